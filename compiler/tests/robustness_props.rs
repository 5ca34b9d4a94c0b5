//! Property tests of robustness: arbitrary text, arbitrary sequences of the language's tokens
//! and broken lines of declarations go through the parser, analysis (with the solve),
//! rendering, the editor queries and the formatter without a panic; the parser makes progress
//! on every token; every diagnostic span and every span of the syntax tree lies inside the
//! text, on character boundaries; and whatever the formatter accepts it formats to a fixed
//! point. The same holds for the bundled examples after random token edits. (The mutation
//! fuzzer in tools/fuzz goes further, with extreme sizes and numbers in a worker process;
//! these stay small so they run in the ordinary suite.)

mod tree_spans;

use caloris_compiler::format::format_source;
use caloris_compiler::lexer::{lex, Tok};
use caloris_compiler::parser::parse;
use caloris_compiler::query;
use caloris_compiler::render::render_diagnostics;
use caloris_compiler::source::NoImports;
use caloris_compiler::span::FileId;
use caloris_compiler::syntax::{Item, ItemKind};
use caloris_compiler::vocabulary;
use caloris_compiler::{analyze, Diagnostic, Options};
use proptest::prelude::*;
use std::path::PathBuf;
use std::sync::OnceLock;

/// Every diagnostic span in the text `text` (file 0) lies inside it, on character boundaries.
fn assert_diagnostic_spans(text: &str, diags: &[Diagnostic]) {
    for d in diags {
        if d.primary.span.file == FileId(0) {
            let (s, e) = (d.primary.span.start as usize, d.primary.span.end as usize);
            assert!(
                s <= e && e <= text.len() && text.is_char_boundary(s) && text.is_char_boundary(e),
                "{} `{}` has the span {s}..{e} in a text of {} bytes",
                d.code,
                d.message,
                text.len()
            );
        }
    }
}

/// Declarations at every level of nesting.
fn count_items(items: &[Item]) -> usize {
    items
        .iter()
        .map(|i| match &i.kind {
            ItemKind::Repeat { body, .. } | ItemKind::Network { body, .. } => 1 + count_items(body),
            _ => 1,
        })
        .sum()
}

/// The parser alone: its tree and errors stay inside the text, and it makes progress: every
/// declaration it keeps and every error it reports costs at least one token, so a recovery
/// that stood still (and would loop) breaks the bound.
fn parse_and_check(text: &str) {
    let (module, diags) = parse(text, FileId(0));
    assert_diagnostic_spans(text, &diags);
    tree_spans::assert_tree_spans(text, &module);
    let tokens = lex(text, FileId(0))
        .iter()
        .filter(|t| t.kind != Tok::Comment)
        .count();
    let items = count_items(&module.items);
    assert!(
        items <= tokens && diags.len() <= tokens + 1,
        "{items} declarations and {} errors from {tokens} tokens:\n{text}",
        diags.len()
    );
    // A large file is read in batches cut before declarations; where the cuts fall must not
    // change the tree or the errors.
    let cut = caloris_compiler::parser::parse_in_batches(text, FileId(0), 1);
    assert!(
        cut == (module, diags),
        "parsing in batches changed the result:\n{text}"
    );
}

/// Everything a tool does with a text, none of which may panic; spans must lie inside it.
fn exercise(text: &str) {
    parse_and_check(text);
    let a = analyze("prop.heat", text, &NoImports, &Options::default());
    assert_diagnostic_spans(text, &a.diagnostics);
    tree_spans::assert_tree_spans(text, a.root());
    render_diagnostics(&a.diagnostics, &a.sources, false);
    query::highlights(&a, FileId(0));
    let mut offsets: Vec<usize> = vec![0, text.len() / 3, text.len() / 2, text.len()];
    offsets.extend(
        a.diagnostics
            .iter()
            .take(3)
            .map(|d| d.primary.span.start as usize),
    );
    for mut off in offsets {
        off = off.min(text.len());
        while !text.is_char_boundary(off) {
            off -= 1;
        }
        query::completion_context(text, off as u32);
        if let Some(query::Target::Symbol { symbol, .. }) =
            query::target_at(&a, FileId(0), off as u32)
        {
            if query::check_new_name(&a, symbol, "renamed").is_ok() {
                query::rename_edits(&a, symbol, "renamed");
            }
        }
    }
    assert_fixed_point(text);
}

/// Text the formatter accepts formats to text it formats to itself.
fn assert_fixed_point(text: &str) {
    if let Ok(once) = format_source(text) {
        match format_source(&once) {
            Ok(twice) => assert_eq!(twice, once, "formatting again changed the text:\n{text}"),
            Err(d) => panic!(
                "the formatter's output does not parse ({}: {}):\n--- input\n{text}\n--- output\n{once}",
                d[0].code, d[0].message
            ),
        }
    }
}

