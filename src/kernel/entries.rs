//! The weak-coupling coefficients of the kernel (docs/conventions.md section 2):
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

use crate::exact::ring::bernoulli::even_zeta_over_pi_power;

/// a_ijp and D_p for all i, j >= 1 and 2 <= p <= highest.
pub struct KernelTable {
    /// numerators[p][i][j] (i, j from 1, stored from index 0 = index 1).
    numerators: Vec<Vec<Vec<Integer>>>,
    denominators: Vec<Integer>,
}

impl KernelTable {
    /// With p = i + j + 2k the factorials collapse to binomials,
    /// p! (p-1)! / (k! (i+k)! (j+k)! (i+j+k)!) = C(p, i+k) C(p, k) / p,
    /// so a_ijp = +-2 j C(p, i+k) C(p, k) z_num and D_p = p z_den, where
    /// z = zeta(p)/pi^p (or 1 for odd p). D_p need not be the least common
    /// denominator: the recursion reduces every level anyway.
    pub fn new(highest: usize) -> Self {
        let mut numerators = vec![Vec::new(); highest + 1];
        let mut denominators = vec![Integer::from(1); highest + 1];
        for p in 2..=highest {
            let z = if p % 2 == 0 {
                even_zeta_over_pi_power(p as u32 / 2)
            } else {
                Rational::from(1)
            };
            let (z_num, z_den) = z.into_numer_denom();
            let binomials = binomial_row(p as u32);
            numerators[p] = (1..p)
                .map(|i| {
                    (1..=(p - i))
                        .map(|j| numerator(&binomials, &z_num, i as u32, j as u32, p as u32))
                        .collect()
                })
                .collect();
            denominators[p] = z_den * p as u32;
        }
        KernelTable {
            numerators,
            denominators,
        }
    }

    /// a_ijp, zero when p < i + j or p - i - j is odd.
    pub fn numerator(&self, i: usize, j: usize, p: usize) -> &Integer {
        &self.numerators[p][i - 1][j - 1]
    }

    pub fn denominator(&self, p: usize) -> &Integer {
        &self.denominators[p]
    }
}

/// C(p, 0), ..., C(p, p).
fn binomial_row(p: u32) -> Vec<Integer> {
    let mut row = vec![Integer::from(1)];
    for k in 0..p {
        let next = Integer::from(&row[k as usize] * (p - k)) / (k + 1);
        row.push(next);
    }
    row
}

fn numerator(binomials: &[Integer], z_num: &Integer, i: u32, j: u32, p: u32) -> Integer {
    if p < i + j || (p - i - j) % 2 == 1 {
        return Integer::new();
    }
    let k = (p - i - j) / 2;
    let a = Integer::from(&binomials[(i + k) as usize] * &binomials[k as usize]) * z_num * (2 * j);
    if ((j * (i + 1)) % 2 == 1) != (k % 2 == 1) {
        -a
    } else {
        a
    }
}

/// The rational coefficient of M_p g^p in K_ij.
pub fn entry(i: u32, j: u32, p: u32) -> Rational {
    let z = if p % 2 == 0 {
        even_zeta_over_pi_power(p / 2)
    } else {
        Rational::from(1)
    };
    let (z_num, z_den) = z.into_numer_denom();
    Rational::from((numerator(&binomial_row(p), &z_num, i, j, p), z_den * p))
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
                    let r =
                        Rational::from((t.numerator(i, j, p).clone(), t.denominator(p).clone()));
                    assert_eq!(r, entry(i as u32, j as u32, p as u32));
                }
            }
        }
    }
}
