//! The quadrature nodes of the kernel integrals
//! S_ij = int_0^inf J_i(2gt) J_j(2gt) f(t) dt, f(t) = 1 / (t (e^t - 1)),
//! and the real rows each node adds to the Gram sum S = sum_k r_k r_k^T.
//!
//! At weak and moderate coupling the nodes are one composite Gauss-Legendre
//! rule on [0, T] (quadrature.rs). At strong coupling that rule needs about
//! g T nodes, because the product oscillates like e^(4igt) all the way to T.
//! Past a point a where x = 2gt exceeds every order in use by a factor
//! KAPPA, the product is split with H = H^(1) = J + iY (real argument):
//!
//!   J_i J_j = (1/2) Re(H_i H_j) + (1/2) (J_i J_j + Y_i Y_j).
//!
//! The second half has no e^(4igt): it is Re(H_i conj(H_j)), whose phase
//! moves like (j^2 - i^2) / (2x) (DLMF 10.20), so [a, T] needs few nodes.
//! The first half is analytic for Re t >= a, Im t >= 0 (f's poles lie on
//! Re t = 0) and decays there like e^(-4 g c Im t), c = sqrt(1 - (i/x)^2),
//! so by Cauchy's theorem its integral over [a, inf) is the one up the
//! ray a + is, s >= 0, cut at S where the rest is below the tolerance (the
//! arc at infinity vanishes). The ray is the same length in units of 1/g at
//! any coupling. On [0, a] the plain rule remains.

use std::f64::consts::{LN_2, PI};

use rug::Float;

use crate::error::{Error, Result};

use super::bessel::bessel_j_upto;
use super::hankel::{hankel_upto, Cx};
use super::quadrature::{
    cutoff, oscillating, panel_points, plan, plan_range, weighted_nodes, Growth, Panel, RuleCache,
};

/// How far past the largest order the split starts, x = KAPPA * top: far
/// enough that Y_i, H_i stay of the size of J_i (no cancellation between the
/// halves) and the ray's decay rate c stays at least 0.6, near enough that
/// the oscillating piece [0, a] stays short (its nodes grow like KAPPA).
const KAPPA: f64 = 1.25;

/// The cost of a node past the split in plain nodes, measured as the ratio
/// of run times at equal node counts (Gamma_cusp, 15 and 30 digits, g = 3
/// to 10: the two layouts break even near g = 5 at 30 digits).
const SPLIT_COST: f64 = 3.0;

/// One quadrature node and the weight folded with f.
pub(crate) enum Node {
    /// t on the real axis before the split, weight W = w f(t): the row
    /// sqrt(W) J_i(2gt).
    Plain { t: Float, w: Float },
    /// t in [a, T], W = w f(t) / 2: the rows sqrt(W) J_i and sqrt(W) Y_i.
    Smooth { t: Float, w: Float },
    /// t = a + i s on the ray, W = i w f(t) / 2 and its square root:
    /// with c_i = root H_i(2gt), the rows Re c (added) and Im c (taken
    /// away), since Re(W H_i H_j) = Re c_i Re c_j - Im c_i Im c_j.
    Ray { t: Cx, root: Cx },
}

/// One real row of a node: orders 1..=m, and whether it is subtracted.
pub(crate) struct Row {
    pub values: Vec<Float>,
    pub negative: bool,
}

impl Node {
    /// An upper bound of |entry| over the node's rows (f64, control only):
    /// |J_i(x)| <= min(1, x/2) (DLMF 10.14.1, 10.14.4); past the split
    /// |H_i(x)|^2 <= 2 / (pi x c) < 1 (DLMF 10.18.17, 10.20) and H decays
    /// up the ray.
    pub fn bound(&self, g: f64) -> f64 {
        match self {
            Node::Plain { t, w } => w.to_f64().abs().sqrt() * (g * t.to_f64()).min(1.0),
            Node::Smooth { w, .. } => w.to_f64().abs().sqrt(),
            Node::Ray { root, .. } => root.abs().to_f64(),
        }
    }

    /// The highest order worth a row, from `top` down: below exp(ln_drop)
    /// an order's contribution is dropped (plain nodes only: past the split
    /// every order is of full size).
    pub fn orders(&self, top: usize, g: f64, ln_drop: f64, squared: bool) -> usize {
        match self {
            Node::Plain { t, w } => {
                let xf = 2.0 * g * t.to_f64();
                let ln_w = w.to_f64().abs().ln();
                let power = if squared { 2.0 } else { 1.0 };
                let mut m = top;
                while m > 0 && power * super::bessel::ln_magnitude(m, xf) + ln_w < ln_drop {
                    m -= 1;
                }
                m
            }
            _ => top,
        }
    }

