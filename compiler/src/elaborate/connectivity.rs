//! Pass 11, connectivity, only when the network is otherwise sound (an unknown node name would
//! otherwise show up twice): a boundary node no link touches (W102), a model with no fixed
//! temperature (E302), and groups of free nodes with no path to one (E301), which would make the
//! conductance matrix singular.

use super::Cx;
use crate::diagnostic::Diagnostic;
use crate::network::{Network, NodeId};

impl Cx<'_> {
    pub(super) fn connectivity(&mut self) {
        let has_errors = self
            .diags
            .iter()
            .chain(self.ev.diags.iter())
            .any(|d| d.is_error());
        if has_errors {
            return;
        }
        let net = self.asm.net();
        let mut used = vec![false; net.nodes.len()];
        for l in &net.links {
            used[l.from] = true;
            used[l.to] = true;
        }
        for (i, n) in net.nodes.iter().enumerate() {
            if !used[i] && n.fixed.is_some() {
                self.diags.push(
                    Diagnostic::warning(
                        "W102",
                        format!("boundary node `{}` is not connected to anything", n.name),
                        n.span,
                    )
                    .with_label("no link ends here")
                    .with_help("link it to the network or remove it"),
                );
            }
        }
        if !net.nodes.is_empty() && net.nodes.iter().all(|n| n.fixed.is_none()) {
            let first = &net.nodes[0];
            self.diags.push(
                Diagnostic::error("E302", "the model has no fixed temperature", first.span)
                    .with_label("no node is held at a boundary temperature")
                    .with_help("fix at least one node, e.g. `node outdoor (fixed = -5 °C)`"),
            );
        } else {
            for group in floating_groups(net) {
                self.diags.push(floating_error(net, &group));
            }
        }
    }
}

/// Groups of free nodes that no chain of links joins to a fixed node; each such group makes
/// the conductance matrix singular.
pub fn floating_groups(net: &Network) -> Vec<Vec<NodeId>> {
    let n = net.nodes.len();
    let mut parent: Vec<usize> = (0..n).collect();
    fn find(p: &mut [usize], mut x: usize) -> usize {
        while p[x] != x {
            p[x] = p[p[x]];
            x = p[x];
        }
        x
    }
    for l in &net.links {
        let (a, b) = (find(&mut parent, l.from), find(&mut parent, l.to));
        if a != b {
            parent[a] = b;
        }
    }
    let mut anchored = vec![false; n];
    for i in 0..n {
        if net.nodes[i].fixed.is_some() {
            let r = find(&mut parent, i);
            anchored[r] = true;
        }
    }
    let mut groups: std::collections::BTreeMap<usize, Vec<NodeId>> = Default::default();
    for i in 0..n {
        let r = find(&mut parent, i);
        if !anchored[r] {
            groups.entry(r).or_default().push(i);
        }
    }
    groups.into_values().collect()
}

fn floating_error(net: &Network, group: &[NodeId]) -> Diagnostic {
    let names: Vec<&str> = group.iter().map(|&i| net.nodes[i].name.as_str()).collect();
    let shown = if names.len() > 6 {
        format!("{}, … ({} nodes)", names[..6].join(", "), names.len())
    } else {
        names.join(", ")
    };
    let first = &net.nodes[group[0]];
    let mut d = Diagnostic::error(
        "E301",
        format!("no path to any boundary temperature from: {shown}"),
        first.span,
    )
    .with_label("floating: its temperature is undetermined")
    .with_help("link these nodes to a node with a fixed temperature; without one the network equations are singular");
    for &i in group.iter().skip(1).take(5) {
        d = d.with_secondary(
            net.nodes[i].span,
            format!("`{}` is in the same floating group", net.nodes[i].name),
        );
    }
    d
}
