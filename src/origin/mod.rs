//! The six-gluon amplitude at the origin u1, u2, u3 -> 0 (docs/conventions.md section 6):
//! loop coefficients that are polynomials in the logarithms l_i = ln u_i, the
//! conversion between the normalised amplitude E and the remainder function
//! R6, the logarithm of E, the exponentiation check, and the extraction of
//! the double-log coefficients and of the constant C0,
//!
//!   ln E = alpha (l1+l2+l3)^2 + beta sum_i (l_i - l_(i+1))^2 + C0 + (power-suppressed),
//!
//! predicted as alpha = -Gamma_oct/24 and beta = -Gamma_hex/24.
//!
//! Loop coefficients of E grow to degree 2L in the logs with thousands of
//! terms, while those of ln E stay quadratic. The series arithmetic here
//! therefore runs on a private dense form (log exponents and an interned
//! transcendental monomial packed into one integer key), with the small
//! factor of every product (a coefficient of ln E, or of the exponent) in the
//! outer loop; the ring's own `Exact` is used at the edges only.

pub mod check;
pub mod numeric;

use std::collections::HashMap;
use std::hash::{BuildHasherDefault, Hasher};

use rug::Rational;

use crate::error::{Error, Result};
use crate::exact::powerseries::Series;
use crate::exact::ring::{Exact, Monomial};
use crate::kernel::{self, Tilt};

/// Which logarithms the coefficients are written in.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum OriginLogs {
    /// Three logs l_i = ln u_i, in the order (l1, l2, l3); u4 = u1.
    Three([String; 3]),
    /// The line u1 = u2 = u3, with l1 = l2 = l3 = the one log.
    Line(String),
}

impl OriginLogs {
    /// The logs named l1, l2, l3.
    pub fn three() -> Self {
        OriginLogs::Three(["l1".to_string(), "l2".to_string(), "l3".to_string()])
    }

    /// The single log l on the line.
    pub fn line() -> Self {
        OriginLogs::Line("l".to_string())
    }

    /// The logs from the `symbols` list of a series file: three names for
    /// (l1, l2, l3) in that order, or one name for the line.
    pub fn from_symbols(symbols: &[String]) -> Result<Self> {
        match symbols {
            [a, b, c] if a != b && b != c && a != c => {
                Ok(OriginLogs::Three([a.clone(), b.clone(), c.clone()]))
            }
            [l] => Ok(OriginLogs::Line(l.clone())),
            _ => Err(Error::input(format!(
                "an origin file lists either three logs (ln u1, ln u2, ln u3, e.g. [l1, l2, l3]) \
                 or one log for the line u1 = u2 = u3 (e.g. [l]); found [{}]",
                symbols.join(", ")
            ))),
        }
    }

    pub fn names(&self) -> Vec<&str> {
        match self {
            OriginLogs::Three(n) => n.iter().map(String::as_str).collect(),
            OriginLogs::Line(n) => vec![n.as_str()],
        }
    }

    fn sum_of_squares(&self) -> Exact {
        match self {
            OriginLogs::Three(n) => n
                .iter()
                .map(|s| Exact::symbol(s).pow(2))
                .fold(Exact::zero(), |a, b| &a + &b),
            OriginLogs::Line(n) => Exact::symbol(n).pow(2).scale(&Rational::from(3)),
        }
    }
}

/// The limit of the one-loop amplitude E^(1) = sum_i Li2(1 - 1/u_i)
/// at the origin: -(1/2) sum_i l_i^2 - 3 zeta(2), from Li2(1 - 1/u) =
/// -ln^2(u)/2 - zeta(2) + O(u) (Abramowitz & Stegun 27.7, inversion formula).
/// On the line the sum is 3 l^2.
pub fn one_loop_limit(logs: &OriginLogs) -> Exact {
    let zeta2 = Exact::zeta(2).unwrap_or_default();
    &logs.sum_of_squares().scale(&Rational::from((-1, 2))) - &zeta2.scale(&Rational::from(3))
}

/// The one-loop value of C0: -3 zeta(2) (docs/conventions.md section 6, derived from
/// [`one_loop_limit`] with Gamma_cusp^(1) = 4).
pub fn one_loop_constant() -> Exact {
    Exact::zeta(2)
        .unwrap_or_default()
        .scale(&Rational::from(-3))
}

