//! Bessel functions of the first kind, J_0..J_n at one real argument, all at
//! once in MPFR: by backward recurrence normalised with the Neumann sum
//! (DLMF 10.74(iv), Abramowitz & Stegun 9.12), or, when x is large against
//! both n and the precision, by the Hankel expansion of J_0 and J_1
//! (DLMF 10.17.3) and forward recurrence, which then costs O(n) instead of
//! O(x). Also the cheap magnitude estimate that decides recurrence start
//! orders and where orders vanish.

use rug::float::Constant;
use rug::{Assign, Float};

/// Natural log of |J_m(x)| as an order-of-magnitude estimate (never used as a
/// value): the Debye form (DLMF 10.19.3) below the turning point m > x, and 0
/// (the bound |J_m| <= 1, DLMF 10.14.1) at or past it. Control logic only.
pub(crate) fn ln_magnitude(m: usize, x: f64) -> f64 {
    let m = m as f64;
    if m == 0.0 {
        return 0.0;
    }
    if x <= 0.0 {
        return f64::NEG_INFINITY;
    }
    if m <= x {
        return 0.0;
    }
    let beta = (m / x).acosh();
    let th = beta.tanh();
    let debye = -m * (beta - th) - 0.5 * (2.0 * std::f64::consts::PI * m * th).ln();
    debye.min(0.0)
}

/// The order at which the backward recurrence starts: far enough above both
/// n and the turning point that J_start(x) lies below the working precision
/// by a margin, so the neglected minimal-solution error is invisible.
fn start_order(n: usize, x: f64, prec: u32) -> usize {
    let target = -(prec as f64) * std::f64::consts::LN_2 - 12.0;
    let mut m = n.max(x.ceil() as usize) + 2;
    let mut step = 1 + m / 16;
    while ln_magnitude(m, x) > target {
        m += step;
        step += step / 2;
    }
    m
}

/// J_0(x), ..., J_n(x) for real x >= 0 at `prec` bits. The result has n + 1
/// entries.
pub fn bessel_j_upto(n: usize, x: &Float, prec: u32) -> Vec<Float> {
    let xf = x.to_f64();
    // The Hankel series' smallest term is about e^(-2x); forward recurrence
    // is stable while the order stays below x.
    let wprec = prec + 16;
    if xf > 0.5 * f64::from(wprec) * std::f64::consts::LN_2 + 16.0 && (n as f64) + 16.0 < 0.8 * xf {
        if let Some(v) = hankel_forward(n, x, prec) {
            return v;
        }
    }
    miller(n, x, prec)
}

/// P and Q of DLMF 10.17.3 for orders 0 and 1 at large x, in one pass over
/// the powers of 1/x, or None if the terms stop decreasing before reaching
/// the working precision.
fn hankel_pq(x: &Float, wprec: u32) -> Option<[(Float, Float); 2]> {
    let inv_x = Float::with_val(wprec, x.recip_ref());
    let eps = Float::with_val(wprec, Float::i_exp(1, -(wprec as i32)));
    let mut out = [
        (Float::with_val(wprec, 1), Float::new(wprec)),
        (Float::with_val(wprec, 1), Float::new(wprec)),
    ];
    let mut terms = [Float::with_val(wprec, 1), Float::with_val(wprec, 1)];
    let mut last = [Float::with_val(wprec, 1), Float::with_val(wprec, 1)];
    let mut done = [false, false];
    for k in 1u32..100_000 {
        for nu in 0..2 {
            if done[nu] {
                continue;
            }
            // a_k(nu) / x^k = a_{k-1} / x^{k-1} * (mu - (2k-1)^2) / (8 k x)
            let mu = 4 * (nu * nu) as i64;
            let odd = (2 * k - 1) as i64;
            let term = &mut terms[nu];
            *term *= mu - odd * odd;
            *term /= 8 * k;
            *term *= &inv_x;
            if term.cmp_abs(&last[nu]) == Some(std::cmp::Ordering::Greater) {
                return None;
            }
            // P = sum (-1)^j a_{2j} / x^{2j}, Q = sum (-1)^j a_{2j+1} / x^{2j+1}
            let (p, q) = &mut out[nu];
            match k % 4 {
                0 => *p += &*term,
                1 => *q += &*term,
                2 => *p -= &*term,
                _ => *q -= &*term,
            }
            if term.cmp_abs(&eps) == Some(std::cmp::Ordering::Less) {
                done[nu] = true;
            }
            last[nu].assign(&*term);
        }
        if done[0] && done[1] {
            return Some(out);
        }
    }
    None
}

