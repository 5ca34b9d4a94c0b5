//! Semantic tokens: the compiler's highlight classes in the standard token types, so any theme
//! colours them.

use crate::proto::lsp;
use crate::snapshot::Snapshot;
use caloris_compiler::query::{highlights, Class};
use caloris_compiler::span::FileId;
use caloris_compiler::span::LineCol;
use caloris_compiler::symbols::SymbolKind;
use lsp::{
    SemanticToken, SemanticTokenModifier, SemanticTokenType, SemanticTokens, SemanticTokensLegend,
};

/// Token types, indexed by the numbers in the encoded tokens.
pub const TYPES: &[SemanticTokenType] = &[
    SemanticTokenType::KEYWORD,     // 0
    SemanticTokenType::COMMENT,     // 1
    SemanticTokenType::STRING,      // 2
    SemanticTokenType::NUMBER,      // 3
    SemanticTokenType::TYPE,        // 4 unit
    SemanticTokenType::OPERATOR,    // 5
    SemanticTokenType::VARIABLE,    // 6 node, parameter
    SemanticTokenType::STRUCT,      // 7 material
    SemanticTokenType::PROPERTY,    // 8 link, build-up element, argument name
    SemanticTokenType::CLASS,       // 9 build-up
    SemanticTokenType::FUNCTION,    // 10 element kind, measure, function
    SemanticTokenType::ENUM_MEMBER, // 11 limit
];

pub const MODIFIERS: &[SemanticTokenModifier] = &[
    SemanticTokenModifier::DECLARATION,
    SemanticTokenModifier::READONLY,
    SemanticTokenModifier::DEFAULT_LIBRARY,
];

const DECLARATION: u32 = 1;
const READONLY: u32 = 2;
const DEFAULT_LIBRARY: u32 = 4;

pub fn legend() -> SemanticTokensLegend {
    SemanticTokensLegend {
        token_types: TYPES.to_vec(),
        token_modifiers: MODIFIERS.to_vec(),
    }
}

fn encode_class(c: Class) -> (u32, u32) {
    match c {
        Class::Keyword => (0, 0),
        Class::Comment => (1, 0),
        Class::String => (2, 0),
        Class::Number => (3, 0),
        Class::Unit => (4, 0),
        Class::Operator => (5, 0),
        Class::Symbol(SymbolKind::Param) => (6, READONLY),
        Class::Symbol(SymbolKind::Node | SymbolKind::GeneratedNode) => (6, 0),
        Class::Symbol(SymbolKind::Material) => (7, 0),
        Class::Symbol(SymbolKind::Link | SymbolKind::BuildupElement) => (8, 0),
        Class::Symbol(SymbolKind::Buildup) => (9, 0),
        Class::Symbol(SymbolKind::Limit) => (11, 0),
        Class::Symbol(SymbolKind::Schedule | SymbolKind::Case | SymbolKind::Transient) => (9, 0),
        Class::ElementKind | Class::Measure | Class::Function => (10, DEFAULT_LIBRARY),
        Class::ArgName => (8, 0),
    }
}

/// All tokens of the document, encoded relative to each other as the protocol requires.
pub fn semantic_tokens(snap: &Snapshot) -> SemanticTokens {
    let mut cursor = Cursor::new(snap.text());
    let mut data = Vec::new();
    let (mut prev_line, mut prev_start) = (0u32, 0u32);
    for h in highlights(&snap.analysis, FileId(0)) {
        let start = cursor.at(h.span.start);
        let end = cursor.at(h.span.end);
        // Tokens never span lines in this language; guard anyway.
        if end.line != start.line || end.col <= start.col {
            continue;
        }
        let (ty, mut mods) = encode_class(h.class);
        if h.declaration {
            mods |= DECLARATION;
        }
        let delta_line = start.line - prev_line;
        let delta_start = if delta_line == 0 {
            start.col - prev_start
        } else {
            start.col
        };
        data.push(SemanticToken {
            delta_line,
            delta_start,
            length: end.col - start.col,
            token_type: ty,
            token_modifiers_bitset: mods,
        });
        prev_line = start.line;
        prev_start = start.col;
    }
    SemanticTokens {
        result_id: None,
        data,
    }
}

/// Line and UTF-16 column of offsets visited in increasing order, each found by counting on
/// from the one before. A generated line of a hundred thousand characters holds tens of
/// thousands of tokens; counting each from the line's start would take minutes.
struct Cursor<'t> {
    text: &'t str,
    offset: usize,
    at: LineCol,
}

impl<'t> Cursor<'t> {
    fn new(text: &'t str) -> Self {
        Cursor {
            text,
            offset: 0,
            at: LineCol { line: 0, col: 0 },
        }
    }

    /// The position of `offset`; an offset before the last one (or inside a character) starts
    /// the count again from the beginning of the text.
    fn at(&mut self, offset: u32) -> LineCol {
        let mut target = (offset as usize).min(self.text.len());
        while !self.text.is_char_boundary(target) {
            target -= 1;
        }
        if target < self.offset {
            *self = Cursor::new(self.text);
        }
        for c in self.text[self.offset..target].chars() {
            if c == '\n' {
                self.at.line += 1;
                self.at.col = 0;
            } else {
                self.at.col += c.len_utf16() as u32;
            }
        }
        self.offset = target;
        self.at
    }
}

#[cfg(test)]
mod tests {
    use super::Cursor;
    use caloris_compiler::span::LineIndex;

    #[test]
    fn the_cursor_agrees_with_the_line_index() {
        let text = "node a (fixed = 20 °C)\n# naïve “quotes” 𝄞\nparam p = 1 m²\n";
        let index = LineIndex::new(text);
        let mut cursor = Cursor::new(text);
        let offsets: Vec<u32> = (0..=text.len() as u32)
            .filter(|&o| text.is_char_boundary(o as usize))
            .collect();
        for &o in offsets.iter().chain(offsets.iter().rev().step_by(7)) {
            assert_eq!(cursor.at(o), index.line_col_utf16(o), "offset {o}");
        }
    }
}
