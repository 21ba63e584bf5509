//! Diagnostics for a weak-coupling series: where it stops converging (ratio
//! and root tests on the loop coefficients, with an extrapolated radius in g)
//! and [m/n] Padé approximants that continue it past that radius.
//!
//! Everything runs in MPFR at the largest precision among the inputs; results
//! carry that precision.

use std::cmp::Ordering;

use rug::ops::Pow;
use rug::Float;

use crate::error::{Error, Result};

/// Highest Richardson order used on the ratio sequence: enough to remove the
/// 1/L, ..., 1/L^4 corrections of an algebraic singularity, low enough not
/// to amplify noise from coefficients known only to a few digits.
const MAX_RICHARDSON_ORDER: usize = 4;

/// Where the series sum_L c_L g^(2L) stops converging, seen from its coefficients.
#[derive(Debug, Clone)]
pub struct RadiusEstimate {
    /// (L, estimate of the radius in g from orders L and L+1): sqrt|c_L / c_{L+1}|
    pub ratio: Vec<(u32, Float)>,
    /// (L, |c_L|^(-1/(2L))), the root test
    pub root: Vec<(u32, Float)>,
    /// Richardson extrapolation in 1/L of the ratio sequence, taken on its
    /// last orders (ratios of a series with one nearest algebraic singularity
    /// approach the radius as r (1 + a1/L + a2/L^2 + ...)).
    pub estimate: Float,
    /// How well that extrapolation settles: the largest difference between
    /// `estimate` and the same-order extrapolation one order earlier, and the
    /// one-order-lower extrapolation on the same orders. Large when the
    /// coefficients do not follow one dominant singularity (for instance a
    /// complex pair, which makes the ratios oscillate).
    pub spread: Float,
}

/// Ratio and root tests on loop coefficients c_1, c_2, ... (c_L multiplies
/// g^(2L)), with an extrapolated radius of convergence in g.
///
/// Errors: fewer than three coefficients (Input), a coefficient that is not
/// finite (Input), a zero coefficient, which leaves the ratio test undefined
/// (Numeric).
pub fn radius_in_g(coeffs: &[Float]) -> Result<RadiusEstimate> {
    if coeffs.len() < 3 {
        return Err(Error::input(format!(
            "a radius estimate needs at least 3 loop coefficients, got {}",
            coeffs.len()
        )));
    }
    let prec = common_prec(coeffs);
    for (i, c) in coeffs.iter().enumerate() {
        if !c.is_finite() {
            return Err(Error::input(format!(
                "coefficient at loop order {} is not finite",
                i + 1
            )));
        }
        if c.is_zero() {
            return Err(Error::numeric(format!(
                "coefficient at loop order {} is zero: the ratio test is undefined",
                i + 1
            )));
        }
    }

    let ratio: Vec<(u32, Float)> = coeffs
        .windows(2)
        .enumerate()
        .map(|(i, pair)| {
            let q = Float::with_val(prec, &pair[0] / &pair[1]).abs().sqrt();
            (i as u32 + 1, q)
        })
        .collect();
    let root: Vec<(u32, Float)> = coeffs
        .iter()
        .enumerate()
        .map(|(i, c)| {
            let order = i as u32 + 1;
            let exponent = Float::with_val(prec, -1) / (2 * order);
            (order, Float::with_val(prec, c.abs_ref()).pow(&exponent))
        })
        .collect();

    let m = ratio.len();
    let order = MAX_RICHARDSON_ORDER.min(m - 2).max(1).min(m - 1);
    let last = m - 1 - order;
    let estimate = richardson(&ratio, last, order, prec);
    let mut spread = Float::with_val(prec, 0);
    if last > 0 {
        let earlier = richardson(&ratio, last - 1, order, prec);
        spread = spread.max(&Float::with_val(prec, &estimate - &earlier).abs());
    }
    let lower = richardson(&ratio, last + 1, order - 1, prec);
    spread = spread.max(&Float::with_val(prec, &estimate - &lower).abs());
    Ok(RadiusEstimate {
        ratio,
        root,
        estimate,
        spread,
    })
}

