//! The checks behind `loopwise origin`, from an origin file read by
//! [`crate::origin::read`] to a report value: judging what
//! [`crate::origin::analysis`] reads from it against the predictions with the
//! verdicts of `check` ([`crate::check::judge`]), and naming the coupling and
//! sign slips that would make a differing file agree.
//!
//! Coefficients are compared in the file's own coupling: the analysis runs
//! in g^2, and readings and predictions are converted back order by order
//! (a rescaling, which no exact verdict can notice).
//!
//! An order written with decimals (or other numbers outside the exact ring)
//! makes the whole file numerical: every order becomes a polynomial with
//! [`Estimate`] coefficients at the working precision and the analysis runs
//! in [`crate::origin::numeric`], judged with [`crate::check::judge_numbers`].
//! A file that is all exact takes the exact path alone.

use crate::check::{judge, judge_numbers, Supplied, Verdict};
use crate::error::{Error, Result};
use crate::exact::coupling::Coupling;
use crate::exact::powerseries::Series;
use crate::exact::ring::Exact;
use crate::input::catalogue::{Catalogue, Entry};
use crate::input::seriesfile::Normalisation;
use crate::kernel::{self};
use crate::limits::MAX_LOOPS;
use crate::numeric::working_bits;
use crate::numeric::Estimate;
use crate::origin::numeric::{self, NumBreakdown, NumPoly, NumTerm};
use crate::origin::read::{numeric_source, OriginData};
use crate::origin::{self, Breakdown, OriginLogs};
use crate::quantity::Quantity;

/// A coefficient read from the data: exact, or a number with its
/// propagated uncertainty when the file was read numerically.
#[derive(Clone, Debug)]
pub enum Reading {
    Exact(Exact),
    Number(Estimate),
}

impl Reading {
    fn negated(&self) -> Reading {
        match self {
            Reading::Exact(x) => Reading::Exact(-x),
            Reading::Number(a) => Reading::Number(Estimate {
                value: rug::Float::with_val(a.value.prec(), -&a.value),
                ..a.clone()
            }),
        }
    }

    pub fn is_zero(&self) -> bool {
        match self {
            Reading::Exact(x) => x.is_zero(),
            Reading::Number(a) => a.value.is_zero() && a.error.is_zero(),
        }
    }
}

/// One coefficient read from the data, with its verdict.
#[derive(Clone, Debug)]
pub struct Judged {
    pub supplied: Reading,
    pub predicted: Option<Exact>,
    pub verdict: Verdict,
}

impl Judged {
    fn new(supplied: Reading, predicted: Option<Exact>, digits: u32) -> Result<Self> {
        let verdict = match (&supplied, &predicted) {
            (_, None) => Verdict::NotPredicted,
            (Reading::Exact(x), Some(p)) => judge(&Supplied::Exact(x.clone()), p, digits)?,
            (Reading::Number(a), Some(p)) => {
                judge_numbers(a, &p.evaluate(working_bits(digits))?, None, digits)
            }
        };
        Ok(Judged {
            supplied,
            predicted,
            verdict,
        })
    }
}

/// The first order that breaks exponentiation, with its offending terms.
#[derive(Clone, Debug)]
pub enum Broken {
    Exact(Breakdown<Exact>),
    /// The terms found nonzero beyond their uncertainty.
    Numeric(NumBreakdown),
}

impl Broken {
    pub fn order(&self) -> usize {
        match self {
            Broken::Exact(b) => b.order,
            Broken::Numeric(b) => b.order,
        }
    }
}

/// The hexagon coefficient of one order, where it can be tested.
#[derive(Clone, Debug)]
pub enum HexagonCell {
    Judged(Judged),
    NotTestableOnLine,
}

