//! The editor grammars against the compiler's schema: every word list in the VS Code TextMate
//! grammar, the Neovim syntax file and the Emacs mode names only words of one kind that the
//! language has (keywords, contextual declaration words, functions, constants, limit measures,
//! element kinds), and together a grammar's lists of a kind name all of them. A new declaration
//! word, function or element kind fails this test until each grammar highlights it.
//!
//! Helix has no grammar of its own here (editors/helix configures the language server, whose
//! semantic tokens come from the compiler), so there is nothing to compare for it.

use caloris_compiler::schema;
use std::collections::{BTreeMap, BTreeSet};
use std::path::Path;

type Words = BTreeSet<String>;

fn read(path: &str) -> String {
    let p = Path::new(env!("CARGO_MANIFEST_DIR")).join(path);
    std::fs::read_to_string(&p).unwrap_or_else(|e| panic!("{}: {e}", p.display()))
}

fn is_word(w: &str) -> bool {
    !w.is_empty() && w.chars().all(|c| c.is_ascii_lowercase() || c == '_')
}

/// The word lists of a regular-expression text: alternations of plain words between `open` and
/// `close`, split on `bar` (`(a|b)`, `\%(a\|b\)`, `\\(a\\|b\\)`), and words between word
/// boundaries (`\bpi\b`, `\_<pi\_>`).
fn alternations(text: &str, open: &str, close: &str, bar: &str, out: &mut Vec<Words>) {
    let mut rest = text;
    while let Some(i) = rest.find(open) {
        let after = &rest[i + open.len()..];
        let after = after.strip_prefix("?:").unwrap_or(after);
        if let Some(j) = after.find(close) {
            let inner = &after[..j];
            let words: Vec<&str> = inner.split(bar).collect();
            if words.iter().all(|w| is_word(w)) {
                out.push(words.iter().map(|w| w.to_string()).collect());
            }
        }
        rest = &rest[i + open.len()..];
    }
}

fn bounded(text: &str, open: &str, close: &str, out: &mut Vec<Words>) {
    let mut rest = text;
    while let Some(i) = rest.find(open) {
        let after = &rest[i + open.len()..];
        let end = after
            .find(|c: char| !(c.is_ascii_lowercase() || c == '_'))
            .unwrap_or(after.len());
        if end > 0 && after[end..].starts_with(close) {
            out.push(BTreeSet::from([after[..end].to_string()]));
        }
        rest = after;
    }
}

/// Every `match`/`begin` regex of the TextMate grammar.
fn textmate_regexes(v: &serde_json::Value, out: &mut Vec<String>) {
    match v {
        serde_json::Value::Object(m) => {
            for (k, v) in m {
                match (k.as_str(), v) {
                    ("match" | "begin" | "end", serde_json::Value::String(s)) => {
                        out.push(s.clone())
                    }
                    _ => textmate_regexes(v, out),
                }
            }
        }
        serde_json::Value::Array(a) => a.iter().for_each(|v| textmate_regexes(v, out)),
        _ => {}
    }
}

fn vscode() -> Vec<Words> {
    let json: serde_json::Value =
        serde_json::from_str(&read("editors/vscode/syntaxes/heat.tmLanguage.json"))
            .expect("the TextMate grammar is JSON");
    let mut regexes = Vec::new();
    textmate_regexes(&json, &mut regexes);
    assert!(regexes.len() > 10, "the grammar's patterns were found");
    let mut out = Vec::new();
    for r in &regexes {
        alternations(r, "(", ")", "|", &mut out);
        bounded(r, "\\b", "\\b", &mut out);
    }
    out
}

fn neovim() -> Vec<Words> {
    let text = read("editors/neovim/syntax/heat.vim");
    let mut out = Vec::new();
    for line in text.lines() {
        let mut parts = line.split_whitespace();
        if let (Some("syn"), Some("keyword"), Some(_group)) =
            (parts.next(), parts.next(), parts.next())
        {
            // Options (`contained`, `nextgroup=...`, `skipwhite`) are not words of the language;
            // words in capitals (`TODO`) belong to comments.
            let words: Words = parts
                .filter(|w| {
                    !w.contains('=')
                        && !matches!(*w, "contained" | "skipwhite" | "skipnl" | "skipempty")
                })
                .filter(|w| is_word(w))
                .map(str::to_string)
                .collect();
            if !words.is_empty() {
                out.push(words);
            }
        }
        alternations(line, "\\%(", "\\)", "\\|", &mut out);
    }
    out
}

