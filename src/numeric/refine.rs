//! Solutions of M x = e_1 and M^T x = e_1 for the truncated system
//! M = 1 + K' at full precision without a full-precision factorisation:
//! one LU with partial pivoting in double precision, then iterative
//! refinement, x += LU^-1 (e_1 - M x), with the residual in MPFR.
//!
//! Each step costs one MPFR matrix-vector product (N^2 multiply-adds)
//! where the MPFR LU costs N^3 / 3, and each gains about
//! -log2(cond(M) 2^-53) bits, so a few steps reach the working precision.
//! The iteration is contracting only while cond(M) 2^-53 is small; it
//! reports None when a correction fails to shrink a hundredfold, and the
//! caller then factorises in MPFR. The stopping test is measured: the last
//! correction, below k^2 2^-prec of the solution, bounds what a contracting
//! iteration has left (ratio <= 1/100), which is the rounding-level error
//! `attempt` charges a full-precision LU.
//! Gamma needs no determinant, so this is all it factorises.

use rug::{Assign, Float};

/// A double-precision LU with partial pivoting of a k x k row-major matrix.
pub(crate) struct RoughLu {
    k: usize,
    lu: Vec<f64>,
    perm: Vec<usize>,
}

impl RoughLu {
    /// The factors of the leading `k` x `k` block of the row-major matrix
    /// `a` of side `side`, or None if a pivot vanishes in double precision.
    pub fn new(a: &[Float], side: usize, k: usize) -> Option<RoughLu> {
        let mut lu: Vec<f64> = (0..k * k)
            .map(|i| a[(i / k) * side + i % k].to_f64())
            .collect();
        let mut perm: Vec<usize> = (0..k).collect();
        for c in 0..k {
            let p = (c..k).max_by(|&x, &y| lu[x * k + c].abs().total_cmp(&lu[y * k + c].abs()))?;
            if lu[p * k + c] == 0.0 || !lu[p * k + c].is_finite() {
                return None;
            }
            if p != c {
                for j in 0..k {
                    lu.swap(p * k + j, c * k + j);
                }
                perm.swap(p, c);
            }
            let pivot = lu[c * k + c];
            let (upper, lower) = lu.split_at_mut((c + 1) * k);
            let pivot_row = &upper[c * k..(c + 1) * k];
            for row in lower.chunks_exact_mut(k) {
                let f = row[c] / pivot;
                row[c] = f;
                if f != 0.0 {
                    for (x, y) in row[c + 1..].iter_mut().zip(&pivot_row[c + 1..]) {
                        *x -= f * y;
                    }
                }
            }
        }
        Some(RoughLu { k, lu, perm })
    }

    /// Whether det M > 0: the pivots' signs and the permutation's parity
    /// (reliable where the refinement contracts, cond(M) 2^-53 << 1).
    pub fn determinant_positive(&self) -> bool {
        let mut negative = (0..self.k)
            .filter(|&c| self.lu[c * self.k + c] < 0.0)
            .count()
            % 2
            == 1;
        let mut seen = vec![false; self.k];
        for start in 0..self.k {
            let mut len = 0;
            let mut i = start;
            while !seen[i] {
                seen[i] = true;
                i = self.perm[i];
                len += 1;
            }
            if len > 0 && len % 2 == 0 {
                negative = !negative;
            }
        }
        !negative
    }

    /// M^-1 r (or M^-T r) in double precision.
    fn solve(&self, r: &[f64], transpose: bool) -> Vec<f64> {
        let (k, lu) = (self.k, &self.lu);
        if !transpose {
            // P M = L U: L U x = P r.
            let mut y: Vec<f64> = self.perm.iter().map(|&p| r[p]).collect();
            for i in 0..k {
                let s: f64 = (0..i).map(|j| lu[i * k + j] * y[j]).sum();
                y[i] -= s;
            }
            for i in (0..k).rev() {
                let s: f64 = (i + 1..k).map(|j| lu[i * k + j] * y[j]).sum();
                y[i] = (y[i] - s) / lu[i * k + i];
            }
            y
        } else {
            // M^T = U^T L^T P: U^T z = r, L^T w = z, x = P^T w.
            let mut z = r.to_vec();
            for i in 0..k {
                let s: f64 = (0..i).map(|j| lu[j * k + i] * z[j]).sum();
                z[i] = (z[i] - s) / lu[i * k + i];
            }
            for i in (0..k).rev() {
                let s: f64 = (i + 1..k).map(|j| lu[j * k + i] * z[j]).sum();
                z[i] -= s;
            }
            let mut x = vec![0.0; k];
            for (i, &p) in self.perm.iter().enumerate() {
                x[p] = z[i];
            }
            x
        }
    }

