//! Linear least squares in MPFR: the coefficients c minimising
//! sum_i (sum_t A_it c_t - y_i)^2, and the pseudo-inverse that carries the
//! data's errors into them.
//!
//! The normal equations (A^T A) c = A^T y are solved by Gauss-Jordan
//! elimination with partial pivoting at the caller's precision. Squaring the
//! condition number is harmless here because the caller works with many
//! more bits than its data carries (the fits of `quantity::strong` have
//! condition numbers of 10^10 or so against 100 or more guard bits).

use rug::Float;

use crate::error::{Error, Result};

/// A solved least-squares problem.
#[derive(Clone, Debug)]
pub struct Solution {
    /// The fitted coefficients, one per column of the design matrix.
    pub coefficients: Vec<Float>,
    /// (A^T A)^-1 A^T, row t giving dc_t / dy_i.
    pub pseudo_inverse: Vec<Vec<Float>>,
}

impl Solution {
    /// sum_i |dc_t / dy_i| e_i: the change of coefficient t that the data
    /// errors `errors` can cause at most, to first order.
    pub fn propagated(&self, t: usize, errors: &[Float]) -> Float {
        let prec = self.coefficients[t].prec();
        let mut sum = Float::new(prec);
        for (p, e) in self.pseudo_inverse[t].iter().zip(errors) {
            sum += Float::with_val(prec, p.abs_ref()) * e;
        }
        sum
    }
}

/// Fits `rhs` by the columns of `design` (rows: data points). Errors (kind
/// Numeric): fewer rows than columns, or columns that are numerically
/// dependent.
pub fn solve(design: &[Vec<Float>], rhs: &[Float], prec: u32) -> Result<Solution> {
    let rows = design.len();
    let cols = design.first().map_or(0, Vec::len);
    if cols == 0 || rows < cols || rhs.len() != rows {
        return Err(Error::numeric(format!(
            "a least-squares fit of {cols} terms needs at least as many points; it has {rows}"
        )));
    }
    // The augmented system [A^T A | I]; reducing its left half to the
    // identity leaves (A^T A)^-1 on the right.
    let mut m: Vec<Vec<Float>> = (0..cols)
        .map(|a| {
            let mut row: Vec<Float> = (0..cols)
                .map(|b| {
                    let mut s = Float::new(prec);
                    for r in design {
                        s += Float::with_val(prec, &r[a] * &r[b]);
                    }
                    s
                })
                .collect();
            row.extend((0..cols).map(|b| Float::with_val(prec, u32::from(a == b))));
            row
        })
        .collect();
    let scale = m
        .iter()
        .enumerate()
        .map(|(a, row)| row[a].to_f64().abs())
        .fold(0.0, f64::max);
    for k in 0..cols {
        let pivot = (k..cols)
            .max_by(|&a, &b| {
                m[a][k]
                    .to_f64()
                    .abs()
                    .partial_cmp(&m[b][k].to_f64().abs())
                    .unwrap_or(std::cmp::Ordering::Equal)
            })
            .unwrap_or(k);
        // A pivot this far below the matrix's scale means dependent columns
        // to the working precision: nothing trustworthy can come out.
        let floor = scale * 2f64.powi(-(prec as i32) / 2);
        if m[pivot][k].to_f64().abs() <= floor {
            return Err(Error::numeric(
                "the fit's terms are numerically dependent on these points: use a wider range or fewer terms",
            ));
        }
        m.swap(k, pivot);
        let p = m[k][k].clone();
        for v in m[k].iter_mut() {
            *v /= &p;
        }
        let pivot_row = m[k].clone();
        for (a, row) in m.iter_mut().enumerate() {
            if a == k || row[k].is_zero() {
                continue;
            }
            let factor = row[k].clone();
            for (v, w) in row.iter_mut().zip(&pivot_row) {
                *v -= Float::with_val(prec, &factor * w);
            }
        }
    }
    let inverse: Vec<&[Float]> = m.iter().map(|row| &row[cols..]).collect();
    let pseudo_inverse: Vec<Vec<Float>> = (0..cols)
        .map(|t| {
            design
                .iter()
                .map(|r| {
                    let mut s = Float::new(prec);
                    for (b, x) in r.iter().enumerate() {
                        s += Float::with_val(prec, &inverse[t][b] * x);
                    }
                    s
                })
                .collect()
        })
        .collect();
    let coefficients = pseudo_inverse
        .iter()
        .map(|p| {
            let mut s = Float::new(prec);
            for (w, y) in p.iter().zip(rhs) {
                s += Float::with_val(prec, w * y);
            }
            s
        })
        .collect();
    Ok(Solution {
        coefficients,
        pseudo_inverse,
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    fn f(x: f64) -> Float {
        Float::with_val(200, x)
    }

    /// A polynomial sampled exactly is reproduced exactly, and a straight
    /// line through three points off a line lands on the textbook normal-
    /// equation answer (common practice: hand computation).
    #[test]
    fn recovers_a_polynomial_and_the_textbook_line() {
        let xs = [1.0, 2.0, 3.0, 4.0, 5.0];
        let design: Vec<Vec<Float>> = xs.iter().map(|&x| vec![f(1.0), f(x), f(x * x)]).collect();
        let rhs: Vec<Float> = xs.iter().map(|&x| f(3.0 - 2.0 * x + 0.5 * x * x)).collect();
        let s = solve(&design, &rhs, 200).unwrap();
        for (c, want) in s.coefficients.iter().zip([3.0, -2.0, 0.5]) {
            assert!((c.to_f64() - want).abs() < 1e-40, "{c} vs {want}");
        }
        // y = 0, 1, 3 at x = 0, 1, 2: slope 3/2, intercept -1/6.
        let design: Vec<Vec<Float>> = [0.0, 1.0, 2.0]
            .iter()
            .map(|&x| vec![f(1.0), f(x)])
            .collect();
        let rhs = vec![f(0.0), f(1.0), f(3.0)];
        let s = solve(&design, &rhs, 200).unwrap();
        assert!((s.coefficients[0].to_f64() + 1.0 / 6.0).abs() < 1e-15);
        assert!((s.coefficients[1].to_f64() - 1.5).abs() < 1e-15);
        // The slope moves by (x_i - mean)/sum (x - mean)^2 per unit of y_i.
        let errors = vec![f(1.0), f(1.0), f(1.0)];
        assert!((s.propagated(1, &errors).to_f64() - 1.0).abs() < 1e-15);
    }

    #[test]
    fn refuses_dependent_columns_and_too_few_points() {
        let design: Vec<Vec<Float>> = [1.0, 2.0, 3.0]
            .iter()
            .map(|&x| vec![f(x), f(2.0 * x)])
            .collect();
        let rhs = vec![f(1.0), f(2.0), f(3.0)];
        assert!(solve(&design, &rhs, 200).is_err());
        assert!(solve(&design[..1], &rhs[..1], 200).is_err());
    }
}
