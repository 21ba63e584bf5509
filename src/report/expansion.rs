//! The report of `expand`: a quantity's exact loop coefficients with their
//! decimal values, as a table, JSON, YAML or a LaTeX table (the Mathematica
//! and Maple forms are written by [`super::cas`]).

use std::io::Write;
use std::sync::Mutex;

use serde::Serialize;

use super::cas::Cas;
use super::latex::{escape, math_cell};
use super::{decimal, output_error, Format};
use crate::error::{Error, Result};
use crate::exact::coupling::Coupling;
use crate::exact::powerseries::Series;
use crate::exact::ring::{Constants, EvenStyle, Exact, Notation};
use crate::input::catalogue::{Entry, Status};
use crate::numeric::bits_for_digits;

/// The number of terms from which the rows are written in parallel.
const PARALLEL_TERMS: usize = 500;

/// Everything `expand` shows.
pub struct Expansion {
    pub quantity: String,
    pub definition: String,
    pub entry: Option<Entry>,
    pub coupling: Coupling,
    pub even: EvenStyle,
    pub digits: u32,
    /// The series in the chosen coupling: loop order L is its coefficient of x^L.
    series: Series,
}

#[derive(Serialize)]
struct JsonOrder {
    #[serde(rename = "loop")]
    loop_order: u32,
    exact: String,
    /// None when the coefficient holds a symbol (the symbolic tilt).
    value: Option<String>,
}

#[derive(Serialize)]
struct JsonReport<'a> {
    quantity: &'a str,
    definition: &'a str,
    coupling: &'a str,
    status: Option<String>,
    references: Vec<String>,
    orders: Vec<JsonOrder>,
}

impl Expansion {
    /// The report of `series` (in g^2) shown in `coupling`, loops 1..=order.
    /// The series is taken, not copied: at 50 loops one copy of its
    /// coefficients takes a few hundred MiB.
    pub fn new(
        quantity: &str,
        definition: &str,
        entry: Option<Entry>,
        series: Series,
        coupling: Coupling,
        even: EvenStyle,
        digits: u32,
    ) -> Self {
        let series = match coupling {
            Coupling::G2 => series,
            _ => series.in_coupling(coupling),
        };
        Expansion {
            quantity: quantity.to_string(),
            definition: definition.to_string(),
            entry,
            coupling,
            even,
            digits,
            series,
        }
    }

    /// Loop order and exact coefficient, L = 1..=order.
    pub fn orders(&self) -> impl Iterator<Item = (u32, &Exact)> {
        self.series
            .coeffs()
            .iter()
            .enumerate()
            .skip(1)
            .map(|(l, c)| (l as u32, c))
    }

    fn value(&self, c: &Exact, constants: &mut Constants) -> Result<Option<String>> {
        if c.terms().any(|(m, _)| !m.symbols().is_empty()) {
            return Ok(None);
        }
        let v = c.evaluate_with(bits_for_digits(self.digits), constants)?;
        Ok(Some(decimal(&v, self.digits)))
    }