    /// The node's real rows over orders 1..=m (m >= 1).
    pub fn rows(&self, two_g: &Float, m: usize, prec: u32) -> Result<Vec<Row>> {
        match self {
            Node::Plain { t, w } => {
                let mut js = bessel_j_upto(m, &Float::with_val(prec, two_g * t), prec);
                js.remove(0);
                let root = Float::with_val(prec, w.sqrt_ref());
                for v in js.iter_mut() {
                    *v *= &root;
                }
                Ok(vec![Row {
                    values: js,
                    negative: false,
                }])
            }
            Node::Smooth { t, w } => {
                let z = Cx::new(Float::with_val(prec, two_g * t), Float::new(prec));
                let root = Cx::new(Float::with_val(prec, w.sqrt_ref()), Float::new(prec));
                Ok(split_rows(hankel(m, &z, &root, prec)?, false))
            }
            Node::Ray { t, root } => Ok(split_rows(hankel(m, &t.scale(two_g), root, prec)?, true)),
        }
    }

    /// Rows per order (plain 1, the split's 2), for sharing work out.
    pub fn width(&self) -> usize {
        match self {
            Node::Plain { .. } => 1,
            _ => 2,
        }
    }
}

/// root H_i(z) for i = 1..=m.
fn hankel(m: usize, z: &Cx, root: &Cx, prec: u32) -> Result<Vec<Cx>> {
    // `layout` only puts nodes where the expansion converges and m < |z|,
    // for orders up to its `top`: a larger m is the caller's mistake.
    let mut h = hankel_upto(m, z, root, prec).ok_or_else(|| {
        Error::numeric(format!(
            "order {m} is past the split of the contour at |z| = {:.1}",
            z.abs().to_f64()
        ))
    })?;
    h.remove(0);
    Ok(h)
}

/// The rows Re c and Im c of a node past the split, the second subtracted
/// on the ray.
fn split_rows(c: Vec<Cx>, subtract_im: bool) -> Vec<Row> {
    let (re, im): (Vec<Float>, Vec<Float>) = c.into_iter().map(|c| (c.re, c.im)).unzip();
    vec![
        Row {
            values: re,
            negative: false,
        },
        Row {
            values: im,
            negative: subtract_im,
        },
    ]
}

/// The decay rate c = sqrt(1 - (top/x)^2) of H_top at x past its turning
/// point, or None at or before KAPPA's safety margin of 1.02.
fn decay(top: usize, x: f64) -> Option<f64> {
    let r = top as f64 / x;
    (x > 0.0 && r < 1.0 / 1.02).then(|| (1.0 - r * r).sqrt())
}

fn plain_nodes(panels: &[Panel], cache: &mut RuleCache, prec: u32) -> Vec<Node> {
    weighted_nodes(panels, cache, prec)
        .into_iter()
        .map(|(t, w)| Node::Plain { t, w })
        .collect()
}

