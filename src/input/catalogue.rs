//! The catalogue of named predictions: one YAML file per quantity in
//! series/catalogue/, embedded in the binary at build time, extendable (and
//! overridable by name) with files from a directory of the user's.
//!
//! An entry says what the quantity is, how it is built from the kernel
//! functionals (a formula in the coefficient language), whether the
//! literature holds it as established or as a conjecture, and what is known
//! in closed form or at strong coupling.

use std::collections::BTreeMap;
use std::fmt;
use std::path::Path;

use serde::Deserialize;

use crate::error::{Error, Result};
use crate::exact::coupling::Coupling;
use crate::input::suggest::did_you_mean;

fn coupling_name<'de, D: serde::Deserializer<'de>>(
    d: D,
) -> std::result::Result<Coupling, D::Error> {
    let text = String::deserialize(d)?;
    text.parse()
        .map_err(|e: Error| serde::de::Error::custom(e.message()))
}

/// The built-in files, in the order `list` shows them. Adding a quantity means
/// adding its file to series/catalogue/ and one line here.
const BUILTIN: &[(&str, &str)] = &[
    (
        "cusp.yaml",
        include_str!("../../series/catalogue/cusp.yaml"),
    ),
    (
        "scaling-function.yaml",
        include_str!("../../series/catalogue/scaling-function.yaml"),
    ),
    (
        "octagon.yaml",
        include_str!("../../series/catalogue/octagon.yaml"),
    ),
    (
        "hexagon.yaml",
        include_str!("../../series/catalogue/hexagon.yaml"),
    ),
    (
        "octagon-constant.yaml",
        include_str!("../../series/catalogue/octagon-constant.yaml"),
    ),
];

/// How firmly the literature holds a formula.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Deserialize)]
#[serde(rename_all = "lowercase")]
pub enum Status {
    /// Derived and confirmed independently (direct calculation, closed form).
    Established,
    /// Proposed in the literature and tested, but not derived.
    Conjecture,
}

impl fmt::Display for Status {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(match self {
            Status::Established => "established",
            Status::Conjecture => "conjecture",
        })
    }
}

/// A strong-coupling expansion, as a formula in g (evaluated numerically).
#[derive(Clone, Debug, PartialEq, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct StrongCoupling {
    pub formula: String,
    pub status: Status,
    #[serde(default)]
    pub note: Option<String>,
}

/// One named quantity.
#[derive(Clone, Debug, PartialEq, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Entry {
    pub name: String,
    /// One line for `list`.
    pub summary: String,
    /// The quantity in terms of the functionals, in the coefficient language,
    /// with the coupling g^2 = lambda / (16 pi^2).
    pub definition: String,
    /// The convention the literature quotes this quantity's loop coefficients
    /// in; `expand` prints them in it unless told otherwise.
    #[serde(default, deserialize_with = "coupling_name")]
    pub coupling: Coupling,
    pub status: Status,
    #[serde(default)]
    pub note: Option<String>,
    #[serde(default)]
    pub references: Vec<String>,
    #[serde(default)]
    pub closed_form: Option<String>,
    #[serde(default)]
    pub strong_coupling: Option<StrongCoupling>,
    /// Where the entry came from ("built-in" or a path), for messages.
    #[serde(skip)]
    pub origin: String,
}

const ENTRY_KEYS: &[&str] = &[
    "name",
    "summary",
    "definition",
    "coupling",
    "status",
    "note",
    "references",
    "closed_form",
    "strong_coupling",
];
const STRONG_KEYS: &[&str] = &["formula", "status", "note"];

/// All known quantities, by name.
#[derive(Clone, Debug, Default)]
pub struct Catalogue {
    entries: BTreeMap<String, Entry>,
    order: Vec<String>,
}

impl Catalogue {
    /// The entries shipped in the binary.
    pub fn builtin() -> Result<Catalogue> {
        let mut c = Catalogue::default();
        for (file, text) in BUILTIN {
            c.insert(parse_entry(
                text,
                &format!("built-in series/catalogue/{file}"),
            )?);
        }
        Ok(c)
    }

