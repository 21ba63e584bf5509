//! The LU factorisation of 1 + K' with partial pivoting, in exact
//! fixed-point dot products, and what the finite-coupling engine reads off
//! it: the first column and first row of the inverse and ln det, for the
//! leading block and for the whole matrix.
//!
//! The arithmetic. The factorisation is Crout's: every entry of L and U is
//! one dot product a_ij - sum_c l_ic u_cj, formed exactly and rounded once.
//! Each number is an integer multiple of 2^-F held in L signed limbs of 55
//! bits (the lower ones in [0, 2^55), the top one signed): the entries of L
//! share one scale F_L = prec + GUARD, the entries of column j of A and U
//! the scale F_j = prec + GUARD - e_j, where 2^e_j is the power of two at or
//! above the column's largest input entry. A product of two limbs is below
//! 2^110, so a dot product of length k is an exact sum in 2L - 1 columns of
//! i128 (kL < 2^16 keeps them below 2^127): L^2 machine multiplications per
//! multiply-add and no allocation, several times cheaper than an MPFR
//! multiply and subtract at the same width. The limb count leaves at least
//! MIN_HEADROOM bits above the largest input entry of every column for the
//! growth of U (and for |l| > 1 in the rows below a leading block); an entry
//! that does not fit restarts the factorisation with one more limb, and past
//! MAX_LIMBS the factorisation fails with an error.
//!
//! The error model. Only three roundings occur: a_ij to 2^-F_j on input,
//! u_ij to 2^-F_j, and l_ij = s_i / u_jj to 2^-F_L, each by at most half a
//! unit. Hence the computed factors satisfy L U = P A + E exactly with
//! |E_ij| <= 2^-(prec + GUARD) (2^e_j + |u_jj| / 2) <= 2^-(prec + GUARD - 2)
//! max(|A_.j|, |u_jj|): one rounding per entry of the size of the column,
//! where MPFR elimination accumulates up to k roundings of 2^-prec per entry.
//! To first order ln det moves by tr(A^-1 E) and [A^-1]_11 by
//! (A^-1 E A^-1)_11, sums of k^2 terms each below 2^-(prec + 14) times an
//! entry of A^-1 and the column scale; for the well-conditioned 1 + K' this
//! is far inside the engine's rounding allowance of k^2 2^-prec times the
//! value, as the tests below measure against factorisations at twice the
//! precision. The triangular solves for the first column and row of the
//! inverse run in MPFR at the working precision (O(k^2) operations).

use rug::float::Round;
use rug::{Assign, Float, Integer};

use crate::error::{Error, Result};

/// Bits per limb: products of two limbs stay below 2^110.
const BITS: u32 = 55;
const MASK: i64 = (1 << BITS) - 1;
/// Bits beyond the working precision in every rounding.
const GUARD: u32 = 16;
/// Bits of room above the largest input entry of a column, at least.
const MIN_HEADROOM: u32 = 8;
/// Largest limb count (1100 bits, above what MAX_FINITE_DIGITS asks).
const MAX_LIMBS: usize = 20;
/// Exact accumulation in i128 needs (k L + 2) 2^110 < 2^127.
const MAX_TERMS: usize = 1 << 16;

/// What one factorisation yields.
pub(crate) struct Solved {
    /// [(1 + K')^{-1}]_11
    pub inv11: Float,
    /// ln det(1 + K')
    pub ln_det: Float,
    /// M^{-1} e_1, all entries (its first is `inv11`).
    pub first_column: Vec<Float>,
    /// M^{-T} e_1: the first row of the inverse, all entries.
    pub first_row: Vec<Float>,
}

/// LU with partial pivoting of the k x k row-major matrix, then what the
/// engine reads off it (see `factor_nested`).
pub(crate) fn factor(a: Vec<Float>, k: usize, prec: u32) -> Result<Solved> {
    factor_nested(a, k, k, prec).map(|(_, whole)| whole)
}

/// LU with partial pivoting of the k x k row-major matrix, read off for the
/// leading `inner` x `inner` block as well as for the whole matrix.
///
/// For the first `inner` columns the pivot is searched among the first
/// `inner` rows only: the row swaps then permute whole rows of the leading
/// block among themselves, so after `inner` steps the leading part of the
/// factorisation is the pivoted LU of that block, and its determinant and
/// inverse come with the big one's. Returns (block, whole).
pub(crate) fn factor_nested(
    a: Vec<Float>,
    k: usize,
    inner: usize,
    prec: u32,
) -> Result<(Solved, Solved)> {
    if k == 0 || a.len() != k * k {
        return Err(Error::numeric("the truncated kernel system is empty"));
    }
    let inner = inner.clamp(1, k);
    let exps = column_exponents(&a, k)?;
    let mut limbs = (prec + GUARD + 1 + MIN_HEADROOM).div_ceil(BITS) as usize;
    loop {
        if limbs > MAX_LIMBS || k * limbs >= MAX_TERMS {
            return Err(Error::numeric(
                "the pivots of the truncated kernel system grow beyond the fixed-point range",
            ));
        }
        if let Some(f) = Factors::new(&a, k, inner, prec, limbs, &exps)? {
            return Ok((f.solved(inner, prec)?, f.solved(k, prec)?));
        }
        limbs += 1;
    }
}

