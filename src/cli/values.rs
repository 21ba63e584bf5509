//! The finite-coupling commands: `at`, `scan`, `plot`, `radius` and
//! `selftest`. Arguments are checked before any expensive work starts.

use std::path::PathBuf;

use clap::{Args as ClapArgs, ValueEnum};
use rug::Float;

use loopwise::input::catalogue::Catalogue;

use loopwise::input::seriesfile::read_input;
use loopwise::numeric::{bits_for_digits, working_bits};
use loopwise::quantity::curves::{self, Companions};
use loopwise::quantity::finite::{self, parse_couplings, GridPoints};
use loopwise::quantity::selftest::{self_checks, SelfCheck};
use loopwise::quantity::shard::{self, ScanId, Shard};
use loopwise::quantity::Quantity;
use loopwise::report::figure::{self, FigureFormat};
use loopwise::report::values::{
    radius_text, scan_row, scan_rows, scan_text, selftest_text, shard_text, AtReport, AtRow,
};
use loopwise::{Error, Result};

use super::progress::Progress;
use super::{emit, DataFormatArg, Outcome};
use loopwise::limits::MAX_FINITE_DIGITS;
use loopwise::limits::MAX_LOOPS;
use loopwise::limits::MAX_PLOT_POINTS;
use loopwise::limits::MAX_POINTS;

/// Points of a START:STOP grid when `--points` is not given.
const DEFAULT_POINTS: usize = 61;

fn grid_points(points: Option<usize>) -> GridPoints {
    points.map_or(GridPoints::Default(DEFAULT_POINTS), GridPoints::Given)
}

pub fn check_digits(digits: u32) -> Result<()> {
    if digits == 0 || digits > MAX_FINITE_DIGITS {
        return Err(Error::range(format!(
            "--digits {digits} is out of range: the finite-coupling engine delivers 1 to {MAX_FINITE_DIGITS} digits honestly"
        )));
    }
    Ok(())
}

#[derive(ClapArgs, Debug)]
pub struct AtArgs {
    /// A catalogue name or a formula in the functionals (any real tilt: Gamma(0.3), Delta(c2=0.2)).
    #[arg(allow_hyphen_values = true)]
    pub quantity: String,
    /// Couplings g (g^2 = lambda/(16 pi^2)), 0 to 200: a list 0.1,0.5,1,2 or a grid START:STOP:STEP.
    #[arg(long, default_value = "0.1,0.5,1,2", allow_hyphen_values = true)]
    pub g: String,
    /// Significant digits wanted; only digits the error estimate supports are printed.
    #[arg(long, default_value_t = 20)]
    pub digits: u32,
    /// Output format.
    #[arg(long, value_enum, default_value = "text")]
    pub format: DataFormatArg,
}

pub fn at(args: &AtArgs, catalogue: &Catalogue) -> Result<Outcome> {
    check_digits(args.digits)?;
    let prec = bits_for_digits(args.digits) + 64;
    let couplings = parse_couplings(&args.g, GridPoints::NoCount, MAX_POINTS, prec)?;
    let quantity = Quantity::resolve(&args.quantity, catalogue)?;
    let mut progress = Progress::new();
    let values = finite::values(&quantity, &couplings, args.digits, &mut |d, t| {
        progress.update("finite coupling", d, t)
    });
    progress.finish();
    let rows = couplings
        .iter()
        .zip(values?)
        .map(|(g, estimate)| {
            let strong = if g.is_zero() {
                None
            } else {
                finite::strong_coupling(&quantity, g, prec)?
            };
            Ok(AtRow {
                g: g.clone(),
                estimate,
                strong,
            })
        })
        .collect::<Result<Vec<_>>>()?;
    let report = AtReport {
        quantity: quantity.label.clone(),
        definition: quantity.definition.clone(),
        entry: quantity.entry.clone(),
        digits: args.digits,
        rows,
    };
    emit(&report.render(args.format.into())?)?;
    Ok(Outcome::Done)
}

/// Output formats of `scan`.
#[derive(Clone, Copy, Debug, ValueEnum)]
pub enum ScanFormat {
    Csv,
    Json,
}

#[derive(ClapArgs, Debug)]
pub struct ScanArgs {
    /// A catalogue name or a formula in the functionals.
    #[arg(allow_hyphen_values = true)]
    pub quantity: String,
    /// The grid, 0 <= g <= 200: START:STOP:STEP, or START:STOP with --points values.
    #[arg(long, default_value = "0:4:0.05", allow_hyphen_values = true)]
    pub g: String,
    /// Number of points of a START:STOP grid, ends included (2 to 100000) [default: 61];
    /// not with a STEP.
    #[arg(long)]
    pub points: Option<usize>,
    /// Significant digits wanted.
    #[arg(long, default_value_t = 15)]
    pub digits: u32,
    /// Output format.
    #[arg(long, value_enum, default_value = "csv")]
    pub format: ScanFormat,
    /// Compute only part K of N of the grid (points K-1, K-1+N, ...), e.g. a
    /// batch job array's task number as K; `loopwise merge` joins the parts.
    #[arg(long, value_name = "K/N")]
    pub shard: Option<String>,
}

