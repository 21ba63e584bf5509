//! Decimal text of computed numbers: a value to a number of significant
//! digits, a value rounded at a decimal place, an estimate to the digits its
//! error supports, and an estimate with its error in brackets the way the
//! coefficient language reads it back (`20.834722249(13)`).

use rug::ops::Pow;
use rug::{Float, Integer, Rational};

use crate::numeric::evaluate::Settled;
use crate::numeric::Estimate;

/// A decimal string with `digits` significant digits: plain notation for
/// moderate exponents, scientific otherwise.
pub fn decimal(x: &Float, digits: u32) -> String {
    if x.is_zero() {
        return "0".to_string();
    }
    if !x.is_finite() {
        return x.to_string();
    }
    let (negative, mantissa, exp) = x.to_sign_string_exp(10, Some(digits.max(1) as usize));
    let exp = exp.unwrap_or(0);
    let sign = if negative { "-" } else { "" };
    // value = 0.mantissa * 10^exp
    let plain = if exp > 0 && exp as usize <= mantissa.len() {
        let (int, frac) = mantissa.split_at(exp as usize);
        if frac.is_empty() {
            int.to_string()
        } else {
            format!("{int}.{frac}")
        }
    } else if exp <= 0 && exp > -6 {
        format!("0.{}{}", "0".repeat((-exp) as usize), mantissa)
    } else {
        let (first, rest) = mantissa.split_at(1);
        let e = exp - 1;
        return if rest.is_empty() {
            format!("{sign}{first}e{e}")
        } else {
            format!("{sign}{first}.{rest}e{e}")
        };
    };
    format!("{sign}{plain}")
}

/// The decimal place (the power of ten) of the `nth` significant digit of
/// `x`, after rounding `x` to n digits, so that 0.000996 to two digits (0.0010)
/// has its second digit at 10^-4. None for zero and non-finite values.
pub fn digit_place(x: &Float, nth: u32) -> Option<i32> {
    if x.is_zero() || !x.is_finite() {
        return None;
    }
    let (_, _, exp) = x.to_sign_string_exp(10, Some(nth.max(1) as usize));
    // x = 0.d1d2... * 10^exp: the first digit stands at 10^(exp-1).
    exp.map(|e| e - nth as i32)
}

/// `x` rounded to a multiple of 10^place and written down to that place,
/// trailing zeros included: they are digits the rounding vouches for.
pub fn rounded_at(x: &Float, place: i32) -> String {
    let prec = x.prec().max(64) + 64;
    let unit = Float::with_val(prec, Float::with_val(prec, 10u32).pow(place));
    let m = Float::with_val(prec, x / &unit)
        .round()
        .to_integer()
        .unwrap_or_default();
    if m.is_zero() {
        return if (-6..0).contains(&place) {
            format!("0.{}", "0".repeat(place.unsigned_abs() as usize))
        } else {
            "0".to_string()
        };
    }
    let digits = m.to_string_radix(10).trim_start_matches('-').len() as u32;
    decimal(&(Float::with_val(prec, &m) * &unit), digits)
}

/// The value rounded to exactly min(digits_supported, max_digits)
/// significant digits (trailing zeros included, since they are supported
/// digits too), in plain decimal when that needs no padding zeros and as
/// mantissa`e`exponent otherwise. Only digits the error supports are
/// printed; when none are (the error reaches the value's size), the value
/// is rounded at the error's leading digit (common practice), so that the
/// text stays one number whose every digit the error vouches for.
pub fn supported(e: &Estimate, max_digits: u32) -> String {
    let k = e.digits_supported().min(max_digits);
    if k == 0 {
        return digit_place(&e.error, 1)
            .filter(|_| e.value.is_finite())
            .map_or_else(|| "nan".to_string(), |place| rounded_at(&e.value, place));
    }
    // Scientific text with k significant digits (rug counts the
    // precision in significant digits), rounded to nearest:
    // "-d.ddd...e<exp>", split into sign, digits and exponent.
    let sci = format!("{:.*e}", k as usize, e.value);
    let (mantissa, exp_text) = sci.split_once('e').unwrap_or((&sci, "0"));
    let sign = if mantissa.starts_with('-') { "-" } else { "" };
    let digits: String = mantissa.chars().filter(char::is_ascii_digit).collect();
    let exp = exp_text.parse::<i64>().unwrap_or(0) + 1;
    // value = 0.d1d2d3... x 10^exp
    // Plain decimals unless that would need padding zeros that look
    // like digits (a large integer part) or many leading zeros.
    if (-5..=digits.len() as i64).contains(&exp) {
        if exp <= 0 {
            format!("{sign}0.{}{digits}", "0".repeat((-exp) as usize))
        } else if exp as usize == digits.len() {
            format!("{sign}{digits}")
        } else {
            let (a, b) = digits.split_at(exp as usize);
            format!("{sign}{a}.{b}")
        }
    } else {
        let (a, b) = digits.split_at(1);
        let b = if b.is_empty() {
            String::new()
        } else {
            format!(".{b}")
        };
        format!("{sign}{a}{b}e{}", exp - 1)
    }
}

