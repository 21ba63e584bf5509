//! Multiple zeta values zeta(s1, ..., sk) to high precision.
//!
//! Method: the iterated-integral representation over 1 > t1 > ... > tw > 0 is
//! split at t = 1/2 (the convolution of arXiv:math/9910045 with the split
//! point 1/2). With the word w in the letters x0 = dt/t and
//! x1 = dt/(1-t) and its dual tau(w) (swap x0 <-> x1, then reverse),
//!
//!   zeta(w) = sum_{j=0}^{|w|} Li[last j letters of tau(w)](1/2)
//!                            * Li[last |w|-j letters of w](1/2),
//!
//! where Li[u](1/2) is the iterated integral of u from 0 to 1/2, i.e. a
//! multiple polylogarithm at 1/2. Every one of those is a nested sum whose
//! outer index carries 2^-n, so a few more than `prec` terms suffice, and all
//! suffixes of one word come out of a single pass over n. All quantities are
//! positive, so there is no cancellation.
//!
//! Guarantee: the returned value has relative error below 2^-(prec-1). The
//! truncation of every sum is bounded rigorously (see `terms_needed`); the
//! rounding of the working-precision arithmetic is bounded by a worst-case
//! count of correctly rounded operations on positive numbers, covered by the
//! guard bits; the final rounding to `prec` bits adds at most half an ulp.

use rug::{Assign, Float, Integer};

use crate::error::{Error, Result};
use crate::limits::MAX_MZV_PREC;
use crate::limits::MAX_MZV_WEIGHT;
use crate::limits::MAX_ZETA_DEPTH;

/// zeta(s1, ..., sk) = sum_{n1 > n2 > ... > nk >= 1} n1^-s1 ... nk^-sk to
/// `prec` bits, with relative error below 2^-(prec-1).
///
/// Errors (kind Input): empty list, s1 < 2, any si == 0. Errors (kind Range):
/// depth above [`MAX_ZETA_DEPTH`], weight above [`MAX_MZV_WEIGHT`], `prec` of 0 or
/// above [`MAX_MZV_PREC`].
pub fn mzv(s: &[u32], prec: u32) -> Result<Float> {
    let weight = check_arguments(s, prec)?;
    let word = word_of(s);
    let dual = dual_word(&word);

    let max_depth = s.len().max(weight as usize - s.len());
    // Truncation: every Li at 1/2 is at most Li[x1^m](1/2) = (ln 2)^m/m! < 1,
    // so a tail T in one factor moves a product by at most T. The 2 (|w|+1)
    // tails must stay below zeta 2^-(prec+1), and zeta is at least its first
    // term k^-s1 (k-1)^-s2 ... 1^-sk.
    let convolution_bits = bit_length(weight as u64 + 1);
    let target = prec as u64 + 2 + convolution_bits + smallness_bits(s);
    let terms = terms_needed(target, max_depth);
    // Rounding: each accumulated value passes through at most
    // terms * (2 weight + 4) correctly rounded operations, and the final
    // convolution through 2 (weight + 1) more.
    let ops = terms * (2 * weight as u64 + 4) + 2 * (weight as u64 + 1);
    let work = prec + 8 + bit_length(ops) as u32 + convolution_bits as u32;

    let left = suffix_values(&dual, terms, work);
    let right = suffix_values(&word, terms, work);
    let len = word.len();
    let mut total = Float::with_val(work, 0);
    for j in 0..=len {
        total += Float::with_val(work, &left[j] * &right[len - j]);
    }
    Ok(Float::with_val(prec, &total))
}

