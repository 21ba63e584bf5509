//! `loopwise identify`: numbers recovered as rational combinations of a
//! basis by PSLQ, refusals when the digits are too few, no relation for a
//! number outside the basis, dependent bases refused, and relations that
//! evaluate back to the value.

mod common;

use common::loopwise;

/// The cusp anomalous dimension in g^2 = lambda/(16 pi^2), loops 1..5: the
/// weak-coupling expansion of hep-th/0610251 (its f(g) is twice this), as
/// `loopwise expand cusp --loops 5` prints it. The decimals were produced
/// with `loopwise eval "EXACT" --digits 60`.
const CUSP: [(u32, &str, &str); 5] = [
    (
        1,
        "4.00000000000000000000000000000000000000000000000000000000000",
        "4",
    ),
    (
        2,
        "-13.1594725347858114917793213331682015137515992096543875018845",
        "-4/3*pi^2",
    ),
    (
        3,
        "95.2444445665801608534083252956227754441780837688479678761019",
        "44/45*pi^4",
    ),
    (
        4,
        "-937.430627848253741875155629018669992911871654253224157746156",
        "-292/315*pi^6 - 32*zeta(3)^2",
    ),
    (
        5,
        "10601.8706457975159964080152183616298073345195364145769930318",
        "14192/14175*pi^8 + 64/3*pi^2*zeta(3)^2 + 640*zeta(3)*zeta(5)",
    ),
];

fn json(args: &[&str]) -> (i32, serde_json::Value, String) {
    let mut all = args.to_vec();
    all.extend(["--format", "json"]);
    let (code, out, err) = loopwise(&all);
    let v = serde_json::from_str(&out).unwrap_or(serde_json::Value::Null);
    (code, v, err)
}

#[test]
fn recovers_the_cusp_coefficients_through_five_loops() {
    for (loops, decimal, exact) in CUSP {
        let weight = (2 * loops - 2).to_string();
        let (code, v, err) = json(&["identify", decimal, "--weight", &weight]);
        assert_eq!(code, 0, "loop {loops}: {err}");
        assert_eq!(v["found"], true, "loop {loops}");
        assert_eq!(v["relation"], exact, "loop {loops}");
        assert_eq!(v["digits_used"], 60, "loop {loops}");
        assert!(v["digits_to_spare"].as_i64().unwrap() >= 8, "loop {loops}");
    }
}

/// Each printed relation, read back by `eval`, gives the decimal it was
/// identified from, digit for digit (the decimals came from `eval`; see CUSP).
#[test]
fn the_printed_relation_evaluates_back_to_the_value() {
    for (loops, decimal, _) in CUSP {
        let weight = (2 * loops - 2).to_string();
        let (_, v, _) = json(&["identify", decimal, "--weight", &weight]);
        let relation = v["relation"].as_str().expect("a relation");
        let (code, out, err) = loopwise(&["eval", relation, "--digits", "60"]);
        assert_eq!(code, 0, "{err}");
        assert_eq!(out.trim(), decimal, "loop {loops}: {relation}");
    }
}

/// The five-loop coefficient (CUSP) to 12 digits against all 15 elements of
/// weights 0..8: 12 digits carry too little information for any relation
/// among 16 numbers, so nothing may be claimed (the rule of
/// src/numeric/pslq.rs: a relation needs its information content in digits
/// plus 8 to spare).
#[test]
fn refuses_to_claim_with_too_few_digits() {
    let (code, v, err) = json(&["identify", "10601.8706458", "--weight", "8", "--with-lower"]);
    assert_eq!(code, 1, "{err}");
    assert_eq!(v["found"], false);
    assert_eq!(v["relation"], serde_json::Value::Null);
    assert_eq!(v["digits_used"], 12);
    assert_eq!(v["basis"].as_array().unwrap().len(), 15);
    let (code, out, _) = loopwise(&["identify", "10601.8706458", "--weight", "8", "--with-lower"]);
    assert_eq!(code, 1);
    assert!(out.contains("no relation found"), "{out}");
    assert!(out.contains("too few to exclude any relation"), "{out}");
}

