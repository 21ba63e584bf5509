//! Checks of the fixed-point LU (lu.rs) against exact rational inverses of small
//! integer matrices, against plain MPFR Gaussian elimination written here at
//! twice the precision, and on the worst case of partial pivoting.

use super::lu::Solved;
use super::{factor, factor_nested};
use rug::{Float, Rational};

fn floats(vals: &[i64], prec: u32) -> Vec<Float> {
    vals.iter().map(|&v| Float::with_val(prec, v)).collect()
}

/// Exact inverse by Gauss-Jordan over the rationals.
fn rational_inverse(vals: &[i64], n: usize) -> Vec<Rational> {
    let mut m: Vec<Rational> = vals.iter().map(|&v| Rational::from(v)).collect();
    let mut inv: Vec<Rational> = (0..n * n)
        .map(|i| Rational::from(u8::from(i / n == i % n)))
        .collect();
    for c in 0..n {
        let p = (c..n)
            .find(|&r| m[r * n + c] != 0)
            .expect("invertible test matrix");
        for j in 0..n {
            m.swap(p * n + j, c * n + j);
            inv.swap(p * n + j, c * n + j);
        }
        let d = m[c * n + c].clone();
        for j in 0..n {
            m[c * n + j] /= &d;
            inv[c * n + j] /= &d;
        }
        for r in (0..n).filter(|&r| r != c) {
            let f = m[r * n + c].clone();
            for j in 0..n {
                let (a, b) = (
                    Rational::from(&f * &m[c * n + j]),
                    Rational::from(&f * &inv[c * n + j]),
                );
                m[r * n + j] -= a;
                inv[r * n + j] -= b;
            }
        }
    }
    inv
}

fn close(x: &Float, want: &Rational, tol: f64) -> bool {
    let w = Float::with_val(x.prec(), want);
    Float::with_val(x.prec(), x - &w).abs().to_f64() <= tol * w.to_f64().abs().max(1.0)
}

/// The first column and first row of the inverse against the exact one.
fn check_against_rational(vals: &[i64], n: usize, s: &Solved, tol: f64) {
    let inv = rational_inverse(vals, n);
    for i in 0..n {
        assert!(
            close(&s.first_column[i], &inv[i * n], tol),
            "column entry {i}"
        );
        assert!(close(&s.first_row[i], &inv[i], tol), "row entry {i}");
    }
    assert!(close(&s.inv11, &inv[0], tol));
}

#[test]
fn small_system_against_closed_form() {
    // [[2, 1], [4, 5]]: det 6, inverse [[5, -1], [-4, 2]] / 6 (by hand).
    let s = factor(floats(&[2, 1, 4, 5], 100), 2, 100).unwrap();
    let d = (s.ln_det.clone() - Float::with_val(100, 6).ln())
        .abs()
        .to_f64();
    assert!(d < 1e-28);
    check_against_rational(&[2, 1, 4, 5], 2, &s, 1e-28);
}

#[test]
fn nested_factorisation_reads_block_and_whole() {
    // The leading block [[1, -3], [4, 2]] needs a swap inside it and the
    // first column's largest entry (9) lies outside it. By cofactor
    // expansion: det(block) = 14, det(whole) = 40; the inverses are exact
    // rational Gauss-Jordan.
    let vals = [1, -3, 0, 5, 4, 2, 1, 0, 9, 1, 2, 0, 0, 6, 1, 8];
    let (small, whole) = factor_nested(floats(&vals, 120), 4, 2, 120).unwrap();
    let near = |x: &Float, want: f64| (x.to_f64() - want).abs() < 1e-15;
    assert!(near(&small.ln_det, 14f64.ln()) && near(&whole.ln_det, 40f64.ln()));
    check_against_rational(&[1, -3, 4, 2], 2, &small, 1e-33);
    check_against_rational(&vals, 4, &whole, 1e-33);
}

#[test]
fn negative_determinant_is_refused() {
    assert!(factor(floats(&[1, 2, 3, 4], 100), 2, 100).is_err());
}

#[test]
fn singular_and_out_of_range_systems_are_errors() {
    assert!(factor(floats(&[1, 2, 2, 4], 100), 2, 100).is_err());
    assert!(factor(floats(&[1, 0, 0, 0], 100), 2, 100).is_err());
    let mut huge = floats(&[1, 1, 1, 1], 100);
    huge[0] <<= 300;
    assert!(factor(huge, 2, 100).is_err());
}

