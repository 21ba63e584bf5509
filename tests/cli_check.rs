//! `loopwise check`, `eval` and `demo` run as a user runs them: every verdict,
//! every diagnosis, the exit codes and the JSON shape, on files written here.
//! Reference coefficients: the cusp anomalous dimension of hep-th/0610251
//! (f = 2 Gamma_cusp there; in our normalisation Gamma_cusp =
//! 4g^2 - 8 zeta2 g^4 + 88 zeta4 g^6 - (876 zeta6 + 32 zeta3^2) g^8
//! + (14192/14175 pi^8 + 64/3 pi^2 zeta3^2 + 640 zeta3 zeta5) g^10).

use std::path::PathBuf;
mod common;

use common::{diagnoses, loopwise, loopwise_with_stdin};

fn write(name: &str, text: &str) -> PathBuf {
    let dir = std::env::temp_dir().join(format!("loopwise-check-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let path = dir.join(name);
    std::fs::write(&path, text).unwrap();
    path
}

fn check_json(name: &str, text: &str) -> (i32, serde_json::Value) {
    let path = write(name, text);
    let (code, out, err) = loopwise(&["check", path.to_str().unwrap(), "--format", "json"]);
    assert!(code == 0 || code == 1, "{err}");
    (
        code,
        serde_json::from_str(&out).unwrap_or_else(|e| panic!("{e}: {out}")),
    )
}

const FOUR: &str = "-876*zeta(6) - 32*zeta(3)^2";
const FIVE: &str = "14192/14175*pi^8 + 64/3*pi^2*zeta(3)^2 + 640*zeta(3)*zeta(5)";

fn cusp_file(coupling: &str, orders: &[(u32, &str, &str)]) -> String {
    let mut s = format!("prediction: cusp\ncoupling: {coupling}\norders:\n");
    for (l, key, v) in orders {
        s.push_str(&format!("  - loop: {l}\n    {key}: \"{v}\"\n"));
    }
    s
}

/// The exact four- and five-loop coefficients of hep-th/0610251 agree exactly.
#[test]
fn published_cusp_coefficients_agree_exactly() {
    let text = cusp_file(
        "g2",
        &[
            (1, "exact", "4"),
            (2, "exact", "-8 zeta(2)"),
            (3, "exact", "88 zeta(4)"),
            (4, "exact", FOUR),
            (5, "exact", FIVE),
        ],
    );
    let (code, v) = check_json("published.yaml", &text);
    assert_eq!(code, 0);
    assert_eq!(v["agrees"], true);
    for k in 0..5 {
        assert_eq!(v["orders"][k]["verdict"], "agrees-exactly");
    }
    assert_eq!(v["summary"], "orders 1-5 agree");
}

/// The four-loop coefficient as a numerical computation reports it: the
/// value -937.43062784825374188 (from the exact form above, evaluated with
/// MPFR in `expand`) written as -937.4306(2).
#[test]
fn decimal_with_uncertainty_agrees_numerically() {
    let text = cusp_file("g2", &[(4, "value", "-937.4306(2)")]);
    let (code, v) = check_json("numerical.yaml", &text);
    assert_eq!(code, 0);
    let o = &v["orders"][3];
    assert_eq!(o["verdict"], "agrees-numerically");
    assert_eq!(o["digits_agreeing"], 7);
    assert_eq!(v["orders"][0]["verdict"], "not-supplied");
    // The same number off by about 10 sigma differs, in units of the uncertainty.
    let (code, v) = check_json(
        "numerical-off.yaml",
        &cusp_file("g2", &[(4, "value", "-937.4286(2)")]),
    );
    assert_eq!(code, 1);
    let o = &v["orders"][3];
    assert_eq!(o["verdict"], "differs-numerically");
    let sigmas: f64 = o["sigmas"].as_str().unwrap().parse().unwrap();
    // (-937.4286 - -937.43062784825...) / 0.0002 = 10.139...
    assert!((sigmas - 10.14).abs() < 0.01, "{sigmas}");
}

/// A deliberately wrong five-loop value (620 instead of 640 zeta3 zeta5)
/// differs with exactly the right difference, and the diagnosis points at it.
#[test]
fn wrong_value_differs_with_the_exact_difference() {
    let wrong = FIVE.replace("640", "620");
    let text = cusp_file(
        "g2",
        &[
            (1, "exact", "4"),
            (2, "exact", "-4/3 pi^2"),
            (3, "exact", "88 zeta(4)"),
            (4, "exact", FOUR),
            (5, "exact", &wrong),
        ],
    );
    let (code, v) = check_json("wrong.yaml", &text);
    assert_eq!(code, 1);
    let o = &v["orders"][4];
    assert_eq!(o["verdict"], "differs-exactly");
    assert_eq!(o["difference"], "-20*zeta(3)*zeta(5)");
    assert_eq!(v["summary"], "orders 1-4 agree, order 5 differs");
    let d = v["diagnoses"][0].as_str().unwrap();
    assert!(
        d.contains("order 5") && d.contains("other 4 orders agree"),
        "{d}"
    );
}

/// Coefficients in a = 2 g^2 (c_L / 2^L, docs/conventions.md section 1) but declared
/// as g2 are recognised; declared as a, they agree.
#[test]
fn convention_a_is_recognised() {
    let a_orders = [
        (1, "exact", "2"),
        (2, "exact", "-2 zeta(2)"),
        (3, "exact", "11 zeta(4)"),
        (4, "exact", "-219/4 zeta(6) - 2 zeta(3)^2"),
    ];
    let (code, v) = check_json("a-declared-g2.yaml", &cusp_file("g2", &a_orders));
    assert_eq!(code, 1);
    let d: Vec<&str> = v["diagnoses"]
        .as_array()
        .unwrap()
        .iter()
        .map(|d| d.as_str().unwrap())
        .collect();
    assert!(
        d.iter()
            .any(|d| d.contains("convention a") && d.contains("`coupling: g2`")),
        "{d:?}"
    );
    assert_eq!(
        d.len(),
        1,
        "only the explanation that fits every order: {d:?}"
    );
    let (code, v) = check_json("a-declared-a.yaml", &cusp_file("a", &a_orders));
    assert_eq!(code, 0, "{v}");
}

#[test]
fn scaling_function_sign_and_shift_slips_are_recognised() {
    let twice = [
        (1, "exact", "8"),
        (2, "exact", "-16 zeta(2)"),
        (3, "exact", "176 zeta(4)"),
    ];
    let (_, v) = check_json("twice.yaml", &cusp_file("g2", &twice));
    assert!(diagnoses(&v)[0].contains("scaling function"), "{v}");
    let minus = [
        (1, "exact", "-4"),
        (2, "exact", "8 zeta(2)"),
        (3, "exact", "-88 zeta(4)"),
    ];
    let (_, v) = check_json("minus.yaml", &cusp_file("g2", &minus));
    assert!(diagnoses(&v)[0].contains("opposite sign"), "{v}");
    let shifted = [
        (1, "exact", "-8 zeta(2)"),
        (2, "exact", "88 zeta(4)"),
        (3, "exact", FOUR),
    ];
    let (_, v) = check_json("shifted.yaml", &cusp_file("g2", &shifted));
    assert!(diagnoses(&v)[0].contains("shifted by one"), "{v}");
}

/// Item 9 of issue 8: a file with one supplied order still gets the slip
/// that makes it agree, and the diagnosis says it rests on that one order.
/// The four-loop cusp coefficient (hep-th/0610251, header) in a = 2 g^2 is
/// c_4 / 2^4 (README conventions); with its sign flipped it is -c_4.
#[test]
fn single_order_slip_is_diagnosed_and_says_it_rests_on_one_order() {
    let in_a = format!("({FOUR})/16");
    let (code, v) = check_json("one-order-a.yaml", &cusp_file("g2", &[(4, "exact", &in_a)]));
    assert_eq!(code, 1);
    let d = diagnoses(&v);
    assert_eq!(d.len(), 1, "{d:?}");
    assert!(
        d[0].contains("convention a") && d[0].contains("rests on one supplied order"),
        "{d:?}"
    );
    let flipped = format!("-({FOUR})");
    let (code, v) = check_json(
        "one-order-sign.yaml",
        &cusp_file("g2", &[(4, "exact", &flipped)]),
    );
    assert_eq!(code, 1);
    let d = diagnoses(&v);
    assert_eq!(d.len(), 1, "{d:?}");
    assert!(
        d[0].contains("opposite sign") && d[0].contains("rests on one supplied order"),
        "{d:?}"
    );
    // A number known to its written digits: -937.43062784825 / 16 = -58.589414240516 (by hand).
    let (_, v) = check_json(
        "one-order-a-value.yaml",
        &cusp_file("g2", &[(4, "value", "-58.5894142405(1)")]),
    );
    assert!(
        diagnoses(&v).iter().any(|d| d.contains("convention a")),
        "{v}"
    );
    // Nothing is claimed when no slip makes the order agree.
    let (code, v) = check_json(
        "one-order-wrong.yaml",
        &cusp_file("g2", &[(4, "exact", "-877*zeta(6) - 32*zeta(3)^2")]),
    );
    assert_eq!(code, 1);
    assert!(
        diagnoses(&v)
            .iter()
            .all(|d| !d.contains("convention") && !d.contains("sign")),
        "{v}"
    );
    // With two orders the caveat is not printed.
    let (_, v) = check_json(
        "two-orders-a.yaml",
        &cusp_file("g2", &[(1, "exact", "2"), (4, "exact", &in_a)]),
    );
    let d = diagnoses(&v);
    assert!(
        d.iter().any(|d| d.contains("convention a")) && d.iter().all(|d| !d.contains("rests on")),
        "{d:?}"
    );
}

/// Item 17 of issue 8: coefficients in g^2 declared as lambda are explained
/// by the convention alone, without one weight line per order; a real weight
/// slip in a lambda file is counted on the coefficient of g^(2L), where the
/// cusp has uniform weight 2L - 2 (hep-th/0610251), not as "weight -2".
#[test]
fn lambda_convention_diagnosis_has_no_weight_noise() {
    let g2_orders = [
        (1, "exact", "4"),
        (2, "exact", "-8 zeta(2)"),
        (3, "exact", "88 zeta(4)"),
    ];
    let (code, v) = check_json("g2-declared-lambda.yaml", &cusp_file("lambda", &g2_orders));
    assert_eq!(code, 1);
    let d = diagnoses(&v);
    assert_eq!(d.len(), 1, "{d:?}");
    assert!(
        d[0].contains("convention g2") && d[0].contains("`coupling: lambda`"),
        "{d:?}"
    );
    let lambda_orders = [
        (1, "exact", "4/(16 pi^2)"),
        (2, "exact", "-8 zeta(2)/(16 pi^2)^2"),
        (3, "exact", "(88 zeta(4) + zeta(3))/(16 pi^2)^3"),
    ];
    let (_, v) = check_json("lambda-weight.yaml", &cusp_file("lambda", &lambda_orders));
    let d = diagnoses(&v);
    assert!(
        d.iter().any(|d| d
            .contains("order 3 mixes transcendental weights 3, 4; the prediction has weight 4")),
        "{d:?}"
    );
    assert!(d.iter().all(|d| !d.contains("weight -2")), "{d:?}");
}

/// A coefficient of the wrong transcendental weight is named (docs/conventions.md
/// section 1: uniform weight 2L - 2).
#[test]
fn non_uniform_weight_is_reported() {
    let text = cusp_file(
        "g2",
        &[
            (1, "exact", "4"),
            (2, "exact", "-8 zeta(2)"),
            (3, "exact", "88 zeta(4) + zeta(3)"),
        ],
    );
    let (code, v) = check_json("weight.yaml", &text);
    assert_eq!(code, 1);
    let d: Vec<&str> = v["diagnoses"]
        .as_array()
        .unwrap()
        .iter()
        .map(|d| d.as_str().unwrap())
        .collect();
    assert!(
        d.iter()
            .any(|d| d.contains("mixes transcendental weights 3, 4")),
        "{d:?}"
    );
}

#[test]
fn numbers_without_stated_uncertainty_use_the_written_digits() {
    // -13.1594725347858 is zeta-exact to all 15 written digits; -13.15947 rounds
    // correctly; -13.15948 is outside half a unit of its last digit.
    for (value, verdict) in [
        ("-13.1594725347858", "agrees-numerically"),
        ("-13.15947", "agrees-numerically"),
        ("-13.15948", "differs-numerically"),
    ] {
        let (_, v) = check_json("digits.yaml", &cusp_file("g2", &[(2, "value", value)]));
        assert_eq!(v["orders"][1]["verdict"], verdict, "{value}");
    }
}

#[test]
fn exact_and_value_must_agree_with_each_other() {
    let text = "prediction: cusp\ncoupling: g2\norders:\n  - loop: 2\n    exact: \"-8 zeta(2)\"\n    value: \"-13.5(1)\"\n";
    let (code, v) = check_json("both-inconsistent.yaml", text);
    assert_eq!(code, 1);
    assert_eq!(v["orders"][1]["inconsistent_value"], "differs-numerically");
}

/// Item 16 of issue 8: the row of an entry whose `value` disagrees with its
/// own `exact` gives the size of the gap. -8 zeta(2) = -13.159472534785811
/// (A&S 23.2.24), so -13.5(1) is 0.3405 = 3.41 of its stated 0.1 away.
#[test]
fn value_disagreeing_with_its_own_exact_shows_the_size() {
    let text = "prediction: cusp\ncoupling: g2\norders:\n  - loop: 2\n    exact: \"-8 zeta(2)\"\n    value: \"-13.5(1)\"\n";
    let path = write("gap.yaml", text);
    let (code, out, _) = loopwise(&["check", path.to_str().unwrap()]);
    assert_eq!(code, 1);
    let row = out
        .lines()
        .find(|l| l.trim_start().starts_with("2 "))
        .unwrap();
    assert!(
        row.contains("DIFF") && row.contains("value -13.5(1) disagrees with its exact"),
        "{row}"
    );
    assert!(
        row.contains("value - exact = -0.340527 = 3.41 sigma"),
        "{row}"
    );
    assert!(!row.contains(" ; "), "{row}");
    let (_, v) = check_json("gap.yaml", text);
    let gap = &v["orders"][1]["inconsistency"];
    let d: f64 = gap["difference_value"].as_str().unwrap().parse().unwrap();
    assert!((d + 0.340527465214).abs() < 1e-9, "{gap}");
    assert_eq!(gap["sigmas"], "3.405");
}

/// Item 15 of issue 8: without a stated uncertainty the yardstick is the
/// rounding bound of the written digits, and the report says so instead of
/// "sigma"; a stated uncertainty keeps "sigma". -8 zeta(2) =
/// -13.159472534785811 (A&S 23.2.24): -13.15948 is 7.465e-6 off, 1.49 of
/// its bound 5e-6 (differs); -13.159 is 0.95 of 5e-4 (agrees).
#[test]
fn implied_uncertainty_is_worded_as_a_rounding_bound_not_sigma() {
    let path = write(
        "bound-differs.yaml",
        &cusp_file("g2", &[(2, "value", "-13.15948")]),
    );
    let (code, out, _) = loopwise(&["check", path.to_str().unwrap()]);
    assert_eq!(code, 1);
    let row = out
        .lines()
        .find(|l| l.trim_start().starts_with("2 "))
        .unwrap();
    assert!(
        row.contains("= 1.49 times the rounding bound of the written digits")
            && !row.contains("sigma"),
        "{row}"
    );
    let (_, v) = check_json(
        "bound-differs.yaml",
        &cusp_file("g2", &[(2, "value", "-13.15948")]),
    );
    assert_eq!(v["orders"][1]["rounding_bounds"], "1.493");
    assert!(v["orders"][1].get("sigmas").is_none(), "{v}");
    let path = write(
        "bound-agrees.yaml",
        &cusp_file("g2", &[(2, "value", "-13.159")]),
    );
    let (code, out, _) = loopwise(&["check", path.to_str().unwrap()]);
    assert_eq!(code, 0);
    assert!(
        out.contains("supplied -13.159, 0.95 times the rounding bound of the written digits"),
        "{out}"
    );
    // A stated uncertainty is a standard deviation: 1.7 sigma agrees and says so.
    let (code, v) = check_json(
        "stated.yaml",
        &cusp_file("g2", &[(2, "value", "-13.15949(1)")]),
    );
    assert_eq!(code, 0);
    assert_eq!(v["orders"][1]["sigmas"], "1.747");
    assert!(v["orders"][1].get("rounding_bounds").is_none(), "{v}");
}

#[test]
fn formula_predictions_and_not_predicted_orders() {
    let text = "prediction: \"Gamma(pi/4) - 4 g^2\"\ncoupling: g2\norders:\n  - loop: 1\n    exact: \"0\"\n  - loop: 2\n    exact: \"-8 zeta(2)\"\n  - loop: 51\n    value: \"1.0\"\n";
    let (code, v) = check_json("formula.yaml", text);
    // Loop 51 is beyond the engine: not compared, so not a pass (issue 8, item 8).
    assert_eq!(code, 1, "{v}");
    assert_eq!(v["agrees"], false);
    assert_eq!(v["orders"][50]["verdict"], "not-predicted");
    assert_eq!(v["orders"][10]["verdict"], "not-supplied");
    assert_eq!(v["orders"][1]["verdict"], "agrees-exactly");
}

/// Item 8 of issue 8: a file whose only order is beyond the 50 loops the
/// engine reaches is not called agreement: exit 1, `agrees: false`, and the
/// order is listed as not compared in JSON and text.
#[test]
fn orders_beyond_the_engine_are_not_compared_and_not_a_pass() {
    let text = "prediction: cusp\ncoupling: g2\norders:\n  - loop: 51\n    value: \"1.0\"\n";
    let (code, v) = check_json("loop51.yaml", text);
    assert_eq!(code, 1, "{v}");
    assert_eq!(v["agrees"], false);
    assert_eq!(v["not_compared"], serde_json::json!([51]));
    assert_eq!(
        v["summary"],
        "orders 1-50 not supplied, order 51 not compared"
    );
    let path = write("loop51.yaml", text);
    let (code, out, _) = loopwise(&["check", path.to_str().unwrap()]);
    assert_eq!(code, 1);
    assert!(
        out.contains("not compared: order 51 is beyond the 50 loops"),
        "{out}"
    );
    // Agreeing orders next to uncompared ones: still not a pass, and only the uncompared are listed.
    let text = "prediction: cusp\ncoupling: g2\norders:\n  - loop: 1\n    exact: \"4\"\n  - loop: 52\n    value: \"1.0\"\n  - loop: 53\n    value: \"2.0\"\n";
    let (code, v) = check_json("loop53.yaml", text);
    assert_eq!(code, 1, "{v}");
    assert_eq!(v["not_compared"], serde_json::json!([52, 53]));
    assert_eq!(v["orders"][0]["verdict"], "agrees-exactly");
    // Everything compared and agreeing: an empty list and a pass.
    let (code, v) = check_json("loop1.yaml", &cusp_file("g2", &[(1, "exact", "4")]));
    assert_eq!(code, 0);
    assert_eq!(v["not_compared"], serde_json::json!([]));
}

#[test]
fn text_report_has_marks_and_summary() {
    let path = write(
        "text.yaml",
        &cusp_file("g2", &[(1, "exact", "4"), (2, "exact", "-8 zeta(3)")]),
    );
    let (code, out, _) = loopwise(&["check", path.to_str().unwrap()]);
    assert_eq!(code, 1);
    assert!(
        out.contains("DIFF") && out.contains("summary: order 1 agrees, order 2 differs"),
        "{out}"
    );
}

#[test]
fn unreadable_input_exits_two_with_file_line_and_column() {
    let path = write(
        "broken.yaml",
        "prediction: cusp\ncoupling: g2\norders:\n  - loop: 2\n    exact: \"-8 zeta(2\"\n",
    );
    let (code, out, err) = loopwise(&["check", path.to_str().unwrap()]);
    assert_eq!(code, 2);
    assert!(out.is_empty());
    assert!(err.contains("broken.yaml:5:"), "{err}");
    let path = write(
        "unknown.yaml",
        "prediction: cusp\ncoupling: g2\norders:\n  - loop: 1\n    exat: \"4\"\n",
    );
    let (code, _, err) = loopwise(&["check", path.to_str().unwrap()]);
    assert_eq!(code, 2);
    assert!(err.contains("did you mean `exact`"), "{err}");
    let (code, _, err) = loopwise(&["check", "/nonexistent/file.yaml"]);
    assert_eq!(code, 2);
    assert!(err.contains("/nonexistent/file.yaml"), "{err}");
    let path = write(
        "noprediction.yaml",
        "coupling: g2\norders:\n  - loop: 1\n    exact: \"4\"\n",
    );
    let (code, _, err) = loopwise(&["check", path.to_str().unwrap()]);
    assert_eq!(code, 2);
    assert!(err.contains("names no `prediction`"), "{err}");
}

#[test]
fn several_files_give_a_json_array_and_the_worst_exit_code() {
    let good = write("good.yaml", &cusp_file("g2", &[(1, "exact", "4")]));
    let bad = write("bad.yaml", &cusp_file("g2", &[(1, "exact", "5")]));
    let (code, out, _) = loopwise(&[
        "check",
        good.to_str().unwrap(),
        bad.to_str().unwrap(),
        "--format",
        "json",
    ]);
    assert_eq!(code, 1);
    let v: serde_json::Value = serde_json::from_str(&out).unwrap();
    assert_eq!(v.as_array().unwrap().len(), 2);
}

/// Item 7 of issue 8: an unusable file among several is one entry of the
/// report (text, JSON and YAML), the others are still checked, and the exit
/// code is 2 because one input could not be used.
#[test]
fn unreadable_file_among_many_is_reported_and_exits_2() {
    let good = write("many-good.yaml", &cusp_file("g2", &[(1, "exact", "4")]));
    let bad = write(
        "many-bad.yaml",
        "prediction: cusp\ncoupling: g2\norders:\n  - loop: 1\n    exat: \"4\"\n",
    );
    let slip = write(
        "many-slip.yaml",
        &cusp_file("g2", &[(1, "exact", "2"), (2, "exact", "-2 zeta(2)")]),
    );
    let paths = [
        good.to_str().unwrap(),
        bad.to_str().unwrap(),
        slip.to_str().unwrap(),
    ];
    let (code, out, err) = loopwise(&["check", paths[0], paths[1], paths[2]]);
    assert_eq!(code, 2, "{out}");
    assert!(
        err.contains("many-bad.yaml") && err.contains("did you mean `exact`"),
        "{err}"
    );
    assert!(
        out.contains("many-good.yaml: checked against")
            && out.contains("many-slip.yaml: checked against"),
        "{out}"
    );
    assert!(
        out.contains("many-bad.yaml: not checked") && out.contains("line 5 column 5"),
        "{out}"
    );
    assert!(
        out.contains("convention a"),
        "the file after the bad one is diagnosed: {out}"
    );

    let (code, out, _) = loopwise(&["check", paths[0], paths[1], paths[2], "--format", "json"]);
    assert_eq!(code, 2);
    let v: serde_json::Value = serde_json::from_str(&out).unwrap_or_else(|e| panic!("{e}: {out}"));
    let entries = v.as_array().unwrap();
    assert_eq!(entries.len(), 3);
    assert_eq!(entries[0]["agrees"], true);
    assert_eq!(entries[1]["agrees"], false);
    assert!(entries[1]["file"]
        .as_str()
        .unwrap()
        .ends_with("many-bad.yaml"));
    assert!(
        entries[1]["error"]
            .as_str()
            .unwrap()
            .contains("unknown key `exat`"),
        "{v}"
    );
    assert_eq!(entries[2]["orders"][0]["verdict"], "differs-exactly");

    let (code, out, _) = loopwise(&["check", paths[0], paths[1], "--format", "yaml"]);
    assert_eq!(code, 2);
    let docs: Vec<&str> = out
        .split("---\n")
        .filter(|d| !d.trim().is_empty())
        .collect();
    assert_eq!(docs.len(), 2, "{out}");
    assert!(
        docs[1].contains("agrees: false") && docs[1].contains("error:"),
        "{out}"
    );
    // A missing file among good ones is an entry too.
    let (code, out, _) = loopwise(&[
        "check",
        paths[0],
        "/nonexistent/many.yaml",
        "--format",
        "json",
    ]);
    assert_eq!(code, 2);
    let v: serde_json::Value = serde_json::from_str(&out).unwrap();
    assert_eq!(v[1]["file"], "/nonexistent/many.yaml");
}

/// Item 19 of issue 8 (part): `-` reads the series file from standard
/// input, named `<stdin>` in messages and reports.
#[test]
fn dash_reads_the_series_file_from_standard_input() {
    let (code, out, err) = loopwise_with_stdin(
        &["check", "-", "--format", "json"],
        &cusp_file("g2", &[(1, "exact", "4"), (2, "exact", "-8 zeta(2)")]),
    );
    assert_eq!(code, 0, "{err}");
    let v: serde_json::Value = serde_json::from_str(&out).unwrap();
    assert_eq!(v["file"], "<stdin>");
    assert_eq!(v["summary"], "orders 1-2 agree");
    let (code, _, err) = loopwise_with_stdin(
        &["check", "-"],
        "prediction: cusp\ncoupling: g2\norders:\n  - loop: 1\n    exact: \"4 +\"\n",
    );
    assert_eq!(code, 2);
    assert!(err.contains("<stdin>:5:"), "{err}");
    let (code, _, err) = loopwise_with_stdin(&["check", "-", "-"], "");
    assert_eq!(code, 2);
    assert!(err.contains("more than once"), "{err}");
}

/// The demo finds its planted mistake (five loops) and the numerical order.
#[test]
fn demo_finds_the_planted_mistake() {
    let (code, out, _) = loopwise(&["demo"]);
    assert_eq!(code, 0);
    assert!(out.contains("fictional"), "{out}");
    assert!(out.contains("order 5 looks like a slip"), "{out}");
    assert!(
        out.contains("summary: orders 1-4 agree, order 5 differs, orders 6-7 agree"),
        "{out}"
    );
    assert!(out.contains("agrees to 9 digits"), "{out}");
}

/// zeta(2) = pi^2/6 (A&S 23.2.24) to the digits asked.
#[test]
fn eval_prints_one_value() {
    let (code, out, _) = loopwise(&["eval", "pi^2/6 - zeta(2) + 1", "--digits", "40"]);
    assert_eq!(code, 0);
    assert_eq!(out.trim(), "1.000000000000000000000000000000000000000");
    let (code, out, _) = loopwise(&["eval", "-1240.9(2)*2"]);
    assert_eq!(code, 0);
    assert!(out.contains("± 0.40"), "{out}");
    let (code, _, err) = loopwise(&["eval", "zeta(1)"]);
    assert_eq!(code, 2);
    assert!(err.contains("1:"), "{err}");
}

/// A coefficient written with a multiple zeta value, zeta(2,1) = zeta(3)
/// (Euler's identity), is outside the exact ring and checks numerically at
/// the working precision; with --digits 200 all 200 digits agree.
#[test]
fn multiple_zeta_values_check_numerically() {
    let text = cusp_file("g2", &[(4, "exact", "-876 zeta(6) - 32 zeta(2,1)^2")]);
    let path = write("mzv.yaml", &text);
    let (code, out, err) = loopwise(&[
        "check",
        path.to_str().unwrap(),
        "--format",
        "json",
        "--digits",
        "200",
    ]);
    assert_eq!(code, 0, "{err}");
    let v: serde_json::Value = serde_json::from_str(&out).unwrap();
    assert_eq!(v["orders"][3]["verdict"], "agrees-numerically");
    assert_eq!(v["orders"][3]["digits_agreeing"], 200);
    // zeta(3,1) = pi^4/360 (docs/conventions.md section 7): the difference is zero, not noise.
    let (code, out, _) = loopwise(&["eval", "zeta(3,1) - pi^4/360", "--digits", "30"]);
    assert_eq!(code, 0);
    assert!(out.starts_with("0 (zero to within"), "{out}");
    // zeta(5,3) = 0.0377076729848475... (docs/conventions.md section 7, from memory; the mzv
    // module checks it against two independent algorithms).
    let (_, out, _) = loopwise(&["eval", "zeta(5,3)", "--digits", "15"]);
    assert_eq!(out.trim(), "0.0377076729848475");
}

/// Reference coefficients from `expand` can be pasted back whatever their
/// length: the 30-loop cusp coefficient has 4,637 terms.
#[test]
fn long_pasted_coefficients_check() {
    let (code, out, _) = loopwise(&["expand", "cusp", "--loops", "30", "--format", "json"]);
    assert_eq!(code, 0);
    let v: serde_json::Value = serde_json::from_str(&out).unwrap();
    let thirty = v["orders"][29]["exact"].as_str().unwrap();
    assert!(thirty.matches(" + ").count() + thirty.matches(" - ").count() > 4000);
    let (code, v) = check_json(
        "thirty.yaml",
        &cusp_file(
            "g2",
            &[
                (29, "exact", v["orders"][28]["exact"].as_str().unwrap()),
                (30, "exact", thirty),
            ],
        ),
    );
    assert_eq!(code, 0, "{v}");
    assert_eq!(v["orders"][29]["verdict"], "agrees-exactly");
}