/// One loop order that passed the exponentiation check, in the file's coupling.
#[derive(Clone, Debug)]
pub struct OriginRow {
    pub loop_order: u32,
    /// The coefficient of ln^2(u1 u2 u3) against -Gamma_oct/24.
    pub octagon: Judged,
    /// The coefficient of sum_i ln^2(u_i/u_(i+1)) against -Gamma_hex/24.
    pub hexagon: HexagonCell,
    /// The coefficient of ln(u1 u2 u3) against zero.
    pub linear: Judged,
    /// C0 against its one-loop value (at one loop only).
    pub constant: Judged,
    /// C0 against the file's own formula, when it gives one.
    pub formula: Option<Judged>,
}

impl OriginRow {
    fn verdicts(&self) -> Vec<&Verdict> {
        let mut v = vec![
            &self.octagon.verdict,
            &self.linear.verdict,
            &self.constant.verdict,
        ];
        if let HexagonCell::Judged(h) = &self.hexagon {
            v.push(&h.verdict);
        }
        if let Some(f) = &self.formula {
            v.push(&f.verdict);
        }
        v
    }

    pub fn differs(&self) -> bool {
        self.verdicts().iter().any(|v| v.differs())
    }
}

/// Everything `loopwise origin` reports.
#[derive(Clone, Debug)]
pub struct OriginCheck {
    pub file: String,
    pub about: Vec<(String, String)>,
    pub coupling: Coupling,
    pub normalisation: Normalisation,
    pub logs: OriginLogs,
    pub highest: u32,
    /// The orders that exponentiate, from 1 up to a breaking order.
    pub rows: Vec<OriginRow>,
    /// The first order that breaks exponentiation, its terms in the file's coupling.
    pub broken: Option<Broken>,
    /// The file's C0 formula, as written.
    pub formula: Option<String>,
    pub octagon_entry: Option<Entry>,
    pub hexagon_entry: Option<Entry>,
    pub digits: u32,
    /// The orders written with numbers; non-empty when the file was read numerically.
    pub numeric: Vec<u32>,
    /// The slips that would make every order exponentiate and agree.
    pub diagnoses: Vec<String>,
}

impl OriginCheck {
    /// Every compared coefficient agrees and every order exponentiates.
    pub fn agrees(&self) -> bool {
        self.broken.is_none() && !self.rows.iter().any(OriginRow::differs)
    }

