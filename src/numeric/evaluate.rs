//! Numerical values of expressions through MPFR, with an absolute
//! uncertainty carried along: the uncertainty a user wrote (`-1240.9(2)`,
//! `1.2e-3 ± 1e-4`), or, for a decimal written without one, half a unit in
//! its last digit (the rounding bound of the written digits, common
//! practice). Exact parts (integers, pi, zeta values) carry none.
//!
//! Propagation is first order and worst case (|a| u_b + |b| u_a for a
//! product), which is what a person checking digits expects; the working
//! precision is chosen by the caller and rounding is far below it.

use rug::float::Constant;
use rug::ops::Pow;
use rug::{Float, Integer, Rational};

use crate::error::{Error, Result};
use crate::input::catalogue::Catalogue;
use crate::input::expr;
use crate::input::expr::{Angle, Expr, Functional, Node};
use crate::numeric::Estimate;

/// Values of the functionals at the context's coupling.
pub type FunctionalValues<'a> = &'a mut dyn FnMut(Functional, &Angle) -> Result<Estimate>;

/// Multiple zeta values (arguments, precision in bits).
pub type MzvValues<'a> = &'a dyn Fn(&[u32], u32) -> Result<Float>;

/// What an evaluation may consult beyond the expression itself.
pub struct Context<'a> {
    /// Working precision in bits.
    pub prec: u32,
    /// Values of symbols (the coupling `g`, kinematic logs); a symbol
    /// without a value is an error.
    pub symbols: &'a [(&'a str, Float)],
    /// Values of the functionals at the context's coupling, when the caller
    /// can compute them (finite coupling); None makes them an error.
    pub functional: Option<FunctionalValues<'a>>,
    /// Multiple zeta values of depth > 1.
    pub mzv: Option<MzvValues<'a>>,
}

impl<'a> Context<'a> {
    pub fn new(prec: u32) -> Self {
        Context {
            prec,
            symbols: &[],
            functional: None,
            mzv: None,
        }
    }
}

/// Evaluates `e`; errors carry plain messages (callers render them at spans).
pub fn evaluate(
    e: &Expr,
    ctx: &mut Context<'_>,
) -> std::result::Result<Estimate, (crate::input::expr::Span, String)> {
    let p = ctx.prec;
    let exact = |v: Float| Ok(Estimate::exact(v));
    match &e.node {
        Node::Integer(i) => exact(Float::with_val(p, i)),
        Node::Decimal {
            value,
            uncertainty,
            text,
        } => {
            let v = Float::with_val(p, value);
            match uncertainty {
                Some(u) => Ok(Estimate {
                    value: v,
                    error: Float::with_val(p, u),
                    stated: true,
                }),
                None => Ok(Estimate {
                    value: v,
                    error: Float::with_val(p, half_last_digit(text)),
                    stated: false,
                }),
            }
        }
        Node::Pi => exact(Float::with_val(p, Constant::Pi)),
        Node::Catalan => exact(Float::with_val(p, Constant::Catalan)),
        Node::Zeta(args) if args.len() == 1 => exact(Float::with_val(p, Float::zeta_u(args[0]))),
        Node::Zeta(args) => match ctx.mzv {
            Some(f) => f(args, p)
                .map(Estimate::exact)
                .map_err(|err| (e.span, err.message().to_string())),
            None => Err((
                e.span,
                "multiple zeta values cannot be evaluated here".to_string(),
            )),
        },
        Node::Log(a) => {
            let x = evaluate(a, ctx)?;
            if x.value <= 0 || Float::with_val(p, &x.value - &x.error) <= 0 {
                return Err((
                    a.span,
                    "the logarithm needs a positive argument (also within its uncertainty)"
                        .to_string(),
                ));
            }
            let u = Float::with_val(p, &x.error / &x.value);
            Ok(Estimate {
                value: x.value.ln(),
                error: u,
                stated: x.stated,
            })
        }
        Node::Symbol(name) => match ctx.symbols.iter().find(|(n, _)| n == name) {
            Some((_, v)) => exact(Float::with_val(p, v)),
            None => Err((e.span, format!("the symbol `{name}` has no value here"))),
        },
        Node::Functional { kind, angle } => match ctx.functional.as_mut() {
            Some(f) => f(*kind, angle).map_err(|err| (e.span, err.message().to_string())),
            None => Err((
                e.span,
                "the functionals need a coupling: use `loopwise at` for finite-coupling values"
                    .to_string(),
            )),
        },
        Node::Neg(a) => Ok(evaluate(a, ctx)?.negated()),
        Node::Add(a, b) => Ok(evaluate(a, ctx)?.sum(&evaluate(b, ctx)?)),
        Node::Sub(a, b) => Ok(evaluate(a, ctx)?.difference(&evaluate(b, ctx)?)),
        Node::Mul(a, b) => Ok(evaluate(a, ctx)?.product(&evaluate(b, ctx)?)),
        Node::Div(a, b) => {
            let x = evaluate(a, ctx)?;
            x.quotient(&evaluate(b, ctx)?).ok_or_else(|| {
                (
                    b.span,
                    "division by a number that is zero within its uncertainty".to_string(),
                )
            })
        }
        Node::Pow(a, b) => {
            let x = evaluate(a, ctx)?;
            let y = evaluate(b, ctx)?;
            if y.is_exact() && y.value.is_integer() {
                let n = y.value.to_integer().unwrap_or_default();
                let k = n
                    .to_i32()
                    .filter(|k| k.abs() <= 100_000)
                    .ok_or_else(|| (b.span, "exponent too large".to_string()))?;
                if x.value.is_zero() && k < 0 {
                    return Err((e.span, "zero to a negative power".to_string()));
                }
                let value = Float::with_val(p, (&x.value).pow(k));
                // d(x^k) = k x^(k-1) dx
                let u = if x.is_exact() || k == 0 {
                    Float::with_val(p, 0)
                } else {
                    Float::with_val(p, (&x.value).pow(k - 1)).abs() * &x.error * k.unsigned_abs()
                };
                return Ok(Estimate {
                    value,
                    error: u,
                    stated: x.stated,
                });
            }
            if x.value <= 0 {
                return Err((
                    a.span,
                    "a non-integer power needs a positive base".to_string(),
                ));
            }
            let value = Float::with_val(p, (&x.value).pow(&y.value));
            let ln = Float::with_val(p, x.value.ln_ref());
            let d_base = Float::with_val(p, &y.value * &value) / &x.value;
            let u = d_base.abs() * &x.error + Float::with_val(p, &ln * &value).abs() * &y.error;
            Ok(Estimate {
                value,
                error: u,
                stated: x.stated || y.stated,
            })
        }
    }
}

