//! The finite-coupling commands run as a user runs them: `at` against the
//! octagon closed forms (with honest error estimates), formulas, `scan`,
//! `plot`, `radius`, `selftest`, and bad input.

mod common;

use common::loopwise;

use rug::float::Constant;
use rug::Float;

fn at_json(args: &[&str]) -> serde_json::Value {
    let mut all = vec!["at"];
    all.extend_from_slice(args);
    all.extend_from_slice(&["--format", "json"]);
    let (code, out, err) = loopwise(&all);
    assert_eq!(code, 0, "{err}");
    serde_json::from_str(&out).unwrap()
}

const PREC: u32 = 400;

fn f(text: &str) -> Float {
    Float::with_val(PREC, Float::parse(text).unwrap())
}

/// Checks every printed value against a reference: the true error is below
/// the reported estimate, and at least `min_digits` significant digits are printed.
fn assert_honest(v: &serde_json::Value, reference: impl Fn(&Float) -> Float, min_digits: u32) {
    for row in v["values"].as_array().unwrap() {
        let g = f(row["g"].as_str().unwrap());
        let value = f(row["value"].as_str().unwrap());
        let error = f(row["error"].as_str().unwrap());
        let truth = reference(&g);
        let actual = Float::with_val(PREC, &value - &truth).abs();
        // The printed value is rounded to its supported digits: allow half a unit of the last one.
        let digits = row["digits"].as_u64().unwrap() as i32;
        let lead = truth.clone().abs().log10().floor().to_f64() as i32;
        let half_unit = Float::with_val(PREC, Float::i_exp(1, 0))
            * Float::with_val(PREC, 10u32).pow_ref_i(lead - digits + 1)
            / 2u32;
        assert!(
            actual <= Float::with_val(PREC, &error + &half_unit),
            "g = {g}: |{value} - truth| = {actual} > {error}"
        );
        assert!(digits as u32 >= min_digits, "g = {g}: only {digits} digits");
    }
}

trait PowI {
    fn pow_ref_i(&self, k: i32) -> Float;
}

impl PowI for Float {
    fn pow_ref_i(&self, k: i32) -> Float {
        use rug::ops::Pow;
        Float::with_val(self.prec(), self.pow(k))
    }
}

/// Gamma(0) = (2/pi^2) ln cosh(2 pi g) (arXiv:1907.13131, arXiv:2003.01121;
/// closed form recalled from memory, docs/conventions.md section 4), at
/// g = 0.1, 0.5, 1, 2, 4 to at least 25 digits, with honest error estimates.
#[test]
fn octagon_against_its_closed_form() {
    let v = at_json(&["octagon", "--g", "0.1,0.5,1,2,4", "--digits", "30"]);
    let pi = Float::with_val(PREC, Constant::Pi);
    assert_honest(
        &v,
        |g| {
            Float::with_val(PREC, Float::with_val(PREC, &pi * g) * 2u32)
                .cosh()
                .ln()
                * 2u32
                / pi.clone().square()
        },
        25,
    );
}

/// Delta(0) = (1/4) ln(sinh(4 pi g)/(4 pi g)) (docs/conventions.md section 4; the
/// identification with arXiv:2003.01121 is from memory), at least 20 digits.
#[test]
fn octagon_constant_against_its_closed_form() {
    let v = at_json(&["octagon-constant", "--g", "0.1,0.5,1,2", "--digits", "25"]);
    let pi = Float::with_val(PREC, Constant::Pi);
    assert_honest(
        &v,
        |g| {
            let y = Float::with_val(PREC, &pi * g) * 4u32;
            Float::with_val(PREC, y.clone().sinh() / &y).ln() / 4u32
        },
        20,
    );
}

/// A formula of functionals at finite coupling: the scaling function is twice
/// the cusp (catalogue definitions), and an irrational tilt works here.
#[test]
fn formulas_and_any_real_tilt() {
    let cusp = at_json(&["cusp", "--g", "0.7", "--digits", "20"]);
    let twice = at_json(&["2*Gamma(pi/4)", "--g", "0.7", "--digits", "20"]);
    let a = f(cusp["values"][0]["value"].as_str().unwrap());
    let b = f(twice["values"][0]["value"].as_str().unwrap());
    assert!(Float::with_val(PREC, b - a * 2u32).abs() < 1e-17);
    let v = at_json(&["Gamma(pi/5)", "--g", "0.5", "--digits", "15"]);
    assert!(v["values"][0]["digits"].as_u64().unwrap() >= 15);
    // c2 = cos^2(pi/4) = 1/2 given directly is the cusp again.
    let c = at_json(&["Gamma(c2=0.5)", "--g", "0.7", "--digits", "20"]);
    assert_eq!(c["values"][0]["value"], cusp["values"][0]["value"]);
}

