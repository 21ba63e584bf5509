//! Reports: computed values in, text out. Every report is a plain value that
//! printers turn into a readable table (default), JSON or YAML for pipelines,
//! or LaTeX for papers; nothing here computes physics.

pub mod check;
pub mod expansion;
pub mod fit;
pub mod latex;
pub mod origin;
pub mod svg;
pub mod values;

use std::fmt;

use rug::ops::Pow;
use rug::Float;

use crate::error::{Error, Result};

/// The output formats the commands offer.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq)]
pub enum Format {
    #[default]
    Text,
    Json,
    Yaml,
    Latex,
}

impl fmt::Display for Format {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(match self {
            Format::Text => "text",
            Format::Json => "json",
            Format::Yaml => "yaml",
            Format::Latex => "latex",
        })
    }
}

/// The machine form of one verdict, shared by every report that judges
/// coefficients (`check`, `origin`): its name and, where they apply, the
/// difference (exact text and decimal), the agreeing digits and the sigmas.
#[derive(serde::Serialize)]
pub struct JsonVerdict {
    pub verdict: &'static str,
    /// supplied - predicted: exact text for exact verdicts.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub difference: Option<String>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub difference_value: Option<String>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub digits_agreeing: Option<u32>,
    /// |supplied - predicted| in units of a stated uncertainty.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub sigmas: Option<String>,
    /// |supplied - predicted| in units of the rounding bound of the written
    /// digits, when no uncertainty is stated.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub rounding_bounds: Option<String>,
}

/// A difference in units of its uncertainty, as the text reports say it;
/// `bound` names the rounding bound where no uncertainty was stated.
pub fn in_units_text(u: &crate::check::InUnits, digits: u32, bound: &str) -> String {
    match u {
        crate::check::InUnits::Sigmas(x) => format!("{} sigma", decimal(x, digits)),
        crate::check::InUnits::RoundingBounds(x) => {
            format!("{} times {bound}", decimal(x, digits))
        }
    }
}

impl JsonVerdict {
    /// A verdict that carries no details (not supplied, not testable, ...).
    pub fn named(verdict: &'static str) -> Self {
        JsonVerdict {
            verdict,
            difference: None,
            difference_value: None,
            digits_agreeing: None,
            sigmas: None,
            rounding_bounds: None,
        }
    }

    /// `exact` writes an exact difference in the report's style.
    pub fn of(
        v: &crate::check::Verdict,
        exact: impl Fn(&crate::exact::ring::Exact) -> String,
    ) -> Self {
        use crate::check::Verdict;
        let mut out = JsonVerdict::named(v.name());
        let in_units = match v {
            Verdict::DiffersExactly { difference, size } => {
                out.difference = Some(exact(difference));
                out.difference_value = Some(decimal(size, 20));
                None
            }
            Verdict::AgreesNumerically { digits, in_units } => {
                out.digits_agreeing = Some(*digits);
                in_units.as_ref()
            }
            Verdict::DiffersNumerically {
                difference,
                in_units,
                digits,
            } => {
                out.difference_value = Some(decimal(difference, 20));
                out.digits_agreeing = Some(*digits);
                in_units.as_ref()
            }
            _ => None,
        };
        match in_units {
            Some(crate::check::InUnits::Sigmas(x)) => out.sigmas = Some(decimal(x, 4)),
            Some(crate::check::InUnits::RoundingBounds(x)) => {
                out.rounding_bounds = Some(decimal(x, 4))
            }
            None => {}
        }
        out
    }
}

/// A report value as JSON (pretty, with a final newline) or YAML.
pub fn serialized<T: serde::Serialize>(value: &T, format: Format) -> Result<String> {
    match format {
        Format::Yaml => serde_yaml::to_string(value).map_err(|e| Error::io(e.to_string())),
        _ => serde_json::to_string_pretty(value)
            .map(|s| s + "\n")
            .map_err(|e| Error::io(e.to_string())),
    }
}

/// Bits of MPFR precision that carry `digits` decimal digits.
pub fn bits_for_digits(digits: u32) -> u32 {
    (f64::from(digits) * std::f64::consts::LOG2_10).ceil() as u32 + 8
}

