//! The docs agree with the compiler's schema: `docs/language.md` carries the argument reference
//! generated from it (`CALORIS_UPDATE_DOCS=1 cargo test --test schema_docs` rewrites that part
//! after a change to the schema), every declaration word has its own section in the prose, and
//! the hand-written tables of `docs/elements.md` and `docs/transient.md` name every argument the
//! schema gives the element kinds, nodes and transient runs.

use caloris_compiler::schema::{self, markdown_reference};
use std::path::{Path, PathBuf};

fn doc(name: &str) -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR"))
        .join("docs")
        .join(name)
}

fn read(name: &str) -> String {
    std::fs::read_to_string(doc(name)).unwrap_or_else(|e| panic!("docs/{name}: {e}"))
}

/// The generated part of the language reference, from its first marker line to its last.
fn generated_part(text: &str) -> Option<(usize, usize)> {
    let want = markdown_reference();
    let begin = want.lines().next()?;
    let end = want.lines().last()?;
    let start = text.find(begin)?;
    let stop = text[start..].find(end)? + start + end.len();
    Some((start, stop))
}

#[test]
fn the_language_reference_carries_the_generated_argument_reference() {
    let path = doc("language.md");
    let text = read("language.md");
    let want = markdown_reference();
    let Some((start, stop)) = generated_part(&text) else {
        panic!("docs/language.md has no generated argument reference (its markers are missing)");
    };
    if std::env::var_os("CALORIS_UPDATE_DOCS").is_some() {
        let updated = format!("{}{want}{}", &text[..start], &text[stop..]);
        std::fs::write(&path, updated).expect("docs/language.md is writable");
        return;
    }
    assert!(
        text[start..stop] == want,
        "docs/language.md's argument reference differs from the schema; run \
         `CALORIS_UPDATE_DOCS=1 cargo test --test schema_docs` and read the diff"
    );
}

#[test]
fn every_declaration_word_is_described_in_the_prose() {
    let text = read("language.md");
    let (start, stop) = generated_part(&text).expect("markers");
    let prose = format!("{}{}", &text[..start], &text[stop..]);
    for d in schema::DECLARATIONS {
        // Its form written out, e.g. `node NAME (ARGUMENTS)` or an example that begins with it.
        let shown = prose.lines().any(|l| {
            l.trim_start().starts_with(&format!("{} ", d.word))
                || l.contains(&format!("`{} ", d.word))
        });
        assert!(
            shown,
            "docs/language.md shows no `{}` declaration outside the generated part",
            d.word
        );
    }
    // The keywords' sentence lists every keyword and contextual word.
    let line = prose
        .lines()
        .find(|l| l.contains("**Keywords**"))
        .expect("the keywords' line");
    let para: String = prose[prose.find(line).expect("line")..]
        .split("\n\n")
        .next()
        .unwrap_or_default()
        .to_string();
    for w in schema::keywords().chain(schema::contextual_words()) {
        assert!(
            para.contains(&format!("`{w}`")),
            "the keywords' paragraph lacks `{w}`"
        );
    }
}

#[test]
fn the_element_and_transient_tables_name_every_argument() {
    // Plane layers, films, contacts and stated resistances are in the language reference, the
    // other element kinds in the element reference; its generated part does not count here.
    let language = read("language.md");
    let (start, stop) = generated_part(&language).expect("markers");
    let elements = format!(
        "{}{}{}",
        read("elements.md"),
        &language[..start],
        &language[stop..]
    );
    for k in schema::element_kinds() {
        assert!(
            elements.contains(&format!("`{}", k.name())),
            "docs/elements.md and language.md lack `{}`",
            k.name()
        );
        for a in k.params() {
            assert!(
                elements.contains(&format!("`{}`", a.name))
                    || elements.contains(&format!("{} =", a.name)),
                "docs/elements.md and language.md never name `{}` of `{}`",
                a.name,
                k.name()
            );
        }
    }
    let transient = read("transient.md");
    let names =
        |n: &str| transient.contains(&format!("`{n}`")) || transient.contains(&format!("{n} ="));
    for a in schema::TRANSIENT.iter().chain(schema::SCHEDULE) {
        assert!(names(a.name), "docs/transient.md lacks `{}`", a.name);
    }
    for a in schema::NODE
        .iter()
        .filter(|a| !matches!(a.name, "fixed" | "load"))
    {
        assert!(
            names(a.name),
            "docs/transient.md lacks node argument `{}`",
            a.name
        );
    }
}
