//! `loopwise check FILE...` and `loopwise demo [cusp]`: compare series files with
//! their predictions and print the verdicts.

use std::path::PathBuf;

use clap::{Args as ClapArgs, ValueEnum};

use loopwise::catalogue::Catalogue;
use loopwise::compare;
use loopwise::report::{check::render, Format};
use loopwise::seriesfile::{parse_series_text, read_series_file, SeriesFile};
use loopwise::Result;

use super::progress::Progress;
use super::{emit, DataFormatArg, Outcome, in_range};

/// The most working digits of numerical comparisons.
pub const MAX_DIGITS: u32 = 2000;

/// The demo's series file, shipped in the binary.
const DEMO: &str = include_str!("../../series/examples/demo-cusp.yaml");
const DEMO_NAME: &str = "series/examples/demo-cusp.yaml";

#[derive(ClapArgs, Debug)]
pub struct Args {
    /// Series files (YAML) to check; see the README for the format.
    #[arg(required = true)]
    pub files: Vec<PathBuf>,
    /// Output format; JSON gives one object per file, an array for several.
    #[arg(long, value_enum, default_value = "text")]
    pub format: DataFormatArg,
    /// Working decimal digits of numerical comparisons.
    #[arg(long, default_value_t = 30)]
    pub digits: u32,
}

/// The built-in demos.
#[derive(Clone, Copy, Debug, ValueEnum)]
pub enum DemoKind {
    /// `check` on a seven-loop cusp anomalous dimension.
    Cusp,
    /// `origin` on a seven-loop six-gluon amplitude at the origin.
    Origin,
}

#[derive(ClapArgs, Debug)]
pub struct DemoArgs {
    /// Which demo to run.
    #[arg(value_enum, default_value = "cusp")]
    pub which: DemoKind,
    /// Output format.
    #[arg(long, value_enum, default_value = "text")]
    pub format: DataFormatArg,
}


fn run_one(file: &SeriesFile, catalogue: &Catalogue, digits: u32) -> Result<compare::Comparison> {
    let mut progress = Progress::new();
    let c = compare::check(file, catalogue, digits, &mut |what, done, total| progress.update(what, done, total));
    progress.finish();
    c
}

pub fn run(args: &Args, catalogue: &Catalogue) -> Result<Outcome> {
    in_range("--digits", args.digits, 6, MAX_DIGITS)?;
    let format: Format = args.format.into();
    let files = args.files.iter().map(|p| read_series_file(p)).collect::<Result<Vec<_>>>()?;
    let comparisons = files.iter().map(|f| run_one(f, catalogue, args.digits)).collect::<Result<Vec<_>>>()?;
    let differs = comparisons.iter().any(compare::Comparison::any_differs);
    let text = match (format, comparisons.len()) {
        (Format::Json, n) if n > 1 => {
            let parts = comparisons.iter().map(|c| render(c, format)).collect::<Result<Vec<_>>>()?;
            format!("[\n{}]\n", parts.iter().map(|p| p.trim_end().to_string()).collect::<Vec<_>>().join(",\n"))
        }
        _ => comparisons.iter().map(|c| render(c, format)).collect::<Result<Vec<_>>>()?.join("\n"),
    };
    emit(&text)?;
    Ok(if differs { Outcome::Differs } else { Outcome::Done })
}

/// Runs the check on the built-in fictional scenario. It always exits 0:
/// finding the planted mistake is what the demo is for.
pub fn demo(args: &DemoArgs, catalogue: &Catalogue) -> Result<Outcome> {
    let file = parse_series_text(DEMO, DEMO_NAME)?;
    let c = run_one(&file, catalogue, 30)?;
    let mut text = String::new();
    if matches!(args.format, DataFormatArg::Text) {
        text.push_str("loopwise demo: an invented group's seven-loop cusp results (fictional data, shipped\n");
        text.push_str("in series/examples/demo-cusp.yaml) checked order by order against the prediction.\n\n");
    }
    text.push_str(&render(&c, args.format.into())?);
    emit(&text)?;
    Ok(Outcome::Done)
}
