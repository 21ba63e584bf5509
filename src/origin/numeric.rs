//! Origin files with numerical coefficients: polynomials in the logs whose
//! coefficients are numbers with an uncertainty ([`Estimate`]), read from
//! decimals such as `-0.16667(1)*l1^2 + 1.6449 l1 l2 - 4.93480220054(2)`,
//! and the numerical counterpart of [`crate::origin`]: ln E order by order,
//! the exponentiation check and the readings of the double-log coefficients,
//! the linear term and C0.
//!
//! Uncertainties are those of [`crate::numeric::evaluate`](mod@crate::numeric::evaluate): written by the user
//! or half a unit in the last written digit, propagated to first order in
//! the worst case (|a| u_b + |b| u_a + u_a u_b for a product, sums for
//! sums). A coefficient that is exact carries none. Whether a term that
//! should vanish (degree > 2, or an asymmetric part) is nonzero is decided
//! with [`crate::check::judge_numbers`] against zero, so the criteria are
//! those of `check`: beyond 3 sigma for a stated uncertainty, beyond the
//! rounding bound for an implied one, beyond the working precision for none.

use std::collections::{BTreeMap, BTreeSet};

use rug::{Float, Rational};

use crate::check::judge_numbers;
use crate::error::{Error, Result};
use crate::exact::powerseries::{Series, SeriesCoefficients};
use crate::exact::ring::Exact;
use crate::input::expr::{for_each_symbol, Expr, Node};
use crate::input::seriesfile::Located;
use crate::limits::MAX_LOG_POWER;
pub use crate::numeric::evaluate::needs_numbers;
use crate::numeric::evaluate::{self, Context};
use crate::numeric::Estimate;
pub use crate::origin::analysis::Exponents;
use crate::origin::analysis::{self, permutations, permuted, Analysis, LogPolynomials};
use crate::origin::{one_loop_limit, OrderReading, OriginLogs};

fn zero(prec: u32) -> Estimate {
    Estimate::exact(Float::with_val(prec, 0))
}

/// A polynomial in the logs with numerical coefficients.
#[derive(Clone, Debug)]
pub struct NumPoly {
    prec: u32,
    terms: BTreeMap<Exponents, Estimate>,
}

impl NumPoly {
    pub fn zero(prec: u32) -> Self {
        NumPoly {
            prec,
            terms: BTreeMap::new(),
        }
    }

    pub fn constant(c: Estimate) -> Self {
        let mut p = NumPoly::zero(c.value.prec());
        p.terms.insert([0, 0, 0], c);
        p
    }

    /// The coefficient of one monomial; zero (exactly) when absent.
    pub fn coefficient(&self, e: Exponents) -> Estimate {
        self.terms
            .get(&e)
            .cloned()
            .unwrap_or_else(|| zero(self.prec))
    }

    pub fn terms(&self) -> impl Iterator<Item = (&Exponents, &Estimate)> {
        self.terms.iter()
    }

    fn add_term(&mut self, e: Exponents, c: &Estimate) {
        let merged = match self.terms.get(&e) {
            Some(old) => old.sum(c),
            None => c.clone(),
        };
        self.terms.insert(e, merged);
    }

    pub fn add(&self, other: &NumPoly) -> NumPoly {
        let mut out = self.clone();
        for (e, c) in &other.terms {
            out.add_term(*e, c);
        }
        out
    }

    pub fn neg(&self) -> NumPoly {
        NumPoly {
            prec: self.prec,
            terms: self.terms.iter().map(|(e, c)| (*e, c.negated())).collect(),
        }
    }

    pub fn scale(&self, factor: &Float) -> NumPoly {
        NumPoly {
            prec: self.prec,
            terms: self
                .terms
                .iter()
                .map(|(e, c)| (*e, c.scaled(factor)))
                .collect(),
        }
    }

    /// None when `d` is zero within its error.
    fn divide(&self, d: &Estimate) -> Option<NumPoly> {
        let terms = self
            .terms
            .iter()
            .map(|(e, c)| Some((*e, c.quotient(d)?)))
            .collect::<Option<_>>()?;
        Some(NumPoly {
            prec: self.prec,
            terms,
        })
    }

