//! loopwise: exact and finite-coupling predictions for loop coefficients of
//! planar N=4 super-Yang-Mills, and order-by-order checks of users' results
//! against them.
//!
//! The modules are the stages of the data flow, each using only those
//! before it: [`exact`] (the ring, power series and coupling conventions),
//! [`input`] (the coefficient language, series files, the catalogue),
//! [`kernel`] (the exact
//! engine), [`numeric`] (MPFR numbers, the finite-coupling engine),
//! [`quantity`] (predictions, exactly and as functions of g), [`check`]
//! (verdicts), [`origin`] (the six-gluon origin), [`fit`] (exact fits), and
//! [`report`] (all printing); [`limits`] holds every limit.
//!
//! The exact engine in a few lines: the cusp anomalous dimension through four
//! loops, in g^2 = lambda/(16 pi^2) (hep-th/0610251).
//!
//! ```
//! use loopwise::kernel::{gamma, Tilt};
//! use rug::Rational;
//!
//! let cusp = Tilt::pi_multiple(&Rational::from((1, 4)))?;
//! let series = gamma(&cusp, 4, &mut |_, _| {})?;
//! assert_eq!(series.coeff(4).to_string(), "-292/315*pi^6 - 32*zeta(3)^2");
//! # Ok::<(), loopwise::Error>(())
//! ```

pub mod check;
pub mod error;
pub mod exact;
pub mod fit;
pub mod input;
pub mod kernel;
pub mod limits;
pub mod numeric;
pub mod origin;
pub mod quantity;
pub mod report;

pub use error::{Error, ErrorKind, Result};
