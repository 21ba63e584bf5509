//! Messages that point into the source: `origin:line:column: message`, then
//! the offending line with carets under the culprit. Used for parse errors,
//! for the semantic checks done while building the tree, and by evaluators
//! through `expr::error_at`.

use std::sync::Arc;

use crate::error::{Error, ErrorKind};

use super::Span;

/// Where a piece of text sits inside a larger file: the whole file and the
/// byte offset at which the text starts. Messages about the text are then
/// shown on the file's own line, with the file's own line and column, also
/// when the text was folded over lines, quoted or escaped on its way out of
/// the file.
#[derive(Debug, Clone)]
pub struct Site {
    pub file: Arc<str>,
    pub start: usize,
}

impl Site {
    /// Renders a message at a span of `text` (which was read from this site).
    pub fn render(
        &self,
        kind: ErrorKind,
        text: &str,
        origin: &str,
        span: Span,
        message: &str,
    ) -> Error {
        let map = align(&self.file, self.start, text);
        let at = |i: usize| map.get(i).copied().unwrap_or(self.start);
        render(
            kind,
            &self.file,
            origin,
            None,
            Span {
                start: at(span.start),
                end: at(span.end),
            },
            message,
        )
    }
}

/// For each byte offset of `text` (and its end), the offset in `file` where
/// that character was written, for a value whose text starts at `start`.
/// Exact when the value was copied verbatim; for values folded over lines,
/// block scalars and escapes it follows the characters that do match, which
/// keeps errors on the right line.
fn align(file: &str, start: usize, text: &str) -> Vec<usize> {
    const LOOKAHEAD: usize = 64;
    let mut map = vec![start; text.len() + 1];
    let mut at = start.min(file.len());
    for (i, c) in text.char_indices() {
        let mut end = (at + LOOKAHEAD).min(file.len());
        while !file.is_char_boundary(end) {
            end -= 1;
        }
        let window = file.get(at..end).unwrap_or("");
        let found = if c.is_whitespace() {
            window.find(char::is_whitespace)
        } else {
            window.find(c)
        };
        let here = found.map_or(at, |k| at + k);
        for slot in &mut map[i..i + c.len_utf8()] {
            *slot = here;
        }
        if found.is_some() {
            at = here + file[here..].chars().next().map_or(0, char::len_utf8);
        }
    }
    map[text.len()] = at;
    map
}

/// Lines longer than this are shown as a window around the culprit, so a
/// pasted 10,000-character coefficient does not flood the terminal.
const SHOWN_CHARS: usize = 100;

/// Line and column (both from 1, the column counted in characters) of a byte
/// offset, shifted by `place` when the source sits inside a larger file.
pub(crate) fn line_column(
    source: &str,
    offset: usize,
    place: Option<(usize, usize)>,
) -> (usize, usize) {
    let offset = floor_boundary(source, offset);
    let before = &source[..offset];
    let line = 1 + before.matches('\n').count();
    let line_start = before.rfind('\n').map_or(0, |i| i + 1);
    let column = 1 + source[line_start..offset].chars().count();
    match place {
        Some((pl, pc)) if line == 1 => (pl, pc + column - 1),
        Some((pl, _)) => (pl + line - 1, column),
        None => (line, column),
    }
}

fn floor_boundary(source: &str, offset: usize) -> usize {
    let mut at = offset.min(source.len());
    while !source.is_char_boundary(at) {
        at -= 1;
    }
    at
}

pub(crate) fn render(
    kind: ErrorKind,
    source: &str,
    origin: &str,
    place: Option<(usize, usize)>,
    span: Span,
    message: &str,
) -> Error {
    let start = floor_boundary(source, span.start);
    let end = floor_boundary(source, span.end.max(start));
    let (line, column) = line_column(source, start, place);

    let line_start = source[..start].rfind('\n').map_or(0, |i| i + 1);
    let line_end = source[start..]
        .find('\n')
        .map_or(source.len(), |i| start + i);
    let text: Vec<char> = source[line_start..line_end]
        .trim_end_matches('\r')
        .chars()
        .map(|c| if c.is_whitespace() { ' ' } else { c })
        .collect();
    let caret_from = source[line_start..start].chars().count();
    let caret_len = source[start..end.min(line_end)].chars().count().max(1);

    // Window long lines so that the caret stays in view.
    let first = caret_from
        .saturating_sub(SHOWN_CHARS / 2)
        .min(text.len().saturating_sub(SHOWN_CHARS));
    let last = (first + SHOWN_CHARS).min(text.len());
    let mut shown: String = text[first..last].iter().collect();
    let mut caret_at = caret_from - first;
    if first > 0 {
        shown.insert(0, '…');
        caret_at += 1;
    }
    if last < text.len() {
        shown.push('…');
    }
    let caret_len = caret_len.min((SHOWN_CHARS + 1).saturating_sub(caret_at).max(1));

    let number = line.to_string();
    let pad = " ".repeat(number.len());
    Error::new(
        kind,
        format!(
            "{origin}:{line}:{column}: {message}\n{pad} |\n{number} | {shown}\n{pad} | {}{}",
            " ".repeat(caret_at),
            "^".repeat(caret_len)
        ),
    )
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn columns_count_characters_and_shift_by_place() {
        let src = "ζ(3) +\n  x";
        assert_eq!(line_column(src, 0, None), (1, 1));
        assert_eq!(line_column(src, "ζ(3) ".len(), None), (1, 6));
        assert_eq!(line_column(src, src.len() - 1, None), (2, 3));
        assert_eq!(line_column(src, "ζ(3) ".len(), Some((7, 12))), (7, 17));
        assert_eq!(line_column(src, src.len() - 1, Some((7, 12))), (8, 3));
    }

    #[test]
    fn caret_sits_under_the_span() {
        let e = render(
            ErrorKind::Input,
            "1 + foo * 2",
            "<argument>",
            None,
            Span { start: 4, end: 7 },
            "unknown symbol",
        );
        assert_eq!(
            e.message(),
            "<argument>:1:5: unknown symbol\n  |\n1 | 1 + foo * 2\n  |     ^^^"
        );
    }

    #[test]
    fn long_lines_are_windowed() {
        let src = format!("{}$", "1+".repeat(200));
        let e = render(
            ErrorKind::Parse,
            &src,
            "f",
            None,
            Span {
                start: 400,
                end: 401,
            },
            "bad",
        );
        let lines: Vec<&str> = e.message().lines().collect();
        assert!(lines[2].chars().count() < 120);
        let caret = lines[3].find('^').unwrap();
        assert_eq!(lines[2].chars().nth(caret).unwrap(), '$');
    }
}
