//! Numerical identification of a number: an integer relation
//! a_0 x + a_1 b_1 + ... + a_n b_n = 0 between the number x and a basis of
//! constants, found by PSLQ ([`crate::numeric::pslq`]) and solved for x, so
//! that x = -sum (a_i / a_0) b_i with rational coefficients. A relation found
//! this way holds to the digits given with digits to spare beyond what a
//! chance relation of its size needs; it is evidence, not a proof.
//!
//! The weight bases are stated in [`BASIS_STATEMENT`]: every product of even
//! powers of pi, odd zeta values and the irreducible multiple zeta values
//! [`IRREDUCIBLE_MZVS`] of one total weight.

use rug::float::Special;
use rug::ops::Pow;
use rug::{Float, Integer, Rational};

use crate::error::{Error, Result};
use crate::exact::ring::{EvenStyle, Exact, Notation};
use crate::input::catalogue::Catalogue;
use crate::input::expr::{self, Node};
use crate::kernel::WeightBases;
use crate::limits::{MAX_IDENTIFY_BASIS, MAX_IDENTIFY_DIGITS, MAX_IDENTIFY_WEIGHT};
use crate::numeric::evaluate::{evaluate, located, needs_numbers, number, written_digits};
use crate::numeric::evaluate::{Context, Settled};
use crate::numeric::pslq::{find_relation, Relation, RelationSearch};
use crate::numeric::working_bits;
use crate::quantity::exact_constant;

/// The multiple zeta values through weight 11 that the weight bases add to
/// the products of zeta values, as (weight, arguments); the choice is the
/// usual one of the MZV data mine (arXiv:0907.2557, recalled from memory).
pub const IRREDUCIBLE_MZVS: [(u32, &[u32]); 3] = [(8, &[5, 3]), (10, &[7, 3]), (11, &[3, 5, 3])];

/// What `--weight W` means, for reports and the README.
pub const BASIS_STATEMENT: &str = "Weight basis: every product of even powers of pi, odd zeta values \
and the multiple zeta values zeta(5,3) (weight 8), zeta(7,3) (weight 10) and zeta(3,5,3) (weight 11) \
of total weight W, with zeta(s1,...,sk) = sum over n1 > ... > nk >= 1 of n1^-s1 ... nk^-sk. Weight w \
has d_w elements, d_w = d_(w-2) + d_(w-3) from d_0 = 1, d_1 = 0, d_2 = 1 (1, 0, 1, 1, 1, 2, 2, 3, 4, 5, \
7, 9 for w = 0..11): the conjectured dimension of the weight-w multiple zeta values, a proven upper \
bound (Invent. Math. 149 (2002) 339, recalled from memory). So the basis spans weight w if its \
elements are linearly independent over Q, which is conjectured and which each run checks numerically to its digits.";

/// The weight basis in one line, for reports meant for people.
pub const BASIS_SUMMARY: &str =
    "weight basis: products of pi^2, odd zeta values and zeta(5,3), zeta(7,3), \
zeta(3,5,3); it spans its weight if the conjectured independence of its elements holds (README, \
\"Identifying numbers\")";

/// What to identify, and against what.
#[derive(Clone, Debug, Default)]
pub struct Request<'a> {
    /// A decimal, or an expression of the coefficient language.
    pub value: &'a str,
    /// Trusted digits: by default those written in a decimal; required for an
    /// expression.
    pub digits: Option<u32>,
    /// The weight basis of this weight.
    pub weight: Option<u32>,
    /// With `weight`: every lower weight too, down to the constant 1.
    pub with_lower: bool,
    /// Further basis elements, separated by `;`.
    pub basis: Option<&'a str>,
}

/// The outcome of an identification.
#[derive(Clone, Debug)]
pub struct Identification {
    /// The value as the user wrote it.
    pub value: String,
    /// The basis elements, as they print in the relation.
    pub basis: Vec<String>,
    /// Whether a weight basis was part of the basis (its statement applies).
    pub weight_basis: bool,
    /// The relation, when one was found and believed.
    pub found: Option<Found>,
    /// A relation that holds to the digits but is too large for them to tell
    /// from a chance one, as an equation: not an identification.
    pub candidate: Option<String>,
    /// |x - relation| of the found or candidate relation.
    pub residual: Option<Float>,
    /// No integer relation (a_0, ..., a_n) of Euclidean norm below this exists.
    pub bound: Float,
    /// Digits the search trusted.
    pub digits_used: u32,
    /// Digits beyond the relation's information content (the found or
    /// candidate relation).
    pub digits_to_spare: Option<i64>,
}

