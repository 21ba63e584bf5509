//! The finite-coupling numerical engine: the tilted kernel's functionals
//! Gamma(c2; g) = 4 g^2 [(1 + K')^{-1}]_11 and Delta(c2; g) = ln det(1 + K')
//! evaluated in MPFR with an error estimate beside every value.
//!
//! Each evaluation picks a truncation N and a refined size N2 from magnitude
//! estimates of the kernel's entries, a composite Gauss-Legendre rule and a
//! coarser companion rule, and reports
//! |F(fine, N2) - F(fine, N)| + |F(fine, N) - F(coarse, N)| + rounding
//! as the error of F(fine, N2): each difference measures the error of the
//! less accurate member of its pair, so the sum over-estimates the error of
//! the value returned. Delta at size N also carries the trace of the
//! diagonal it leaves out, which makes its truncation error second order
//! (about half the N for the same digits); the trace stops where a modelled
//! remainder, added to the error, is three decades below the tolerance.
//! Sizes, panel orders and precisions come from f64 control estimates;
//! every value is computed in MPFR.

mod bessel;
mod contour;
pub mod convergence;
pub mod estimate;
pub mod evaluate;
mod gram;
mod hankel;
pub mod leastsquares;
mod matrix;
pub mod mzv;
pub mod pslq;
mod quadrature;
mod refine;
mod sensitivity;

use std::f64::consts::LN_10;
use std::sync::atomic::{AtomicBool, AtomicUsize, Ordering};
use std::sync::mpsc;

use rug::float::Round;
use rug::Float;

use crate::error::{Error, Result};
use crate::limits::MAX_FINITE_DIGITS;
use crate::limits::{MAX_COUPLING, MAX_TRUNCATION};
use bessel::ln_magnitude;
use contour::layout;
use matrix::{diagonal_integrals, factor, factor_nested, kernel_integrals, tilted_system};
use quadrature::RuleCache;
use refine::RoughLu;
use sensitivity::Form;

pub use bessel::bessel_j_upto;
pub use estimate::Estimate;

pub use crate::kernel::Functional;

/// Bits of MPFR precision that carry `digits` decimal digits.
pub fn bits_for_digits(digits: u32) -> u32 {
    (f64::from(digits) * std::f64::consts::LOG2_10).ceil() as u32 + 8
}

/// Bits of working precision for `digits` decimal digits, with 64 guard
/// bits: room for the cancellation of a sum of a few thousand terms.
pub fn working_bits(digits: u32) -> u32 {
    bits_for_digits(digits) + 64
}

/// ln of an a-priori magnitude of the diagonal entry K'_mm ~ 4m S_mm: the
/// peak of J_m(2gt)^2 / (t (e^t - 1)) over t, times 4m.
fn ln_diagonal(m: usize, g: f64) -> f64 {
    peak(|t| 2.0 * ln_magnitude(m, 2.0 * g * t), m)
}

/// The same for the first row: J_1(2gt) J_m(2gt) with |J_1(x)| <= min(1, x/2).
fn ln_first_row(m: usize, g: f64) -> f64 {
    peak(|t| ln_magnitude(m, 2.0 * g * t) + (g * t).ln().min(0.0), m)
}

/// Peak over t of exp(bessel(t)) / (e^t - 1), times 4m, as a logarithm.
fn peak(bessel: impl Fn(f64) -> f64, m: usize) -> f64 {
    let mut best = f64::NEG_INFINITY;
    // A geometric grid from 1e-3 (below it every order >= 1 is suppressed
    // by (g t)^m) to 400 (past the largest cutoff, about 470 digits' worth
    // of e^-t); 3% steps resolve a peak of relative width >= 10% in t.
    let mut t = 1e-3;
    while t < 400.0 {
        // The integral is roughly the peak value times its width ~ t, and
        // that width cancels the 1/t of the integrand.
        let v = bessel(t) - t.exp_m1().ln();
        best = best.max(v);
        t *= 1.03;
    }
    best + ((4 * m) as f64).ln()
}

