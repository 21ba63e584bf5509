//! Predictions as exact series: a catalogue name or a formula in the
//! coefficient language (functionals at chosen tilts, numbers, zeta values,
//! the coupling g) turned into a truncated series in g^2 over the exact ring.
//!
//! Kernel expansions are cached per (functional, tilt), so a formula that
//! uses Gamma(pi/4) twice expands it once; a formula walked once keeps an
//! expansion only while a later use remains, because at 50 loops a second
//! copy of the cusp's series takes about 400 MiB.

pub mod curves;
pub mod finite;
pub mod identify;
pub mod selftest;
pub mod shard;
pub mod strong;

use std::collections::HashMap;

use rug::Rational;

use crate::error::{Error, Result};
use crate::exact::coupling::Coupling;
use crate::exact::powerseries::Series;
use crate::exact::ring::{Exact, Monomial};
use crate::input::catalogue::{looks_like_name, Catalogue, Entry, Status};
use crate::input::expr::{self, Angle, Expr, Functional, Node, Site, Span};
use crate::input::seriesfile::SeriesFile;
use crate::input::suggest::did_you_mean;
use crate::kernel::{self, Tilt};
use crate::limits::MAX_NAME_DEPTH;

pub use crate::input::expr::COUPLING;

/// A quantity the user named: the text of its formula and where it came from.
#[derive(Clone, Debug)]
pub struct Quantity {
    /// What the user typed.
    pub label: String,
    /// The formula in the coefficient language.
    pub definition: String,
    /// The catalogue entry, when the user named one; for a formula built
    /// from catalogue quantities, an entry describing it (its status is a
    /// conjecture as soon as one ingredient is).
    pub entry: Option<Entry>,
    /// The parsed formula, with every catalogue name replaced by its definition.
    pub expr: Expr,
    /// The origin used in messages about the formula.
    pub origin: String,
    /// Where the formula sits in a file, if it came from one.
    pub site: Option<Site>,
}

/// The names a formula may use besides the coupling `g` and the catalogue.
#[derive(Clone, Copy, Default)]
pub struct Scope<'a> {
    /// Kinematic symbols declared by a file; they stay symbols.
    pub symbols: &'a [String],
    /// Names defined earlier in the same command (basis elements of a fit).
    pub local: &'a [(String, Expr)],
}

impl Quantity {
    /// Reads a QUANTITY argument: a catalogue name, or a formula.
    pub fn resolve(text: &str, catalogue: &Catalogue) -> Result<Quantity> {
        Quantity::resolve_in(text, catalogue, Scope::default())
    }

    /// Reads a catalogue name or a formula that may use the names of `scope`.
    pub fn resolve_in(text: &str, catalogue: &Catalogue, scope: Scope<'_>) -> Result<Quantity> {
        let trimmed = text.trim();
        if let Some(entry) = catalogue.get_in_formula(trimmed) {
            return Quantity::from_entry(entry, catalogue);
        }
        if looks_like_name(trimmed)
            && trimmed != COUPLING
            && !scope.local.iter().any(|(n, _)| n == trimmed)
        {
            catalogue.lookup(trimmed)?;
        }
        let origin = "<quantity>";
        let masked = catalogue.mask_hyphens(trimmed);
        let expr = expr::parse(&masked, origin, None)?;
        let fail = |span: Span, message: &str| expr::error_at(trimmed, origin, None, span, message);
        Quantity::formula(trimmed, expr, origin, None, catalogue, scope, &fail)
    }

    pub fn from_entry(entry: &Entry, catalogue: &Catalogue) -> Result<Quantity> {
        let origin = format!("definition of `{}` ({})", entry.name, entry.origin);
        let expr = Resolver::new(catalogue, Scope::default()).definition(entry, &mut Vec::new())?;
        Ok(Quantity {
            label: entry.name.clone(),
            definition: entry.definition.clone(),
            entry: Some(entry.clone()),
            expr,
            origin,
            site: None,
        })
    }

    /// The `prediction` of a series file: a catalogue name, or a formula
    /// that may use the catalogue and the file's declared symbols. Errors
    /// point at the file's own line.
    pub fn from_file(file: &SeriesFile, catalogue: &Catalogue) -> Result<Option<Quantity>> {
        let Some(located) = &file.prediction else {
            return Ok(None);
        };
        if let Some(name) = file.catalogue_name() {
            if !file.symbols.iter().any(|s| s == name) {
                let lead = located.text.len() - located.text.trim_start().len();
                let span = Span {
                    start: lead,
                    end: lead + name.len(),
                };
                let entry = catalogue
                    .get_in_formula(name)
                    .map_or_else(|| catalogue.lookup(name), Ok)
                    .map_err(|e| located.error_at(&file.origin, span, e.message()))?;
                return Quantity::from_entry(entry, catalogue).map(Some);
            }
        }
        let masked = catalogue.mask_hyphens(&located.text);
        let expr = expr::parse_unrendered(&masked)
            .map_err(|f| located.error_at(&file.origin, f.span, &f.message))?;
        let fail = |span: Span, message: &str| located.error_at(&file.origin, span, message);
        let scope = Scope {
            symbols: &file.symbols,
            local: &[],
        };
        Quantity::formula(
            &located.text,
            expr,
            &file.origin,
            Some(located.site.clone()),
            catalogue,
            scope,
            &fail,
        )
        .map(Some)
    }