/// A believed relation, solved for the value.
#[derive(Clone, Debug)]
pub struct Found {
    /// The value as an expression of the coefficient language.
    pub expression: String,
    /// The coefficient of each basis element.
    pub coefficients: Vec<Rational>,
    /// Significant digits to which the expression, evaluated again from its
    /// text, agrees with the value.
    pub agreeing_digits: u32,
}

/// One basis element: its text, its exact form when it is in the exact ring
/// (so the relation prints through the ring), and its value.
struct Element {
    text: String,
    /// A sum, difference or negation: bracketed behind a coefficient.
    compound: bool,
    exact: Option<Exact>,
    value: Float,
}

/// Identifies `request.value` against the requested basis.
///
/// Errors: unusable value, digits or basis (kinds Parse, Input, Range),
/// among them a linearly dependent basis, which names its relation.
pub fn identify(request: &Request<'_>, catalogue: &Catalogue) -> Result<Identification> {
    let (value, digits) = read_value(request, catalogue)?;
    let basis = read_basis(request, value.prec())?;
    search(
        request.value.trim().to_string(),
        &value,
        digits,
        &basis,
        request.weight.is_some(),
    )
}

/// Identifies a computed number, trusted to `digits` significant digits,
/// against the elements of `basis` (expressions separated by `;`); `label`
/// is how the result names the value.
///
/// Errors: as [`identify`], and a zero value (kind Input).
pub fn identify_number(
    value: &Float,
    digits: u32,
    label: &str,
    basis: &str,
) -> Result<Identification> {
    check_digits(digits)?;
    if value.is_zero() {
        return Err(Error::input(format!(
            "{label} is zero: there is nothing to identify"
        )));
    }
    let value = Float::with_val(working_bits(digits), value);
    let request = Request {
        basis: Some(basis),
        ..Request::default()
    };
    let basis = read_basis(&request, value.prec())?;
    search(label.to_string(), &value, digits, &basis, false)
}

/// The search behind both entry points: the basis must be independent, then
/// a relation with the value is sought, believed or refused.
fn search(
    label: String,
    value: &Float,
    digits: u32,
    basis: &[Element],
    weight_basis: bool,
) -> Result<Identification> {
    // The digits alone decide how far a search can vouch for its answer.
    let unbounded = Float::with_val(64, Special::Infinity);
    if basis.len() >= 2 {
        let values: Vec<Float> = basis.iter().map(|b| b.value.clone()).collect();
        if let Some(r) = find_relation(&values, digits, &unbounded)?.relation {
            return Err(dependent(basis, &r.coefficients, digits));
        }
    }
    let mut values = vec![value.clone()];
    values.extend(basis.iter().map(|b| b.value.clone()));
    let RelationSearch {
        relation,
        refused,
        norm_bound,
        digits_used,
        ..
    } = find_relation(&values, digits, &unbounded)?;
    let mut result = Identification {
        value: label,
        basis: basis.iter().map(|b| b.text.clone()).collect(),
        weight_basis,
        found: None,
        candidate: None,
        residual: None,
        bound: norm_bound,
        digits_used,
        digits_to_spare: None,
    };
    if let Some(r) = relation {
        if r.coefficients[0] == 0 {
            return Err(dependent(basis, &r.coefficients[1..], digits_used));
        }
        let (expression, coefficients) = solved(basis, &r.coefficients);
        let agreeing_digits = verify(&expression, value, basis, &coefficients, digits_used)?;
        result.residual = Some(residual(&r));
        result.digits_to_spare = Some(r.digits_to_spare);
        result.found = Some(Found {
            expression,
            coefficients,
            agreeing_digits,
        });
    } else if let Some(r) = refused {
        result.candidate = Some(if r.coefficients[0] == 0 {
            format!("{} = 0", terms(basis, &to_rationals(&r.coefficients[1..])))
        } else {
            format!("{} = {}", result.value, solved(basis, &r.coefficients).0)
        });
        result.residual = Some(residual(&r));
        result.digits_to_spare = Some(r.digits_to_spare);
    }
    Ok(result)
}

