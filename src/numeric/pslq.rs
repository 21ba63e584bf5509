//! Integer relations among real numbers: integers a_1, ..., a_n, not all
//! zero, with a_1 x_1 + ... + a_n x_n = 0 for values x_i known to a stated
//! number of decimal digits, found by the PSLQ algorithm (Math. Comp. 68
//! (1999) 351) in MPFR; or else a bound B such that
//! no relation of Euclidean norm below B exists.
//!
//! What a caller may rely on, with d the trusted digits and n the number of
//! values:
//! - A combination counts as zero when
//!   |sum a_i x_i| <= 10^-(d - 2) * sum |a_i x_i|: every x_i may be off by a
//!   relative 10^-d, and two digits go to rounding and its propagation.
//! - Found is not yet believed. Among the (2H + 1)^n integer vectors with
//!   entries up to H, one is that small by chance as soon as 10^-(d - 2)
//!   reaches about (2H + 1)^-n, so a relation carries n log10(2H + 1) digits
//!   of information, and it is believed only when the digits exceed that by
//!   [`MIN_SPARE_DIGITS`] (common practice: the precision must exceed the
//!   information in the relation with digits to spare). Otherwise it comes
//!   back as `refused`, never as `relation`.
//! - The search ends once PSLQ's bound passes the largest norm a believable
//!   relation can have (or `max_norm`), so the bound reported never claims
//!   more than the digits support; when the digits cannot support even a
//!   relation with entries of size 1, there is no search at all.
//! - A relation is primitive (gcd 1) with its first non-zero entry positive.

use std::f64::consts::{LOG10_2, LOG2_10};

use rug::ops::Pow;
use rug::{Float, Integer};

use crate::error::{Error, Result};

/// Digits of the input given up to rounding and its propagation.
const TOLERANCE_DIGITS: i64 = 2;

/// Digits beyond a relation's information content before it is believed:
/// about a one-in-10^8 chance that a relation this size shows up by accident.
pub const MIN_SPARE_DIGITS: i64 = 8;

/// Working digits beyond the trusted ones, so that the arithmetic of the
/// search is not what limits it.
const GUARD_DIGITS: u32 = 30;

/// PSLQ's selection parameter; the convergence theorem needs gamma > 2/sqrt(3).
const GAMMA: f64 = 1.2;

/// An integer relation and how far it can be trusted.
#[derive(Debug, Clone, PartialEq)]
pub struct Relation {
    /// Coefficients in the order of the inputs.
    pub coefficients: Vec<Integer>,
    /// |sum a_i x_i| (absolute), at the working precision.
    pub residual: Float,
    /// Trusted digits, less the tolerance's two, less the relation's
    /// information n log10(2H + 1) rounded up; negative when the relation is
    /// larger than the digits can single out.
    pub digits_to_spare: i64,
}

/// Outcome of a search for an integer relation sum_i a_i x_i = 0.
#[derive(Debug, Clone, PartialEq)]
pub struct RelationSearch {
    /// The relation found, when it is clearly better than chance.
    pub relation: Option<Relation>,
    /// A relation that holds to the tolerance but is too large for the digits
    /// to tell it from a chance one: not a finding.
    pub refused: Option<Relation>,
    /// No integer relation with Euclidean norm below this exists (PSLQ's
    /// 1/max|H_jj| when the search ended; 1 when there was no search).
    pub norm_bound: Float,
    /// The norm up to which the search could vouch for its answer:
    /// `max_norm` or the largest norm a believable relation can have, whichever
    /// is smaller (0 when the digits support no relation at all). A search
    /// without a relation whose `norm_bound` is below this stopped early.
    pub norm_limit: Float,
    /// PSLQ iterations used.
    pub iterations: usize,
    /// Decimal digits of the inputs that the search trusted: `digits`, or
    /// fewer when the values' precision holds fewer.
    pub digits_used: u32,
}