/// Order-k Richardson extrapolation in 1/L through the ratios at indices
/// start..=start+k (orders L = start+1, ...):
///   sum_j r_{L+j} (L+j)^k (-1)^(k-j) / (j! (k-j)!),
/// exact for r_L = r + a1/L + ... + ak/L^k.
fn richardson(ratio: &[(u32, Float)], start: usize, k: usize, prec: u32) -> Float {
    let mut total = Float::with_val(prec, 0);
    let mut binomial = Float::with_val(prec, 1);
    let mut k_factorial = Float::with_val(prec, 1);
    for i in 1..=k as u32 {
        k_factorial *= i;
    }
    for j in 0..=k {
        let (order, value) = &ratio[start + j];
        // binomial = C(k, j); the weight is C(k, j) L^k (-1)^(k-j) / k!.
        let power = Float::with_val(prec, Float::u_pow_u(*order, k as u32));
        let mut term = Float::with_val(prec, value * &power) * &binomial;
        if (k - j) % 2 == 1 {
            term = -term;
        }
        total += term;
        binomial *= (k - j) as u32;
        binomial /= (j + 1) as u32;
    }
    total / k_factorial
}

fn common_prec(values: &[Float]) -> u32 {
    values.iter().map(Float::prec).max().unwrap_or(64).max(64)
}

/// An [m/n] Padé approximant P(x)/Q(x) with Q(0) = 1; coefficients lowest
/// power first.
#[derive(Debug, Clone)]
pub struct Pade {
    pub numerator: Vec<Float>,
    pub denominator: Vec<Float>,
}

/// [m/n] Padé approximant of sum_k a_k x^k (a_0 first): P of degree m and Q
/// of degree n with Q(0) = 1 and P - Q sum a_k x^k = O(x^(m+n+1)).
///
/// Needs a_0 ..= a_{m+n}. The n x n Toeplitz system for Q is solved by
/// Gaussian elimination with partial pivoting after scaling every row to
/// unit maximum, 32 guard bits above the series' precision p. A pivot below
/// 2^-(7p/8) counts as zero: the [m/n] system is then singular to working
/// precision (typically because the series is a rational function of lower
/// degree) and the result is a Numeric error.
pub fn pade(series: &[Float], m: usize, n: usize) -> Result<Pade> {
    let needed = m
        .checked_add(n)
        .and_then(|d| d.checked_add(1))
        .ok_or_else(|| Error::range("Padé degrees are too large"))?;
    if series.len() < needed {
        return Err(Error::input(format!(
            "a [{m}/{n}] Padé approximant needs {needed} series coefficients, got {}",
            series.len()
        )));
    }
    if let Some(k) = series.iter().position(|a| !a.is_finite()) {
        return Err(Error::input(format!(
            "series coefficient {k} is not finite"
        )));
    }
    let prec = common_prec(series);
    let work = prec + 32;
    let a = |k: isize| -> Float {
        if k < 0 {
            Float::with_val(work, 0)
        } else {
            Float::with_val(work, &series[k as usize])
        }
    };

    // Row r: sum_{j=1..n} q_j a_{m+1+r-j} = -a_{m+1+r}; column n is the right side.
    let mut rows: Vec<Vec<Float>> = (0..n)
        .map(|r| {
            let k = (m + 1 + r) as isize;
            let mut row: Vec<Float> = (1..=n).map(|j| a(k - j as isize)).collect();
            row.push(-a(k));
            row
        })
        .collect();
    for (r, row) in rows.iter_mut().enumerate() {
        let scale = row[..n].iter().fold(Float::with_val(work, 0), |acc, x| {
            acc.max(&Float::with_val(work, x.abs_ref()))
        });
        if scale.is_zero() {
            return Err(singular(m, n, r));
        }
        for x in row.iter_mut() {
            *x /= &scale;
        }
    }
    let threshold = Float::with_val(work, 1) >> (prec - prec / 8);
    for col in 0..n {
        let pivot = (col..n)
            .max_by(|&x, &y| {
                let ax = Float::with_val(work, rows[x][col].abs_ref());
                let ay = Float::with_val(work, rows[y][col].abs_ref());
                ax.partial_cmp(&ay).unwrap_or(Ordering::Equal)
            })
            .unwrap_or(col);
        rows.swap(col, pivot);
        if Float::with_val(work, rows[col][col].abs_ref()) <= threshold {
            return Err(singular(m, n, col));
        }
        let (upper, lower) = rows.split_at_mut(col + 1);
        let pivot_row = &upper[col];
        for row in lower.iter_mut() {
            let factor = Float::with_val(work, &row[col] / &pivot_row[col]);
            for c in col..=n {
                let sub = Float::with_val(work, &factor * &pivot_row[c]);
                row[c] -= sub;
            }
        }
    }
    let mut q = vec![Float::with_val(work, 0); n + 1];
    q[0] = Float::with_val(work, 1);
    for r in (0..n).rev() {
        let mut acc = rows[r][n].clone();
        for c in r + 1..n {
            acc -= Float::with_val(work, &rows[r][c] * &q[c + 1]);
        }
        q[r + 1] = acc / &rows[r][r];
    }

    let numerator = (0..=m)
        .map(|k| {
            let mut acc = Float::with_val(work, 0);
            for (j, qj) in q.iter().enumerate().take(k.min(n) + 1) {
                acc += Float::with_val(work, qj * &series[k - j]);
            }
            Float::with_val(prec, &acc)
        })
        .collect();
    let denominator = q.iter().map(|x| Float::with_val(prec, x)).collect();
    Ok(Pade {
        numerator,
        denominator,
    })
}

