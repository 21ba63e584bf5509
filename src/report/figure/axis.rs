//! Axis ranges and tick marks: ticks at round numbers (1, 2 or 5 times a
//! power of ten), labelled with as many decimals as the step needs and a
//! true minus sign.

/// Ticks of an axis over `[lo, hi]`: the values and their labels.
pub fn ticks(lo: f64, hi: f64, target: usize) -> Vec<(f64, String)> {
    if !(lo.is_finite() && hi.is_finite()) || hi <= lo {
        return Vec::new();
    }
    let step = nice_step(hi - lo, target);
    let decimals = (-step.log10().floor()).max(0.0) as usize;
    let first = (lo / step).ceil() as i64;
    let last = (hi / step).floor() as i64;
    (first..=last)
        .map(|k| {
            let v = k as f64 * step;
            (v, number(v, decimals))
        })
        .collect()
}

/// The round step (1, 2 or 5 times a power of ten) that gives closest to
/// `target` intervals over `span`.
fn nice_step(span: f64, target: usize) -> f64 {
    let raw = span / target.max(1) as f64;
    let power = 10f64.powf(raw.log10().floor());
    let count = |step: f64| (span / step - target as f64).abs();
    [1.0, 2.0, 5.0, 10.0]
        .iter()
        .map(|m| m * power)
        .fold(power, |best, step| {
            if count(step) < count(best) {
                step
            } else {
                best
            }
        })
}

/// A tick label: fixed decimals, U+2212 for the minus, no negative zero.
fn number(v: f64, decimals: usize) -> String {
    let text = format!("{v:.decimals$}");
    let zero = text
        .trim_start_matches('-')
        .chars()
        .all(|c| c == '0' || c == '.');
    if zero {
        text.trim_start_matches('-').to_string()
    } else {
        text.replace('-', "\u{2212}")
    }
}

/// The y range of a figure: the span of `values` (the finite-coupling
/// curves) with a margin of 5 % on each side; a flat span is widened.
pub fn padded_span(values: impl Iterator<Item = f64>) -> Option<(f64, f64)> {
    let (lo, hi) = values
        .filter(|v| v.is_finite())
        .fold((f64::INFINITY, f64::NEG_INFINITY), |(lo, hi), v| {
            (lo.min(v), hi.max(v))
        });
    if lo > hi {
        return None;
    }
    let pad = if hi > lo {
        0.05 * (hi - lo)
    } else {
        0.5 * lo.abs().max(1.0)
    };
    Some((lo - pad, hi + pad))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn ticks_sit_at_round_numbers() {
        let t = ticks(0.0, 3.0, 6);
        let labels: Vec<&str> = t.iter().map(|(_, l)| l.as_str()).collect();
        assert_eq!(labels, ["0.0", "0.5", "1.0", "1.5", "2.0", "2.5", "3.0"]);
        let t = ticks(-0.13, 2.61, 6);
        let labels: Vec<&str> = t.iter().map(|(_, l)| l.as_str()).collect();
        assert_eq!(labels, ["0.0", "0.5", "1.0", "1.5", "2.0", "2.5"]);
        let t = ticks(-23.0, 41.0, 6);
        let labels: Vec<&str> = t.iter().map(|(_, l)| l.as_str()).collect();
        assert_eq!(
            labels,
            ["\u{2212}20", "\u{2212}10", "0", "10", "20", "30", "40"]
        );
        assert!(ticks(1.0, 1.0, 6).is_empty());
    }

    #[test]
    fn the_span_has_a_margin_and_ignores_non_finite_values() {
        let (lo, hi) = padded_span([0.0, 2.0, f64::NAN, f64::INFINITY].into_iter()).unwrap();
        assert!(
            (lo + 0.1).abs() < 1e-12 && (hi - 2.1).abs() < 1e-12,
            "{lo} {hi}"
        );
        assert_eq!(padded_span([f64::NAN].into_iter()), None);
    }
}
