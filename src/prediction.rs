//! Predictions as exact series: a catalogue name or a formula in the
//! coefficient language (functionals at chosen tilts, numbers, zeta values,
//! the coupling g) turned into a truncated series in g^2 over the exact ring.
//!
//! Kernel expansions are cached per (functional, tilt), so a formula that
//! uses Gamma(pi/4) twice expands it once.

use std::collections::HashMap;

use rug::Rational;

use crate::catalogue::{Catalogue, Entry};
use crate::error::{Error, Result};
use crate::expr::{self, Angle, Expr, FunctionalKind, Node, Span};
use crate::kernel::{self, Functional, Tilt};
use crate::ring::{Exact, Monomial};
use crate::series::Series;

/// The name of the coupling in formulas.
pub const COUPLING: &str = "g";

/// A quantity the user named: the text of its formula and where it came from.
#[derive(Clone, Debug)]
pub struct Quantity {
    /// What the user typed.
    pub label: String,
    /// The formula in the coefficient language.
    pub definition: String,
    /// The catalogue entry, when the user named one.
    pub entry: Option<Entry>,
    /// The parsed formula.
    pub expr: Expr,
    /// The origin used in messages about the formula.
    pub origin: String,
    /// Line and column of the formula's first character in its file, if any.
    pub place: Option<(usize, usize)>,
}

impl Quantity {
    /// Reads a QUANTITY argument: a catalogue name, or a formula.
    pub fn resolve(text: &str, catalogue: &Catalogue) -> Result<Quantity> {
        let trimmed = text.trim();
        let looks_like_name = trimmed.chars().next().is_some_and(|c| c.is_ascii_alphabetic())
            && trimmed.chars().all(|c| c.is_ascii_alphanumeric() || c == '-' || c == '_');
        if let Some(entry) = catalogue.get(trimmed) {
            return Quantity::from_entry(entry);
        }
        if looks_like_name && !matches!(trimmed, COUPLING) {
            catalogue.lookup(trimmed)?;
        }
        let expr = expr::parse(trimmed, "<quantity>", None)?;
        Ok(Quantity {
            label: trimmed.to_string(),
            definition: trimmed.to_string(),
            entry: None,
            expr,
            origin: "<quantity>".to_string(),
            place: None,
        })
    }

    pub fn from_entry(entry: &Entry) -> Result<Quantity> {
        let origin = format!("definition of `{}` ({})", entry.name, entry.origin);
        let expr = expr::parse(&entry.definition, &origin, None)?;
        Ok(Quantity {
            label: entry.name.clone(),
            definition: entry.definition.clone(),
            entry: Some(entry.clone()),
            expr,
            origin,
            place: None,
        })
    }

    /// A formula read from a file, keeping its place for messages.
    pub fn from_formula(text: &str, expr: Expr, origin: &str, place: (usize, usize)) -> Quantity {
        Quantity {
            label: text.trim().to_string(),
            definition: text.to_string(),
            entry: None,
            expr,
            origin: origin.to_string(),
            place: Some(place),
        }
    }

    /// The exact series through g^(2 loops).
    pub fn expand(&self, loops: u32, progress: &mut dyn FnMut(&str, usize, usize)) -> Result<Series> {
        let mut ev = Expander { source: &self.definition, origin: &self.origin, place: self.place, loops, cache: HashMap::new(), progress };
        ev.series(&self.expr)
    }
}

/// Walks a formula into a series, remembering kernel expansions.
pub struct Expander<'a> {
    pub source: &'a str,
    pub origin: &'a str,
    pub place: Option<(usize, usize)>,
    pub loops: u32,
    pub cache: HashMap<(Functional, Tilt), Series>,
    pub progress: &'a mut dyn FnMut(&str, usize, usize),
}

