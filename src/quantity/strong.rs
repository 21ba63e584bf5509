//! Strong-coupling expansions extracted from the numbers: a quantity's
//! high-precision values at large g fitted by
//! F(g) ~ c_1 g + c_0 + c_-1 / g + ... (with ln g terms where asked), each
//! coefficient with an error estimate from varying the number of terms and
//! the range, then offered to [`identify_number`] against a small basis of
//! the constants such expansions are made of.
//!
//! The fit is linear least squares ([`crate::numeric::leastsquares`]) of
//! F(g)/g^lead in the powers of 1/g. For coefficient j the fits with K
//! terms, K > j, are compared: the spread of c_j between the fit on all
//! points, the fits on the upper and lower three quarters of the points, and
//! the fit with K + 1 terms, plus the data errors carried through the fit.
//! The K whose spread and whose neighbour's spread are both smallest is
//! used, and the larger of the two is the error (a plateau of two fits, the
//! usual practice of extrapolation). An asymptotic series fitted this way is
//! limited by the exponentially small terms the model lacks (for the cusp,
//! of order exp(-2 pi g)); the spread sees them when the range is varied.
//!
//! An identification here is numerical: a short integer relation that the
//! digits single out with digits to spare, after allowing for every subset
//! of the basis that was tried. It is evidence, not a derivation.

use rug::ops::Pow;
use rug::Float;

use crate::error::{Error, Result};
use crate::input::catalogue::Status;
use crate::input::expr::Functional;
use crate::numeric::leastsquares::{self, Solution};
use crate::numeric::working_bits;
use crate::numeric::Estimate;
use crate::quantity::finite::{self, uses};
use crate::quantity::identify::identify_number;
use crate::quantity::Quantity;

/// The constants the coefficients are offered to by default, one or two at a
/// time: those of the known expansions (arXiv:0708.3933 for the cusp, the
/// closed forms of the octagon) and their nearest relatives.
pub const DEFAULT_BASIS: &str = "1; pi; 1/pi; 1/pi^2; log(2); log(2)/pi; log(2)/pi^2; log(3); \
log(3)/pi; log(pi); catalan/pi; catalan/pi^2; 3^(1/2); 3^(1/2)/pi";

/// Digits a coefficient needs before an identification is attempted.
const MIN_IDENTIFY_DIGITS: u32 = 6;

/// One term g^power (ln g)^log_power of the expansion.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct Term {
    pub power: i32,
    pub log_power: u32,
}

/// What to fit.
#[derive(Clone, Debug)]
pub struct Request<'a> {
    /// The couplings, ascending, all positive.
    pub couplings: Vec<Float>,
    /// Significant digits of each value.
    pub digits: u32,
    /// The leading power of g.
    pub leading: i32,
    /// Powers of g that also come with a ln g (e.g. 0 for a ln g term).
    pub logs: Vec<i32>,
    /// How many coefficients to report, from the leading one down.
    pub terms: usize,
    /// The constants to identify against, separated by `;`.
    pub basis: &'a str,
}

/// A fitted coefficient.
#[derive(Clone, Debug)]
pub struct Coefficient {
    pub term: Term,
    pub value: Float,
    /// The spread estimate described in the module documentation.
    pub error: Float,
    /// Terms in the fit the value comes from.
    pub fitted_terms: usize,
    /// The identification, when the digits single one out.
    pub identified: Option<Identified>,
    /// The coefficient of the catalogue's strong-coupling formula, when there
    /// is one of the fitted form.
    pub formula: Option<Float>,
}

impl Coefficient {
    /// Significant digits the error leaves (0 when it swamps the value),
    /// counted as every other value with an error is.
    pub fn digits(&self) -> u32 {
        Estimate::new(self.value.clone(), self.error.clone()).digits_supported()
    }
}

