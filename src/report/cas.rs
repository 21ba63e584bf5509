//! Computer-algebra output: the exact parts of the `expand`, `check` and
//! `origin` reports as one Wolfram Language (Mathematica) or Maple
//! expression, preceded by one comment line that says what the entries are.
//!
//! Values are written from the exact ring (rationals, powers of pi, odd zeta
//! values, named symbols) or, for a user's entry outside the ring, from the
//! parsed expression (logarithms, Catalan's constant, multiple zeta values).
//! The spellings: `Pi`, `Zeta[n]` / `Zeta(n)`, `Log[x]` / `log(x)`,
//! `Catalan`, and `MZV[s1, ..., sk]` / `MZV(s1, ..., sk)` for a multiple zeta
//! value, which neither system has under that name: Maple's two-argument
//! `Zeta` is a derivative, so a multiple zeta value is never written as
//! `Zeta`. Anything else (a symbol whose name would mean something else in
//! the target system, a functional inside a user's entry) is refused with an
//! error rather than written wrongly.

use rug::Rational;

use super::expansion::{coefficient_words, Expansion};
use crate::check::{Comparison, Supplied};
use crate::error::{Error, Result};
use crate::exact::ring::bernoulli::even_zeta_over_pi_power;
use crate::exact::ring::{EvenStyle, Exact, Monomial};
use crate::input::catalogue::{Entry, Status};
use crate::input::expr::{self, Expr, Node};
use crate::origin::check::{HexagonCell, Judged, OriginCheck, Reading};

/// The computer-algebra systems loopwise writes for.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Cas {
    Mathematica,
    Maple,
}

/// Why an entry of a check or origin expression holds no value.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
enum Gap {
    NoEntry,
    Decimals,
    NoPrediction,
    OnTheLine,
}

impl Gap {
    fn words(self) -> &'static str {
        match self {
            Gap::NoEntry => "not supplied",
            Gap::Decimals => "not exact",
            Gap::NoPrediction => "not predicted",
            Gap::OnTheLine => "not testable on line",
        }
    }
}

/// The convention of `MZV` after its head, stated wherever one is written.
const MZV_CONVENTION: &str = " = sum over n1 > n2 > ... > nk >= 1 of n1^-s1 ... nk^-sk, \
     the arguments in the order of loopwise's zeta(s1, ..., sk); it is not built in: define \
     it or replace it before evaluating";

/// Words Maple reserves or binds to a value, which a symbol must not be
/// written as (its reserved words, and its lower-case constants).
const MAPLE_TAKEN: [&str; 49] = [
    "and",
    "break",
    "by",
    "catch",
    "description",
    "do",
    "done",
    "elif",
    "else",
    "end",
    "error",
    "export",
    "fi",
    "finally",
    "for",
    "from",
    "global",
    "if",
    "implies",
    "in",
    "intersect",
    "local",
    "minus",
    "mod",
    "module",
    "next",
    "not",
    "od",
    "option",
    "options",
    "or",
    "proc",
    "quit",
    "read",
    "return",
    "save",
    "stop",
    "subset",
    "then",
    "to",
    "try",
    "union",
    "use",
    "uses",
    "while",
    "xor",
    "gamma",
    "infinity",
    "undefined",
];

