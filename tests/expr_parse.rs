//! The coefficient language from the outside: which spellings are accepted
//! and the tree they give, which inputs are rejected and what the message
//! says, and that printing then parsing gives back the same tree.

use loopwise::input::expr::{parse, Angle, Expr, Functional, Node};
use rug::ops::Pow;
use rug::{Integer, Rational};

fn p(s: &str) -> Expr {
    match parse(s, "<test>", None) {
        Ok(e) => e,
        Err(e) => panic!("{s:?} should parse:\n{e}"),
    }
}

fn err(s: &str) -> String {
    match parse(s, "<test>", None) {
        Ok(e) => panic!("{s:?} should be rejected, gave {e}"),
        Err(e) => e.message().to_string(),
    }
}

fn rat(n: i64, d: i64) -> Rational {
    Rational::from((n, d))
}

fn decimal(e: &Expr) -> (Rational, Option<Rational>) {
    match &e.node {
        Node::Decimal {
            value, uncertainty, ..
        } => (value.clone(), uncertainty.clone()),
        other => panic!("not a decimal: {other:?}"),
    }
}

/// Pairs that must give equal trees: the left is a spelling people paste,
/// the right the fully explicit form the language's rules (module docs of
/// `loopwise::input::expr`) say it means.
#[test]
fn spellings_give_the_documented_structure() {
    let same = [
        ("2pi^2", "2*(pi^2)"),
        ("-pi^2", "-(pi^2)"),
        ("2^3^2", "2^(3^2)"),
        ("2**3", "2^3"),
        ("Zeta[3]", "zeta(3)"),
        ("z3", "zeta(3)"),
        ("ζ(3)", "zeta(3)"),
        ("ζ3", "zeta(3)"),
        ("zeta3", "zeta(3)"),
        ("ZETA(3)", "zeta(3)"),
        ("Z5", "zeta(5)"),
        ("π", "pi"),
        ("Pi", "pi"),
        ("PI", "pi"),
        ("Catalan", "catalan"),
        ("CATALAN", "catalan"),
        ("ln(2)", "log(2)"),
        ("Log[2]", "log(2)"),
        ("LOG(1+x)", "log(1+x)"),
        ("4 zeta(3)^2", "4*(zeta(3)^2)"),
        ("2 l1 l2", "(2*l1)*l2"),
        ("3(1+pi)", "3*(1+pi)"),
        ("1 - 2 - 3", "(1-2)-3"),
        ("1/2/3", "(1/2)/3"),
        ("1/2 pi", "(1/2)*pi"),
        ("-2*3", "(-2)*3"),
        ("2*-3", "2*(-3)"),
        ("2^-1", "2^(-1)"),
        ("-2^-2^3", "-(2^(-(2^3)))"),
        ("+5", "5"),
        ("a - -b", "a - (-b)"),
        ("73/630", "73/630"),
        ("2 x (1)", "2*x*1"),
        ("pi(2)", "pi*2"),
        ("Γ(pi/4)", "Gamma(pi/4)"),
        ("gamma[pi/4]", "Gamma(pi/4)"),
        ("Δ(0)", "Delta(0)"),
        ("Delta( c2 = 1/3 )", "Delta(c2=1/3)"),
        ("2pi/3", "(2*pi)/3"),
        ("1.5 (3 + 1)", "1.5*(3 + 1)"),
        ("3 × 4 · 5", "3*4*5"),
        ("\u{2212}1", "-1"),
        (
            "-876*zeta(6)\n  - 32*zeta(3)^2",
            "(-876*zeta(6)) - 32*zeta(3)^2",
        ),
        ("x2", "x2"),
        ("pix", "pix"),
        ("z3x", "z3x"),
    ];
    for (a, b) in same {
        assert_eq!(p(a), p(b), "{a:?} versus {b:?}");
    }
    let differ = [
        ("2^3^2", "(2^3)^2"),
        ("-pi^2", "(-pi)^2"),
        ("1.5(3)", "1.5*3"),
        ("L1", "l1"),
    ];
    for (a, b) in differ {
        assert_ne!(p(a), p(b), "{a:?} versus {b:?}");
    }
}

