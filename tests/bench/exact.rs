//! Benchmark of the exact engine (run with `cargo bench --bench exact`):
//! Gamma(pi/4) at 16, 24, 30 and 40 loops and the symbolic Gamma(c2) at 16
//! loops, best of several runs, with the process's peak memory; then the
//! measurement behind the choice of GMP (rug) over num-bigint for the
//! integer multiply-adds of the recursion.

use std::time::{Duration, Instant};

use loopwise::kernel::{gamma, Tilt};
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

fn main() {
    let cusp = Tilt::cos2(Rational::from((1, 2))).unwrap();
    println!(
        "exact engine, release build, {} threads",
        std::thread::available_parallelism().map_or(1, |n| n.get())
    );
    for (label, tilt, loops, runs) in [
        ("Gamma(c2) symbolic", Tilt::Symbolic, 16u32, 5usize),
        ("Gamma(pi/4)", cusp.clone(), 16, 10),
        ("Gamma(pi/4)", cusp.clone(), 24, 5),
        ("Gamma(pi/4)", cusp.clone(), 30, 3),
        ("Gamma(pi/4)", cusp.clone(), 40, 1),
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
    integer_backends();
}
