//! Exact fits of a quantity known through some loop orders as a rational
//! combination of named basis series: target = sum_k a_k B_k(g), a_k rational.
//!
//! Every (loop order, monomial of the zeta ring) pair is one linear equation
//! in the a_k; the system is solved by Gaussian elimination over the
//! rationals (GMP), so the answer is exact: a unique solution, a family (one
//! particular solution plus a basis of the null space), or no solution.
//!
//! Definitions used in the reports:
//! - *Orders to fix a family*: the basis series are expanded further and the
//!   smallest L' above the highest supplied order is found at which the
//!   equations of the basis alone, at the supplied orders and at every order
//!   up to L', have only the zero solution (full column rank). Then data
//!   through L' determine the a_k whatever the values turn out to be. The
//!   search stops at a caller-given ceiling; a basis with an exact relation
//!   between its elements is never fixed, and the report says so.
//! - *No fit*: the supplied orders are taken in increasing order; the first
//!   order at which the equations of the orders up to it have no solution is
//!   reported. For each basis element, using only the consistent orders
//!   below it: the first order from which every solution has a_k = 0 (the
//!   order that rules the element out), and whether a_k can still be nonzero.

pub mod file;
mod linear;

use std::collections::BTreeSet;

use rug::Rational;

use crate::error::{Error, Result};
use crate::exact::powerseries::Series;
use crate::exact::ring::{Exact, Monomial};
use crate::input::catalogue::Catalogue;
use crate::quantity::{Expander, Quantity, Scope};
use linear::{reduce, Reduced};

/// One named basis series, given by a formula in the coefficient language.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct BasisElement {
    pub name: String,
    pub formula: String,
}

impl BasisElement {
    pub fn new(formula: &str) -> Self {
        BasisElement {
            name: formula.to_string(),
            formula: formula.to_string(),
        }
    }
}

/// The tilts of the default basis, as the coefficient language writes them.
pub const DEFAULT_TILTS: [&str; 5] = ["0", "pi/6", "pi/4", "pi/3", "pi/2"];

/// Gamma and Delta at the tilts 0, pi/6, pi/4, pi/3, pi/2, and zeta(2) times
/// each Gamma: fifteen elements, of which Delta(pi/2) vanishes identically
/// (K(pi/2) is nilpotent, docs/conventions.md section 3) and is dropped at expansion.
pub fn default_basis() -> Vec<BasisElement> {
    let mut out: Vec<BasisElement> = Vec::new();
    for t in DEFAULT_TILTS {
        out.push(BasisElement::new(&format!("Gamma({t})")));
    }
    for t in DEFAULT_TILTS {
        out.push(BasisElement::new(&format!("Delta({t})")));
    }
    for t in DEFAULT_TILTS {
        out.push(BasisElement::new(&format!("zeta(2)*Gamma({t})")));
    }
    out
}

/// An element left out of the fit, and why.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Dropped {
    pub name: String,
    pub reason: String,
}

/// Basis series expanded to a common order, with zero elements and exact
/// multiples of earlier elements dropped.
#[derive(Clone, Debug)]
pub struct ExpandedBasis {
    pub names: Vec<String>,
    pub series: Vec<Series>,
    pub dropped: Vec<Dropped>,
}