/// The cusp at strong coupling: 2g - 3 ln2/(2 pi) - K/(8 pi^2 g)
/// (arXiv:0708.3933) is printed beside the value and approaches it.
#[test]
fn strong_coupling_column() {
    let v = at_json(&["cusp", "--g", "5,10", "--digits", "12"]);
    let diff = |k: usize| {
        let row = &v["values"][k];
        Float::with_val(
            PREC,
            f(row["value"].as_str().unwrap()) - f(row["strong_coupling"].as_str().unwrap()),
        )
        .abs()
    };
    let (d5, d10) = (diff(0), diff(1));
    assert!(d5 < 1e-3 && d10 < d5, "{d5} {d10}");
    assert_eq!(v["strong_coupling_status"], "established");
    let (_, text, _) = loopwise(&["at", "hexagon", "--g", "1", "--digits", "8"]);
    assert!(
        text.contains("CAUTION"),
        "the hexagon's strong coupling is a conjecture: {text}"
    );
}

#[test]
fn scan_gives_csv_and_json() {
    let (code, out, _) = loopwise(&["scan", "hexagon", "--g", "0:1:0.25", "--digits", "10"]);
    assert_eq!(code, 0);
    let lines: Vec<&str> = out.lines().collect();
    assert_eq!(lines[0], "g,value,error");
    assert_eq!(lines.len(), 6, "{out}");
    assert!(lines[1].starts_with("0,0,"), "{out}");
    let (code, out, _) = loopwise(&[
        "scan", "hexagon", "--g", "0.5:1", "--points", "3", "--format", "json",
    ]);
    assert_eq!(code, 0);
    let v: serde_json::Value = serde_json::from_str(&out).unwrap();
    assert_eq!(v.as_array().unwrap().len(), 3);
    assert_eq!(v[2]["g"], "1");
}

/// The SVG is written, is SVG, draws every series and names it in its
/// legend, typeset: under each quantity's symbol the finite-coupling curve,
/// the truncations by their last power of g, the Padé approximant and the
/// strong-coupling expansion.
#[test]
fn plot_writes_an_svg_with_every_series_named() {
    let path = std::env::temp_dir().join(format!("loopwise-plot-{}.svg", std::process::id()));
    let (code, _, err) = loopwise(&[
        "plot",
        "cusp",
        "octagon",
        "--g",
        "0:2",
        "--points",
        "21",
        "--loops",
        "2,6",
        "--pade",
        "4",
        "--out",
        path.to_str().unwrap(),
    ]);
    assert_eq!(code, 0, "{err}");
    let svg = std::fs::read_to_string(&path).unwrap();
    std::fs::remove_file(&path).ok();
    assert!(svg.starts_with("<svg xmlns=\"http://www.w3.org/2000/svg\""));
    assert!(svg.trim_end().ends_with("</svg>"));
    let sub = |s: &str| format!("<tspan baseline-shift=\"sub\" font-size=\"70%\">{s}</tspan>");
    // The legend, in order: each quantity's header, then its curves.
    let legend: Vec<&str> = svg
        .lines()
        .filter(|l| l.starts_with("<text") && l.contains("text-anchor=\"start\""))
        .map(|l| &l[l.find('>').unwrap() + 1..l.rfind("</text>").unwrap()])
        .collect();
    let rows = [
        "finite coupling",
        "weak coupling to g⁴ (2 loops)",
        "weak coupling to g¹² (6 loops)",
        "Padé [4/4] in g²",
        "strong coupling, g ≥ 0.5",
    ];
    let mut expected = vec![format!("Γ{} = Γ(π/4)", sub("cusp"))];
    expected.extend(rows.iter().map(|r| r.to_string()));
    expected.push(format!("Γ{} = Γ(0)", sub("oct")));
    expected.extend(rows.iter().map(|r| r.to_string()));
    assert_eq!(legend, expected);
    assert!(svg.contains("g² = λ/(16π²)"), "the convention is stated");
    for k in 0..2 {
        for kind in ["finite", "weak-2", "weak-6", "pade-4", "strong"] {
            let tag = format!("<path class=\"curve\" data-quantity=\"{k}\" data-kind=\"{kind}\"");
            assert_eq!(svg.matches(&tag).count(), 1, "{k} {kind}");
        }
    }
}