    pub fn mul(&self, other: &NumPoly) -> Result<NumPoly> {
        let mut out = NumPoly::zero(self.prec.max(other.prec));
        for (ea, ca) in &self.terms {
            for (eb, cb) in &other.terms {
                let mut e = [0; 3];
                for i in 0..3 {
                    e[i] = ea[i] + eb[i];
                    if e[i] > MAX_LOG_POWER {
                        return Err(Error::range(format!(
                            "a power of a log above {MAX_LOG_POWER} in a numerical origin coefficient"
                        )));
                    }
                }
                out.add_term(e, &ca.product(cb));
            }
        }
        Ok(out)
    }

    fn pow(&self, k: u32) -> Result<NumPoly> {
        let mut out = NumPoly::constant(Estimate::exact(Float::with_val(self.prec, 1)));
        for _ in 0..k {
            out = out.mul(self)?;
        }
        Ok(out)
    }

    /// An exact polynomial in the logs, its transcendental coefficients
    /// evaluated at `prec` bits (no uncertainty).
    pub fn from_exact(x: &Exact, logs: &OriginLogs, prec: u32) -> Result<NumPoly> {
        let mut out = NumPoly::zero(prec);
        for (m, c) in x.terms() {
            let (rest, e) = logs.split(m)?;
            let value = Exact::term(c.clone(), rest).evaluate(prec)?;
            out.add_term(e, &Estimate::exact(value));
        }
        Ok(out)
    }
}

/// Reads a coefficient written with numbers as a polynomial in the logs, at
/// `prec` bits; errors name file, line and column.
pub fn read_polynomial(
    located: &Located,
    origin: &str,
    logs: &OriginLogs,
    prec: u32,
) -> Result<NumPoly> {
    Reader {
        located,
        origin,
        logs,
        prec,
    }
    .poly(&located.expr)
}

struct Reader<'a> {
    located: &'a Located,
    origin: &'a str,
    logs: &'a OriginLogs,
    prec: u32,
}

fn has_symbol(e: &Expr) -> bool {
    let mut found = false;
    for_each_symbol(e, &mut |_, _| found = true);
    found
}

impl Reader<'_> {
    fn fail(&self, span: crate::input::expr::Span, message: &str) -> Error {
        self.located.error_at(self.origin, span, message)
    }

    fn number(&self, e: &Expr) -> Result<Estimate> {
        let mut ctx = Context::new(self.prec);
        let mzv = |s: &[u32], p: u32| crate::numeric::mzv::mzv(s, p);
        ctx.mzv = Some(&mzv);
        evaluate::evaluate(e, &mut ctx).map_err(|(span, msg)| self.fail(span, &msg))
    }

    fn poly(&self, e: &Expr) -> Result<NumPoly> {
        if !has_symbol(e) {
            return Ok(NumPoly::constant(self.number(e)?));
        }
        match &e.node {
            Node::Symbol(name) => {
                let names = self.logs.names();
                let slot = names.iter().position(|n| n == name).ok_or_else(|| {
                    self.fail(
                        e.span,
                        &format!(
                            "the symbol `{name}` is not one of the logs ({})",
                            names.join(", ")
                        ),
                    )
                })?;
                let mut exps = [0; 3];
                exps[slot] = 1;
                let mut p = NumPoly::zero(self.prec);
                p.add_term(exps, &Estimate::exact(Float::with_val(self.prec, 1)));
                Ok(p)
            }
            Node::Neg(a) => Ok(self.poly(a)?.neg()),
            Node::Add(a, b) => Ok(self.poly(a)?.add(&self.poly(b)?)),
            Node::Sub(a, b) => Ok(self.poly(a)?.add(&self.poly(b)?.neg())),
            Node::Mul(a, b) => self.poly(a)?.mul(&self.poly(b)?),
            Node::Div(a, b) => {
                if has_symbol(b) {
                    return Err(self.fail(
                        b.span,
                        "an origin coefficient is a polynomial in the logs: divide by numbers only",
                    ));
                }
                let d = self.number(b)?;
                self.poly(a)?.divide(&d).ok_or_else(|| {
                    self.fail(
                        b.span,
                        "division by a number that is zero within its uncertainty",
                    )
                })
            }
            Node::Pow(a, b) => {
                let k = if has_symbol(b) {
                    None
                } else {
                    Some(self.number(b)?)
                };
                let k = k
                    .filter(|k| k.is_exact() && k.value.is_integer() && k.value >= 0 && k.value <= MAX_LOG_POWER)
                    .and_then(|k| k.value.to_integer())
                    .and_then(|k| k.to_u32())
                    .ok_or_else(|| self.fail(b.span, "a power of the logs takes a whole exponent from 0 up (a polynomial in the logs)"))?;
                self.poly(a)?.pow(k)
            }
            _ => Err(self.fail(
                e.span,
                "an origin coefficient is a polynomial in the logs; this is not one",
            )),
        }
    }
}