impl Expander<'_> {
    fn fail(&self, span: Span, message: &str) -> Error {
        expr::error_at(self.source, self.origin, self.place, span, message)
    }

    fn constant(&self, c: Exact) -> Series {
        Series::constant(c, self.loops as usize)
    }

    pub fn series(&mut self, e: &Expr) -> Result<Series> {
        let n = self.loops as usize;
        Ok(match &e.node {
            Node::Integer(i) => self.constant(Exact::from(Rational::from(i))),
            Node::Decimal { text, .. } => {
                return Err(self.fail(e.span, &format!(
                    "the decimal {text} is not exact; write it as a fraction in an exact prediction"
                )))
            }
            Node::Pi => self.constant(Exact::pi()),
            Node::Catalan => return Err(self.fail(e.span, "Catalan's constant is not in the exact ring of predictions")),
            Node::Zeta(args) if args.len() == 1 => {
                self.constant(Exact::zeta(args[0]).map_err(|err| self.fail(e.span, err.message()))?)
            }
            Node::Zeta(_) => {
                return Err(self.fail(e.span, "multiple zeta values are not in the exact ring of predictions"))
            }
            Node::Log(_) => return Err(self.fail(e.span, "logarithms are not in the exact ring of predictions")),
            Node::Symbol(name) if name == COUPLING => {
                return Err(self.fail(e.span, "the coupling enters as even powers g^2, g^4, ...: these expansions have no odd powers of g"))
            }
            Node::Symbol(name) => self.constant(Exact::symbol(name)),
            Node::Functional { kind, angle } => {
                let tilt = self.tilt(angle, e.span)?;
                let f = match kind {
                    FunctionalKind::Gamma => Functional::Gamma,
                    FunctionalKind::Delta => Functional::Delta,
                };
                self.functional(f, tilt)?
            }
            Node::Neg(a) => -&self.series(a)?,
            Node::Add(..) | Node::Sub(..) => self.sum(e)?,
            Node::Mul(a, b) => &self.series(a)? * &self.series(b)?,
            Node::Div(a, b) => {
                let denominator = self.series(b)?;
                let inverse = denominator.inverse().map_err(|err| self.fail(b.span, err.message()))?;
                &self.series(a)? * &inverse
            }
            Node::Pow(base, exponent) => {
                let k = self.integer_exponent(exponent)?;
                if matches!(&base.node, Node::Symbol(s) if s == COUPLING) {
                    if k < 0 || k % 2 != 0 {
                        return Err(self.fail(e.span, "only even, non-negative powers of the coupling g occur in these expansions"));
                    }
                    let mut s = Series::zero(n);
                    if (k / 2) as usize <= n {
                        s = &s + &Series::new(
                            (0..=n).map(|i| if i == (k / 2) as usize { Exact::one() } else { Exact::zero() }).collect(),
                        );
                    }
                    s
                } else {
                    let b = self.series(base)?;
                    let b = if k < 0 { b.inverse().map_err(|err| self.fail(base.span, err.message()))? } else { b };
                    b.pow(k.unsigned_abs())
                }
            }
        })
    }

    /// A chain a + b - c + ... (left-nested), walked down its left spine and
    /// summed in place: pasted coefficients can have thousands of terms.
    fn sum(&mut self, e: &Expr) -> Result<Series> {
        let mut terms: Vec<(bool, &Expr)> = Vec::new();
        let mut left = e;
        loop {
            match &left.node {
                Node::Add(a, b) => {
                    terms.push((false, b));
                    left = a;
                }
                Node::Sub(a, b) => {
                    terms.push((true, b));
                    left = a;
                }
                _ => break,
            }
        }
        let mut total = self.series(left)?;
        for (negative, term) in terms.into_iter().rev() {
            let s = self.series(term)?;
            if negative {
                total -= &s;
            } else {
                total += &s;
            }
        }
        Ok(total)
    }

    fn functional(&mut self, f: Functional, tilt: Tilt) -> Result<Series> {
        if let Some(s) = self.cache.get(&(f, tilt.clone())) {
            return Ok(s.clone());
        }
        let label = format!("{}({})", f.name(), tilt.label());
        let progress = &mut *self.progress;
        let s = kernel::expand(f, &tilt, self.loops, &mut |done, total| progress(&label, done, total))?;
        self.cache.insert((f, tilt), s.clone());
        Ok(s)
    }

    fn integer_exponent(&self, e: &Expr) -> Result<i64> {
        let value = self.rational_constant(e)?;
        if *value.denom() != 1 {
            return Err(self.fail(e.span, "exact predictions take integer exponents only"));
        }
        value
            .numer()
            .to_i64()
            .filter(|k| k.abs() <= 1000)
            .ok_or_else(|| self.fail(e.span, "exponent too large"))
    }

    /// A subexpression that must be a plain rational number.
    fn rational_constant(&self, e: &Expr) -> Result<Rational> {
        let c = self.constant_value(e)?;
        c.as_rational().ok_or_else(|| self.fail(e.span, &format!("expected a rational number here, found {c}")))
    }

    /// A subexpression without the coupling or functionals, as a ring element.
    fn constant_value(&self, e: &Expr) -> Result<Exact> {
        let mut inner = Expander {
            source: self.source,
            origin: self.origin,
            place: self.place,
            loops: 0,
            cache: HashMap::new(),
            progress: &mut |_, _, _| {},
        };
        if contains_functional_or_coupling(e) {
            return Err(self.fail(e.span, "expected a constant here, without g or functionals"));
        }
        Ok(inner.series(e)?.coeff(0).clone())
    }

    /// The tilt of a functional, exactly: a rational multiple of pi with
    /// rational cos^2, c2=P/Q, or the symbol c2.
    fn tilt(&self, angle: &Angle, span: Span) -> Result<Tilt> {
        match angle {
            Angle::SymbolicCos2 => Ok(Tilt::Symbolic),
            Angle::Cos2(value) => {
                let c = self.rational_constant(value)?;
                Tilt::cos2(c).map_err(|err| self.fail(value.span, err.message()))
            }
            Angle::Radians(value) => {
                let v = self.constant_value(value).ok();
                let q = match v.as_ref().map(|v| (v.is_zero(), v.as_single_term())) {
                    Some((true, _)) => Rational::new(),
                    Some((false, Some((m, c)))) if *m == Monomial::pi_power(1) => c.clone(),
                    _ => {
                        return Err(self.fail(
                            value.span,
                            "the exact engine needs the angle as a rational multiple of pi (pi/6, 2*pi/3, 0); \
                             give c2=P/Q or the symbolic c2 instead, or use the finite-coupling commands",
                        ))
                    }
                };
                Tilt::pi_multiple(&q).map_err(|err| self.fail(span, err.message()))
            }
        }
    }
}

