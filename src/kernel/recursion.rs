//! The forward recursion for one diagonal element of the resolvent,
//! [(1 + K_{>=s})^(-1)]_{ss}, order by order in g, in exact integer arithmetic.
//!
//! With R = (1 + K)^(-1) e_s: R^(0) = e_s and R^(n) = -sum_{p>=2} K^(p) R^(n-p)
//! (docs/conventions.md section 3). Three facts keep the work small:
//! - K^(p)_ij is a_ijp / D_p times one monomial M_p, so the sum over j at
//!   fixed p is an integer combination of vectors of one weight, and the
//!   monomial is applied once afterwards;
//! - R^(m)_j can only reach the diagonal element at order top if
//!   m + j + s <= top (the cheapest way back from j to s costs g^(j+s)), and it
//!   vanishes unless m + j + s is even; other entries are never formed;
//! - every vector of one weight shares one denominator, reduced after each
//!   weight, so the inner loops are integer multiply-adds (GMP addmul).
//!
//! Targets of one weight are independent and are shared between threads.

use std::sync::atomic::{AtomicUsize, Ordering};
use std::sync::Mutex;

use rug::{Assign, Integer, Rational};

use super::basis::WeightBases;
use super::entries::KernelTable;
use crate::exact::ring::{Exact, Monomial};

/// How the tilt enters: the factor 2 c2 on most entries and 2 s2 = 2 (1 - c2)
/// on entries with i even and j odd (docs/conventions.md section 3, rational form).
#[derive(Clone, Debug)]
pub enum TiltFactors {
    /// c2 = u / w with integers 0 <= u <= w.
    Rational { u: Integer, w: Integer },
    /// c2 kept as a symbol: vectors carry one slot per power of c2.
    Symbolic,
}

impl TiltFactors {
    pub(crate) fn slots(&self, weight: usize) -> usize {
        match self {
            TiltFactors::Rational { .. } => 1,
            TiltFactors::Symbolic => weight / 2 + 1,
        }
    }
}

/// Everything the recursion reads, built once per maximal order.
pub struct Tables {
    pub kernel: KernelTable,
    pub bases: WeightBases,
    shifts: Vec<Vec<Vec<u32>>>,
}

impl Tables {
    pub fn new(top: usize) -> Self {
        let bases = WeightBases::new(top);
        let shifts = bases.shift_maps();
        Tables {
            kernel: KernelTable::new(top),
            bases,
            shifts,
        }
    }
}

/// The vectors R^(m)_j of one weight m: a common denominator and, per index j,
/// integer numerators laid out as [basis element][power of c2].
struct Level {
    denominator: Integer,
    /// (j, numerators), j ascending.
    rows: Vec<(usize, Vec<Integer>)>,
}

/// One coefficient in dense form: integer numerators over one denominator,
/// laid out as [basis element of its weight][power of c2].
#[derive(Clone, Debug)]
pub struct Dense {
    pub denominator: Integer,
    pub numerators: Vec<Integer>,
}

/// [(1 + K_{>=s})^(-1)]_{ss} through g^top, as exact coefficients of g^n for
/// n = 0..=top (odd n are zero). `progress` is told (n, top) after each order.
pub fn diagonal(
    tables: &Tables,
    tilt: &TiltFactors,
    s: usize,
    top: usize,
    progress: &mut dyn FnMut(usize, usize),
) -> Vec<Exact> {
    diagonal_dense(tables, tilt, s, top, progress)
        .iter()
        .enumerate()
        .map(|(n, d)| to_exact(tables, tilt, n, &d.denominator, &d.numerators))
        .collect()
}

