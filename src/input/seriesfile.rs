//! Series files: the YAML files in which users keep the loop coefficients of
//! one quantity, in one coupling convention, next to their own code. This
//! module owns the format, its reader, and its checks; every expression in a
//! file goes through [`crate::input::expr::parse`], and every error names the file,
//! the line and the column.
//!
//! # The format
//!
//! ```yaml
//! # A series file: loop coefficients of one quantity, in one coupling convention.
//! prediction: cusp          # a catalogue name, or a formula in the coefficient language,
//!                           # e.g. "-zeta(2)/2*Gamma(pi/4) + Delta(0)/4"; optional for origin files
//! coupling: g2              # g2 | a | lambda  (required)
//! normalisation: E          # optional, only for six-gluon origin files: E or R6
//! symbols: [l1, l2, l3]     # optional: kinematic symbols the coefficients may use
//! about:                    # optional, free-form metadata, kept and echoed, never interpreted
//!   group: Fictional Bootstrap Collective
//!   code: hexbootstrap 0.3
//!   date: 2026-11-30
//! orders:                   # required, at least one entry
//!   - loop: 1               # 1 to 200, each loop order at most once
//!     exact: "4"
//!   - loop: 4
//!     exact: "-876*zeta(6) - 32*zeta(3)^2"
//!     label: "from the four-loop run"     # optional, free text
//!   - loop: 5
//!     value: "-1240.9(2)"   # a number with its uncertainty
//!   - loop: 7
//!     value: -1240.9        # the same, with the uncertainty as its own key
//!     uncertainty: 0.2
//!   - loop: 6
//!     exact: "..."
//!     value: "..."          # both may be given; the checker decides whether they agree
//! ```
//!
//! Rules:
//! - Keys are exactly the ones above; any other key is an error that names
//!   its line and column and suggests the nearest known key.
//! - `coupling` and `orders` are required; every entry needs `loop` and at
//!   least one of `exact` and `value`. `uncertainty` goes with `value` only,
//!   and then `value` must be a plain number without an uncertainty of its own.
//! - Numbers may be written unquoted (`value: 0.1000000000000000000001`):
//!   the text is taken exactly as written, never through a binary float.
//! - A coefficient is a number: it may use the symbols listed under
//!   `symbols` and nothing else, not the coupling `g` (the loop order says
//!   which power of g it multiplies).
//! - A `prediction` that is a single name is a catalogue name; a formula may
//!   use the coupling `g`, the declared symbols and catalogue names
//!   (`3*octagon - cusp`, `scaling-function/2`); anything else is an error.
//! - `about` is kept as flattened `key: value` text (nested keys joined with
//!   dots) for reports; its top-level numbers keep their written form.
//! - Entries are kept in the order written.
//!
//! Errors inside an expression are shown on the file's own line with a
//! caret under the culprit, also when the value is folded over several
//! lines, written as a block scalar (`|`, `>`) or contains escapes. The
//! `line`/`column` kept in [`Located`] are those of the value's first
//! character.

use std::fmt;
use std::path::Path;
use std::sync::Arc;

use serde::de::{self, Deserialize, Deserializer, IgnoredAny, MapAccess, Visitor};

use crate::error::{Error, ErrorKind, Result};
use crate::exact::coupling::Coupling;
use crate::input::expr::{self, line_column, Expr, Node, Site, Span};

/// Largest accepted series file, in bytes.
pub const MAX_FILE_BYTES: usize = 16 << 20;
/// Highest loop order a file may give.
pub const MAX_LOOP: u32 = 200;

const TOP_KEYS: [&str; 6] = [
    "prediction",
    "coupling",
    "normalisation",
    "symbols",
    "about",
    "orders",
];
const ORDER_KEYS: [&str; 5] = ["loop", "exact", "value", "uncertainty", "label"];

/// The contents of one series file, checked.
#[derive(Debug, Clone)]
pub struct SeriesFile {
    /// The path as given, for messages.
    pub origin: String,
    /// A parsed formula, or a catalogue name (then `expr` is a bare symbol).
    pub prediction: Option<Located>,
    pub coupling: Coupling,
    pub normalisation: Option<Normalisation>,
    pub symbols: Vec<String>,
    /// Flattened "key: value" text for echoing in reports.
    pub about: Vec<(String, String)>,
    pub orders: Vec<OrderEntry>,
}

