//! Quadrature on (0, inf) for the kernel integrands: composite
//! Gauss-Legendre on equal panels of [0, T], with the panel width and each
//! panel's order chosen from an a-priori error model, and Gauss-Legendre
//! rules computed in MPFR and cached per order.
//!
//! The model (control logic in f64; the rules themselves are MPFR): on a
//! panel of width H, an n-point rule errs by about
//! (64/15) (H/2) max_E|f| / (rho^(2n) (rho^2 - 1)) where E is the Bernstein
//! ellipse of parameter rho around the panel. For J_i(2gt) J_j(2gt) / (t (e^t - 1))
//! the growth on E comes from |J_n(z)| <= exp|Im z| (DLMF 10.14.4), from e^-t,
//! and is capped by the poles of 1/(e^t - 1) at t = +-2 pi i.

use std::collections::HashMap;
use std::f64::consts::PI;
use std::rc::Rc;

use rug::{Assign, Float};

/// One panel [a, b] with an n-point rule; consecutive panels share the
/// same f64 end point, so that the rules in MPFR tile their range exactly.
#[derive(Debug, Clone, Copy, PartialEq)]
pub(crate) struct Panel {
    pub a: f64,
    pub b: f64,
    pub n: usize,
}

/// Gauss-Legendre nodes and weights on [-1, 1] at one precision.
pub(crate) struct GaussRule {
    pub nodes: Vec<Float>,
    pub weights: Vec<Float>,
}

/// Newton's method on P_m from Chebyshev-like starting points; the
/// three-term recurrence gives P_m and P_{m-1}, hence P_m' (A&S 22.8.5).
fn gauss_legendre(m: usize, prec: u32) -> GaussRule {
    let wprec = prec + 10;
    let mut nodes = vec![Float::new(prec); m];
    let mut weights = vec![Float::new(prec); m];
    let legendre = |x: &Float| -> (Float, Float) {
        let mut p0 = Float::with_val(wprec, 1);
        let mut p1 = x.clone();
        let mut tmp = Float::new(wprec);
        for k in 1..m {
            // p_{k+1} = ((2k+1) x p_k - k p_{k-1}) / (k+1)
            tmp.assign(x * &p1);
            tmp *= (2 * k + 1) as u32;
            p0 *= k as u32;
            tmp -= &p0;
            tmp /= (k + 1) as u32;
            std::mem::swap(&mut p0, &mut p1);
            std::mem::swap(&mut p1, &mut tmp);
        }
        let pm = if m == 0 { p0.clone() } else { p1 };
        let pm1 = p0;
        // P_m' = m (x P_m - P_{m-1}) / (x^2 - 1)
        let mut d = Float::with_val(wprec, x * &pm);
        d -= &pm1;
        d *= m as u32;
        let den = Float::with_val(wprec, x * x) - 1u32;
        d /= &den;
        (pm, d)
    };
    for i in 0..m.div_ceil(2) {
        let mut x = Float::with_val(wprec, root_f64(m, i));
        // The double-precision root has about 50 correct bits and Newton
        // doubles them per step: stop once 50 * 2^steps covers wprec.
        let mut good = 50u32;
        while good < wprec {
            let (p, d) = legendre(&x);
            x -= Float::with_val(wprec, &p / &d);
            good *= 2;
        }
        let (_, d) = legendre(&x);
        let one_minus = Float::with_val(wprec, 1u32 - Float::with_val(wprec, &x * &x));
        let w = Float::with_val(wprec, 2u32 / (one_minus * Float::with_val(wprec, &d * &d)));
        nodes[i].assign(&x);
        weights[i].assign(&w);
        nodes[m - 1 - i].assign(-x);
        weights[m - 1 - i].assign(&w);
    }
    GaussRule { nodes, weights }
}

/// The i-th largest root of P_m to double precision: Newton in f64 from
/// the asymptotic position cos(pi (i + 3/4) / (m + 1/2)) (A&S 22.16.6).
fn root_f64(m: usize, i: usize) -> f64 {
    let mut x = (PI * (i as f64 + 0.75) / (m as f64 + 0.5)).cos();
    for _ in 0..100 {
        let (mut p0, mut p1) = (1.0f64, x);
        for k in 1..m {
            let p2 = ((2 * k + 1) as f64 * x * p1 - k as f64 * p0) / (k + 1) as f64;
            p0 = p1;
            p1 = p2;
        }
        let d = m as f64 * (x * p1 - p0) / (x * x - 1.0);
        let dx = p1 / d;
        x -= dx;
        if dx.abs() < 1e-15 {
            break;
        }
    }
    x
}

/// Gauss-Legendre rules by order and precision, computed on first use, so
/// that a scan over couplings computes each rule once.
#[derive(Default)]
pub(crate) struct RuleCache {
    rules: HashMap<(usize, u32), Rc<GaussRule>>,
}

impl RuleCache {
    pub fn get(&mut self, n: usize, prec: u32) -> Rc<GaussRule> {
        self.rules
            .entry((n, prec))
            .or_insert_with(|| Rc::new(gauss_legendre(n, prec)))
            .clone()
    }
}