/// A term of ln E that should vanish and does not.
#[derive(Clone, Debug)]
pub struct NumTerm {
    pub exponents: Exponents,
    pub coefficient: Estimate,
}

/// The first order at which ln E is not, within the uncertainties, a
/// symmetric polynomial of degree <= 2: the terms found nonzero.
#[derive(Clone, Debug)]
pub struct NumBreakdown {
    pub order: usize,
    pub high_degree: Vec<NumTerm>,
    pub asymmetric: Vec<NumTerm>,
}

#[derive(Clone, Debug)]
pub struct NumAnalysis {
    /// ln E through the last order examined.
    pub ln_e: Vec<NumPoly>,
    pub orders: Vec<OrderReading<Estimate>>,
    pub broken: Option<NumBreakdown>,
}

impl NumAnalysis {
    fn from(a: Analysis<NumPoly, Estimate>) -> Self {
        let terms = |p: &NumPoly| -> Vec<NumTerm> {
            p.terms
                .iter()
                .map(|(e, c)| NumTerm {
                    exponents: *e,
                    coefficient: c.clone(),
                })
                .collect()
        };
        NumAnalysis {
            broken: a.broken.map(|b| NumBreakdown {
                order: b.order,
                high_degree: terms(&b.high_degree),
                asymmetric: terms(&b.asymmetric),
            }),
            ln_e: a.ln_e,
            orders: a.orders,
        }
    }
}

/// Numerical polynomials at one precision, with the verdicts on vanishing
/// terms taken at `digits`.
struct Numbers {
    prec: u32,
    digits: u32,
}

impl SeriesCoefficients for Numbers {
    type C = NumPoly;
    fn zero(&mut self) -> NumPoly {
        NumPoly::zero(self.prec)
    }
    fn one(&mut self) -> NumPoly {
        NumPoly::constant(Estimate::exact(Float::with_val(self.prec, 1)))
    }
    fn is_zero(&self, c: &NumPoly) -> bool {
        c.terms.is_empty()
    }
    fn add_product(
        &mut self,
        acc: &mut NumPoly,
        factor: &Rational,
        a: &NumPoly,
        b: &NumPoly,
    ) -> Result<()> {
        let term = a.mul(b)?.scale(&Float::with_val(self.prec, factor));
        *acc = acc.add(&term);
        Ok(())
    }
}

impl LogPolynomials for Numbers {
    type Value = Estimate;
    fn split_at_quadratic(&self, p: &NumPoly) -> (NumPoly, NumPoly) {
        let (low, high) = p
            .terms
            .iter()
            .map(|(e, c)| (*e, c.clone()))
            .partition(|(e, _)| e.iter().sum::<u32>() <= 2);
        (
            NumPoly {
                prec: p.prec,
                terms: low,
            },
            NumPoly {
                prec: p.prec,
                terms: high,
            },
        )
    }
    /// At e this is (1/6) sum over the permutations that move e of
    /// (c_e - c_(sigma e)), whose worst-case error is (1/6) sum of
    /// (u_e + u_(sigma e)).
    fn asymmetric_part(&self, c: &NumPoly) -> NumPoly {
        let support: BTreeSet<Exponents> = c
            .terms
            .keys()
            .flat_map(|&e| permutations().map(move |p| permuted(e, p)))
            .collect();
        let sixth = Float::with_val(c.prec, Rational::from((1, 6)));
        let mut out = NumPoly::zero(c.prec);
        for e in support {
            let ce = c.coefficient(e);
            let mut acc = zero(c.prec);
            for perm in permutations() {
                let moved = permuted(e, perm);
                if moved != e {
                    acc = acc.sum(&ce.difference(&c.coefficient(moved)));
                }
            }
            let part = acc.scaled(&sixth);
            if !(part.value.is_zero() && part.error.is_zero()) {
                out.terms.insert(e, part);
            }
        }
        out
    }
    fn significant(&self, p: &NumPoly) -> NumPoly {
        let nought = Float::with_val(self.prec, 0);
        NumPoly {
            prec: p.prec,
            terms: p
                .terms
                .iter()
                .filter(|(_, a)| judge_numbers(a, &nought, None, self.digits).differs())
                .map(|(e, a)| (*e, a.clone()))
                .collect(),
        }
    }
    fn coefficient(&self, p: &NumPoly, e: Exponents) -> Estimate {
        p.coefficient(e)
    }
    fn combination(&self, terms: &[(Rational, &Estimate)]) -> Estimate {
        terms.iter().fold(zero(self.prec), |acc, (r, v)| {
            acc.sum(&v.scaled(&Float::with_val(self.prec, r)))
        })
    }
}

