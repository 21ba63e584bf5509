//! Numbers with errors: an MPFR value with an absolute error bound, and the
//! first-order, worst-case propagation of that bound through arithmetic
//! (|a| e_b + |b| e_a for a product), which is what a person checking digits
//! expects. The same type carries the uncertainty a user wrote beside a
//! decimal and the error the finite-coupling engine estimates for a value.

use rug::Float;

/// A number known to within an absolute error.
#[derive(Clone, Debug, PartialEq)]
pub struct Estimate {
    pub value: Float,
    /// Absolute error bound (non-negative); zero for exact values.
    pub error: Float,
    /// Whether the error was written by the user (`(2)`, `±`), as opposed
    /// to implied by the written digits, estimated by the engine, or absent.
    pub stated: bool,
}

impl Estimate {
    /// A value with an estimated (not user-stated) error.
    pub fn new(value: Float, error: Float) -> Self {
        Estimate {
            value,
            error,
            stated: false,
        }
    }

    pub fn exact(value: Float) -> Self {
        let prec = value.prec();
        Estimate::new(value, Float::with_val(prec, 0))
    }

    pub fn is_exact(&self) -> bool {
        self.error.is_zero()
    }

    fn prec_with(&self, other: &Estimate) -> u32 {
        self.value.prec().max(other.value.prec())
    }

    pub fn sum(&self, other: &Estimate) -> Estimate {
        let p = self.prec_with(other);
        Estimate {
            value: Float::with_val(p, &self.value + &other.value),
            error: Float::with_val(p, &self.error + &other.error),
            stated: self.stated || other.stated,
        }
    }

    pub fn difference(&self, other: &Estimate) -> Estimate {
        self.sum(&other.negated())
    }

    pub fn negated(&self) -> Estimate {
        Estimate {
            value: Float::with_val(self.value.prec(), -&self.value),
            ..self.clone()
        }
    }

    /// `self` times an exact number.
    pub fn scaled(&self, factor: &Float) -> Estimate {
        let p = self.value.prec().max(factor.prec());
        Estimate {
            value: Float::with_val(p, &self.value * factor),
            error: Float::with_val(p, &self.error * factor).abs(),
            stated: self.stated,
        }
    }

    /// x * y: |x| e_y + |y| e_x + e_x e_y.
    pub fn product(&self, other: &Estimate) -> Estimate {
        let p = self.prec_with(other);
        let error = Float::with_val(p, self.value.abs_ref()) * &other.error
            + Float::with_val(p, other.value.abs_ref()) * &self.error
            + Float::with_val(p, &self.error * &other.error);
        Estimate {
            value: Float::with_val(p, &self.value * &other.value),
            error,
            stated: self.stated || other.stated,
        }
    }

    /// Whether zero lies within the error of the value.
    pub fn straddles_zero(&self) -> bool {
        Float::with_val(self.value.prec(), self.value.abs_ref()) <= self.error
    }

    /// x / y: the worst case over the intervals, (e_x |y| + |x| e_y) /
    /// (|y| (|y| - e_y)); None when y is zero within its error.
    pub fn quotient(&self, other: &Estimate) -> Option<Estimate> {
        if other.straddles_zero() {
            return None;
        }
        let p = self.prec_with(other);
        let ay = Float::with_val(p, other.value.abs_ref());
        let spread = Float::with_val(p, &self.error * &ay)
            + Float::with_val(p, self.value.abs_ref()) * &other.error;
        let denominator = Float::with_val(p, &ay * &ay) - Float::with_val(p, &ay * &other.error);
        Some(Estimate {
            value: Float::with_val(p, &self.value / &other.value),
            error: spread / denominator,
            stated: self.stated || other.stated,
        })
    }

    /// Significant digits k such that rounding `value` to k digits stays
    /// within one unit of the k-th digit of the true value: the error is at
    /// most half that unit. Zero when the error reaches the value's size.
    pub fn digits_supported(&self) -> u32 {
        if self.value.is_zero() || !self.value.is_finite() || !self.error.is_finite() {
            return 0;
        }
        let lead = self.value.clone().abs().log10().floor().to_f64();
        if self.error.is_zero() {
            return (self.value.prec() as f64 * 2f64.log10()).floor() as u32;
        }
        let two_err = Float::with_val(64, &self.error * 2u32).log10().to_f64();
        let k = (lead + 1.0 - two_err).floor();
        if k < 1.0 {
            0
        } else {
            k.min(self.value.prec() as f64 * 2f64.log10()) as u32
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn e(v: f64, u: f64) -> Estimate {
        Estimate::new(Float::with_val(100, v), Float::with_val(100, u))
    }

    /// Worst case over the intervals (common practice): [1.9, 2.1] / [0.9, 1.1]
    /// reaches 2.1/0.9 = 2.333..., so the error is 1/3 beyond the value 2.
    #[test]
    fn quotient_is_the_worst_case_of_the_intervals() {
        let q = e(2.0, 0.1).quotient(&e(1.0, 0.1)).unwrap();
        assert_eq!(q.value, 2.0);
        assert!((q.error.to_f64() - 1.0 / 3.0).abs() < 1e-12);
        assert!(e(1.0, 0.0).quotient(&e(0.05, 0.1)).is_none());
    }

    #[test]
    fn product_and_sum_propagate_first_order_worst_case() {
        let p = e(3.0, 0.1).product(&e(-2.0, 0.2));
        assert_eq!(p.value, -6.0);
        // |3| 0.2 + |-2| 0.1 + 0.1*0.2
        assert!((p.error.to_f64() - 0.82).abs() < 1e-12);
        let d = e(3.0, 0.1).difference(&e(1.0, 0.2));
        assert_eq!(d.value, 2.0);
        assert!((d.error.to_f64() - 0.3).abs() < 1e-12);
    }

    #[test]
    fn supported_digits_follow_the_error() {
        // 1.23456 ± 4e-4: 1.235 is within half a unit of its last digit (4e-4 < 5e-4).
        assert_eq!(e(1.23456, 4e-4).digits_supported(), 4);
        assert_eq!(e(1.0, 2.0).digits_supported(), 0);
    }
}