#[derive(ClapArgs, Debug)]
pub struct MergeArgs {
    /// The outputs of `scan --shard K/N`, one per part, in any order.
    #[arg(required = true)]
    pub files: Vec<PathBuf>,
}

pub fn scan(args: &ScanArgs, catalogue: &Catalogue) -> Result<Outcome> {
    check_digits(args.digits)?;
    if !args.g.contains(':') {
        return Err(Error::input(format!(
            "--g {}: a scan takes a grid START:STOP:STEP or START:STOP",
            args.g
        )));
    }
    let shard = args.shard.as_deref().map(Shard::parse).transpose()?;
    let prec = bits_for_digits(args.digits) + 64;
    let couplings = parse_couplings(&args.g, grid_points(args.points), MAX_POINTS, prec)?;
    let quantity = Quantity::resolve(&args.quantity, catalogue)?;
    let json = matches!(args.format, ScanFormat::Json);
    let points: Vec<usize> = match shard {
        Some(s) => s.points(couplings.len()),
        None => (0..couplings.len()).collect(),
    };
    let chosen: Vec<Float> = points.iter().map(|&i| couplings[i].clone()).collect();
    let mut progress = Progress::new();
    let values = finite::values(&quantity, &chosen, args.digits, &mut |d, t| {
        progress.update("scan", d, t)
    });
    progress.finish();
    let values = values?;
    let text = match shard {
        None => scan_rows(&chosen, &values, args.digits, json)?,
        Some(s) => {
            let id = ScanId {
                quantity: args.quantity.clone(),
                grid: match args.points {
                    Some(n) => format!("{} --points {n}", args.g),
                    None => args.g.clone(),
                },
                digits: args.digits,
                points: couplings.len(),
            };
            let rows = chosen
                .iter()
                .zip(&values)
                .map(|(g, e)| scan_row(g, e, args.digits))
                .collect();
            shard_text(s, &id, &points, rows, json)?
        }
    };
    emit(&text)?;
    Ok(Outcome::Done)
}

pub fn merge(args: &MergeArgs) -> Result<Outcome> {
    let files = args
        .files
        .iter()
        .map(|p| read_input(p).map(|(text, name)| (name, text)))
        .collect::<Result<Vec<_>>>()?;
    let merged = shard::merge(&files)?;
    emit(&scan_text(&merged.rows, merged.json)?)?;
    Ok(Outcome::Done)
}

#[derive(ClapArgs, Debug)]
pub struct PlotArgs {
    /// One or more catalogue names or formulas.
    #[arg(required = true)]
    pub quantities: Vec<String>,
    /// The range of g, 0 <= g <= 200: START:STOP, or START:STOP:STEP.
    #[arg(long, default_value = "0:3", allow_hyphen_values = true)]
    pub g: String,
    /// Points along a START:STOP range, ends included (2 to 2000) [default: 61]; not with a STEP.
    #[arg(long)]
    pub points: Option<usize>,
    /// Weak-coupling truncations to draw, as loop orders (e.g. 2,4,8); `none` for none.
    #[arg(long, default_value = "2,4,8")]
    pub loops: String,
    /// Also draw the [n/n] Padé approximant (in g^2) of the weak-coupling series.
    #[arg(long, value_name = "N")]
    pub pade: Option<usize>,
    /// Leave out the strong-coupling expansions of the catalogue.
    #[arg(long)]
    pub no_strong: bool,
    /// Draw the strong-coupling expansions from this coupling on (0 < G <= 200) [default: 0.5].
    #[arg(long, value_name = "G", allow_negative_numbers = true)]
    pub strong_from: Option<f64>,
    /// The file to write: SVG, or PDF when it ends in .pdf.
    #[arg(long, short = 'o')]
    pub out: PathBuf,
    /// The file format [default: pdf for a path ending in .pdf, else svg].
    #[arg(long, value_enum)]
    pub format: Option<FigureFormatArg>,
}

/// The file formats of `plot`.
#[derive(Clone, Copy, Debug, ValueEnum)]
pub enum FigureFormatArg {
    /// Scalable vector graphics, text as text.
    Svg,
    /// PDF with the font embedded.
    Pdf,
}

impl From<FigureFormatArg> for FigureFormat {
    fn from(f: FigureFormatArg) -> Self {
        match f {
            FigureFormatArg::Svg => FigureFormat::Svg,
            FigureFormatArg::Pdf => FigureFormat::Pdf,
        }
    }
}

