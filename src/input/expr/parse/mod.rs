//! From text to [`Expr`]: runs the pest grammar (`grammar/expr.pest`),
//! applies operator precedence with pest's Pratt parser, builds the tree with
//! spans, and does the checks that need no evaluation (zeta arguments, sizes
//! of literals, nesting). Every limit below exists so that hostile or
//! mangled input ends in an error, never in a stack overflow or a
//! runaway allocation.

use std::num::NonZeroUsize;
use std::sync::Once;

use pest::iterators::Pair;
use pest::pratt_parser::{Assoc, Op, PrattParser};
use pest::Parser;
use rug::{Integer, Rational};

use super::site::render;
use super::{Angle, Expr, Functional, Node, Span};
use crate::error::{ErrorKind, Result};

mod literal;

use literal::{bracketed_number, fortran_exponent, number_literal};

use crate::limits::MAX_EXPONENT;
use crate::limits::MAX_LITERAL_DIGITS;
use crate::limits::MAX_NESTING;
use crate::limits::MAX_SOURCE_BYTES;
use crate::limits::MAX_TREE_DEPTH;
use crate::limits::MAX_ZETA_ARGUMENT;
use crate::limits::MAX_ZETA_DEPTH;

/// A failed parse before it is rendered: where, and what went wrong. The
/// series-file reader renders these against the file itself.
#[derive(Debug, Clone)]
pub(crate) struct Failure {
    pub span: Span,
    pub message: String,
}

type Fallible<T> = std::result::Result<T, Failure>;

#[derive(pest_derive::Parser)]
#[grammar = "../grammar/expr.pest"]
struct ExprGrammar;

/// Most signs and powers in one chain (`- - -x`, `2^2^2^2`); each costs a
/// level of recursion in the Pratt parser.
const MAX_CHAIN: usize = 100;
/// Backstop on pest's total work for one parse; far above what any accepted
/// source needs (a few dozen calls per byte).
const CALL_LIMIT: usize = 200_000_000;

static SET_CALL_LIMIT: Once = Once::new();

struct Ctx<'s> {
    source: &'s str,
    pratt: PrattParser<Rule>,
}

impl Ctx<'_> {
    fn error(&self, span: Span, message: &str) -> Failure {
        Failure {
            span,
            message: message.to_string(),
        }
    }
}

fn span_of(pair: &Pair<'_, Rule>) -> Span {
    let s = pair.as_span();
    Span {
        start: s.start(),
        end: s.end(),
    }
}

/// A subtree and its depth, carried together so that depth is checked as the
/// tree grows (a tree that is too deep is never finished, so never dropped
/// recursively).
type Built = (Expr, usize);

pub(crate) fn parse(source: &str, origin: &str, place: Option<(usize, usize)>) -> Result<Expr> {
    parse_unrendered(source)
        .map_err(|f| render(ErrorKind::Parse, source, origin, place, f.span, &f.message))
}

pub(crate) fn parse_unrendered(source: &str) -> Fallible<Expr> {
    SET_CALL_LIMIT.call_once(|| pest::set_call_limit(NonZeroUsize::new(CALL_LIMIT)));
    let ctx = Ctx {
        source,
        pratt: PrattParser::new()
            .op(Op::infix(Rule::add, Assoc::Left) | Op::infix(Rule::sub, Assoc::Left))
            .op(Op::infix(Rule::mul, Assoc::Left)
                | Op::infix(Rule::div, Assoc::Left)
                | Op::infix(Rule::implicit_mul, Assoc::Left))
            .op(Op::prefix(Rule::neg) | Op::prefix(Rule::pos))
            .op(Op::infix(Rule::pow, Assoc::Right)),
    };
    if source.len() > MAX_SOURCE_BYTES {
        return Err(ctx.error(
            Span::default(),
            &format!(
                "expression of {} bytes is longer than the {MAX_SOURCE_BYTES} bytes accepted",
                source.len()
            ),
        ));
    }
    let first = source.len() - source.trim_start().len();
    if first == source.len() {
        return Err(ctx.error(
            Span {
                start: first,
                end: first,
            },
            "empty expression: expected a number, a constant, a function, a symbol or `(`",
        ));
    }
    check_nesting(&ctx)?;
    let mut pairs = ExprGrammar::parse(Rule::main, source).map_err(|e| grammar_error(&ctx, e))?;
    let main = pairs
        .next()
        .ok_or_else(|| ctx.error(Span::default(), "nothing to parse"))?;
    let expr = main
        .into_inner()
        .find(|p| p.as_rule() == Rule::expr)
        .ok_or_else(|| ctx.error(Span::default(), "nothing to parse"))?;
    build(&ctx, expr).map(|(e, _)| e)
}

