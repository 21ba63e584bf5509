//! The truncated kernel on shared quadrature nodes, its tilt, and the two
//! functionals read off an LU factorisation: the (1,1) element of the
//! inverse and the log-determinant, all in MPFR.

use rug::{Assign, Float};

use super::contour::Node;
use super::gram::{gram, Format};
use crate::error::{Error, Result};

/// The symmetric matrix S_ij = int_0^inf J_i(2gt) J_j(2gt) dt / (t (e^t - 1)),
/// 1 <= i, j <= n, row-major (index (i-1) n + (j-1)).
///
/// All entries share the nodes (contour.rs): each node adds the outer
/// products of its rows, accumulated exactly in fixed point (gram.rs) on
/// `threads` threads. Orders above m, with m from the magnitude estimate
/// of J at 2g t_k, would contribute below exp(ln_drop) and are skipped; the
/// fixed-point rounding is held below the same level summed over all nodes.
pub(crate) fn kernel_integrals(
    g: &Float,
    n: usize,
    nodes: &[Node],
    ln_drop: f64,
    prec: u32,
    threads: usize,
) -> Result<Vec<Float>> {
    let two_g = Float::with_val(prec, g * 2u32);
    let gf = g.to_f64();
    let orders: Vec<usize> = nodes
        .iter()
        .map(|node| node.orders(n, gf, ln_drop, false))
        .collect();
    let bounds: Vec<f64> = nodes
        .iter()
        .map(|node| node.bound(gf) * node.width() as f64)
        .collect();
    let largest = bounds.iter().cloned().fold(1.0, f64::max);
    let total: f64 = bounds.iter().sum::<f64>().max(1.0);
    // Rounding each entry to 2^-F errs by 2^-(F+1); an entry of S collects
    // at most 2^-F sum_k b_k, to be kept at the total dropping level (one
    // node's level times the node count), with 4 bits to spare.
    let ln_all = ln_drop + (nodes.len().max(1) as f64).ln();
    let frac_bits = ((total.ln() - ln_all) / std::f64::consts::LN_2)
        .ceil()
        .max(0.0) as u32
        + 4;
    let int_bits = largest.log2().ceil().max(0.0) as u32 + 2;
    let format = Format::new(int_bits, frac_bits)?;
    let cost: Vec<usize> = nodes
        .iter()
        .zip(&orders)
        .map(|(node, &m)| node.width() * m * m)
        .collect();
    let sums = gram(n, format, nodes.len(), &cost, threads, |k| {
        let m = orders[k];
        if m == 0 {
            return Ok(Vec::new());
        }
        nodes[k]
            .rows(&two_g, m, prec)?
            .iter()
            .map(|row| format.row(&row.values, row.negative))
            .collect()
    })?;
    let mut s = vec![Float::new(prec); n * n];
    let mut it = sums.into_iter();
    for i in 0..n {
        for j in i..n {
            let v = Float::with_val(prec, it.next().unwrap_or_default()) >> (2 * frac_bits);
            s[j * n + i].clone_from(&v);
            s[i * n + j] = v;
        }
    }
    Ok(s)
}

/// The diagonal integrals S_mm for m = from + 1 ..= upto on the same nodes,
/// for the trace of the kernel's tail (see `attempt` in mod.rs). On the
/// real axis each term W_k J_m^2 is positive, so plain MPFR sums lose
/// nothing to cancellation; past the split the rows' signed squares are of
/// the size of the result. Orders whose term would lie below exp(ln_drop)
/// at a node are skipped as in `kernel_integrals`.
pub(crate) fn diagonal_integrals(
    g: &Float,
    from: usize,
    upto: usize,
    nodes: &[Node],
    ln_drop: f64,
    prec: u32,
) -> Result<Vec<Float>> {
    let mut out = vec![Float::new(prec); upto.saturating_sub(from)];
    if out.is_empty() {
        return Ok(out);
    }
    let two_g = Float::with_val(prec, g * 2u32);
    let gf = g.to_f64();
    let mut term = Float::new(prec);
    for node in nodes {
        let m = node.orders(upto, gf, ln_drop, true);
        if m <= from {
            continue;
        }
        for row in node.rows(&two_g, m, prec)? {
            for (sum, v) in out.iter_mut().zip(&row.values[from..]) {
                term.assign(v.square_ref());
                if row.negative {
                    *sum -= &term;
                } else {
                    *sum += &term;
                }
            }
        }
    }
    Ok(out)
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
    /// (1 + K')^-1 e_1
    pub first_column: Vec<Float>,
    /// (1 + K')^-T e_1, the first row of the inverse
    pub first_row: Vec<Float>,
}

