//! A plain timing of the parser: 10,000 expressions, one per line, as a user
//! would keep them in a file of pasted coefficients. Run with
//! `cargo bench --bench parse`; the target is under 0.5 s in a release build.

use std::time::Instant;

use loopwise::input::expr::parse;
use loopwise::input::seriesfile::parse_series_text;

/// Deterministic pseudo-random numbers (a 64-bit linear congruential step
/// with Knuth's MMIX constants), so every run times the same text.
struct Lcg(u64);

impl Lcg {
    fn next(&mut self, below: u64) -> u64 {
        self.0 = self
            .0
            .wrapping_mul(6364136223846793005)
            .wrapping_add(1442695040888963407);
        (self.0 >> 33) % below
    }
}

fn term(r: &mut Lcg) -> String {
    let coefficient = match r.next(4) {
        0 => format!("{}", r.next(100_000)),
        1 => format!("{}/{}", r.next(10_000) + 1, r.next(10_000) + 1),
        2 => format!("{}.{}({})", r.next(10_000), r.next(1000), r.next(9) + 1),
        _ => format!("{}.{}e-{}", r.next(10), r.next(1000), r.next(20)),
    };
    let factor = match r.next(8) {
        0 => format!("zeta({})^{}", r.next(9) + 2, r.next(3) + 1),
        1 => format!("Zeta[{},{}]", r.next(5) + 2, r.next(5) + 1),
        2 => format!("pi^{}", 2 * (r.next(5) + 1)),
        3 => "log(2)".to_string(),
        4 => format!("Gamma(pi/{})", r.next(6) + 1),
        5 => format!("Delta(c2={}/{})", r.next(5) + 1, r.next(5) + 2),
        6 => format!("l1 l2^{} (1 - l3)", r.next(3) + 1),
        _ => format!("z{} catalan", 2 * r.next(5) + 3),
    };
    format!("{coefficient} {factor}")
}

fn main() {
    let mut r = Lcg(2026);
    let lines: Vec<String> = (0..10_000)
        .map(|_| {
            let n = r.next(8) + 1;
            let terms: Vec<String> = (0..n).map(|_| term(&mut r)).collect();
            let mut line = terms.join(" + ");
            if r.next(2) == 0 {
                line = format!("-({line})");
            }
            line
        })
        .collect();
    let file = lines.join("\n");

    let start = Instant::now();
    let mut nodes = 0usize;
    for (i, line) in file.lines().enumerate() {
        match parse(line, "bench.txt", Some((i + 1, 1))) {
            Ok(e) => nodes += usize::from(e.span.end > e.span.start),
            Err(e) => panic!("generated line {} did not parse:\n{e}", i + 1),
        }
    }
    let elapsed = start.elapsed();
    println!(
        "parsed 10000 expressions ({} bytes) in {:.3} s ({:.1} us each); target < 0.5 s in release",
        file.len(),
        elapsed.as_secs_f64(),
        elapsed.as_secs_f64() * 1e6 / 10_000.0
    );
    assert_eq!(nodes, 10_000);

    // The same coefficients as a series file of 200 orders, read 50 times.
    let mut yaml = String::from("coupling: g2\nsymbols: [l1, l2, l3]\norders:\n");
    for (i, line) in lines.iter().take(200).enumerate() {
        yaml.push_str(&format!("  - loop: {}\n    exact: \"{line}\"\n", i + 1));
    }
    let start = Instant::now();
    for _ in 0..50 {
        let f = parse_series_text(&yaml, "bench.yaml").unwrap_or_else(|e| panic!("{e}"));
        assert_eq!(f.orders.len(), 200);
    }
    println!(
        "read a 200-order series file ({} bytes) 50 times in {:.3} s",
        yaml.len(),
        start.elapsed().as_secs_f64()
    );
}