impl Cas {
    pub fn name(self) -> &'static str {
        match self {
            Cas::Mathematica => "Mathematica",
            Cas::Maple => "Maple",
        }
    }

    fn call(self, head: &str, args: &[String]) -> String {
        match self {
            Cas::Mathematica => format!("{head}[{}]", args.join(", ")),
            Cas::Maple => format!("{head}({})", args.join(", ")),
        }
    }

    fn log(self, argument: String) -> String {
        match self {
            Cas::Mathematica => self.call("Log", &[argument]),
            Cas::Maple => self.call("log", &[argument]),
        }
    }

    fn zeta(self, args: &[u32]) -> String {
        let args: Vec<String> = args.iter().map(u32::to_string).collect();
        let head = if args.len() == 1 { "Zeta" } else { "MZV" };
        self.call(head, &args)
    }

    fn gap(self, gap: Gap) -> String {
        match self {
            Cas::Mathematica => {
                let tag: String = gap
                    .words()
                    .split(' ')
                    .map(|w| w[..1].to_uppercase() + &w[1..])
                    .collect();
                format!("Missing[\"{tag}\"]")
            }
            Cas::Maple => format!("\"{}\"", gap.words()),
        }
    }

    /// How the gaps are written, for the comment line. Mathematica's reasons
    /// are named without their quotes: a string inside a comment trips
    /// parsers that split strings out before comments.
    fn gap_words(self, gaps: &[(Gap, &str)]) -> String {
        let each = |g: Gap| match self {
            Cas::Mathematica => self
                .gap(g)
                .replace(['"', '[', ']'], " ")
                .replace("Missing ", ""),
            Cas::Maple => self.gap(g),
        };
        let listed = gaps
            .iter()
            .map(|(g, when)| format!("{} {when}", each(*g).trim()))
            .collect::<Vec<_>>()
            .join(", ");
        match self {
            Cas::Mathematica => format!("Missing[reason] stands for a gap, the reason {listed}"),
            Cas::Maple => listed,
        }
    }

    fn list(self, items: &[String]) -> String {
        let (open, close) = match self {
            Cas::Mathematica => ("{", "}"),
            Cas::Maple => ("[", "]"),
        };
        format!("{open}{}{close}", items.join(", "))
    }

    /// A list with one item per line, for the outermost level.
    fn long_list(self, items: &[String]) -> String {
        let (open, close) = match self {
            Cas::Mathematica => ("{", "}"),
            Cas::Maple => ("[", "]"),
        };
        if items.is_empty() {
            return format!("{open}{close}");
        }
        format!("{open}\n  {}\n{close}", items.join(",\n  "))
    }

    /// The comment line, on one line, with the comment's closing sequence
    /// broken up so that free text cannot end the comment early.
    fn comment(self, text: &str) -> String {
        let one_line = text.split_whitespace().collect::<Vec<_>>().join(" ");
        match self {
            Cas::Mathematica => format!(
                "(* {} *)\n",
                one_line.replace("*)", "* )").replace("(*", "( *")
            ),
            Cas::Maple => format!("# {one_line}\n"),
        }
    }

    /// The whole output: comment, expression, and Maple's statement end.
    fn document(self, comment: &str, expression: &str) -> String {
        let end = match self {
            Cas::Mathematica => "",
            Cas::Maple => ";",
        };
        format!("{}{expression}{end}\n", self.comment(comment))
    }

    /// A symbol's name, if the system reads it as a fresh symbol: a lower-case
    /// letter, then letters and digits (Mathematica's built-in names all start
    /// upper-case; underscores are patterns there), and not a Maple word.
    fn symbol(self, name: &str) -> Result<String> {
        let mut chars = name.chars();
        let well_formed = chars.next().is_some_and(|c| c.is_ascii_lowercase())
            && chars.all(|c| c.is_ascii_alphanumeric());
        let taken = self == Cas::Maple && MAPLE_TAKEN.contains(&name);
        if well_formed && !taken {
            Ok(name.to_string())
        } else {
            Err(Error::input(format!(
                "cannot write the symbol `{name}` for {}: only names of a lower-case letter \
                 followed by letters and digits, not reserved there, are written as they are \
                 (rename the symbol)",
                self.name()
            )))
        }
    }
}

fn power(base: String, e: i64) -> String {
    match e {
        1 => base,
        e if e < 0 => format!("{base}^({e})"),
        e => format!("{base}^{e}"),
    }
}

