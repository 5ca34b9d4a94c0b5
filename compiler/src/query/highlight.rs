//! Token classes for semantic highlighting: the lexer's tokens, with names classified by what
//! they were resolved to.

use crate::analysis::Analysis;
use crate::elements;
use crate::lexer::{lex, Tok};
use crate::schema;
use crate::span::{FileId, Span};
use crate::symbols::SymbolKind;
use std::collections::HashMap;

/// What a highlighted piece of text is.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Class {
    Keyword,
    Comment,
    String,
    Number,
    /// The unit written after a number.
    Unit,
    Operator,
    /// A declared name, by the kind of thing it names.
    Symbol(SymbolKind),
    ElementKind,
    Measure,
    /// A standard function or `pi`.
    Function,
    /// An argument name in `name = value`.
    ArgName,
}

#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct Highlight {
    pub span: Span,
    pub class: Class,
    /// True where a name is declared rather than used.
    pub declaration: bool,
}

/// A standard function or constant of expressions (see `crate::schema`).
fn is_function(word: &str) -> bool {
    schema::function(word).is_some() || schema::CONSTANTS.iter().any(|c| c.0 == word)
}

/// Highlights of one file of the analysis, in text order. Names that resolve to nothing (a
/// typo the diagnostics already report) get no class.
pub fn highlights(a: &Analysis, file: FileId) -> Vec<Highlight> {
    let mut names: HashMap<u32, (SymbolKind, bool)> = HashMap::new();
    for s in &a.symbols.symbols {
        if s.def.file == file {
            names.entry(s.def.start).or_insert((s.kind, true));
        }
        for r in s.refs.iter().filter(|r| r.file == file) {
            names.entry(r.start).or_insert((s.kind, false));
        }
    }
    let text = a.sources.text(file);
    let tokens = lex(text, file);
    let mut out = Vec::with_capacity(tokens.len());
    let mut depth = 0i32;
    for (i, t) in tokens.iter().enumerate() {
        let next = tokens[i + 1..]
            .iter()
            .find(|n| n.kind != Tok::Comment)
            .map(|n| n.kind);
        let plain = |class| Highlight {
            span: t.span,
            class,
            declaration: false,
        };
        match t.kind {
            Tok::Comment => out.push(plain(Class::Comment)),
            Tok::Str | Tok::UnterminatedStr => out.push(plain(Class::String)),
            Tok::Title
            | Tok::Import
            | Tok::Param
            | Tok::Material
            | Tok::Node
            | Tok::Link
            | Tok::Buildup
            | Tok::Limit
            | Tok::To => out.push(plain(Class::Keyword)),
            Tok::Number(len) => {
                let num_end = t.span.start + len;
                out.push(Highlight {
                    span: Span {
                        end: num_end,
                        ..t.span
                    },
                    class: Class::Number,
                    declaration: false,
                });
                let unit = &text[num_end as usize..t.span.end as usize];
                let lead = (unit.len() - unit.trim_start().len()) as u32;
                if num_end + lead < t.span.end {
                    out.push(Highlight {
                        span: Span {
                            start: num_end + lead,
                            ..t.span
                        },
                        class: Class::Unit,
                        declaration: false,
                    });
                }
            }
            Tok::Eq
            | Tok::Plus
            | Tok::Minus
            | Tok::Star
            | Tok::Slash
            | Tok::Caret
            | Tok::Lt
            | Tok::Le
            | Tok::Gt
            | Tok::Ge
            | Tok::PlusMinus => out.push(plain(Class::Operator)),
            Tok::LParen => depth += 1,
            Tok::RParen => depth -= 1,
            Tok::Ident => {
                let word = &text[t.span.range()];
                let class = if let Some(&(kind, declaration)) = names.get(&t.span.start) {
                    Some((Class::Symbol(kind), declaration))
                } else if depth > 0 && next == Some(Tok::Eq) {
                    Some((Class::ArgName, false))
                } else if next == Some(Tok::LParen) && elements::lookup(word).is_some() {
                    Some((Class::ElementKind, false))
                } else if next == Some(Tok::LParen) && schema::measure(word).is_some() {
                    Some((Class::Measure, false))
                } else if contextual_keyword(text, &tokens, i) {
                    Some((Class::Keyword, false))
                } else if is_function(word) {
                    Some((Class::Function, false))
                } else {
                    None
                };
                if let Some((class, declaration)) = class {
                    out.push(Highlight {
                        span: t.span,
                        class,
                        declaration,
                    });
                }
            }
            _ => {}
        }
    }
    out
}

/// Whether token `i` is a contextual declaration word (`schedule`, `region`, ...) where it
/// begins a declaration: first on its line and followed by a name.
fn contextual_keyword(text: &str, tokens: &[crate::lexer::Token], i: usize) -> bool {
    let t = tokens[i];
    let word = &text[t.span.range()];
    let line_start = text[..t.span.start as usize]
        .rfind('\n')
        .map_or(0, |p| p + 1);
    schema::contextual_words().any(|w| w == word)
        && text[line_start..t.span.start as usize].trim().is_empty()
        && tokens.get(i + 1).is_some_and(|n| n.kind == Tok::Ident)
}
