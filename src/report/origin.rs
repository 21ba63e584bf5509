//! The report of `origin`: one row per loop order with the exponentiation
//! status and the verdicts on the octagon and hexagon coefficients, the
//! linear term and the constant, then the readings, the differences, where
//! exponentiation breaks, a summary line and notes; as text for people or
//! JSON/YAML for pipelines (the same content either way). A file read
//! numerically shows its readings as numbers with their propagated
//! uncertainties, `20.834722249(13)`.

use serde::Serialize;

use super::{decimal, in_units_text, DataFormat, JsonVerdict};
use crate::check::Verdict;
use crate::error::Result;
use crate::exact::ring::{EvenStyle, Exact, Notation};
use crate::input::catalogue::{Entry, Status};
use crate::numeric::Estimate;
use crate::origin::check::{Broken, HexagonCell, Judged, OriginCheck, Reading};
use crate::origin::numeric::{monomial_text, NumTerm};
use crate::origin::OriginLogs;
use crate::report::decimal::bracketed;

fn show(x: &Exact, even: EvenStyle) -> String {
    x.format(even, Notation::Text)
}

/// Significant digits of numbers shown without an uncertainty.
const SHOWN_DIGITS: u32 = 20;

fn show_reading(r: &Reading, even: EvenStyle, digits: u32) -> String {
    match r {
        Reading::Exact(x) => show(x, even),
        Reading::Number(a) => bracketed(a, digits.min(SHOWN_DIGITS)),
    }
}

/// What an uncertainty propagated from implied ones is, in the words of the report.
const PROPAGATED_BOUND: &str = "the rounding bound propagated from the written digits";

/// |value| / uncertainty, when there is an uncertainty.
fn sigmas_of(a: &Estimate) -> Option<rug::Float> {
    (!a.error.is_zero()).then(|| rug::Float::with_val(a.value.prec(), a.value.abs_ref()) / &a.error)
}

/// One term that breaks exponentiation, with how far it is from zero.
fn term_text(t: &NumTerm, logs: &OriginLogs, digits: u32) -> String {
    let size = match sigmas_of(&t.coefficient) {
        Some(s) if t.coefficient.stated => format!("{} sigma", decimal(&s, 3)),
        Some(s) => format!("{} times {PROPAGATED_BOUND}", decimal(&s, 3)),
        None => "beyond the working precision".to_string(),
    };
    format!(
        "{}*{} ({size})",
        bracketed(&t.coefficient, digits.min(SHOWN_DIGITS)),
        monomial_text(t.exponents, logs)
    )
}

/// The high-degree and asymmetric parts of a break, as text.
fn break_parts(b: &Broken, logs: &OriginLogs, even: EvenStyle, digits: u32) -> (String, String) {
    let terms = |ts: &[NumTerm]| {
        if ts.is_empty() {
            "0".to_string()
        } else {
            ts.iter()
                .map(|t| term_text(t, logs, digits))
                .collect::<Vec<_>>()
                .join(" + ")
                .replace("+ -", "- ")
        }
    };
    match b {
        Broken::Exact(b) => (show(&b.high_degree, even), show(&b.asymmetric, even)),
        Broken::Numeric(b) => (terms(&b.high_degree), terms(&b.asymmetric)),
    }
}

#[derive(Serialize)]
struct JsonCell {
    #[serde(flatten)]
    verdict: JsonVerdict,
    supplied: Option<String>,
    predicted: Option<String>,
    /// For numerical readings: the value, its uncertainty and whether that
    /// came from uncertainties the file states.
    #[serde(skip_serializing_if = "Option::is_none")]
    supplied_value: Option<String>,
    #[serde(skip_serializing_if = "Option::is_none")]
    uncertainty: Option<String>,
    #[serde(skip_serializing_if = "Option::is_none")]
    uncertainty_stated: Option<bool>,
    #[serde(skip_serializing_if = "Option::is_none")]
    predicted_value: Option<String>,
}

impl JsonCell {
    fn empty(verdict: JsonVerdict) -> Self {
        JsonCell {
            verdict,
            supplied: None,
            predicted: None,
            supplied_value: None,
            uncertainty: None,
            uncertainty_stated: None,
            predicted_value: None,
        }
    }
}

