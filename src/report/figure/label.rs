//! Typeset labels: the project's names and formulas (ASCII in the
//! coefficient language) turned into rich text with Greek letters, a true
//! minus sign and raised or lowered runs, and that text written as SVG
//! `<tspan>`s. Digit exponents become Unicode superscript digits (g², π⁴),
//! which every renderer and the bundled font draw; other raised or lowered
//! runs (g^(2L), the subscript of Γ_cusp) become tspans with
//! `baseline-shift`.

use super::font;

/// Where a run sits relative to the baseline.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Shift {
    Base,
    Super,
    Sub,
}

/// Size of a raised or lowered run relative to the text around it.
pub const SHIFTED_SIZE: f64 = 0.7;

/// Text made of runs, each on the baseline, raised or lowered.
#[derive(Clone, Debug, Default, PartialEq)]
pub struct Rich {
    pub runs: Vec<(String, Shift)>,
}

impl Rich {
    pub fn plain(text: &str) -> Rich {
        let mut r = Rich::default();
        r.push(text, Shift::Base);
        r
    }

    /// Appends `text` at `shift`, merging with the last run when they match.
    pub fn push(&mut self, text: &str, shift: Shift) {
        if text.is_empty() {
            return;
        }
        match self.runs.last_mut() {
            Some((last, s)) if *s == shift => last.push_str(text),
            _ => self.runs.push((text.to_string(), shift)),
        }
    }

    pub fn append(&mut self, other: &Rich) {
        for (t, s) in &other.runs {
            self.push(t, *s);
        }
    }

    pub fn then(mut self, text: &str) -> Rich {
        self.push(text, Shift::Base);
        self
    }

    /// The characters without their placement (what a text extractor reads).
    pub fn text(&self) -> String {
        self.runs.iter().map(|(t, _)| t.as_str()).collect()
    }

    /// Width in user units at font size `size`, from the bundled font's advances.
    pub fn width(&self, size: f64) -> f64 {
        self.runs
            .iter()
            .map(|(t, s)| {
                let scale = if *s == Shift::Base { 1.0 } else { SHIFTED_SIZE };
                font::advance(t, size * scale)
            })
            .sum()
    }

    /// The content of an SVG `<text>` element: escaped text, shifted runs as tspans.
    pub fn svg(&self) -> String {
        let mut out = String::new();
        for (t, s) in &self.runs {
            match s {
                Shift::Base => out.push_str(&escape(t)),
                Shift::Super | Shift::Sub => {
                    let shift = if *s == Shift::Super { "super" } else { "sub" };
                    out.push_str(&format!(
                        "<tspan baseline-shift=\"{shift}\" font-size=\"{}%\">{}</tspan>",
                        (SHIFTED_SIZE * 100.0).round(),
                        escape(t)
                    ));
                }
            }
        }
        out
    }
}

/// Escapes the characters XML reserves.
pub fn escape(text: &str) -> String {
    let mut out = String::with_capacity(text.len());
    for c in text.chars() {
        match c {
            '&' => out.push_str("&amp;"),
            '<' => out.push_str("&lt;"),
            '>' => out.push_str("&gt;"),
            '"' => out.push_str("&quot;"),
            _ => out.push(c),
        }
    }
    out
}

/// The Unicode superscript of a digit or sign, where there is one.
fn superscript(c: char) -> Option<char> {
    Some(match c {
        '0' => '⁰',
        '1' => '¹',
        '2' => '²',
        '3' => '³',
        '4' => '⁴',
        '5' => '⁵',
        '6' => '⁶',
        '7' => '⁷',
        '8' => '⁸',
        '9' => '⁹',
        '-' | '\u{2212}' => '⁻',
        '+' => '⁺',
        _ => return None,
    })
}

/// The printed form of a name of the coefficient language: functionals,
/// constants and Greek letter names as their letters.
fn name(word: &str) -> Option<&'static str> {
    const GREEK: [(&str, &str); 27] = [
        ("alpha", "α"),
        ("beta", "β"),
        ("gamma", "Γ"),
        ("delta", "Δ"),
        ("epsilon", "ε"),
        ("zeta", "ζ"),
        ("eta", "η"),
        ("theta", "θ"),
        ("iota", "ι"),
        ("kappa", "κ"),
        ("lambda", "λ"),
        ("mu", "μ"),
        ("nu", "ν"),
        ("xi", "ξ"),
        ("pi", "π"),
        ("rho", "ρ"),
        ("sigma", "σ"),
        ("tau", "τ"),
        ("upsilon", "υ"),
        ("phi", "φ"),
        ("chi", "χ"),
        ("psi", "ψ"),
        ("omega", "ω"),
        // Catalan's constant, G in the handbooks (DLMF 25.11.40).
        ("catalan", "G"),
        ("c2", "cos²α"),
        ("sqrt", "√"),
        ("ln", "ln"),
    ];
    let lower = word.to_ascii_lowercase();
    // The language's functional and constant names are case-insensitive;
    // a symbol spelled with a capital (`Lambda`) is still the letter.
    GREEK.iter().find(|(w, _)| *w == lower).map(|(_, g)| *g)
}

