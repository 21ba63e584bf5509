//! Series files from the outside: a full valid file, and each kind of
//! mistake with the file, line and column its message must name.

use loopwise::error::ErrorKind;
use loopwise::exact::coupling::Coupling;
use loopwise::input::catalogue::Catalogue;
use loopwise::input::expr::{parse, Node};
use loopwise::input::seriesfile::{parse_series_text, read_series_file, Normalisation};
use loopwise::quantity::Quantity;
use rug::Rational;

const FULL: &str = r#"# A series file: loop coefficients of one quantity, in one coupling convention.
prediction: "-zeta(2)/2*Gamma(pi/4) + Delta(0)/4"
coupling: g2
normalisation: E
symbols: [l1, l2, l3]
about:
  group: Fictional Bootstrap Collective
  code: hexbootstrap 0.3
  date: 2026-11-30
  version: 0.30   # a number, kept as written
  nested:
    machine: two cores
orders:
  - loop: 1
    exact: "4"
  - loop: 4
    exact: "-876*zeta(6) - 32*zeta(3)^2"
    label: "from the four-loop run"
  - loop: 5
    value: "-1240.9(2)"
  - loop: 6
    exact: 2 l1 l2 + 3*l3
    value: 0.1000000000000000000001
  - loop: 7
    value: -1240.9
    uncertainty: 0.2
  - {loop: 8, exact: 'ζ(3) l1'}
"#;

fn err(text: &str) -> loopwise::Error {
    match parse_series_text(text, "runs/cusp.yaml") {
        Ok(f) => panic!("should be rejected:\n{text}\ngave {f:?}"),
        Err(e) => e,
    }
}

#[test]
fn a_full_file_reads_back_everything() {
    let f = parse_series_text(FULL, "runs/cusp.yaml").unwrap();
    assert_eq!(f.origin, "runs/cusp.yaml");
    assert_eq!(f.coupling, Coupling::G2);
    assert_eq!(f.normalisation, Some(Normalisation::E));
    assert_eq!(f.symbols, ["l1", "l2", "l3"]);
    let pred = f.prediction.as_ref().unwrap();
    assert_eq!(
        pred.expr,
        parse("-zeta(2)/2*Gamma(pi/4) + Delta(0)/4", "t", None).unwrap()
    );
    assert_eq!((pred.line, pred.column), (2, 14));
    assert_eq!(f.catalogue_name(), None);
    let about: Vec<(&str, &str)> = f
        .about
        .iter()
        .map(|(k, v)| (k.as_str(), v.as_str()))
        .collect();
    assert_eq!(
        about,
        [
            ("group", "Fictional Bootstrap Collective"),
            ("code", "hexbootstrap 0.3"),
            ("date", "2026-11-30"),
            ("version", "0.30"),
            ("nested.machine", "two cores")
        ]
    );
    let loops: Vec<u32> = f.orders.iter().map(|o| o.loop_order).collect();
    assert_eq!(loops, [1, 4, 5, 6, 7, 8]);
    let o = &f.orders[1];
    assert_eq!(o.label.as_deref(), Some("from the four-loop run"));
    assert_eq!(o.line, 16);
    let exact = o.exact.as_ref().unwrap();
    assert_eq!((exact.line, exact.column), (17, 13));
    assert_eq!(exact.text, "-876*zeta(6) - 32*zeta(3)^2");
    // Unquoted numbers keep every written digit.
    let v = f.orders[3].value.as_ref().unwrap();
    assert_eq!(v.text, "0.1000000000000000000001");
    assert_eq!((v.line, v.column), (23, 12));
    match &v.expr.node {
        Node::Decimal { value, .. } => {
            assert_eq!(
                *value,
                "1000000000000000000001/10000000000000000000000"
                    .parse::<Rational>()
                    .unwrap()
            )
        }
        other => panic!("{other:?}"),
    }
    // A separate uncertainty joins the value.
    let v = f.orders[4].value.as_ref().unwrap();
    assert_eq!(v.text, "-1240.9 ± 0.2");
    assert_eq!(v.expr, parse("-1240.9 ± 0.2", "t", None).unwrap());
    let v = f.orders[2].value.as_ref().unwrap();
    assert_eq!(v.expr, parse("-1240.9(2)", "t", None).unwrap());
    let e = f.orders[5].exact.as_ref().unwrap();
    assert_eq!(e.expr, parse("zeta(3)*l1", "t", None).unwrap());
    assert_eq!((e.line, e.column), (27, 23));
}

