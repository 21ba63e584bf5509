//! The exact polynomials in the logs at the origin, in a dense form: log
//! exponents and an interned transcendental monomial packed into one integer
//! key, mapped to a rational. Loop coefficients of E grow to degree 2L in the
//! logs with thousands of terms, so the products of the series logarithm
//! and exponential run here, with the small factor of every product (a
//! coefficient of ln E, or of the exponent) in the outer loop; the ring's
//! own `Exact` is used at the edges only.

use std::collections::HashMap;
use std::hash::{BuildHasherDefault, Hasher};

use rug::Rational;

use super::analysis::{permutations, Exponents, LogPolynomials};
use super::OriginLogs;
use crate::error::{Error, Result};
use crate::exact::powerseries::{Series, SeriesCoefficients};
use crate::exact::ring::{Exact, Monomial};

/// A multiply-xor hasher for the packed integer keys; the default SipHash
/// dominated the profile of the series products.
#[derive(Default, Clone, Copy)]
pub struct KeyHasher(u64);

impl KeyHasher {
    fn mix(&mut self, n: u64) {
        self.0 = (self.0.rotate_left(5) ^ n).wrapping_mul(0x517c_c1b7_2722_0a95);
    }
}

impl Hasher for KeyHasher {
    fn finish(&self) -> u64 {
        self.0
    }
    fn write(&mut self, bytes: &[u8]) {
        for &b in bytes {
            self.mix(u64::from(b));
        }
    }
    fn write_u32(&mut self, n: u32) {
        self.mix(u64::from(n));
    }
    fn write_u64(&mut self, n: u64) {
        self.mix(n);
    }
}

pub type KeyMap<V> = HashMap<u64, V, BuildHasherDefault<KeyHasher>>;

/// Bits per log exponent and for the transcendental id in a key.
const FIELD: u32 = 16;
const FIELD_MAX: u64 = (1 << FIELD) - 1;

fn pack(exps: [u64; 3], t: u64) -> u64 {
    exps[0] | exps[1] << FIELD | exps[2] << (2 * FIELD) | t << (3 * FIELD)
}

fn exps_of(key: u64) -> [u64; 3] {
    [
        key & FIELD_MAX,
        (key >> FIELD) & FIELD_MAX,
        (key >> (2 * FIELD)) & FIELD_MAX,
    ]
}

fn transcendental_of(key: u64) -> u64 {
    key >> (3 * FIELD)
}

fn degree_of(key: u64) -> u64 {
    exps_of(key).iter().sum()
}

/// A polynomial in the logs with transcendental coefficients: key -> rational.
pub type PackedPoly = KeyMap<Rational>;

fn max_exps(d: &PackedPoly) -> [u64; 3] {
    let mut m = [0; 3];
    for &key in d.keys() {
        for (x, e) in m.iter_mut().zip(exps_of(key)) {
            *x = (*x).max(e);
        }
    }
    m
}

fn too_many_transcendentals() -> Error {
    Error::range(format!(
        "more than {FIELD_MAX} distinct transcendental monomials in one origin series"
    ))
}

/// The interned transcendental monomials and their products.
pub struct Algebra {
    logs: OriginLogs,
    monomials: Vec<Monomial>,
    index: HashMap<Monomial, u64>,
    products: KeyMap<u64>,
}

impl Algebra {
    pub fn new(logs: &OriginLogs) -> Self {
        let mut a = Algebra {
            logs: logs.clone(),
            monomials: Vec::new(),
            index: HashMap::new(),
            products: KeyMap::default(),
        };
        a.intern(Monomial::one());
        a
    }

    fn intern(&mut self, m: Monomial) -> u64 {
        if let Some(&i) = self.index.get(&m) {
            return i;
        }
        let i = self.monomials.len() as u64;
        self.monomials.push(m.clone());
        self.index.insert(m, i);
        i
    }

    fn product(&mut self, a: u64, b: u64) -> Result<u64> {
        let key = a << 32 | b;
        if let Some(&p) = self.products.get(&key) {
            return Ok(p);
        }
        let m = self.monomials[a as usize].mul(&self.monomials[b as usize]);
        let p = self.intern(m);
        if p > FIELD_MAX {
            return Err(too_many_transcendentals());
        }
        self.products.insert(key, p);
        Ok(p)
    }

    fn import_exact(&mut self, e: &Exact) -> Result<PackedPoly> {
        let mut out = PackedPoly::default();
        for (m, c) in e.terms() {
            let (rest, e) = self.logs.split(m)?;
            let exps = e.map(u64::from);
            if exps.iter().any(|&x| x > FIELD_MAX) {
                return Err(Error::range(format!(
                    "a power of a log above {FIELD_MAX} in {m}"
                )));
            }
            let t = self.intern(rest);
            if t > FIELD_MAX {
                return Err(too_many_transcendentals());
            }
            *out.entry(pack(exps, t)).or_default() += c;
        }
        Ok(out)
    }

