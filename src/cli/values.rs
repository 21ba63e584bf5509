//! The finite-coupling commands: `at`, `scan`, `plot`, `radius` and
//! `selftest`. Arguments are checked before any expensive work starts.

use std::path::PathBuf;

use clap::{Args as ClapArgs, ValueEnum};
use rug::ops::Pow;
use rug::Float;

use loopwise::input::catalogue::{Catalogue, Status};
use loopwise::kernel::{Functional, Tilt, MAX_LOOPS};
use loopwise::numeric::bits_for_digits;
use loopwise::numeric::{self, MAX_DIGITS};
use loopwise::quantity::finite::{self, parse_couplings, GridPoints};
use loopwise::quantity::Quantity;
use loopwise::report::decimal;
use loopwise::report::svg as plot;
use loopwise::report::values::{radius_text, scan_rows, AtReport, AtRow};
use loopwise::{Error, Result};
use rug::Rational;

use super::progress::Progress;
use super::{emit, DataFormatArg, Outcome};

/// The most couplings `at` and `scan` take in one run.
const MAX_POINTS: usize = 100_000;

/// The most points along a plot's range: more add nothing a figure can show.
const MAX_PLOT_POINTS: usize = 2_000;

/// Points of a START:STOP grid when `--points` is not given.
const DEFAULT_POINTS: usize = 61;

fn grid_points(points: Option<usize>) -> GridPoints {
    points.map_or(GridPoints::Default(DEFAULT_POINTS), GridPoints::Given)
}