/// The value at the working precision of its trusted digits.
fn read_value(request: &Request<'_>, catalogue: &Catalogue) -> Result<(Float, u32)> {
    let text = request.value;
    let e = expr::parse(&catalogue.mask_hyphens(text), "VALUE", None)?;
    let (negative, literal) = match &e.node {
        Node::Neg(inner) => (true, &inner.node),
        other => (false, other),
    };
    let (value, digits) = if let Node::Decimal {
        value,
        uncertainty,
        text: written,
    } = literal
    {
        if uncertainty.is_some() {
            return Err(Error::input(format!(
                "VALUE {} carries an uncertainty: give only the digits you trust, without it",
                text.trim()
            )));
        }
        let available = written_digits(written);
        let digits = request.digits.unwrap_or(available);
        if digits > available {
            return Err(Error::input(format!(
                "VALUE {} has {available} significant digits; --digits {digits} asks for more",
                text.trim()
            )));
        }
        check_digits(digits)?;
        let v = Float::with_val(working_bits(digits), value);
        (if negative { -v } else { v }, digits)
    } else {
        let digits = request.digits.ok_or_else(|| {
            Error::input(format!(
                "VALUE {} is an expression: say with --digits how many digits to evaluate it to",
                text.trim()
            ))
        })?;
        check_digits(digits)?;
        let prec = working_bits(digits);
        match number(text, catalogue, digits)? {
            Settled::Exact(v) => (Float::with_val(prec, v), digits),
            Settled::Uncertain(est) => {
                let supported = Float::with_val(64, &est.value / &est.error).abs().log10();
                if supported < digits {
                    return Err(Error::input(format!(
                        "VALUE {} carries an uncertainty that leaves fewer than the {digits} digits asked for",
                        text.trim()
                    )));
                }
                (Float::with_val(prec, &est.value), digits)
            }
            Settled::Zero { .. } => (Float::new(prec), digits),
        }
    };
    if value.is_zero() {
        return Err(Error::input(format!(
            "VALUE {} is zero: there is nothing to identify",
            text.trim()
        )));
    }
    Ok((value, digits))
}

fn check_digits(digits: u32) -> Result<()> {
    if (1..=MAX_IDENTIFY_DIGITS).contains(&digits) {
        Ok(())
    } else {
        Err(Error::range(format!(
            "--digits {digits} is out of range: 1 to {MAX_IDENTIFY_DIGITS}"
        )))
    }
}

/// The weight basis and the user's elements, without repeats.
fn read_basis(request: &Request<'_>, prec: u32) -> Result<Vec<Element>> {
    let mut basis: Vec<Element> = Vec::new();
    if let Some(w) = request.weight {
        if w > MAX_IDENTIFY_WEIGHT {
            return Err(Error::range(format!(
                "--weight {w} is out of range: 0 to {MAX_IDENTIFY_WEIGHT}; beyond weight {MAX_IDENTIFY_WEIGHT} the \
                 multiple zeta values need basis elements this tool does not state (give them with --basis)"
            )));
        }
        let lowest = if request.with_lower { 0 } else { w };
        for weight in lowest..=w {
            basis.extend(weight_basis(weight, prec)?);
        }
    }
    if let Some(list) = request.basis {
        for (place, piece) in list.split(';').enumerate() {
            if piece.trim().is_empty() {
                continue;
            }
            let element = user_element(piece, place + 1, prec)?;
            let repeat = basis
                .iter()
                .any(|b| b.text == element.text || (b.exact.is_some() && b.exact == element.exact));
            if !repeat {
                basis.push(element);
            }
        }
    }
    if basis.is_empty() {
        return Err(Error::input(
            "the basis is empty (weight 1 has no elements): add --with-lower or --basis",
        ));
    }
    if basis.len() > MAX_IDENTIFY_BASIS {
        return Err(Error::range(format!(
            "the basis has {} elements; at most {MAX_IDENTIFY_BASIS} are searched at once",
            basis.len()
        )));
    }
    Ok(basis)
}

