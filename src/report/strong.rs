//! The report of `strong`: the fitted strong-coupling coefficients with
//! their errors, the fit each comes from, the numerical identifications,
//! the catalogue's formula beside them when it has one, and the cautions
//! (an identification is not a derivation; without a formula, or with a
//! conjectured one, the numbers are all there is).

use serde::Serialize;

use super::decimal::{bracketed, supported};
use super::{decimal, wrap, DataFormat};
use crate::error::Result;
use crate::input::catalogue::Status;
use crate::numeric::Estimate;
use crate::quantity::strong::{Coefficient, Extraction, Term};

/// The caution every identification here carries.
pub const IDENTIFIED: &str = "numerical identification, not a derivation: a short relation \
with the basis that the fitted digits single out with digits to spare, allowing for every \
subset of the basis tried";

/// Significant digits printed at most for a coefficient.
const MAX_DIGITS: u32 = 30;

#[derive(Serialize)]
struct JsonTerm {
    power: i32,
    log_power: u32,
    value: String,
    error: String,
    identified: Option<String>,
    digits_to_spare: Option<i64>,
    fitted_terms: usize,
    /// The coefficient of the catalogue's formula, where it has one of the
    /// fitted form.
    formula_value: Option<String>,
    /// |value - formula_value| / error, where both exist.
    formula_sigmas: Option<String>,
}

#[derive(Serialize)]
struct JsonFormula<'a> {
    formula: &'a str,
    status: String,
    note: Option<&'a str>,
    compared: bool,
}

#[derive(Serialize)]
struct JsonReport<'a> {
    quantity: &'a str,
    definition: &'a str,
    range: [String; 2],
    points: usize,
    digits: u32,
    terms: Vec<JsonTerm>,
    formula: Option<JsonFormula<'a>>,
    basis: &'a str,
    identification: &'static str,
    caution: Option<String>,
}

pub fn render(x: &Extraction, format: DataFormat) -> Result<String> {
    match format {
        DataFormat::Text => Ok(text(x)),
        DataFormat::Json | DataFormat::Yaml => super::serialized(&json(x), format),
    }
}

/// How a term prints: g, 1, 1/g, ln g, ln g / g^2, ...
pub fn term_text(t: &Term) -> String {
    let power = match t.power {
        0 => String::new(),
        1 => "g".to_string(),
        p if p > 1 => format!("g^{p}"),
        -1 => "/g".to_string(),
        p => format!("/g^{}", -p),
    };
    let log = match t.log_power {
        0 => String::new(),
        1 => "ln g".to_string(),
        l => format!("(ln g)^{l}"),
    };
    match (log.is_empty(), power.is_empty()) {
        (true, true) => "1".to_string(),
        (true, false) if power.starts_with('/') => format!("1{power}"),
        (true, false) => power,
        (false, true) => log,
        (false, false) if power.starts_with('/') => format!("{log} {power}"),
        (false, false) => format!("{power} {log}"),
    }
}

/// A coupling of the grid as the user wrote it (a few digits, no padding).
fn short(g: &rug::Float) -> String {
    format!("{}", (g.to_f64() * 1e6).round() / 1e6)
}

fn estimate(c: &Coefficient) -> Estimate {
    Estimate::new(c.value.clone(), c.error.clone())
}

fn sigmas(c: &Coefficient) -> Option<f64> {
    let f = c.formula.as_ref()?;
    if c.error.is_zero() {
        return None;
    }
    Some((c.value.to_f64() - f.to_f64()).abs() / c.error.to_f64())
}

/// The caution of the report: no formula to compare with, or a conjectured one.
fn caution(x: &Extraction) -> Option<String> {
    match &x.formula {
        None => Some(format!(
            "the catalogue has no strong-coupling formula for {}: these coefficients are numerical \
             results of the fit, with the errors shown, and nothing here derives them",
            x.quantity
        )),
        Some(f) if f.status == Status::Conjecture => Some(format!(
            "the catalogue's strong-coupling formula for {} is a conjecture of the literature: \
             agreement with it is evidence for it, not a check of the fit",
            x.quantity
        )),
        Some(f) if !f.of_fitted_form => Some(
            "the catalogue's formula is not of the fitted form (a ln g term missing? see --logs), \
             so its coefficients are not compared"
                .to_string(),
        ),
        Some(_) => None,
    }
}