    /// The rows in loop order, `exact` writing each coefficient, by up to one
    /// thread per core, each with its own constants. The coefficients are
    /// taken out of the report and each is dropped once written, so that the
    /// exact series and its text are not both whole in memory; the largest
    /// go first so that no thread is left with a big one at the end.
    fn rows(&mut self, exact: &(dyn Fn(&Exact) -> String + Sync)) -> Result<Vec<JsonOrder>> {
        let coeffs = std::mem::replace(&mut self.series, Series::zero(0)).into_coeffs();
        let count = coeffs.len().saturating_sub(1);
        let terms: usize = coeffs.iter().map(Exact::len).sum();
        let mut queue: Vec<(usize, Exact)> = coeffs.into_iter().enumerate().skip(1).collect();
        queue.sort_by_key(|(_, c)| c.len());
        let queue = Mutex::new(queue);
        let threads = std::thread::available_parallelism()
            .map_or(1, |n| n.get())
            .min(count);
        let done: Mutex<Vec<(usize, Result<JsonOrder>)>> = Mutex::new(Vec::with_capacity(count));
        let this = &*self;
        let work = || {
            let mut constants = Constants::new();
            loop {
                let next = queue.lock().unwrap_or_else(|e| e.into_inner()).pop();
                let Some((l, c)) = next else { break };
                // The text grew by doubling; the rows live until printed.
                let mut text = exact(&c);
                text.shrink_to_fit();
                let row = this.value(&c, &mut constants).map(|value| JsonOrder {
                    loop_order: l as u32,
                    exact: text,
                    value,
                });
                drop(c);
                done.lock()
                    .unwrap_or_else(|e| e.into_inner())
                    .push((l, row));
            }
        };
        // A term takes about 1.5 us to write and evaluate (measured at 36
        // loops of the cusp) and a thread tens of microseconds to start, so
        // threads pay from a few hundred terms (the cusp's first 16 loops).
        if threads > 1 && terms >= PARALLEL_TERMS {
            std::thread::scope(|scope| {
                for _ in 0..threads {
                    scope.spawn(work);
                }
            });
        } else {
            work();
        }
        let mut done = done.into_inner().unwrap_or_else(|e| e.into_inner());
        done.sort_by_key(|(k, _)| *k);
        done.into_iter().map(|(_, row)| row).collect()
    }

    /// The exact coefficients in the coefficient language.
    fn text_rows(&mut self) -> Result<Vec<JsonOrder>> {
        let even = self.even;
        self.rows(&move |c: &Exact| c.format(even, Notation::Text))
    }

    /// The report as one text.
    pub fn render(self, format: Format) -> Result<String> {
        let mut out = Vec::new();
        self.write(format, &mut out)?;
        String::from_utf8(out).map_err(|e| Error::io(format!("the report is not UTF-8: {e}")))
    }

    /// Writes the report to `out` as it is made: at 50 loops the JSON is
    /// over 100 MB, which is not built as one string first.
    pub fn write(mut self, format: Format, out: &mut dyn Write) -> Result<()> {
        match format {
            Format::Text => self.text(out),
            Format::Json => {
                let report = self.json()?;
                serde_json::to_writer_pretty(&mut *out, &report)
                    .map_err(|e| output_error(e.into()))?;
                out.write_all(b"\n").map_err(output_error)
            }
            Format::Yaml => {
                let text = super::serialized(&self.json()?, format)?;
                out.write_all(text.as_bytes()).map_err(output_error)
            }
            Format::Latex => {
                let text = self.latex()?;
                out.write_all(text.as_bytes()).map_err(output_error)
            }
            Format::Mathematica | Format::Maple => {
                let cas = if format == Format::Mathematica {
                    Cas::Mathematica
                } else {
                    Cas::Maple
                };
                let text = super::cas::expansion(&self, cas)?;
                out.write_all(text.as_bytes()).map_err(output_error)
            }
        }
    }

