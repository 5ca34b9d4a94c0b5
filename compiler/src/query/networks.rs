//! Sub-network names: where each `network` is declared and every `use` that names it. The
//! symbol table cannot hold them (uses are expanded into plain declarations before names are
//! resolved), so they are read from the parsed modules.

use crate::analysis::Analysis;
use crate::span::{FileId, Span};
use crate::syntax::{Item, ItemKind};

/// A sub-network's declaration and its uses.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct NetworkRefs {
    pub name: String,
    /// The name at its declaration.
    pub def: Span,
    /// The whole `network` declaration.
    pub decl: Span,
    /// The network name in every `use`.
    pub uses: Vec<Span>,
}

fn walk<'a>(items: &'a [Item], f: &mut impl FnMut(&'a Item)) {
    for item in items {
        f(item);
        match &item.kind {
            ItemKind::Network { body, .. } | ItemKind::Repeat { body, .. } => walk(body, f),
            _ => {}
        }
    }
}

/// Every sub-network of the model and its imports; the first declaration of a name counts, as
/// in the expansion.
pub fn networks(a: &Analysis) -> Vec<NetworkRefs> {
    let mut out: Vec<NetworkRefs> = Vec::new();
    let mut uses = Vec::new();
    for (_, module) in &a.modules {
        walk(&module.items, &mut |item| match &item.kind {
            ItemKind::Network { name, .. } if !out.iter().any(|n| n.name == name.name) => {
                out.push(NetworkRefs {
                    name: name.name.clone(),
                    def: name.span,
                    decl: item.span,
                    uses: Vec::new(),
                })
            }
            ItemKind::Use { network, .. } => uses.push(network),
            _ => {}
        });
    }
    for u in uses {
        if let Some(n) = out.iter_mut().find(|n| n.name == u.name) {
            n.uses.push(u.span);
        }
    }
    out
}

/// The sub-network whose name is declared or used at `offset` of `file`.
pub fn network_at(a: &Analysis, file: FileId, offset: u32) -> Option<NetworkRefs> {
    let hit = |s: &Span| s.file == file && s.start <= offset && offset <= s.end;
    networks(a)
        .into_iter()
        .find(|n| hit(&n.def) || n.uses.iter().any(hit))
}
