//! Benchmark of `check` (run with `cargo bench --bench check`): a file of 20
//! exact orders checked against a 20-loop prediction, computing the
//! prediction included, best of several runs.

use std::time::{Duration, Instant};

use loopwise::check::check;
use loopwise::input::catalogue::Catalogue;
use loopwise::input::seriesfile::parse_series_text;
use loopwise::kernel::{gamma, Tilt};
use rug::Rational;

fn main() {
    let loops = 20u32;
    let cusp = gamma(
        &Tilt::cos2(Rational::from((1, 2))).unwrap(),
        loops,
        &mut |_, _| {},
    )
    .unwrap();
    let mut text = String::from("prediction: cusp\ncoupling: g2\norders:\n");
    for l in 1..=loops as usize {
        text.push_str(&format!(
            "  - loop: {l}\n    exact: \"{}\"\n",
            cusp.coeff(l)
        ));
    }
    let catalogue = Catalogue::builtin().unwrap();
    let mut best = Duration::MAX;
    for _ in 0..5 {
        let t = Instant::now();
        let file = parse_series_text(&text, "bench.yaml").unwrap();
        let c = check(&file, &catalogue, 30, &mut |_, _, _| {}).unwrap();
        assert!(!c.any_differs());
        best = best.min(t.elapsed());
    }
    println!(
        "check: {} bytes, {loops} exact orders against a {loops}-loop prediction: {:.3} s",
        text.len(),
        best.as_secs_f64()
    );
}
