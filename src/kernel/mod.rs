//! The tilted BES kernel and its two functionals, exactly, order by order in
//! the coupling (docs/conventions.md sections 2 and 3):
//!
//!   Gamma_alpha(g) = 4 g^2 [(1 + K(alpha))^(-1)]_11,
//!   Delta_alpha(g) = ln det(1 + K(alpha)).
//!
//! The tilt enters only through c2 = cos^2(alpha) (rational form of the
//! kernel), either as a rational number or as the symbol `c2`. The
//! determinant is reduced to diagonal resolvent elements by the Schur
//! complement identity det A = det A_{>=2} / [A^(-1)]_11 applied repeatedly
//! (common practice of linear algebra): ln det(1 + K) = -sum_s ln [(1 + K_{>=s})^(-1)]_ss.

mod basis;
mod entries;
mod logdet;
mod recursion;
mod tilt;

use crate::error::{Error, Result};
use crate::exact::powerseries::Series;
use crate::exact::ring::Exact;
use crate::limits::MAX_LOOPS;

pub use basis::WeightBases;
pub use entries::entry;
pub use recursion::TiltFactors;
pub use tilt::Tilt;

/// The name of the symbolic tilt in the coefficient ring.
pub const C2: &str = "c2";

pub use crate::input::expr::Functional;

fn check_loops(loops: u32) -> Result<()> {
    if loops == 0 || loops > MAX_LOOPS {
        return Err(Error::range(format!(
            "loop order {loops} is out of range: the exact engine takes 1 to {MAX_LOOPS} loops"
        )));
    }
    Ok(())
}

/// The recursion's tables through weight `highest`, for a message naming `loops`.
fn tables(highest: usize, loops: u32) -> Result<recursion::Tables> {
    recursion::Tables::new(highest).ok_or_else(|| beyond_packed_keys(loops))
}

fn beyond_packed_keys(loops: u32) -> Error {
    Error::range(format!(
        "{loops} loops is beyond what the engine's packed monomials hold"
    ))
}

/// The functional as a series in g^2 through g^(2 loops).
pub fn expand(
    f: Functional,
    tilt: &Tilt,
    loops: u32,
    progress: &mut dyn FnMut(usize, usize),
) -> Result<Series> {
    match f {
        Functional::Gamma => gamma(tilt, loops, progress),
        Functional::Delta => delta(tilt, loops, progress),
    }
}

/// Gamma_alpha through g^(2 loops), as a series in x = g^2.
pub fn gamma(tilt: &Tilt, loops: u32, progress: &mut dyn FnMut(usize, usize)) -> Result<Series> {
    check_loops(loops)?;
    let highest = 2 * loops as usize - 2;
    let mut tables = tables(highest, loops)?;
    let factors = tilt.factors();
    let diag = recursion::diagonal_dense(&tables, &factors, 1, highest, progress);
    tables.drop_shifts();
    // The coefficient of g^(2L) is 4 times that of g^(2L-2) in the element.
    let even: Vec<(usize, recursion::Dense)> = diag.into_iter().enumerate().step_by(2).collect();
    let coeffs = std::iter::once(Exact::zero())
        .chain(recursion::to_exact_all(&tables, &factors, even, 4))
        .collect();
    Ok(Series::new(coeffs))
}

/// Delta_alpha = ln det(1 + K(alpha)) through g^(2 loops).
pub fn delta(tilt: &Tilt, loops: u32, progress: &mut dyn FnMut(usize, usize)) -> Result<Series> {
    check_loops(loops)?;
    let highest = 2 * loops as usize;
    let mut tables = tables(highest, loops)?;
    let factors = tilt.factors();
    let index = basis::ProductIndex::new(&tables.bases).ok_or_else(|| beyond_packed_keys(loops))?;
    let mut total = logdet::zeros(&tables.bases, &factors, loops as usize);
    // [(1 + K_{>=s})^(-1)]_ss - 1 starts at g^(2s), so s <= loops suffices.
    let steps = loops as usize * highest;
    for s in 1..=loops as usize {
        let diag = recursion::diagonal_dense(&tables, &factors, s, highest, &mut |n, _| {
            progress((s - 1) * highest + n, steps)
        });
        let in_x: logdet::DenseSeries = diag.into_iter().step_by(2).collect();
        total = logdet::subtract(&total, &logdet::ln(&in_x, &tables.bases, &index, &factors));
    }
    drop(index);
    tables.drop_shifts();
    let total = total
        .into_iter()
        .enumerate()
        .map(|(k, d)| (2 * k, d))
        .collect();
    Ok(Series::new(recursion::to_exact_all(
        &tables, &factors, total, 1,
    )))
}
