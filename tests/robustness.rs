//! Robustness of the parser and the series-file reader against random and
//! mangled input: every input must end in `Ok` or a clean `Err` (no panic,
//! no stack overflow), and whatever parses must print to text that parses
//! back to the same tree; whatever parses must also evaluate (exactly, as a
//! prediction, and numerically) to a value or a clean error, and mutated
//! series files must go through the whole `check` pipeline the same way.
//! The default run is short; the long run (over 100,000 inputs in total) is
//! `cargo test --release --test robustness -- --ignored`.

use loopwise::check;
use loopwise::input::catalogue::Catalogue;
use loopwise::input::expr::parse;
use loopwise::input::seriesfile::parse_series_text;
use loopwise::numeric::evaluate::{evaluate, Context};
use loopwise::quantity::Quantity;
use proptest::prelude::*;
use proptest::test_runner::{Config, TestRunner};

const SEED_EXPRESSIONS: &[&str] = &[
    "-876*zeta(6) - 32*zeta(3)^2",
    "-zeta(2)/2*Gamma(pi/4) + Delta(0)/4",
    "4 zeta(3)^2 + 2pi^2 l1 l2",
    "-1240.9(2)",
    "1.2e-3 ± 1e-4",
    "73/630 * Zeta[5,3] - Log[2]^2 + catalan",
    "Gamma(c2=1/3) - Delta(c2) + Γ(2pi/3) * ζ3",
    "3(1+pi) - 2**3**2 + z5 - ln(1 + x)/g",
    "((1 + l1)^2 - (l2 - l3)^-2) / (4 π^4)",
];

const SEED_FILE: &str = r#"prediction: "-zeta(2)/2*Gamma(pi/4) + Delta(0)/4"
coupling: g2
normalisation: E
symbols: [l1, l2, l3]
about:
  group: Fictional Bootstrap Collective
  date: 2026-11-30
orders:
  - loop: 1
    exact: "4"
  - loop: 4
    exact: "-876*zeta(6) - 32*zeta(3)^2"
    label: "from the four-loop run"
  - loop: 5
    value: "-1240.9(2)"
  - loop: 6
    value: -1240.9
    uncertainty: 0.2
  - {loop: 7, exact: 'ζ(3) l1 + 2 l2'}
"#;

const SEED_CHECK: &str = r#"prediction: cusp
coupling: a
orders:
  - loop: 1
    exact: "2"
  - loop: 2
    exact: "-2 zeta(2)"
  - loop: 3
    value: "11.9056(1)"
  - loop: 4
    exact: "-219/4 zeta(6) - 2 zeta(3)^2 + zeta(5,3) - zeta(5,3)"
"#;

/// Characters mutations draw from: the language's own tokens, YAML syntax,
/// and unicode that is not part of either.
const ALPHABET: &[char] = &[
    '0', '1', '2', '9', '.', 'e', 'E', '+', '-', '*', '/', '^', '(', ')', '[', ']', ',', '=', ' ',
    '\n', '\t', 'p', 'i', 'z', 'l', 'g', 'c', 'x', '_', 'Z', 'G', 'D', ':', '"', '\'', '#', '{',
    '}', '&', '!', '|', '>', '-', '±', 'π', 'ζ', 'Γ', 'Δ', '−', '×', '\u{a0}', 'é', '日', '🦀',
    '\u{0}', '\u{feff}', '\u{200b}', '\\',
];

#[derive(Debug, Clone)]
enum Edit {
    Insert(usize, char),
    Delete(usize),
    Replace(usize, char),
}

fn edit() -> impl Strategy<Value = Edit> {
    let ch = prop::sample::select(ALPHABET);
    prop_oneof![
        (any::<usize>(), ch.clone()).prop_map(|(i, c)| Edit::Insert(i, c)),
        any::<usize>().prop_map(Edit::Delete),
        (any::<usize>(), ch).prop_map(|(i, c)| Edit::Replace(i, c)),
    ]
}

fn mutate(seed: &str, edits: &[Edit]) -> String {
    let mut chars: Vec<char> = seed.chars().collect();
    for e in edits {
        match *e {
            Edit::Insert(i, c) => {
                let at = i % (chars.len() + 1);
                chars.insert(at, c);
            }
            Edit::Delete(i) if !chars.is_empty() => {
                let at = i % chars.len();
                chars.remove(at);
            }
            Edit::Replace(i, c) if !chars.is_empty() => {
                let at = i % chars.len();
                chars[at] = c;
            }
            _ => {}
        }
    }
    chars.into_iter().collect()
}

