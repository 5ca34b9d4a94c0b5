//! The language server's features on one analysed document, called as the server calls them
//! (each feature is a function of a [`Snapshot`] and a position, see `lsp/src/lib.rs`):
//! published diagnostics, semantic tokens, symbols, inlay hints, formatting, and at a few
//! positions hover, completion, signature help, definition, references, code actions and
//! rename. Positions include some a client may send past the end of a line or of the text.

use caloris_compiler::span::{FileId, Span};
use caloris_lsp::proto::lsp::{Position, Range, Uri};
use caloris_lsp::settings::{Settings, Units};
use caloris_lsp::snapshot::Snapshot;
use caloris_lsp::{
    code_actions, completion, diagnostics, formatting, hover, inlay_hints, navigation, rename,
    semantic_tokens, signature_help, symbols,
};
use std::str::FromStr;
use std::sync::Arc;

/// Where the fuzzed document lives. No such folder exists, so imports of other files fail with
/// their error; the project fence keeps every read inside it.
pub const DOC_PATH: &str = "/caloris-fuzz/model.heat";

pub fn doc_uri() -> Uri {
    // A constant, well-formed URI; parsing it cannot fail.
    Uri::from_str(&format!("file://{DOC_PATH}")).unwrap_or_else(|_| unreachable!("valid URI"))
}

/// The whole-document features, then the positional ones at each of `offsets` (byte offsets
/// into the text, clamped and moved to a character boundary here). Returns a count of answers
/// so the work cannot be optimised away.
pub fn features(snap: &Arc<Snapshot>, offsets: &[usize]) -> usize {
    let auto = Settings::default();
    let us = Settings {
        units: Units::Us,
        ..Settings::default()
    };
    let text = snap.text();
    let lines = snap.lines(FileId(0));
    let end = caloris_lsp::proto::position(lines, text.len() as u32);
    let whole = Range {
        start: Position::default(),
        end,
    };
    let mut n = diagnostics::to_lsp(snap).len();
    n += semantic_tokens::semantic_tokens(snap).data.len();
    n += symbols::document_symbols(snap, &auto).len();
    n += inlay_hints::inlay_hints(snap, whole, &auto).len();
    n += inlay_hints::inlay_hints(snap, whole, &us).len();
    n += formatting::format_document(snap).map_or(0, |e| e.len());

    let mut positions: Vec<Position> = offsets
        .iter()
        .map(|&off| {
            let mut off = off.min(text.len());
            while !text.is_char_boundary(off) {
                off -= 1;
            }
            caloris_lsp::proto::position(lines, off as u32)
        })
        .collect();
    // What an editor with a stale view of the text may ask.
    positions.push(Position {
        line: end.line,
        character: end.character + 5,
    });
    positions.push(Position {
        line: end.line + 3,
        character: 0,
    });
    // The server hands rename and workspace symbols every open document; here, this one.
    let snaps = std::slice::from_ref(snap);
    n += symbols::workspace_symbols(snaps, "a").len();
    for (i, &pos) in positions.iter().enumerate() {
        let settings = if i % 2 == 0 { &auto } else { &us };
        n += hover::hover(snap, pos, settings).is_some() as usize;
        n += completion::completion(snap, pos).len();
        n += signature_help::signature_help(snap, pos).is_some() as usize;
        n += navigation::definition(snap, pos).is_some() as usize;
        n += navigation::network_references(snap, pos, true).map_or(0, |r| r.len());
        if let Some(s) = navigation::symbol_at(snap, pos) {
            let key = navigation::key(snap, s);
            n += navigation::references(snap, &key, true).len();
        }
        let range = Range {
            start: pos,
            end: Position {
                line: pos.line,
                character: pos.character + 3,
            },
        };
        n += code_actions::code_actions(snap, range).len();
        n += rename::prepare(snap, pos).is_ok_and(|r| r.is_some()) as usize;
        n += rename::rename(snap, snaps, pos, "renamed").is_ok_and(|r| r.is_some()) as usize;
    }
    n
}

/// Offsets an editor would ask about: the starts of the first diagnostics and some picked from
/// the text's hash (so the same input asks at the same places).
pub fn offsets(text: &str, diagnostic_spans: impl Iterator<Item = Span>) -> Vec<usize> {
    let mut offsets: Vec<usize> = diagnostic_spans
        .filter(|s| s.file == FileId(0))
        .take(4)
        .map(|s| s.start as usize)
        .collect();
    let mut h = crate::rng::hash(text.as_bytes());
    for _ in 0..6 {
        h = h.rotate_left(17).wrapping_mul(0x9E37_79B9_7F4A_7C15);
        offsets.push((h % (text.len() as u64 + 1)) as usize);
    }
    offsets
}