/// Expands the elements through g^(2 loops), sharing kernel expansions.
pub fn expand_basis(
    elements: &[BasisElement],
    loops: u32,
    catalogue: &Catalogue,
) -> Result<ExpandedBasis> {
    let mut cache = std::collections::HashMap::new();
    let mut out = ExpandedBasis {
        names: Vec::new(),
        series: Vec::new(),
        dropped: Vec::new(),
    };
    // Earlier named elements may be used in later formulas (`A=Gamma(0); B=2*A`).
    let mut named: Vec<(String, crate::input::expr::Expr)> = Vec::new();
    for element in elements {
        let scope = Scope {
            symbols: &[],
            local: &named,
        };
        let q = Quantity::resolve_in(&element.formula, catalogue, scope)
            .map_err(|e| e.context(&element.name))?;
        if element.name != element.formula {
            named.push((element.name.clone(), q.expr.clone()));
        }
        let mut progress = |_: &str, _: usize, _: usize| {};
        let mut ex = Expander {
            source: &q.definition,
            origin: &q.origin,
            site: q.site.as_ref(),
            loops,
            cache: std::mem::take(&mut cache),
            uses_left: None,
            progress: &mut progress,
        };
        let s = ex.series(&q.expr);
        cache = std::mem::take(&mut ex.cache);
        let s = s.map_err(|e| e.context(&element.name))?;
        if s.coeffs().iter().all(Exact::is_zero) {
            out.dropped.push(Dropped {
                name: element.name.clone(),
                reason: format!("zero through g^{}", 2 * loops),
            });
            continue;
        }
        if let Some((k, r)) = out
            .series
            .iter()
            .enumerate()
            .find_map(|(k, b)| rational_ratio(&s, b).map(|r| (k, r)))
        {
            out.dropped.push(Dropped {
                name: element.name.clone(),
                reason: format!("equal to ({r}) * {} through g^{}", out.names[k], 2 * loops),
            });
            continue;
        }
        out.names.push(element.name.clone());
        out.series.push(s);
    }
    Ok(out)
}

/// r with a = r b, when there is one and b is not zero.
fn rational_ratio(a: &Series, b: &Series) -> Option<Rational> {
    let k = b.coeffs().iter().position(|c| !c.is_zero())?;
    let (m, cb) = b.coeff(k).terms().next()?;
    let r = a.coeff(k).coefficient(m) / cb;
    let scaled = b.map(|c| c.scale(&r));
    (scaled == *a).then_some(r)
}

/// What the equations of some orders say about the a_k.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum Solution {
    Unique(Vec<Rational>),
    /// a = particular + sum_i t_i `null_space[i]`, t_i any rationals.
    Family {
        particular: Vec<Rational>,
        null_space: Vec<Vec<Rational>>,
    },
    /// No combination fits.
    Inconsistent(Inconsistency),
}

/// Where a fit fails (see the module documentation for the definitions).
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Inconsistency {
    /// The first supplied order whose equations, with those of lower orders, have no solution.
    pub first_inconsistent_order: u32,
    /// Per basis element, in basis order.
    pub elements: Vec<ElementStatus>,
}

#[derive(Clone, Debug, PartialEq, Eq)]
pub struct ElementStatus {
    /// The first consistent order from which every solution has a_k = 0.
    pub ruled_out_at: Option<u32>,
    /// Whether a_k can be nonzero in a solution of all the consistent orders.
    pub can_appear: bool,
}

/// Solves target = sum_k a_k `basis[k]` at the supplied orders, exactly.
pub fn solve(target: &[(u32, Exact)], basis: &[Series]) -> Result<Solution> {
    let orders = check_orders(target, basis)?;
    let n = basis.len();
    let rows = equations(target, basis, &orders);
    match reduce(rows.clone(), n) {
        Some(r) => Ok(r.solution()),
        None => {
            // Find the first inconsistent prefix, then read the last consistent one.
            let mut consistent: Option<Reduced> = None;
            let mut ruled_out_at: Vec<Option<u32>> = vec![None; n];
            for (i, &order) in orders.iter().enumerate() {
                let prefix = equations(target, basis, &orders[..=i]);
                match reduce(prefix, n) {
                    Some(r) => {
                        let forced = r.forced_zero();
                        for k in 0..n {
                            if forced[k] && ruled_out_at[k].is_none() {
                                ruled_out_at[k] = Some(order);
                            }
                        }
                        consistent = Some(r);
                    }
                    None => {
                        let forced = consistent.map_or(vec![false; n], |r| r.forced_zero());
                        let elements = (0..n)
                            .map(|k| ElementStatus {
                                ruled_out_at: ruled_out_at[k],
                                can_appear: !forced[k],
                            })
                            .collect();
                        return Ok(Solution::Inconsistent(Inconsistency {
                            first_inconsistent_order: order,
                            elements,
                        }));
                    }
                }
            }
            Err(Error::numeric(
                "the full system is inconsistent but no prefix of it is",
            ))
        }
    }
}

