//! The coefficient language: the typed, spanned expression tree that the
//! parser produces, its canonical printed form, and the entry points
//! [`parse`] and [`error_at`]. The grammar itself is `grammar/expr.pest`;
//! turning pest's output into this tree lives in `parse.rs`, and the
//! rendering of messages with a caret under the culprit in `report.rs`.
//!
//! What the language accepts, briefly (the grammar file has the details):
//! integers, decimals (`-1240.9`, `1.2e-3`, `1.2*^-3`), decimals with an
//! uncertainty (`-1240.9(2)`, `1.2e-3 ± 1e-4`, `+-`, `+/-`), `pi`/`π`,
//! `catalan`, `zeta(3)`/`Zeta[3]`/`ζ(3)`/`z3`/`zeta3`/`ζ3`, multiple zeta
//! values `zeta(5,3)`, `log(2)`/`ln(2)`/`Log[2]`, `Gamma(ANGLE)` and
//! `Delta(ANGLE)` (also `Γ`, `Δ`) with ANGLE an expression in radians,
//! `c2=EXPR` or `c2`, symbols (`l1`, `x`, the coupling `g`), the operators
//! `+ - * / ^ **`, and multiplication by juxtaposition (`2pi^2`, `3(1+pi)`).
//! `^` binds tighter than a sign (`-pi^2` is `-(pi^2)`) and groups to the
//! right (`2^3^2` is `2^(3^2)`).
//!
//! Readings to know about: a number glued to a bracket of digits is a
//! number with an uncertainty in units of its last digit (`1.5(3)` is
//! 1.5 ± 0.3, `15(3)` is 15 ± 3, `1.2e-3(1)` is 0.0012 ± 0.0001); a bracket
//! with a decimal point holds the uncertainty itself (`4.0(1.5)` is
//! 4.0 ± 1.5). A number before a bracket that holds only a number, with a
//! blank or a sign (`3.9 (1)`, `4(-1)`), is refused as ambiguous, and so is
//! a Fortran exponent (`1.2d3`). `+-` right after a number literal is ±, so
//! write `2 + -3` for a sum with a negative term.

mod parse;
mod site;

use std::fmt;

pub(crate) use parse::parse_unrendered;
pub(crate) use site::line_column;
pub use site::Site;

use crate::error::{Error, ErrorKind, Result};

/// Byte offsets `start..end` into the parsed source text.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Default)]
pub struct Span {
    pub start: usize,
    pub end: usize,
}

/// A node together with the stretch of source it came from.
///
/// Equality compares structure only: two trees that differ only in where
/// their text sat are equal, which is what "the same expression" means.
#[derive(Debug, Clone)]
pub struct Expr {
    pub node: Node,
    pub span: Span,
}

impl PartialEq for Expr {
    fn eq(&self, other: &Self) -> bool {
        self.node == other.node
    }
}

impl Eq for Expr {}

#[derive(Debug, Clone, PartialEq, Eq)]
pub enum Node {
    Integer(rug::Integer),
    /// A decimal literal: its exact written value, and the absolute uncertainty if one was given.
    Decimal {
        value: rug::Rational,
        uncertainty: Option<rug::Rational>,
        text: String,
    },
    Pi,
    Catalan,
    /// zeta(s1, ..., sk); k = 1 is the ordinary zeta value.
    Zeta(Vec<u32>),
    Log(Box<Expr>),
    /// Kinematic symbols and the coupling `g`.
    Symbol(String),
    Functional {
        kind: Functional,
        angle: Angle,
    },
    Neg(Box<Expr>),
    Add(Box<Expr>, Box<Expr>),
    Sub(Box<Expr>, Box<Expr>),
    Mul(Box<Expr>, Box<Expr>),
    Div(Box<Expr>, Box<Expr>),
    Pow(Box<Expr>, Box<Expr>),
}

/// The name of the coupling in formulas.
pub const COUPLING: &str = "g";

