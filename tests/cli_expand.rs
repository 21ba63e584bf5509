//! The `loopwise` binary, run as a user runs it: `list` and `expand`, their
//! output shapes, exit codes and messages for bad input.

mod common;

use common::loopwise;

use rug::ops::Pow;
use rug::Float;

fn json(args: &[&str]) -> serde_json::Value {
    let (code, stdout, stderr) = loopwise(args);
    assert_eq!(code, 0, "{stderr}");
    serde_json::from_str(&stdout).expect("valid JSON")
}

#[test]
fn list_shows_the_catalogue_and_flags_conjectures() {
    let (code, out, _) = loopwise(&["list"]);
    assert_eq!(code, 0);
    for name in ["cusp", "octagon", "hexagon", "octagon-constant"] {
        assert!(out.contains(name), "{out}");
    }
    let hex = out.lines().find(|l| l.starts_with("hexagon ")).unwrap();
    assert!(hex.contains("CONJECTURE"), "{hex}");
}

/// The JSON shape scripts rely on: quantity, coupling, orders[{loop, exact, value}].
#[test]
fn json_shape() {
    let v = json(&["expand", "cusp", "--loops", "4", "--format", "json"]);
    assert_eq!(v["quantity"], "cusp");
    assert_eq!(v["coupling"], "g2");
    let orders = v["orders"].as_array().unwrap();
    assert_eq!(orders.len(), 4);
    assert_eq!(orders[0]["loop"], 1);
    assert_eq!(orders[0]["exact"], "4");
    assert_eq!(orders[3]["exact"], "-292/315*pi^6 - 32*zeta(3)^2");
}

/// The printed values against an independent MPFR evaluation of the zeta
/// values of hep-th/0610251's four- and five-loop cusp coefficients:
/// -(876 zeta(6) + 32 zeta(3)^2) and 14192/14175 pi^8 + 64/3 pi^2 zeta(3)^2 + 640 zeta(3) zeta(5).
#[test]
fn values_match_an_independent_mpfr_evaluation() {
    let digits = 60;
    let v = json(&[
        "expand", "cusp", "--loops", "5", "--format", "json", "--digits", "60",
    ]);
    let prec = 300;
    let z = |n: u32| Float::with_val(prec, Float::zeta_u(n));
    let pi = Float::with_val(prec, rug::float::Constant::Pi);
    let four = -(z(6) * 876u32 + z(3).square() * 32u32);
    let five = Float::with_val(prec, pi.clone().pow(8u32)) * 14192u32 / 14175u32
        + Float::with_val(prec, pi.square_ref()) * z(3).square() * 64u32 / 3u32
        + z(3) * z(5) * 640u32;
    for (order, reference) in [(3usize, four), (4, five)] {
        let text = v["orders"][order]["value"].as_str().unwrap();
        let printed = Float::with_val(prec, Float::parse(text).unwrap());
        let rel = Float::with_val(prec, (printed - &reference) / &reference).abs();
        assert!(
            rel < Float::with_val(64, Float::i_exp(1, -(digits as i32 * 3))),
            "order {}: {text}",
            order + 1
        );
        assert_eq!(
            text.trim_start_matches('-').replace('.', "").len(),
            digits,
            "{text}"
        );
    }
}

/// In a = 2 g^2 the L-loop coefficient is divided by 2^L (docs/conventions.md section 1);
/// with --even zeta the four-loop cusp reads as in hep-th/0610251.
#[test]
fn coupling_and_even_zeta_options() {
    let v = json(&[
        "expand",
        "cusp",
        "--loops",
        "4",
        "--format",
        "json",
        "--coupling",
        "a",
        "--even",
        "zeta",
    ]);
    assert_eq!(v["coupling"], "a");
    assert_eq!(v["orders"][0]["exact"], "2");
    assert_eq!(v["orders"][1]["exact"], "-2*zeta(2)");
    assert_eq!(v["orders"][3]["exact"], "-219/4*zeta(6) - 2*zeta(3)^2");
    let y = loopwise(&["expand", "octagon", "--loops", "2", "--format", "yaml"]).1;
    assert!(
        y.contains("quantity: octagon") && y.contains("exact: -8/3*pi^2"),
        "{y}"
    );
}

#[test]
fn symbolic_tilt_has_no_value() {
    let v = json(&["expand", "Gamma(c2)", "--loops", "2", "--format", "json"]);
    assert_eq!(v["orders"][1]["exact"], "-8/3*c2*pi^2");
    assert!(v["orders"][1]["value"].is_null());
}

