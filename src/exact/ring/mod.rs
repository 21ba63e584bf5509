//! The exact coefficient ring: finite rational linear combinations of
//! monomials in pi (any integer power), odd zeta values and named symbols.
//!
//! Even zeta values never appear as factors: zeta(2n) is a rational multiple
//! of pi^(2n) (see [`bernoulli`]), so the representation is canonical and two
//! equal values print identically. No floating point is used here; numerical
//! values come from [`Exact::evaluate`] through MPFR.

pub mod bernoulli;
mod display;
mod evaluate;
mod monomial;

use std::collections::BTreeMap;
use std::ops::{Add, AddAssign, Mul, Neg, Sub, SubAssign};

use rug::Rational;

pub use display::{EvenStyle, Notation};
pub use evaluate::Constants;
pub use monomial::Monomial;

use crate::error::{Error, Result};

/// A rational linear combination of monomials, without zero coefficients.
#[derive(Clone, Debug, Default, PartialEq, Eq, Hash)]
pub struct Exact {
    terms: BTreeMap<Monomial, Rational>,
}

impl Exact {
    pub fn zero() -> Self {
        Exact::default()
    }

    pub fn one() -> Self {
        Exact::from(1)
    }

    pub fn term(coefficient: Rational, monomial: Monomial) -> Self {
        let mut e = Exact::zero();
        e.add_term(monomial, coefficient);
        e
    }

    pub fn pi() -> Self {
        Exact::term(Rational::from(1), Monomial::pi_power(1))
    }

    /// zeta(n) for n >= 2; even n becomes its rational multiple of pi^n.
    pub fn zeta(n: u32) -> Result<Self> {
        match n {
            0 | 1 => Err(Error::input(format!(
                "zeta({n}) is not a finite zeta value"
            ))),
            n if n % 2 == 0 => Ok(Exact::term(
                bernoulli::even_zeta_over_pi_power(n / 2),
                Monomial::pi_power(n as i32),
            )),
            n => Ok(Exact::term(Rational::from(1), Monomial::odd_zeta(n))),
        }
    }

    pub fn symbol(name: &str) -> Self {
        Exact::term(Rational::from(1), Monomial::symbol(name, 1))
    }

    pub fn is_zero(&self) -> bool {
        self.terms.is_empty()
    }

    pub fn len(&self) -> usize {
        self.terms.len()
    }

    pub fn is_empty(&self) -> bool {
        self.terms.is_empty()
    }

    pub fn terms(&self) -> impl Iterator<Item = (&Monomial, &Rational)> {
        self.terms.iter()
    }

    pub fn coefficient(&self, m: &Monomial) -> Rational {
        self.terms.get(m).cloned().unwrap_or_default()
    }

    /// Adds c * m in place, dropping the term if it cancels.
    pub fn add_term(&mut self, m: Monomial, c: Rational) {
        if c == 0 {
            return;
        }
        match self.terms.entry(m) {
            std::collections::btree_map::Entry::Vacant(v) => {
                v.insert(c);
            }
            std::collections::btree_map::Entry::Occupied(mut o) => {
                *o.get_mut() += c;
                if *o.get() == 0 {
                    o.remove();
                }
            }
        }
    }

    /// The value as a rational number, if it has no transcendental or symbol part.
    pub fn as_rational(&self) -> Option<Rational> {
        match self.terms.len() {
            0 => Some(Rational::new()),
            1 => {
                let (m, c) = self.terms.iter().next()?;
                m.is_one().then(|| c.clone())
            }
            _ => None,
        }
    }

    /// The single term c * m, if the value is one.
    pub fn as_single_term(&self) -> Option<(&Monomial, &Rational)> {
        if self.terms.len() == 1 {
            self.terms.iter().next()
        } else {
            None
        }
    }

    pub fn scale(&self, c: &Rational) -> Exact {
        self.mapped(c, Monomial::clone)
    }

    pub fn mul_monomial(&self, m: &Monomial, c: &Rational) -> Exact {
        self.mapped(c, |k| k.mul(m))
    }