impl SeriesFile {
    /// The catalogue name, when `prediction` is a single name (letters,
    /// digits, `-` and `_`, as catalogue names are written), not a formula.
    pub fn catalogue_name(&self) -> Option<&str> {
        let text = self.prediction.as_ref()?.text.trim();
        crate::input::catalogue::looks_like_name(text).then_some(text)
    }
}

/// How a six-gluon origin file normalises its coefficients.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Normalisation {
    E,
    R6,
}

impl fmt::Display for Normalisation {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(match self {
            Normalisation::E => "E",
            Normalisation::R6 => "R6",
        })
    }
}

/// An expression from the file, with its text and where that text starts
/// (line and column from 1, the column counted in characters).
#[derive(Debug, Clone)]
pub struct Located {
    pub text: String,
    pub expr: Expr,
    pub line: usize,
    pub column: usize,
    /// The file itself, so that later messages (evaluation errors, names
    /// the catalogue does not know) are shown on the file's own line.
    pub site: Site,
}

impl Located {
    /// Wraps a text that stands on its own (an argument, a test), as if it
    /// were a one-line file.
    pub fn standalone(text: &str, expr: Expr) -> Located {
        Located {
            text: text.to_string(),
            expr,
            line: 1,
            column: 1,
            site: Site {
                file: Arc::from(text),
                start: 0,
            },
        }
    }

    /// An error at a span of this expression, shown on the file's own line.
    pub fn error_at(&self, origin: &str, span: expr::Span, message: &str) -> Error {
        self.site
            .render(ErrorKind::Input, &self.text, origin, span, message)
    }
}

/// One entry of `orders`.
#[derive(Debug, Clone)]
pub struct OrderEntry {
    pub loop_order: u32,
    pub exact: Option<Located>,
    pub value: Option<Located>,
    pub label: Option<String>,
    /// The line where the entry starts.
    pub line: usize,
}

/// Reads and checks a series file.
pub fn read_series_file(path: &Path) -> Result<SeriesFile> {
    let (text, origin) = read_input(path)?;
    parse_series_text(&text, &origin)
}

/// The name standard input goes by in messages when a file is given as `-`.
pub const STDIN_NAME: &str = "<stdin>";

/// The text of a series file and the name messages give it: `-` reads
/// standard input (named [`STDIN_NAME`]), anything else the file at `path`.
/// Either way the size limit of series files holds and the text must be UTF-8.
pub fn read_input(path: &Path) -> Result<(String, String)> {
    let (bytes, origin) = if path.as_os_str() == "-" {
        use std::io::Read;
        let mut bytes = Vec::new();
        // One byte past the limit is enough to know the input is too large.
        std::io::stdin()
            .lock()
            .take(MAX_FILE_BYTES as u64 + 1)
            .read_to_end(&mut bytes)
            .map_err(|e| Error::io(format!("cannot read {STDIN_NAME}: {e}")))?;
        (bytes, STDIN_NAME.to_string())
    } else {
        let origin = path.display().to_string();
        let meta =
            std::fs::metadata(path).map_err(|e| Error::io(format!("cannot read {origin}: {e}")))?;
        if meta.len() > MAX_FILE_BYTES as u64 {
            return Err(Error::input(format!(
                "{origin} is larger than {MAX_FILE_BYTES} bytes; is it really a series file?"
            )));
        }
        (
            std::fs::read(path).map_err(|e| Error::io(format!("cannot read {origin}: {e}")))?,
            origin,
        )
    };
    if bytes.len() > MAX_FILE_BYTES {
        return Err(Error::input(format!(
            "{origin} is larger than {MAX_FILE_BYTES} bytes; is it really a series file?"
        )));
    }
    let text = String::from_utf8(bytes).map_err(|e| {
        Error::input(format!(
            "{origin} is not UTF-8 text (bad byte at offset {})",
            e.utf8_error().valid_up_to()
        ))
    })?;
    Ok((text, origin))
}