/// Marks of the language, numbers with units, names and layout, to go with its words
/// (`caloris_compiler::vocabulary`). Counts stay small so that repetitions cannot multiply into
/// sizes this test does not mean to measure.
const MARKS: &[&str] = &[
    "a",
    "b",
    "room",
    "wall",
    "x.y",
    "i",
    "(",
    ")",
    "{",
    "}",
    ",",
    ":",
    "=",
    "+",
    "-",
    "*",
    "/",
    "^",
    "<",
    ">=",
    "±",
    "\"text\"",
    "\"",
    "# note",
    "\n",
    "\n\n",
    "0",
    "1",
    "2",
    "3",
    "0.5",
    "12.5 mm",
    "20 °C",
    "-5 °C",
    "0.04 W/(m*K)",
    "3 m²",
    "150 W",
    "0.13 m^2*K/W",
    "2 h",
    "10 min",
    "1e-3",
    ".5",
    "5 K",
    "°",
    "µm",
    "é",
    "\t",
    // The rest of the lexer's spellings, bad numbers and strings, and characters it rejects.
    "<=",
    ">",
    "≤",
    "≥",
    "−",
    "·",
    "×",
    "+-",
    "1e99999",
    "1e-400",
    "1.2.3 mm",
    "2..5",
    "40 kJ/K",
    "\"open",
    "$",
    "℃",
    "\u{a0}",
    "\r\n",
    "left",
    "top",
    "front",
    "previous",
    "index",
    "first",
    "ln",
    "u_value",
];

/// The language's words and [`MARKS`]: what token sequences are made of.
fn vocab() -> &'static [&'static str] {
    static VOCAB: OnceLock<Vec<&'static str>> = OnceLock::new();
    VOCAB.get_or_init(|| {
        let mut v = vocabulary::words();
        v.extend(MARKS);
        v
    })
}

fn token_text() -> impl Strategy<Value = String> {
    prop::collection::vec((0..vocab().len(), 0..4u8), 0..120).prop_map(|toks| {
        let mut s = String::new();
        for (i, sep) in toks {
            s.push_str(vocab()[i]);
            s.push_str(["", " ", " ", "\n"][sep as usize]);
        }
        s
    })
}

/// Whole lines of the language: each kind of declaration, the openings of the blocks, table
/// rows, build-up elements, region edges and closing braces, so that random sequences of them
/// open and leave blocks the way an analyst's unfinished file does.
const LINES: &[&str] = &[
    "title \"Tool shed\"",
    "import \"walls.heat\"",
    "param a = 2 m * (3 m + 1 cm)",
    "param t = -sqrt(4 K^2) ^ 1",
    "material m (k = 0.04 W/(m*K), density = 30 kg/m^3)",
    "node a (fixed = 20 °C)",
    "node b",
    "node c (load = 5 W, capacity = 2 kJ/K, initial = 10 °C)",
    "link l: a to b film(h = 5 W/(m^2*K), area = 1 m^2)",
    "link w: a to c wall(area = 2 m^2)",
    "limit hot: temperature(a) < 60 °C",
    "buildup wall {",
    "  inside: film(r = 0.13 m^2*K/W)",
    "  core: layer(m, thickness = 10 cm)",
    "schedule s (repeat = 24 h) {",
    "  0 h: 3 °C",
    "  6 h: -2 °C",
    "node d (fixed = s)",
    "repeat r (count = 2, first = a) {",
    "  node t",
    "  link k: previous.t to t film(h = 1 W/(m^2*K), area = 1 m^2)",
    "network n (p, q) {",
    "  link x: p to q film(h = 2 W/(m^2*K), area = 1 m^2)",
    "use u: n(p = a, q = b)",
    "region plate (m, thickness = 2 mm, width = 1 m, height = 1 m, cells_x = 2, cells_y = 2) {",
    "  left: a",
    "  right: b film(h = 10 W/(m^2*K))",
    "}",
    "}",
    "transient run (duration = 2 h, output = 10 min)",
    "case cold (a = 3 m)",
    "# a comment",
    "",
];

/// Lines drawn from [`LINES`], three in eight of them broken: cut short before a token, a token
/// dropped, or a word of [`vocab`] put in before a token.
fn broken_lines() -> impl Strategy<Value = String> {
    let line = (0..LINES.len(), 0..8u8, any::<usize>(), 0..vocab().len());
    prop::collection::vec(line, 0..40).prop_map(|lines| {
        let mut s = String::new();
        for (i, how, at, word) in lines {
            let line = LINES[i];
            let toks = lex(line, FileId(0));
            let Some(t) = toks.get(at % toks.len().max(1)) else {
                s.push_str(line);
                s.push('\n');
                continue;
            };
            let (a, b) = (t.span.start as usize, t.span.end as usize);
            match how {
                0 => s.push_str(&line[..a]),
                1 => s.push_str(&format!("{}{}", &line[..a], &line[b..])),
                2 => s.push_str(&format!("{}{} {}", &line[..a], vocab()[word], &line[a..])),
                _ => s.push_str(line),
            }
            s.push('\n');
        }
        s
    })
}

