//! "Did you mean ...?": the closest known names to a mistyped one, by edit
//! distance, for unknown quantities, keys and options.

/// Levenshtein distance between two strings, by characters (common practice).
pub fn edit_distance(a: &str, b: &str) -> usize {
    let b: Vec<char> = b.chars().collect();
    let mut row: Vec<usize> = (0..=b.len()).collect();
    for (i, ca) in a.chars().enumerate() {
        let mut diagonal = row[0];
        row[0] = i + 1;
        for (j, &cb) in b.iter().enumerate() {
            let next = (row[j + 1] + 1)
                .min(row[j] + 1)
                .min(diagonal + usize::from(ca != cb));
            diagonal = row[j + 1];
            row[j + 1] = next;
        }
    }
    row[b.len()]
}

/// The candidates within a distance that scales with the length, closest first.
pub fn closest<'a>(word: &str, candidates: impl IntoIterator<Item = &'a str>) -> Vec<&'a str> {
    let limit = (word.chars().count() / 3).max(2);
    let lower = word.to_lowercase();
    let mut scored: Vec<(usize, &str)> = candidates
        .into_iter()
        .map(|c| (edit_distance(&lower, &c.to_lowercase()), c))
        .filter(|(d, c)| *d <= limit || c.to_lowercase().starts_with(&lower) && !lower.is_empty())
        .collect();
    scored.sort();
    scored.into_iter().map(|(_, c)| c).collect()
}

/// " (did you mean `a` or `b`?)", or nothing when no candidate is close.
pub fn did_you_mean<'a>(word: &str, candidates: impl IntoIterator<Item = &'a str>) -> String {
    let close = closest(word, candidates);
    match close.as_slice() {
        [] => String::new(),
        [one] => format!(" (did you mean `{one}`?)"),
        [one, two, ..] => format!(" (did you mean `{one}` or `{two}`?)"),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn distances() {
        assert_eq!(edit_distance("kitten", "sitting"), 3);
        assert_eq!(edit_distance("", "abc"), 3);
        assert_eq!(edit_distance("octagon", "octagon"), 0);
    }

    #[test]
    fn suggestions() {
        let names = ["cusp", "octagon", "hexagon", "octagon-constant"];
        assert_eq!(closest("octagn", names)[0], "octagon");
        assert_eq!(did_you_mean("cups", names), " (did you mean `cusp`?)");
        assert_eq!(did_you_mean("zzzzzzzz", names), "");
    }
}
