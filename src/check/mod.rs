//! Order-by-order comparison of a user's loop coefficients with a
//! prediction, and the diagnosis of the usual slips when they differ.
//!
//! Verdict rules (documented in the README):
//! - exact against exact: equal in the ring, or the exact difference;
//! - a number against the prediction: with a stated uncertainty u, it
//!   agrees when |difference| <= 3u (u read as one standard deviation,
//!   common practice); with no stated uncertainty, when |difference| is
//!   within the rounding bound of the written digits; a value that is exact
//!   but outside the ring (multiple zeta values) agrees when the relative
//!   difference is below 10^-(D-3) at D working digits.

mod diagnose;
pub mod propose;
pub mod supplied;

use rug::ops::Pow;
use rug::Float;

use crate::error::Result;
use crate::exact::coupling::Coupling;
use crate::exact::powerseries::Series;
use crate::exact::ring::Exact;
use crate::input::catalogue::Entry;
use crate::limits::MAX_LOOPS;
use crate::numeric::working_bits;
use crate::numeric::Estimate;

pub use diagnose::{diagnose, Diagnosis};
pub use supplied::Supplied;

/// The verdict on one loop order.
#[derive(Clone, Debug)]
pub enum Verdict {
    AgreesExactly,
    /// supplied - predicted, and its numerical value.
    DiffersExactly {
        difference: Exact,
        size: Float,
    },
    /// How many significant digits agree.
    AgreesNumerically {
        digits: u32,
        in_units: Option<InUnits>,
    },
    /// supplied - predicted numerically, in units of the uncertainty when one is known.
    DiffersNumerically {
        difference: Float,
        in_units: Option<InUnits>,
        digits: u32,
    },
    /// The prediction does not reach this order.
    NotPredicted,
    /// The file gives no coefficient for this order.
    NotSupplied,
}

/// |supplied - predicted| in units of the supplied uncertainty. The two
/// kinds are kept apart because they are judged differently: 2 sigma of a
/// stated uncertainty agrees (within 3), twice the rounding bound of the
/// written digits differs (beyond 1).
#[derive(Clone, Debug)]
pub enum InUnits {
    /// Of an uncertainty the file states, read as one standard deviation.
    Sigmas(Float),
    /// Of the rounding bound implied by the written digits (half a unit of the last).
    RoundingBounds(Float),
}

impl InUnits {
    pub fn ratio(&self) -> &Float {
        match self {
            InUnits::Sigmas(x) | InUnits::RoundingBounds(x) => x,
        }
    }
}

impl Verdict {
    pub fn agrees(&self) -> bool {
        matches!(
            self,
            Verdict::AgreesExactly | Verdict::AgreesNumerically { .. }
        )
    }

    pub fn differs(&self) -> bool {
        matches!(
            self,
            Verdict::DiffersExactly { .. } | Verdict::DiffersNumerically { .. }
        )
    }

    /// A short machine name: agrees-exactly, differs-numerically, ...
    pub fn name(&self) -> &'static str {
        match self {
            Verdict::AgreesExactly => "agrees-exactly",
            Verdict::DiffersExactly { .. } => "differs-exactly",
            Verdict::AgreesNumerically { .. } => "agrees-numerically",
            Verdict::DiffersNumerically { .. } => "differs-numerically",
            Verdict::NotPredicted => "not-predicted",
            Verdict::NotSupplied => "not-supplied",
        }
    }
}

/// One loop order of a comparison.
#[derive(Clone, Debug)]
pub struct OrderResult {
    pub loop_order: u32,
    pub label: Option<String>,
    pub supplied: Option<Supplied>,
    pub predicted: Option<Exact>,
    pub verdict: Verdict,
    /// When the file gives both `exact` and `value`: the verdict of the value
    /// against the file's own exact coefficient, if they disagree.
    pub inconsistent: Option<Verdict>,
    /// The `value` as written, when the file gives both.
    pub value_text: Option<String>,
}

/// The whole comparison of one file.
#[derive(Clone, Debug)]
pub struct Comparison {
    pub file: String,
    pub prediction: String,
    pub definition: String,
    pub entry: Option<Entry>,
    pub coupling: Coupling,
    pub about: Vec<(String, String)>,
    pub digits: u32,
    pub orders: Vec<OrderResult>,
    pub diagnoses: Vec<Diagnosis>,
}