/// How many more orders fix a family of solutions.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum Fixing {
    /// Data through `loop_order` fix the a_k; `missing` lists the orders to add.
    At { loop_order: u32, missing: Vec<u32> },
    /// The basis equations keep `free` parameters through `ceiling` loops.
    NotWithin { ceiling: u32, free: usize },
}

/// The result of [`fit`].
#[derive(Clone, Debug)]
pub struct Fit {
    /// The elements used, in order; coefficient vectors follow this order.
    pub names: Vec<String>,
    pub dropped: Vec<Dropped>,
    pub solution: Solution,
    /// For a family: the orders that would fix it.
    pub fixing: Option<Fixing>,
}

/// Fits `target` with the basis `elements`. The basis is expanded through
/// `depth` = max(highest supplied order, `ceiling`) loops (the ceiling capped
/// at the exact engine's limit): elements zero or proportional to an earlier
/// one through that depth are dropped, and a family is searched for the
/// orders that would fix it up to that depth.
pub fn fit(
    target: &[(u32, Exact)],
    elements: &[BasisElement],
    ceiling: u32,
    catalogue: &Catalogue,
) -> Result<Fit> {
    let highest = target
        .iter()
        .map(|(l, _)| *l)
        .max()
        .ok_or_else(|| Error::input("nothing to fit: no orders given"))?;
    let depth = highest.max(ceiling.min(crate::limits::MAX_LOOPS)).max(1);
    let basis = expand_basis(elements, depth, catalogue)?;
    let solution = solve(target, &basis.series)?;
    let fixing = match &solution {
        Solution::Family { null_space, .. } => Some(fixing_order(
            target,
            &basis.series,
            highest,
            depth,
            null_space.len(),
        )?),
        _ => None,
    };
    Ok(Fit {
        names: basis.names,
        dropped: basis.dropped,
        solution,
        fixing,
    })
}

fn fixing_order(
    target: &[(u32, Exact)],
    series: &[Series],
    highest: u32,
    depth: u32,
    free_now: usize,
) -> Result<Fixing> {
    let supplied: BTreeSet<u32> = target.iter().map(|(l, _)| *l).collect();
    let n = series.len();
    let mut free = free_now;
    for l in (highest + 1)..=depth {
        let orders: Vec<u32> = supplied
            .iter()
            .copied()
            .chain(1..=l)
            .collect::<BTreeSet<u32>>()
            .into_iter()
            .collect();
        let zero_target: Vec<(u32, Exact)> = orders.iter().map(|&o| (o, Exact::zero())).collect();
        let r = reduce(equations(&zero_target, series, &orders), n)
            .ok_or_else(|| Error::numeric("a homogeneous system cannot be inconsistent"))?;
        free = n - r.pivots.len();
        if free == 0 {
            let missing = (1..=l).filter(|o| !supplied.contains(o)).collect();
            return Ok(Fixing::At {
                loop_order: l,
                missing,
            });
        }
    }
    Ok(Fixing::NotWithin {
        ceiling: depth,
        free,
    })
}

fn check_orders(target: &[(u32, Exact)], basis: &[Series]) -> Result<Vec<u32>> {
    let mut orders: Vec<u32> = target.iter().map(|(l, _)| *l).collect();
    orders.sort_unstable();
    if let Some(w) = orders.windows(2).find(|w| w[0] == w[1]) {
        return Err(Error::input(format!("loop order {} is given twice", w[0])));
    }
    let highest = orders.last().copied().unwrap_or(0) as usize;
    if let Some(b) = basis.iter().find(|b| b.order() < highest) {
        return Err(Error::range(format!(
            "a basis series is known through g^{} only, the data reach g^{}",
            2 * b.order(),
            2 * highest
        )));
    }
    Ok(orders)
}

