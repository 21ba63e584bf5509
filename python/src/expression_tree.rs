//! The parsed tree of a coefficient-language expression as plain JSON, for
//! the Python side to rebuild as a sympy expression. Sums and products are
//! flattened into lists, so that the Python side never recurses along a long
//! chain of `+` (Python's recursion limit is far below the parser's depth
//! limit), and sympy adds all terms at once.
//!
//! Node forms: `["int", "12"]`, `["rational", "num", "den"]` (a decimal
//! literal, exactly as written), `["pi"]`, `["catalan"]`, `["zeta", [5, 3]]`,
//! `["log", x]`, `["symbol", "c2"]`, `["neg", x]`, `["sum", [x, ...]]`,
//! `["product", [x, ...]]`, `["power", base, exponent]`; a quotient a/b is
//! `["product", [a, ["power", b, ["int", "-1"]]]]`.

use serde_json::{json, Value};

use loopwise::input::expr::{self, Expr, Node};
use loopwise::Result;

/// Where expressions handed to `to_sympy` come from, in messages.
const ORIGIN: &str = "<expression>";

/// Parses `text` and returns its tree as JSON text.
///
/// Errors: text outside the language (kind Parse, located), and the parts
/// that have no exact symbolic value: a number with an uncertainty, and
/// `Gamma(...)`/`Delta(...)`, which are functions of the coupling (kind
/// Input, located at the part).
pub fn tree(text: &str) -> Result<String> {
    let e = expr::parse(text, ORIGIN, None)?;
    Ok(node(&e, text)?.to_string())
}

fn node(e: &Expr, text: &str) -> Result<Value> {
    let refuse = |message: &str| expr::error_at(text, ORIGIN, None, e.span, message);
    Ok(match &e.node {
        Node::Integer(i) => json!(["int", i.to_string()]),
        Node::Decimal {
            uncertainty: Some(_),
            ..
        } => {
            return Err(refuse(
                "a number with an uncertainty has no exact symbolic value; drop the uncertainty to read it as an exact decimal",
            ))
        }
        Node::Decimal { value, .. } => json!([
            "rational",
            value.numer().to_string(),
            value.denom().to_string()
        ]),
        Node::Pi => json!(["pi"]),
        Node::Catalan => json!(["catalan"]),
        Node::Zeta(args) => json!(["zeta", args]),
        Node::Log(x) => json!(["log", node(x, text)?]),
        Node::Symbol(name) => json!(["symbol", name]),
        Node::Functional { kind, .. } => {
            return Err(refuse(&format!(
                "{} is a function of the coupling, not a constant; loopwise.expand gives its exact loop coefficients",
                kind.name()
            )))
        }
        Node::Neg(x) => json!(["neg", node(x, text)?]),
        Node::Add(..) | Node::Sub(..) => {
            let mut terms = Vec::new();
            flatten_sum(e, false, text, &mut terms)?;
            json!(["sum", terms])
        }
        Node::Mul(..) | Node::Div(..) => {
            let mut factors = Vec::new();
            flatten_product(e, false, text, &mut factors)?;
            json!(["product", factors])
        }
        Node::Pow(base, exponent) => json!(["power", node(base, text)?, node(exponent, text)?]),
    })
}

/// The terms of a chain of `+` and `-`, each negated when `negate` says so.
fn flatten_sum(e: &Expr, negate: bool, text: &str, out: &mut Vec<Value>) -> Result<()> {
    match &e.node {
        Node::Add(a, b) => {
            flatten_sum(a, negate, text, out)?;
            flatten_sum(b, negate, text, out)
        }
        Node::Sub(a, b) => {
            flatten_sum(a, negate, text, out)?;
            flatten_sum(b, !negate, text, out)
        }
        _ => {
            let v = node(e, text)?;
            out.push(if negate { json!(["neg", v]) } else { v });
            Ok(())
        }
    }
}

/// The factors of a chain of `*` and `/`, each inverted when `invert` says so.
fn flatten_product(e: &Expr, invert: bool, text: &str, out: &mut Vec<Value>) -> Result<()> {
    match &e.node {
        Node::Mul(a, b) => {
            flatten_product(a, invert, text, out)?;
            flatten_product(b, invert, text, out)
        }
        Node::Div(a, b) => {
            flatten_product(a, invert, text, out)?;
            flatten_product(b, !invert, text, out)
        }
        _ => {
            let v = node(e, text)?;
            out.push(if invert {
                json!(["power", v, ["int", "-1"]])
            } else {
                v
            });
            Ok(())
        }
    }
}
