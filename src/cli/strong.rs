//! `loopwise strong QUANTITY`: the strong-coupling expansion fitted to
//! finite-coupling values at large g, with errors and numerical
//! identifications of its coefficients.

use clap::Args as ClapArgs;

use loopwise::input::catalogue::Catalogue;
use loopwise::limits::MAX_POINTS;
use loopwise::numeric::working_bits;
use loopwise::quantity::finite::{parse_couplings, GridPoints};
use loopwise::quantity::strong::{default_range, extract, Request, DEFAULT_BASIS};
use loopwise::quantity::Quantity;
use loopwise::report::strong::render;
use loopwise::{Error, Result};

use super::progress::Progress;
use super::{emit, DataFormatArg, Outcome};

#[derive(ClapArgs, Debug)]
pub struct Args {
    /// A catalogue name or a formula in the functionals (Gamma(pi/5), Delta(0), ...).
    #[arg(allow_hyphen_values = true)]
    pub quantity: String,
    /// The couplings fitted, START:STOP (with --points values) or START:STOP:STEP
    /// [default: 6:20 for quantities of Gamma only, 2:3 when Delta enters].
    #[arg(long, allow_hyphen_values = true)]
    pub g: Option<String>,
    /// Values in a START:STOP range.
    #[arg(long, default_value_t = 15)]
    pub points: usize,
    /// Significant digits of each value.
    #[arg(long, default_value_t = 30)]
    pub digits: u32,
    /// Coefficients reported, from the leading one down.
    #[arg(long, default_value_t = 4)]
    pub terms: usize,
    /// The leading power of g.
    #[arg(long, default_value_t = 1, allow_hyphen_values = true)]
    pub leading: i32,
    /// Powers of g that also come with a ln g term, e.g. `0` for c ln g, `0,-1` for that and (ln g)/g.
    #[arg(
        long,
        value_delimiter = ',',
        allow_hyphen_values = true,
        value_name = "P1,P2"
    )]
    pub logs: Vec<i32>,
    /// The constants each coefficient is identified against, one or two at a time,
    /// expressions separated by `;` [default: 1; pi; 1/pi; 1/pi^2; log(2); log(2)/pi; ...].
    #[arg(long, value_name = "E1; E2; ...")]
    pub basis: Option<String>,
    /// Output format.
    #[arg(long, value_enum, default_value = "text")]
    pub format: DataFormatArg,
}

pub fn run(args: &Args, catalogue: &Catalogue) -> Result<Outcome> {
    super::values::check_digits(args.digits)?;
    let quantity = Quantity::resolve(&args.quantity, catalogue)?;
    let range = match &args.g {
        Some(g) if !g.contains(':') => {
            return Err(Error::input(format!(
                "--g {g}: a fit takes a range START:STOP or START:STOP:STEP"
            )))
        }
        Some(g) => g.clone(),
        None => {
            let (lo, hi) = default_range(&quantity);
            format!("{lo}:{hi}")
        }
    };
    let couplings = parse_couplings(
        &range,
        GridPoints::Default(args.points),
        MAX_POINTS,
        working_bits(args.digits),
    )?;
    let request = Request {
        couplings,
        digits: args.digits,
        leading: args.leading,
        logs: args.logs.clone(),
        terms: args.terms,
        basis: args.basis.as_deref().unwrap_or(DEFAULT_BASIS),
    };
    let mut progress = Progress::new();
    let result = extract(&quantity, &request, &mut |d, t| {
        progress.update("finite coupling", d, t)
    });
    progress.finish();
    emit(&render(&result?, args.format.into())?)?;
    Ok(Outcome::Done)
}
