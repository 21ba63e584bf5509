//! `loopwise init [PATH]`: write a commented series file to start from.

use std::path::PathBuf;

use clap::Args as ClapArgs;

use loopwise::exact::coupling::Coupling;
use loopwise::input::catalogue::Catalogue;
use loopwise::quantity::Quantity;
use loopwise::report::template::{Template, TEMPLATE_LOOPS};
use loopwise::Result;

use super::{emit, write_new, CouplingArg, Outcome};

/// Where the template goes when no PATH is given.
const DEFAULT_PATH: &str = "series.yaml";

#[derive(ClapArgs, Debug)]
pub struct Args {
    /// The file to write, `-` for standard output.
    #[arg(default_value = DEFAULT_PATH)]
    pub path: PathBuf,
    /// The prediction the file names, and whose first coefficients fill the
    /// example entries: a catalogue name or a formula.
    #[arg(long, default_value = "cusp", allow_hyphen_values = true)]
    pub quantity: String,
    /// The coupling convention of the file [default: the catalogue entry's,
    /// g2 for formulas].
    #[arg(long, value_enum)]
    pub coupling: Option<CouplingArg>,
    /// Replace PATH if it exists.
    #[arg(long)]
    pub force: bool,
}

pub fn run(args: &Args, catalogue: &Catalogue) -> Result<Outcome> {
    let quantity = Quantity::resolve(&args.quantity, catalogue)?;
    let series = quantity.expand(TEMPLATE_LOOPS, &mut |_, _, _| {})?;
    let coupling = args.coupling.map_or_else(
        || quantity.entry.as_ref().map_or(Coupling::G2, |e| e.coupling),
        Coupling::from,
    );
    let text = Template {
        quantity: &quantity.label,
        entry: quantity.entry.as_ref(),
        coupling,
        series: &series,
    }
    .render()?;
    if args.path.as_os_str() == "-" {
        emit(&text)?;
    } else {
        write_new(&args.path, &text, args.force)?;
        eprintln!(
            "loopwise: wrote {}; check it with `loopwise check {}`",
            args.path.display(),
            args.path.display()
        );
    }
    Ok(Outcome::Done)
}
