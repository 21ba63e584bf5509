//! loopwise: exact and finite-coupling predictions for loop coefficients of
//! planar N=4 super-Yang-Mills, and order-by-order checks of users' results
//! against them.

pub mod convergence;
pub mod coupling;
pub mod error;
pub mod mzv;

pub use error::{Error, ErrorKind, Result};