/// One ring element in the system's syntax; with `EvenStyle::Zeta` an even
/// power of pi is written as a rational times the even zeta value.
pub fn exact(x: &Exact, even: EvenStyle, cas: Cas) -> Result<String> {
    if x.is_zero() {
        return Ok("0".to_string());
    }
    let mut out = String::new();
    for (i, (m, c)) in x.terms().enumerate() {
        let (c, even_zeta) = match m.pi_exponent() {
            e if even == EvenStyle::Zeta && e > 0 && e % 2 == 0 => {
                (c / even_zeta_over_pi_power(e as u32 / 2), Some(e as u32))
            }
            _ => (c.clone(), None),
        };
        out.push_str(match (i, c < 0) {
            (0, true) => "-",
            (0, false) => "",
            (_, true) => " - ",
            (_, false) => " + ",
        });
        out.push_str(&term(m, &Rational::from(c.abs_ref()), even_zeta, cas)?);
    }
    Ok(out)
}

fn term(m: &Monomial, abs: &Rational, even_zeta: Option<u32>, cas: Cas) -> Result<String> {
    let mut factors = Vec::new();
    for (name, e) in m.symbols() {
        factors.push(power(cas.symbol(name)?, *e as i64));
    }
    match even_zeta {
        Some(n) => factors.push(cas.zeta(&[n])),
        None if m.pi_exponent() != 0 => {
            factors.push(power("Pi".to_string(), m.pi_exponent() as i64))
        }
        None => {}
    }
    for (z, e) in m.zeta_powers() {
        factors.push(power(cas.zeta(&[z]), e as i64));
    }
    Ok(match (factors.is_empty(), *abs == 1) {
        (true, _) => abs.to_string(),
        (false, true) => factors.join("*"),
        (false, false) => format!("{abs}*{}", factors.join("*")),
    })
}

/// Binding strength, for the brackets a written expression needs.
#[derive(Clone, Copy, PartialEq, Eq, PartialOrd, Ord)]
enum Binding {
    Sum,
    /// A negation: as a product's left factor it needs no brackets, since
    /// -(a*b) and (-a)*b are one value in both systems.
    Negated,
    Product,
    Power,
    Atom,
}

/// A user's expression in the system's syntax; `None` when it holds a
/// decimal, i.e. is not exact. Every operation keeps its grouping as parsed.
pub fn expression(e: &Expr, cas: Cas) -> Result<Option<String>> {
    Ok(written(e, cas)?.map(|(text, _)| text))
}

fn written(e: &Expr, cas: Cas) -> Result<Option<(String, Binding)>> {
    let atom = |s: String| Ok(Some((s, Binding::Atom)));
    let at_least = |e: &Expr, b: Binding| -> Result<Option<String>> {
        Ok(written(e, cas)?.map(|(s, have)| if have >= b { s } else { format!("({s})") }))
    };
    let binary = |a: &Expr, op: &str, b: &Expr, left: Binding, right: Binding, result| {
        Ok(match (at_least(a, left)?, at_least(b, right)?) {
            (Some(a), Some(b)) => Some((format!("{a}{op}{b}"), result)),
            _ => None,
        })
    };
    match &e.node {
        Node::Integer(n) => atom(n.to_string()),
        Node::Decimal { .. } => Ok(None),
        Node::Pi => atom("Pi".to_string()),
        Node::Catalan => atom("Catalan".to_string()),
        Node::Zeta(args) => atom(cas.zeta(args)),
        Node::Log(inner) => Ok(expression(inner, cas)?.map(|s| (cas.log(s), Binding::Atom))),
        Node::Symbol(name) => atom(cas.symbol(name)?),
        Node::Functional { kind, .. } => Err(Error::input(format!(
            "cannot write {}(...) inside an entry for {}: only numbers, pi, zeta values, \
             logarithms and Catalan's constant are written",
            kind.name(),
            cas.name()
        ))),
        Node::Neg(inner) => {
            Ok(at_least(inner, Binding::Product)?.map(|s| (format!("-{s}"), Binding::Negated)))
        }
        Node::Add(a, b) => binary(a, " + ", b, Binding::Sum, Binding::Product, Binding::Sum),
        Node::Sub(a, b) => binary(a, " - ", b, Binding::Sum, Binding::Product, Binding::Sum),
        Node::Mul(a, b) => binary(
            a,
            "*",
            b,
            Binding::Negated,
            Binding::Power,
            Binding::Product,
        ),
        Node::Div(a, b) => binary(
            a,
            "/",
            b,
            Binding::Negated,
            Binding::Power,
            Binding::Product,
        ),
        Node::Pow(a, b) => binary(a, "^", b, Binding::Atom, Binding::Atom, Binding::Power),
    }
}

