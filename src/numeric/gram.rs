//! Exact fixed-point accumulation of the Gram matrix S = A^T A of the
//! quadrature rows A_ki = sqrt(W_k) J_i(2 g t_k), split over threads.
//!
//! Every A_ki is rounded once to an integer multiple of 2^-F held in L
//! 64-bit limbs (sign and magnitude); products and sums are then exact in
//! two's complement accumulators of 2L + 1 limbs, so the only error is that
//! one rounding, bounded by 2^-(F+1) sum_k (|A_ki| + |A_kj|) per entry. The
//! multiply-add costs L^2 machine multiplications, several times cheaper than
//! an MPFR multiply and add at the same width, and needs no allocation.

use rug::integer::Order;
use rug::{Float, Integer};

use crate::error::{Error, Result};

/// Largest limb count provided (about 1000 bits, above what MAX_DIGITS asks).
const MAX_LIMBS: usize = 16;

/// One row: orders 1..=m as fixed-point numbers, and whether its outer
/// product is subtracted.
pub(crate) struct FixedRow {
    /// (sign mask, L magnitude limbs) per order, stride L + 1.
    words: Vec<u64>,
    m: usize,
    negative: bool,
}

/// The fixed-point format: `limbs` limbs with `frac_bits` fractional bits.
#[derive(Clone, Copy)]
pub(crate) struct Format {
    pub limbs: usize,
    pub frac_bits: u32,
}

impl Format {
    /// Room for magnitudes below 2^int_bits with `frac_bits` after the point.
    pub fn new(int_bits: u32, frac_bits: u32) -> Result<Format> {
        let limbs = (int_bits + frac_bits).div_ceil(64) as usize;
        if limbs > MAX_LIMBS {
            return Err(Error::numeric(format!(
                "{} bits exceed the fixed-point accumulator",
                int_bits + frac_bits
            )));
        }
        Ok(Format {
            limbs: limbs.max(1),
            frac_bits,
        })
    }

    /// The row for values A_1..A_m (MPFR), or an error if one does not fit;
    /// a `negative` row's outer product is subtracted from the sum.
    pub fn row(&self, values: &[Float], negative: bool) -> Result<FixedRow> {
        let l = self.limbs;
        let mut words = vec![0u64; values.len() * (l + 1)];
        for (v, w) in values.iter().zip(words.chunks_exact_mut(l + 1)) {
            if v.is_zero() {
                continue;
            }
            let (Some(sig), Some(exp)) = (v.get_significand(), v.get_exp()) else {
                return Err(Error::numeric("a Bessel value is not finite"));
            };
            // |v| = sig 2^(exp - 64 len), so |v| 2^F is sig shifted right by
            // 64 len - exp - F bits, rounded to nearest (half up).
            let limbs = sig.as_limbs();
            let shift = 64 * limbs.len() as i64 - i64::from(exp) - i64::from(self.frac_bits);
            if !round_shifted(limbs, shift, &mut w[1..]) {
                return Err(Error::numeric("a quadrature row overflows its fixed point"));
            }
            if v.is_sign_negative() {
                w[0] = u64::MAX;
            }
        }
        Ok(FixedRow {
            words,
            m: values.len(),
            negative,
        })
    }
}

/// The 64 bits of `limbs` (least significant first) from bit `p` up, with
/// zeros outside them.
fn word_at(limbs: &[u64], p: i64) -> u64 {
    let bits = 64 * limbs.len() as i64;
    if p >= bits || p <= -64 {
        0
    } else if p < 0 {
        limbs[0] << (-p)
    } else {
        let (i, off) = ((p / 64) as usize, (p % 64) as u32);
        let low = limbs[i] >> off;
        let high = match limbs.get(i + 1) {
            Some(&h) if off > 0 => h << (64 - off),
            _ => 0,
        };
        low | high
    }
}

/// out = round(limbs / 2^shift) to nearest, half up; false if it does not
/// fit in out's limbs.
fn round_shifted(limbs: &[u64], shift: i64, out: &mut [u64]) -> bool {
    let top = 64 * limbs.len() as i64 - 1;
    let room = 64 * out.len() as i64;
    if limbs.last().is_some_and(|&h| h != 0) && top - shift >= room {
        return false;
    }
    for (q, o) in out.iter_mut().enumerate() {
        *o = word_at(limbs, shift + 64 * q as i64);
    }
    let half = shift >= 1 && word_at(limbs, shift - 1) & 1 == 1;
    if half {
        for o in out.iter_mut() {
            let (v, carry) = o.overflowing_add(1);
            *o = v;
            if !carry {
                return true;
            }
        }
        return false;
    }
    true
}

