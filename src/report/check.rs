//! The report of `check`: one row per loop order with its verdict, the
//! diagnoses, and a summary line; as text for people or JSON/YAML for
//! pipelines (the same verdicts either way).

use rug::Float;
use serde::Serialize;

use super::expansion::status_line;
use super::{decimal, in_units_text, serialized, DataFormat, JsonVerdict};
use crate::check::propose::Proposal;
use crate::check::{Comparison, OrderResult, Verdict};
use crate::error::{Error, Result};

#[derive(Serialize)]
struct JsonOrder {
    #[serde(rename = "loop")]
    loop_order: u32,
    #[serde(flatten)]
    verdict: JsonVerdict,
    #[serde(skip_serializing_if = "Option::is_none")]
    label: Option<String>,
    supplied: Option<String>,
    predicted: Option<String>,
    #[serde(skip_serializing_if = "Option::is_none")]
    inconsistent_value: Option<&'static str>,
    /// The file's `value` judged against its own `exact`, with the size of the gap.
    #[serde(skip_serializing_if = "Option::is_none")]
    inconsistency: Option<JsonVerdict>,
}

#[derive(Serialize)]
struct JsonReport {
    file: String,
    prediction: String,
    definition: String,
    coupling: &'static str,
    status: Option<String>,
    agrees: bool,
    /// Supplied orders that were not compared; `agrees` is false when there are any.
    not_compared: Vec<u32>,
    orders: Vec<JsonOrder>,
    diagnoses: Vec<String>,
    summary: String,
    /// `check --identify`: exact forms proposed for agreeing numerical entries.
    #[serde(skip_serializing_if = "Vec::is_empty")]
    identified: Vec<JsonProposal>,
}

#[derive(Serialize)]
struct JsonProposal {
    #[serde(rename = "loop")]
    loop_order: u32,
    found: bool,
    relation: Option<String>,
    digits_used: Option<u32>,
    digits_to_spare: Option<i64>,
    /// Why nothing was found or attempted.
    #[serde(skip_serializing_if = "Option::is_none")]
    note: Option<String>,
}

fn json_proposal(p: &Proposal) -> JsonProposal {
    match &p.outcome {
        Ok(id) => JsonProposal {
            loop_order: p.loop_order,
            found: id.found.is_some(),
            relation: id.found.as_ref().map(|f| f.expression.clone()),
            digits_used: Some(id.digits_used),
            digits_to_spare: id.digits_to_spare.filter(|_| id.found.is_some()),
            note: id
                .found
                .is_none()
                .then(|| "no relation the digits can confirm".to_string()),
        },
        Err(why) => JsonProposal {
            loop_order: p.loop_order,
            found: false,
            relation: None,
            digits_used: None,
            digits_to_spare: None,
            note: Some(why.clone()),
        },
    }
}

/// The lines of `check --identify`.
fn proposals_text(proposals: &[Proposal]) -> String {
    let mut out = String::from(
        "\nexact forms proposed for the agreeing numerical entries (numerical identification by \
         PSLQ in the weight basis of the prediction, not a proof):\n",
    );
    if proposals.is_empty() {
        out.push_str("  (no numerical entry agrees)\n");
    }
    for p in proposals {
        let line = match &p.outcome {
            Ok(id) => match &id.found {
                Some(f) => format!(
                    "{} digits used, {} to spare: {}",
                    id.digits_used,
                    id.digits_to_spare.unwrap_or(0),
                    f.expression
                ),
                None => format!("no relation the {} digits can confirm", id.digits_used),
            },
            Err(why) => format!("not attempted: {why}"),
        };
        out.push_str(&format!("  loop {:>2}: {line}\n", p.loop_order));
    }
    out
}

/// The report with the proposals of `check --identify`.
pub fn render_identified(
    c: &Comparison,
    proposals: &[Proposal],
    format: DataFormat,
) -> Result<String> {
    match format {
        DataFormat::Text => Ok(text(c) + &proposals_text(proposals)),
        DataFormat::Json | DataFormat::Yaml => {
            let mut j = json(c);
            j.identified = proposals.iter().map(json_proposal).collect();
            serialized(&j, format)
        }
    }
}

