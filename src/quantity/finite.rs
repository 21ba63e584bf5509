//! Predictions as functions of the coupling: a catalogue entry or formula
//! evaluated at finite g with an error estimate (through the numerical
//! engine), its strong-coupling expansion, its weak-coupling series summed
//! to chosen orders, Padé approximants of that series, and the radius of
//! convergence the exact coefficients suggest.

use std::collections::HashMap;

use rug::Float;

use crate::error::{Error, Result};
use crate::exact::powerseries::Series;
use crate::input::expr::{self, Angle, Expr, Functional, Node};

use crate::numeric::convergence::{self, Pade, RadiusEstimate};
use crate::numeric::evaluate::{self, Context};
use crate::numeric::Estimate;
use crate::numeric::{self as engine};
use crate::quantity::{Quantity, COUPLING};

/// Bits for `digits` decimal digits plus guard bits.
fn bits(digits: u32) -> u32 {
    crate::numeric::bits_for_digits(digits) + 64
}

/// cos^2 of a functional's tilt, numerically; any real angle is accepted.
fn cos2_of(angle: &Angle, q: &Quantity, prec: u32) -> Result<Float> {
    let fail = |f: (expr::Span, String)| q.error_at(f.0, &f.1);
    match angle {
        Angle::SymbolicCos2 => Err(Error::input(format!(
            "{}: the symbolic tilt c2 has no value at finite coupling; give an angle or c2=VALUE",
            q.label
        ))),
        Angle::Cos2(e) => {
            let v = evaluate::evaluate(e, &mut Context::new(prec)).map_err(fail)?;
            if v.value < 0 || v.value > 1 {
                return Err(Error::range(format!(
                    "{}: c2 = {} is outside [0, 1]",
                    q.label,
                    v.value.to_f64()
                )));
            }
            Ok(v.value)
        }
        Angle::Radians(e) => {
            let v = evaluate::evaluate(e, &mut Context::new(prec)).map_err(fail)?;
            Ok(v.value.cos().square())
        }
    }
}

/// The distinct functionals of a formula, with their tilts as c2 values.
fn functionals(q: &Quantity, prec: u32) -> Result<Vec<(Functional, Angle, Float)>> {
    let mut out: Vec<(Functional, Angle, Float)> = Vec::new();
    let mut found = Vec::new();
    collect(&q.expr, &mut found);
    for (kind, angle) in found {
        let f = kind;
        if !out.iter().any(|(g, a, _)| *g == f && *a == angle) {
            let c2 = cos2_of(&angle, q, prec)?;
            out.push((f, angle, c2));
        }
    }
    Ok(out)
}

/// Whether the quantity's formula contains the functional `f`.
pub fn uses(q: &Quantity, f: Functional) -> bool {
    let mut found = Vec::new();
    collect(&q.expr, &mut found);
    found.iter().any(|(k, _)| *k == f)
}

fn collect(e: &Expr, out: &mut Vec<(Functional, Angle)>) {
    match &e.node {
        Node::Functional { kind, angle } => out.push((*kind, angle.clone())),
        Node::Log(a) | Node::Neg(a) => collect(a, out),
        Node::Add(a, b) | Node::Sub(a, b) | Node::Mul(a, b) | Node::Div(a, b) | Node::Pow(a, b) => {
            collect(a, out);
            collect(b, out);
        }
        _ => {}
    }
}

