//! The `loopwise` binary: argument parsing and wiring only; the work is done
//! by the library and the exit code is decided in one place.

mod cli;

fn main() {
    std::process::exit(cli::run());
}