/// Nodes for all S_ij with i, j <= top at absolute accuracy exp(ln_tol), or
/// None when no rule reaches it.
pub(crate) fn layout(
    g: f64,
    ln_tol: f64,
    top: usize,
    cache: &mut RuleCache,
    prec: u32,
) -> Option<Vec<Node>> {
    let t_max = cutoff(ln_tol);
    // The Hankel expansion's smallest term is about e^(-2|z|); forward
    // recurrence needs the orders below |z|.
    let wprec = f64::from(prec + 16);
    let x_split = (KAPPA * top as f64).max(0.5 * wprec * LN_2 + 16.0);
    let a = x_split / (2.0 * g);
    if a > 0.5 * t_max {
        return Some(plain_nodes(&plan(g, ln_tol)?, cache, prec));
    }
    // A third of the tolerance for each piece.
    let ln_piece = ln_tol - 3f64.ln();
    // The real-axis pieces share f's nearest pole, 2 pi i.
    let on_axis = |lo: f64, hi: f64, ln_max: &dyn Fn(f64, f64, f64) -> Option<f64>| {
        plan_range(
            lo,
            hi,
            ln_piece,
            &Growth {
                pole: (0.0, 2.0 * PI),
                ln_max,
            },
        )
    };
    let plain = on_axis(0.0, a, &oscillating(g))?;
    // Past the split the analytic continuation of Re(H_i conj(H_j)) grows
    // at most like e^(y |c_i - c_j|) <= e^(y (1 - c_top)) at y = 2g Im t;
    // f is bounded by e^2 e^(-Re t) / |t| away from its poles.
    let smooth_growth = move |left: f64, _major: f64, minor: f64| {
        let c = decay(top, 2.0 * g * left)?;
        Some(2.0 * g * minor * (1.0 - c) - left + 2.0 - left.ln())
    };
    let smooth = on_axis(a, t_max.max(a + 1.0), &smooth_growth)?;
    // Up the ray |H_i H_j f| <= e^(-4 g c s) e^2 e^(-a) / a with c at the
    // smallest x the ellipse reaches; below the axis (s < 0) H grows at
    // most like e^(4 g |s|).
    let ray_growth = move |left: f64, _major: f64, minor: f64| {
        let c = decay(top, 2.0 * g * (a - minor))?;
        let bessel = if left >= 0.0 {
            -4.0 * g * c * left
        } else {
            -4.0 * g * left
        };
        Some(bessel + minor - a + 2.0 - a.ln())
    };
    let c_a = decay(top, x_split)?;
    let reach = ((2.0 - a - a.ln() - ln_piece) / (4.0 * g * c_a)).max(1.0 / (4.0 * g));
    let ray = plan_range(
        0.0,
        reach,
        ln_piece,
        &Growth {
            pole: (0.0, a),
            ln_max: &ray_growth,
        },
    )?;
    // A node past the split costs about SPLIT_COST plain ones (two rows,
    // complex recurrence, and no orders to drop): split only when that wins.
    let count = |p: &[Panel]| p.iter().map(|q| q.n).sum::<usize>() as f64;
    let whole = plan(g, ln_tol)?;
    if count(&whole) <= count(&plain) + SPLIT_COST * (count(&smooth) + count(&ray)) {
        return Some(plain_nodes(&whole, cache, prec));
    }
    let mut nodes = plain_nodes(&plain, cache, prec);
    for (t, w) in weighted_nodes(&smooth, cache, prec) {
        nodes.push(Node::Smooth { t, w: w / 2u32 });
    }
    let a_f = Float::with_val(prec, a);
    for (s, w) in panel_points(&ray, cache, prec) {
        let t = Cx::new(a_f.clone(), s);
        // W = i w f(t) / 2, f(t) = 1 / (t (e^t - 1)), e^t = e^a e^(is).
        let mut e = Cx::unit(&t.im).scale(&Float::with_val(prec, a_f.exp_ref()));
        e.re -= 1u32;
        let f = t.mul(&e).recip();
        let half_w = w / 2u32;
        let weight = Cx::new(-Float::with_val(prec, &f.im * &half_w), f.re * &half_w);
        nodes.push(Node::Ray {
            root: weight.sqrt(),
            t,
        });
    }
    Some(nodes)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::numeric::matrix::kernel_integrals;

    #[test]
    fn split_and_plain_rules_agree() {
        // The same integrals by the plain rule on [0, T] and by the split
        // with its ray: two independent quadratures of one integral.
        let prec = 200;
        let g = Float::with_val(prec, 12);
        let ln_tol = -45.0 * std::f64::consts::LN_10;
        let mut cache = RuleCache::default();
        let top = 40;
        let split = layout(12.0, ln_tol, top, &mut cache, prec).unwrap();
        assert!(split.iter().any(|n| matches!(n, Node::Ray { .. })));
        let plain: Vec<Node> = weighted_nodes(&plan(12.0, ln_tol).unwrap(), &mut cache, prec)
            .into_iter()
            .map(|(t, w)| Node::Plain { t, w })
            .collect();
        assert!(
            split.len() * 2 < plain.len(),
            "{} vs {}",
            split.len(),
            plain.len()
        );
        let drop = ln_tol - 10.0;
        let a = kernel_integrals(&g, top, &split, drop, prec, 2).unwrap();
        let b = kernel_integrals(&g, top, &plain, drop, prec, 2).unwrap();
        for (k, (u, v)) in a.iter().zip(&b).enumerate() {
            let d = Float::with_val(prec, u - v).abs().to_f64();
            assert!(d < 1e-40, "entry {k}: {d} ({})", v.to_f64());
        }
    }
}