/// The elements of weight `w`: products of zeta values first (pi^2 counts as
/// the even part), then each irreducible multiple zeta value times the
/// products of the remaining weight.
fn weight_basis(w: u32, prec: u32) -> Result<Vec<Element>> {
    let mut out = Vec::new();
    for m in products(w) {
        out.push(Element {
            text: m.format(EvenStyle::Pi, Notation::Text),
            compound: false,
            value: m.evaluate(prec)?,
            exact: Some(m),
        });
    }
    for (weight, args) in IRREDUCIBLE_MZVS.iter().filter(|(k, _)| *k <= w) {
        let mzv = crate::numeric::mzv::mzv(args, prec)?;
        let name = format!(
            "zeta({})",
            args.iter()
                .map(u32::to_string)
                .collect::<Vec<_>>()
                .join(",")
        );
        for m in products(w - weight) {
            let text = if m == Exact::one() {
                name.clone()
            } else {
                format!("{}*{name}", m.format(EvenStyle::Pi, Notation::Text))
            };
            out.push(Element {
                text,
                compound: false,
                value: m.evaluate(prec)? * &mzv,
                exact: None,
            });
        }
    }
    Ok(out)
}

/// The products of even powers of pi and odd zeta values of weight `w`.
fn products(w: u32) -> Vec<Exact> {
    let bases = WeightBases::new(w as usize);
    (0..bases.len(w as usize))
        .map(|k| Exact::term(Rational::from(1), bases.monomial(w as usize, k)))
        .collect()
}

/// One `--basis` element: parsed, evaluated exactly (no decimals) and, when it
/// lies in the exact ring, expanded into it.
fn user_element(piece: &str, place: usize, prec: u32) -> Result<Element> {
    let origin = format!("--basis element {place}");
    let e = expr::parse(piece, &origin, None)?;
    let mzv = |s: &[u32], p: u32| crate::numeric::mzv::mzv(s, p);
    let mut ctx = Context::new(prec + 64);
    ctx.mzv = Some(&mzv);
    let estimate = evaluate(&e, &mut ctx).map_err(|f| located(piece, &origin, None, f))?;
    let text = e.to_string();
    if !estimate.is_exact() {
        return Err(Error::input(format!(
            "{origin} `{text}` holds a decimal: basis elements must be exact constants"
        )));
    }
    if estimate.value.is_zero() {
        return Err(Error::input(format!(
            "{origin} `{text}` is zero: it is a relation by itself; leave it out"
        )));
    }
    let exact = if needs_numbers(&e) {
        None
    } else {
        // Constants outside the exact ring (3^(1/2)) take part by value;
        // the relation then prints them as written.
        exact_constant(piece, &origin, None, &e).ok()
    };
    Ok(Element {
        compound: matches!(e.node, Node::Add(..) | Node::Sub(..) | Node::Neg(_)),
        text,
        exact,
        value: Float::with_val(prec, &estimate.value),
    })
}

fn to_rationals(coefficients: &[Integer]) -> Vec<Rational> {
    coefficients.iter().map(Rational::from).collect()
}

/// The relation solved for the value: its text and the coefficients
/// -a_i / a_0. Exact elements are summed in the ring, so that the text is
/// the ring's canonical form; the others follow term by term.
fn solved(basis: &[Element], relation: &[Integer]) -> (String, Vec<Rational>) {
    let a0 = &relation[0];
    let coefficients: Vec<Rational> = relation[1..]
        .iter()
        .map(|a| -Rational::from((a.clone(), a0.clone())))
        .collect();
    let mut exact = Exact::zero();
    let mut rest = vec![Rational::new(); basis.len()];
    for ((b, c), r) in basis.iter().zip(&coefficients).zip(rest.iter_mut()) {
        match &b.exact {
            Some(x) => exact += &x.scale(c),
            None => *r = c.clone(),
        }
    }
    let tail = terms(basis, &rest);
    let text = match (exact.is_zero(), tail.is_empty()) {
        (true, _) => tail,
        (false, true) => exact.format(EvenStyle::Pi, Notation::Text),
        (false, false) => {
            let head = exact.format(EvenStyle::Pi, Notation::Text);
            match tail.strip_prefix('-') {
                Some(negative) => format!("{head} - {negative}"),
                None => format!("{head} + {tail}"),
            }
        }
    };
    (text, coefficients)
}

