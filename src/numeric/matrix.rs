//! The truncated kernel on shared quadrature nodes, its tilt, and the two
//! functionals read off an LU factorisation (lu.rs): the (1,1) element of
//! the inverse and the log-determinant, all in MPFR.

use rug::{Assign, Float};

use super::contour::Node;
use super::gram::{gram, Format};
use crate::error::Result;

mod lu;

pub(crate) use lu::{factor, factor_nested};

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

#[cfg(test)]
mod tests;
