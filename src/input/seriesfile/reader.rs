//! The checked layer of a series file: keys against the format, values
//! parsed as expressions of the coefficient language at their own position
//! in the file, and the rules of the format enforced with messages that name
//! file, line and column.

use super::raw::{RawField, RawFile, RawOrder, Tok};
use super::*;

pub(super) struct Reader<'a> {
    pub(super) text: &'a str,
    pub(super) origin: &'a str,
    pub(super) file: Arc<str>,
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
            Some((name, span)) if name == crate::input::expr::COUPLING => Err(self.error_in_file(
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

    pub(super) fn check(&self, raw: RawFile<'_>) -> Result<SeriesFile> {
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
            Ok(n) if (1..=i64::from(MAX_FILE_LOOP)).contains(&n) => n as u32,
            Ok(n) => {
                return Err(Error::range(format!(
                    "loop order {n} {loop_at} is outside 1..{MAX_FILE_LOOP}"
                )))
            }
            Err(_) if !loop_text.is_empty() && loop_text.bytes().all(|b| b.is_ascii_digit()) => {
                return Err(Error::range(format!(
                    "loop order {loop_text} {loop_at} is outside 1..{MAX_FILE_LOOP}"
                )))
            }
            Err(_) => {
                return Err(Error::input(format!(
                    "loop order `{loop_text}` {loop_at} is not a whole number from 1 to {MAX_FILE_LOOP}"
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