fn singular(m: usize, n: usize, at: usize) -> Error {
    Error::numeric(format!(
        "the [{m}/{n}] Padé system is singular to working precision (pivot {}); \
         try a lower denominator degree",
        at + 1
    ))
}

impl Pade {
    /// P(x)/Q(x) at the larger of x's precision and the coefficients'. A zero
    /// of Q gives an infinite or NaN value, as MPFR division does.
    pub fn eval(&self, x: &Float) -> Float {
        let prec = x
            .prec()
            .max(common_prec(&self.numerator))
            .max(common_prec(&self.denominator));
        horner(&self.numerator, x, prec) / horner(&self.denominator, x, prec)
    }

    /// Real zeros of the denominator in [lo, hi] (where the approximant has
    /// poles, unless the numerator vanishes there too), sorted. Empty when
    /// the interval is empty or not finite.
    ///
    /// Real roots are isolated exactly by recursion on derivatives: between
    /// consecutive real critical points Q is monotone, so a sign change
    /// brackets exactly one root, found by bisection. A critical point where
    /// Q vanishes to working precision (a root of even multiplicity) is
    /// reported too.
    pub fn real_poles(&self, lo: f64, hi: f64) -> Vec<f64> {
        if !(lo.is_finite() && hi.is_finite() && lo < hi) {
            return Vec::new();
        }
        let prec = common_prec(&self.denominator);
        let lo = Float::with_val(prec, lo);
        let hi = Float::with_val(prec, hi);
        let mut roots: Vec<f64> = real_roots(&self.denominator, &lo, &hi, prec)
            .iter()
            .map(Float::to_f64)
            .collect();
        roots.sort_by(|a, b| a.partial_cmp(b).unwrap_or(Ordering::Equal));
        roots.dedup();
        roots
    }
}

fn horner(coeffs: &[Float], x: &Float, prec: u32) -> Float {
    let mut acc = Float::with_val(prec, 0);
    for c in coeffs.iter().rev() {
        acc *= x;
        acc += c;
    }
    acc
}

/// Whether |p(x)| is within the rounding noise of evaluating p at x.
fn vanishes(poly: &[Float], x: &Float, prec: u32) -> bool {
    let value = horner(poly, x, prec);
    let abs_x = Float::with_val(prec, x.abs_ref());
    let abs_poly: Vec<Float> = poly
        .iter()
        .map(|c| Float::with_val(prec, c.abs_ref()))
        .collect();
    let noise = horner(&abs_poly, &abs_x, prec) >> (prec - prec / 8);
    value.abs() <= noise
}

fn real_roots(poly: &[Float], lo: &Float, hi: &Float, prec: u32) -> Vec<Float> {
    let degree = match poly.iter().rposition(|c| !c.is_zero()) {
        Some(d) => d,
        None => return Vec::new(),
    };
    if degree == 0 {
        return Vec::new();
    }
    let poly = &poly[..=degree];
    if degree == 1 {
        let root = Float::with_val(prec, -&poly[0]) / &poly[1];
        return if &root >= lo && &root <= hi {
            vec![root]
        } else {
            Vec::new()
        };
    }
    let derivative: Vec<Float> = poly
        .iter()
        .enumerate()
        .skip(1)
        .map(|(k, c)| Float::with_val(prec, c * k as u32))
        .collect();
    let mut points = vec![lo.clone()];
    points.extend(real_roots(&derivative, lo, hi, prec));
    points.push(hi.clone());

    let mut roots = Vec::new();
    for (i, x) in points.iter().enumerate() {
        if vanishes(poly, x, prec) {
            roots.push(x.clone());
        } else if let Some(next) = points.get(i + 1) {
            if !vanishes(poly, next, prec) {
                let fa = horner(poly, x, prec);
                let fb = horner(poly, next, prec);
                if fa.is_sign_negative() != fb.is_sign_negative() {
                    roots.push(bisect(poly, x, next, fa.is_sign_negative(), prec));
                }
            }
        }
    }
    roots
}

