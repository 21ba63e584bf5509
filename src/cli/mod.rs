//! Command-line arguments (clap derive) and the one map from outcomes to exit
//! codes: 0 when results were produced or everything agreed, 1 when a check
//! finds a difference or leaves a supplied order uncompared, 2 when input
//! could not be used; a closed standard output ends a run with 0. Messages
//! go to stderr, results alone to stdout.

mod check;
mod completions;
mod demo;
mod eval;
mod expand;
mod identify;
mod init;
mod manual;
mod origin;
mod progress;
mod strong;
mod values;

use std::io::Write;
use std::path::{Path, PathBuf};

use clap::{Parser, Subcommand, ValueEnum};

use loopwise::exact::coupling::Coupling;
use loopwise::exact::ring::EvenStyle;
use loopwise::input::catalogue::Catalogue;
use loopwise::report::cas::Cas;
use loopwise::report::{output_error, DataFormat, Format};
use loopwise::{Error, ErrorKind, Result};

/// Exact and finite-coupling predictions for planar N=4 super-Yang-Mills loop
/// coefficients, and order-by-order checks of your own results against them.
#[derive(Parser, Debug)]
#[command(name = "loopwise", version, about, long_about = None)]
pub struct Cli {
    /// A directory of extra catalogue entries (*.yaml); an entry with a
    /// built-in name replaces the built-in one.
    #[arg(long, global = true, value_name = "DIR")]
    pub catalog: Option<PathBuf>,

    #[command(subcommand)]
    pub command: Command,
}

#[derive(Subcommand, Debug)]
pub enum Command {
    /// Show the catalogue of named predictions.
    List,
    /// Exact loop coefficients of a prediction, order by order.
    Expand(expand::Args),
    /// Check the loop coefficients of series files against their predictions.
    Check(check::Args),
    /// Evaluate one expression numerically to many digits.
    Eval(eval::Args),
    /// Run `check` (cusp, the default) or `origin` on a built-in, fictional seven-loop dataset.
    Demo(demo::Args),
    /// Read a six-gluon origin series: exponentiation, Gamma_oct, Gamma_hex and C0 order by order.
    Origin(origin::OriginArgs),
    /// Fit loop coefficients as an exact rational combination of basis series.
    Fit(origin::FitArgs),
    /// Values at finite coupling, with error estimates.
    At(values::AtArgs),
    /// Values on a grid of couplings, as CSV or JSON; a part of the grid with --shard.
    Scan(values::ScanArgs),
    /// Join the outputs of `scan --shard K/N` into the output of the whole scan.
    Merge(values::MergeArgs),
    /// Draw finite-coupling curves, weak- and strong-coupling expansions (SVG or PDF).
    Plot(values::PlotArgs),
    /// Radius of convergence of the weak-coupling series (ratio and root tests).
    Radius(values::RadiusArgs),
    /// Compare the summed weak-coupling series with the numerical engine.
    Selftest,
    /// Identify a number as a rational combination of zeta values, pi powers or a given basis (PSLQ).
    Identify(identify::Args),
    /// Fit the strong-coupling expansion c1 g + c0 + c-1/g + ... to values at large g, and identify its coefficients.
    Strong(strong::Args),
    /// Write a commented series file to start from, whose example entries pass `check`.
    Init(init::Args),
    /// Print a shell's completion script (bash, zsh, fish, elvish, powershell).
    Completions(completions::Args),
    /// Print the manual page (roff), or write one page per command with --dir.
    Manual(manual::Args),
}

/// Output formats, as the command line spells them.
#[derive(Clone, Copy, Debug, ValueEnum)]
pub enum FormatArg {
    Text,
    Json,
    Yaml,
    Latex,
    /// One Wolfram Language expression: the list of coefficients.
    Mathematica,
    /// One Maple expression: the list of coefficients.
    Maple,
}

impl From<FormatArg> for Format {
    fn from(f: FormatArg) -> Self {
        match f {
            FormatArg::Text => Format::Text,
            FormatArg::Json => Format::Json,
            FormatArg::Yaml => Format::Yaml,
            FormatArg::Latex => Format::Latex,
            FormatArg::Mathematica => Format::Mathematica,
            FormatArg::Maple => Format::Maple,
        }
    }
}

/// Output formats of reports that have no LaTeX form.
#[derive(Clone, Copy, Debug, ValueEnum)]
pub enum DataFormatArg {
    Text,
    Json,
    Yaml,
}