/// Where the integrands are negligible: beyond T the tail of
/// |J_i J_j| / (t (e^t - 1)) <= 2 e^-t / t is below exp(ln_tol).
pub(crate) fn cutoff(ln_tol: f64) -> f64 {
    // e^-2 of margin covers the tail's integral beyond the bound's value
    // at T (the bound decays like e^-t, so its integral is below its value
    // times 1 + 1/T); the half-unit step costs at most half a node panel.
    let mut t = 1.0f64;
    while (2.0f64).ln() - t - t.ln() > ln_tol - 2.0 {
        t += 0.5;
    }
    t
}

/// Where the integrand of a panel may grow: `ln_max(left, semi_major,
/// semi_minor)` bounds ln max |integrand| on the Bernstein ellipse around
/// the panel from its leftmost point and half-axes (None: that ellipse is
/// not allowed), and `pole` is the integrand's nearest singularity, which
/// every ellipse must keep clear of.
pub(crate) struct Growth<'a> {
    pub pole: (f64, f64),
    pub ln_max: &'a dyn Fn(f64, f64, f64) -> Option<f64>,
}

/// The growth of J_i(2gt) J_j(2gt) / (t (e^t - 1)) on the real axis.
pub(crate) fn oscillating(g: f64) -> impl Fn(f64, f64, f64) -> Option<f64> {
    // |J_i J_j| / |t|^2 near t = 0 is at most |g t|^2 / |t|^2 = g^2 (both
    // orders >= 1, DLMF 10.14.4), and 1/|e^t - 1| <= e^2 |e^-t| on the
    // ellipse away from the pole: hence ln max(g^2, 1) + 2 over the
    // e^(4 g Im t - Re t) of the two Bessel factors and the weight.
    let amp = (g * g).max(1.0).ln() + 2.0;
    move |left, _major, minor| Some(4.0 * g * minor - left + amp)
}

/// The smallest order whose modelled error on `[a, a + h]` is below
/// exp(ln_tol), or None past a sanity bound.
fn panel_order(a: f64, h: f64, ln_tol: f64, growth: &Growth) -> Option<usize> {
    // Sum of distances from the pole to the panel's ends bounds the
    // ellipse: (h/2)(rho + 1/rho) must stay below it with a margin.
    let (pr, pi) = growth.pole;
    let s = ((a - pr).powi(2) + pi * pi).sqrt() + ((a + h - pr).powi(2) + pi * pi).sqrt();
    // 0.9: stay a tenth inside the pole, where |1/(e^t - 1)| is still
    // within about ten times its size on the real axis.
    let cap = (2.0 * s / h) * 0.9;
    let rho_max = 0.5 * (cap + (cap * cap - 4.0).max(0.0).sqrt());
    let mut best: Option<f64> = None;
    // rho is scanned on a grid quadratic in its range, denser near 1 where
    // the optimum lies at strong coupling; 120 points put the scanned
    // optimum within a percent of the true one.
    let steps = 120;
    for k in 1..=steps {
        let rho = 1.0 + (rho_max - 1.0) * (k as f64 / steps as f64).powi(2);
        if rho <= 1.0 || rho > rho_max {
            continue;
        }
        let semi_minor = 0.25 * h * (rho - 1.0 / rho);
        let semi_major = 0.25 * h * (rho + 1.0 / rho);
        let left = a + 0.5 * h - semi_major;
        let Some(ln_m) = (growth.ln_max)(left, semi_major, semi_minor) else {
            continue;
        };
        let ln_err0 = (64.0f64 / 15.0).ln() + (0.5 * h).ln() + ln_m - (rho * rho - 1.0).ln();
        let n = (ln_err0 - ln_tol) / (2.0 * rho.ln());
        // Below two points the error model is not meaningful.
        let n = n.max(2.0);
        best = Some(best.map_or(n, |b: f64| b.min(n)));
    }
    // One point more than the model's minimum absorbs its rounding down.
    let n = best?.ceil() as usize + 1;
    // A rule costs O(n^2) MPFR operations to compute, so orders are rounded
    // up onto a grid of spacing about n/16 (a power of two): at most 1/16
    // more nodes, and panels, the coarse rule and nearby couplings then
    // share a few rules instead of computing one per panel.
    let step = (n / 16).max(1).next_power_of_two();
    let n = n.div_ceil(step) * step;
    // 4000 points on one panel means the model has left its range (the
    // widths tried below would all do better).
    (n <= 4000).then_some(n)
}

/// Panels covering [0, cutoff] for absolute accuracy exp(ln_tol) on every
/// integral J_i(2gt) J_j(2gt) / (t (e^t - 1)), with the width (a power of
/// two) that needs the fewest nodes.
pub(crate) fn plan(g: f64, ln_tol: f64) -> Option<Vec<Panel>> {
    let growth = oscillating(g);
    let growth = Growth {
        pole: (0.0, 2.0 * PI),
        ln_max: &growth,
    };
    // Whole panels of a power-of-two width from 0, the last one reaching
    // past the cutoff: the tail it covers costs a few nodes and the widths
    // stay exact binary fractions.
    best_of(&[0.5, 1.0, 2.0, 4.0, 8.0], |width| {
        let count = (cutoff(ln_tol) / width).ceil() as usize;
        panels(0.0, count as f64 * width, width, count, ln_tol, &growth)
    })
}