/// Bisection on a bracket [a, b] with p(a) of sign `a_negative`, until the
/// ends agree as f64 (the precision reported) or 200 halvings.
fn bisect(poly: &[Float], a: &Float, b: &Float, a_negative: bool, prec: u32) -> Float {
    let mut a = a.clone();
    let mut b = b.clone();
    for _ in 0..200 {
        if a.to_f64() == b.to_f64() {
            break;
        }
        let mid = Float::with_val(prec, &a + &b) / 2u32;
        let value = horner(poly, &mid, prec);
        if value.is_zero() {
            return mid;
        }
        if value.is_sign_negative() == a_negative {
            a = mid;
        } else {
            b = mid;
        }
    }
    Float::with_val(prec, &a + &b) / 2u32
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::error::ErrorKind;
    use rug::float::Constant;
    use rug::{Integer, Rational};

    const P: u32 = 256;

    fn f(x: f64) -> Float {
        Float::with_val(P, x)
    }

    /// B_0 ..= B_n exactly, from sum_{j=0}^{k} C(k+1, j) B_j = 0 (DLMF 24.5.3
    /// with x = 0; B_1 = -1/2).
    fn bernoulli(n: usize) -> Vec<Rational> {
        let mut b = vec![Rational::from(1)];
        for k in 1..=n {
            let mut acc = Rational::new();
            for (j, bj) in b.iter().enumerate() {
                let c = Integer::from(Integer::binomial_u(k as u32 + 1, j as u32));
                acc += Rational::from(bj * c);
            }
            b.push(-acc / (k as u32 + 1));
        }
        b
    }

    /// Coefficients c_L of g^(2L), L = 1..=orders, of ln cosh(2 pi g).
    /// Integrating tanh x = sum_n 2^(2n) (2^(2n)-1) B_2n x^(2n-1) / (2n)!
    /// (A&S 4.5.64) from 0 gives
    ///   ln cosh x = sum_n 2^(2n) (2^(2n)-1) B_2n x^(2n) / (2n (2n)!),
    /// and x = 2 pi g adds (2 pi)^(2n).
    fn ln_cosh_coefficients(orders: usize) -> Vec<Float> {
        let b = bernoulli(2 * orders);
        let two_pi = Float::with_val(P, Constant::Pi) * 2u32;
        (1..=orders)
            .map(|n| {
                let four_n = Integer::from(1) << (2 * n as u32);
                let exact = Rational::from(&b[2 * n] * (Integer::from(&four_n - 1) * &four_n))
                    / (Integer::from(Integer::factorial(2 * n as u32)) * (2 * n as u32));
                Float::with_val(P, &exact) * Float::with_val(P, two_pi.clone().pow(2 * n as u32))
            })
            .collect()
    }

    #[test]
    fn ln_cosh_series_is_right() {
        // The derived coefficients against MPFR's ln(cosh(2 pi g)) at g = 0.05
        // (well inside the radius 1/4): 30 terms leave about 0.2^60 of tail.
        let c = ln_cosh_coefficients(30);
        assert_eq!(c[0], Float::with_val(P, Constant::Pi).square() * 2u32);
        let g2 = f(0.05).square();
        let mut sum = Float::with_val(P, 0);
        for ci in c.iter().rev() {
            sum += ci;
            sum *= &g2;
        }
        let direct = (Float::with_val(P, Constant::Pi) * 2u32 * f(0.05))
            .cosh()
            .ln();
        assert!(Float::with_val(P, &sum - &direct).abs() < 1e-40);
    }

    #[test]
    fn radius_of_ln_cosh_is_one_quarter() {
        // ln cosh(2 pi g) is singular where cosh vanishes, g = i/4, the
        // nearest zero of cosh z at z = i pi/2 (A&S 4.5.8 zeros of cosh).
        let est = radius_in_g(&ln_cosh_coefficients(30)).unwrap();
        let quarter = f(0.25);
        let err = |x: &Float| Float::with_val(P, x - &quarter).abs();
        assert!(err(&est.estimate) < 1e-3, "estimate {}", est.estimate);
        // The ratios follow sqrt(1 + 1/L)/4 up to relative corrections of order
        // 4^-L (from 2^(2L) - 1 and zeta(2L) in B_2L), so Richardson does far better.
        assert!(err(&est.estimate) < 1e-6, "estimate {}", est.estimate);
        assert!(est.spread < 1e-3, "spread {}", est.spread);
        assert!(err(&est.estimate) <= Float::with_val(P, &est.spread * 10u32) + 1e-30);
        assert_eq!(est.ratio.len(), 29);
        assert_eq!(est.root.len(), 30);
        // Both sequences close in on 1/4: later orders are nearer.
        for seq in [&est.ratio, &est.root] {
            let early = err(&seq[4].1);
            let late = err(&seq[seq.len() - 1].1);
            assert!(late < early, "{late} !< {early}");
        }
        assert!(err(&est.ratio[28].1) < 0.01);
        assert!(err(&est.root[29].1) < 0.02);
    }

    #[test]
    fn spread_flags_a_complex_pair() {
        // c_L = 16^L cos L: singularities at g^2 = e^(+-i)/16, radius 1/4 in g
        // again, but the ratios oscillate and never settle.
        let c: Vec<Float> = (1..=30u32)
            .map(|l| Float::with_val(P, Float::u_pow_u(16, l)) * f(l as f64).cos())
            .collect();
        let est = radius_in_g(&c).unwrap();
        assert!(
            est.spread > 0.1,
            "spread {} estimate {}",
            est.spread,
            est.estimate
        );
    }

    #[test]
    fn radius_errors() {
        let ones: Vec<Float> = (0..5).map(|_| f(1.0)).collect();
        assert_eq!(
            radius_in_g(&ones[..2]).unwrap_err().kind(),
            ErrorKind::Input
        );
        let mut with_zero = ones.clone();
        with_zero[2] = f(0.0);
        assert_eq!(
            radius_in_g(&with_zero).unwrap_err().kind(),
            ErrorKind::Numeric
        );
        let mut with_nan = ones;
        with_nan[1] = Float::with_val(P, rug::float::Special::Nan);
        assert_eq!(radius_in_g(&with_nan).unwrap_err().kind(), ErrorKind::Input);
    }

    fn exp_series(len: usize) -> Vec<Float> {
        let mut out = vec![f(1.0)];
        for k in 1..len as u32 {
            let next = Float::with_val(P, &out[k as usize - 1] / k);
            out.push(next);
        }
        out
    }

    #[test]
    fn pade_of_exp_at_one() {
        // [15/15] of exp: the error at x = 1 is about (15!)^2 / (30! 31!) ~ 1e-42.
        let approx = pade(&exp_series(31), 15, 15).unwrap();
        let e = f(1.0).exp();
        let err = Float::with_val(P, approx.eval(&f(1.0)) - &e).abs();
        assert!(err < 1e-40, "error {err}");
        assert!(err > 0.0, "an [n/n] approximant cannot be exact for exp");
    }

    #[test]
    fn pade_of_exp_coefficients_closed_form() {
        // [n/n] of exp has numerator coefficients (2n-k)! n! / ((2n)! k! (n-k)!)
        // and denominator the same with (-1)^k (standard closed form, recalled
        // from memory; n = 1 gives (1 + x/2)/(1 - x/2)).
        let n = 4u32;
        let approx = pade(&exp_series(9), 4, 4).unwrap();
        let fact = |k: u32| Integer::from(Integer::factorial(k));
        for k in 0..=n {
            let exact = Rational::from((
                fact(2 * n - k) * fact(n),
                fact(2 * n) * fact(k) * fact(n - k),
            ));
            let want = Float::with_val(P, &exact);
            let sign = if k % 2 == 1 { -1 } else { 1 };
            let num_err = Float::with_val(P, &approx.numerator[k as usize] - &want).abs();
            let den_err = Float::with_val(P, &approx.denominator[k as usize] - want * sign).abs();
            assert!(num_err < 1e-70 && den_err < 1e-70, "k = {k}");
        }
    }

    fn ln_1p_series(len: usize) -> Vec<Float> {
        (0..len)
            .map(|k| {
                if k == 0 {
                    f(0.0)
                } else {
                    let v = Float::with_val(P, 1) / k as u32;
                    if k % 2 == 0 {
                        -v
                    } else {
                        v
                    }
                }
            })
            .collect()
    }

    #[test]
    fn pade_of_log_beyond_radius() {
        // The Taylor series of ln(1+x) diverges at x = 2; diagonal Padé
        // approximants of this Stieltjes-type function converge on the plane
        // cut along (-inf, -1], here like ((sqrt 3 - 1)/(sqrt 3 + 1))^(2n).
        let ln3 = f(3.0).ln();
        let series = ln_1p_series(41);
        let mut last = f(1.0);
        for n in [4usize, 8, 12, 16, 20] {
            let approx = pade(&series, n, n).unwrap();
            let err = Float::with_val(P, approx.eval(&f(2.0)) - &ln3).abs();
            assert!(err < last, "[{n}/{n}] error {err} did not shrink");
            last = err;
        }
        assert!(last < 1e-20, "[20/20] error {last}");
        // Poles sit on the cut only (same Stieltjes property).
        let approx = pade(&series, 10, 10).unwrap();
        assert!(approx.real_poles(-0.999, 100.0).is_empty());
        let poles = approx.real_poles(-1e6, -1.0);
        assert_eq!(poles.len(), 10, "{poles:?}");
    }

    /// Series coefficients of P/Q for exact rational P, Q with Q(0) = 1.
    fn rational_series(p: &[Rational], q: &[Rational], len: usize) -> Vec<Rational> {
        let mut a: Vec<Rational> = Vec::new();
        for k in 0..len {
            let mut v = p.get(k).cloned().unwrap_or_default();
            for j in 1..q.len().min(k + 1) {
                v -= Rational::from(&q[j] * &a[k - j]);
            }
            a.push(v);
        }
        a
    }

    #[test]
    fn pade_recovers_rational_function() {
        // (1 + 2x - x^2) / (1 - x/3 + x^2/5): its [2/2] approximant is itself.
        let r = |n: i32, d: u32| Rational::from((n, d));
        let p = [r(1, 1), r(2, 1), r(-1, 1)];
        let q = [r(1, 1), r(-1, 3), r(1, 5)];
        let series: Vec<Float> = rational_series(&p, &q, 9)
            .iter()
            .map(|a| Float::with_val(P, a))
            .collect();
        let approx = pade(&series, 2, 2).unwrap();
        for (got, want) in approx
            .numerator
            .iter()
            .zip(&p)
            .chain(approx.denominator.iter().zip(&q))
        {
            let err = Float::with_val(P, got - Float::with_val(P, want)).abs();
            assert!(err < 1e-70, "{got} vs {want}");
        }
        let x = f(0.3);
        let direct = {
            let px = Float::with_val(P, 1) + Float::with_val(P, &x * 2u32)
                - Float::with_val(P, x.square_ref());
            let qx = Float::with_val(P, 1) - Float::with_val(P, &x / 3u32)
                + Float::with_val(P, x.square_ref()) / 5u32;
            px / qx
        };
        assert!(Float::with_val(P, approx.eval(&x) - direct).abs() < 1e-70);
        // [3/3] asks for more than the function has: a singular system.
        assert_eq!(pade(&series, 3, 3).unwrap_err().kind(), ErrorKind::Numeric);
        // Q = 1 - x/3 + x^2/5 has no real zeros (discriminant 1/9 - 4/5 < 0).
        assert!(approx.real_poles(-100.0, 100.0).is_empty());
    }

    #[test]
    fn real_poles_of_known_denominator() {
        // 1/((1 - x)(1 + x/2)) = 1/(1 - x/2 - x^2/2): poles at 1 and -2.
        let r = |n: i32, d: u32| Rational::from((n, d));
        let series: Vec<Float> = rational_series(&[r(1, 1)], &[r(1, 1), r(-1, 2), r(-1, 2)], 3)
            .iter()
            .map(|a| Float::with_val(P, a))
            .collect();
        let approx = pade(&series, 0, 2).unwrap();
        assert_eq!(approx.real_poles(-5.0, 5.0), vec![-2.0, 1.0]);
        assert_eq!(approx.real_poles(0.0, 0.5), Vec::<f64>::new());
        assert_eq!(approx.real_poles(5.0, -5.0), Vec::<f64>::new());
    }

    #[test]
    fn pade_errors() {
        let s = exp_series(5);
        assert_eq!(pade(&s, 3, 2).unwrap_err().kind(), ErrorKind::Input);
        assert_eq!(
            pade(&s, usize::MAX, 2).unwrap_err().kind(),
            ErrorKind::Range
        );
        let zeros: Vec<Float> = (0..5).map(|_| f(0.0)).collect();
        assert_eq!(pade(&zeros, 2, 2).unwrap_err().kind(), ErrorKind::Numeric);
        let taylor = pade(&s, 4, 0).unwrap();
        assert_eq!(taylor.denominator.len(), 1);
        assert_eq!(taylor.numerator.len(), 5);
    }
}