    /// "orders 1-4 agree, order 5 breaks exponentiation, orders 6-7 not examined".
    pub fn summary(&self) -> String {
        let mut classes: Vec<(u32, &'static str)> = self
            .rows
            .iter()
            .map(|r| (r.loop_order, if r.differs() { "differ" } else { "agree" }))
            .collect();
        if let Some(b) = &self.broken {
            classes.push((b.order() as u32, "break exponentiation"));
            classes.extend((b.order() as u32 + 1..=self.highest).map(|l| (l, "not examined")));
        }
        let mut runs: Vec<(u32, u32, &'static str)> = Vec::new();
        for (l, c) in classes {
            match runs.last_mut() {
                Some((_, end, last)) if *last == c && *end + 1 == l => *end = l,
                _ => runs.push((l, l, c)),
            }
        }
        runs.iter()
            .map(|&(a, b, c)| match (a == b, c) {
                (true, "agree") => format!("order {a} agrees"),
                (true, "differ") => format!("order {a} differs"),
                (true, "break exponentiation") => format!("order {a} breaks exponentiation"),
                (true, other) => format!("order {a} {other}"),
                (false, other) => format!("orders {a}-{b} {other}"),
            })
            .collect::<Vec<_>>()
            .join(", ")
    }

    pub fn on_line(&self) -> bool {
        matches!(self.logs, OriginLogs::Line(_))
    }

    pub fn is_numeric(&self) -> bool {
        !self.numeric.is_empty()
    }
}

/// The coefficient of order k of a g^2 series, written in `coupling`.
fn in_file(c: &Exact, k: usize, coupling: Coupling) -> Exact {
    let mut coeffs = vec![Exact::zero(); k + 1];
    coeffs[k] = c.clone();
    Series::new(coeffs).in_coupling(coupling).coeff(k).clone()
}

/// The factor that takes a coefficient of order k in `coupling` to g^2.
fn to_g2(k: usize, coupling: Coupling) -> Exact {
    let mut coeffs = vec![Exact::zero(); k + 1];
    coeffs[k] = Exact::one();
    Series::new(coeffs).from_coupling(coupling).coeff(k).clone()
}

/// What the analysis of either path leaves for the verdicts, in g^2.
struct Readings {
    /// (order, octagon, hexagon or None on the line, linear, constant).
    orders: Vec<(usize, Reading, Option<Reading>, Reading, Reading)>,
    broken: Option<Broken>,
}

/// How the file's numbers are read: in which coupling convention, and
/// whether with the opposite sign. The file's own reading is its declared
/// coupling and its sign; the others are the slips `origin` tests.
#[derive(Clone, Copy, Debug, PartialEq)]
struct Variant {
    coupling: Coupling,
    negated: bool,
}

impl Variant {
    /// Whether the sign acts on the file's coefficients (R6, on which ln E
    /// depends linearly) rather than on the readings (E, where the
    /// opposite sign of every reading means the file holds 1/E).
    fn negates_data(&self, normalisation: Normalisation) -> bool {
        self.negated && normalisation == Normalisation::R6
    }

    /// The file's coefficients as a series in g^2, read this way.
    fn series(&self, data: &OriginData) -> Series {
        let s = data
            .series
            .in_coupling(data.file.coupling)
            .from_coupling(self.coupling);
        if self.negates_data(data.normalisation) {
            -&s
        } else {
            s
        }
    }
}

fn exact_readings(data: &OriginData, v: Variant, cusp: Option<&Series>) -> Result<Readings> {
    let series = v.series(data);
    let analysis = match cusp {
        None => origin::analyse_e(&series, &data.logs),
        Some(cusp) => origin::analyse_r6(&series, cusp, &data.logs),
    }
    .map_err(|e| e.context(&data.file.origin))?;
    let c = v.coupling;
    let orders = analysis
        .orders
        .iter()
        .map(|r| {
            let k = r.order;
            let at = |x: &Exact| Reading::Exact(in_file(x, k, c));
            let hexagon = r.hexagon.as_ref().map(at);
            (k, at(&r.octagon), hexagon, at(&r.linear), at(&r.constant))
        })
        .collect();
    let broken = analysis.broken.map(|b| {
        Broken::Exact(Breakdown {
            order: b.order,
            high_degree: in_file(&b.high_degree, b.order, c),
            asymmetric: in_file(&b.asymmetric, b.order, c),
        })
    });
    Ok(Readings { orders, broken })
}

/// Every order as a numerical polynomial in g^2 at `prec` bits: the numeric
/// entries read from their text, the exact ones evaluated.
fn numeric_series(data: &OriginData, v: Variant, prec: u32) -> Result<Vec<NumPoly>> {
    let file = &data.file;
    let series = v.series(data);
    let sign = if v.negates_data(data.normalisation) {
        -1
    } else {
        1
    };
    let mut out = Vec::with_capacity(series.order() + 1);
    for (k, exact) in series.coeffs().iter().enumerate() {
        let entry = file.orders.iter().find(|o| o.loop_order as usize == k);
        let poly = match entry.and_then(numeric_source) {
            Some(located) => {
                let p = numeric::read_polynomial(located, &file.origin, &data.logs, prec)?;
                p.scale(&(to_g2(k, v.coupling).evaluate(prec)? * sign))
            }
            None => {
                NumPoly::from_exact(exact, &data.logs, prec).map_err(|e| e.context(&file.origin))?
            }
        };
        out.push(poly);
    }
    Ok(out)
}

fn numeric_readings(
    data: &OriginData,
    v: Variant,
    cusp: Option<&Series>,
    digits: u32,
) -> Result<Readings> {
    let prec = working_bits(digits);
    let series = numeric_series(data, v, prec)?;
    let analysis = match cusp {
        None => numeric::analyse_e(&series, &data.logs, digits),
        Some(cusp) => numeric::analyse_r6(&series, cusp, &data.logs, digits),
    }
    .map_err(|e| e.context(&data.file.origin))?;
    let c = v.coupling;
    let back = |k: usize| -> Result<rug::Float> { in_file(&Exact::one(), k, c).evaluate(prec) };
    let mut orders = Vec::new();
    for r in &analysis.orders {
        let f = back(r.order)?;
        let at = |a: &Estimate| Reading::Number(a.scaled(&f));
        orders.push((
            r.order,
            at(&r.octagon),
            r.hexagon.as_ref().map(at),
            at(&r.linear),
            at(&r.constant),
        ));
    }
    let broken = match analysis.broken {
        None => None,
        Some(b) => {
            let f = back(b.order)?;
            let terms = |ts: &[NumTerm]| -> Vec<NumTerm> {
                ts.iter()
                    .map(|t| NumTerm {
                        exponents: t.exponents,
                        coefficient: t.coefficient.scaled(&f),
                    })
                    .collect()
            };
            Some(Broken::Numeric(NumBreakdown {
                order: b.order,
                high_degree: terms(&b.high_degree),
                asymmetric: terms(&b.asymmetric),
            }))
        }
    };
    Ok(Readings { orders, broken })
}

/// What every reading is judged against, in g^2.
struct Predictions {
    cusp: Option<Series>,
    octagon: Series,
    hexagon: Series,
    /// The file's C0 formula, as written and expanded.
    formula: Option<(String, Series)>,
}

/// Runs the exponentiation check and judges every reading; when something
/// differs, tests the slips of `diagnose`.
pub fn check_origin(data: &OriginData, catalogue: &Catalogue, digits: u32) -> Result<OriginCheck> {
    let file = &data.file;
    let highest = data.series.order();
    let reach = (highest as u32).clamp(1, MAX_LOOPS);
    let cusp = match data.normalisation {
        Normalisation::E => None,
        Normalisation::R6 => {
            if highest as u32 > MAX_LOOPS {
                return Err(Error::range(format!(
                    "{}: converting R6 needs Gamma_cusp through {highest} loops; the exact engine reaches {MAX_LOOPS}",
                    file.origin
                )));
            }
            Some(kernel::gamma(
                &kernel::Tilt::cos2(rug::Rational::from((1, 2)))?,
                reach,
                &mut |_, _| {},
            )?)
        }
    };
    let predicted = origin::predicted_log_coefficients(reach)?;
    let formula = match Quantity::from_file(file, catalogue)? {
        None => None,
        Some(quantity) => Some((
            quantity.definition.trim().to_string(),
            quantity.expand(reach, &mut |_, _, _| {})?,
        )),
    };
    let predictions = Predictions {
        cusp,
        octagon: predicted.octagon,
        hexagon: predicted.hexagon,
        formula,
    };
    let declared = Variant {
        coupling: file.coupling,
        negated: false,
    };
    let (rows, broken) = judged_rows(data, declared, &predictions, digits)?;
    let mut check = OriginCheck {
        file: file.origin.clone(),
        about: file.about.clone(),
        coupling: file.coupling,
        normalisation: data.normalisation,
        logs: data.logs.clone(),
        highest: highest as u32,
        rows,
        broken,
        formula: predictions.formula.as_ref().map(|(f, _)| f.clone()),
        octagon_entry: catalogue.get("octagon").cloned(),
        hexagon_entry: catalogue.get("hexagon").cloned(),
        digits,
        numeric: data.numeric.clone(),
        diagnoses: Vec::new(),
    };
    if !check.agrees() {
        check.diagnoses = diagnose(data, &predictions, digits);
    }
    Ok(check)
}

/// The rows and the break of the file read as `v` says.
fn judged_rows(
    data: &OriginData,
    v: Variant,
    p: &Predictions,
    digits: u32,
) -> Result<(Vec<OriginRow>, Option<Broken>)> {
    let mut readings = if data.numeric.is_empty() {
        exact_readings(data, v, p.cusp.as_ref())?
    } else {
        numeric_readings(data, v, p.cusp.as_ref(), digits)?
    };
    // ln(1/E) = -ln E: the readings change sign, and whether (and where)
    // exponentiation breaks does not change.
    if v.negated && !v.negates_data(data.normalisation) {
        for (_, octagon, hexagon, linear, constant) in &mut readings.orders {
            for r in [octagon, linear, constant]
                .into_iter()
                .chain(hexagon.as_mut())
            {
                *r = r.negated();
            }
        }
    }
    let c = v.coupling;
    let predicted_at = |s: &Series, k: usize| (k <= s.order()).then(|| in_file(s.coeff(k), k, c));
    let mut rows = Vec::new();
    for (k, octagon, hexagon, linear, constant) in readings.orders {
        let hexagon = match hexagon {
            Some(h) => HexagonCell::Judged(Judged::new(h, predicted_at(&p.hexagon, k), digits)?),
            None => HexagonCell::NotTestableOnLine,
        };
        let one_loop = (k == 1).then(|| in_file(&origin::one_loop_constant(), 1, c));
        let formula_cell = match &p.formula {
            Some((_, s)) => Some(Judged::new(constant.clone(), predicted_at(s, k), digits)?),
            None => None,
        };
        rows.push(OriginRow {
            loop_order: k as u32,
            octagon: Judged::new(octagon, predicted_at(&p.octagon, k), digits)?,
            hexagon,
            linear: Judged::new(linear, Some(Exact::zero()), digits)?,
            constant: Judged::new(constant, one_loop, digits)?,
            formula: formula_cell,
        });
    }
    Ok((rows, readings.broken))
}

/// The slips of `check` that carry over to origin files, each named only when
/// it makes every order exponentiate and every reading agree: another
/// coupling convention (ln E rescales order by order with the coupling, and
/// an R6 file is reread from its coefficients) and the opposite sign (of R6,
/// or of ln E, i.e. a file that holds 1/E). Shifted loop orders and the
/// factor 2 of the scaling function do not carry over: the logarithm mixes
/// orders, and no reading is a multiple of Gamma_cusp.
fn diagnose(data: &OriginData, p: &Predictions, digits: u32) -> Vec<String> {
    let declared = data.file.coupling;
    let mut out = Vec::new();
    for coupling in Coupling::ALL {
        for negated in [false, true] {
            let v = Variant { coupling, negated };
            if v == (Variant {
                coupling: declared,
                negated: false,
            }) {
                continue;
            }
            // A reading that fails under a hypothesis only rules the hypothesis out.
            let Ok((rows, None)) = judged_rows(data, v, p, digits) else {
                continue;
            };
            if rows.is_empty() || rows.iter().any(OriginRow::differs) {
                continue;
            }
            let mut parts = Vec::new();
            if coupling != declared {
                parts.push(format!(
                    "the coefficients follow the convention {} ({}) although the file says `coupling: {}`",
                    coupling.name(),
                    coupling.meaning(),
                    declared.name()
                ));
            }
            if negated {
                parts.push(match data.normalisation {
                    Normalisation::R6 => "every coefficient of R6 has the opposite sign: an overall sign slip".to_string(),
                    Normalisation::E => "every reading of ln E has the opposite sign: does the file hold 1/E rather than E?".to_string(),
                });
            }
            let mut text = parts.join("; and ");
            if data.file.orders.len() == 1 {
                text.push_str(
                    " (this rests on one order only; more orders would confirm or rule it out)",
                );
            }
            out.push(text);
        }
    }
    out
}