/// e_j with 2^e_j at or above max_i |a_ij|, per column.
fn column_exponents(a: &[Float], k: usize) -> Result<Vec<i32>> {
    let mut exps = vec![None::<i32>; k];
    for (idx, v) in a.iter().enumerate() {
        if !v.is_finite() {
            return Err(Error::numeric("the truncated kernel system is not finite"));
        }
        if let Some(e) = v.get_exp() {
            let e_j = &mut exps[idx % k];
            *e_j = Some(e_j.map_or(e, |x| x.max(e)));
        }
    }
    exps.into_iter()
        .map(|e| e.ok_or_else(|| Error::numeric("the truncated kernel system is singular")))
        .collect()
}

/// The fixed-point factors P A = L U and the row order.
struct Factors {
    k: usize,
    limbs: usize,
    frac_l: u32,
    /// F_j per column.
    frac: Vec<u32>,
    /// Row-major, row r holds l_rc for c < r.
    lower: Vec<i64>,
    /// Column-major, column j holds u_rj for r <= j.
    upper: Vec<i64>,
    /// Factor row r is input row perm[r].
    perm: Vec<usize>,
    /// Parity of the row swaps within the first `inner` steps, and of all.
    swapped_block: bool,
    swapped: bool,
}

impl Factors {
    /// The factorisation with `limbs` limbs, or None if an entry outgrew it.
    fn new(
        a: &[Float],
        k: usize,
        inner: usize,
        prec: u32,
        limbs: usize,
        exps: &[i32],
    ) -> Result<Option<Factors>> {
        let frac_l = prec + GUARD;
        let frac = exps
            .iter()
            .map(|&e| {
                u32::try_from(i64::from(frac_l) - i64::from(e))
                    .ok()
                    .filter(|&f| f > 0)
                    .ok_or_else(|| Error::numeric("an entry of the kernel system is out of range"))
            })
            .collect::<Result<Vec<u32>>>()?;
        let mut fixed = vec![0i64; k * k * limbs];
        let mut scratch = Integer::new();
        for (idx, v) in a.iter().enumerate() {
            let scaled = Float::with_val(v.prec(), v << frac[idx % k]);
            scaled.to_integer_round_in_place(&mut scratch, Round::Nearest);
            if !to_limbs(&mut scratch, &mut fixed[idx * limbs..(idx + 1) * limbs]) {
                return Ok(None);
            }
        }
        let mut f = Factors {
            k,
            limbs,
            frac_l,
            frac,
            lower: vec![0i64; k * k * limbs],
            upper: vec![0i64; k * k * limbs],
            perm: (0..k).collect(),
            swapped_block: false,
            swapped: false,
        };
        let mut sums = vec![[0i128; WIDE]; k];
        let mut pivot = Integer::new();
        let (mut num, mut quotient, mut rest) = (Integer::new(), Integer::new(), Integer::new());
        for j in 0..k {
            if j == inner {
                f.swapped_block = f.swapped;
            }
            for (i, sum) in sums.iter_mut().enumerate().skip(j) {
                *sum = f.residual(&fixed, i, j)?;
            }
            let rows = if j < inner { inner } else { k };
            let width = 2 * limbs - 1;
            let p = (j..rows)
                .max_by(|&x, &y| {
                    let (ax, ay) = (magnitude(&sums[x], width), magnitude(&sums[y], width));
                    ax.total_cmp(&ay).then(y.cmp(&x))
                })
                .unwrap_or(j);
            if p != j {
                let l = limbs;
                for c in 0..k * l {
                    fixed.swap(p * k * l + c, j * k * l + c);
                }
                for c in 0..j * l {
                    f.lower.swap(p * k * l + c, j * k * l + c);
                }
                sums.swap(p, j);
                f.perm.swap(p, j);
                f.swapped = !f.swapped;
            }
            let at = (j * k + j) * limbs;
            if !f.round_into(&sums[j], at) {
                return Ok(None);
            }
            from_limbs(&f.upper[at..at + limbs], &mut pivot);
            if pivot.is_zero() {
                return Err(Error::numeric("the truncated kernel system is singular"));
            }
            for (i, sum) in sums.iter().enumerate().skip(j + 1) {
                wide_to_integer(sum, width, &mut num);
                (&mut quotient, &mut rest).assign(num.div_rem_round_ref(&pivot));
                let at = (i * k + j) * limbs;
                if !to_limbs(&mut quotient, &mut f.lower[at..at + limbs]) {
                    return Ok(None);
                }
            }
            for m in (j + 1)..k {
                let sum = f.residual(&fixed, j, m)?;
                if !f.round_into(&sum, (m * k + j) * limbs) {
                    return Ok(None);
                }
            }
        }
        if inner == k {
            f.swapped_block = f.swapped;
        }
        Ok(Some(f))
    }

