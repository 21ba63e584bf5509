//! Exact fixed-point accumulation of the Gram matrix S = A^T A of the
//! quadrature rows A_ki = sqrt(W_k) J_i(2 g t_k), split over threads.
//!
//! Every A_ki is rounded once to an integer multiple of 2^-F, v, and held
//! offset as u = v + B with B = 2^(rL - 1), an unsigned integer of L limbs
//! of r <= 59 bits; products and sums are then exact, so the only error is
//! that one rounding, bounded by 2^-(F+1) sum_k (|A_ki| + |A_kj|) per
//! entry. The offset takes the signs out of the inner loop: over a batch of
//! c rows, sum v_i v_j = sum u_i u_j - B (U_i + U_j) + c B^2 with
//! U_i = sum u_i. The short limbs let a 128-bit column sum take every
//! limb product of a batch without a carry (2r + log2(L c) <= 128), so the
//! loop is L^2 multiplications and L^2 two-word additions per row and
//! entry, with registers for the columns, and carries once per batch.

use rug::integer::Order;
use rug::{Float, Integer};

use crate::error::{Error, Result};

/// Largest limb count provided (944 bits, above what MAX_FINITE_DIGITS asks).
const MAX_LIMBS: usize = 16;

/// The longest limb: with batches of BATCH rows and at most MAX_LIMBS
/// products per column and row, 2 * 59 + log2(64 * 16) = 128 bits.
const MAX_RADIX: u32 = 59;

/// One row: orders 1..=m as offset fixed-point numbers, and whether its
/// outer product is subtracted.
pub(crate) struct FixedRow {
    /// u = v + 2^(rL - 1) in L limbs of r bits per order, least
    /// significant first.
    words: Vec<u64>,
    m: usize,
    negative: bool,
}

/// The fixed-point format: `limbs` limbs of `radix` bits, `frac_bits` of
/// them after the point.
#[derive(Clone, Copy)]
pub(crate) struct Format {
    pub limbs: usize,
    pub radix: u32,
    pub frac_bits: u32,
}

impl Format {
    /// Room for magnitudes below 2^int_bits with `frac_bits` after the point
    /// (and the offset's top bit), in as few limbs as the radix allows.
    pub fn new(int_bits: u32, frac_bits: u32) -> Result<Format> {
        let bits = int_bits + frac_bits + 1;
        let limbs = bits.div_ceil(MAX_RADIX).max(1);
        if limbs as usize > MAX_LIMBS {
            return Err(Error::numeric(format!(
                "{} bits exceed the fixed-point accumulator",
                int_bits + frac_bits
            )));
        }
        Ok(Format {
            limbs: limbs as usize,
            radix: bits.div_ceil(limbs),
            frac_bits,
        })
    }

    /// The row for values A_1..A_m (MPFR), or an error if one does not fit;
    /// a `negative` row's outer product is subtracted from the sum.
    pub fn row(&self, values: &[Float], negative: bool) -> Result<FixedRow> {
        let (l, r) = (self.limbs, self.radix);
        let bits = r * l as u32;
        let words = bits.div_ceil(64) as usize;
        let mut out = vec![0u64; values.len() * l];
        let mut w = [0u64; MAX_LIMBS];
        for (v, limbs) in values.iter().zip(out.chunks_exact_mut(l)) {
            let w = &mut w[..words];
            w.fill(0);
            if !v.is_zero() {
                let (Some(sig), Some(exp)) = (v.get_significand(), v.get_exp()) else {
                    return Err(Error::numeric("a Bessel value is not finite"));
                };
                // |v| = sig 2^(exp - 64 len), so |v| 2^F is sig shifted right
                // by 64 len - exp - F bits, rounded to nearest (half up).
                let sig = sig.as_limbs();
                let shift = 64 * sig.len() as i64 - i64::from(exp) - i64::from(self.frac_bits);
                // Bit rL - 1 and above are the offset's.
                if !round_shifted(sig, shift, w) || word_at(w, i64::from(bits) - 1) != 0 {
                    return Err(Error::numeric("a quadrature row overflows its fixed point"));
                }
                if v.is_sign_negative() {
                    negate(w);
                }
            }
            // Modulo 2^(rL), plus B: a set offset bit becomes B - |v|.
            let top = bits - 1;
            w[(top / 64) as usize] ^= 1 << (top % 64);
            for (q, limb) in limbs.iter_mut().enumerate() {
                *limb = word_at(w, i64::from(r) * q as i64) & ((1u64 << r) - 1);
            }
        }
        Ok(FixedRow {
            words: out,
            m: values.len(),
            negative,
        })
    }
}

