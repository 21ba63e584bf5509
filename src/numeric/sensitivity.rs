//! The first-order change of Gamma = 4 g^2 [(1 + K')^-1]_11 when the kernel
//! integrals S change, read off the factorisation instead of a second one:
//!
//!   d[(1 + K')^-1]_11 = -u^T dK' v,  u = (1 + K')^-T e_1, v = (1 + K')^-1 e_1.
//!
//! With K'_ij = 4 j sigma_ij S_ij and sigma_ij = c2 - [i even][j odd] (the
//! tilt, matrix.rs), u^T K' v is the form sum_ij u_i sigma_ij S_ij w_j with
//! w_j = 4 j v_j. On a quadrature rule S = sum_k r_k r_k^T, so the form is
//! sum_k +-(c2 (u.r_k)(w.r_k) - (u_even.r_k)(w_odd.r_k)): two dot products
//! per node split by parity, instead of the N^2 per node a Gram matrix
//! costs. The coarse rule's value of Gamma is then the fine one minus
//! 4 g^2 (form(coarse) - form(fine)), exact to first order in the rules'
//! difference, whose square lies far below the tolerance.

use rug::{Assign, Float};

use super::contour::Node;
use super::gram::joined;
use crate::error::Result;

/// The weights of the form: u and w = 4 j v, by order 1..=n.
pub(crate) struct Form<'a> {
    c2: Float,
    u: &'a [Float],
    w: Vec<Float>,
    prec: u32,
}

