//! `--format mathematica` and `--format maple` run as a user runs them: the
//! exact text of small cases (coefficients against the published cusp
//! expansion), the comment lines, multiple zeta values never written as a
//! two-argument `Zeta` in Maple, exit codes, and the refusals. The readback
//! through sympy's parsers is in tests/python/test_cas_readback.py.

mod common;

use common::{loopwise, loopwise_with_stdin};

/// The expression after the comment line.
fn body(out: &str) -> &str {
    out.split_once('\n').expect("a comment line").1
}

/// Gamma_cusp = f(g)/2 = 4 g^2 - 4/3 pi^2 g^4 + 44/45 pi^4 g^6 - ...,
/// hep-th/0610251 (f(g) = 8 g^2 - 8/3 pi^2 g^4 + 88/45 pi^4 g^6, recalled
/// from memory), in Wolfram Language list syntax.
#[test]
fn expand_cusp_in_mathematica() {
    let (code, out, err) = loopwise(&["expand", "cusp", "-L", "3", "--format", "mathematica"]);
    assert_eq!(code, 0, "{err}");
    let comment = out.lines().next().unwrap();
    assert!(
        comment.starts_with("(* loopwise expand: cusp = Gamma(pi/4)"),
        "{comment}"
    );
    assert!(comment.ends_with(" *)"), "{comment}");
    assert!(
        comment.contains(
            "list entry L (L = 1..3) is the coefficient of g^(2L), with g^2 = lambda/(16 pi^2)"
        ),
        "{comment}"
    );
    assert!(comment.contains("status: established"), "{comment}");
    assert_eq!(body(&out), "{\n  4,\n  -4/3*Pi^2,\n  44/45*Pi^4\n}\n");
}

/// The four-loop cusp coefficient -876 zeta(6) - 32 zeta(3)^2 with the
/// lower ones 4, -8 zeta(2), 88 zeta(4) (hep-th/0610251, in the even-zeta
/// form of its eq. for f(g)/2, recalled from memory), in Maple syntax.
#[test]
fn expand_cusp_in_maple_with_even_zetas() {
    let (code, out, err) = loopwise(&[
        "expand", "cusp", "-L", "4", "--format", "maple", "--even", "zeta",
    ]);
    assert_eq!(code, 0, "{err}");
    assert!(
        out.starts_with("# loopwise expand: cusp = Gamma(pi/4)"),
        "{out}"
    );
    assert_eq!(
        body(&out),
        "[\n  4,\n  -8*Zeta(2),\n  88*Zeta(4),\n  -876*Zeta(6) - 32*Zeta(3)^2\n];\n"
    );
}

/// The symbolic tilt is explained where it appears, a conjecture is flagged,
/// and the coupling of the list is the one asked for: Gamma_hex at one loop
/// is 4 g^2 = lambda/(4 pi^2) (g^2 = lambda/(16 pi^2), docs/conventions.md
/// section 1; the one-loop value 4 g^2 is common to every tilt, derived here).
#[test]
fn comments_state_the_tilt_the_status_and_the_coupling() {
    let (code, out, _) = loopwise(&["expand", "Gamma(c2)", "-L", "2", "--format", "maple"]);
    assert_eq!(code, 0);
    assert!(
        out.lines().next().unwrap().contains("c2 = cos^2(alpha)"),
        "{out}"
    );
    assert_eq!(body(&out), "[\n  4,\n  -8/3*c2*Pi^2\n];\n");
    let (code, out, _) = loopwise(&[
        "expand",
        "hexagon",
        "-L",
        "1",
        "--format",
        "mathematica",
        "--coupling",
        "lambda",
    ]);
    assert_eq!(code, 0);
    let comment = out.lines().next().unwrap();
    assert!(
        comment.contains("CAUTION: conjecture of the literature"),
        "{comment}"
    );
    assert!(comment.contains("coefficient of lambda^L"), "{comment}");
    assert_eq!(body(&out), "{\n  1/4*Pi^(-2)\n}\n");
}

/// Invented check input (fictional): an exact entry with a multiple zeta
/// value and a logarithm, a decimal, and a gap.
const MIXED: &str = "\
# invented test data
prediction: cusp
coupling: g2
orders:
  - loop: 1
    exact: \"4 + zeta(5,3) - zeta(5,3)\"
  - loop: 2
    exact: \"-8 Zeta[2] + log(2)^2/3\"
  - loop: 4
    value: \"-937.43062784825374188\"
";

