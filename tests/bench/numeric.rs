//! Timings of the finite-coupling engine on the workloads of issue 10
//! (run with `cargo bench --bench numeric`), and their ratios to the
//! reference point Gamma_cusp at g = 1, 30 digits, all from one run:
//! printed, not asserted.

use std::time::Instant;

use loopwise::numeric::{evaluate, scan, Functional};
use rug::Float;

fn timed(label: &str, f: Functional, c2: &Float, g: f64, digits: u32) -> f64 {
    let gv = Float::with_val(256, g);
    let start = Instant::now();
    let out = evaluate(f, c2, &gv, digits);
    let secs = start.elapsed().as_secs_f64();
    match out {
        Ok(est) => println!(
            "{label}: {secs:>8.3} s  {}",
            loopwise::report::decimal::supported(&est, digits)
        ),
        Err(e) => println!("{label}: failed after {secs:.3} s: {e}"),
    }
    secs
}

fn main() {
    let prec = 256;
    // The cusp is the tilt pi/4, c2 = 1/2; Delta(0) is the tilt 0, c2 = 1;
    // the hexagon's tilt pi/3 has c2 = 1/4.
    let half = Float::with_val(prec, 0.5);
    let one = Float::with_val(prec, 1);
    let quarter = Float::with_val(prec, 0.25);

    let reference = timed(
        "Gamma_cusp g=1,   30 digits",
        Functional::Gamma,
        &half,
        1.0,
        30,
    );
    let mut ratios = Vec::new();
    for g in [5.0, 20.0, 50.0] {
        let label = format!("Gamma_cusp g={g:<3}, 30 digits");
        ratios.push((
            label.clone(),
            timed(&label, Functional::Gamma, &half, g, 30),
        ));
    }
    timed(
        "Delta(0)   g=1,   30 digits",
        Functional::Delta,
        &one,
        1.0,
        30,
    );
    let label = "Delta(0)   g=5,   30 digits".to_string();
    ratios.push((
        label.clone(),
        timed(&label, Functional::Delta, &one, 5.0, 30),
    ));
    let label = "Gamma_cusp g=200, 15 digits".to_string();
    ratios.push((
        label.clone(),
        timed(&label, Functional::Gamma, &half, 200.0, 15),
    ));

    let couplings: Vec<Float> = (0..=50).map(|k| Float::with_val(prec, k) / 10u32).collect();
    let mut ticks = |_done: usize, _total: usize| {};
    for (f, name) in [(Functional::Gamma, "Gamma"), (Functional::Delta, "Delta")] {
        let top = if f == Functional::Gamma { 5 } else { 3 };
        let grid: Vec<Float> = couplings
            .iter()
            .map(|g| Float::with_val(prec, g * top) / 5u32)
            .collect();
        let start = Instant::now();
        let out = scan(f, &quarter, &grid, 15, &mut ticks);
        let secs = start.elapsed().as_secs_f64();
        let label = format!("{name}(pi/3), 51 points on g in [0, {top}], 15 digits");
        match out {
            Ok(_) => println!("{label}: {secs:>8.3} s"),
            Err(e) => println!("{label}: failed: {e}"),
        }
        ratios.push((label, secs));
    }

    println!("\nratios to Gamma_cusp at g = 1, 30 digits ({reference:.3} s):");
    for (label, secs) in ratios {
        println!("  {label}: {:>8.1}x", secs / reference);
    }
}
