//! `loopwise eval EXPR`: one expression of the coefficient language to D
//! digits, with its uncertainty when the expression carries one.

use clap::Args as ClapArgs;

use loopwise::compare::working_bits;
use loopwise::expr::numeric::{self, Context};
use loopwise::expr::{self};
use loopwise::report::decimal;
use loopwise::{Error, Result};

use super::{emit, Outcome};

/// The most digits `eval` prints.
pub const MAX_DIGITS: u32 = 10_000;

#[derive(ClapArgs, Debug)]
pub struct Args {
    /// The expression, e.g. "zeta(5,3)", "-876 zeta(6) - 32 zeta(3)^2", "1.2e-3(1) * pi".
    #[arg(allow_hyphen_values = true)]
    pub expr: String,
    /// Significant decimal digits.
    #[arg(long, default_value_t = 30)]
    pub digits: u32,
}

pub fn run(args: &Args) -> Result<Outcome> {
    if args.digits == 0 || args.digits > MAX_DIGITS {
        return Err(Error::range(format!("--digits {} is out of range: 1 to {MAX_DIGITS}", args.digits)));
    }
    let e = expr::parse(&args.expr, "<expression>", None)?;
    let mut ctx = Context::new(working_bits(args.digits));
    let x = numeric::evaluate(&e, &mut ctx).map_err(|f| numeric::located(&args.expr, "<expression>", None, f))?;
    let line = if x.is_exact() {
        decimal(&x.value, args.digits)
    } else {
        format!("{} ± {}", decimal(&x.value, args.digits), decimal(&x.uncertainty, 2))
    };
    emit(&format!("{line}\n"))?;
    Ok(Outcome::Done)
}