/// Checks a series file given as text; `origin` names it in messages.
pub fn parse_series_text(text: &str, origin: &str) -> Result<SeriesFile> {
    if text.len() > MAX_FILE_BYTES {
        return Err(Error::input(format!(
            "{origin} is larger than {MAX_FILE_BYTES} bytes; is it really a series file?"
        )));
    }
    if text
        .lines()
        .all(|l| l.trim().is_empty() || l.trim_start().starts_with('#'))
    {
        return Err(Error::input(format!(
            "{origin} is empty; a series file needs at least `coupling` and `orders`"
        )));
    }
    // Editors on some systems start UTF-8 files with a byte-order mark; it
    // is not part of the YAML, and left in it hides the real content.
    let text = text.strip_prefix('\u{feff}').unwrap_or(text);
    check_depth(text, origin)?;
    let raw: RawFile<'_> =
        serde_yaml::from_str(text).map_err(|e| Error::input(format!("{origin}: {e}")))?;
    Reader {
        text,
        origin,
        file: Arc::from(text),
    }
    .check(raw)
}

/// Deepest nesting of YAML collections accepted. A series file needs three
/// levels (the file, `orders`, an entry); `about` may nest a few more. The
/// YAML parser's cost grows quadratically with the depth of flow
/// collections, so a pathological file is refused before it is parsed.
pub const MAX_YAML_DEPTH: usize = 64;

/// Refuses over-deep nesting in one linear pass: flow brackets (`[`, `{`)
/// outside quoted text and comments, and compact block nesting (`- - - x`).
pub(crate) fn check_depth(text: &str, origin: &str) -> Result<()> {
    let refuse = |line: usize, column: usize| {
        Err(Error::input(format!(
            "{origin}:{line}:{column}: collections nested more than {MAX_YAML_DEPTH} deep; \
             a loopwise file needs a few levels (a series file three: file, `orders`, entry)"
        )))
    };
    let mut flow = 0usize;
    for (index, line) in text.lines().enumerate() {
        let mut rest = line.trim_start();
        let mut compact = 0usize;
        while let Some(r) = rest.strip_prefix("- ").or_else(|| rest.strip_prefix("? ")) {
            compact += 1;
            if compact > MAX_YAML_DEPTH {
                return refuse(index + 1, line.len() - r.len());
            }
            rest = r.trim_start();
        }
        let mut quote: Option<char> = None;
        let mut previous = ' ';
        for (column, c) in line.chars().enumerate() {
            match quote {
                Some(q) if c == q => quote = None,
                Some(_) => {}
                // A quote opens a quoted scalar only where a token starts;
                // elsewhere (`group's`) it is part of plain text.
                None if (c == '"' || c == '\'')
                    && (previous.is_whitespace() || "[{,:".contains(previous)) =>
                {
                    quote = Some(c)
                }
                None if c == '#' && previous.is_whitespace() => break,
                None if c == '[' || c == '{' => {
                    flow += 1;
                    if flow > MAX_YAML_DEPTH {
                        return refuse(index + 1, column + 1);
                    }
                }
                None if c == ']' || c == '}' => flow = flow.saturating_sub(1),
                None => {}
            }
            previous = c;
        }
    }
    Ok(())
}

// ---------------------------------------------------------------------------
// The raw layer: what serde_yaml hands over, with every scalar kept as text.

/// A scalar exactly as written. When serde_yaml can lend the text straight
/// out of the file (plain and simply quoted scalars), its address tells where
/// it sits.
#[derive(Debug)]
enum Tok<'de> {
    Lent(&'de str),
    Copied(String),
}

impl Tok<'_> {
    fn text(&self) -> &str {
        match self {
            Tok::Lent(s) => s,
            Tok::Copied(s) => s,
        }
    }

    /// Byte offset in `file`, when the text was lent from it.
    fn offset_in(&self, file: &str) -> Option<usize> {
        match self {
            Tok::Lent(s) => {
                let at = (s.as_ptr() as usize).checked_sub(file.as_ptr() as usize)?;
                (at + s.len() <= file.len()).then_some(at)
            }
            Tok::Copied(_) => None,
        }
    }
}

impl<'de> Deserialize<'de> for Tok<'de> {
    fn deserialize<D: Deserializer<'de>>(d: D) -> std::result::Result<Self, D::Error> {
        struct V;
        impl<'de> Visitor<'de> for V {
            type Value = Tok<'de>;
            fn expecting(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
                f.write_str("a single value (text or a number)")
            }
            fn visit_borrowed_str<E: de::Error>(
                self,
                v: &'de str,
            ) -> std::result::Result<Tok<'de>, E> {
                Ok(Tok::Lent(v))
            }
            fn visit_str<E: de::Error>(self, v: &str) -> std::result::Result<Tok<'de>, E> {
                Ok(Tok::Copied(v.to_string()))
            }
        }
        // Asking for a string makes serde_yaml hand over the scalar's text,
        // so `value: -1240.9` never becomes a binary float.
        d.deserialize_str(V)
    }
}

