//! Canonical spacing between two tokens on one line, and the guard that keeps a join from
//! changing how the text splits into tokens.
//!
//! The guard matters because a number swallows a unit written after it: `5` and `h` joined by a
//! space read back as the quantity `5 h`. Whatever the rules prefer, a join that would re-lex
//! differently is refused and the caller keeps a line break instead.

use super::pieces::Piece;
use crate::lexer::{lex, Tok};
use crate::span::FileId;
use crate::syntax::is_declaration_word;

/// The context of a join: the token before `prev`, and whether `prev` is a sign.
pub struct Join<'a> {
    pub before_prev: Option<&'a Piece>,
    pub prev: &'a Piece,
    pub prev_is_sign: bool,
    pub next: &'a Piece,
}

/// Whether the rules want a space between `prev` and `next`.
pub fn wants_space(j: &Join) -> bool {
    let (p, n) = (j.prev, j.next);
    if matches!(n.text.as_str(), "," | ")" | "]" | ":" | ";") {
        return false;
    }
    if matches!(p.text.as_str(), "(" | "[") {
        return false;
    }
    if j.prev_is_sign {
        return false;
    }
    if matches!(n.text.as_str(), "(" | "[") {
        if p.kind == Tok::Ident {
            // `material steel (k = …)`: a declaration's own argument list stands apart from
            // its name; everywhere else a name and its `(` make one call: `layer(…)`.
            // The contextual words (`schedule`, `case`, `transient`) open declarations too.
            return j.before_prev.is_some_and(|b| {
                b.starts_item() || (b.kind == Tok::Ident && is_declaration_word(&b.text))
            });
        }
        if p.is_closer() {
            return n.spaced;
        }
        return true;
    }
    if p.is_operator() || n.is_operator() {
        return true;
    }
    if matches!(p.text.as_str(), "," | ":" | ";") || n.is("{") {
        return true;
    }
    let wordish = |x: &Piece| x.is_word() || x.starts_value() || x.is_closer();
    if wordish(p) && (n.is_word() || n.starts_value()) {
        return true;
    }
    n.spaced
}

/// The separator to put between `prev` and `next` on one line, or `None` when neither a
/// space nor nothing keeps the two tokens apart (they must go on separate lines).
pub fn separator(j: &Join) -> Option<&'static str> {
    let preferred = if wants_space(j) { " " } else { "" };
    let other = if preferred.is_empty() { " " } else { "" };
    [preferred, other]
        .into_iter()
        .find(|sep| relexes_same(j.prev, sep, j.next))
}

fn relexes_same(a: &Piece, sep: &str, b: &Piece) -> bool {
    let joined = format!("{}{sep}{}", a.text, b.text);
    let toks = lex(&joined, FileId(0));
    if toks.len() != 2 {
        return false;
    }
    let split = a.text.len() + sep.len();
    toks[0].kind == a.kind
        && toks[0].span.range() == (0..a.text.len())
        && toks[1].kind == b.kind
        && toks[1].span.range() == (split..joined.len())
}
