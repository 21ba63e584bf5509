//! Fits of a series file's loop coefficients: the file's exact coefficients
//! as fit data in g^2, the basis given on the command line (`A = formula;
//! ...`), and the report value with the combination written back as a
//! formula of the coefficient language.

use crate::error::{Error, Result};
use crate::exact::coupling::Coupling;
use crate::exact::powerseries::Series;
use crate::exact::ring::Exact;
use crate::fit::{self, BasisElement, Fit};
use crate::input::catalogue::Catalogue;
use crate::input::seriesfile::{Located, OrderEntry, SeriesFile};

use crate::limits::MAX_LOOPS;
use crate::origin::read::{exact_coefficient, numeric_source};

/// The loop coefficients of a file as fit data in g^2: exact, without symbols.
pub fn fit_target(file: &SeriesFile) -> Result<Vec<(u32, Exact)>> {
    let mut out = Vec::new();
    for entry in &file.orders {
        if let Some(located) = numeric_source(entry) {
            return Err(refuse_numbers(file, entry, located));
        }
        let x = exact_coefficient(file, entry)?;
        if let Some((m, _)) = x.terms().find(|(m, _)| !m.symbols().is_empty()) {
            return Err(Error::input(format!(
                "{}: the coefficient at line {} (loop {}) depends on the symbol `{}`; a fit takes numbers such as C0, \
                 not polynomials in the logs (read those with `loopwise origin`)",
                file.origin,
                entry.line,
                entry.loop_order,
                m.symbols()[0].0
            )));
        }
        let k = entry.loop_order as usize;
        let mut coeffs = vec![Exact::zero(); k + 1];
        coeffs[k] = x;
        out.push((
            entry.loop_order,
            Series::new(coeffs)
                .from_coupling(file.coupling)
                .coeff(k)
                .clone(),
        ));
    }
    Ok(out)
}

/// Why a fit takes no decimals, pointing at the first number outside the
/// exact ring (or at the `value` given alone).
fn refuse_numbers(file: &SeriesFile, entry: &OrderEntry, located: &Located) -> Error {
    fn first_inexact(e: &crate::input::expr::Expr) -> Option<crate::input::expr::Span> {
        use crate::input::expr::Node;
        match &e.node {
            Node::Decimal { .. } | Node::Catalan | Node::Log(_) => Some(e.span),
            Node::Zeta(args) if args.len() > 1 => Some(e.span),
            Node::Neg(a) => first_inexact(a),
            Node::Add(a, b)
            | Node::Sub(a, b)
            | Node::Mul(a, b)
            | Node::Div(a, b)
            | Node::Pow(a, b) => first_inexact(a).or_else(|| first_inexact(b)),
            _ => None,
        }
    }
    let message = format!(
        "`loopwise fit` needs exact coefficients (loop {}): it solves for rational coefficients of the basis, \
         which a decimal cannot fix; write the coefficient exactly (fractions, pi, zeta values), or read numerical \
         data with `loopwise origin`",
        entry.loop_order
    );
    match first_inexact(&located.expr) {
        Some(span) => located.error_at(&file.origin, span, &message),
        None => Error::input(format!("{}: line {}: {message}", file.origin, located.line)),
    }
}

/// Reads `--basis "NAME=FORMULA; FORMULA; ..."`: elements separated by `;`,
/// each a formula, optionally named by a plain name and `=` in front.
pub fn parse_basis(text: &str) -> Result<Vec<BasisElement>> {
    let mut out: Vec<BasisElement> = Vec::new();
    for item in text.split(';').map(str::trim).filter(|s| !s.is_empty()) {
        let named = item.split_once('=').filter(|(name, _)| {
            let name = name.trim();
            name.chars().next().is_some_and(|c| c.is_ascii_alphabetic())
                && name.chars().all(|c| c.is_ascii_alphanumeric() || c == '_')
        });
        let element = match named {
            Some((name, formula)) if !formula.trim().is_empty() => BasisElement {
                name: name.trim().to_string(),
                formula: formula.trim().to_string(),
            },
            Some((name, _)) => {
                return Err(Error::input(format!(
                    "basis element `{}` has no formula after `=`",
                    name.trim()
                )))
            }
            None => BasisElement::new(item),
        };
        if out.iter().any(|e| e.name == element.name) {
            return Err(Error::input(format!(
                "basis element `{}` is given twice",
                element.name
            )));
        }
        out.push(element);
    }
    if out.is_empty() {
        return Err(Error::input(
            "--basis lists no elements; write e.g. \"A=Gamma(pi/4); B=zeta(2)*Gamma(0)\"",
        ));
    }
    Ok(out)
}

/// Everything `loopwise fit` reports.
#[derive(Clone, Debug)]
pub struct FitReport {
    pub file: String,
    pub coupling: Coupling,
    pub orders: Vec<u32>,
    /// The elements as given; the fit's `names` select from them.
    pub elements: Vec<BasisElement>,
    pub fit: Fit,
    pub ceiling: u32,
}

impl FitReport {
    fn formula_of<'a>(&'a self, name: &'a str) -> &'a str {
        self.elements
            .iter()
            .find(|e| e.name == name)
            .map_or(name, |e| e.formula.as_str())
    }