/// Rejects deep bracket nesting before pest sees it: each level costs
/// several frames of recursion in the generated parser.
fn check_nesting(ctx: &Ctx<'_>) -> Fallible<()> {
    let mut depth = 0usize;
    for (i, b) in ctx.source.bytes().enumerate() {
        match b {
            b'(' | b'[' => {
                depth += 1;
                if depth > MAX_NESTING {
                    return Err(ctx.error(
                        Span {
                            start: i,
                            end: i + 1,
                        },
                        &format!("brackets nested more than {MAX_NESTING} deep"),
                    ));
                }
            }
            b')' | b']' => depth = depth.saturating_sub(1),
            _ => {}
        }
    }
    Ok(())
}

/// Words for the rules an error can list as expected.
fn describe(rule: &Rule) -> String {
    match rule {
        Rule::EOI => "the end of the expression",
        Rule::expr | Rule::main => "an expression",
        Rule::number_lit | Rule::number | Rule::bare_number | Rule::mantissa => "a number",
        Rule::last_digits | Rule::uncertainty_digits => "an uncertainty in brackets",
        Rule::exponent | Rule::exponent_value => "an exponent",
        Rule::plus_minus => "`±`",
        Rule::pi | Rule::catalan | Rule::zeta_short => "a constant",
        Rule::zeta_name | Rule::log_name | Rule::gamma_name | Rule::delta_name => "a function",
        Rule::zeta_call | Rule::log_call | Rule::functional => "a function",
        Rule::symbol | Rule::unknown_call => "a symbol",
        Rule::group | Rule::open_paren => "`(`",
        Rule::close_paren => "`)`",
        Rule::open_bracket => "`[`",
        Rule::close_bracket => "`]`",
        Rule::comma => "`,`",
        Rule::equals => "`=`",
        Rule::neg | Rule::pos => "a sign",
        Rule::add | Rule::sub | Rule::mul | Rule::div | Rule::pow => "an operator",
        Rule::implicit_mul => "an operand",
        Rule::zeta_argument => "a whole number",
        Rule::cos2_word | Rule::cos2_value | Rule::cos2_symbolic => "`c2`",
        // Silent rules never reach an error message.
        _ => "a token",
    }
    .to_string()
}

/// The order in which expected things are listed: what may continue an
/// expression, what may start an operand, then closers.
const WORD_ORDER: [&str; 17] = [
    "an operator",
    "`±`",
    "a sign",
    "an expression",
    "a number",
    "a constant",
    "a function",
    "a symbol",
    "`(`",
    "`[`",
    "a whole number",
    "`c2`",
    "`,`",
    "`=`",
    "`)`",
    "`]`",
    "the end of the expression",
];