fn contains_functional_or_coupling(e: &Expr) -> bool {
    match &e.node {
        Node::Functional { .. } => true,
        Node::Symbol(s) => s == COUPLING,
        Node::Integer(_) | Node::Decimal { .. } | Node::Pi | Node::Catalan | Node::Zeta(_) => false,
        Node::Log(a) | Node::Neg(a) => contains_functional_or_coupling(a),
        Node::Add(a, b) | Node::Sub(a, b) | Node::Mul(a, b) | Node::Div(a, b) | Node::Pow(a, b) => {
            contains_functional_or_coupling(a) || contains_functional_or_coupling(b)
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn expand(text: &str, loops: u32) -> Result<Series> {
        let c = Catalogue::builtin().unwrap();
        Quantity::resolve(text, &c)?.expand(loops, &mut |_, _, _| {})
    }

    #[test]
    fn scaling_function_is_twice_the_cusp() {
        let f = expand("scaling-function", 4).unwrap();
        let cusp = expand("cusp", 4).unwrap();
        assert_eq!(f, cusp.scale(&Exact::from(2)));
    }

    #[test]
    fn formulas_combine_functionals() {
        let a = expand("Gamma(pi/4) - 4 g^2", 4).unwrap();
        assert!(a.coeff(1).is_zero());
        let b = expand("Gamma(c2=1/2) / 2 + Gamma(pi/4)/2", 4).unwrap();
        assert_eq!(b, expand("cusp", 4).unwrap());
        assert_eq!(expand("(1 + g^2)^2", 3).unwrap().coeff(1), &Exact::from(2));
    }

    #[test]
    fn errors_point_at_the_culprit() {
        let e = expand("Gamma(pi/5)", 3).unwrap_err();
        assert!(e.message().contains("irrational"), "{e}");
        let e = expand("Gamma(0.3)", 3).unwrap_err();
        assert!(e.message().contains("rational multiple of pi"), "{e}");
        let e = expand("octagn", 3).unwrap_err();
        assert!(e.message().contains("did you mean `octagon`"), "{e}");
        let e = expand("g*Gamma(0)", 3).unwrap_err();
        assert!(e.message().contains("even powers"), "{e}");
        assert!(expand("Gamma(c2=3/2)", 3).is_err());
    }
}