/// An expression's value as `eval` settles it: digits that survived a
/// doubling of the working precision.
#[derive(Clone, Debug)]
pub enum Settled {
    /// An exact expression, stable to the requested digits.
    Exact(Float),
    /// A value with an uncertainty from the input, stable far below it.
    Uncertain(Estimate),
    /// An exact value that stayed below the rounding noise at every
    /// precision tried: zero to within `bound` at `bits` bits.
    Zero { bound: Float, bits: u32 },
}

/// Parses `text` and evaluates it to `digits` significant digits. A
/// catalogue name is refused with a pointer to `at`: it is a function of the
/// coupling, not a number.
pub fn number(text: &str, catalogue: &Catalogue, digits: u32) -> Result<Settled> {
    let e = expr::parse(&catalogue.mask_hyphens(text), "<expression>", None)?;
    let mut quantity = None;
    expr::for_each_symbol(&e, &mut |name, span| {
        if quantity.is_none() && catalogue.get_in_formula(name).is_some() {
            quantity = Some((name.replace('_', "-"), span));
        }
    });
    if let Some((name, span)) = quantity {
        return Err(expr::error_at(
            text,
            "<expression>",
            None,
            span,
            &format!("`{name}` is a function of the coupling, not a number; `loopwise at \"{}\" --g VALUE` gives its value", text.trim()),
        ));
    }
    settle(&e, text, digits)
}

/// Evaluates at two precisions and raises both until they agree to the
/// digits that will be printed, so that cancellation never shows digits that
/// are only rounding noise.
fn settle(e: &Expr, source: &str, digits: u32) -> Result<Settled> {
    let mzv = |s: &[u32], p: u32| crate::numeric::mzv::mzv(s, p);
    let mut bits = crate::numeric::working_bits(digits);
    let mut last = None;
    // Six doublings take 30 digits to about 2,000: a value still below the
    // noise there is zero for every practical purpose.
    for _ in 0..6 {
        let at = |b: u32| {
            let mut ctx = Context::new(b);
            ctx.mzv = Some(&mzv);
            evaluate(e, &mut ctx).map_err(|f| located(source, "<expression>", None, f))
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
            if noise <= Float::with_val(bits, &high.error / 1000u32).max(&tolerance) {
                return Ok(Settled::Uncertain(high));
            }
        } else if !high.value.is_zero() && noise <= tolerance {
            return Ok(Settled::Exact(high.value));
        }
        last = Some((noise.max(&scale), bits + 64));
        bits *= 2;
    }
    let (bound, bits) = last.unwrap_or_else(|| (Float::new(bits), bits));
    Ok(Settled::Zero { bound, bits })
}