/// The status of a prediction in the words of the comment; a conjecture says so.
fn status_words(entry: Option<&Entry>) -> String {
    match entry {
        None => String::new(),
        Some(e) => {
            let refs = if e.references.is_empty() {
                String::new()
            } else {
                format!(" [{}]", e.references.join(", "))
            };
            match e.status {
                Status::Established => format!(" (status: established{refs})"),
                Status::Conjecture => {
                    format!(" (CAUTION: conjecture of the literature, not a theorem{refs})")
                }
            }
        }
    }
}

fn named(quantity: &str, definition: &str) -> String {
    if quantity == definition {
        quantity.to_string()
    } else {
        format!("{quantity} = {definition}")
    }
}

/// What the symbolic tilt means, when a value holds it.
fn tilt_words<'a>(mut values: impl Iterator<Item = &'a Exact>) -> &'static str {
    let tilted = |x: &Exact| {
        x.terms()
            .any(|(m, _)| m.symbol_exponent(crate::kernel::C2) > 0)
    };
    if values.any(tilted) {
        "; c2 = cos^2(alpha), the squared cosine of the tilt angle"
    } else {
        ""
    }
}

fn mzv_words(items: &[String], cas: Cas) -> String {
    if items.iter().any(|s| s.contains("MZV")) {
        let head = cas.call("MZV", &["s1, ..., sk".to_string()]);
        format!("; {head}{MZV_CONVENTION}")
    } else {
        String::new()
    }
}

/// `expand`: the list of coefficients, entry L the coefficient of loop order L.
pub fn expansion(report: &Expansion, cas: Cas) -> Result<String> {
    let items = report
        .orders()
        .map(|(_, c)| exact(c, report.even, cas))
        .collect::<Result<Vec<_>>>()?;
    let comment = format!(
        "loopwise expand: {}{}{}; list entry L (L = 1..{}) is the {}{}",
        named(&report.quantity, &report.definition),
        report
            .entry
            .as_ref()
            .map_or(String::new(), |e| format!(", {}", e.summary)),
        status_words(report.entry.as_ref()),
        items.len(),
        coefficient_words(report.coupling),
        tilt_words(report.orders().map(|(_, c)| c)),
    );
    Ok(cas.document(&comment, &cas.long_list(&items)))
}

/// A user's entry as the system reads it, or why it cannot be.
fn supplied(s: Option<&Supplied>, origin: &str, cas: Cas) -> Result<String> {
    match s {
        None => Ok(cas.gap(Gap::NoEntry)),
        Some(Supplied::Exact(x)) => exact(x, EvenStyle::Pi, cas),
        Some(Supplied::Number { text, .. }) => {
            let parsed = expr::parse(text, origin, None)?;
            Ok(expression(&parsed, cas)?.unwrap_or_else(|| cas.gap(Gap::Decimals)))
        }
    }
}

fn predicted(p: Option<&Exact>, even: EvenStyle, cas: Cas) -> Result<String> {
    p.map_or(Ok(cas.gap(Gap::NoPrediction)), |p| exact(p, even, cas))
}

fn no_exact_part(file: &str, command: &str, why: &str, cas: Cas) -> Error {
    Error::input(format!(
        "{file}: the {command} report has no exact part to write for {}: {why}; use --format text or json",
        cas.name()
    ))
}