impl Comparison {
    pub fn any_differs(&self) -> bool {
        self.orders
            .iter()
            .any(|o| o.verdict.differs() || o.inconsistent.is_some())
    }

    /// The supplied orders that were not compared (beyond the engine's reach).
    pub fn not_compared(&self) -> Vec<u32> {
        self.orders
            .iter()
            .filter(|o| o.supplied.is_some() && matches!(o.verdict, Verdict::NotPredicted))
            .map(|o| o.loop_order)
            .collect()
    }

    /// The verdict a pipeline acts on: every supplied order was compared and
    /// agrees. An order that could not be compared is no evidence of agreement.
    pub fn agrees(&self) -> bool {
        !self.any_differs() && self.not_compared().is_empty()
    }

    /// "orders 1-6 agree, order 7 differs".
    pub fn summary(&self) -> String {
        let class = |o: &OrderResult| -> &'static str {
            if o.inconsistent.is_some() || o.verdict.differs() {
                "differ"
            } else if o.verdict.agrees() {
                "agree"
            } else if matches!(o.verdict, Verdict::NotPredicted) {
                "not compared"
            } else {
                "not supplied"
            }
        };
        let mut runs: Vec<(u32, u32, &'static str)> = Vec::new();
        for o in &self.orders {
            let c = class(o);
            match runs.last_mut() {
                Some((_, end, last)) if *last == c && *end + 1 == o.loop_order => {
                    *end = o.loop_order
                }
                _ => runs.push((o.loop_order, o.loop_order, c)),
            }
        }
        runs.iter()
            .map(|&(a, b, c)| match (a == b, c) {
                (true, "agree") => format!("order {a} agrees"),
                (true, "differ") => format!("order {a} differs"),
                (true, other) => format!("order {a} {other}"),
                (false, other) => format!("orders {a}-{b} {other}"),
            })
            .collect::<Vec<_>>()
            .join(", ")
    }
}

/// Judges one supplied coefficient against a predicted one.
pub fn judge(supplied: &Supplied, predicted: &Exact, digits: u32) -> Result<Verdict> {
    let prec = working_bits(digits);
    if let Supplied::Exact(x) = supplied {
        let difference = x - predicted;
        if difference.is_zero() {
            return Ok(Verdict::AgreesExactly);
        }
        let size = difference.evaluate(prec)?;
        return Ok(Verdict::DiffersExactly { difference, size });
    }
    let approx = supplied.approx(prec)?;
    let p = predicted.evaluate(prec)?;
    Ok(judge_numbers(
        &approx,
        &p,
        supplied_digits(supplied),
        digits,
    ))
}

fn supplied_digits(s: &Supplied) -> Option<u32> {
    match s {
        Supplied::Number { written, .. } => *written,
        Supplied::Exact(_) => None,
    }
}

/// The numerical verdict of `x` against the predicted value `p`.
pub fn judge_numbers(x: &Estimate, p: &Float, written: Option<u32>, digits: u32) -> Verdict {
    let prec = p.prec().max(x.value.prec());
    let difference = Float::with_val(prec, &x.value - p);
    let abs = Float::with_val(prec, difference.abs_ref());
    let agreeing = agreeing_digits(&abs, p)
        .min(written.unwrap_or(digits))
        .min(digits);
    let in_units = (!x.error.is_zero()).then(|| {
        let ratio = Float::with_val(prec, &abs / &x.error);
        if x.stated {
            InUnits::Sigmas(ratio)
        } else {
            InUnits::RoundingBounds(ratio)
        }
    });
    let agrees = if x.error.is_zero() {
        let scale = if p.is_zero() {
            Float::with_val(prec, 1)
        } else {
            Float::with_val(prec, p.abs_ref())
        };
        let tolerance = Float::with_val(prec, 10u32).pow(digits.saturating_sub(3));
        Float::with_val(prec, &abs * &tolerance) <= scale
    } else if x.stated {
        abs <= Float::with_val(prec, &x.error * 3u32)
    } else {
        // The rounding bound of the written digits, with room for the
        // binary representation of the literal itself.
        abs <= Float::with_val(prec, &x.error * 1.000001f64)
    };
    if agrees {
        Verdict::AgreesNumerically {
            digits: agreeing,
            in_units,
        }
    } else {
        Verdict::DiffersNumerically {
            difference,
            in_units,
            digits: agreeing,
        }
    }
}

