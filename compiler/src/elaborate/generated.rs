//! Pass 6, generated nodes: the interface nodes of every build-up use (`LINK.ELEMENT`, the
//! face after each element but the last) and the internal nodes of elements that have them
//! (`LINK.centre`), made before any link so that a link may end on one.

use super::buildups::Buildups;
use super::Cx;
use crate::assemble::Origin;
use crate::elements;
use crate::syntax::{Item, ItemKind};

impl Cx<'_> {
    pub(super) fn generated_nodes(&mut self, items: &[&Item], buildups: &Buildups) {
        for item in items {
            let ItemKind::Link { name, element, .. } = &item.kind else {
                continue;
            };
            let origin = Origin {
                parent: &name.name,
                def: name.span,
                decl: item.span,
            };
            if let Some(els) = buildups.get(element.kind.name.as_str()) {
                for e in els.iter().take(els.len().saturating_sub(1)) {
                    let gen = format!("{}.{}", name.name, e.name.name);
                    self.asm
                        .generated_node(gen, e.name.span, 0.0, &mut self.symbols, origin);
                }
            } else if let Some(kind) = elements::lookup(&element.kind.name) {
                for suffix in kind.internal_nodes() {
                    let gen = format!("{}.{suffix}", name.name);
                    self.asm
                        .generated_node(gen, name.span, 0.0, &mut self.symbols, origin);
                }
            }
        }
    }
}
