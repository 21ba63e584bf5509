//! Number literals of the coefficient language, read exactly from their
//! text: integers, decimals with an optional uncertainty in brackets or
//! after `±`, exponents; with the hints for forms other languages use
//! (Fortran's `1.2d3`) and the refusal of ambiguous brackets (`3.9 (1)`).

use super::*;

/// `1.2d3`, the exponent mark of Fortran output, would otherwise read as
/// the product of 1.2 and a symbol `d3`.
pub(super) fn fortran_exponent(ctx: &Ctx<'_>, number: &Pair<'_, Rule>) -> Fallible<()> {
    let end = number.as_span().end();
    let rest = &ctx.source.as_bytes()[end..];
    let digit_at = match rest {
        [b'd' | b'D', b'+' | b'-', ..] => 2,
        [b'd' | b'D', ..] => 1,
        _ => return Ok(()),
    };
    if !rest.get(digit_at).is_some_and(u8::is_ascii_digit) {
        return Ok(());
    }
    let tail = rest[digit_at..]
        .iter()
        .take_while(|b| b.is_ascii_digit())
        .count();
    let span = Span {
        start: number.as_span().start(),
        end: end + digit_at + tail,
    };
    let text = &ctx.source[span.start..span.end];
    Err(ctx.error(
        span,
        &format!(
            "`{text}` looks like a Fortran exponent: write `{}` (or `{}*{}` for a product with a symbol)",
            text.replacen(['d', 'D'], "e", 1),
            number.as_str(),
            &ctx.source[end..span.end]
        ),
    ))
}

/// A number before a bracket that holds a bare number (`3.9 (1)`,
/// `4(-1)`, `2 (3)`) reads either as an uncertainty written carelessly or
/// as a product; neither reading is safe to pick, so both are refused.
pub(super) fn bracketed_number(
    ctx: &Ctx<'_>,
    number: &Pair<'_, Rule>,
    group: &Pair<'_, Rule>,
) -> Fallible<()> {
    let Some(inner) = group
        .clone()
        .into_inner()
        .find(|q| q.as_rule() == Rule::expr)
    else {
        return Ok(());
    };
    let parts: Vec<Rule> = inner.into_inner().map(|q| q.as_rule()).collect();
    let Some((last, signs)) = parts.split_last() else {
        return Ok(());
    };
    if *last != Rule::number_lit || !signs.iter().all(|r| matches!(r, Rule::neg | Rule::pos)) {
        return Ok(());
    }
    let span = Span {
        start: number.as_span().start(),
        end: group.as_span().end(),
    };
    let (n, g) = (number.as_str(), group.as_str());
    let glued = number.as_span().end() == group.as_span().start();
    let reading = if !signs.is_empty() && glued {
        "an uncertainty in brackets cannot be negative".to_string()
    } else if glued {
        "a bracket glued to a number holds its uncertainty as plain digits (`3.9(1)`) or a plain decimal (`4.0(1.5)`)".to_string()
    } else {
        format!(
            "ambiguous: for an uncertainty write `{n}{}` with no blank",
            g.replace(' ', "")
        )
    };
    Err(ctx.error(
        span,
        &format!(
            "`{}`: {reading}; for a product write `{n}*{g}`",
            &ctx.source[span.start..span.end]
        ),
    ))
}

/// The parts of a written number: digits before and after the point, the
/// digits of a bracketed uncertainty, and the power of ten.
struct Written<'a> {
    whole: &'a str,
    fraction: &'a str,
    last_digits: Option<&'a str>,
    exponent: i64,
    has_point: bool,
}

