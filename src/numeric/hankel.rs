//! Hankel functions of the first kind H_0(z), ..., H_n(z) = J_n(z) + i Y_n(z)
//! at one complex argument with |z| large, in MPFR: the Hankel expansion of
//! H_0 and H_1 (DLMF 10.17.5) and forward recurrence (DLMF 10.6.1), with the
//! few complex operations that needs on pairs of MPFR numbers.
//!
//! Forward recurrence is safe for every order below |z| wherever it is
//! used here (0 <= arg z < pi/2): the solution it could drift into is H^(2),
//! and the ratio |H^(2)_k / H^(1)_k| falls with k there (it is about
//! exp(2 Im z sqrt(1 - k^2/|z|^2))), so an error made at a low order shrinks
//! relative to the wanted solution as the order grows.

use rug::float::Constant;
use rug::{Assign, Float};

/// A complex number as two MPFR numbers at one precision.
#[derive(Clone, Debug)]
pub(crate) struct Cx {
    pub re: Float,
    pub im: Float,
}

impl Cx {
    pub fn new(re: Float, im: Float) -> Cx {
        Cx { re, im }
    }

    pub fn mul(&self, o: &Cx) -> Cx {
        let p = self.re.prec();
        let mut re = Float::with_val(p, &self.re * &o.re);
        re -= Float::with_val(p, &self.im * &o.im);
        let mut im = Float::with_val(p, &self.re * &o.im);
        im += Float::with_val(p, &self.im * &o.re);
        Cx::new(re, im)
    }

    pub fn scale(&self, r: &Float) -> Cx {
        let p = self.re.prec();
        Cx::new(
            Float::with_val(p, &self.re * r),
            Float::with_val(p, &self.im * r),
        )
    }

    pub fn abs(&self) -> Float {
        Float::with_val(self.re.prec(), self.re.hypot_ref(&self.im))
    }

    pub fn recip(&self) -> Cx {
        let p = self.re.prec();
        let mut d = Float::with_val(p, self.re.square_ref());
        d += Float::with_val(p, self.im.square_ref());
        Cx::new(
            Float::with_val(p, &self.re / &d),
            -Float::with_val(p, &self.im / &d),
        )
    }

    /// The principal square root.
    pub fn sqrt(&self) -> Cx {
        let p = self.re.prec();
        let r = self.abs();
        let re = Float::with_val(p, Float::with_val(p, &r + &self.re) / 2u32).sqrt();
        let mut im = Float::with_val(p, Float::with_val(p, &r - &self.re) / 2u32).sqrt();
        if self.im.is_sign_negative() {
            im = -im;
        }
        Cx::new(re, im)
    }

    /// e^(i phase) for a real phase.
    pub fn unit(phase: &Float) -> Cx {
        let (sin, cos) = phase.clone().sin_cos(Float::new(phase.prec()));
        Cx::new(cos, sin)
    }
}

/// The Hankel sum sum_k i^k a_k(nu) / z^k of DLMF 10.17.5 for nu = 0 or 1, or
/// None if its terms stop decreasing before reaching the working precision.
fn hankel_sum(nu: u32, i_over_z: &Cx, wprec: u32) -> Option<Cx> {
    let mu = i64::from(4 * nu * nu);
    let mut sum = Cx::new(Float::with_val(wprec, 1), Float::new(wprec));
    let mut term = sum.clone();
    let eps = Float::with_val(wprec, Float::i_exp(1, -(wprec as i32)));
    let mut last = Float::with_val(wprec, 1);
    for k in 1u32..100_000 {
        // a_k = a_{k-1} (mu - (2k - 1)^2) / (8k)
        let odd = i64::from(2 * k - 1);
        term = term.mul(i_over_z);
        let factor = Float::with_val(wprec, mu - odd * odd) / (8 * k);
        term = term.scale(&factor);
        let size = term.abs();
        if size > last {
            return None;
        }
        sum.re += &term.re;
        sum.im += &term.im;
        if size < eps {
            return Some(sum);
        }
        last = size;
    }
    None
}