    /// Every term's monomial through `f`, its coefficient times `c`; `f`
    /// must be injective on the monomials (a product by a monomial is), so
    /// that no two terms meet.
    fn mapped(&self, c: &Rational, f: impl Fn(&Monomial) -> Monomial) -> Exact {
        if *c == 0 {
            return Exact::zero();
        }
        Exact {
            terms: self
                .terms
                .iter()
                .map(|(m, x)| (f(m), Rational::from(x * c)))
                .collect(),
        }
    }

    pub fn pow(&self, e: u32) -> Exact {
        let mut result = Exact::one();
        let mut base = self.clone();
        let mut e = e;
        while e > 0 {
            if e & 1 == 1 {
                result = &result * &base;
            }
            e >>= 1;
            if e > 0 {
                base = &base * &base;
            }
        }
        result
    }

    /// The inverse, which exists in this ring only for a single nonzero term
    /// without symbols.
    pub fn inverse(&self) -> Result<Exact> {
        let (m, c) = self.as_single_term().ok_or_else(|| {
            Error::input(format!(
                "cannot divide by {self}: only single terms are invertible exactly"
            ))
        })?;
        if !m.symbols().is_empty() {
            return Err(Error::input(format!(
                "cannot divide by {self}: it contains a symbol"
            )));
        }
        let zetas = m.zetas();
        if !zetas.is_empty() {
            return Err(Error::input(format!(
                "cannot divide by {self}: odd zeta values have no exact inverse in the ring"
            )));
        }
        Ok(Exact::term(
            Rational::from(c.recip_ref()),
            Monomial::pi_power(-m.pi_exponent()),
        ))
    }

    /// The set of transcendental weights present (symbols weigh nothing).
    pub fn weights(&self) -> Vec<i64> {
        let mut w: Vec<i64> = self.terms.keys().map(Monomial::weight).collect();
        w.sort_unstable();
        w.dedup();
        w
    }

    /// Replaces symbol `name` by `value` everywhere.
    pub fn substitute(&self, name: &str, value: &Exact) -> Exact {
        let mut out = Exact::zero();
        let mut powers: Vec<Exact> = vec![Exact::one()];
        for (m, c) in &self.terms {
            let (rest, e) = m.without_symbol(name);
            while powers.len() <= e as usize {
                let next = powers.last().map(|p| p * value).unwrap_or_default();
                powers.push(next);
            }
            out += &powers[e as usize].mul_monomial(&rest, c);
        }
        out
    }
}

impl From<i64> for Exact {
    fn from(n: i64) -> Self {
        Exact::term(Rational::from(n), Monomial::one())
    }
}

impl From<Rational> for Exact {
    fn from(q: Rational) -> Self {
        Exact::term(q, Monomial::one())
    }
}

impl<'a> AddAssign<&'a Exact> for Exact {
    fn add_assign(&mut self, rhs: &'a Exact) {
        for (m, c) in &rhs.terms {
            self.add_term(m.clone(), c.clone());
        }
    }
}

impl<'a> SubAssign<&'a Exact> for Exact {
    fn sub_assign(&mut self, rhs: &'a Exact) {
        for (m, c) in &rhs.terms {
            self.add_term(m.clone(), Rational::from(-c));
        }
    }
}

impl<'a> Add<&'a Exact> for &'a Exact {
    type Output = Exact;
    fn add(self, rhs: &'a Exact) -> Exact {
        let mut out = self.clone();
        out += rhs;
        out
    }
}

impl<'a> Sub<&'a Exact> for &'a Exact {
    type Output = Exact;
    fn sub(self, rhs: &'a Exact) -> Exact {
        let mut out = self.clone();
        out -= rhs;
        out
    }
}

impl<'a> Mul<&'a Exact> for &'a Exact {
    type Output = Exact;
    fn mul(self, rhs: &'a Exact) -> Exact {
        let mut acc: std::collections::HashMap<Monomial, Rational> =
            std::collections::HashMap::new();
        for (ma, ca) in &self.terms {
            for (mb, cb) in &rhs.terms {
                let m = ma.mul(mb);
                let c = Rational::from(ca * cb);
                match acc.entry(m) {
                    std::collections::hash_map::Entry::Vacant(v) => {
                        v.insert(c);
                    }
                    std::collections::hash_map::Entry::Occupied(mut o) => *o.get_mut() += c,
                }
            }
        }
        Exact {
            terms: acc.into_iter().filter(|(_, c)| *c != 0).collect(),
        }
    }
}

