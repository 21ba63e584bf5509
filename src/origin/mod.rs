//! The six-gluon amplitude at the origin u1, u2, u3 -> 0 (docs/conventions.md section 6):
//! loop coefficients that are polynomials in the logarithms l_i = ln u_i, the
//! conversion between the normalised amplitude E and the remainder function
//! R6, the logarithm of E, the exponentiation check, and the extraction of
//! the double-log coefficients and of the constant C0,
//!
//!   ln E = alpha (l1+l2+l3)^2 + beta sum_i (l_i - l_(i+1))^2 + C0 + (power-suppressed),
//!
//! predicted as alpha = -Gamma_oct/24 and beta = -Gamma_hex/24.
//!
//! The analysis itself is [`analysis`], shared by exact coefficients (in the
//! packed form of `packed`) and numbers with errors ([`numeric`]).

pub mod analysis;
pub mod check;
pub mod numeric;
mod packed;
pub mod read;

use rug::Rational;

use analysis::Analysis;
pub use analysis::{Breakdown, OrderReading};
use packed::{Algebra, PackedPoly};

use crate::error::{Error, Result};
use crate::exact::powerseries::{exp_coefficients, ln_coefficients, Series, SeriesCoefficients};
use crate::exact::ring::{Exact, Monomial};
use crate::kernel::{self, Tilt};

/// Which logarithms the coefficients are written in.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum OriginLogs {
    /// Three logs l_i = ln u_i, in the order (l1, l2, l3); u4 = u1.
    Three([String; 3]),
    /// The line u1 = u2 = u3, with l1 = l2 = l3 = the one log.
    Line(String),
}

impl OriginLogs {
    /// The logs named l1, l2, l3.
    pub fn three() -> Self {
        OriginLogs::Three(["l1".to_string(), "l2".to_string(), "l3".to_string()])
    }

    /// The single log l on the line.
    pub fn line() -> Self {
        OriginLogs::Line("l".to_string())
    }

    /// The logs from the `symbols` list of a series file: three names for
    /// (l1, l2, l3) in that order, or one name for the line.
    pub fn from_symbols(symbols: &[String]) -> Result<Self> {
        match symbols {
            [a, b, c] if a != b && b != c && a != c => {
                Ok(OriginLogs::Three([a.clone(), b.clone(), c.clone()]))
            }
            [l] => Ok(OriginLogs::Line(l.clone())),
            _ => Err(Error::input(format!(
                "an origin file lists either three logs (ln u1, ln u2, ln u3, e.g. [l1, l2, l3]) \
                 or one log for the line u1 = u2 = u3 (e.g. [l]); found [{}]",
                symbols.join(", ")
            ))),
        }
    }

    pub fn names(&self) -> Vec<&str> {
        match self {
            OriginLogs::Three(n) => n.iter().map(String::as_str).collect(),
            OriginLogs::Line(n) => vec![n.as_str()],
        }
    }

    /// A monomial of the ring split into its transcendental part and the
    /// exponents of the logs; any other symbol is an error.
    pub fn split(&self, m: &Monomial) -> Result<(Monomial, analysis::Exponents)> {
        let names = self.names();
        let (rest, syms) = m.split_symbols();
        let mut e = [0u32; 3];
        for (name, power) in syms.symbols() {
            let slot = names.iter().position(|n| **n == **name).ok_or_else(|| {
                Error::input(format!(
                    "'{name}' in an origin coefficient is not one of the logs ({})",
                    names.join(", ")
                ))
            })?;
            e[slot] = *power;
        }
        Ok((rest, e))
    }

    fn sum_of_squares(&self) -> Exact {
        match self {
            OriginLogs::Three(n) => n
                .iter()
                .map(|s| Exact::symbol(s).pow(2))
                .fold(Exact::zero(), |a, b| &a + &b),
            OriginLogs::Line(n) => Exact::symbol(n).pow(2).scale(&Rational::from(3)),
        }
    }
}

/// The limit of the one-loop amplitude E^(1) = sum_i Li2(1 - 1/u_i)
/// at the origin: -(1/2) sum_i l_i^2 - 3 zeta(2), from Li2(1 - 1/u) =
/// -ln^2(u)/2 - zeta(2) + O(u) (Abramowitz & Stegun 27.7, inversion formula).
/// On the line the sum is 3 l^2.
pub fn one_loop_limit(logs: &OriginLogs) -> Exact {
    let zeta2 = Exact::zeta(2).unwrap_or_default();
    &logs.sum_of_squares().scale(&Rational::from((-1, 2))) - &zeta2.scale(&Rational::from(3))
}

