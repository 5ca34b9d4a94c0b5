//! Document formatting: the compiler's canonical formatter, returned as one whole-document edit.
//! A document with syntax errors is left alone (the formatter refuses rather than lose text).

use crate::proto;
use crate::proto::lsp::TextEdit;
use crate::snapshot::Snapshot;
use caloris_compiler::format::format_source;
use caloris_compiler::span::{FileId, Span};

pub fn format_document(snap: &Snapshot) -> Option<Vec<TextEdit>> {
    let text = snap.text();
    let formatted = format_source(text).ok()?;
    if formatted == text {
        return Some(Vec::new());
    }
    let whole = Span::new(FileId(0), 0, text.len());
    Some(vec![TextEdit {
        range: proto::range(snap.lines(FileId(0)), whole),
        new_text: formatted,
    }])
}
