//! `loopwise._native`: the Python extension module. Each function takes
//! plain arguments, runs one composition of library calls from
//! `commands.rs` with the interpreter released, and returns text (JSON for
//! reports); the Python package `loopwise` turns that into Python objects.
//! Library errors become `loopwise.InputError` (a `ValueError`: unusable
//! input, out-of-range numbers, unreadable files) or `loopwise.NumericError`
//! (an `ArithmeticError`: accuracy the engine cannot reach), with the
//! library's message unchanged, file, line and column included.

mod commands;
mod expression_tree;

use std::path::PathBuf;

use pyo3::create_exception;
use pyo3::exceptions::{PyArithmeticError, PyValueError};
use pyo3::prelude::*;

use loopwise::ErrorKind;

create_exception!(
    loopwise,
    InputError,
    PyValueError,
    "Input loopwise cannot use: text outside the coefficient language, an unknown name, an out-of-range number, a series file that cannot be read or used. The message is the command line's, with file, line and column where there are any."
);
create_exception!(
    loopwise,
    NumericError,
    PyArithmeticError,
    "A numerical computation that could not reach the accuracy asked for."
);

fn raise(e: loopwise::Error) -> PyErr {
    match e.kind() {
        ErrorKind::Numeric => NumericError::new_err(e.to_string()),
        _ => InputError::new_err(e.to_string()),
    }
}

/// Runs `work` with the built-in catalogue (extended by `catalog`) and
/// without holding the interpreter, so that other Python threads go on.
fn run<T: Send>(
    py: Python<'_>,
    catalog: Option<PathBuf>,
    work: impl FnOnce(&loopwise::input::catalogue::Catalogue) -> loopwise::Result<T> + Send,
) -> PyResult<T> {
    py.detach(|| commands::catalogue(catalog.as_deref()).and_then(|c| work(&c)))
        .map_err(raise)
}

/// expand(quantity, loops, coupling=None, digits=20, even="pi", catalog=None) -> str
///
/// The JSON text of `loopwise expand QUANTITY -L LOOPS --format json`.
#[pyfunction]
#[pyo3(signature = (quantity, loops, coupling=None, digits=20, even="pi".to_string(), catalog=None))]
fn expand(
    py: Python<'_>,
    quantity: String,
    loops: i64,
    coupling: Option<String>,
    digits: i64,
    even: String,
    catalog: Option<PathBuf>,
) -> PyResult<String> {
    run(py, catalog, |c| {
        commands::expand(&quantity, loops, coupling.as_deref(), digits, &even, c)
    })
}

/// at(quantity, g, digits=30, catalog=None) -> str
///
/// The JSON text of `loopwise at QUANTITY --g G --format json`; `g` is a
/// list `0.1,0.5` or a grid `START:STOP:STEP`.
#[pyfunction]
#[pyo3(signature = (quantity, g, digits=30, catalog=None))]
fn at(
    py: Python<'_>,
    quantity: String,
    g: String,
    digits: i64,
    catalog: Option<PathBuf>,
) -> PyResult<String> {
    run(py, catalog, |c| commands::at(&quantity, &g, digits, c))
}

/// scan(quantity, grid, points=None, digits=15, catalog=None) -> str
///
/// The JSON text of `loopwise scan QUANTITY --g GRID [--points N] --format
/// json`; `grid` may also be a list `0.1,0.5` (then without `points`).
#[pyfunction]
#[pyo3(signature = (quantity, grid, points=None, digits=15, catalog=None))]
fn scan(
    py: Python<'_>,
    quantity: String,
    grid: String,
    points: Option<i64>,
    digits: i64,
    catalog: Option<PathBuf>,
) -> PyResult<String> {
    run(py, catalog, |c| {
        commands::scan(&quantity, &grid, points, digits, c)
    })
}

