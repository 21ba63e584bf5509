//! `loopwise origin FILE`, `loopwise fit FILE` and `loopwise demo origin`:
//! read the file, run the checks of [`loopwise::origin::check`], print.

use std::path::PathBuf;

use clap::Args as ClapArgs;

use loopwise::fit::file::{fit_file, parse_basis};
use loopwise::fit::{default_basis, Solution};
use loopwise::input::catalogue::Catalogue;
use loopwise::input::seriesfile::{parse_series_text, read_input};
use loopwise::origin::check::check_origin;
use loopwise::origin::read::{parse_origin_text, read_origin_file, OriginData};
use loopwise::report::{cas, fit as fit_report, origin as origin_report, DataFormat};
use loopwise::Result;

use super::{emit, in_range, CheckFormatArg, DataFormatArg, EvenArg, Outcome, Written};
use loopwise::limits::MAX_CHECK_DIGITS;

/// The origin demo's series file, shipped in the binary.
pub(super) const DEMO: &str = include_str!("../../series/examples/demo-origin.yaml");
pub(super) const DEMO_NAME: &str = "series/examples/demo-origin.yaml";

/// Default of `--ceiling`: how far the basis is expanded to find the orders that fix a family.
const DEFAULT_CEILING: u32 = 12;

#[derive(ClapArgs, Debug)]
pub struct OriginArgs {
    /// A series file with `normalisation: E` or `R6` and `symbols: [l1, l2, l3]` or `[l]`;
    /// coefficients exact, or with decimals (then the whole file is read numerically);
    /// `-` reads standard input.
    pub file: PathBuf,
    /// Output format; mathematica and maple write the readings and predictions
    /// of the exponentiating orders as one expression.
    #[arg(long, value_enum, default_value = "text")]
    pub format: CheckFormatArg,
    /// Working decimal digits: of the numerical size of differences, and of the
    /// whole analysis when the file is read numerically.
    #[arg(long, default_value_t = 30)]
    pub digits: u32,
    /// Write even zeta values as zeta(2n) or as powers of pi.
    #[arg(long, value_enum, default_value = "zeta")]
    pub even: EvenArg,
}

#[derive(ClapArgs, Debug)]
pub struct FitArgs {
    /// A series file whose `orders` hold exact coefficients (no symbols, no decimals);
    /// `-` reads standard input.
    pub file: PathBuf,
    /// Basis elements separated by `;`, each `NAME=FORMULA` or a bare formula;
    /// default: Gamma, Delta and zeta(2)*Gamma at the tilts 0, pi/6, pi/4, pi/3, pi/2.
    #[arg(long, allow_hyphen_values = true)]
    pub basis: Option<String>,
    /// The highest loop order to which the basis is expanded when looking for
    /// the orders that would fix a family of solutions.
    #[arg(long, default_value_t = DEFAULT_CEILING)]
    pub ceiling: u32,
    /// Output format.
    #[arg(long, value_enum, default_value = "text")]
    pub format: DataFormatArg,
}

fn report(
    data: &OriginData,
    catalogue: &Catalogue,
    format: Written,
    even: EvenArg,
    digits: u32,
) -> Result<(String, bool)> {
    let c = check_origin(data, catalogue, digits)?;
    let text = match format {
        Written::Data(f) => origin_report::render(&c, f, even.into())?,
        Written::Cas(cas) => cas::origin(&c, even.into(), cas)?,
    };
    Ok((text, c.agrees()))
}

pub fn origin(args: &OriginArgs, catalogue: &Catalogue) -> Result<Outcome> {
    in_range("--digits", args.digits, 6, MAX_CHECK_DIGITS)?;
    let data = read_origin_file(&args.file)?;
    let (text, agrees) = report(&data, catalogue, args.format.into(), args.even, args.digits)?;
    emit(&text)?;
    Ok(if agrees {
        Outcome::Done
    } else {
        Outcome::Differs
    })
}

pub fn fit(args: &FitArgs, catalogue: &Catalogue) -> Result<Outcome> {
    let elements = match &args.basis {
        Some(text) => parse_basis(text)?,
        None => default_basis(),
    };
    let (text, origin) = read_input(&args.file)?;
    let file = parse_series_text(&text, &origin)?;
    let r = fit_file(&file, elements, args.ceiling, catalogue)?;
    emit(&fit_report::render(&r, args.format.into())?)?;
    Ok(match r.fit.solution {
        Solution::Inconsistent(_) => Outcome::Differs,
        _ => Outcome::Done,
    })
}

/// Runs the origin check on the built-in fictional dataset. It always exits
/// 0: finding the planted mistake is what the demo is for.
pub fn demo(format: DataFormatArg, catalogue: &Catalogue) -> Result<Outcome> {
    let data = parse_origin_text(DEMO, DEMO_NAME)?;
    let mut text = String::new();
    if matches!(format, DataFormatArg::Text) {
        text.push_str("loopwise demo origin: an invented group's seven-loop six-gluon amplitude at the origin\n");
        text.push_str("(fictional data, shipped in series/examples/demo-origin.yaml), read order by order.\n\n");
    }
    let format = Written::Data(DataFormat::from(format));
    text.push_str(&report(&data, catalogue, format, EvenArg::Zeta, 30)?.0);
    emit(&text)?;
    Ok(Outcome::Done)
}