fn cell(j: &Judged, even: EvenStyle, digits: u32) -> JsonCell {
    let mut out = JsonCell::empty(JsonVerdict::of(&j.verdict, |x| show(x, even)));
    out.supplied = Some(show_reading(&j.supplied, even, digits));
    out.predicted = j.predicted.as_ref().map(|p| show(p, even));
    if let Reading::Number(a) = &j.supplied {
        out.supplied_value = Some(decimal(&a.value, digits.min(SHOWN_DIGITS)));
        out.uncertainty = Some(decimal(&a.error, 3));
        out.uncertainty_stated = Some(a.stated);
        out.predicted_value = j
            .predicted
            .as_ref()
            .and_then(|p| p.evaluate(a.value.prec()).ok())
            .map(|v| decimal(&v, 20));
    }
    out
}

#[derive(Serialize)]
struct JsonOrder {
    #[serde(rename = "loop")]
    loop_order: u32,
    /// holds | broken | not-examined
    exponentiation: &'static str,
    octagon: Option<JsonCell>,
    hexagon: Option<JsonCell>,
    linear: Option<JsonCell>,
    constant: Option<JsonCell>,
    #[serde(skip_serializing_if = "Option::is_none")]
    constant_formula: Option<JsonCell>,
}

#[derive(Serialize)]
struct JsonBreak {
    #[serde(rename = "loop")]
    loop_order: u32,
    high_degree: String,
    asymmetric: String,
    /// For a file read numerically: each term found nonzero.
    #[serde(skip_serializing_if = "Vec::is_empty")]
    terms: Vec<JsonTerm>,
}

#[derive(Serialize)]
struct JsonTerm {
    /// high-degree | asymmetric
    part: &'static str,
    monomial: String,
    value: String,
    uncertainty: String,
    uncertainty_stated: bool,
    /// |value| in units of a stated uncertainty, or of a rounding bound when none is stated.
    #[serde(skip_serializing_if = "Option::is_none")]
    sigmas: Option<String>,
    #[serde(skip_serializing_if = "Option::is_none")]
    rounding_bounds: Option<String>,
}

fn json_break(b: &Broken, logs: &OriginLogs, even: EvenStyle, digits: u32) -> JsonBreak {
    let (high_degree, asymmetric) = break_parts(b, logs, even, digits);
    let mut terms = Vec::new();
    if let Broken::Numeric(n) = b {
        for (part, ts) in [
            ("high-degree", &n.high_degree),
            ("asymmetric", &n.asymmetric),
        ] {
            terms.extend(ts.iter().map(|t| {
                JsonTerm {
                    part,
                    monomial: monomial_text(t.exponents, logs),
                    value: decimal(&t.coefficient.value, digits.min(SHOWN_DIGITS)),
                    uncertainty: decimal(&t.coefficient.error, 3),
                    uncertainty_stated: t.coefficient.stated,
                    sigmas: sigmas_of(&t.coefficient)
                        .filter(|_| t.coefficient.stated)
                        .map(|s| decimal(&s, 4)),
                    rounding_bounds: sigmas_of(&t.coefficient)
                        .filter(|_| !t.coefficient.stated)
                        .map(|s| decimal(&s, 4)),
                }
            }));
        }
    }
    JsonBreak {
        loop_order: b.order() as u32,
        high_degree,
        asymmetric,
        terms,
    }
}

#[derive(Serialize)]
struct JsonReport {
    file: String,
    normalisation: String,
    logs: Vec<String>,
    line: bool,
    coupling: &'static str,
    c0_formula: Option<String>,
    exponentiates: bool,
    broken: Option<JsonBreak>,
    agrees: bool,
    orders: Vec<JsonOrder>,
    /// Slips that would make every order exponentiate and agree.
    diagnoses: Vec<String>,
    summary: String,
    notes: Vec<String>,
    /// The orders written with numbers; the analysis was numerical when any is.
    #[serde(skip_serializing_if = "Vec::is_empty")]
    numeric_orders: Vec<u32>,
}

pub fn render(c: &OriginCheck, format: DataFormat, even: EvenStyle) -> Result<String> {
    match format {
        DataFormat::Text => Ok(text(c, even)),
        DataFormat::Json | DataFormat::Yaml => super::serialized(&json(c, even), format),
    }
}

