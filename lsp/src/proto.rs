//! The protocol types the server uses (one place, so a change of the types crate stays local),
//! and conversions between the compiler's byte spans and protocol positions.

pub use tower_lsp_server::ls_types as lsp;

use caloris_compiler::span::{LineCol, LineIndex, Span};
use lsp::{Position, Range, Uri};
use std::path::{Path, PathBuf};

/// A protocol position (UTF-16 columns) for a byte offset.
pub fn position(lines: &LineIndex, offset: u32) -> Position {
    let lc = lines.line_col_utf16(offset);
    Position {
        line: lc.line,
        character: lc.col,
    }
}

/// A protocol range for a span of the text `lines` indexes.
pub fn range(lines: &LineIndex, span: Span) -> Range {
    Range {
        start: position(lines, span.start),
        end: position(lines, span.end),
    }
}

/// The byte offset of a protocol position; positions past a line's end clamp to it.
pub fn offset(lines: &LineIndex, pos: Position) -> u32 {
    lines.offset_utf16(LineCol {
        line: pos.line,
        col: pos.character,
    })
}

/// True when two ranges share some text (ranges are end-exclusive).
pub fn overlaps(a: Range, b: Range) -> bool {
    a.start < b.end && b.start < a.end
}

/// True when two ranges overlap or touch (a cursor at either end of a range touches it).
pub fn touches(a: Range, b: Range) -> bool {
    !(a.end < b.start || b.end < a.start)
}

/// The local path of a `file:` URI.
pub fn uri_path(uri: &Uri) -> Option<PathBuf> {
    if uri.scheme().as_str() != "file" {
        return None;
    }
    uri.to_file_path().map(|p| p.into_owned())
}

/// The `file:` URI of an absolute path.
pub fn path_uri(path: &Path) -> Option<Uri> {
    Uri::from_file_path(path)
}