impl Neg for &Exact {
    type Output = Exact;
    fn neg(self) -> Exact {
        Exact {
            terms: self
                .terms
                .iter()
                .map(|(m, c)| (m.clone(), Rational::from(-c)))
                .collect(),
        }
    }
}

macro_rules! forward_by_value {
    ($($tr:ident $f:ident),*) => {$(
        impl $tr<Exact> for Exact {
            type Output = Exact;
            fn $f(self, rhs: Exact) -> Exact { (&self).$f(&rhs) }
        }
        impl<'a> $tr<&'a Exact> for Exact {
            type Output = Exact;
            fn $f(self, rhs: &'a Exact) -> Exact { (&self).$f(rhs) }
        }
    )*};
}
forward_by_value!(Add add, Sub sub, Mul mul);

impl Neg for Exact {
    type Output = Exact;
    fn neg(self) -> Exact {
        -&self
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use rug::ops::Pow;
    use rug::{Float, Integer};

    fn zeta(n: u32) -> Exact {
        Exact::zeta(n).unwrap()
    }

    #[test]
    fn ring_laws_on_samples() {
        let a = &zeta(3) + &Exact::from(2);
        let b = &zeta(2) - &zeta(5);
        let c = Exact::symbol("c2") * zeta(4);
        assert_eq!(&(&a * &b) * &c, &a * &(&b * &c));
        assert_eq!(&a * &(&b + &c), &(&a * &b) + &(&a * &c));
        assert!((&a - &a).is_zero());
        assert_eq!(a.pow(3), &(&a * &a) * &a);
    }

    #[test]
    fn even_zetas_become_pi_powers() {
        // zeta(2)^2 = (5/2) zeta(4): both are 1/36 pi^4 (A&S table 23.3 values).
        assert_eq!(zeta(2).pow(2), zeta(4).scale(&Rational::from((5, 2))));
    }

    #[test]
    fn inverse_of_pi_power() {
        let x = zeta(2).scale(&Rational::from(16));
        assert_eq!(&x * &x.inverse().unwrap(), Exact::one());
        assert!(zeta(3).inverse().is_err());
    }

    #[test]
    fn evaluation_against_mpfr_zeta() {
        // 88 zeta(4) - 32 zeta(3)^2, evaluated with MPFR's own zeta as the reference.
        let x = &zeta(4).scale(&Rational::from(88)) - &zeta(3).pow(2).scale(&Rational::from(32));
        let v = x.evaluate(200).unwrap();
        let z4 = Float::with_val(260, Float::zeta_u(4));
        let z3 = Float::with_val(260, Float::zeta_u(3));
        let reference =
            Float::with_val(260, &z4 * 88u32) - Float::with_val(260, z3.square_ref()) * 32u32;
        let diff = Float::with_val(260, &v - &reference).abs();
        assert!(diff < Float::with_val(64, Float::i_exp(1, -190)));
    }

    #[test]
    fn cancellation_is_handled() {
        // pi^2 - r with r the 60-digit truncation of pi^2 (r built here from a
        // 400-bit MPFR pi): the difference is below 1e-60 and must keep its digits.
        let pi2 = Float::with_val(400, rug::float::Constant::Pi).square();
        let scale = Integer::from(10).pow(60);
        let r = Rational::from((
            Float::with_val(400, &pi2 * &scale).to_integer().unwrap(),
            scale,
        ));
        let x = &Exact::pi().pow(2) - &Exact::from(r.clone());
        let v = x.evaluate(64).unwrap();
        let reference = Float::with_val(64, pi2 - r);
        assert!(reference > 0 && reference < 1e-59);
        assert_eq!(v, reference);
        assert!((&Exact::pi().pow(2) - &zeta(2).scale(&Rational::from(6))).is_zero());
    }
}
