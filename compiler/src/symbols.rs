//! Declarations and references of every name, for navigation (definition, references, rename,
//! outline) and for the one namespace rule: a name is declared once per model.

use crate::span::Span;
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
}

impl SymbolTable {
    pub fn get(&self, name: &str) -> Option<&Symbol> {
        self.symbols
            .iter()
            .find(|s| s.name == name && s.kind != SymbolKind::BuildupElement)
    }
    pub fn add_ref(&mut self, name: &str, span: Span) {
        if let Some(s) = self
            .symbols
            .iter_mut()
            .find(|s| s.name == name && s.kind != SymbolKind::BuildupElement)
        {
            s.refs.push(span);
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