/// A number with its uncertainty as the coefficient language writes it:
/// the value rounded at the second significant digit of the uncertainty,
/// that uncertainty (rounded up) in brackets in units of the last digit,
/// `20.834722249(13)` or `-1.23(4)e-9`; a number without an uncertainty at
/// `digits` significant digits.
pub fn bracketed(a: &Estimate, digits: u32) -> String {
    if a.error.is_zero() {
        return decimal(&a.value, digits);
    }
    let (Some(value), Some(u)) = (a.value.to_rational(), a.error.to_rational()) else {
        return format!("{} ± {}", a.value, a.error);
    };
    let u = Rational::from(u.abs_ref());
    let leading = |x: &Rational| -> i64 {
        let f = Float::with_val(64, x);
        Float::with_val(64, f.log10_ref()).floor().to_f64() as i64
    };
    let mut last = leading(&u) - 1;
    let (n, ud) = loop {
        let unit = power_of_ten(last);
        let n = Rational::from(&value / &unit).round().into_numer_denom().0;
        // Rounded up, less a relative 10^-12 so that the binary image of a
        // written `(13)` does not come out as 14.
        let slack = Rational::from((999_999_999_999u64, 1_000_000_000_000u64));
        let ud = (Rational::from(&u / &unit) * slack)
            .ceil()
            .into_numer_denom()
            .0;
        if ud < 100 {
            break (n, ud);
        }
        last += 1;
    };
    let negative = n < 0;
    let digits_n = Integer::from(n.abs_ref()).to_string();
    let sign = if negative { "-" } else { "" };
    let width = digits_n.len().max(ud.to_string().len()) as i64;
    let exponent = last + width - 1;
    if (-5..21).contains(&exponent) {
        if last >= 0 {
            let zeros = "0".repeat(last as usize);
            return format!("{sign}{digits_n}{zeros}({ud}{zeros})");
        }
        let places = (-last) as usize;
        let padded = format!("{:0>w$}", digits_n, w = places + 1);
        let (int, frac) = padded.split_at(padded.len() - places);
        return format!("{sign}{int}.{frac}({ud})");
    }
    let padded = format!("{:0>w$}", digits_n, w = width as usize);
    let (first, rest) = padded.split_at(1);
    let point = if rest.is_empty() {
        String::new()
    } else {
        format!(".{rest}")
    };
    format!("{sign}{first}{point}({ud})e{exponent}")
}

fn power_of_ten(e: i64) -> Rational {
    let p = Integer::from(Integer::u_pow_u(10, e.unsigned_abs() as u32));
    if e >= 0 {
        Rational::from(p)
    } else {
        Rational::from((Integer::from(1), p))
    }
}

