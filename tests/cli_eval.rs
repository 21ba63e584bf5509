//! `loopwise eval` run as a user runs it: how a value with an uncertainty is
//! printed.

mod common;

use common::loopwise;

use rug::float::Constant;
use rug::Float;

const PREC: u32 = 256;

/// The power of ten of the last written digit of a decimal such as
/// `0.00377`, `-1240.90` or `1.00e-30`.
fn last_place(text: &str) -> i32 {
    let (mantissa, exp) = text
        .split_once('e')
        .map_or((text, 0), |(m, e)| (m, e.parse::<i32>().unwrap()));
    let decimals = mantissa.split_once('.').map_or(0, |(_, d)| d.len() as i32);
    exp - decimals
}

/// Significant digits written in a decimal: leading zeros do not count.
fn significant(text: &str) -> usize {
    let mantissa = text.split('e').next().unwrap();
    mantissa
        .chars()
        .filter(char::is_ascii_digit)
        .skip_while(|&c| c == '0')
        .count()
}

/// `VALUE ± UNCERTAINTY` from one line of output.
fn split(out: &str) -> (String, String) {
    let (v, u) = out
        .trim()
        .split_once(" ± ")
        .unwrap_or_else(|| panic!("no uncertainty in `{out}`"));
    (v.to_string(), u.to_string())
}

fn float(text: &str) -> Float {
    Float::with_val(PREC, Float::parse(text).unwrap())
}

/// An uncertain value is printed with its uncertainty to two significant
/// digits and the value rounded at the place of the uncertainty's second
/// digit (common practice), not with the 30 working digits below it.
/// References: pi times the written numbers, computed here in MPFR.
#[test]
fn eval_prints_only_digits_its_uncertainty_supports() {
    let pi = Float::with_val(PREC, Constant::Pi);
    let cases = [
        (
            "(1.2e-3 ± 1e-4) * pi",
            float("1.2e-3") * pi.clone(),
            float("1e-4") * pi.clone(),
        ),
        ("-1240.9(2)", float("-1240.9"), float("0.2")),
        (
            "(1e-30 ± 1e-31) * pi",
            float("1e-30") * pi.clone(),
            float("1e-31") * pi.clone(),
        ),
        ("(123456 ± 7000)", float("123456"), float("7000")),
    ];
    for (expr, value, uncertainty) in cases {
        let (code, out, err) = loopwise(&["eval", expr]);
        assert_eq!(code, 0, "{expr}: {err}");
        let (v, u) = split(&out);
        assert_eq!(significant(&u), 2, "{expr}: uncertainty `{u}`");
        assert_eq!(
            last_place(&v),
            last_place(&u),
            "{expr}: `{v}` is not rounded where `{u}` ends"
        );
        let unit = Float::with_val(PREC, Float::with_val(PREC, 10u32).pow_ref_i(last_place(&u)));
        let off = Float::with_val(PREC, float(&v) - &value).abs();
        assert!(
            off <= Float::with_val(PREC, &unit / 2u32) * 1.000001,
            "{expr}: {v} is not {value} rounded"
        );
        let u_off = Float::with_val(PREC, float(&u) - &uncertainty).abs();
        assert!(
            u_off <= Float::with_val(PREC, &unit / 2u32) * 1.000001,
            "{expr}: {u} is not {uncertainty} rounded"
        );
    }
    // The case of the report, whatever reading of `1.2e-3(1)` the parser settles on.
    let (v, u) = split(&loopwise(&["eval", "1.2e-3(1) * pi"]).1);
    assert_eq!(last_place(&v), last_place(&u), "`{v} ± {u}`");
    // A value uncertain only far below the requested digits keeps those digits.
    let (v, _) = split(&loopwise(&["eval", "(1 ± 1e-25) * pi", "--digits", "10"]).1);
    assert_eq!(significant(&v), 10, "{v}");
    assert!(
        Float::with_val(PREC, float(&v) - &pi).abs() < 5.000001e-10,
        "{v}"
    );
    // A value whose uncertainty exceeds it is still written with both.
    let (v, u) = split(&loopwise(&["eval", "1.2(1) - 1.2(1)"]).1);
    assert_eq!(last_place(&v), last_place(&u), "`{v} ± {u}`");
    assert_eq!(float(&v), 0, "`{v}`");
}

trait PowI {
    fn pow_ref_i(&self, k: i32) -> Float;
}

impl PowI for Float {
    fn pow_ref_i(&self, k: i32) -> Float {
        use rug::ops::Pow;
        Float::with_val(self.prec(), self.pow(k))
    }
}