/// Whether an expression needs numbers outside the exact ring: decimals,
/// Catalan's constant, logarithms, multiple zeta values.
pub fn needs_numbers(e: &Expr) -> bool {
    match &e.node {
        Node::Decimal { .. } | Node::Catalan | Node::Log(_) => true,
        Node::Zeta(args) => args.len() > 1,
        Node::Integer(_) | Node::Pi | Node::Symbol(_) | Node::Functional { .. } => false,
        Node::Neg(a) => needs_numbers(a),
        Node::Add(a, b) | Node::Sub(a, b) | Node::Mul(a, b) | Node::Div(a, b) | Node::Pow(a, b) => {
            needs_numbers(a) || needs_numbers(b)
        }
    }
}

/// Half a unit in the last written digit of a decimal literal: "-1240.9"
/// gives 0.05, "1.20e-3" gives 5e-6, "7e2" gives 50.
pub fn half_last_digit(text: &str) -> Rational {
    let t = text.trim().trim_start_matches(['-', '+']);
    let (mantissa, exponent) = match t.find(['e', 'E']) {
        Some(k) => (
            &t[..k],
            t[k + 1..]
                .trim_start_matches('+')
                .parse::<i64>()
                .unwrap_or(0),
        ),
        None => match t.find("*^") {
            Some(k) => (&t[..k], t[k + 2..].parse::<i64>().unwrap_or(0)),
            None => (t, 0),
        },
    };
    let mantissa = mantissa.split(['(', ' ', '±']).next().unwrap_or("");
    let decimals = mantissa.find('.').map_or(0, |k| mantissa.len() - k - 1) as i64;
    let e = exponent - decimals;
    let unit = if e >= 0 {
        Rational::from(Integer::from(10).pow(e as u32))
    } else {
        Rational::from((1, Integer::from(10).pow((-e) as u32)))
    };
    unit / 2u32
}

/// Significant digits written in a decimal literal (for capping "digits agree").
pub fn written_digits(text: &str) -> u32 {
    let t = text.trim().trim_start_matches(['-', '+']);
    let mantissa = t.split(['e', 'E', '(', ' ', '±', '*']).next().unwrap_or("");
    let digits: String = mantissa.chars().filter(char::is_ascii_digit).collect();
    digits.trim_start_matches('0').len().max(1) as u32
}

/// Renders an evaluation failure at its span in `source`.
pub fn located(
    source: &str,
    origin: &str,
    site: Option<&crate::input::expr::Site>,
    failure: (crate::input::expr::Span, String),
) -> Error {
    crate::input::expr::error_at(source, origin, site, failure.0, &failure.1)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::input::expr::parse;

    fn eval(text: &str) -> Estimate {
        let e = parse(text, "<test>", None).unwrap();
        evaluate(&e, &mut Context::new(200)).unwrap()
    }

    #[test]
    fn implied_and_stated_uncertainties() {
        assert_eq!(half_last_digit("-1240.9"), Rational::from((1, 20)));
        assert_eq!(half_last_digit("1.20e-3"), Rational::from((1, 200_000)));
        assert_eq!(half_last_digit("7e2"), Rational::from(50));
        assert_eq!(written_digits("-1240.9"), 5);
        assert_eq!(written_digits("0.00120"), 3);
        let a = eval("-1240.9(2)");
        assert!(a.stated);
        assert_eq!(a.error, Float::with_val(200, Rational::from((1, 5))));
    }

    /// Values against MPFR's own constants (an independent path through the library).
    #[test]
    fn constants_and_operations() {
        let x = eval("2pi^2 - 6 zeta(2) + catalan*0 + log(2)");
        let reference =
            Float::with_val(200, Constant::Pi).square() + Float::with_val(200, Constant::Log2);
        assert!(x.is_exact());
        assert!(Float::with_val(200, x.value - reference).abs() < 1e-55);
        let y = eval("3^(1/2)");
        assert!(Float::with_val(200, y.value.square() - 3u32).abs() < 1e-55);
    }

    #[test]
    fn propagation_is_first_order_worst_case() {
        let x = eval("2.0(1) * 3.0(2)");
        // |2| 0.2 + |3| 0.1 + 0.1*0.2 = 0.72
        assert!(Float::with_val(64, x.error - 0.72f64).abs() < 1e-12);
        let e = parse("1/0.0(1)", "<test>", None).unwrap();
        assert!(evaluate(&e, &mut Context::new(64)).is_err());
        let e = parse("l1 + 1", "<test>", None).unwrap();
        assert!(evaluate(&e, &mut Context::new(64)).is_err());
    }
}
