//! Dense bases of the coefficient ring by transcendental weight: every
//! monomial pi^(2a) zeta(n1) zeta(n2)... (odd n >= 3) of weight w, in a fixed
//! order, so that the kernel recursion works on plain integer vectors. These
//! are the only monomials the kernel can produce (its entries at order g^p
//! carry the single factor pi^p or zeta(p)).
//!
//! A basis element is kept as its partition of w into parts 2 (one pi^2) and
//! odd n (one zeta(n)): at 40 loops there are 356,209 of them, so the compact
//! form matters; full monomials are built only for output.

use std::collections::HashMap;

use crate::ring::Monomial;

/// The monomials of each weight 0..=top as partitions (parts descending).
pub struct WeightBases {
    parts: Vec<Vec<Box<[u8]>>>,
}

impl WeightBases {
    pub fn new(top: usize) -> Self {
        let parts = (0..=top)
            .map(|w| {
                let mut list = Vec::new();
                partitions(w as u8, w as u8, &mut Vec::new(), &mut list);
                list
            })
            .collect();
        WeightBases { parts }
    }

    pub fn len(&self, w: usize) -> usize {
        self.parts[w].len()
    }

    pub fn monomial(&self, w: usize, k: usize) -> Monomial {
        let parts = &self.parts[w][k];
        let pi = parts.iter().filter(|&&p| p == 2).count() as i32 * 2;
        let zetas = parts.iter().filter(|&&p| p != 2).map(|&p| p as u32).collect();
        Monomial::from_parts(pi, zetas, Vec::new())
    }

    /// maps[m][p][k]: the index in weight m + p of (element k of weight m) * M_p,
    /// for 2 <= p <= top - m (empty for p < 2).
    pub fn shift_maps(&self) -> Vec<Vec<Vec<u32>>> {
        let top = self.parts.len() - 1;
        let mut maps: Vec<Vec<Vec<u32>>> = (0..=top).map(|m| vec![Vec::new(); top - m + 1]).collect();
        for w in 2..=top {
            let index: HashMap<&[u8], u32> =
                self.parts[w].iter().enumerate().map(|(k, p)| (&**p, k as u32)).collect();
            for p in 2..=w {
                let m = w - p;
                maps[m][p] = self.parts[m].iter().map(|x| index[&*times_factor(x, p)]).collect();
            }
        }
        maps
    }
}

/// The partition of (monomial * M_p): p/2 more parts 2 for even p, the part p for odd p.
fn times_factor(parts: &[u8], p: usize) -> Vec<u8> {
    let mut out = parts.to_vec();
    if p % 2 == 0 {
        out.extend(std::iter::repeat_n(2u8, p / 2));
    } else {
        out.push(p as u8);
    }
    out.sort_unstable_by(|a, b| b.cmp(a));
    out
}

/// All multisets of parts from {2} and odd n >= 3, parts <= max, summing to w.
fn partitions(w: u8, max: u8, current: &mut Vec<u8>, out: &mut Vec<Box<[u8]>>) {
    if w == 0 {
        out.push(current.clone().into_boxed_slice());
        return;
    }
    for part in (2..=max.min(w)).rev() {
        if part == 2 || part % 2 == 1 {
            current.push(part);
            partitions(w - part, part, current, out);
            current.pop();
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// M_p: pi^p for even p, zeta(p) for odd p.
    fn kernel_factor(p: usize) -> Monomial {
        if p % 2 == 0 {
            Monomial::pi_power(p as i32)
        } else {
            Monomial::odd_zeta(p as u32)
        }
    }

    /// Counts of partitions of w into parts 2, 3, 5, 7, ... (derived here by hand
    /// for small w: 8 = 2+2+2+2 = 3+3+2 = 5+3; 9 = 9 = 7+2 = 5+2+2 = 3+3+3 = 3+2+2+2).
    #[test]
    fn basis_sizes() {
        let b = WeightBases::new(10);
        let sizes: Vec<usize> = (0..=10).map(|w| b.len(w)).collect();
        assert_eq!(sizes, vec![1, 0, 1, 1, 1, 2, 2, 3, 3, 5, 5]);
        for w in 0..=10 {
            for k in 0..b.len(w) {
                assert_eq!(b.monomial(w, k).weight(), w as i64);
            }
        }
    }

    #[test]
    fn shift_maps_multiply_by_the_kernel_factor() {
        let b = WeightBases::new(12);
        let maps = b.shift_maps();
        for m in 0..=10 {
            for p in 2..=(12 - m) {
                for k in 0..b.len(m) {
                    let target = b.monomial(m + p, maps[m][p][k] as usize);
                    assert_eq!(target, b.monomial(m, k).mul(&kernel_factor(p)));
                }
            }
        }
    }
}
