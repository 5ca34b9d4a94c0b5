//! The parser: logos tokens into chumsky combinators, with error recovery.
//!
//! Comments are set aside, and every token learns whether it is the first on its line: the
//! language is line-sensitive in two places (a declaration left unfinished is reported at the
//! end of its own line; a table row ends at its line) and recovery resumes at declarations that
//! begin a line. A broken declaration is skipped up to the next one, a broken row, build-up
//! element or region edge up to the next one, so one run reports every independent error.
//!
//! Errors are the project's own [`Diagnostic`]s: each site names what it expected in the
//! analyst's words (chumsky labels), and [`error::PErr`] turns the furthest failure into
//! "expected …, found …" with a stable code.

mod blocks;
mod error;
mod expr;
mod items;
mod tokens;

use crate::diagnostic::Diagnostic;
use crate::span::{FileId, Span};
use crate::syntax::*;
use chumsky::input::Input as _;
use chumsky::inspector::RollbackState;
use chumsky::prelude::*;

pub use tokens::Tk;

/// Deepest nesting of brackets, function calls, signs and exponents in one expression. Far
/// beyond anything written by hand or generated sensibly, yet every walk over the syntax tree
/// (evaluation, expansion, editor queries, comparison, drop) stays well inside a 2 MB thread
/// stack in an unoptimised build (compiler/tests/nesting_limits.rs runs every stage at 2 MB).
/// Long chains of `+ - * /` do not nest: they are flat lists.
pub const MAX_EXPR_DEPTH: usize = 100;

/// Deepest nesting of `repeat` and `network` blocks; the same as the expansion's limit, so the
/// block that crosses it is reported once, before the parser goes any deeper.
pub const MAX_BLOCK_DEPTH: usize = crate::expand::MAX_DEPTH;

/// Tokens the grammar reads at a time (see [`tokens::Batches`]): large enough that building
/// the grammar once per batch costs nothing, small enough that the token list of a model of a
/// million nodes is never held whole.
const BATCH_TOKENS: usize = 1 << 15;

/// Parse one file. Always returns a module (possibly partial) and every syntax error found.
pub fn parse(text: &str, file: FileId) -> (Module, Vec<Diagnostic>) {
    parse_in_batches(text, file, BATCH_TOKENS)
}

/// [`parse`] with batches of at least `min_tokens` tokens; the result does not depend on it
/// (compiler/tests/parse_batches.rs checks that on every case file).
#[doc(hidden)]
pub fn parse_in_batches(text: &str, file: FileId, min_tokens: usize) -> (Module, Vec<Diagnostic>) {
    let mut batches = tokens::Batches::new(text, file, min_tokens);
    let mut items = Vec::new();
    let mut diags = Vec::new();
    while let Some((tokens, next)) = batches.next_batch() {
        let cx = Cx::new(text, file, &tokens, next);
        let mut state = RollbackState(tokens::Depths::default());
        let (batch, errors) = items::module(cx)
            .parse_with_state(cx.input(), &mut state)
            .into_output_errors();
        items.extend(batch.unwrap_or_default());
        diags.extend(
            errors
                .into_iter()
                .map(|e| e.found_at_cut(&cx).into_diagnostic(&cx)),
        );
    }
    items.shrink_to_fit();
    (
        Module {
            items,
            comments: batches.comments,
        },
        diags,
    )
}

/// Parse a lone expression (used for test expectations, study overrides and the language
/// server).
pub fn parse_expr(text: &str, file: FileId) -> Result<Expr, Diagnostic> {
    let (tokens, _) = tokens::prepare(text, file);
    let cx = Cx::new(text, file, &tokens, None);
    let mut state = RollbackState(tokens::Depths::default());
    let (e, errors) = expr::expr(cx)
        .then_ignore(end().labelled(error::END_OF_EXPRESSION))
        .parse_with_state(cx.input(), &mut state)
        .into_output_errors();
    // A part nested too deep was skipped and reported; the expression is not whole.
    match (e, errors.into_iter().next()) {
        (Some(e), None) => Ok(e),
        (_, Some(err)) => Err(err.into_diagnostic(&cx)),
        (None, None) => Err(Diagnostic::error(
            "E002",
            "expected a value, found the end of the file",
            cx.eof,
        )),
    }
}

/// The token input the grammar reads: our own tokens with our own spans.
pub(crate) type In<'s> = chumsky::input::MappedInput<'s, Tk, Span, &'s [(Tk, Span)]>;

/// Parser extras: our error type and the nesting counters (see [`tokens::Depths`]).
pub(crate) type Ex = extra::Full<error::PErr, RollbackState<tokens::Depths>, ()>;

/// What every part of the grammar needs besides the tokens: the text (names are slices of it),
/// the file, and the tokens themselves for lookahead.
#[derive(Clone, Copy)]
pub(crate) struct Cx<'s> {
    pub text: &'s str,
    pub file: FileId,
    pub tokens: &'s [(Tk, Span)],
    /// Where "the end of the file" is reported: after the last token; in a batch that is not
    /// the file's last, the token after the batch (see [`tokens::Batches`]).
    pub eof: Span,
    /// The token after the batch, when the batch is not the file's last.
    pub next: Option<(Tk, Span)>,
}

impl<'s> Cx<'s> {
    fn new(
        text: &'s str,
        file: FileId,
        tokens: &'s [(Tk, Span)],
        next: Option<(Tk, Span)>,
    ) -> Cx<'s> {
        // After the last token, not after trailing comments: that is where a declaration left
        // unfinished stops.
        let end = tokens.last().map_or(0, |(_, s)| s.end as usize);
        Cx {
            text,
            file,
            tokens,
            eof: next.map_or(Span::new(file, end, end), |(_, s)| s),
            next,
        }
    }

    pub fn input(&self) -> In<'s> {
        self.tokens.split_token_span(self.eof)
    }

    pub fn slice(&self, span: Span) -> &'s str {
        &self.text[span.range()]
    }

    pub fn ident(&self, span: Span) -> Ident {
        Ident {
            name: self.slice(span).to_string(),
            span,
        }
    }

    /// The innermost `(` still open before `span`, looking back at most a few thousand
    /// tokens (enough for any declaration; bounded so many errors stay cheap).
    pub fn open_paren_before(&self, span: Span) -> Option<Span> {
        let end = self.tokens.partition_point(|(_, s)| s.start < span.start);
        let mut depth = 0usize;
        for &(t, s) in self.tokens[..end].iter().rev().take(4096) {
            match t.kind {
                crate::lexer::Tok::RParen => depth += 1,
                crate::lexer::Tok::LParen if depth == 0 => return Some(s),
                crate::lexer::Tok::LParen => depth -= 1,
                _ if t.starts_line_decl => return None,
                _ => {}
            }
        }
        None
    }

    /// The end of the token before the one at `span` (or the file's start).
    pub fn end_before(&self, span: Span) -> Span {
        let i = self
            .tokens
            .partition_point(|(_, s)| s.start < span.start)
            .checked_sub(1);
        match i.map(|i| self.tokens[i].1) {
            Some(s) => Span { start: s.end, ..s },
            None => Span::new(self.file, 0, 0),
        }
    }
}

/// chumsky reports places in the project's own spans (byte offsets in one file).
impl chumsky::span::Span for Span {
    type Context = FileId;
    type Offset = u32;
    fn new(file: FileId, range: std::ops::Range<u32>) -> Span {
        Span {
            file,
            start: range.start,
            end: range.end,
        }
    }
    fn context(&self) -> FileId {
        self.file
    }
    fn start(&self) -> u32 {
        self.start
    }
    fn end(&self) -> u32 {
        self.end
    }
}