/// The ratio test on the octagon's 30 exact orders points to 1/4, the
/// radius of ln cosh(2 pi g) (singularity at g = i/4; docs/conventions.md section 4).
#[test]
fn radius_of_the_octagon_series() {
    let (code, out, _) = loopwise(&["radius", "octagon", "--loops", "30"]);
    assert_eq!(code, 0);
    let line = out
        .lines()
        .find(|l| l.starts_with("difference from 1/4:"))
        .unwrap();
    let d: f64 = line.split(':').nth(1).unwrap().trim().parse().unwrap();
    assert!(d.abs() < 1e-4, "{out}");
}

/// The summed weak-coupling series against the numerical engine at
/// g = 0.05, 0.1, 0.15 for four tilts, both functionals.
#[test]
fn selftest_passes() {
    let (code, out, err) = loopwise(&["selftest"]);
    assert_eq!(code, 0, "{out}{err}");
    assert!(out.contains("24 passed, 0 failed"), "{out}");
}

#[test]
fn bad_input_is_one_message_and_exit_code_two() {
    let unwritable = "/nonexistent-dir/figure.svg";
    for (args, needle) in [
        (vec!["at", "cusp", "--g", "-1"], "g >= 0"),
        (vec!["at", "cusp", "--g", "abc"], "is not a number"),
        (vec!["at", "cusp", "--g", ""], "no couplings"),
        (vec!["at", "cusp", "--digits", "5000"], "honestly"),
        (vec!["at", "Gamma(c2)", "--g", "1"], "symbolic tilt"),
        (vec!["scan", "cusp", "--g", "2:1"], "empty or reversed"),
        (vec!["scan", "cusp", "--g", "1:1"], "empty or reversed"),
        (vec!["scan", "cusp", "--g", "0:1:0"], "step"),
        (vec!["plot", "cusp", "--out", unwritable], "does not exist"),
        (
            vec!["plot", "cusp", "--loops", "0", "--out", "x.svg"],
            "loop order",
        ),
    ] {
        let (code, out, err) = loopwise(&args);
        assert_eq!(code, 2, "{args:?}: {err}");
        assert!(out.is_empty(), "{args:?}: {out}");
        assert!(err.contains(needle), "{args:?}: {err}");
    }
}

/// Runs the binary and gives up after `seconds`: a grid refused only after
/// computing its first points would take minutes (g = 200 alone does).
fn loopwise_within(args: &[&str], seconds: u64) -> (i32, String, String) {
    use std::io::Read;
    use std::process::{Command, Stdio};
    use std::time::{Duration, Instant};
    let mut child = Command::new(env!("CARGO_BIN_EXE_loopwise"))
        .args(args)
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .expect("the binary runs");
    let start = Instant::now();
    let status = loop {
        if let Some(status) = child.try_wait().unwrap() {
            break status;
        }
        if start.elapsed() > Duration::from_secs(seconds) {
            child.kill().ok();
            child.wait().ok();
            panic!("{args:?} still running after {seconds} s: the grid was not checked before the work");
        }
        std::thread::sleep(Duration::from_millis(20));
    };
    let (mut out, mut err) = (String::new(), String::new());
    child
        .stdout
        .take()
        .unwrap()
        .read_to_string(&mut out)
        .unwrap();
    child
        .stderr
        .take()
        .unwrap()
        .read_to_string(&mut err)
        .unwrap();
    (status.code().unwrap_or(-1), out, err)
}