/// Whether an expression holds anything without a fixed numerical value.
fn has_free_parts(text: &str) -> bool {
    let e = match parse(text, "<free>", None) {
        Ok(e) => e,
        Err(_) => return true,
    };
    let mut free = false;
    loopwise::input::expr::for_each_symbol(&e, &mut |_, _| free = true);
    free || text.to_lowercase().contains("gamma")
        || text.to_lowercase().contains("delta")
        || text.contains(['Γ', 'Δ'])
}

/// The property for expressions: a clean result, a faithful printed form,
/// numerical values that survive printing, evaluation errors that point
/// inside the input, and an exact reading that agrees with the numerical one.
fn check_expression(input: &str) -> Result<(), TestCaseError> {
    let e = match parse(input, "<fuzz>", None) {
        Ok(e) => e,
        Err(err) => {
            prop_assert!(
                err.message().starts_with("<fuzz>:1:") || err.message().starts_with("<fuzz>:"),
                "{}",
                err
            );
            return Ok(());
        }
    };
    let printed = e.to_string();
    let again = parse(&printed, "<printed>", None).map_err(|err| {
        TestCaseError::fail(format!("{input:?} printed as {printed:?} fails:\n{err}"))
    })?;
    prop_assert_eq!(&again, &e, "{:?} printed as {:?}", input, printed);
    let mzv = |s: &[u32], p: u32| loopwise::numeric::mzv::mzv(s, p);
    let evaluate_at = |tree: &loopwise::input::expr::Expr| {
        let mut ctx = Context::new(128);
        ctx.mzv = Some(&mzv);
        evaluate(tree, &mut ctx)
    };
    let numeric = evaluate_at(&e);
    match (&numeric, evaluate_at(&again)) {
        (Ok(a), Ok(b)) => {
            prop_assert!(
                a.value.is_finite() && a.error.is_finite() && a.error >= 0,
                "{input:?}: {a:?}"
            );
            prop_assert_eq!(
                &a.value,
                &b.value,
                "{:?} printed as {:?} changes its value",
                input,
                printed
            );
            prop_assert_eq!(
                &a.error,
                &b.error,
                "{:?} printed as {:?} changes its uncertainty",
                input,
                printed
            );
        }
        (Err((span, message)), Err(_)) => {
            prop_assert!(
                span.end <= input.len() && span.start <= span.end,
                "{input:?}: span {span:?} outside the input"
            );
            prop_assert!(!message.is_empty(), "{input:?}: empty message");
        }
        (a, b) => prop_assert!(
            false,
            "{input:?} and its printed form {printed:?} evaluate differently: {a:?} / {b:?}"
        ),
    }
    let catalogue = Catalogue::builtin().map_err(|e| TestCaseError::fail(e.to_string()))?;
    match Quantity::resolve(input, &catalogue) {
        Err(err) => prop_assert!(
            err.message().starts_with("<quantity>:")
                || err.message().starts_with("unknown quantity"),
            "{input:?}: resolution error without a place: {err}"
        ),
        Ok(q) => match q.expand(3, &mut |_, _, _| {}) {
            Err(err) => prop_assert!(
                err.message().starts_with("<quantity>:")
                    || err.message().starts_with("definition of"),
                "{input:?}: expansion error without a place: {err}"
            ),
            // A constant read exactly and read numerically is one number.
            Ok(series) if !has_free_parts(input) => {
                if let (Ok(n), Ok(x)) = (&numeric, series.coeff(0).evaluate(128)) {
                    if n.is_exact() && series.coeffs().iter().skip(1).all(|c| c.is_zero()) {
                        let scale = rug::Float::with_val(128, n.value.abs_ref())
                            .max(&rug::Float::with_val(128, 1));
                        let gap = rug::Float::with_val(128, &x - &n.value).abs() / scale;
                        prop_assert!(
                            gap < 1e-25,
                            "{input:?}: exact {x} against numerical {}",
                            n.value
                        );
                    }
                }
            }
            Ok(_) => {}
        },
    }
    Ok(())
}

fn check_file(input: &str) -> Result<(), TestCaseError> {
    match parse_series_text(input, "fuzz.yaml") {
        Err(err) => prop_assert!(err.message().contains("fuzz.yaml"), "{}", err),
        Ok(file) => {
            let catalogue = Catalogue::builtin().map_err(|e| TestCaseError::fail(e.to_string()))?;
            if file.orders.iter().all(|o| o.loop_order <= 6) {
                match check::check(&file, &catalogue, 20, &mut |_, _, _| {}) {
                    Err(err) => prop_assert!(
                        err.message().contains("fuzz.yaml"),
                        "a check error that names no file: {}",
                        err
                    ),
                    // Nothing is silently dropped: every supplied order gets a verdict.
                    Ok(c) => {
                        for o in &file.orders {
                            prop_assert!(
                                c.orders
                                    .iter()
                                    .any(|r| r.loop_order == o.loop_order && r.supplied.is_some()),
                                "order {} of the file has no verdict",
                                o.loop_order
                            );
                        }
                    }
                }
            }
        }
    }
    Ok(())
}

