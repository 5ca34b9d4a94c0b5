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
    let mut batches = Batches::new(text, file, usize::MAX);
    let (tokens, _) = batches.next_batch().unwrap_or_default();
    (tokens, batches.comments)
}

/// One batch of tokens and the token after it, if the file goes on.
pub type Batch = (Vec<(Tk, Span)>, Option<(Tk, Span)>);

/// The file's tokens in batches of at least `min_tokens`, each ending just before a
/// declaration that begins a line outside every `{ }`: the grammar reads each batch on its
/// own, so the token list of a large model is never held whole (a 17 MB model has 3.4 million
/// tokens). Such a cut is where recovery would resume anyway, and the token after the cut is
/// handed along so that a declaration left unfinished before it is reported as it would be in
/// one piece ("found `node`", not "the end of the file").
pub struct Batches<'t> {
    text: &'t str,
    lexer: Box<dyn Iterator<Item = crate::lexer::Token> + 't>,
    buf: Vec<(Tk, Span)>,
    /// Comments met so far, in file order.
    pub comments: Vec<Span>,
    prev_end: usize,
    /// Open `{` before the last token read, and before the one before it.
    depth: usize,
    depth_before_last: usize,
    depth_before_prev: usize,
    min_tokens: usize,
    done: bool,
}

impl<'t> Batches<'t> {
    pub fn new(text: &'t str, file: FileId, min_tokens: usize) -> Batches<'t> {
        Batches {
            text,
            lexer: Box::new(tokens(text, file)),
            buf: Vec::new(),
            comments: Vec::new(),
            prev_end: 0,
            depth: 0,
            depth_before_last: 0,
            depth_before_prev: 0,
            min_tokens: min_tokens.max(1),
            done: false,
        }
    }

    /// The next token that is not a comment, with the facts known without looking ahead.
    fn next_token(&mut self) -> Option<(Tk, Span)> {
        let t = loop {
            let t = self.lexer.next()?;
            if t.kind == Tok::Comment {
                self.comments.push(t.span);
            } else {
                break t;
            }
        };
        let text = self.text;
        let first_on_line =
            self.prev_end == 0 || text[self.prev_end..t.span.start as usize].contains('\n');
        self.prev_end = t.span.end as usize;
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
        Some((
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
        ))
    }

    /// The next batch and the token after it (`None` after the last batch). The first batch
    /// of an empty file is empty.
    pub fn next_batch(&mut self) -> Option<Batch> {
        if self.done {
            return None;
        }
        loop {
            let Some(t) = self.next_token() else {
                self.done = true;
                let mut batch = std::mem::take(&mut self.buf);
                merge_build_up(self.text, &mut batch);
                annotate(self.text, &mut batch, None);
                return Some((batch, None));
            };
            self.depth_before_prev = self.depth_before_last;
            self.depth_before_last = self.depth;
            match t.0.kind {
                Tok::LBrace => self.depth += 1,
                Tok::RBrace => self.depth = self.depth.saturating_sub(1),
                _ => {}
            }
            self.buf.push(t);
            // The token before the one just read can now be judged: it needs its successor.
            let n = self.buf.len();
            if n < 2 || n - 2 < self.min_tokens || self.depth_before_prev != 0 {
                continue;
            }
            let (cand, next) = (self.buf[n - 2].0, self.buf[n - 1].0);
            if !(cand.first_on_line && opens_declaration(&cand, Some(next.kind))) {
                continue;
            }
            let rest = self.buf.split_off(n - 2);
            let mut batch = std::mem::replace(&mut self.buf, rest);
            merge_build_up(self.text, &mut batch);
            annotate(self.text, &mut batch, Some(cand.kind));
            annotate(self.text, &mut self.buf[..1], Some(next.kind));
            self.buf.reserve(self.min_tokens.min(1 << 16));
            return Some((batch, Some(self.buf[0])));
        }
    }
}

/// Whether `t` opens a declaration, given the kind of the token after it.
fn opens_declaration(t: &Tk, next: Option<Tok>) -> bool {
    if t.kind.starts_item() {
        next != Some(Tok::Eq)
    } else {
        // A contextual word opens a declaration at the start of a line, before a name (a
        // stray `network notes` mid-line is not one).
        t.kind == Tok::Ident && next == Some(Tok::Ident) && t.first_on_line && t.word != Word::Plain
    }
}

/// Work out what each token needs to know about its neighbours; `after` is the kind of the
/// token that follows the slice, if any.
fn annotate(text: &str, out: &mut [(Tk, Span)], after: Option<Tok>) {
    for i in 0..out.len() {
        let next = out.get(i + 1).map(|(n, _)| n.kind).or(after);
        let (t, span) = &mut out[i];
        t.starts_decl = opens_declaration(t, next);
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
