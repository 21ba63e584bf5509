//! Exact values: the coefficient ring (rational combinations of pi, odd zeta
//! values and symbols), truncated power series in the coupling over it, and
//! the coupling conventions that rescale loop coefficients.

pub mod coupling;
pub mod powerseries;
pub mod ring;