/// The quantity at each coupling, to about `digits` significant digits, with
/// the error estimate of the numerical engine carried through the formula.
/// `progress` hears (points done, points in all).
pub fn values(
    q: &Quantity,
    couplings: &[Float],
    digits: u32,
    progress: &mut dyn FnMut(usize, usize),
) -> Result<Vec<Estimate>> {
    if digits == 0 || digits > crate::limits::MAX_FINITE_DIGITS {
        return Err(Error::range(format!(
            "{digits} digits is out of range: the finite-coupling engine delivers 1 to {}",
            crate::limits::MAX_FINITE_DIGITS
        )));
    }
    let prec = bits(digits);
    let parts = functionals(q, prec)?;
    let inner_digits = (digits + 3).min(crate::limits::MAX_FINITE_DIGITS);
    let total = parts.len().max(1) * couplings.len();
    let mut tables: Vec<Vec<Estimate>> = Vec::new();
    for (k, (f, _, c2)) in parts.iter().enumerate() {
        let offset = k * couplings.len();
        tables.push(engine::scan(
            *f,
            c2,
            couplings,
            inner_digits,
            &mut |done, _| progress(offset + done, total),
        )?);
    }
    let mut out = Vec::with_capacity(couplings.len());
    for (i, g) in couplings.iter().enumerate() {
        let lookup: HashMap<usize, &Estimate> =
            (0..parts.len()).map(|k| (k, &tables[k][i])).collect();
        let mut callback = |kind: Functional, angle: &Angle| -> Result<Estimate> {
            let f = kind;
            let k = parts
                .iter()
                .position(|(g, a, _)| *g == f && a == angle)
                .ok_or_else(|| Error::numeric("functional not prepared"))?;
            let e = lookup[&k];
            Ok(Estimate {
                value: Float::with_val(prec, &e.value),
                error: Float::with_val(prec, &e.error),
                stated: true,
            })
        };
        let symbols = [(COUPLING, Float::with_val(prec, g))];
        let mut ctx = Context {
            prec,
            symbols: &symbols,
            functional: Some(&mut callback),
            mzv: None,
        };
        let v = evaluate::evaluate(&q.expr, &mut ctx).map_err(|f| q.error_at(f.0, &f.1))?;
        out.push(Estimate::new(v.value, v.error));
    }
    Ok(out)
}

/// The catalogue's strong-coupling expansion at g, if the entry has one.
pub fn strong_coupling(q: &Quantity, g: &Float, prec: u32) -> Result<Option<Float>> {
    let Some(sc) = q.entry.as_ref().and_then(|e| e.strong_coupling.as_ref()) else {
        return Ok(None);
    };
    let origin = format!("strong-coupling formula of `{}`", q.label);
    let e = expr::parse(&sc.formula, &origin, None)?;
    let symbols = [(COUPLING, Float::with_val(prec, g))];
    let mut ctx = Context {
        prec,
        symbols: &symbols,
        functional: None,
        mzv: None,
    };
    let v = evaluate::evaluate(&e, &mut ctx)
        .map_err(|f| expr::error_at(&sc.formula, &origin, None, f.0, &f.1))?;
    Ok(Some(v.value))
}

/// The weak-coupling coefficients c_L of g^(2L), L = 0..=loops, as numbers.
pub fn weak_coefficients(series: &Series, prec: u32) -> Result<Vec<Float>> {
    series.coeffs().iter().map(|c| c.evaluate(prec)).collect()
}

/// sum_{L <= loops} c_L g^(2L).
pub fn weak_sum(coeffs: &[Float], loops: usize, g: &Float) -> Float {
    let prec = coeffs.first().map_or(64, Float::prec);
    let x = Float::with_val(prec, g.square_ref());
    let mut sum = Float::with_val(prec, 0);
    for c in coeffs.iter().take(loops + 1).rev() {
        sum = sum * &x + c;
    }
    sum
}

/// The [m/n] Padé approximant in x = g^2 of the weak-coupling series.
pub fn pade_in_g2(coeffs: &[Float], m: usize, n: usize) -> Result<Pade> {
    convergence::pade(coeffs, m, n)
}

/// Radius of convergence in g from the coefficients of g^2, g^4, ... (the
/// constant term is dropped).
pub fn radius(coeffs: &[Float]) -> Result<RadiusEstimate> {
    convergence::radius_in_g(&coeffs[1.min(coeffs.len())..])
}

/// How many points a grid START:STOP (without a STEP) has.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum GridPoints {
    /// The user asked for this many (`--points`): a STEP beside it is a conflict.
    Given(usize),
    /// The command's default, used when the grid has no STEP.
    Default(usize),
    /// The command has no `--points`: a grid needs its STEP.
    NoCount,
}

