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

use crate::exact::ring::Monomial;

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
        let zetas = parts
            .iter()
            .filter(|&&p| p != 2)
            .map(|&p| p as u32)
            .collect();
        Monomial::from_parts(pi, zetas, Vec::new())
    }

    /// `maps[m][p][k]`: the index in weight m + p of (element k of weight m) * M_p,
    /// for 2 <= p <= top - m (empty for p < 2).
    pub fn shift_maps(&self) -> Vec<Vec<Vec<u32>>> {
        let top = self.parts.len() - 1;
        let mut maps: Vec<Vec<Vec<u32>>> =
            (0..=top).map(|m| vec![Vec::new(); top - m + 1]).collect();
        for w in 2..=top {
            let index: HashMap<&[u8], u32> = self.parts[w]
                .iter()
                .enumerate()
                .map(|(k, p)| (&**p, k as u32))
                .collect();
            for p in 2..=w {
                let m = w - p;
                maps[m][p] = self.parts[m]
                    .iter()
                    .map(|x| index[&*times_factor(x, p)])
                    .collect();
            }
        }
        maps
    }
}

/// Monomials as additive keys: the exponents of pi^2, zeta(3), zeta(5), ...
/// packed into bit fields of one u128, each field wide enough for the
/// largest exponent a weight up to `top` allows, so that the key of a
/// product is the sum of the keys. Up to weight 100 the fields take 103 bits.
pub struct ProductIndex {
    keys: Vec<Vec<u128>>,
    index: HashMap<u128, u32>,
}

impl ProductIndex {
    /// None when the fields do not fit in 128 bits (weights far beyond 100).
    pub fn new(bases: &WeightBases) -> Option<Self> {
        let offsets = field_offsets(bases.parts.len() - 1)?;
        let key = |parts: &[u8]| {
            parts
                .iter()
                .map(|&p| 1u128 << offsets[p as usize])
                .sum::<u128>()
        };
        let keys: Vec<Vec<u128>> = bases
            .parts
            .iter()
            .map(|w| w.iter().map(|p| key(p)).collect())
            .collect();
        let index = keys
            .iter()
            .flat_map(|w| w.iter().enumerate().map(|(k, &key)| (key, k as u32)))
            .collect();
        Some(ProductIndex { keys, index })
    }

    pub fn key(&self, w: usize, k: usize) -> u128 {
        self.keys[w][k]
    }

    /// The index, within its weight, of the monomial with this key.
    pub fn index_of(&self, key: u128) -> u32 {
        self.index[&key]
    }
}

/// Bit offsets of the exponent fields of parts 2, 3, 5, ... for weights up
/// to `top`, or None when they need more than 128 bits.
fn field_offsets(top: usize) -> Option<Vec<u32>> {
    let mut offsets = vec![0u32; top + 1];
    let mut used = 0u32;
    for p in (2..=top).filter(|&p| p == 2 || p % 2 == 1) {
        offsets[p] = used;
        used += usize::BITS - (top / p).leading_zeros();
    }
    (used <= 128).then_some(offsets)
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
    fn product_keys_add() {
        let b = WeightBases::new(20);
        let index = ProductIndex::new(&b).unwrap();
        for (w1, w2) in [(2, 3), (5, 8), (6, 14)] {
            for i in 0..b.len(w1) {
                for j in 0..b.len(w2) {
                    let k = index.index_of(index.key(w1, i) + index.key(w2, j)) as usize;
                    assert_eq!(
                        b.monomial(w1 + w2, k),
                        b.monomial(w1, i).mul(&b.monomial(w2, j))
                    );
                }
            }
        }
        assert!(field_offsets(100).is_some());
        assert!(field_offsets(200).is_none());
    }

    // The indices are the weights and positions the maps are defined by.
    #[allow(clippy::needless_range_loop)]
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