fn check_arguments(s: &[u32], prec: u32) -> Result<u32> {
    if s.is_empty() {
        return Err(Error::input(
            "a multiple zeta value needs at least one index",
        ));
    }
    if s[0] < 2 {
        return Err(Error::input(format!(
            "zeta({}) diverges: the first index must be at least 2",
            join(s)
        )));
    }
    if s.contains(&0) {
        return Err(Error::input(format!(
            "zeta({}): every index must be at least 1",
            join(s)
        )));
    }
    if s.len() > MAX_ZETA_DEPTH {
        return Err(Error::range(format!(
            "zeta({}): depth {} exceeds the supported {MAX_ZETA_DEPTH}",
            join(s),
            s.len()
        )));
    }
    let weight: u64 = s.iter().map(|&x| x as u64).sum();
    if weight > MAX_MZV_WEIGHT as u64 {
        return Err(Error::range(format!(
            "zeta({}): weight {weight} exceeds the supported {MAX_MZV_WEIGHT}",
            join(s)
        )));
    }
    if prec == 0 || prec > MAX_MZV_PREC {
        return Err(Error::range(format!(
            "precision {prec} bits is outside the supported 1..={MAX_MZV_PREC}"
        )));
    }
    Ok(weight as u32)
}

fn join(s: &[u32]) -> String {
    s.iter()
        .map(|x| x.to_string())
        .collect::<Vec<_>>()
        .join(",")
}

/// Letters of an iterated-integral word: `false` for x0 = dt/t, `true` for
/// x1 = dt/(1-t).
type Word = Vec<bool>;

/// zeta(s1, ..., sk) is the integral of x0^(s1-1) x1 ... x0^(sk-1) x1.
fn word_of(s: &[u32]) -> Word {
    let mut word = Vec::new();
    for &si in s {
        word.extend(std::iter::repeat_n(false, si as usize - 1));
        word.push(true);
    }
    word
}

/// Substituting t -> 1 - t in the part of the integral above 1/2 maps
/// x0 <-> x1 and reverses the order of integration.
fn dual_word(word: &[bool]) -> Word {
    word.iter().rev().map(|&letter| !letter).collect()
}

/// The exponents b1, ..., bm with word = x0^(b1-1) x1 ... x0^(bm-1) x1.
fn exponents(word: &[bool]) -> Vec<u32> {
    let mut out = Vec::new();
    let mut zeros = 0;
    for &letter in word {
        if letter {
            out.push(zeros + 1);
            zeros = 0;
        } else {
            zeros += 1;
        }
    }
    out
}

/// b with zeta(s) >= 2^-b, from the first term of the nested sum,
/// n1 = k, ..., nk = 1; the product is formed exactly.
fn smallness_bits(s: &[u32]) -> u64 {
    let k = s.len() as u32;
    let mut denominator = Integer::from(1);
    for (i, &si) in s.iter().enumerate() {
        denominator *= Integer::from(Integer::u_pow_u(k - i as u32, si));
    }
    denominator.significant_bits() as u64
}

fn bit_length(x: u64) -> u64 {
    (u64::BITS - x.leading_zeros()) as u64
}

/// Smallest number N of outer terms for which the tail of every
/// Li[b1..bm](1/2) with m <= depth lies below 2^-target.
///
/// The inner nested harmonic sum is at most e_{m-1}(1, 1/2, ..., 1/n), which
/// is at most H_n^(m-1)/(m-1)! <= (1 + ln n)^(m-1)/(m-1)!. For n >= 3(m-1)
/// that bound grows by a factor below e^(1/3) per step, so with the 2^-n it
/// forms a geometric tail with ratio below 0.7, and
///   tail <= 2^(-N+1) (1 + ln(N+1))^(m-1) / (m-1)!.
/// In integers: 1 + ln x <= bits(x) once x >= 8, so the power contributes at
/// most (m-1) ceil(log2 bits(N+1)) bits, and (m-1)! at least
/// bits((m-1)!) - 1.
fn terms_needed(target: u64, depth: usize) -> u64 {
    let q = depth.saturating_sub(1) as u64;
    let factorial_bits = Integer::from(Integer::factorial(q as u32)).significant_bits() as u64 - 1;
    let mut n = target.max(3 * q).max(8);
    loop {
        let growth = q * bit_length(bit_length(n + 1) - 1);
        if n + factorial_bits >= target + 1 + growth {
            return n;
        }
        n += 8;
    }
}