/// `check`: one {L, predicted, supplied} triple per loop order.
pub fn check(c: &Comparison, cas: Cas) -> Result<String> {
    let mut items = Vec::new();
    let mut any_exact = false;
    for o in &c.orders {
        let p = predicted(o.predicted.as_ref(), EvenStyle::Pi, cas)?;
        let s = supplied(o.supplied.as_ref(), &c.file, cas)?;
        any_exact |=
            o.predicted.is_some() || (s != cas.gap(Gap::Decimals) && s != cas.gap(Gap::NoEntry));
        items.push(cas.list(&[o.loop_order.to_string(), p, s]));
    }
    if !any_exact {
        return Err(no_exact_part(
            &c.file,
            "check",
            "no order is predicted and no entry of the file is exact",
            cas,
        ));
    }
    let comment = format!(
        "loopwise check of {} against {}{}; each element is {{L, predicted, supplied}}: the \
         prediction's and the file's exact {}; {}; verdicts: {}{}{}",
        c.file,
        named(&c.prediction, &c.definition),
        status_words(c.entry.as_ref()),
        coefficient_words(c.coupling),
        cas.gap_words(&[
            (Gap::Decimals, "where the file gives a number with decimals"),
            (Gap::NoEntry, "where it gives nothing"),
            (
                Gap::NoPrediction,
                "where the check has no prediction (beyond the engine's reach, or above \
                 the highest order it compares)",
            ),
        ]),
        c.summary(),
        tilt_words(c.orders.iter().filter_map(|o| o.predicted.as_ref())),
        mzv_words(&items, cas),
    );
    Ok(cas.document(&comment, &cas.long_list(&items)))
}

fn pair(j: &Judged, even: EvenStyle, cas: Cas) -> Result<String> {
    let s = match &j.supplied {
        Reading::Exact(x) => exact(x, even, cas)?,
        Reading::Number(_) => cas.gap(Gap::Decimals),
    };
    Ok(cas.list(&[predicted(j.predicted.as_ref(), even, cas)?, s]))
}

/// `origin`: per exponentiating loop order {L, octagon, hexagon, linear, C0}
/// (and the C0 formula's pair when the file gives one), each a pair
/// {predicted, read from the file}.
pub fn origin(c: &OriginCheck, even: EvenStyle, cas: Cas) -> Result<String> {
    if c.rows.is_empty() {
        return Err(no_exact_part(
            &c.file,
            "origin",
            "exponentiation breaks at the first order, so nothing is read",
            cas,
        ));
    }
    let mut items = Vec::new();
    for r in &c.rows {
        let mut row = vec![r.loop_order.to_string(), pair(&r.octagon, even, cas)?];
        row.push(match &r.hexagon {
            HexagonCell::Judged(j) => pair(j, even, cas)?,
            HexagonCell::NotTestableOnLine => cas.gap(Gap::OnTheLine),
        });
        row.push(pair(&r.linear, even, cas)?);
        row.push(pair(&r.constant, even, cas)?);
        if let Some(f) = &r.formula {
            row.push(pair(f, even, cas)?);
        }
        items.push(cas.list(&row));
    }
    let formula = c.formula.as_ref().map_or(String::new(), |f| {
        format!(", C0 formula `{f}` (the file's own conjecture)")
    });
    let broken = c.broken.as_ref().map_or(String::new(), |b| {
        format!(
            "; exponentiation breaks at order {}, so orders from {} on are not listed",
            b.order(),
            b.order()
        )
    });
    let hexagon = match &c.hexagon_entry {
        Some(e) if e.status == Status::Conjecture && !c.on_line() => {
            "; the hexagon prediction is a conjecture of the literature, not a theorem"
        }
        _ => "",
    };
    let comment = format!(
        "loopwise origin of {} (normalisation {}, logs {}): ln E = octagon*ln^2(u1 u2 u3) + \
         hexagon*sum_i ln^2(u_i/u_(i+1)) + linear*ln(u1 u2 u3) + C0; each element is {{L, \
         octagon, hexagon, linear, C0{}}}, each a pair {{predicted, read from the file}}, the \
         {}{formula}; {}{hexagon}{broken}; verdicts: {}",
        c.file,
        c.normalisation,
        c.logs.names().join(", "),
        if c.formula.is_some() {
            ", C0 formula"
        } else {
            ""
        },
        coefficient_words(c.coupling),
        cas.gap_words(&[
            (Gap::Decimals, "where the file was read numerically"),
            (Gap::NoPrediction, "where loopwise predicts nothing"),
            (Gap::OnTheLine, "for the hexagon on the line u1 = u2 = u3"),
        ]),
        c.summary(),
    );
    Ok(cas.document(&comment, &cas.long_list(&items)))
}