/// ln of the a-priori truncation error at size n, relative to the scale the
/// tolerance is measured in (4 g^2 for Gamma, absolute for Delta).
fn ln_truncation(f: Functional, n: usize, g: f64) -> f64 {
    match f {
        // The trace of the neglected block is added back (`attempt`), so
        // what remains is second order in the neglected rows and columns:
        // ln det(1 + E) - tr E with E the block's Schur complement, about
        // tr(E^2)/2, plus the diagonal of K_TN (1 + K_NN)^-1 K_NT. Entries
        // K_mi scale like the larger index's diagonal at strong coupling
        // (the weight e^-t sits where J_max(m,i) turns on) and like the
        // first row times the column at weak coupling (K_m1 K_1m ~ g^(2m+2)
        // against K_mm ~ g^(2m)), so the model is the larger square.
        // Measured at 30 digits (Delta(0), Delta(pi/3); g = 0.1, 0.5, 1, 5)
        // as |F(N2) - F(N)|, the error lies e^-9 .. e^-11 below that
        // square, hence the prefactor e^-7; an optimistic model costs a
        // retry, never a wrong digit, since the error is measured.
        Functional::Delta => 2.0 * ln_diagonal(n + 1, g).max(ln_first_row(n + 1, g)) - 7.0,
        // Two first-row entries enter quadratically; at strong coupling the
        // error decays far faster than those entries' own exp(-n/(2g)).
        // Measured at c2 = 1/2, 30 digits, as |F(n + 20) - F(n)| in units of
        // 4 g^2: the rate per unit of n is 1.6, 0.67, 0.35, 0.23 at g = 1,
        // 5, 20, 50, i.e. 1.6/sqrt(g), and the error at n = 30..100 lies
        // e^-9 .. e^-15 below exp(-rate n). The model takes 1.5/sqrt(g) (the
        // slowest of those, at g = 5) and a prefactor e^-8; a model that
        // proves optimistic costs a retry at a tighter tolerance, never a
        // wrong digit, since the error is measured, not modelled;
        // below g = 1/2 the entries' own g^(2n) decay governs and the fit,
        // measured from g = 1 up, is not used.
        Functional::Gamma => {
            let entries = 2.0 * ln_first_row(n + 1, g) + 1.0;
            if g >= 0.5 {
                entries.min(-8.0 - 1.5 / g.sqrt() * n as f64)
            } else {
                entries
            }
        }
    }
}

/// ln of the trace of the diagonal beyond m: the first neglected diagonal
/// entry, times e for the geometric tail of the following ones (ratio
/// e^-1/(2g) or smaller).
fn ln_trace_beyond(m: usize, g: f64) -> f64 {
    ln_diagonal(m + 1, g) + 1.0
}

/// Where the trace of Delta's tail may stop: three decades below the
/// tolerance, so that the modelled remainder, added to the error, is small
/// beside the measured parts.
fn tail_end(n2: usize, g: f64, ln_tol: f64) -> usize {
    let mut m = n2;
    while ln_trace_beyond(m, g) > ln_tol - 3.0 * LN_10 && m < 4 * MAX_TRUNCATION {
        m += 1 + m / 32;
    }
    m
}

fn sizes(f: Functional, g: f64, ln_tol: f64) -> Result<(usize, usize)> {
    // A decade below the tolerance, so that the truncation and quadrature
    // parts of the error together stay inside it; steps of about 3% keep
    // the search cost logarithmic without overshooting n by more than that.
    let mut n = 1;
    while ln_truncation(f, n, g) > ln_tol - LN_10 {
        n += 1 + n / 32;
        if n > MAX_TRUNCATION {
            return Err(Error::numeric(format!(
                "the requested accuracy at g = {g} needs a truncation above {MAX_TRUNCATION}"
            )));
        }
    }
    // The refined size is modelled three decades better than n, so that
    // |F(N2) - F(N)| measures the error of F(N) and over-estimates that of
    // F(N2) by about a thousand; at least two more rows in any case.
    let goal = ln_truncation(f, n, g) - 3.0 * LN_10;
    let mut n2 = n + 2;
    while ln_truncation(f, n2, g) > goal && n2 < MAX_TRUNCATION {
        n2 += 1 + n2 / 32;
    }
    Ok((n, n2))
}