    fn formula(
        text: &str,
        expr: Expr,
        origin: &str,
        site: Option<Site>,
        catalogue: &Catalogue,
        scope: Scope<'_>,
        fail: &dyn Fn(Span, &str) -> Error,
    ) -> Result<Quantity> {
        let mut resolver = Resolver::new(catalogue, scope);
        let expr = resolver.walk(expr, &mut Vec::new(), fail)?;
        let label = text.trim().to_string();
        let entry = composite_entry(&label, &resolver.used);
        Ok(Quantity {
            label,
            definition: text.to_string(),
            entry,
            expr,
            origin: origin.to_string(),
            site,
        })
    }

    /// The exact series through g^(2 loops).
    pub fn expand(
        &self,
        loops: u32,
        progress: &mut dyn FnMut(&str, usize, usize),
    ) -> Result<Series> {
        let mut ev = Expander {
            source: &self.definition,
            origin: &self.origin,
            site: self.site.as_ref(),
            loops,
            cache: HashMap::new(),
            uses_left: None,
            progress,
        };
        ev.count_uses(&self.expr);
        ev.series(&self.expr)
    }

    /// Renders an evaluation failure at its span in the formula.
    pub fn error_at(&self, span: Span, message: &str) -> Error {
        expr::error_at(
            &self.definition,
            &self.origin,
            self.site.as_ref(),
            span,
            message,
        )
    }
}

/// An entry that describes a formula built from catalogue quantities, so
/// that reports carry their status (a conjecture as soon as one ingredient
/// is one) and their references. None when the formula uses no entry.
fn composite_entry(label: &str, used: &[Entry]) -> Option<Entry> {
    let first = used.first()?;
    let conjectures: Vec<&str> = used
        .iter()
        .filter(|e| e.status == Status::Conjecture)
        .map(|e| e.name.as_str())
        .collect();
    let names: Vec<&str> = used.iter().map(|e| e.name.as_str()).collect();
    let mut references: Vec<String> = Vec::new();
    for r in used.iter().flat_map(|e| e.references.iter()) {
        if !references.contains(r) {
            references.push(r.clone());
        }
    }
    let note = if conjectures.is_empty() {
        format!("Built from {}.", names.join(", "))
    } else {
        format!(
            "Built from {}; {} rests on a conjecture of the literature.",
            names.join(", "),
            conjectures.join(", ")
        )
    };
    Some(Entry {
        name: label.to_string(),
        summary: format!("formula in the catalogue quantities {}", names.join(", ")),
        definition: label.to_string(),
        coupling: if used.iter().all(|e| e.coupling == first.coupling) {
            first.coupling
        } else {
            Coupling::G2
        },
        status: if conjectures.is_empty() {
            Status::Established
        } else {
            Status::Conjecture
        },
        note: Some(note),
        references,
        closed_form: None,
        strong_coupling: None,
        origin: "a formula".to_string(),
    })
}

/// Replaces the names in a formula by what they stand for, and refuses
/// every name that stands for nothing.
struct Resolver<'a> {
    catalogue: &'a Catalogue,
    scope: Scope<'a>,
    /// Catalogue entries the formula uses, each once, in the order met.
    used: Vec<Entry>,
}

impl<'a> Resolver<'a> {
    fn new(catalogue: &'a Catalogue, scope: Scope<'a>) -> Self {
        Resolver {
            catalogue,
            scope,
            used: Vec::new(),
        }
    }

    /// The parsed and resolved definition of an entry; `trail` holds the
    /// entries whose definitions are being resolved, to catch cycles.
    fn definition(&mut self, entry: &Entry, trail: &mut Vec<String>) -> Result<Expr> {
        if trail.contains(&entry.name) || trail.len() >= MAX_NAME_DEPTH {
            trail.push(entry.name.clone());
            return Err(Error::input(format!(
                "the catalogue definitions refer to each other in a cycle: {}",
                trail.join(" -> ")
            )));
        }
        let origin = format!("definition of `{}` ({})", entry.name, entry.origin);
        let masked = self.catalogue.mask_hyphens(&entry.definition);
        let parsed = expr::parse(&masked, &origin, None)?;
        trail.push(entry.name.clone());
        // Inside a definition only the catalogue and the coupling count.
        let outer = std::mem::take(&mut self.scope);
        let fail = |span: Span, message: &str| {
            expr::error_at(&entry.definition, &origin, None, span, message)
        };
        let resolved = self.walk(parsed, trail, &fail);
        self.scope = outer;
        trail.pop();
        resolved
    }