/// Li[u](1/2) for every suffix u of `word` (which ends in x1), indexed by the
/// suffix length; index 0 is the empty word, whose value is 1.
///
/// A suffix starting inside block i of the word, with e letters of that block
/// left (1 <= e <= b_i), is
///   sum_n 2^-n n^-e H_{b_{i+1}..b_m}(n-1),
/// with the strict nested harmonic sums
///   H_{c1..cq}(N) = sum_{N >= n1 > ... > nq >= 1} n1^-c1 ... nq^-cq.
/// One pass over n updates all of them; dividing a running value by n
/// repeatedly produces every exponent e of a block along the way.
fn suffix_values(word: &[bool], terms: u64, prec: u32) -> Vec<Float> {
    let b = exponents(word);
    let m = b.len();
    let len = word.len();
    // harmonic[i] = H_{b_i..b_m}(n) for block i (0-based), harmonic[m] = 1.
    let mut harmonic: Vec<Float> = (0..m).map(|_| Float::with_val(prec, 0)).collect();
    harmonic.push(Float::with_val(prec, 1));
    let mut sums: Vec<Float> = (0..=len).map(|_| Float::with_val(prec, 0)).collect();

    // End of block i in the word, to turn (block, exponent) into a suffix length.
    let mut block_end = Vec::with_capacity(m);
    let mut pos = 0usize;
    for &bi in &b {
        pos += bi as usize;
        block_end.push(pos);
    }

    let mut term = Float::with_val(prec, 0);
    for n in 1..=terms {
        let n_small = n as u32;
        let shift = n_small;
        // Ascending i: H_{b_{i+1}..}(n-1) is read before block i+1 moves it to n.
        for i in 0..m {
            term.assign(&harmonic[i + 1]);
            term >>= shift;
            for e in 1..=b[i] {
                term /= n_small;
                // Suffix with e letters of block i left starts at block_end[i] - e.
                let suffix_len = len - (block_end[i] - e as usize);
                sums[suffix_len] += &term;
            }
            if i > 0 {
                term <<= shift;
                harmonic[i] += &term;
            }
        }
    }
    sums[0] = Float::with_val(prec, 1);
    sums
}

#[cfg(test)]
mod tests {
    use super::*;
    use rug::float::Constant;
    use rug::ops::Pow;

    fn zeta1(s: u32, prec: u32) -> Float {
        Float::with_val(prec, Float::zeta_u(s))
    }

    fn pi(prec: u32) -> Float {
        Float::with_val(prec, Constant::Pi)
    }

    /// |a - b| <= |b| 2^-bits.
    fn assert_close(a: &Float, b: &Float, bits: i32, what: &str) {
        let diff = Float::with_val(a.prec().max(b.prec()), a - b).abs();
        let scale = Float::with_val(b.prec(), b.abs_ref()) >> bits;
        assert!(diff <= scale, "{what}: {a} vs {b}, difference {diff}");
    }

    // 300 decimal digits need 997 bits; compare at 1024 with 1000 bits agreement.
    const P: u32 = 1024;
    const AGREE: i32 = 1000;

    #[test]
    fn depth_one_matches_mpfr_zeta() {
        // Independent reference: MPFR's mpfr_zeta_ui.
        for s in [2, 3, 4, 7, 12, 31] {
            assert_close(
                &mzv(&[s], P).unwrap(),
                &zeta1(s, P),
                AGREE,
                &format!("zeta({s})"),
            );
        }
    }

    #[test]
    fn zeta_2_1_equals_zeta_3() {
        // Classical identity zeta(2,1) = zeta(3), checked to 1000 bits (> 300 digits).
        assert_close(&mzv(&[2, 1], P).unwrap(), &zeta1(3, P), AGREE, "zeta(2,1)");
    }

