//! The layout the contributor guide describes, kept by CI: at most five
//! source files directly in src/, none over 700 lines, and data flowing one
//! way between the stages of src/ (a stage names only stages before it,
//! outside its tests).

use std::path::{Path, PathBuf};

/// The stages in the order data flows (DEVELOPERS.md, "Architecture").
const STAGES: [&str; 11] = [
    "error", "limits", "exact", "input", "kernel", "numeric", "quantity", "check", "origin", "fit",
    "report",
];

fn sources(dir: &Path, out: &mut Vec<PathBuf>) {
    for entry in std::fs::read_dir(dir).unwrap() {
        let path = entry.unwrap().path();
        if path.is_dir() {
            sources(&path, out);
        } else if path.extension().is_some_and(|e| e == "rs") {
            out.push(path);
        }
    }
}

fn all_sources() -> Vec<PathBuf> {
    let mut out = Vec::new();
    sources(&Path::new(env!("CARGO_MANIFEST_DIR")).join("src"), &mut out);
    out
}

#[test]
fn few_files_at_the_root_and_none_too_long() {
    let src = Path::new(env!("CARGO_MANIFEST_DIR")).join("src");
    let root: Vec<_> = all_sources()
        .into_iter()
        .filter(|p| p.parent() == Some(src.as_path()))
        .collect();
    assert!(root.len() <= 5, "{root:?}");
    for p in all_sources() {
        let lines = std::fs::read_to_string(&p).unwrap().lines().count();
        assert!(lines <= 700, "{} has {lines} lines", p.display());
    }
}

#[test]
fn data_flows_one_way() {
    let src = Path::new(env!("CARGO_MANIFEST_DIR")).join("src");
    let mut wrong = Vec::new();
    for p in all_sources() {
        let rel = p.strip_prefix(&src).unwrap();
        let top = rel
            .components()
            .next()
            .unwrap()
            .as_os_str()
            .to_string_lossy();
        let top = top.trim_end_matches(".rs");
        let Some(stage) = STAGES.iter().position(|s| *s == top) else {
            continue;
        };
        let text = std::fs::read_to_string(&p).unwrap();
        let code = text.split("#[cfg(test)]").next().unwrap_or("");
        for line in code.lines().filter(|l| !l.trim_start().starts_with("//")) {
            for later in STAGES.iter().skip(stage + 1) {
                if line.contains(&format!("crate::{later}::"))
                    || line.contains(&format!("crate::{later};"))
                {
                    wrong.push(format!("{}: uses {later}: {}", rel.display(), line.trim()));
                }
            }
        }
    }
    assert!(wrong.is_empty(), "{wrong:#?}");
}
