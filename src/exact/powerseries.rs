//! Truncated power series in the loop-counting parameter x (x = g^2 in the
//! project's convention), with coefficients in the exact ring.
//!
//! A series knows the highest power it holds; every operation truncates to
//! the lowest order its operands know, so no order is ever claimed that was
//! not computed.

use std::ops::{Add, AddAssign, Mul, Neg, Sub, SubAssign};

use rug::Rational;

use crate::error::{Error, Result};
use crate::exact::coupling::Coupling;
use crate::exact::ring::{Exact, Monomial};

/// sum_{k=0}^{order} c_k x^k, known through x^order.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Series {
    coeffs: Vec<Exact>,
}

impl Series {
    /// The series with these coefficients of x^0, x^1, ...; known through the last.
    pub fn new(coeffs: Vec<Exact>) -> Self {
        assert!(
            !coeffs.is_empty(),
            "a series holds at least its constant term"
        );
        Series { coeffs }
    }

    pub fn zero(order: usize) -> Self {
        Series {
            coeffs: vec![Exact::zero(); order + 1],
        }
    }

    pub fn constant(c: Exact, order: usize) -> Self {
        let mut s = Series::zero(order);
        s.coeffs[0] = c;
        s
    }

    /// x itself, known through `order` (at least 1).
    pub fn variable(order: usize) -> Self {
        let mut s = Series::zero(order.max(1));
        s.coeffs[1] = Exact::one();
        s
    }

    /// The highest power of x this series knows.
    pub fn order(&self) -> usize {
        self.coeffs.len() - 1
    }

    /// The coefficient of x^k; zero beyond the known order is not implied,
    /// so callers check `order()` first.
    pub fn coeff(&self, k: usize) -> &Exact {
        &self.coeffs[k]
    }

    pub fn coeffs(&self) -> &[Exact] {
        &self.coeffs
    }

    /// The coefficients of x^0, x^1, ..., taken out of the series.
    pub fn into_coeffs(self) -> Vec<Exact> {
        self.coeffs
    }

    pub fn truncate(&self, order: usize) -> Series {
        Series {
            coeffs: self.coeffs[..=order.min(self.order())].to_vec(),
        }
    }

    pub fn scale(&self, c: &Exact) -> Series {
        Series {
            coeffs: self.coeffs.iter().map(|a| a * c).collect(),
        }
    }

    pub fn map(&self, f: impl Fn(&Exact) -> Exact) -> Series {
        Series {
            coeffs: self.coeffs.iter().map(f).collect(),
        }
    }

    /// The k-th power, by repeated squaring.
    pub fn pow(&self, k: u64) -> Series {
        let mut result = Series::constant(Exact::one(), self.order());
        let mut base = self.clone();
        let mut k = k;
        while k > 0 {
            if k & 1 == 1 {
                result = &result * &base;
            }
            k >>= 1;
            if k > 0 {
                base = &base * &base;
            }
        }
        result
    }

    /// x -> k x: the coefficient of x^n is multiplied by k^n.
    pub fn rescale(&self, k: &Exact) -> Series {
        let mut power = Exact::one();
        let mut coeffs = Vec::with_capacity(self.coeffs.len());
        for c in &self.coeffs {
            coeffs.push(c * &power);
            power = &power * k;
        }
        Series { coeffs }
    }

    /// The same function written as a series in another coupling: a
    /// coefficient c_L of g^(2L) becomes c_L / r^L, where x = r g^2.
    pub fn in_coupling(&self, coupling: Coupling) -> Series {
        let (num, pi2) = coupling.ratio_to_g2();
        let inverse = Exact::term(Rational::from((1, num)), Monomial::pi_power(-2 * pi2));
        self.rescale(&inverse)
    }

    /// The inverse of `in_coupling`: coefficients given in `coupling`, back to g^2.
    pub fn from_coupling(&self, coupling: Coupling) -> Series {
        let (num, pi2) = coupling.ratio_to_g2();
        self.rescale(&Exact::term(
            Rational::from(num),
            Monomial::pi_power(2 * pi2),
        ))
    }

