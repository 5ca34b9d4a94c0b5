//! The tokens the grammar reads: logos tokens without comments, each carrying the facts about
//! its place that the line-sensitive rules and recovery need, worked out once here so the
//! grammar never looks at the text or at neighbouring tokens.

use crate::lexer::{lex, Tok};
use crate::span::{FileId, Span};
use crate::syntax::{BLOCK_WORDS, DECLARATION_WORDS};

/// Which contextual word a name is, if any.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Word {
    Plain,
    /// `schedule`, `case`, `transient`: a declaration when first on its line and followed by a
    /// name.
    Declaration,
    /// `repeat`, `network`, `use`, `region`: a declaration wherever a name follows.
    Block,
}

/// One token of the grammar.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct Tk {
    pub kind: Tok,
    /// No earlier token on the same line (comments do not count).
    pub first_on_line: bool,
    pub word: Word,
    /// A declaration begins here: a keyword (not naming an argument before `=`), a declaration
    /// word first on its line and followed by a name, or a block word followed by a name.
    pub starts_decl: bool,
    /// A declaration begins here and is first on its line: where recovery resumes.
    pub starts_line_decl: bool,
    /// The next token is `:` (a build-up element or region edge starts at a name before `:`).
    pub before_colon: bool,
    /// The next token is `(`.
    pub before_paren: bool,
    /// The next token is `=` (a name or keyword before `=` names an argument).
    pub before_eq: bool,
    /// A name first on its line that is a slip for a declaration word (`nod`, `Link`,
    /// `build-up`): the word it was meant to be, from [`WORDS`].
    pub misspelt: Option<&'static str>,
    /// The next token is a name (a contextual word before a name opens a declaration).
    pub before_name: bool,
}

impl std::fmt::Display for Tk {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        self.kind.fmt(f)
    }
}

/// Every word that opens a declaration.
pub const WORDS: &[&str] = &[
    "title",
    "import",
    "param",
    "material",
    "node",
    "link",
    "buildup",
    "limit",
    "schedule",
    "case",
    "transient",
    "repeat",
    "network",
    "use",
    "region",
];

/// The declaration word `s` is a slip for: the same letters in another case, or one edit away
/// (two for longer words); `build-up` and `build_up` for `buildup`.
pub fn misspelt_word(s: &str) -> Option<&'static str> {
    if s.len() > 24 {
        return None;
    }
    let lower = s.to_lowercase().replace(['-', '_'], "");
    WORDS.iter().copied().find(|w| {
        let d = strsim::damerau_levenshtein(&lower, w);
        lower == *w || (lower.len() >= 3 && d <= 1) || (lower.len() >= 7 && d <= 2)
    })
}

/// Nesting counters carried through a parse (chumsky's parser state).
#[derive(Clone, Copy, Debug, Default)]
pub struct Depths {
    /// Levels of the expression being read (see `MAX_EXPR_DEPTH`).
    pub expr: usize,
    /// Levels of `{ }` blocks of declarations (see `MAX_BLOCK_DEPTH`).
    pub blocks: usize,
}

/// Lex `text`, set the comments aside and annotate every other token.
pub fn prepare(text: &str, file: FileId) -> (Vec<(Tk, Span)>, Vec<Span>) {
    let mut comments = Vec::new();
    let mut raw = Vec::new();
    for t in lex(text, file) {
        if t.kind == Tok::Comment {
            comments.push(t.span);
        } else {
            raw.push(t);
        }
    }
    // `build-up` written with a hyphen lexes as `build - up`; read it as one (misspelt) word.
    let mut i = 0;
    while i + 2 < raw.len() {
        let (a, m, b) = (raw[i], raw[i + 1], raw[i + 2]);
        let line_start =
            i == 0 || text[raw[i - 1].span.end as usize..a.span.start as usize].contains('\n');
        if line_start
            && a.kind == Tok::Ident
            && m.kind == Tok::Minus
            && b.kind == Tok::Ident
            && a.span.end == m.span.start
            && m.span.end == b.span.start
            && text[a.span.range()].eq_ignore_ascii_case("build")
            && text[b.span.range()].eq_ignore_ascii_case("up")
        {
            raw[i].span = a.span.to(b.span);
            raw.drain(i + 1..i + 3);
        }
        i += 1;
    }
    let mut out: Vec<(Tk, Span)> = Vec::with_capacity(raw.len());
    let mut prev_end = 0usize;
    for (i, t) in raw.iter().enumerate() {
        let start = t.span.start as usize;
        let first_on_line = i == 0 || text[prev_end..start].contains('\n');
        prev_end = t.span.end as usize;
        let word = if t.kind == Tok::Ident {
            let s = &text[t.span.range()];
            if DECLARATION_WORDS.contains(&s) {
                Word::Declaration
            } else if BLOCK_WORDS.contains(&s) {
                Word::Block
            } else {
                Word::Plain
            }
        } else {
            Word::Plain
        };
        let next = raw.get(i + 1).map(|n| n.kind);
        let starts_decl = if t.kind.starts_item() {
            next != Some(Tok::Eq)
        } else {
            t.kind == Tok::Ident
                && next == Some(Tok::Ident)
                && match word {
                    Word::Declaration => first_on_line,
                    // Like the declaration words, a block word opens a declaration only at the
                    // start of a line (a stray `network notes` mid-line is not one).
                    Word::Block => first_on_line,
                    Word::Plain => false,
                }
        };
        let misspelt = if t.kind == Tok::Ident
            && first_on_line
            && word == Word::Plain
            && next != Some(Tok::Colon)
            && next != Some(Tok::Eq)
        {
            misspelt_word(&text[t.span.range()])
        } else {
            None
        };
        out.push((
            Tk {
                kind: t.kind,
                first_on_line,
                word,
                starts_decl,
                starts_line_decl: starts_decl && first_on_line,
                before_colon: next == Some(Tok::Colon),
                before_paren: next == Some(Tok::LParen),
                before_name: next == Some(Tok::Ident),
                before_eq: next == Some(Tok::Eq),
                misspelt,
            },
            t.span,
        ));
    }
    (out, comments)
}
