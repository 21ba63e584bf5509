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

mod raw;
mod reader;

use raw::RawFile;
use reader::Reader;

use crate::limits::MAX_FILE_BYTES;
use crate::limits::MAX_FILE_LOOP;
use crate::limits::MAX_YAML_DEPTH;

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
