//! The report of `origin`: one row per loop order with the exponentiation
//! status and the verdicts on the octagon and hexagon coefficients, the
//! linear term and the constant, then the readings, the differences, where
//! exponentiation breaks, a summary line and notes; as text for people or
//! JSON/YAML for pipelines (the same content either way).

use serde::Serialize;

use super::{decimal, Format};
use crate::catalogue::{Entry, Status};
use crate::compare::Verdict;
use crate::error::{Error, Result};
use crate::origincheck::{HexagonCell, Judged, OriginCheck};
use crate::ring::{EvenStyle, Exact, Notation};

fn show(x: &Exact, even: EvenStyle) -> String {
    x.format(even, Notation::Text)
}

#[derive(Serialize)]
struct JsonCell {
    verdict: &'static str,
    supplied: Option<String>,
    predicted: Option<String>,
    #[serde(skip_serializing_if = "Option::is_none")]
    difference: Option<String>,
    #[serde(skip_serializing_if = "Option::is_none")]
    difference_value: Option<String>,
}

fn cell(j: &Judged, even: EvenStyle) -> JsonCell {
    let (difference, difference_value) = match &j.verdict {
        Verdict::DiffersExactly { difference, size } => (Some(show(difference, even)), Some(decimal(size, 20))),
        Verdict::DiffersNumerically { difference, .. } => (None, Some(decimal(difference, 20))),
        _ => (None, None),
    };
    JsonCell {
        verdict: j.verdict.name(),
        supplied: Some(show(&j.supplied, even)),
        predicted: j.predicted.as_ref().map(|p| show(p, even)),
        difference,
        difference_value,
    }
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
    summary: String,
    notes: Vec<String>,
}

pub fn render(c: &OriginCheck, format: Format, even: EvenStyle) -> Result<String> {
    match format {
        Format::Text => Ok(text(c, even)),
        Format::Json => {
            let mut s = serde_json::to_string_pretty(&json(c, even)).map_err(|e| Error::io(e.to_string()))?;
            s.push('\n');
            Ok(s)
        }
        Format::Yaml => serde_yaml::to_string(&json(c, even)).map_err(|e| Error::io(e.to_string())),
        Format::Latex => Err(Error::input("the origin report comes as text, json or yaml")),
    }
}

fn json(c: &OriginCheck, even: EvenStyle) -> JsonReport {
    let mut orders: Vec<JsonOrder> = c
        .rows
        .iter()
        .map(|r| JsonOrder {
            loop_order: r.loop_order,
            exponentiation: "holds",
            octagon: Some(cell(&r.octagon, even)),
            hexagon: match &r.hexagon {
                HexagonCell::Judged(j) => Some(cell(j, even)),
                HexagonCell::NotTestableOnLine => Some(JsonCell {
                    verdict: "not-testable-on-line",
                    supplied: None,
                    predicted: None,
                    difference: None,
                    difference_value: None,
                }),
            },
            linear: Some(cell(&r.linear, even)),
            constant: Some(cell(&r.constant, even)),
            constant_formula: r.formula.as_ref().map(|f| cell(f, even)),
        })
        .collect();
    if let Some(b) = &c.broken {
        for l in b.order as u32..=c.highest {
            orders.push(JsonOrder {
                loop_order: l,
                exponentiation: if l == b.order as u32 { "broken" } else { "not-examined" },
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
        broken: c.broken.as_ref().map(|b| JsonBreak {
            loop_order: b.order as u32,
            high_degree: show(&b.high_degree, even),
            asymmetric: show(&b.asymmetric, even),
        }),
        agrees: c.agrees(),
        orders,
        summary: c.summary(),
        notes: notes(c),
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
    out.push(format!(
        "octagon: the coefficient of ln^2(u1 u2 u3) is predicted as -Gamma_oct/24, Gamma_oct = Gamma(0) ({oct})."
    ));
    if c.on_line() {
        out.push(
            "on the line u1 = u2 = u3 only Gamma_oct is testable: sum_i ln^2(u_i/u_(i+1)) vanishes there, so the \
             hexagon coefficient cannot be read, and the symmetry part of the exponentiation check is empty."
                .to_string(),
        );
    } else {
        let hex = match &c.hexagon_entry {
            Some(e) if e.status == Status::Conjecture => {
                let refs = if e.references.is_empty() { String::new() } else { format!(", {}", e.references.join(", ")) };
                format!("a conjecture of the literature{refs}, not a theorem")
            }
            Some(_) => "established".to_string(),
            None => "not in the catalogue".to_string(),
        };
        out.push(format!(
            "hexagon: the coefficient of sum_i ln^2(u_i/u_(i+1)) is predicted as -Gamma_hex/24, Gamma_hex = Gamma(pi/3) ({hex})."
        ));
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
    if c.normalisation == crate::seriesfile::Normalisation::R6 {
        out.push("R6 was read as ln E = R6 + Gamma_cusp/4 E^(1), with Gamma_cusp = Gamma(pi/4).".to_string());
    }
    out
}

fn text(c: &OriginCheck, even: EvenStyle) -> String {
    let mut out = String::new();
    let logs = c.logs.names().join(", ");
    let kind = if c.on_line() { format!("the line u1 = u2 = u3, log {logs}") } else { format!("logs {logs}") };
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
    let mut header = format!("{:>4}  {:<13}  {:<7}  {:<7}  {:<6}  {:<5}", "L", "exponentiates", "octagon", "hexagon", "linear", "C0");
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
        out.push_str(&format!("{:>4}  NO (see below)\n", b.order));
        if c.highest > b.order as u32 {
            let rest = if c.highest == b.order as u32 + 1 {
                format!("{:>4}  not examined\n", c.highest)
            } else {
                format!("{:>4}  not examined (orders {}-{})\n", "", b.order + 1, c.highest)
            };
            out.push_str(&rest);
        }
    }

    if !c.rows.is_empty() {
        out.push_str("\nreadings:\n");
        for r in &c.rows {
            let hex = match &r.hexagon {
                HexagonCell::Judged(j) => show(&j.supplied, even),
                HexagonCell::NotTestableOnLine => "n/a".to_string(),
            };
            let mut line = format!(
                "L={}: octagon {}; hexagon {hex}; C0 {}",
                r.loop_order,
                show(&r.octagon.supplied, even),
                show(&r.constant.supplied, even)
            );
            if !r.linear.supplied.is_zero() {
                line.push_str(&format!("; linear {}", show(&r.linear.supplied, even)));
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
            if let Verdict::DiffersExactly { difference, size } = &j.verdict {
                let predicted = j.predicted.as_ref().map_or(String::new(), |p| show(p, even));
                differences.push(format!(
                    "L={} {name}: supplied {}, predicted {predicted}; supplied - predicted = {} = {}",
                    r.loop_order,
                    show(&j.supplied, even),
                    show(difference, even),
                    decimal(size, 6)
                ));
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
        out.push_str(&format!("\nexponentiation breaks at order {}: ln E is not a symmetric polynomial of degree <= 2 there.\n", b.order));
        if !b.high_degree.is_zero() {
            out.push_str(&indent(&super::wrap(&format!("terms of degree > 2 in the logs: {}", show(&b.high_degree, even)), 84)));
        }
        if !b.asymmetric.is_zero() {
            out.push_str(&indent(&super::wrap(
                &format!("part of degree <= 2 that is not symmetric in the logs: {}", show(&b.asymmetric, even)),
                84,
            )));
        }
        if c.highest > b.order as u32 {
            out.push_str(&indent(&format!("orders above {} are not compared.\n", b.order)));
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
