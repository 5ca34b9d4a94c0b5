//! Rename: nodes, links, materials, parameters, build-ups, their elements and limits, in every
//! file of every analysis that sees the name (a material declared in an imported library is
//! renamed in the library and in each open model that imports it).

use crate::navigation::{find, key, symbol_at};
use crate::proto::lsp;
use crate::snapshot::Snapshot;
use caloris_compiler::query::{check_new_name, rename_edits, target_at, Target};
use caloris_compiler::span::FileId;
use caloris_compiler::symbols::SymbolKind;
use lsp::{Position, PrepareRenameResponse, TextEdit, Uri, WorkspaceEdit};
use std::collections::HashMap;
use std::sync::Arc;

/// The name under the cursor and its range, or why it cannot be renamed (`Ok(None)`: nothing
/// renamable here).
pub fn prepare(snap: &Snapshot, pos: Position) -> Result<Option<PrepareRenameResponse>, String> {
    let Some(Target::Symbol { symbol, span }) =
        target_at(&snap.analysis, FileId(0), snap.offset(pos))
    else {
        return Ok(None);
    };
    if symbol.kind == SymbolKind::GeneratedNode {
        return Err(format!(
            "`{}` is made by a build-up: rename the link or the build-up element instead",
            symbol.name
        ));
    }
    Ok(Some(PrepareRenameResponse::RangeWithPlaceholder {
        range: snap.range(span),
        placeholder: symbol.name.clone(),
    }))
}

/// The edits renaming the symbol under the cursor of `snap` to `new_name`, over `snap` and the
/// `others` analyses that include its declaration.
pub fn rename(
    snap: &Snapshot,
    others: &[Arc<Snapshot>],
    pos: Position,
    new_name: &str,
) -> Result<Option<WorkspaceEdit>, String> {
    let Some(symbol) = symbol_at(snap, pos) else {
        return Ok(None);
    };
    if symbol.kind == SymbolKind::GeneratedNode {
        return Err(format!(
            "`{}` is made by a build-up: rename the link or the build-up element instead",
            symbol.name
        ));
    }
    let k = key(snap, symbol);
    let mut changes: HashMap<Uri, Vec<TextEdit>> = HashMap::new();
    for s in std::iter::once(snap).chain(others.iter().map(|o| o.as_ref())) {
        let Some(sym) = find(s, &k) else { continue };
        check_new_name(&s.analysis, sym, new_name)?;
        for (span, text) in rename_edits(&s.analysis, sym, new_name) {
            let Some(uri) = s.uri_of(span.file) else {
                continue;
            };
            let edit = TextEdit {
                range: s.range(span),
                new_text: text,
            };
            let list = changes.entry(uri).or_default();
            if !list.contains(&edit) {
                list.push(edit);
            }
        }
    }
    for list in changes.values_mut() {
        list.sort_by_key(|e| (e.range.start.line, e.range.start.character));
    }
    Ok(Some(WorkspaceEdit {
        changes: Some(changes),
        ..WorkspaceEdit::default()
    }))
}