/// One pass at an absolute tolerance exp(ln_tol) on the functional divided by
/// its scale (4 g^2 for Gamma, 1 for Delta).
fn attempt(
    f: Functional,
    c2: &Float,
    g: &Float,
    ln_tol: f64,
    cache: &mut RuleCache,
    threads: usize,
) -> Result<Estimate> {
    let gf = g.to_f64();
    let (n, n2) = sizes(f, gf, ln_tol)?;
    // Six guard digits over the tolerance, plus the log of the largest
    // entry factor 4 N2 (entries of K' are that much larger than those of
    // S), plus 32 bits for the elimination's rounding over N2 steps.
    let guard_digits = -ln_tol / LN_10 + 6.0 + ((4 * n2) as f64).log10();
    let prec = (guard_digits * 10f64.log2()).ceil() as u32 + 32;
    // Entries of K' carry the factor 4j; the functionals move by at most
    // about that much per entry error, hence the extra margin.
    let ln_entry = ln_tol - ((4 * n2) as f64).ln() - 2.0 * LN_10;
    // Delta: ln det(1 + K') = ln det(1 + K'_NN) + tr K'_TT + second order
    // (`ln_truncation`), so each truncation carries the trace of the
    // diagonal it leaves out, K'_mm = 4 m c2 S_mm, up to `end`; beyond it
    // the modelled remainder joins the error.
    let (end, beyond) = match f {
        Functional::Delta => {
            let end = tail_end(n2, gf, ln_tol);
            (end, Float::with_val(prec, ln_trace_beyond(end, gf)).exp())
        }
        Functional::Gamma => (n, Float::new(prec)),
    };
    // The fine rule is planned four decades better than the coarse one, so
    // that |F(fine) - F(coarse)| measures the coarse rule's error and
    // over-estimates the fine one's. Each rule serves orders up to the
    // largest its matrix or trace reads.
    let no_rule = || Error::numeric("no quadrature plan reaches the tolerance");
    let fine_nodes =
        layout(gf, ln_entry - 4.0 * LN_10, n2.max(end), cache, prec).ok_or_else(no_rule)?;
    let coarse_nodes = layout(gf, ln_entry, n.max(end), cache, prec).ok_or_else(no_rule)?;
    let drop_fine = ln_entry - 4.0 * LN_10 - (fine_nodes.len() as f64).ln();
    let drop_coarse = ln_entry - (coarse_nodes.len() as f64).ln();
    let s_fine = kernel_integrals(g, n2, &fine_nodes, drop_fine, prec, threads)?;
    let fine_system = tilted_system(&s_fine, n2, n2, c2, prec);
    let rules = Rules {
        fine: &fine_nodes,
        coarse: &coarse_nodes,
        drop_fine,
        drop_coarse,
    };
    let (best, fine_small, coarse_small) = match f {
        Functional::Gamma => {
            // No full-precision factorisation: three refined solves on a
            // double-precision LU (refine.rs), or the MPFR LU where that
            // does not contract; the coarse rule enters to first order
            // (sensitivity.rs), at two dot products per node.
            let (whole, first_row, first_column) = match refined(&fine_system, n2, n, prec) {
                Some(parts) => parts,
                None => {
                    let (small, whole) = factor_nested(fine_system, n2, n, prec)?;
                    (whole.inv11, small.first_row, small.first_column)
                }
            };
            let form = Form::new(c2, &first_row, &first_column, prec);
            let mut shift = form.on_nodes(rules.coarse, g, rules.drop_coarse, threads)?;
            shift -= form.on_matrix(&s_fine, n2);
            let g2 = Float::with_val(prec, g * g) * 4u32;
            let best = Float::with_val(prec, &g2 * &whole);
            let fine_small = Float::with_val(prec, &g2 * &first_column[0]);
            let coarse_small = Float::with_val(prec, &fine_small - g2 * shift);
            (best, fine_small, coarse_small)
        }
        Functional::Delta => delta_parts(c2, g, (n, n2, end), fine_system, &rules, prec, threads)?,
    };
    let mut error = Float::with_val(prec, &best - &fine_small).abs();
    error += Float::with_val(prec, &fine_small - &coarse_small).abs();
    // Rounding: about n2^2 operations each contributing a relative 2^-prec
    // to the inverse's entry (Gamma) or to the determinant (Delta).
    let mut rounding = Float::with_val(prec, Float::i_exp(1, -(prec as i32)));
    rounding *= (n2 * n2) as u32;
    match f {
        Functional::Gamma => rounding *= Float::with_val(prec, best.abs_ref()),
        Functional::Delta => {
            rounding *= Float::with_val(prec, best.abs_ref()).max(&Float::with_val(prec, 1))
        }
    }
    error += rounding;
    error += beyond;
    Ok(Estimate::new(best, error))
}