/// root H_0(z), ..., root H_n(z) (first kind) at `prec` bits for Re z > 0,
/// Im z >= 0, or None when |z| is too small for the expansion to reach the
/// precision (about |z| > prec ln 2 / 2) or n is not below |z|. The factor
/// `root` is the quadrature's (square-rooted) weight, applied on the way out.
pub(crate) fn hankel_upto(n: usize, z: &Cx, root: &Cx, prec: u32) -> Option<Vec<Cx>> {
    let wprec = prec + 16;
    let x = Float::with_val(wprec, &z.re);
    let y = Float::with_val(wprec, &z.im);
    let zw = Cx::new(x.clone(), y.clone());
    let modulus = zw.abs();
    if modulus.to_f64() <= n as f64 {
        return None;
    }
    let pi = Float::with_val(wprec, Constant::Pi);
    let arg = Float::with_val(wprec, y.atan2_ref(&x));
    // sqrt(2 / (pi z)) e^(i (z - nu pi/2 - pi/4)): modulus
    // sqrt(2 / (pi |z|)) e^-y, phase x - nu pi/2 - pi/4 - arg/2.
    let amp = Float::with_val(wprec, Float::with_val(wprec, &modulus * &pi) / 2u32).recip_sqrt()
        * Float::with_val(wprec, -&y).exp();
    let i_over_z = Cx::new(Float::new(wprec), Float::with_val(wprec, 1)).mul(&zw.recip());
    let mut first = Vec::with_capacity(2);
    for nu in 0..2u32 {
        let sum = hankel_sum(nu, &i_over_z, wprec)?;
        let mut phase = Float::with_val(
            wprec,
            &x - Float::with_val(wprec, &pi * (2 * nu + 1)) / 4u32,
        );
        phase -= Float::with_val(wprec, &arg / 2u32);
        first.push(Cx::unit(&phase).mul(&sum).scale(&amp));
    }
    let two_over_z = zw.recip().scale(&Float::with_val(wprec, 2));
    let (tr, ti) = (&two_over_z.re, &two_over_z.im);
    let root = Cx::new(
        Float::with_val(wprec, &root.re),
        Float::with_val(wprec, &root.im),
    );
    let out_of = |c: &Cx| {
        let v = root.mul(c);
        Cx::new(Float::with_val(prec, &v.re), Float::with_val(prec, &v.im))
    };
    let mut out = Vec::with_capacity(n + 1);
    let mut prev = first.swap_remove(0);
    let mut here = first.swap_remove(0);
    out.push(out_of(&prev));
    if n >= 1 {
        out.push(out_of(&here));
    }
    // In place, without allocation: this loop is the cost of a node.
    let (mut a, mut b) = (Float::new(wprec), Float::new(wprec));
    for k in 1..n {
        // H_{k+1} = (2k / z) H_k - H_{k-1}, written over H_{k-1}.
        a.assign(tr * &here.re);
        b.assign(ti * &here.im);
        a -= &b;
        a *= k as u32;
        a -= &prev.re;
        std::mem::swap(&mut prev.re, &mut a);
        a.assign(tr * &here.im);
        b.assign(ti * &here.re);
        a += &b;
        a *= k as u32;
        a -= &prev.im;
        std::mem::swap(&mut prev.im, &mut a);
        std::mem::swap(&mut prev, &mut here);
        out.push(out_of(&here));
    }
    Some(out)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::numeric::bessel::bessel_j_upto;

    fn one(prec: u32) -> Cx {
        Cx::new(Float::with_val(prec, 1), Float::new(prec))
    }

    fn parse(s: &str, prec: u32) -> Float {
        Float::with_val(prec, Float::parse(s).unwrap())
    }

    #[test]
    fn real_part_is_the_bessel_function() {
        // On the real axis Re H_n = J_n, computed independently by bessel.rs
        // (itself checked against mpmath there).
        let prec = 200;
        for x in ["120.5", "900"] {
            let z = Cx::new(parse(x, prec), Float::new(prec));
            let h = hankel_upto(100, &z, &one(prec), prec).unwrap();
            let j = bessel_j_upto(100, &z.re, prec);
            for (k, (hk, jk)) in h.iter().zip(&j).enumerate() {
                let d = Float::with_val(prec, &hk.re - jk).abs().to_f64();
                assert!(d < 1e-55, "x = {x}, order {k}: {d}");
            }
        }
    }

    #[test]
    fn wronskian_on_the_real_axis() {
        // J_{n+1} Y_n - J_n Y_{n+1} = 2 / (pi x) (DLMF 10.5.2).
        let prec = 200;
        let x = parse("300.25", prec);
        let z = Cx::new(x.clone(), Float::new(prec));
        let h = hankel_upto(250, &z, &one(prec), prec).unwrap();
        let want = Float::with_val(prec, 2u32 / (Float::with_val(prec, Constant::Pi) * &x));
        for k in [0usize, 17, 120, 249] {
            let mut w = Float::with_val(prec, &h[k + 1].re * &h[k].im);
            w -= Float::with_val(prec, &h[k].re * &h[k + 1].im);
            let d = (w - &want).abs().to_f64();
            assert!(d < 1e-55, "order {k}: {d}");
        }
    }

    #[test]
    fn reference_values_off_the_axis() {
        // mpmath 1.3.0, mpmath.hankel1(n, mpc(150, 40)) at mp.dps = 80, quoted
        // to 40 digits (at dps = 40 mpmath's own J + iY loses a dozen digits
        // to cancellation there).
        let prec = 160;
        let z = Cx::new(Float::with_val(prec, 150), Float::with_val(prec, 40));
        let h = hankel_upto(100, &z, &one(prec), prec).unwrap();
        let cases = [
            (
                0usize,
                "-3.852824756571567372553858928878886615581e-20",
                "-2.692552647281209498934473414530230486014e-19",
            ),
            (
                1,
                "-2.695997185958200838176430907648853177963e-19",
                "3.772316396534118361988877093524824641486e-20",
            ),
            (
                100,
                "9.142807551661174349531259632188660978728e-16",
                "-2.972349182078870812919506213860331773695e-15",
            ),
        ];
        for (k, re, im) in cases {
            let dr = Float::with_val(prec, &h[k].re - parse(re, prec))
                .abs()
                .to_f64();
            let di = Float::with_val(prec, &h[k].im - parse(im, prec))
                .abs()
                .to_f64();
            let size = h[k].abs().to_f64();
            assert!(
                dr < 1e-36 * size && di < 1e-36 * size,
                "order {k}: {dr} {di}"
            );
        }
    }
}