/// words = -words modulo 2^(64 len).
fn negate(words: &mut [u64]) {
    let mut carry = 1u128;
    for w in words.iter_mut() {
        let t = u128::from(!*w) + carry;
        *w = t as u64;
        carry = t >> 64;
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
                    let mut waiting = [Vec::new(), Vec::new()];
                    for k in lo..hi {
                        for row in make(k)? {
                            let side = &mut waiting[usize::from(row.negative)];
                            side.push(row);
                            if side.len() >= WINDOW {
                                add_rows(&mut acc, side, n, format)?;
                            }
                        }
                    }
                    for side in waiting.iter_mut() {
                        add_rows(&mut acc, side, n, format)?;
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

/// a += b modulo 2^(64 len(a)), b zero-extended.
fn add_wrapping(a: &mut [u64], b: &[u64]) {
    let mut carry = 0u128;
    for (k, x) in a.iter_mut().enumerate() {
        let t = u128::from(*x) + u128::from(b.get(k).copied().unwrap_or(0)) + carry;
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

/// Rows held back and sorted by length before they are added, so that the
/// batches cut from them have nearly equal lengths (a batch is padded to
/// its longest row with zeros).
const WINDOW: usize = 512;

/// Rows per batch: enough to spread the carries and the offset's
/// correction, few enough that a batch of one order fits the cache.
const BATCH: usize = 64;

/// Orders per tile of the accumulator, so that the tile's rows stay in the
/// first-level cache while the entries against them are summed.
const TILE: usize = 16;

/// Adds the outer products of `rows` (all of one sign) to acc and empties it.
fn add_rows(acc: &mut [u64], rows: &mut Vec<FixedRow>, n: usize, format: Format) -> Result<()> {
    rows.sort_by_key(|r| std::cmp::Reverse(r.m));
    for batch in rows.chunks(BATCH) {
        add_batch(acc, batch, n, format)?;
    }
    rows.clear();
    Ok(())
}

// One monomorphic copy per width, so that the limb loops unroll.
macro_rules! dispatch {
    ($l:expr, $r:expr, $acc:expr, $rows:expr, $n:expr; $($w:literal)*) => {
        match $l {
            $($w => { add_batch_l::<$w>($acc, $rows, $n, $r); Ok(()) })*
            _ => Err(Error::numeric("fixed-point width out of range")),
        }
    };
}

fn add_batch(acc: &mut [u64], rows: &[FixedRow], n: usize, format: Format) -> Result<()> {
    dispatch!(format.limbs, format.radix, acc, rows, n; 1 2 3 4 5 6 7 8 9 10 11 12 13 14 15 16)
}

/// acc +-= sum over the batch of v v^T on the upper triangle, exactly
/// (modulo 2^(64 (2L + 1)), the accumulator's two's complement width);
/// the rows share one sign and are sorted longest first.
fn add_batch_l<const L: usize>(acc: &mut [u64], rows: &[FixedRow], n: usize, r: u32) {
    let Some(first) = rows.first() else {
        return;
    };
    let width = 2 * L + 1;
    let m = first.m.min(n);
    let c = rows.len();
    let bits = r * L as u32;
    // Order-major copy of the batch: u_ki at ((i c) + k) L, zeros (u = B)
    // past a row's end.
    let mut u = vec![0u64; m * c * L];
    let top = (bits - 1 - r * (L as u32 - 1)) as u64;
    for (i, block) in u.chunks_exact_mut(c * L).enumerate() {
        for (row, w) in rows.iter().zip(block.chunks_exact_mut(L)) {
            if i < row.m {
                w.copy_from_slice(&row.words[i * L..(i + 1) * L]);
            } else {
                w[L - 1] = 1 << top;
            }
        }
    }
    // B U_i = 2^(rL - 1) sum_k u_ki, modulo the accumulator's width.
    let mut offsets = vec![0u64; m * width];
    for (block, out) in u.chunks_exact(c * L).zip(offsets.chunks_exact_mut(width)) {
        let mut sums = [0u128; MAX_LIMBS];
        for w in block.chunks_exact(L) {
            for (s, &x) in sums.iter_mut().zip(w) {
                *s += u128::from(x);
            }
        }
        for (p, &s) in sums[..L].iter().enumerate() {
            add_shifted(out, s, r * p as u32 + bits - 1);
        }
    }
    // c B^2 = c 2^(2rL - 2).
    let mut square = [0u64; 2 * MAX_LIMBS + 1];
    add_shifted(&mut square[..width], c as u128, 2 * bits - 2);
    let negative = first.negative;
    for tj in (0..m).step_by(TILE) {
        for i in 0..(tj + TILE).min(m) {
            let a = &u[i * c * L..(i + 1) * c * L];
            let base = packed_index(n, i, 0);
            for j in tj.max(i)..(tj + TILE).min(m) {
                let b = &u[j * c * L..(j + 1) * c * L];
                let cols = products::<L>(a, b);
                let mut delta = square;
                let delta = &mut delta[..width];
                for (q, &col) in cols[..2 * L - 1].iter().enumerate() {
                    add_shifted(delta, col, r * q as u32);
                }
                subtract(delta, &offsets[i * width..(i + 1) * width]);
                subtract(delta, &offsets[j * width..(j + 1) * width]);
                let dst = &mut acc[(base + j) * width..(base + j + 1) * width];
                if negative {
                    subtract(dst, delta);
                } else {
                    add_wrapping(dst, delta);
                }
            }
        }
    }
}

/// The column sums sum_k sum_{p+q=s} a_kp b_kq of two runs of L-limb
/// numbers: each limb product is below 2^(2r) and a column takes at most
/// L of them per row, so a batch fits 128 bits (MAX_RADIX).
#[inline(always)]
fn products<const L: usize>(a: &[u64], b: &[u64]) -> [u128; 2 * MAX_LIMBS] {
    let mut cols = [0u128; 2 * MAX_LIMBS];
    for (x, y) in a.chunks_exact(L).zip(b.chunks_exact(L)) {
        for p in 0..L {
            for q in 0..L {
                cols[p + q] += u128::from(x[p]) * u128::from(y[q]);
            }
        }
    }
    cols
}

/// dst += x 2^shift modulo 2^(64 len).
fn add_shifted(dst: &mut [u64], x: u128, shift: u32) {
    let (q, off) = ((shift / 64) as usize, shift % 64);
    if q >= dst.len() || x == 0 {
        return;
    }
    // x 2^off spans three words.
    let parts = [
        (x << off) as u64,
        if off == 0 {
            (x >> 64) as u64
        } else {
            (x >> (64 - off)) as u64
        },
        if off == 0 {
            0
        } else {
            (x >> (128 - off)) as u64
        },
    ];
    let mut carry = 0u128;
    for (k, d) in dst[q..].iter_mut().enumerate() {
        let add = parts.get(k).copied().unwrap_or(0);
        if add == 0 && carry == 0 && k >= parts.len() {
            break;
        }
        let t = u128::from(*d) + u128::from(add) + carry;
        *d = t as u64;
        carry = t >> 64;
    }
}

/// a -= b modulo 2^(64 len).
fn subtract(a: &mut [u64], b: &[u64]) {
    let mut borrow = 0u64;
    for (x, &y) in a.iter_mut().zip(b) {
        let (d, b1) = x.overflowing_sub(y);
        let (d, b2) = d.overflowing_sub(borrow);
        *x = d;
        borrow = u64::from(b1 | b2);
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The accumulation against GMP's exact sum of the rounded products:
    /// signed values of many magnitudes (carries, borrows and sign changes
    /// all occur), rows of every length up to n and a few longer, more rows
    /// than a window and a batch, orders across several tiles, one to four
    /// limbs and one to three threads.
    fn check_exact(n: usize, count: usize, format: Format, threads: usize) {
        let prec = 300;
        let vals: Vec<Vec<Float>> = (0..count)
            .map(|k| {
                let len = if k % 11 == 0 { n + 3 } else { 1 + (k * 7) % n };
                (0..len)
                    .map(|i| {
                        let v = Float::with_val(prec, ((k * 7 + i * 3) % 41) as f64 - 17.5);
                        let shift = ((k * 13 + i * 5) % 60) as i32 - 30;
                        (v / 3.7f64) << shift
                    })
                    .collect()
            })
            .collect();
        let cost: Vec<usize> = vals.iter().map(|v| v.len() * v.len()).collect();
        // Every third row is subtracted.
        let got = gram(n, format, vals.len(), &cost, threads, |k| {
            format.row(&vals[k], k % 3 == 2).map(|r| vec![r])
        })
        .unwrap();
        let fixed = |v: &Float| -> Integer {
            Float::with_val(prec, v << format.frac_bits)
                .round()
                .to_integer()
                .unwrap()
        };
        for i in 0..n {
            for j in i..n {
                let want: Integer = vals
                    .iter()
                    .enumerate()
                    .filter(|(_, r)| r.len() > j)
                    .map(|(k, r)| {
                        let p = fixed(&r[i]) * fixed(&r[j]);
                        if k % 3 == 2 {
                            -p
                        } else {
                            p
                        }
                    })
                    .sum();
                assert_eq!(got[packed_index(n, i, j)], want, "entry ({i}, {j})");
            }
        }
    }

    #[test]
    fn exact_against_integer_arithmetic() {
        check_exact(5, 7, Format::new(40, 20).unwrap(), 2);
        check_exact(37, 700, Format::new(32, 90).unwrap(), 1);
        check_exact(37, 700, Format::new(40, 150).unwrap(), 2);
        check_exact(21, 300, Format::new(70, 180).unwrap(), 3);
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
        let (l, r) = (format.limbs, format.radix);
        let offset = Integer::from(1) << (r * l as u32 - 1);
        for (k, v) in cases.iter().enumerate() {
            let want = Float::with_val(400, v << format.frac_bits)
                .round()
                .to_integer()
                .unwrap();
            let got = row.words[k * l..(k + 1) * l]
                .iter()
                .rev()
                .fold(Integer::new(), |acc, &w| (acc << r) + w)
                - &offset;
            assert_eq!(got, want, "value {v}");
        }
    }

    #[test]
    fn overflow_is_an_error() {
        // One limb: 55 fractional bits, two integer bits and the offset's.
        let format = Format::new(2, 55).unwrap();
        assert_eq!(format.limbs, 1);
        assert!(format.row(&[Float::with_val(64, -3.5)], false).is_ok());
        for big in [5.0, -5.0, 100.0] {
            assert!(format.row(&[Float::with_val(64, big)], false).is_err());
        }
    }
}