/// [M^-1]_11 of the whole n2 x n2 system and the first row and column of
/// the inverse of its leading n x n block, by refinement; None where the
/// refinement does not contract or det M is not positive in double
/// precision (then the MPFR LU decides, and refuses a negative one).
fn refined(
    system: &[Float],
    n2: usize,
    n: usize,
    prec: u32,
) -> Option<(Float, Vec<Float>, Vec<Float>)> {
    let whole = RoughLu::new(system, n2, n2)?;
    let block = RoughLu::new(system, n2, n)?;
    if !whole.determinant_positive() || !block.determinant_positive() {
        return None;
    }
    let v2 = whole.refine(system, n2, false, prec)?;
    let column = block.refine(system, n2, false, prec)?;
    let row = block.refine(system, n2, true, prec)?;
    Some((v2.into_iter().next()?, row, column))
}

/// The two rules of one attempt and their dropping levels.
struct Rules<'a> {
    fine: &'a [contour::Node],
    coarse: &'a [contour::Node],
    drop_fine: f64,
    drop_coarse: f64,
}

/// Delta's F(fine, N2), F(fine, N) and F(coarse, N), each with the trace of
/// the diagonal it leaves out (`attempt`), from the factored fine system
/// and a second factorisation on the coarse rule (ln det's first-order
/// change would need the whole inverse, no cheaper than that).
fn delta_parts(
    c2: &Float,
    g: &Float,
    (n, n2, end): (usize, usize, usize),
    fine_system: Vec<Float>,
    rules: &Rules,
    prec: u32,
    threads: usize,
) -> Result<(Float, Float, Float)> {
    let s_coarse = kernel_integrals(g, n, rules.coarse, rules.drop_coarse, prec, threads)?;
    let trace = |diag: &[Float], from: usize| -> Float {
        let mut sum = Float::new(prec);
        for (i, d) in diag.iter().enumerate().skip(from - n) {
            sum += Float::with_val(prec, d * c2) * (4 * (n + 1 + i)) as u32;
        }
        sum
    };
    let fine_diag = diagonal_integrals(g, n, end, rules.fine, rules.drop_fine, prec)?;
    let coarse_diag = diagonal_integrals(g, n, end, rules.coarse, rules.drop_coarse, prec)?;
    // The two factorisations are independent; with a second core the
    // coarse one (about (N/N2)^3 of the work) runs beside the nested one.
    let coarse_system = tilted_system(&s_coarse, n, n, c2, prec);
    let (nested, coarse) = if threads > 1 {
        std::thread::scope(|s| {
            let coarse = s.spawn(|| factor(coarse_system, n, prec));
            let nested = factor_nested(fine_system, n2, n, prec);
            let coarse = coarse
                .join()
                .unwrap_or_else(|_| Err(Error::numeric("a factorisation thread failed")));
            (nested, coarse)
        })
    } else {
        (
            factor_nested(fine_system, n2, n, prec),
            factor(coarse_system, n, prec),
        )
    };
    let (small, whole) = nested?;
    Ok((
        whole.ln_det + trace(&fine_diag, n2.min(end)),
        small.ln_det + trace(&fine_diag, n),
        coarse?.ln_det + trace(&coarse_diag, n),
    ))
}