#[derive(Debug)]
enum RawField<'de> {
    Scalar(Tok<'de>),
    Symbols(Vec<Tok<'de>>),
    About(Vec<(Tok<'de>, serde_yaml::Value)>),
    Orders(Vec<RawOrder<'de>>),
    Unknown,
}

#[derive(Debug)]
struct RawFile<'de> {
    fields: Vec<(Tok<'de>, RawField<'de>)>,
}

/// The keys of one order entry, in file order; `None` for an unknown key.
#[derive(Debug)]
struct RawOrder<'de> {
    fields: Vec<(Tok<'de>, Option<Tok<'de>>)>,
}

impl<'de> Deserialize<'de> for RawFile<'de> {
    fn deserialize<D: Deserializer<'de>>(d: D) -> std::result::Result<Self, D::Error> {
        struct V;
        impl<'de> Visitor<'de> for V {
            type Value = RawFile<'de>;
            fn expecting(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
                f.write_str("a series file: keys such as `coupling:` and `orders:`")
            }
            fn visit_map<A: MapAccess<'de>>(
                self,
                mut map: A,
            ) -> std::result::Result<RawFile<'de>, A::Error> {
                let mut fields = Vec::new();
                while let Some(key) = map.next_key::<Tok<'de>>()? {
                    let field = match key.text() {
                        "prediction" | "coupling" | "normalisation" => {
                            RawField::Scalar(map.next_value()?)
                        }
                        "symbols" => RawField::Symbols(map.next_value()?),
                        "about" => RawField::About(map.next_value::<AboutMap<'de>>()?.0),
                        "orders" => RawField::Orders(map.next_value()?),
                        _ => {
                            map.next_value::<IgnoredAny>()?;
                            RawField::Unknown
                        }
                    };
                    fields.push((key, field));
                }
                Ok(RawFile { fields })
            }
        }
        d.deserialize_map(V)
    }
}

struct AboutMap<'de>(Vec<(Tok<'de>, serde_yaml::Value)>);

impl<'de> Deserialize<'de> for AboutMap<'de> {
    fn deserialize<D: Deserializer<'de>>(d: D) -> std::result::Result<Self, D::Error> {
        struct V;
        impl<'de> Visitor<'de> for V {
            type Value = AboutMap<'de>;
            fn expecting(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
                f.write_str("free-form `key: value` lines")
            }
            fn visit_map<A: MapAccess<'de>>(
                self,
                mut map: A,
            ) -> std::result::Result<AboutMap<'de>, A::Error> {
                let mut out = Vec::new();
                while let Some(key) = map.next_key::<Tok<'de>>()? {
                    out.push((key, map.next_value()?));
                }
                Ok(AboutMap(out))
            }
        }
        d.deserialize_map(V)
    }
}

impl<'de> Deserialize<'de> for RawOrder<'de> {
    fn deserialize<D: Deserializer<'de>>(d: D) -> std::result::Result<Self, D::Error> {
        struct V;
        impl<'de> Visitor<'de> for V {
            type Value = RawOrder<'de>;
            fn expecting(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
                f.write_str("an order entry: `loop:` with `exact:` and/or `value:`")
            }
            fn visit_map<A: MapAccess<'de>>(
                self,
                mut map: A,
            ) -> std::result::Result<RawOrder<'de>, A::Error> {
                let mut fields = Vec::new();
                while let Some(key) = map.next_key::<Tok<'de>>()? {
                    let value = if ORDER_KEYS.contains(&key.text()) {
                        Some(map.next_value()?)
                    } else {
                        map.next_value::<IgnoredAny>()?;
                        None
                    };
                    fields.push((key, value));
                }
                Ok(RawOrder { fields })
            }
        }
        d.deserialize_map(V)
    }
}

// ---------------------------------------------------------------------------
// The checked layer.

struct Reader<'a> {
    text: &'a str,
    origin: &'a str,
    file: Arc<str>,
}

/// What names an expression of the file may use.
#[derive(Clone, Copy)]
enum Names<'s> {
    /// A loop coefficient: a number, so only the declared kinematic symbols.
    Coefficient(&'s [String]),
    /// The prediction: checked later against the catalogue and the declared
    /// symbols, where the catalogue is known.
    Later,
}

