//! The report of `identify`: the relation found, as an expression that
//! pastes back into the coefficient language, with the digits it used and
//! had to spare, its residual and PSLQ's bound; or why none was found, with
//! a refused candidate marked as one the digits cannot confirm. Always with
//! the caution that this is numerical identification, not a proof.

use serde::Serialize;

use super::{decimal, wrap, DataFormat};
use crate::error::Result;
use crate::numeric::pslq::MIN_SPARE_DIGITS;
use crate::quantity::identify::{Identification, BASIS_STATEMENT, BASIS_SUMMARY};

/// The caution every identification carries.
pub const CAUTION: &str =
    "numerical identification, not a proof: the relation holds to the digits \
used, with digits to spare beyond what a relation of its size would need to hold by chance";

#[derive(Serialize)]
struct JsonReport<'a> {
    value: &'a str,
    found: bool,
    relation: Option<&'a str>,
    /// The rational coefficient of each basis element in the relation.
    coefficients: Option<Vec<String>>,
    /// A relation the digits cannot confirm, as an equation.
    candidate: Option<&'a str>,
    residual: Option<String>,
    bound: String,
    digits_used: u32,
    digits_to_spare: Option<i64>,
    /// Digits to which the relation, evaluated again, agrees with the value.
    agreeing_digits: Option<u32>,
    basis: &'a [String],
    basis_statement: Option<&'static str>,
    caution: &'static str,
}

pub fn render(r: &Identification, format: DataFormat) -> Result<String> {
    match format {
        DataFormat::Text => Ok(text(r)),
        DataFormat::Json | DataFormat::Yaml => super::serialized(&json(r), format),
    }
}

fn json(r: &Identification) -> JsonReport<'_> {
    JsonReport {
        value: &r.value,
        found: r.found.is_some(),
        relation: r.found.as_ref().map(|f| f.expression.as_str()),
        coefficients: r
            .found
            .as_ref()
            .map(|f| f.coefficients.iter().map(ToString::to_string).collect()),
        candidate: r.candidate.as_deref(),
        residual: r.residual.as_ref().map(|x| decimal(x, 3)),
        bound: decimal(&r.bound, 3),
        digits_used: r.digits_used,
        digits_to_spare: r.digits_to_spare,
        agreeing_digits: r.found.as_ref().map(|f| f.agreeing_digits),
        basis: &r.basis,
        basis_statement: r.weight_basis.then_some(BASIS_STATEMENT),
        caution: CAUTION,
    }
}

fn text(r: &Identification) -> String {
    let mut out = String::new();
    match &r.found {
        Some(f) => {
            out.push_str(&format!("{} = {}\n", r.value, f.expression));
            out.push_str(&format!(
                "found by PSLQ at {} digits, {} to spare; residual |value - relation| {}; the relation, \
                 evaluated again, agrees to {} digits\n",
                r.digits_used,
                r.digits_to_spare.unwrap_or(0),
                r.residual.as_ref().map_or("0".into(), |x| decimal(x, 3)),
                f.agreeing_digits
            ));
        }
        None => {
            out.push_str(&format!(
                "{}: no relation found with this basis at {} digits\n",
                r.value, r.digits_used
            ));
            if let Some(c) = &r.candidate {
                out.push_str(&format!(
                    "a candidate that the digits cannot confirm ({} digits to spare, {MIN_SPARE_DIGITS} needed): {c}\n",
                    r.digits_to_spare.unwrap_or(0)
                ));
            }
        }
    }
    if r.bound <= 1 {
        out.push_str(
            "the digits are too few to exclude any relation with this basis: give more digits or fewer elements\n",
        );
    } else {
        out.push_str(&format!(
            "no integer relation among the value and the basis has coefficients of Euclidean norm below {} (PSLQ's bound)\n",
            decimal(&r.bound, 3)
        ));
    }
    out.push_str(&wrap(
        &format!("basis ({}): {}", r.basis.len(), r.basis.join(", ")),
        100,
    ));
    if r.weight_basis {
        out.push_str(&wrap(BASIS_SUMMARY, 100));
    }
    out.push_str(&wrap(CAUTION, 100));
    out
}