impl From<DataFormatArg> for DataFormat {
    fn from(f: DataFormatArg) -> Self {
        match f {
            DataFormatArg::Text => DataFormat::Text,
            DataFormatArg::Json => DataFormat::Json,
            DataFormatArg::Yaml => DataFormat::Yaml,
        }
    }
}

/// Output formats of reports with exact parts (`check`, `origin`).
#[derive(Clone, Copy, Debug, ValueEnum)]
pub enum CheckFormatArg {
    Text,
    Json,
    Yaml,
    /// The exact parts as one Wolfram Language expression.
    Mathematica,
    /// The exact parts as one Maple expression.
    Maple,
}

/// Where a report with exact parts goes: a data format, or a computer-algebra system.
pub enum Written {
    Data(DataFormat),
    Cas(Cas),
}

impl From<CheckFormatArg> for Written {
    fn from(f: CheckFormatArg) -> Self {
        match f {
            CheckFormatArg::Text => Written::Data(DataFormat::Text),
            CheckFormatArg::Json => Written::Data(DataFormat::Json),
            CheckFormatArg::Yaml => Written::Data(DataFormat::Yaml),
            CheckFormatArg::Mathematica => Written::Cas(Cas::Mathematica),
            CheckFormatArg::Maple => Written::Cas(Cas::Maple),
        }
    }
}

/// How even zeta values are written.
#[derive(Clone, Copy, Debug, ValueEnum)]
pub enum EvenArg {
    /// pi^(2n)
    Pi,
    /// zeta(2n) times a rational
    Zeta,
}

impl From<EvenArg> for EvenStyle {
    fn from(e: EvenArg) -> Self {
        match e {
            EvenArg::Pi => EvenStyle::Pi,
            EvenArg::Zeta => EvenStyle::Zeta,
        }
    }
}

/// Coupling conventions, as the command line spells them.
#[derive(Clone, Copy, Debug, ValueEnum)]
pub enum CouplingArg {
    /// g^2 = lambda/(16 pi^2)
    G2,
    /// a = lambda/(8 pi^2) = 2 g^2
    A,
    /// the 't Hooft coupling
    Lambda,
}

impl From<CouplingArg> for Coupling {
    fn from(c: CouplingArg) -> Self {
        match c {
            CouplingArg::G2 => Coupling::G2,
            CouplingArg::A => Coupling::A,
            CouplingArg::Lambda => Coupling::Lambda,
        }
    }
}

/// What a command hands back to the exit-code map.
pub enum Outcome {
    /// Results were produced (or everything agreed).
    Done,
    /// A comparison found a difference, or could not compare every supplied order.
    Differs,
    /// Some input could not be used, but the report on the rest was printed
    /// (its messages are already on stderr).
    Unusable,
}

/// Parses the arguments, runs the command, prints and returns the exit code.
pub fn run() -> i32 {
    let cli = Cli::parse();
    match dispatch(&cli) {
        Ok(Outcome::Done) => 0,
        Ok(Outcome::Differs) => 1,
        Ok(Outcome::Unusable) => 2,
        Err(e) => {
            let code = exit_code(e.kind());
            if code != 0 {
                eprintln!("loopwise: {e}");
            }
            code
        }
    }
}

/// The exit code of a run that ended in an error: a reader that stopped
/// reading (`| head`) ends the run normally; input that cannot be parsed or
/// used, numbers out of range, files that cannot be read or written and
/// accuracy the engine cannot reach all mean "unusable", 2. The kinds are
/// non-exhaustive, so a kind added later is unusable until it is mapped here.
fn exit_code(kind: ErrorKind) -> i32 {
    match kind {
        ErrorKind::Closed => 0,
        ErrorKind::Parse
        | ErrorKind::Input
        | ErrorKind::Range
        | ErrorKind::Io
        | ErrorKind::Numeric => 2,
        _ => 2,
    }
}

fn dispatch(cli: &Cli) -> Result<Outcome> {
    let catalogue = load_catalogue(cli)?;
    match &cli.command {
        Command::List => list(&catalogue),
        Command::Expand(args) => expand::run(args, &catalogue),
        Command::Check(args) => check::run(args, &catalogue),
        Command::Eval(args) => eval::run(args, &catalogue),
        Command::Demo(args) => demo::run(args, &catalogue),
        Command::Origin(args) => origin::origin(args, &catalogue),
        Command::Fit(args) => origin::fit(args, &catalogue),
        Command::At(args) => values::at(args, &catalogue),
        Command::Scan(args) => values::scan(args, &catalogue),
        Command::Merge(args) => values::merge(args),
        Command::Plot(args) => values::plot(args, &catalogue),
        Command::Radius(args) => values::radius(args, &catalogue),
        Command::Selftest => values::selftest(),
        Command::Identify(args) => identify::run(args, &catalogue),
        Command::Strong(args) => strong::run(args, &catalogue),
        Command::Init(args) => init::run(args, &catalogue),
        Command::Completions(args) => completions::run(args),
        Command::Manual(args) => manual::run(args),
    }
}