fn suggestion(key: &str, known: &[&str]) -> String {
    use crate::input::suggest::edit_distance;
    let lower = key.to_lowercase();
    let best = known.iter().map(|k| (edit_distance(&lower, k), *k)).min();
    match best {
        Some((d, k)) if d <= 2.max(k.len() / 3) => format!("; did you mean `{k}`?"),
        _ => format!(
            "; the keys here are {}",
            known
                .iter()
                .map(|k| format!("`{k}`"))
                .collect::<Vec<_>>()
                .join(", ")
        ),
    }
}

impl<'a> Reader<'a> {
    fn position(&self, offset: Option<usize>) -> (usize, usize) {
        offset.map_or((1, 1), |o| line_column(self.text, o, None))
    }

    fn key_position(&self, key: &Tok<'_>) -> (usize, usize) {
        self.position(key.offset_in(self.text))
    }

    /// Where a value's text starts: its own address when lent, otherwise
    /// found after its key (past `:`, an opening quote, or a block indicator).
    fn value_offset(&self, key: &Tok<'_>, value: &Tok<'_>) -> Option<usize> {
        if let Some(o) = value.offset_in(self.text) {
            return Some(o);
        }
        let after_key = key.offset_in(self.text)? + key.text().len();
        let rest = &self.text[after_key..];
        let skipped = rest.len() - rest.trim_start_matches([' ', '\t', '"', '\'']).len();
        let mut at = after_key + skipped;
        if self.text[at..].starts_with(':') {
            at += 1;
            let rest = &self.text[at..];
            at += rest.len() - rest.trim_start_matches([' ', '\t']).len();
        }
        match self.text[at..].chars().next() {
            Some('"' | '\'') => Some(at + 1),
            Some('|' | '>') => {
                let next_line = at + self.text[at..].find('\n')? + 1;
                let rest = &self.text[next_line..];
                Some(next_line + rest.len() - rest.trim_start_matches([' ', '\t']).len())
            }
            _ => Some(at),
        }
    }

    fn at(&self, (line, column): (usize, usize)) -> String {
        format!("at line {line} column {column} of {}", self.origin)
    }

    fn unknown_key(&self, key: &Tok<'_>, known: &[&str]) -> Error {
        Error::input(format!(
            "unknown key `{}` {}{}",
            key.text(),
            self.at(self.key_position(key)),
            suggestion(key.text(), known)
        ))
    }

    /// Parses a value as an expression; errors are shown on the file's own
    /// line, and the names it uses are checked as `names` says.
    fn expression(&self, key: &Tok<'_>, value: &Tok<'_>, names: Names<'_>) -> Result<Located> {
        let start = self.value_offset(key, value).unwrap_or(0);
        let (line, column) = self.position(Some(start));
        let text = value.text().to_string();
        let expr = expr::parse_unrendered(&text)
            .map_err(|f| self.error_in_file(ErrorKind::Parse, start, &text, f.span, &f.message))?;
        if let Names::Coefficient(symbols) = names {
            self.check_symbols(start, &text, &expr, symbols)?;
            if let Some(functional) =
                expr::find(&expr, &mut |x| matches!(x.node, Node::Functional { .. }))
            {
                let span = functional.span;
                return Err(self.error_in_file(
                    ErrorKind::Input,
                    start,
                    &text,
                    span,
                    "a loop coefficient cannot contain Gamma(...) or Delta(...): they are functions of the \
                     coupling; a coefficient is the number that multiplies one power of it",
                ));
            }
        }
        Ok(Located {
            text,
            expr,
            line,
            column,
            site: Site {
                file: self.file.clone(),
                start,
            },
        })
    }

    /// Renders an error at a span of a value's text, shown on the line of
    /// the file where that text sits.
    fn error_in_file(
        &self,
        kind: ErrorKind,
        start: usize,
        text: &str,
        span: Span,
        message: &str,
    ) -> Error {
        Site {
            file: self.file.clone(),
            start,
        }
        .render(kind, text, self.origin, span, message)
    }

