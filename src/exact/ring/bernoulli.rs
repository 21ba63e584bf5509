//! Bernoulli numbers, exactly, and the rational prefactor of the even zeta
//! values: zeta(2n) = (-1)^(n+1) B_(2n) (2 pi)^(2n) / (2 (2n)!)
//! (Abramowitz & Stegun 23.2.16). Computed from the defining recurrence,
//! never read from a table, and cached because every kernel entry asks.

use std::sync::{Mutex, OnceLock};

use rug::{Integer, Rational};

fn cache() -> &'static Mutex<Vec<Rational>> {
    static CACHE: OnceLock<Mutex<Vec<Rational>>> = OnceLock::new();
    CACHE.get_or_init(|| Mutex::new(vec![Rational::from(1)]))
}

/// B_n with the convention B_1 = -1/2, from sum_{k=0}^{m} C(m+1, k) B_k = 0
/// (A&S 23.1.1 with x = 0; common practice).
pub fn bernoulli(n: u32) -> Rational {
    let mut table = cache().lock().unwrap_or_else(|e| e.into_inner());
    while table.len() <= n as usize {
        let m = table.len() as u32;
        let mut sum = Rational::new();
        let mut binom = Integer::from(1);
        for (k, b) in table.iter().enumerate() {
            sum += Rational::from(&binom * b.numer()) / b.denom();
            binom = binom * (m + 1 - k as u32) / (k as u32 + 1);
        }
        table.push(-sum / Integer::from(m + 1));
    }
    table[n as usize].clone()
}

/// zeta(2n) / pi^(2n), a positive rational for n >= 1.
pub fn even_zeta_over_pi_power(n: u32) -> Rational {
    let b = bernoulli(2 * n);
    let two_n_fact = Integer::from(Integer::factorial(2 * n));
    let value = b * (Integer::from(1) << (2 * n)) / (two_n_fact * 2u32);
    if n % 2 == 0 {
        -value
    } else {
        value
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn q(n: i64, d: i64) -> Rational {
        Rational::from((n, d))
    }

    /// Abramowitz & Stegun table 23.2 (Bernoulli numbers B_n).
    #[test]
    fn bernoulli_against_handbook_table() {
        let table = [
            (0, q(1, 1)),
            (1, q(-1, 2)),
            (2, q(1, 6)),
            (3, q(0, 1)),
            (4, q(-1, 30)),
            (6, q(1, 42)),
            (8, q(-1, 30)),
            (10, q(5, 66)),
            (12, q(-691, 2730)),
            (14, q(7, 6)),
            (16, q(-3617, 510)),
            (18, q(43867, 798)),
            (20, q(-174611, 330)),
        ];
        for (n, expected) in table {
            assert_eq!(bernoulli(n), expected, "B_{n}");
        }
        for n in (3..60).step_by(2) {
            assert_eq!(bernoulli(n), 0, "odd B_{n} vanishes");
        }
    }

    /// zeta(2)=pi^2/6, zeta(4)=pi^4/90, zeta(6)=pi^6/945, zeta(8)=pi^8/9450,
    /// zeta(10)=pi^10/93555 (A&S table 23.3).
    #[test]
    fn even_zeta_values_against_handbook() {
        for (n, d) in [(1u32, 6i64), (2, 90), (3, 945), (4, 9450), (5, 93555)] {
            assert_eq!(even_zeta_over_pi_power(n), q(1, d), "zeta({})", 2 * n);
        }
        assert_eq!(
            even_zeta_over_pi_power(6),
            q(691, 638512875),
            "zeta(12), A&S 23.3"
        );
    }
}