/// The one-loop value of C0: -3 zeta(2) (docs/conventions.md section 6, derived from
/// [`one_loop_limit`] with Gamma_cusp^(1) = 4).
pub fn one_loop_constant() -> Exact {
    Exact::zeta(2)
        .unwrap_or_default()
        .scale(&Rational::from(-3))
}

/// Gamma_cusp/4 * E^(1) at the origin, order by order.
fn ansatz_exponent(gamma_cusp: &Series, logs: &OriginLogs, order: usize) -> Result<Series> {
    if gamma_cusp.order() < order {
        return Err(Error::range(format!(
            "Gamma_cusp is known through g^{} only, the origin series needs g^{}",
            2 * gamma_cusp.order(),
            2 * order
        )));
    }
    let e1 = one_loop_limit(logs).scale(&Rational::from((1, 4)));
    Ok(gamma_cusp.truncate(order).map(|c| c * &e1))
}

/// E = exp[R6 + Gamma_cusp/4 * E^(1)] at the origin, exactly, through the
/// order of `r6`. R6 must have no g^0 term.
pub fn r6_to_e(r6: &Series, gamma_cusp: &Series, logs: &OriginLogs) -> Result<Series> {
    let exponent = r6 + &ansatz_exponent(gamma_cusp, logs, r6.order())?;
    if !exponent.coeff(0).is_zero() {
        return Err(Error::input(format!(
            "R6 must vanish at g^0, found {}",
            exponent.coeff(0)
        )));
    }
    let mut alg = Algebra::new(logs);
    let f = alg.import_series(&exponent)?;
    let e = exp_coefficients(&mut alg, &f)?;
    Ok(alg.export_series(&e))
}

/// R6 = ln E - Gamma_cusp/4 * E^(1) at the origin, exactly, through the order
/// of `e`. E must start with 1.
pub fn e_to_r6(e: &Series, gamma_cusp: &Series, logs: &OriginLogs) -> Result<Series> {
    let ansatz = ansatz_exponent(gamma_cusp, logs, e.order())?;
    Ok(&ln_e(e, logs)? - &ansatz)
}

/// ln E over the polynomials in the logs, through the order of `e`.
pub fn ln_e(e: &Series, logs: &OriginLogs) -> Result<Series> {
    let mut alg = Algebra::new(logs);
    let d = alg.import_series(e)?;
    check_unit(&mut alg, &d)?;
    let out = ln_coefficients(&mut alg, &d, &mut |_, _, _| true)?;
    Ok(alg.export_series(&out))
}

/// The readings of an exact origin series: ln E as a series, the readings
/// of the orders that exponentiate, and the first that does not.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct OriginAnalysis {
    pub logs: OriginLogs,
    /// ln E through the last order examined (a breaking order included).
    pub ln_e: Series,
    pub orders: Vec<OrderReading<Exact>>,
    pub broken: Option<Breakdown<Exact>>,
}

impl OriginAnalysis {
    fn exported(alg: &Algebra, a: Analysis<PackedPoly, Exact>, logs: &OriginLogs) -> Self {
        OriginAnalysis {
            logs: logs.clone(),
            ln_e: alg.export_series(&a.ln_e),
            orders: a.orders,
            broken: a.broken.map(|b| Breakdown {
                order: b.order,
                high_degree: alg.export(&b.high_degree),
                asymmetric: alg.export(&b.asymmetric),
            }),
        }
    }
}

/// Reads a series of E (constant term 1) at the origin.
pub fn analyse_e(e: &Series, logs: &OriginLogs) -> Result<OriginAnalysis> {
    let mut alg = Algebra::new(logs);
    let d = alg.import_series(e)?;
    check_unit(&mut alg, &d)?;
    let a = analysis::analyse_e(&mut alg, &d, logs)?;
    Ok(OriginAnalysis::exported(&alg, a, logs))
}

