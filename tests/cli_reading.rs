//! How input is read: every input is read as meant or refused with a
//! located message and exit code 2. One regression test per way the tool
//! used to read input silently wrong; the expected coefficients come from
//! hep-th/0610251 (the cusp through four loops) and from the closed form
//! Gamma_oct = (2/pi^2) ln cosh(2 pi g) of arXiv:1907.13131 / arXiv:2003.01121.

mod common;

use common::loopwise;

/// A fresh folder of this test run, named by `tag`.
fn folder(tag: &str) -> std::path::PathBuf {
    let dir = std::env::temp_dir().join(format!("loopwise-reading-{tag}-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    dir
}

fn write(name: &str, text: &str) -> String {
    let path = folder("files").join(name);
    std::fs::write(&path, text).unwrap();
    path.display().to_string()
}

fn json(text: &str) -> serde_json::Value {
    serde_json::from_str(text).unwrap_or_else(|e| panic!("not JSON ({e}):\n{text}"))
}

fn exact_column(args: &[&str]) -> Vec<String> {
    let (code, out, err) = loopwise(args);
    assert_eq!(code, 0, "{err}");
    json(&out)["orders"]
        .as_array()
        .unwrap()
        .iter()
        .map(|o| o["exact"].as_str().unwrap().to_string())
        .collect()
}

#[test]
fn catalogue_names_inside_formulas_are_their_definitions() {
    // Twice the cusp: 8, -16 zeta(2) = -8/3 pi^2, 176 zeta(4) = 88/45 pi^4 (hep-th/0610251).
    assert_eq!(
        exact_column(&["expand", "2*cusp", "--loops", "3", "--format", "json"]),
        ["8", "-8/3*pi^2", "88/45*pi^4"]
    );
    // A catalogue name minus its own definition vanishes at every order.
    assert_eq!(
        exact_column(&[
            "expand",
            "octagon - Gamma(0)",
            "--loops",
            "3",
            "--format",
            "json"
        ]),
        ["0", "0", "0"]
    );
    // 3 octagon - cusp: 3*4 - 4 = 8 at one loop; 3*(-16 zeta2) + 8 zeta2 = -40 zeta2 = -20/3 pi^2 at two.
    assert_eq!(
        exact_column(&[
            "expand",
            "3*octagon - cusp",
            "--loops",
            "2",
            "--format",
            "json"
        ]),
        ["8", "-20/3*pi^2"]
    );
    // The same at finite coupling: the formula against its parts, computed apart.
    let value = |q: &str| {
        let (code, out, err) = loopwise(&["at", q, "--g", "0.1", "--format", "json"]);
        assert_eq!(code, 0, "{err}");
        let v = json(&out);
        let first = &v["values"][0];
        first["value"]
            .as_str()
            .map(|s| s.parse::<f64>().unwrap())
            .unwrap_or_else(|| panic!("{v}"))
    };
    let combined = value("3*octagon - cusp");
    let apart = 3.0 * value("octagon") - value("cusp");
    assert!(
        (combined - apart).abs() < 1e-14,
        "{combined} against {apart}"
    );
    // Closed form of the octagon at g = 0.1.
    let closed = 2.0 / std::f64::consts::PI.powi(2) * (0.2 * std::f64::consts::PI).cosh().ln();
    assert!((value("octagon") - closed).abs() < 1e-14);
}

#[test]
fn unknown_names_in_formulas_are_errors_everywhere() {
    for args in [
        vec!["expand", "Gamma(pi/4) + l1", "--loops", "2"],
        vec!["expand", "2*cuspp", "--loops", "2"],
        vec!["at", "cusp + l1", "--g", "0.1"],
        vec!["scan", "cusp - foo", "--g", "0:1:0.5"],
        vec!["radius", "cusp*bar", "--loops", "8"],
    ] {
        let (code, out, err) = loopwise(&args);
        assert_eq!(code, 2, "{args:?}: {out}");
        assert!(err.contains("unknown name"), "{args:?}: {err}");
        assert!(out.is_empty(), "{args:?}: {out}");
    }
    let (_, _, err) = loopwise(&["expand", "2*cuspp", "--loops", "2"]);
    assert!(err.contains("did you mean `cusp`"), "{err}");
    assert!(err.contains("<quantity>:1:3"), "{err}");
}

#[test]
fn a_formula_of_a_conjecture_carries_its_caution() {
    let (code, out, _) = loopwise(&["expand", "2*hexagon", "--loops", "2"]);
    assert_eq!(code, 0);
    assert!(out.contains("CAUTION: conjecture"), "{out}");
    let (_, out, _) = loopwise(&["expand", "2*hexagon", "--loops", "2", "--format", "json"]);
    assert_eq!(json(&out)["status"], "conjecture");
}

#[test]
fn fit_basis_elements_may_use_earlier_ones() {
    let path = write("fit.yaml", "coupling: g2\norders:\n  - loop: 1\n    exact: \"12\"\n  - loop: 2\n    exact: \"-48*zeta(2)\"\n");
    let (code, out, err) = loopwise(&["fit", &path, "--basis", "A=Gamma(0); B=2*A"]);
    assert_eq!(code, 0, "{err}");
    // B = 2 A is not zero (the old reading) but a multiple of A, left out as such.
    assert!(out.contains("left out: B (equal to (2) * A"), "{out}");
    assert!(out.contains("= 3*A"), "{out}");
    let (code, _, err) = loopwise(&["fit", &path, "--basis", "A=Gamma(0); B=2*Z"]);
    assert_eq!(code, 2);
    assert!(err.contains("unknown name `Z`"), "{err}");
}

const CUSP_G2: &str = "  - loop: 1\n    exact: \"4\"\n  - loop: 2\n    exact: \"-8*zeta(2)\"\n  - loop: 3\n    exact: \"88*zeta(4)\"\n";

#[test]
fn hyphenated_catalogue_names_work_as_prediction() {
    // f = 2 Gamma_cusp (hep-th/0610251 writes its expansion for f).
    let f = "  - loop: 1\n    exact: \"8\"\n  - loop: 2\n    exact: \"-16*zeta(2)\"\n";
    let path = write(
        "f.yaml",
        &format!("prediction: scaling-function\ncoupling: g2\norders:\n{f}"),
    );
    let (code, out, err) = loopwise(&["check", &path]);
    assert_eq!(code, 0, "{out}{err}");
    let path = write(
        "half-f.yaml",
        &format!("prediction: \"scaling-function/2\"\ncoupling: g2\norders:\n{CUSP_G2}"),
    );
    let (code, out, err) = loopwise(&["check", &path]);
    assert_eq!(code, 0, "{out}{err}");
    let path = write("combo.yaml", "prediction: \"3*octagon - 2*cusp\"\ncoupling: g2\norders:\n  - loop: 1\n    exact: \"4\"\n");
    let (code, out, err) = loopwise(&["check", &path]);
    assert_eq!(code, 0, "{out}{err}");
    let path = write(
        "typo.yaml",
        "prediction: \"2*cuspp\"\ncoupling: g2\norders:\n  - loop: 1\n    exact: \"8\"\n",
    );
    let (code, _, err) = loopwise(&["check", &path]);
    assert_eq!(code, 2);
    assert!(
        err.contains("typo.yaml:1:16: unknown name `cuspp`"),
        "{err}"
    );
    assert!(err.contains("1 | prediction: \"2*cuspp\""), "{err}");
}

#[test]
fn coupling_inside_a_coefficient_is_refused_with_its_place() {
    let path = write(
        "g.yaml",
        "prediction: cusp\ncoupling: g2\norders:\n  - loop: 1\n    exact: \"4 + 100*g^2\"\n",
    );
    let (code, out, err) = loopwise(&["check", &path]);
    assert_eq!(code, 2, "{out}");
    assert!(
        err.contains("g.yaml:5:21: a loop coefficient cannot contain the coupling `g`"),
        "{err}"
    );
    let path = write(
        "gv.yaml",
        "prediction: cusp\ncoupling: g2\norders:\n  - loop: 1\n    value: \"4.0 + g\"\n",
    );
    let (code, _, err) = loopwise(&["check", &path]);
    assert_eq!(code, 2);
    assert!(err.contains("gv.yaml:5:19:"), "{err}");
}

#[test]
fn uncertainty_notation_is_read_as_written() {
    // 4.0(1.5) is 4.0 ± 1.5, not the product 6.
    let (code, out, _) = loopwise(&["eval", "4.0(1.5)"]);
    assert_eq!(code, 0);
    assert!(
        out.contains("± 1.5") && out.trim_start().starts_with('4'),
        "{out}"
    );
    // The bracket after the exponent: 1.2e-3(1) = 0.0012 ± 0.0001.
    let (code, out, _) = loopwise(&["eval", "1.2e-3(1)"]);
    assert_eq!(code, 0);
    let (value, uncertainty) = out
        .trim()
        .split_once('±')
        .unwrap_or_else(|| panic!("{out}"));
    let value: f64 = value.trim().parse().unwrap();
    let uncertainty: f64 = uncertainty.trim().parse().unwrap();
    assert!(
        (value - 1.2e-3).abs() < 1e-15 && (uncertainty - 1e-4).abs() < 1e-12,
        "{out}"
    );
    // As a loop coefficient: 4.0(1.5) agrees with 4; 9.0(1.5) (3.3 sigma) does not.
    let path = write(
        "u.yaml",
        "prediction: cusp\ncoupling: g2\norders:\n  - loop: 1\n    value: \"4.0(1.5)\"\n",
    );
    assert_eq!(loopwise(&["check", &path]).0, 0);
    let path = write(
        "u2.yaml",
        "prediction: cusp\ncoupling: g2\norders:\n  - loop: 1\n    value: \"9.0(1.5)\"\n",
    );
    assert_eq!(loopwise(&["check", &path]).0, 1);
}

#[test]
fn ambiguous_uncertainty_spacings_are_refused() {
    for (text, column) in [
        ("3.9 (1)", 1),
        ("4(-1)", 1),
        ("4 (-1)", 1),
        ("2*pi + 1.5 (3)", 8),
        ("4(1e-3)", 1),
    ] {
        let (code, out, err) = loopwise(&["eval", text]);
        assert_eq!(code, 2, "{text}: {out}");
        assert!(
            err.contains(&format!("<expression>:1:{column}:")),
            "{text}: {err}"
        );
        assert!(err.contains("for a product write"), "{text}: {err}");
    }
    let path = write(
        "sp.yaml",
        "prediction: cusp\ncoupling: g2\norders:\n  - loop: 1\n    value: \"3.9 (1)\"\n",
    );
    let (code, _, err) = loopwise(&["check", &path]);
    assert_eq!(code, 2);
    assert!(err.contains("sp.yaml:5:13:"), "{err}");
    // A product with a bracket that is not a bare number stays a product.
    let (code, out, _) = loopwise(&["eval", "2 (1 + 1)"]);
    assert_eq!(code, 0);
    assert!(out.starts_with('4'), "{out}");
}

#[test]
fn byte_order_mark_does_not_hide_the_real_error() {
    let path = write(
        "bom.yaml",
        "\u{feff}prediction: cusp\ncoupling: g2\norders:\n  - loop: 1\n    exactt: \"4\"\n",
    );
    let (code, _, err) = loopwise(&["check", &path]);
    assert_eq!(code, 2);
    assert!(
        err.contains("unknown key `exactt`") && err.contains("line 5"),
        "{err}"
    );
    assert!(!err.contains("more than one document"), "{err}");
    let path = write(
        "bom-ok.yaml",
        &format!("\u{feff}prediction: cusp\ncoupling: g2\norders:\n{CUSP_G2}"),
    );
    let (code, out, err) = loopwise(&["check", &path]);
    assert_eq!(code, 0, "{out}{err}");
}

#[test]
fn evaluation_errors_show_the_file_line() {
    let cases = [
        ("    value: \"2.0/(1.0 - 1.0)\"\n", "5:17:", "division by"),
        ("    value: \"log(-2.0)\"\n", "5:17:", "logarithm"),
        (
            "    value: \"2.0^100000000\"\n",
            "5:17:",
            "exponent too large",
        ),
    ];
    for (line, place, words) in cases {
        let text = format!("prediction: cusp\ncoupling: g2\norders:\n  - loop: 1\n{line}");
        let path = write("ev.yaml", &text);
        let (code, _, err) = loopwise(&["check", &path]);
        assert_eq!(code, 2, "{line}");
        assert!(
            err.contains(&format!("ev.yaml:{place}")) && err.contains(words),
            "{line}: {err}"
        );
        // The line shown is the file's own, not the bare expression.
        assert!(
            err.contains(&format!("5 | {}", line.trim_end())),
            "{line}: {err}"
        );
    }
}

#[test]
fn over_deep_yaml_is_refused_quickly() {
    for about in [
        "[".repeat(100_000) + &"]".repeat(100_000),
        "{a: ".repeat(100_000) + "1" + &"}".repeat(100_000),
    ] {
        let path = write(
            "deep.yaml",
            &format!("prediction: cusp\ncoupling: g2\nabout: {about}\norders:\n{CUSP_G2}"),
        );
        let (code, _, err) = loopwise(&["check", &path]);
        assert_eq!(code, 2);
        assert!(
            err.contains("deep.yaml:3:") && err.contains("nested more than 64 deep"),
            "{err}"
        );
    }
    // Brackets inside quoted text are text.
    let path = write(
        "quoted.yaml",
        &format!(
            "prediction: cusp\ncoupling: g2\nabout:\n  note: \"{}\"\norders:\n{CUSP_G2}",
            "[".repeat(200)
        ),
    );
    let (code, out, err) = loopwise(&["check", &path]);
    assert_eq!(code, 0, "{out}{err}");
}

#[test]
fn fortran_and_mathematica_number_marks_get_a_hint() {
    let (code, _, err) = loopwise(&["eval", "1.2d3"]);
    assert_eq!(code, 2);
    assert!(err.contains("Fortran exponent: write `1.2e3`"), "{err}");
    let (code, _, err) = loopwise(&["eval", "-1.5D-04 * pi"]);
    assert_eq!(code, 2);
    assert!(err.contains("write `1.5e-04`"), "{err}");
    let (code, _, err) = loopwise(&["eval", "1.2345`20."]);
    assert_eq!(code, 2);
    assert!(
        err.contains("<expression>:1:7:") && err.contains("precision"),
        "{err}"
    );
}

#[test]
fn fit_reads_names_from_the_users_catalogue() {
    let dir = folder("catalogue");
    std::fs::write(dir.join("mine.yaml"), "name: my-octagon\nsummary: the octagon under another name\ndefinition: Gamma(0)\nstatus: established\n")
        .unwrap();
    let path = write("fitcat.yaml", "coupling: g2\norders:\n  - loop: 1\n    exact: \"12\"\n  - loop: 2\n    exact: \"-48*zeta(2)\"\n");
    let (code, out, err) = loopwise(&[
        "fit",
        &path,
        "--basis",
        "A=2*my-octagon",
        "--catalog",
        dir.to_str().unwrap(),
    ]);
    assert_eq!(code, 0, "{err}");
    assert!(out.contains("= 3/2*A"), "{out}");
    let (code, _, err) = loopwise(&["fit", &path, "--basis", "A=2*my-octagon"]);
    assert_eq!(code, 2);
    assert!(err.contains("unknown name `my`"), "{err}");
}

#[test]
fn functionals_inside_a_coefficient_are_refused_with_their_place() {
    let path = write(
        "fn.yaml",
        "prediction: cusp\ncoupling: g2\norders:\n  - loop: 1\n    exact: \"2*Gamma(pi/4)\"\n",
    );
    let (code, _, err) = loopwise(&["check", &path]);
    assert_eq!(code, 2);
    assert!(
        err.contains("fn.yaml:5:15: a loop coefficient cannot contain Gamma"),
        "{err}"
    );
}

#[test]
fn over_deep_catalogue_files_are_refused_quickly() {
    let dir = folder("deep");
    let deep = "[".repeat(100_000) + &"]".repeat(100_000);
    std::fs::write(
        dir.join("deep.yaml"),
        format!("name: deep\nsummary: {deep}\ndefinition: Gamma(0)\nstatus: established\n"),
    )
    .unwrap();
    let (code, _, err) = loopwise(&["list", "--catalog", dir.to_str().unwrap()]);
    assert_eq!(code, 2);
    assert!(
        err.contains("deep.yaml:2:") && err.contains("nested more than 64 deep"),
        "{err}"
    );
}

#[test]
fn eval_of_a_catalogue_name_says_it_needs_a_coupling() {
    let (code, out, err) = loopwise(&["eval", "2*scaling-function + 1"]);
    assert_eq!(code, 2, "{out}");
    assert!(
        err.contains("<expression>:1:3:") && err.contains("function of the coupling"),
        "{err}"
    );
}
