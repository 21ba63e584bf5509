//! What every test of the binary needs: run `loopwise` as a user would and
//! collect its exit code, standard output and standard error.

use std::io::Write;
use std::process::{Command, Stdio};

pub fn loopwise(args: &[&str]) -> (i32, String, String) {
    let out = Command::new(env!("CARGO_BIN_EXE_loopwise"))
        .args(args)
        .output()
        .expect("the binary runs");
    (
        out.status.code().unwrap_or(-1),
        String::from_utf8_lossy(&out.stdout).into_owned(),
        String::from_utf8_lossy(&out.stderr).into_owned(),
    )
}

/// `loopwise` with `input` on its standard input; only the tests of the
/// commands that read files use it, hence the allowance in the others.
#[allow(dead_code)]
pub fn loopwise_with_stdin(args: &[&str], input: &str) -> (i32, String, String) {
    let mut child = Command::new(env!("CARGO_BIN_EXE_loopwise"))
        .args(args)
        .stdin(Stdio::piped())
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .expect("the binary runs");
    child
        .stdin
        .take()
        .expect("a pipe")
        .write_all(input.as_bytes())
        .expect("the binary reads its input");
    let out = child.wait_with_output().expect("the binary ends");
    (
        out.status.code().unwrap_or(-1),
        String::from_utf8_lossy(&out.stdout).into_owned(),
        String::from_utf8_lossy(&out.stderr).into_owned(),
    )
}

/// The diagnoses of a JSON report, as text.
#[allow(dead_code)]
pub fn diagnoses(v: &serde_json::Value) -> Vec<String> {
    v["diagnoses"]
        .as_array()
        .unwrap()
        .iter()
        .map(|d| d.as_str().unwrap().to_string())
        .collect()
}
