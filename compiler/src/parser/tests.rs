//! The chumsky parser against the hand-written one it replaced (kept for this test only):
//! every model in the repository, and every model with one line or one token removed, must
//! give the same diagnostics, and a clean model the same tree.

use super::legacy;
use crate::span::FileId;
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

fn corpus() -> Vec<(String, String)> {
    let root = Path::new(env!("CARGO_MANIFEST_DIR")).join("..");
    let mut files = Vec::new();
    for d in ["examples", "tests/cases", "library"] {
        heat_files(&root.join(d), &mut files);
    }
    files.sort();
    files
        .into_iter()
        .filter_map(|p| Some((p.display().to_string(), std::fs::read_to_string(&p).ok()?)))
        .collect()
}

type Seen = Vec<(&'static str, String, u32, u32)>;

fn summary(d: &[crate::diagnostic::Diagnostic]) -> Seen {
    d.iter()
        .map(|d| {
            (
                d.code,
                d.message.clone(),
                d.primary.span.start,
                d.primary.span.end,
            )
        })
        .collect()
}

/// Compare on one text; returns a description of the difference, if any.
fn differs(text: &str) -> Option<String> {
    let (new_m, new_d) = super::parse(text, FileId(0));
    let (old_m, old_d) = legacy::parse(text, FileId(0));
    let (new_s, old_s) = (summary(&new_d), summary(&old_d));
    // The new parser may report fewer errors (it no longer resumes at a keyword naming an
    // argument, and an error inside a declaration that fails later is reported with it once
    // the first is fixed), but never a message the old one did not give, and never none.
    let subset = new_s.iter().all(|d| old_s.contains(d)) && new_s.is_empty() == old_s.is_empty();
    if !subset {
        return Some(format!(
            "diagnostics differ:\n new {new_s:?}\n old {old_s:?}"
        ));
    }
    if old_d.is_empty() && new_m != old_m {
        return Some(format!("trees differ:\n new {new_m:#?}\n old {old_m:#?}"));
    }
    None
}

fn check_all(variants: impl Fn(&str) -> Vec<String>) {
    let mut failures = Vec::new();
    let mut n = 0;
    for (name, text) in corpus() {
        for v in variants(&text) {
            n += 1;
            if let Some(why) = differs(&v) {
                failures.push(format!(
                    "== {name}\n--- {why}\n--- text near: {}",
                    near(&v, &why)
                ));
            }
        }
    }
    let shown: Vec<&String> = failures.iter().take(12).collect();
    assert!(
        failures.is_empty(),
        "{} of {n} texts differ; first ones:\n{}",
        failures.len(),
        shown
            .iter()
            .map(|s| s.as_str())
            .collect::<Vec<_>>()
            .join("\n")
    );
}

/// The lines around the first byte offset named in a difference report.
fn near(text: &str, why: &str) -> String {
    let offset = why
        .split(|c: char| !c.is_ascii_digit())
        .filter_map(|w| w.parse::<usize>().ok())
        .find(|&n| n > 0 && n <= text.len())
        .unwrap_or(0);
    let start = text[..offset.min(text.len())]
        .rfind('\n')
        .map(|i| text[..i].rfind('\n').map(|j| j + 1).unwrap_or(0))
        .unwrap_or(0);
    let end = text[offset.min(text.len())..]
        .find('\n')
        .map(|i| offset + i)
        .unwrap_or(text.len());
    text[start..end].to_string()
}

#[test]
fn same_as_before_on_every_model() {
    check_all(|t| vec![t.to_string()]);
}

#[test]
fn same_as_before_with_a_line_removed() {
    check_all(|t| {
        let lines: Vec<&str> = t.lines().collect();
        (0..lines.len().min(60))
            .map(|i| {
                let mut l = lines.clone();
                l.remove(i);
                l.join("\n")
            })
            .collect()
    });
}

#[test]
fn same_as_before_with_a_token_removed() {
    check_all(|t| {
        let toks = crate::lexer::lex(t, FileId(0));
        toks.iter()
            .take(150)
            .map(|tk| {
                format!(
                    "{}{}",
                    &t[..tk.span.start as usize],
                    &t[tk.span.end as usize..]
                )
            })
            .collect()
    });
}
