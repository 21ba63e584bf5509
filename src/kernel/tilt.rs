//! The tilt of the kernel as the exact engine sees it: c2 = cos^2(alpha),
//! rational or symbolic. An angle that is a rational multiple of pi has a
//! rational cos^2 only when cos(2 alpha) is 0, +-1/2 or +-1 (Niven's theorem,
//! a standard result), i.e. for multiples of pi/4 and pi/6; other angles are
//! refused with a way out.

use rug::Rational;

use super::recursion::TiltFactors;
use crate::error::{Error, Result};

/// c2 = cos^2(alpha), exactly.
#[derive(Clone, Debug, PartialEq, Eq, Hash)]
pub enum Tilt {
    /// A rational c2 in [0, 1].
    Cos2(Rational),
    /// c2 kept as a symbol; coefficients are polynomials in c2.
    Symbolic,
}

impl Tilt {
    /// The tilt with cos^2(alpha) = c2, which must lie in [0, 1].
    pub fn cos2(c2: Rational) -> Result<Tilt> {
        if !(0..=1).contains(&c2) {
            return Err(Error::range(format!(
                "c2 = cos^2(alpha) = {c2} is outside [0, 1]"
            )));
        }
        Ok(Tilt::Cos2(c2))
    }

    /// The tilt alpha = q * pi, when cos^2(alpha) is rational.
    pub fn pi_multiple(q: &Rational) -> Result<Tilt> {
        // cos^2(q pi) = (1 + cos(2 q pi)) / 2; reduce 2q modulo 2.
        let two_q = Rational::from(q * 2u32);
        let half = Rational::from(&two_q / 2u32);
        let r = two_q - Rational::from(half.floor_ref()) * 2u32;
        let cos = [
            (0, 1, 1, 1),
            (1, 3, 1, 2),
            (1, 2, 0, 1),
            (2, 3, -1, 2),
            (1, 1, -1, 1),
            (4, 3, -1, 2),
            (3, 2, 0, 1),
            (5, 3, 1, 2),
        ]
        .iter()
        .find(|(n, d, _, _)| r == Rational::from((*n, *d)))
        .map(|(_, _, cn, cd)| Rational::from((*cn, *cd)));
        match cos {
            Some(c) => Tilt::cos2((c + 1u32) / 2u32),
            None => Err(Error::input(format!(
                "cos^2({}) is irrational, so the exact engine cannot take this angle; \
                 use the symbolic tilt (e.g. Gamma(c2)) or give a rational cos^2 as c2=P/Q; \
                 the finite-coupling commands take any angle",
                pi_text(q)
            ))),
        }
    }

    pub fn factors(&self) -> TiltFactors {
        match self {
            Tilt::Cos2(c) => TiltFactors::Rational {
                u: c.numer().clone(),
                w: c.denom().clone(),
            },
            Tilt::Symbolic => TiltFactors::Symbolic,
        }
    }

    /// "c2=1/2" or "c2".
    pub fn label(&self) -> String {
        match self {
            Tilt::Cos2(c) => format!("c2={c}"),
            Tilt::Symbolic => "c2".to_string(),
        }
    }
}

/// q * pi written as people write angles: 0, pi, pi/4, 2*pi/3.
pub fn pi_text(q: &Rational) -> String {
    let (n, d) = (q.numer(), q.denom());
    let num = match n.to_i64() {
        Some(0) => return "0".to_string(),
        Some(1) => "pi".to_string(),
        Some(-1) => "-pi".to_string(),
        _ => format!("{n}*pi"),
    };
    if *d == 1 {
        num
    } else {
        format!("{num}/{d}")
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn q(n: i64, d: i64) -> Rational {
        Rational::from((n, d))
    }

    /// cos^2 at the named tilts: pi/4 -> 1/2, 0 -> 1, pi/3 -> 1/4, pi/2 -> 0,
    /// pi/6 -> 3/4, 2pi/3 -> 1/4, -pi/4 -> 1/2 (elementary values).
    #[test]
    fn rational_cos2_values() {
        for (angle, c2) in [
            (q(1, 4), q(1, 2)),
            (q(0, 1), q(1, 1)),
            (q(1, 3), q(1, 4)),
            (q(1, 2), q(0, 1)),
            (q(1, 6), q(3, 4)),
            (q(2, 3), q(1, 4)),
            (q(-1, 4), q(1, 2)),
            (q(5, 6), q(3, 4)),
            (q(7, 4), q(1, 2)),
        ] {
            assert_eq!(
                Tilt::pi_multiple(&angle).unwrap(),
                Tilt::Cos2(c2),
                "angle {angle} pi"
            );
        }
    }

    #[test]
    fn irrational_cos2_is_refused_with_a_way_out() {
        let e = Tilt::pi_multiple(&q(1, 5)).unwrap_err();
        assert!(e.message().contains("pi/5"), "{e}");
        assert!(e.message().contains("Gamma(c2)"), "{e}");
        assert!(Tilt::pi_multiple(&q(1, 8)).is_err());
        assert!(Tilt::cos2(q(3, 2)).is_err());
    }
}