fn written<'a>(ctx: &Ctx<'_>, p: Pair<'a, Rule>) -> Fallible<Written<'a>> {
    let mut w = Written {
        whole: "",
        fraction: "",
        last_digits: None,
        exponent: 0,
        has_point: false,
    };
    let mut exponent_span = span_of(&p);
    let mut exponent_text = None;
    for q in p.into_inner() {
        match q.as_rule() {
            Rule::mantissa => {
                let t = q.as_str();
                match t.split_once('.') {
                    Some((a, b)) => {
                        w.whole = a;
                        w.fraction = b;
                        w.has_point = true;
                    }
                    None => w.whole = t,
                }
                if w.whole.len() + w.fraction.len() > MAX_LITERAL_DIGITS {
                    return Err(ctx.error(
                        span_of(&q),
                        &format!("number with more than {MAX_LITERAL_DIGITS} digits"),
                    ));
                }
            }
            Rule::last_digits => {
                let d = q.as_str().trim_start_matches('(').trim_end_matches(')');
                if d.len() > MAX_LITERAL_DIGITS {
                    return Err(ctx.error(
                        span_of(&q),
                        &format!("uncertainty with more than {MAX_LITERAL_DIGITS} digits"),
                    ));
                }
                w.last_digits = Some(d);
            }
            Rule::exponent => {
                exponent_span = span_of(&q);
                exponent_text = q.into_inner().next().map(|v| v.as_str());
            }
            _ => {}
        }
    }
    if let Some(t) = exponent_text {
        let digits = t.trim_start_matches(['+', '-']).trim_start_matches('0');
        let e: Option<i64> = if digits.len() > 6 {
            None
        } else {
            t.parse().ok()
        };
        match e {
            Some(e) if e.unsigned_abs() <= u64::from(MAX_EXPONENT) => w.exponent = e,
            _ => {
                return Err(ctx.error(
                    exponent_span,
                    &format!("exponent outside -{MAX_EXPONENT}..{MAX_EXPONENT}"),
                ));
            }
        }
    }
    Ok(w)
}

fn digits_value(digits: &str) -> Integer {
    if digits.is_empty() {
        return Integer::new();
    }
    // The grammar admits only ASCII digits here.
    Integer::from_str_radix(digits, 10).unwrap_or_default()
}

/// `digits * 10^(exponent - scale)` exactly.
fn scaled(digits: &str, scale: usize, exponent: i64) -> Rational {
    let n = digits_value(digits);
    let shift = exponent - scale as i64;
    let ten = Integer::from(Integer::u_pow_u(10, shift.unsigned_abs() as u32));
    if shift >= 0 {
        Rational::from(n * ten)
    } else {
        Rational::from((n, ten))
    }
}

pub(super) fn number_literal(ctx: &Ctx<'_>, p: Pair<'_, Rule>) -> Fallible<Built> {
    let span = span_of(&p);
    let text = p.as_str().to_string();
    let mut main = None;
    let mut plus_minus = None;
    for q in p.into_inner() {
        match q.as_rule() {
            Rule::number => main = Some(written(ctx, q)?),
            Rule::bare_number => plus_minus = Some((span_of(&q), written(ctx, q)?)),
            _ => {}
        }
    }
    let main = main.ok_or_else(|| ctx.error(span, "missing number"))?;
    if !main.has_point
        && main.exponent == 0
        && main.last_digits.is_none()
        && plus_minus.is_none()
        && !text.contains(['e', 'E', '^'])
    {
        return node(Node::Integer(digits_value(main.whole)), span, 1, ctx);
    }
    let scale = main.fraction.len();
    let all = format!("{}{}", main.whole, main.fraction);
    let value = scaled(&all, scale, main.exponent);
    let uncertainty = match (main.last_digits, plus_minus) {
        (Some(_), Some((s, _))) => {
            return Err(ctx.error(
                s,
                "this number already has an uncertainty in brackets; give it one way only",
            ));
        }
        // A bracket with a point holds the uncertainty itself (4.0(1.5) is
        // 4.0 ± 1.5); one of bare digits counts units of the last written digit.
        (Some(d), None) => Some(match d.split_once('.') {
            Some((whole, fraction)) => {
                scaled(&format!("{whole}{fraction}"), fraction.len(), main.exponent)
            }
            None => scaled(d, scale, main.exponent),
        }),
        (None, Some((_, w))) => {
            let all = format!("{}{}", w.whole, w.fraction);
            Some(scaled(&all, w.fraction.len(), w.exponent))
        }
        (None, None) => None,
    };
    node(
        Node::Decimal {
            value,
            uncertainty,
            text,
        },
        span,
        1,
        ctx,
    )
}
