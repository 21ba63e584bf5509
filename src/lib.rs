//! loopwise: exact and finite-coupling predictions for loop coefficients of
//! planar N=4 super-Yang-Mills, and order-by-order checks of users' results
//! against them.

pub mod catalogue;
pub mod compare;
pub mod convergence;
pub mod coupling;
pub mod error;
pub mod expr;
pub mod finite;
pub mod fit;
pub mod kernel;
pub mod mzv;
pub mod numeric;
pub mod origin;
pub mod origincheck;
pub mod originnum;
pub mod prediction;
pub mod report;
pub mod ring;
pub mod series;
pub mod seriesfile;
pub mod suggest;

pub use error::{Error, ErrorKind, Result};
