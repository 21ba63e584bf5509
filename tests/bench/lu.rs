//! Timings of the fixed-point LU of the finite-coupling engine at the sizes
//! of Delta at strong coupling (run with `cargo bench --bench lu`): printed,
//! not asserted.
//!
//! The factorisation is private to the library, so this harness compiles
//! its source file on its own, with the library's error type as the
//! `crate::error` it names.

mod error {
    pub use loopwise::error::{Error, Result};
}

#[path = "../../src/numeric/matrix/lu.rs"]
mod lu;

use std::time::Instant;

use rug::Float;

/// 1 + D with D_ij = r_ij (1 + 4j/k) e^(-|i-j|/8) / 16, r_ij in [-1, 1] from a
/// linear congruential sequence: the shape of 1 + K', full-precision entries.
fn system(k: usize, prec: u32) -> Vec<Float> {
    let mut state = 7u64;
    (0..k * k)
        .map(|idx| {
            state = state
                .wrapping_mul(6364136223846793005)
                .wrapping_add(1442695040888963407);
            let r = (state >> 11) as f64 / (1u64 << 53) as f64 * 2.0 - 1.0;
            let (i, j) = (idx / k, idx % k);
            let d =
                (1.0 + 4.0 * j as f64 / k as f64) * (-(i.abs_diff(j) as f64) / 8.0).exp() / 16.0;
            let mut v = Float::with_val(prec, r * d);
            v += Float::with_val(prec, Float::with_val(prec, r.abs()).sqrt_ref()) >> 60u32;
            if i == j {
                v += 1u32;
            }
            v
        })
        .collect()
}

fn main() {
    let prec = 190;
    for k in [450, 500] {
        let a = system(k, prec);
        let start = Instant::now();
        let out = lu::factor_nested(a.clone(), k, k * 9 / 10, prec);
        let nested = start.elapsed().as_secs_f64();
        let start = Instant::now();
        let whole = lu::factor(a, k, prec);
        let single = start.elapsed().as_secs_f64();
        match (out, whole) {
            (Ok((block, _)), Ok(whole)) => println!(
                "k = {k}, {prec} bits: factor_nested {nested:.3} s, factor {single:.3} s \
                 (block inverse (1,1) {:.6}, ln det {:.6}, inverse row/column {}/{})",
                block.inv11.to_f64(),
                whole.ln_det.to_f64(),
                whole.first_row.len(),
                whole.first_column.len()
            ),
            (Err(e), _) | (_, Err(e)) => println!("k = {k}: failed: {e}"),
        }
    }
}
