//! Reports: computed values in, text out. Every report is a plain value that
//! printers turn into a readable table (default), JSON or YAML for pipelines,
//! or LaTeX for papers; nothing here computes physics.

pub mod cas;
pub mod check;
pub mod decimal;
pub mod expansion;
pub mod figure;
pub mod fit;
pub mod identify;
pub mod latex;
pub mod origin;
pub mod strong;
pub mod template;
pub mod values;

pub use decimal::{decimal, digit_place, rounded_at};

use std::fmt;

use crate::error::{Error, Result};

/// The formats every report offers: a readable table, or JSON or YAML for
/// pipelines (the same content either way).
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq)]
pub enum DataFormat {
    #[default]
    Text,
    Json,
    Yaml,
}

/// The formats of `expand`, whose exact coefficients also go into papers
/// and computer-algebra sessions: the data formats, a LaTeX table, and one
/// Mathematica or Maple expression ([`cas`]). Only renderers that can write every
/// variant take this type, so no format is refused at run time.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq)]
pub enum Format {
    #[default]
    Text,
    Json,
    Yaml,
    Latex,
    Mathematica,
    Maple,
}

impl From<DataFormat> for Format {
    fn from(f: DataFormat) -> Self {
        match f {
            DataFormat::Text => Format::Text,
            DataFormat::Json => Format::Json,
            DataFormat::Yaml => Format::Yaml,
        }
    }
}

impl fmt::Display for Format {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(match self {
            Format::Text => "text",
            Format::Json => "json",
            Format::Yaml => "yaml",
            Format::Latex => "latex",
            Format::Mathematica => "mathematica",
            Format::Maple => "maple",
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

/// A failed write of a report: a reader that closed the pipe (`| head`) has
/// read all it wanted, which the binary treats as success.
pub fn output_error(e: std::io::Error) -> Error {
    if e.kind() == std::io::ErrorKind::BrokenPipe {
        Error::closed("standard output was closed")
    } else {
        Error::io(format!("cannot write to standard output: {e}"))
    }
}

/// A report value as JSON (pretty, with a final newline) or YAML.
pub fn serialized<T: serde::Serialize>(value: &T, format: impl Into<Format>) -> Result<String> {
    match format.into() {
        Format::Yaml => serde_yaml::to_string(value).map_err(|e| Error::io(e.to_string())),
        _ => serde_json::to_string_pretty(value)
            .map(|s| s + "\n")
            .map_err(|e| Error::io(e.to_string())),
    }
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
    fn wrapping() {
        assert_eq!(wrap("aa bb cc", 5), "aa bb\ncc\n");
        assert_eq!(wrap("", 5), "");
    }
}
