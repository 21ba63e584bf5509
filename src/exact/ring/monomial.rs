//! Monomials of the coefficient ring: a power of pi (any integer exponent, so
//! that the lambda convention's negative powers fit), a product of odd zeta
//! values, and a product of named symbols (the tilt c2, kinematic logs l1 l2 l3).
//!
//! Equal monomials have equal fields, so derived equality and hashing are
//! canonical. The order is the printing order: symbols first (higher degree
//! first), then higher powers of pi, then zeta products.

use std::cmp::Ordering;
use std::fmt;

/// pi^pi * zeta(z_1) zeta(z_2) ... * s_1^e_1 s_2^e_2 ...
#[derive(Clone, Debug, Default, PartialEq, Eq, Hash)]
pub struct Monomial {
    pi: i32,
    /// Arguments of the odd zeta factors, ascending, repeated by multiplicity.
    zetas: Vec<u32>,
    /// Symbol names with positive exponents, sorted by name.
    syms: Vec<(Box<str>, u32)>,
}

impl Monomial {
    pub fn one() -> Self {
        Monomial::default()
    }

    pub fn pi_power(e: i32) -> Self {
        Monomial {
            pi: e,
            ..Default::default()
        }
    }

    /// zeta(n) for odd n >= 3; even arguments belong to pi powers and are
    /// handled by the ring, which knows their rational prefactor.
    pub fn odd_zeta(n: u32) -> Self {
        debug_assert!(n >= 3 && n % 2 == 1);
        Monomial {
            zetas: vec![n],
            ..Default::default()
        }
    }

    pub fn symbol(name: &str, exponent: u32) -> Self {
        if exponent == 0 {
            return Monomial::one();
        }
        Monomial {
            syms: vec![(name.into(), exponent)],
            ..Default::default()
        }
    }

    pub fn from_parts(pi: i32, mut zetas: Vec<u32>, mut syms: Vec<(Box<str>, u32)>) -> Self {
        zetas.sort_unstable();
        syms.retain(|(_, e)| *e > 0);
        syms.sort();
        let mut merged: Vec<(Box<str>, u32)> = Vec::with_capacity(syms.len());
        for (name, e) in syms {
            match merged.last_mut() {
                Some((last, le)) if *last == name => *le += e,
                _ => merged.push((name, e)),
            }
        }
        Monomial {
            pi,
            zetas,
            syms: merged,
        }
    }

    pub fn pi_exponent(&self) -> i32 {
        self.pi
    }

    pub fn zetas(&self) -> &[u32] {
        &self.zetas
    }

    pub fn symbols(&self) -> &[(Box<str>, u32)] {
        &self.syms
    }

    pub fn is_one(&self) -> bool {
        self.pi == 0 && self.zetas.is_empty() && self.syms.is_empty()
    }

    /// Transcendental weight: pi counts 1, zeta(n) counts n, symbols 0.
    pub fn weight(&self) -> i64 {
        self.pi as i64 + self.zetas.iter().map(|&z| z as i64).sum::<i64>()
    }

    /// Total degree in the named symbols.
    pub fn symbol_degree(&self) -> u32 {
        self.syms.iter().map(|(_, e)| e).sum()
    }

    pub fn symbol_exponent(&self, name: &str) -> u32 {
        self.syms
            .iter()
            .find(|(n, _)| &**n == name)
            .map_or(0, |(_, e)| *e)
    }

    /// The same monomial without its symbol part, and the symbol part alone.
    pub fn split_symbols(&self) -> (Monomial, Monomial) {
        (
            Monomial {
                pi: self.pi,
                zetas: self.zetas.clone(),
                syms: Vec::new(),
            },
            Monomial {
                pi: 0,
                zetas: Vec::new(),
                syms: self.syms.clone(),
            },
        )
    }

    /// This monomial with `name` removed, and the exponent it had.
    pub fn without_symbol(&self, name: &str) -> (Monomial, u32) {
        let e = self.symbol_exponent(name);
        let syms = self
            .syms
            .iter()
            .filter(|(n, _)| &**n != name)
            .cloned()
            .collect();
        (
            Monomial {
                pi: self.pi,
                zetas: self.zetas.clone(),
                syms,
            },
            e,
        )
    }

