//! The report of `fit`: the unique combination as a formula that pastes back
//! into the coefficient language, or the family (a particular solution, the
//! free directions and the orders that would fix it), or why nothing fits;
//! always with the caution that a fit makes a conjecture, not a derivation.
//! Text for people, JSON/YAML for pipelines.

use serde::Serialize;

use super::DataFormat;
use crate::error::Result;
use crate::fit::file::FitReport;
use crate::fit::{Fixing, Solution};

/// The caution every fit report carries.
pub const CAUTION: &str = "CAUTION: a fit turns data into a conjecture, not a derivation. A combination \
that matches the supplied orders predicts the next ones only if the true answer lies in the span of the basis.";

#[derive(Serialize)]
struct JsonElement {
    name: String,
    formula: String,
}

#[derive(Serialize)]
struct JsonDropped {
    name: String,
    reason: String,
}

#[derive(Serialize)]
struct JsonElementStatus {
    name: String,
    ruled_out_at: Option<u32>,
    can_appear: bool,
}

#[derive(Serialize)]
struct JsonFixing {
    /// Data through this loop order would fix the coefficients.
    fixed_at: Option<u32>,
    missing_orders: Vec<u32>,
    /// When no order up to the ceiling fixes them: free parameters left there.
    free_at_ceiling: Option<usize>,
    ceiling: u32,
}

#[derive(Serialize)]
struct JsonReport {
    file: String,
    coupling: &'static str,
    orders: Vec<u32>,
    basis: Vec<JsonElement>,
    dropped: Vec<JsonDropped>,
    /// unique | family | none
    result: &'static str,
    formula: Option<String>,
    coefficients: Option<Vec<String>>,
    free_directions: Vec<String>,
    fixing: Option<JsonFixing>,
    first_inconsistent_order: Option<u32>,
    elements: Vec<JsonElementStatus>,
    caution: &'static str,
}

pub fn render(r: &FitReport, format: DataFormat) -> Result<String> {
    match format {
        DataFormat::Text => Ok(text(r)),
        DataFormat::Json | DataFormat::Yaml => super::serialized(&json(r), format),
    }
}

fn json(r: &FitReport) -> JsonReport {
    let basis = r
        .fit
        .names
        .iter()
        .map(|n| JsonElement {
            name: n.clone(),
            formula: r
                .elements
                .iter()
                .find(|e| &e.name == n)
                .map_or(n.clone(), |e| e.formula.clone()),
        })
        .collect();
    let mut out = JsonReport {
        file: r.file.clone(),
        coupling: r.coupling.name(),
        orders: r.orders.clone(),
        basis,
        dropped: r
            .fit
            .dropped
            .iter()
            .map(|d| JsonDropped {
                name: d.name.clone(),
                reason: d.reason.clone(),
            })
            .collect(),
        result: "none",
        formula: None,
        coefficients: None,
        free_directions: Vec::new(),
        fixing: None,
        first_inconsistent_order: None,
        elements: Vec::new(),
        caution: CAUTION,
    };
    match &r.fit.solution {
        Solution::Unique(a) => {
            out.result = "unique";
            out.formula = Some(r.combination(a));
            out.coefficients = Some(a.iter().map(ToString::to_string).collect());
        }
        Solution::Family {
            particular,
            null_space,
        } => {
            out.result = "family";
            out.formula = Some(r.combination(particular));
            out.coefficients = Some(particular.iter().map(ToString::to_string).collect());
            out.free_directions = null_space.iter().map(|v| r.combination(v)).collect();
            out.fixing = r.fit.fixing.as_ref().map(|f| match f {
                Fixing::At {
                    loop_order,
                    missing,
                } => JsonFixing {
                    fixed_at: Some(*loop_order),
                    missing_orders: missing.clone(),
                    free_at_ceiling: None,
                    ceiling: r.ceiling,
                },
                Fixing::NotWithin { ceiling, free } => JsonFixing {
                    fixed_at: None,
                    missing_orders: Vec::new(),
                    free_at_ceiling: Some(*free),
                    ceiling: *ceiling,
                },
            });
        }
        Solution::Inconsistent(bad) => {
            out.first_inconsistent_order = Some(bad.first_inconsistent_order);
            out.elements = r
                .fit
                .names
                .iter()
                .zip(&bad.elements)
                .map(|(n, s)| JsonElementStatus {
                    name: n.clone(),
                    ruled_out_at: s.ruled_out_at,
                    can_appear: s.can_appear,
                })
                .collect();
        }
    }
    out
}

