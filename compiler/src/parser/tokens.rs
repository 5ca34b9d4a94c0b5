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
    /// The next token is a name (a contextual word before a name opens a declaration).
    pub before_name: bool,
}

impl std::fmt::Display for Tk {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        self.kind.fmt(f)
    }
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
                    Word::Block => true,
                    Word::Plain => false,
                }
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
            },
            t.span,
        ));
    }
    (out, comments)
}