/// A decimal string with `digits` significant digits: plain notation for
/// moderate exponents, scientific otherwise.
pub fn decimal(x: &Float, digits: u32) -> String {
    if x.is_zero() {
        return "0".to_string();
    }
    if !x.is_finite() {
        return x.to_string();
    }
    let (negative, mantissa, exp) = x.to_sign_string_exp(10, Some(digits.max(1) as usize));
    let exp = exp.unwrap_or(0);
    let sign = if negative { "-" } else { "" };
    // value = 0.mantissa * 10^exp
    let plain = if exp > 0 && exp as usize <= mantissa.len() {
        let (int, frac) = mantissa.split_at(exp as usize);
        if frac.is_empty() {
            int.to_string()
        } else {
            format!("{int}.{frac}")
        }
    } else if exp <= 0 && exp > -6 {
        format!("0.{}{}", "0".repeat((-exp) as usize), mantissa)
    } else {
        let (first, rest) = mantissa.split_at(1);
        let e = exp - 1;
        return if rest.is_empty() {
            format!("{sign}{first}e{e}")
        } else {
            format!("{sign}{first}.{rest}e{e}")
        };
    };
    format!("{sign}{plain}")
}

/// The decimal place (the power of ten) of the `nth` significant digit of
/// `x`, after rounding `x` to n digits, so that 0.000996 to two digits (0.0010)
/// has its second digit at 10^-4. None for zero and non-finite values.
pub fn digit_place(x: &Float, nth: u32) -> Option<i32> {
    if x.is_zero() || !x.is_finite() {
        return None;
    }
    let (_, _, exp) = x.to_sign_string_exp(10, Some(nth.max(1) as usize));
    // x = 0.d1d2... * 10^exp: the first digit stands at 10^(exp-1).
    exp.map(|e| e - nth as i32)
}

/// `x` rounded to a multiple of 10^place and written down to that place,
/// trailing zeros included: they are digits the rounding vouches for.
pub fn rounded_at(x: &Float, place: i32) -> String {
    let prec = x.prec().max(64) + 64;
    let unit = Float::with_val(prec, Float::with_val(prec, 10u32).pow(place));
    let m = Float::with_val(prec, x / &unit)
        .round()
        .to_integer()
        .unwrap_or_default();
    if m.is_zero() {
        return if (-6..0).contains(&place) {
            format!("0.{}", "0".repeat(place.unsigned_abs() as usize))
        } else {
            "0".to_string()
        };
    }
    let digits = m.to_string_radix(10).trim_start_matches('-').len() as u32;
    decimal(&(Float::with_val(prec, &m) * &unit), digits)
}

/// Greedy word wrap at `width` columns; every line ends with a newline.
pub fn wrap(text: &str, width: usize) -> String {
    let mut out = String::new();
    let mut line = String::new();
    for word in text.split_whitespace() {
        if !line.is_empty() && line.len() + 1 + word.len() > width {
            out.push_str(&line);
            out.push('\n');
            line.clear();
        }
        if !line.is_empty() {
            line.push(' ');
        }
        line.push_str(word);
    }
    if !line.is_empty() {
        out.push_str(&line);
        out.push('\n');
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn decimals() {
        let f = |v: f64| Float::with_val(64, v);
        assert_eq!(decimal(&f(4.0), 5), "4.0000");
        assert_eq!(decimal(&f(-13.15947), 4), "-13.16");
        assert_eq!(decimal(&f(0.00123), 3), "0.00123");
        assert_eq!(decimal(&f(1.5e30), 3), "1.50e30");
        assert_eq!(decimal(&f(-2.5e-9), 2), "-2.5e-9");
        assert_eq!(decimal(&f(0.0), 2), "0");
    }

    #[test]
    fn rounding_at_a_decimal_place() {
        let f = |v: &str| Float::with_val(128, Float::parse(v).unwrap());
        assert_eq!(digit_place(&f("0.000314"), 2), Some(-5));
        assert_eq!(digit_place(&f("0.000996"), 2), Some(-4));
        assert_eq!(digit_place(&f("7000"), 1), Some(3));
        assert_eq!(digit_place(&f("0"), 2), None);
        assert_eq!(rounded_at(&f("0.0037699"), -5), "0.00377");
        assert_eq!(rounded_at(&f("-1240.9"), -2), "-1240.90");
        assert_eq!(rounded_at(&f("123456"), 2), "1.235e5");
        assert_eq!(rounded_at(&f("0.004"), -2), "0.00");
        assert_eq!(rounded_at(&f("3e-40"), -31), "0");
    }

    #[test]
    fn wrapping() {
        assert_eq!(wrap("aa bb cc", 5), "aa bb\ncc\n");
        assert_eq!(wrap("", 5), "");
    }
}