fn orders_text(orders: &[u32]) -> String {
    orders
        .iter()
        .map(ToString::to_string)
        .collect::<Vec<_>>()
        .join(", ")
}

fn text(r: &FitReport) -> String {
    let mut out = String::new();
    out.push_str(&format!(
        "{}: fit of the coefficients of {}^L at orders {} as a rational combination of {} basis series\n",
        r.file,
        if r.coupling.symbol() == "g^2" { "(g^2)" } else { r.coupling.symbol() },
        orders_text(&r.orders),
        r.fit.names.len()
    ));
    if r.has_names() {
        for n in &r.fit.names {
            if let Some(e) = r
                .elements
                .iter()
                .find(|e| &e.name == n && e.name != e.formula)
            {
                out.push_str(&format!("  {} = {}\n", e.name, e.formula));
            }
        }
    }
    for d in &r.fit.dropped {
        out.push_str(&format!("  left out: {} ({})\n", d.name, d.reason));
    }
    out.push('\n');
    match &r.fit.solution {
        Solution::Unique(a) => {
            out.push_str("unique solution:\n");
            out.push_str(&format!("  {}\n", r.combination(a)));
            if r.has_names() {
                out.push_str(&format!("  = {}\n", r.named_combination(a)));
            }
        }
        Solution::Family {
            particular,
            null_space,
        } => {
            out.push_str(&format!(
                "a family of solutions with {} free parameter{}: particular solution + any rational multiples of the directions\n",
                null_space.len(),
                if null_space.len() == 1 { "" } else { "s" }
            ));
            out.push_str(&format!("  particular: {}\n", r.combination(particular)));
            for (i, v) in null_space.iter().enumerate() {
                out.push_str(&format!("  direction {}: {}\n", i + 1, r.combination(v)));
            }
            match &r.fit.fixing {
                Some(Fixing::At { loop_order, missing }) => out.push_str(&format!(
                    "\ndata through loop {loop_order} would fix it: {} more order{} ({})\n",
                    missing.len(),
                    if missing.len() == 1 { "" } else { "s" },
                    orders_text(missing)
                )),
                Some(Fixing::NotWithin { ceiling, free }) => out.push_str(&format!(
                    "\nno data up to loop {ceiling} fix it: {free} free parameter{} remain (an exact relation \
                     between basis elements, or raise --ceiling)\n",
                    if *free == 1 { "" } else { "s" }
                )),
                None => {}
            }
        }
        Solution::Inconsistent(bad) => {
            let n = bad.first_inconsistent_order;
            let below: Vec<u32> = r.orders.iter().copied().filter(|&l| l < n).collect();
            if below.is_empty() {
                out.push_str(&format!("no combination fits: no rational combination of the basis matches order {n}.\n"));
            } else {
                out.push_str(&format!("no combination fits: orders {} can be matched, but not together with order {n}.\n", orders_text(&below)));
            }
            let width = r.fit.names.iter().map(String::len).max().unwrap_or(4);
            for (name, s) in r.fit.names.iter().zip(&bad.elements) {
                let status = match (s.ruled_out_at, s.can_appear, below.is_empty()) {
                    (Some(l), _, _) => format!("ruled out by the orders up to {l}"),
                    (None, _, true) => format!("no lower order to rule it out before order {n}"),
                    (None, true, false) => {
                        format!("still possible at orders {}", orders_text(&below))
                    }
                    (None, false, false) => {
                        format!("zero in every fit of orders {}", orders_text(&below))
                    }
                };
                out.push_str(&format!("  {name:<width$}  {status}\n"));
            }
        }
    }
    out.push('\n');
    out.push_str(&super::wrap(CAUTION, 88));
    out
}
