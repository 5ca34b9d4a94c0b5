//! Declarations and references of every name, for navigation (definition, references, rename,
//! outline) and for the one namespace rule: a name is declared once per model.

use crate::span::Span;
use rustc_hash::FxHashMap;
use serde::Serialize;

#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum SymbolKind {
    Param,
    Material,
    Node,
    Link,
    Buildup,
    /// An element inside a build-up.
    BuildupElement,
    Limit,
    /// An interface node made by a build-up (`north.inside`).
    GeneratedNode,
    /// A time table of boundary temperatures or loads (`schedule`).
    Schedule,
    /// A named set of parameter values (`case`).
    Case,
    /// A transient run's settings (`transient`).
    Transient,
}

impl SymbolKind {
    /// "a parameter", "a node", ... for messages.
    pub fn article(self) -> &'static str {
        match self {
            SymbolKind::Param => "a parameter",
            SymbolKind::Material => "a material",
            SymbolKind::Node | SymbolKind::GeneratedNode => "a node",
            SymbolKind::Link => "a link",
            SymbolKind::Buildup => "a build-up",
            SymbolKind::BuildupElement => "a build-up element",
            SymbolKind::Limit => "a limit",
            SymbolKind::Schedule => "a schedule",
            SymbolKind::Case => "a case",
            SymbolKind::Transient => "a transient run",
        }
    }
}

#[derive(Clone, Debug, Serialize)]
pub struct Symbol {
    pub name: String,
    pub kind: SymbolKind,
    /// The name at its declaration.
    pub def: Span,
    /// The whole declaration.
    pub decl: Span,
    /// Every place the name is used.
    pub refs: Vec<Span>,
    /// For build-up elements: the build-up they belong to.
    pub parent: Option<String>,
}

#[derive(Clone, Debug, Default, Serialize)]
pub struct SymbolTable {
    pub symbols: Vec<Symbol>,
    /// First symbol of each name (build-up elements excluded). Models reach 10⁵ names, so name
    /// lookups must not scan; symbols pushed directly onto `symbols` are still found by the
    /// scanning fallback.
    #[serde(skip)]
    index: FxHashMap<String, usize>,
    /// How many symbols went through [`SymbolTable::push`]. While that is all of them the
    /// index is complete and a name it lacks is unknown without a scan: an unknown name in
    /// each of 10 000 copies of a `repeat` would otherwise scan the whole table each time.
    #[serde(skip)]
    pushed: usize,
}

impl SymbolTable {
    pub fn push(&mut self, symbol: Symbol) {
        if symbol.kind != SymbolKind::BuildupElement {
            self.index
                .entry(symbol.name.clone())
                .or_insert(self.symbols.len());
        }
        self.symbols.push(symbol);
        self.pushed += 1;
    }
    fn position(&self, name: &str) -> Option<usize> {
        match self.index.get(name) {
            Some(&i) => Some(i),
            None if self.pushed == self.symbols.len() => None,
            None => self
                .symbols
                .iter()
                .position(|s| s.name == name && s.kind != SymbolKind::BuildupElement),
        }
    }
    pub fn get(&self, name: &str) -> Option<&Symbol> {
        self.position(name).map(|i| &self.symbols[i])
    }
    pub fn add_ref(&mut self, name: &str, span: Span) {
        if let Some(i) = self.position(name) {
            self.symbols[i].refs.push(span);
        }
    }
    pub fn add_element_ref(&mut self, buildup: &str, element: &str, span: Span) {
        if let Some(s) = self.symbols.iter_mut().find(|s| {
            s.kind == SymbolKind::BuildupElement
                && s.name == element
                && s.parent.as_deref() == Some(buildup)
        }) {
            s.refs.push(span);
        }
    }
    /// The symbol declared or used at a byte offset of a file.
    pub fn at(&self, span_file: crate::span::FileId, offset: u32) -> Option<&Symbol> {
        self.symbols.iter().find(|s| {
            (s.def.file == span_file && s.def.contains(offset))
                || s.refs
                    .iter()
                    .any(|r| r.file == span_file && r.contains(offset))
        })
    }
    pub fn names_of(&self, kind: SymbolKind) -> impl Iterator<Item = &str> {
        self.symbols
            .iter()
            .filter(move |s| s.kind == kind)
            .map(|s| s.name.as_str())
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::span::FileId;

    fn symbol(name: &str) -> Symbol {
        let span = Span::new(FileId(0), 0, 1);
        Symbol {
            name: name.to_string(),
            kind: SymbolKind::Node,
            def: span,
            decl: span,
            refs: Vec::new(),
            parent: None,
        }
    }

    #[test]
    fn finds_symbols_pushed_either_way() {
        let mut t = SymbolTable::default();
        t.push(symbol("room"));
        assert!(t.get("room").is_some());
        assert!(t.get("attic").is_none());
        // Pushed past the index: found by the scan.
        t.symbols.push(symbol("attic"));
        assert_eq!(t.get("attic").map(|s| s.name.as_str()), Some("attic"));
        assert!(t.get("cellar").is_none());
    }
}