impl<'a> Form<'a> {
    /// The form of the first row u and first column v of the inverse, at
    /// the working precision `prec` (which also fixes the rows' precision:
    /// the rule was laid out for it).
    pub fn new(c2: &Float, u: &'a [Float], v: &[Float], prec: u32) -> Form<'a> {
        let w = v
            .iter()
            .enumerate()
            .map(|(j, x)| Float::with_val(prec, x * (4 * (j + 1)) as u32))
            .collect();
        Form {
            c2: Float::with_val(prec, c2),
            u,
            w,
            prec,
        }
    }

    fn n(&self) -> usize {
        self.u.len()
    }

    /// sum_ij u_i sigma_ij S_ij w_j over the leading n x n block of the
    /// row-major matrix `s` of side `side`.
    pub fn on_matrix(&self, s: &[Float], side: usize) -> Float {
        let prec = self.prec;
        let mut total = Float::new(prec);
        let mut row = Float::new(prec);
        let mut odd_cols = Float::new(prec);
        for (i, ui) in self.u.iter().enumerate() {
            row.assign(0);
            odd_cols.assign(0);
            for (j, wj) in self.w.iter().enumerate() {
                let t = Float::with_val(prec, &s[i * side + j] * wj);
                // Orders are 1-based: index j holds order j + 1.
                if j % 2 == 0 {
                    odd_cols += &t;
                }
                row += t;
            }
            let mut sum = Float::with_val(prec, &row * &self.c2);
            if i % 2 == 1 {
                sum -= &odd_cols;
            }
            total += sum * ui;
        }
        total
    }

    /// The same form on the rule of `nodes`: sum_k of its rows' terms, the
    /// orders per node chosen by the rule's dropping level as for the Gram
    /// matrix; split over `threads` threads.
    pub fn on_nodes(
        &self,
        nodes: &[Node],
        g: &Float,
        ln_drop: f64,
        threads: usize,
    ) -> Result<Float> {
        let prec = self.prec;
        let two_g = Float::with_val(prec, g * 2u32);
        let gf = g.to_f64();
        let chunk = nodes.len().div_ceil(threads.max(1)).max(1);
        let parts: Vec<Result<Float>> = std::thread::scope(|s| {
            let handles: Vec<_> = nodes
                .chunks(chunk)
                .map(|part| {
                    let two_g = &two_g;
                    s.spawn(move || -> Result<Float> {
                        let mut total = Float::new(prec);
                        for node in part {
                            let m = node.orders(self.n(), gf, ln_drop, false);
                            if m == 0 {
                                continue;
                            }
                            for row in node.rows(two_g, m, prec)? {
                                let t = self.row_term(&row.values);
                                if row.negative {
                                    total -= t;
                                } else {
                                    total += t;
                                }
                            }
                        }
                        Ok(total)
                    })
                })
                .collect();
            joined(handles)
        });
        let mut total = Float::new(prec);
        for p in parts {
            total += p?;
        }
        Ok(total)
    }

    /// c2 (u.r)(w.r) - (u_even.r)(w_odd.r) for one row r of orders 1..=m.
    fn row_term(&self, r: &[Float]) -> Float {
        let prec = self.prec;
        // [even order, odd order] parts of u.r and w.r.
        let mut ur = [Float::new(prec), Float::new(prec)];
        let mut wr = [Float::new(prec), Float::new(prec)];
        let mut t = Float::new(prec);
        for (j, x) in r.iter().enumerate() {
            let odd = j % 2;
            t.assign(x * &self.u[j]);
            ur[1 - odd] += &t;
            t.assign(x * &self.w[j]);
            wr[1 - odd] += &t;
        }
        let [u_even, u_odd] = ur;
        let [w_even, w_odd] = wr;
        let mut term = Float::with_val(prec, &u_even + &u_odd);
        term *= Float::with_val(prec, &w_even + &w_odd);
        term *= &self.c2;
        term -= u_even * w_odd;
        term
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::numeric::contour::layout;
    use crate::numeric::matrix::{factor, kernel_integrals, tilted_system};
    use crate::numeric::quadrature::RuleCache;

    #[test]
    fn first_order_shift_matches_a_second_factorisation() {
        // Two deliberately different rules (tolerances 1e-12 and 1e-40):
        // the linearised change of [(1 + K')^-1]_11 must reproduce the one
        // two factorisations give, up to the square of that change. g = 2
        // uses the plain rule, g = 12 the split with its ray.
        let prec = 200;
        let c2 = Float::with_val(prec, 0.25);
        for (gv, n) in [(2.0, 24usize), (12.0, 40)] {
            let g = Float::with_val(prec, gv);
            let mut cache = RuleCache::default();
            let ln = std::f64::consts::LN_10;
            let rough = layout(gv, -12.0 * ln, n, &mut cache, prec).unwrap();
            let fine = layout(gv, -40.0 * ln, n, &mut cache, prec).unwrap();
            // Orders are kept (and the fixed point rounds) far below both
            // rules' errors, so that the rules differ by quadrature only.
            let drop_rough = -55.0 * ln;
            let drop_fine = -55.0 * ln;
            let s_rough = kernel_integrals(&g, n, &rough, drop_rough, prec, 2).unwrap();
            let s_fine = kernel_integrals(&g, n, &fine, drop_fine, prec, 2).unwrap();
            let solve = |s: &[Float]| factor(tilted_system(s, n, n, &c2, prec), n, prec).unwrap();
            let at_fine = solve(&s_fine);
            let at_rough = solve(&s_rough);
            let form = Form::new(&c2, &at_fine.first_row, &at_fine.first_column, prec);
            let shift =
                form.on_nodes(&rough, &g, drop_rough, 2).unwrap() - form.on_matrix(&s_fine, n);
            let predicted = Float::with_val(prec, &at_fine.inv11 - &shift);
            let change = Float::with_val(prec, &at_rough.inv11 - &at_fine.inv11)
                .abs()
                .to_f64();
            let miss = Float::with_val(prec, &predicted - &at_rough.inv11)
                .abs()
                .to_f64();
            assert!(
                change > 1e-30,
                "g = {gv}: the rules should differ ({change:e})"
            );
            assert!(
                miss < 1e-6 * change,
                "g = {gv}: change {change:e}, first order missed by {miss:e}"
            );
        }
    }
}
