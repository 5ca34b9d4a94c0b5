//! The tokens the grammar reads: logos tokens without comments, each carrying the facts about
//! its place that the line-sensitive rules and recovery need, worked out once here so the
//! grammar never looks at the text or at neighbouring tokens.

use crate::lexer::{tokens, Tok};
use crate::schema::DECLARATIONS;
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
    /// `build-up`): the word it was meant to be, as an index into the schema's declarations.
    pub misspelt: Option<u8>,
    /// The next token is a name (a contextual word before a name opens a declaration).
    pub before_name: bool,
}

impl std::fmt::Display for Tk {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        self.kind.fmt(f)
    }
}

/// The declaration word `s` is a slip for: the same letters in another case, or one edit away
/// (two for longer words); `build-up` and `build_up` for `buildup`.
pub fn misspelt_word(s: &str) -> Option<u8> {
    if s.len() > 24 {
        return None;
    }
    let lower = s.to_lowercase().replace(['-', '_'], "");
    DECLARATIONS
        .iter()
        .position(|decl| {
            let w = decl.word;
            let d = strsim::damerau_levenshtein(&lower, w);
            lower == w || (lower.len() >= 3 && d <= 1) || (lower.len() >= 7 && d <= 2)
        })
        .map(|i| i as u8)
}

impl Tk {
    /// The declaration word this name is a slip for, if any.
    pub fn meant(&self) -> Option<&'static str> {
        self.misspelt.map(|i| DECLARATIONS[i as usize].word)
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
    // One vector, filled straight from the lexer and then annotated in place: the token list
    // is the parser's largest allocation after the tree (a 17 MB model has 3.4 million).
    let mut out: Vec<(Tk, Span)> = Vec::with_capacity(text.len() / 6);
    let mut prev_end = 0usize;
    for t in tokens(text, file) {
        if t.kind == Tok::Comment {
            comments.push(t.span);
            continue;
        }
        let first_on_line = out.is_empty() || text[prev_end..t.span.start as usize].contains('\n');
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
        out.push((
            Tk {
                kind: t.kind,
                first_on_line,
                word,
                starts_decl: false,
                starts_line_decl: false,
                before_colon: false,
                before_paren: false,
                before_name: false,
                before_eq: false,
                misspelt: None,
            },
            t.span,
        ));
    }
    merge_build_up(text, &mut out);
    for i in 0..out.len() {
        let next = out.get(i + 1).map(|(n, _)| n.kind);
        let (t, span) = &mut out[i];
        t.starts_decl = if t.kind.starts_item() {
            next != Some(Tok::Eq)
        } else {
            // A contextual word opens a declaration at the start of a line, before a name (a
            // stray `network notes` mid-line is not one).
            t.kind == Tok::Ident
                && next == Some(Tok::Ident)
                && t.first_on_line
                && t.word != Word::Plain
        };
        t.starts_line_decl = t.starts_decl && t.first_on_line;
        t.before_colon = next == Some(Tok::Colon);
        t.before_paren = next == Some(Tok::LParen);
        t.before_name = next == Some(Tok::Ident);
        t.before_eq = next == Some(Tok::Eq);
        if t.kind == Tok::Ident
            && t.first_on_line
            && t.word == Word::Plain
            && !t.before_colon
            && !t.before_eq
        {
            t.misspelt = misspelt_word(&text[span.range()]);
        }
    }
    (out, comments)
}

/// `build-up` written with a hyphen at the start of a line lexes as `build - up`; make it one
/// (misspelt) word so it is reported as such.
fn merge_build_up(text: &str, out: &mut Vec<(Tk, Span)>) {
    let mut i = 0;
    while i + 2 < out.len() {
        let ((a, sa), (m, sm), (b, sb)) = (out[i], out[i + 1], out[i + 2]);
        if a.first_on_line
            && a.kind == Tok::Ident
            && m.kind == Tok::Minus
            && b.kind == Tok::Ident
            && sa.end == sm.start
            && sm.end == sb.start
            && text[sa.range()].eq_ignore_ascii_case("build")
            && text[sb.range()].eq_ignore_ascii_case("up")
        {
            out[i].1 = sa.to(sb);
            out.drain(i + 1..i + 3);
        }
        i += 1;
    }
}
