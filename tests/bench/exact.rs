//! Benchmark of the exact engine (run with `cargo bench --bench exact`):
//! Gamma(pi/4) at 16, 24, 30 and 40 loops and the symbolic Gamma(c2) at 16
//! loops; the plain anchor recursion at 30 and 36 loops, the reference point
//! of the ratios; `loopwise expand cusp --format json` end to end at 36, 40
//! and 50 loops, with the share of printing and evaluating the decimal values
//! at 40 loops; then the measurement behind the choice of GMP (rug) over
//! num-bigint for the integer multiply-adds of the recursion. Times are best
//! of several runs, memory is peak resident set size.

use std::collections::HashMap;
use std::process::Command;
use std::time::{Duration, Instant};

use loopwise::exact::coupling::Coupling;
use loopwise::exact::powerseries::Series;
use loopwise::exact::ring::{EvenStyle, Exact, Monomial};
use loopwise::input::catalogue::Catalogue;
use loopwise::kernel::{entry, gamma, Tilt};
use loopwise::quantity::Quantity;
use loopwise::report::expansion::Expansion;
use loopwise::report::Format;
use rug::ops::Pow;
use rug::Rational;

fn best_of(runs: usize, f: &mut dyn FnMut()) -> Duration {
    (0..runs)
        .map(|_| {
            let t = Instant::now();
            f();
            t.elapsed()
        })
        .min()
        .unwrap_or_default()
}

fn peak_rss_mib() -> Option<f64> {
    let status = std::fs::read_to_string("/proc/self/status").ok()?;
    let line = status.lines().find(|l| l.starts_with("VmHWM:"))?;
    let kib: f64 = line.split_whitespace().nth(1)?.parse().ok()?;
    Some(kib / 1024.0)
}

/// THE ANCHOR: a deliberately plain implementation of the recursion of
/// docs/conventions.md section 3, R^(0) = e_1, R^(n)_i = -sum_p sum_j
/// t_ij K^(p)_ij R^(n-p)_j, for Gamma = 4 g^2 R_1, without the engine's
/// tricks: every coefficient is a hash map from exponent vectors (pi,
/// zeta(3), zeta(5), ...) to GMP rationals, reduced after every operation,
/// on one thread. It keeps only the finite truncation any implementation
/// needs (R^(n)_i reaches the answer only if n + i + 1 <= top, since K_ij
/// starts at g^(i+j)) and skips the entries that vanish.
mod anchor {
    use super::*;

    type Key = Vec<u16>;
    type Coefficient = HashMap<Key, Rational>;

    /// Coefficients of g^(2L), L = 1..=loops, of Gamma at cos^2(alpha) = c2.
    pub fn gamma(c2: &Rational, loops: u32) -> Vec<Coefficient> {
        let top = 2 * loops as usize - 2;
        let two_c2 = Rational::from(c2 * 2u32);
        let two_s2 = Rational::from(2) - two_c2.clone();
        // kernel[p][i][j] = t_ij K^(p)_ij / M_p for i + j <= p.
        let mut kernel: Vec<Vec<Vec<Rational>>> = vec![Vec::new(); top + 1];
        for (p, row) in kernel.iter_mut().enumerate().skip(2) {
            *row = (0..p)
                .map(|i| {
                    (0..=p - i)
                        .map(|j| {
                            if i == 0 || j == 0 {
                                return Rational::new();
                            }
                            let t = if i % 2 == 0 && j % 2 == 1 {
                                &two_s2
                            } else {
                                &two_c2
                            };
                            entry(i as u32, j as u32, p as u32) * t
                        })
                        .collect()
                })
                .collect();
        }
        // r[n][i]: R^(n)_i, i = 1.. (index 0 unused).
        let mut r: Vec<Vec<Coefficient>> = Vec::with_capacity(top + 1);
        let mut start = vec![Coefficient::new(); top + 1];
        start[1].insert(vec![0], Rational::from(1));
        r.push(start);
        for n in 1..=top {
            let last = if n == top {
                1
            } else {
                top.saturating_sub(n + 1)
            };
            let mut level = vec![Coefficient::new(); last + 1];
            for (i, out) in level.iter_mut().enumerate().skip(1) {
                for p in (i + 1)..=n {
                    for j in 1..=(p - i).min(r[n - p].len() - 1) {
                        let k = &kernel[p][i][j];
                        if *k == 0 {
                            continue;
                        }
                        for (key, v) in &r[n - p][j] {
                            let target = times_kernel_factor(key, p);
                            let add = -Rational::from(k * v);
                            let slot = out.entry(target).or_default();
                            *slot += add;
                        }
                    }
                }
                out.retain(|_, v| *v != 0);
            }
            r.push(level);
        }
        (1..=loops as usize)
            .map(|l| {
                r[2 * l - 2][1]
                    .iter()
                    .map(|(k, v)| (k.clone(), Rational::from(v * 4u32)))
                    .collect()
            })
            .collect()
    }