#[derive(Debug, PartialEq)]
enum Token {
    Number(String),
    Word(String),
    Op(char),
    Open,
    Close,
}

fn tokens(text: &str) -> Vec<Token> {
    let chars: Vec<char> = text.chars().collect();
    let mut out = Vec::new();
    let mut i = 0;
    while i < chars.len() {
        let c = chars[i];
        if c.is_ascii_digit() || (c == '.' && chars.get(i + 1).is_some_and(char::is_ascii_digit)) {
            let start = i;
            while i < chars.len() && (chars[i].is_ascii_digit() || chars[i] == '.') {
                i += 1;
            }
            out.push(Token::Number(chars[start..i].iter().collect()));
        } else if c.is_alphabetic() || c == '_' {
            let start = i;
            // A hyphen glued between letters belongs to a catalogue name
            // (`scaling-function`); a difference of symbols is printed the same.
            let glued = |k: usize| {
                chars[k] == '-'
                    && k > start
                    && chars[k - 1].is_alphabetic()
                    && chars.get(k + 1).is_some_and(|c| c.is_alphabetic())
            };
            while i < chars.len() && (chars[i].is_alphanumeric() || chars[i] == '_' || glued(i)) {
                i += 1;
            }
            out.push(Token::Word(chars[start..i].iter().collect()));
        } else if c == '*' && chars.get(i + 1) == Some(&'*') {
            out.push(Token::Op('^'));
            i += 2;
        } else {
            match c {
                '(' | '[' => out.push(Token::Open),
                ')' | ']' => out.push(Token::Close),
                c if c.is_whitespace() => {}
                c => out.push(Token::Op(c)),
            }
            i += 1;
        }
    }
    out
}

/// Typesets a formula of the coefficient language (or any name) for a
/// figure: `Gamma(pi/4) - 4*g^2` becomes Γ(π/4) − 4g², `Delta(c2=1/3)`
/// Δ(cos²α = 1/3). Text it does not recognise is kept as written.
pub fn typeset(text: &str) -> Rich {
    let toks = tokens(text);
    let mut out = Rich::default();
    let mut i = 0;
    write_tokens(&toks, &mut i, &mut out, Shift::Base, false);
    out
}

/// Writes tokens from `*i` on; inside a group (`nested`) it stops after
/// the matching close bracket.
fn write_tokens(toks: &[Token], i: &mut usize, out: &mut Rich, shift: Shift, nested: bool) {
    // Whether the previous token ends an operand: decides whether `-` is a
    // binary minus (spaced) or a sign, and whether `*` can be left out.
    let mut after_operand = false;
    let mut after_number = false;
    // A number right after `/` is a divisor: `/2*Gamma` keeps its product sign.
    let mut divided = false;
    while *i < toks.len() {
        let tok = &toks[*i];
        *i += 1;
        match tok {
            Token::Number(n) => {
                out.push(n, shift);
                after_operand = true;
                after_number = !divided;
                divided = false;
                continue;
            }
            Token::Word(w) => {
                let printed = name(w).map_or_else(|| w.clone(), str::to_string);
                out.push(&printed, shift);
            }
            Token::Open => {
                out.push("(", shift);
                write_tokens(toks, i, out, shift, true);
                out.push(")", shift);
            }
            Token::Close => {
                if nested {
                    return;
                }
                out.push(")", shift);
            }
            Token::Op('^') => {
                exponent(toks, i, out, shift);
            }
            Token::Op('*') | Token::Op('×') | Token::Op('·') => {
                // A number times a name or bracket reads as juxtaposition (4g²);
                // anything else keeps a visible product sign.
                let next_is_factor = matches!(toks.get(*i), Some(Token::Word(_) | Token::Open));
                if !(after_number && next_is_factor) {
                    out.push("·", shift);
                }
                after_operand = false;
                after_number = false;
                continue;
            }
            Token::Op(c @ ('-' | '\u{2212}' | '+')) => {
                let sign = if *c == '+' { "+" } else { "\u{2212}" };
                if after_operand && shift == Shift::Base {
                    out.push(&format!(" {sign} "), shift);
                } else {
                    out.push(sign, shift);
                }
                after_operand = false;
                after_number = false;
                continue;
            }
            Token::Op('=') => {
                out.push(if shift == Shift::Base { " = " } else { "=" }, shift);
                after_operand = false;
                after_number = false;
                continue;
            }
            Token::Op(c) => {
                out.push(&c.to_string(), shift);
                after_operand = false;
                after_number = false;
                divided = *c == '/';
                continue;
            }
        }
        after_operand = true;
        after_number = false;
        divided = false;
    }
}

