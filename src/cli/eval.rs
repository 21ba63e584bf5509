//! `loopwise eval EXPR`: one expression of the coefficient language to D
//! digits, with its uncertainty when the expression carries one.

use clap::Args as ClapArgs;

use loopwise::input::catalogue::Catalogue;
use loopwise::numeric::evaluate::number;
use loopwise::report::decimal::number_text;
use loopwise::Result;

use super::{emit, in_range, Outcome};
use loopwise::limits::MAX_PRINTED_DIGITS;

#[derive(ClapArgs, Debug)]
pub struct Args {
    /// The expression, e.g. "zeta(5,3)", "-876 zeta(6) - 32 zeta(3)^2", "1.2e-3(1) * pi".
    #[arg(allow_hyphen_values = true)]
    pub expr: String,
    /// Significant decimal digits.
    #[arg(long, default_value_t = 30)]
    pub digits: u32,
}

pub fn run(args: &Args, catalogue: &Catalogue) -> Result<Outcome> {
    in_range("--digits", args.digits, 1, MAX_PRINTED_DIGITS)?;
    let value = number(&args.expr, catalogue, args.digits)?;
    emit(&format!("{}\n", number_text(&value, args.digits)))?;
    Ok(Outcome::Done)
}