    /// A loop coefficient multiplies a fixed power of the coupling, so it is
    /// a number: it may use the declared kinematic symbols, not `g`.
    fn check_symbols(
        &self,
        start: usize,
        text: &str,
        expr: &Expr,
        symbols: &[String],
    ) -> Result<()> {
        let mut bad = None;
        expr::for_each_symbol(expr, &mut |name, span| {
            if bad.is_none() && !symbols.iter().any(|s| s == name) {
                bad = Some((name.to_string(), span));
            }
        });
        match bad {
            None => Ok(()),
            Some((name, span)) if name == crate::quantity::COUPLING => Err(self.error_in_file(
                ErrorKind::Input,
                start,
                text,
                span,
                "a loop coefficient cannot contain the coupling `g`: it is the number that multiplies \
                 the power of the coupling named by `loop` (write the g^2 and g^4 terms as separate orders)",
            )),
            Some((name, span)) => {
                let declared = if symbols.is_empty() { "none are declared".to_string() } else { format!("declared: {}", symbols.join(", ")) };
                Err(self.error_in_file(
                    ErrorKind::Input,
                    start,
                    text,
                    span,
                    &format!("undeclared symbol `{name}`: list it under `symbols:` ({declared})"),
                ))
            }
        }
    }

    fn check(&self, raw: RawFile<'_>) -> Result<SeriesFile> {
        let mut seen: Vec<(&str, (usize, usize))> = Vec::new();
        let mut prediction = None;
        let mut coupling = None;
        let mut normalisation = None;
        let mut symbols_raw = None;
        let mut about = Vec::new();
        let mut orders_raw = None;
        for (key, field) in &raw.fields {
            let here = self.key_position(key);
            if let RawField::Unknown = field {
                return Err(self.unknown_key(key, &TOP_KEYS));
            }
            if let Some((_, first)) = seen.iter().find(|(k, _)| *k == key.text()) {
                return Err(Error::input(format!(
                    "key `{}` given twice, at line {} and {}",
                    key.text(),
                    first.0,
                    self.at(here)
                )));
            }
            seen.push((key.text(), here));
            match (key.text(), field) {
                ("prediction", RawField::Scalar(v)) => prediction = Some((key, v)),
                ("coupling", RawField::Scalar(v)) => coupling = Some((key, v)),
                ("normalisation", RawField::Scalar(v)) => normalisation = Some((key, v)),
                ("symbols", RawField::Symbols(list)) => symbols_raw = Some(list),
                ("about", RawField::About(entries)) => about = self.about(entries),
                ("orders", RawField::Orders(list)) => orders_raw = Some((key, list)),
                _ => return Err(self.unknown_key(key, &TOP_KEYS)),
            }
        }

        let (ckey, cvalue) = coupling.ok_or_else(|| {
            Error::input(format!(
                "{}: missing `coupling:` (g2, a or lambda: what one loop order multiplies)",
                self.origin
            ))
        })?;
        let coupling: Coupling = cvalue.text().parse().map_err(|e: Error| {
            Error::input(format!(
                "{} {}",
                e.message(),
                self.at(self.position(self.value_offset(ckey, cvalue)))
            ))
        })?;

        let normalisation = match normalisation {
            None => None,
            Some((k, v)) => Some(match v.text().trim() {
                "E" | "e" => Normalisation::E,
                "R6" | "r6" => Normalisation::R6,
                other => {
                    return Err(Error::input(format!(
                        "unknown normalisation `{other}` {}: expected E or R6",
                        self.at(self.position(self.value_offset(k, v)))
                    )))
                }
            }),
        };

        let mut symbols: Vec<String> = Vec::new();
        for s in symbols_raw.into_iter().flatten() {
            let here = self.position(s.offset_in(self.text));
            let name = s.text().trim();
            let is_symbol = matches!(expr::parse(name, self.origin, None), Ok(Expr { node: Node::Symbol(ref n), .. }) if n == name);
            if !is_symbol {
                return Err(Error::input(format!(
                    "`{name}` {} cannot be a symbol: symbols are names like l1 or x that are not function or constant names",
                    self.at(here)
                )));
            }
            if name == "g" {
                return Err(Error::input(format!(
                    "`g` {} is the coupling; it may be used without being listed under `symbols:`",
                    self.at(here)
                )));
            }
            if symbols.iter().any(|t| t == name) {
                return Err(Error::input(format!(
                    "symbol `{name}` listed twice ({})",
                    self.at(here)
                )));
            }
            symbols.push(name.to_string());
        }

        let prediction = match prediction {
            None => None,
            Some((k, v)) => Some(self.expression(k, v, Names::Later)?),
        };

        let (okey, list) = orders_raw.ok_or_else(|| {
            Error::input(format!(
                "{}: missing `orders:` (the list of loop coefficients)",
                self.origin
            ))
        })?;
        if list.is_empty() {
            return Err(Error::input(format!(
                "`orders` {} has no entries",
                self.at(self.key_position(okey))
            )));
        }
        let mut orders: Vec<OrderEntry> = Vec::with_capacity(list.len());
        for (index, raw) in list.iter().enumerate() {
            let entry = self.order(index, okey, raw, &symbols)?;
            if let Some(first) = orders.iter().find(|o| o.loop_order == entry.loop_order) {
                return Err(Error::input(format!(
                    "loop order {} given twice, at line {} and at line {} of {}",
                    entry.loop_order, first.line, entry.line, self.origin
                )));
            }
            orders.push(entry);
        }

        Ok(SeriesFile {
            origin: self.origin.to_string(),
            prediction,
            coupling,
            normalisation,
            symbols,
            about,
            orders,
        })
    }