/// One row per (order, monomial): the basis coefficients, then the target's.
fn equations(target: &[(u32, Exact)], basis: &[Series], orders: &[u32]) -> Vec<Vec<Rational>> {
    let mut rows = Vec::new();
    for &order in orders {
        let k = order as usize;
        let Some((_, t)) = target.iter().find(|(l, _)| *l == order) else {
            continue;
        };
        let mut monomials: BTreeSet<&Monomial> = t.terms().map(|(m, _)| m).collect();
        for b in basis {
            monomials.extend(b.coeff(k).terms().map(|(m, _)| m));
        }
        for m in monomials {
            let mut row: Vec<Rational> = basis.iter().map(|b| b.coeff(k).coefficient(m)).collect();
            row.push(t.coefficient(m));
            rows.push(row);
        }
    }
    rows
}

#[cfg(test)]
mod tests {
    use super::*;

    fn q(n: i64, d: i64) -> Rational {
        Rational::from((n, d))
    }

    fn zeta(n: u32) -> Exact {
        Exact::zeta(n).unwrap()
    }

    fn expand(formula: &str, loops: u32) -> Series {
        Quantity::resolve(formula, &Catalogue::builtin().unwrap())
            .unwrap()
            .expand(loops, &mut |_, _, _| {})
            .unwrap()
    }

    fn data(s: &Series) -> Vec<(u32, Exact)> {
        (1..=s.order())
            .map(|k| (k as u32, s.coeff(k).clone()))
            .collect()
    }

    /// The coefficient vector in the order of `names`, from (name, value) pairs.
    fn vector(names: &[String], entries: &[(&str, Rational)]) -> Vec<Rational> {
        names
            .iter()
            .map(|n| {
                entries
                    .iter()
                    .find(|(e, _)| e == n)
                    .map_or(Rational::new(), |(_, v)| v.clone())
            })
            .collect()
    }

    /// Whether a lies in particular + span(null_space): the null vectors carry
    /// the identity on the free columns, so the span coordinates are read off there.
    fn in_family(a: &[Rational], particular: &[Rational], null_space: &[Vec<Rational>]) -> bool {
        let mut rest: Vec<Rational> = a
            .iter()
            .zip(particular)
            .map(|(x, p)| Rational::from(x - p))
            .collect();
        for v in null_space {
            let free = v.iter().position(|x| *x == 1).unwrap();
            let t = rest[free].clone();
            for (r, x) in rest.iter_mut().zip(v) {
                *r -= Rational::from(&t * x);
            }
        }
        rest.iter().all(|x| *x == 0)
    }

    #[test]
    fn elimination_on_small_systems() {
        // 2x + y = 3, x - y = 0: x = y = 1 (by hand).
        let b = vec![
            Series::new(vec![Exact::zero(), Exact::from(2), Exact::from(1)]),
            Series::new(vec![Exact::zero(), Exact::from(1), Exact::from(-1)]),
        ];
        let t = vec![(1, Exact::from(3)), (2, Exact::from(0))];
        assert_eq!(
            solve(&t, &b).unwrap(),
            Solution::Unique(vec![q(1, 1), q(1, 1)])
        );
        // One equation, two unknowns: x + y/2 = 1 -> (1, 0) + t (-1/2, 1).
        let b = vec![
            Series::new(vec![Exact::zero(), Exact::from(1)]),
            Series::new(vec![Exact::zero(), Exact::from(Rational::from((1, 2)))]),
        ];
        assert_eq!(
            solve(&[(1, Exact::from(1))], &b).unwrap(),
            Solution::Family {
                particular: vec![q(1, 1), q(0, 1)],
                null_space: vec![vec![q(-1, 2), q(1, 1)]]
            }
        );
    }