/// What an implied uncertainty is, in the words of the report.
const WRITTEN_BOUND: &str = "the rounding bound of the written digits";

fn short(x: &Float) -> String {
    decimal(x, 6)
}

fn json_order(o: &OrderResult) -> JsonOrder {
    JsonOrder {
        loop_order: o.loop_order,
        verdict: JsonVerdict::of(&o.verdict, ToString::to_string),
        label: o.label.clone(),
        supplied: o.supplied.as_ref().map(|s| s.text()),
        predicted: o.predicted.as_ref().map(|p| p.to_string()),
        inconsistent_value: o.inconsistent.as_ref().map(Verdict::name),
        inconsistency: o
            .inconsistent
            .as_ref()
            .map(|v| JsonVerdict::of(v, ToString::to_string)),
    }
}

/// (mark, verdict words, detail) for the text table.
fn text_row(o: &OrderResult, max_digits: u32) -> (&'static str, String, String) {
    let supplied = o.supplied.as_ref().map(|s| s.text()).unwrap_or_default();
    let (mark, words, mut detail) = match &o.verdict {
        Verdict::AgreesExactly => ("ok", "agrees exactly".to_string(), String::new()),
        Verdict::DiffersExactly { difference, size } => (
            "DIFF",
            "differs exactly".to_string(),
            format!("supplied - predicted = {difference} = {}", short(size)),
        ),
        Verdict::AgreesNumerically { digits, in_units } => {
            let d = if *digits >= max_digits {
                format!("{max_digits}+")
            } else {
                digits.to_string()
            };
            let s = in_units.as_ref().map_or(String::new(), |u| {
                format!(", {}", in_units_text(u, 2, WRITTEN_BOUND))
            });
            (
                "ok",
                format!("agrees to {d} digits"),
                format!("supplied {supplied}{s}"),
            )
        }
        Verdict::DiffersNumerically {
            difference,
            in_units,
            ..
        } => {
            let s = in_units.as_ref().map_or(String::new(), |u| {
                format!(" = {}", in_units_text(u, 3, WRITTEN_BOUND))
            });
            (
                "DIFF",
                "differs numerically".to_string(),
                format!(
                    "supplied {supplied}: supplied - predicted = {}{s}",
                    short(difference)
                ),
            )
        }
        Verdict::NotPredicted => (
            "-",
            "not predicted".to_string(),
            "beyond the orders the prediction reaches".to_string(),
        ),
        Verdict::NotSupplied => ("-", "not supplied".to_string(), String::new()),
    };
    if let Some(v) = &o.inconsistent {
        let size = match v {
            Verdict::DiffersNumerically {
                difference,
                in_units,
                ..
            } => {
                let u = in_units.as_ref().map_or(String::new(), |u| {
                    format!(" = {}", in_units_text(u, 3, WRITTEN_BOUND))
                });
                format!(": value - exact = {}{u}", short(difference))
            }
            Verdict::DiffersExactly { difference, size } => {
                format!(": value - exact = {difference} = {}", short(size))
            }
            _ => String::new(),
        };
        let value = o.value_text.as_deref().unwrap_or("");
        let gap = format!("the file's own value {value} disagrees with its exact{size}");
        detail = if detail.is_empty() {
            format!("but {gap}")
        } else {
            format!("{detail}; and {gap}")
        };
        return ("DIFF", words, detail);
    }
    if let Some(l) = &o.label {
        detail = if detail.is_empty() {
            format!("[{l}]")
        } else {
            format!("{detail} [{l}]")
        };
    }
    (mark, words, detail)
}

pub fn render(c: &Comparison, format: DataFormat) -> Result<String> {
    match format {
        DataFormat::Text => Ok(text(c)),
        DataFormat::Json | DataFormat::Yaml => serialized(&json(c), format),
    }
}

/// The entry of a file that could not be checked, among the reports on
/// several files: its name and the message, with `agrees: false` so that a
/// pipeline reading only that field does not take it for a pass.
#[derive(Serialize)]
struct JsonUnusable<'a> {
    file: &'a str,
    agrees: bool,
    error: &'a str,
}

