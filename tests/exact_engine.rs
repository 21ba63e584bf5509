//! The exact engine against the literature and against closed forms, each
//! check naming its source. Reference series are built here independently of
//! the engine (Bernoulli numbers by a different algorithm than the crate's).

use loopwise::exact::powerseries::Series;
use loopwise::exact::ring::{Exact, Monomial};
use loopwise::kernel::{self, Tilt};
use rug::{Integer, Rational};

fn q(n: i64, d: i64) -> Rational {
    Rational::from((n, d))
}

fn zeta(n: u32) -> Exact {
    Exact::zeta(n).unwrap()
}

fn gamma(tilt: &Tilt, loops: u32) -> Series {
    kernel::gamma(tilt, loops, &mut |_, _| {}).unwrap()
}

fn delta(tilt: &Tilt, loops: u32) -> Series {
    kernel::delta(tilt, loops, &mut |_, _| {}).unwrap()
}

fn c2(n: i64, d: i64) -> Tilt {
    Tilt::cos2(q(n, d)).unwrap()
}

/// Bernoulli numbers by the Akiyama-Tanigawa algorithm (a different route from
/// the crate's recurrence), with B_1 = +1/2 in this algorithm's convention;
/// only even indices are used here, where conventions agree.
fn bernoulli_even(max: usize) -> Vec<Rational> {
    let mut out = Vec::with_capacity(max + 1);
    let mut a: Vec<Rational> = Vec::new();
    for m in 0..=max {
        a.push(q(1, m as i64 + 1));
        for j in (1..=m).rev() {
            let d = Rational::from(&a[j - 1] - &a[j]) * j as u32;
            a[j - 1] = d;
        }
        out.push(a[0].clone());
    }
    out
}

fn factorial(n: u32) -> Integer {
    Integer::from(Integer::factorial(n))
}

/// Gamma_cusp through five loops: hep-th/0610251 (weak-coupling expansion of
/// f = 2 Gamma_cusp); the four-loop term also hep-th/0610248.
#[test]
fn cusp_through_five_loops_matches_the_literature() {
    let s = gamma(&Tilt::pi_multiple(&q(1, 4)).unwrap(), 5);
    assert_eq!(*s.coeff(0), Exact::zero());
    assert_eq!(*s.coeff(1), Exact::from(4));
    assert_eq!(*s.coeff(2), zeta(2).scale(&q(-8, 1)));
    assert_eq!(*s.coeff(3), zeta(4).scale(&q(88, 1)));
    assert_eq!(
        *s.coeff(4),
        &zeta(6).scale(&q(-876, 1)) - &zeta(3).pow(2).scale(&q(32, 1))
    );
    let pi = Exact::pi();
    let five = &(&pi.pow(8).scale(&q(14192, 14175))
        + &(&pi.pow(2) * &zeta(3).pow(2)).scale(&q(64, 3)))
        + &(&zeta(3) * &zeta(5)).scale(&q(640, 1));
    assert_eq!(*s.coeff(5), five);
}

/// Gamma_hex through four loops: docs/conventions.md section 4 (derived from the
/// definitions there; published to seven loops in arXiv:2001.05460).
#[test]
fn hexagon_through_four_loops() {
    let s = gamma(&Tilt::pi_multiple(&q(1, 3)).unwrap(), 4);
    assert_eq!(*s.coeff(2), zeta(2).scale(&q(-4, 1)));
    assert_eq!(*s.coeff(3), zeta(4).scale(&q(34, 1)));
    assert_eq!(
        *s.coeff(4),
        &zeta(6).scale(&q(-603, 2)) - &zeta(3).pow(2).scale(&q(24, 1))
    );
}

/// Gamma_oct = (2/pi^2) ln cosh(2 pi g) to all orders (arXiv:1907.13131,
/// arXiv:2003.01121; closed form recalled from memory, docs/conventions.md
/// section 4). ln cosh x = sum_{n>=1} 2^(2n) (2^(2n) - 1)
/// B_(2n) x^(2n) / (2n (2n)!), the integral of the tanh series A&S 4.5.64.
#[test]
fn octagon_matches_log_cosh_through_thirty_loops() {
    let loops = 30u32;
    let s = gamma(&Tilt::pi_multiple(&q(0, 1)).unwrap(), loops);
    let b = bernoulli_even(2 * loops as usize);
    for n in 1..=loops {
        let two_n = 2 * n;
        let pow2 = Integer::from(1) << two_n;
        let c = (&b[two_n as usize] * Rational::from(pow2.clone() * (pow2 - 1u32)))
            / Rational::from(factorial(two_n) * two_n);
        // x^(2n) = (2 pi g)^(2n); times 2/pi^2.
        let coefficient = c * Rational::from(Integer::from(1) << two_n) * 2u32;
        let expected = Exact::term(coefficient, Monomial::pi_power(two_n as i32 - 2));
        assert_eq!(*s.coeff(n as usize), expected, "octagon at {n} loops");
    }
}