/// `eval`'s line: an exact value to `digits` significant digits; an
/// uncertain one as `VALUE ± UNCERTAINTY`, the uncertainty to two significant
/// digits and the value rounded to the place of its second digit (common
/// practice), or to `digits` significant digits if that is coarser.
pub fn number_text(value: &Settled, digits: u32) -> String {
    match value {
        Settled::Exact(x) => decimal(x, digits),
        Settled::Uncertain(e) => {
            let place = digit_place(&e.error, 2).unwrap_or(0);
            let shown = match digit_place(&e.value, digits) {
                Some(cap) if cap > place => decimal(&e.value, digits),
                _ => rounded_at(&e.value, place),
            };
            format!("{shown} ± {}", decimal(&e.error, 2))
        }
        Settled::Zero { bound, bits } => {
            let bound = if bound.is_zero() {
                "0".to_string()
            } else {
                decimal(bound, 2)
            };
            format!("0 (zero to within {bound} at {bits} bits)")
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::input::expr::parse;
    use crate::numeric::evaluate::{evaluate, Context};

    fn fl(s: &str) -> Float {
        Float::with_val(200, Float::parse(s).unwrap())
    }

    #[test]
    fn decimals() {
        let f = |v: f64| Float::with_val(64, v);
        assert_eq!(decimal(&f(4.0), 5), "4.0000");
        assert_eq!(decimal(&f(-13.15947), 4), "-13.16");
        assert_eq!(decimal(&f(0.00123), 3), "0.00123");
        assert_eq!(decimal(&f(1.5e30), 3), "1.50e30");
        assert_eq!(decimal(&f(-2.5e-9), 2), "-2.5e-9");
        assert_eq!(decimal(&f(0.0), 2), "0");
    }

    #[test]
    fn rounding_at_a_decimal_place() {
        let f = |v: &str| Float::with_val(128, Float::parse(v).unwrap());
        assert_eq!(digit_place(&f("0.000314"), 2), Some(-5));
        assert_eq!(digit_place(&f("0.000996"), 2), Some(-4));
        assert_eq!(digit_place(&f("7000"), 1), Some(3));
        assert_eq!(digit_place(&f("0"), 2), None);
        assert_eq!(rounded_at(&f("0.0037699"), -5), "0.00377");
        assert_eq!(rounded_at(&f("-1240.9"), -2), "-1240.90");
        assert_eq!(rounded_at(&f("123456"), 2), "1.235e5");
        assert_eq!(rounded_at(&f("0.004"), -2), "0.00");
        assert_eq!(rounded_at(&f("3e-40"), -31), "0");
    }

    fn num(text: &str) -> Estimate {
        evaluate(
            &parse(text, "<test>", None).unwrap(),
            &mut Context::new(200),
        )
        .unwrap()
    }

    fn close(x: &Float, y: f64, tol: f64) -> bool {
        (x.to_f64() - y).abs() <= tol
    }

    #[test]
    fn decimal_text_keeps_only_supported_digits() {
        let e = Estimate::new(fl("0.324512345678"), fl("3e-8"));
        // The error 3e-8 is within half a unit of the 7th digit (5e-8) but not
        // of the 8th (5e-9): 7 digits.
        assert_eq!(e.digits_supported(), 7);
        assert_eq!(supported(&e, 40), "0.3245123");
        assert_eq!(supported(&e, 3), "0.325");
        let big = Estimate::new(fl("-12345.678"), fl("0.004"));
        assert_eq!(supported(&big, 40), "-12345.68");
        let tiny = Estimate::new(fl("1e-30"), fl("1e-20"));
        assert_eq!(tiny.digits_supported(), 0);
        assert_eq!(supported(&tiny, 10), "0");
        // An error as large as the value: rounded at the error's leading digit.
        let rough = Estimate::new(fl("1.04"), fl("0.6"));
        assert_eq!(rough.digits_supported(), 0);
        assert_eq!(supported(&rough, 10), "1.0");
        let cancelled = Estimate::new(fl("2e-25"), fl("3e-3"));
        assert_eq!(supported(&cancelled, 10), "0.000");
        let half = Estimate::new(fl("0.5"), fl("1e-10"));
        assert_eq!(supported(&half, 40), "0.500000000");
        let whole = Estimate::new(fl("1234567.4"), fl("2000"));
        assert_eq!(supported(&whole, 40), "1.23e6");
        let sci = Estimate::new(fl("6.02214076e23"), fl("1e15"));
        assert_eq!(supported(&sci, 40), "6.0221408e23");
    }

    #[test]
    fn uncertainties_are_written_in_brackets() {
        assert_eq!(bracketed(&num("20.834722249(13)"), 20), "20.834722249(13)");
        assert_eq!(bracketed(&num("-0.16667(1)"), 20), "-0.166670(10)");
        assert_eq!(bracketed(&num("-1.234e-9 ± 4e-11"), 20), "-1.234(40)e-9");
        assert_eq!(bracketed(&num("123456 ± 3400"), 20), "123500(3400)");
        assert_eq!(bracketed(&num("0.0001(3)"), 20), "0.00010(30)");
        assert_eq!(bracketed(&num("0.5"), 20), "0.500(50)");
        assert_eq!(bracketed(&num("2"), 6), "2.00000");
        // What is written reads back as the same interval (rounded outwards).
        let back = num(&bracketed(&num("1.23456(27)"), 20));
        assert!(close(&back.value, 1.23456, 1e-12) && close(&back.error, 0.00027, 1e-12));
    }
}