    /// The multiplicative inverse; the constant term must be invertible in the ring.
    pub fn inverse(&self) -> Result<Series> {
        if self.coeffs[0].is_zero() {
            let message = if self.coeffs.iter().all(Exact::is_zero) {
                "division by zero"
            } else {
                "division by a series without constant term (it starts at a positive power of g^2): no power series inverts it"
            };
            return Err(Error::input(message));
        }
        let c0_inv = self.coeffs[0]
            .inverse()
            .map_err(|e| e.context("inverting a series"))?;
        let n = self.order();
        let mut out: Vec<Exact> = Vec::with_capacity(n + 1);
        out.push(c0_inv.clone());
        for k in 1..=n {
            let mut acc = Exact::zero();
            for j in 1..=k {
                if !self.coeffs[j].is_zero() && !out[k - j].is_zero() {
                    acc += &(&self.coeffs[j] * &out[k - j]);
                }
            }
            out.push(-(&acc * &c0_inv));
        }
        Ok(Series { coeffs: out })
    }

    /// ln of a series whose constant term is 1.
    pub fn ln(&self) -> Result<Series> {
        if self.coeffs[0] != Exact::one() {
            return Err(Error::input(format!(
                "the logarithm of a series needs constant term 1, not {}",
                self.coeffs[0]
            )));
        }
        let coeffs = ln_coefficients(&mut RingSeries, &self.coeffs, &mut |_, _, _| true)?;
        Ok(Series { coeffs })
    }

    /// exp of a series whose constant term is 0.
    pub fn exp(&self) -> Result<Series> {
        if !self.coeffs[0].is_zero() {
            return Err(Error::input(format!(
                "the exponential of a series needs constant term 0, not {}",
                self.coeffs[0]
            )));
        }
        Ok(Series {
            coeffs: exp_coefficients(&mut RingSeries, &self.coeffs)?,
        })
    }
}

/// The arithmetic the series logarithm and exponential need from a
/// representation of coefficients: the exact ring here, and the origin's
/// polynomials in the logs, exact or with errors. A representation may keep
/// state (interned monomials), hence `&mut self`.
pub trait SeriesCoefficients {
    type C: Clone;
    fn zero(&mut self) -> Self::C;
    fn one(&mut self) -> Self::C;
    /// Structurally zero: a term that can be skipped.
    fn is_zero(&self, c: &Self::C) -> bool;
    /// acc += factor * a * b, with `a` the operand expected to be smaller.
    fn add_product(
        &mut self,
        acc: &mut Self::C,
        factor: &Rational,
        a: &Self::C,
        b: &Self::C,
    ) -> Result<()>;
}

/// ln of a series with constant term 1 (the caller checks it), from
/// (ln f)' f = f': L_k = f_k - (1/k) sum_{j<k} j L_j f_(k-j). `keep_going`
/// sees each new coefficient and may stop the expansion, which then ends at
/// that order.
pub fn ln_coefficients<A: SeriesCoefficients>(
    alg: &mut A,
    f: &[A::C],
    keep_going: &mut dyn FnMut(&mut A, usize, &A::C) -> bool,
) -> Result<Vec<A::C>> {
    let mut out = vec![alg.zero()];
    for k in 1..f.len() {
        let mut acc = f[k].clone();
        for j in 1..k {
            if !alg.is_zero(&out[j]) && !alg.is_zero(&f[k - j]) {
                let factor = Rational::from((-(j as i64), k as i64));
                alg.add_product(&mut acc, &factor, &out[j], &f[k - j])?;
            }
        }
        let go_on = keep_going(alg, k, &acc);
        out.push(acc);
        if !go_on {
            break;
        }
    }
    Ok(out)
}

/// exp of a series with constant term 0 (the caller checks it), from
/// (exp f)' = f' exp f: k E_k = sum_{j<=k} j f_j E_(k-j).
pub fn exp_coefficients<A: SeriesCoefficients>(alg: &mut A, f: &[A::C]) -> Result<Vec<A::C>> {
    let mut out = vec![alg.one()];
    for k in 1..f.len() {
        let mut acc = alg.zero();
        for j in 1..=k {
            if !alg.is_zero(&f[j]) && !alg.is_zero(&out[k - j]) {
                let factor = Rational::from((j as i64, k as i64));
                alg.add_product(&mut acc, &factor, &f[j], &out[k - j])?;
            }
        }
        out.push(acc);
    }
    Ok(out)
}

/// Coefficients in the exact ring.
struct RingSeries;

impl SeriesCoefficients for RingSeries {
    type C = Exact;
    fn zero(&mut self) -> Exact {
        Exact::zero()
    }
    fn one(&mut self) -> Exact {
        Exact::one()
    }
    fn is_zero(&self, c: &Exact) -> bool {
        c.is_zero()
    }
    fn add_product(
        &mut self,
        acc: &mut Exact,
        factor: &Rational,
        a: &Exact,
        b: &Exact,
    ) -> Result<()> {
        *acc += &(a * b).scale(factor);
        Ok(())
    }
}