/// Reads a series of R6 at the origin: ln E = R6 + Gamma_cusp/4 * E^(1)
/// directly, without passing through E.
pub fn analyse_r6(r6: &Series, gamma_cusp: &Series, logs: &OriginLogs) -> Result<OriginAnalysis> {
    let ln = r6 + &ansatz_exponent(gamma_cusp, logs, r6.order())?;
    if !ln.coeff(0).is_zero() {
        return Err(Error::input(format!(
            "R6 must vanish at g^0, found {}",
            ln.coeff(0)
        )));
    }
    let mut alg = Algebra::new(logs);
    let d = alg.import_series(&ln)?;
    let a = analysis::analyse_ln(&mut alg, d, logs);
    Ok(OriginAnalysis::exported(&alg, a, logs))
}

/// E = 1 + O(g^2): the logarithm needs it.
fn check_unit(alg: &mut Algebra, e: &[PackedPoly]) -> Result<()> {
    let one = alg.one();
    if e[0] != one {
        return Err(Error::input(format!(
            "E must start with 1 at g^0 (E = 1 + O(g^2)), found {}",
            alg.export(&e[0])
        )));
    }
    Ok(())
}

/// The predicted double-log coefficients, -Gamma_oct/24 and -Gamma_hex/24,
/// from the exact kernel engine (Gamma_oct at tilt 0, Gamma_hex at pi/3).
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct OriginPrediction {
    pub octagon: Series,
    pub hexagon: Series,
}

