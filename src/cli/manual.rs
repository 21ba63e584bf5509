//! `loopwise manual`: the manual page (roff), generated from the argument
//! definitions: one page on standard output, or a page per command in a
//! directory.

use std::path::{Path, PathBuf};

use clap::{Args as ClapArgs, CommandFactory};
use clap_mangen::Man;

use loopwise::{Error, Result};

use super::{emit, Cli, Outcome};

#[derive(ClapArgs, Debug)]
pub struct Args {
    /// Write loopwise.1 and one page per command (loopwise-check.1, ...) into
    /// DIR, created if missing, replacing pages already there, instead of
    /// printing the main page.
    #[arg(long, value_name = "DIR")]
    pub dir: Option<PathBuf>,
}

pub fn run(args: &Args) -> Result<Outcome> {
    match &args.dir {
        None => {
            emit(&page(&Man::new(command()).source(source()))?)?;
        }
        Some(dir) => {
            let written = write_pages(dir)?;
            eprintln!(
                "loopwise: wrote {written} manual pages into {}",
                dir.display()
            );
        }
    }
    Ok(Outcome::Done)
}

/// The argument definitions as the pages show them: built, so that every
/// command has its full name (`loopwise-check`, which names its page), and
/// without the `help` command, which only repeats the others and has no page.
fn command() -> clap::Command {
    let mut command = Cli::command().disable_help_subcommand(true);
    command.build();
    command
}

/// A page names its source as `man` prints it in the footer: the program
/// and its version, also on the pages of the commands.
fn source() -> String {
    format!("loopwise {}", env!("CARGO_PKG_VERSION"))
}

fn page(man: &Man) -> Result<String> {
    let mut roff = Vec::new();
    man.render(&mut roff)
        .map_err(|e| Error::io(format!("cannot render the manual page: {e}")))?;
    String::from_utf8(roff).map_err(|e| Error::io(format!("the manual page is not UTF-8: {e}")))
}

/// The main page and one per command, named as `man` looks them up.
fn write_pages(dir: &Path) -> Result<usize> {
    std::fs::create_dir_all(dir)
        .map_err(|e| Error::io(format!("cannot create {}: {e}", dir.display())))?;
    let command = command();
    let mut commands = vec![command.clone()];
    commands.extend(
        command
            .get_subcommands()
            .filter(|c| !c.is_hide_set())
            .cloned(),
    );
    for c in &commands {
        let man = Man::new(c.clone()).source(source());
        let path = dir.join(man.get_filename());
        std::fs::write(&path, page(&man)?)
            .map_err(|e| Error::io(format!("cannot write {}: {e}", path.display())))?;
    }
    Ok(commands.len())
}