fn load_catalogue(cli: &Cli) -> Result<Catalogue> {
    let mut c = Catalogue::builtin()?;
    if let Some(dir) = &cli.catalog {
        c.extend_from_dir(dir)?;
    }
    Ok(c)
}

/// An out-of-range option value as the one error message the user sees.
pub fn in_range(option: &str, value: u32, lo: u32, hi: u32) -> Result<()> {
    if (lo..=hi).contains(&value) {
        Ok(())
    } else {
        Err(Error::range(format!(
            "{option} {value} is out of range: {lo} to {hi}"
        )))
    }
}

/// Writes a finished report to stdout. A reader that closed the pipe (`| head`)
/// ends the run quietly and with success: it has read all it wanted.
pub fn emit(text: &str) -> Result<()> {
    let mut out = std::io::stdout().lock();
    out.write_all(text.as_bytes())
        .and_then(|_| out.flush())
        .map_err(output_error)
}

/// Writes `text` to a new file at `path`; an existing file is replaced only
/// with `force`, and otherwise left as it was (the check and the creation are
/// one step, so no file appearing in between is lost).
pub fn write_new(path: &Path, text: &str, force: bool) -> Result<()> {
    let mut options = std::fs::OpenOptions::new();
    options.write(true);
    if force {
        options.create(true).truncate(true);
    } else {
        options.create_new(true);
    }
    let cannot = |e: std::io::Error| Error::io(format!("cannot write {}: {e}", path.display()));
    let mut file = options.open(path).map_err(|e| {
        if e.kind() == std::io::ErrorKind::AlreadyExists {
            Error::input(format!(
                "{} exists already and was left as it is; give --force to replace it",
                path.display()
            ))
        } else {
            cannot(e)
        }
    })?;
    file.write_all(text.as_bytes()).map_err(cannot)
}

fn list(catalogue: &Catalogue) -> Result<Outcome> {
    let width = catalogue.names().map(str::len).max().unwrap_or(4);
    let def_width = catalogue
        .entries()
        .map(|e| e.definition.len())
        .max()
        .unwrap_or(10);
    let mut out = String::new();
    for e in catalogue.entries() {
        let status = match e.status {
            loopwise::input::catalogue::Status::Established => "established",
            loopwise::input::catalogue::Status::Conjecture => "CONJECTURE",
        };
        out.push_str(&format!(
            "{:<width$}  {:<def_width$}  {:<11}  {}\n",
            e.name, e.definition, status, e.summary
        ));
    }
    out.push_str("\nAny functional works as a quantity too: Gamma(ANGLE) or Delta(ANGLE), with ANGLE a rational\n");
    out.push_str("multiple of pi (0, pi/6, pi/4, pi/3, pi/2, ...), c2=P/Q for cos^2 of the tilt, or c2 for a symbolic tilt.\n");
    emit(&out)?;
    Ok(Outcome::Done)
}

#[cfg(test)]
mod tests {
    use super::*;
    use clap::CommandFactory;

    /// clap's own consistency checks, and a help line for every command and
    /// every argument, so `--help` stays complete as options are added.
    #[test]
    fn help_is_complete() {
        let cli = Cli::command();
        cli.clone().debug_assert();
        for sub in cli.get_subcommands() {
            assert!(
                sub.get_about().is_some(),
                "command `{}` has no help",
                sub.get_name()
            );
            for arg in sub.get_arguments() {
                if arg.get_id() == "help" {
                    continue;
                }
                assert!(
                    arg.get_help().is_some(),
                    "`{} {}` has no help",
                    sub.get_name(),
                    arg.get_id()
                );
            }
        }
    }

    /// The documented exit codes (README): 0 for a closed pipe, 2 for
    /// everything else that ends a run in an error.
    #[test]
    fn error_kinds_map_to_documented_exit_codes() {
        assert_eq!(exit_code(ErrorKind::Closed), 0);
        for kind in [
            ErrorKind::Parse,
            ErrorKind::Input,
            ErrorKind::Range,
            ErrorKind::Io,
            ErrorKind::Numeric,
        ] {
            assert_eq!(exit_code(kind), 2, "{kind:?}");
        }
    }
}
