//! Numerical values of ring elements through MPFR, and the cache of the
//! constants they need. A report evaluates tens of thousands of terms that
//! share a few dozen constants (pi powers, odd zeta values), so each constant
//! is computed once per precision and reused by every term of every element.
//!
//! The cached values are the very numbers a fresh computation gives (each is
//! MPFR's correctly rounded result at the working precision), and every term
//! is formed by the same operations in the same order, so a value does not
//! depend on what the cache held before.

use std::cmp::Ordering;
use std::collections::HashMap;

use rug::ops::Pow;
use rug::{Assign, Float};

use super::Exact;
use crate::error::{Error, Result};

/// pi powers and odd zeta values, at every precision asked for so far.
#[derive(Default)]
pub struct Constants {
    by_precision: HashMap<u32, AtPrecision>,
}

/// The constants at one precision, filled in as terms ask for them.
struct AtPrecision {
    prec: u32,
    pi: Float,
    pi_powers: HashMap<i32, Float>,
    zetas: HashMap<u32, Float>,
}

impl Constants {
    pub fn new() -> Self {
        Constants::default()
    }

    fn at(&mut self, prec: u32) -> &mut AtPrecision {
        self.by_precision
            .entry(prec)
            .or_insert_with(|| AtPrecision {
                prec,
                pi: Float::with_val(prec, rug::float::Constant::Pi),
                pi_powers: HashMap::new(),
                zetas: HashMap::new(),
            })
    }
}

impl AtPrecision {
    /// pi^e as pi rounded to the precision, then raised and rounded again.
    fn pi_power(&mut self, e: i32) -> &Float {
        let (prec, pi) = (self.prec, &self.pi);
        self.pi_powers
            .entry(e)
            .or_insert_with(|| Float::with_val(prec, pi.pow(e)))
    }

    fn zeta(&mut self, n: u32) -> &Float {
        let prec = self.prec;
        self.zetas
            .entry(n)
            .or_insert_with(|| Float::with_val(prec, Float::zeta_u(n)))
    }
}

impl Exact {
    /// Numerical value to `prec` bits; symbols must have been substituted.
    /// Works with guard bits and repeats at higher precision when terms
    /// cancel, so the result carries `prec` correct bits up to rounding.
    pub fn evaluate(&self, prec: u32) -> Result<Float> {
        self.evaluate_with(prec, &mut Constants::new())
    }

    /// The same value as [`Exact::evaluate`], taking the constants from
    /// `constants` and leaving there the ones it computed.
    pub fn evaluate_with(&self, prec: u32, constants: &mut Constants) -> Result<Float> {
        if let Some((m, _)) = self.terms().find(|(m, _)| !m.symbols().is_empty()) {
            return Err(Error::input(format!(
                "cannot evaluate {self} numerically: symbol '{}' has no value",
                m.symbols()[0].0
            )));
        }
        let mut work = prec + 32;
        loop {
            let (sum, largest) = self.sum_at(constants.at(work));
            if largest.is_zero() {
                return Ok(Float::with_val(prec, 0));
            }
            // The sum keeps about `work - lost` correct bits; distinct monomials
            // are independent, so a zero sum only means too few bits.
            let lost = if sum.is_zero() {
                work
            } else {
                (largest.get_exp().unwrap_or(0) - sum.get_exp().unwrap_or(0)).max(0) as u32
            };
            if work >= prec + lost + 16 {
                return Ok(Float::with_val(prec, &sum));
            }
            if work > prec + 200_000 {
                return Err(Error::numeric(format!(
                    "{self} cancels to below 2^-200000 of its largest term"
                )));
            }
            work = prec + lost + 32;
        }
    }

    /// The sum of the terms and the largest of their magnitudes, at the
    /// constants' precision.
    fn sum_at(&self, constants: &mut AtPrecision) -> (Float, Float) {
        let prec = constants.prec;
        let mut sum = Float::with_val(prec, 0);
        let mut largest = Float::with_val(prec, 0);
        let mut t = Float::new(prec);
        for (m, c) in self.terms() {
            t.assign(c);
            // pi^0 is exactly 1, and so is the product with it.
            if m.pi_exponent() != 0 {
                t *= constants.pi_power(m.pi_exponent());
            }
            for &z in m.zetas() {
                t *= constants.zeta(z);
            }
            if t.cmp_abs(&largest) == Some(Ordering::Greater) {
                largest.assign(t.abs_ref());
            }
            sum += &t;
        }
        (sum, largest)
    }
}

#[cfg(test)]
mod tests {
    use rug::Rational;

    use super::*;
    use crate::exact::ring::Monomial;

    /// 3/7 pi^4 zeta(3) - 5 zeta(5)^2 + 2/3 pi^(-2): pi powers of both signs
    /// and a repeated zeta factor.
    fn sample() -> Exact {
        let mut x = Exact::zero();
        x.add_term(
            Monomial::from_parts(4, vec![3], Vec::new()),
            Rational::from((3, 7)),
        );
        x.add_term(
            Monomial::from_parts(0, vec![5, 5], Vec::new()),
            Rational::from(-5),
        );
        x.add_term(Monomial::pi_power(-2), Rational::from((2, 3)));
        x
    }

    #[test]
    fn a_shared_cache_gives_the_fresh_values() {
        let x = sample();
        let y = &x * &x;
        let mut shared = Constants::new();
        for prec in [64, 200, 64, 1000, 200] {
            for e in [&x, &y, &x] {
                let fresh = e.evaluate(prec).unwrap();
                let cached = e.evaluate_with(prec, &mut shared).unwrap();
                assert_eq!(fresh, cached, "precision {prec}");
                assert_eq!(fresh.prec(), prec);
            }
        }
    }

    #[test]
    fn symbols_are_refused() {
        let x = &sample() + &Exact::symbol("c2");
        let e = x.evaluate_with(64, &mut Constants::new()).unwrap_err();
        assert!(e.message().contains("'c2'"), "{e}");
    }
}