#[test]
fn nodes_of_simple_inputs() {
    assert_eq!(p("12").node, Node::Integer(Integer::from(12)));
    assert_eq!(p("zeta(5,3)").node, Node::Zeta(vec![5, 3]));
    assert_eq!(p("zeta(2, 1, 1)").node, Node::Zeta(vec![2, 1, 1]));
    assert_eq!(p("catalan").node, Node::Catalan);
    assert_eq!(p("g").node, Node::Symbol("g".into()));
    assert_eq!(p("L1").node, Node::Symbol("L1".into()));
    match p("Gamma(pi/4)").node {
        Node::Functional {
            kind: Functional::Gamma,
            angle: Angle::Radians(a),
        } => assert_eq!(*a, p("pi/4")),
        other => panic!("{other:?}"),
    }
    match p("Delta(c2=1/3)").node {
        Node::Functional {
            kind: Functional::Delta,
            angle: Angle::Cos2(a),
        } => assert_eq!(*a, p("1/3")),
        other => panic!("{other:?}"),
    }
    assert_eq!(
        p("Gamma(c2)").node,
        Node::Functional {
            kind: Functional::Gamma,
            angle: Angle::SymbolicCos2
        }
    );
    assert_eq!(
        p("Gamma[C2]").node,
        Node::Functional {
            kind: Functional::Gamma,
            angle: Angle::SymbolicCos2
        }
    );
    // A bracketed c2 is an angle in radians that happens to be a symbol.
    match p("Gamma((c2))").node {
        Node::Functional {
            angle: Angle::Radians(a),
            ..
        } => assert_eq!(a.node, Node::Symbol("c2".into())),
        other => panic!("{other:?}"),
    }
}

/// Values of decimal literals. The bracket notation follows the convention
/// of JCGM 100:2008 (GUM) section 7.2.2: the bracketed digits are the
/// uncertainty in units of the last written digits.
#[test]
fn decimal_values_and_uncertainties() {
    assert_eq!(decimal(&p("1.5(3)")), (rat(3, 2), Some(rat(3, 10))));
    assert_eq!(decimal(&p("1240.9(2)")), (rat(12409, 10), Some(rat(2, 10))));
    assert_eq!(decimal(&p("1.5(13)")), (rat(3, 2), Some(rat(13, 10))));
    assert_eq!(decimal(&p("15(3)")), (rat(15, 1), Some(rat(3, 1))));
    assert_eq!(
        decimal(&p("6.67430(15)e-11")),
        (
            Rational::from((667430, Integer::from(10).pow(16u32))),
            Some(Rational::from((15, Integer::from(10).pow(16u32))))
        )
    );
    assert_eq!(
        decimal(&p("1.2e-3 ± 1e-4")),
        (rat(12, 10000), Some(rat(1, 10000)))
    );
    assert_eq!(
        decimal(&p("1.2e-3 +- 1e-4")),
        (rat(12, 10000), Some(rat(1, 10000)))
    );
    assert_eq!(
        decimal(&p("1.2e-3+/-1e-4")),
        (rat(12, 10000), Some(rat(1, 10000)))
    );
    assert_eq!(
        decimal(&p("-1240.9 ± 0.2").node_neg()),
        (rat(12409, 10), Some(rat(1, 5)))
    );
    assert_eq!(decimal(&p("1.2E+3")), (rat(1200, 1), None));
    assert_eq!(decimal(&p("1.2*^-3")), (rat(12, 10000), None));
    assert_eq!(decimal(&p("2e3")), (rat(2000, 1), None));
    assert_eq!(decimal(&p(".5")), (rat(1, 2), None));
    assert_eq!(decimal(&p("2.")), (rat(2, 1), None));
    assert_eq!(
        decimal(&p("0.1000000000000000000001")),
        (
            Rational::from((
                Integer::from(10).pow(21u32) + 1,
                Integer::from(10).pow(22u32)
            )),
            None
        )
    );
    match p("-1240.9").node {
        Node::Neg(inner) => assert_eq!(decimal(&inner), (rat(-(-12409), 10), None)),
        other => panic!("{other:?}"),
    }
    match &p("1.5(3)").node {
        Node::Decimal { text, .. } => assert_eq!(text, "1.5(3)"),
        other => panic!("{other:?}"),
    }
}