/// sum c_i b_i term by term, zero terms left out.
fn terms(basis: &[Element], coefficients: &[Rational]) -> String {
    let mut out = String::new();
    for (b, c) in basis.iter().zip(coefficients) {
        if *c == 0 {
            continue;
        }
        let sign = match (out.is_empty(), *c < 0) {
            (true, true) => "-",
            (true, false) => "",
            (false, true) => " - ",
            (false, false) => " + ",
        };
        let text = if b.compound {
            format!("({})", b.text)
        } else {
            b.text.clone()
        };
        let magnitude = Rational::from(c.abs_ref());
        if magnitude == 1 {
            out.push_str(&format!("{sign}{text}"));
        } else {
            out.push_str(&format!("{sign}{magnitude}*{text}"));
        }
    }
    out
}

/// |x - relation| = |sum a_i x_i| / |a_0|.
fn residual(r: &Relation) -> Float {
    let a0 = Float::with_val(r.residual.prec(), &r.coefficients[0]).abs();
    if a0.is_zero() {
        r.residual.clone()
    } else {
        Float::with_val(r.residual.prec(), &r.residual / &a0)
    }
}

/// Evaluates the printed relation again from its text and checks that it
/// gives the value to the search's tolerance, 10^-(d - 2) of the sizes of
/// its terms; returns the significant digits that agree.
fn verify(
    text: &str,
    value: &Float,
    basis: &[Element],
    coefficients: &[Rational],
    digits: u32,
) -> Result<u32> {
    let prec = value.prec();
    let e = expr::parse(text, "<relation>", None)?;
    let mzv = |s: &[u32], p: u32| crate::numeric::mzv::mzv(s, p);
    let mut ctx = Context::new(prec);
    ctx.mzv = Some(&mzv);
    let back = evaluate(&e, &mut ctx).map_err(|f| located(text, "<relation>", None, f))?;
    let difference = Float::with_val(prec, &back.value - value).abs();
    let mut size = Float::with_val(prec, value.abs_ref());
    for (b, c) in basis.iter().zip(coefficients) {
        size += Float::with_val(prec, &b.value * c).abs();
    }
    let tolerance = size * Float::with_val(prec, 10u32).pow(-(i64::from(digits) - 2) as i32);
    if difference > tolerance {
        return Err(Error::numeric(format!(
            "the relation {text} evaluates to {} and misses the value by more than its tolerance",
            back.value.to_f64()
        )));
    }
    if difference.is_zero() {
        return Ok(digits);
    }
    let agreeing = Float::with_val(64, value / &difference)
        .abs()
        .log10()
        .to_f64()
        .floor();
    Ok((agreeing.max(0.0) as u32).min(digits))
}

/// The error for a basis with a relation among its own elements.
fn dependent(basis: &[Element], relation: &[Integer], digits: u32) -> Error {
    let involved: Vec<String> = basis
        .iter()
        .zip(relation)
        .filter(|(_, a)| **a != 0)
        .map(|(b, _)| format!("`{}`", b.text))
        .collect();
    Error::input(format!(
        "the basis is linearly dependent: {} = 0 holds to {digits} digits; leave out one of {}",
        terms(basis, &to_rationals(relation)),
        involved.join(", ")
    ))
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The weight bases have the sizes the dimension recursion
    /// d_w = d_(w-2) + d_(w-3) gives (the conjecture the statement cites).
    #[test]
    fn weight_bases_have_the_conjectured_dimensions() {
        let mut d = vec![1usize, 0, 1];
        for w in 3..=MAX_IDENTIFY_WEIGHT as usize {
            d.push(d[w - 2] + d[w - 3]);
        }
        for (w, expected) in d.iter().enumerate() {
            assert_eq!(
                weight_basis(w as u32, 128).unwrap().len(),
                *expected,
                "weight {w}"
            );
        }
    }

    /// Conjecturally no rational relation holds among the elements of one
    /// weight; at 150 digits PSLQ must find none with small coefficients at
    /// weights 8, 10 and 11, where the multiple zeta values enter.
    #[test]
    fn the_stated_bases_show_no_relation() {
        for w in [8, 10, 11] {
            let values: Vec<Float> = weight_basis(w, working_bits(150))
                .unwrap()
                .into_iter()
                .map(|b| b.value)
                .collect();
            let search =
                find_relation(&values, 150, &Float::with_val(64, Special::Infinity)).unwrap();
            assert!(
                search.relation.is_none(),
                "weight {w}: {:?}",
                search.relation
            );
            assert!(
                search.norm_bound > 1e6,
                "weight {w}: bound {}",
                search.norm_bound
            );
        }
    }
}
