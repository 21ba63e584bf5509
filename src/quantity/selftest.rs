//! The self-test: the exact engine's weak-coupling series, summed, against
//! the numerical engine at small coupling, for four tilts and both
//! functionals. Two independent computations of one function agreeing
//! within a stated bound is the check.

use rug::ops::Pow;
use rug::{Float, Rational};

use super::finite;
use crate::error::{Error, Result};
use crate::kernel::{Functional, Tilt};
use crate::numeric::{self, Estimate};

/// One comparison.
pub struct SelfCheck {
    pub label: String,
    pub g: f64,
    /// The weak-coupling series summed through `LOOPS` loops.
    pub weak: Float,
    pub numeric: Estimate,
    /// The numerical error estimate plus the truncation bound of the sum.
    pub bound: Float,
}

impl SelfCheck {
    pub fn difference(&self) -> Float {
        Float::with_val(128, &self.weak - &self.numeric.value).abs()
    }

    pub fn passes(&self) -> bool {
        self.difference() <= self.bound
    }
}

/// Loop orders summed: at g = 0.15 the first omitted term is about
/// (0.15/0.25)^50 ~ 1e-11 of the first one for a series of radius 1/4, and
/// the bound adds it, so the comparison stays sharp without long expansions.
pub const LOOPS: u32 = 24;

/// The couplings compared, well inside the radius of convergence 1/4.
pub const COUPLINGS: [f64; 3] = [0.05, 0.1, 0.15];

/// Sums the exact series and compares with the numerical engine. The bound
/// is the numerical error estimate plus the first omitted term times the
/// geometric factor 1/(1 - (g/0.25)^2) of a series with radius 1/4
/// (docs/conventions.md section 4).
pub fn self_checks(progress: &mut dyn FnMut(&str, usize, usize)) -> Result<Vec<SelfCheck>> {
    let prec = 200;
    let tilts = [
        ("0", (0, 1)),
        ("pi/6", (1, 6)),
        ("pi/4", (1, 4)),
        ("pi/3", (1, 3)),
    ];
    let mut out = Vec::new();
    for (name, (n, d)) in tilts {
        let tilt = Tilt::pi_multiple(&Rational::from((n, d)))?;
        let c2 = match &tilt {
            Tilt::Cos2(c) => Float::with_val(prec, c),
            Tilt::Symbolic => return Err(Error::numeric("selftest needs rational tilts")),
        };
        for f in [Functional::Gamma, Functional::Delta] {
            let label = format!("{}({name})", f.name());
            let series =
                crate::kernel::expand(f, &tilt, LOOPS + 1, &mut |d, t| progress(&label, d, t))?;
            let coeffs = finite::weak_coefficients(&series, prec)?;
            for g in COUPLINGS {
                let gf = Float::with_val(prec, g);
                let weak = finite::weak_sum(&coeffs, LOOPS as usize, &gf);
                let next = Float::with_val(prec, coeffs[LOOPS as usize + 1].abs_ref())
                    * Float::with_val(prec, &gf).pow(2 * (LOOPS + 1));
                let q = (g / 0.25) * (g / 0.25);
                let numeric = numeric::evaluate(f, &c2, &gf, 30)?;
                let bound = Float::with_val(prec, &numeric.error) + next / (1.0 - q);
                out.push(SelfCheck {
                    label: label.clone(),
                    g,
                    weak,
                    numeric,
                    bound,
                });
            }
        }
    }
    Ok(out)
}
