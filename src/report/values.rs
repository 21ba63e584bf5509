//! Reports of the finite-coupling commands: `at` (a table of values with
//! error estimates and the strong-coupling expansion beside them), `scan`
//! (CSV or JSON rows) and `radius` (the ratio and root sequences).

use rug::Float;
use serde::Serialize;

use super::expansion::status_line;
use super::{decimal, DataFormat};
use crate::error::Result;
use crate::input::catalogue::{Entry, Status};
use crate::numeric::convergence::RadiusEstimate;
use crate::numeric::Estimate;
use crate::quantity::selftest::{SelfCheck, LOOPS};
use crate::quantity::shard::{csv_header, IndexedRow, ScanId, ScanRow, Shard, ShardJson};

/// One coupling of `at`.
pub struct AtRow {
    pub g: Float,
    pub estimate: Estimate,
    pub strong: Option<Float>,
}

/// Everything `at` shows.
pub struct AtReport {
    pub quantity: String,
    pub definition: String,
    pub entry: Option<Entry>,
    pub digits: u32,
    pub rows: Vec<AtRow>,
}

#[derive(Serialize)]
struct JsonRow {
    g: String,
    value: String,
    error: String,
    digits: u32,
    #[serde(skip_serializing_if = "Option::is_none")]
    strong_coupling: Option<String>,
}

#[derive(Serialize)]
struct JsonAt<'a> {
    quantity: &'a str,
    definition: &'a str,
    coupling: &'static str,
    status: Option<String>,
    strong_coupling_formula: Option<String>,
    strong_coupling_status: Option<String>,
    values: Vec<JsonRow>,
}

fn g_text(g: &Float) -> String {
    if g.is_zero() {
        return "0".to_string();
    }
    let d = decimal(g, 12);
    if d.contains('.') && !d.contains('e') {
        d.trim_end_matches('0').trim_end_matches('.').to_string()
    } else {
        d
    }
}

/// The estimate's supported digits; an exact zero (g = 0) prints as 0.
fn value_text(e: &Estimate, digits: u32) -> String {
    if e.value.is_zero() && e.error.is_zero() {
        "0".to_string()
    } else {
        crate::report::decimal::supported(e, digits)
    }
}

fn json_row(r: &AtRow, digits: u32) -> JsonRow {
    JsonRow {
        g: g_text(&r.g),
        value: value_text(&r.estimate, digits),
        error: decimal(&r.estimate.error, 2),
        digits: r.estimate.digits_supported().min(digits),
        strong_coupling: r.strong.as_ref().map(|s| decimal(s, 15)),
    }
}

impl AtReport {
    fn json(&self) -> JsonAt<'_> {
        let sc = self.entry.as_ref().and_then(|e| e.strong_coupling.as_ref());
        JsonAt {
            quantity: &self.quantity,
            definition: &self.definition,
            coupling: "g2",
            status: self.entry.as_ref().map(|e| e.status.to_string()),
            strong_coupling_formula: sc.map(|s| s.formula.clone()),
            strong_coupling_status: sc.map(|s| s.status.to_string()),
            values: self.rows.iter().map(|r| json_row(r, self.digits)).collect(),
        }
    }

    pub fn render(&self, format: DataFormat) -> Result<String> {
        match format {
            DataFormat::Json | DataFormat::Yaml => super::serialized(&self.json(), format),
            DataFormat::Text => Ok(self.text()),
        }
    }

    fn text(&self) -> String {
        let mut out = String::new();
        let title = if self.quantity == self.definition {
            self.quantity.clone()
        } else {
            format!("{} = {}", self.quantity, self.definition)
        };
        out.push_str(&format!(
            "{title} at finite coupling, g^2 = lambda/(16 pi^2)"
        ));
        if let Some(e) = &self.entry {
            out.push_str(&format!(": {}\n", e.summary));
            out.push_str(&status_line(e));
        } else {
            out.push('\n');
        }
        let sc = self.entry.as_ref().and_then(|e| e.strong_coupling.as_ref());
        if let Some(s) = sc {
            let caution = if s.status == Status::Conjecture {
                " (CAUTION: conjecture)"
            } else {
                ""
            };
            out.push_str(&format!("strong coupling: {}{caution}\n", s.formula));
        }
        out.push_str(&format!(
            "values carry only the digits their error estimate supports (at most {})\n\n",
            self.digits
        ));
        let rows: Vec<JsonRow> = self.rows.iter().map(|r| json_row(r, self.digits)).collect();
        let gw = rows.iter().map(|r| r.g.len()).max().unwrap_or(1).max(1);
        let vw = rows.iter().map(|r| r.value.len()).max().unwrap_or(5).max(5);
        let strong_header = if sc.is_some() {
            "  strong coupling"
        } else {
            ""
        };
        let header = format!(
            "{:>gw$}  {:<vw$}  {:<8}{strong_header}",
            "g", "value", "error"
        );
        out.push_str(header.trim_end());
        out.push('\n');
        for r in rows {
            let strong = r
                .strong_coupling
                .as_deref()
                .map_or(String::new(), |s| format!("  {s}"));
            let line = format!("{:>gw$}  {:<vw$}  {:<8}{strong}", r.g, r.value, r.error);
            out.push_str(line.trim_end());
            out.push('\n');
        }
        out
    }
}