trait NegInner {
    fn node_neg(&self) -> Expr;
}
impl NegInner for Expr {
    fn node_neg(&self) -> Expr {
        match &self.node {
            Node::Neg(inner) => (**inner).clone(),
            other => panic!("not a negation: {other:?}"),
        }
    }
}

#[test]
fn spans_are_byte_ranges_of_the_source() {
    let src = "ζ(3) + 2*x";
    let e = p(src);
    assert_eq!((e.span.start, e.span.end), (0, src.len()));
    match e.node {
        Node::Add(a, b) => {
            assert_eq!(&src[a.span.start..a.span.end], "ζ(3)");
            assert_eq!(&src[b.span.start..b.span.end], "2*x");
        }
        other => panic!("{other:?}"),
    }
    let e = p("-(1 + 2)");
    match e.node {
        Node::Neg(inner) => assert_eq!((inner.span.start, inner.span.end), (1, 8)),
        other => panic!("{other:?}"),
    }
}

/// Each rejected input with the line:column the message must name and a
/// phrase it must contain.
#[test]
fn rejected_inputs_and_their_messages() {
    let cases = [
        ("2 +", "1:4", "a number"),
        ("2 +", "1:4", "found the end of the expression"),
        ("zeta(1)", "1:1", "zeta(1) diverges"),
        ("zeta()", "1:6", "expected a whole number"),
        ("zeta(-2)", "1:6", "whole numbers from 1"),
        ("zeta(1,2)", "1:6", "first argument is 1"),
        ("zeta(2,1,1,1,1,1,1,1,1)", "1:1", "depth above 8"),
        ("zeta(3]", "1:7", "expected `,` or `)`"),
        ("zeta(x)", "1:6", "expected a whole number"),
        ("((1)", "1:5", "expected an operator"),
        ("((1)", "1:5", "`)`"),
        ("3 $ 4", "1:3", "found `$`"),
        ("Gamma(c2=)", "1:10", "expected an expression"),
        ("Gamma", "1:6", "expected `(`"),
        ("", "1:1", "empty expression"),
        ("   \n ", "2:2", "empty expression"),
        ("sqrt(2)", "1:1", "`sqrt` is not a known function"),
        ("1 +\n  * 2", "2:3", "expected a sign"),
        ("1.5(3) ± 0.1", "1:10", "already has an uncertainty"),
        ("1e99999", "1:2", "exponent outside"),
        ("2 ** ** 3", "1:6", "expected"),
        ("x +", "1:4", "found the end"),
    ];
    for (input, at, phrase) in cases {
        let m = err(input);
        assert!(
            m.starts_with(&format!("<test>:{at}: ")),
            "{input:?}: wrong place in\n{m}"
        );
        assert!(m.contains(phrase), "{input:?}: no {phrase:?} in\n{m}");
    }
}

#[test]
fn message_shows_the_line_and_a_caret() {
    let m = err("1 + 2 $ 3");
    assert_eq!(m, "<test>:1:7: expected an operator, `±`, a number, a constant, a function, a symbol, `(`, or the end of the expression, found `$`\n  |\n1 | 1 + 2 $ 3\n  |       ^");
}

#[test]
fn place_shifts_positions_into_a_larger_file() {
    let m = parse("1 + zeta(1)", "runs/cusp.yaml", Some((7, 12))).unwrap_err();
    assert!(
        m.message()
            .starts_with("runs/cusp.yaml:7:16: zeta(1) diverges"),
        "{m}"
    );
    let m = parse("1 +\n $", "runs/cusp.yaml", Some((7, 12))).unwrap_err();
    assert!(m.message().starts_with("runs/cusp.yaml:8:2: "), "{m}");
}