/// 600/7 to 16 digits against the basis {1}: the relation 7 x - 600 = 0 holds
/// to the digits, but 16 digits leave only one to spare for it, so it is shown
/// as a candidate and not claimed; with 26 digits it is found. (600/7 =
/// 85.714285... repeating, elementary arithmetic.)
#[test]
fn a_relation_too_large_for_the_digits_is_only_a_candidate() {
    let (code, v, _) = json(&["identify", "85.71428571428571", "--basis", "1"]);
    assert_eq!(code, 1);
    assert_eq!(v["found"], false);
    assert_eq!(v["relation"], serde_json::Value::Null);
    assert_eq!(v["candidate"], "85.71428571428571 = 600/7");
    let (_, out, _) = loopwise(&["identify", "85.71428571428571", "--basis", "1"]);
    assert!(
        out.contains("a candidate that the digits cannot confirm"),
        "{out}"
    );
    let (code, v, _) = json(&["identify", "85.714285714285714285714286", "--basis", "1"]);
    assert_eq!(code, 0);
    assert_eq!(v["relation"], "600/7");
}

/// Catalan's constant and ln 2 are not known to be rational combinations of
/// 1 and pi^2 (recalled from memory: none is known, and such a relation with
/// small coefficients would be famous), so at 50 digits there must be no
/// relation, and the bound must exclude all small ones.
#[test]
fn no_relation_for_a_number_outside_the_basis() {
    let catalan = [
        "identify",
        "catalan",
        "--digits",
        "50",
        "--weight",
        "2",
        "--with-lower",
    ];
    let log2 = ["identify", "log(2)", "--digits", "50", "--basis", "1; pi^2"];
    for args in [&catalan[..], &log2[..]] {
        let (code, v, err) = json(args);
        assert_eq!(code, 1, "{args:?}: {err}");
        assert_eq!(v["found"], false);
        assert_eq!(v["relation"], serde_json::Value::Null);
        assert_eq!(v["candidate"], serde_json::Value::Null);
        let bound: f64 = v["bound"].as_str().unwrap().parse().unwrap();
        assert!(bound > 1e10, "{args:?}: bound {bound}");
    }
}

/// zeta(2) = pi^2/6 (the even zeta values, Handbook of Mathematical
/// Functions 23.2.24): a basis holding both is dependent, an error naming
/// both, whatever the value.
#[test]
fn a_dependent_basis_is_refused() {
    let (code, out, err) = loopwise(&[
        "identify",
        "log(2)",
        "--digits",
        "40",
        "--basis",
        "pi^2; zeta(2)",
    ]);
    assert_eq!(code, 2, "{out}");
    assert!(out.is_empty(), "{out}");
    assert!(err.contains("the basis is linearly dependent"), "{err}");
    assert!(err.contains("pi^2 - 6*zeta(2) = 0"), "{err}");
    assert!(err.contains("`pi^2`") && err.contains("`zeta(2)`"), "{err}");
    // The same through the union with a weight basis.
    let value = "1.5000000000000000000000000000000";
    let (code, _, err) = loopwise(&["identify", value, "--weight", "2", "--basis", "zeta(2)"]);
    assert_eq!(code, 2);
    assert!(err.contains("linearly dependent"), "{err}");
}

/// The stuffle product zeta(3) zeta(5) = zeta(3,5) + zeta(5,3) + zeta(8), with
/// zeta(8) = pi^8/9450 (derived here from the series definitions; common
/// practice), identifies zeta(3,5) in the weight-8 basis.
#[test]
fn a_multiple_zeta_value_in_the_weight_basis() {
    let (code, v, err) = json(&["identify", "zeta(3,5)", "--digits", "60", "--weight", "8"]);
    assert_eq!(code, 0, "{err}");
    assert_eq!(v["relation"], "-1/9450*pi^8 + zeta(3)*zeta(5) - zeta(5,3)");
    // In the order of the basis: zeta(3)*zeta(5), pi^2*zeta(3)^2, pi^8, zeta(5,3).
    assert_eq!(
        v["coefficients"],
        serde_json::json!(["1", "0", "-1/9450", "-1"])
    );
}

