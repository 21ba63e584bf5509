//! The usual slips, tested one by one when orders differ: another coupling
//! convention (ratios 2^L or (16 pi^2)^L), the scaling function f = 2 Gamma
//! instead of Gamma, an overall sign, loop orders shifted by one, a single
//! mistyped order, a coefficient whose transcendental weight is not the
//! prediction's. A slip is claimed only when it makes every supplied order
//! agree; when only one order is supplied, the claim says it rests on it.

use std::fmt;

use rug::Rational;

use super::{judge, Supplied, Verdict};
use crate::error::Result;
use crate::exact::coupling::Coupling;
use crate::exact::powerseries::Series;
use crate::exact::ring::Exact;

/// What the diagnosis found.
#[derive(Clone, Debug, PartialEq)]
pub enum Diagnosis {
    /// One hypothesis makes every supplied order agree; `orders` is how many
    /// supplied orders it was tested on.
    Explained { text: String, orders: usize },
    /// All orders but this one agree.
    Typo { loop_order: u32, agreeing: usize },
    /// An exact coefficient whose weights are not the prediction's.
    /// Weights are those of the coefficient of g^(2L); `declared` says
    /// whether that needs saying (only lambda rescales by powers of pi).
    Weight {
        loop_order: u32,
        found: Vec<i64>,
        expected: Vec<i64>,
        declared: Coupling,
    },
}

impl fmt::Display for Diagnosis {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            Diagnosis::Explained { text, orders: 1 } => write!(
                f,
                "{text} (this rests on one supplied order only: a single number cannot tell a slip from a \
                 coincidence; more orders would confirm or rule it out)"
            ),
            Diagnosis::Explained { text, .. } => f.write_str(text),
            Diagnosis::Typo { loop_order, agreeing } => {
                write!(f, "order {loop_order} looks like a slip in that order alone: the other {agreeing} orders agree")
            }
            Diagnosis::Weight { loop_order, found, expected, declared } => {
                let list = |w: &[i64]| w.iter().map(i64::to_string).collect::<Vec<_>>().join(", ");
                if found.len() > 1 {
                    write!(f, "order {loop_order} mixes transcendental weights {}; the prediction has weight {}", list(found), list(expected))
                } else {
                    write!(f, "order {loop_order} has transcendental weight {}; the prediction has weight {}", list(found), list(expected))
                }?;
                if *declared == Coupling::Lambda {
                    f.write_str(" (counted on the coefficient of g^(2L), without the pi^(-2L) of lambda)")?;
                }
                Ok(())
            }
        }
    }
}

/// One hypothesis: the user's order L holds factor * (prediction in
/// `coupling`) at order L + shift.
struct Hypothesis {
    coupling: Coupling,
    factor: Rational,
    shift: i32,
}

impl Hypothesis {
    fn describe(&self, declared: Coupling) -> String {
        let mut parts = Vec::new();
        if self.coupling != declared {
            parts.push(format!(
                "the coefficients follow the convention {} ({}) although the file says `coupling: {}`",
                self.coupling.name(),
                self.coupling.meaning(),
                declared.name()
            ));
        }
        let f = &self.factor;
        if *f == 2 {
            parts.push("every coefficient is twice the prediction: the scaling function f = 2 Gamma rather than Gamma?".into());
        } else if *f == Rational::from((1, 2)) {
            parts.push(
                "every coefficient is half the prediction: Gamma where f = 2 Gamma was expected?"
                    .into(),
            );
        } else if *f == -1 {
            parts.push("every coefficient has the opposite sign: an overall sign slip".into());
        } else if *f == -2 || *f == Rational::from((-1, 2)) {
            parts.push(format!("every coefficient is {f} times the prediction: a sign slip and a factor 2 (f = 2 Gamma?)"));
        }
        match self.shift {
            1 => parts.push(
                "the file's order L holds the prediction's order L+1: loop orders shifted by one"
                    .into(),
            ),
            -1 => parts.push(
                "the file's order L holds the prediction's order L-1: loop orders shifted by one"
                    .into(),
            ),
            _ => {}
        }
        parts.join("; and ")
    }
}