/// Reads a series of E (constant term 1) with numerical coefficients;
/// `digits` sets the working precision of the verdicts on vanishing terms.
pub fn analyse_e(e: &[NumPoly], logs: &OriginLogs, digits: u32) -> Result<NumAnalysis> {
    let one = e.first().map(|c| c.coefficient([0, 0, 0]));
    let is_one = e.first().is_some_and(|c| c.terms.len() == 1)
        && one.is_some_and(|c| c.is_exact() && c.value == 1);
    if !is_one {
        return Err(Error::input(
            "a series of E must start with exactly 1 at g^0",
        ));
    }
    let mut numbers = Numbers {
        prec: e[0].prec,
        digits,
    };
    Ok(NumAnalysis::from(analysis::analyse_e(
        &mut numbers,
        e,
        logs,
    )?))
}

/// Reads a series of R6 with numerical coefficients: ln E = R6 +
/// Gamma_cusp/4 E^(1) directly, as [`crate::origin::analyse_r6`] does.
pub fn analyse_r6(
    r6: &[NumPoly],
    gamma_cusp: &Series,
    logs: &OriginLogs,
    digits: u32,
) -> Result<NumAnalysis> {
    let highest = r6.len().saturating_sub(1);
    if gamma_cusp.order() < highest {
        return Err(Error::range(format!(
            "Gamma_cusp is known through g^{} only, the origin series needs g^{}",
            2 * gamma_cusp.order(),
            2 * highest
        )));
    }
    let prec = r6.first().map_or(64, |c| c.prec);
    let e1 = one_loop_limit(logs).scale(&Rational::from((1, 4)));
    let mut ln = vec![NumPoly::zero(prec)];
    for (k, c) in r6.iter().enumerate().skip(1) {
        let ansatz = NumPoly::from_exact(&(gamma_cusp.coeff(k) * &e1), logs, prec)?;
        ln.push(c.add(&ansatz));
    }
    let mut numbers = Numbers { prec, digits };
    Ok(NumAnalysis::from(analysis::analyse_ln(
        &mut numbers,
        ln,
        logs,
    )))
}

