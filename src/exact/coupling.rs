//! Coupling conventions users bring (docs/conventions.md section 1) and the factor
//! that converts a loop coefficient from one to another.
//!
//! The project's own convention is g^2 = lambda / (16 pi^2); loop order L
//! multiplies g^(2L). With a = lambda/(8 pi^2) = 2 g^2 a coefficient c_L of
//! g^(2L) becomes c_L / 2^L; with lambda itself it becomes c_L / (16 pi^2)^L.

use std::fmt;
use std::str::FromStr;

use crate::error::{Error, Result};

/// The expansion parameter a series is written in.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Default)]
pub enum Coupling {
    /// g^2 = lambda / (16 pi^2), the project's default.
    #[default]
    G2,
    /// a = lambda / (8 pi^2) = 2 g^2.
    A,
    /// The 't Hooft coupling lambda = g_YM^2 N_c.
    Lambda,
}

impl Coupling {
    pub const ALL: [Coupling; 3] = [Coupling::G2, Coupling::A, Coupling::Lambda];

    /// The name used on the command line and in files.
    pub fn name(self) -> &'static str {
        match self {
            Coupling::G2 => "g2",
            Coupling::A => "a",
            Coupling::Lambda => "lambda",
        }
    }

    /// What one loop order multiplies, for people: "g^2", "a", "lambda".
    pub fn symbol(self) -> &'static str {
        match self {
            Coupling::G2 => "g^2",
            Coupling::A => "a",
            Coupling::Lambda => "lambda",
        }
    }

    /// What the convention means, for diagnoses: "a = lambda/(8 pi^2) = 2 g^2".
    pub fn meaning(self) -> &'static str {
        match self {
            Coupling::G2 => "g^2 = lambda/(16 pi^2)",
            Coupling::A => "a = lambda/(8 pi^2) = 2 g^2",
            Coupling::Lambda => "lambda",
        }
    }

    /// The expansion parameter as a multiple of g^2: x = ratio * g^2 with
    /// ratio = (numerator, power of pi^2) meaning numerator * pi^(2 * power).
    /// g2: (1, 0); a: (2, 0); lambda: (16, 1).
    pub fn ratio_to_g2(self) -> (u32, i32) {
        match self {
            Coupling::G2 => (1, 0),
            Coupling::A => (2, 0),
            Coupling::Lambda => (16, 1),
        }
    }
}

impl fmt::Display for Coupling {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(self.name())
    }
}

impl FromStr for Coupling {
    type Err = Error;
    fn from_str(s: &str) -> Result<Self> {
        match s.trim() {
            "g2" | "g^2" => Ok(Coupling::G2),
            "a" => Ok(Coupling::A),
            "lambda" | "λ" => Ok(Coupling::Lambda),
            other => {
                Err(Error::input(format!("unknown coupling convention '{other}': expected g2 (g^2 = lambda/(16 pi^2)), a (a = 2 g^2) or lambda")))
            }
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn names_round_trip() {
        for c in Coupling::ALL {
            assert_eq!(c.name().parse::<Coupling>().unwrap(), c);
        }
        assert!("g".parse::<Coupling>().is_err());
    }
}
