//! Printing ring elements: plain text that the coefficient language reads
//! back, and LaTeX for papers. Even powers of pi can be written as even zeta
//! values instead (`--even zeta`), one even zeta times a rational per term.

use std::fmt;

use rug::Rational;

use super::bernoulli::even_zeta_over_pi_power;
use super::{Exact, Monomial};

/// How even powers of pi are written.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq)]
pub enum EvenStyle {
    /// pi^(2n) as it is.
    #[default]
    Pi,
    /// pi^(2n) as zeta(2n) times the rational that makes it equal.
    Zeta,
}

/// The output language.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq)]
pub enum Notation {
    #[default]
    Text,
    Latex,
}

impl Exact {
    /// The value written in the chosen style; terms in canonical order.
    pub fn format(&self, even: EvenStyle, notation: Notation) -> String {
        if self.is_zero() {
            return "0".to_string();
        }
        let mut out = String::new();
        for (i, (m, c)) in self.terms().enumerate() {
            let (c, pi_part) = split_even(m, c, even);
            let negative = c < 0;
            let abs = Rational::from(c.abs_ref());
            match (i, negative) {
                (0, true) => out.push('-'),
                (0, false) => {}
                (_, true) => out.push_str(" - "),
                (_, false) => out.push_str(" + "),
            }
            match notation {
                Notation::Text => write_text_term(&mut out, m, &abs, pi_part),
                Notation::Latex => write_latex_term(&mut out, m, &abs, pi_part),
            }
        }
        out
    }
}

/// The coefficient and, for even style, the zeta(2n) that replaces pi^(2n).
fn split_even(m: &Monomial, c: &Rational, even: EvenStyle) -> (Rational, Option<u32>) {
    let e = m.pi_exponent();
    if even == EvenStyle::Zeta && e > 0 && e % 2 == 0 {
        ((c / even_zeta_over_pi_power(e as u32 / 2)), Some(e as u32))
    } else {
        (c.clone(), None)
    }
}

fn write_text_term(out: &mut String, m: &Monomial, abs: &Rational, even_zeta: Option<u32>) {
    let pi_text = even_zeta.map(|n| format!("zeta({n})"));
    let mut factors = String::new();
    let has_factors = m.write_factors(&mut factors, pi_text.as_deref());
    if !has_factors {
        out.push_str(&abs.to_string());
    } else if *abs == 1 {
        out.push_str(&factors);
    } else {
        out.push_str(&abs.to_string());
        out.push('*');
        out.push_str(&factors);
    }
}

fn write_latex_term(out: &mut String, m: &Monomial, abs: &Rational, even_zeta: Option<u32>) {
    let mut factors: Vec<String> = Vec::new();
    for (name, e) in m.symbols() {
        factors.push(latex_power(&latex_symbol(name), *e as i64));
    }
    match even_zeta {
        Some(n) => factors.push(format!("\\zeta_{{{n}}}")),
        None if m.pi_exponent() != 0 => factors.push(latex_power("\\pi", m.pi_exponent() as i64)),
        None => {}
    }
    for (z, e) in m.zeta_powers() {
        factors.push(latex_power(&format!("\\zeta_{{{z}}}"), e as i64));
    }
    let coefficient = if *abs == 1 && !factors.is_empty() {
        String::new()
    } else if *abs.denom() == 1 {
        abs.numer().to_string()
    } else {
        format!("\\frac{{{}}}{{{}}}", abs.numer(), abs.denom())
    };
    out.push_str(&coefficient);
    if !coefficient.is_empty() && !factors.is_empty() {
        out.push_str("\\,");
    }
    out.push_str(&factors.join("\\,"));
}

fn latex_symbol(name: &str) -> String {
    let split = name
        .find(|c: char| c.is_ascii_digit())
        .unwrap_or(name.len());
    let (stem, digits) = name.split_at(split);
    if digits.is_empty() {
        stem.to_string()
    } else {
        format!("{stem}_{{{digits}}}")
    }
}

fn latex_power(base: &str, e: i64) -> String {
    if e == 1 {
        base.to_string()
    } else {
        format!("{base}^{{{e}}}")
    }
}

impl fmt::Display for Exact {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(&self.format(EvenStyle::Pi, Notation::Text))
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn four_loop_cusp() -> Exact {
        // -(876 zeta(6) + 32 zeta(3)^2), hep-th/0610251.
        let z6 = Exact::zeta(6).unwrap().scale(&Rational::from(-876));
        let z33 = Exact::zeta(3).unwrap().pow(2).scale(&Rational::from(-32));
        &z6 + &z33
    }

    #[test]
    fn text_with_pi_and_with_even_zeta() {
        let x = four_loop_cusp();
        assert_eq!(x.to_string(), "-292/315*pi^6 - 32*zeta(3)^2");
        assert_eq!(
            x.format(EvenStyle::Zeta, Notation::Text),
            "-876*zeta(6) - 32*zeta(3)^2"
        );
    }

    #[test]
    fn latex_form() {
        let x = four_loop_cusp();
        assert_eq!(
            x.format(EvenStyle::Pi, Notation::Latex),
            "-\\frac{292}{315}\\,\\pi^{6} - 32\\,\\zeta_{3}^{2}"
        );
        let y = &Exact::symbol("l1") * &Exact::from(3);
        assert_eq!(y.format(EvenStyle::Pi, Notation::Latex), "3\\,l_{1}");
        assert_eq!(Exact::zero().to_string(), "0");
        assert_eq!(Exact::from(Rational::from((-7, 2))).to_string(), "-7/2");
    }
}
