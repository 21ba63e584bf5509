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

    /// ln of a series whose constant term is 1, from (ln f)' f = f'.
    pub fn ln(&self) -> Result<Series> {
        if self.coeffs[0] != Exact::one() {
            return Err(Error::input(format!(
                "the logarithm of a series needs constant term 1, not {}",
                self.coeffs[0]
            )));
        }
        let n = self.order();
        let mut out: Vec<Exact> = vec![Exact::zero(); n + 1];
        for k in 1..=n {
            let mut acc = Exact::zero();
            for (j, oj) in out.iter().enumerate().take(k).skip(1) {
                if !oj.is_zero() && !self.coeffs[k - j].is_zero() {
                    acc += &(oj * &self.coeffs[k - j]).scale(&Rational::from(j as i64));
                }
            }
            out[k] = &self.coeffs[k] - &acc.scale(&Rational::from((1, k as i64)));
        }
        Ok(Series { coeffs: out })
    }

    /// exp of a series whose constant term is 0, from (exp f)' = f' exp f.
    pub fn exp(&self) -> Result<Series> {
        if !self.coeffs[0].is_zero() {
            return Err(Error::input(format!(
                "the exponential of a series needs constant term 0, not {}",
                self.coeffs[0]
            )));
        }
        let n = self.order();
        let mut out: Vec<Exact> = vec![Exact::zero(); n + 1];
        out[0] = Exact::one();
        for k in 1..=n {
            let mut acc = Exact::zero();
            for j in 1..=k {
                if !self.coeffs[j].is_zero() && !out[k - j].is_zero() {
                    acc += &(&self.coeffs[j] * &out[k - j]).scale(&Rational::from(j as i64));
                }
            }
            out[k] = acc.scale(&Rational::from((1, k as i64)));
        }
        Ok(Series { coeffs: out })
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