/// Which functional of the tilted kernel: Gamma = 4 g^2 [(1+K)^(-1)]_11 or
/// Delta = ln det(1+K) (docs/conventions.md section 3). Named here, where
/// the language first meets it; the engines in [`crate::kernel`] and
/// [`crate::numeric`] compute it.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum Functional {
    Gamma,
    Delta,
}

impl Functional {
    pub fn name(self) -> &'static str {
        match self {
            Functional::Gamma => "Gamma",
            Functional::Delta => "Delta",
        }
    }
}

/// How the argument of `Gamma(...)` / `Delta(...)` was given.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum Angle {
    /// An angle in radians: `Gamma(pi/4)`.
    Radians(Box<Expr>),
    /// The squared cosine of the angle: `Gamma(c2=1/3)`.
    Cos2(Box<Expr>),
    /// The squared cosine kept as a symbol: `Gamma(c2)`.
    SymbolicCos2,
}

/// Parses one expression of the coefficient language.
///
/// `origin` names the source for messages (`"file.yaml"` or `"<argument>"`);
/// `place` optionally shifts reported line/column when the text sits inside
/// a larger file (line, column of its first character, both from 1), so
/// errors point into that file.
pub fn parse(source: &str, origin: &str, place: Option<(usize, usize)>) -> Result<Expr> {
    parse::parse(source, origin, place)
}

/// Renders a semantic error (found later by an evaluator) at a span, in the
/// same style as parse errors: origin:line:column, the line, a caret under
/// the span, the message. With a `site` the line shown is the file's own.
/// The error's kind is [`ErrorKind::Input`].
pub fn error_at(
    source: &str,
    origin: &str,
    site: Option<&Site>,
    span: Span,
    message: &str,
) -> Error {
    match site {
        Some(site) => site.render(ErrorKind::Input, source, origin, span, message),
        None => site::render(ErrorKind::Input, source, origin, None, span, message),
    }
}

/// Calls `visit` on every symbol in the tree (inside functionals and logs
/// too), with its span, left to right.
pub fn for_each_symbol<'e>(expr: &'e Expr, visit: &mut dyn FnMut(&'e str, Span)) {
    match &expr.node {
        Node::Symbol(name) => visit(name, expr.span),
        Node::Integer(_) | Node::Decimal { .. } | Node::Pi | Node::Catalan | Node::Zeta(_) => {}
        Node::Log(inner) | Node::Neg(inner) => for_each_symbol(inner, visit),
        Node::Functional { angle, .. } => match angle {
            Angle::Radians(inner) | Angle::Cos2(inner) => for_each_symbol(inner, visit),
            Angle::SymbolicCos2 => {}
        },
        Node::Add(a, b) | Node::Sub(a, b) | Node::Mul(a, b) | Node::Div(a, b) | Node::Pow(a, b) => {
            for_each_symbol(a, visit);
            for_each_symbol(b, visit);
        }
    }
}

/// The direct subexpressions of a node (an angle counts as one).
fn parts(node: &Node) -> [Option<&Expr>; 2] {
    match node {
        Node::Log(a) | Node::Neg(a) => [Some(a), None],
        Node::Functional {
            angle: Angle::Radians(a) | Angle::Cos2(a),
            ..
        } => [Some(a), None],
        Node::Add(a, b) | Node::Sub(a, b) | Node::Mul(a, b) | Node::Div(a, b) | Node::Pow(a, b) => {
            [Some(a), Some(b)]
        }
        _ => [None, None],
    }
}

fn parts_mut(node: &mut Node) -> [Option<&mut Expr>; 2] {
    match node {
        Node::Log(a) | Node::Neg(a) => [Some(a), None],
        Node::Functional {
            angle: Angle::Radians(a) | Angle::Cos2(a),
            ..
        } => [Some(a), None],
        Node::Add(a, b) | Node::Sub(a, b) | Node::Mul(a, b) | Node::Div(a, b) | Node::Pow(a, b) => {
            [Some(a), Some(b)]
        }
        _ => [None, None],
    }
}