/// Delta(0) = ln det(1 + K(0)) = (1/4) ln(sinh(4 pi g) / (4 pi g)) (the null
/// octagon's constant, docs/conventions.md section 4; the citation to
/// arXiv:2003.01121 is from memory). ln(sinh y / y) = sum_{n>=1} 2^(2n) B_(2n)
/// y^(2n) / (2n (2n)!), the integral of coth y - 1/y (A&S 4.5.67).
#[test]
fn octagon_constant_matches_log_sinh_through_twenty_loops() {
    let loops = 20u32;
    let s = delta(&c2(1, 1), loops);
    let b = bernoulli_even(2 * loops as usize);
    for n in 1..=loops {
        let two_n = 2 * n;
        let c = (&b[two_n as usize] * Rational::from(Integer::from(1) << two_n))
            / Rational::from(factorial(two_n) * two_n);
        // y^(2n) = (4 pi g)^(2n); times 1/4.
        let coefficient = c * Rational::from(Integer::from(1) << (2 * two_n)) / 4u32;
        let expected = Exact::term(coefficient, Monomial::pi_power(two_n as i32));
        assert_eq!(*s.coeff(n as usize), expected, "Delta(0) at {n} loops");
    }
}

fn tilts() -> Vec<(Tilt, Exact)> {
    let mut out: Vec<(Tilt, Exact)> = [
        (1, 1),
        (3, 4),
        (1, 2),
        (1, 3),
        (1, 4),
        (2, 7),
        (5, 9),
        (1, 10),
        (0, 1),
    ]
    .iter()
    .map(|&(n, d)| (c2(n, d), Exact::from(q(n, d))))
    .collect();
    out.push((Tilt::Symbolic, Exact::symbol(kernel::C2)));
    out
}

/// Two-loop coefficient -16 c2 zeta(2) and first odd-zeta term
/// -128 c2 (1 - c2) zeta(3)^2 at four loops, for any tilt (docs/conventions.md
/// section 4, derived from the definitions).
#[test]
fn two_loop_and_first_odd_zeta_terms_for_many_tilts() {
    let z33 = Monomial::from_parts(0, vec![3, 3], vec![]);
    for (tilt, c) in tilts() {
        let s = gamma(&tilt, 4);
        assert_eq!(*s.coeff(1), Exact::from(4), "{tilt:?}");
        assert_eq!(*s.coeff(2), &c * &zeta(2).scale(&q(-16, 1)), "{tilt:?}");
        let one_minus = &Exact::one() - &c;
        let expected = (&c * &one_minus).scale(&q(-128, 1));
        let found: Exact = s
            .coeff(4)
            .terms()
            .filter(|(m, _)| m.split_symbols().0 == z33)
            .map(|(m, x)| Exact::term(x.clone(), m.clone()))
            .fold(Exact::zero(), |a, b| &a + &b);
        assert_eq!(found, &expected * &zeta(3).pow(2), "{tilt:?}");
    }
}

/// Every coefficient of g^(2L) has uniform weight 2L - 2 for Gamma and 2L for
/// Delta (docs/conventions.md section 1; Delta carries no 1/(4 g^2)).
#[test]
fn uniform_transcendental_weight() {
    for (tilt, _) in tilts() {
        let g = gamma(&tilt, 9);
        let d = delta(&tilt, 6);
        for l in 1..=9 {
            let w = g.coeff(l).weights();
            assert!(
                w.is_empty() || w == vec![2 * l as i64 - 2],
                "{tilt:?} Gamma L={l}: {w:?}"
            );
        }
        for l in 1..=6 {
            let w = d.coeff(l).weights();
            assert!(
                w.is_empty() || w == vec![2 * l as i64],
                "{tilt:?} Delta L={l}: {w:?}"
            );
        }
    }
}

/// At alpha = pi/2 the kernel vanishes: Gamma = 4 g^2 and Delta = 0 exactly
/// (docs/conventions.md section 4).
#[test]
fn right_angle_is_trivial() {
    let t = Tilt::pi_multiple(&q(1, 2)).unwrap();
    let s = gamma(&t, 12);
    let d = delta(&t, 8);
    for l in 0..=12 {
        let expected = if l == 1 {
            Exact::from(4)
        } else {
            Exact::zero()
        };
        assert_eq!(*s.coeff(l), expected);
    }
    for l in 0..=8 {
        assert!(d.coeff(l).is_zero());
    }
}

/// The symbolic tilt evaluated at c2 = 1/4 equals the rational tilt pi/3, and
/// at c2 = 1/3 equals the rational c2 = 1/3 (consistency of the two paths).
#[test]
fn symbolic_tilt_specialises_to_rational_tilts() {
    let g_sym = gamma(&Tilt::Symbolic, 10);
    let d_sym = delta(&Tilt::Symbolic, 7);
    for (n, d) in [(1, 4), (1, 3), (9, 10)] {
        let value = Exact::from(q(n, d));
        let g = gamma(&c2(n, d), 10);
        let dl = delta(&c2(n, d), 7);
        for l in 0..=10 {
            assert_eq!(
                g_sym.coeff(l).substitute(kernel::C2, &value),
                *g.coeff(l),
                "Gamma c2={n}/{d} L={l}"
            );
        }
        for l in 0..=7 {
            assert_eq!(
                d_sym.coeff(l).substitute(kernel::C2, &value),
                *dl.coeff(l),
                "Delta c2={n}/{d} L={l}"
            );
        }
    }
}

#[test]
fn loop_orders_out_of_range_are_errors() {
    let t = c2(1, 2);
    assert!(kernel::gamma(&t, 0, &mut |_, _| {}).is_err());
    let e = kernel::delta(&t, loopwise::limits::MAX_LOOPS + 1, &mut |_, _| {}).unwrap_err();
    assert!(e.message().contains("out of range"), "{e}");
}
