//! The conveniences of an installed binary, run as a user runs them: shell
//! completion scripts and manual pages generated from the argument
//! definitions, the commented template of `init` (which `check` must accept
//! as written), and the demo files handed out by `demo --print-file` and
//! `demo --write` (byte for byte the repository's files).

use std::path::{Path, PathBuf};
use std::process::Command;

mod common;

use common::{loopwise, loopwise_with_stdin};

/// A fresh directory of this test process for one test.
fn scratch(test: &str) -> PathBuf {
    let dir = std::env::temp_dir().join(format!(
        "loopwise-conveniences-{}-{test}",
        std::process::id()
    ));
    let _ = std::fs::remove_dir_all(&dir);
    std::fs::create_dir_all(&dir).unwrap();
    dir
}

/// Standard output as bytes, for the byte-for-byte comparisons.
fn stdout_bytes(args: &[&str]) -> Vec<u8> {
    let out = Command::new(env!("CARGO_BIN_EXE_loopwise"))
        .args(args)
        .output()
        .expect("the binary runs");
    assert_eq!(
        out.status.code(),
        Some(0),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    out.stdout
}

/// The commands as `loopwise --help` lists them (clap's own listing, under
/// "Commands:"), so that a command added later is expected everywhere too.
fn commands() -> Vec<String> {
    let (code, out, err) = loopwise(&["--help"]);
    assert_eq!(code, 0, "{err}");
    let listing = out
        .split("Commands:")
        .nth(1)
        .expect("a Commands: section")
        .split("\n\n")
        .next()
        .unwrap();
    let names: Vec<String> = listing
        .lines()
        .filter_map(|l| l.split_whitespace().next())
        .filter(|n| *n != "help")
        .map(str::to_string)
        .collect();
    for expected in ["check", "demo", "init", "completions", "manual"] {
        assert!(names.iter().any(|n| n == expected), "{names:?}");
    }
    names
}

fn repository_file(relative: &str) -> Vec<u8> {
    std::fs::read(Path::new(env!("CARGO_MANIFEST_DIR")).join(relative)).unwrap()
}

/// bash is on every machine the project builds on (CI included); a missing
/// bash is a failure of this test, not a reason to skip it.
fn bash() -> Command {
    let probe = Command::new("bash").arg("--version").output();
    assert!(
        probe.is_ok_and(|o| o.status.success()),
        "bash is needed to test the bash completion script and was not found"
    );
    Command::new("bash")
}

/// The bash script names every command, is valid bash (`bash -n`), and,
/// loaded into bash, completes `loopwise ch` to `check` and `loopwise
/// completions z` to `zsh` (bash's programmable completion, the
/// COMP_WORDS/COMPREPLY protocol of the bash manual, "Programmable
/// Completion").
#[test]
fn bash_completion_is_valid_and_completes_commands() {
    let (code, script, err) = loopwise(&["completions", "bash"]);
    assert_eq!(code, 0, "{err}");
    for name in commands() {
        assert!(script.contains(&name), "`{name}` missing from the script");
    }
    let dir = scratch("bash");
    let path = dir.join("loopwise.bash");
    std::fs::write(&path, &script).unwrap();
    let syntax = bash().arg("-n").arg(&path).output().unwrap();
    assert!(
        syntax.status.success(),
        "bash -n: {}",
        String::from_utf8_lossy(&syntax.stderr)
    );
    let complete = |words: &str| -> String {
        let program = format!(
            "source '{}'; COMP_WORDS=({words}); COMP_CWORD=$((${{#COMP_WORDS[@]}} - 1)); \
             COMP_LINE='{words}'; COMP_POINT=${{#COMP_LINE}}; \
             _loopwise loopwise \"${{COMP_WORDS[COMP_CWORD]}}\" \"${{COMP_WORDS[COMP_CWORD-1]}}\"; \
             printf '%s\\n' \"${{COMPREPLY[@]}}\"",
            path.display()
        );
        let out = bash().arg("-c").arg(program).output().unwrap();
        assert!(
            out.status.success(),
            "{}",
            String::from_utf8_lossy(&out.stderr)
        );
        String::from_utf8(out.stdout).unwrap()
    };
    let replies = complete("loopwise ch");
    assert_eq!(replies.lines().collect::<Vec<_>>(), ["check"], "{replies}");
    let replies = complete("loopwise completions z");
    assert_eq!(replies.lines().collect::<Vec<_>>(), ["zsh"], "{replies}");
}

/// The zsh script is UTF-8 text in zsh's completion-function form (its
/// first line `#compdef loopwise`, zsh manual "Completion System") naming
/// every command; the other shells get non-empty scripts naming them too.
#[test]
fn other_shells_get_scripts_naming_every_command() {
    let zsh = String::from_utf8(stdout_bytes(&["completions", "zsh"])).expect("UTF-8 text");
    assert_eq!(zsh.lines().next(), Some("#compdef loopwise"), "{zsh}");
    for name in commands() {
        assert!(
            zsh.contains(&format!("'{name}:")),
            "`{name}` missing: {zsh}"
        );
    }
    for shell in ["fish", "elvish", "powershell"] {
        let script = String::from_utf8(stdout_bytes(&["completions", shell])).unwrap();
        for name in commands() {
            assert!(script.contains(&name), "`{name}` missing for {shell}");
        }
    }
    let (code, _, err) = loopwise(&["completions", "tcsh"]);
    assert_eq!(code, 2);
    assert!(err.contains("bash"), "{err}");
}

/// The man page is roff with a title line (`.TH`, man(7)) and a NAME
/// section, and lists every command as a page of its own; `--dir` writes
/// those pages, each with its own title line.
#[test]
fn manual_pages_cover_every_command() {
    let (code, page, err) = loopwise(&["manual"]);
    assert_eq!(code, 0, "{err}");
    assert!(page.contains("\n.TH loopwise 1 "), "{page}");
    assert!(page.contains(".SH NAME\nloopwise \\- "), "{page}");
    for name in commands() {
        assert!(
            page.contains(&format!("loopwise\\-{name}(1)")),
            "`{name}` missing from the page"
        );
    }
    let dir = scratch("manual");
    let (code, _, err) = loopwise(&["manual", "--dir", dir.join("man1").to_str().unwrap()]);
    assert_eq!(code, 0, "{err}");
    let main = std::fs::read_to_string(dir.join("man1/loopwise.1")).unwrap();
    assert_eq!(main, page);
    for name in commands() {
        let sub = std::fs::read_to_string(dir.join(format!("man1/loopwise-{name}.1")))
            .unwrap_or_else(|e| panic!("loopwise-{name}.1: {e}"));
        assert!(
            sub.contains(&format!("\n.TH loopwise-{name} 1 ")),
            "{name}: {sub}"
        );
    }
    let written = std::fs::read_dir(dir.join("man1")).unwrap().count();
    assert_eq!(written, commands().len() + 1);
}

/// The decimal digit strings after `value: ` in a template, in order.
fn values(template: &str) -> Vec<String> {
    template
        .lines()
        .filter_map(|l| l.trim().strip_prefix("value: "))
        .map(|v| v.trim_matches('"').to_string())
        .collect()
}

fn check_json(path: &Path) -> serde_json::Value {
    let (code, out, err) = loopwise(&["check", path.to_str().unwrap(), "--format", "json"]);
    assert_eq!(code, 0, "{err}\n{out}");
    serde_json::from_str(&out).unwrap()
}

/// The untouched template passes `check`: two exact orders and two
/// numerical ones. Its examples are the cusp's first coefficients, compared
/// here with hep-th/0610251, Gamma_cusp = 4 g^2 - 8 zeta(2) g^4 +
/// 88 zeta(4) g^6 - (876 zeta(6) + 32 zeta(3)^2) g^8, evaluated in f64 with
/// zeta(4) = pi^4/90, zeta(6) = pi^6/945 (A&S 23.2.24) and zeta(3) =
/// 1.2020569031595942 (A&S table 23.3; the digits recalled from memory).
#[test]
fn template_passes_check_and_holds_the_published_cusp() {
    let dir = scratch("template");
    let path = dir.join("series.yaml");
    let (code, _, err) = loopwise(&["init", path.to_str().unwrap()]);
    assert_eq!(code, 0, "{err}");
    let text = std::fs::read_to_string(&path).unwrap();
    assert!(text.contains("prediction: cusp\n"), "{text}");
    assert!(text.contains("coupling: g2\n"), "{text}");
    assert!(text.contains("exact: \"4\""), "{text}");
    assert!(text.contains("exact: \"-8*zeta(2)\""), "{text}");
    assert!(text.contains("NOT results"), "{text}");
    assert!(text.contains("(placeholder)"), "{text}");
    let pi = std::f64::consts::PI;
    let zeta3 = 1.2020569031595942_f64;
    let published = [
        88.0 * pi.powi(4) / 90.0,
        -876.0 * pi.powi(6) / 945.0 - 32.0 * zeta3 * zeta3,
    ];
    let written = values(&text);
    assert_eq!(written.len(), 2, "{text}");
    assert!(written[0].ends_with("(3)"), "{text}");
    let three: f64 = written[0].trim_end_matches("(3)").parse().unwrap();
    let four: f64 = written[1].parse().unwrap();
    assert!((three - published[0]).abs() < 1e-8, "{three}");
    assert!((four - published[1]).abs() < 1e-5, "{four}");
    assert!(text.contains("uncertainty: 0.00003\n"), "{text}");
    let v = check_json(&path);
    assert_eq!(v["agrees"], true);
    let verdicts: Vec<&str> = (0..4)
        .map(|k| v["orders"][k]["verdict"].as_str().unwrap())
        .collect();
    assert_eq!(
        verdicts,
        [
            "agrees-exactly",
            "agrees-exactly",
            "agrees-numerically",
            "agrees-numerically"
        ]
    );
}

/// `init` leaves an existing file alone (exit 2, a message naming --force,
/// the contents unchanged) and replaces it with `--force`; `-` prints the
/// same template on standard output.
#[test]
fn init_refuses_to_overwrite_unless_forced() {
    let dir = scratch("overwrite");
    let path = dir.join("mine.yaml");
    std::fs::write(&path, "my own results\n").unwrap();
    let (code, out, err) = loopwise(&["init", path.to_str().unwrap()]);
    assert_eq!(code, 2);
    assert!(out.is_empty(), "{out}");
    assert!(
        err.contains("exists already") && err.contains("--force"),
        "{err}"
    );
    assert_eq!(std::fs::read_to_string(&path).unwrap(), "my own results\n");
    let (code, _, err) = loopwise(&["init", path.to_str().unwrap(), "--force"]);
    assert_eq!(code, 0, "{err}");
    let written = std::fs::read_to_string(&path).unwrap();
    assert!(written.starts_with("# A loopwise series file"), "{written}");
    let (code, printed, err) = loopwise(&["init", "-"]);
    assert_eq!(code, 0, "{err}");
    assert_eq!(printed, written);
    let (code, _, err) = loopwise(&["init", dir.join("no/such/dir.yaml").to_str().unwrap()]);
    assert_eq!(code, 2);
    assert!(err.contains("cannot write"), "{err}");
}

/// `--quantity` prefills another prediction, `--coupling` another
/// convention, and `check` accepts each as written. The octagon's examples
/// follow from its closed form (2/pi^2) ln cosh(2 pi g) (arXiv:2003.01121)
/// with ln cosh x = x^2/2 - x^4/12 + x^6/45 - 17 x^8/2520 (the tanh series
/// of A&S 4.5.64 integrated; the equation number recalled from memory):
/// 4, -16 zeta(2), 128 pi^4/45, -1088 pi^6/315; in the coupling a = 2 g^2
/// the L-loop coefficient is divided by 2^L.
#[test]
fn template_for_other_quantities_and_couplings() {
    let dir = scratch("quantities");
    let pi = std::f64::consts::PI;
    let octagon = [128.0 * pi.powi(4) / 45.0, -1088.0 * pi.powi(6) / 315.0];
    for (coupling, base) in [("g2", 1.0), ("a", 2.0_f64)] {
        let path = dir.join(format!("octagon-{coupling}.yaml"));
        let (code, _, err) = loopwise(&[
            "init",
            path.to_str().unwrap(),
            "--quantity",
            "octagon",
            "--coupling",
            coupling,
        ]);
        assert_eq!(code, 0, "{err}");
        let text = std::fs::read_to_string(&path).unwrap();
        assert!(text.contains(&format!("coupling: {coupling}\n")), "{text}");
        let written = values(&text);
        let three: f64 = written[0].trim_end_matches("(3)").parse().unwrap();
        let four: f64 = written[1].parse().unwrap();
        assert!(
            (three * base.powi(3) / octagon[0] - 1.0).abs() < 1e-8,
            "{text}"
        );
        assert!(
            (four * base.powi(4) / octagon[1] - 1.0).abs() < 1e-6,
            "{text}"
        );
        assert_eq!(check_json(&path)["agrees"], true);
    }
    // A formula is quoted for YAML, and a conjecture says it is one.
    let (code, text, err) = loopwise(&["init", "-", "--quantity", "-zeta(2)/2*Gamma(pi/4)"]);
    assert_eq!(code, 0, "{err}");
    assert!(
        text.contains("prediction: \"-zeta(2)/2*Gamma(pi/4)\"\n"),
        "{text}"
    );
    let (code, out, err) = loopwise_with_stdin(&["check", "-"], &text);
    assert_eq!(code, 0, "{err}\n{out}");
    let (code, text, _) = loopwise(&["init", "-", "--quantity", "hexagon"]);
    assert_eq!(code, 0);
    assert!(
        text.contains("CAUTION, a conjecture of the literature"),
        "{text}"
    );
    // A symbolic tilt has no decimal examples: refused with a way out.
    let (code, out, err) = loopwise(&["init", "-", "--quantity", "Gamma(c2)"]);
    assert_eq!(code, 2);
    assert!(out.is_empty());
    assert!(err.contains("c2=1/3"), "{err}");
    let (code, _, err) = loopwise(&["init", "-", "--quantity", "nosuch"]);
    assert_eq!(code, 2);
    assert!(err.contains("unknown quantity"), "{err}");
}

/// The printed demo files are the repository's, byte for byte, and the
/// commands read them: `check` finds the planted five-loop slip of the cusp
/// file (exit 1, as for any file that differs) and `origin` the broken
/// exponentiation of the origin file.
#[test]
fn demo_prints_the_repository_files() {
    let cusp = stdout_bytes(&["demo", "--print-file"]);
    assert_eq!(cusp, repository_file("series/examples/demo-cusp.yaml"));
    let origin = stdout_bytes(&["demo", "origin", "--print-file"]);
    assert_eq!(origin, repository_file("series/examples/demo-origin.yaml"));
    let (code, out, err) = loopwise_with_stdin(
        &["check", "-", "--format", "json"],
        std::str::from_utf8(&cusp).unwrap(),
    );
    assert_eq!(code, 1, "{err}");
    let v: serde_json::Value = serde_json::from_str(&out).unwrap();
    assert_eq!(v["orders"][4]["verdict"], "differs-exactly");
    assert_eq!(
        v["summary"],
        "orders 1-4 agree, order 5 differs, orders 6-7 agree"
    );
    let (code, out, err) = loopwise_with_stdin(
        &["origin", "-", "--format", "json"],
        std::str::from_utf8(&origin).unwrap(),
    );
    assert_eq!(code, 1, "{err}");
    let v: serde_json::Value = serde_json::from_str(&out).unwrap();
    assert_eq!(v["broken"]["loop"], 5);
}

/// `--write DIR` creates DIR, writes the file under its repository name,
/// refuses to replace it a second time and replaces it with `--force`.
#[test]
fn demo_writes_its_file_once_unless_forced() {
    let dir = scratch("demo-write").join("examples");
    let target = dir.to_str().unwrap();
    let path = dir.join("demo-cusp.yaml");
    let (code, out, err) = loopwise(&["demo", "--write", target]);
    assert_eq!(code, 0, "{err}");
    assert!(out.is_empty(), "{out}");
    assert_eq!(
        std::fs::read(&path).unwrap(),
        repository_file("series/examples/demo-cusp.yaml")
    );
    std::fs::write(&path, "edited\n").unwrap();
    let (code, _, err) = loopwise(&["demo", "--write", target]);
    assert_eq!(code, 2);
    assert!(err.contains("--force"), "{err}");
    assert_eq!(std::fs::read_to_string(&path).unwrap(), "edited\n");
    let (code, _, err) = loopwise(&["demo", "--write", target, "--force"]);
    assert_eq!(code, 0, "{err}");
    assert_eq!(
        std::fs::read(&path).unwrap(),
        repository_file("series/examples/demo-cusp.yaml")
    );
    let (code, _, err) = loopwise(&["demo", "origin", "--write", target]);
    assert_eq!(code, 0, "{err}");
    assert_eq!(
        std::fs::read(dir.join("demo-origin.yaml")).unwrap(),
        repository_file("series/examples/demo-origin.yaml")
    );
    let (code, _, _) = loopwise(&["demo", "--print-file", "--write", target]);
    assert_eq!(code, 2);
}