    /// Replaces every name in the tree; a replacement is already resolved,
    /// so visiting its parts afterwards changes nothing.
    fn walk(
        &mut self,
        mut e: Expr,
        trail: &mut Vec<String>,
        fail: &dyn Fn(Span, &str) -> Error,
    ) -> Result<Expr> {
        let mut failure = None;
        expr::for_each_node_mut(&mut e, &mut |node| {
            if let (None, Node::Symbol(name)) = (&failure, &node.node) {
                match self.name(name.clone(), node.span, trail, fail) {
                    Ok(replacement) => *node = replacement,
                    Err(err) => failure = Some(err),
                }
            }
        });
        failure.map_or(Ok(e), Err)
    }

    fn name(
        &mut self,
        name: String,
        span: Span,
        trail: &mut Vec<String>,
        fail: &dyn Fn(Span, &str) -> Error,
    ) -> Result<Expr> {
        if name == COUPLING || self.scope.symbols.contains(&name) {
            return Ok(Expr {
                node: Node::Symbol(name),
                span,
            });
        }
        if let Some((_, e)) = self.scope.local.iter().find(|(n, _)| *n == name) {
            return Ok(respan(e.clone(), span));
        }
        if let Some(entry) = self.catalogue.get_in_formula(&name).cloned() {
            let e = self.definition(&entry, trail)?;
            if !self.used.iter().any(|u| u.name == entry.name) {
                self.used.push(entry);
            }
            return Ok(respan(e, span));
        }
        let known = self
            .catalogue
            .names()
            .chain(self.scope.symbols.iter().map(String::as_str))
            .chain(self.scope.local.iter().map(|(n, _)| n.as_str()));
        let declared = if self.scope.symbols.is_empty() {
            String::new()
        } else {
            format!(" nor a declared symbol ({})", self.scope.symbols.join(", "))
        };
        Err(fail(
            span,
            &format!("unknown name `{name}`: not a catalogue quantity{declared}{}; `loopwise list` shows the catalogue", did_you_mean(&name, known)),
        ))
    }
}

/// The tree with every span set to `span`: a name replaced by its
/// definition is reported where the name was written.
fn respan(mut e: Expr, span: Span) -> Expr {
    expr::for_each_node_mut(&mut e, &mut |node| node.span = span);
    e
}

/// A constant expression (no coupling, no functionals) as a ring element,
/// its errors located in `source` (at `site` when it comes from a file).
pub fn exact_constant(source: &str, origin: &str, site: Option<&Site>, e: &Expr) -> Result<Exact> {
    let mut ev = Expander {
        source,
        origin,
        site,
        loops: 0,
        cache: HashMap::new(),
        uses_left: None,
        progress: &mut |_, _, _| {},
    };
    Ok(ev.series(e)?.coeff(0).clone())
}

/// Walks a formula into a series, remembering kernel expansions.
pub struct Expander<'a> {
    pub source: &'a str,
    pub origin: &'a str,
    pub site: Option<&'a Site>,
    pub loops: u32,
    pub cache: HashMap<(Functional, Tilt), Series>,
    /// The uses of each kernel expansion still ahead, once counted by
    /// `count_uses`: an expansion stays in `cache` only while one remains.
    /// None keeps every expansion (a cache shared by several walks).
    pub uses_left: Option<HashMap<(Functional, Tilt), usize>>,
    pub progress: &'a mut dyn FnMut(&str, usize, usize),
}

