//! The parser reads a large file in batches cut before declarations (so the token list is
//! never held whole); the result must not depend on where the cuts fall. Every model and
//! case file of the project, and every reliability reproducer, is parsed in one piece and
//! with a cut before every declaration that allows one: the trees and diagnostics must be
//! the same.

use caloris_compiler::parser::{parse, parse_in_batches};
use caloris_compiler::span::FileId;
use std::path::{Path, PathBuf};

fn heat_files(dir: &Path, out: &mut Vec<PathBuf>) {
    let Ok(entries) = std::fs::read_dir(dir) else {
        return;
    };
    for e in entries.flatten() {
        let p = e.path();
        if p.is_dir() {
            heat_files(&p, out);
        } else if p.extension().is_some_and(|x| x == "heat") {
            out.push(p);
        }
    }
}

#[test]
fn cuts_between_declarations_change_nothing() {
    let root = Path::new(env!("CARGO_MANIFEST_DIR")).join("..");
    let mut files = Vec::new();
    for dir in [
        "examples",
        "tests",
        "library",
        "docs",
        "fuzz",
        "compiler/tests",
    ] {
        heat_files(&root.join(dir), &mut files);
    }
    assert!(files.len() > 50, "found only {} model files", files.len());
    let mut differ = Vec::new();
    for f in &files {
        let Ok(text) = std::fs::read_to_string(f) else {
            continue;
        };
        let whole = parse(&text, FileId(0));
        for min in [1, 7] {
            let cut = parse_in_batches(&text, FileId(0), min);
            if cut != whole {
                differ.push(format!("{} (batches of {min})", f.display()));
            }
        }
    }
    assert!(differ.is_empty(), "cut parses differ: {differ:#?}");
}
