//! Dense bases of the coefficient ring by transcendental weight: every
//! monomial pi^(2a) zeta(n1) zeta(n2)... (odd n >= 3) of weight w, in a fixed
//! order, so that the kernel recursion works on plain integer vectors. These
//! are the only monomials the kernel can produce (its entries at order g^p
//! carry the single factor pi^p or zeta(p)).
//!
//! A basis element is kept as its partition of w into parts 2 (one pi^2) and
//! odd n (one zeta(n)): at 40 loops there are 356,209 of them and at 50
//! loops 2.3 million, so the compact form matters: the parts of one weight
//! are laid end to end in one byte vector (one small allocation per element
//! took 48 bytes, over 100 MB at 50 loops); full monomials are built only
//! for output.

use std::collections::HashMap;
use std::hash::{BuildHasherDefault, Hasher};

use crate::exact::ring::Monomial;

/// The partitions of one weight, end to end: element k is
/// `parts[starts[k]..starts[k + 1]]`.
#[derive(Default)]
struct Partitions {
    parts: Vec<u8>,
    starts: Vec<u32>,
}

impl Partitions {
    fn len(&self) -> usize {
        self.starts.len() - 1
    }

    fn get(&self, k: usize) -> &[u8] {
        &self.parts[self.starts[k] as usize..self.starts[k + 1] as usize]
    }

    fn iter(&self) -> impl Iterator<Item = &[u8]> {
        (0..self.len()).map(|k| self.get(k))
    }
}

/// The monomials of each weight 0..=highest as partitions (parts descending).
pub struct WeightBases {
    parts: Vec<Partitions>,
    /// pi_halves[w][k]: the number of parts 2 (factors pi^2) of element k.
    pi_halves: Vec<Vec<u8>>,
}

impl WeightBases {
    pub fn new(highest: usize) -> Self {
        let parts = (0..=highest)
            .map(|w| {
                let mut list = Partitions {
                    parts: Vec::new(),
                    starts: vec![0],
                };
                partitions(w as u8, w as u8, &mut Vec::new(), &mut list);
                list.parts.shrink_to_fit();
                list.starts.shrink_to_fit();
                list
            })
            .collect::<Vec<Partitions>>();
        let pi_halves = parts
            .iter()
            .map(|w| {
                w.iter()
                    .map(|p| p.iter().filter(|&&x| x == 2).count() as u8)
                    .collect()
            })
            .collect();
        WeightBases { parts, pi_halves }
    }

    pub fn len(&self, w: usize) -> usize {
        self.parts[w].len()
    }

    /// Half the power of pi of each element of weight w.
    pub fn pi_halves(&self, w: usize) -> &[u8] {
        &self.pi_halves[w]
    }

    pub fn monomial(&self, w: usize, k: usize) -> Monomial {
        let parts = self.parts[w].get(k);
        let pi = parts.iter().filter(|&&p| p == 2).count() as i32 * 2;
        let zetas = parts
            .iter()
            .filter(|&&p| p != 2)
            .map(|&p| p as u32)
            .collect();
        Monomial::from_parts(pi, zetas, Vec::new())
    }

    /// `maps[m][p][k]`: the index in weight m + p of (element k of weight m) * M_p,
    /// for 2 <= p <= highest - m (empty for p < 2); None when the packed keys
    /// do not fit (see `ProductIndex`).
    pub fn shift_maps(&self) -> Option<Vec<Vec<Vec<u32>>>> {
        let highest = self.parts.len() - 1;
        let index = ProductIndex::new(self)?;
        let mut maps: Vec<Vec<Vec<u32>>> = (0..=highest)
            .map(|m| vec![Vec::new(); highest - m + 1])
            .collect();
        for (m, row) in maps.iter_mut().enumerate() {
            for (p, map) in row.iter_mut().enumerate().skip(2) {
                let factor = index.factor_key(p);
                *map = index.keys[m]
                    .iter()
                    .map(|&key| index.index_of(key + factor))
                    .collect();
            }
        }
        Some(maps)
    }
}

/// Monomials as additive keys: the exponents of pi^2, zeta(3), zeta(5), ...
/// packed into bit fields of one u128, each field wide enough for the
/// largest exponent a weight up to `highest` allows, so that the key of a
/// product is the sum of the keys. Up to weight 100 the fields take 103 bits.
pub struct ProductIndex {
    offsets: Vec<u32>,
    keys: Vec<Vec<u128>>,
    index: HashMap<u128, u32, BuildHasherDefault<KeyHasher>>,
}

/// A multiplicative hash for the packed keys: they are distinct integers
/// already, and the lookups (tens of millions at 50 loops, building the
/// shift maps) took more time in the default keyed hash than in the maps'
/// arithmetic. The odd constant is 2^64 divided by the golden ratio, the
/// usual multiplier of multiplicative hashing: it spreads keys that differ
/// in few bits over the whole word.
///
/// Only the high bits of a product depend on all bits of the key, and the
/// table picks its bucket from the low bits, so `finish` folds the high half
/// down: with the bare product, keys differing only in the exponents of
/// long zetas (the high fields) shared buckets, and building the shift maps
/// took a fifth of the 44-loop run.
#[derive(Default)]
struct KeyHasher(u64);

impl Hasher for KeyHasher {
    fn finish(&self) -> u64 {
        self.0 ^ (self.0 >> 32)
    }

    fn write(&mut self, bytes: &[u8]) {
        for &b in bytes {
            self.0 = (self.0.rotate_left(8) ^ u64::from(b)).wrapping_mul(0x9e37_79b9_7f4a_7c15);
        }
    }

    fn write_u128(&mut self, key: u128) {
        let folded = (key as u64) ^ ((key >> 64) as u64).rotate_left(32);
        self.0 = (self.0 ^ folded).wrapping_mul(0x9e37_79b9_7f4a_7c15);
    }
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
            .map(|w| w.iter().map(&key).collect())
            .collect();
        let index = keys
            .iter()
            .flat_map(|w| w.iter().enumerate().map(|(k, &key)| (key, k as u32)))
            .collect();
        Some(ProductIndex {
            offsets,
            keys,
            index,
        })
    }

    /// The key of M_p: pi^p (p/2 parts 2) for even p, zeta(p) for odd p.
    fn factor_key(&self, p: usize) -> u128 {
        if p % 2 == 0 {
            (p as u128 / 2) << self.offsets[2]
        } else {
            1u128 << self.offsets[p]
        }
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
/// to `highest`, or None when they need more than 128 bits.
fn field_offsets(highest: usize) -> Option<Vec<u32>> {
    let mut offsets = vec![0u32; highest + 1];
    let mut used = 0u32;
    for p in (2..=highest).filter(|&p| p == 2 || p % 2 == 1) {
        offsets[p] = used;
        used += usize::BITS - (highest / p).leading_zeros();
    }
    (used <= 128).then_some(offsets)
}

/// All multisets of parts from {2} and odd n >= 3, parts <= max, summing to w.
fn partitions(w: u8, max: u8, current: &mut Vec<u8>, out: &mut Partitions) {
    if w == 0 {
        out.parts.extend_from_slice(current);
        out.starts.push(out.parts.len() as u32);
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
        let maps = b.shift_maps().unwrap();
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