/// Significant digits in which a value differing by `abs` from `p` agrees with it.
fn agreeing_digits(abs: &Float, p: &Float) -> u32 {
    if abs.is_zero() {
        return u32::MAX;
    }
    if p.is_zero() {
        return 0;
    }
    let rel = Float::with_val(64, abs / p.clone().abs());
    let d = -rel.log10().to_f64();
    if d <= 0.0 {
        0
    } else {
        d.floor() as u32
    }
}

/// Compares supplied coefficients with a prediction series (in the file's
/// coupling), order by order from 1 to the highest supplied order.
pub fn compare_orders(
    supplied: &[(u32, Option<String>, Supplied, Option<Supplied>)],
    prediction: &Series,
    digits: u32,
) -> Result<Vec<OrderResult>> {
    let highest = supplied.iter().map(|s| s.0).max().unwrap_or(0);
    let mut out = Vec::new();
    for l in 1..=highest {
        let predicted =
            (l as usize <= prediction.order()).then(|| prediction.coeff(l as usize).clone());
        let Some((_, label, main, extra)) = supplied.iter().find(|s| s.0 == l) else {
            out.push(OrderResult {
                loop_order: l,
                label: None,
                supplied: None,
                predicted,
                verdict: Verdict::NotSupplied,
                inconsistent: None,
                value_text: None,
            });
            continue;
        };
        let verdict = match &predicted {
            Some(p) => judge(main, p, digits)?,
            None => Verdict::NotPredicted,
        };
        let inconsistent = match (main, extra) {
            (Supplied::Exact(x), Some(value)) => {
                let v = judge(value, x, digits)?;
                (!v.agrees()).then_some(v)
            }
            _ => None,
        };
        out.push(OrderResult {
            loop_order: l,
            label: label.clone(),
            supplied: Some(main.clone()),
            predicted,
            verdict,
            inconsistent,
            value_text: extra.as_ref().map(Supplied::text),
        });
    }
    Ok(out)
}

/// Checks a series file against the prediction it names.
pub fn check(
    file: &crate::input::seriesfile::SeriesFile,
    catalogue: &crate::input::catalogue::Catalogue,
    digits: u32,
    progress: &mut dyn FnMut(&str, usize, usize),
) -> Result<Comparison> {
    use crate::error::Error;

    use crate::quantity::Quantity;

    let quantity = Quantity::from_file(file, catalogue)?.ok_or_else(|| {
        Error::input(format!(
            "{}: the file names no `prediction` to check against (a catalogue name or a formula)",
            file.origin
        ))
    })?;
    let prec = working_bits(digits);
    let mut supplied = Vec::new();
    for o in &file.orders {
        let main = match (&o.exact, &o.value) {
            (Some(x), _) => supplied::read(x, &file.origin, prec)?,
            (None, Some(v)) => supplied::read_number(v, &file.origin, prec)?,
            (None, None) => continue,
        };
        supplied::require_constant(&main, o.loop_order, &file.origin)?;
        let extra = match (&o.exact, &o.value) {
            (Some(_), Some(v)) => Some(supplied::read_number(v, &file.origin, prec)?),
            _ => None,
        };
        supplied.push((o.loop_order, o.label.clone(), main, extra));
    }
    // Orders beyond the engine's reach are "not predicted"; the prediction is
    // expanded only as far as a supplied order it can reach, plus one for
    // the shifted-orders diagnosis.
    let highest = supplied
        .iter()
        .map(|s| s.0)
        .filter(|&l| l <= MAX_LOOPS)
        .max()
        .unwrap_or(1);
    let reach = (highest + 1).min(MAX_LOOPS);
    let prediction_g2 = quantity.expand(reach, progress)?;
    let in_file = prediction_g2
        .in_coupling(file.coupling)
        .truncate(highest as usize);
    let orders = compare_orders(&supplied, &in_file, digits)?;
    let mains: Vec<(u32, Supplied)> = supplied
        .iter()
        .map(|(l, _, s, _)| (*l, s.clone()))
        .collect();
    let diagnoses = diagnose(&mains, &prediction_g2, file.coupling, digits)?;
    Ok(Comparison {
        file: file.origin.clone(),
        prediction: quantity.label.clone(),
        definition: quantity.definition.trim().to_string(),
        entry: quantity.entry.clone(),
        coupling: file.coupling,
        about: file.about.clone(),
        digits,
        orders,
        diagnoses,
    })
}