    /// a_ij 2^F_L - sum_{c < min(i, j)} l_ic u_cj, exactly, in the columns
    /// of scale 2^-(F_L + F_j).
    fn residual(&self, fixed: &[i64], i: usize, j: usize) -> Result<[i128; WIDE]> {
        let (k, l) = (self.k, self.limbs);
        let n = i.min(j);
        let mut acc = [0i128; WIDE];
        let (q, r) = ((self.frac_l / BITS) as usize, self.frac_l % BITS);
        for (t, &limb) in fixed[(i * k + j) * l..(i * k + j + 1) * l]
            .iter()
            .enumerate()
        {
            acc[q + t] += i128::from(limb) << r;
        }
        dot(
            l,
            &self.lower[i * k * l..(i * k + n) * l],
            &self.upper[j * k * l..(j * k + n) * l],
            &mut acc,
        )?;
        Ok(acc)
    }

    /// Rounds the residual of column j's scale times 2^F_L to that column's
    /// scale into `upper` at `at`; false if it does not fit.
    fn round_into(&mut self, sum: &[i128; WIDE], at: usize) -> bool {
        let l = self.limbs;
        let mut s = *sum;
        let half = self.frac_l - 1;
        s[(half / BITS) as usize] += 1i128 << (half % BITS);
        shifted(&mut s, 2 * l - 1, self.frac_l, &mut self.upper[at..at + l])
    }

    /// The first column and row of the inverse and ln det of the leading
    /// `size` block, in MPFR at `prec`.
    fn solved(&self, size: usize, prec: u32) -> Result<Solved> {
        let (k, l) = (self.k, self.limbs);
        let swapped = if size == k {
            self.swapped
        } else {
            self.swapped_block
        };
        let mut scratch = Integer::new();
        let mut value = |words: &[i64], frac: u32| -> Float {
            from_limbs(words, &mut scratch);
            Float::with_val(prec, &scratch) >> frac
        };
        let lower: Vec<Float> = (0..size * size)
            .map(|idx| {
                let (r, c) = (idx / size, idx % size);
                if c < r {
                    value(
                        &self.lower[(r * k + c) * l..(r * k + c + 1) * l],
                        self.frac_l,
                    )
                } else {
                    Float::new(prec)
                }
            })
            .collect();
        // Column-major: entry (r, j) at j * size + r.
        let upper: Vec<Float> = (0..size * size)
            .map(|idx| {
                let (j, r) = (idx / size, idx % size);
                if r <= j {
                    value(
                        &self.upper[(j * k + r) * l..(j * k + r + 1) * l],
                        self.frac[j],
                    )
                } else {
                    Float::new(prec)
                }
            })
            .collect();
        let mut ln_det = Float::new(prec);
        let mut negative = swapped;
        for j in 0..size {
            let d = &upper[j * size + j];
            negative ^= d.is_sign_negative();
            ln_det += Float::with_val(prec, d.abs_ref()).ln();
        }
        if negative {
            return Err(Error::numeric(
                "det(1 + K') came out negative: the truncation is not trustworthy",
            ));
        }
        let mut tmp = Float::new(prec);
        // L U v = P e_1.
        let mut v: Vec<Float> = self.perm[..size]
            .iter()
            .map(|&row| Float::with_val(prec, u32::from(row == 0)))
            .collect();
        for r in 0..size {
            for c in 0..r {
                tmp.assign(&lower[r * size + c] * &v[c]);
                v[r] -= &tmp;
            }
        }
        for r in (0..size).rev() {
            for m in (r + 1)..size {
                tmp.assign(&upper[m * size + r] * &v[m]);
                v[r] -= &tmp;
            }
            v[r] /= &upper[r * size + r];
        }
        // U^T L^T z = e_1 with z = P w.
        let mut z: Vec<Float> = (0..size)
            .map(|r| Float::with_val(prec, u32::from(r == 0)))
            .collect();
        for r in 0..size {
            for c in 0..r {
                tmp.assign(&upper[r * size + c] * &z[c]);
                z[r] -= &tmp;
            }
            z[r] /= &upper[r * size + r];
        }
        for r in (0..size).rev() {
            for m in (r + 1)..size {
                tmp.assign(&lower[m * size + r] * &z[m]);
                z[r] -= &tmp;
            }
        }
        let mut w = vec![Float::new(prec); size];
        for (zr, &row) in z.into_iter().zip(&self.perm[..size]) {
            w[row] = zr;
        }
        Ok(Solved {
            inv11: v[0].clone(),
            ln_det,
            first_column: v,
            first_row: w,
        })
    }
}