/// Searches for an integer relation among `values`, which must all have the
/// same precision, be finite and be non-zero (a zero value is a relation by
/// itself). `digits` is the number of decimal digits of the values that are
/// trustworthy; `max_norm` ends the search once no relation below it exists.
///
/// Errors (kind Input): fewer than two values, a value that is zero, NaN or
/// infinite, values of different precisions. Error (kind Range): `max_norm`
/// NaN or not positive.
pub fn find_relation(values: &[Float], digits: u32, max_norm: &Float) -> Result<RelationSearch> {
    check(values, max_norm)?;
    let n = values.len();
    let digits_used = digits.min((f64::from(values[0].prec()) * LOG10_2).floor() as u32);
    let effective = i64::from(digits_used) - TOLERANCE_DIGITS;
    let Some(believable) = believable_norm(n, effective - MIN_SPARE_DIGITS) else {
        return Ok(RelationSearch {
            relation: None,
            refused: None,
            norm_bound: Float::with_val(64, 1),
            norm_limit: Float::new(64),
            iterations: 0,
            digits_used,
        });
    };
    let limit = believable.min(&Float::with_val(64, max_norm));
    let working_digits = digits_used + GUARD_DIGITS;
    let prec = (f64::from(working_digits) * LOG2_10).ceil() as u32;
    let tol = Float::with_val(64, 10u32).pow(-effective as i32);

    // H errs by about 10^-working_digits times A's largest entry, and the
    // bound reads max|H_jj| down to 1/limit: A must stay below this to trust it.
    let a_limit_bits =
        (f64::from(working_digits - 10) * LOG2_10 - limit.clone().log2().to_f64()) as u32;
    let max_iterations = iteration_cap(n, &limit);
    let mut state = Pslq::new(values, prec);
    state.reduce();
    let mut iterations = 0;
    let column = loop {
        if let Some(j) = state.detect(&tol) {
            break Some(state.bt[j].clone());
        }
        if state.bound() > limit || iterations >= max_iterations || state.a_bits() > a_limit_bits {
            break None;
        }
        state.step();
        iterations += 1;
    };
    let norm_bound = state.bound();

    let (relation, refused) = match column.map(|c| assess(values, c, prec, &tol, effective)) {
        Some((candidate, true)) => (Some(candidate), None),
        Some((candidate, false)) => (None, Some(candidate)),
        None => (None, None),
    };
    Ok(RelationSearch {
        relation,
        refused,
        norm_bound,
        norm_limit: limit,
        iterations,
        digits_used,
    })
}

fn check(values: &[Float], max_norm: &Float) -> Result<()> {
    if values.len() < 2 {
        return Err(Error::input(format!(
            "an integer relation needs at least two values, got {}",
            values.len()
        )));
    }
    let prec = values[0].prec();
    for (v, place) in values.iter().zip(1..) {
        let problem = if !v.is_finite() {
            "is not a finite number".to_string()
        } else if v.is_zero() {
            "is zero: it is a relation by itself; leave it out".to_string()
        } else if v.prec() != prec {
            format!(
                "has {} bits and value 1 has {prec}: give all at one precision",
                v.prec()
            )
        } else {
            continue;
        };
        return Err(Error::input(format!("value {place} {problem}")));
    }
    if max_norm.is_nan() || *max_norm <= 0 {
        return Err(Error::range("max_norm must be positive"));
    }
    Ok(())
}

/// The largest Euclidean norm of a relation among n values whose information
/// n log10(2H + 1) fits in `digits`, or None when not even H = 1 fits.
fn believable_norm(n: usize, digits: i64) -> Option<Float> {
    let per_entry = digits as f64 / n as f64;
    if per_entry < 3f64.log10() {
        return None;
    }
    let mut h = Float::with_val(64, 10u32).pow(Float::with_val(64, per_entry));
    h -= 1u32;
    h /= 2u32;
    // The largest entry of a relation is at least its norm over sqrt(n).
    Some(h * Float::with_val(64, n).sqrt())
}

/// A safety net against rounding stalling the search: four times the count
/// within which the convergence theorem of the cited paper has PSLQ find a
/// relation of norm up to `limit` if one exists, C(n, 2) log(gamma^(n-1)
/// limit) / log(tau) with 1/tau^2 = 1/gamma^2 + 1/4.
fn iteration_cap(n: usize, limit: &Float) -> usize {
    let ln_tau = -0.5 * (1.0 / (GAMMA * GAMMA) + 0.25).ln();
    let pairs = (n * (n - 1) / 2) as f64;
    let ln_m = (n - 1) as f64 * GAMMA.ln() + limit.clone().ln().to_f64().max(0.0);
    (4.0 * pairs * ln_m / ln_tau).ceil() as usize + 10
}