    /// sum_k a_k B_k as a formula the coefficient language reads back.
    pub fn combination(&self, coefficients: &[rug::Rational]) -> String {
        let formulas: Vec<&str> = self.fit.names.iter().map(|n| self.formula_of(n)).collect();
        combination(coefficients, &formulas)
    }

    /// sum_k a_k NAME_k, in the names of the basis.
    pub fn named_combination(&self, coefficients: &[rug::Rational]) -> String {
        let names: Vec<&str> = self.fit.names.iter().map(String::as_str).collect();
        combination(coefficients, &names)
    }

    /// Whether some element was given a name other than its formula.
    pub fn has_names(&self) -> bool {
        self.elements.iter().any(|e| e.name != e.formula)
    }
}

/// Runs the fit of a file's coefficients.
pub fn fit_file(
    file: &SeriesFile,
    elements: Vec<BasisElement>,
    ceiling: u32,
    catalogue: &Catalogue,
) -> Result<FitReport> {
    if ceiling == 0 || ceiling > MAX_LOOPS {
        return Err(Error::range(format!(
            "--ceiling {ceiling} is out of range: 1 to {MAX_LOOPS} loops"
        )));
    }
    let target = fit_target(file)?;
    if let Some((l, _)) = target.iter().find(|(l, _)| *l > MAX_LOOPS) {
        return Err(Error::range(format!(
            "{}: loop {l} is beyond the exact engine's {MAX_LOOPS} loops, so the basis cannot be expanded that far",
            file.origin
        )));
    }
    let fit =
        fit::fit(&target, &elements, ceiling, catalogue).map_err(|e| e.context(&file.origin))?;
    Ok(FitReport {
        file: file.origin.clone(),
        coupling: file.coupling,
        orders: target.iter().map(|(l, _)| *l).collect(),
        elements,
        fit,
        ceiling,
    })
}

/// Whether a formula needs parentheses as a factor: a sum or difference at
/// the top level, or a leading sign.
fn needs_parentheses(formula: &str) -> bool {
    let mut depth = 0i32;
    for (i, c) in formula.trim().char_indices() {
        match c {
            '(' | '[' => depth += 1,
            ')' | ']' => depth -= 1,
            '+' | '-' if depth == 0 => {
                let before = formula.trim()[..i].trim_end();
                // A sign after `^`, `*`, `/` or at the start belongs to a factor.
                if i == 0 || !before.ends_with(['^', '*', '/', '(']) {
                    return true;
                }
            }
            _ => {}
        }
    }
    false
}

fn combination(coefficients: &[rug::Rational], factors: &[&str]) -> String {
    let mut out = String::new();
    for (a, f) in coefficients.iter().zip(factors) {
        if *a == 0 {
            continue;
        }
        let f = if needs_parentheses(f) {
            format!("({})", f.trim())
        } else {
            f.trim().to_string()
        };
        let abs = rug::Rational::from(a.abs_ref());
        let sign = if *a < 0 { "-" } else { "+" };
        if out.is_empty() {
            if *a < 0 {
                out.push('-');
            }
        } else {
            out.push_str(&format!(" {sign} "));
        }
        if abs == 1 {
            out.push_str(&f);
        } else {
            out.push_str(&format!("{abs}*{f}"));
        }
    }
    if out.is_empty() {
        "0".to_string()
    } else {
        out
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn basis_items_with_and_without_names() {
        let b = parse_basis("A = Gamma(pi/4); Gamma(c2=1/2) ; zeta(2)*Delta(0)").unwrap();
        assert_eq!(
            b[0],
            BasisElement {
                name: "A".into(),
                formula: "Gamma(pi/4)".into()
            }
        );
        assert_eq!(b[1], BasisElement::new("Gamma(c2=1/2)"));
        assert_eq!(b[2], BasisElement::new("zeta(2)*Delta(0)"));
        assert!(parse_basis(" ; ").is_err());
        assert!(parse_basis("A=Gamma(0); A=Delta(0)").is_err());
        assert!(parse_basis("A=").is_err());
    }

    #[test]
    fn combinations_read_back_as_formulas() {
        let q = |n: i64, d: i64| rug::Rational::from((n, d));
        assert_eq!(
            combination(
                &[q(-1, 2), q(0, 1), q(1, 1), q(3, 4)],
                &[
                    "zeta(2)*Gamma(pi/4)",
                    "Gamma(0)",
                    "Delta(pi/3)",
                    "Gamma(0) - Delta(0)"
                ]
            ),
            "-1/2*zeta(2)*Gamma(pi/4) + Delta(pi/3) + 3/4*(Gamma(0) - Delta(0))"
        );
        assert_eq!(combination(&[q(2, 1)], &["-Gamma(0)"]), "2*(-Gamma(0))");
        assert_eq!(
            combination(&[q(2, 1)], &["g^-2*Gamma(0)"]),
            "2*g^-2*Gamma(0)"
        );
        assert_eq!(combination(&[q(0, 1)], &["Gamma(0)"]), "0");
    }
}
