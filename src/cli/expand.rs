//! `loopwise expand`: validate the arguments, expand, print.

use std::io::Write;

use clap::Args as ClapArgs;

use loopwise::exact::coupling::Coupling;
use loopwise::input::catalogue::Catalogue;

use loopwise::quantity::Quantity;
use loopwise::report::expansion::Expansion;
use loopwise::report::output_error;
use loopwise::{Error, Result};

use super::progress::Progress;
use super::{in_range, CouplingArg, EvenArg, FormatArg, Outcome};
use loopwise::limits::MAX_LOOPS;
use loopwise::limits::MAX_PRINTED_DIGITS;

#[derive(ClapArgs, Debug)]
pub struct Args {
    /// A catalogue name (see `loopwise list`) or a formula such as Gamma(pi/6),
    /// Delta(c2=1/3), Gamma(c2) or -zeta(2)/2*Gamma(pi/4) + Delta(0)/4.
    #[arg(allow_hyphen_values = true)]
    pub quantity: String,
    /// The highest loop order L (coefficient of g^(2L)).
    #[arg(long, short = 'L', default_value_t = 5)]
    pub loops: u32,
    /// Output format.
    #[arg(long, value_enum, default_value = "text")]
    pub format: FormatArg,
    /// Significant decimal digits of the numerical values.
    #[arg(long, default_value_t = 20)]
    pub digits: u32,
    /// Write even zeta values as powers of pi or as zeta(2n).
    #[arg(long, value_enum, default_value = "pi")]
    pub even: EvenArg,
    /// The coupling the coefficients are given in [default: the catalogue
    /// entry's convention, g2 for formulas].
    #[arg(long, value_enum)]
    pub coupling: Option<CouplingArg>,
}

pub fn run(args: &Args, catalogue: &Catalogue) -> Result<Outcome> {
    if args.loops == 0 || args.loops > MAX_LOOPS {
        return Err(Error::range(format!(
            "--loops {} is out of range: the exact engine takes 1 to {MAX_LOOPS} loops",
            args.loops
        )));
    }
    in_range("--digits", args.digits, 1, MAX_PRINTED_DIGITS)?;
    let quantity = Quantity::resolve(&args.quantity, catalogue)?;
    let mut progress = Progress::new();
    let series = quantity.expand(args.loops, &mut |what, done, total| {
        progress.update(what, done, total)
    });
    progress.finish();
    let report = Expansion::new(
        &quantity.label,
        &quantity.definition,
        quantity.entry.clone(),
        series?,
        args.coupling.map_or_else(
            || quantity.entry.as_ref().map_or(Coupling::G2, |e| e.coupling),
            Coupling::from,
        ),
        args.even.into(),
        args.digits,
    );
    let mut out = std::io::BufWriter::new(std::io::stdout().lock());
    report.write(args.format.into(), &mut out)?;
    out.flush().map_err(output_error)?;
    Ok(Outcome::Done)
}
