//! The forward recursion for one diagonal element of the resolvent,
//! [(1 + K_{>=s})^(-1)]_{ss}, order by order in g, in exact integer arithmetic.
//!
//! With R = (1 + K)^(-1) e_s: R^(0) = e_s and R^(n) = -sum_{p>=2} K^(p) R^(n-p)
//! (docs/conventions.md section 3). Three facts keep the work small:
//! - K^(p)_ij is a_ijp / D_p times one monomial M_p, so the sum over j at
//!   fixed p is an integer combination of vectors of one weight, and the
//!   monomial is applied once afterwards;
//! - R^(m)_j can only reach the diagonal element at order highest if
//!   m + j + s <= highest (the cheapest way back from j to s costs g^(j+s)), and it
//!   vanishes unless m + j + s is even; other entries are never formed;
//! - the entries of one weight with the same power of pi share one
//!   denominator, reduced after each weight, so the inner loops are integer
//!   multiply-adds (GMP addmul). The denominators come from the even zeta
//!   values, i.e. from the powers of pi: at 40 loops an entry without pi
//!   needs a denominator of a few bits where the weight's common one has 280,
//!   so one denominator per weight made most numerators three times longer.
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
    /// None beyond the weights the packed monomial keys hold (about 100).
    pub fn new(highest: usize) -> Option<Self> {
        let bases = WeightBases::new(highest);
        let shifts = bases.shift_maps()?;
        Some(Tables {
            kernel: KernelTable::new(highest),
            bases,
            shifts,
        })
    }

    /// Frees the shift maps (85 MB at 50 loops) once the recursions are
    /// done, before the coefficients become ring elements.
    pub fn drop_shifts(&mut self) {
        self.shifts = Vec::new();
    }
}

/// The vectors R^(m)_j of one weight m: one denominator per power of pi
/// and, per index j, integer numerators laid out as [basis element][power of c2].
struct Level {
    /// denominators[a]: the denominator of every entry with the factor pi^(2a).
    denominators: Vec<Integer>,
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

/// [(1 + K_{>=s})^(-1)]_{ss} through g^highest, each coefficient of g^n for
/// n = 0..=highest in dense form (all-zero numerators where the element has no
/// g^n term). `progress` is told (n, highest) after each order.
pub fn diagonal_dense(
    tables: &Tables,
    tilt: &TiltFactors,
    s: usize,
    highest: usize,
    progress: &mut dyn FnMut(usize, usize),
) -> Vec<Dense> {
    let threads = std::thread::available_parallelism()
        .map_or(1, |n| n.get())
        .min(8);
    let mut levels: Vec<Level> = Vec::with_capacity(highest + 1);
    let len0 = tables.bases.len(0) * tilt.slots(0);
    let mut start = vec![Integer::new(); len0];
    start[0] = Integer::from(1);
    levels.push(Level {
        denominators: vec![Integer::from(1)],
        rows: vec![(s, start)],
    });

    for n in 1..=highest {
        let targets: Vec<usize> = (s..)
            .take_while(|&i| n + i + s <= highest || (i == s && n <= highest))
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
        levels.push(reduce(
            tables,
            tilt,
            n,
            Level {
                denominators: common,
                rows,
            },
        ));
        progress(n, highest);
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
            one_denominator(tables, tilt, n, &level.denominators, numerators)
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

/// The entries of weight n over the lcm of their classes' denominators.
fn one_denominator(
    tables: &Tables,
    tilt: &TiltFactors,
    n: usize,
    denominators: &[Integer],
    mut numerators: Vec<Integer>,
) -> Dense {
    let mut denominator = Integer::from(1);
    for d in denominators {
        denominator.lcm_mut(d);
    }
    let factors: Vec<Integer> = denominators
        .iter()
        .map(|d| Integer::from(denominator.div_exact_ref(d)))
        .collect();
    let slots = tilt.slots(n);
    for (k, x) in numerators.iter_mut().enumerate() {
        let f = &factors[tables.bases.pi_halves(n)[k / slots] as usize];
        if *f != 1 && !x.is_zero() {
            *x *= f;
        }
    }
    Dense {
        denominator,
        numerators,
    }
}

/// The class of weight n that class a of weight n - p lands in under M_p.
fn target_class(a: usize, p: usize) -> usize {
    if p % 2 == 0 {
        a + p / 2
    } else {
        a
    }
}

/// Per power of pi of weight n: the lcm over contributing sources (m, class
/// a) of D_p * E_(m,a) * (tilt denominator), p = n - m.
fn level_denominator(
    tables: &Tables,
    tilt: &TiltFactors,
    levels: &[Level],
    n: usize,
    s: usize,
    targets: &[usize],
) -> Vec<Integer> {
    let mut common = vec![Integer::from(1); n / 2 + 1];
    let Some(&i) = targets.first() else {
        return common;
    };
    debug_assert!(i >= s);
    let mut seen = vec![false; n + 1];
    for (m, _, _) in sources(levels, n, i) {
        if !seen[m] {
            seen[m] = true;
            let p = n - m;
            let d = tables.kernel.denominator(p) * tilt_denominator(tilt);
            for (a, e) in levels[m].denominators.iter().enumerate() {
                common[target_class(a, p)].lcm_mut(&Integer::from(&d * e));
            }
        }
    }
    common
}

/// R^(n)_i as integer numerators over `common` (one per power of pi).
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
    common: &[Integer],
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
        // R^(n)_i = -sum_p M_p (1 / (D_p E_(m,a))) (tilt factors) sums, with
        // the scale to the target's denominator folded into the factors.
        let d = tables.kernel.denominator(p) * tilt_denominator(tilt);
        let factors: Vec<(Integer, Integer)> = level
            .denominators
            .iter()
            .enumerate()
            .map(|(a, e)| {
                let source = Integer::from(&d * e);
                let scale = Integer::from(common[target_class(a, p)].div_exact_ref(&source));
                match tilt {
                    TiltFactors::Rational { u, w } => (
                        Integer::from(u * 2u32) * &scale,
                        (Integer::from(w - u) * 2u32) * &scale,
                    ),
                    TiltFactors::Symbolic => {
                        let two_scale = scale * 2u32;
                        (two_scale.clone(), two_scale)
                    }
                }
            })
            .collect();
        let classes = tables.bases.pi_halves(m);
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
            let (fc, fs) = &factors[classes[b] as usize];
            let target = shift[b] as usize * slots_n;
            match tilt {
                TiltFactors::Rational { .. } => {
                    let t = &mut out[target];
                    if !acc_c.is_zero() {
                        *t -= fc * &acc_c;
                    }
                    if !acc_s.is_zero() {
                        *t -= fs * &acc_s;
                    }
                }
                TiltFactors::Symbolic => {
                    // 2 c2 * sum_c: c2^d -> c2^(d+1).
                    if !acc_c.is_zero() {
                        out[target + d + 1] -= fc * &acc_c;
                    }
                    // 2 (1 - c2) * sum_s.
                    if !acc_s.is_zero() {
                        out[target + d] -= fs * &acc_s;
                        out[target + d + 1] += fs * &acc_s;
                    }
                }
            }
        }
    }
    out
}

