//! Origin files: series files whose coefficients are polynomials in the
//! logs l1 l2 l3 (or l on the line), of E or of R6, in any coupling, read
//! into one exact series in g^2; orders written with decimals are kept
//! apart and read numerically by the checks.

use crate::error::{Error, Result};
use crate::exact::powerseries::Series;
use crate::exact::ring::Exact;
use crate::input::seriesfile::{parse_series_text, Located, Normalisation, OrderEntry, SeriesFile};
use crate::origin::numeric::needs_numbers;
use crate::origin::OriginLogs;
use crate::quantity::exact_constant;

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
    /// the working precision by [`crate::origin::check::check_origin`]; empty for an exact file.
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
pub(crate) fn numeric_source(entry: &OrderEntry) -> Option<&Located> {
    match (&entry.exact, &entry.value) {
        (Some(x), _) if needs_numbers(&x.expr) => Some(x),
        (Some(_), _) => None,
        (None, v) => v.as_ref(),
    }
}

pub(crate) fn highest(file: &SeriesFile) -> u32 {
    file.orders.iter().map(|o| o.loop_order).max().unwrap_or(0)
}

/// The exact coefficient of one entry; numbers are refused, naming the line.
pub(crate) fn exact_coefficient(file: &SeriesFile, entry: &OrderEntry) -> Result<Exact> {
    let located = entry.exact.as_ref().ok_or_else(|| {
        Error::input(format!(
            "{}: the entry at line {} (loop {}) gives only a `value`; this command needs exact coefficients (`exact:`)",
            file.origin, entry.line, entry.loop_order
        ))
    })?;
    // The exact reader names file, line and column of anything outside the
    // exact ring (decimals, logarithms, Catalan's constant, multiple zeta values).
    exact_constant(
        &located.text,
        &file.origin,
        Some(&located.site),
        &located.expr,
    )
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn key_lines() {
        assert_eq!(
            key_line("coupling: g2\nsymbols : [a]\n", "symbols"),
            Some(2)
        );
        assert_eq!(key_line("symbolsx: 1\n", "symbols"), None);
    }
}