    #[test]
    fn zeta_3_1_is_pi4_over_360() {
        // Closed form zeta(3,1) = pi^4/360 (the case n = 1 of
        // zeta({3,1}^n) = 2 pi^(4n)/(4n+2)!, arXiv:math/9812020).
        let expect = Float::with_val(P, pi(P).pow(4u32)) / 360u32;
        assert_close(&mzv(&[3, 1], P).unwrap(), &expect, AGREE, "zeta(3,1)");
    }

    #[test]
    fn zeta_3_1_3_1_closed_form() {
        // zeta({3,1}^2) = 2 pi^8 / 10! (arXiv:math/9812020), depth 4.
        let fact = Integer::from(Integer::factorial(10));
        let expect = Float::with_val(P, pi(P).pow(8u32)) * 2u32 / fact;
        assert_close(
            &mzv(&[3, 1, 3, 1], P).unwrap(),
            &expect,
            AGREE,
            "zeta(3,1,3,1)",
        );
    }

    #[test]
    fn zeta_2_2_2_closed_form() {
        // zeta({2}^3) = pi^6 / 7!, from the coefficient of x^6 in the product
        // sin(pi x)/(pi x) = prod_n (1 - x^2/n^2) (DLMF 4.22.1).
        let expect = Float::with_val(P, pi(P).pow(6u32)) / 5040u32;
        assert_close(&mzv(&[2, 2, 2], P).unwrap(), &expect, AGREE, "zeta(2,2,2)");
    }

    #[test]
    fn stuffle_products() {
        // Harmonic (stuffle) product of nested sums:
        // zeta(a) zeta(b) = zeta(a,b) + zeta(b,a) + zeta(a+b); single zetas from MPFR.
        for (a, b) in [(2, 3), (3, 5), (2, 2), (2, 7), (4, 6)] {
            let lhs = Float::with_val(P, zeta1(a, P) * zeta1(b, P));
            let rhs = Float::with_val(P, mzv(&[a, b], P).unwrap() + mzv(&[b, a], P).unwrap())
                + zeta1(a + b, P);
            assert_close(&rhs, &lhs, AGREE, &format!("stuffle ({a},{b})"));
        }
    }

    #[test]
    fn stuffle_depth_two_by_one() {
        // zeta(a,b) zeta(c) = zeta(c,a,b) + zeta(a,c,b) + zeta(a,b,c)
        //                   + zeta(a+c,b) + zeta(a,b+c)  (stuffle product).
        let (a, b, c) = (3, 1, 2);
        let z = |s: &[u32]| mzv(s, P).unwrap();
        let lhs = Float::with_val(P, z(&[a, b]) * zeta1(c, P));
        let mut rhs = z(&[c, a, b]);
        for s in [[a, c, b].as_slice(), &[a, b, c], &[a + c, b], &[a, b + c]] {
            rhs += z(s);
        }
        assert_close(&rhs, &lhs, AGREE, "stuffle (3,1)*(2)");
    }

    #[test]
    fn dual_words_are_computed_correctly() {
        // tau(x0^3 x1) = x0 x1 x1 x1: zeta(4) is dual to zeta(2,1,1).
        assert_eq!(exponents(&dual_word(&word_of(&[4]))), vec![2, 1, 1]);
        // x0^2 x1 x1 x0 x1 -> swap 110010 -> reverse 010011 = zeta(2,3,1).
        assert_eq!(exponents(&dual_word(&word_of(&[3, 1, 2]))), vec![2, 3, 1]);
        assert_eq!(
            exponents(&dual_word(&word_of(&[5, 3]))),
            vec![2, 1, 2, 1, 1, 1]
        );
    }