/// Tests the slips; `prediction_g2` must reach one order beyond the file.
pub fn diagnose(
    supplied: &[(u32, Supplied)],
    prediction_g2: &Series,
    declared: Coupling,
    digits: u32,
) -> Result<Vec<Diagnosis>> {
    let mut out = Vec::new();
    let baseline = Hypothesis {
        coupling: declared,
        factor: Rational::from(1),
        shift: 0,
    };
    let verdicts = verdicts_under(&baseline, supplied, prediction_g2, digits)?;
    if !verdicts
        .iter()
        .any(|v| v.as_ref().is_some_and(Verdict::differs))
    {
        return Ok(out);
    }
    // A single order is tested too: the usual slips are few, so one that
    // turns the only order into agreement is worth naming, with the caveat
    // that it rests on that order.
    for h in hypotheses(declared) {
        let v = verdicts_under(&h, supplied, prediction_g2, digits)?;
        if v.iter().all(|v| v.as_ref().is_some_and(Verdict::agrees)) {
            out.push(Diagnosis::Explained {
                text: h.describe(declared),
                orders: supplied.len(),
            });
        }
    }
    let differing: Vec<usize> = (0..verdicts.len())
        .filter(|&k| verdicts[k].as_ref().is_some_and(Verdict::differs))
        .collect();
    let agreeing = verdicts
        .iter()
        .filter(|v| v.as_ref().is_some_and(Verdict::agrees))
        .count();
    if out.is_empty() && differing.len() == 1 && agreeing >= 2 {
        out.push(Diagnosis::Typo {
            loop_order: supplied[differing[0]].0,
            agreeing,
        });
    }
    // A slip that explains every order explains their weights too. Weights
    // are compared in g^2, where the predictions have uniform weight: in
    // lambda every coefficient carries pi^(-2L), which says nothing about
    // the order itself.
    if out.iter().any(|d| matches!(d, Diagnosis::Explained { .. })) {
        return Ok(out);
    }
    for &k in &differing {
        let (l, s) = &supplied[k];
        if let (Supplied::Exact(x), true) = (s, (*l as usize) <= prediction_g2.order()) {
            let found = in_g2(x, *l as usize, declared).weights();
            let expected = prediction_g2.coeff(*l as usize).weights();
            if !found.is_empty() && expected.len() == 1 && found != expected {
                out.push(Diagnosis::Weight {
                    loop_order: *l,
                    found,
                    expected,
                    declared,
                });
            }
        }
    }
    Ok(out)
}

/// The coefficient of order `l` written in `coupling`, as the coefficient of g^(2l).
fn in_g2(x: &Exact, l: usize, coupling: Coupling) -> Exact {
    let mut coeffs = vec![Exact::zero(); l + 1];
    coeffs[l] = x.clone();
    Series::new(coeffs).from_coupling(coupling).coeff(l).clone()
}

fn hypotheses(declared: Coupling) -> Vec<Hypothesis> {
    let factors = [(1, 1), (2, 1), (1, 2), (-1, 1), (-2, 1), (-1, 2)];
    let mut out = Vec::new();
    for c in Coupling::ALL {
        for &(n, d) in &factors {
            if c == declared && n == 1 && d == 1 {
                continue;
            }
            out.push(Hypothesis {
                coupling: c,
                factor: Rational::from((n, d)),
                shift: 0,
            });
        }
    }
    out.push(Hypothesis {
        coupling: declared,
        factor: Rational::from(1),
        shift: 1,
    });
    out.push(Hypothesis {
        coupling: declared,
        factor: Rational::from(1),
        shift: -1,
    });
    out
}

/// Verdicts of every supplied order under a hypothesis; None where the
/// hypothesis has no predicted coefficient.
fn verdicts_under(
    h: &Hypothesis,
    supplied: &[(u32, Supplied)],
    prediction_g2: &Series,
    digits: u32,
) -> Result<Vec<Option<Verdict>>> {
    let series = prediction_g2.in_coupling(h.coupling);
    let factor = Exact::from(h.factor.clone());
    supplied
        .iter()
        .map(|(l, s)| {
            let k = *l as i64 + h.shift as i64;
            if k < 1 || k as usize > series.order() {
                return Ok(None);
            }
            let predicted = series.coeff(k as usize) * &factor;
            judge(s, &predicted, digits).map(Some)
        })
        .collect()
}
