//! Pass 7, regions: each region's arguments are checked and its cells made (so that links and
//! limits can name `NAME.i.j`), then its cells are joined and its edges and faces attached to
//! their nodes, each through its element if it has one.

use super::Cx;
use crate::diagnostic::Diagnostic;
use crate::elements;
use crate::region;
use crate::schema;
use crate::span::Span;
use crate::syntax::{Item, ItemKind, RegionEdge};
use rustc_hash::FxHashMap;

impl Cx<'_> {
    pub(super) fn regions(&mut self, items: &[&Item]) {
        let mut plans = Vec::new();
        for item in items {
            if let ItemKind::Region { name, args, .. } = &item.kind {
                self.owner = format!("region `{}`", name.name);
                let Some(checked) = self.args(&region::RegionArgs, args, item.span, &[]) else {
                    continue;
                };
                match region::Plan::new(&name.name, name.span, checked) {
                    Ok(mut plan) => {
                        plan.add_nodes(&mut self.asm, &mut self.symbols, item.span);
                        plans.push((item, plan));
                    }
                    Err(d) => self.diags.push(d),
                }
            }
        }
        for (item, mut plan) in plans {
            if let ItemKind::Region { edges, .. } = &item.kind {
                plan.add_internal_links(&mut self.asm);
                self.region_edges(&mut plan, edges, item.span);
                self.asm.region(plan.region);
            }
        }
        self.owner.clear();
    }

    /// Attach a region's edges and faces to their nodes, each through its element if it has one.
    fn region_edges(&mut self, plan: &mut region::Plan, edges: &[RegionEdge], decl: Span) {
        let mut seen: FxHashMap<&str, Span> = FxHashMap::default();
        for e in edges {
            let sides: Vec<&'static str> = schema::REGION_SIDES.iter().map(|s| s.0).collect();
            if !sides.contains(&e.side.name.as_str()) {
                self.unknown_arg(&e.side, &format!("region `{}`", plan.region.name), &sides);
                continue;
            }
            if let Some(prev) = seen.insert(&e.side.name, e.side.span) {
                self.duplicate_arg(&e.side.name, e.side.span, prev);
                continue;
            }
            let Some(node) = self.node_ref(&e.node) else {
                continue;
            };
            let element = match &e.element {
                None => None,
                Some(call) => {
                    let Some(kind) = elements::lookup(&call.kind.name)
                        .filter(|k| k.takes_area() && k.single_link())
                    else {
                        self.diags.push(
                            Diagnostic::error("E206", format!("`{}` cannot attach a region's edge", call.kind.name), call.kind.span)
                                .with_label("not an element with an area")
                                .with_help("attach an edge through `film`, `contact`, `radiation` or `layer`, or to a node directly (`left: hot_bar`)"),
                        );
                        continue;
                    };
                    let area = plan.cell_area(&e.side.name);
                    self.owner = format!(
                        "`{}` on side `{}` of region `{}`",
                        kind.name(),
                        e.side.name,
                        plan.region.name
                    );
                    let Some(args) =
                        self.args(kind, &call.args, call.span, &[("area", area, e.side.span)])
                    else {
                        continue;
                    };
                    match self.checked_law(kind, &args) {
                        Some((law, _)) => Some((kind.name(), law)),
                        None => continue,
                    }
                }
            };
            plan.attach(
                &mut self.asm,
                &mut self.symbols,
                decl,
                &e.side.name,
                node,
                element,
            );
        }
    }
}