fn examples() -> Vec<String> {
    let dir = PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("../examples");
    let mut files: Vec<PathBuf> = std::fs::read_dir(&dir)
        .expect("the examples folder")
        .flatten()
        .map(|e| e.path())
        .filter(|p| p.extension().is_some_and(|e| e == "heat"))
        .collect();
    files.sort();
    files
        .iter()
        .map(|p| std::fs::read_to_string(p).expect("an example"))
        .collect()
}

/// Numbers with units that may replace a number of a model.
const NUMBERS: &[&str] = &[
    "0",
    "1",
    "2.5",
    "0.5 m",
    "12.5 mm",
    "20 °C",
    "-5 °C",
    "0.04 W/(m*K)",
    "3 m²",
    "150 W",
    "0.13 m^2*K/W",
    "2 h",
    "10 min",
    "1e-3",
    "5 K",
    "68 °F",
    "1 Btu/h",
    "0.9",
];

/// One edit of a text at its `n`th token: delete it, repeat it, put a word before it, swap it
/// with the next one, or (edits that mostly keep the syntax, so the formatter gets to work)
/// replace a number, repeat or delete its line, or put a comment or a blank line before it.
fn edit(text: &str, n: usize, what: u8, word: usize) -> String {
    let toks = lex(text, FileId(0));
    if toks.is_empty() {
        return vocab()[word].to_string();
    }
    let i = n % toks.len();
    let t = toks[i];
    let (s, e) = (t.span.start as usize, t.span.end as usize);
    let line_start = text[..s].rfind('\n').map_or(0, |p| p + 1);
    let line_end = text[e..].find('\n').map_or(text.len(), |p| e + p + 1);
    match what % 8 {
        0 => format!("{}{}", &text[..s], &text[e..]),
        1 => format!("{}{}", &text[..e], &text[s..]),
        2 => format!("{}{} {}", &text[..s], vocab()[word], &text[s..]),
        3 => match toks.get(i + 1) {
            Some(u) => {
                let (us, ue) = (u.span.start as usize, u.span.end as usize);
                format!(
                    "{}{}{}{}{}",
                    &text[..s],
                    &text[us..ue],
                    &text[e..us],
                    &text[s..e],
                    &text[ue..]
                )
            }
            None => text.to_string(),
        },
        4 => match toks[i..]
            .iter()
            .find(|u| matches!(u.kind, caloris_compiler::lexer::Tok::Number(_)))
        {
            Some(u) => format!(
                "{}{}{}",
                &text[..u.span.start as usize],
                NUMBERS[word % NUMBERS.len()],
                &text[u.span.end as usize..]
            ),
            None => text.to_string(),
        },
        5 => format!("{}{}", &text[..line_end], &text[line_start..]),
        6 => format!("{}{}", &text[..line_start], &text[line_end..]),
        _ => {
            let insert = if word.is_multiple_of(2) {
                "# an edit\n"
            } else {
                "\n"
            };
            format!("{}{insert}{}", &text[..line_start], &text[line_start..])
        }
    }
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 1000, ..ProptestConfig::default() })]

    #[test]
    fn arbitrary_text_never_panics(text in "\\PC{0,300}") {
        exercise(&text);
    }

    #[test]
    fn text_of_the_languages_characters_never_panics(
        text in "[a-z0-9_ .,:=(){}+*/^<>#\"\n°µ²-]{0,300}"
    ) {
        exercise(&text);
    }

    #[test]
    fn arbitrary_token_sequences_never_panic(text in token_text()) {
        exercise(&text);
    }
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 500, ..ProptestConfig::default() })]

    /// Declarations cut short, with a token missing or one too many, inside and outside blocks:
    /// the inputs error recovery exists for.
    #[test]
    fn broken_lines_of_declarations_never_panic(text in broken_lines()) {
        exercise(&text);
    }
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 300, ..ProptestConfig::default() })]

    /// Random token edits of the bundled examples: analysis never panics, and whatever still
    /// parses the formatter formats to a fixed point.
    #[test]
    fn edited_examples_never_panic_and_format_to_a_fixed_point(
        which in 0usize..64,
        edits in prop::collection::vec((any::<usize>(), any::<u8>(), 0..vocab().len()), 1..5),
    ) {
        let all = examples();
        let mut text = all[which % all.len()].clone();
        for (n, what, word) in edits {
            text = edit(&text, n, what, word);
        }
        exercise(&text);
    }
}