    pub fn import_series(&mut self, s: &Series) -> Result<Vec<PackedPoly>> {
        s.coeffs().iter().map(|c| self.import_exact(c)).collect()
    }

    pub fn export(&self, d: &PackedPoly) -> Exact {
        let names = self.logs.names();
        let mut out = Exact::zero();
        for (&key, c) in d {
            let syms = exps_of(key)
                .iter()
                .zip(&names)
                .filter(|(e, _)| **e > 0)
                .map(|(e, n)| (Box::<str>::from(*n), *e as u32))
                .collect();
            let (rest, _) = self.monomials[transcendental_of(key) as usize].split_symbols();
            let m = Monomial::from_parts(0, Vec::new(), syms).mul(&rest);
            out.add_term(m, c.clone());
        }
        out
    }

    pub fn export_series(&self, s: &[PackedPoly]) -> Series {
        Series::new(s.iter().map(|d| self.export(d)).collect())
    }

    /// The terms of `d` whose log exponents are `exps`, as a ring element.
    fn at(&self, d: &PackedPoly, exps: [u64; 3]) -> Exact {
        let mut out = Exact::zero();
        for (&key, c) in d {
            if exps_of(key) == exps {
                out.add_term(
                    self.monomials[transcendental_of(key) as usize].clone(),
                    c.clone(),
                );
            }
        }
        out
    }
}

/// p - (1/6) sum over the six permutations of the three logs.
fn asymmetric_part(p: &PackedPoly) -> PackedPoly {
    let sixth = Rational::from((1, 6));
    let mut out = p.clone();
    for (&key, c) in p {
        let e = exps_of(key);
        let t = transcendental_of(key);
        let share = Rational::from(c * &sixth);
        for perm in permutations() {
            let moved = pack([e[perm[0]], e[perm[1]], e[perm[2]]], t);
            *out.entry(moved).or_default() -= &share;
        }
    }
    out.retain(|_, c| *c != 0);
    out
}

impl SeriesCoefficients for Algebra {
    type C = PackedPoly;
    fn zero(&mut self) -> PackedPoly {
        PackedPoly::default()
    }
    fn one(&mut self) -> PackedPoly {
        PackedPoly::from_iter([(pack([0; 3], 0), Rational::from(1))])
    }
    fn is_zero(&self, c: &PackedPoly) -> bool {
        c.is_empty()
    }
    /// Keys add field by field, so a product that would carry out of a
    /// field is refused before it corrupts a key.
    fn add_product(
        &mut self,
        acc: &mut PackedPoly,
        factor: &Rational,
        a: &PackedPoly,
        b: &PackedPoly,
    ) -> Result<()> {
        // Exponents add field by field; a carry would corrupt the key.
        let (ma, mb) = (max_exps(a), max_exps(b));
        if (0..3).any(|i| ma[i] + mb[i] > FIELD_MAX) {
            return Err(Error::range(format!(
                "a power of a log above {FIELD_MAX} in a product of origin coefficients"
            )));
        }
        let mut row: KeyMap<u64> = KeyMap::default();
        for (&ka, ca) in a {
            let ca = Rational::from(ca * factor);
            let (ea, ta) = (ka & ((1 << (3 * FIELD)) - 1), transcendental_of(ka));
            row.clear();
            for (&kb, cb) in b {
                let tb = transcendental_of(kb);
                let t = match row.get(&tb) {
                    Some(&t) => t,
                    None => {
                        let t = self.product(ta, tb)?;
                        row.insert(tb, t);
                        t
                    }
                };
                let key = (ea + (kb & ((1 << (3 * FIELD)) - 1))) | t << (3 * FIELD);
                let p = Rational::from(&ca * cb);
                match acc.entry(key) {
                    std::collections::hash_map::Entry::Vacant(v) => {
                        v.insert(p);
                    }
                    std::collections::hash_map::Entry::Occupied(mut o) => *o.get_mut() += p,
                }
            }
        }
        acc.retain(|_, c| *c != 0);
        Ok(())
    }
}

impl LogPolynomials for Algebra {
    type Value = Exact;
    fn split_at_quadratic(&self, p: &PackedPoly) -> (PackedPoly, PackedPoly) {
        p.iter()
            .map(|(&k, v)| (k, v.clone()))
            .partition(|(key, _)| degree_of(*key) <= 2)
    }
    fn asymmetric_part(&self, p: &PackedPoly) -> PackedPoly {
        asymmetric_part(p)
    }
    fn significant(&self, p: &PackedPoly) -> PackedPoly {
        p.clone()
    }
    fn coefficient(&self, p: &PackedPoly, e: Exponents) -> Exact {
        self.at(p, e.map(u64::from))
    }
    fn combination(&self, terms: &[(Rational, &Exact)]) -> Exact {
        let mut out = Exact::zero();
        for (r, v) in terms {
            out += &v.scale(r);
        }
        out
    }
}
