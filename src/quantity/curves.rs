//! The curves of a figure: each quantity at finite coupling, and beside it
//! its truncated weak-coupling sums, a diagonal Padé approximant in g^2 and
//! its strong-coupling expansion, cut where they leave the window of the
//! finite-coupling curves. The figure is drawn by the SVG printer of `report`;
//! f64 is enough here, since a figure is presentation.

use rug::Float;

use super::finite;
use super::Quantity;
use crate::error::Result;
use crate::input::catalogue::Status;

/// One curve of a figure.
#[derive(Debug, Clone, PartialEq)]
pub struct Curve {
    pub name: String,
    pub points: Vec<(f64, f64)>,
    /// Expansions and approximants are dashed; finite-coupling values solid.
    pub dashed: bool,
}

/// What to draw besides the finite-coupling values.
pub struct Companions {
    /// Truncations of the weak-coupling series, by loop order.
    pub loops: Vec<u32>,
    /// The [n/n] Padé approximant in g^2.
    pub pade: Option<usize>,
    /// The catalogue's strong-coupling expansion, where it has one.
    pub strong: bool,
}

/// The curves, and notes on what was left out and why (for stderr).
pub struct Figure {
    pub title: String,
    pub curves: Vec<Curve>,
    pub notes: Vec<String>,
}

/// Digits of the finite-coupling values of a figure: far beyond what a
/// pixel resolves.
const FIGURE_DIGITS: u32 = 10;

pub fn figure(
    quantities: &[Quantity],
    couplings: &[Float],
    companions: &Companions,
    progress: &mut dyn FnMut(&str, usize, usize),
) -> Result<Figure> {
    let prec = crate::numeric::working_bits(FIGURE_DIGITS);
    let xs: Vec<f64> = couplings.iter().map(Float::to_f64).collect();
    let mut curves = Vec::new();
    let mut notes = Vec::new();
    let mut window = (f64::INFINITY, f64::NEG_INFINITY);
    for q in quantities {
        let values = finite::values(q, couplings, FIGURE_DIGITS, &mut |d, t| {
            progress(&q.label, d, t)
        })?;
        let points: Vec<(f64, f64)> = xs
            .iter()
            .zip(&values)
            .map(|(x, e)| (*x, e.value.to_f64()))
            .collect();
        for p in &points {
            window = (window.0.min(p.1), window.1.max(p.1));
        }
        curves.push(Curve {
            name: format!("{} (finite coupling)", q.label),
            points,
            dashed: false,
        });
    }
    let mut extra = Vec::new();
    for q in quantities {
        extra.extend(expansions(q, couplings, companions, prec, &mut notes)?);
    }
    // Truncated series leave the picture quickly; cut each extra curve where
    // it leaves the window of the finite-coupling curves (plus a quarter of
    // its height) so that the figure stays readable.
    let margin = 0.25 * (window.1 - window.0).max(1e-12);
    let inside = |y: f64| y >= window.0 - margin && y <= window.1 + margin;
    for mut c in extra {
        let keep: Vec<(f64, f64)> = c
            .points
            .iter()
            .copied()
            .skip_while(|p| !inside(p.1))
            .take_while(|p| inside(p.1))
            .collect();
        if keep.len() >= 2 {
            c.points = keep;
            curves.push(c);
        } else {
            notes.push(format!(
                "{}: left out, fewer than two of its points lie near the finite-coupling curves",
                c.name
            ));
        }
    }
    let names: Vec<&str> = quantities.iter().map(|q| q.label.as_str()).collect();
    Ok(Figure {
        title: format!("{} vs g, with g^2 = lambda/(16 pi^2)", names.join(", ")),
        curves,
        notes,
    })
}

/// The weak-coupling sums, the Padé approximant and the strong-coupling
/// expansion of one quantity, uncut.
fn expansions(
    q: &Quantity,
    couplings: &[Float],
    companions: &Companions,
    prec: u32,
    notes: &mut Vec<String>,
) -> Result<Vec<Curve>> {
    let xs: Vec<f64> = couplings.iter().map(Float::to_f64).collect();
    let mut out = Vec::new();
    let highest = companions
        .loops
        .iter()
        .copied()
        .max()
        .unwrap_or(0)
        .max(companions.pade.map_or(0, |n| 2 * n as u32));
    let coeffs = if highest == 0 {
        None
    } else {
        match q.expand(highest, &mut |_, _, _| {}) {
            Ok(series) => Some(finite::weak_coefficients(&series, prec)?),
            // The finite-coupling engine takes any real tilt, the exact
            // one only some: what it cannot expand is left out, not the figure.
            Err(e) => {
                notes.push(format!(
                    "{}: weak-coupling curves left out (the finite-coupling curve is drawn): {e}",
                    q.label
                ));
                None
            }
        }
    };
    if let Some(coeffs) = &coeffs {
        for &l in &companions.loops {
            let points = xs
                .iter()
                .zip(couplings)
                .map(|(x, g)| (*x, finite::weak_sum(coeffs, l as usize, g).to_f64()))
                .collect();
            out.push(Curve {
                name: format!("{} weak coupling, {l} loops", q.label),
                points,
                dashed: true,
            });
        }
        if let Some(n) = companions.pade {
            let pade = finite::pade_in_g2(&coeffs[..=2 * n], n, n)?;
            let points = xs
                .iter()
                .zip(couplings)
                .map(|(x, g)| {
                    (
                        *x,
                        pade.eval(&Float::with_val(prec, g.square_ref())).to_f64(),
                    )
                })
                .collect();
            out.push(Curve {
                name: format!("{} Padé [{n}/{n}] in g^2", q.label),
                points,
                dashed: true,
            });
        }
    }
    if companions.strong {
        if let Some(sc) = q.entry.as_ref().and_then(|e| e.strong_coupling.as_ref()) {
            let mut points = Vec::new();
            for (x, g) in xs.iter().zip(couplings) {
                if *x > 0.0 {
                    if let Some(v) = finite::strong_coupling(q, g, prec)? {
                        points.push((*x, v.to_f64()));
                    }
                }
            }
            let tag = if sc.status == Status::Conjecture {
                " (conjecture)"
            } else {
                ""
            };
            out.push(Curve {
                name: format!("{} strong coupling{tag}", q.label),
                points,
                dashed: true,
            });
        }
    }
    Ok(out)
}