    #[test]
    fn duality_relations() {
        // Iterated-integral duality zeta(w) = zeta(tau(w)); the pairs below are
        // checked to be duals in dual_words_are_computed_correctly. The split
        // at 1/2 treats w and tau(w) alike, so for the method itself duality
        // holds by construction: the informative checks are zeta(4) from MPFR
        // here and the direct sums for zeta(3,1,2) and zeta(2,3,1) in
        // inner_unit_indices_against_direct_sums.
        assert_close(
            &mzv(&[2, 1, 1], P).unwrap(),
            &zeta1(4, P),
            AGREE,
            "zeta(2,1,1)",
        );
        assert_close(
            &mzv(&[3, 1, 2], P).unwrap(),
            &mzv(&[2, 3, 1], P).unwrap(),
            AGREE,
            "zeta(3,1,2) vs zeta(2,3,1)",
        );
        assert_close(
            &mzv(&[5, 3], P).unwrap(),
            &mzv(&[2, 1, 2, 1, 1, 1], P).unwrap(),
            AGREE,
            "zeta(5,3) vs zeta(2,1,2,1,1,1)",
        );
    }

    /// Second, independent algorithm (test only): the partial sums
    /// S(N) = sum_{N >= n1 > ... > nk >= 1} n1^-s1 ... nk^-sk summed directly,
    /// then extrapolated to N = infinity by fitting
    ///   S(N) = S + sum_{k=1..K} sum_{j=0..logs} a_kj ln(N)^j / N^k
    /// through the last points N = spacing, 2 spacing, .... The tail of the
    /// nested sum has that asymptotic form; powers of ln N appear only through
    /// inner indices equal to 1, at most one power per such index.
    fn direct_extrapolated(s: &[u32], spacing: u32, points: usize, logs: usize) -> Float {
        let prec = 640;
        let k = s.len();
        let mut nested: Vec<Float> = (0..k).map(|_| Float::with_val(prec, 0)).collect();
        nested.push(Float::with_val(prec, 1));
        let mut samples = Vec::new();
        for n in 1..=spacing * points as u32 {
            for i in 0..k {
                let term =
                    Float::with_val(prec, &nested[i + 1] / Float::with_val(prec, n).pow(s[i]));
                nested[i] += term;
            }
            if n % spacing == 0 {
                samples.push((n, nested[0].clone()));
            }
        }
        let orders = (points - 1) / (logs + 1);
        let unknowns = 1 + orders * (logs + 1);
        let rows = &samples[samples.len() - unknowns..];
        let mut a: Vec<Vec<Float>> = rows
            .iter()
            .map(|(n, value)| {
                let ln = Float::with_val(prec, *n).ln();
                let mut row = vec![Float::with_val(prec, 1)];
                for order in 1..=orders as u32 {
                    let inv = Float::with_val(prec, *n).pow(order).recip();
                    for j in 0..=logs as u32 {
                        row.push(Float::with_val(
                            prec,
                            &inv * Float::with_val(prec, (&ln).pow(j)),
                        ));
                    }
                }
                row.push(value.clone());
                row
            })
            .collect();
        // Gaussian elimination with partial pivoting; the unknown S is column 0.
        for col in 0..unknowns {
            let pivot = (col..unknowns)
                .max_by(|&x, &y| {
                    a[x][col]
                        .clone()
                        .abs()
                        .partial_cmp(&a[y][col].clone().abs())
                        .unwrap()
                })
                .unwrap();
            a.swap(col, pivot);
            let pivot_row = a[col].clone();
            for row in a.iter_mut().skip(col + 1) {
                let f = Float::with_val(prec, &row[col] / &pivot_row[col]);
                for (c, p) in pivot_row.iter().enumerate().skip(col) {
                    let sub = Float::with_val(prec, &f * p);
                    row[c] -= sub;
                }
            }
        }
        let mut x: Vec<Float> = vec![Float::with_val(prec, 0); unknowns];
        for r in (0..unknowns).rev() {
            let mut acc = a[r][unknowns].clone();
            for c in r + 1..unknowns {
                acc -= Float::with_val(prec, &a[r][c] * &x[c]);
            }
            x[r] = acc / &a[r][r];
        }
        x.swap_remove(0)
    }

