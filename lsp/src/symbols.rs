//! Document symbols (the outline) and workspace symbols.

use crate::display::{one, point, q};
use crate::proto::lsp;
use crate::settings::Settings;
use crate::snapshot::Snapshot;
use caloris_compiler::span::FileId;
use caloris_compiler::symbols::SymbolKind as Kind;
use caloris_compiler::syntax::{Item, ItemKind};
use caloris_compiler::units::Dim;
use lsp::{DocumentSymbol, Location, OneOf, SymbolKind, WorkspaceSymbol};
use std::sync::Arc;

fn kind(k: Kind) -> SymbolKind {
    match k {
        Kind::Param => SymbolKind::CONSTANT,
        Kind::Material => SymbolKind::STRUCT,
        Kind::Node | Kind::GeneratedNode => SymbolKind::VARIABLE,
        Kind::Link => SymbolKind::FUNCTION,
        Kind::Buildup => SymbolKind::CLASS,
        Kind::BuildupElement => SymbolKind::FIELD,
        Kind::Limit => SymbolKind::BOOLEAN,
        Kind::Schedule => SymbolKind::EVENT,
        Kind::Case | Kind::Transient => SymbolKind::MODULE,
    }
}

#[allow(deprecated)] // `DocumentSymbol::deprecated` must still be written.
fn doc_symbol(
    name: String,
    detail: Option<String>,
    k: SymbolKind,
    range: lsp::Range,
    selection: lsp::Range,
    children: Option<Vec<DocumentSymbol>>,
) -> DocumentSymbol {
    DocumentSymbol {
        name,
        detail,
        kind: k,
        tags: None,
        deprecated: None,
        range,
        selection_range: selection,
        children,
    }
}

/// The outline of the document: its declarations in file order, build-ups with their elements.
pub fn document_symbols(snap: &Snapshot, settings: &Settings) -> Vec<DocumentSymbol> {
    let a = &snap.analysis;
    let sys = snap.system(settings);
    let text = snap.text();
    let mut out = Vec::new();
    for item in &a.root().items {
        if let ItemKind::Import { path, path_span } = &item.kind {
            out.push(doc_symbol(
                path.clone(),
                Some("import".into()),
                SymbolKind::MODULE,
                snap.range(item.span),
                snap.range(*path_span),
                None,
            ));
            continue;
        }
        if let Some(sym) = contextual(snap, item, text) {
            out.push(sym);
            continue;
        }
        let Some(name) = item.name() else { continue };
        let Some(sym) = a.symbols.symbols.iter().find(|s| s.def == name.span) else {
            continue;
        };
        let children = match &item.kind {
            ItemKind::Buildup { elements, .. } => Some(
                elements
                    .iter()
                    .map(|e| {
                        let detail = Some(text[e.element.span.range()].to_string());
                        doc_symbol(
                            e.name.name.clone(),
                            detail,
                            SymbolKind::FIELD,
                            snap.range(e.span),
                            snap.range(e.name.span),
                            None,
                        )
                    })
                    .collect(),
            ),
            _ => None,
        };
        out.push(doc_symbol(
            name.name.clone(),
            detail(snap, item, sys, text),
            kind(sym.kind),
            snap.range(item.span),
            snap.range(name.span),
            children,
        ));
    }
    out
}

/// The LSP kind of a declaration by its syntax, for names the symbol table does not hold
/// (the bodies of repetitions and sub-networks are templates, not declarations of the model).
fn item_kind(item: &Item) -> SymbolKind {
    match &item.kind {
        ItemKind::Param { .. } => SymbolKind::CONSTANT,
        ItemKind::Material { .. } => SymbolKind::STRUCT,
        ItemKind::Node { .. } => SymbolKind::VARIABLE,
        ItemKind::Link { .. } | ItemKind::Region { .. } => SymbolKind::FUNCTION,
        ItemKind::Buildup { .. } => SymbolKind::CLASS,
        ItemKind::Limit { .. } => SymbolKind::BOOLEAN,
        ItemKind::Repeat { .. } => SymbolKind::ARRAY,
        ItemKind::Network { .. } => SymbolKind::INTERFACE,
        ItemKind::Use { .. } => SymbolKind::OBJECT,
        _ => SymbolKind::MODULE,
    }
}