/// check(path, digits=30, identify=False, catalog=None) -> str
///
/// The JSON text of `loopwise check PATH --format json [--identify]`.
#[pyfunction]
#[pyo3(signature = (path, digits=30, identify=false, catalog=None))]
fn check(
    py: Python<'_>,
    path: PathBuf,
    digits: i64,
    identify: bool,
    catalog: Option<PathBuf>,
) -> PyResult<String> {
    run(py, catalog, |c| {
        commands::check_file(&path, digits, identify, c)
    })
}

/// origin(path, digits=30, even="zeta", catalog=None) -> str
///
/// The JSON text of `loopwise origin PATH --format json`.
#[pyfunction]
#[pyo3(signature = (path, digits=30, even="zeta".to_string(), catalog=None))]
fn origin(
    py: Python<'_>,
    path: PathBuf,
    digits: i64,
    even: String,
    catalog: Option<PathBuf>,
) -> PyResult<String> {
    run(py, catalog, |c| {
        commands::origin_file(&path, digits, &even, c)
    })
}

/// identify(value, digits=None, weight=None, with_lower=False, basis=None, catalog=None) -> str
///
/// The JSON text of `loopwise identify VALUE --format json` with the same options.
#[pyfunction]
#[pyo3(signature = (value, digits=None, weight=None, with_lower=false, basis=None, catalog=None))]
fn identify(
    py: Python<'_>,
    value: String,
    digits: Option<i64>,
    weight: Option<i64>,
    with_lower: bool,
    basis: Option<String>,
    catalog: Option<PathBuf>,
) -> PyResult<String> {
    run(py, catalog, |c| {
        commands::identify(&value, digits, weight, with_lower, basis.as_deref(), c)
    })
}

/// evaluate(expression, digits=30, catalog=None) -> (str, str)
///
/// The value of a coefficient-language expression as `loopwise eval` computes
/// it, and its uncertainty ("0" for an exact expression), as decimal text.
#[pyfunction]
#[pyo3(signature = (expression, digits=30, catalog=None))]
fn evaluate(
    py: Python<'_>,
    expression: String,
    digits: i64,
    catalog: Option<PathBuf>,
) -> PyResult<(String, String)> {
    run(py, catalog, |c| commands::evaluate(&expression, digits, c))
}

/// status(quantity, catalog=None) -> str | None
///
/// The catalogue status of a name or formula: "established", "conjecture"
/// (also for a formula built from a conjecture), or None for a formula of
/// the functionals alone.
#[pyfunction]
#[pyo3(signature = (quantity, catalog=None))]
fn status(py: Python<'_>, quantity: String, catalog: Option<PathBuf>) -> PyResult<Option<String>> {
    run(py, catalog, |c| commands::status(&quantity, c))
}

/// tree(text) -> str
///
/// The parsed tree of a coefficient-language expression as JSON (node forms
/// in python/src/expression_tree.rs), for the conversion to sympy.
#[pyfunction]
fn tree(py: Python<'_>, text: String) -> PyResult<String> {
    py.detach(|| expression_tree::tree(&text)).map_err(raise)
}

/// The native half of the `loopwise` package; use the package, not this module.
#[pymodule]
fn _native(m: &Bound<'_, PyModule>) -> PyResult<()> {
    let py = m.py();
    m.add("InputError", py.get_type::<InputError>())?;
    m.add("NumericError", py.get_type::<NumericError>())?;
    m.add("__version__", env!("CARGO_PKG_VERSION"))?;
    for f in [
        wrap_pyfunction!(expand, m)?,
        wrap_pyfunction!(at, m)?,
        wrap_pyfunction!(scan, m)?,
        wrap_pyfunction!(check, m)?,
        wrap_pyfunction!(origin, m)?,
        wrap_pyfunction!(identify, m)?,
        wrap_pyfunction!(evaluate, m)?,
        wrap_pyfunction!(status, m)?,
        wrap_pyfunction!(tree, m)?,
    ] {
        m.add_function(f)?;
    }
    Ok(())
}