    fn order(
        &self,
        index: usize,
        okey: &Tok<'_>,
        raw: &RawOrder<'_>,
        symbols: &[String],
    ) -> Result<OrderEntry> {
        let start = match raw.fields.first() {
            Some((k, _)) => self.key_position(k),
            None => self.key_position(okey),
        };
        let entry_name = format!("order entry {} (line {})", index + 1, start.0);
        let mut loop_tok = None;
        let mut exact = None;
        let mut value = None;
        let mut uncertainty = None;
        let mut label = None;
        let mut seen: Vec<&str> = Vec::new();
        for (key, v) in &raw.fields {
            let Some(v) = v else {
                return Err(self.unknown_key(key, &ORDER_KEYS));
            };
            if seen.contains(&key.text()) {
                return Err(Error::input(format!(
                    "key `{}` given twice in {entry_name} of {}",
                    key.text(),
                    self.origin
                )));
            }
            seen.push(key.text());
            match key.text() {
                "loop" => loop_tok = Some((key, v)),
                "exact" => exact = Some((key, v)),
                "value" => value = Some((key, v)),
                "uncertainty" => uncertainty = Some((key, v)),
                _ => label = Some(v.text().to_string()),
            }
        }
        let (lk, lv) = loop_tok.ok_or_else(|| {
            Error::input(format!("{entry_name} of {} has no `loop:`", self.origin))
        })?;
        let loop_at = self.at(self.position(self.value_offset(lk, lv)));
        let loop_text = lv.text().trim();
        let loop_order = match loop_text.parse::<i64>() {
            Ok(n) if (1..=i64::from(MAX_LOOP)).contains(&n) => n as u32,
            Ok(n) => {
                return Err(Error::range(format!(
                    "loop order {n} {loop_at} is outside 1..{MAX_LOOP}"
                )))
            }
            Err(_) if !loop_text.is_empty() && loop_text.bytes().all(|b| b.is_ascii_digit()) => {
                return Err(Error::range(format!(
                    "loop order {loop_text} {loop_at} is outside 1..{MAX_LOOP}"
                )))
            }
            Err(_) => {
                return Err(Error::input(format!(
                    "loop order `{loop_text}` {loop_at} is not a whole number from 1 to {MAX_LOOP}"
                )))
            }
        };
        if exact.is_none() && value.is_none() {
            return Err(Error::input(format!(
                "{entry_name} of {} (loop {loop_order}) needs `exact:` or `value:`",
                self.origin
            )));
        }
        let exact = match exact {
            Some((k, v)) => Some(self.expression(k, v, Names::Coefficient(symbols))?),
            None => None,
        };
        let value = match (value, uncertainty) {
            (Some((k, v)), None) => Some(self.expression(k, v, Names::Coefficient(symbols))?),
            (Some((k, v)), Some((uk, uv))) => Some(self.value_with_uncertainty(k, v, uk, uv)?),
            (None, Some((uk, _))) => {
                return Err(Error::input(format!(
                    "`uncertainty` {} needs a `value` to go with",
                    self.at(self.key_position(uk))
                )))
            }
            (None, None) => None,
        };
        Ok(OrderEntry {
            loop_order,
            exact,
            value,
            label,
            line: start.0,
        })
    }

