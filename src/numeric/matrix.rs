//! The truncated kernel on shared quadrature nodes, its tilt, and the two
//! functionals read off an LU factorisation: the (1,1) element of the
//! inverse and the log-determinant, all in MPFR.

use rug::{Assign, Float};

use super::bessel::{bessel_j_upto, ln_magnitude};
use crate::error::{Error, Result};

/// The symmetric matrix S_ij = int_0^inf J_i(2gt) J_j(2gt) dt / (t (e^t - 1)),
/// 1 <= i, j <= n, row-major (index (i-1) n + (j-1)).
///
/// All entries share the nodes: at each node the orders 0..m are computed
/// in one recurrence and the node adds a rank-one term. Orders above m, with
/// m from the magnitude estimate of J at 2g t_k, would contribute below
/// exp(ln_drop) and are skipped.
pub(crate) fn kernel_integrals(
    g: &Float,
    n: usize,
    nodes: &[(Float, Float)],
    ln_drop: f64,
    prec: u32,
) -> Vec<Float> {
    let mut s = vec![Float::new(prec); n * n];
    let two_g = Float::with_val(prec, g * 2u32);
    let mut u: Vec<Float> = vec![Float::new(prec); n + 1];
    let mut prod = Float::new(prec);
    for (t, w) in nodes {
        let x = Float::with_val(prec, &two_g * t);
        let xf = x.to_f64();
        let ln_w = w.to_f64().abs().ln();
        let mut m = n;
        while m > 0 && ln_magnitude(m, xf) + ln_w < ln_drop {
            m -= 1;
        }
        if m == 0 {
            continue;
        }
        let js = bessel_j_upto(m, &x, prec);
        for (ui, ji) in u.iter_mut().zip(&js).take(m + 1).skip(1) {
            ui.assign(w * ji);
        }
        for i in 1..=m {
            let row = (i - 1) * n;
            let ui = &u[i];
            for (sij, jj) in s[row + i - 1..row + m].iter_mut().zip(&js[i..=m]) {
                prod.assign(ui * jj);
                *sij += &prod;
            }
        }
    }
    for i in 1..=n {
        for j in (i + 1)..=n {
            let v = s[(i - 1) * n + j - 1].clone();
            s[(j - 1) * n + i - 1] = v;
        }
    }
    s
}

/// 1 + K' for the leading k x k block of S, with
/// K_ij = 2 j (-1)^(j(i+1)) S_ij and the tilt in rational form:
/// K'_ij = 2 s2 K_ij for even i and odd j, 2 c2 K_ij otherwise.
pub(crate) fn tilted_system(s: &[Float], n: usize, k: usize, c2: &Float, prec: u32) -> Vec<Float> {
    let s2 = Float::with_val(prec, 1u32 - c2);
    let mut a = Vec::with_capacity(k * k);
    for i in 1..=k {
        for j in 1..=k {
            let odd_even = i % 2 == 0 && j % 2 == 1;
            // (-1)^(j(i+1)) is -1 exactly on that block.
            let mut v = if odd_even {
                Float::with_val(prec, -&s2)
            } else {
                Float::with_val(prec, c2)
            };
            v *= (4 * j) as u32;
            v *= &s[(i - 1) * n + j - 1];
            if i == j {
                v += 1u32;
            }
            a.push(v);
        }
    }
    a
}

/// What one factorisation yields.
pub(crate) struct Solved {
    /// [(1 + K')^{-1}]_11
    pub inv11: Float,
    /// ln det(1 + K')
    pub ln_det: Float,
}

/// LU with partial pivoting of the k x k row-major matrix, then the first
/// column of the inverse's first entry and the log of the determinant.
pub(crate) fn factor(mut a: Vec<Float>, k: usize, prec: u32) -> Result<Solved> {
    let mut rhs: Vec<Float> = (0..k)
        .map(|i| Float::with_val(prec, if i == 0 { 1 } else { 0 }))
        .collect();
    let mut ln_det = Float::new(prec);
    let mut negative = false;
    let mut tmp = Float::new(prec);
    for c in 0..k {
        let mut p = c;
        for r in (c + 1)..k {
            if a[r * k + c].cmp_abs(&a[p * k + c]) == Some(std::cmp::Ordering::Greater) {
                p = r;
            }
        }
        if a[p * k + c].is_zero() {
            return Err(Error::numeric("the truncated kernel system is singular"));
        }
        if p != c {
            for j in 0..k {
                a.swap(p * k + j, c * k + j);
            }
            rhs.swap(p, c);
            negative = !negative;
        }
        let pivot = a[c * k + c].clone();
        if pivot.is_sign_negative() {
            negative = !negative;
        }
        ln_det += Float::with_val(prec, pivot.abs_ref()).ln();
        for r in (c + 1)..k {
            if a[r * k + c].is_zero() {
                continue;
            }
            let f = Float::with_val(prec, &a[r * k + c] / &pivot);
            for j in (c + 1)..k {
                tmp.assign(&f * &a[c * k + j]);
                a[r * k + j] -= &tmp;
            }
            tmp.assign(&f * &rhs[c]);
            rhs[r] -= &tmp;
        }
    }
    if negative {
        return Err(Error::numeric(
            "det(1 + K') came out negative: the truncation is not trustworthy",
        ));
    }
    for r in (0..k).rev() {
        for j in (r + 1)..k {
            tmp.assign(&a[r * k + j] * &rhs[j]);
            rhs[r] -= &tmp;
        }
        rhs[r] /= &a[r * k + r];
    }
    Ok(Solved {
        inv11: rhs.swap_remove(0),
        ln_det,
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn factor_small_system() {
        // [[2, 1], [4, 5]]: det 6, inverse (1,1) = 5/6.
        let a: Vec<Float> = [2, 1, 4, 5]
            .iter()
            .map(|&v| Float::with_val(100, v))
            .collect();
        let s = factor(a, 2, 100).unwrap();
        let d = (s.ln_det - Float::with_val(100, 6).ln()).abs().to_f64();
        assert!(d < 1e-28);
        let e = (s.inv11 - Float::with_val(100, 5) / 6u32).abs().to_f64();
        assert!(e < 1e-28);
    }

    #[test]
    fn negative_determinant_is_refused() {
        let a: Vec<Float> = [1, 2, 3, 4]
            .iter()
            .map(|&v| Float::with_val(100, v))
            .collect();
        assert!(factor(a, 2, 100).is_err());
    }
}