/// A combination built here from the user's basis comes back in formula text
/// that the language reads (derived here: the value is the expression).
#[test]
fn a_user_basis_outside_the_exact_ring() {
    let (code, v, err) = json(&[
        "identify",
        "3/2*log(2) - catalan/4 + 7",
        "--digits",
        "50",
        "--basis",
        "log(2); catalan; 1",
    ]);
    assert_eq!(code, 0, "{err}");
    assert_eq!(v["relation"], "7 + 3/2*log(2) - 1/4*catalan");
}

#[test]
fn unusable_requests_are_refused_with_exit_2() {
    for (args, says) in [
        (vec!["identify", "pi^2", "--weight", "2"], "--digits"),
        (
            vec!["identify", "1.234567", "--weight", "12"],
            "out of range",
        ),
        (
            vec!["identify", "1.234567", "--digits", "9", "--weight", "2"],
            "7 significant digits",
        ),
        (vec!["identify", "0.000", "--weight", "2"], "zero"),
        (vec!["identify", "1.23(4)", "--weight", "2"], "uncertainty"),
        (vec!["identify", "1.234567", "--weight", "1"], "empty"),
        (vec!["identify", "1.234567", "--basis", "1; 2.5"], "exact"),
        (vec!["identify", "1.234567", "--basis", "1; x"], "no value"),
        (vec!["identify", "1.234567"], "required"),
    ] {
        let (code, out, err) = loopwise(&args);
        assert_eq!(code, 2, "{args:?}: {out}");
        assert!(err.contains(says), "{args:?}: {err}");
    }
}

/// `check --identify` proposes the exact form of every agreeing numerical
/// entry: the cusp's two-, three- and four-loop coefficients (hep-th/0610251;
/// decimals from `loopwise eval ... --digits 30`, and they round-trip), while
/// a differing entry gets no proposal.
#[test]
fn check_proposes_exact_forms_for_agreeing_numbers() {
    let dir = std::env::temp_dir().join(format!("loopwise-check-identify-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let path = dir.join("numbers.yaml");
    std::fs::write(
        &path,
        "# invented numerical run for the test\nprediction: cusp\ncoupling: g2\norders:\n  - loop: 2\n    value: \"-13.1594725347858114917793213331682\"\n  - loop: 3\n    value: \"95.244444566580160853408325295623\"\n  - loop: 4\n    value: \"-937.430627848253741875155629019\"\n  - loop: 5\n    value: \"10601.8\"\n",
    )
    .unwrap();
    let (code, out, err) = loopwise(&[
        "check",
        path.to_str().unwrap(),
        "--identify",
        "--format",
        "json",
    ]);
    assert_eq!(code, 1, "{err}");
    let v: serde_json::Value = serde_json::from_str(&out).unwrap();
    let ids = v["identified"].as_array().unwrap();
    let relations: Vec<(u64, &str)> = ids
        .iter()
        .map(|p| (p["loop"].as_u64().unwrap(), p["relation"].as_str().unwrap()))
        .collect();
    assert_eq!(
        relations,
        [
            (2, "-4/3*pi^2"),
            (3, "44/45*pi^4"),
            (4, "-292/315*pi^6 - 32*zeta(3)^2")
        ]
    );
    let (code, out, _) = loopwise(&["check", path.to_str().unwrap(), "--identify"]);
    assert_eq!(code, 1);
    assert!(out.contains("numerical identification"), "{out}");
    let (_, plain, _) = loopwise(&["check", path.to_str().unwrap(), "--format", "json"]);
    assert!(!plain.contains("identified"), "{plain}");
    std::fs::remove_dir_all(&dir).unwrap();
}