    /// The exponent vector times M_p: pi^p for even p, zeta(p) for odd p.
    fn times_kernel_factor(key: &Key, p: usize) -> Key {
        let slot = if p % 2 == 0 { 0 } else { (p - 1) / 2 };
        let mut out = key.clone();
        if out.len() <= slot {
            out.resize(slot + 1, 0);
        }
        out[slot] += if p % 2 == 0 { p as u16 } else { 1 };
        out
    }

    /// The anchor's coefficient in the ring, to compare with the engine's.
    pub fn to_exact(c: &Coefficient) -> Exact {
        let mut out = Exact::zero();
        for (key, v) in c {
            let zetas = key
                .iter()
                .enumerate()
                .skip(1)
                .flat_map(|(k, &e)| std::iter::repeat_n(2 * k as u32 + 1, e as usize))
                .collect();
            out.add_term(
                Monomial::from_parts(key[0] as i32, zetas, Vec::new()),
                v.clone(),
            );
        }
        out
    }
}

/// sum_k a_k * b_k over numbers of the size the recursion meets at 40 loops
/// (about 400-bit numerators), GMP against num-bigint.
fn integer_backends() {
    use num_bigint::BigInt;
    let n = 20_000;
    let seed = rug::Integer::from(3u32).pow(250) + 12345u32;
    let a: Vec<rug::Integer> = (0..n)
        .map(|k| rug::Integer::from(&seed * (k + 1)) - 7u32 * k)
        .collect();
    let b: Vec<rug::Integer> = (0..n).map(|k| rug::Integer::from(k * 31 + 17)).collect();
    let an: Vec<BigInt> = a.iter().map(|x| x.to_string().parse().unwrap()).collect();
    let bn: Vec<BigInt> = b.iter().map(|x| x.to_string().parse().unwrap()).collect();
    let mut r1 = rug::Integer::new();
    let t_rug = best_of(5, &mut || {
        let mut acc = rug::Integer::new();
        for (x, y) in a.iter().zip(&b) {
            acc += x * y;
        }
        r1 = acc;
    });
    let mut r2 = BigInt::default();
    let t_num = best_of(5, &mut || {
        let mut acc = BigInt::default();
        for (x, y) in an.iter().zip(&bn) {
            acc += x * y;
        }
        r2 = acc;
    });
    assert_eq!(r1.to_string(), r2.to_string());
    println!(
        "integer multiply-add, {n} terms of ~400 bits: rug (GMP) {:.3} ms, num-bigint {:.3} ms",
        t_rug.as_secs_f64() * 1e3,
        t_num.as_secs_f64() * 1e3
    );
}

/// `loopwise expand cusp --loops L --format json` as a process: wall time
/// and, when /usr/bin/time is there to measure it, peak memory in MiB.
fn end_to_end(loops: u32) -> (Duration, Option<f64>) {
    let binary = env!("CARGO_BIN_EXE_loopwise");
    let args = [
        "expand",
        "cusp",
        "--loops",
        &loops.to_string(),
        "--format",
        "json",
    ];
    let timer = std::path::Path::new("/usr/bin/time");
    let t = Instant::now();
    let output = if timer.exists() {
        Command::new(timer)
            .args(["-f", "%M"])
            .arg(binary)
            .args(args)
            .output()
    } else {
        Command::new(binary).args(args).output()
    }
    .expect("the loopwise binary runs");
    let elapsed = t.elapsed();
    assert!(output.status.success(), "expand at {loops} loops failed");
    let kib = String::from_utf8_lossy(&output.stderr)
        .lines()
        .last()
        .and_then(|l| l.trim().parse::<f64>().ok());
    (elapsed, kib.map(|k| k / 1024.0))
}

