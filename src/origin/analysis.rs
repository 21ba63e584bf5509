//! The analysis of ln E at the origin, written once for both kinds of
//! coefficients (exact, and numbers with errors): order by order, ln E must
//! be a symmetric polynomial of degree <= 2 in the logs (the exponentiation
//! check); where it is, the order is read as
//!
//!   alpha (l1+l2+l3)^2 + beta sum_i (l_i - l_(i+1))^2 + linear (l1+l2+l3) + C0,
//!
//! (docs/conventions.md section 6); the first order where it is not is the
//! breakdown, and no later order is examined.

use rug::Rational;

use super::OriginLogs;
use crate::error::Result;
use crate::exact::powerseries::{ln_coefficients, SeriesCoefficients};

/// Exponents of (l1, l2, l3); on the line only the first is used.
pub type Exponents = [u32; 3];

/// What the analysis needs from a representation of polynomials in the
/// logs (`Self::C`) with coefficients of type `Value`.
pub trait LogPolynomials: SeriesCoefficients {
    type Value: Clone;
    /// The terms of degree <= 2 and those above.
    fn split_at_quadratic(&self, p: &Self::C) -> (Self::C, Self::C);
    /// p - (1/6) sum over the six permutations of the logs.
    fn asymmetric_part(&self, p: &Self::C) -> Self::C;
    /// The terms that are nonzero: all of them when exact, those beyond
    /// their errors when numerical.
    fn significant(&self, p: &Self::C) -> Self::C;
    /// The coefficient of one monomial in the logs.
    fn coefficient(&self, p: &Self::C, e: Exponents) -> Self::Value;
    fn combination(&self, terms: &[(Rational, &Self::Value)]) -> Self::Value;
}

/// What one order of ln E says, once it has passed the exponentiation check.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct OrderReading<V> {
    /// The loop order L (the power of g^2).
    pub order: usize,
    /// alpha_L, the coefficient of (l1+l2+l3)^2 = ln^2(u1 u2 u3).
    pub octagon: V,
    /// beta_L, the coefficient of sum_i (l_i - l_(i+1))^2; None on the line
    /// u1 = u2 = u3, where that combination vanishes identically.
    pub hexagon: Option<V>,
    /// The coefficient of l1+l2+l3; the physics predicts zero.
    pub linear: V,
    /// C0 at this order.
    pub constant: V,
}

/// The first order at which ln E is not a symmetric polynomial of degree <= 2.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Breakdown<P> {
    pub order: usize,
    /// The nonzero terms of degree > 2 in the logs at this order.
    pub high_degree: P,
    /// The nonzero part of degree <= 2 that is not symmetric under
    /// permutations of the logs. Always empty on the line.
    pub asymmetric: P,
}

/// The readings of a series of ln E.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Analysis<P, V> {
    /// ln E through the last order examined (a breaking order included).
    pub ln_e: Vec<P>,
    /// Orders 1, 2, ... that exponentiate, up to the first that does not.
    pub orders: Vec<OrderReading<V>>,
    pub broken: Option<Breakdown<P>>,
}

/// Reads a series of E (its constant term checked by the caller).
pub fn analyse_e<A: LogPolynomials>(
    alg: &mut A,
    e: &[A::C],
    logs: &OriginLogs,
) -> Result<Analysis<A::C, A::Value>> {
    let mut orders = Vec::new();
    let mut broken = None;
    let ln_e = ln_coefficients(alg, e, &mut |alg, k, c| {
        match examine(alg, k, c, logs) {
            Ok(reading) => orders.push(reading),
            Err(b) => broken = Some(b),
        }
        broken.is_none()
    })?;
    Ok(Analysis {
        ln_e,
        orders,
        broken,
    })
}