/// The state of PSLQ: y = x B, with H the lower trapezoidal matrix the
/// iterations drive towards a small last row.
struct Pslq {
    /// The input scaled to unit Euclidean norm.
    x: Vec<Float>,
    /// n rows by n - 1 columns, zero above the diagonal.
    h: Vec<Vec<Float>>,
    /// A with B = A^-1; kept only for the size of its entries.
    a: Vec<Vec<Integer>>,
    /// B's columns as rows: each is a candidate relation.
    bt: Vec<Vec<Integer>>,
    /// gamma^(j+1), the selection weights.
    weights: Vec<Float>,
    prec: u32,
}

impl Pslq {
    fn new(values: &[Float], prec: u32) -> Self {
        let n = values.len();
        let mut norm = Float::new(prec);
        for v in values {
            norm += Float::with_val(prec, v.square_ref());
        }
        let norm = norm.sqrt();
        let x: Vec<Float> = values
            .iter()
            .map(|v| Float::with_val(prec, v / &norm))
            .collect();
        // s[k] = sqrt(x_k^2 + ... + x_(n-1)^2); all positive as no x is zero.
        let mut s = vec![Float::new(prec); n];
        let mut tail = Float::new(prec);
        for k in (0..n).rev() {
            tail += Float::with_val(prec, x[k].square_ref());
            s[k] = Float::with_val(prec, tail.sqrt_ref());
        }
        let mut h = vec![vec![Float::new(prec); n - 1]; n];
        for (i, row) in h.iter_mut().enumerate() {
            for (j, entry) in row.iter_mut().enumerate().take(i.min(n - 2) + 1) {
                *entry = if i == j {
                    Float::with_val(prec, &s[j + 1] / &s[j])
                } else {
                    let e = Float::with_val(prec, &x[i] * &x[j]);
                    -e / Float::with_val(prec, &s[j] * &s[j + 1])
                };
            }
        }
        let identity: Vec<Vec<Integer>> = (0..n)
            .map(|i| (0..n).map(|k| Integer::from(i == k)).collect())
            .collect();
        let gamma = Float::with_val(64, GAMMA);
        let weights = (1..n as u32)
            .map(|j| Float::with_val(64, (&gamma).pow(j)))
            .collect();
        Pslq {
            x,
            h,
            a: identity.clone(),
            bt: identity,
            weights,
            prec,
        }
    }

    /// Hermite reduction of H: every entry below the diagonal becomes at most
    /// half its column's diagonal entry, by integer row operations mirrored
    /// in A and (inversely) in B.
    fn reduce(&mut self) {
        let n = self.x.len();
        for i in 1..n {
            for j in (0..i.min(n - 1)).rev() {
                // A zero diagonal entry (an exact relation) gives no finite
                // quotient, and nothing to reduce by.
                let q = Float::with_val(self.prec, &self.h[i][j] / &self.h[j][j]).round();
                let Some(t) = q.to_integer() else { continue };
                if t == 0 {
                    continue;
                }
                let tf = Float::with_val(self.prec, &t);
                let (upper, lower) = self.h.split_at_mut(i);
                for (hik, hjk) in lower[0].iter_mut().zip(&upper[j]).take(j + 1) {
                    *hik -= &tf * hjk;
                }
                let (upper, lower) = self.a.split_at_mut(i);
                for (aik, ajk) in lower[0].iter_mut().zip(&upper[j]) {
                    *aik -= &t * ajk;
                }
                let (upper, lower) = self.bt.split_at_mut(i);
                for (bjk, bik) in upper[j].iter_mut().zip(&lower[0]) {
                    *bjk += &t * bik;
                }
            }
        }
    }

