//! `loopwise completions SHELL`: the shell's completion script, generated
//! from the argument definitions so that it never falls behind them.

use clap::{Args as ClapArgs, CommandFactory};
use clap_complete::Shell;

use loopwise::Result;

use super::{emit, Cli, Outcome};

#[derive(ClapArgs, Debug)]
pub struct Args {
    /// The shell the script is for.
    #[arg(value_enum)]
    pub shell: Shell,
}

pub fn run(args: &Args) -> Result<Outcome> {
    let mut command = Cli::command();
    let mut script = Vec::new();
    clap_complete::generate(args.shell, &mut command, "loopwise", &mut script);
    emit(&String::from_utf8_lossy(&script))?;
    Ok(Outcome::Done)
}