/// The same element as `diagonal`, each coefficient of g^n in dense form
/// (all-zero numerators where the element has no g^n term).
pub fn diagonal_dense(
    tables: &Tables,
    tilt: &TiltFactors,
    s: usize,
    top: usize,
    progress: &mut dyn FnMut(usize, usize),
) -> Vec<Dense> {
    let threads = std::thread::available_parallelism()
        .map_or(1, |n| n.get())
        .min(8);
    let mut levels: Vec<Level> = Vec::with_capacity(top + 1);
    let len0 = tables.bases.len(0) * tilt.slots(0);
    let mut start = vec![Integer::new(); len0];
    start[0] = Integer::from(1);
    levels.push(Level {
        denominator: Integer::from(1),
        rows: vec![(s, start)],
    });

    for n in 1..=top {
        let targets: Vec<usize> = (s..)
            .take_while(|&i| n + i + s <= top || (i == s && n <= top))
            .filter(|&i| (n + i + s) % 2 == 0)
            .collect();
        let common = level_denominator(tables, tilt, &levels, n, s, &targets);
        let next = AtomicUsize::new(0);
        let results: Mutex<Vec<(usize, Vec<Integer>)>> =
            Mutex::new(Vec::with_capacity(targets.len()));
        let work = || loop {
            let k = next.fetch_add(1, Ordering::Relaxed);
            let Some(&i) = targets.get(k) else { break };
            let row = target_row(tables, tilt, &levels, n, i, s, &common);
            results
                .lock()
                .unwrap_or_else(|e| e.into_inner())
                .push((i, row));
        };
        // Spawning costs more than a small level takes.
        if threads > 1 && targets.len() > 1 && tables.bases.len(n) * tilt.slots(n) >= 32 {
            std::thread::scope(|scope| {
                for _ in 0..threads.min(targets.len()) {
                    scope.spawn(work);
                }
            });
        } else {
            work();
        }
        let mut rows = results.into_inner().unwrap_or_else(|e| e.into_inner());
        rows.sort_by_key(|(i, _)| *i);
        levels.push(reduce(Level {
            denominator: common,
            rows,
        }));
        progress(n, top);
    }

    levels
        .into_iter()
        .enumerate()
        .map(|(n, level)| {
            let numerators = level
                .rows
                .into_iter()
                .find(|(j, _)| *j == s)
                .map(|(_, v)| v)
                .unwrap_or_else(|| vec![Integer::new(); tables.bases.len(n) * tilt.slots(n)]);
            Dense {
                denominator: level.denominator,
                numerators,
            }
        })
        .collect()
}

