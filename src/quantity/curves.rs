//! The curves of a figure: each quantity at finite coupling, and beside it
//! its truncated weak-coupling sums, a diagonal Padé approximant in g^2 and
//! its strong-coupling expansion (from a threshold coupling on). Curves are
//! computed over the whole range and left uncut: the figure printer of
//! `report` clips them at its frame. f64 is enough here, since a figure is
//! presentation.

use rug::Float;

use super::finite;
use super::Quantity;
use crate::error::Result;
use crate::input::catalogue::Status;

/// What a curve shows; the printer names and styles it from this.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum CurveKind {
    /// The finite-coupling values of the numerical engine.
    Finite,
    /// The weak-coupling series summed through this loop order.
    Weak(u32),
    /// The [n/n] Padé approximant in g^2 of the weak-coupling series.
    Pade(usize),
    /// The catalogue's strong-coupling expansion, from `Figure::strong_from` on.
    Strong { conjecture: bool },
}

/// One curve of a figure.
#[derive(Debug, Clone, PartialEq)]
pub struct Curve {
    /// Index of the quantity (in the order given) the curve belongs to.
    pub quantity: usize,
    pub kind: CurveKind,
    pub points: Vec<(f64, f64)>,
}

/// The smallest coupling at which a strong-coupling expansion is drawn,
/// unless the user says otherwise. The catalogue's expansions are
/// asymptotic series in 1/g whose leading omitted corrections are
/// exponentially small only once g is of order one, and some of their terms
/// (-catalan/(8 pi^2 g) of the cusp, log(8 pi g) of the octagon constant)
/// diverge as g -> 0. At g = 1/2 the cusp's three terms are within 1.3 % of
/// its finite-coupling value (0.6458 against 0.6539, `loopwise at cusp`),
/// at g = 1/4 they are 43 % off (0.1226 against 0.2133): below 1/2 the curve
/// would only show where the expansion is meaningless.
pub const STRONG_FROM: f64 = 0.5;

/// What to draw besides the finite-coupling values.
pub struct Companions {
    /// Truncations of the weak-coupling series, by loop order.
    pub loops: Vec<u32>,
    /// The [n/n] Padé approximant in g^2.
    pub pade: Option<usize>,
    /// The catalogue's strong-coupling expansion, where it has one.
    pub strong: bool,
    /// The strong-coupling expansions start at this coupling
    /// ([`STRONG_FROM`] unless the user chose another).
    pub strong_from: f64,
}

/// The curves, and notes on what was left out and why (for stderr).
pub struct Figure {
    pub curves: Vec<Curve>,
    /// Where the strong-coupling curves start.
    pub strong_from: f64,
    pub notes: Vec<String>,
}

/// Digits of the finite-coupling values of a figure: far beyond what a
/// pixel resolves.
const FIGURE_DIGITS: u32 = 10;

/// Computes every curve of the figure of `quantities` over `couplings`.
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
    for (k, q) in quantities.iter().enumerate() {
        let values = finite::values(q, couplings, FIGURE_DIGITS, &mut |d, t| {
            progress(&q.label, d, t)
        })?;
        let points = xs
            .iter()
            .zip(&values)
            .map(|(x, e)| (*x, e.value.to_f64()))
            .collect();
        curves.push(Curve {
            quantity: k,
            kind: CurveKind::Finite,
            points,
        });
    }
    for (k, q) in quantities.iter().enumerate() {
        curves.extend(expansions(k, q, couplings, companions, prec, &mut notes)?);
    }
    Ok(Figure {
        curves,
        strong_from: companions.strong_from,
        notes,
    })
}

/// The weak-coupling sums, the Padé approximant and the strong-coupling
/// expansion of the `k`-th quantity, uncut.
fn expansions(
    k: usize,
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
                quantity: k,
                kind: CurveKind::Weak(l),
                points,
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
                quantity: k,
                kind: CurveKind::Pade(n),
                points,
            });
        }
    }
    if companions.strong {
        if let Some(sc) = q.entry.as_ref().and_then(|e| e.strong_coupling.as_ref()) {
            let mut points = Vec::new();
            for (x, g) in xs.iter().zip(couplings) {
                if *x >= companions.strong_from && *x > 0.0 {
                    if let Some(v) = finite::strong_coupling(q, g, prec)? {
                        points.push((*x, v.to_f64()));
                    }
                }
            }
            if points.len() >= 2 {
                out.push(Curve {
                    quantity: k,
                    kind: CurveKind::Strong {
                        conjecture: sc.status == Status::Conjecture,
                    },
                    points,
                });
            } else {
                notes.push(format!(
                    "{}: strong-coupling curve left out: it is drawn from g = {} on, and the range has fewer than two couplings there",
                    q.label, companions.strong_from
                ));
            }
        }
    }
    Ok(out)
}