fn hankel_forward(n: usize, x: &Float, prec: u32) -> Option<Vec<Float>> {
    let wprec = prec + 16;
    let pi = Float::with_val(wprec, Constant::Pi);
    let amp = Float::with_val(wprec, Float::with_val(wprec, x * &pi) / 2u32).recip_sqrt();
    let mut out: Vec<Float> = Vec::with_capacity(n + 1);
    let pq = hankel_pq(x, wprec)?;
    let mut first = [Float::new(wprec), Float::new(wprec)];
    for (nu, (p, q)) in pq.iter().enumerate() {
        // omega = x - nu pi/2 - pi/4
        let shift = Float::with_val(wprec, &pi * (2 * nu as u32 + 1)) / 4u32;
        let omega = Float::with_val(wprec, x - shift);
        let (sin, cos) = omega.sin_cos(Float::new(wprec));
        let mut v = Float::with_val(wprec, p * &cos);
        v -= Float::with_val(wprec, q * &sin);
        v *= &amp;
        first[nu] = v;
    }
    let [j0, j1] = first;
    let two_over_x = Float::with_val(wprec, 2u32 / Float::with_val(wprec, x));
    let mut prev = j0;
    let mut here = j1;
    out.push(Float::with_val(prec, &prev));
    if n >= 1 {
        out.push(Float::with_val(prec, &here));
    }
    // The factor 2k/x grows by 2/x per order: one addition, not a product.
    let mut factor = Float::new(wprec);
    let mut next = Float::new(wprec);
    for _ in 1..n {
        // J_{k+1} = (2k/x) J_k - J_{k-1}
        factor += &two_over_x;
        next.assign(&factor * &here);
        next -= &prev;
        out.push(Float::with_val(prec, &next));
        std::mem::swap(&mut prev, &mut here);
        std::mem::swap(&mut here, &mut next);
    }
    Some(out)
}

