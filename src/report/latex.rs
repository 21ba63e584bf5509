//! Small pieces shared by the LaTeX printers: escaping text and breaking a
//! long sum over several lines of an aligned block, so that a table cell of a
//! thirty-loop coefficient still fits a page width.

/// Escapes the characters LaTeX treats specially in running text.
pub fn escape(text: &str) -> String {
    let mut out = String::with_capacity(text.len());
    for c in text.chars() {
        match c {
            '\\' => out.push_str("\\textbackslash{}"),
            '&' | '%' | '$' | '#' | '_' | '{' | '}' => {
                out.push('\\');
                out.push(c);
            }
            '~' => out.push_str("\\textasciitilde{}"),
            '^' => out.push_str("\\textasciicircum{}"),
            other => out.push(other),
        }
    }
    out
}

/// Math for a table cell: one line when short, otherwise an aligned block
/// with `per_line` terms on each line.
pub fn math_cell(sum: &str, per_line: usize) -> String {
    let terms = split_terms(sum);
    if terms.len() <= per_line {
        return format!("${sum}$");
    }
    let lines: Vec<String> = terms
        .chunks(per_line)
        .map(|c| format!("&{}", c.concat()))
        .collect();
    format!(
        "$\\begin{{aligned}}[t]{}\\end{{aligned}}$",
        lines.join("\\\\")
    )
}

/// Splits "a - b + c" into ["a", " - b", " + c"] at the top-level signs the
/// ring's printer writes between terms.
fn split_terms(sum: &str) -> Vec<String> {
    let mut terms = Vec::new();
    let mut current = String::new();
    let mut rest = sum;
    while !rest.is_empty() {
        let next = [" + ", " - "].iter().filter_map(|sep| rest.find(sep)).min();
        match next {
            Some(0) => {
                current.push_str(&rest[..3]);
                rest = &rest[3..];
            }
            Some(k) => {
                current.push_str(&rest[..k]);
                terms.push(std::mem::take(&mut current));
                rest = &rest[k..];
            }
            None => {
                current.push_str(rest);
                rest = "";
            }
        }
    }
    if !current.is_empty() {
        terms.push(current);
    }
    terms
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn long_sums_break_into_lines() {
        assert_eq!(math_cell("a - b", 3), "$a - b$");
        assert_eq!(
            math_cell("-a - b + c - d", 2),
            "$\\begin{aligned}[t]&-a - b\\\\& + c - d\\end{aligned}$"
        );
        assert_eq!(escape("a_b & 50%"), "a\\_b \\& 50\\%");
    }
}