/// Gamma_cusp/4 * E^(1) at the origin, order by order.
fn ansatz_exponent(gamma_cusp: &Series, logs: &OriginLogs, order: usize) -> Result<Series> {
    if gamma_cusp.order() < order {
        return Err(Error::range(format!(
            "Gamma_cusp is known through g^{} only, the origin series needs g^{}",
            2 * gamma_cusp.order(),
            2 * order
        )));
    }
    let e1 = one_loop_limit(logs).scale(&Rational::from((1, 4)));
    Ok(gamma_cusp.truncate(order).map(|c| c * &e1))
}

/// E = exp[R6 + Gamma_cusp/4 * E^(1)] at the origin, exactly, through the
/// order of `r6`. R6 must have no g^0 term.
pub fn r6_to_e(r6: &Series, gamma_cusp: &Series, logs: &OriginLogs) -> Result<Series> {
    let exponent = r6 + &ansatz_exponent(gamma_cusp, logs, r6.order())?;
    if !exponent.coeff(0).is_zero() {
        return Err(Error::input(format!(
            "R6 must vanish at g^0, found {}",
            exponent.coeff(0)
        )));
    }
    let mut alg = Algebra::new(logs);
    let f = alg.import_series(&exponent)?;
    let e = alg.exp(&f)?;
    Ok(alg.export_series(&e))
}

/// R6 = ln E - Gamma_cusp/4 * E^(1) at the origin, exactly, through the order
/// of `e`. E must start with 1.
pub fn e_to_r6(e: &Series, gamma_cusp: &Series, logs: &OriginLogs) -> Result<Series> {
    let ansatz = ansatz_exponent(gamma_cusp, logs, e.order())?;
    Ok(&ln_e(e, logs)? - &ansatz)
}

/// ln E over the polynomials in the logs, through the order of `e`.
pub fn ln_e(e: &Series, logs: &OriginLogs) -> Result<Series> {
    let mut alg = Algebra::new(logs);
    let d = alg.import_series(e)?;
    let out = alg.ln(&d, &mut |_, _| true)?;
    Ok(alg.export_series(&out))
}

/// The coefficient of sum_i (l_i - l_(i+1))^2, where it can be read.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum HexagonSlot {
    Value(Exact),
    /// On the line u1 = u2 = u3 the combination vanishes identically.
    NotTestableOnLine,
}

/// What one order of ln E says, once it has passed the exponentiation check.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct OrderReading {
    /// The loop order L (the power of g^2).
    pub order: usize,
    /// alpha_L, the coefficient of (l1+l2+l3)^2 = ln^2(u1 u2 u3).
    pub octagon: Exact,
    /// beta_L, the coefficient of sum_i (l_i - l_(i+1))^2.
    pub hexagon: HexagonSlot,
    /// The coefficient of l1+l2+l3; the physics predicts zero.
    pub linear: Exact,
    /// C0 at this order.
    pub constant: Exact,
}

/// The first order at which ln E is not a symmetric polynomial of degree <= 2.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Breakdown {
    pub order: usize,
    /// The terms of ln E of degree > 2 in the logs at this order.
    pub high_degree: Exact,
    /// The part of degree <= 2 that is not symmetric under permutations of
    /// the logs: p - (1/6) sum_sigma sigma(p). Always zero on the line.
    pub asymmetric: Exact,
}

/// The result of reading an origin series.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct OriginAnalysis {
    pub logs: OriginLogs,
    /// ln E through the last order examined (a breaking order included).
    pub ln_e: Series,
    /// Orders 1, 2, ... that exponentiate, up to the first that does not.
    pub orders: Vec<OrderReading>,
    /// The first order that breaks exponentiation; no later order is examined.
    pub broken: Option<Breakdown>,
}

