//! Semantic tokens: the compiler's highlight classes in the standard token types, so any theme
//! colours them.

use crate::proto::lsp;
use crate::snapshot::Snapshot;
use caloris_compiler::query::{highlights, Class};
use caloris_compiler::span::FileId;
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
    let lines = snap.lines(FileId(0));
    let mut data = Vec::new();
    let (mut prev_line, mut prev_start) = (0u32, 0u32);
    for h in highlights(&snap.analysis, FileId(0)) {
        let start = lines.line_col_utf16(h.span.start);
        let end = lines.line_col_utf16(h.span.end);
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