#[test]
fn catalogue_names_are_bare_names() {
    let f = parse_series_text(
        "prediction: cusp\ncoupling: lambda\norders:\n  - loop: 1\n    exact: 1\n",
        "f.yaml",
    )
    .unwrap();
    assert_eq!(f.catalogue_name(), Some("cusp"));
    assert_eq!(f.coupling, Coupling::Lambda);
}

#[test]
fn unknown_keys_are_located_and_get_a_suggestion() {
    let text =
        "coupling: g2\norders:\n  - loop: 1\n    exact: \"4\"\n  - loop: 2\n    exat: \"-4\"\n";
    let e = err(text);
    assert_eq!(
        e.message(),
        "unknown key `exat` at line 6 column 5 of runs/cusp.yaml; did you mean `exact`?"
    );
    let e = err("coupling: g2\nnormalization: E\norders: [{loop: 1, exact: 1}]\n");
    assert_eq!(e.message(), "unknown key `normalization` at line 2 column 1 of runs/cusp.yaml; did you mean `normalisation`?");
    let e = err("coupling: g2\nwhatever: 1\norders: [{loop: 1, exact: 1}]\n");
    assert!(
        e.message().contains("line 2 column 1")
            && e.message().contains("the keys here are `prediction`"),
        "{e}"
    );
}

#[test]
fn wrong_coupling_name() {
    let e = err("coupling: g3\norders:\n  - loop: 1\n    exact: 4\n");
    assert!(
        e.message().starts_with("unknown coupling convention 'g3'"),
        "{e}"
    );
    assert!(
        e.message()
            .ends_with("at line 1 column 11 of runs/cusp.yaml"),
        "{e}"
    );
}

#[test]
fn missing_parts() {
    assert!(err("coupling: g2\n")
        .message()
        .contains("missing `orders:`"));
    assert!(err("orders:\n  - loop: 1\n    exact: 4\n")
        .message()
        .contains("missing `coupling:`"));
    assert!(err("coupling: g2\norders: []\n")
        .message()
        .contains("has no entries"));
    assert!(err("").message().contains("is empty"));
    assert!(err("# only a comment\n").message().contains("is empty"));
    let e = err("coupling: g2\norders:\n  - loop: 3\n    label: x\n");
    assert!(e.message().contains("needs `exact:` or `value:`"), "{e}");
    let e = err("coupling: g2\norders:\n  - exact: 3\n");
    assert!(
        e.message().contains("order entry 1 (line 3)") && e.message().contains("no `loop:`"),
        "{e}"
    );
}

#[test]
fn loop_orders_out_of_range_or_repeated() {
    let e = err("coupling: g2\norders:\n  - loop: 1\n    exact: 4\n  - loop: 1\n    exact: 5\n");
    assert_eq!(
        e.message(),
        "loop order 1 given twice, at line 3 and at line 5 of runs/cusp.yaml"
    );
    for (bad, kind) in [
        ("0", ErrorKind::Range),
        ("-2", ErrorKind::Range),
        ("201", ErrorKind::Range),
        ("99999999999999999999999", ErrorKind::Range),
        ("1.5", ErrorKind::Input),
        ("two", ErrorKind::Input),
    ] {
        let e = err(&format!(
            "coupling: g2\norders:\n  - loop: {bad}\n    exact: 4\n"
        ));
        assert_eq!(e.kind(), kind, "{bad}: {e}");
        assert!(
            e.message().contains(bad) && e.message().contains("at line 3 column 11"),
            "{bad}: {e}"
        );
    }
}

#[test]
fn expression_errors_point_into_the_file() {
    let text = "coupling: g2\norders:\n  - loop: 1\n    exact: \"4 + zeta(1)\"\n";
    let e = err(text);
    assert!(
        e.message()
            .starts_with("runs/cusp.yaml:4:17: zeta(1) diverges"),
        "{e}"
    );
    let text = "coupling: g2\norders:\n  - loop: 1\n    exact: 4 +\n";
    let e = err(text);
    assert!(
        e.message().starts_with("runs/cusp.yaml:4:15: expected"),
        "{e}"
    );
    let text = "coupling: g2\nsymbols: [l1]\norders:\n  - loop: 1\n    exact: 2 l1 x\n";
    let e = err(text);
    assert!(
        e.message()
            .starts_with("runs/cusp.yaml:5:17: undeclared symbol `x`"),
        "{e}"
    );
    // A prediction's names are checked against the catalogue as well, when
    // the prediction is built; the message still points into the file.
    let text = "coupling: g2\nprediction: 'Gamma(pi/4) + y'\norders: [{loop: 1, exact: 1}]\n";
    let file = parse_series_text(text, "runs/cusp.yaml").unwrap();
    let e = Quantity::from_file(&file, &Catalogue::builtin().unwrap()).unwrap_err();
    assert!(
        e.message()
            .starts_with("runs/cusp.yaml:2:28: unknown name `y`"),
        "{e}"
    );
    assert!(
        e.message().contains("2 | prediction: 'Gamma(pi/4) + y'"),
        "{e}"
    );
}