/// ln |det|, its sign, A^-1 e_1 and A^-T e_1 by plain Gaussian elimination
/// with partial pivoting in MPFR, written independently of the module.
fn reference(a: &[Float], k: usize, prec: u32) -> (Float, bool, Vec<Float>, Vec<Float>) {
    let solve = |transpose: bool| -> (Float, bool, Vec<Float>) {
        let mut m: Vec<Float> = (0..k * k)
            .map(|idx| {
                let (i, j) = (idx / k, idx % k);
                let at = if transpose { j * k + i } else { i * k + j };
                Float::with_val(prec, &a[at])
            })
            .collect();
        let mut b: Vec<Float> = (0..k)
            .map(|i| Float::with_val(prec, u8::from(i == 0)))
            .collect();
        let mut ln_det = Float::new(prec);
        let mut negative = false;
        for c in 0..k {
            let p = (c..k)
                .max_by(|&x, &y| m[x * k + c].cmp_abs(&m[y * k + c]).unwrap())
                .unwrap();
            if p != c {
                for j in 0..k {
                    m.swap(p * k + j, c * k + j);
                }
                b.swap(p, c);
                negative = !negative;
            }
            let piv = m[c * k + c].clone();
            negative ^= piv.is_sign_negative();
            ln_det += Float::with_val(prec, piv.abs_ref()).ln();
            for r in (c + 1)..k {
                let f = Float::with_val(prec, &m[r * k + c] / &piv);
                for j in (c + 1)..k {
                    let t = Float::with_val(prec, &f * &m[c * k + j]);
                    m[r * k + j] -= t;
                }
                let t = Float::with_val(prec, &f * &b[c]);
                b[r] -= t;
            }
        }
        for r in (0..k).rev() {
            for j in (r + 1)..k {
                let t = Float::with_val(prec, &m[r * k + j] * &b[j]);
                b[r] -= t;
            }
            b[r] /= &m[r * k + r];
        }
        (ln_det, negative, b)
    };
    let (ln_det, negative, column) = solve(false);
    let (_, _, row) = solve(true);
    (ln_det, negative, column, row)
}

/// 1 + D, D_ij = r_ij (1 + 4j/k) e^(-|i-j|/8) / 8 with r_ij in [-1, 1] from
/// a fixed linear congruential sequence: entries growing with the column
/// like those of K', decaying away from the diagonal, well conditioned.
fn decaying(k: usize, prec: u32, seed: u64) -> Vec<Float> {
    let mut state = seed;
    (0..k * k)
        .map(|idx| {
            state = state
                .wrapping_mul(6364136223846793005)
                .wrapping_add(1442695040888963407);
            let r = (state >> 11) as f64 / (1u64 << 53) as f64 * 2.0 - 1.0;
            let (i, j) = (idx / k, idx % k);
            let d = (1.0 + 4.0 * j as f64 / k as f64) * (-(i.abs_diff(j) as f64) / 8.0).exp() / 8.0;
            // A value with all prec bits set, not only the 53 of r.
            let mut v = Float::with_val(prec, r * d);
            v += Float::with_val(prec, Float::with_val(prec, r.abs()).sqrt_ref()) >> 60u32;
            if i == j {
                v += 1u32;
            }
            v
        })
        .collect()
}

/// The largest |x - y| relative to max(|y|, 1) over the vectors.
fn worst(x: &[Float], y: &[Float]) -> f64 {
    x.iter()
        .zip(y)
        .map(|(a, b)| {
            let d = Float::with_val(b.prec(), a - b).abs().to_f64();
            d / b.to_f64().abs().max(1.0)
        })
        .fold(0.0, f64::max)
}

#[test]
fn rounding_stays_inside_the_engine_allowance() {
    // The engine adds k^2 2^-prec times max(|value|, 1) for rounding; the
    // single-rounding arithmetic should be well inside it (below k 2^-prec).
    let (k, inner, prec) = (200, 180, 190);
    for seed in [1u64, 2] {
        let a = decaying(k, prec, seed);
        let (small, whole) = factor_nested(a.clone(), k, inner, prec).unwrap();
        let block: Vec<Float> = (0..inner * inner)
            .map(|idx| a[(idx / inner) * k + idx % inner].clone())
            .collect();
        for (got, m, n) in [(&whole, &a, k), (&small, &block, inner)] {
            let (ln_det, negative, column, row) = reference(m, n, 2 * prec);
            assert!(!negative);
            let allowance = (n * n) as f64 * (-(prec as f64)).exp2();
            let tight = n as f64 * (-(prec as f64)).exp2();
            let e = worst(
                std::slice::from_ref(&got.ln_det),
                std::slice::from_ref(&ln_det),
            );
            assert!(e < tight && e < allowance, "ln det off by {e:e} at k = {n}");
            let e = worst(&got.first_column, &column).max(worst(&got.first_row, &row));
            assert!(e < tight, "inverse off by {e:e} at k = {n}");
        }
    }
}

#[test]
fn pivot_growth_beyond_the_headroom_restarts_wider() {
    // The worst case of partial pivoting (1 on the diagonal and in the last
    // column, -1 below the diagonal) doubles the last column at every step:
    // det = 2^(n-1) (growth factor 2^(n-1), a textbook example), far beyond
    // the first width's headroom at n = 90.
    let (n, prec) = (90, 120);
    let vals: Vec<i64> = (0..n * n)
        .map(|idx| {
            let (i, j) = (idx / n, idx % n);
            if i == j || j == n - 1 {
                1
            } else if i > j {
                -1
            } else {
                0
            }
        })
        .collect();
    let a = floats(&vals, prec);
    let s = factor(a.clone(), n, prec).unwrap();
    let want = Float::with_val(prec, 2).ln() * (n - 1) as u32;
    assert!(worst(std::slice::from_ref(&s.ln_det), &[want]) < 1e-33);
    let (_, _, column, row) = reference(&a, n, 2 * prec);
    assert!(worst(&s.first_column, &column) < 1e-33);
    assert!(worst(&s.first_row, &row) < 1e-33);
}