/// A numerical identification.
#[derive(Clone, Debug)]
pub struct Identified {
    /// The coefficient in the coefficient language.
    pub expression: String,
    /// Digits trusted in the search.
    pub digits_used: u32,
    /// Digits beyond the relation's information content.
    pub digits_to_spare: i64,
    /// Subsets of the basis searched for this coefficient.
    pub trials: usize,
}

/// The catalogue's formula, for comparison.
#[derive(Clone, Debug)]
pub struct Formula {
    pub text: String,
    pub status: Status,
    pub note: Option<String>,
    /// Whether the formula is of the fitted form (the same fit reproduces
    /// it); if not, its coefficients are not compared.
    pub of_fitted_form: bool,
}

/// The extracted expansion.
#[derive(Clone, Debug)]
pub struct Extraction {
    pub quantity: String,
    pub definition: String,
    pub couplings: Vec<Float>,
    pub digits: u32,
    pub coefficients: Vec<Coefficient>,
    pub formula: Option<Formula>,
    pub basis: String,
}

/// The default range of couplings for a quantity: where the exponentially
/// small corrections lie below the fit's reach. Delta's are of order
/// exp(-8 pi g) at zero tilt and its cost grows as g^3, so it is fitted
/// lower than Gamma, whose corrections are of order exp(-2 pi g) for the
/// cusp.
pub fn default_range(q: &Quantity) -> (f64, f64) {
    if uses(q, Functional::Delta) {
        (2.0, 3.0)
    } else {
        (6.0, 20.0)
    }
}

/// The terms of the model, leading first.
fn model(leading: i32, logs: &[i32], count: usize) -> Vec<Term> {
    let mut out = Vec::new();
    let mut power = leading;
    while out.len() < count {
        if logs.contains(&power) {
            out.push(Term {
                power,
                log_power: 1,
            });
        }
        out.push(Term {
            power,
            log_power: 0,
        });
        power -= 1;
    }
    out.truncate(count);
    out
}

/// Fits and identifies. `progress` hears (values done, values in all).
///
/// Errors: too few points for the terms asked, a coupling that is not
/// positive, and whatever the numerical engine or the identification report.
pub fn extract(
    q: &Quantity,
    request: &Request<'_>,
    progress: &mut dyn FnMut(usize, usize),
) -> Result<Extraction> {
    let points = request.couplings.len();
    let subset = points - points / 4;
    if request.terms == 0 || subset < request.terms + 2 {
        return Err(Error::range(format!(
            "{} coefficients need at least {} points ({} given): the error estimate refits on three quarters of them with a term more",
            request.terms,
            4 * (request.terms + 2) / 3 + 1,
            points
        )));
    }
    if request.couplings.iter().any(|g| *g <= 0) {
        return Err(Error::range("a strong-coupling fit needs couplings g > 0"));
    }
    let values = finite::values(q, &request.couplings, request.digits, progress)?;
    let prec = working_bits(request.digits) + 128;
    let max_terms = subset - 1;
    let terms = model(request.leading, &request.logs, max_terms + 1);
    let data = Data::new(&request.couplings, &values, request.leading, prec);
    let fits = Fits::new(&data, &terms, max_terms, prec)?;
    let formula = formula_fit(q, &data, &terms, request.terms, prec)?;
    let mut coefficients = Vec::new();
    for j in 0..request.terms {
        let (k, value, error) = fits.best(j, &data.errors);
        let mut c = Coefficient {
            term: terms[j],
            value,
            error,
            fitted_terms: k,
            identified: None,
            formula: formula.as_ref().and_then(|(f, c)| {
                // A term the formula lacks is unknown, not zero: it is not compared.
                let present = !c[j].is_zero()
                    && Float::with_val(prec, c[j].abs_ref()).log2() > -(prec as i32 / 3);
                (f.of_fitted_form && present).then(|| c[j].clone())
            }),
        };
        c.identified = identification(&c, request.basis)?;
        coefficients.push(c);
    }
    Ok(Extraction {
        quantity: q.label.clone(),
        definition: q.definition.clone(),
        couplings: request.couplings.clone(),
        digits: request.digits,
        coefficients,
        formula: formula.map(|(f, _)| f),
        basis: request.basis.to_string(),
    })
}