    /// Adds every `*.yaml` file of `dir`; an entry with a known name replaces it.
    pub fn extend_from_dir(&mut self, dir: &Path) -> Result<()> {
        let listing = std::fs::read_dir(dir).map_err(|e| {
            Error::io(format!(
                "cannot read catalogue directory {}: {e}",
                dir.display()
            ))
        })?;
        let mut paths: Vec<_> = listing
            .filter_map(|e| e.ok().map(|e| e.path()))
            .filter(|p| p.extension().is_some_and(|x| x == "yaml" || x == "yml"))
            .collect();
        paths.sort();
        for path in paths {
            let text = std::fs::read_to_string(&path)
                .map_err(|e| Error::io(format!("cannot read {}: {e}", path.display())))?;
            self.insert(parse_entry(&text, &path.display().to_string())?);
        }
        Ok(())
    }

    fn insert(&mut self, entry: Entry) {
        if !self.entries.contains_key(&entry.name) {
            self.order.push(entry.name.clone());
        }
        self.entries.insert(entry.name.clone(), entry);
    }

    pub fn get(&self, name: &str) -> Option<&Entry> {
        self.entries.get(name)
    }

    /// The entry, or an error that suggests the closest names.
    pub fn lookup(&self, name: &str) -> Result<&Entry> {
        self.get(name).ok_or_else(|| {
            Error::input(format!(
                "unknown quantity `{name}`{}; `loopwise list` shows the catalogue, and a functional such as Gamma(pi/6) or Delta(c2=1/3) works too",
                did_you_mean(name, self.names())
            ))
        })
    }

    /// The entry a name written inside a formula stands for. A formula
    /// cannot hold a hyphen inside a name (`a-b` is a difference), so
    /// `scaling_function` stands for `scaling-function` too.
    pub fn get_in_formula(&self, name: &str) -> Option<&Entry> {
        self.get(name).or_else(|| self.get(&name.replace('_', "-")))
    }

    /// The formula text with the hyphens of catalogue names turned into
    /// `_`, so that `2*scaling-function` parses as a product with one name.
    /// The text keeps its length, so spans and columns still point into
    /// what the user wrote.
    pub fn mask_hyphens(&self, text: &str) -> String {
        let mut out = text.to_string();
        let mut names: Vec<&str> = self.names().filter(|n| n.contains('-')).collect();
        names.sort_by_key(|n| std::cmp::Reverse(n.len()));
        let word =
            |c: Option<char>| c.is_some_and(|c| c.is_ascii_alphanumeric() || c == '_' || c == '-');
        for name in names {
            let mut from = 0;
            while let Some(k) = out[from..].find(name) {
                let at = from + k;
                let end = at + name.len();
                if !word(out[..at].chars().next_back()) && !word(out[end..].chars().next()) {
                    out.replace_range(at..end, &name.replace('-', "_"));
                }
                from = end;
            }
        }
        out
    }

    pub fn names(&self) -> impl Iterator<Item = &str> {
        self.order.iter().map(String::as_str)
    }

    pub fn entries(&self) -> impl Iterator<Item = &Entry> {
        self.order.iter().filter_map(|n| self.entries.get(n))
    }
}

/// Whether a text is written as a catalogue name is (a letter, then letters,
/// digits, `-` and `_`) rather than as a formula.
pub fn looks_like_name(text: &str) -> bool {
    text.chars().next().is_some_and(|c| c.is_ascii_alphabetic())
        && text
            .chars()
            .all(|c| c.is_ascii_alphanumeric() || c == '-' || c == '_')
}