/// The panels [lo + p h, lo + (p + 1) h], p < count, the last one ending
/// at `hi`, each with the order that reaches its share of exp(ln_tol), or
/// None if one cannot.
fn panels(
    lo: f64,
    hi: f64,
    h: f64,
    count: usize,
    ln_tol: f64,
    growth: &Growth,
) -> Option<Vec<Panel>> {
    let ln_each = ln_tol - (count as f64).ln();
    let end = |p: usize| if p == count { hi } else { lo + p as f64 * h };
    (0..count)
        .map(|p| {
            let (a, b) = (end(p), end(p + 1));
            panel_order(a, b - a, ln_each, growth).map(|n| Panel { a, b, n })
        })
        .collect()
}

/// The candidate plan with the fewest nodes.
fn best_of(widths: &[f64], make: impl Fn(f64) -> Option<Vec<Panel>>) -> Option<Vec<Panel>> {
    widths
        .iter()
        .filter_map(|&w| make(w))
        .min_by_key(|p| p.iter().map(|q| q.n).sum::<usize>())
}

/// Equal panels covering exactly [lo, hi] for absolute accuracy
/// exp(ln_tol) in all, with the width (near a power of two, from 1/16 for
/// the short pieces of the contour at strong coupling to 8) that needs the
/// fewest nodes. Widths that would need more than 64 panels are not tried:
/// planning then costs more than it saves, since a panel costs a scan of
/// its error model.
pub(crate) fn plan_range(lo: f64, hi: f64, ln_tol: f64, growth: &Growth) -> Option<Vec<Panel>> {
    let widths: Vec<f64> = [0.0625, 0.125, 0.25, 0.5, 1.0, 2.0, 4.0, 8.0]
        .into_iter()
        .filter(|&w| (hi - lo) / w <= 64.0 || w == 8.0)
        .collect();
    best_of(&widths, |width| {
        let count = ((hi - lo) / width).ceil().max(1.0) as usize;
        panels(lo, hi, (hi - lo) / count as f64, count, ln_tol, growth)
    })
}

/// Nodes and weights of the composite rule on its panels, as they are.
pub(crate) fn panel_points(
    panels: &[Panel],
    cache: &mut RuleCache,
    prec: u32,
) -> Vec<(Float, Float)> {
    let mut out = Vec::new();
    for p in panels {
        let rule = cache.get(p.n, prec);
        // Both ends are f64 values, so half and mid are exact in MPFR.
        let half = (Float::with_val(prec, p.b) - p.a) / 2u32;
        let mid = Float::with_val(prec, p.a) + &half;
        for (x, w) in rule.nodes.iter().zip(&rule.weights) {
            let t = Float::with_val(prec, x * &half) + &mid;
            out.push((t, Float::with_val(prec, w * &half)));
        }
    }
    out
}

/// Nodes t_k and weights w_k / (t_k (e^t_k - 1)) of the composite rule, the
/// kernel's weight folded in so that an integral is sum_k W_k J_i J_j.
pub(crate) fn weighted_nodes(
    panels: &[Panel],
    cache: &mut RuleCache,
    prec: u32,
) -> Vec<(Float, Float)> {
    panel_points(panels, cache, prec)
        .into_iter()
        .map(|(t, w)| {
            let denom = Float::with_val(prec, t.exp_m1_ref()) * &t;
            let wt = w / denom;
            (t, wt)
        })
        .collect()
}

#[cfg(test)]
mod tests {
    use super::*;
    use rug::ops::Pow;

    #[test]
    fn legendre_rule_integrates_polynomials_exactly() {
        let rule = gauss_legendre(12, 200);
        // A 12-point rule is exact to degree 23: int_{-1}^{1} x^22 = 2/23.
        let mut s = Float::with_val(200, 0);
        for (x, w) in rule.nodes.iter().zip(&rule.weights) {
            s += Float::with_val(200, x.clone().pow(22u32)) * w;
        }
        let d = (s - Float::with_val(200, 2) / 23u32).abs().to_f64();
        assert!(d < 1e-55, "{d}");
    }

    #[test]
    fn composite_rule_matches_closed_form() {
        // int_0^inf t e^{-t} ... expressed through the folded weight:
        // sum_k W_k t_k^2 = int_0^inf t / (e^t - 1) dt = zeta(2) = pi^2/6
        // (DLMF 25.5.1).
        let prec = 160;
        let panels = plan(1.0, -40.0 * std::f64::consts::LN_10).unwrap();
        let mut cache = RuleCache::default();
        let nodes = weighted_nodes(&panels, &mut cache, prec);
        let mut s = Float::with_val(prec, 0);
        for (t, w) in &nodes {
            s += Float::with_val(prec, t * t) * w;
        }
        let pi2 = Float::with_val(prec, rug::float::Constant::Pi).square() / 6u32;
        let d = (s - pi2).abs().to_f64();
        assert!(d < 1e-38, "{d}");
    }
}