/// Reads ln E given order by order (from R6 and the cusp).
pub fn analyse_ln<A: LogPolynomials>(
    alg: &mut A,
    ln: Vec<A::C>,
    logs: &OriginLogs,
) -> Analysis<A::C, A::Value> {
    let mut orders = Vec::new();
    let mut ln_e = Vec::new();
    for (k, c) in ln.into_iter().enumerate() {
        if k > 0 {
            match examine(alg, k, &c, logs) {
                Ok(reading) => orders.push(reading),
                Err(b) => {
                    ln_e.push(c);
                    return Analysis {
                        ln_e,
                        orders,
                        broken: Some(b),
                    };
                }
            }
        }
        ln_e.push(c);
    }
    Analysis {
        ln_e,
        orders,
        broken: None,
    }
}

/// The exponentiation check and the readings of order `k` of ln E.
fn examine<A: LogPolynomials>(
    alg: &mut A,
    k: usize,
    c: &A::C,
    logs: &OriginLogs,
) -> std::result::Result<OrderReading<A::Value>, Breakdown<A::C>> {
    let (low, high) = alg.split_at_quadratic(c);
    let high = alg.significant(&high);
    let asymmetric = match logs {
        OriginLogs::Three(_) => alg.significant(&alg.asymmetric_part(&low)),
        OriginLogs::Line(_) => alg.zero(),
    };
    if !alg.is_zero(&high) || !alg.is_zero(&asymmetric) {
        return Err(Breakdown {
            order: k,
            high_degree: high,
            asymmetric,
        });
    }
    let q = |n: i64, d: i64| Rational::from((n, d));
    let constant = alg.coefficient(&low, [0, 0, 0]);
    Ok(match logs {
        OriginLogs::Three(_) => {
            // With A the coefficient of l1^2 and B that of l1 l2, expanding
            // alpha (sum l)^2 + beta sum (l_i - l_(i+1))^2 gives
            // A = alpha + 2 beta and B = 2 alpha - 2 beta, so that
            // alpha = (A + B)/3 and beta = (2A - B)/6.
            let a = orbit_mean(alg, &low, [2, 0, 0]);
            let b = orbit_mean(alg, &low, [1, 1, 0]);
            OrderReading {
                order: k,
                octagon: alg.combination(&[(q(1, 3), &a), (q(1, 3), &b)]),
                hexagon: Some(alg.combination(&[(q(1, 3), &a), (q(-1, 6), &b)])),
                linear: orbit_mean(alg, &low, [1, 0, 0]),
                constant,
            }
        }
        // On the line (sum l)^2 = 9 l^2 and l1 + l2 + l3 = 3 l.
        OriginLogs::Line(_) => OrderReading {
            order: k,
            octagon: alg.combination(&[(q(1, 9), &alg.coefficient(&low, [2, 0, 0]))]),
            hexagon: None,
            linear: alg.combination(&[(q(1, 3), &alg.coefficient(&low, [1, 0, 0]))]),
            constant,
        },
    })
}

const PERMUTATIONS: [[usize; 3]; 6] = [
    [0, 1, 2],
    [0, 2, 1],
    [1, 0, 2],
    [1, 2, 0],
    [2, 0, 1],
    [2, 1, 0],
];

/// The exponents of `e` with the logs permuted.
pub fn permuted(e: Exponents, perm: [usize; 3]) -> Exponents {
    [e[perm[0]], e[perm[1]], e[perm[2]]]
}

/// The six permutations of the three logs.
pub fn permutations() -> impl Iterator<Item = [usize; 3]> {
    PERMUTATIONS.into_iter()
}

/// The mean coefficient over the orbit of `e` under permutations of the
/// logs: for an exact symmetric polynomial the coefficient of `e` itself,
/// and for numbers with errors the best reading of a symmetric one.
fn orbit_mean<A: LogPolynomials>(alg: &A, p: &A::C, e: Exponents) -> A::Value {
    let orbit: std::collections::BTreeSet<Exponents> =
        permutations().map(|perm| permuted(e, perm)).collect();
    let share = Rational::from((1, orbit.len() as i64));
    let values: Vec<A::Value> = orbit.iter().map(|&m| alg.coefficient(p, m)).collect();
    let terms: Vec<(Rational, &A::Value)> = values.iter().map(|v| (share.clone(), v)).collect();
    alg.combination(&terms)
}