/// Backward recurrence J_{k-1} = (2k/x) J_k - J_{k+1} is stable in the
/// direction of decreasing order (DLMF 10.74(iv)); the unknown scale is fixed
/// by J_0 + 2 (J_2 + J_4 + ...) = 1 (DLMF 10.12.4 at angle 0).
fn miller(n: usize, x: &Float, prec: u32) -> Vec<Float> {
    let mut out: Vec<Float> = (0..=n).map(|_| Float::new(prec)).collect();
    if x.is_zero() {
        out[0].assign(1);
        return out;
    }
    // The recurrence loses about log2 of the growth factor in the
    // normalisation sum; a few extra bits cover it.
    let wprec = prec + 16;
    let xf = x.to_f64();
    let top = start_order(n, xf, wprec);
    let two_over_x = Float::with_val(wprec, 2u32 / Float::with_val(wprec, x));
    let mut above = Float::new(wprec); // J_{k+1}, scaled
    let mut here = Float::with_val(wprec, 1); // J_k, scaled
    let mut next = Float::new(wprec);
    let mut sum = Float::new(wprec);
    let mut factor = Float::new(wprec);
    for k in (1..=top).rev() {
        if k <= n {
            out[k].assign(&here);
        }
        if k % 2 == 0 {
            sum += &here;
        }
        // J_{k-1} = (2k/x) J_k - J_{k+1}
        factor.assign(&two_over_x * k as u32);
        next.assign(&factor * &here);
        next -= &above;
        std::mem::swap(&mut above, &mut here);
        std::mem::swap(&mut here, &mut next);
    }
    out[0].assign(&here);
    sum *= 2u32;
    sum += &here;
    let inv = Float::with_val(wprec, 1u32 / &sum);
    for v in out.iter_mut() {
        *v *= &inv;
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    fn close(a: &Float, b: &str, abs: f64) -> bool {
        let r = Float::with_val(200, Float::parse(b).unwrap());
        let d = Float::with_val(200, a - &r).abs();
        d < abs
    }

    // Reference values from mpmath 1.3.0, mpmath.besselj(n, x) at mp.dps = 40.
    const TABLE: &[(&str, usize, &str)] = &[
        ("0.5", 0, "0.9384698072408129042284046735997126255689"),
        ("0.5", 1, "0.2422684576748738863839545761415316408006"),
        ("0.5", 5, "0.000008053627241357474085978185330309064711833"),
        ("0.5", 12, "1.238382559479932689620412707736431793574e-16"),
        ("0.5", 30, "3.263356828913978498149085413715020571504e-51"),
        ("7.25", 0, "0.2919969241917789975052565742998521689419"),
        ("7.25", 1, "0.06858170065313174453057489697826940557362"),
        ("7.25", 5, "0.3203580732712000963536384737845977377606"),
        ("7.25", 12, "0.003757474774647783845976093142908153179185"),
        ("7.25", 30, "1.479946374354499678630862372242526032311e-16"),
        ("40", 0, "0.007366890584237289553531735691438071378291"),
        ("40", 1, "0.1260383180375849992056027218391718766899"),
        ("40", 5, "0.1225734659771177869886303652650421252197"),
        ("40", 12, "-0.1269779961178480636121922003827782500925"),
        ("40", 30, "-0.1040859497656497269331275741925546683634"),
        ("500", 0, "-0.03410055688073199826512506045189455813144"),
        ("500", 1, "0.01047261347037229284446709475696705457897"),
        ("500", 100, "0.03432953285495152145516604111476245344243"),
        ("500", 400, "-0.02597197267949868124587370346398487682735"),
        ("3000.5", 0, "-0.0127378294877311721365037418248889914031"),
        ("3000.5", 1, "0.00706321016276995713452300254942529517144"),
        (
            "3000.5",
            100,
            "-0.005816843936297108311664284785269628726754",
        ),
        (
            "3000.5",
            400,
            "-0.007117765053528114231864138059783064000652",
        ),
    ];

    #[test]
    fn matches_reference_table() {
        for &(x, n, want) in TABLE {
            let xv = Float::with_val(140, Float::parse(x).unwrap());
            let js = bessel_j_upto(400, &xv, 140);
            // Absolute 1e-38 plus relative 1e-36 for the tiny values.
            let want_abs = Float::with_val(140, Float::parse(want).unwrap())
                .abs()
                .to_f64();
            assert!(
                close(&js[n], want, 1e-38 + 1e-36 * want_abs),
                "J_{n}({x}) = {}",
                js[n]
            );
        }
    }

    #[test]
    fn neumann_sum_of_squares_is_one() {
        // J_0^2 + 2 sum_{k>=1} J_k^2 = 1 (DLMF 10.23.3), independent of the
        // normalisation the recurrence used.
        for x in ["0.001", "3", "95.5", "700"] {
            let xv = Float::with_val(200, Float::parse(x).unwrap());
            let n = 900;
            let js = bessel_j_upto(n, &xv, 200);
            let mut s = Float::with_val(200, &js[0] * &js[0]);
            for j in &js[1..] {
                s += Float::with_val(200, j * j) * 2u32;
            }
            let d = (s - 1u32).abs().to_f64();
            assert!(d < 1e-55, "x = {x}: sum of squares off by {d}");
        }
    }

    #[test]
    fn large_argument_paths_agree() {
        // Hankel plus forward recurrence against backward recurrence where
        // both apply.
        for x in ["150.25", "2500"] {
            let xv = Float::with_val(200, Float::parse(x).unwrap());
            let a = hankel_forward(100, &xv, 200).unwrap();
            let b = miller(100, &xv, 200);
            for (k, (u, v)) in a.iter().zip(&b).enumerate() {
                let d = Float::with_val(200, u - v).abs().to_f64();
                assert!(d < 1e-55, "x = {x}, order {k}: paths differ by {d}");
            }
        }
    }

    #[test]
    fn zero_argument() {
        let js = bessel_j_upto(3, &Float::new(64), 64);
        assert_eq!(js[0], 1);
        assert!(js[1..].iter().all(|v| v.is_zero()));
    }
}
