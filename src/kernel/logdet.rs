//! ln det(1 + K) from the diagonal resolvent elements, in dense integer form:
//! ln det = -sum_s ln G_s with G_s = [(1 + K_{>=s})^(-1)]_ss, and each ln
//! from (ln G)' G = G', i.e. L_n = G_n - (1/n) sum_{k<n} k L_k G_(n-k) in
//! powers of x = g^2. Products of monomials are additions of packed keys
//! (see `ProductIndex`), and each coefficient keeps one denominator, so the
//! inner loop is an integer multiply-add, as in the resolvent recursion.

use rug::{Assign, Integer};

use super::basis::{ProductIndex, WeightBases};
use super::recursion::{Dense, TiltFactors};

/// Coefficients of x^k (weight 2k), k = 0..=loops, of one dense series.
pub type DenseSeries = Vec<Dense>;

fn zero(bases: &WeightBases, tilt: &TiltFactors, weight: usize) -> Dense {
    Dense {
        denominator: Integer::from(1),
        numerators: vec![Integer::new(); bases.len(weight) * tilt.slots(weight)],
    }
}

/// sum_terms (factor * a * b) over the given pairs of coefficients, as numerators over `common`.
fn convolve(
    bases: &WeightBases,
    index: &ProductIndex,
    tilt: &TiltFactors,
    pairs: &[(Integer, usize, &Dense, usize, &Dense)],
    weight: usize,
) -> Vec<Integer> {
    let slots = tilt.slots(weight);
    let mut out = vec![Integer::new(); bases.len(weight) * slots];
    let mut scaled = Integer::new();
    for (factor, wa, a, wb, b) in pairs {
        let (sa, sb) = (tilt.slots(*wa), tilt.slots(*wb));
        for (ia, x) in a
            .numerators
            .iter()
            .enumerate()
            .filter(|(_, x)| !x.is_zero())
        {
            let (ba, da) = (ia / sa, ia % sa);
            scaled.assign(factor * x);
            let key_a = index.key(*wa, ba);
            for (ib, y) in b
                .numerators
                .iter()
                .enumerate()
                .filter(|(_, y)| !y.is_zero())
            {
                let (bb, db) = (ib / sb, ib % sb);
                let target = index.index_of(key_a + index.key(*wb, bb)) as usize * slots + da + db;
                out[target] += &scaled * y;
            }
        }
    }
    out
}

/// Divides numerators and denominator by their common factor.
fn reduced(mut d: Dense) -> Dense {
    let mut g = d.denominator.clone();
    for x in d.numerators.iter().filter(|x| !x.is_zero()) {
        if g == 1 {
            break;
        }
        g.gcd_mut(x);
    }
    if g != 1 {
        d.denominator.div_exact_mut(&g);
        for x in d.numerators.iter_mut().filter(|x| !x.is_zero()) {
            x.div_exact_mut(&g);
        }
    }
    d
}

/// ln G for a series with G_0 = 1 (coefficient k at weight 2k).
pub fn ln(
    g: &DenseSeries,
    bases: &WeightBases,
    index: &ProductIndex,
    tilt: &TiltFactors,
) -> DenseSeries {
    let loops = g.len() - 1;
    let mut out: DenseSeries = vec![zero(bases, tilt, 0)];
    for n in 1..=loops {
        let mut common = Integer::from(1);
        for k in 1..n {
            common.lcm_mut(&Integer::from(&out[k].denominator * &g[n - k].denominator));
        }
        let pairs: Vec<(Integer, usize, &Dense, usize, &Dense)> = (1..n)
            .filter(|&k| {
                out[k].numerators.iter().any(|x| !x.is_zero())
                    && g[n - k].numerators.iter().any(|x| !x.is_zero())
            })
            .map(|k| {
                let scale = (&common / Integer::from(&out[k].denominator * &g[n - k].denominator))
                    * k as u32;
                (scale, 2 * k, &out[k], 2 * (n - k), &g[n - k])
            })
            .collect();
        let sum = convolve(bases, index, tilt, &pairs, 2 * n);
        // L_n = G_n - sum / (n common), over the denominator lcm(D(G_n), n common).
        let nc = Integer::from(&common * n as u32);
        let mut denominator = g[n].denominator.clone();
        denominator.lcm_mut(&nc);
        let fg = Integer::from(&denominator / &g[n].denominator);
        let fs = Integer::from(&denominator / &nc);
        let numerators = g[n]
            .numerators
            .iter()
            .zip(&sum)
            .map(|(a, b)| Integer::from(a * &fg) - Integer::from(b * &fs))
            .collect();
        out.push(reduced(Dense {
            denominator,
            numerators,
        }));
    }
    out
}

/// a - b, coefficientwise.
pub fn subtract(a: &DenseSeries, b: &DenseSeries) -> DenseSeries {
    a.iter()
        .zip(b)
        .map(|(x, y)| {
            let mut denominator = x.denominator.clone();
            denominator.lcm_mut(&y.denominator);
            let fx = Integer::from(&denominator / &x.denominator);
            let fy = Integer::from(&denominator / &y.denominator);
            let numerators = x
                .numerators
                .iter()
                .zip(&y.numerators)
                .map(|(p, q)| Integer::from(p * &fx) - Integer::from(q * &fy))
                .collect();
            reduced(Dense {
                denominator,
                numerators,
            })
        })
        .collect()
}

/// The zero series through x^loops.
pub fn zeros(bases: &WeightBases, tilt: &TiltFactors, loops: usize) -> DenseSeries {
    (0..=loops).map(|k| zero(bases, tilt, 2 * k)).collect()
}