/// Reads a series of E (constant term 1) at the origin.
pub fn analyse_e(e: &Series, logs: &OriginLogs) -> Result<OriginAnalysis> {
    let mut alg = Algebra::new(logs);
    let d = alg.import_series(e)?;
    let mut orders = Vec::new();
    let mut broken = None;
    let ln = alg.ln(&d, &mut |alg, (k, c)| {
        let (reading, breakdown) = alg.examine(k, c);
        orders.extend(reading);
        broken = breakdown;
        broken.is_none()
    })?;
    Ok(OriginAnalysis {
        logs: logs.clone(),
        ln_e: alg.export_series(&ln),
        orders,
        broken,
    })
}

/// Reads a series of R6 at the origin: ln E = R6 + Gamma_cusp/4 * E^(1)
/// directly, without passing through E.
pub fn analyse_r6(r6: &Series, gamma_cusp: &Series, logs: &OriginLogs) -> Result<OriginAnalysis> {
    let ln = r6 + &ansatz_exponent(gamma_cusp, logs, r6.order())?;
    if !ln.coeff(0).is_zero() {
        return Err(Error::input(format!(
            "R6 must vanish at g^0, found {}",
            ln.coeff(0)
        )));
    }
    let mut alg = Algebra::new(logs);
    let mut orders = Vec::new();
    let mut broken = None;
    let mut last = 0;
    for k in 1..=ln.order() {
        let c = alg.import(ln.coeff(k))?;
        let (reading, breakdown) = alg.examine(k, &c);
        orders.extend(reading);
        last = k;
        if breakdown.is_some() {
            broken = breakdown;
            break;
        }
    }
    Ok(OriginAnalysis {
        logs: logs.clone(),
        ln_e: ln.truncate(last),
        orders,
        broken,
    })
}

/// The predicted double-log coefficients, -Gamma_oct/24 and -Gamma_hex/24,
/// from the exact kernel engine (Gamma_oct at tilt 0, Gamma_hex at pi/3).
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct OriginPrediction {
    pub octagon: Series,
    pub hexagon: Series,
}

pub fn predicted_log_coefficients(loops: u32) -> Result<OriginPrediction> {
    let scale = Exact::from(Rational::from((-1, 24)));
    let oct = kernel::gamma(&Tilt::cos2(Rational::from(1))?, loops, &mut |_, _| {})?;
    let hex = kernel::gamma(&Tilt::cos2(Rational::from((1, 4)))?, loops, &mut |_, _| {})?;
    Ok(OriginPrediction {
        octagon: oct.scale(&scale),
        hexagon: hex.scale(&scale),
    })
}

/// alpha and beta from A sum l_i^2 + B sum_{i<j} l_i l_j: expanding
/// alpha (sum l)^2 + beta sum (l_i - l_(i+1))^2 gives A = alpha + 2 beta and
/// B = 2 alpha - 2 beta, so alpha = (A + B)/3 and beta = (2A - B)/6.
pub fn quadratic_to_alpha_beta(a: &Exact, b: &Exact) -> (Exact, Exact) {
    let alpha = (a + b).scale(&Rational::from((1, 3)));
    let beta = (&a.scale(&Rational::from(2)) - b).scale(&Rational::from((1, 6)));
    (alpha, beta)
}

// ---------------------------------------------------------------------------
// The dense form.

/// A multiply-xor hasher for the packed integer keys; the default SipHash
/// dominated the profile of the series products.
#[derive(Default, Clone, Copy)]
struct KeyHasher(u64);

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

type KeyMap<V> = HashMap<u64, V, BuildHasherDefault<KeyHasher>>;

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
type Dense = KeyMap<Rational>;

