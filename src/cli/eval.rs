//! `loopwise eval EXPR`: one expression of the coefficient language to D
//! digits, with its uncertainty when the expression carries one.

use clap::Args as ClapArgs;

use loopwise::check::working_bits;
use loopwise::input::catalogue::Catalogue;
use loopwise::input::expr::{self};
use loopwise::numeric::evaluate::{self, Context};
use loopwise::report::{decimal, digit_place, rounded_at};
use loopwise::Result;
use rug::ops::Pow;
use rug::Float;

use super::{emit, in_range, Outcome};

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

pub fn run(args: &Args, catalogue: &Catalogue) -> Result<Outcome> {
    in_range("--digits", args.digits, 1, MAX_DIGITS)?;
    let e = expr::parse(&catalogue.mask_hyphens(&args.expr), "<expression>", None)?;
    // A catalogue name is a function of the coupling, not a number: say so
    // rather than "no value".
    let mut quantity = None;
    expr::for_each_symbol(&e, &mut |name, span| {
        if quantity.is_none() && catalogue.get_in_formula(name).is_some() {
            quantity = Some((name.replace('_', "-"), span));
        }
    });
    if let Some((name, span)) = quantity {
        return Err(expr::error_at(
            &args.expr,
            "<expression>",
            None,
            span,
            &format!("`{name}` is a function of the coupling, not a number; `loopwise at \"{}\" --g VALUE` gives its value", args.expr.trim()),
        ));
    }
    let line = stable_value(&e, &args.expr, args.digits)?;
    emit(&format!("{line}\n"))?;
    Ok(Outcome::Done)
}

/// Evaluates at two precisions and raises both until they agree to the
/// digits that will be printed, so that cancellation never shows digits that
/// are only rounding noise; an exact value that stays below the noise is
/// printed as zero with its bound.
fn stable_value(e: &expr::Expr, source: &str, digits: u32) -> Result<String> {
    let mzv = |s: &[u32], p: u32| loopwise::numeric::mzv::mzv(s, p);
    let mut bits = working_bits(digits);
    let mut last = None;
    for _ in 0..6 {
        let at = |b: u32| {
            let mut ctx = Context::new(b);
            ctx.mzv = Some(&mzv);
            evaluate::evaluate(e, &mut ctx)
                .map_err(|f| evaluate::located(source, "<expression>", None, f))
        };
        let low = at(bits)?;
        let high = at(bits + 64)?;
        let noise = Float::with_val(bits, &high.value - &low.value).abs();
        let scale = Float::with_val(bits, high.value.abs_ref());
        let tolerance =
            Float::with_val(bits, &scale / Float::with_val(bits, 10u32).pow(digits + 1));
        if !high.is_exact() {
            // At most the uncertainty's second digit is printed: noise a
            // thousand times below it cannot reach a printed digit.
            if noise <= Float::with_val(bits, &high.uncertainty / 1000u32).max(&tolerance) {
                return Ok(uncertain_text(&high.value, &high.uncertainty, digits));
            }
        } else if !high.value.is_zero() && noise <= tolerance {
            return Ok(decimal(&high.value, digits));
        }
        last = Some((decimal(&noise.max(&scale), 2), bits + 64));
        bits *= 2;
    }
    let (bound, used) = last.unwrap_or_else(|| ("0".to_string(), bits));
    Ok(format!("0 (zero to within {bound} at {used} bits)"))
}

/// An uncertain value as `VALUE ± UNCERTAINTY`, the uncertainty to two
/// significant digits and the value rounded to the place of its second digit
/// (common practice), or to `digits` significant digits if that is coarser.
fn uncertain_text(value: &Float, uncertainty: &Float, digits: u32) -> String {
    let place = digit_place(uncertainty, 2).unwrap_or(0);
    let shown = match digit_place(value, digits) {
        Some(cap) if cap > place => decimal(value, digits),
        _ => rounded_at(value, place),
    };
    format!("{shown} ± {}", decimal(uncertainty, 2))
}