#[test]
fn overlong_nesting_is_an_error_not_a_crash() {
    let deep = "(".repeat(100_000);
    assert!(err(&deep).contains("nested more than"));
    let deep = format!("{}1{}", "(".repeat(100_000), ")".repeat(100_000));
    assert!(err(&deep).contains("nested more than"));
    let deep = format!("{}1{}", "log(".repeat(1000), ")".repeat(1000));
    assert!(err(&deep).contains("nested more than"));
    let signs = format!("{}1", "-".repeat(100_000));
    assert!(err(&signs).contains("signs and powers in a row"));
    let powers = format!("2{}", "^2".repeat(100_000));
    assert!(err(&powers).contains("signs and powers in a row"));
    let long_product = format!("1{}", "*1".repeat(100_000));
    assert!(err(&long_product).contains("operations deep"));
    // Within the limits, all of these parse, even on a test thread's small stack.
    p(&format!("{}2{}", "log(".repeat(64), ")".repeat(64)));
    p(&format!("{}x{}", "Delta[c2 = -".repeat(64), "]".repeat(64)));
    p(&format!("{}1{}", "-2^(-".repeat(64), ")".repeat(64)));
    p(&format!("{}1{}", "-(".repeat(64), ")".repeat(64)));
    p(&format!("{}1{}", "(".repeat(60), ")".repeat(60)));
    p(&format!("1{}", "+1".repeat(1000)));
    p(&format!("{}1", "-".repeat(90)));
}

#[test]
fn huge_literals_are_refused() {
    assert!(err(&"9".repeat(6000)).contains("more than 5000 digits"));
    assert!(err(&format!("1.{}", "9".repeat(6000))).contains("more than 5000 digits"));
    p(&"9".repeat(4000));
    p("1e1000");
    p("1e-1000");
}

#[test]
fn printing_then_parsing_gives_the_same_tree() {
    let inputs = [
        "-876*zeta(6) - 32*zeta(3)^2",
        "-zeta(2)/2*Gamma(pi/4) + Delta(0)/4",
        "2pi^2",
        "-pi^2",
        "(-pi)^2",
        "2^3^2",
        "(2^3)^2",
        "a - (b - c)",
        "a/(b*c)",
        "a/-b",
        "a^-b^c",
        "(a^-b)^c",
        "--x",
        "-(a*b)",
        "1.5(3)*x",
        "x*1.2e-3 ± 1e-4",
        "(1.2e-3 +- 1e-4)^2",
        "Gamma(c2)",
        "Gamma((c2))",
        "Delta(c2 = 1/3) - Delta(2pi/3)",
        "log(1 + x)^2 * zeta(5,3)",
        "catalan - 2.",
        "-(1 - 2)^-(3)",
        "x^(y*z)",
        "l1 l2 + l3 (l1 - 1)",
    ];
    for s in inputs {
        let e = p(s);
        let printed = e.to_string();
        assert_eq!(p(&printed), e, "{s:?} printed as {printed:?}");
    }
    assert_eq!(p("2pi^2").to_string(), "2*pi^2");
    assert_eq!(
        p("-zeta(2)/2*Gamma(pi/4)").to_string(),
        "-zeta(2)/2*Gamma(pi/4)"
    );
    assert_eq!(p("a - (b - c)").to_string(), "a - (b - c)");
}

/// A pasted high-loop coefficient is a sum of thousands of terms: it parses,
/// as a balanced tree whose depth grows like the logarithm of its length, and
/// keeps its value (100,001 terms of +-1 summing to 1).
#[test]
fn long_sums_parse_as_shallow_trees() {
    let mut text = String::from("1");
    for k in 0..100_000 {
        text.push_str(if k % 2 == 0 { " + 1" } else { " - 1" });
    }
    let e = p(&text);
    fn depth(e: &loopwise::input::expr::Expr) -> usize {
        use loopwise::input::expr::Node;
        match &e.node {
            Node::Add(a, b)
            | Node::Sub(a, b)
            | Node::Mul(a, b)
            | Node::Div(a, b)
            | Node::Pow(a, b) => 1 + depth(a).max(depth(b)),
            Node::Neg(a) | Node::Log(a) => 1 + depth(a),
            _ => 1,
        }
    }
    assert!(depth(&e) < 40, "depth {}", depth(&e));
    let mut ctx = loopwise::numeric::evaluate::Context::new(64);
    let v = loopwise::numeric::evaluate::evaluate(&e, &mut ctx).unwrap();
    assert_eq!(v.value, 1);
    // Below the threshold a sum stays left-nested, as its operators associate.
    assert_eq!(p("a - b + c"), p("(a - b) + c"));
}