fn max_exps(d: &Dense) -> [u64; 3] {
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
struct Algebra {
    logs: OriginLogs,
    monomials: Vec<Monomial>,
    index: HashMap<Monomial, u64>,
    products: KeyMap<u64>,
}

impl Algebra {
    fn new(logs: &OriginLogs) -> Self {
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

    fn import(&mut self, e: &Exact) -> Result<Dense> {
        let names: Vec<String> = self.logs.names().iter().map(|n| n.to_string()).collect();
        let mut out = Dense::default();
        for (m, c) in e.terms() {
            let (rest, syms) = m.split_symbols();
            let mut exps = [0u64; 3];
            for (name, power) in syms.symbols() {
                let slot = names.iter().position(|n| **n == **name).ok_or_else(|| {
                    Error::input(format!(
                        "'{name}' in an origin coefficient is not one of the logs ({})",
                        names.join(", ")
                    ))
                })?;
                exps[slot] = u64::from(*power);
            }
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

    fn import_series(&mut self, s: &Series) -> Result<Vec<Dense>> {
        s.coeffs().iter().map(|c| self.import(c)).collect()
    }

    fn export(&self, d: &Dense) -> Exact {
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

    fn export_series(&self, s: &[Dense]) -> Series {
        Series::new(s.iter().map(|d| self.export(d)).collect())
    }

    /// acc += factor * a * b, with `a` the small operand.
    fn add_product(
        &mut self,
        acc: &mut Dense,
        factor: &Rational,
        a: &Dense,
        b: &Dense,
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

    /// exp of a series with zero constant term: k out_k = sum_j j f_j out_(k-j),
    /// the f_j (the exponent) being the small operand.
    fn exp(&mut self, f: &[Dense]) -> Result<Vec<Dense>> {
        let n = f.len() - 1;
        let mut out: Vec<Dense> = Vec::with_capacity(n + 1);
        out.push(Dense::from_iter([(pack([0; 3], 0), Rational::from(1))]));
        for k in 1..=n {
            let mut acc = Dense::default();
            for j in 1..=k {
                if !f[j].is_empty() && !out[k - j].is_empty() {
                    let factor = Rational::from((j as i64, k as i64));
                    self.add_product(&mut acc, &factor, &f[j], &out[k - j])?;
                }
            }
            out.push(acc);
        }
        Ok(out)
    }

    /// ln of a series with constant term 1: out_k = e_k - (1/k) sum_(j<k) j out_j e_(k-j).
    /// `keep_going` sees each new coefficient and may stop the expansion; the
    /// result then ends at that order.
    fn ln(
        &mut self,
        e: &[Dense],
        keep_going: &mut dyn FnMut(&mut Self, (usize, &Dense)) -> bool,
    ) -> Result<Vec<Dense>> {
        let one = Dense::from_iter([(pack([0; 3], 0), Rational::from(1))]);
        if e[0] != one {
            return Err(Error::input(format!(
                "E must start with 1 at g^0 (E = 1 + O(g^2)), found {}",
                self.export(&e[0])
            )));
        }
        let n = e.len() - 1;
        let mut out: Vec<Dense> = vec![Dense::default()];
        for k in 1..=n {
            let mut acc = Dense::default();
            for j in 1..k {
                if !out[j].is_empty() && !e[k - j].is_empty() {
                    let factor = Rational::from((-(j as i64), k as i64));
                    let small = std::mem::take(&mut out[j]);
                    let done = self.add_product(&mut acc, &factor, &small, &e[k - j]);
                    out[j] = small;
                    done?;
                }
            }
            for (&key, c) in &e[k] {
                *acc.entry(key).or_default() += c;
            }
            acc.retain(|_, c| *c != 0);
            let go_on = keep_going(self, (k, &acc));
            out.push(acc);
            if !go_on {
                break;
            }
        }
        Ok(out)
    }

    /// The terms of `d` whose log exponents are `exps`, as a ring element.
    fn at(&self, d: &Dense, exps: [u64; 3]) -> Exact {
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

    /// The exponentiation check and the readings of one order of ln E.
    fn examine(&self, k: usize, c: &Dense) -> (Option<OrderReading>, Option<Breakdown>) {
        let high: Dense = c
            .iter()
            .filter(|(&key, _)| degree_of(key) > 2)
            .map(|(&k, v)| (k, v.clone()))
            .collect();
        let low: Dense = c
            .iter()
            .filter(|(&key, _)| degree_of(key) <= 2)
            .map(|(&k, v)| (k, v.clone()))
            .collect();
        let asymmetric = match self.logs {
            OriginLogs::Three(_) => asymmetric_part(&low),
            OriginLogs::Line(_) => Dense::default(),
        };
        if !high.is_empty() || !asymmetric.is_empty() {
            let b = Breakdown {
                order: k,
                high_degree: self.export(&high),
                asymmetric: self.export(&asymmetric),
            };
            return (None, Some(b));
        }
        let constant = self.at(&low, [0, 0, 0]);
        let reading = match self.logs {
            OriginLogs::Three(_) => {
                let (alpha, beta) =
                    quadratic_to_alpha_beta(&self.at(&low, [2, 0, 0]), &self.at(&low, [1, 1, 0]));
                OrderReading {
                    order: k,
                    octagon: alpha,
                    hexagon: HexagonSlot::Value(beta),
                    linear: self.at(&low, [1, 0, 0]),
                    constant,
                }
            }
            // On the line (sum l)^2 = 9 l^2 and l1 + l2 + l3 = 3 l.
            OriginLogs::Line(_) => OrderReading {
                order: k,
                octagon: self.at(&low, [2, 0, 0]).scale(&Rational::from((1, 9))),
                hexagon: HexagonSlot::NotTestableOnLine,
                linear: self.at(&low, [1, 0, 0]).scale(&Rational::from((1, 3))),
                constant,
            },
        };
        (Some(reading), None)
    }
}

/// p - (1/6) sum over the six permutations of the three logs.
fn asymmetric_part(p: &Dense) -> Dense {
    const PERMS: [[usize; 3]; 6] = [
        [0, 1, 2],
        [0, 2, 1],
        [1, 0, 2],
        [1, 2, 0],
        [2, 0, 1],
        [2, 1, 0],
    ];
    let sixth = Rational::from((1, 6));
    let mut out = p.clone();
    for (&key, c) in p {
        let e = exps_of(key);
        let t = transcendental_of(key);
        let share = Rational::from(c * &sixth);
        for perm in PERMS {
            let moved = pack([e[perm[0]], e[perm[1]], e[perm[2]]], t);
            *out.entry(moved).or_default() -= &share;
        }
    }
    out.retain(|_, c| *c != 0);
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    fn q(n: i64, d: i64) -> Exact {
        Exact::from(Rational::from((n, d)))
    }

    fn zeta(n: u32) -> Exact {
        Exact::zeta(n).unwrap()
    }

    fn l(i: usize) -> Exact {
        Exact::symbol(&format!("l{i}"))
    }

    fn sum_logs_squared() -> Exact {
        (&(&l(1) + &l(2)) + &l(3)).pow(2)
    }

    fn sum_differences_squared() -> Exact {
        let d = |a: usize, b: usize| (&l(a) - &l(b)).pow(2);
        &(&d(1, 2) + &d(2, 3)) + &d(3, 1)
    }

    fn cusp(loops: u32) -> Series {
        kernel::gamma(
            &Tilt::cos2(Rational::from((1, 2))).unwrap(),
            loops,
            &mut |_, _| {},
        )
        .unwrap()
    }

    /// Li2(1 - 1/u) -> -ln^2(u)/2 - zeta(2) as u -> 0 (Abramowitz & Stegun 27.7).
    fn li2_inverse_limit(log: &Exact) -> Exact {
        &log.pow(2).scale(&Rational::from((-1, 2))) - &zeta(2)
    }

    fn value(slot: &HexagonSlot) -> &Exact {
        match slot {
            HexagonSlot::Value(v) => v,
            HexagonSlot::NotTestableOnLine => panic!("expected a value"),
        }
    }

    #[test]
    fn alpha_beta_from_the_quadratic_form() {
        // Expand alpha (sum l)^2 + beta sum (l_i - l_(i+1))^2 with symbolic
        // alpha, beta and read back A (l1^2) and B (l1 l2).
        let (alpha, beta) = (Exact::symbol("alpha"), Exact::symbol("beta"));
        let form = &(&alpha * &sum_logs_squared()) + &(&beta * &sum_differences_squared());
        let coefficient = |m: Monomial| {
            let mut out = Exact::zero();
            for (k, c) in form.terms() {
                if ["l1", "l2", "l3"]
                    .iter()
                    .all(|n| k.symbol_exponent(n) == m.symbol_exponent(n))
                {
                    let (rest, _) = k.without_symbol("l1");
                    let (rest, _) = rest.without_symbol("l2");
                    let (rest, _) = rest.without_symbol("l3");
                    out.add_term(rest, c.clone());
                }
            }
            out
        };
        let a = coefficient(Monomial::symbol("l1", 2));
        let b = coefficient(Monomial::from_parts(
            0,
            vec![],
            vec![("l1".into(), 1), ("l2".into(), 1)],
        ));
        assert_eq!(a, &alpha + &beta.scale(&Rational::from(2)));
        assert_eq!(
            b,
            &alpha.scale(&Rational::from(2)) - &beta.scale(&Rational::from(2))
        );
        assert_eq!(quadratic_to_alpha_beta(&a, &b), (alpha, beta));
    }

    /// One loop: E^(1) = sum_i Li2(1 - 1/u_i) (docs/conventions.md section 6); in g^2
    /// normalisation E = 1 + g^2 Gamma_cusp^(1)/4 E^(1) = 1 + g^2 E^(1).
    #[test]
    fn one_loop_reads_minus_one_sixth_twice_and_minus_three_zeta2() {
        let e1 = (1..=3)
            .map(|i| li2_inverse_limit(&l(i)))
            .fold(Exact::zero(), |a, b| &a + &b);
        assert_eq!(e1, one_loop_limit(&OriginLogs::three()));
        let e = Series::new(vec![Exact::one(), e1]);
        let a = analyse_e(&e, &OriginLogs::three()).unwrap();
        assert!(a.broken.is_none());
        let r = &a.orders[0];
        assert_eq!(r.octagon, q(-1, 6));
        assert_eq!(value(&r.hexagon), &q(-1, 6));
        assert!(r.linear.is_zero());
        assert_eq!(r.constant, zeta(2).scale(&Rational::from(-3)));
        assert_eq!(r.constant, one_loop_constant());
        // Gamma^(1) = 4 for every tilt: -4/24 = -1/6 (docs/conventions.md section 4).
        let p = predicted_log_coefficients(1).unwrap();
        assert_eq!(p.octagon.coeff(1), &r.octagon);
        assert_eq!(p.hexagon.coeff(1), value(&r.hexagon));
    }

    /// Two loops: R6^(2) -> zeta2 (l1 l2 + l2 l3 + l3 l1) + 77/4 zeta4 - 6 zeta2^2
    /// (arXiv:1006.5703 as given in docs/conventions.md section 6).
    fn two_loop_r6() -> Series {
        let pairs = &(&(&l(1) * &l(2)) + &(&l(2) * &l(3))) + &(&l(3) * &l(1));
        let c2 = &(&zeta(2) * &pairs)
            + &(&zeta(4).scale(&Rational::from((77, 4)))
                - &zeta(2).pow(2).scale(&Rational::from(6)));
        Series::new(vec![Exact::zero(), Exact::zero(), c2])
    }

    #[test]
    fn two_loop_remainder_matches_octagon_and_hexagon() {
        let logs = OriginLogs::three();
        let r6 = two_loop_r6();
        let a = analyse_r6(&r6, &cusp(2), &logs).unwrap();
        assert!(a.broken.is_none());
        let r = &a.orders[1];
        // Gamma_oct^(2) = -16 zeta2, Gamma_hex^(2) = -4 zeta2 (docs/conventions.md section 4).
        assert_eq!(r.octagon, zeta(2).scale(&Rational::from((16, 24))));
        assert_eq!(value(&r.hexagon), &zeta(2).scale(&Rational::from((4, 24))));
        assert!(r.linear.is_zero());
        assert_eq!(r.constant, zeta(4).scale(&Rational::from((77, 4))));
        let p = predicted_log_coefficients(2).unwrap();
        assert_eq!(p.octagon.coeff(2), &r.octagon);
        assert_eq!(p.hexagon.coeff(2), value(&r.hexagon));
        // The same through E: exp, then the logarithm.
        let e = r6_to_e(&r6, &cusp(2), &logs).unwrap();
        assert_eq!(analyse_e(&e, &logs).unwrap().orders, a.orders);
    }

    /// ln E built from the predicted quadratic form with arbitrary constants.
    fn predicted_ln_e(loops: u32) -> Series {
        let p = predicted_log_coefficients(loops).unwrap();
        let mut coeffs = vec![Exact::zero()];
        for k in 1..=loops as usize {
            let constant =
                &zeta(2 * k as u32).scale(&Rational::from((k as i64, 3))) + &q(1, k as i64 + 1);
            let c = &(&(p.octagon.coeff(k) * &sum_logs_squared())
                + &(p.hexagon.coeff(k) * &sum_differences_squared()))
                + &constant;
            coeffs.push(c);
        }
        Series::new(coeffs)
    }

    #[test]
    fn exponentiated_prediction_passes_and_one_cubic_term_breaks_one_order() {
        let logs = OriginLogs::three();
        let ln = predicted_ln_e(5);
        // The ring's own exp, independent of the dense form used here.
        let e = ln.exp().unwrap();
        let a = analyse_e(&e, &logs).unwrap();
        assert!(a.broken.is_none(), "{:?}", a.broken);
        assert_eq!(a.orders.len(), 5);
        assert_eq!(a.ln_e, ln);
        let p = predicted_log_coefficients(5).unwrap();
        for r in &a.orders {
            assert_eq!(r.octagon, *p.octagon.coeff(r.order));
            assert_eq!(value(&r.hexagon), p.hexagon.coeff(r.order));
        }

        let cubic = (&l(1).pow(2) * &l(2)).scale(&Rational::from((5, 7)));
        let mut changed = e.coeffs().to_vec();
        changed[3] = &changed[3] + &cubic;
        let a = analyse_e(&Series::new(changed), &logs).unwrap();
        let b = a.broken.expect("order 3 must break");
        assert_eq!(b.order, 3);
        assert_eq!(b.high_degree, cubic);
        assert!(b.asymmetric.is_zero());
        assert_eq!(a.orders.len(), 2);
        assert_eq!(a.ln_e.order(), 3);
    }

    #[test]
    fn asymmetric_quadratic_term_is_named() {
        let logs = OriginLogs::three();
        let e = predicted_ln_e(3).exp().unwrap();
        let mut changed = e.coeffs().to_vec();
        changed[2] = &changed[2] + &l(1).pow(2);
        let b = analyse_e(&Series::new(changed), &logs)
            .unwrap()
            .broken
            .unwrap();
        assert_eq!(b.order, 2);
        assert!(b.high_degree.is_zero());
        let symmetric =
            (&(&l(1).pow(2) + &l(2).pow(2)) + &l(3).pow(2)).scale(&Rational::from((1, 3)));
        assert_eq!(b.asymmetric, &l(1).pow(2) - &symmetric);
    }

    #[test]
    fn linear_symmetric_part_is_read_not_hidden() {
        let logs = OriginLogs::three();
        let sum = &(&l(1) + &l(2)) + &l(3);
        let ln = Series::new(vec![
            Exact::zero(),
            &one_loop_limit(&logs) + &sum.scale(&Rational::from(2)),
        ]);
        let a = analyse_e(&ln.exp().unwrap(), &logs).unwrap();
        assert_eq!(a.orders[0].linear, Exact::from(2));
    }

    /// A small deterministic generator (a 64-bit LCG with the MMIX multiplier and increment).
    struct Lcg(u64);

    impl Lcg {
        fn next(&mut self, n: u64) -> u64 {
            self.0 = self
                .0
                .wrapping_mul(6364136223846793005)
                .wrapping_add(1442695040888963407);
            (self.0 >> 33) % n
        }
        fn rational(&mut self) -> Rational {
            Rational::from((self.next(41) as i64 - 20, self.next(9) as i64 + 1))
        }
    }

    fn random_r6(rng: &mut Lcg, order: usize) -> Series {
        let transcendentals = [Exact::one(), zeta(2), zeta(3), zeta(3).pow(2), zeta(5)];
        let mut coeffs = vec![Exact::zero()];
        for k in 1..=order {
            let mut c = Exact::zero();
            for _ in 0..6 {
                let mono = Monomial::from_parts(
                    0,
                    vec![],
                    (1..=3)
                        .map(|i| (format!("l{i}").into(), rng.next(2 * k as u64 + 1) as u32))
                        .collect(),
                );
                let t = &transcendentals[rng.next(5) as usize];
                c = &c + &t.mul_monomial(&mono, &rng.rational());
            }
            coeffs.push(c);
        }
        Series::new(coeffs)
    }

    #[test]
    fn r6_to_e_and_back_is_the_identity() {
        let logs = OriginLogs::three();
        let g = cusp(4);
        let mut rng = Lcg(20240531);
        for _ in 0..8 {
            let r6 = random_r6(&mut rng, 4);
            let e = r6_to_e(&r6, &g, &logs).unwrap();
            assert_eq!(e.coeff(0), &Exact::one());
            assert_eq!(e_to_r6(&e, &g, &logs).unwrap(), r6);
            // The dense logarithm agrees with the ring's own.
            assert_eq!(ln_e(&e, &logs).unwrap(), e.ln().unwrap());
        }
    }

    #[test]
    fn on_the_line_only_the_octagon_is_read() {
        let line = OriginLogs::line();
        let on_line = |s: &Series| {
            s.map(|c| {
                c.substitute("l1", &Exact::symbol("l"))
                    .substitute("l2", &Exact::symbol("l"))
                    .substitute("l3", &Exact::symbol("l"))
            })
        };
        let a = analyse_r6(&on_line(&two_loop_r6()), &cusp(2), &line).unwrap();
        let p = predicted_log_coefficients(2).unwrap();
        for r in &a.orders {
            assert_eq!(r.hexagon, HexagonSlot::NotTestableOnLine);
            assert_eq!(r.octagon, *p.octagon.coeff(r.order));
        }
        assert_eq!(
            a.orders[1].constant,
            zeta(4).scale(&Rational::from((77, 4)))
        );
        let e = on_line(&predicted_ln_e(4)).exp().unwrap();
        let a = analyse_e(&e, &line).unwrap();
        assert!(a.broken.is_none());
        assert_eq!(a.orders.len(), 4);
        let p = predicted_log_coefficients(4).unwrap();
        assert!(a
            .orders
            .iter()
            .all(|r| r.octagon == *p.octagon.coeff(r.order)));
    }

    /// Three loops: Gamma_oct = (2/pi^2) ln cosh(2 pi g) with ln cosh y =
    /// y^2/2 - y^4/12 + y^6/45 - ... (integrated tanh series, Abramowitz &
    /// Stegun section 4.5) gives 128 pi^4/45 = 256 zeta4 at g^6; Gamma_hex^(3) =
    /// 34 zeta4 (docs/conventions.md section 4).
    #[test]
    fn three_loop_predictions_against_closed_forms() {
        let p = predicted_log_coefficients(3).unwrap();
        assert_eq!(
            p.octagon.coeff(3),
            &Exact::pi().pow(4).scale(&Rational::from((-128, 45 * 24)))
        );
        assert_eq!(
            p.octagon.coeff(3),
            &zeta(4).scale(&Rational::from((-256, 24)))
        );
        assert_eq!(
            p.hexagon.coeff(3),
            &zeta(4).scale(&Rational::from((-34, 24)))
        );
    }

    #[test]
    fn bad_input_is_refused() {
        assert!(OriginLogs::from_symbols(&["a".into(), "b".into()]).is_err());
        assert!(OriginLogs::from_symbols(&["a".into(), "a".into(), "b".into()]).is_err());
        assert_eq!(
            OriginLogs::from_symbols(&["l".into()]).unwrap(),
            OriginLogs::line()
        );
        let e = Series::new(vec![Exact::from(2), l(1)]);
        assert!(analyse_e(&e, &OriginLogs::three()).is_err());
        let e = Series::new(vec![Exact::one(), Exact::symbol("x")]);
        assert!(analyse_e(&e, &OriginLogs::three())
            .unwrap_err()
            .message()
            .contains("'x'"));
        assert!(r6_to_e(&two_loop_r6(), &cusp(1), &OriginLogs::three()).is_err());
        // Powers whose products would not fit the dense keys are refused, not wrapped.
        let big = Series::new(vec![Exact::one(), Exact::symbol("l1").pow(40_000)]);
        assert_eq!(ln_e(&big, &OriginLogs::three()).unwrap(), big.ln().unwrap());
        let twice = Series::new(vec![
            Exact::one(),
            Exact::symbol("l1").pow(40_000),
            Exact::zero(),
        ]);
        assert!(ln_e(&twice, &OriginLogs::three()).is_err());
    }
}
