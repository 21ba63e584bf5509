//! `loopwise check FILE...` and `loopwise demo [cusp]`: compare series files with
//! their predictions and print the verdicts.

use std::path::{Path, PathBuf};

use clap::Args as ClapArgs;

use loopwise::check;
use loopwise::check::propose::propose;
use loopwise::input::catalogue::Catalogue;
use loopwise::input::seriesfile::{parse_series_text, read_series_file, SeriesFile, STDIN_NAME};
use loopwise::report::cas::{self, Cas};
use loopwise::report::check::{joined, render, render_identified, render_unusable};
use loopwise::{Error, Result};

use super::progress::Progress;
use super::{emit, in_range, CheckFormatArg, DataFormatArg, Outcome, Written};
use loopwise::limits::MAX_CHECK_DIGITS;

/// The demo's series file, shipped in the binary.
pub(super) const DEMO: &str = include_str!("../../series/examples/demo-cusp.yaml");
pub(super) const DEMO_NAME: &str = "series/examples/demo-cusp.yaml";

#[derive(ClapArgs, Debug)]
pub struct Args {
    /// Series files (YAML) to check, `-` for standard input; see the README for the format.
    #[arg(required = true)]
    pub files: Vec<PathBuf>,
    /// Output format; JSON gives one object per file, an array for several
    /// (a file that cannot be used is an object with `error`); mathematica and
    /// maple write the exact predicted and supplied coefficients of one file
    /// as one expression.
    #[arg(long, value_enum, default_value = "text")]
    pub format: CheckFormatArg,
    /// Working decimal digits of numerical comparisons.
    #[arg(long, default_value_t = 30)]
    pub digits: u32,
    /// Propose an exact form for every numerical entry that agrees (PSLQ in
    /// the weight basis of the predicted coefficient; numerical identification).
    #[arg(long)]
    pub identify: bool,
}

fn run_one(file: &SeriesFile, catalogue: &Catalogue, digits: u32) -> Result<check::Comparison> {
    let mut progress = Progress::new();
    let c = check::check(file, catalogue, digits, &mut |what, done, total| {
        progress.update(what, done, total)
    });
    progress.finish();
    c
}

/// The name a file goes by in reports, as the reader names it.
fn display_name(path: &Path) -> String {
    if path.as_os_str() == "-" {
        STDIN_NAME.to_string()
    } else {
        path.display().to_string()
    }
}

pub fn run(args: &Args, catalogue: &Catalogue) -> Result<Outcome> {
    in_range("--digits", args.digits, 6, MAX_CHECK_DIGITS)?;
    let format = match Written::from(args.format) {
        Written::Data(format) => format,
        Written::Cas(system) => return run_cas(args, catalogue, system),
    };
    if args.files.iter().filter(|p| p.as_os_str() == "-").count() > 1 {
        return Err(Error::input(
            "`-` (standard input) is given more than once; it can be read only once",
        ));
    }
    let checked =
        |p: &PathBuf| read_series_file(p).and_then(|f| run_one(&f, catalogue, args.digits));
    // One file that cannot be used is the whole answer; among several, it is
    // one entry of the report and the others are still checked.
    let report = |c: &check::Comparison| -> Result<String> {
        if args.identify {
            render_identified(c, &propose(c, catalogue)?, format)
        } else {
            render(c, format)
        }
    };
    if let [only] = args.files.as_slice() {
        let c = checked(only)?;
        emit(&report(&c)?)?;
        return Ok(if c.agrees() {
            Outcome::Done
        } else {
            Outcome::Differs
        });
    }
    let results: Vec<(String, Result<check::Comparison>)> = args
        .files
        .iter()
        .map(|p| (display_name(p), checked(p)))
        .collect();
    let mut parts = Vec::new();
    for (name, r) in &results {
        parts.push(match r {
            Ok(c) => report(c)?,
            Err(e) => {
                eprintln!("loopwise: {e}");
                render_unusable(name, e, format)?
            }
        });
    }
    emit(&joined(&parts, format))?;
    Ok(if results.iter().any(|(_, r)| r.is_err()) {
        Outcome::Unusable
    } else if results
        .iter()
        .any(|(_, r)| r.as_ref().is_ok_and(|c| !c.agrees()))
    {
        Outcome::Differs
    } else {
        Outcome::Done
    })
}

/// The exact parts of one file's check, for a computer-algebra system.
fn run_cas(args: &Args, catalogue: &Catalogue, system: Cas) -> Result<Outcome> {
    let [only] = args.files.as_slice() else {
        return Err(Error::input(format!(
            "--format {} writes one expression for one file; {} files were given (check them one at a time)",
            system.name().to_lowercase(),
            args.files.len()
        )));
    };
    if args.identify {
        return Err(Error::input(format!(
            "--identify proposes forms for numbers, which --format {} does not write; use text, json or yaml",
            system.name().to_lowercase()
        )));
    }
    let c = read_series_file(only).and_then(|f| run_one(&f, catalogue, args.digits))?;
    emit(&cas::check(&c, system)?)?;
    Ok(if c.agrees() {
        Outcome::Done
    } else {
        Outcome::Differs
    })
}

/// Runs the check on the built-in fictional scenario. It always exits 0:
/// finding the planted mistake is what the demo is for.
pub fn demo(format: DataFormatArg, catalogue: &Catalogue) -> Result<Outcome> {
    let file = parse_series_text(DEMO, DEMO_NAME)?;
    let c = run_one(&file, catalogue, 30)?;
    let mut text = String::new();
    if matches!(format, DataFormatArg::Text) {
        text.push_str(
            "loopwise demo: an invented group's seven-loop cusp results (fictional data, shipped\n",
        );
        text.push_str(
            "in series/examples/demo-cusp.yaml) checked order by order against the prediction.\n\n",
        );
    }
    text.push_str(&render(&c, format.into())?);
    emit(&text)?;
    Ok(Outcome::Done)
}