/// Values over several lines (block scalars, folded plain scalars, escapes)
/// still get errors on the file line where the culprit was written.
#[test]
fn errors_in_multi_line_values_point_at_their_line() {
    let block = "coupling: g2\norders:\n  - loop: 1\n    exact: |\n      4 + zeta(3)\n      + $\n";
    let e = err(block);
    assert!(
        e.message().starts_with("runs/cusp.yaml:6:9: expected"),
        "{e}"
    );
    assert!(e.message().contains("6 |       + $\n  |         ^"), "{e}");
    let folded = "coupling: g2\norders:\n  - loop: 1\n    exact: 4 + zeta(3)\n      + zeta(1)\n";
    let e = err(folded);
    assert!(
        e.message()
            .starts_with("runs/cusp.yaml:5:9: zeta(1) diverges"),
        "{e}"
    );
    let escaped = "coupling: g2\norders:\n  - loop: 1\n    exact: \"\\u03b6(3) + zeta(1)\"\n";
    let e = err(escaped);
    assert!(
        e.message()
            .starts_with("runs/cusp.yaml:4:25: zeta(1) diverges"),
        "{e}"
    );
    let f = parse_series_text(block.replace("+ $", "+ 1").as_str(), "f").unwrap();
    assert_eq!(
        f.orders[0].exact.as_ref().unwrap().expr,
        parse("4 + zeta(3) + 1", "t", None).unwrap()
    );
}

#[test]
fn other_mistakes() {
    let e = err("coupling: g2\nsymbols: [l1, zeta]\norders: [{loop: 1, exact: 1}]\n");
    assert!(e.message().contains("`zeta` at line 2 column 15"), "{e}");
    let e = err("coupling: g2\nsymbols: [g]\norders: [{loop: 1, exact: 1}]\n");
    assert!(e.message().contains("is the coupling"), "{e}");
    let e = err("coupling: g2\ncoupling: a\norders: [{loop: 1, exact: 1}]\n");
    assert!(e.message().contains("given twice"), "{e}");
    let e = err("coupling: g2\nnormalisation: R7\norders: [{loop: 1, exact: 1}]\n");
    assert!(e.message().contains("expected E or R6"), "{e}");
    let e = err("coupling: g2\norders: [{loop: 1, uncertainty: 0.1}]\n");
    assert!(e.message().contains("needs `exact:` or `value:`"), "{e}");
    let e = err("coupling: g2\norders: [{loop: 1, value: 1.5(2), uncertainty: 0.1}]\n");
    assert!(
        e.message().contains("without an uncertainty of its own"),
        "{e}"
    );
    let e = err("coupling: g2\norders: 5\n");
    assert!(
        e.message().starts_with("runs/cusp.yaml: ") && e.message().contains("line 2"),
        "{e}"
    );
    let e = err("coupling: [g2\n");
    assert!(e.message().starts_with("runs/cusp.yaml: "), "{e}");
    let f = parse_series_text(
        "coupling: a\norders: [{loop: 2, value: 1240, uncertainty: 20}]\n",
        "f",
    )
    .unwrap();
    assert_eq!(
        f.orders[0].value.as_ref().unwrap().expr,
        parse("1240 ± 20", "t", None).unwrap()
    );
    assert_eq!(f.coupling, Coupling::A);
}

#[test]
fn reading_from_disk() {
    let dir = std::env::temp_dir().join(format!("loopwise-seriesfile-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let path = dir.join("cusp.yaml");
    std::fs::write(&path, FULL).unwrap();
    let f = read_series_file(&path).unwrap();
    assert_eq!(f.orders.len(), 6);
    let missing = read_series_file(&dir.join("absent.yaml")).unwrap_err();
    assert_eq!(missing.kind(), ErrorKind::Io);
    std::fs::remove_dir_all(&dir).unwrap();
}
