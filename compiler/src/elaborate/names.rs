//! Pass 1, names: the declarations of imported files that may not be imported are set aside
//! (W105), and every name goes into the symbol table — one namespace per model, a name
//! declared twice is E201 — with the elements of each build-up as its children.

use crate::diagnostic::Diagnostic;
use crate::span::Span;
use crate::symbols::{Symbol, SymbolKind, SymbolTable};
use crate::syntax::{Item, ItemKind, Module};
use rustc_hash::FxHashMap;

/// What the names pass finds.
pub(super) struct Names<'m> {
    /// The declarations elaboration uses, the root model's first.
    pub items: Vec<&'m Item>,
    pub symbols: SymbolTable,
    pub title: Option<String>,
    pub diags: Vec<Diagnostic>,
}

pub(super) fn collect<'m>(modules: &[&'m Module]) -> Names<'m> {
    let mut diags = Vec::new();
    let mut symbols = SymbolTable::default();
    let mut title = None;
    let mut items: Vec<&Item> = Vec::new();
    for (i, m) in modules.iter().enumerate() {
        for item in &m.items {
            if i > 0
                && matches!(
                    item.kind,
                    ItemKind::Node { .. }
                        | ItemKind::Link { .. }
                        | ItemKind::Limit { .. }
                        | ItemKind::Title { .. }
                        | ItemKind::Region { .. }
                )
            {
                diags.push(
                    Diagnostic::warning("W105", "an imported file's nodes, links, limits and title are not used", item.span)
                        .with_label("ignored in the importing model")
                        .with_help("imports bring in materials, parameters and build-ups; move this declaration into the model that uses it"),
                );
                continue;
            }
            items.push(item);
        }
    }
    let mut by_name: FxHashMap<&str, &Item> = FxHashMap::default();
    for item in &items {
        if let ItemKind::Title { text } = &item.kind {
            title = Some(text.clone());
        }
        let Some(name) = item.name() else { continue };
        if let Some(first) = by_name.get(name.name.as_str()) {
            let first_name = first.name().map(|n| n.span).unwrap_or(first.span);
            diags.push(
                Diagnostic::error("E201", format!("`{}` is declared twice", name.name), name.span)
                    .with_label("declared again here")
                    .with_secondary(first_name, "first declared here")
                    .with_help("every parameter, material, node, link, build-up and limit needs its own name; rename one of them"),
            );
            continue;
        }
        by_name.insert(&name.name, item);
        let kind = match item.kind {
            ItemKind::Param { .. } => SymbolKind::Param,
            ItemKind::Material { .. } => SymbolKind::Material,
            ItemKind::Node { .. } => SymbolKind::Node,
            ItemKind::Link { .. } => SymbolKind::Link,
            ItemKind::Buildup { .. } => SymbolKind::Buildup,
            ItemKind::Declaration { ref word, .. } => symbol_kind(&word.name),
            // A region is a body that carries heat, like a link; its cells are generated nodes.
            ItemKind::Region { .. } => SymbolKind::Link,
            _ => SymbolKind::Limit,
        };
        symbols.push(Symbol {
            name: name.name.clone(),
            kind,
            def: name.span,
            decl: item.span,
            refs: Vec::new(),
            parent: None,
        });
        if let ItemKind::Buildup { elements, .. } = &item.kind {
            let mut seen: FxHashMap<&str, Span> = FxHashMap::default();
            for e in elements {
                if let Some(prev) = seen.insert(&e.name.name, e.name.span) {
                    diags.push(
                        Diagnostic::error(
                            "E201",
                            format!(
                                "build-up `{}` has two elements named `{}`",
                                name.name, e.name.name
                            ),
                            e.name.span,
                        )
                        .with_label("second element with this name")
                        .with_secondary(prev, "first one here")
                        .with_help(
                            "give each element its own name; it names the interface node after it",
                        ),
                    );
                }
                symbols.push(Symbol {
                    name: e.name.name.clone(),
                    kind: SymbolKind::BuildupElement,
                    def: e.name.span,
                    decl: e.span,
                    refs: Vec::new(),
                    parent: Some(name.name.clone()),
                });
            }
        }
    }
    Names {
        items,
        symbols,
        title,
        diags,
    }
}

/// The symbol kind of a contextual declaration word.
fn symbol_kind(word: &str) -> SymbolKind {
    match word {
        "schedule" => SymbolKind::Schedule,
        "case" => SymbolKind::Case,
        _ => SymbolKind::Transient,
    }
}