/// Writes the exponent after a `^`: digits as superscript characters, a
/// bracket or a name as a raised run (the bracket dropped, as in print).
fn exponent(toks: &[Token], i: &mut usize, out: &mut Rich, shift: Shift) {
    let raised = if shift == Shift::Base {
        Shift::Super
    } else {
        shift
    };
    match toks.get(*i) {
        Some(Token::Number(n)) if n.chars().all(|c| superscript(c).is_some()) => {
            *i += 1;
            let sup: String = n.chars().filter_map(superscript).collect();
            out.push(&sup, shift);
        }
        Some(Token::Op('-')) if matches!(toks.get(*i + 1), Some(Token::Number(n)) if n.chars().all(|c| c.is_ascii_digit())) =>
        {
            let Some(Token::Number(n)) = toks.get(*i + 1) else {
                unreachable!("matched above")
            };
            *i += 2;
            let sup: String = std::iter::once('⁻')
                .chain(n.chars().filter_map(superscript))
                .collect();
            out.push(&sup, shift);
        }
        Some(Token::Open) => {
            *i += 1;
            let mut inner = Rich::default();
            write_tokens(toks, i, &mut inner, raised, true);
            out.append(&inner);
        }
        Some(Token::Number(_) | Token::Word(_)) => {
            let mut inner = Rich::default();
            write_tokens(&toks[*i..*i + 1], &mut 0, &mut inner, raised, false);
            *i += 1;
            out.append(&inner);
        }
        _ => out.push("^", shift),
    }
}

/// The coupling convention, as the figures state it: g² = λ/(16π²).
pub fn convention() -> Rich {
    typeset("g^2 = lambda/(16*pi^2)")
}

/// The symbol of a catalogue quantity where the literature has one
/// (Γ_cusp, hep-th/0610251; Γ_oct, arXiv:1907.13131; Γ_hex, the
/// six-gluon origin; the scaling function f = 2Γ_cusp), as the catalogue's
/// summaries name them; other quantities are shown by their definition.
pub fn symbol(name: &str) -> Option<Rich> {
    let gamma = |sub: &str| {
        let mut r = Rich::plain("Γ");
        r.push(sub, Shift::Sub);
        Some(r)
    };
    match name {
        "cusp" => gamma("cusp"),
        "octagon" => gamma("oct"),
        "hexagon" => gamma("hex"),
        "scaling-function" => Some(Rich::plain("f")),
        _ => None,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The forms a physicist writes by hand (the conventions of README.md).
    #[test]
    fn formulas_are_typeset_with_greek_letters_and_superscripts() {
        for (ascii, printed) in [
            ("Gamma(pi/4)", "Γ(π/4)"),
            ("Delta(0)", "Δ(0)"),
            ("Delta(c2=1/3)", "Δ(cos²α = 1/3)"),
            ("Gamma(c2)", "Γ(cos²α)"),
            ("Gamma(pi/4) - 4*g^2", "Γ(π/4) − 4g²"),
            (
                "-zeta(2)/2*Gamma(pi/4) + Delta(0)/4",
                "−ζ(2)/2·Γ(π/4) + Δ(0)/4",
            ),
            ("g^2 = lambda/(16*pi^2)", "g² = λ/(16π²)"),
            ("pi**4*zeta(3)", "π⁴·ζ(3)"),
            ("g^-2", "g⁻²"),
            ("2*alpha", "2α"),
            ("2*scaling-function - cusp", "2scaling-function − cusp"),
        ] {
            let r = typeset(ascii);
            assert_eq!(r.text(), printed, "{ascii}");
            assert!(r.runs.iter().all(|(_, s)| *s == Shift::Base), "{ascii}");
        }
    }

    #[test]
    fn non_digit_exponents_are_raised_runs() {
        let r = typeset("g^(2*L)");
        assert_eq!(
            r.runs,
            vec![("g".into(), Shift::Base), ("2L".into(), Shift::Super)]
        );
        assert!(r.svg().contains("<tspan baseline-shift=\"super\""));
        let cusp = symbol("cusp").unwrap();
        assert_eq!(cusp.text(), "Γcusp");
        assert!(cusp
            .svg()
            .contains("Γ<tspan baseline-shift=\"sub\" font-size=\"70%\">cusp</tspan>"));
    }

    #[test]
    fn unknown_text_is_kept_and_escaped() {
        let r = typeset("my_quantity<2>");
        assert_eq!(r.text(), "my_quantity<2>");
        assert_eq!(r.svg(), "my_quantity&lt;2&gt;");
    }

    #[test]
    fn widths_grow_with_text_and_shrink_when_raised() {
        let base = Rich::plain("cusp").width(20.0);
        let mut sub = Rich::default();
        sub.push("cusp", Shift::Sub);
        assert!(base > 20.0 && base < 80.0, "{base}");
        assert!((sub.width(20.0) - SHIFTED_SIZE * base).abs() < 1e-9);
    }
}
