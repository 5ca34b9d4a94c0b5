//! Pass 8, links: each link's two ends are found, then its element is checked and built into
//! one link, or into the several links and loads of an element that expands, or — for a
//! build-up use — into a chain of element links (`buildups`). Links made without element
//! arguments of their own (a region's cells, an element's parts) get their value-range check
//! here, once per declaration.

use super::buildups::Buildups;
use super::{sorted, value_range, Cx};
use crate::diagnostic::{did_you_mean, Diagnostic};
use crate::elements::{self, generation, ElementKind};
use crate::network::{Link, LinkLaw, NodeId};
use crate::span::Span;
use crate::syntax::{ElementCall, Ident, Item, ItemKind};

impl Cx<'_> {
    pub(super) fn links(&mut self, items: &[&Item], buildups: &Buildups) {
        for item in items {
            let ItemKind::Link {
                name,
                from,
                to,
                element,
            } = &item.kind
            else {
                continue;
            };
            let a = self.node_ref(from);
            let b = self.node_ref(to);
            if let (Some(a), Some(b)) = (a, b) {
                if a == b {
                    self.diags.push(
                        Diagnostic::error(
                            "E208",
                            format!("link `{}` joins node `{}` to itself", name.name, from.name),
                            to.span,
                        )
                        .with_label("same node at both ends")
                        .with_secondary(from.span, "first end")
                        .with_help(
                            "a link carries heat between two different nodes; check the node names",
                        ),
                    );
                    continue;
                }
            }
            if let Some(els) = buildups.get(element.kind.name.as_str()) {
                self.symbols.add_ref(&element.kind.name, element.kind.span);
                self.buildup_link(name, a, b, element, els);
            } else if let Some(kind) = elements::lookup(&element.kind.name) {
                self.element_link(kind, item.span, name, a, b, element);
            } else {
                self.unknown_kind(&element.kind, buildups);
            }
        }
        self.owner.clear();
        let mut reported = rustc_hash::FxHashSet::default();
        for l in &self.asm.net().links {
            if let Some(d) = value_range::link_error(l) {
                if reported.insert(l.span) {
                    self.diags.push(d);
                }
            }
        }
    }

    /// A link through one element: one link, or the parts of an element that expands.
    fn element_link(
        &mut self,
        kind: &'static dyn ElementKind,
        span: Span,
        name: &Ident,
        a: Option<NodeId>,
        b: Option<NodeId>,
        element: &ElementCall,
    ) {
        self.owner = format!("`{}` in link `{}`", kind.name(), name.name);
        let args = self.args(kind, &element.args, element.span, &[]);
        let built = args.as_ref().and_then(|args| self.checked_law(kind, args));
        let (Some(a), Some(b), Some((law, built)), Some(args)) = (a, b, built, args) else {
            return;
        };
        self.diags.extend(kind.warnings(&args));
        // The figures belong to the first link the element makes.
        let first = self.asm.net().links.len();
        for f in kind.figures(&args) {
            self.asm.figure(first, f);
        }
        for (n, rule) in kind.solved_figures(&args) {
            self.asm.solved_figure(first, n, rule);
        }
        match kind.expand(&args) {
            Ok(Some(x)) => {
                if let Some(d) = self.expansion(name, span, a, b, kind, x) {
                    self.diags.push(d);
                }
            }
            Ok(None) => {
                self.asm.link(element_link(
                    name.name.clone(),
                    span,
                    (a, b),
                    kind,
                    law,
                    built,
                ));
            }
            Err(d) => self.diags.push(d),
        }
    }

    /// The links and loads of an element that expands into several links (see
    /// [`generation::Expansion`]). A load on a fixed FROM or TO node is E209.
    fn expansion(
        &mut self,
        name: &Ident,
        span: Span,
        from: NodeId,
        to: NodeId,
        kind: &dyn ElementKind,
        x: generation::Expansion,
    ) -> Option<Diagnostic> {
        use generation::End;
        let asm = &mut self.asm;
        let node = |asm: &crate::assemble::Assembler, e: End| match e {
            End::From => Some(from),
            End::To => Some(to),
            End::Internal(s) => asm.node_id(&format!("{}.{s}", name.name)),
        };
        for (end, load) in &x.loads {
            let Some(n) = node(asm, *end) else { continue };
            let fixed = &asm.net().nodes[n];
            if fixed.fixed.is_some() {
                return Some(
                    Diagnostic::error("E209", format!("`{}` puts its generated heat into `{}`, which is fixed", name.name, fixed.name), name.span)
                        .with_label("generated heat on a fixed node")
                        .with_help(format!("the FROM node of `{}` is the body's axis: make it a free node (its temperature is the centre temperature)", kind.name())),
                );
            }
            asm.add_load(n, *load);
        }
        for p in x.parts {
            let (Some(a), Some(b)) = (node(asm, p.from), node(asm, p.to)) else {
                continue;
            };
            let link_name = if p.suffix.is_empty() {
                name.name.clone()
            } else {
                format!("{}.{}", name.name, p.suffix)
            };
            asm.link(Link {
                name: link_name,
                span,
                from: a,
                to: b,
                law: LinkLaw::Linear {
                    conductance: p.conductance,
                },
                area: None,
                kind: kind.name().to_string(),
                formula: p.formula.into(),
                group: None,
            });
        }
        None
    }

    fn unknown_kind(&mut self, kind: &Ident, buildups: &Buildups) {
        let names: Vec<&str> = elements::ALL
            .iter()
            .map(|k| k.name())
            .chain(sorted(buildups.keys().copied()))
            .collect();
        let mut d = Diagnostic::error(
            "E206",
            format!("unknown link kind `{}`", kind.name),
            kind.span,
        )
        .with_label("not an element kind or build-up");
        let list = elements::ALL
            .iter()
            .map(|k| format!("`{}`", k.name()))
            .collect::<Vec<_>>()
            .join(", ");
        d = match did_you_mean(&kind.name, names) {
            Some(s) => d.with_help(format!("did you mean `{s}`?")).with_fix(
                format!("Replace with `{s}`"),
                kind.span,
                s,
            ),
            None => d.with_help(format!("use one of {list}, or the name of a `buildup`")),
        };
        self.diags.push(d);
    }

    /// The node a link's end or a region's edge names; E102 (with a suggestion) or E105 when
    /// it names none.
    pub(super) fn node_ref(&mut self, id: &Ident) -> Option<NodeId> {
        if let Some(i) = self.asm.node_id(&id.name) {
            self.symbols.add_ref(&id.name, id.span);
            return Some(i);
        }
        let mut d;
        if let Some(s) = self.symbols.get(&id.name) {
            d = Diagnostic::error(
                "E105",
                format!("`{}` is {}, not a node", id.name, s.kind.article()),
                id.span,
            )
            .with_label("a link's ends must be nodes")
            .with_secondary(s.def, "declared here");
        } else {
            d = Diagnostic::error("E102", format!("unknown node `{}`", id.name), id.span)
                .with_label("no node has this name");
            if let Some(s) = did_you_mean(
                &id.name,
                self.asm.net().nodes.iter().map(|n| n.name.as_str()),
            ) {
                d = d.with_help(format!("did you mean `{s}`?")).with_fix(
                    format!("Replace with `{s}`"),
                    id.span,
                    s,
                );
            } else if let Some((link, elem)) = id.name.split_once('.') {
                d = d.with_help(format!(
                    "`{link}.{elem}` would be the face after element `{elem}` of a link `{link}` that uses a build-up; the last element's far face is the link's `to` node"
                ));
            } else {
                d = d.with_help(format!("declare it, e.g. `node {}`", id.name));
            }
        }
        self.diags.push(d);
        None
    }
}

/// The link one element makes between two nodes, with its law and formula; a build-up use's
/// links learn their group when the group is added.
pub(super) fn element_link(
    name: String,
    span: Span,
    (from, to): (NodeId, NodeId),
    kind: &dyn ElementKind,
    law: LinkLaw,
    built: elements::Built,
) -> Link {
    Link {
        name,
        span,
        from,
        to,
        law,
        area: built.area,
        kind: kind.name().to_string(),
        formula: built.formula,
        group: None,
    }
}