/// [`MIXED`] written to a file of this test run.
fn mixed_file() -> String {
    let dir = std::env::temp_dir().join(format!("loopwise-cas-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let path = dir.join("mixed.yaml");
    std::fs::write(&path, MIXED).unwrap();
    path.to_str().unwrap().to_string()
}

#[test]
fn check_writes_predicted_and_supplied_triples() {
    let (code, out, err) = loopwise_with_stdin(&["check", "-", "--format", "mathematica"], MIXED);
    // Order 2 differs by log(2)^2/3: exit code 1, as for every other format.
    assert_eq!(code, 1, "{err}");
    let comment = out.lines().next().unwrap();
    assert!(comment.contains("{L, predicted, supplied}"), "{comment}");
    assert!(
        comment.contains("MZV[s1, ..., sk] = sum over n1 > n2 > ... > nk >= 1"),
        "{comment}"
    );
    assert!(comment.contains("order 2 differs"), "{comment}");
    assert_eq!(
        body(&out),
        "{\n  {1, 4, 4 + MZV[5, 3] - MZV[5, 3]},\n  \
         {2, -4/3*Pi^2, -8*Zeta[2] + Log[2]^2/3},\n  \
         {3, 44/45*Pi^4, Missing[\"NotSupplied\"]},\n  \
         {4, -292/315*Pi^6 - 32*Zeta[3]^2, Missing[\"NotExact\"]}\n}\n"
    );
}

/// A two-argument `Zeta` is a derivative in Maple: multiple zeta values go
/// out as `MZV(...)` and never as `Zeta(5, 3)`.
#[test]
fn maple_never_writes_a_multiple_zeta_value_as_zeta() {
    let (_, out, err) = loopwise_with_stdin(&["check", "-", "--format", "maple"], MIXED);
    assert!(
        out.contains("[1, 4, 4 + MZV(5, 3) - MZV(5, 3)]"),
        "{out}{err}"
    );
    assert!(out.contains("[3, 44/45*Pi^4, \"not supplied\"]"), "{out}");
    assert!(!out.contains("Zeta(5"), "{out}");
    assert!(out.trim_end().ends_with("];"), "{out}");
}

/// The origin demo (fictional data): the one-loop row holds -Gamma_oct/24 =
/// -1/6 for Gamma_oct = 4 g^2 at one loop (arXiv:2003.01121, recalled from
/// memory) and C0 = -3 zeta(2) (Abramowitz & Stegun 27.7); C0 is predicted
/// at one loop only, and the break of exponentiation is stated.
#[test]
fn origin_writes_pairs_and_states_the_break() {
    let demo = include_str!("../series/examples/demo-origin.yaml");
    let (code, out, err) = loopwise_with_stdin(&["origin", "-", "--format", "mathematica"], demo);
    assert_eq!(code, 1, "{err}");
    let comment = out.lines().next().unwrap();
    assert!(
        comment.contains("exponentiation breaks at order 5"),
        "{comment}"
    );
    assert!(
        comment.contains("the hexagon prediction is a conjecture"),
        "{comment}"
    );
    let rows: Vec<&str> = body(&out).lines().collect();
    assert_eq!(
        rows[1],
        "  {1, {-1/6, -1/6}, {-1/6, -1/6}, {0, 0}, {-3*Zeta[2], -3*Zeta[2]}},"
    );
    assert!(
        rows[2].ends_with("{Missing[\"NotPredicted\"], 41/4*Zeta[4]}},"),
        "{}",
        rows[2]
    );
    assert_eq!(rows.len(), 6, "orders 1-4 and the brackets");
}

#[test]
fn refusals_are_errors_with_exit_code_2() {
    // A file, not standard input: the refusal comes before anything is read.
    let mixed = mixed_file();
    let (code, out, err) = loopwise(&["check", &mixed, "--format", "mathematica", "--identify"]);
    assert_eq!((code, out.as_str()), (2, ""));
    assert!(err.contains("--identify"), "{err}");
    // Exponentiation breaks at one loop (a cubic log term): nothing is read.
    let broken =
        "normalisation: E\ncoupling: g2\nsymbols: [l1, l2, l3]\norders:\n  - loop: 1\n    \
                  exact: \"l1^3 - 1/2*l1^2 - 1/2*l2^2 - 1/2*l3^2 - 3*zeta(2)\"\n";
    let (code, out, err) = loopwise_with_stdin(&["origin", "-", "--format", "maple"], broken);
    assert_eq!((code, out.as_str()), (2, ""));
    assert!(err.contains("no exact part"), "{err}");
    let (code, _, err) = loopwise(&["demo", "--format", "maple"]);
    assert_eq!(code, 2, "the demo offers the data formats only: {err}");
}

#[test]
fn several_files_are_refused_for_one_expression() {
    let p = mixed_file();
    let (code, out, err) = loopwise(&["check", &p, &p, "--format", "mathematica"]);
    assert_eq!((code, out.as_str()), (2, ""));
    assert!(
        err.contains("one expression for one file; 2 files"),
        "{err}"
    );
}
