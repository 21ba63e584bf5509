//! The checks behind `loopwise origin` and `loopwise fit`, from a series file
//! to a report value: reading origin files (polynomials in the logs, E or R6,
//! any coupling) into exact series in g^2, judging what [`crate::origin`]
//! reads from them against the predictions with the verdicts of `check`
//! ([`crate::compare::judge`]), and running [`crate::fit`] on the loop
//! coefficients of a file with a basis given on the command line.
//!
//! Coefficients are compared in the file's own coupling: the analysis runs
//! in g^2, and readings and predictions are converted back order by order
//! (a rescaling, which no exact verdict can notice).

use crate::catalogue::{Catalogue, Entry};
use crate::compare::{judge, Supplied, Verdict};
use crate::coupling::Coupling;
use crate::error::{Error, Result};
use crate::fit::{self, BasisElement, Fit};
use crate::kernel::{self, MAX_LOOPS};
use crate::origin::{self, Breakdown, HexagonSlot, OriginLogs};
use crate::prediction::{Expander, Quantity};
use crate::ring::Exact;
use crate::series::Series;
use crate::seriesfile::{parse_series_text, Normalisation, OrderEntry, SeriesFile, MAX_FILE_BYTES};

/// An origin file, read and checked: the coefficients as one series in g^2.
#[derive(Clone, Debug)]
pub struct OriginData {
    pub file: SeriesFile,
    pub logs: OriginLogs,
    pub normalisation: Normalisation,
    /// Coefficients of g^(2L), L = 0 .. highest order; 1 (E) or 0 (R6) at g^0.
    pub series: Series,
}

/// Reads an origin file from disk.
pub fn read_origin_file(path: &std::path::Path) -> Result<OriginData> {
    parse_origin_text(&read_text(path)?, &path.display().to_string())
}

/// Reads a series file's text from disk, with the limits of series files.
pub fn read_text(path: &std::path::Path) -> Result<String> {
    let origin = path.display().to_string();
    let meta = std::fs::metadata(path).map_err(|e| Error::io(format!("cannot read {origin}: {e}")))?;
    if meta.len() > MAX_FILE_BYTES as u64 {
        return Err(Error::input(format!("{origin} is larger than {MAX_FILE_BYTES} bytes; is it really a series file?")));
    }
    let bytes = std::fs::read(path).map_err(|e| Error::io(format!("cannot read {origin}: {e}")))?;
    String::from_utf8(bytes).map_err(|e| {
        Error::input(format!("{origin} is not UTF-8 text (bad byte at offset {})", e.utf8_error().valid_up_to()))
    })
}

/// The line (from 1) where a top-level key is written, for messages about
/// keys whose value the series-file reader does not locate.
fn key_line(text: &str, key: &str) -> Option<usize> {
    text.lines().position(|l| l.strip_prefix(key).is_some_and(|rest| rest.trim_start().starts_with(':'))).map(|i| i + 1)
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
    let logs = OriginLogs::from_symbols(&file.symbols).map_err(|e| match key_line(text, "symbols") {
        Some(line) => e.context(format!("line {line} of {origin}")),
        None => e.context(origin),
    })?;
    let mut coeffs = vec![Exact::zero(); highest(&file) as usize + 1];
    for entry in &file.orders {
        coeffs[entry.loop_order as usize] = exact_coefficient(&file, entry)?;
    }
    // R6 vanishes at one loop by definition, so an R6 file may start at two.
    let first = if normalisation == Normalisation::R6 { 2 } else { 1 };
    if let Some(missing) = (first..coeffs.len()).find(|&k| !file.orders.iter().any(|o| o.loop_order as usize == k)) {
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
    Ok(OriginData { file, logs, normalisation, series })
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
        place: Some((located.line, located.column)),
        loops: 0,
        cache: std::collections::HashMap::new(),
        progress: &mut |_, _, _| {},
    };
    Ok(expander.series(&located.expr)?.coeff(0).clone())
}

/// One coefficient read from the data, with its verdict.
#[derive(Clone, Debug)]
pub struct Judged {
    pub supplied: Exact,
    pub predicted: Option<Exact>,
    pub verdict: Verdict,
}