/// Divides each class of the level by the gcd of its denominator and its
/// numerators.
fn reduce(tables: &Tables, tilt: &TiltFactors, n: usize, mut level: Level) -> Level {
    let classes = tables.bases.pi_halves(n);
    let slots = tilt.slots(n);
    let mut g = level.denominators.clone();
    for (_, v) in &level.rows {
        for (k, x) in v.iter().enumerate() {
            let g = &mut g[classes[k / slots] as usize];
            if *g != 1 && !x.is_zero() {
                g.gcd_mut(x);
            }
        }
    }
    for (e, g) in level.denominators.iter_mut().zip(&g) {
        if *g != 1 {
            e.div_exact_mut(g);
        }
    }
    // Rows live until the end, so they give back what the accumulation over-allocated.
    for (_, v) in &mut level.rows {
        for (k, x) in v.iter_mut().enumerate() {
            let g = &g[classes[k / slots] as usize];
            if *g != 1 && !x.is_zero() {
                x.div_exact_mut(g);
            }
            x.shrink_to_fit();
        }
    }
    level
}

/// `times` * d for each (weight n, d), in the ring, in the given order.
///
/// The coefficients are converted on worker threads, largest first, also
/// on one thread: the rows were made and freed on workers, and the C
/// allocator keeps a thread's freed memory in that thread's arena, so ring
/// elements built on the main thread could not reuse it (at 50 loops that
/// raised the peak by a third).
pub(crate) fn to_exact_all(
    tables: &Tables,
    tilt: &TiltFactors,
    dense: Vec<(usize, Dense)>,
    times: u32,
) -> Vec<Exact> {
    let count = dense.len();
    let mut queue: Vec<(usize, usize, Dense)> = dense
        .into_iter()
        .enumerate()
        .map(|(k, (n, d))| (k, n, d))
        .collect();
    queue.sort_by_key(|(_, n, _)| tables.bases.len(*n));
    let queue = Mutex::new(queue);
    let done: Mutex<Vec<(usize, Exact)>> = Mutex::new(Vec::with_capacity(count));
    let work = || loop {
        let next = queue.lock().unwrap_or_else(|e| e.into_inner()).pop();
        let Some((k, n, d)) = next else { break };
        let e = to_exact(tables, tilt, n, d, times);
        done.lock().unwrap_or_else(|e| e.into_inner()).push((k, e));
    };
    let threads = std::thread::available_parallelism()
        .map_or(1, |n| n.get())
        .clamp(1, 8);
    std::thread::scope(|scope| {
        for _ in 0..threads {
            scope.spawn(work);
        }
    });
    let mut done = done.into_inner().unwrap_or_else(|e| e.into_inner());
    done.sort_by_key(|(k, _)| *k);
    done.into_iter().map(|(_, e)| e).collect()
}

/// `times` * d, the coefficient of weight n, in the ring.
fn to_exact(tables: &Tables, tilt: &TiltFactors, n: usize, d: Dense, times: u32) -> Exact {
    let slots = tilt.slots(n);
    let mut out = Exact::zero();
    for (k, mut x) in d.numerators.into_iter().enumerate() {
        if x.is_zero() {
            continue;
        }
        let (b, e) = (k / slots, k % slots);
        let mut m = tables.bases.monomial(n, b);
        if e > 0 {
            m = m.mul(&Monomial::symbol(super::C2, e as u32));
        }
        x *= times;
        out.add_term(m, Rational::from((x, d.denominator.clone())));
    }
    out
}