/// The fitted data: y_i = F(g_i) / g_i^lead with its errors.
struct Data {
    g: Vec<Float>,
    y: Vec<Float>,
    errors: Vec<Float>,
    leading: i32,
}

impl Data {
    fn new(couplings: &[Float], values: &[Estimate], leading: i32, prec: u32) -> Data {
        let scale = |g: &Float| Float::with_val(prec, g).pow(leading);
        Data {
            g: couplings.iter().map(|g| Float::with_val(prec, g)).collect(),
            y: couplings
                .iter()
                .zip(values)
                .map(|(g, v)| Float::with_val(prec, &v.value) / scale(g))
                .collect(),
            errors: couplings
                .iter()
                .zip(values)
                .map(|(g, v)| Float::with_val(prec, &v.error) / scale(g))
                .collect(),
            leading,
        }
    }

    /// The design matrix of the first `k` terms on points `range`.
    fn design(&self, terms: &[Term], range: std::ops::Range<usize>) -> Vec<Vec<Float>> {
        self.g[range]
            .iter()
            .map(|g| {
                let ln = Float::with_val(g.prec(), g.ln_ref());
                terms
                    .iter()
                    .map(|t| {
                        let p = Float::with_val(g.prec(), g).pow(t.power - self.leading);
                        p * Float::with_val(g.prec(), ln.clone().pow(t.log_power))
                    })
                    .collect()
            })
            .collect()
    }

    fn fit(
        &self,
        y: &[Float],
        terms: &[Term],
        range: std::ops::Range<usize>,
        prec: u32,
    ) -> Result<Solution> {
        leastsquares::solve(&self.design(terms, range.clone()), &y[range], prec)
    }
}

/// Every fit the error estimate compares: all points with K terms
/// (K = 1 ..= max + 1), the upper and lower three quarters with K terms.
struct Fits {
    all: Vec<Solution>,
    upper: Vec<Solution>,
    lower: Vec<Solution>,
}

impl Fits {
    fn new(data: &Data, terms: &[Term], max: usize, prec: u32) -> Result<Fits> {
        let n = data.g.len();
        let cut = n / 4;
        let mut fits = Fits {
            all: Vec::new(),
            upper: Vec::new(),
            lower: Vec::new(),
        };
        for k in 1..=max + 1 {
            fits.all.push(data.fit(&data.y, &terms[..k], 0..n, prec)?);
            if k <= max {
                fits.upper
                    .push(data.fit(&data.y, &terms[..k], cut..n, prec)?);
                fits.lower
                    .push(data.fit(&data.y, &terms[..k], 0..n - cut, prec)?);
            }
        }
        Ok(fits)
    }

    /// The spread of coefficient j in the K-term fit (index K - 1).
    fn spread(&self, j: usize, k: usize, errors: &[Float]) -> Float {
        let c = &self.all[k - 1].coefficients[j];
        let mut worst = Float::with_val(c.prec(), 0);
        for other in [
            &self.all[k].coefficients[j],
            &self.upper[k - 1].coefficients[j],
            &self.lower[k - 1].coefficients[j],
        ] {
            worst = worst.max(&Float::with_val(c.prec(), c - other).abs());
        }
        worst + self.all[k - 1].propagated(j, errors)
    }

    /// (terms, value, error) of coefficient j from the best plateau.
    fn best(&self, j: usize, errors: &[Float]) -> (usize, Float, Float) {
        let max = self.upper.len();
        let mut best: Option<(usize, Float)> = None;
        for k in (j + 1)..=max {
            let here = self.spread(j, k, errors);
            let score = if k < max {
                here.max(&self.spread(j, k + 1, errors))
            } else {
                here
            };
            if best.as_ref().is_none_or(|(_, s)| score < *s) {
                best = Some((k, score));
            }
        }
        let (k, error) = best.expect("at least one fit has coefficient j");
        (k, self.all[k - 1].coefficients[j].clone(), error)
    }
}