/// The whole grid is checked before any value is computed: couplings beyond
/// the engine's g <= 200, grids of fewer than two points, --points beside a
/// STEP (it used to be ignored) and --points 0 or 1 (they used to give 2).
#[test]
fn grid_is_validated_before_any_work() {
    for (args, needle) in [
        (vec!["scan", "cusp", "--g", "0:300:10"], "g <= 200"),
        (
            vec!["scan", "cusp", "--g", "190:201", "--points", "3"],
            "g <= 200",
        ),
        (vec!["at", "cusp", "--g", "0.5,250"], "g <= 200"),
        (vec!["at", "cusp", "--g", "0:1"], "STEP"),
        (
            vec!["scan", "cusp", "--g", "0:1", "--points", "0"],
            "--points 0",
        ),
        (
            vec!["scan", "cusp", "--g", "0:1", "--points", "1"],
            "--points 1",
        ),
        (
            vec!["scan", "cusp", "--g", "0:1:0.25", "--points", "7"],
            "--points 7",
        ),
        (vec!["scan", "cusp", "--g", "0:3:5"], "single point"),
        (vec!["scan", "cusp", "--g", "0:1:0.000001"], "points"),
        (
            vec![
                "scan", "cusp", "--g", "0:1", "--points", "3", "--digits", "0",
            ],
            "--digits 0",
        ),
        (
            vec!["plot", "cusp", "--g", "0:300", "--out", "never.svg"],
            "g <= 200",
        ),
        (
            vec![
                "plot",
                "cusp",
                "--g",
                "0:1",
                "--points",
                "1",
                "--out",
                "never.svg",
            ],
            "--points 1",
        ),
        (
            vec![
                "plot",
                "cusp",
                "--g",
                "0:1:0.5",
                "--points",
                "9",
                "--out",
                "never.svg",
            ],
            "--points 9",
        ),
        (
            vec!["plot", "cusp", "--g", "0:1:0.0001", "--out", "never.svg"],
            "2000",
        ),
    ] {
        let (code, out, err) = loopwise_within(&args, 20);
        assert_eq!(code, 2, "{args:?}: {err}");
        assert!(out.is_empty(), "{args:?}: {out}");
        assert!(err.contains(needle), "{args:?}: {err}");
    }
    assert!(!std::path::Path::new("never.svg").exists());
    // The count asked for is the count delivered, both ends included.
    let (code, out, err) = loopwise(&[
        "scan", "octagon", "--g", "0:1", "--points", "4", "--digits", "5",
    ]);
    assert_eq!(code, 0, "{err}");
    let gs: Vec<&str> = out
        .lines()
        .skip(1)
        .map(|l| l.split(',').next().unwrap())
        .collect();
    assert_eq!(gs.len(), 4, "{out}");
    assert_eq!((gs[0], gs[3]), ("0", "1"), "{out}");
}

/// `scan` and `at` print no digit below the error estimate: a formula that
/// cancels to zero prints a number (once `0 +- 4.9e-24`, text in a CSV
/// column) no larger than its error, and no digit finer than the error's
/// leading one.
#[test]
fn scan_and_at_print_only_digits_the_error_supports() {
    let (code, out, err) = loopwise(&[
        "scan",
        "Gamma(pi/4) - Gamma(c2=1/2)",
        "--g",
        "0.5:1",
        "--points",
        "2",
        "--digits",
        "10",
    ]);
    assert_eq!(code, 0, "{err}");
    for line in out.lines().skip(1) {
        let cols: Vec<&str> = line.split(',').collect();
        assert_eq!(cols.len(), 3, "{line}");
        let value = f(cols[1]);
        let error = f(cols[2]);
        assert!(Float::with_val(PREC, value.abs_ref()) <= error, "{line}");
        if let Some((_, decimals)) = cols[1].split_once('.') {
            let unit = Float::with_val(
                PREC,
                Float::with_val(PREC, 10u32).pow_ref_i(-(decimals.len() as i32)),
            );
            assert!(unit * 10u32 > error, "{line}: digits below the error");
        }
    }
    let v = at_json(&["Gamma(pi/4) - Gamma(c2=1/2)", "--g", "1", "--digits", "10"]);
    assert_eq!(v["values"][0]["digits"], 0);
    assert!(
        Float::parse(v["values"][0]["value"].as_str().unwrap()).is_ok(),
        "{v}"
    );
}

/// A plot needs two points of its range at least: a STEP beyond the range
/// is refused (it drew empty axes) and no file is written.
#[test]
fn one_point_plot_is_refused() {
    let path = std::env::temp_dir().join(format!("loopwise-one-point-{}.svg", std::process::id()));
    let (code, _, err) = loopwise(&[
        "plot",
        "cusp",
        "--g",
        "0:3:5",
        "--out",
        path.to_str().unwrap(),
    ]);
    assert_eq!(code, 2, "{err}");
    assert!(err.contains("single point"), "{err}");
    assert!(!path.exists());
    let (code, _, err) = loopwise(&["plot", "cusp", "--g", "1", "--out", path.to_str().unwrap()]);
    assert_eq!(code, 2, "{err}");
    assert!(err.contains("range"), "{err}");
    assert!(!path.exists());
}