    /// One iteration: exchange the rows m, m + 1 with the largest weighted
    /// diagonal entry, restore the trapezoidal shape, reduce.
    fn step(&mut self) {
        let n = self.x.len();
        let mut m = 0;
        let mut best = Float::new(64);
        for j in 0..n - 1 {
            let w = Float::with_val(64, self.h[j][j].abs_ref()) * &self.weights[j];
            if w > best {
                best = w;
                m = j;
            }
        }
        self.h.swap(m, m + 1);
        self.a.swap(m, m + 1);
        self.bt.swap(m, m + 1);
        if m + 2 < n {
            let prec = self.prec;
            let t0 = Float::with_val(prec, self.h[m][m].hypot_ref(&self.h[m][m + 1]));
            if !t0.is_zero() {
                let t1 = Float::with_val(prec, &self.h[m][m] / &t0);
                let t2 = Float::with_val(prec, &self.h[m][m + 1] / &t0);
                for row in &mut self.h[m..] {
                    let mut left = Float::with_val(prec, &t1 * &row[m]);
                    left += &t2 * &row[m + 1];
                    let mut right = Float::with_val(prec, &t1 * &row[m + 1]);
                    right -= &t2 * &row[m];
                    row[m] = left;
                    row[m + 1] = right;
                }
                // Zero in exact arithmetic; rounding must not leave an entry
                // above the diagonal for a later exchange to move down.
                self.h[m][m + 1] = Float::new(prec);
            }
        }
        self.reduce();
    }

    /// 1/max|H_jj|: every relation of x has at least this norm (Theorem 1
    /// of the cited paper).
    fn bound(&self) -> Float {
        let largest = (0..self.x.len() - 1)
            .map(|j| Float::with_val(64, self.h[j][j].abs_ref()))
            .fold(Float::new(64), |big, d| big.max(&d));
        Float::with_val(64, 1u32) / largest
    }

    /// The column of B whose combination of x is smallest relative to the
    /// size of its terms, when that is within the tolerance. Recomputed from
    /// B rather than updated, so that its rounding stays relative to the
    /// terms however large B grows.
    fn detect(&self, tol: &Float) -> Option<usize> {
        let mut found: Option<(usize, Float)> = None;
        for (j, column) in self.bt.iter().enumerate() {
            let (sum, scale) = combination(&self.x, column, self.prec);
            let ratio = Float::with_val(64, sum.abs_ref()) / Float::with_val(64, &scale);
            if ratio <= *tol && found.as_ref().is_none_or(|(_, r)| ratio < *r) {
                found = Some((j, ratio));
            }
        }
        found.map(|(j, _)| j)
    }

    fn a_bits(&self) -> u32 {
        self.a
            .iter()
            .flatten()
            .map(Integer::significant_bits)
            .max()
            .unwrap_or(0)
    }
}

/// sum c_i v_i and sum |c_i v_i|, at `prec`.
fn combination(values: &[Float], coefficients: &[Integer], prec: u32) -> (Float, Float) {
    let mut sum = Float::new(prec);
    let mut scale = Float::new(prec);
    for (v, c) in values.iter().zip(coefficients) {
        let term = Float::with_val(prec, v * c);
        sum += &term;
        scale += term.abs();
    }
    (sum, scale)
}