/// The catalogue formula fitted the same way, with its coefficients, when
/// the quantity has one.
fn formula_fit(
    q: &Quantity,
    data: &Data,
    terms: &[Term],
    wanted: usize,
    prec: u32,
) -> Result<Option<(Formula, Vec<Float>)>> {
    let Some(sc) = q.entry.as_ref().and_then(|e| e.strong_coupling.as_ref()) else {
        return Ok(None);
    };
    let mut y = Vec::with_capacity(data.g.len());
    for g in &data.g {
        let v = finite::strong_coupling(q, g, prec)?
            .ok_or_else(|| Error::numeric("the strong-coupling formula has no value"))?;
        y.push(v / Float::with_val(prec, g).pow(data.leading));
    }
    let n = data.g.len();
    let k = (wanted + 2).min(n);
    let fit = data.fit(&y, &terms[..k], 0..n, prec)?;
    // Of the fitted form when the fit leaves no residual beyond rounding.
    let design = data.design(&terms[..k], 0..n);
    let tolerance = Float::with_val(prec, Float::i_exp(1, -(prec as i32) / 2));
    let of_fitted_form = design.iter().zip(&y).all(|(row, yi)| {
        let mut s = Float::with_val(prec, -yi);
        for (x, c) in row.iter().zip(&fit.coefficients) {
            s += Float::with_val(prec, x * c);
        }
        s.abs() <= Float::with_val(prec, yi.abs_ref()).max(&Float::with_val(prec, 1)) * &tolerance
    });
    Ok(Some((
        Formula {
            text: sc.formula.clone(),
            status: sc.status,
            note: sc.note.clone(),
            of_fitted_form,
        },
        fit.coefficients,
    )))
}

/// Tries the basis one and two elements at a time; believes the relation
/// with the most digits to spare once the subsets tried are allowed for.
fn identification(c: &Coefficient, basis: &str) -> Result<Option<Identified>> {
    let digits = c.digits().min(crate::limits::MAX_IDENTIFY_DIGITS);
    if digits < MIN_IDENTIFY_DIGITS {
        return Ok(None);
    }
    let elements: Vec<&str> = basis.split(';').filter(|e| !e.trim().is_empty()).collect();
    let mut subsets: Vec<String> = elements.iter().map(|e| e.to_string()).collect();
    for (a, first) in elements.iter().enumerate() {
        for second in &elements[a + 1..] {
            subsets.push(format!("{first}; {second}"));
        }
    }
    let singles = elements.len();
    let mut best: Option<Identified> = None;
    for (tried, subset) in subsets.iter().enumerate() {
        // The pairs are searched only when no single element explains the
        // value; each subset searched is another chance of a lucky relation,
        // and log10(subsets searched) more digits keep the overall chance
        // where one search keeps it.
        if tried == singles && best.is_some() {
            break;
        }
        let trials = if tried < singles {
            singles
        } else {
            subsets.len()
        };
        let margin = (trials as f64).log10().ceil() as i64;
        let result = identify_number(&c.value, digits, "coefficient", subset)?;
        if let (Some(found), Some(spare)) = (result.found, result.digits_to_spare) {
            let enough = spare - margin >= crate::numeric::pslq::MIN_SPARE_DIGITS;
            if enough && best.as_ref().is_none_or(|b| spare > b.digits_to_spare) {
                best = Some(Identified {
                    expression: found.expression,
                    digits_used: result.digits_used,
                    digits_to_spare: spare - margin,
                    trials,
                });
            }
        }
    }
    Ok(best)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_model_puts_each_log_before_its_power() {
        let t = model(1, &[0], 4);
        let pairs: Vec<(i32, u32)> = t.iter().map(|t| (t.power, t.log_power)).collect();
        assert_eq!(pairs, vec![(1, 0), (0, 1), (0, 0), (-1, 0)]);
    }
}