fn check_inputs(c2: &Float, g: &Float, digits: u32) -> Result<()> {
    if digits == 0 || digits > MAX_FINITE_DIGITS {
        return Err(Error::range(format!(
            "digits must be between 1 and {MAX_FINITE_DIGITS}, got {digits}"
        )));
    }
    if c2.is_nan() || *c2 < 0 || *c2 > 1 {
        return Err(Error::range(format!(
            "cos^2(alpha) must lie in [0, 1], got {}",
            c2.to_f64()
        )));
    }
    if g.is_nan() || *g < 0 {
        return Err(Error::range(format!(
            "the coupling g must be non-negative, got {}",
            g.to_f64()
        )));
    }
    if g.is_infinite() || *g > MAX_COUPLING {
        return Err(Error::range(format!(
            "the coupling g must be at most {MAX_COUPLING}, got {}",
            g.to_f64()
        )));
    }
    Ok(())
}

/// The functional `f` at c2 = cos^2(alpha) in [0, 1] and coupling g >= 0 to
/// `digits` significant digits (relative to |value|, or absolute at the
/// functional's natural scale when the value is nearly zero).
pub fn evaluate(f: Functional, c2: &Float, g: &Float, digits: u32) -> Result<Estimate> {
    evaluate_with(f, c2, g, digits, &mut RuleCache::default(), cores())
}

/// Threads worth running: the machine's cores.
fn cores() -> usize {
    std::thread::available_parallelism().map_or(1, |n| n.get())
}

fn evaluate_with(
    f: Functional,
    c2: &Float,
    g: &Float,
    digits: u32,
    cache: &mut RuleCache,
    threads: usize,
) -> Result<Estimate> {
    check_inputs(c2, g, digits)?;
    // Ten digits beyond the request, so that rounding the value for output
    // adds nothing visible to its error.
    let out_prec = (f64::from(digits + 10) * 10f64.log2()).ceil() as u32;
    if g.is_zero() {
        return Ok(Estimate::exact(Float::new(out_prec)));
    }
    let gf = g.to_f64();
    // The expected size of the functional in the unit its tolerance is
    // measured in: Gamma / (4 g^2) is about min(1, 1/(2g)) (it grows like 2g
    // at strong coupling), Delta about min(1, g^2).
    let scale_ln = match f {
        Functional::Gamma => (1.0 / (2.0 * gf)).min(1.0).ln(),
        Functional::Delta => (gf * gf).min(1.0).ln(),
    };
    let mut ln_scale = scale_ln;
    // Two extra digits on the first pass; each retry (the measured error
    // missed, or the value is far below the assumed scale) asks five more,
    // and four passes reach 17 digits beyond the request before giving up.
    let mut extra = 2.0;
    let mut last = None;
    for _ in 0..4 {
        let ln_tol = ln_scale - (f64::from(digits) + extra) * LN_10;
        let est = attempt(f, c2, g, ln_tol, cache, threads)?;
        let unit = match f {
            Functional::Gamma => Float::with_val(64, g * g) * 4u32,
            Functional::Delta => Float::with_val(64, 1),
        };
        let rel_value = Float::with_val(64, est.value.abs_ref()) / &unit;
        let rel_error = Float::with_val(64, &est.error / &unit);
        let rounded = round_out(est.clone(), out_prec);
        if rounded.digits_supported() >= digits {
            return Ok(rounded);
        }
        let tol_now = Float::with_val(64, ln_tol).exp();
        if rel_error <= tol_now {
            let ln_value = rel_value.clone().ln().to_f64();
            let floor = scale_ln - f64::from(digits) * LN_10;
            if rel_value > Float::with_val(64, &rel_error * 10u32)
                && ln_value < ln_scale - 1.0
                && ln_value > floor
            {
                // The value is far below the assumed scale: aim at it.
                ln_scale = ln_value;
                continue;
            }
            if ln_value <= floor || rel_value <= Float::with_val(64, &rel_error * 10u32) {
                // Indistinguishable from zero at the natural scale's
                // accuracy: the honest answer is the value with its error.
                return Ok(rounded);
            }
        }
        extra += 5.0;
        last = Some(est);
    }
    let detail = last
        .map(|e| format!(" (best: {} +- {:.1e})", e.value.to_f64(), e.error.to_f64()))
        .unwrap_or_default();
    Err(Error::numeric(format!(
        "could not reach {digits} digits for {f:?} at g = {gf}, cos^2 = {}{detail}",
        c2.to_f64()
    )))
}