pub fn predicted_log_coefficients(loops: u32) -> Result<OriginPrediction> {
    let scale = Exact::from(Rational::from((-1, 24)));
    let oct = kernel::gamma(&Tilt::cos2(Rational::from(1))?, loops, &mut |_, _| {})?;
    let hex = kernel::gamma(&Tilt::cos2(Rational::from((1, 4)))?, loops, &mut |_, _| {})?;
    Ok(OriginPrediction {
        octagon: oct.scale(&scale),
        hexagon: hex.scale(&scale),
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    fn q(n: i64, d: i64) -> Exact {
        Exact::from(Rational::from((n, d)))
    }

    fn zeta(n: u32) -> Exact {
        Exact::zeta(n).unwrap()
    }

    fn l(i: usize) -> Exact {
        Exact::symbol(&format!("l{i}"))
    }

    fn sum_logs_squared() -> Exact {
        (&(&l(1) + &l(2)) + &l(3)).pow(2)
    }

    fn sum_differences_squared() -> Exact {
        let d = |a: usize, b: usize| (&l(a) - &l(b)).pow(2);
        &(&d(1, 2) + &d(2, 3)) + &d(3, 1)
    }

    fn cusp(loops: u32) -> Series {
        kernel::gamma(
            &Tilt::cos2(Rational::from((1, 2))).unwrap(),
            loops,
            &mut |_, _| {},
        )
        .unwrap()
    }

    /// Li2(1 - 1/u) -> -ln^2(u)/2 - zeta(2) as u -> 0 (Abramowitz & Stegun 27.7).
    fn li2_inverse_limit(log: &Exact) -> Exact {
        &log.pow(2).scale(&Rational::from((-1, 2))) - &zeta(2)
    }

    fn value(slot: &Option<Exact>) -> &Exact {
        slot.as_ref().expect("a hexagon reading off the line")
    }

    #[test]
    fn alpha_beta_from_the_quadratic_form() {
        // Expand alpha (sum l)^2 + beta sum (l_i - l_(i+1))^2 with symbolic
        // alpha, beta and read back A (l1^2) and B (l1 l2).
        let (alpha, beta) = (Exact::symbol("alpha"), Exact::symbol("beta"));
        let form = &(&alpha * &sum_logs_squared()) + &(&beta * &sum_differences_squared());
        let coefficient = |m: Monomial| {
            let mut out = Exact::zero();
            for (k, c) in form.terms() {
                if ["l1", "l2", "l3"]
                    .iter()
                    .all(|n| k.symbol_exponent(n) == m.symbol_exponent(n))
                {
                    let (rest, _) = k.without_symbol("l1");
                    let (rest, _) = rest.without_symbol("l2");
                    let (rest, _) = rest.without_symbol("l3");
                    out.add_term(rest, c.clone());
                }
            }
            out
        };
        let a = coefficient(Monomial::symbol("l1", 2));
        let b = coefficient(Monomial::from_parts(
            0,
            vec![],
            vec![("l1".into(), 1), ("l2".into(), 1)],
        ));
        assert_eq!(a, &alpha + &beta.scale(&Rational::from(2)));
        assert_eq!(
            b,
            &alpha.scale(&Rational::from(2)) - &beta.scale(&Rational::from(2))
        );
        // The analysis inverts it: ln E = g^2 (3/7 (sum l)^2 - 2/5 sum (l_i - l_(i+1))^2).
        let form = &sum_logs_squared().scale(&Rational::from((3, 7)))
            + &sum_differences_squared().scale(&Rational::from((-2, 5)));
        let r = analyse_e(
            &Series::new(vec![Exact::zero(), form]).exp().unwrap(),
            &OriginLogs::three(),
        )
        .unwrap();
        assert_eq!(r.orders[0].octagon, q(3, 7));
        assert_eq!(value(&r.orders[0].hexagon), &q(-2, 5));
    }

    /// One loop: E^(1) = sum_i Li2(1 - 1/u_i) (docs/conventions.md section 6); in g^2
    /// normalisation E = 1 + g^2 Gamma_cusp^(1)/4 E^(1) = 1 + g^2 E^(1).
    #[test]
    fn one_loop_reads_minus_one_sixth_twice_and_minus_three_zeta2() {
        let e1 = (1..=3)
            .map(|i| li2_inverse_limit(&l(i)))
            .fold(Exact::zero(), |a, b| &a + &b);
        assert_eq!(e1, one_loop_limit(&OriginLogs::three()));
        let e = Series::new(vec![Exact::one(), e1]);
        let a = analyse_e(&e, &OriginLogs::three()).unwrap();
        assert!(a.broken.is_none());
        let r = &a.orders[0];
        assert_eq!(r.octagon, q(-1, 6));
        assert_eq!(value(&r.hexagon), &q(-1, 6));
        assert!(r.linear.is_zero());
        assert_eq!(r.constant, zeta(2).scale(&Rational::from(-3)));
        assert_eq!(r.constant, one_loop_constant());
        // Gamma^(1) = 4 for every tilt: -4/24 = -1/6 (docs/conventions.md section 4).
        let p = predicted_log_coefficients(1).unwrap();
        assert_eq!(p.octagon.coeff(1), &r.octagon);
        assert_eq!(p.hexagon.coeff(1), value(&r.hexagon));
    }

    /// Two loops: R6^(2) -> zeta2 (l1 l2 + l2 l3 + l3 l1) + 77/4 zeta4 - 6 zeta2^2
    /// (arXiv:1006.5703 as given in docs/conventions.md section 6).
    fn two_loop_r6() -> Series {
        let pairs = &(&(&l(1) * &l(2)) + &(&l(2) * &l(3))) + &(&l(3) * &l(1));
        let c2 = &(&zeta(2) * &pairs)
            + &(&zeta(4).scale(&Rational::from((77, 4)))
                - &zeta(2).pow(2).scale(&Rational::from(6)));
        Series::new(vec![Exact::zero(), Exact::zero(), c2])
    }

    #[test]
    fn two_loop_remainder_matches_octagon_and_hexagon() {
        let logs = OriginLogs::three();
        let r6 = two_loop_r6();
        let a = analyse_r6(&r6, &cusp(2), &logs).unwrap();
        assert!(a.broken.is_none());
        let r = &a.orders[1];
        // Gamma_oct^(2) = -16 zeta2, Gamma_hex^(2) = -4 zeta2 (docs/conventions.md section 4).
        assert_eq!(r.octagon, zeta(2).scale(&Rational::from((16, 24))));
        assert_eq!(value(&r.hexagon), &zeta(2).scale(&Rational::from((4, 24))));
        assert!(r.linear.is_zero());
        assert_eq!(r.constant, zeta(4).scale(&Rational::from((77, 4))));
        let p = predicted_log_coefficients(2).unwrap();
        assert_eq!(p.octagon.coeff(2), &r.octagon);
        assert_eq!(p.hexagon.coeff(2), value(&r.hexagon));
        // The same through E: exp, then the logarithm.
        let e = r6_to_e(&r6, &cusp(2), &logs).unwrap();
        assert_eq!(analyse_e(&e, &logs).unwrap().orders, a.orders);
    }

    /// ln E built from the predicted quadratic form with arbitrary constants.
    fn predicted_ln_e(loops: u32) -> Series {
        let p = predicted_log_coefficients(loops).unwrap();
        let mut coeffs = vec![Exact::zero()];
        for k in 1..=loops as usize {
            let constant =
                &zeta(2 * k as u32).scale(&Rational::from((k as i64, 3))) + &q(1, k as i64 + 1);
            let c = &(&(p.octagon.coeff(k) * &sum_logs_squared())
                + &(p.hexagon.coeff(k) * &sum_differences_squared()))
                + &constant;
            coeffs.push(c);
        }
        Series::new(coeffs)
    }

    #[test]
    fn exponentiated_prediction_passes_and_one_cubic_term_breaks_one_order() {
        let logs = OriginLogs::three();
        let ln = predicted_ln_e(5);
        // The ring's own exp, independent of the dense form used here.
        let e = ln.exp().unwrap();
        let a = analyse_e(&e, &logs).unwrap();
        assert!(a.broken.is_none(), "{:?}", a.broken);
        assert_eq!(a.orders.len(), 5);
        assert_eq!(a.ln_e, ln);
        let p = predicted_log_coefficients(5).unwrap();
        for r in &a.orders {
            assert_eq!(r.octagon, *p.octagon.coeff(r.order));
            assert_eq!(value(&r.hexagon), p.hexagon.coeff(r.order));
        }

        let cubic = (&l(1).pow(2) * &l(2)).scale(&Rational::from((5, 7)));
        let mut changed = e.coeffs().to_vec();
        changed[3] = &changed[3] + &cubic;
        let a = analyse_e(&Series::new(changed), &logs).unwrap();
        let b = a.broken.expect("order 3 must break");
        assert_eq!(b.order, 3);
        assert_eq!(b.high_degree, cubic);
        assert!(b.asymmetric.is_zero());
        assert_eq!(a.orders.len(), 2);
        assert_eq!(a.ln_e.order(), 3);
    }

    #[test]
    fn asymmetric_quadratic_term_is_named() {
        let logs = OriginLogs::three();
        let e = predicted_ln_e(3).exp().unwrap();
        let mut changed = e.coeffs().to_vec();
        changed[2] = &changed[2] + &l(1).pow(2);
        let b = analyse_e(&Series::new(changed), &logs)
            .unwrap()
            .broken
            .unwrap();
        assert_eq!(b.order, 2);
        assert!(b.high_degree.is_zero());
        let symmetric =
            (&(&l(1).pow(2) + &l(2).pow(2)) + &l(3).pow(2)).scale(&Rational::from((1, 3)));
        assert_eq!(b.asymmetric, &l(1).pow(2) - &symmetric);
    }

    #[test]
    fn linear_symmetric_part_is_read_not_hidden() {
        let logs = OriginLogs::three();
        let sum = &(&l(1) + &l(2)) + &l(3);
        let ln = Series::new(vec![
            Exact::zero(),
            &one_loop_limit(&logs) + &sum.scale(&Rational::from(2)),
        ]);
        let a = analyse_e(&ln.exp().unwrap(), &logs).unwrap();
        assert_eq!(a.orders[0].linear, Exact::from(2));
    }

    /// A small deterministic generator (a 64-bit LCG with the MMIX multiplier and increment).
    struct Lcg(u64);

    impl Lcg {
        fn next(&mut self, n: u64) -> u64 {
            self.0 = self
                .0
                .wrapping_mul(6364136223846793005)
                .wrapping_add(1442695040888963407);
            (self.0 >> 33) % n
        }
        fn rational(&mut self) -> Rational {
            Rational::from((self.next(41) as i64 - 20, self.next(9) as i64 + 1))
        }
    }

    fn random_r6(rng: &mut Lcg, order: usize) -> Series {
        let transcendentals = [Exact::one(), zeta(2), zeta(3), zeta(3).pow(2), zeta(5)];
        let mut coeffs = vec![Exact::zero()];
        for k in 1..=order {
            let mut c = Exact::zero();
            for _ in 0..6 {
                let mono = Monomial::from_parts(
                    0,
                    vec![],
                    (1..=3)
                        .map(|i| (format!("l{i}").into(), rng.next(2 * k as u64 + 1) as u32))
                        .collect(),
                );
                let t = &transcendentals[rng.next(5) as usize];
                c = &c + &t.mul_monomial(&mono, &rng.rational());
            }
            coeffs.push(c);
        }
        Series::new(coeffs)
    }

    #[test]
    fn r6_to_e_and_back_is_the_identity() {
        let logs = OriginLogs::three();
        let g = cusp(4);
        let mut rng = Lcg(20240531);
        for _ in 0..8 {
            let r6 = random_r6(&mut rng, 4);
            let e = r6_to_e(&r6, &g, &logs).unwrap();
            assert_eq!(e.coeff(0), &Exact::one());
            assert_eq!(e_to_r6(&e, &g, &logs).unwrap(), r6);
            // The dense logarithm agrees with the ring's own.
            assert_eq!(ln_e(&e, &logs).unwrap(), e.ln().unwrap());
        }
    }

    #[test]
    fn on_the_line_only_the_octagon_is_read() {
        let line = OriginLogs::line();
        let on_line = |s: &Series| {
            s.map(|c| {
                c.substitute("l1", &Exact::symbol("l"))
                    .substitute("l2", &Exact::symbol("l"))
                    .substitute("l3", &Exact::symbol("l"))
            })
        };
        let a = analyse_r6(&on_line(&two_loop_r6()), &cusp(2), &line).unwrap();
        let p = predicted_log_coefficients(2).unwrap();
        for r in &a.orders {
            assert_eq!(r.hexagon, None);
            assert_eq!(r.octagon, *p.octagon.coeff(r.order));
        }
        assert_eq!(
            a.orders[1].constant,
            zeta(4).scale(&Rational::from((77, 4)))
        );
        let e = on_line(&predicted_ln_e(4)).exp().unwrap();
        let a = analyse_e(&e, &line).unwrap();
        assert!(a.broken.is_none());
        assert_eq!(a.orders.len(), 4);
        let p = predicted_log_coefficients(4).unwrap();
        assert!(a
            .orders
            .iter()
            .all(|r| r.octagon == *p.octagon.coeff(r.order)));
    }

    /// Three loops: Gamma_oct = (2/pi^2) ln cosh(2 pi g) with ln cosh y =
    /// y^2/2 - y^4/12 + y^6/45 - ... (integrated tanh series, Abramowitz &
    /// Stegun section 4.5) gives 128 pi^4/45 = 256 zeta4 at g^6; Gamma_hex^(3) =
    /// 34 zeta4 (docs/conventions.md section 4).
    #[test]
    fn three_loop_predictions_against_closed_forms() {
        let p = predicted_log_coefficients(3).unwrap();
        assert_eq!(
            p.octagon.coeff(3),
            &Exact::pi().pow(4).scale(&Rational::from((-128, 45 * 24)))
        );
        assert_eq!(
            p.octagon.coeff(3),
            &zeta(4).scale(&Rational::from((-256, 24)))
        );
        assert_eq!(
            p.hexagon.coeff(3),
            &zeta(4).scale(&Rational::from((-34, 24)))
        );
    }

    #[test]
    fn bad_input_is_refused() {
        assert!(OriginLogs::from_symbols(&["a".into(), "b".into()]).is_err());
        assert!(OriginLogs::from_symbols(&["a".into(), "a".into(), "b".into()]).is_err());
        assert_eq!(
            OriginLogs::from_symbols(&["l".into()]).unwrap(),
            OriginLogs::line()
        );
        let e = Series::new(vec![Exact::from(2), l(1)]);
        assert!(analyse_e(&e, &OriginLogs::three()).is_err());
        let e = Series::new(vec![Exact::one(), Exact::symbol("x")]);
        assert!(analyse_e(&e, &OriginLogs::three())
            .unwrap_err()
            .message()
            .contains("'x'"));
        assert!(r6_to_e(&two_loop_r6(), &cusp(1), &OriginLogs::three()).is_err());
        // Powers whose products would not fit the dense keys are refused, not wrapped.
        let big = Series::new(vec![Exact::one(), Exact::symbol("l1").pow(40_000)]);
        assert_eq!(ln_e(&big, &OriginLogs::three()).unwrap(), big.ln().unwrap());
        let twice = Series::new(vec![
            Exact::one(),
            Exact::symbol("l1").pow(40_000),
            Exact::zero(),
        ]);
        assert!(ln_e(&twice, &OriginLogs::three()).is_err());
    }
}