/// A monomial in the logs as text: `l1^2*l2`, `1` for the constant.
pub fn monomial_text(e: Exponents, logs: &OriginLogs) -> String {
    let names = logs.names();
    let parts: Vec<String> = e
        .iter()
        .zip(&names)
        .filter(|(p, _)| **p > 0)
        .map(|(p, n)| {
            if *p == 1 {
                n.to_string()
            } else {
                format!("{n}^{p}")
            }
        })
        .collect();
    if parts.is_empty() {
        "1".to_string()
    } else {
        parts.join("*")
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::input::expr::parse;

    const PREC: u32 = 200;

    fn located(text: &str) -> Located {
        Located::standalone(text, parse(text, "<test>", None).unwrap())
    }

    fn close(x: &Float, y: f64, tol: f64) -> bool {
        (x.to_f64() - y).abs() <= tol
    }

    /// (1.5(1) l1 + 2) * (l1 - 0.5(2)): l1^2 1.5(1); l1 2 - 0.75 with
    /// uncertainty 0.1*0.5 + 1.5*0.2 + 0.1*0.2 = 0.37 (by hand); constant
    /// -1 with 2*0.2 = 0.4.
    #[test]
    fn polynomials_propagate_first_order_worst_case() {
        let logs = OriginLogs::three();
        let p = read_polynomial(
            &located("(1.5(1)*l1 + 2)*(l1 - 0.5(2))"),
            "<test>",
            &logs,
            PREC,
        )
        .unwrap();
        let c = p.coefficient([1, 0, 0]);
        assert!(
            close(&c.value, 1.25, 1e-15) && close(&c.error, 0.37, 1e-15),
            "{c:?}"
        );
        let c = p.coefficient([0, 0, 0]);
        assert!(close(&c.value, -1.0, 1e-15) && close(&c.error, 0.4, 1e-15) && c.stated);
        let c = p.coefficient([2, 0, 0]);
        assert!(close(&c.value, 1.5, 1e-15) && close(&c.error, 0.1, 1e-15));
        assert!(read_polynomial(&located("1.5/l1"), "<test>", &logs, PREC).is_err());
        assert!(read_polynomial(&located("l1^0.5"), "<test>", &logs, PREC).is_err());
        assert!(read_polynomial(&located("log(l1)*1.0"), "<test>", &logs, PREC).is_err());
        assert!(read_polynomial(&located("x*1.0"), "<test>", &logs, PREC)
            .unwrap_err()
            .message()
            .contains("`x`"));
    }

    /// The numerical logarithm of an exact series agrees with the ring's
    /// exact logarithm evaluated afterwards (two independent routes).
    #[test]
    fn numerical_ln_matches_the_exact_one() {
        let logs = OriginLogs::three();
        let l = |i: usize| Exact::symbol(&format!("l{i}"));
        let z = |n: u32| Exact::zeta(n).unwrap();
        let e1 = &(&l(1) * &l(2)).scale(&Rational::from((3, 5))) - &z(2);
        let e2 = &(&l(1).pow(3) * &z(3)) + &l(3).pow(2);
        let e3 = &(&l(2) * &z(5)) + &Exact::from(Rational::from((7, 2)));
        let e = Series::new(vec![Exact::one(), e1, e2, e3]);
        let nums: Vec<NumPoly> = e
            .coeffs()
            .iter()
            .map(|c| NumPoly::from_exact(c, &logs, PREC).unwrap())
            .collect();
        let a = analyse_e(&nums, &logs, 30).unwrap();
        let b = a
            .broken
            .expect("the asymmetric l1 l2 term breaks at order 1");
        assert_eq!(b.order, 1);
        let exact_ln = e.ln().unwrap();
        let k = 1;
        let want = NumPoly::from_exact(exact_ln.coeff(k), &logs, PREC).unwrap();
        for (m, c) in want.terms() {
            let got = a.ln_e[k].coefficient(*m);
            assert!(
                Float::with_val(PREC, &got.value - &c.value).abs() < 1e-50,
                "{m:?}"
            );
        }
        // Order 3 through the recursion on the line, where nothing is asymmetric.
        let line = OriginLogs::line();
        let on_line = |x: &Exact| {
            x.substitute("l1", &Exact::symbol("l"))
                .substitute("l2", &Exact::symbol("l"))
                .substitute("l3", &Exact::symbol("l"))
        };
        let e = e.map(on_line);
        let nums: Vec<NumPoly> = e
            .coeffs()
            .iter()
            .map(|c| NumPoly::from_exact(c, &line, PREC).unwrap())
            .collect();
        let ln = analyse_e(&nums[..=3], &line, 30).unwrap().ln_e;
        let exact_ln = e.ln().unwrap();
        for (k, computed) in ln.iter().enumerate().skip(1) {
            let want = NumPoly::from_exact(exact_ln.coeff(k), &line, PREC).unwrap();
            for (m, c) in want.terms() {
                let got = computed.coefficient(*m);
                assert!(
                    Float::with_val(PREC, &got.value - &c.value).abs() < 1e-50,
                    "order {k} {m:?}"
                );
            }
        }
    }

    #[test]
    fn asymmetric_part_within_uncertainty_is_not_a_break() {
        let logs = OriginLogs::three();
        let p = read_polynomial(
            &located("1.00(1)*l1^2 + 1.01(1)*l2^2 + 1.00(1)*l3^2"),
            "<test>",
            &logs,
            PREC,
        )
        .unwrap();
        let examine = |p: NumPoly| {
            let mut numbers = Numbers {
                prec: PREC,
                digits: 30,
            };
            NumAnalysis::from(analysis::analyse_ln(
                &mut numbers,
                vec![NumPoly::zero(PREC), p],
                &logs,
            ))
            .broken
        };
        assert!(examine(p).is_none());
        let p = read_polynomial(
            &located("1.00(1)*l1^2 + 1.10(1)*l2^2 + 1.00(1)*l3^2"),
            "<test>",
            &logs,
            PREC,
        )
        .unwrap();
        let b = examine(p).unwrap();
        assert!(b.high_degree.is_empty());
        // At l2^2: (1/6)(4 (1.10 - 1.00)) = 0.0667 with (1/6)(4 * 0.02) = 0.0133.
        let t = b
            .asymmetric
            .iter()
            .find(|t| t.exponents == [0, 2, 0])
            .unwrap();
        assert!(
            close(&t.coefficient.value, 0.4 / 6.0, 1e-12)
                && close(&t.coefficient.error, 0.08 / 6.0, 1e-12)
        );
    }
}
