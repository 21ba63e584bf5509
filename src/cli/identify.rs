//! `loopwise identify VALUE`: a number as a rational combination of a basis
//! of constants, found numerically.

use clap::{ArgGroup, Args as ClapArgs};

use loopwise::input::catalogue::Catalogue;
use loopwise::quantity::identify::{identify, Request};
use loopwise::report::identify::render;
use loopwise::Result;

use super::{emit, DataFormatArg, Outcome};

#[derive(ClapArgs, Debug)]
#[command(group(ArgGroup::new("against").args(["weight", "basis"]).required(true).multiple(true)))]
pub struct Args {
    /// The number: a decimal with the digits you trust (-937.43062784825374188), or an
    /// expression of the coefficient language together with --digits.
    #[arg(allow_hyphen_values = true)]
    pub value: String,
    /// Trusted significant digits [default: those written in a decimal VALUE; required for an
    /// expression].
    #[arg(long)]
    pub digits: Option<u32>,
    /// Basis of all products of even powers of pi, odd zeta values and the irreducible
    /// multiple zeta values zeta(5,3), zeta(7,3), zeta(3,5,3) of this total weight (0 to 11).
    #[arg(long, value_name = "W")]
    pub weight: Option<u32>,
    /// With --weight: all lower weights too, down to the constant 1.
    #[arg(long, requires = "weight")]
    pub with_lower: bool,
    /// Further basis elements, expressions separated by `;`: "log(2); catalan; 1/pi".
    #[arg(long, value_name = "E1; E2; ...")]
    pub basis: Option<String>,
    /// Output format.
    #[arg(long, value_enum, default_value = "text")]
    pub format: DataFormatArg,
}

/// Exit code 0 when a relation is found, 1 when none is, 2 on unusable input
/// (a linearly dependent basis among it).
pub fn run(args: &Args, catalogue: &Catalogue) -> Result<Outcome> {
    let request = Request {
        value: &args.value,
        digits: args.digits,
        weight: args.weight,
        with_lower: args.with_lower,
        basis: args.basis.as_deref(),
    };
    let result = identify(&request, catalogue)?;
    emit(&render(&result, args.format.into())?)?;
    Ok(if result.found.is_some() {
        Outcome::Done
    } else {
        Outcome::Differs
    })
}