pub fn render_unusable(file: &str, error: &Error, format: DataFormat) -> Result<String> {
    match format {
        DataFormat::Text => {
            let message: String = error
                .message()
                .lines()
                .map(|l| format!("  {l}\n"))
                .collect();
            Ok(format!(
                "{file}: not checked, the input cannot be used:\n{message}"
            ))
        }
        DataFormat::Json | DataFormat::Yaml => serialized(
            &JsonUnusable {
                file,
                agrees: false,
                error: error.message(),
            },
            format,
        ),
    }
}

fn json(c: &Comparison) -> JsonReport {
    JsonReport {
        file: c.file.clone(),
        prediction: c.prediction.clone(),
        definition: c.definition.clone(),
        coupling: c.coupling.name(),
        status: c.entry.as_ref().map(|e| e.status.to_string()),
        agrees: c.agrees(),
        not_compared: c.not_compared(),
        orders: c.orders.iter().map(json_order).collect(),
        diagnoses: c.diagnoses.iter().map(ToString::to_string).collect(),
        summary: c.summary(),
        identified: Vec::new(),
    }
}

fn text(c: &Comparison) -> String {
    let mut out = String::new();
    let what = if c.prediction == c.definition {
        c.prediction.clone()
    } else {
        format!("{} = {}", c.prediction, c.definition)
    };
    out.push_str(&format!(
        "{}: checked against {what}, coupling {}\n",
        c.file,
        c.coupling.symbol()
    ));
    if let Some(e) = &c.entry {
        out.push_str(&status_line(e));
    }
    if !c.about.is_empty() {
        let about: Vec<String> = c.about.iter().map(|(k, v)| format!("{k}: {v}")).collect();
        out.push_str(&super::wrap(&format!("about: {}", about.join("; ")), 88));
    }
    out.push('\n');
    let rows: Vec<(u32, (&str, String, String))> = c
        .orders
        .iter()
        .map(|o| (o.loop_order, text_row(o, c.digits)))
        .collect();
    let width = rows
        .iter()
        .map(|(_, (_, w, _))| w.len())
        .max()
        .unwrap_or(7)
        .max(7);
    out.push_str(&format!(
        "{:>4}  {:<4}  {:<width$}  detail\n",
        "L", "", "verdict"
    ));
    for (l, (mark, words, detail)) in rows {
        out.push_str(format!("{l:>4}  {mark:<4}  {words:<width$}  {detail}").trim_end());
        out.push('\n');
    }
    if !c.diagnoses.is_empty() {
        out.push_str("\ndiagnosis:\n");
        for d in &c.diagnoses {
            out.push_str(&format!("  - {d}\n"));
        }
    }
    let skipped = c.not_compared();
    if !skipped.is_empty() {
        let list = skipped
            .iter()
            .map(u32::to_string)
            .collect::<Vec<_>>()
            .join(", ");
        let (which, are) = if skipped.len() == 1 {
            ("order", "is")
        } else {
            ("orders", "are")
        };
        out.push('\n');
        out.push_str(&super::wrap(
            &format!(
                "not compared: {which} {list} {are} beyond the {} loops the prediction is expanded to, so the file \
                 is not a pass even where every compared order agrees.",
                crate::limits::MAX_LOOPS
            ),
            88,
        ));
    }
    out.push_str(&format!("\nsummary: {}\n", c.summary()));
    out
}
/// The reports of several files as one document: a JSON array, a stream of
/// YAML documents, or the text reports one after another.
pub fn joined(parts: &[String], format: DataFormat) -> String {
    match format {
        DataFormat::Json => format!(
            "[\n{}]\n",
            parts
                .iter()
                .map(|p| p.trim_end().to_string())
                .collect::<Vec<_>>()
                .join(",\n")
        ),
        DataFormat::Yaml => parts.iter().map(|p| format!("---\n{p}")).collect(),
        DataFormat::Text => parts.join("\n"),
    }
}
