//! Timings of the finite-coupling engine on three reference workloads
//! (run with `cargo bench --bench numeric`): printed, not asserted.

use std::time::Instant;

use loopwise::numeric::{evaluate, scan, Functional};
use rug::Float;

fn main() {
    let prec = 256;
    let half = Float::with_val(prec, 0.5);
    let one = Float::with_val(prec, 1);
    let quarter = Float::with_val(prec, 0.25);
    let g1 = Float::with_val(prec, 1);

    let runs: [(&str, Functional, &Float); 2] = [
        ("Gamma(c2=1/2), g=1, 30 digits", Functional::Gamma, &half),
        ("Delta(c2=1),   g=1, 30 digits", Functional::Delta, &one),
    ];
    for (label, f, c2) in runs {
        let start = Instant::now();
        match evaluate(f, c2, &g1, 30) {
            Ok(est) => println!(
                "{label}: {:>8.3} s  {}",
                start.elapsed().as_secs_f64(),
                loopwise::report::decimal::supported(&est, 30)
            ),
            Err(e) => println!("{label}: failed: {e}"),
        }
    }

    let couplings: Vec<Float> = (1..=60).map(|k| Float::with_val(prec, k) / 20u32).collect();
    let start = Instant::now();
    let mut ticks = |_done: usize, _total: usize| {};
    match scan(Functional::Gamma, &quarter, &couplings, 15, &mut ticks) {
        Ok(values) => println!(
            "Gamma(c2=1/4), 60 points on g in (0, 3], 15 digits: {:>8.3} s  (last {})",
            start.elapsed().as_secs_f64(),
            values
                .last()
                .map(|e| loopwise::report::decimal::supported(e, 15))
                .unwrap_or_default()
        ),
        Err(e) => println!("scan failed: {e}"),
    }
}
