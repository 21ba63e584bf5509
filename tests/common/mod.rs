//! What every test of the binary needs: run `loopwise` as a user would and
//! collect its exit code, standard output and standard error.

use std::process::Command;

pub fn loopwise(args: &[&str]) -> (i32, String, String) {
    let out = Command::new(env!("CARGO_BIN_EXE_loopwise")).args(args).output().expect("the binary runs");
    (
        out.status.code().unwrap_or(-1),
        String::from_utf8_lossy(&out.stdout).into_owned(),
        String::from_utf8_lossy(&out.stderr).into_owned(),
    )
}