/// Packed upper triangle of an n x n matrix: row i holds columns i..n.
fn packed_index(n: usize, i: usize, j: usize) -> usize {
    i * n - i * (i + 1) / 2 + j
}

/// sum over rows of the (signed) outer products, upper triangle, as exact
/// integers scaled by 2^(2F); the rows of node k are produced by `make(k)`
/// for k in 0..count, and nodes are spread over `threads` threads by their
/// `cost` (multiply-adds).
pub(crate) fn gram<M>(
    n: usize,
    format: Format,
    count: usize,
    cost: &[usize],
    threads: usize,
    make: M,
) -> Result<Vec<Integer>>
where
    M: Fn(usize) -> Result<Vec<FixedRow>> + Sync,
{
    let width = 2 * format.limbs + 1;
    let total: usize = cost.iter().sum();
    let threads = threads.clamp(1, count.max(1));
    // Contiguous chunks of nodes of about equal work.
    let mut bounds = vec![0usize];
    let mut run = 0usize;
    for (k, &c) in cost.iter().enumerate() {
        run += c;
        if bounds.len() < threads && run * threads >= total * bounds.len() {
            bounds.push(k + 1);
        }
    }
    while bounds.len() <= threads {
        bounds.push(count);
    }
    let entries = n * (n + 1) / 2;
    let parts: Vec<Result<Vec<u64>>> = std::thread::scope(|s| {
        let handles: Vec<_> = bounds
            .windows(2)
            .map(|w| {
                let (lo, hi) = (w[0], w[1]);
                let make = &make;
                s.spawn(move || -> Result<Vec<u64>> {
                    let mut acc = vec![0u64; entries * width];
                    for k in lo..hi {
                        for row in make(k)? {
                            add_outer(&mut acc, &row, n, format.limbs)?;
                        }
                    }
                    Ok(acc)
                })
            })
            .collect();
        joined(handles)
    });
    let mut sum: Option<Vec<u64>> = None;
    for part in parts {
        let part = part?;
        match sum.as_mut() {
            None => sum = Some(part),
            Some(acc) => {
                for (a, b) in acc.chunks_exact_mut(width).zip(part.chunks_exact(width)) {
                    add_wrapping(a, b);
                }
            }
        }
    }
    let sum = sum.unwrap_or_else(|| vec![0u64; entries * width]);
    Ok(sum.chunks_exact(width).map(to_integer).collect())
}

/// The results of scoped quadrature threads, in order; a thread that
/// panicked is an error, not a panic of the caller.
pub(crate) fn joined<T>(
    handles: Vec<std::thread::ScopedJoinHandle<'_, Result<T>>>,
) -> Vec<Result<T>> {
    handles
        .into_iter()
        .map(|h| {
            h.join()
                .unwrap_or_else(|_| Err(Error::numeric("a quadrature thread failed")))
        })
        .collect()
}

fn add_wrapping(a: &mut [u64], b: &[u64]) {
    let mut carry = 0u128;
    for (x, y) in a.iter_mut().zip(b) {
        let t = u128::from(*x) + u128::from(*y) + carry;
        *x = t as u64;
        carry = t >> 64;
    }
}

/// The two's complement accumulator as an Integer.
fn to_integer(words: &[u64]) -> Integer {
    let negative = words.last().is_some_and(|w| w >> 63 == 1);
    if negative {
        let mut neg = vec![0u64; words.len()];
        let mut carry = 1u128;
        for (d, w) in neg.iter_mut().zip(words) {
            let t = u128::from(!w) + carry;
            *d = t as u64;
            carry = t >> 64;
        }
        -Integer::from_digits(&neg, Order::Lsf)
    } else {
        Integer::from_digits(words, Order::Lsf)
    }
}

// One monomorphic copy per width, so that the limb loops unroll.
macro_rules! dispatch {
    ($l:expr, $acc:expr, $row:expr, $n:expr; $($w:literal)*) => {
        match $l {
            $($w => { add_outer_l::<$w>($acc, $row, $n); Ok(()) })*
            _ => Err(Error::numeric("fixed-point width out of range")),
        }
    };
}

fn add_outer(acc: &mut [u64], row: &FixedRow, n: usize, limbs: usize) -> Result<()> {
    dispatch!(limbs, acc, row, n; 1 2 3 4 5 6 7 8 9 10 11 12 13 14 15 16)
}

