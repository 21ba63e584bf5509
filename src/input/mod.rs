//! Everything users hand in, read and checked before any work starts: the
//! coefficient language (expressions with spans), the YAML series files, the
//! catalogue of named predictions, and the "did you mean" suggestions.

pub mod catalogue;
pub mod expr;
pub mod seriesfile;
pub mod suggest;
