//! The checks behind `loopwise origin` and `loopwise fit`, from a series file
//! to a report value: reading origin files (polynomials in the logs, E or R6,
//! any coupling) into exact series in g^2, judging what [`crate::origin`]
//! reads from them against the predictions with the verdicts of `check`
//! ([`crate::check::judge`]), naming the coupling and sign slips that
//! would make a differing file agree, and running [`crate::fit`] on the loop
//! coefficients of a file with a basis given on the command line.
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
use crate::fit::{self, BasisElement, Fit};
use crate::input::catalogue::{Catalogue, Entry};
use crate::input::seriesfile::{parse_series_text, Located, Normalisation, OrderEntry, SeriesFile};
use crate::kernel::{self, MAX_LOOPS};
use crate::numeric::working_bits;
use crate::numeric::Estimate;
use crate::origin::numeric::{self, needs_numbers, NumBreakdown, NumPoly, NumTerm};
use crate::origin::{self, Breakdown, OriginLogs};
use crate::quantity::{Expander, Quantity};

/// An origin file, read and checked: the coefficients as one series in g^2.
#[derive(Clone, Debug)]
pub struct OriginData {
    pub file: SeriesFile,
    pub logs: OriginLogs,
    pub normalisation: Normalisation,
    /// Coefficients of g^(2L), L = 0 .. highest order; 1 (E) or 0 (R6) at g^0.
    /// The orders listed in `numeric` hold zero here.
    pub series: Series,
    /// The loop orders written with numbers outside the exact ring, read at
    /// the working precision by [`check_origin`]; empty for an exact file.
    pub numeric: Vec<u32>,
}

/// Reads an origin file from disk, or from standard input when `path` is `-`.
pub fn read_origin_file(path: &std::path::Path) -> Result<OriginData> {
    let (text, origin) = crate::input::seriesfile::read_input(path)?;
    parse_origin_text(&text, &origin)
}

/// The line (from 1) where a top-level key is written, for messages about
/// keys whose value the series-file reader does not locate.
fn key_line(text: &str, key: &str) -> Option<usize> {
    text.lines()
        .position(|l| {
            l.strip_prefix(key)
                .is_some_and(|rest| rest.trim_start().starts_with(':'))
        })
        .map(|i| i + 1)
}

/// Checks an origin file given as text; `origin` names it in messages.
pub fn parse_origin_text(text: &str, origin: &str) -> Result<OriginData> {
    let file = parse_series_text(text, origin)?;
    let normalisation = file.normalisation.ok_or_else(|| {
        Error::input(format!(
            "{origin}: an origin file needs `normalisation: E` (the normalised amplitude) \
             or `normalisation: R6` (the remainder function)"
        ))
    })?;
    let logs =
        OriginLogs::from_symbols(&file.symbols).map_err(|e| match key_line(text, "symbols") {
            Some(line) => e.context(format!("line {line} of {origin}")),
            None => e.context(origin),
        })?;
    let mut coeffs = vec![Exact::zero(); highest(&file) as usize + 1];
    let mut numeric = Vec::new();
    for entry in &file.orders {
        if entry.exact.is_some() && entry.value.is_some() {
            return Err(Error::input(format!(
                "{origin}: the entry at line {} (loop {}) gives both `exact` and `value`; an origin file takes one \
                 of them per order (the checks would otherwise read one and ignore the other)",
                entry.line, entry.loop_order
            )));
        }
        match numeric_source(entry) {
            Some(_) => numeric.push(entry.loop_order),
            None => coeffs[entry.loop_order as usize] = exact_coefficient(&file, entry)?,
        }
    }
    // R6 vanishes at one loop by definition, so an R6 file may start at two.
    let first = if normalisation == Normalisation::R6 {
        2
    } else {
        1
    };
    if let Some(missing) =
        (first..coeffs.len()).find(|&k| !file.orders.iter().any(|o| o.loop_order as usize == k))
    {
        return Err(Error::input(format!(
            "{origin}: loop order {missing} is missing; the logarithm of the series needs every order up to the highest ({})",
            coeffs.len() - 1
        )));
    }
    let mut series = Series::new(coeffs).from_coupling(file.coupling);
    if normalisation == Normalisation::E {
        let mut c = series.coeffs().to_vec();
        c[0] = Exact::one();
        series = Series::new(c);
    }
    Ok(OriginData {
        file,
        logs,
        normalisation,
        series,
        numeric,
    })
}