/// `repeat`, `network` and `use` (with their bodies as children), which have no symbol of
/// their own; `None` for other declarations.
fn contextual(snap: &Snapshot, item: &Item, text: &str) -> Option<DocumentSymbol> {
    let (name, detail, body) = match &item.kind {
        ItemKind::Repeat { name, args, body } => {
            let args = args
                .first()
                .zip(args.last())
                .map(|(f, l)| text[f.span.start as usize..l.span.end as usize].to_string());
            (name, args.map(|a| format!("repeat ({a})")), Some(body))
        }
        ItemKind::Network { name, ports, body } => {
            let ports: Vec<&str> = ports.iter().map(|p| p.name.as_str()).collect();
            (
                name,
                Some(format!("network ({})", ports.join(", "))),
                Some(body),
            )
        }
        ItemKind::Use { name, network, .. } => {
            (name, Some(format!("use of {}", network.name)), None)
        }
        _ => return None,
    };
    let children = body.map(|items| {
        items
            .iter()
            .filter_map(|i| {
                if let Some(sym) = contextual(snap, i, text) {
                    return Some(sym);
                }
                let n = i.name()?;
                Some(doc_symbol(
                    n.name.clone(),
                    None,
                    item_kind(i),
                    snap.range(i.span),
                    snap.range(n.span),
                    None,
                ))
            })
            .collect()
    });
    Some(doc_symbol(
        name.name.clone(),
        detail,
        item_kind(item),
        snap.range(item.span),
        snap.range(name.span),
        children,
    ))
}

fn detail(
    snap: &Snapshot,
    item: &Item,
    sys: caloris_compiler::units::UnitSystem,
    text: &str,
) -> Option<String> {
    let a = &snap.analysis;
    let sol = a.solution.as_ref();
    match &item.kind {
        ItemKind::Node { name, .. } => {
            let n = a.network.node_id(&name.name)?;
            let t = sol
                .map(|s| s.temperatures[n])
                .or(a.network.nodes[n].fixed)?;
            Some(one(point(t), sys))
        }
        ItemKind::Link {
            from, to, element, ..
        } => Some(format!(
            "{} → {} · {}",
            from.name, to.name, element.kind.name
        )),
        ItemKind::Material { name, .. } => {
            let m = a.materials.iter().find(|m| m.name == name.name)?;
            Some(format!("k = {}", one(q(m.k, Dim::CONDUCTIVITY), sys)))
        }
        ItemKind::Param { name, .. } => a
            .params
            .iter()
            .find(|p| p.0 == name.name)
            .and_then(|p| p.1)
            .map(|v| one(v, sys)),
        ItemKind::Buildup { elements, .. } => Some(format!("{} elements", elements.len())),
        ItemKind::Region { name, .. } => {
            let r = a.network.regions.iter().find(|r| r.name == name.name)?;
            Some(format!("region, {} × {} cells", r.nx, r.ny))
        }
        ItemKind::Declaration { word, .. } => Some(word.name.clone()),
        ItemKind::Limit { measure, .. } => {
            Some(text[measure.span.start as usize..item.span.end as usize].to_string())
        }
        _ => None,
    }
}

/// True when every character of `query` appears in `name` in order (case-insensitive).
fn matches(name: &str, query: &str) -> bool {
    let mut chars = name.chars().flat_map(char::to_lowercase);
    query
        .chars()
        .flat_map(char::to_lowercase)
        .all(|c| chars.any(|n| n == c))
}

/// Declarations matching `query` in the documents of the analyses (each file once).
pub fn workspace_symbols(snaps: &[Arc<Snapshot>], query: &str) -> Vec<WorkspaceSymbol> {
    let mut seen = std::collections::HashSet::new();
    let mut out = Vec::new();
    for snap in snaps {
        for s in &snap.analysis.symbols.symbols {
            if s.def.file != FileId(0) || s.kind == Kind::GeneratedNode || !matches(&s.name, query)
            {
                continue;
            }
            let Some(location) = snap.location(s.def) else {
                continue;
            };
            if !seen.insert((location.uri.as_str().to_string(), s.def.start)) {
                continue;
            }
            out.push(WorkspaceSymbol {
                name: s.name.clone(),
                kind: kind(s.kind),
                tags: None,
                container_name: s.parent.clone(),
                location: OneOf::Left(Location {
                    uri: location.uri,
                    range: location.range,
                }),
                data: None,
            });
        }
    }
    out.sort_by(|a, b| a.name.cmp(&b.name));
    out
}