    /// x with M x = e_1 (M^T x = e_1 if `transpose`) at `prec` bits, M the
    /// leading k x k block of `a` (side `side`), or None if the refinement
    /// does not contract.
    pub fn refine(
        &self,
        a: &[Float],
        side: usize,
        transpose: bool,
        prec: u32,
    ) -> Option<Vec<Float>> {
        let k = self.k;
        let mut x: Vec<Float> = (0..k).map(|_| Float::new(prec)).collect();
        let mut r = vec![0.0; k];
        r[0] = 1.0;
        let mut residual: Vec<Float> = (0..k).map(|_| Float::new(prec)).collect();
        let mut last = f64::INFINITY;
        let mut t = Float::new(prec);
        // The residual's own rounding, about k 2^-prec of |M| |x|, is the
        // floor the corrections reach; the stop is at k^2 2^-prec of the
        // solution, the rounding `attempt` charges to every value. 60 steps
        // is far past any contracting case.
        let floor = (k * k) as f64 * f64::powi(2.0, -(prec as i32));
        for _ in 0..60 {
            let d = self.solve(&r, transpose);
            let size = d.iter().fold(0.0f64, |m, v| m.max(v.abs()));
            if !size.is_finite() || size > last / 100.0 {
                return None;
            }
            for (xi, di) in x.iter_mut().zip(&d) {
                *xi += *di;
            }
            let scale = x.iter().fold(0.0f64, |m, v| m.max(v.to_f64().abs()));
            if size <= scale * floor {
                return Some(x);
            }
            last = size;
            // residual = e_1 - M x (or M^T x), in MPFR.
            for (i, ri) in residual.iter_mut().enumerate() {
                ri.assign(if i == 0 { 1 } else { 0 });
                for (j, xj) in x.iter().enumerate() {
                    let m = if transpose {
                        &a[j * side + i]
                    } else {
                        &a[i * side + j]
                    };
                    t.assign(m * xj);
                    *ri -= &t;
                }
            }
            for (ri, v) in r.iter_mut().zip(&residual) {
                *ri = v.to_f64();
            }
        }
        None
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn refined_solutions_satisfy_the_system_to_full_precision() {
        // A nonsymmetric, diagonally weighted matrix like 1 + K'; the check
        // is the residual itself, computed independently at twice the
        // precision, and the transposed solve against the plain one
        // through (M^-1)_11 = e_1^T M^-1 e_1 read from both.
        let prec = 200;
        let k = 30;
        let a: Vec<Float> = (0..k * k)
            .map(|idx| {
                let (i, j) = ((idx / k) as f64, (idx % k) as f64);
                let v = if i == j {
                    1.0 + 0.5 / (1.0 + i)
                } else {
                    0.3 / (1.0 + (i - j).abs() + 0.1 * i)
                };
                Float::with_val(prec, v) / 7u32 * 7u32
                    + Float::with_val(prec, 1) / 3u32 / (1.0 + i + 2.0 * j)
            })
            .collect();
        let lu = RoughLu::new(&a, k, k).unwrap();
        for transpose in [false, true] {
            let x = lu.refine(&a, k, transpose, prec).unwrap();
            for i in 0..k {
                let mut s = Float::with_val(2 * prec, if i == 0 { -1 } else { 0 });
                for (j, xj) in x.iter().enumerate() {
                    let m = if transpose {
                        &a[j * k + i]
                    } else {
                        &a[i * k + j]
                    };
                    s += Float::with_val(2 * prec, m * xj);
                }
                assert!(s.abs().to_f64() < 1e-57, "row {i}, transpose {transpose}");
            }
        }
        let v = lu.refine(&a, k, false, prec).unwrap();
        let u = lu.refine(&a, k, true, prec).unwrap();
        let d = Float::with_val(prec, &v[0] - &u[0]).abs().to_f64();
        assert!(d < 1e-57, "{d}");
    }

    #[test]
    fn a_hopeless_condition_is_reported() {
        // Hilbert-like 40 x 40: cond far beyond 2^53, so no contraction.
        let prec = 300;
        let k = 40;
        let a: Vec<Float> = (0..k * k)
            .map(|idx| Float::with_val(prec, 1) / ((idx / k + idx % k + 1) as u32))
            .collect();
        let lu = RoughLu::new(&a, k, k);
        assert!(lu.is_none_or(|lu| lu.refine(&a, k, false, prec).is_none()));
    }
}
