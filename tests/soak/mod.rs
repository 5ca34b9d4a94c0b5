//! The random edits and requests of the language server soak test (`tests/lsp_soak.rs`):
//! typing, deleting, pasting fragments and lines of the examples and the reliability
//! reproducers, fresh files, and feature requests at random places and at names.

use crate::client::position_of;
use crate::corpus;
use crate::fixture::CABIN;
use caloris_compiler::lexer::{lex, Tok};
use caloris_compiler::span::FileId;
use serde_json::{json, Value};
use std::path::PathBuf;

/// The document is replaced by a fresh example when edits have made it larger than this.
pub const MAX_TEXT: usize = 24 * 1024;
/// Lines longer than this are pasted in part (some reproducers are one line of 60 kB).
const MAX_PASTED_LINE: usize = 400;

/// SplitMix64: the same edits on every run.
pub struct Rng(pub u64);
impl Rng {
    fn next(&mut self) -> u64 {
        self.0 = self.0.wrapping_add(0x9E37_79B9_7F4A_7C15);
        let mut z = self.0;
        z = (z ^ (z >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
        z = (z ^ (z >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
        z ^ (z >> 31)
    }
    pub fn below(&mut self, n: usize) -> usize {
        (self.next() % n.max(1) as u64) as usize
    }
}

/// A char boundary of `text` at random (the end included).
pub fn boundary(rng: &mut Rng, text: &str) -> usize {
    let mut i = rng.below(text.len() + 1);
    while !text.is_char_boundary(i) {
        i -= 1;
    }
    i
}

/// `i` moved down to a char boundary of `text`.
pub fn floor(text: &str, mut i: usize) -> usize {
    i = i.min(text.len());
    while !text.is_char_boundary(i) {
        i -= 1;
    }
    i
}

const TYPED: &[&str] = &[
    "a", "e", "x", "_", "1", "0", ".", " ", " ", "\n", "(", ")", "{", "}", "=", ",", ":", "*", "/",
    "^", "-", "+", "#", "\"", "°", "²", "µ", "é", "😀", "m", "K", "W", "node ", "link ", "param ",
    "layer(", "film(", "repeat ", "to ", "°C", "mm", "W/(m*K)",
];

/// What edits draw on: the examples, and the reliability reproducers (whole only when small).
pub struct Sources {
    examples: Vec<String>,
    corpus: Vec<String>,
    /// The reproducers that pass the check and fail only in the solve.
    solve_failures: Vec<String>,
}

impl Sources {
    pub fn load() -> Sources {
        let read = |files: Vec<PathBuf>| -> Vec<String> {
            files
                .iter()
                .map(|p| std::fs::read_to_string(p).expect("model file"))
                .collect()
        };
        let corpus = read(corpus::reliability_cases());
        let solve_failures: Vec<String> = corpus
            .iter()
            .filter(|t| {
                let codes = corpus::expected_errors(t);
                !codes.is_empty() && codes.iter().all(|c| c.starts_with("E50"))
            })
            .cloned()
            .collect();
        assert!(
            !solve_failures.is_empty(),
            "a reproducer fails in the solve"
        );
        Sources {
            examples: read(corpus::examples()),
            corpus,
            solve_failures,
        }
    }

    /// A file to paste from: an example or a reproducer, as often each.
    fn any(&self, rng: &mut Rng) -> &str {
        if rng.below(2) == 0 {
            &self.examples[rng.below(self.examples.len())]
        } else {
            &self.corpus[rng.below(self.corpus.len())]
        }
    }

    /// The model that imports the library, an example, or now and then a model whose errors
    /// only the solve finds (so the server publishes twice for one version).
    pub fn restart(&self, rng: &mut Rng) -> String {
        if rng.below(4) == 0 {
            return self.solve_failures[rng.below(self.solve_failures.len())].clone();
        }
        match rng.below(self.examples.len() + 1) {
            0 => CABIN.to_string(),
            n => self.examples[n - 1].clone(),
        }
    }

    /// A whole file to start again from: the model that imports the library, an example, or a
    /// reproducer small enough to edit.
    pub fn fresh(&self, rng: &mut Rng) -> String {
        match rng.below(3) {
            0 => CABIN.to_string(),
            1 => self.examples[rng.below(self.examples.len())].clone(),
            _ => {
                let small: Vec<&String> =
                    self.corpus.iter().filter(|t| t.len() <= MAX_TEXT).collect();
                small[rng.below(small.len())].clone()
            }
        }
    }
}

/// One random edit of `text`.
pub fn edit(rng: &mut Rng, text: &str, sources: &Sources) -> String {
    match rng.below(12) {
        // Typing.
        0..=3 => {
            let at = boundary(rng, text);
            let what = TYPED[rng.below(TYPED.len())];
            format!("{}{what}{}", &text[..at], &text[at..])
        }
        // Deleting a few characters, or a whole selection.
        4..=6 => {
            let a = boundary(rng, text);
            let len = if rng.below(8) == 0 {
                200
            } else {
                1 + rng.below(5)
            };
            let b = floor(text, a + len);
            format!("{}{}", &text[..a], &text[b..])
        }
        // Pasting a fragment of another file.
        7 => {
            let src = sources.any(rng);
            let a = boundary(rng, src);
            let b = floor(src, a + 1 + rng.below(300));
            let at = boundary(rng, text);
            format!("{}{}{}", &text[..at], &src[a..b], &text[at..])
        }
        // Pasting whole lines of another file at the start of a line.
        8 | 9 => {
            let lines: Vec<&str> = sources.any(rng).split_inclusive('\n').collect();
            let first = rng.below(lines.len());
            let mut pasted = String::new();
            for line in lines.iter().skip(first).take(1 + rng.below(3)) {
                pasted.push_str(&line[..floor(line, MAX_PASTED_LINE)]);
            }
            if !pasted.ends_with('\n') {
                pasted.push('\n');
            }
            let starts: Vec<usize> = std::iter::once(0)
                .chain(text.match_indices('\n').map(|(i, _)| i + 1))
                .collect();
            let at = starts[rng.below(starts.len())];
            format!("{}{pasted}{}", &text[..at], &text[at..])
        }
        // Undoing a lot: a fresh file.
        10 if rng.below(4) == 0 => sources.fresh(rng),
        _ => {
            // Cut a line and paste it elsewhere.
            let lines: Vec<&str> = text.split_inclusive('\n').collect();
            if lines.len() < 2 {
                return text.to_string();
            }
            let i = rng.below(lines.len());
            let mut rest: Vec<&str> = lines.clone();
            let line = rest.remove(i);
            let j = rng.below(rest.len() + 1);
            rest.insert(j, line);
            rest.concat()
        }
    }
}

/// A place in `text` for a request: mostly inside a name (where navigation and rename have
/// something to do), sometimes anywhere, sometimes past the end (a client whose view is ahead
/// of or behind the server's).
pub fn place(rng: &mut Rng, text: &str) -> Value {
    match rng.below(12) {
        0 => json!({"line": text.lines().count() + rng.below(3), "character": rng.below(200)}),
        1..=5 => position_of(text, boundary(rng, text)),
        _ => {
            let names: Vec<(usize, usize)> = lex(text, FileId(0))
                .into_iter()
                .filter(|t| t.kind == Tok::Ident)
                .map(|t| (t.span.start as usize, t.span.end as usize))
                .collect();
            if names.is_empty() {
                return position_of(text, boundary(rng, text));
            }
            let (s, e) = names[rng.below(names.len())];
            position_of(text, floor(text, s + rng.below(e - s + 1)))
        }
    }
}

/// New names for rename: fresh ones, and ones the server must refuse (not a name, a keyword).
const NEW_NAMES: &[&str] = &["renamed", "cellar_air", "x2", "node", "1st", "a b", ""];

/// A request for one of the server's features at a random place of `text`.
pub fn feature_request(rng: &mut Rng, uri: &str, text: &str) -> (&'static str, Value) {
    let doc = json!({"uri": uri});
    let pos = place(rng, text);
    let range = json!({"start": {"line": 0, "character": 0}, "end": {"line": 400, "character": 0}});
    match rng.below(13) {
        0 => (
            "textDocument/hover",
            json!({"textDocument": doc, "position": pos}),
        ),
        1 => (
            "textDocument/completion",
            json!({"textDocument": doc, "position": pos}),
        ),
        2 => (
            "textDocument/signatureHelp",
            json!({"textDocument": doc, "position": pos}),
        ),
        3 => (
            "textDocument/definition",
            json!({"textDocument": doc, "position": pos}),
        ),
        4 | 5 => (
            "textDocument/references",
            json!({"textDocument": doc, "position": pos, "context": {"includeDeclaration": rng.below(2) == 0}}),
        ),
        6 => (
            "textDocument/prepareRename",
            json!({"textDocument": doc, "position": pos}),
        ),
        7 => (
            "textDocument/rename",
            json!({"textDocument": doc, "position": pos, "newName": NEW_NAMES[rng.below(NEW_NAMES.len())]}),
        ),
        8 => (
            "textDocument/semanticTokens/full",
            json!({"textDocument": doc}),
        ),
        9 => (
            "textDocument/inlayHint",
            json!({"textDocument": doc, "range": range}),
        ),
        10 => ("textDocument/documentSymbol", json!({"textDocument": doc})),
        11 => (
            "textDocument/codeAction",
            json!({"textDocument": doc, "range": {"start": pos, "end": pos}, "context": {"diagnostics": []}}),
        ),
        _ => (
            "textDocument/formatting",
            json!({"textDocument": doc, "options": {"tabSize": 2, "insertSpaces": true}}),
        ),
    }
}
