//! loopwise: exact and finite-coupling predictions for loop coefficients of
//! planar N=4 super-Yang-Mills, and order-by-order checks of users' results
//! against them.

pub mod coupling;
pub mod error;
pub mod numeric;

pub use error::{Error, ErrorKind, Result};
