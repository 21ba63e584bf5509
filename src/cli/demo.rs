//! `loopwise demo [cusp|origin]`: run a built-in demo, or hand out its
//! fictional series file (`--print-file`, `--write DIR`), which an installed
//! binary carries inside it.

use std::path::{Path, PathBuf};

use clap::{Args as ClapArgs, ValueEnum};

use loopwise::input::catalogue::Catalogue;
use loopwise::{Error, Result};

use super::{check, emit, origin, write_new, DataFormatArg, Outcome};

/// The built-in demos.
#[derive(Clone, Copy, Debug, ValueEnum)]
pub enum DemoKind {
    /// `check` on a seven-loop cusp anomalous dimension.
    Cusp,
    /// `origin` on a seven-loop six-gluon amplitude at the origin.
    Origin,
}

#[derive(ClapArgs, Debug)]
pub struct Args {
    /// Which demo to run.
    #[arg(value_enum, default_value = "cusp")]
    pub which: DemoKind,
    /// Output format of the run.
    #[arg(long, value_enum, default_value = "text")]
    pub format: DataFormatArg,
    /// Print the demo's series file instead of running the demo (`loopwise
    /// check`, or `loopwise origin` for the origin demo, reads it).
    #[arg(long, conflicts_with = "write")]
    pub print_file: bool,
    /// Write the demo's series file into DIR (created if missing) under its
    /// name in the repository, demo-cusp.yaml or demo-origin.yaml, instead
    /// of running the demo.
    #[arg(long, value_name = "DIR")]
    pub write: Option<PathBuf>,
    /// With --write: replace the file if it exists.
    #[arg(long, requires = "write")]
    pub force: bool,
}

pub fn run(args: &Args, catalogue: &Catalogue) -> Result<Outcome> {
    let (text, name) = match args.which {
        DemoKind::Cusp => (check::DEMO, check::DEMO_NAME),
        DemoKind::Origin => (origin::DEMO, origin::DEMO_NAME),
    };
    if args.print_file {
        emit(text)?;
        return Ok(Outcome::Done);
    }
    if let Some(dir) = &args.write {
        std::fs::create_dir_all(dir)
            .map_err(|e| Error::io(format!("cannot create {}: {e}", dir.display())))?;
        let file_name = Path::new(name).file_name().unwrap_or(name.as_ref());
        let path = dir.join(file_name);
        write_new(&path, text, args.force)?;
        eprintln!("loopwise: wrote {}", path.display());
        return Ok(Outcome::Done);
    }
    match args.which {
        DemoKind::Cusp => check::demo(args.format, catalogue),
        DemoKind::Origin => origin::demo(args.format, catalogue),
    }
}
