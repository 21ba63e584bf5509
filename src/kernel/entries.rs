//! The weak-coupling coefficients of the kernel (physics.md section 2):
//!
//!   K_ij = 2 j (-1)^(j(i+1)) sum_k (-1)^k p! (p-1)! / (k! (i+k)! (j+k)! (i+j+k)!) zeta(p) g^p,
//!   p = i + j + 2k,
//!
//! from the power series of J_i J_j (A&S 9.1.10 and the Cauchy product) and
//! Integral_0^inf t^(p-1)/(e^t - 1) dt = (p-1)! zeta(p) (A&S 23.2.7).
//! The coefficient of g^p is a rational times the single monomial
//! M_p = pi^p (p even, zeta(p) = rational * pi^p) or zeta(p) (p odd), so it
//! is stored as an integer numerator a_ijp over one denominator D_p per order.

use rug::{Integer, Rational};

use crate::ring::bernoulli::even_zeta_over_pi_power;

/// a_ijp and D_p for all i, j >= 1 and 2 <= p <= top.
pub struct KernelTable {
    /// numerators[p][i][j] (i, j from 1, stored from index 0 = index 1).
    numerators: Vec<Vec<Vec<Integer>>>,
    denominators: Vec<Integer>,
}

impl KernelTable {
    pub fn new(top: usize) -> Self {
        let mut numerators = vec![Vec::new(); top + 1];
        let mut denominators = vec![Integer::from(1); top + 1];
        for p in 2..=top {
            let mut rows: Vec<Vec<Rational>> = Vec::new();
            let mut d = Integer::from(1);
            for i in 1..p {
                let mut row = Vec::new();
                for j in 1..=(p - i) {
                    let r = entry(i as u32, j as u32, p as u32);
                    d.lcm_mut(r.denom());
                    row.push(r);
                }
                rows.push(row);
            }
            numerators[p] = rows
                .into_iter()
                .map(|row| {
                    row.into_iter()
                        .map(|r| {
                            let (n, den) = r.into_numer_denom();
                            n * Integer::from(&d / &den)
                        })
                        .collect()
                })
                .collect();
            denominators[p] = d;
        }
        KernelTable { numerators, denominators }
    }

    /// a_ijp, zero when p < i + j or p - i - j is odd.
    pub fn numerator(&self, i: usize, j: usize, p: usize) -> &Integer {
        &self.numerators[p][i - 1][j - 1]
    }

    pub fn denominator(&self, p: usize) -> &Integer {
        &self.denominators[p]
    }
}

/// The rational coefficient of M_p g^p in K_ij.
pub fn entry(i: u32, j: u32, p: u32) -> Rational {
    if p < i + j || (p - i - j) % 2 == 1 {
        return Rational::new();
    }
    let k = (p - i - j) / 2;
    let f = |n: u32| Integer::from(Integer::factorial(n));
    let num = f(p) * f(p - 1) * 2u32 * j;
    let den = f(k) * f(i + k) * f(j + k) * f(i + j + k);
    let mut r = Rational::from((num, den));
    if (j * (i + 1)) % 2 == 1 {
        r = -r;
    }
    if k % 2 == 1 {
        r = -r;
    }
    if p % 2 == 0 {
        r *= even_zeta_over_pi_power(p / 2);
    }
    r
}

#[cfg(test)]
mod tests {
    use super::*;

    /// K_11 = 2 * sum_k (-1)^k (2+2k)! (1+2k)! / (k! (1+k)!^2 (2+k)!) zeta(2+2k) g^(2+2k):
    /// the first terms 2 zeta(2) g^2 = pi^2/3 g^2 and -2*4!3!/(1*4*6) zeta(4) g^4 = -12 zeta(4) g^4
    /// (derived here from the Bessel series, A&S 9.1.10).
    #[test]
    fn first_entries_by_hand() {
        assert_eq!(entry(1, 1, 2), Rational::from((1, 3)));
        assert_eq!(entry(1, 1, 4), Rational::from((-12, 90)));
        // K_12 at g^3: j = 2, (-1)^(2*2) = 1, k = 0: 2*2 * 3! 2! / (1! 2! 3!) zeta(3) = 4 zeta(3).
        assert_eq!(entry(1, 2, 3), Rational::from(4));
        // K_21 at g^3: j = 1, (-1)^(1*3) = -1: -2 * 3! 2! / (2! 1! 3!) = -2.
        assert_eq!(entry(2, 1, 3), Rational::from(-2));
        assert_eq!(entry(1, 2, 4), Rational::new());
    }

    #[test]
    fn table_reassembles_entries() {
        let t = KernelTable::new(12);
        for p in 2..=12usize {
            for i in 1..p {
                for j in 1..=(p - i) {
                    let r = Rational::from((t.numerator(i, j, p).clone(), t.denominator(p).clone()));
                    assert_eq!(r, entry(i as u32, j as u32, p as u32));
                }
            }
        }
    }
}