    #[test]
    fn default_basis_drops_the_vanishing_delta() {
        let b = expand_basis(&default_basis(), 4, &Catalogue::builtin().unwrap()).unwrap();
        assert_eq!(default_basis().len(), 15);
        assert_eq!(b.names.len(), 14);
        assert_eq!(b.dropped.len(), 1);
        assert_eq!(b.dropped[0].name, "Delta(pi/2)");
        // Gamma(pi/2) = 4 g^2 exactly (docs/conventions.md section 4) stays in.
        let k = b.names.iter().position(|n| n == "Gamma(pi/2)").unwrap();
        assert_eq!(
            b.series[k],
            Series::new(vec![
                Exact::zero(),
                Exact::from(4),
                Exact::zero(),
                Exact::zero(),
                Exact::zero()
            ])
        );
    }

    #[test]
    fn multiples_are_dropped_with_their_ratio() {
        let elements = [
            BasisElement::new("Gamma(pi/4)"),
            BasisElement::new("Gamma(c2=1/2)/3"),
        ];
        let b = expand_basis(&elements, 3, &Catalogue::builtin().unwrap()).unwrap();
        assert_eq!(b.names, vec!["Gamma(pi/4)".to_string()]);
        assert!(
            b.dropped[0].reason.contains("1/3"),
            "{}",
            b.dropped[0].reason
        );
    }

    /// C0 through two loops, C0^(1) = -3 zeta2 and C0^(2) = 77/4 zeta4
    /// (docs/conventions.md section 6; arXiv:1006.5703 for the two-loop value), with
    /// the two members docs/conventions.md names: C0 = -zeta2/2 Gamma(pi/4) + D0.
    #[test]
    fn two_loop_constant_gives_a_family_holding_both_known_members() {
        let target = vec![(1, zeta(2).scale(&q(-3, 1))), (2, zeta(4).scale(&q(77, 4)))];
        let members = [
            "-zeta(2)/2*Gamma(pi/4) + (Delta(pi/4) + Delta(pi/3) - Delta(pi/6) - Delta(0))/4",
            "-zeta(2)/2*Gamma(pi/4) + (4*Delta(pi/3) - 2*Delta(pi/4) - Delta(0))/4",
        ];
        for m in members {
            assert_eq!(data(&expand(m, 2)), target, "{m}");
        }
        let f = fit(
            &target,
            &default_basis(),
            12,
            &Catalogue::builtin().unwrap(),
        )
        .unwrap();
        let Solution::Family {
            particular,
            null_space,
        } = &f.solution
        else {
            panic!("{:?}", f.solution)
        };
        // Four equations (monomials 1 and pi^2 at one loop, pi^2 and pi^4 at
        // two: Gamma has weight 2L-2, Delta and zeta(2)*Gamma weight 2L) for
        // fourteen unknowns.
        assert_eq!(null_space.len(), 10);
        let first = vector(
            &f.names,
            &[
                ("zeta(2)*Gamma(pi/4)", q(-1, 2)),
                ("Delta(pi/4)", q(1, 4)),
                ("Delta(pi/3)", q(1, 4)),
                ("Delta(pi/6)", q(-1, 4)),
                ("Delta(0)", q(-1, 4)),
            ],
        );
        let second = vector(
            &f.names,
            &[
                ("zeta(2)*Gamma(pi/4)", q(-1, 2)),
                ("Delta(pi/3)", q(1, 1)),
                ("Delta(pi/4)", q(-1, 2)),
                ("Delta(0)", q(-1, 4)),
            ],
        );
        assert!(in_family(&first, particular, null_space));
        assert!(in_family(&second, particular, null_space));
        let mut wrong = first.clone();
        wrong[0] += 1;
        assert!(!in_family(&wrong, particular, null_space));
        let Some(Fixing::At {
            loop_order,
            missing,
        }) = &f.fixing
        else {
            panic!("{:?}", f.fixing)
        };
        assert!(*loop_order > 2);
        assert_eq!(*missing, (3..=*loop_order).collect::<Vec<u32>>());
        // At that order the first member is recovered alone; one order less
        // still leaves a family, so the order reported is the smallest.
        let c0 = expand(members[0], *loop_order);
        let f = fit(
            &data(&c0),
            &default_basis(),
            12,
            &Catalogue::builtin().unwrap(),
        )
        .unwrap();
        assert_eq!(f.solution, Solution::Unique(first));
        let f = fit(
            &data(&c0.truncate(*loop_order as usize - 1)),
            &default_basis(),
            12,
            &Catalogue::builtin().unwrap(),
        )
        .unwrap();
        assert!(matches!(f.solution, Solution::Family { .. }));
    }