impl<'a> AddAssign<&'a Series> for Series {
    /// In place, so that a long sum costs its terms and not their square.
    fn add_assign(&mut self, rhs: &'a Series) {
        self.coeffs.truncate(rhs.order().min(self.order()) + 1);
        for (a, b) in self.coeffs.iter_mut().zip(&rhs.coeffs) {
            *a += b;
        }
    }
}

impl<'a> SubAssign<&'a Series> for Series {
    fn sub_assign(&mut self, rhs: &'a Series) {
        self.coeffs.truncate(rhs.order().min(self.order()) + 1);
        for (a, b) in self.coeffs.iter_mut().zip(&rhs.coeffs) {
            *a -= b;
        }
    }
}

impl<'a> Add<&'a Series> for &'a Series {
    type Output = Series;
    fn add(self, rhs: &'a Series) -> Series {
        let n = self.order().min(rhs.order());
        Series {
            coeffs: (0..=n).map(|k| &self.coeffs[k] + &rhs.coeffs[k]).collect(),
        }
    }
}

impl<'a> Sub<&'a Series> for &'a Series {
    type Output = Series;
    fn sub(self, rhs: &'a Series) -> Series {
        let n = self.order().min(rhs.order());
        Series {
            coeffs: (0..=n).map(|k| &self.coeffs[k] - &rhs.coeffs[k]).collect(),
        }
    }
}

impl<'a> Mul<&'a Series> for &'a Series {
    type Output = Series;
    fn mul(self, rhs: &'a Series) -> Series {
        let n = self.order().min(rhs.order());
        let mut coeffs = vec![Exact::zero(); n + 1];
        for (i, a) in self.coeffs.iter().enumerate().take(n + 1) {
            if a.is_zero() {
                continue;
            }
            for (j, b) in rhs.coeffs.iter().enumerate().take(n + 1 - i) {
                if !b.is_zero() {
                    coeffs[i + j] += &(a * b);
                }
            }
        }
        Series { coeffs }
    }
}

impl Neg for &Series {
    type Output = Series;
    fn neg(self) -> Series {
        Series {
            coeffs: self.coeffs.iter().map(|c| -c).collect(),
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn q(n: i64, d: i64) -> Exact {
        Exact::from(Rational::from((n, d)))
    }

    fn sample() -> Series {
        Series::new(vec![
            Exact::zero(),
            Exact::from(4),
            Exact::zeta(2).unwrap().scale(&Rational::from(-8)),
            &Exact::zeta(3).unwrap() + &Exact::symbol("c2"),
            q(3, 7),
        ])
    }

    #[test]
    fn in_place_sums_agree() {
        let f = sample();
        let mut g = f.clone();
        g += &f;
        assert_eq!(g, &f + &f);
        g -= &f;
        assert_eq!(g, f);
        let mut short = f.truncate(2);
        short += &f;
        assert_eq!(short.order(), 2);
    }

    #[test]
    fn powers_agree_with_products() {
        let f = sample();
        assert_eq!(f.pow(3), &(&f * &f) * &f);
        assert_eq!(f.pow(0), Series::constant(Exact::one(), 4));
    }

    #[test]
    fn exp_and_ln_are_inverse() {
        let f = sample();
        assert_eq!(f.exp().unwrap().ln().unwrap(), f);
    }

    #[test]
    fn inverse_times_series_is_one() {
        let f = &Series::constant(Exact::from(2), 4) + &sample();
        let product = &f * &f.inverse().unwrap();
        assert_eq!(product, Series::constant(Exact::one(), 4));
    }

    /// exp(x) = sum x^n / n! (common practice).
    #[test]
    fn exp_of_x() {
        let e = Series::variable(6).exp().unwrap();
        let mut fact = 1i64;
        for n in 0..=6 {
            if n > 0 {
                fact *= n;
            }
            assert_eq!(*e.coeff(n as usize), q(1, fact));
        }
    }

    #[test]
    fn coupling_conversion_round_trips() {
        let f = sample();
        for c in Coupling::ALL {
            assert_eq!(f.in_coupling(c).from_coupling(c), f);
        }
        // In a = 2 g^2 the two-loop coefficient is divided by 2^2 (docs/conventions.md section 1).
        assert_eq!(
            *f.in_coupling(Coupling::A).coeff(2),
            Exact::zeta(2).unwrap().scale(&Rational::from(-2))
        );
    }

    #[test]
    fn ln_requires_unit_constant() {
        assert!(Series::variable(3).ln().is_err());
        assert!(Series::constant(Exact::one(), 3).exp().is_err());
    }
}