#[test]
fn latex_is_a_table_environment() {
    let (code, out, _) = loopwise(&["expand", "hexagon", "--loops", "4", "--format", "latex"]);
    assert_eq!(code, 0);
    assert!(
        out.contains("\\begin{table}")
            && out.contains("\\end{tabular}")
            && out.contains("\\end{table}")
    );
    // -603/2 zeta(6) = -67/210 pi^6 (docs/conventions.md section 4, zeta(6) = pi^6/945).
    assert!(out.contains("-\\frac{67}{210}\\,\\pi^{6}"), "{out}");
    assert!(out.contains("conjecture"), "hexagon is flagged: {out}");
}

#[test]
fn conjectures_carry_a_caution_in_text() {
    let (_, out, _) = loopwise(&["expand", "hexagon", "--loops", "2"]);
    assert!(out.contains("CAUTION: conjecture"), "{out}");
}

#[test]
fn bad_input_is_one_line_and_exit_code_two() {
    for (args, needle) in [
        (vec!["expand", "cusp", "--loops", "0"], "out of range"),
        (vec!["expand", "cusp", "--loops", "100000"], "out of range"),
        (vec!["expand", "cups"], "did you mean `cusp`"),
        (vec!["expand", "Gamma(pi/5)"], "irrational"),
        (vec!["expand", "Gamma(pi/4"], "1:11"),
        (vec!["expand", "cusp", "--digits", "0"], "out of range"),
        (
            vec!["--catalog", "/nonexistent-dir", "list"],
            "cannot read catalogue directory",
        ),
    ] {
        let (code, out, err) = loopwise(&args);
        assert_eq!(code, 2, "{args:?}: {err}");
        assert!(out.is_empty(), "{args:?} printed to stdout: {out}");
        assert!(err.contains(needle), "{args:?}: {err}");
        assert!(!err.contains("panicked"), "{err}");
    }
}

/// An unreadable catalogue file is reported with its name, line and column.
#[test]
fn broken_catalogue_file_names_file_and_line() {
    let dir = std::env::temp_dir().join(format!("loopwise-cat-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    std::fs::write(
        dir.join("mine.yaml"),
        "name: mine\nsummary: s\ndefinition: Gamma(0)\nstatuss: established\n",
    )
    .unwrap();
    let (code, _, err) = loopwise(&["--catalog", dir.to_str().unwrap(), "list"]);
    std::fs::write(
        dir.join("mine.yaml"),
        "name: mine\nsummary: mine\ndefinition: 3*Gamma(pi/6)\ncoupling: a\nstatus: conjecture\n",
    )
    .unwrap();
    let (code2, out2, _) = loopwise(&[
        "--catalog",
        dir.to_str().unwrap(),
        "expand",
        "mine",
        "--loops",
        "2",
        "--format",
        "json",
    ]);
    std::fs::remove_dir_all(&dir).ok();
    assert_eq!(code, 2);
    assert!(
        err.contains("mine.yaml:4:") && err.contains("did you mean `status`"),
        "{err}"
    );
    assert_eq!(code2, 0);
    let v: serde_json::Value = serde_json::from_str(&out2).unwrap();
    // 3 Gamma(pi/6) at two loops is 3 * (-16 * 3/4 * zeta(2)) = -6 pi^2 in g^2; the
    // entry asks for a = 2 g^2, which divides by 2^2.
    assert_eq!(v["coupling"], "a");
    assert_eq!(v["orders"][1]["exact"], "-3/2*pi^2");
}

/// `loopwise expand cusp --loops 30 | head -1`: the report (about 1.4 MB, far
/// more than a pipe holds) is still being written when the reader closes the
/// pipe. That is a normal end: exit 0, and nothing on stderr.
#[test]
fn closed_stdout_pipe_is_a_normal_end() {
    use std::io::{BufRead, BufReader};
    use std::process::{Command, Stdio};
    let mut child = Command::new(env!("CARGO_BIN_EXE_loopwise"))
        .args(["expand", "cusp", "--loops", "30"])
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .expect("the binary runs");
    let mut reader = BufReader::new(child.stdout.take().unwrap());
    let mut first = String::new();
    reader.read_line(&mut first).unwrap();
    drop(reader);
    let out = child.wait_with_output().unwrap();
    assert!(first.starts_with("cusp = Gamma(pi/4)"), "{first}");
    assert_eq!(
        out.status.code(),
        Some(0),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    assert!(
        out.stderr.is_empty(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
}