impl Judged {
    fn new(supplied: Exact, predicted: Option<Exact>, digits: u32) -> Result<Self> {
        let verdict = match &predicted {
            Some(p) => judge(&Supplied::Exact(supplied.clone()), p, digits)?,
            None => Verdict::NotPredicted,
        };
        Ok(Judged { supplied, predicted, verdict })
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
        let mut v = vec![&self.octagon.verdict, &self.linear.verdict, &self.constant.verdict];
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
    pub broken: Option<Breakdown>,
    /// The file's C0 formula, as written.
    pub formula: Option<String>,
    pub octagon_entry: Option<Entry>,
    pub hexagon_entry: Option<Entry>,
    pub digits: u32,
}

impl OriginCheck {
    /// Every compared coefficient agrees and every order exponentiates.
    pub fn agrees(&self) -> bool {
        self.broken.is_none() && !self.rows.iter().any(OriginRow::differs)
    }

    /// "orders 1-4 agree, order 5 breaks exponentiation, orders 6-7 not examined".
    pub fn summary(&self) -> String {
        let mut classes: Vec<(u32, &'static str)> =
            self.rows.iter().map(|r| (r.loop_order, if r.differs() { "differ" } else { "agree" })).collect();
        if let Some(b) = &self.broken {
            classes.push((b.order as u32, "break exponentiation"));
            classes.extend((b.order as u32 + 1..=self.highest).map(|l| (l, "not examined")));
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
}

/// The coefficient of order k of a g^2 series, written in `coupling`.
fn in_file(c: &Exact, k: usize, coupling: Coupling) -> Exact {
    let mut coeffs = vec![Exact::zero(); k + 1];
    coeffs[k] = c.clone();
    Series::new(coeffs).in_coupling(coupling).coeff(k).clone()
}

/// Runs the exponentiation check and judges every reading.
pub fn check_origin(data: &OriginData, catalogue: &Catalogue, digits: u32) -> Result<OriginCheck> {
    let file = &data.file;
    let top = data.series.order();
    let reach = (top as u32).clamp(1, MAX_LOOPS);
    let analysis = match data.normalisation {
        Normalisation::E => origin::analyse_e(&data.series, &data.logs),
        Normalisation::R6 => {
            if top as u32 > MAX_LOOPS {
                return Err(Error::range(format!(
                    "{}: converting R6 needs Gamma_cusp through {top} loops; the exact engine reaches {MAX_LOOPS}",
                    file.origin
                )));
            }
            let cusp = kernel::gamma(&kernel::Tilt::cos2(rug::Rational::from((1, 2)))?, reach, &mut |_, _| {})?;
            origin::analyse_r6(&data.series, &cusp, &data.logs)
        }
    }
    .map_err(|e| e.context(&file.origin))?;
    let predicted = origin::predicted_log_coefficients(reach)?;
    let formula = match &file.prediction {
        None => None,
        Some(located) => {
            let quantity = match file.catalogue_name() {
                Some(name) => Quantity::from_entry(catalogue.lookup(name).map_err(|e| e.context(&file.origin))?)?,
                None => Quantity::from_formula(&located.text, located.expr.clone(), &file.origin, (located.line, located.column)),
            };
            Some((quantity.definition.trim().to_string(), quantity.expand(reach, &mut |_, _, _| {})?))
        }
    };
    let c = file.coupling;
    let predicted_at = |s: &Series, k: usize| (k <= s.order()).then(|| in_file(s.coeff(k), k, c));
    let mut rows = Vec::new();
    for r in &analysis.orders {
        let k = r.order;
        let hexagon = match &r.hexagon {
            HexagonSlot::Value(v) => HexagonCell::Judged(Judged::new(in_file(v, k, c), predicted_at(&predicted.hexagon, k), digits)?),
            HexagonSlot::NotTestableOnLine => HexagonCell::NotTestableOnLine,
        };
        let constant = in_file(&r.constant, k, c);
        let one_loop = (k == 1).then(|| in_file(&origin::one_loop_constant(), 1, c));
        let formula_cell = match &formula {
            Some((_, s)) => Some(Judged::new(constant.clone(), predicted_at(s, k), digits)?),
            None => None,
        };
        rows.push(OriginRow {
            loop_order: k as u32,
            octagon: Judged::new(in_file(&r.octagon, k, c), predicted_at(&predicted.octagon, k), digits)?,
            hexagon,
            linear: Judged::new(in_file(&r.linear, k, c), Some(Exact::zero()), digits)?,
            constant: Judged::new(constant, one_loop, digits)?,
            formula: formula_cell,
        });
    }
    let broken = analysis.broken.map(|b| Breakdown {
        order: b.order,
        high_degree: in_file(&b.high_degree, b.order, c),
        asymmetric: in_file(&b.asymmetric, b.order, c),
    });
    Ok(OriginCheck {
        file: file.origin.clone(),
        about: file.about.clone(),
        coupling: c,
        normalisation: data.normalisation,
        logs: data.logs.clone(),
        highest: top as u32,
        rows,
        broken,
        formula: formula.map(|(f, _)| f),
        octagon_entry: catalogue.get("octagon").cloned(),
        hexagon_entry: catalogue.get("hexagon").cloned(),
        digits,
    })
}

// ---------------------------------------------------------------------------
// Fits from files.

/// The loop coefficients of a file as fit data in g^2: exact, without symbols.
pub fn fit_target(file: &SeriesFile) -> Result<Vec<(u32, Exact)>> {
    let mut out = Vec::new();
    for entry in &file.orders {
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
        out.push((entry.loop_order, Series::new(coeffs).from_coupling(file.coupling).coeff(k).clone()));
    }
    Ok(out)
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
            Some((name, formula)) if !formula.trim().is_empty() => {
                BasisElement { name: name.trim().to_string(), formula: formula.trim().to_string() }
            }
            Some((name, _)) => return Err(Error::input(format!("basis element `{}` has no formula after `=`", name.trim()))),
            None => BasisElement::new(item),
        };
        if out.iter().any(|e| e.name == element.name) {
            return Err(Error::input(format!("basis element `{}` is given twice", element.name)));
        }
        out.push(element);
    }
    if out.is_empty() {
        return Err(Error::input("--basis lists no elements; write e.g. \"A=Gamma(pi/4); B=zeta(2)*Gamma(0)\""));
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
        self.elements.iter().find(|e| e.name == name).map_or(name, |e| e.formula.as_str())
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
pub fn fit_file(file: &SeriesFile, elements: Vec<BasisElement>, ceiling: u32) -> Result<FitReport> {
    if ceiling == 0 || ceiling > MAX_LOOPS {
        return Err(Error::range(format!("--ceiling {ceiling} is out of range: 1 to {MAX_LOOPS} loops")));
    }
    let target = fit_target(file)?;
    if let Some((l, _)) = target.iter().find(|(l, _)| *l > MAX_LOOPS) {
        return Err(Error::range(format!(
            "{}: loop {l} is beyond the exact engine's {MAX_LOOPS} loops, so the basis cannot be expanded that far",
            file.origin
        )));
    }
    let fit = fit::fit(&target, &elements, ceiling).map_err(|e| e.context(&file.origin))?;
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
        let f = if needs_parentheses(f) { format!("({})", f.trim()) } else { f.trim().to_string() };
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
        assert_eq!(b[0], BasisElement { name: "A".into(), formula: "Gamma(pi/4)".into() });
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
            combination(&[q(-1, 2), q(0, 1), q(1, 1), q(3, 4)], &["zeta(2)*Gamma(pi/4)", "Gamma(0)", "Delta(pi/3)", "Gamma(0) - Delta(0)"]),
            "-1/2*zeta(2)*Gamma(pi/4) + Delta(pi/3) + 3/4*(Gamma(0) - Delta(0))"
        );
        assert_eq!(combination(&[q(2, 1)], &["-Gamma(0)"]), "2*(-Gamma(0))");
        assert_eq!(combination(&[q(2, 1)], &["g^-2*Gamma(0)"]), "2*g^-2*Gamma(0)");
        assert_eq!(combination(&[q(0, 1)], &["Gamma(0)"]), "0");
    }

    #[test]
    fn key_lines() {
        assert_eq!(key_line("coupling: g2\nsymbols : [a]\n", "symbols"), Some(2));
        assert_eq!(key_line("symbolsx: 1\n", "symbols"), None);
    }
}