/// Well-formed text of the coefficient language, built from its own
/// pieces: every one must parse, print, and read back to the same value.
fn well_formed() -> impl Strategy<Value = String> {
    let leaf = prop_oneof![
        (0u32..2000).prop_map(|n| n.to_string()),
        (0u32..1000, 1u32..999).prop_map(|(a, b)| format!("{a}.{b}")),
        (0u32..100, 1u32..99, 1u32..9).prop_map(|(a, b, u)| format!("{a}.{b}({u})")),
        (1u32..9, 1u32..9, 1u32..5).prop_map(|(a, b, u)| format!("{a}.{b}({u}.5)")),
        (1u32..9, 1u32..9, 1u32..9).prop_map(|(a, b, e)| format!("{a}.{b}e-{e}(2)")),
        (1u32..99, 1u32..9).prop_map(|(a, u)| format!("{a}.0 ± 0.{u}")),
        Just("pi".to_string()),
        Just("catalan".to_string()),
        (2u32..12).prop_map(|n| format!("zeta({n})")),
        (3u32..9).prop_map(|n| format!("z{n}")),
        Just("zeta(5,3)".to_string()),
        (2u32..50).prop_map(|n| format!("log({n})")),
    ];
    leaf.prop_recursive(4, 24, 3, |inner| {
        prop_oneof![
            (
                inner.clone(),
                prop::sample::select(vec![" + ", " - ", "*", "/", " * "]),
                inner.clone()
            )
                .prop_map(|(a, op, b)| format!("({a}){op}({b})")),
            (inner.clone(), 1u32..4).prop_map(|(a, k)| format!("({a})^{k}")),
            inner.clone().prop_map(|a| format!("-({a})")),
            (1u32..9, inner).prop_map(|(k, a)| format!("{k}({a} + 1)")),
        ]
    })
}

fn generated_expressions(cases: u32) {
    runner(cases)
        .run(&well_formed(), |s| {
            prop_assert!(
                parse(&s, "<gen>", None).is_ok(),
                "well-formed {s:?} refused: {}",
                parse(&s, "<gen>", None).unwrap_err()
            );
            check_expression(&s)
        })
        .unwrap();
}

fn runner(cases: u32) -> TestRunner {
    TestRunner::new(Config {
        cases,
        failure_persistence: None,
        ..Config::default()
    })
}

fn random_expressions(cases: u32) {
    let strategy = prop::collection::vec(prop::sample::select(ALPHABET), 0..60)
        .prop_map(|v| v.into_iter().collect::<String>());
    runner(cases)
        .run(&strategy, |s| check_expression(&s))
        .unwrap();
}

fn mutated_expressions(cases: u32) {
    let strategy = (
        prop::sample::select(SEED_EXPRESSIONS),
        prop::collection::vec(edit(), 1..8),
    );
    runner(cases)
        .run(&strategy, |(seed, edits)| {
            check_expression(&mutate(seed, &edits))
        })
        .unwrap();
}

fn mutated_files(cases: u32) {
    let strategy = (
        prop::sample::select(&[SEED_FILE, SEED_CHECK][..]),
        prop::collection::vec(edit(), 1..10),
    );
    runner(cases)
        .run(&strategy, |(seed, edits)| check_file(&mutate(seed, &edits)))
        .unwrap();
}

#[test]
fn seeds_are_valid() {
    for s in SEED_EXPRESSIONS {
        check_expression(s).unwrap();
        assert!(parse(s, "<seed>", None).is_ok(), "{s}");
    }
    assert!(parse_series_text(SEED_FILE, "seed.yaml").is_ok());
    let file = parse_series_text(SEED_CHECK, "seed.yaml").unwrap();
    let c = check::check(&file, &Catalogue::builtin().unwrap(), 20, &mut |_, _, _| {}).unwrap();
    assert!(!c.any_differs(), "{:?}", c.summary());
}

#[test]
fn short_run() {
    generated_expressions(1000);
    random_expressions(1500);
    mutated_expressions(1500);
    mutated_files(1000);
}

/// 20,000 + 60,000 + 40,000 + 20,000 = 140,000 inputs.
#[test]
#[ignore]
fn long_run() {
    generated_expressions(20_000);
    random_expressions(60_000);
    mutated_expressions(40_000);
    mutated_files(20_000);
}