/// acc += a a^T on the leading m x m upper triangle, exactly.
fn add_outer_l<const L: usize>(acc: &mut [u64], row: &FixedRow, n: usize) {
    let width = 2 * L + 1;
    let stride = L + 1;
    let m = row.m.min(n);
    let mut p = [0u64; 2 * MAX_LIMBS];
    let flip = if row.negative { u64::MAX } else { 0 };
    for i in 0..m {
        let a = &row.words[i * stride..(i + 1) * stride];
        let base = packed_index(n, i, 0);
        for j in i..m {
            let b = &row.words[j * stride..(j + 1) * stride];
            p[..2 * L].fill(0);
            for (x, &ax) in a[1..].iter().enumerate() {
                let mut carry = 0u128;
                for (y, &by) in b[1..].iter().enumerate() {
                    let t = u128::from(ax) * u128::from(by) + u128::from(p[x + y]) + carry;
                    p[x + y] = t as u64;
                    carry = t >> 64;
                }
                p[x + L] = carry as u64;
            }
            // Add p or its two's complement negation: (p ^ mask) + (mask & 1).
            let mask = a[0] ^ b[0] ^ flip;
            let dst = &mut acc[(base + j) * width..(base + j + 1) * width];
            let mut carry = u128::from(mask & 1);
            for (d, &pk) in dst[..2 * L].iter_mut().zip(&p[..2 * L]) {
                let t = u128::from(*d) + u128::from(pk ^ mask) + carry;
                *d = t as u64;
                carry = t >> 64;
            }
            dst[2 * L] = dst[2 * L].wrapping_add(mask).wrapping_add(carry as u64);
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn exact_against_integer_arithmetic() {
        // Signed values of several magnitudes, so that carries, borrows and
        // sign changes all occur; the reference is GMP's exact sum.
        let prec = 300;
        let vals: Vec<Vec<Float>> = (0..7)
            .map(|k| {
                (0..5)
                    .map(|i| {
                        let v = Float::with_val(prec, (k * 7 + i * 3) as f64 - 17.5);
                        (v / 3.7f64) << (k as u32 * 9)
                    })
                    .collect()
            })
            .collect();
        let format = Format::new(70, 150).unwrap();
        let cost = vec![5; vals.len()];
        // Every third row is subtracted.
        let got = gram(5, format, vals.len(), &cost, 2, |k| {
            format.row(&vals[k], k % 3 == 2).map(|r| vec![r])
        })
        .unwrap();
        let fixed = |v: &Float| -> Integer {
            Float::with_val(prec, v << format.frac_bits)
                .round()
                .to_integer()
                .unwrap()
        };
        for i in 0..5 {
            for j in i..5 {
                let want: Integer = vals
                    .iter()
                    .enumerate()
                    .map(|(k, r)| {
                        let p = fixed(&r[i]) * fixed(&r[j]);
                        if k % 3 == 2 {
                            -p
                        } else {
                            p
                        }
                    })
                    .sum();
                assert_eq!(got[packed_index(5, i, j)], want, "entry ({i}, {j})");
            }
        }
    }

    #[test]
    fn conversion_rounds_like_mpfr() {
        // The limb-level conversion against MPFR's own rounding to nearest
        // (ties away from zero) of v 2^F, over precisions of one to four
        // limbs and magnitudes from far below 2^-F (rounds to 0) to near
        // the top of the format, ties included.
        let format = Format::new(40, 130).unwrap();
        let mut cases = Vec::new();
        for prec in [53u32, 64, 65, 200] {
            for e in [-200i32, -131, -130, -129, -70, -1, 0, 1, 20, 38] {
                for m in [1.0f64, -1.0, 0.7, -0.999_999_9, 1.5 / 1.9] {
                    cases.push(Float::with_val(prec, m) << e);
                }
            }
            // A tie: exactly half a unit of 2^-F above 3 units.
            cases.push(Float::with_val(prec, 7) >> (format.frac_bits + 1));
        }
        let row = format.row(&cases, false).unwrap();
        let stride = format.limbs + 1;
        for (k, v) in cases.iter().enumerate() {
            let want = Float::with_val(400, v << format.frac_bits)
                .round()
                .to_integer()
                .unwrap();
            let w = &row.words[k * stride..(k + 1) * stride];
            let mag = Integer::from_digits(&w[1..], Order::Lsf);
            let got = if w[0] == u64::MAX { -mag } else { mag };
            assert_eq!(got, want, "value {v}");
        }
    }

    #[test]
    fn overflow_is_an_error() {
        let format = Format::new(4, 60).unwrap();
        let big = [Float::with_val(64, 100)];
        assert!(format.row(&big, false).is_err());
    }
}
