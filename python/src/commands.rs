//! The library calls behind each Python function, composed as the binary's
//! commands compose them (src/cli/): the same checks of the arguments, the
//! same library functions, and the same report rendered as JSON, so that a
//! Python caller gets exactly what `loopwise COMMAND --format json` prints.
//! Range messages name the Python argument (`loops`, `digits`), not the
//! command-line option.

use std::path::Path;

use rug::Float;

use loopwise::check::{self, propose::propose};
use loopwise::exact::coupling::Coupling;
use loopwise::exact::ring::EvenStyle;
use loopwise::input::catalogue::Catalogue;
use loopwise::input::seriesfile::read_series_file;
use loopwise::limits::{
    MAX_CHECK_DIGITS, MAX_FINITE_DIGITS, MAX_LOOPS, MAX_POINTS, MAX_PRINTED_DIGITS,
};
use loopwise::numeric::bits_for_digits;
use loopwise::numeric::evaluate::{number, Settled};
use loopwise::origin::check::check_origin;
use loopwise::origin::read::read_origin_file;
use loopwise::quantity::finite::{self, parse_couplings, GridPoints};
use loopwise::quantity::identify::{identify as identify_value, Request};
use loopwise::quantity::Quantity;
use loopwise::report::expansion::Expansion;
use loopwise::report::values::{scan_rows, AtReport, AtRow};
use loopwise::report::{self, decimal, digit_place, rounded_at, DataFormat, Format};
use loopwise::{Error, Result};

/// The built-in catalogue, extended by a directory of entries as `--catalog DIR` does.
pub fn catalogue(dir: Option<&Path>) -> Result<Catalogue> {
    let mut c = Catalogue::builtin()?;
    if let Some(dir) = dir {
        c.extend_from_dir(dir)?;
    }
    Ok(c)
}

/// A whole-number argument within `lo..=hi`, or the message naming it.
pub fn in_range(name: &str, value: i64, lo: u32, hi: u32) -> Result<u32> {
    u32::try_from(value)
        .ok()
        .filter(|v| (lo..=hi).contains(v))
        .ok_or_else(|| Error::range(format!("{name}={value} is out of range: {lo} to {hi}")))
}

/// How even zeta values are written: "pi" (powers of pi) or "zeta" (zeta(2n)).
pub fn even_style(even: &str) -> Result<EvenStyle> {
    match even {
        "pi" => Ok(EvenStyle::Pi),
        "zeta" => Ok(EvenStyle::Zeta),
        other => Err(Error::input(format!(
            "even='{other}': expected 'pi' (powers of pi) or 'zeta' (zeta(2n))"
        ))),
    }
}

/// `expand --format json`: the exact coefficients through `loops`, in
/// `coupling` (the catalogue entry's convention when none is given).
pub fn expand(
    quantity: &str,
    loops: i64,
    coupling: Option<&str>,
    digits: i64,
    even: &str,
    catalogue: &Catalogue,
) -> Result<String> {
    let loops = u32::try_from(loops)
        .ok()
        .filter(|l| (1..=MAX_LOOPS).contains(l))
        .ok_or_else(|| {
            Error::range(format!(
                "loops={loops} is out of range: the exact engine takes 1 to {MAX_LOOPS} loops"
            ))
        })?;
    let digits = in_range("digits", digits, 1, MAX_PRINTED_DIGITS)?;
    let even = even_style(even)?;
    let coupling = coupling.map(str::parse::<Coupling>).transpose()?;
    let quantity = Quantity::resolve(quantity, catalogue)?;
    let series = quantity.expand(loops, &mut |_, _, _| {})?;
    let coupling =
        coupling.unwrap_or_else(|| quantity.entry.as_ref().map_or(Coupling::G2, |e| e.coupling));
    Expansion::new(
        &quantity.label,
        &quantity.definition,
        quantity.entry.clone(),
        series,
        coupling,
        even,
        digits,
    )
    .render(Format::Json)
}

fn finite_digits(digits: i64) -> Result<u32> {
    u32::try_from(digits)
        .ok()
        .filter(|d| (1..=MAX_FINITE_DIGITS).contains(d))
        .ok_or_else(|| {
            Error::range(format!(
                "digits={digits} is out of range: the finite-coupling engine delivers 1 to {MAX_FINITE_DIGITS} digits honestly"
            ))
        })
}

/// `at --format json`: values at the couplings of `g` (a list `0.1,0.5` or
/// a grid `START:STOP:STEP`), each with its error estimate and, where the
/// catalogue has one, the strong-coupling expansion beside it.
pub fn at(quantity: &str, g: &str, digits: i64, catalogue: &Catalogue) -> Result<String> {
    let digits = finite_digits(digits)?;
    let prec = bits_for_digits(digits) + 64;
    let couplings = parse_couplings(g, GridPoints::NoCount, MAX_POINTS, prec)?;
    let quantity = Quantity::resolve(quantity, catalogue)?;
    let values = finite::values(&quantity, &couplings, digits, &mut |_, _| {})?;
    let rows = couplings
        .into_iter()
        .zip(values)
        .map(|(g, estimate)| {
            let strong = if g.is_zero() {
                None
            } else {
                finite::strong_coupling(&quantity, &g, prec)?
            };
            Ok(AtRow {
                g,
                estimate,
                strong,
            })
        })
        .collect::<Result<Vec<_>>>()?;
    AtReport {
        quantity: quantity.label.clone(),
        definition: quantity.definition.clone(),
        entry: quantity.entry.clone(),
        digits,
        rows,
    }
    .render(DataFormat::Json)
}