    fn from_decimal(text: &str, prec: u32) -> Float {
        Float::with_val(prec, Float::parse(text).unwrap())
    }

    #[test]
    fn zeta_5_3_three_ways() {
        let fast = mzv(&[5, 3], P).unwrap();
        // 1. Value recalled from memory in the project's physics notes (16 digits).
        let memory = from_decimal("0.0377076729848475", P);
        assert_close(&fast, &memory, 48, "zeta(5,3) vs recalled value");
        // 2. mpmath 1.3.0 at mp.dps = 60, from
        //    nsum(lambda n: n**-5 * (zeta(3) - zeta(3, n)), [1, inf])
        //    (Hurwitz zeta for the inner tail; methods 'euler-maclaurin' and
        //    'richardson' gave the same 60 digits).
        let mpmath = from_decimal(
            "0.0377076729848475440113047822936599148226013194152775240126451",
            P,
        );
        assert_close(&fast, &mpmath, 180, "zeta(5,3) vs mpmath");
        // 3. Direct nested sum to N = 600 with extrapolation (this file's second algorithm).
        let slow = direct_extrapolated(&[5, 3], 20, 30, 0);
        assert_close(&fast, &slow, 180, "zeta(5,3) vs direct sum");
    }

    #[test]
    fn depth_three_against_direct_sums() {
        // Second algorithm: direct nested sum plus extrapolation; all indices
        // >= 2, so the tail has no logarithms. Agreement to about 1e-55.
        for s in [[3u32, 2, 2], [4, 2, 3], [2, 2, 5]] {
            let fast = mzv(&s, 512).unwrap();
            let slow = direct_extrapolated(&s, 20, 30, 0);
            assert_close(&fast, &slow, 180, &format!("zeta{s:?}"));
        }
    }

    #[test]
    fn inner_unit_indices_against_direct_sums() {
        // With inner indices 1 the tail carries powers of ln N; the fit allows
        // one power per such index, with more points when there are two.
        for s in [[3u32, 1, 2].as_slice(), &[2, 3, 1], &[2, 1], &[4, 1, 1]] {
            let logs = s[1..].iter().filter(|&&x| x == 1).count();
            let fast = mzv(s, 512).unwrap();
            let slow = direct_extrapolated(s, 20, 15 + 15 * logs, logs);
            assert_close(&fast, &slow, 90, &format!("zeta{s:?}"));
        }
    }

    #[test]
    fn tiny_values_keep_relative_precision() {
        // zeta(60,30,2) is about 3^-60 2^-30 (the first term); check the full
        // relative precision against the direct sums, which converge fast here.
        let fast = mzv(&[60, 30, 2], 256).unwrap();
        let slow = direct_extrapolated(&[60, 30, 2], 20, 30, 0);
        assert!(fast < 1e-35);
        assert_close(&fast, &slow, 250, "zeta(60,30,2)");
    }

    #[test]
    fn rejects_bad_arguments() {
        use crate::error::ErrorKind;
        assert_eq!(mzv(&[], 64).unwrap_err().kind(), ErrorKind::Input);
        assert_eq!(mzv(&[1, 2], 64).unwrap_err().kind(), ErrorKind::Input);
        assert_eq!(mzv(&[3, 0], 64).unwrap_err().kind(), ErrorKind::Input);
        assert_eq!(mzv(&[2; 9], 64).unwrap_err().kind(), ErrorKind::Range);
        assert_eq!(mzv(&[150, 51], 64).unwrap_err().kind(), ErrorKind::Range);
        assert_eq!(mzv(&[2], 40_001).unwrap_err().kind(), ErrorKind::Range);
        assert_eq!(mzv(&[2], 0).unwrap_err().kind(), ErrorKind::Range);
        assert!(mzv(&[150, 50], 64).is_ok());
    }
}