/// Reads one entry; errors name the file, line and column, and suggest keys.
pub fn parse_entry(text: &str, origin: &str) -> Result<Entry> {
    let text = text.strip_prefix('\u{feff}').unwrap_or(text);
    crate::input::seriesfile::check_depth(text, origin)?;
    let mut entry: Entry = serde_yaml::from_str(text).map_err(|e| {
        // serde_yaml places errors raised while converting a value at the
        // document's start; point at the `coupling:` line instead.
        let line = text
            .lines()
            .position(|l| l.starts_with("coupling:"))
            .map(|i| i + 1);
        match line {
            Some(line) if e.to_string().contains("unknown coupling") => {
                Error::input(format!("{origin}:{line}:11: {e}"))
            }
            _ => yaml_error(origin, &e),
        }
    })?;
    if entry.name.trim().is_empty() || entry.name.contains(char::is_whitespace) {
        return Err(Error::input(format!(
            "{origin}: `name` must be one word without spaces, not {:?}",
            entry.name
        )));
    }
    entry.origin = origin.to_string();
    Ok(entry)
}

/// serde_yaml's message with the file in front and a key suggestion added.
fn yaml_error(origin: &str, e: &serde_yaml::Error) -> Error {
    let place = e
        .location()
        .map(|l| format!("{origin}:{}:{}", l.line(), l.column()))
        .unwrap_or_else(|| origin.to_string());
    let message = e.to_string();
    let hint = unknown_field(&message)
        .map(|field| did_you_mean(field, ENTRY_KEYS.iter().chain(STRONG_KEYS).copied()))
        .unwrap_or_default();
    Error::input(format!("{place}: {message}{hint}"))
}

/// The field name in serde's "unknown field `x`" message.
pub(crate) fn unknown_field(message: &str) -> Option<&str> {
    let rest = message.split("unknown field `").nth(1)?;
    rest.split('`').next()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn builtin_catalogue_reads() {
        let c = Catalogue::builtin().unwrap();
        for name in [
            "cusp",
            "octagon",
            "hexagon",
            "octagon-constant",
            "scaling-function",
        ] {
            assert!(c.get(name).is_some(), "{name}");
        }
        assert_eq!(c.get("cusp").unwrap().definition, "Gamma(pi/4)");
        assert_eq!(c.get("hexagon").unwrap().status, Status::Conjecture);
    }

    #[test]
    fn unknown_name_suggests() {
        let c = Catalogue::builtin().unwrap();
        let e = c.lookup("octagn").unwrap_err();
        assert!(e.message().contains("did you mean `octagon`"), "{e}");
    }

    #[test]
    fn unknown_key_names_file_line_and_suggestion() {
        let text =
            "name: x\nsummary: s\ndefinition: Gamma(0)\nstatus: established\nrefrences: []\n";
        let e = parse_entry(text, "mine.yaml").unwrap_err();
        assert!(e.message().starts_with("mine.yaml:5:"), "{e}");
        assert!(e.message().contains("did you mean `references`"), "{e}");
    }

    #[test]
    fn coupling_defaults_to_g2_and_is_checked() {
        let c = Catalogue::builtin().unwrap();
        assert_eq!(c.get("cusp").unwrap().coupling, Coupling::G2);
        let text = "name: x\nsummary: s\ndefinition: Gamma(0)\ncoupling: a\nstatus: established\n";
        assert_eq!(
            parse_entry(text, "mine.yaml").unwrap().coupling,
            Coupling::A
        );
        let text = "name: x\nsummary: s\ndefinition: Gamma(0)\ncoupling: b\nstatus: established\n";
        let e = parse_entry(text, "mine.yaml").unwrap_err();
        assert!(
            e.message().contains("mine.yaml:4:") && e.message().contains("unknown coupling"),
            "{e}"
        );
    }

    #[test]
    fn bad_status_is_an_error() {
        let text = "name: x\nsummary: s\ndefinition: Gamma(0)\nstatus: proven\n";
        let e = parse_entry(text, "mine.yaml").unwrap_err();
        assert!(e.message().contains("mine.yaml:4:"), "{e}");
    }
}