/// The printed form of each point of a scan.
pub fn scan_row(g: &Float, e: &Estimate, digits: u32) -> ScanRow {
    ScanRow {
        g: g_text(g),
        value: value_text(e, digits),
        error: decimal(&e.error, 2),
        digits: Some(e.digits_supported().min(digits)),
    }
}

/// A scan as CSV (`g,value,error`) or as a JSON list of rows.
pub fn scan_rows(
    couplings: &[Float],
    values: &[Estimate],
    digits: u32,
    json: bool,
) -> Result<String> {
    let rows: Vec<ScanRow> = couplings
        .iter()
        .zip(values)
        .map(|(g, e)| scan_row(g, e, digits))
        .collect();
    scan_text(&rows, json)
}

/// Rows already printed (a scan, or the parts `merge` joined).
pub fn scan_text(rows: &[ScanRow], json: bool) -> Result<String> {
    if json {
        return super::serialized(&rows, DataFormat::Json);
    }
    let mut out = String::from("g,value,error\n");
    for r in rows {
        out.push_str(&format!("{},{},{}\n", r.g, r.value, r.error));
    }
    Ok(out)
}

/// One part of a scan: its points with their grid indices, and what
/// identifies the scan, so that `merge` can check the parts belong together.
pub fn shard_text(
    shard: Shard,
    id: &ScanId,
    points: &[usize],
    rows: Vec<ScanRow>,
    json: bool,
) -> Result<String> {
    if json {
        let j = ShardJson {
            shard: format!("{}/{}", shard.index, shard.count),
            id: id.clone(),
            rows: points
                .iter()
                .zip(rows)
                .map(|(&point, row)| IndexedRow { point, row })
                .collect(),
        };
        return super::serialized(&j, DataFormat::Json);
    }
    let mut out = csv_header(shard, id);
    out.push_str("\npoint,g,value,error\n");
    for (i, r) in points.iter().zip(rows) {
        out.push_str(&format!("{i},{},{},{}\n", r.g, r.value, r.error));
    }
    Ok(out)
}

/// The ratio and root sequences and the estimate, against the expected 1/4.
pub fn radius_text(quantity: &str, r: &RadiusEstimate) -> String {
    let mut out = super::wrap(
        &format!(
            "{quantity}: radius of convergence in g of the weak-coupling series (ratio test \
             sqrt|c_L/c_(L+1)|, root test |c_L|^(-1/(2L))); 1/4 is expected for every tilt, \
             where the octagon's ln cosh(2 pi g) has its singularities g = +-i/4"
        ),
        88,
    );
    out.push('\n');
    out.push_str(&format!("{:>4}  {:<14}  {:<14}\n", "L", "ratio", "root"));
    for ((l, ratio), (_, root)) in r.ratio.iter().zip(&r.root) {
        out.push_str(&format!(
            "{l:>4}  {:<14}  {:<14}\n",
            decimal(ratio, 10),
            decimal(root, 10)
        ));
    }
    let quarter = Float::with_val(64, 0.25);
    let off = Float::with_val(64, &r.estimate - &quarter);
    out.push_str(&format!(
        "\nestimate (extrapolated ratio sequence): {} ± {}\ndifference from 1/4: {}\n",
        decimal(&r.estimate, 10),
        decimal(&r.spread, 2),
        decimal(&off, 2)
    ));
    out
}

/// The self-test's table: one line per comparison, then the count.
pub fn selftest_text(checks: &[SelfCheck]) -> String {
    let mut out = format!("selftest: the summed {LOOPS}-loop weak-coupling series (exact engine) against the numerical engine\n\n");
    out.push_str(&format!(
        "{:<12} {:>5}  {:<10}  {:<10}  result\n",
        "functional", "g", "|diff|", "bound"
    ));
    for c in checks {
        out.push_str(&format!(
            "{:<12} {:>5}  {:<10}  {:<10}  {}\n",
            c.label,
            c.g,
            decimal(&c.difference(), 2),
            decimal(&c.bound, 2),
            if c.passes() { "ok" } else { "FAILED" }
        ));
    }
    let failed = checks.iter().filter(|c| !c.passes()).count();
    out.push_str(&format!(
        "\n{} passed, {failed} failed\n",
        checks.len() - failed
    ));
    out
}