/// LU with partial pivoting of the k x k row-major matrix, read off for the
/// leading `inner` x `inner` block as well as for the whole matrix.
///
/// For the first `inner` columns the pivot is searched among the first
/// `inner` rows only: the row swaps then permute whole rows of the leading
/// block among themselves, so after `inner` steps the leading part of the
/// factorisation is the pivoted LU of that block, and its determinant and
/// first inverse column come with the big one's. Returns (block, whole).
pub(crate) fn factor_nested(
    mut a: Vec<Float>,
    k: usize,
    inner: usize,
    prec: u32,
) -> Result<(Solved, Solved)> {
    let inner = inner.clamp(1, k);
    let mut rhs: Vec<Float> = (0..k)
        .map(|i| Float::with_val(prec, if i == 0 { 1 } else { 0 }))
        .collect();
    let mut ln_det = Float::new(prec);
    let mut negative = false;
    let mut tmp = Float::new(prec);
    let mut block = None;
    let mut perm: Vec<usize> = (0..k).collect();
    for c in 0..k {
        if c == inner {
            block = Some((ln_det.clone(), negative, rhs[..inner].to_vec()));
        }
        let rows = if c < inner { inner } else { k };
        let mut p = c;
        for r in (c + 1)..rows {
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
            perm.swap(p, c);
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
            a[r * k + c].assign(&f);
            let (upper, lower) = a.split_at_mut(r * k);
            for (x, y) in lower[c + 1..k]
                .iter_mut()
                .zip(&upper[c * k + c + 1..c * k + k])
            {
                tmp.assign(&f * y);
                *x -= &tmp;
            }
            tmp.assign(&f * &rhs[c]);
            rhs[r] -= &tmp;
        }
    }
    let (block_det, block_negative, block_rhs) =
        block.unwrap_or_else(|| (ln_det.clone(), negative, rhs.clone()));
    let small = solved(&a, k, inner, block_rhs, block_det, block_negative, &perm)?;
    let whole = solved(&a, k, k, rhs, ln_det, negative, &perm)?;
    Ok((small, whole))
}

/// Back substitution in the leading `size` block of the factored matrix.
fn solved(
    a: &[Float],
    k: usize,
    size: usize,
    mut rhs: Vec<Float>,
    ln_det: Float,
    negative: bool,
    perm: &[usize],
) -> Result<Solved> {
    if negative {
        return Err(Error::numeric(
            "det(1 + K') came out negative: the truncation is not trustworthy",
        ));
    }
    let mut tmp = Float::new(rhs[0].prec());
    for r in (0..size).rev() {
        for j in (r + 1)..size {
            tmp.assign(&a[r * k + j] * &rhs[j]);
            rhs[r] -= &tmp;
        }
        rhs[r] /= &a[r * k + r];
    }
    // The first row of the inverse: P M = L U gives M^T = U^T L^T P, so
    // U^T y = e_1, then L^T z = y (L's multipliers are stored below the
    // diagonal), and u = P^T z.
    let prec = rhs[0].prec();
    let mut y: Vec<Float> = (0..size).map(|_| Float::new(prec)).collect();
    for i in 0..size {
        let mut v = Float::with_val(prec, if i == 0 { 1 } else { 0 });
        for j in 0..i {
            tmp.assign(&a[j * k + i] * &y[j]);
            v -= &tmp;
        }
        v /= &a[i * k + i];
        y[i] = v;
    }
    for i in (0..size).rev() {
        let mut v = std::mem::replace(&mut y[i], Float::new(prec));
        for j in (i + 1)..size {
            tmp.assign(&a[j * k + i] * &y[j]);
            v -= &tmp;
        }
        y[i] = v;
    }
    let mut u: Vec<Float> = (0..size).map(|_| Float::new(prec)).collect();
    for (i, z) in y.into_iter().enumerate() {
        u[perm[i]] = z;
    }
    Ok(Solved {
        inv11: rhs[0].clone(),
        ln_det,
        first_column: rhs,
        first_row: u,
    })
}

/// LU with partial pivoting of the k x k row-major matrix, then the first
/// entry of the inverse's first column and the log of the determinant.
pub(crate) fn factor(a: Vec<Float>, k: usize, prec: u32) -> Result<Solved> {
    factor_nested(a, k, k, prec).map(|(_, whole)| whole)
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
    fn nested_factorisation_reads_block_and_whole() {
        // The leading block [[1, -3], [4, 2]] needs a swap inside it and the
        // first column's largest entry (9) lies outside it. By cofactor
        // expansion: det(block) = 14, its inverse (1,1) = 2/14; det(whole) =
        // 40, its inverse (1,1) = 24/40.
        let vals = [1, -3, 0, 5, 4, 2, 1, 0, 9, 1, 2, 0, 0, 6, 1, 8];
        let a: Vec<Float> = vals.iter().map(|&v| Float::with_val(120, v)).collect();
        let (small, whole) = factor_nested(a, 4, 2, 120).unwrap();
        let near = |x: &Float, want: f64| (x.to_f64() - want).abs() < 1e-15;
        assert!(near(&small.ln_det, 14f64.ln()) && near(&small.inv11, 1.0 / 7.0));
        assert!(near(&whole.ln_det, 40f64.ln()) && near(&whole.inv11, 0.6));
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