/// The library path of `expand cusp --format json` at `loops`, split into
/// the engine (the series) and the report (exact text and decimal values).
fn phases(loops: u32) -> (Duration, Duration) {
    let catalogue = Catalogue::builtin().unwrap();
    let quantity = Quantity::resolve("cusp", &catalogue).unwrap();
    let t = Instant::now();
    let series: Series = quantity.expand(loops, &mut |_, _, _| {}).unwrap();
    let engine = t.elapsed();
    let t = Instant::now();
    let report = Expansion::new(
        &quantity.label,
        &quantity.definition,
        quantity.entry.clone(),
        series,
        Coupling::G2,
        EvenStyle::Pi,
        20,
    );
    let text = report.render(Format::Json).unwrap();
    let printing = t.elapsed();
    assert!(text.len() > 1000);
    (engine, printing)
}

fn main() {
    let c2 = Rational::from((1, 2));
    let cusp = Tilt::cos2(c2.clone()).unwrap();
    println!(
        "exact engine, release build, {} threads",
        std::thread::available_parallelism().map_or(1, |n| n.get())
    );
    for (label, tilt, loops, runs) in [
        ("Gamma(c2) symbolic", Tilt::Symbolic, 16u32, 5usize),
        ("Gamma(pi/4)", cusp.clone(), 16, 10),
        ("Gamma(pi/4)", cusp.clone(), 24, 5),
        ("Gamma(pi/4)", cusp.clone(), 30, 3),
        ("Gamma(pi/4)", cusp.clone(), 36, 3),
        ("Gamma(pi/4)", cusp.clone(), 40, 2),
    ] {
        let t = best_of(runs, &mut || {
            gamma(&tilt, loops, &mut |_, _| {}).unwrap();
        });
        println!(
            "{label:<20} {loops:>2} loops: {:>9.3} s   (peak RSS so far {:.0} MiB)",
            t.as_secs_f64(),
            peak_rss_mib().unwrap_or(f64::NAN)
        );
    }

    let mut anchor_36 = Duration::ZERO;
    for (loops, runs) in [(30u32, 2usize), (36, 1)] {
        let mut result = Vec::new();
        let t = best_of(runs, &mut || result = anchor::gamma(&c2, loops));
        let engine = gamma(&cusp, loops, &mut |_, _| {}).unwrap();
        for (l, c) in result.iter().enumerate() {
            assert_eq!(
                anchor::to_exact(c),
                *engine.coeff(l + 1),
                "anchor and engine at {} loops",
                l + 1
            );
        }
        println!(
            "anchor recursion     {loops:>2} loops: {:>9.3} s   (agrees with the engine)",
            t.as_secs_f64()
        );
        anchor_36 = t;
    }

    let (engine, printing) = (0..2)
        .map(|_| phases(40))
        .min_by_key(|(e, p)| *e + *p)
        .unwrap_or_default();
    println!(
        "expand cusp 40 loops in the library: engine {:.3} s, report {:.3} s ({:.0}% of the engine)",
        engine.as_secs_f64(),
        printing.as_secs_f64(),
        100.0 * printing.as_secs_f64() / engine.as_secs_f64()
    );

    for (loops, runs) in [(36u32, 3usize), (40, 2), (50, 1)] {
        let (t, mib) = (0..runs)
            .map(|_| end_to_end(loops))
            .min_by_key(|(t, _)| *t)
            .unwrap_or_default();
        let memory = mib.map_or("not measured".to_string(), |m| format!("{m:.0} MiB peak"));
        let ratio = if loops == 36 {
            format!(
                ", {:.2}x the anchor's {:.3} s",
                t.as_secs_f64() / anchor_36.as_secs_f64(),
                anchor_36.as_secs_f64()
            )
        } else {
            String::new()
        };
        println!(
            "loopwise expand cusp --loops {loops} --format json: {:.3} s, {memory}{ratio}",
            t.as_secs_f64()
        );
    }
    integer_backends();
}