/// Parses a list of couplings "0.1,0.5,1" or a grid "START:STOP:STEP" /
/// "START:STOP" (then `points` values), and checks the whole of it before
/// any work starts: every coupling within the engine's 0 <= g <= MAX_COUPLING,
/// a grid with at least two and at most `max_points` points, and no `--points`
/// beside a STEP or a list, which would otherwise be ignored.
pub fn parse_couplings(
    text: &str,
    points: GridPoints,
    max_points: usize,
    prec: u32,
) -> Result<Vec<Float>> {
    let limit = crate::limits::MAX_COUPLING;
    let number = |t: &str| -> Result<Float> {
        let t = t.trim();
        let parsed = Float::parse(t).map_err(|_| {
            Error::input(format!(
                "`{t}` is not a number (couplings are written like 0.5 or 2)"
            ))
        })?;
        let v = Float::with_val(prec, parsed);
        if !v.is_finite() || v < 0 {
            return Err(Error::range(format!(
                "coupling {t} must be a finite number g >= 0"
            )));
        }
        Ok(v)
    };
    let reach = |g: &Float, t: &str| -> Result<()> {
        if *g > limit {
            return Err(Error::range(format!(
                "{t} is beyond the finite-coupling engine: it takes couplings 0 <= g <= {limit}"
            )));
        }
        Ok(())
    };
    if !text.contains(':') {
        if let GridPoints::Given(n) = points {
            return Err(Error::input(format!(
                "--points {n} applies to a grid START:STOP, not to the list `{text}`"
            )));
        }
        let mut list = Vec::new();
        for t in text.split(',').filter(|t| !t.trim().is_empty()) {
            let g = number(t)?;
            reach(&g, &format!("coupling {}", t.trim()))?;
            list.push(g);
        }
        if list.is_empty() {
            return Err(Error::input(
                "no couplings given: write a list like 0.1,0.5,1 or a grid like 0:3:0.05",
            ));
        }
        if list.len() > max_points {
            return Err(Error::range(format!(
                "the list has {} couplings: at most {max_points}",
                list.len()
            )));
        }
        return Ok(list);
    }
    let parts: Vec<&str> = text.split(':').collect();
    if parts.len() > 3 {
        return Err(Error::input(format!(
            "grid `{text}`: expected START:STOP or START:STOP:STEP"
        )));
    }
    let start = number(parts[0])?;
    let stop = number(parts[1])?;
    if stop <= start {
        return Err(Error::range(format!(
            "grid `{text}` is empty or reversed: STOP must exceed START"
        )));
    }
    let span = Float::with_val(prec, &stop - &start);
    let (step, count) = match (parts.get(2), points) {
        (Some(_), GridPoints::Given(n)) => {
            return Err(Error::input(format!(
                "grid `{text}` has a STEP and --points {n} asks for a count: give one of them (START:STOP with --points, or START:STOP:STEP)"
            )))
        }
        (Some(t), _) => {
            let step = number(t)?;
            if step.is_zero() {
                return Err(Error::range(format!("grid `{text}`: the step must be positive")));
            }
            let n = Float::with_val(prec, &span / &step).to_f64();
            if n + 1.0 > max_points as f64 {
                return Err(Error::range(format!("grid `{text}` has {:.0} points: at most {max_points}", (n + 1.0).floor())));
            }
            // A small tolerance keeps STOP when the step divides the span up to rounding.
            let count = (n + 1e-9).floor() as usize + 1;
            if count < 2 {
                return Err(Error::range(format!("grid `{text}` has a single point: the step exceeds STOP - START; a grid needs at least two")));
            }
            (step, count)
        }
        (None, GridPoints::Given(n) | GridPoints::Default(n)) => {
            if !(2..=max_points).contains(&n) {
                return Err(Error::range(format!("--points {n} is out of range: a grid START:STOP has 2 (its ends) to {max_points} points")));
            }
            (Float::with_val(prec, &span / (n - 1) as u32), n)
        }
        (None, GridPoints::NoCount) => {
            return Err(Error::input(format!(
                "grid `{text}` has no STEP, and this command takes no --points: write START:STOP:STEP, or a list 0.1,0.5,1"
            )))
        }
    };
    let grid: Vec<Float> = (0..count)
        .map(|k| Float::with_val(prec, &start + Float::with_val(prec, &step * k as u32)))
        .collect();
    if let Some(last) = grid.last() {
        reach(
            last,
            &format!("grid `{text}` reaches g = {}, which", last.to_f64()),
        )?;
    }
    Ok(grid)
}
