//! The formatter on every bundled model: idempotent, keeps every comment, and the formatted
//! text analyses to the same network and solution, bit for bit.

mod common;

use caloris_compiler::format::format_source;
use caloris_compiler::parser::parse;
use caloris_compiler::span::FileId;
use std::path::{Path, PathBuf};

fn collect(dir: &Path, out: &mut Vec<PathBuf>) {
    let Ok(entries) = std::fs::read_dir(dir) else {
        return;
    };
    for e in entries.flatten() {
        let p = e.path();
        if p.is_dir() {
            collect(&p, out);
        } else if p.extension().is_some_and(|x| x == "heat") {
            out.push(p);
        }
    }
}

fn models() -> Vec<PathBuf> {
    let root = Path::new(env!("CARGO_MANIFEST_DIR")).join("..");
    let mut files = Vec::new();
    collect(&root.join("examples"), &mut files);
    collect(&root.join("tests/cases"), &mut files);
    files.sort();
    files
}

#[test]
fn every_model_formats_idempotently_and_keeps_its_meaning() {
    let files = models();
    assert!(files.len() >= 10, "too few models: {files:?}");
    for f in &files {
        let text = std::fs::read_to_string(f).expect("readable model");
        let once = match format_source(&text) {
            Ok(s) => s,
            // Files with syntax errors (tests/cases/errors) are refused, never half-formatted.
            Err(d) => {
                let (_, syntax) = parse(&text, FileId(0));
                assert!(
                    !syntax.is_empty(),
                    "{}: refused without a syntax error: {d:?}",
                    f.display()
                );
                continue;
            }
        };
        let twice = format_source(&once).expect("formatted text formats again");
        assert_eq!(once, twice, "{}: not idempotent", f.display());
        assert_eq!(
            common::comments(&text),
            common::comments(&once),
            "{}: comments changed",
            f.display()
        );
        let before = common::fingerprint(&common::analyse(&text));
        let after = common::fingerprint(&common::analyse(&once));
        assert_eq!(before, after, "{}: meaning changed", f.display());
        assert!(
            !once.contains("\n\n\n") && !once.starts_with('\n'),
            "{}: blank lines not collapsed",
            f.display()
        );
    }
}

/// The examples are what new users copy, so they are kept in the canonical layout
/// (`caloris fmt --check examples/*.heat` in CI says the same).
#[test]
fn examples_are_in_canonical_layout() {
    for f in models()
        .iter()
        .filter(|f| f.components().any(|c| c.as_os_str() == "examples"))
    {
        let text = std::fs::read_to_string(f).expect("readable model");
        let formatted = format_source(&text).expect("example formats");
        assert!(
            formatted == text,
            "{} is not formatted; run `caloris fmt {}`",
            f.display(),
            f.display()
        );
    }
}