    /// `value: -1240.9` with `uncertainty: 0.2` becomes the literal
    /// `-1240.9 ± 0.2`.
    fn value_with_uncertainty(
        &self,
        k: &Tok<'_>,
        v: &Tok<'_>,
        uk: &Tok<'_>,
        uv: &Tok<'_>,
    ) -> Result<Located> {
        let mut located = self.expression(k, v, Names::Coefficient(&[]))?;
        let u = self.expression(uk, uv, Names::Coefficient(&[]))?;
        let (uline, ucolumn) = (u.line, u.column);
        let u = u.expr;
        let u_value = match u.node {
            Node::Integer(n) => rug::Rational::from(n),
            Node::Decimal {
                value,
                uncertainty: None,
                ..
            } => value,
            _ => {
                return Err(Error::input(format!(
                    "`uncertainty` {} must be a plain non-negative number",
                    self.at((uline, ucolumn))
                )))
            }
        };
        let u_text = uv.text().trim().to_string();
        let target = match &mut located.expr.node {
            Node::Neg(inner) => &mut inner.node,
            other => other,
        };
        let combined = format!("{} ± {u_text}", located.text.trim());
        match target {
            Node::Integer(n) => {
                let value = rug::Rational::from(std::mem::take(n));
                *target = Node::Decimal { value, uncertainty: Some(u_value), text: combined_literal(&combined) };
            }
            Node::Decimal { uncertainty: slot @ None, text, .. } => {
                *text = format!("{text} ± {u_text}");
                *slot = Some(u_value);
            }
            _ => {
                return Err(Error::input(format!(
                    "with a separate `uncertainty`, `value` {} must be a plain number without an uncertainty of its own",
                    self.at((located.line, located.column))
                )))
            }
        }
        located.text = combined;
        Ok(located)
    }

    fn about(&self, entries: &[(Tok<'_>, serde_yaml::Value)]) -> Vec<(String, String)> {
        let mut out = Vec::new();
        for (key, value) in entries {
            let written = match value {
                serde_yaml::Value::Number(_) => self.written_after(key),
                _ => None,
            };
            match written {
                Some(text) => out.push((key.text().to_string(), text)),
                None => flatten(key.text(), value, &mut out),
            }
        }
        out
    }

    /// The rest of the key's line after `:`, without a trailing comment: the
    /// number as written, when it is written there.
    fn written_after(&self, key: &Tok<'_>) -> Option<String> {
        let after = key.offset_in(self.text)? + key.text().len();
        let line = self.text[after..].lines().next()?;
        let rest = line.trim_start().strip_prefix(':')?;
        let rest = rest.split(" #").next()?.trim();
        (!rest.is_empty()).then(|| rest.to_string())
    }
}

/// The literal text of a negated integer given with a separate uncertainty:
/// the sign belongs to the enclosing node, not the literal.
fn combined_literal(combined: &str) -> String {
    combined
        .trim_start_matches(['-', '+'])
        .trim_start()
        .to_string()
}

fn flatten(prefix: &str, value: &serde_yaml::Value, out: &mut Vec<(String, String)>) {
    use serde_yaml::Value;
    match value {
        Value::Mapping(m) => {
            for (k, v) in m {
                let k = scalar_text(k);
                flatten(&format!("{prefix}.{k}"), v, out);
            }
        }
        other => out.push((prefix.to_string(), scalar_text(other))),
    }
}

fn scalar_text(value: &serde_yaml::Value) -> String {
    use serde_yaml::Value;
    match value {
        Value::Null => String::new(),
        Value::Bool(b) => b.to_string(),
        Value::Number(n) => n.to_string(),
        Value::String(s) => s.clone(),
        Value::Sequence(items) => items.iter().map(scalar_text).collect::<Vec<_>>().join(", "),
        Value::Mapping(m) => m
            .iter()
            .map(|(k, v)| format!("{}: {}", scalar_text(k), scalar_text(v)))
            .collect::<Vec<_>>()
            .join(", "),
        Value::Tagged(t) => scalar_text(&t.value),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn suggestions_pick_the_nearest_key() {
        assert_eq!(suggestion("exat", &ORDER_KEYS), "; did you mean `exact`?");
        assert_eq!(
            suggestion("normalization", &TOP_KEYS),
            "; did you mean `normalisation`?"
        );
        assert_eq!(
            suggestion("Coupling", &TOP_KEYS),
            "; did you mean `coupling`?"
        );
        assert!(suggestion("zzzzzz", &ORDER_KEYS).starts_with("; the keys here are `loop`"));
    }
}