/// An angle the exact engine cannot treat still has a finite-coupling curve:
/// the plot draws it, draws the other quantity's weak-coupling curves, and
/// says on stderr what it left out.
#[test]
fn plot_skips_the_weak_coupling_series_it_cannot_expand() {
    let path = std::env::temp_dir().join(format!("loopwise-skip-{}.svg", std::process::id()));
    let (code, _, err) = loopwise(&[
        "plot",
        "Gamma(0.3)",
        "cusp",
        "--g",
        "0:1",
        "--points",
        "11",
        "--loops",
        "2,4",
        "--out",
        path.to_str().unwrap(),
    ]);
    let svg = std::fs::read_to_string(&path).unwrap_or_default();
    std::fs::remove_file(&path).ok();
    assert_eq!(code, 0, "{err}");
    assert!(
        err.contains("Gamma(0.3): weak-coupling curves left out"),
        "{err}"
    );
    let texts: Vec<&str> = svg
        .lines()
        .filter(|l| l.starts_with("<text"))
        .map(|l| &l[l.find('>').unwrap() + 1..l.rfind("</text>").unwrap()])
        .collect();
    assert!(texts.contains(&"Γ(0.3)"), "{texts:?}");
    for (k, kind) in [(0, "finite"), (1, "finite"), (1, "weak-2"), (1, "weak-4")] {
        let tag = format!("<path class=\"curve\" data-quantity=\"{k}\" data-kind=\"{kind}\"");
        assert!(svg.contains(&tag), "missing {k} {kind}");
    }
    assert!(
        !svg.contains("data-quantity=\"0\" data-kind=\"weak"),
        "a curve that cannot exist was drawn"
    );
}

/// `scan --shard K/N` over all K, merged in any order, prints exactly what
/// the unsplit scan prints (CSV and JSON); parts missing, given twice or
/// from another scan are refused with exit code 2 and a message naming them.
#[test]
fn sharded_scans_merge_into_the_whole_scan() {
    let dir = std::env::temp_dir().join(format!("loopwise-shards-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let scan = |extra: &[&str]| {
        let mut args = vec!["scan", "octagon", "--g", "0:1.5:0.25"];
        if !extra.contains(&"--digits") {
            args.extend(["--digits", "12"]);
        }
        args.extend_from_slice(extra);
        let (code, out, err) = loopwise(&args);
        assert_eq!(code, 0, "{err}");
        out
    };
    for format in ["csv", "json"] {
        let whole = scan(&["--format", format]);
        let mut files = Vec::new();
        for k in [3, 1, 2] {
            let path = dir.join(format!("part{k}.{format}"));
            std::fs::write(
                &path,
                scan(&["--format", format, "--shard", &format!("{k}/3")]),
            )
            .unwrap();
            files.push(path.to_string_lossy().to_string());
        }
        let mut args = vec!["merge"];
        args.extend(files.iter().map(String::as_str));
        let (code, out, err) = loopwise(&args);
        assert_eq!(code, 0, "{err}");
        assert_eq!(out, whole, "{format}");
        let (code, _, err) = loopwise(&["merge", &files[0], &files[1]]);
        assert_eq!(code, 2);
        assert!(err.contains("parts missing: 2/3"), "{err}");
        let (code, _, err) = loopwise(&["merge", &files[0], &files[0], &files[1], &files[2]]);
        assert_eq!(code, 2);
        assert!(err.contains("overlap"), "{err}");
    }
    let other = dir.join("other.csv");
    std::fs::write(&other, scan(&["--digits", "11", "--shard", "2/3"])).unwrap();
    let p = |k: u32| {
        dir.join(format!("part{k}.csv"))
            .to_string_lossy()
            .to_string()
    };
    let (code, _, err) = loopwise(&["merge", &p(1), &other.to_string_lossy(), &p(3)]);
    assert_eq!(code, 2);
    assert!(err.contains("another scan"), "{err}");
    let (code, _, err) = loopwise(&["scan", "octagon", "--g", "0:1:0.5", "--shard", "4/3"]);
    assert_eq!(code, 2);
    assert!(err.contains("--shard 4/3"), "{err}");
    std::fs::remove_dir_all(&dir).unwrap();
}
