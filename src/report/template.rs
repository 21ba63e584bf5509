//! The commented series file that `loopwise init` writes: every key of the
//! format explained where it stands, and example entries that are the
//! prediction's own first coefficients, so that the untouched file passes
//! `check` and shows each way of writing a coefficient.

use crate::error::{Error, Result};
use crate::exact::coupling::Coupling;
use crate::exact::powerseries::Series;
use crate::exact::ring::{Constants, EvenStyle, Exact, Notation};
use crate::input::catalogue::{looks_like_name, Entry, Status};
use crate::numeric::bits_for_digits;

use super::{decimal, digit_place, wrap};

/// The loop orders of the example entries: two exact, two numerical.
pub const TEMPLATE_LOOPS: u32 = 4;

/// Significant digits of the example with the uncertainty in brackets.
const BRACKET_DIGITS: u32 = 10;
/// Significant digits of the example with the uncertainty as its own key.
const KEYED_DIGITS: u32 = 8;

/// What the template is written for.
pub struct Template<'a> {
    /// The quantity as the user named it (a catalogue name or a formula).
    pub quantity: &'a str,
    /// Its catalogue entry, or the entry describing a formula.
    pub entry: Option<&'a Entry>,
    /// The convention of the example coefficients.
    pub coupling: Coupling,
    /// The prediction in g^2, through at least [`TEMPLATE_LOOPS`] loops.
    pub series: &'a Series,
}

const HEADER: &str = "\
# A loopwise series file: the loop coefficients of one quantity, in one
# coupling convention. `loopwise check FILE` compares them order by order
# with the prediction named below. Written by `loopwise init`.
#
# EXAMPLE ENTRIES: the entries under `orders` are NOT results. They are
# loopwise's own prediction (its first loop coefficients), copied here
# so that this file passes `loopwise check` as it stands and shows every way
# of writing a coefficient. Replace them with your own coefficients, and the
# placeholders under `about` with your own notes. A key not described here
# is an error.
";

const PREDICTION: &str = "
# prediction: what your coefficients are compared with. A catalogue name
# (`loopwise list` shows them) or a formula in the coefficient language, in
# double quotes: \"Gamma(pi/6)\", \"Delta(c2=1/3)\",
# \"-zeta(2)/2*Gamma(pi/4) + Delta(0)/4\".
";

const COUPLING: &str = "
# coupling (required): the expansion parameter your coefficients multiply.
#   g2      loop order L multiplies g^(2L), with g^2 = lambda/(16 pi^2)
#   a       loop order L multiplies a^L, with a = lambda/(8 pi^2) = 2 g^2
#   lambda  loop order L multiplies lambda^L, lambda = g_YM^2 N_c ('t Hooft)
# The same series in another convention differs by 2^L or (16 pi^2)^L at
# loop order L; when every order is off by exactly that, `check` says so.
";

const ABOUT: &str = "
# about (optional): free-form notes on where the numbers come from, any keys
# you like, nested or not. Reports echo them; loopwise never reads meaning
# into them. The three below are PLACEHOLDERS.
about:
  group: YOUR GROUP (placeholder)
  code: YOUR CODE AND ITS VERSION (placeholder)
  date: YYYY-MM-DD (placeholder)
";

const ORDERS: &str = "
# orders (required): one entry per loop order you have, loop 1 to 200, each
# order at most once, in any order, gaps allowed (a gap is reported as
# `not supplied`). An entry has `loop` and at least one of:
#   exact: \"...\"  an exact coefficient: rationals, pi, zeta(n) (also written
#                 zeta3, z3, Zeta[3], ζ(3)), sums and products; compared
#                 exactly, after even zeta values are turned into powers of pi
#   value: ...    a decimal number, compared numerically. Its uncertainty,
#                 read as one standard deviation (agreement means within 3 of
#                 them), goes in brackets after the last digits it affects,
#                 \"95.2444(3)\" meaning 95.2444 +- 0.0003 (also \"95.2444 ± 0.0003\"),
#                 or as a key of its own, `uncertainty: 0.0003`, beside a plain
#                 number. Without one, the written digits are read as rounded
#                 (agreement within half a unit of the last digit). Unquoted
#                 numbers keep every digit you write, never passing through a
#                 binary float.
# With both `exact` and `value`, the two must also agree with each other.
#   label: \"...\" optional free text, shown beside the verdict.
# (Files for `loopwise origin`, the six-gluon amplitude at the origin, take
# two more keys, `normalisation` and `symbols`; see the README.)
orders:
";