/// Columns of an exact sum: 2L - 1 used, one more for normalising.
const WIDE: usize = 2 * MAX_LIMBS;

/// Carries the columns into digits in [0, 2^55) below `width` and returns
/// the signed rest, the multiple of 2^(55 width).
fn normalise(s: &mut [i128; WIDE], width: usize) -> i128 {
    let mut carry = 0i128;
    for c in s[..width].iter_mut() {
        let t = *c + carry;
        *c = t & i128::from(MASK);
        carry = t >> BITS;
    }
    carry
}

/// |sum| / 2^(55 (width - 3)), to compare residuals of one column.
fn magnitude(sum: &[i128; WIDE], width: usize) -> f64 {
    let mut s = *sum;
    let top = normalise(&mut s, width);
    let unit = f64::from(BITS).exp2();
    let mut m = top as f64;
    for p in (width.saturating_sub(3)..width).rev() {
        m = m * unit + s[p] as f64;
    }
    m.abs()
}

/// floor(sum / 2^shift) into `out` as limbs; false if it does not fit.
fn shifted(s: &mut [i128; WIDE], width: usize, shift: u32, out: &mut [i64]) -> bool {
    let top = normalise(s, width);
    let digit = |p: usize| -> i128 {
        if p < width {
            s[p]
        } else {
            (top >> (BITS as usize * (p - width)).min(127)) & i128::from(MASK)
        }
    };
    let (q, r) = ((shift / BITS) as usize, shift % BITS);
    let l = out.len();
    for (m, o) in out[..l - 1].iter_mut().enumerate() {
        let v = (digit(q + m) >> r) | (digit(q + m + 1) << (BITS - r));
        *o = (v & i128::from(MASK)) as i64;
    }
    let from = q + l - 1;
    let mut high = if from >= width {
        top >> (BITS as usize * (from - width)).min(127)
    } else {
        top
    };
    for p in (from..width).rev() {
        match high.checked_mul(1i128 << BITS) {
            Some(h) => high = h + s[p],
            None => return false,
        }
    }
    let high = high >> r;
    match i64::try_from(high) {
        Ok(h) if (-(1i64 << (BITS - 1))..(1i64 << (BITS - 1))).contains(&h) => {
            out[l - 1] = h;
            true
        }
        _ => false,
    }
}

/// The exact sum as an integer.
fn wide_to_integer(sum: &[i128; WIDE], width: usize, out: &mut Integer) {
    let mut s = *sum;
    let top = normalise(&mut s, width);
    out.assign(top);
    for d in s[..width].iter().rev() {
        *out <<= BITS;
        *out += *d as i64;
    }
}

/// Splits an integer into limbs (consuming it); false if it does not fit
/// below 2^(55 L - 1).
fn to_limbs(x: &mut Integer, out: &mut [i64]) -> bool {
    let l = out.len();
    for o in out[..l - 1].iter_mut() {
        *o = (x.to_u64_wrapping() as i64) & MASK;
        *x >>= BITS;
    }
    match x.to_i64() {
        Some(h) if (-(1i64 << (BITS - 1))..(1i64 << (BITS - 1))).contains(&h) => {
            out[l - 1] = h;
            true
        }
        _ => false,
    }
}

fn from_limbs(words: &[i64], out: &mut Integer) {
    out.assign(0);
    for &w in words.iter().rev() {
        *out <<= BITS;
        *out += w;
    }
}

// One monomorphic copy per width, so that the limb loops unroll.
macro_rules! dispatch {
    ($l:expr, $x:expr, $y:expr, $acc:expr; $($w:literal)*) => {
        match $l {
            $($w => { dot_l::<$w>($x, $y, $acc); Ok(()) })*
            _ => Err(Error::numeric("fixed-point width out of range")),
        }
    };
}

/// acc -= sum_c x_c y_c over limb vectors of length L each.
fn dot(limbs: usize, x: &[i64], y: &[i64], acc: &mut [i128; WIDE]) -> Result<()> {
    dispatch!(limbs, x, y, acc; 1 2 3 4 5 6 7 8 9 10 11 12 13 14 15 16 17 18 19 20)
}

fn dot_l<const L: usize>(x: &[i64], y: &[i64], acc: &mut [i128; WIDE]) {
    let mut col = [0i128; WIDE];
    for (a, b) in x.chunks_exact(L).zip(y.chunks_exact(L)) {
        for i in 0..L {
            for j in 0..L {
                col[i + j] += i128::from(a[i]) * i128::from(b[j]);
            }
        }
    }
    for (d, c) in acc.iter_mut().zip(&col[..2 * L - 1]) {
        *d -= c;
    }
}