/// The sources (m, j) feeding target (n, i), with p = n - m.
fn sources<'a>(
    levels: &'a [Level],
    n: usize,
    i: usize,
) -> impl Iterator<Item = (usize, usize, &'a Vec<Integer>)> + 'a {
    levels.iter().enumerate().flat_map(move |(m, level)| {
        level
            .rows
            .iter()
            .filter(move |(j, _)| m + i + j <= n)
            .map(move |(j, v)| (m, *j, v))
    })
}

/// The extra denominator the tilt brings: w for rational c2 = u/w.
fn tilt_denominator(tilt: &TiltFactors) -> Integer {
    match tilt {
        TiltFactors::Rational { w, .. } => w.clone(),
        TiltFactors::Symbolic => Integer::from(1),
    }
}

/// lcm over contributing p of D_p * E_m * (tilt denominator).
fn level_denominator(
    tables: &Tables,
    tilt: &TiltFactors,
    levels: &[Level],
    n: usize,
    s: usize,
    targets: &[usize],
) -> Integer {
    let mut common = Integer::from(1);
    let Some(&i) = targets.first() else {
        return common;
    };
    debug_assert!(i >= s);
    let mut seen = vec![false; n + 1];
    for (m, _, _) in sources(levels, n, i) {
        if !seen[m] {
            seen[m] = true;
            let d = Integer::from(tables.kernel.denominator(n - m) * &levels[m].denominator)
                * tilt_denominator(tilt);
            common.lcm_mut(&d);
        }
    }
    common
}

/// R^(n)_i as integer numerators over `common`.
///
/// For each source weight m and each basis element, the rows of level m are
/// summed with their kernel numerators into one accumulator per tilt class,
/// which is then scaled into the target: two accumulators reused for every
/// element, rather than a fresh vector per source weight, because
/// allocating and growing those vectors took most of the time.
fn target_row(
    tables: &Tables,
    tilt: &TiltFactors,
    levels: &[Level],
    n: usize,
    i: usize,
    s: usize,
    common: &Integer,
) -> Vec<Integer> {
    let slots_n = tilt.slots(n);
    let mut out = vec![Integer::new(); tables.bases.len(n) * slots_n];
    let (mut acc_c, mut acc_s) = (Integer::new(), Integer::new());
    for (m, level) in levels.iter().enumerate().take(n) {
        let p = n - m;
        if p < i + s {
            continue;
        }
        // The two tilt classes: 2 c2 (default) and 2 s2 (i even, j odd).
        let feeding: Vec<(&Integer, &[Integer], bool)> = level
            .rows
            .iter()
            .filter(|(j, _)| p >= i + j)
            .map(|(j, v)| {
                (
                    tables.kernel.numerator(i, *j, p),
                    &v[..],
                    i % 2 == 0 && j % 2 == 1,
                )
            })
            .filter(|(a, _, _)| !a.is_zero())
            .collect();
        if feeding.is_empty() {
            continue;
        }
        // R^(n)_i = -sum_p M_p (1 / (D_p E_m)) (tilt factors) sums.
        let scale = common
            / (Integer::from(tables.kernel.denominator(p) * &level.denominator)
                * tilt_denominator(tilt));
        let (fc, fs) = match tilt {
            TiltFactors::Rational { u, w } => (
                Integer::from(u * 2u32) * &scale,
                (Integer::from(w - u) * 2u32) * &scale,
            ),
            TiltFactors::Symbolic => {
                let two_scale = Integer::from(&scale * 2u32);
                (two_scale.clone(), two_scale)
            }
        };
        let shift = &tables.shifts[m][p];
        let slots_m = tilt.slots(m);
        for k in 0..tables.bases.len(m) * slots_m {
            acc_c.assign(0);
            acc_s.assign(0);
            for (a, v, into_s) in &feeding {
                let y = &v[k];
                if !y.is_zero() {
                    if *into_s {
                        acc_s += *a * y;
                    } else {
                        acc_c += *a * y;
                    }
                }
            }
            let (b, d) = (k / slots_m, k % slots_m);
            let target = shift[b] as usize * slots_n;
            match tilt {
                TiltFactors::Rational { .. } => {
                    let t = &mut out[target];
                    if !acc_c.is_zero() {
                        *t -= &fc * &acc_c;
                    }
                    if !acc_s.is_zero() {
                        *t -= &fs * &acc_s;
                    }
                }
                TiltFactors::Symbolic => {
                    // 2 c2 * sum_c: c2^d -> c2^(d+1).
                    if !acc_c.is_zero() {
                        out[target + d + 1] -= &fc * &acc_c;
                    }
                    // 2 (1 - c2) * sum_s.
                    if !acc_s.is_zero() {
                        out[target + d] -= &fs * &acc_s;
                        out[target + d + 1] += &fs * &acc_s;
                    }
                }
            }
        }
    }
    out
}

/// Divides the level by the gcd of its denominator and all numerators.
fn reduce(mut level: Level) -> Level {
    let mut g = level.denominator.clone();
    for (_, v) in &level.rows {
        for x in v {
            if g == 1 {
                break;
            }
            if !x.is_zero() {
                g.gcd_mut(x);
            }
        }
    }
    if g != 1 {
        level.denominator.div_exact_mut(&g);
    }
    // Rows live until the end, so they give back what the accumulation over-allocated.
    for (_, v) in &mut level.rows {
        for x in v.iter_mut() {
            if g != 1 && !x.is_zero() {
                x.div_exact_mut(&g);
            }
            x.shrink_to_fit();
        }
    }
    level
}

pub(crate) fn to_exact(
    tables: &Tables,
    tilt: &TiltFactors,
    n: usize,
    denominator: &Integer,
    v: &[Integer],
) -> Exact {
    let slots = tilt.slots(n);
    let mut out = Exact::zero();
    for (k, x) in v.iter().enumerate() {
        if x.is_zero() {
            continue;
        }
        let (b, d) = (k / slots, k % slots);
        let mut m = tables.bases.monomial(n, b);
        if d > 0 {
            m = m.mul(&Monomial::symbol(super::C2, d as u32));
        }
        out.add_term(m, Rational::from((x.clone(), denominator.clone())));
    }
    out
}