fn emacs() -> Vec<Words> {
    let text = read("editors/emacs/caloris-mode.el");
    let mut out = Vec::new();
    // The word lists the mode declares: `(defconst NAME '("title" "import" ...))`.
    let mut rest = text.as_str();
    while let Some(i) = rest.find("(defconst ") {
        let after = &rest[i + 10..];
        let body = after
            .split_once(char::is_whitespace)
            .map_or("", |(_, b)| b.trim_start());
        if let Some(list) = body.strip_prefix("'(\"") {
            let end = list.find(')').expect("a closed list");
            let words: Words = format!("\"{}", &list[..end])
                .split_whitespace()
                .map(|w| w.trim_matches('"').to_string())
                .collect();
            assert!(words.iter().all(|w| is_word(w)), "{words:?}");
            out.push(words);
        }
        rest = after;
    }
    alternations(&text, "\\\\(", "\\\\)", "\\\\|", &mut out);
    bounded(&text, "\\\\_<", "\\\\_>", &mut out);
    out
}

/// The kinds of word the language has, from the schema.
fn kinds() -> BTreeMap<&'static str, Words> {
    let set =
        |it: &mut dyn Iterator<Item = &'static str>| it.map(str::to_string).collect::<Words>();
    BTreeMap::from([
        ("keywords", set(&mut schema::keywords())),
        ("contextual words", set(&mut schema::contextual_words())),
        (
            "functions",
            set(&mut schema::FUNCTIONS.iter().map(|f| f.name)),
        ),
        ("constants", set(&mut schema::CONSTANTS.iter().map(|c| c.0))),
        (
            "measures",
            set(&mut schema::MEASURES.iter().map(|m| m.name)),
        ),
        (
            "element kinds",
            set(&mut schema::element_kinds().map(|k| k.name())),
        ),
    ])
}

/// What is wrong with a grammar's lists, if anything.
fn check(grammar: &str, lists: &[Words]) -> Vec<String> {
    let kinds = kinds();
    let mut problems = Vec::new();
    let mut covered: BTreeMap<&str, Words> = BTreeMap::new();
    for list in lists {
        let fits: Vec<&str> = kinds
            .iter()
            .filter(|(_, words)| list.is_subset(words))
            .map(|(k, _)| *k)
            .collect();
        match fits.as_slice() {
            [kind] => covered
                .entry(kind)
                .or_default()
                .extend(list.iter().cloned()),
            // A single word that is more than one kind cannot happen: the kinds are disjoint.
            _ => {
                let strays: Vec<&String> = list
                    .iter()
                    .filter(|w| !kinds.values().any(|k| k.contains(*w)))
                    .collect();
                if strays.is_empty() {
                    problems.push(format!("{grammar}: the list {list:?} mixes kinds of word"));
                } else {
                    problems.push(format!(
                        "{grammar}: {strays:?} in {list:?} is no word of the language"
                    ));
                }
            }
        }
    }
    for (kind, words) in &kinds {
        let have = covered.get(kind).cloned().unwrap_or_default();
        let missing: Vec<&String> = words.difference(&have).collect();
        if !missing.is_empty() {
            problems.push(format!("{grammar}: {kind} missing: {missing:?}"));
        }
    }
    problems
}

#[test]
fn the_kinds_of_word_are_disjoint() {
    let kinds = kinds();
    let all: Vec<&String> = kinds.values().flatten().collect();
    let unique: BTreeSet<&String> = all.iter().copied().collect();
    assert_eq!(all.len(), unique.len(), "{kinds:?}");
}

#[test]
fn every_grammar_names_the_words_of_the_schema_and_no_others() {
    let mut problems = Vec::new();
    problems.extend(check(
        "editors/vscode/syntaxes/heat.tmLanguage.json",
        &vscode(),
    ));
    problems.extend(check("editors/neovim/syntax/heat.vim", &neovim()));
    problems.extend(check("editors/emacs/caloris-mode.el", &emacs()));
    assert!(problems.is_empty(), "{}", problems.join("\n"));
}

#[test]
fn the_check_finds_a_missing_word_and_a_stray_one() {
    // The check itself, on lists made up here: without `region`, and with a word the language
    // lacks, it must complain.
    let mut lists = vscode();
    for l in &mut lists {
        l.remove("region");
    }
    let problems = check("test", &lists);
    assert!(
        problems
            .iter()
            .any(|p| p.contains("contextual words missing") && p.contains("region")),
        "{problems:?}"
    );
    let mut lists = neovim();
    lists.push(BTreeSet::from(["endloop".to_string()]));
    let problems = check("test", &lists);
    assert!(
        problems
            .iter()
            .any(|p| p.contains("\"endloop\"") && p.contains("no word")),
        "{problems:?}"
    );
}