    #[test]
    fn a_known_combination_is_recovered_with_a_gap_in_the_orders() {
        let combo = expand("3/7*Gamma(pi/6) - 2*zeta(2)*Gamma(0) + Delta(pi/3)/5", 8);
        let mut target = data(&combo);
        target.remove(2);
        let elements = [
            BasisElement::new("Gamma(pi/6)"),
            BasisElement::new("Gamma(0)"),
            BasisElement::new("zeta(2)*Gamma(0)"),
            BasisElement::new("Delta(pi/3)"),
        ];
        let f = fit(&target, &elements, 10, &Catalogue::builtin().unwrap()).unwrap();
        assert_eq!(
            f.solution,
            Solution::Unique(vec![q(3, 7), q(0, 1), q(-2, 1), q(1, 5)])
        );
    }

    #[test]
    fn impossible_targets_are_refused_with_the_order_that_rules_them_out() {
        // zeta(3) g^2: weight 3 where every basis element has weight 0 or 2.
        let f = fit(
            &[(1, zeta(3))],
            &default_basis(),
            4,
            &Catalogue::builtin().unwrap(),
        )
        .unwrap();
        let Solution::Inconsistent(bad) = &f.solution else {
            panic!("{:?}", f.solution)
        };
        assert_eq!(bad.first_inconsistent_order, 1);
        assert!(bad
            .elements
            .iter()
            .all(|e| e.can_appear && e.ruled_out_at.is_none()));

        // Gamma(0) at one loop forces a_Delta(0) = 0 (Delta(0) has 4 zeta2 g^2,
        // docs/conventions.md sections 2-3), then a weight-3 two-loop value is impossible.
        let elements = [BasisElement::new("Gamma(0)"), BasisElement::new("Delta(0)")];
        let f = fit(
            &[(1, Exact::from(4)), (2, zeta(3))],
            &elements,
            4,
            &Catalogue::builtin().unwrap(),
        )
        .unwrap();
        let Solution::Inconsistent(bad) = &f.solution else {
            panic!("{:?}", f.solution)
        };
        assert_eq!(bad.first_inconsistent_order, 2);
        assert_eq!(
            bad.elements[0],
            ElementStatus {
                ruled_out_at: None,
                can_appear: true
            }
        );
        assert_eq!(
            bad.elements[1],
            ElementStatus {
                ruled_out_at: Some(1),
                can_appear: false
            }
        );
        assert!(f.fixing.is_none());
    }

    #[test]
    fn an_exact_relation_is_never_fixed() {
        // Gamma(0) + Gamma(pi/2) is no multiple of either element, but an
        // exact sum of both: one free parameter at every order.
        let elements = [
            BasisElement::new("Gamma(pi/2)"),
            BasisElement::new("Gamma(0)"),
            BasisElement::new("Gamma(0) + Gamma(pi/2)"),
        ];
        let f = fit(
            &[(1, Exact::from(4))],
            &elements,
            6,
            &Catalogue::builtin().unwrap(),
        )
        .unwrap();
        assert_eq!(f.names.len(), 3);
        let Solution::Family { null_space, .. } = &f.solution else {
            panic!("{:?}", f.solution)
        };
        assert_eq!(null_space.len(), 2);
        assert_eq!(
            f.fixing,
            Some(Fixing::NotWithin {
                ceiling: 6,
                free: 1
            })
        );
    }

    #[test]
    fn bad_orders_are_refused() {
        let b = vec![Series::new(vec![Exact::zero(), Exact::from(4)])];
        assert!(solve(&[(1, Exact::one()), (1, Exact::one())], &b).is_err());
        assert!(solve(&[(2, Exact::one())], &b).is_err());
        assert!(fit(&[], &default_basis(), 4, &Catalogue::builtin().unwrap()).is_err());
    }
}
