//! Snapshot tests of diagnostics exactly as an analyst reads them in a terminal (colour off).
//! The inputs are `tests/cases/errors/*.heat`; their `# expect:` lines (checked by cases.rs) pin
//! codes and positions, these snapshots pin the wording, labels and help.

use caloris_compiler::render::render_diagnostics;
use caloris_compiler::source::NoImports;
use caloris_compiler::{analyze, Options};
use std::path::Path;

#[test]
fn rendered_diagnostics_of_every_error_case() {
    let dir = Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/cases/errors");
    let mut files: Vec<_> = std::fs::read_dir(&dir)
        .expect("tests/cases/errors exists")
        .flatten()
        .map(|e| e.path())
        .filter(|p| p.extension().is_some_and(|x| x == "heat"))
        .collect();
    files.sort();
    assert!(
        files.len() >= 8,
        "expected the error cases, found {files:?}"
    );
    for f in files {
        let text = std::fs::read_to_string(&f).expect("readable");
        let stem = f
            .file_stem()
            .and_then(|s| s.to_str())
            .unwrap_or("case")
            .to_string();
        let name = format!("errors/{stem}.heat");
        let a = analyze(&name, &text, &NoImports, &Options::default());
        assert!(
            a.has_errors() || !a.diagnostics.is_empty(),
            "{name} reports nothing"
        );
        let rendered = render_diagnostics(&a.diagnostics, &a.sources, false);
        insta::assert_snapshot!(stem, rendered);
    }
}