impl Expander<'_> {
    fn fail(&self, span: Span, message: &str) -> Error {
        expr::error_at(self.source, self.origin, self.site, span, message)
    }

    fn constant(&self, c: Exact) -> Series {
        Series::constant(c, self.loops as usize)
    }

    pub fn series(&mut self, e: &Expr) -> Result<Series> {
        let n = self.loops as usize;
        Ok(match &e.node {
            Node::Integer(i) => self.constant(Exact::from(Rational::from(i))),
            Node::Decimal { text, .. } => {
                return Err(self.fail(e.span, &format!("the decimal {text} is not exact; write it as a fraction in an exact prediction")))
            }
            Node::Pi => self.constant(Exact::pi()),
            Node::Catalan => return Err(self.fail(e.span, "Catalan's constant is not in the exact ring of predictions")),
            Node::Zeta(args) if args.len() == 1 => self.constant(Exact::zeta(args[0]).map_err(|err| self.fail(e.span, err.message()))?),
            Node::Zeta(_) => return Err(self.fail(e.span, "multiple zeta values are not in the exact ring of predictions")),
            Node::Log(_) => return Err(self.fail(e.span, "logarithms are not in the exact ring of predictions")),
            Node::Symbol(name) if name == COUPLING => {
                return Err(self.fail(e.span, "the coupling enters as even powers g^2, g^4, ...: these expansions have no odd powers of g"))
            }
            Node::Symbol(name) => self.constant(Exact::symbol(name)),
            Node::Functional { kind, angle } => {
                let tilt = self.tilt(angle, e.span)?;
                let f = *kind;
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
                        s = &s + &Series::new((0..=n).map(|i| if i == (k / 2) as usize { Exact::one() } else { Exact::zero() }).collect());
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

    /// Counts the functionals of `e` for a single walk of it. A tilt that
    /// does not resolve is not counted: the walk reports it at its place.
    pub fn count_uses(&mut self, e: &Expr) {
        let mut counts = HashMap::new();
        expr::find(e, &mut |x| {
            if let Node::Functional { kind, angle } = &x.node {
                if let Ok(tilt) = self.tilt(angle, x.span) {
                    *counts.entry((*kind, tilt)).or_insert(0) += 1;
                }
            }
            false
        });
        self.uses_left = Some(counts);
    }

    fn functional(&mut self, f: Functional, tilt: Tilt) -> Result<Series> {
        let key = (f, tilt);
        let used_later = match &mut self.uses_left {
            None => true,
            Some(left) => left.get_mut(&key).is_some_and(|n| {
                *n = n.saturating_sub(1);
                *n > 0
            }),
        };
        if used_later {
            if let Some(s) = self.cache.get(&key) {
                return Ok(s.clone());
            }
        } else if let Some(s) = self.cache.remove(&key) {
            return Ok(s);
        }
        let (f, tilt) = key;
        let label = format!("{}({})", f.name(), tilt.label());
        let progress = &mut *self.progress;
        let s = kernel::expand(f, &tilt, self.loops, &mut |done, total| {
            progress(&label, done, total)
        })?;
        if used_later {
            self.cache.insert((f, tilt), s.clone());
        }
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
        c.as_rational().ok_or_else(|| {
            self.fail(
                e.span,
                &format!("expected a rational number here, found {c}"),
            )
        })
    }

    /// A subexpression without the coupling or functionals, as a ring element.
    fn constant_value(&self, e: &Expr) -> Result<Exact> {
        if contains_functional_or_coupling(e) {
            return Err(self.fail(e.span, "expected a constant here, without g or functionals"));
        }
        exact_constant(self.source, self.origin, self.site, e)
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
                             give c2=P/Q or the symbolic c2 instead; values at finite coupling take any angle",
                        ))
                    }
                };
                Tilt::pi_multiple(&q).map_err(|err| self.fail(span, err.message()))
            }
        }
    }
}

fn contains_functional_or_coupling(e: &Expr) -> bool {
    expr::find(e, &mut |x| {
        matches!(&x.node, Node::Functional { .. })
            || matches!(&x.node, Node::Symbol(s) if s == COUPLING)
    })
    .is_some()
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

    /// A walk counted once keeps an expansion only while a later use remains:
    /// Gamma(pi/4) and Gamma(c2=1/2) are one tilt (cos^2(pi/4) = 1/2), so
    /// their difference vanishes, the second use is served from the cache,
    /// and nothing is left in it at the end; uncounted walks keep everything.
    #[test]
    fn counted_walks_leave_no_copies() {
        let c = Catalogue::builtin().unwrap();
        let q = Quantity::resolve("Gamma(pi/4) - Gamma(c2=1/2) + Delta(0)", &c).unwrap();
        let mut expanded = 0;
        let mut progress = |what: &str, done: usize, total: usize| {
            if done == total && what.starts_with("Gamma") {
                expanded += 1;
            }
        };
        let mut ev = Expander {
            source: &q.definition,
            origin: &q.origin,
            site: None,
            loops: 4,
            cache: HashMap::new(),
            uses_left: None,
            progress: &mut progress,
        };
        ev.count_uses(&q.expr);
        let s = ev.series(&q.expr).unwrap();
        assert!(ev.cache.is_empty());
        drop(ev);
        assert_eq!(expanded, 1);
        assert_eq!(s, expand("Delta(0)", 4).unwrap());

        let mut ev = Expander {
            source: &q.definition,
            origin: &q.origin,
            site: None,
            loops: 4,
            cache: HashMap::new(),
            uses_left: None,
            progress: &mut |_, _, _| {},
        };
        ev.series(&q.expr).unwrap();
        assert_eq!(ev.cache.len(), 2);
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