fn json(x: &Extraction) -> JsonReport<'_> {
    JsonReport {
        quantity: &x.quantity,
        definition: &x.definition,
        range: [
            short(&x.couplings[0]),
            short(&x.couplings[x.couplings.len() - 1]),
        ],
        points: x.couplings.len(),
        digits: x.digits,
        terms: x
            .coefficients
            .iter()
            .map(|c| JsonTerm {
                power: c.term.power,
                log_power: c.term.log_power,
                value: supported(&estimate(c), MAX_DIGITS),
                error: decimal(&c.error, 2),
                identified: c.identified.as_ref().map(|i| i.expression.clone()),
                digits_to_spare: c.identified.as_ref().map(|i| i.digits_to_spare),
                fitted_terms: c.fitted_terms,
                formula_value: c.formula.as_ref().map(|f| decimal(f, MAX_DIGITS)),
                formula_sigmas: sigmas(c).map(|s| format!("{s:.2}")),
            })
            .collect(),
        formula: x.formula.as_ref().map(|f| JsonFormula {
            formula: &f.text,
            status: f.status.to_string(),
            note: f.note.as_deref(),
            compared: f.of_fitted_form,
        }),
        basis: &x.basis,
        identification: IDENTIFIED,
        caution: caution(x),
    }
}

fn text(x: &Extraction) -> String {
    let mut out = format!(
        "strong-coupling expansion of {} ({}), fitted to {} values at g = {} .. {} ({} digits each)\n\n",
        x.quantity,
        x.definition,
        x.couplings.len(),
        short(&x.couplings[0]),
        short(&x.couplings[x.couplings.len() - 1]),
        x.digits
    );
    let rows: Vec<[String; 4]> = x
        .coefficients
        .iter()
        .map(|c| {
            [
                term_text(&c.term),
                bracketed(&estimate(c), MAX_DIGITS),
                c.fitted_terms.to_string(),
                c.identified
                    .as_ref()
                    .map_or_else(|| "-".to_string(), |i| i.expression.clone()),
            ]
        })
        .collect();
    let header = [
        "term",
        "coefficient (error)",
        "fit terms",
        "identified (numerically)",
    ];
    let widths: Vec<usize> = (0..4)
        .map(|k| {
            rows.iter()
                .map(|r| r[k].chars().count())
                .max()
                .unwrap_or(0)
                .max(header[k].len())
        })
        .collect();
    let line = |cells: [&str; 4]| {
        format!(
            "{:<w0$}  {:<w1$}  {:>w2$}  {}\n",
            cells[0],
            cells[1],
            cells[2],
            cells[3],
            w0 = widths[0],
            w1 = widths[1],
            w2 = widths[2]
        )
        .trim_end()
        .to_string()
            + "\n"
    };
    out.push_str(&line(header));
    for r in &rows {
        out.push_str(&line([&r[0], &r[1], &r[2], &r[3]]));
    }
    if let Some(f) = &x.formula {
        out.push_str(&format!("\ncatalogue formula ({}): {}\n", f.status, f.text));
        if f.of_fitted_form {
            let agreeing: Vec<String> = x
                .coefficients
                .iter()
                .filter_map(|c| sigmas(c).map(|s| format!("{} {s:.1}", term_text(&c.term))))
                .collect();
            out.push_str(&format!(
                "|fit - formula| in units of the error: {}\n",
                agreeing.join(", ")
            ));
        }
        if let Some(note) = &f.note {
            out.push_str(&wrap(&format!("({note})"), 88));
        }
    }
    out.push('\n');
    out.push_str(&wrap(&format!("Identifications: {IDENTIFIED}."), 88));
    if let Some(c) = caution(x) {
        out.push_str(&wrap(&format!("Caution: {c}."), 88));
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn terms_print_as_physicists_write_them() {
        let t = |power, log_power| term_text(&Term { power, log_power });
        assert_eq!(t(1, 0), "g");
        assert_eq!(t(0, 0), "1");
        assert_eq!(t(-1, 0), "1/g");
        assert_eq!(t(-3, 0), "1/g^3");
        assert_eq!(t(0, 1), "ln g");
        assert_eq!(t(-2, 1), "ln g /g^2");
        assert_eq!(t(2, 1), "g^2 ln g");
    }
}
