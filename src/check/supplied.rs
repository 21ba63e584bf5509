//! A user's coefficient as the comparator sees it: exact when it lies in the
//! exact ring (rationals, pi, zeta values, declared symbols), otherwise a
//! number with an uncertainty (decimals, logarithms, Catalan's constant,
//! multiple zeta values), evaluated at the working precision.

use crate::error::{Error, Result};
use crate::exact::ring::Exact;
use crate::input::expr::Node;
use crate::input::seriesfile::Located;
use crate::numeric::evaluate::{self, needs_numbers, written_digits, Context};
use crate::numeric::Estimate;
use crate::quantity::exact_constant;

/// One supplied coefficient.
#[derive(Clone, Debug)]
pub enum Supplied {
    Exact(Exact),
    Number {
        approx: Estimate,
        /// Significant digits the user wrote, when the value came from a
        /// decimal; caps how many digits can be said to agree.
        written: Option<u32>,
        /// The text as written, for reports.
        text: String,
    },
}

/// Reads a located coefficient: exact if possible, numerical otherwise.
pub fn read(located: &Located, origin: &str, prec: u32) -> Result<Supplied> {
    if !needs_numbers(&located.expr) {
        return Ok(Supplied::Exact(exact_constant(
            &located.text,
            origin,
            Some(&located.site),
            &located.expr,
        )?));
    }
    read_number(located, origin, prec)
}

/// Reads a located coefficient as a number, whatever it holds.
pub fn read_number(located: &Located, origin: &str, prec: u32) -> Result<Supplied> {
    let mut ctx = Context::new(prec);
    let mzv = |s: &[u32], p: u32| crate::numeric::mzv::mzv(s, p);
    ctx.mzv = Some(&mzv);
    let approx = evaluate::evaluate(&located.expr, &mut ctx)
        .map_err(|(span, msg)| located.error_at(origin, span, &msg))?;
    let written = match &located.expr.node {
        Node::Decimal { text, .. } => Some(written_digits(text)),
        Node::Neg(inner) => match &inner.node {
            Node::Decimal { text, .. } => Some(written_digits(text)),
            _ => None,
        },
        _ => None,
    };
    Ok(Supplied::Number {
        approx,
        written,
        text: located.text.trim().to_string(),
    })
}

impl Supplied {
    /// The value as a number at `prec` bits (exact values carry no uncertainty).
    pub fn approx(&self, prec: u32) -> Result<Estimate> {
        match self {
            Supplied::Exact(x) => Ok(Estimate::exact(x.evaluate(prec)?)),
            Supplied::Number { approx, .. } => Ok(approx.clone()),
        }
    }

    pub fn text(&self) -> String {
        match self {
            Supplied::Exact(x) => x.to_string(),
            Supplied::Number { text, .. } => text.clone(),
        }
    }
}

/// A symbol-free check: exact coefficients with kinematic symbols belong to
/// the origin workflow, not to a plain comparison.
pub fn require_constant(s: &Supplied, loop_order: u32, origin: &str) -> Result<()> {
    if let Supplied::Exact(x) = s {
        if let Some((m, _)) = x.terms().find(|(m, _)| !m.symbols().is_empty()) {
            return Err(Error::input(format!(
                "{origin}: order {loop_order} depends on the symbol `{}`; `loopwise check` compares numbers \
                 (polynomials in the logs of cross ratios belong to `loopwise origin`)",
                m.symbols()[0].0
            )));
        }
    }
    Ok(())
}