/// `scan --format json`: the rows of a grid `START:STOP` of `points` values
/// (or `START:STOP:STEP`), or of a list of couplings `0.1,0.5,1`.
pub fn scan(
    quantity: &str,
    grid: &str,
    points: Option<i64>,
    digits: i64,
    catalogue: &Catalogue,
) -> Result<String> {
    let digits = finite_digits(digits)?;
    let prec = bits_for_digits(digits) + 64;
    let points = match points {
        Some(n) => GridPoints::Given(in_range("points", n, 2, MAX_POINTS as u32)? as usize),
        None if grid.contains(':') => GridPoints::Default(61),
        None => GridPoints::NoCount,
    };
    let couplings = parse_couplings(grid, points, MAX_POINTS, prec)?;
    let quantity = Quantity::resolve(quantity, catalogue)?;
    let values = finite::values(&quantity, &couplings, digits, &mut |_, _| {})?;
    scan_rows(&couplings, &values, digits, true)
}

/// The status of the catalogue entry behind a name or formula, as the
/// reports print it.
pub fn status(quantity: &str, catalogue: &Catalogue) -> Result<Option<String>> {
    let quantity = Quantity::resolve(quantity, catalogue)?;
    Ok(quantity.entry.map(|e| e.status.to_string()))
}

/// `check FILE --format json` (with `--identify` when `identify` is set).
pub fn check_file(
    path: &Path,
    digits: i64,
    identify: bool,
    catalogue: &Catalogue,
) -> Result<String> {
    let digits = in_range("digits", digits, 6, MAX_CHECK_DIGITS)?;
    let file = read_series_file(path)?;
    let c = check::check(&file, catalogue, digits, &mut |_, _, _| {})?;
    if identify {
        report::check::render_identified(&c, &propose(&c, catalogue)?, DataFormat::Json)
    } else {
        report::check::render(&c, DataFormat::Json)
    }
}

/// `origin FILE --format json`.
pub fn origin_file(path: &Path, digits: i64, even: &str, catalogue: &Catalogue) -> Result<String> {
    let digits = in_range("digits", digits, 6, MAX_CHECK_DIGITS)?;
    let even = even_style(even)?;
    let data = read_origin_file(path)?;
    let c = check_origin(&data, catalogue, digits)?;
    report::origin::render(&c, DataFormat::Json, even)
}

/// `identify VALUE --format json`. The command line requires a weight or a
/// basis and `--with-lower` only beside a weight; so does this.
pub fn identify(
    value: &str,
    digits: Option<i64>,
    weight: Option<i64>,
    with_lower: bool,
    basis: Option<&str>,
    catalogue: &Catalogue,
) -> Result<String> {
    if weight.is_none() && basis.is_none() {
        return Err(Error::input(
            "identify needs a weight, a basis, or both: weight=W for the weight-W basis of zeta values, basis=\"E1; E2\" for your own elements",
        ));
    }
    if with_lower && weight.is_none() {
        return Err(Error::input("with_lower=True needs a weight"));
    }
    let whole = |name: &str, v: i64| {
        u32::try_from(v).map_err(|_| Error::range(format!("{name}={v} must not be negative")))
    };
    let request = Request {
        value,
        digits: digits.map(|d| whole("digits", d)).transpose()?,
        weight: weight.map(|w| whole("weight", w)).transpose()?,
        with_lower,
        basis,
    };
    let result = identify_value(&request, catalogue)?;
    report::identify::render(&result, DataFormat::Json)
}

/// `eval EXPR`: the value to `digits` significant digits and its
/// uncertainty, as decimal text; an exact expression has uncertainty "0", and
/// a value indistinguishable from zero has its bound as the uncertainty.
pub fn evaluate(text: &str, digits: i64, catalogue: &Catalogue) -> Result<(String, String)> {
    let digits = in_range("digits", digits, 1, MAX_PRINTED_DIGITS)?;
    Ok(match number(text, catalogue, digits)? {
        Settled::Exact(x) => (decimal(&x, digits), "0".to_string()),
        Settled::Uncertain(e) => {
            // As `eval` prints it: no digits below the uncertainty's second.
            let place = digit_place(&e.error, 2).unwrap_or(0);
            let shown = match digit_place(&e.value, digits) {
                Some(cap) if cap > place => decimal(&e.value, digits),
                _ => rounded_at(&e.value, place),
            };
            (shown, decimal(&e.error, 2))
        }
        Settled::Zero { bound, .. } => ("0".to_string(), bound_text(&bound)),
    })
}

fn bound_text(bound: &Float) -> String {
    if bound.is_zero() {
        "0".to_string()
    } else {
        decimal(bound, 2)
    }
}
