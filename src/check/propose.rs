//! `check --identify`: for every numerical entry that agrees with its
//! prediction, an exact form found by integer-relation search in the weight
//! basis of the predicted coefficient ([`crate::quantity::identify`]). The
//! search never sees the prediction itself, so a proposal is independent
//! evidence, and it is labelled as numerical identification.

use super::{Comparison, Supplied, Verdict};
use crate::error::Result;
use crate::input::catalogue::Catalogue;
use crate::quantity::identify::{identify, Identification, Request};

/// The outcome for one agreeing numerical entry.
#[derive(Clone, Debug)]
pub struct Proposal {
    pub loop_order: u32,
    /// The identification, or why none was attempted.
    pub outcome: std::result::Result<Identification, String>,
}

/// Proposals for every order whose numerical value agrees.
pub fn propose(c: &Comparison, catalogue: &Catalogue) -> Result<Vec<Proposal>> {
    let mut out = Vec::new();
    for o in &c.orders {
        let (Some(Supplied::Number { text, .. }), Some(predicted)) = (&o.supplied, &o.predicted)
        else {
            continue;
        };
        if !matches!(o.verdict, Verdict::AgreesNumerically { .. }) {
            continue;
        }
        let weights = predicted.weights();
        let outcome = match (weights.first(), weights.last()) {
            (Some(&low), Some(&high))
                if low >= 0 && high <= i64::from(crate::limits::MAX_IDENTIFY_WEIGHT) =>
            {
                let request = Request {
                    value: text,
                    digits: None,
                    weight: Some(high as u32),
                    with_lower: low < high,
                    basis: None,
                };
                identify(&request, catalogue).map_err(|e| e.message().to_string())
            }
            _ => Err(format!(
                "the prediction's weights {weights:?} lie outside the weight bases (0 to {})",
                crate::limits::MAX_IDENTIFY_WEIGHT
            )),
        };
        out.push(Proposal {
            loop_order: o.loop_order,
            outcome,
        });
    }
    Ok(out)
}