fn grammar_error(ctx: &Ctx<'_>, e: pest::error::Error<Rule>) -> Failure {
    let at = match e.location {
        pest::error::InputLocation::Pos(p) => p,
        pest::error::InputLocation::Span((s, _)) => s,
    };
    // Several rules share a description; keep the first of each so the
    // message lists every alternative once.
    let e = match e.variant {
        pest::error::ErrorVariant::ParsingError {
            positives,
            negatives,
        } => {
            let mut positives = positives;
            positives.sort_by_key(|r| WORD_ORDER.iter().position(|w| *w == describe(r)));
            let mut seen = Vec::new();
            let positives = positives
                .into_iter()
                .filter(|r| {
                    let word = describe(r);
                    let fresh = !seen.contains(&word);
                    seen.push(word);
                    fresh
                })
                .collect();
            pest::error::Error::new_from_pos(
                pest::error::ErrorVariant::ParsingError {
                    positives,
                    negatives,
                },
                pest::Position::new(ctx.source, at)
                    .unwrap_or_else(|| pest::Position::from_start(ctx.source)),
            )
        }
        variant => {
            pest::error::Error::new_from_pos(variant, pest::Position::from_start(ctx.source))
        }
    };
    let message = match &e.variant {
        pest::error::ErrorVariant::CustomError { message } if message.contains("limit reached") => {
            "expression too long or too deeply nested to parse".to_string()
        }
        _ => e.renamed_rules(describe).variant.message().into_owned(),
    };
    let found = match ctx.source.get(at..).and_then(|rest| rest.chars().next()) {
        None => "the end of the expression".to_string(),
        Some(c) if c.is_whitespace() => "a blank".to_string(),
        Some('`') => "a backtick".to_string(),
        Some(c) => format!("`{c}`"),
    };
    let width = ctx
        .source
        .get(at..)
        .and_then(|r| r.chars().next())
        .map_or(0, char::len_utf8);
    let hint = match ctx.source.get(at..).and_then(|rest| rest.chars().next()) {
        Some('`') => {
            "; a Mathematica precision or accuracy mark (`20., ``30) is not part of the number: delete it, the digits written are what count"
        }
        _ => "",
    };
    ctx.error(
        Span {
            start: at,
            end: at + width,
        },
        &format!("{message}, found {found}{hint}"),
    )
}

fn node(node: Node, span: Span, depth: usize, ctx: &Ctx<'_>) -> Fallible<Built> {
    if depth > MAX_TREE_DEPTH {
        return Err(ctx.error(
            span,
            &format!(
                "expression more than {MAX_TREE_DEPTH} operations deep; split it into several entries"
            ),
        ));
    }
    Ok((Expr { node, span }, depth))
}

fn join(a: &Expr, b: &Expr) -> Span {
    Span {
        start: a.span.start.min(b.span.start),
        end: a.span.end.max(b.span.end),
    }
}

