//! Go to definition and find references, within one analysis; the server merges the answers of
//! several analyses for names that cross files.

use crate::proto::lsp;
use crate::snapshot::Snapshot;
use caloris_compiler::query::{network_at, target_at, NetworkRefs, Target};
use caloris_compiler::span::FileId;
use caloris_compiler::symbols::Symbol;
use lsp::{Location, Position};

/// The symbol under the cursor.
pub fn symbol_at(snap: &Snapshot, pos: Position) -> Option<&Symbol> {
    match target_at(&snap.analysis, FileId(0), snap.offset(pos))? {
        Target::Symbol { symbol, .. } => Some(symbol),
        _ => None,
    }
}

/// Where the name under the cursor is declared.
pub fn definition(snap: &Snapshot, pos: Position) -> Option<Location> {
    match symbol_at(snap, pos) {
        Some(s) => snap.location(s.def),
        None => snap.location(network(snap, pos)?.def),
    }
}

/// The sub-network declared or named by a `use` under the cursor.
pub fn network(snap: &Snapshot, pos: Position) -> Option<NetworkRefs> {
    network_at(&snap.analysis, FileId(0), snap.offset(pos))
}

/// The declaration (if asked) and every `use` of the sub-network under the cursor, in the
/// document and the files it imports.
pub fn network_references(
    snap: &Snapshot,
    pos: Position,
    include_declaration: bool,
) -> Option<Vec<Location>> {
    let n = network(snap, pos)?;
    let decl = include_declaration.then_some(n.def);
    Some(
        decl.into_iter()
            .chain(n.uses.iter().copied())
            .filter_map(|span| snap.location(span))
            .collect(),
    )
}

/// A name's identity across analyses: the file it is declared in and where.
#[derive(Clone, Debug, PartialEq, Eq, Hash)]
pub struct SymbolKey {
    pub file: String,
    pub start: u32,
    pub name: String,
}

pub fn key(snap: &Snapshot, s: &Symbol) -> SymbolKey {
    SymbolKey {
        file: snap.analysis.sources.name(s.def.file).to_string(),
        start: s.def.start,
        name: s.name.clone(),
    }
}

/// The same symbol in another analysis, if that analysis includes its file.
pub fn find<'a>(snap: &'a Snapshot, k: &SymbolKey) -> Option<&'a Symbol> {
    let file = snap.analysis.sources.find(&k.file)?;
    snap.analysis
        .symbols
        .symbols
        .iter()
        .find(|s| s.def.file == file && s.def.start == k.start && s.name == k.name)
}

/// Every place the symbol `k` appears in one analysis.
pub fn references(snap: &Snapshot, k: &SymbolKey, include_declaration: bool) -> Vec<Location> {
    let Some(s) = find(snap, k) else {
        return Vec::new();
    };
    let decl = include_declaration.then_some(s.def);
    decl.into_iter()
        .chain(s.refs.iter().copied())
        .filter_map(|span| snap.location(span))
        .collect()
}
