//! The formatter's view of a file: every token (comments included) with its canonical text and
//! the whitespace the analyst put before it, plus the few token classes the layout rules need.
//!
//! Classes are decided from the token's text as well as its kind, so tokens added to the
//! language later (new keywords, brackets) still get sensible spacing without this file knowing
//! them.

use crate::lexer::{lex, Tok};
use crate::span::FileId;

/// One token as the formatter sees it.
#[derive(Clone, Debug, PartialEq)]
pub struct Piece {
    pub kind: Tok,
    /// Canonical text: a number and its unit joined by one space, a comment without trailing
    /// blanks, anything else exactly as written.
    pub text: String,
    /// Line breaks in the whitespace before this token.
    pub newlines: u32,
    /// Whether any whitespace separates this token from the previous one.
    pub spaced: bool,
    /// Byte range of the token in the original text.
    pub start: usize,
    pub end: usize,
}

/// Split `text` into pieces.
pub fn pieces(text: &str) -> Vec<Piece> {
    let mut out = Vec::new();
    let mut prev_end = 0;
    for t in lex(text, FileId(0)) {
        let r = t.span.range();
        let gap = text.get(prev_end..r.start).unwrap_or("");
        let raw = &text[r.clone()];
        out.push(Piece {
            kind: t.kind,
            text: canonical_text(t.kind, raw),
            newlines: gap.matches('\n').count() as u32,
            spaced: !gap.is_empty(),
            start: r.start,
            end: r.end,
        });
        prev_end = r.end;
    }
    out
}

fn canonical_text(kind: Tok, raw: &str) -> String {
    match kind {
        Tok::Comment => raw.trim_end().to_string(),
        Tok::Number(num_len) => {
            let (num, unit) = raw.split_at((num_len as usize).min(raw.len()));
            let unit = unit.trim_start();
            if unit.is_empty() {
                num.to_string()
            } else {
                format!("{num} {unit}")
            }
        }
        _ => raw.to_string(),
    }
}

impl Piece {
    pub fn is_comment(&self) -> bool {
        self.kind == Tok::Comment
    }
    /// Letters first: a name or a keyword.
    pub fn is_word(&self) -> bool {
        self.text
            .chars()
            .next()
            .is_some_and(|c| c.is_alphabetic() || c == '_')
    }
    /// A word the language reserves (`node`, `to`, and any keyword added later).
    pub fn is_keyword(&self) -> bool {
        self.is_word() && self.kind != Tok::Ident
    }
    /// A keyword that begins a declaration.
    pub fn starts_item(&self) -> bool {
        self.kind.starts_item()
    }
    /// Something a value can end with: after it, `-` is subtraction, not a sign.
    pub fn ends_value(&self) -> bool {
        matches!(self.kind, Tok::Ident | Tok::Number(_) | Tok::Str)
            || matches!(self.text.as_str(), ")" | "]" | "}")
    }
    /// Something a new entry of a block can begin with.
    pub fn starts_value(&self) -> bool {
        matches!(self.kind, Tok::Ident | Tok::Number(_) | Tok::Str)
    }
    pub fn is_opener(&self) -> bool {
        matches!(self.text.as_str(), "(" | "[" | "{")
    }
    pub fn is_closer(&self) -> bool {
        matches!(self.text.as_str(), ")" | "]" | "}")
    }
    pub fn is(&self, text: &str) -> bool {
        self.text == text
    }
    /// An infix operator that gets a space on each side.
    pub fn is_operator(&self) -> bool {
        matches!(
            self.text.as_str(),
            "+" | "-"
                | "−"
                | "*"
                | "·"
                | "×"
                | "/"
                | "^"
                | "="
                | "<"
                | "<="
                | "≤"
                | ">"
                | ">="
                | "≥"
                | "±"
                | "+-"
        )
    }
    /// `+` or `-` written where a value starts.
    pub fn is_sign_after(&self, prev: Option<&Piece>) -> bool {
        matches!(self.text.as_str(), "+" | "-" | "−") && !prev.is_some_and(Piece::ends_value)
    }
}

/// The matching closer of every opener (by index into the pieces), if any.
pub fn match_brackets(pieces: &[Piece]) -> Vec<Option<usize>> {
    let mut matched = vec![None; pieces.len()];
    let mut stack: Vec<usize> = Vec::new();
    for (i, p) in pieces.iter().enumerate() {
        if p.is_opener() {
            stack.push(i);
        } else if p.is_closer() {
            let want = match p.text.as_str() {
                ")" => "(",
                "]" => "[",
                _ => "{",
            };
            if let Some(pos) = stack.iter().rposition(|&o| pieces[o].text == want) {
                matched[stack[pos]] = Some(i);
                stack.truncate(pos);
            }
        }
    }
    matched
}