fn check_digits(digits: u32) -> Result<()> {
    if digits == 0 || digits > MAX_DIGITS {
        return Err(Error::range(format!(
            "--digits {digits} is out of range: the finite-coupling engine delivers 1 to {MAX_DIGITS} digits honestly"
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
}

pub fn scan(args: &ScanArgs, catalogue: &Catalogue) -> Result<Outcome> {
    check_digits(args.digits)?;
    if !args.g.contains(':') {
        return Err(Error::input(format!(
            "--g {}: a scan takes a grid START:STOP:STEP or START:STOP",
            args.g
        )));
    }
    let prec = bits_for_digits(args.digits) + 64;
    let couplings = parse_couplings(&args.g, grid_points(args.points), MAX_POINTS, prec)?;
    let quantity = Quantity::resolve(&args.quantity, catalogue)?;
    let mut progress = Progress::new();
    let values = finite::values(&quantity, &couplings, args.digits, &mut |d, t| {
        progress.update("scan", d, t)
    });
    progress.finish();
    emit(&scan_rows(
        &couplings,
        &values?,
        args.digits,
        matches!(args.format, ScanFormat::Json),
    )?)?;
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
    /// The SVG file to write.
    #[arg(long, short = 'o')]
    pub out: PathBuf,
}

pub fn plot(args: &PlotArgs, catalogue: &Catalogue) -> Result<Outcome> {
    let digits = 10;
    let prec = bits_for_digits(digits) + 64;
    if !args.g.contains(':') {
        return Err(Error::input(format!(
            "--g {}: a plot takes a range START:STOP or START:STOP:STEP",
            args.g
        )));
    }
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
    let xs: Vec<f64> = couplings.iter().map(Float::to_f64).collect();
    let mut curves = Vec::new();
    let mut progress = Progress::new();
    let mut window = (f64::INFINITY, f64::NEG_INFINITY);
    for q in &quantities {
        let values = finite::values(q, &couplings, digits, &mut |d, t| {
            progress.update(&q.label, d, t)
        })?;
        let points: Vec<(f64, f64)> = xs
            .iter()
            .zip(&values)
            .map(|(x, e)| (*x, e.value.to_f64()))
            .collect();
        for p in &points {
            window = (window.0.min(p.1), window.1.max(p.1));
        }
        curves.push(plot::Curve {
            name: format!("{} (finite coupling)", q.label),
            points,
            dashed: false,
        });
    }
    progress.finish();
    let margin = 0.25 * (window.1 - window.0).max(1e-12);
    let inside = |y: f64| y >= window.0 - margin && y <= window.1 + margin;
    let mut extra = Vec::new();
    for q in &quantities {
        let top = loops
            .iter()
            .copied()
            .max()
            .unwrap_or(0)
            .max(args.pade.map_or(0, |n| 2 * n as u32));
        let coeffs = if top == 0 {
            None
        } else {
            match q.expand(top, &mut |_, _, _| {}) {
                Ok(series) => Some(finite::weak_coefficients(&series, prec)?),
                // The finite-coupling engine takes any real tilt, the exact
                // one only some: what it cannot expand is left out, not the figure.
                Err(e) => {
                    eprintln!("loopwise: {}: weak-coupling curves left out (the finite-coupling curve is drawn): {e}", q.label);
                    None
                }
            }
        };
        if let Some(coeffs) = &coeffs {
            for &l in &loops {
                let points = xs
                    .iter()
                    .zip(&couplings)
                    .map(|(x, g)| (*x, finite::weak_sum(coeffs, l as usize, g).to_f64()))
                    .collect();
                extra.push(plot::Curve {
                    name: format!("{} weak coupling, {l} loops", q.label),
                    points,
                    dashed: true,
                });
            }
            if let Some(n) = args.pade {
                let pade = finite::pade_in_g2(&coeffs[..=2 * n], n, n)?;
                let points = xs
                    .iter()
                    .zip(&couplings)
                    .map(|(x, g)| {
                        (
                            *x,
                            pade.eval(&Float::with_val(prec, g.square_ref())).to_f64(),
                        )
                    })
                    .collect();
                extra.push(plot::Curve {
                    name: format!("{} Padé [{n}/{n}] in g^2", q.label),
                    points,
                    dashed: true,
                });
            }
        }
        if !args.no_strong {
            if let Some(sc) = q.entry.as_ref().and_then(|e| e.strong_coupling.as_ref()) {
                let mut points = Vec::new();
                for (x, g) in xs.iter().zip(&couplings) {
                    if *x > 0.0 {
                        if let Some(v) = finite::strong_coupling(q, g, prec)? {
                            points.push((*x, v.to_f64()));
                        }
                    }
                }
                let tag = if sc.status == Status::Conjecture {
                    " (conjecture)"
                } else {
                    ""
                };
                extra.push(plot::Curve {
                    name: format!("{} strong coupling{tag}", q.label),
                    points,
                    dashed: true,
                });
            }
        }
    }
    // Truncated series leave the picture quickly; cut each extra curve where
    // it leaves the window of the finite-coupling curves so they stay readable.
    for mut c in extra {
        let keep: Vec<(f64, f64)> = c
            .points
            .iter()
            .copied()
            .skip_while(|p| !inside(p.1))
            .take_while(|p| inside(p.1))
            .collect();
        if keep.len() >= 2 {
            c.points = keep;
            curves.push(c);
        } else {
            eprintln!("loopwise: {}: left out, fewer than two of its points lie near the finite-coupling curves", c.name);
        }
    }
    let names: Vec<&str> = quantities.iter().map(|q| q.label.as_str()).collect();
    let title = format!("{} vs g, with g^2 = lambda/(16 pi^2)", names.join(", "));
    plot::write_svg(&args.out, &title, "g", "value", &curves)?;
    eprintln!("wrote {} ({} curves)", args.out.display(), curves.len());
    Ok(Outcome::Done)
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

/// One selftest comparison.
pub struct SelfCheck {
    pub label: String,
    pub g: f64,
    pub weak: Float,
    pub numeric: numeric::Estimate,
    pub bound: Float,
}

impl SelfCheck {
    pub fn passes(&self) -> bool {
        Float::with_val(128, &self.weak - &self.numeric.value).abs() <= self.bound
    }
}

/// Sums the exact series (24 loops) and compares with the numerical engine
/// at g = 0.05, 0.1, 0.15, for four tilts and both functionals. The bound
/// is the numerical error estimate plus the first omitted term times the
/// geometric factor 1/(1 - (g/0.25)^2) of a series with radius 1/4.
pub fn self_checks(progress: &mut dyn FnMut(&str, usize, usize)) -> Result<Vec<SelfCheck>> {
    let loops = 24u32;
    let prec = 200;
    let tilts = [
        ("0", (0, 1)),
        ("pi/6", (1, 6)),
        ("pi/4", (1, 4)),
        ("pi/3", (1, 3)),
    ];
    let mut out = Vec::new();
    for (name, (n, d)) in tilts {
        let tilt = Tilt::pi_multiple(&Rational::from((n, d)))?;
        let c2 = match &tilt {
            Tilt::Cos2(c) => Float::with_val(prec, c),
            Tilt::Symbolic => return Err(Error::numeric("selftest needs rational tilts")),
        };
        for f in [Functional::Gamma, Functional::Delta] {
            let label = format!("{}({name})", f.name());
            let series =
                loopwise::kernel::expand(f, &tilt, loops + 1, &mut |d, t| progress(&label, d, t))?;
            let coeffs = finite::weak_coefficients(&series, prec)?;
            for g in [0.05, 0.1, 0.15] {
                let gf = Float::with_val(prec, g);
                let weak = finite::weak_sum(&coeffs, loops as usize, &gf);
                let next = Float::with_val(prec, coeffs[loops as usize + 1].abs_ref())
                    * Float::with_val(prec, &gf).pow(2 * (loops + 1));
                let q = (g / 0.25) * (g / 0.25);
                let numeric = numeric::evaluate(f, &c2, &gf, 30)?;
                let bound = Float::with_val(prec, &numeric.error) + next / (1.0 - q);
                out.push(SelfCheck {
                    label: label.clone(),
                    g,
                    weak,
                    numeric,
                    bound,
                });
            }
        }
    }
    Ok(out)
}

pub fn selftest() -> Result<Outcome> {
    let mut progress = Progress::new();
    let checks = self_checks(&mut |w, d, t| progress.update(w, d, t));
    progress.finish();
    let checks = checks?;
    let mut out = String::from("selftest: the summed 24-loop weak-coupling series (exact engine) against the numerical engine\n\n");
    out.push_str(&format!(
        "{:<12} {:>5}  {:<10}  {:<10}  result\n",
        "functional", "g", "|diff|", "bound"
    ));
    for c in &checks {
        let diff = Float::with_val(128, &c.weak - &c.numeric.value).abs();
        out.push_str(&format!(
            "{:<12} {:>5}  {:<10}  {:<10}  {}\n",
            c.label,
            c.g,
            decimal(&diff, 2),
            decimal(&c.bound, 2),
            if c.passes() { "ok" } else { "FAILED" }
        ));
    }
    let failed = checks.iter().filter(|c| !c.passes()).count();
    out.push_str(&format!(
        "\n{} passed, {failed} failed\n",
        checks.len() - failed
    ));
    emit(&out)?;
    Ok(if failed == 0 {
        Outcome::Done
    } else {
        Outcome::Differs
    })
}