/// The candidate made primitive with a positive first entry, its residual on
/// the caller's values, and whether it is believed.
fn assess(
    values: &[Float],
    mut coefficients: Vec<Integer>,
    prec: u32,
    tol: &Float,
    effective: i64,
) -> (Relation, bool) {
    let mut gcd = Integer::new();
    for c in &coefficients {
        gcd.gcd_mut(c);
    }
    if coefficients
        .iter()
        .find(|c| **c != 0)
        .is_some_and(|c| *c < 0)
    {
        gcd = -gcd;
    }
    for c in &mut coefficients {
        c.div_exact_mut(&gcd);
    }
    let (sum, scale) = combination(values, &coefficients, prec);
    let residual = sum.abs();
    let largest = coefficients
        .iter()
        .map(|c| c.clone().abs())
        .max()
        .unwrap_or_default();
    let information = Float::with_val(64, largest * 2u32 + 1u32).log10().to_f64();
    let needed = (values.len() as f64 * information).ceil() as i64;
    let digits_to_spare = effective - needed;
    let believed =
        residual <= Float::with_val(prec, tol * &scale) && digits_to_spare >= MIN_SPARE_DIGITS;
    (
        Relation {
            coefficients,
            residual,
            digits_to_spare,
        },
        believed,
    )
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::error::ErrorKind;
    use crate::numeric::mzv::mzv;
    use rug::float::Constant;

    const P: u32 = 256;

    fn pi_pow(k: u32) -> Float {
        Float::with_val(P, Constant::Pi).pow(k)
    }

    fn zeta(s: u32) -> Float {
        Float::with_val(P, s).zeta()
    }

    /// The value as data known to `digits` significant digits (rug's
    /// precision in scientific formatting counts significant digits).
    fn known_to(x: &Float, digits: usize) -> Float {
        Float::with_val(P, Float::parse(format!("{x:.digits$e}")).unwrap())
    }

    fn search(values: &[Float], digits: u32) -> RelationSearch {
        find_relation(values, digits, &Float::with_val(64, 1e40)).unwrap()
    }

    /// The relation found at `digits`, after checking it against the bound
    /// (no relation below norm_bound exists, so this one is not below it).
    fn found(values: &[Float], digits: u32) -> Vec<i64> {
        let s = search(values, digits);
        let r = s.relation.expect("a relation");
        let norm: Integer = r.coefficients.iter().map(|c| Integer::from(c * c)).sum();
        assert!(Float::with_val(64, norm).sqrt() >= s.norm_bound);
        r.coefficients.iter().map(|c| c.to_i64().unwrap()).collect()
    }

    #[test]
    fn zeta_four_over_pi_four() {
        // zeta(4) = pi^4/90 (DLMF 25.6.1; docs/conventions.md section 1).
        let (z4, p4) = (known_to(&zeta(4), 60), known_to(&pi_pow(4), 60));
        assert_eq!(found(&[z4.clone(), p4.clone()], 60), [90, -1]);
        assert_eq!(found(&[p4, z4], 60), [1, -90]);
    }

    #[test]
    fn cusp_coefficients() {
        // Gamma_cusp = 4g^2 - 8 zeta2 g^4 + 88 zeta4 g^6 - (876 zeta6 + 32 zeta3^2) g^8
        // + (14192/14175 pi^8 + 64/3 pi^2 zeta3^2 + 640 zeta3 zeta5) g^10
        // (hep-th/0610251, as in docs/conventions.md section 4); with
        // zeta4 = pi^4/90 and zeta6 = pi^6/945 (DLMF 25.6.1) the g^6 and g^8
        // coefficients are 44/45 pi^4 and -292/315 pi^6 - 32 zeta3^2.
        let z3sq = Float::with_val(P, zeta(3).square_ref());
        let three = pi_pow(4) * 44 / 45u32;
        assert_eq!(
            found(&[known_to(&three, 60), known_to(&pi_pow(4), 60)], 60),
            [45, -44]
        );

        let four = pi_pow(6) * -292 / 315u32 - Float::with_val(P, &z3sq * 32u32);
        let basis = [four, pi_pow(6), z3sq.clone()].map(|v| known_to(&v, 60));
        assert_eq!(found(&basis, 60), [315, 292, 10080]);

        let z3z5 = Float::with_val(P, zeta(3) * zeta(5));
        let pi2z3sq = Float::with_val(P, pi_pow(2) * &z3sq);
        let mut five = pi_pow(8) * 14192 / 14175u32;
        five += Float::with_val(P, &pi2z3sq * 64u32) / 3u32;
        five += Float::with_val(P, &z3z5 * 640u32);
        let basis = [five, pi_pow(8), pi2z3sq, z3z5].map(|v| known_to(&v, 60));
        assert_eq!(found(&basis, 60), [14175, -14192, -302400, -9072000]);
    }

    #[test]
    fn classical_constants_without_relation() {
        // ln 2, pi, G = sum_k (-1)^k/(2k + 1)^2, sqrt(2) + sqrt(3): no rational
        // linear relation is known or expected (believed, not proven); the
        // search must end with nothing and a bound up to its limit.
        let root = Float::with_val(P, 2).sqrt() + Float::with_val(P, 3).sqrt();
        let values = [
            Float::with_val(P, Constant::Log2),
            Float::with_val(P, Constant::Pi),
            Float::with_val(P, Constant::Catalan),
            root,
        ]
        .map(|v| known_to(&v, 60));
        let s = search(&values, 60);
        assert!(s.relation.is_none() && s.refused.is_none());
        assert!(s.norm_bound >= s.norm_limit && s.norm_limit > 1e12);
    }

    #[test]
    fn large_relation_needs_the_digits() {
        // x = 12345 pi - 678 e - 9101 sqrt(2) by construction (derived here).
        let e = Float::with_val(P, 1).exp();
        let root = Float::with_val(P, 2).sqrt();
        let pi = Float::with_val(P, Constant::Pi);
        let mut x = Float::with_val(P, &pi * 12345u32);
        x -= Float::with_val(P, &e * 678u32);
        x -= Float::with_val(P, &root * 9101u32);
        let exact = [x, pi, e, root];

        // Four values at 10 digits support no relation at all.
        let s = search(&exact.clone().map(|v| known_to(&v, 10)), 10);
        assert!(s.relation.is_none() && s.refused.is_none());
        assert_eq!((s.iterations, s.norm_limit.is_zero()), (0, true));

        // The relation carries ceil(4 log10(2 * 12345 + 1)) = 18 digits of
        // information (derived here). At 25 digits the search ends at its
        // limit without it; at 27 it turns up, with 27 - 2 - 18 = 7 digits to
        // spare, and is refused: too few digits to tell it from chance.
        let s = search(&exact.clone().map(|v| known_to(&v, 25)), 25);
        assert!(s.relation.is_none() && s.refused.is_none());
        let s = search(&exact.clone().map(|v| known_to(&v, 27)), 27);
        assert!(s.relation.is_none());
        let refused = s.refused.expect("a refused candidate");
        assert_eq!(refused.coefficients, [1, -12345, 678, 9101]);
        assert_eq!(refused.digits_to_spare, 7);

        let values = exact.map(|v| known_to(&v, 60));
        assert_eq!(found(&values, 60), [1, -12345, 678, 9101]);
    }

    #[test]
    fn weight_eight_multiple_zeta_values() {
        let z53 = mzv(&[5, 3], P).unwrap();
        let z3z5 = Float::with_val(P, zeta(3) * zeta(5));
        // zeta(5,3) is not in span{pi^8, zeta(3) zeta(5)}: it is the
        // irreducible one of weight 8 (docs/conventions.md section 7;
        // irreducibility is conjectured, not proven).
        let s = search(&[z53.clone(), pi_pow(8), z3z5.clone()], 60);
        assert!(s.relation.is_none() && s.refused.is_none());
        assert!(s.norm_bound >= s.norm_limit);

        // zeta(5) zeta(3) = zeta(5,3) + zeta(3,5) + zeta(8) from the series
        // definitions (derived here), with zeta(8) = pi^8/9450 (docs/conventions.md
        // section 1, from the Bernoulli numbers of A&S table 23.2).
        let z35 = mzv(&[3, 5], P).unwrap();
        let basis = [z53, z35, pi_pow(8), z3z5];
        assert_eq!(found(&basis, 60), [9450, 9450, 1, -9450]);

        // zeta(3,1) = pi^4/360 (classical identity, docs/conventions.md
        // section 7; recalled from memory).
        assert_eq!(found(&[mzv(&[3, 1], P).unwrap(), pi_pow(4)], 60), [360, -1]);
    }

    #[test]
    fn digits_capped_by_precision() {
        // 64 bits hold 19 digits; asking for 60 trusts only those 19. No
        // relation exists (sqrt(2) is irrational, classical).
        let values = [Float::with_val(64, 2).sqrt(), Float::with_val(64, 1)];
        let s = find_relation(&values, 60, &Float::with_val(64, 1e10)).unwrap();
        assert_eq!(s.digits_used, 19);
        assert!(s.relation.is_none());
    }

    #[test]
    fn bad_input_is_an_error() {
        let big = Float::with_val(64, 1e10);
        let one = Float::with_val(P, 1);
        let kind =
            |values: &[Float], max: &Float| find_relation(values, 30, max).unwrap_err().kind();
        assert_eq!(kind(&[], &big), ErrorKind::Input);
        assert_eq!(kind(std::slice::from_ref(&one), &big), ErrorKind::Input);
        assert_eq!(kind(&[one.clone(), Float::new(P)], &big), ErrorKind::Input);
        let nan = Float::with_val(P, rug::float::Special::Nan);
        assert_eq!(kind(&[one.clone(), nan.clone()], &big), ErrorKind::Input);
        let inf = Float::with_val(P, rug::float::Special::Infinity);
        assert_eq!(kind(&[inf, one.clone()], &big), ErrorKind::Input);
        assert_eq!(
            kind(&[one.clone(), Float::with_val(64, 3)], &big),
            ErrorKind::Input
        );
        let pair = [one, pi_pow(1)];
        assert_eq!(kind(&pair, &Float::new(64)), ErrorKind::Range);
        assert_eq!(kind(&pair, &nan), ErrorKind::Range);
    }
}