fn round_out(est: Estimate, prec: u32) -> Estimate {
    let value = Float::with_val(prec, &est.value);
    let mut error = Float::with_val_round(prec, &est.error, Round::Up).0;
    // Rounding the value to the output precision adds half an ulp.
    error += Float::with_val(prec, value.abs_ref()) >> (prec as i32);
    Estimate::new(value, error)
}

/// `evaluate` over a list of couplings, the points spread over the cores
/// (each worker keeps its own quadrature rules); `progress(done, total)` is
/// called on the calling thread as points finish, and the values come back
/// in the order of `couplings`. The first failing point, in that order, is
/// the error.
pub fn scan(
    f: Functional,
    c2: &Float,
    couplings: &[Float],
    digits: u32,
    progress: &mut dyn FnMut(usize, usize),
) -> Result<Vec<Estimate>> {
    let total = couplings.len();
    let workers = cores().min(total).max(1);
    let inner = (cores() / workers).max(1);
    let next = AtomicUsize::new(0);
    let failed = AtomicBool::new(false);
    let mut slots: Vec<Option<Result<Estimate>>> = (0..total).map(|_| None).collect();
    std::thread::scope(|s| {
        let (tx, rx) = mpsc::channel();
        for _ in 0..workers {
            let tx = tx.clone();
            let (next, failed) = (&next, &failed);
            s.spawn(move || {
                let mut cache = RuleCache::default();
                loop {
                    let i = next.fetch_add(1, Ordering::Relaxed);
                    if i >= total || failed.load(Ordering::Relaxed) {
                        break;
                    }
                    let g = &couplings[i];
                    let r = evaluate_with(f, c2, g, digits, &mut cache, inner)
                        .map_err(|e| e.context(format!("g = {}", g.to_f64())));
                    if r.is_err() {
                        failed.store(true, Ordering::Relaxed);
                    }
                    if tx.send((i, r)).is_err() {
                        break;
                    }
                }
            });
        }
        drop(tx);
        let mut done = 0;
        for (i, r) in rx {
            let ok = r.is_ok();
            slots[i] = Some(r);
            if ok {
                done += 1;
                progress(done, total);
            }
        }
    });
    let mut out = Vec::with_capacity(total);
    for slot in slots {
        match slot {
            Some(r) => out.push(r?),
            None => {
                return Err(Error::numeric(
                    "the scan stopped at an earlier failing point",
                ))
            }
        }
    }
    Ok(out)
}

#[cfg(test)]
mod tests;