/// The text of an entry to be read numerically: an `exact` coefficient with
/// numbers outside the exact ring, or a `value` (entries never carry both).
fn numeric_source(entry: &OrderEntry) -> Option<&Located> {
    match (&entry.exact, &entry.value) {
        (Some(x), _) if needs_numbers(&x.expr) => Some(x),
        (Some(_), _) => None,
        (None, v) => v.as_ref(),
    }
}

fn highest(file: &SeriesFile) -> u32 {
    file.orders.iter().map(|o| o.loop_order).max().unwrap_or(0)
}

/// The exact coefficient of one entry; numbers are refused, naming the line.
fn exact_coefficient(file: &SeriesFile, entry: &OrderEntry) -> Result<Exact> {
    let located = entry.exact.as_ref().ok_or_else(|| {
        Error::input(format!(
            "{}: the entry at line {} (loop {}) gives only a `value`; this command needs exact coefficients (`exact:`)",
            file.origin, entry.line, entry.loop_order
        ))
    })?;
    // The exact reader names file, line and column of anything outside the
    // exact ring (decimals, logarithms, Catalan's constant, multiple zeta values).
    let mut expander = Expander {
        source: &located.text,
        origin: &file.origin,
        site: Some(&located.site),
        loops: 0,
        cache: std::collections::HashMap::new(),
        progress: &mut |_, _, _| {},
    };
    Ok(expander.series(&located.expr)?.coeff(0).clone())
}

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
    let top = data.series.order();
    let reach = (top as u32).clamp(1, MAX_LOOPS);
    let cusp = match data.normalisation {
        Normalisation::E => None,
        Normalisation::R6 => {
            if top as u32 > MAX_LOOPS {
                return Err(Error::range(format!(
                    "{}: converting R6 needs Gamma_cusp through {top} loops; the exact engine reaches {MAX_LOOPS}",
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
        highest: top as u32,
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

// ---------------------------------------------------------------------------
// Fits from files.

/// The loop coefficients of a file as fit data in g^2: exact, without symbols.
pub fn fit_target(file: &SeriesFile) -> Result<Vec<(u32, Exact)>> {
    let mut out = Vec::new();
    for entry in &file.orders {
        if let Some(located) = numeric_source(entry) {
            return Err(refuse_numbers(file, entry, located));
        }
        let x = exact_coefficient(file, entry)?;
        if let Some((m, _)) = x.terms().find(|(m, _)| !m.symbols().is_empty()) {
            return Err(Error::input(format!(
                "{}: the coefficient at line {} (loop {}) depends on the symbol `{}`; a fit takes numbers such as C0, \
                 not polynomials in the logs (read those with `loopwise origin`)",
                file.origin,
                entry.line,
                entry.loop_order,
                m.symbols()[0].0
            )));
        }
        let k = entry.loop_order as usize;
        let mut coeffs = vec![Exact::zero(); k + 1];
        coeffs[k] = x;
        out.push((
            entry.loop_order,
            Series::new(coeffs)
                .from_coupling(file.coupling)
                .coeff(k)
                .clone(),
        ));
    }
    Ok(out)
}

/// Why a fit takes no decimals, pointing at the first number outside the
/// exact ring (or at the `value` given alone).
fn refuse_numbers(file: &SeriesFile, entry: &OrderEntry, located: &Located) -> Error {
    fn first_inexact(e: &crate::input::expr::Expr) -> Option<crate::input::expr::Span> {
        use crate::input::expr::Node;
        match &e.node {
            Node::Decimal { .. } | Node::Catalan | Node::Log(_) => Some(e.span),
            Node::Zeta(args) if args.len() > 1 => Some(e.span),
            Node::Neg(a) => first_inexact(a),
            Node::Add(a, b)
            | Node::Sub(a, b)
            | Node::Mul(a, b)
            | Node::Div(a, b)
            | Node::Pow(a, b) => first_inexact(a).or_else(|| first_inexact(b)),
            _ => None,
        }
    }
    let message = format!(
        "`loopwise fit` needs exact coefficients (loop {}): it solves for rational coefficients of the basis, \
         which a decimal cannot fix; write the coefficient exactly (fractions, pi, zeta values), or read numerical \
         data with `loopwise origin`",
        entry.loop_order
    );
    match first_inexact(&located.expr) {
        Some(span) => located.error_at(&file.origin, span, &message),
        None => Error::input(format!("{}: line {}: {message}", file.origin, located.line)),
    }
}

/// Reads `--basis "NAME=FORMULA; FORMULA; ..."`: elements separated by `;`,
/// each a formula, optionally named by a plain name and `=` in front.
pub fn parse_basis(text: &str) -> Result<Vec<BasisElement>> {
    let mut out: Vec<BasisElement> = Vec::new();
    for item in text.split(';').map(str::trim).filter(|s| !s.is_empty()) {
        let named = item.split_once('=').filter(|(name, _)| {
            let name = name.trim();
            name.chars().next().is_some_and(|c| c.is_ascii_alphabetic())
                && name.chars().all(|c| c.is_ascii_alphanumeric() || c == '_')
        });
        let element = match named {
            Some((name, formula)) if !formula.trim().is_empty() => BasisElement {
                name: name.trim().to_string(),
                formula: formula.trim().to_string(),
            },
            Some((name, _)) => {
                return Err(Error::input(format!(
                    "basis element `{}` has no formula after `=`",
                    name.trim()
                )))
            }
            None => BasisElement::new(item),
        };
        if out.iter().any(|e| e.name == element.name) {
            return Err(Error::input(format!(
                "basis element `{}` is given twice",
                element.name
            )));
        }
        out.push(element);
    }
    if out.is_empty() {
        return Err(Error::input(
            "--basis lists no elements; write e.g. \"A=Gamma(pi/4); B=zeta(2)*Gamma(0)\"",
        ));
    }
    Ok(out)
}

/// Everything `loopwise fit` reports.
#[derive(Clone, Debug)]
pub struct FitReport {
    pub file: String,
    pub coupling: Coupling,
    pub orders: Vec<u32>,
    /// The elements as given; the fit's `names` select from them.
    pub elements: Vec<BasisElement>,
    pub fit: Fit,
    pub ceiling: u32,
}

impl FitReport {
    fn formula_of<'a>(&'a self, name: &'a str) -> &'a str {
        self.elements
            .iter()
            .find(|e| e.name == name)
            .map_or(name, |e| e.formula.as_str())
    }

    /// sum_k a_k B_k as a formula the coefficient language reads back.
    pub fn combination(&self, coefficients: &[rug::Rational]) -> String {
        let formulas: Vec<&str> = self.fit.names.iter().map(|n| self.formula_of(n)).collect();
        combination(coefficients, &formulas)
    }

    /// sum_k a_k NAME_k, in the names of the basis.
    pub fn named_combination(&self, coefficients: &[rug::Rational]) -> String {
        let names: Vec<&str> = self.fit.names.iter().map(String::as_str).collect();
        combination(coefficients, &names)
    }

    /// Whether some element was given a name other than its formula.
    pub fn has_names(&self) -> bool {
        self.elements.iter().any(|e| e.name != e.formula)
    }
}

/// Runs the fit of a file's coefficients.
pub fn fit_file(
    file: &SeriesFile,
    elements: Vec<BasisElement>,
    ceiling: u32,
    catalogue: &crate::input::catalogue::Catalogue,
) -> Result<FitReport> {
    if ceiling == 0 || ceiling > MAX_LOOPS {
        return Err(Error::range(format!(
            "--ceiling {ceiling} is out of range: 1 to {MAX_LOOPS} loops"
        )));
    }
    let target = fit_target(file)?;
    if let Some((l, _)) = target.iter().find(|(l, _)| *l > MAX_LOOPS) {
        return Err(Error::range(format!(
            "{}: loop {l} is beyond the exact engine's {MAX_LOOPS} loops, so the basis cannot be expanded that far",
            file.origin
        )));
    }
    let fit =
        fit::fit(&target, &elements, ceiling, catalogue).map_err(|e| e.context(&file.origin))?;
    Ok(FitReport {
        file: file.origin.clone(),
        coupling: file.coupling,
        orders: target.iter().map(|(l, _)| *l).collect(),
        elements,
        fit,
        ceiling,
    })
}

/// Whether a formula needs parentheses as a factor: a sum or difference at
/// the top level, or a leading sign.
fn needs_parentheses(formula: &str) -> bool {
    let mut depth = 0i32;
    for (i, c) in formula.trim().char_indices() {
        match c {
            '(' | '[' => depth += 1,
            ')' | ']' => depth -= 1,
            '+' | '-' if depth == 0 => {
                let before = formula.trim()[..i].trim_end();
                // A sign after `^`, `*`, `/` or at the start belongs to a factor.
                if i == 0 || !before.ends_with(['^', '*', '/', '(']) {
                    return true;
                }
            }
            _ => {}
        }
    }
    false
}

fn combination(coefficients: &[rug::Rational], factors: &[&str]) -> String {
    let mut out = String::new();
    for (a, f) in coefficients.iter().zip(factors) {
        if *a == 0 {
            continue;
        }
        let f = if needs_parentheses(f) {
            format!("({})", f.trim())
        } else {
            f.trim().to_string()
        };
        let abs = rug::Rational::from(a.abs_ref());
        let sign = if *a < 0 { "-" } else { "+" };
        if out.is_empty() {
            if *a < 0 {
                out.push('-');
            }
        } else {
            out.push_str(&format!(" {sign} "));
        }
        if abs == 1 {
            out.push_str(&f);
        } else {
            out.push_str(&format!("{abs}*{f}"));
        }
    }
    if out.is_empty() {
        "0".to_string()
    } else {
        out
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn basis_items_with_and_without_names() {
        let b = parse_basis("A = Gamma(pi/4); Gamma(c2=1/2) ; zeta(2)*Delta(0)").unwrap();
        assert_eq!(
            b[0],
            BasisElement {
                name: "A".into(),
                formula: "Gamma(pi/4)".into()
            }
        );
        assert_eq!(b[1], BasisElement::new("Gamma(c2=1/2)"));
        assert_eq!(b[2], BasisElement::new("zeta(2)*Delta(0)"));
        assert!(parse_basis(" ; ").is_err());
        assert!(parse_basis("A=Gamma(0); A=Delta(0)").is_err());
        assert!(parse_basis("A=").is_err());
    }

    #[test]
    fn combinations_read_back_as_formulas() {
        let q = |n: i64, d: i64| rug::Rational::from((n, d));
        assert_eq!(
            combination(
                &[q(-1, 2), q(0, 1), q(1, 1), q(3, 4)],
                &[
                    "zeta(2)*Gamma(pi/4)",
                    "Gamma(0)",
                    "Delta(pi/3)",
                    "Gamma(0) - Delta(0)"
                ]
            ),
            "-1/2*zeta(2)*Gamma(pi/4) + Delta(pi/3) + 3/4*(Gamma(0) - Delta(0))"
        );
        assert_eq!(combination(&[q(2, 1)], &["-Gamma(0)"]), "2*(-Gamma(0))");
        assert_eq!(
            combination(&[q(2, 1)], &["g^-2*Gamma(0)"]),
            "2*g^-2*Gamma(0)"
        );
        assert_eq!(combination(&[q(0, 1)], &["Gamma(0)"]), "0");
    }

    #[test]
    fn key_lines() {
        assert_eq!(
            key_line("coupling: g2\nsymbols : [a]\n", "symbols"),
            Some(2)
        );
        assert_eq!(key_line("symbolsx: 1\n", "symbols"), None);
    }
}
