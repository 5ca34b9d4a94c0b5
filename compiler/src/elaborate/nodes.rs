//! Pass 5, nodes: every declared node with its boundary temperature, load and what transient
//! runs need of it (`dynamics`).

use super::args::{self, Value};
use super::Cx;
use crate::diagnostic::Diagnostic;
use crate::network::Node;
use crate::syntax::{Ident, Item, ItemKind};

impl Cx<'_> {
    pub(super) fn nodes(&mut self, items: &[&Item]) {
        for item in items {
            if let ItemKind::Node { name, args } = &item.kind {
                self.owner = format!("node `{}`", name.name);
                let checked = self.declared("node", name, args);
                let (fixed, load) = self.node_args(name, &checked);
                let id = self.asm.declared_node(Node {
                    name: name.name.clone(),
                    span: name.span,
                    fixed,
                    load,
                    generated: false,
                });
                self.node_dynamics(id, name, &checked, fixed.is_some());
            }
        }
        self.owner.clear();
    }

    /// A node's boundary temperature and load (a schedule's value at time 0 for one that
    /// follows a schedule, as a steady solve uses).
    fn node_args(&mut self, name: &Ident, c: &args::Checked) -> (Option<f64>, f64) {
        let value = |n: &str| match c.value(n) {
            Some(Value::Quantity(q)) => Some(q.value),
            Some(Value::Schedule(i)) => Some(self.timed.dynamics.schedules[*i].value(0.0)),
            _ => None,
        };
        let (fixed, load) = (value("fixed"), value("load"));
        if let (Some(_), Some(_), Some(ls)) = (fixed, load, c.name_span("load")) {
            self.diags.push(
                Diagnostic::error(
                    "E209",
                    format!(
                        "node `{}` is fixed, so a load on it has no effect",
                        name.name
                    ),
                    ls,
                )
                .with_label("load on a fixed node")
                .with_help("put the load on a free node linked to it, or remove `fixed`"),
            );
        }
        (fixed, load.unwrap_or(0.0))
    }
}