pub fn plot(args: &PlotArgs, catalogue: &Catalogue) -> Result<Outcome> {
    if !args.g.contains(':') {
        return Err(Error::input(format!(
            "--g {}: a plot takes a range START:STOP or START:STOP:STEP",
            args.g
        )));
    }
    let prec = working_bits(10);
    let couplings = parse_couplings(&args.g, grid_points(args.points), MAX_PLOT_POINTS, prec)?;
    let loops: Vec<u32> = if args.loops == "none" {
        Vec::new()
    } else {
        args.loops
            .split(',')
            .map(|t| {
                t.trim()
                    .parse::<u32>()
                    .ok()
                    .filter(|&l| (1..=MAX_LOOPS).contains(&l))
                    .ok_or_else(|| {
                        Error::range(format!(
                            "--loops: `{t}` is not a loop order from 1 to {MAX_LOOPS}"
                        ))
                    })
            })
            .collect::<Result<_>>()?
    };
    if let Some(n) = args.pade {
        if n == 0 || 2 * n as u32 > MAX_LOOPS {
            return Err(Error::range(format!(
                "--pade {n} is out of range: 1 to {}",
                MAX_LOOPS / 2
            )));
        }
    }
    let quantities = args
        .quantities
        .iter()
        .map(|q| Quantity::resolve(q, catalogue))
        .collect::<Result<Vec<_>>>()?;
    if let Some(parent) = args.out.parent().filter(|p| !p.as_os_str().is_empty()) {
        if !parent.is_dir() {
            return Err(Error::io(format!(
                "{}: the directory {} does not exist",
                args.out.display(),
                parent.display()
            )));
        }
    }
    let format = figure_format(args)?;
    let strong_from = args.strong_from.unwrap_or(curves::STRONG_FROM);
    if !(strong_from > 0.0 && strong_from <= 200.0) {
        return Err(Error::range(format!(
            "--strong-from {strong_from}: the threshold must lie in 0 < G <= 200"
        )));
    }
    let companions = Companions {
        loops,
        pade: args.pade,
        strong: !args.no_strong,
        strong_from,
    };
    let mut progress = Progress::new();
    let figure = curves::figure(&quantities, &couplings, &companions, &mut |w, d, t| {
        progress.update(w, d, t)
    });
    progress.finish();
    let figure = figure?;
    for note in &figure.notes {
        eprintln!("loopwise: {note}");
    }
    let drawing = figure::write(&args.out, format, &figure, &quantities)?;
    for note in &drawing.notes {
        eprintln!("loopwise: {note}");
    }
    eprintln!("wrote {} ({} curves)", args.out.display(), drawing.drawn);
    Ok(Outcome::Done)
}

/// The format asked for: `--format`, else the path's ending; a `--format`
/// that contradicts a `.svg` or `.pdf` ending is refused, not obeyed silently.
fn figure_format(args: &PlotArgs) -> Result<FigureFormat> {
    let by_path = figure::format_of(&args.out);
    let Some(asked) = args.format.map(FigureFormat::from) else {
        return Ok(by_path);
    };
    let ending = args
        .out
        .extension()
        .and_then(|e| e.to_str())
        .map(str::to_ascii_lowercase);
    let named = match ending.as_deref() {
        Some("pdf") => Some(FigureFormat::Pdf),
        Some("svg") => Some(FigureFormat::Svg),
        _ => None,
    };
    match named {
        Some(n) if n != asked => Err(Error::input(format!(
            "{}: --format {} contradicts the file's ending",
            args.out.display(),
            if asked == FigureFormat::Pdf {
                "pdf"
            } else {
                "svg"
            }
        ))),
        _ => Ok(asked),
    }
}

#[derive(ClapArgs, Debug)]
pub struct RadiusArgs {
    /// A catalogue name or a formula (exact tilts).
    #[arg(allow_hyphen_values = true)]
    pub quantity: String,
    /// Loop orders of the exact series to use.
    #[arg(long, short = 'L', default_value_t = 30)]
    pub loops: u32,
}

pub fn radius(args: &RadiusArgs, catalogue: &Catalogue) -> Result<Outcome> {
    if args.loops < 4 || args.loops > MAX_LOOPS {
        return Err(Error::range(format!(
            "--loops {} is out of range: 4 to {MAX_LOOPS}",
            args.loops
        )));
    }
    let quantity = Quantity::resolve(&args.quantity, catalogue)?;
    let mut progress = Progress::new();
    let series = quantity.expand(args.loops, &mut |w, d, t| progress.update(w, d, t));
    progress.finish();
    let coeffs = finite::weak_coefficients(&series?, 256)?;
    let r = finite::radius(&coeffs)?;
    emit(&radius_text(&quantity.label, &r))?;
    Ok(Outcome::Done)
}

pub fn selftest() -> Result<Outcome> {
    let mut progress = Progress::new();
    let checks = self_checks(&mut |w, d, t| progress.update(w, d, t));
    progress.finish();
    let checks = checks?;
    emit(&selftest_text(&checks))?;
    Ok(if checks.iter().all(SelfCheck::passes) {
        Outcome::Done
    } else {
        Outcome::Differs
    })
}