/// The first node, a node before its parts and left before right, for
/// which `hit` holds.
pub fn find<'e>(expr: &'e Expr, hit: &mut dyn FnMut(&Expr) -> bool) -> Option<&'e Expr> {
    if hit(expr) {
        return Some(expr);
    }
    parts(&expr.node)
        .into_iter()
        .flatten()
        .find_map(|p| find(p, hit))
}

/// Calls `visit` on every node of the tree, a node before its parts.
pub fn for_each_node_mut(expr: &mut Expr, visit: &mut dyn FnMut(&mut Expr)) {
    visit(expr);
    for p in parts_mut(&mut expr.node).into_iter().flatten() {
        for_each_node_mut(p, visit);
    }
}

/// Binding strength for printing; mirrors the Pratt table in parse.rs.
fn strength(node: &Node) -> u8 {
    match node {
        Node::Add(..) | Node::Sub(..) => 1,
        Node::Mul(..) | Node::Div(..) => 2,
        Node::Neg(..) => 3,
        Node::Pow(..) => 4,
        _ => 5,
    }
}

/// A literal written with `±` has blanks inside; brackets keep it readable
/// when it is an operand.
fn spelled_with_plus_minus(node: &Node) -> bool {
    matches!(node, Node::Decimal { text, .. } if !text.bytes().all(|b| b.is_ascii_alphanumeric() || b"().+-*^".contains(&b)))
}

fn operand(f: &mut fmt::Formatter<'_>, e: &Expr, bracket: bool) -> fmt::Result {
    if bracket || spelled_with_plus_minus(&e.node) {
        write!(f, "({e})")
    } else {
        write!(f, "{e}")
    }
}

/// The canonical form: explicit `*`, brackets only where the grammar needs
/// them, so that parsing the printed text gives back an equal tree.
impl fmt::Display for Expr {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        let own = strength(&self.node);
        match &self.node {
            Node::Integer(n) => write!(f, "{n}"),
            Node::Decimal { text, .. } => f.write_str(text),
            Node::Pi => f.write_str("pi"),
            Node::Catalan => f.write_str("catalan"),
            Node::Zeta(args) => {
                f.write_str("zeta(")?;
                for (i, a) in args.iter().enumerate() {
                    if i > 0 {
                        f.write_str(",")?;
                    }
                    write!(f, "{a}")?;
                }
                f.write_str(")")
            }
            Node::Log(inner) => write!(f, "log({inner})"),
            Node::Symbol(name) => f.write_str(name),
            Node::Functional { kind, angle } => {
                let name = kind.name();
                match angle {
                    // A radian angle that is the bare symbol `c2` needs brackets,
                    // or it would read back as the symbolic squared cosine.
                    Angle::Radians(inner) if matches!(&inner.node, Node::Symbol(s) if s.eq_ignore_ascii_case("c2")) =>
                    {
                        write!(f, "{name}(({inner}))")
                    }
                    Angle::Radians(inner) => write!(f, "{name}({inner})"),
                    Angle::Cos2(inner) => write!(f, "{name}(c2={inner})"),
                    Angle::SymbolicCos2 => write!(f, "{name}(c2)"),
                }
            }
            Node::Neg(inner) => {
                f.write_str("-")?;
                operand(f, inner, strength(&inner.node) < own)
            }
            Node::Add(a, b) | Node::Sub(a, b) | Node::Mul(a, b) | Node::Div(a, b) => {
                let op = match &self.node {
                    Node::Add(..) => " + ",
                    Node::Sub(..) => " - ",
                    Node::Mul(..) => "*",
                    _ => "/",
                };
                operand(f, a, strength(&a.node) < own)?;
                f.write_str(op)?;
                operand(f, b, strength(&b.node) <= own)
            }
            Node::Pow(a, b) => {
                operand(f, a, strength(&a.node) <= own)?;
                f.write_str("^")?;
                operand(
                    f,
                    b,
                    strength(&b.node) < own && !matches!(b.node, Node::Neg(_)),
                )
            }
        }
    }
}
