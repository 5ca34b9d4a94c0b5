//! The schema agrees with the lexer and parser, and each of its tables is well formed.

use super::*;
use crate::lexer::{lex, Tok};
use crate::span::FileId;
use crate::syntax::{is_declaration_word, BLOCK_WORDS, DECLARATION_WORDS};
use std::collections::HashSet;

fn only_token(word: &str) -> Tok {
    let toks = lex(word, FileId(0));
    assert_eq!(toks.len(), 1, "`{word}` lexes as one token");
    toks[0].kind
}

#[test]
fn keywords_are_the_lexers_and_contextual_words_the_parsers() {
    for d in DECLARATIONS {
        let t = only_token(d.word);
        if d.reserved {
            assert!(
                t.starts_item(),
                "`{}` is a keyword that starts a declaration",
                d.word
            );
        } else {
            assert_eq!(
                t,
                Tok::Ident,
                "`{}` is an ordinary name to the lexer",
                d.word
            );
            assert!(is_declaration_word(d.word), "the parser knows `{}`", d.word);
        }
    }
    for (k, _) in OTHER_KEYWORDS {
        let t = only_token(k);
        assert!(t != Tok::Ident && !t.starts_item(), "`{k}` is a keyword");
    }
    let contextual: HashSet<&str> = contextual_words().collect();
    let parser: HashSet<&str> = DECLARATION_WORDS
        .iter()
        .chain(BLOCK_WORDS)
        .copied()
        .collect();
    assert_eq!(contextual, parser, "the parser's contextual words");
    // The lexer's keywords: every `Tok` keyword variant prints as `` `word` ``, and the schema
    // names each one (the lexer has no list of them to compare with).
    let printed: HashSet<String> = [
        Tok::Title,
        Tok::Import,
        Tok::Param,
        Tok::Material,
        Tok::Node,
        Tok::Link,
        Tok::Buildup,
        Tok::Limit,
        Tok::To,
    ]
    .iter()
    .map(|t| t.to_string().trim_matches('`').to_string())
    .collect();
    let schema: HashSet<String> = keywords().map(str::to_string).collect();
    assert_eq!(printed, schema);
}

#[test]
fn each_example_begins_with_its_word_and_words_are_unique() {
    let mut seen = HashSet::new();
    for d in DECLARATIONS {
        assert!(seen.insert(d.word), "`{}` listed twice", d.word);
        assert!(
            d.example.starts_with(&format!("{} ", d.word)),
            "{}",
            d.example
        );
        assert!(d.form.starts_with(&format!("{} ", d.word)), "{}", d.form);
        assert!(!d.doc.is_empty() && !d.doc.contains('\n'), "one-line doc");
    }
}

/// Every table of arguments: declarations, build-up uses and element kinds.
fn tables() -> Vec<(String, &'static [ArgSpec])> {
    let mut out: Vec<(String, &'static [ArgSpec])> = DECLARATIONS
        .iter()
        .filter(|d| !d.arg_specs().is_empty())
        .map(|d| (d.word.to_string(), d.arg_specs()))
        .collect();
    for g in [Geometry::Plane, Geometry::Cylinder, Geometry::Sphere] {
        out.push((format!("{g:?} use"), buildup_use(g)));
    }
    out.extend(element_kinds().map(|k| (k.name().to_string(), k.params())));
    out
}

use crate::elements::shell::Geometry;

#[test]
fn argument_tables_are_well_formed() {
    for (owner, specs) in tables() {
        let names: HashSet<&str> = specs.iter().map(|s| s.name).collect();
        assert_eq!(names.len(), specs.len(), "{owner}: names are unique");
        for s in specs {
            assert!(
                !s.doc.is_empty() && !s.doc.contains('\n'),
                "{owner}.{}",
                s.name
            );
            // The partner of an alternative or a pair is an argument of the same table.
            if let Need::Either(o) | Need::Instead(o) | Need::With(o) = s.need {
                assert!(names.contains(o), "{owner}.{}: partner `{o}`", s.name);
                assert_ne!(o, s.name);
            }
            // A range fits the type: counts and fractions are dimensionless numbers.
            match s.range {
                Range::Count(max) => {
                    assert_eq!(s.ty, ArgType::Quantity(crate::units::Dim::NONE));
                    assert!(max >= 1);
                }
                Range::Fraction => {
                    assert_eq!(s.ty, ArgType::Quantity(crate::units::Dim::NONE))
                }
                Range::AboveAbsoluteZero => {
                    assert_eq!(s.ty.dim(), Some(crate::units::Dim::TEMPERATURE))
                }
                Range::Positive | Range::Any => {}
            }
            // The words of a choice are written as names, so none may be a keyword.
            if let ArgType::Choice(words) = s.ty {
                for w in words {
                    assert!(
                        !super::keywords().any(|k| k == *w),
                        "{owner}.{}: `{w}` is a keyword",
                        s.name
                    );
                }
            }
            // Names and materials have no range.
            if matches!(s.ty, ArgType::Material | ArgType::Node | ArgType::Choice(_)) {
                assert_eq!(s.range, Range::Any, "{owner}.{}", s.name);
            }
        }
    }
}

#[test]
fn measures_and_functions_are_what_limits_and_eval_know() {
    for m in MEASURES {
        assert_eq!(m.measure.name(), m.name);
        assert_eq!(m.measure.dim(), m.dim);
    }
    // Every function evaluates with dimensionless arguments of its arity (no E107).
    for f in FUNCTIONS {
        let args = vec!["1"; f.params.len()].join(", ");
        let text = format!("param x = {}({args})\n", f.name);
        let a = crate::analyze(
            "f.heat",
            &text,
            &crate::source::NoImports,
            &crate::Options::default(),
        );
        let codes: Vec<&str> = a.diagnostics.iter().map(|d| d.code).collect();
        assert!(!codes.contains(&"E107"), "{text}: {codes:?}");
        let text = format!("param x = {}({args}, 1)\n", f.name);
        let a = crate::analyze(
            "f.heat",
            &text,
            &crate::source::NoImports,
            &crate::Options::default(),
        );
        assert!(
            a.diagnostics.iter().any(|d| d.code == "E107"),
            "{text}: one argument too many"
        );
    }
}

#[test]
fn the_reference_lists_every_word_and_argument() {
    let md = markdown_reference();
    for d in DECLARATIONS {
        assert!(md.contains(&format!("`{}`", d.word)), "{}", d.word);
    }
    for (owner, specs) in tables() {
        for s in specs {
            assert!(
                md.contains(&format!("| `{}` |", s.name)),
                "{owner}.{}",
                s.name
            );
        }
    }
}
