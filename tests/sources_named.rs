//! Sources are named by the law, the closed form or the standard, never by one book's table,
//! section, equation or problem numbers: this walks the docs, examples, case files, reference
//! generators and source code and refuses such citations.

use std::path::Path;

/// Words that, followed by a number such as `3.4`, cite one book's numbering.
const CITES: [&str; 6] = ["table", "section", "eq.", "equation", "example", "problem"];

/// `word N.N` with the word case-insensitive, e.g. a table number.
fn citations(text: &str) -> Vec<String> {
    let lower = text.to_lowercase();
    let mut hits = Vec::new();
    for word in CITES {
        let mut from = 0;
        while let Some(i) = lower[from..].find(word) {
            let at = from + i;
            from = at + word.len();
            let rest = lower[from..].trim_start_matches(' ');
            let digits: String = rest
                .chars()
                .take_while(|c| c.is_ascii_digit() || *c == '.')
                .collect();
            let starts_word = at == 0 || !lower.as_bytes()[at - 1].is_ascii_alphanumeric();
            let dotted = digits.trim_end_matches('.');
            if starts_word && dotted.contains('.') && dotted.split('.').all(|p| !p.is_empty()) {
                hits.push(format!("{word} {dotted}"));
            }
        }
    }
    hits
}

fn walk(dir: &Path, found: &mut Vec<String>) {
    let Ok(entries) = std::fs::read_dir(dir) else {
        return;
    };
    for e in entries.flatten() {
        let p = e.path();
        let name = p
            .file_name()
            .map(|n| n.to_string_lossy().into_owned())
            .unwrap_or_default();
        if p.is_dir() {
            if !name.starts_with('.')
                && name != "target"
                && name != "node_modules"
                && name != "snapshots"
            {
                walk(&p, found);
            }
            continue;
        }
        let text_file = ["md", "heat", "py", "rs", "lua", "el", "ts", "json", "toml"]
            .iter()
            .any(|x| p.extension().is_some_and(|e| e == *x));
        if !text_file || p.ends_with("tests/sources_named.rs") {
            continue;
        }
        let Ok(text) = std::fs::read_to_string(&p) else {
            continue;
        };
        for (n, line) in text.lines().enumerate() {
            for hit in citations(line) {
                found.push(format!(
                    "{}:{}: `{hit}` in: {}",
                    p.display(),
                    n + 1,
                    line.trim()
                ));
            }
        }
    }
}

#[test]
fn the_detector_finds_book_numbering_and_leaves_other_numbers_alone() {
    assert_eq!(citations("as in Table 3.4 of"), ["table 3.4"]);
    assert_eq!(citations("(eq. 3.95)"), ["eq. 3.95"]);
    assert!(citations("a table of 3.5 W points").is_empty());
    assert!(citations("version 1.2.0 of ht; notable 3.3").is_empty());
}

#[test]
fn no_source_is_cited_by_a_books_table_or_section_number() {
    let root = Path::new(env!("CARGO_MANIFEST_DIR"));
    let mut found = Vec::new();
    for dir in [
        "docs", "examples", "tests", "compiler", "lsp", "src", "editors", "library", "tools",
    ] {
        walk(&root.join(dir), &mut found);
    }
    for f in ["README.md", "DEVELOPERS.md"] {
        if let Ok(text) = std::fs::read_to_string(root.join(f)) {
            for (n, line) in text.lines().enumerate() {
                for hit in citations(line) {
                    found.push(format!("{f}:{}: `{hit}`", n + 1));
                }
            }
        }
    }
    assert!(
        found.is_empty(),
        "name the law, closed form or standard instead:\n{}",
        found.join("\n")
    );
}