/// Builds the tree for one `expr` pair: checks the recursion the Pratt parser
/// will need, then lets it apply precedence.
fn build(ctx: &Ctx<'_>, expr: Pair<'_, Rule>) -> Fallible<Built> {
    let mut chain = 0usize;
    for p in expr.clone().into_inner() {
        match p.as_rule() {
            Rule::neg | Rule::pos | Rule::pow => {
                chain += 1;
                if chain > MAX_CHAIN {
                    return Err(ctx.error(
                        span_of(&p),
                        &format!("more than {MAX_CHAIN} signs and powers in a row"),
                    ));
                }
            }
            Rule::add | Rule::sub | Rule::mul | Rule::div | Rule::implicit_mul => chain = 0,
            _ => {}
        }
    }
    let tokens: Vec<Pair<'_, Rule>> = expr.clone().into_inner().collect();
    for (k, p) in tokens.iter().enumerate() {
        if p.as_rule() == Rule::number_lit {
            fortran_exponent(ctx, p)?;
            if let (Some(juxtaposed), Some(group)) = (tokens.get(k + 1), tokens.get(k + 2)) {
                if juxtaposed.as_rule() == Rule::implicit_mul && group.as_rule() == Rule::group {
                    bracketed_number(ctx, p, group)?;
                }
            }
        }
    }
    // `+` and `-` bind loosest, so the sequence splits at them into terms,
    // each parsed on its own. Up to LONG_SUM terms they are joined to the
    // left, as the operators associate; a longer sum (a pasted high-loop
    // coefficient has thousands of terms) is joined as a balanced tree, so
    // its depth grows like log2 of its length rather than the length.
    let mut terms: Vec<(bool, Vec<Pair<'_, Rule>>)> = vec![(false, Vec::new())];
    for p in expr.into_inner() {
        match p.as_rule() {
            Rule::add => terms.push((false, Vec::new())),
            Rule::sub => terms.push((true, Vec::new())),
            _ => terms.last_mut().map_or((), |t| t.1.push(p)),
        }
    }
    let mut pratt = ctx
        .pratt
        .map_primary(|p| primary(ctx, p))
        .map_prefix(|op, rhs| {
            let (rhs, depth) = rhs?;
            let span = Span {
                start: op.as_span().start(),
                end: rhs.span.end,
            };
            match op.as_rule() {
                Rule::neg => node(Node::Neg(Box::new(rhs)), span, depth + 1, ctx),
                // A leading `+` adds nothing to the value, so no node.
                _ => Ok((
                    Expr {
                        node: rhs.node,
                        span,
                    },
                    depth,
                )),
            }
        })
        .map_infix(|lhs, op, rhs| {
            let (lhs, dl) = lhs?;
            let (rhs, dr) = rhs?;
            let span = join(&lhs, &rhs);
            let (a, b) = (Box::new(lhs), Box::new(rhs));
            let n = match op.as_rule() {
                Rule::div => Node::Div(a, b),
                Rule::pow => Node::Pow(a, b),
                _ => Node::Mul(a, b),
            };
            node(n, span, dl.max(dr) + 1, ctx)
        });
    let built: Vec<(bool, Built)> = terms
        .into_iter()
        .map(|(negative, pairs)| Ok((negative, pratt.parse(pairs.into_iter())?)))
        .collect::<Fallible<_>>()?;
    if built.len() <= LONG_SUM {
        let mut items = built.into_iter();
        let Some((_, first)) = items.next() else {
            return Err(ctx.error(Span::default(), "empty expression"));
        };
        return items.try_fold(first, |acc, (negative, term)| {
            combine(ctx, acc, negative, term)
        });
    }
    balanced(ctx, built)
}

/// Sums of more terms than this are joined as a balanced tree.
const LONG_SUM: usize = 1000;

fn combine(ctx: &Ctx<'_>, (a, da): Built, negative: bool, (b, db): Built) -> Fallible<Built> {
    let span = join(&a, &b);
    let (a, b) = (Box::new(a), Box::new(b));
    let n = if negative {
        Node::Sub(a, b)
    } else {
        Node::Add(a, b)
    };
    node(n, span, da.max(db) + 1, ctx)
}

/// t1 s2 t2 s3 t3 ... (the first sign is always +) as a balanced tree:
/// left half s_m (right half with its signs multiplied by s_m).
fn balanced(ctx: &Ctx<'_>, mut items: Vec<(bool, Built)>) -> Fallible<Built> {
    if items.len() == 1 {
        return Ok(items.remove(0).1);
    }
    let mut right = items.split_off(items.len() / 2);
    let negative = right[0].0;
    for item in right.iter_mut() {
        item.0 ^= negative;
    }
    let left = balanced(ctx, items)?;
    let right = balanced(ctx, right)?;
    combine(ctx, left, negative, right)
}

fn primary(ctx: &Ctx<'_>, p: Pair<'_, Rule>) -> Fallible<Built> {
    let span = span_of(&p);
    match p.as_rule() {
        Rule::number_lit => number_literal(ctx, p),
        Rule::pi => node(Node::Pi, span, 1, ctx),
        Rule::catalan => node(Node::Catalan, span, 1, ctx),
        Rule::symbol => node(Node::Symbol(p.as_str().to_string()), span, 1, ctx),
        Rule::zeta_short => {
            let digits = p.as_str().trim_start_matches(|c: char| !c.is_ascii_digit());
            let s = zeta_argument(ctx, digits, span)?;
            zeta(ctx, vec![(s, span)], span)
        }
        Rule::zeta_call => {
            let mut args = Vec::new();
            for a in p.into_inner().filter(|a| a.as_rule() == Rule::zeta_argument) {
                let s = span_of(&a);
                args.push((zeta_argument(ctx, a.as_str(), s)?, s));
            }
            zeta(ctx, args, span)
        }
        Rule::log_call => {
            let inner = inner_expr(ctx, p, span)?;
            let (arg, depth) = build(ctx, inner)?;
            node(Node::Log(Box::new(arg)), span, depth + 1, ctx)
        }
        Rule::functional => functional(ctx, p, span),
        Rule::group => {
            let inner = inner_expr(ctx, p, span)?;
            // The brackets belong to the subexpression's span, so carets
            // under it cover them.
            let (e, depth) = build(ctx, inner)?;
            Ok((Expr { node: e.node, span }, depth))
        }
        Rule::unknown_call => Err(ctx.error(
            span,
            &format!("`{}` is not a known function (known: zeta, log, ln, Gamma, Delta); for a product write `{}*(...)`", p.as_str(), p.as_str()),
        )),
        other => Err(ctx.error(span, &format!("unexpected {}", describe(&other)))),
    }
}

fn inner_expr<'i>(ctx: &Ctx<'_>, p: Pair<'i, Rule>, span: Span) -> Fallible<Pair<'i, Rule>> {
    p.into_inner()
        .find(|q| q.as_rule() == Rule::expr)
        .ok_or_else(|| ctx.error(span, "missing expression"))
}

fn functional(ctx: &Ctx<'_>, p: Pair<'_, Rule>, span: Span) -> Fallible<Built> {
    let mut kind = Functional::Gamma;
    let mut angle = None;
    let mut depth = 1;
    for q in p.into_inner() {
        match q.as_rule() {
            Rule::gamma_name => kind = Functional::Gamma,
            Rule::delta_name => kind = Functional::Delta,
            Rule::cos2_symbolic => angle = Some(Angle::SymbolicCos2),
            Rule::cos2_value => {
                let qs = span_of(&q);
                let (e, d) = build(ctx, inner_expr(ctx, q, qs)?)?;
                depth = d + 1;
                angle = Some(Angle::Cos2(Box::new(e)));
            }
            Rule::expr => {
                let (e, d) = build(ctx, q)?;
                depth = d + 1;
                angle = Some(Angle::Radians(Box::new(e)));
            }
            _ => {}
        }
    }
    let angle = angle.ok_or_else(|| ctx.error(span, "missing angle"))?;
    node(Node::Functional { kind, angle }, span, depth, ctx)
}

fn zeta_argument(ctx: &Ctx<'_>, text: &str, span: Span) -> Fallible<u32> {
    let bad = || {
        ctx.error(
            span,
            &format!("zeta arguments are whole numbers from 1 to {MAX_ZETA_ARGUMENT}, not {text}"),
        )
    };
    if text.starts_with('-') {
        return Err(bad());
    }
    let digits = text.trim_start_matches('0');
    if digits.len() > 4 {
        return Err(bad());
    }
    match digits.parse::<u32>() {
        Ok(s) if (1..=MAX_ZETA_ARGUMENT).contains(&s) => Ok(s),
        _ => Err(bad()),
    }
}

fn zeta(ctx: &Ctx<'_>, args: Vec<(u32, Span)>, span: Span) -> Fallible<Built> {
    if args.len() > MAX_ZETA_DEPTH {
        return Err(ctx.error(
            span,
            &format!("multiple zeta values of depth above {MAX_ZETA_DEPTH} are not supported"),
        ));
    }
    match args.first() {
        Some(&(1, _)) if args.len() == 1 => Err(ctx.error(span, "zeta(1) diverges")),
        Some(&(1, s)) => Err(ctx.error(
            s,
            "a multiple zeta value diverges when its first argument is 1; it must be at least 2",
        )),
        Some(_) => node(
            Node::Zeta(args.into_iter().map(|(s, _)| s).collect()),
            span,
            1,
            ctx,
        ),
        None => Err(ctx.error(span, "zeta needs at least one argument")),
    }
}