    pub fn mul(&self, other: &Monomial) -> Monomial {
        let mut zetas = Vec::with_capacity(self.zetas.len() + other.zetas.len());
        let (mut i, mut j) = (0, 0);
        while i < self.zetas.len() && j < other.zetas.len() {
            if self.zetas[i] <= other.zetas[j] {
                zetas.push(self.zetas[i]);
                i += 1;
            } else {
                zetas.push(other.zetas[j]);
                j += 1;
            }
        }
        zetas.extend_from_slice(&self.zetas[i..]);
        zetas.extend_from_slice(&other.zetas[j..]);
        let syms = if other.syms.is_empty() {
            self.syms.clone()
        } else if self.syms.is_empty() {
            other.syms.clone()
        } else {
            let mut all = self.syms.clone();
            all.extend(other.syms.iter().cloned());
            return Monomial::from_parts(self.pi + other.pi, zetas, all);
        };
        Monomial {
            pi: self.pi + other.pi,
            zetas,
            syms,
        }
    }

    pub fn pow(&self, e: u32) -> Monomial {
        let mut zetas = Vec::with_capacity(self.zetas.len() * e as usize);
        for &z in &self.zetas {
            zetas.extend(std::iter::repeat_n(z, e as usize));
        }
        zetas.sort_unstable();
        Monomial {
            pi: self.pi * e as i32,
            zetas,
            syms: self.syms.iter().map(|(n, x)| (n.clone(), x * e)).collect(),
        }
    }

    /// The odd zeta factors as (argument, exponent) pairs.
    pub fn zeta_powers(&self) -> Vec<(u32, u32)> {
        let mut out: Vec<(u32, u32)> = Vec::new();
        for &z in &self.zetas {
            match out.last_mut() {
                Some((a, e)) if *a == z => *e += 1,
                _ => out.push((z, 1)),
            }
        }
        out
    }

    /// Writes the monomial without coefficient; `pi_text` overrides how the pi
    /// part is written (used to write even powers as zeta(2n)). Returns false
    /// when the monomial is 1 and nothing was written.
    pub(crate) fn write_factors(&self, out: &mut String, pi_text: Option<&str>) -> bool {
        let mut parts: Vec<String> = Vec::new();
        for (name, e) in &self.syms {
            parts.push(power_text(name, *e as i64));
        }
        match pi_text {
            Some(t) => parts.push(t.to_string()),
            None if self.pi != 0 => parts.push(power_text("pi", self.pi as i64)),
            None => {}
        }
        for (z, e) in self.zeta_powers() {
            parts.push(power_text(&format!("zeta({z})"), e as i64));
        }
        out.push_str(&parts.join("*"));
        !parts.is_empty()
    }
}

fn power_text(base: &str, e: i64) -> String {
    match e {
        1 => base.to_string(),
        e if e < 0 => format!("{base}^({e})"),
        e => format!("{base}^{e}"),
    }
}

impl Ord for Monomial {
    fn cmp(&self, other: &Self) -> Ordering {
        other
            .symbol_degree()
            .cmp(&self.symbol_degree())
            .then_with(|| self.syms.cmp(&other.syms))
            .then_with(|| other.pi.cmp(&self.pi))
            .then_with(|| self.zetas.cmp(&other.zetas))
    }
}

impl PartialOrd for Monomial {
    fn partial_cmp(&self, other: &Self) -> Option<Ordering> {
        Some(self.cmp(other))
    }
}

impl fmt::Display for Monomial {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        let mut s = String::new();
        if !self.write_factors(&mut s, None) {
            s.push('1');
        }
        f.write_str(&s)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn multiplication_merges_factors() {
        let a = Monomial::from_parts(2, vec![5, 3], vec![("l1".into(), 1)]);
        let b = Monomial::from_parts(-2, vec![3], vec![("l1".into(), 1), ("c2".into(), 2)]);
        let p = a.mul(&b);
        assert_eq!(p.pi_exponent(), 0);
        assert_eq!(p.zetas(), &[3, 3, 5]);
        assert_eq!(p.to_string(), "c2^2*l1^2*zeta(3)^2*zeta(5)");
        assert_eq!(p.weight(), 11);
        assert_eq!(a.pow(2), a.mul(&a));
    }

    #[test]
    fn printing_order_puts_pi_before_zeta_products() {
        let pi6 = Monomial::pi_power(6);
        let z33 = Monomial::from_parts(0, vec![3, 3], vec![]);
        assert!(pi6 < z33);
    }
}
