//! The project's own model files for tests in both crates (the server's, and the root crate's,
//! which include this file by `#[path]`): the examples, the reliability reproducers and the
//! error codes each reproducer expects of itself.
#![allow(dead_code)]

use std::collections::BTreeSet;
use std::path::{Path, PathBuf};

/// The workspace folder (this file is compiled into crates at different depths below it).
pub fn workspace() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR"))
        .ancestors()
        .find(|d| d.join("tests/cases/reliability").is_dir())
        .expect("the workspace holds tests/cases/reliability")
        .to_path_buf()
}

/// The `.heat` files of a folder of the workspace, sorted.
pub fn heat_files(folder: &str) -> Vec<PathBuf> {
    let dir = workspace().join(folder);
    let mut files: Vec<PathBuf> = std::fs::read_dir(&dir)
        .unwrap_or_else(|e| panic!("{}: {e}", dir.display()))
        .flatten()
        .map(|e| e.path())
        .filter(|p| p.extension().is_some_and(|x| x == "heat"))
        .collect();
    files.sort();
    files
}

/// Every input in `tests/cases/reliability/` that once broke the tool.
pub fn reliability_cases() -> Vec<PathBuf> {
    let files = heat_files("tests/cases/reliability");
    assert!(files.len() >= 20, "the reliability corpus is in place");
    files
}

/// The demo models in `examples/`.
pub fn examples() -> Vec<PathBuf> {
    let files = heat_files("examples");
    assert!(!files.is_empty(), "the examples are in place");
    files
}

/// The error codes a case file expects (`# expect: error CODE at L:C`).
pub fn expected_errors(text: &str) -> BTreeSet<String> {
    text.lines()
        .filter_map(|l| l.strip_prefix("# expect: error "))
        .filter_map(|rest| rest.split_whitespace().next())
        .map(str::to_string)
        .collect()
}