fn json(c: &OriginCheck, even: EvenStyle) -> JsonReport {
    let d = c.digits;
    let mut orders: Vec<JsonOrder> = c
        .rows
        .iter()
        .map(|r| JsonOrder {
            loop_order: r.loop_order,
            exponentiation: "holds",
            octagon: Some(cell(&r.octagon, even, d)),
            hexagon: match &r.hexagon {
                HexagonCell::Judged(j) => Some(cell(j, even, d)),
                HexagonCell::NotTestableOnLine => {
                    Some(JsonCell::empty(JsonVerdict::named("not-testable-on-line")))
                }
            },
            linear: Some(cell(&r.linear, even, d)),
            constant: Some(cell(&r.constant, even, d)),
            constant_formula: r.formula.as_ref().map(|f| cell(f, even, d)),
        })
        .collect();
    if let Some(b) = &c.broken {
        for l in b.order() as u32..=c.highest {
            orders.push(JsonOrder {
                loop_order: l,
                exponentiation: if l == b.order() as u32 {
                    "broken"
                } else {
                    "not-examined"
                },
                octagon: None,
                hexagon: None,
                linear: None,
                constant: None,
                constant_formula: None,
            });
        }
    }
    JsonReport {
        file: c.file.clone(),
        normalisation: c.normalisation.to_string(),
        logs: c.logs.names().iter().map(|s| s.to_string()).collect(),
        line: c.on_line(),
        coupling: c.coupling.name(),
        c0_formula: c.formula.clone(),
        exponentiates: c.broken.is_none(),
        broken: c.broken.as_ref().map(|b| json_break(b, &c.logs, even, d)),
        agrees: c.agrees(),
        orders,
        diagnoses: c.diagnoses.clone(),
        summary: c.summary(),
        notes: notes(c),
        numeric_orders: c.numeric.clone(),
    }
}

fn mark(v: &Verdict) -> &'static str {
    if v.agrees() {
        "ok"
    } else if v.differs() {
        "DIFF"
    } else {
        "-"
    }
}

fn entry_status(e: &Option<Entry>) -> Option<Status> {
    e.as_ref().map(|e| e.status)
}

/// The notes under every report: what was predicted, by whom it is held, and
/// what could not be tested.
pub fn notes(c: &OriginCheck) -> Vec<String> {
    let mut out = Vec::new();
    let oct = match entry_status(&c.octagon_entry) {
        Some(Status::Conjecture) => "a conjecture of the literature",
        _ => "established",
    };
    out.push(format!("octagon: the coefficient of ln^2(u1 u2 u3) is predicted as -Gamma_oct/24, Gamma_oct = Gamma(0) ({oct})."));
    if c.on_line() {
        out.push(
            "on the line u1 = u2 = u3 only Gamma_oct is testable: sum_i ln^2(u_i/u_(i+1)) vanishes there, so the \
             hexagon coefficient cannot be read, and the symmetry part of the exponentiation check is empty."
                .to_string(),
        );
    } else {
        let hex = match &c.hexagon_entry {
            Some(e) if e.status == Status::Conjecture => {
                let refs = if e.references.is_empty() {
                    String::new()
                } else {
                    format!(", {}", e.references.join(", "))
                };
                format!("a conjecture of the literature{refs}, not a theorem")
            }
            Some(_) => "established".to_string(),
            None => "not in the catalogue".to_string(),
        };
        out.push(format!("hexagon: the coefficient of sum_i ln^2(u_i/u_(i+1)) is predicted as -Gamma_hex/24, Gamma_hex = Gamma(pi/3) ({hex})."));
    }
    out.push("linear: the predicted form has no ln(u1 u2 u3) term; a nonzero one counts as a difference.".to_string());
    out.push(
        "C0: only its one-loop value -3 zeta(2) is predicted (from Li2(1 - 1/u) -> -ln^2(u)/2 - zeta(2), Abramowitz & \
         Stegun 27.7); loopwise ships no all-order formula for it."
            .to_string(),
    );
    if let Some(f) = &c.formula {
        out.push(format!(
            "C0 formula `{f}` comes from the file: it is the user's conjecture, compared at every order, not a prediction of loopwise."
        ));
    }
    if c.normalisation == crate::input::seriesfile::Normalisation::R6 {
        out.push(
            "R6 was read as ln E = R6 + Gamma_cusp/4 E^(1), with Gamma_cusp = Gamma(pi/4)."
                .to_string(),
        );
    }
    if c.is_numeric() {
        let orders: Vec<String> = c.numeric.iter().map(u32::to_string).collect();
        let which = match orders.as_slice() {
            [one] => format!("order {one} is"),
            _ => format!("orders {} are", orders.join(", ")),
        };
        out.push(format!(
            "read numerically: {which} written with numbers outside the exact ring, so every order was taken \
             as a polynomial in the logs with numerical coefficients at {} digits (exact ones without uncertainty). \
             Uncertainties are those written ((1), ±) or half a unit in the last written digit, propagated to first \
             order in the worst case (|a| u_b + |b| u_a for products, sums for sums) through ln E; readings are \
             shown as value(uncertainty in the last digits). As in `check`, a reading agrees within 3 sigma of a \
             stated uncertainty, within the rounding bound of an implied one, or to the working precision without \
             one, and a term of degree > 2 or an asymmetric part breaks exponentiation only when it is nonzero by \
             the same rule.",
            c.digits
        ));
    }
    out
}