    fn json(&mut self) -> Result<JsonReport<'_>> {
        let orders = self.text_rows()?;
        Ok(JsonReport {
            quantity: &self.quantity,
            definition: &self.definition,
            coupling: self.coupling.name(),
            status: self.entry.as_ref().map(|e| e.status.to_string()),
            references: self
                .entry
                .as_ref()
                .map(|e| e.references.clone())
                .unwrap_or_default(),
            orders,
        })
    }

    fn text(&mut self, sink: &mut dyn Write) -> Result<()> {
        let mut out = String::new();
        let title = if self.quantity == self.definition {
            self.quantity.clone()
        } else {
            format!("{} = {}", self.quantity, self.definition)
        };
        out.push_str(&title);
        if let Some(e) = &self.entry {
            out.push_str(&format!(": {}\n", e.summary));
            out.push_str(&status_line(e));
        } else {
            out.push('\n');
        }
        out.push_str(&format!(
            "{}; values to {} significant digits\n\n",
            coefficient_words(self.coupling),
            self.digits
        ));
        let rows = self.text_rows()?;
        let width = rows
            .iter()
            .map(|r| r.value.as_deref().map_or(1, str::len))
            .max()
            .unwrap_or(5)
            .max(5);
        out.push_str(&format!("{:>4}  {:<width$}  exact\n", "L", "value"));
        sink.write_all(out.as_bytes()).map_err(output_error)?;
        for r in &rows {
            writeln!(
                sink,
                "{:>4}  {:<width$}  {}",
                r.loop_order,
                r.value.as_deref().unwrap_or("-"),
                r.exact
            )
            .map_err(output_error)?;
        }
        Ok(())
    }

    fn latex(&mut self) -> Result<String> {
        let even = self.even;
        let rows = self.rows(&move |c: &Exact| math_cell(&c.format(even, Notation::Latex), 3))?;
        let variable = match self.coupling {
            Coupling::G2 => "g^{2L}",
            Coupling::A => "a^{L}",
            Coupling::Lambda => "\\lambda^{L}",
        };
        let mut out = String::new();
        out.push_str(&format!(
            "% loopwise: {} = {}; {}\n",
            self.quantity,
            self.definition,
            coefficient_words(self.coupling)
        ));
        out.push_str("\\begin{table}[ht]\n\\centering\n\\begin{tabular}{rlr}\n\\hline\n");
        out.push_str(&format!(
            "$L$ & coefficient of ${variable}$ & value \\\\\n\\hline\n"
        ));
        for r in &rows {
            let (l, cell) = (r.loop_order, &r.exact);
            let value = r
                .value
                .as_deref()
                .map_or("--".to_string(), |v| format!("${v}$"));
            out.push_str(&format!("{l} & {cell} & {value} \\\\\n"));
        }
        out.push_str("\\hline\n\\end{tabular}\n");
        let status = self
            .entry
            .as_ref()
            .filter(|e| e.status == Status::Conjecture)
            .map_or(String::new(), |_| {
                " The all-order formula is a conjecture of the literature.".to_string()
            });
        let convention = match self.coupling {
            Coupling::G2 => "$g^2 = \\lambda/(16\\pi^2)$",
            Coupling::A => "$a = \\lambda/(8\\pi^2) = 2g^2$",
            Coupling::Lambda => "the 't~Hooft coupling $\\lambda$",
        };
        out.push_str(&format!(
            "\\caption{{Weak-coupling coefficients of {} (\\texttt{{{}}}) in {convention}.{status}}}\n",
            escape(&self.quantity),
            escape(&self.definition),
        ));
        out.push_str(&format!(
            "\\label{{tab:{}}}\n\\end{{table}}\n",
            label_slug(&self.quantity)
        ));
        Ok(out)
    }
}

/// A coefficient's meaning in words: "coefficient of g^(2L), with g^2 = lambda/(16 pi^2)".
pub fn coefficient_words(coupling: Coupling) -> &'static str {
    match coupling {
        Coupling::G2 => "coefficient of g^(2L), with g^2 = lambda/(16 pi^2)",
        Coupling::A => "coefficient of a^L, with a = lambda/(8 pi^2) = 2 g^2",
        Coupling::Lambda => "coefficient of lambda^L, lambda = g_YM^2 N_c",
    }
}

/// The status of a catalogue entry in one or two lines; conjectures are flagged.
pub fn status_line(e: &Entry) -> String {
    let refs = if e.references.is_empty() {
        String::new()
    } else {
        format!(" [{}]", e.references.join(", "))
    };
    let note = e.note.as_deref().map_or(String::new(), |n| format!(" {n}"));
    let text = match e.status {
        Status::Established => format!("status: established.{note}{refs}"),
        Status::Conjecture => {
            format!("CAUTION: conjecture of the literature, not a theorem.{note}{refs}")
        }
    };
    super::wrap(&text, 88)
}

fn label_slug(name: &str) -> String {
    let slug: String = name
        .chars()
        .map(|c| if c.is_ascii_alphanumeric() { c } else { '-' })
        .collect();
    format!("loopwise-{}", slug.trim_matches('-'))
}