impl Template<'_> {
    /// The whole file. Coefficients that hold a symbol (a symbolic tilt)
    /// have no decimal value to show, so such a quantity is refused.
    pub fn render(&self) -> Result<String> {
        let series = match self.coupling {
            Coupling::G2 => self.series.truncate(TEMPLATE_LOOPS as usize),
            c => self.series.truncate(TEMPLATE_LOOPS as usize).in_coupling(c),
        };
        let coeffs = series.coeffs();
        if coeffs.len() <= TEMPLATE_LOOPS as usize {
            return Err(Error::input(format!(
                "the prediction `{}` reaches only {} loops, the template shows {TEMPLATE_LOOPS}",
                self.quantity,
                coeffs.len().saturating_sub(1)
            )));
        }
        if let Some(symbol) = coeffs
            .iter()
            .flat_map(|c| c.terms())
            .find_map(|(m, _)| m.symbols().first())
        {
            return Err(Error::input(format!(
                "`{}` keeps the symbol `{}` in its coefficients, and the template's examples are \
                 numbers: give the tilt a value, as in Gamma(c2=1/3) or Gamma(pi/6)",
                self.quantity, symbol.0
            )));
        }
        let mut out = String::from(HEADER);
        out.push_str(PREDICTION);
        if let Some(entry) = self.entry {
            out.push_str(&self.status_comment(entry));
        }
        out.push_str(&format!("prediction: {}\n", yaml_scalar(self.quantity)));
        out.push_str(COUPLING);
        out.push_str(&format!("coupling: {}\n", self.coupling.name()));
        out.push_str(ABOUT);
        out.push_str(ORDERS);
        let mut constants = Constants::new();
        for (l, c) in coeffs.iter().enumerate().skip(1) {
            out.push_str(&example(l as u32, c, &mut constants)?);
        }
        Ok(out)
    }

    /// The prediction's status, as a comment: a conjecture is said to be one.
    fn status_comment(&self, entry: &Entry) -> String {
        let what = if looks_like_name(self.quantity) {
            format!("`{}` is {}", entry.name, entry.definition)
        } else {
            format!("`{}`", self.quantity)
        };
        let text = match entry.status {
            Status::Established => format!("{what}: established."),
            Status::Conjecture => format!(
                "{what}: CAUTION, a conjecture of the literature, not a theorem{}.",
                references(entry)
            ),
        };
        comment(&text)
    }
}

fn references(entry: &Entry) -> String {
    if entry.references.is_empty() {
        String::new()
    } else {
        format!(" ({})", entry.references.join(", "))
    }
}

/// Text as `#` comment lines of at most 78 characters.
fn comment(text: &str) -> String {
    wrap(text, 76).lines().map(|l| format!("# {l}\n")).collect()
}

/// A catalogue name stays bare; a formula is double-quoted, since YAML would
/// read some of its characters (`:`, `#`, a leading `-`) otherwise.
fn yaml_scalar(text: &str) -> String {
    if looks_like_name(text) {
        text.to_string()
    } else {
        format!("\"{}\"", text.replace('\\', "\\\\").replace('"', "\\\""))
    }
}

/// The example entry of loop order `l`: exact at one and two loops, a value
/// with its uncertainty in brackets at three, one with an `uncertainty` key
/// at four. The uncertainty is 3 units of the last written digit, so the
/// rounded value agrees with the prediction (it is within half a unit).
fn example(l: u32, c: &Exact, constants: &mut Constants) -> Result<String> {
    let exact = c.format(EvenStyle::Zeta, Notation::Text);
    let head = format!("  - loop: {l}\n");
    Ok(match l {
        1 | 2 => format!(
            "  # EXAMPLE (the prediction itself): an exact coefficient\n{head}    exact: \"{exact}\"\n"
        ),
        3 => {
            let v = c.evaluate_with(bits_for_digits(BRACKET_DIGITS + 10), constants)?;
            let rounded = decimal(&v, BRACKET_DIGITS);
            format!(
                "  # EXAMPLE (the prediction, {exact}, rounded): a value with its\n  \
                 # uncertainty in brackets, 3 units of the last digit\n{head}    value: \"{}\"\n    \
                 label: \"example entry, replace it\"\n",
                bracketed(&rounded, 3)
            )
        }
        _ => {
            let v = c.evaluate_with(bits_for_digits(KEYED_DIGITS + 10), constants)?;
            let rounded = decimal(&v, KEYED_DIGITS);
            let place = digit_place(&v, KEYED_DIGITS).unwrap_or(0);
            format!(
                "  # EXAMPLE (the prediction, rounded): a value with the uncertainty\n  \
                 # as its own key, 3 units of the last digit\n{head}    value: {rounded}\n    \
                 uncertainty: {}\n",
                units_at(3, place)
            )
        }
    })
}

/// `95.24444457` with 3 in its last digit: `95.24444457(3)`; in scientific
/// form the bracket goes before the exponent, `9.524444457(3)e-9`.
fn bracketed(rounded: &str, units: u32) -> String {
    match rounded.split_once('e') {
        Some((mantissa, exponent)) => format!("{mantissa}({units})e{exponent}"),
        None => format!("{rounded}({units})"),
    }
}

/// `units` times 10^place as a plain decimal where that stays short.
fn units_at(units: u32, place: i32) -> String {
    match place {
        0.. if place <= 6 => format!("{units}{}", "0".repeat(place as usize)),
        -6..=-1 => format!("0.{}{units}", "0".repeat((-place - 1) as usize)),
        _ => format!("{units}e{place}"),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn uncertainties_are_written_at_their_place() {
        assert_eq!(units_at(3, 0), "3");
        assert_eq!(units_at(3, 2), "300");
        assert_eq!(units_at(3, -1), "0.3");
        assert_eq!(units_at(3, -5), "0.00003");
        assert_eq!(units_at(3, -9), "3e-9");
        assert_eq!(units_at(3, 8), "3e8");
        assert_eq!(bracketed("95.24444457", 3), "95.24444457(3)");
        assert_eq!(bracketed("-9.524444457e-9", 3), "-9.524444457(3)e-9");
    }
}