#[cfg(test)]
mod tests {
    use super::*;

    fn zeta(n: u32) -> Exact {
        Exact::zeta(n).unwrap()
    }

    /// One element of every kind the ring holds: a rational, a negative
    /// power of pi, an even zeta value, odd zeta powers and a symbol;
    /// 90 zeta(4) = pi^4 (Abramowitz & Stegun 23.2.16) is how the two even styles meet.
    fn sample() -> Exact {
        let half = Exact::from(Rational::from((1, 2)));
        let inverse_pi2 = Exact::pi().pow(2).inverse().unwrap();
        &(&(&half - &inverse_pi2) + &zeta(4).scale(&Rational::from(90)))
            + &(&Exact::symbol("c2") * &zeta(3).pow(2) * zeta(5)).scale(&Rational::from(-3))
    }

    #[test]
    fn every_kind_of_ring_element_in_both_systems() {
        assert_eq!(
            exact(&sample(), EvenStyle::Pi, Cas::Mathematica).unwrap(),
            "-3*c2*Zeta[3]^2*Zeta[5] + Pi^4 + 1/2 - Pi^(-2)"
        );
        assert_eq!(
            exact(&sample(), EvenStyle::Zeta, Cas::Maple).unwrap(),
            "-3*c2*Zeta(3)^2*Zeta(5) + 90*Zeta(4) + 1/2 - Pi^(-2)"
        );
        assert_eq!(
            exact(&Exact::zero(), EvenStyle::Pi, Cas::Maple).unwrap(),
            "0"
        );
    }

    #[test]
    fn symbols_that_would_mean_something_else_are_refused() {
        for (name, cas) in [
            ("E", Cas::Mathematica),
            ("x_1", Cas::Mathematica),
            ("gamma", Cas::Maple),
            ("in", Cas::Maple),
        ] {
            let x = Exact::symbol(name);
            let e = exact(&x, EvenStyle::Pi, cas).unwrap_err();
            assert!(e.to_string().contains(name), "{e}");
        }
        assert_eq!(
            exact(&Exact::symbol("gamma"), EvenStyle::Pi, Cas::Mathematica).unwrap(),
            "gamma"
        );
    }

    fn written_as(text: &str, cas: Cas) -> Option<String> {
        expression(&expr::parse(text, "<test>", None).unwrap(), cas).unwrap()
    }

    #[test]
    fn expressions_keep_their_grouping() {
        assert_eq!(
            written_as("-(a+b)*2^-3/(c*d) - (2-3)", Cas::Mathematica).as_deref(),
            Some("-(a + b)*2^(-3)/(c*d) - (2 - 3)")
        );
        assert_eq!(
            written_as("zeta(5,3) + ln(2)^2 - catalan*zeta(3)", Cas::Maple).as_deref(),
            Some("MZV(5, 3) + log(2)^2 - Catalan*Zeta(3)")
        );
        assert_eq!(
            written_as("(-2)^2 + a*(-b) - -c", Cas::Maple).as_deref(),
            Some("(-2)^2 + a*(-b) - (-c)")
        );
        assert_eq!(written_as("pi^2 + 1.5", Cas::Maple), None);
    }

    #[test]
    fn comments_cannot_be_closed_by_their_text() {
        assert_eq!(Cas::Mathematica.comment("a *) b\nc"), "(* a * ) b c *)\n");
        assert_eq!(Cas::Maple.comment("a\nb"), "# a b\n");
    }
}