fn text(c: &OriginCheck, even: EvenStyle) -> String {
    let mut out = String::new();
    let logs = c.logs.names().join(", ");
    let kind = if c.on_line() {
        format!("the line u1 = u2 = u3, log {logs}")
    } else {
        format!("logs {logs}")
    };
    out.push_str(&format!(
        "{}: six-gluon amplitude at the origin, normalisation {}, {kind}, coefficients of {}^L\n",
        c.file,
        c.normalisation,
        match c.coupling.symbol() {
            "g^2" => "(g^2)",
            s => s,
        }
    ));
    if !c.about.is_empty() {
        let about: Vec<String> = c.about.iter().map(|(k, v)| format!("{k}: {v}")).collect();
        out.push_str(&super::wrap(&format!("about: {}", about.join("; ")), 88));
    }
    out.push('\n');
    out.push_str(&super::wrap(
        "ln E = octagon * ln^2(u1 u2 u3) + hexagon * sum_i ln^2(u_i/u_(i+1)) + linear * ln(u1 u2 u3) + C0 \
         is read at each order where ln E is a symmetric polynomial of degree <= 2 in the logs.",
        88,
    ));
    out.push('\n');

    let with_formula = c.formula.is_some();
    let mut header = format!(
        "{:>4}  {:<13}  {:<7}  {:<7}  {:<6}  {:<5}",
        "L", "exponentiates", "octagon", "hexagon", "linear", "C0"
    );
    if with_formula {
        header.push_str("  C0 formula");
    }
    out.push_str(header.trim_end());
    out.push('\n');
    for r in &c.rows {
        let hex = match &r.hexagon {
            HexagonCell::Judged(j) => mark(&j.verdict),
            HexagonCell::NotTestableOnLine => "n/a",
        };
        let mut line = format!(
            "{:>4}  {:<13}  {:<7}  {:<7}  {:<6}  {:<5}",
            r.loop_order,
            "yes",
            mark(&r.octagon.verdict),
            hex,
            mark(&r.linear.verdict),
            mark(&r.constant.verdict)
        );
        if let Some(f) = &r.formula {
            line.push_str(&format!("  {}", mark(&f.verdict)));
        }
        out.push_str(line.trim_end());
        out.push('\n');
    }
    if let Some(b) = &c.broken {
        out.push_str(&format!("{:>4}  NO (see below)\n", b.order()));
        if c.highest > b.order() as u32 {
            let rest = if c.highest == b.order() as u32 + 1 {
                format!("{:>4}  not examined\n", c.highest)
            } else {
                format!(
                    "{:>4}  not examined (orders {}-{})\n",
                    "",
                    b.order() + 1,
                    c.highest
                )
            };
            out.push_str(&rest);
        }
    }

    if !c.rows.is_empty() {
        out.push_str("\nreadings:\n");
        for r in &c.rows {
            let hex = match &r.hexagon {
                HexagonCell::Judged(j) => show_reading(&j.supplied, even, c.digits),
                HexagonCell::NotTestableOnLine => "n/a".to_string(),
            };
            let mut line = format!(
                "L={}: octagon {}; hexagon {hex}; C0 {}",
                r.loop_order,
                show_reading(&r.octagon.supplied, even, c.digits),
                show_reading(&r.constant.supplied, even, c.digits)
            );
            if !r.linear.supplied.is_zero() {
                line.push_str(&format!(
                    "; linear {}",
                    show_reading(&r.linear.supplied, even, c.digits)
                ));
            }
            out.push_str(&indent(&super::wrap(&line, 84)));
        }
    }

    let mut differences = Vec::new();
    for r in &c.rows {
        let mut cells: Vec<(&str, &Judged)> = vec![("octagon", &r.octagon)];
        if let HexagonCell::Judged(j) = &r.hexagon {
            cells.push(("hexagon", j));
        }
        cells.push(("linear", &r.linear));
        cells.push(("C0", &r.constant));
        if let Some(f) = &r.formula {
            cells.push(("C0 formula", f));
        }
        for (name, j) in cells {
            let predicted = j
                .predicted
                .as_ref()
                .map_or(String::new(), |p| show(p, even));
            let supplied = show_reading(&j.supplied, even, c.digits);
            match &j.verdict {
                Verdict::DiffersExactly { difference, size } => differences.push(format!(
                    "L={} {name}: supplied {supplied}, predicted {predicted}; supplied - predicted = {} = {}",
                    r.loop_order,
                    show(difference, even),
                    decimal(size, 6)
                )),
                Verdict::DiffersNumerically { difference, in_units, .. } => {
                    let value = j
                        .predicted
                        .as_ref()
                        .and_then(|p| p.evaluate(crate::numeric::working_bits(c.digits)).ok())
                        .map_or(String::new(), |v| format!(" = {}", decimal(&v, 12)));
                    let s = in_units.as_ref().map_or(String::new(), |u| format!(" = {}", in_units_text(u, 3, PROPAGATED_BOUND)));
                    differences.push(format!(
                        "L={} {name}: supplied {supplied}, predicted {predicted}{value}; supplied - predicted = {}{s}",
                        r.loop_order,
                        decimal(difference, 6)
                    ));
                }
                _ => {}
            }
        }
    }
    if !differences.is_empty() {
        out.push_str("\ndifferences:\n");
        for d in differences {
            out.push_str(&indent(&super::wrap(&d, 84)));
        }
    }

    if let Some(b) = &c.broken {
        let within = if c.is_numeric() {
            " (beyond the uncertainties)"
        } else {
            ""
        };
        out.push_str(&format!("\nexponentiation breaks at order {}: ln E is not a symmetric polynomial of degree <= 2 there{within}.\n", b.order()));
        let (high_degree, asymmetric) = break_parts(b, &c.logs, even, c.digits);
        if high_degree != "0" {
            out.push_str(&indent(&super::wrap(
                &format!("terms of degree > 2 in the logs: {high_degree}"),
                84,
            )));
        }
        if asymmetric != "0" {
            out.push_str(&indent(&super::wrap(
                &format!("part of degree <= 2 that is not symmetric in the logs: {asymmetric}"),
                84,
            )));
        }
        if c.highest > b.order() as u32 {
            out.push_str(&indent(&format!(
                "orders above {} are not compared.\n",
                b.order()
            )));
        }
    }

    if !c.diagnoses.is_empty() {
        out.push_str("\ndiagnosis:\n");
        for d in &c.diagnoses {
            for (i, line) in super::wrap(d, 84).lines().enumerate() {
                out.push_str(if i == 0 { "  - " } else { "    " });
                out.push_str(line);
                out.push('\n');
            }
        }
    }
    out.push_str(&format!("\nsummary: {}\n", c.summary()));
    out.push_str("notes:\n");
    for n in notes(c) {
        let wrapped = super::wrap(&n, 84);
        for (i, line) in wrapped.lines().enumerate() {
            out.push_str(if i == 0 { "  - " } else { "    " });
            out.push_str(line);
            out.push('\n');
        }
    }
    out
}

fn indent(text: &str) -> String {
    text.lines().map(|l| format!("  {l}\n")).collect()
}
