//! A node's heat balance on a solved network, and the unit system a model is written in.

use crate::analysis::Analysis;
use crate::network::{LinkId, NodeId};
use crate::span::FileId;
use crate::syntax::{Expr, ExprKind, ItemKind};

/// Where the heat of one node comes from and goes to, in W.
#[derive(Clone, Debug, PartialEq)]
pub struct NodeBalance {
    pub node: NodeId,
    /// Solved temperature, K.
    pub temperature: f64,
    /// Heat load put into the node.
    pub load: f64,
    /// Every link that touches the node, with the heat it carries into the node (negative: out).
    pub links: Vec<(LinkId, f64)>,
    /// For a fixed node: the heat its boundary delivers into the network (negative: absorbs).
    pub boundary: Option<f64>,
    /// Load plus all inflows: zero to round-off at a free node.
    pub residual: f64,
}

/// The heat balance of the node called `name`, when the model is solved.
pub fn node_balance(a: &Analysis, name: &str) -> Option<NodeBalance> {
    let sol = a.solution.as_ref()?;
    let node = a.network.node_id(name)?;
    let links: Vec<(LinkId, f64)> = a
        .network
        .links
        .iter()
        .enumerate()
        .filter_map(|(i, l)| {
            if l.to == node {
                Some((i, sol.heat_flows[i]))
            } else if l.from == node {
                Some((i, -sol.heat_flows[i]))
            } else {
                None
            }
        })
        .collect();
    let boundary = sol.boundary_heat.iter().find(|b| b.0 == node).map(|b| b.1);
    Some(NodeBalance {
        node,
        temperature: sol.temperatures[node],
        load: a.network.nodes[node].load,
        links,
        boundary,
        residual: sol.residuals[node],
    })
}

/// US customary spellings; any literal using one counts for the US system.
const US_ATOMS: &[&str] = &[
    "°F",
    "degF",
    "℉",
    "°R",
    "degR",
    "Δ°F",
    "∆°F",
    "delta_degF",
    "in",
    "ft",
    "yd",
    "mi",
    "lb",
    "Btu",
];

/// The system most of the root file's quantities are written in (SI on a tie), so results can
/// be shown first in the units the analyst uses.
pub fn preferred_system(a: &Analysis) -> crate::units::UnitSystem {
    let mut us = 0usize;
    let mut si = 0usize;
    let Some((_, root)) = a.modules.iter().find(|(id, _)| *id == FileId(0)) else {
        return crate::units::UnitSystem::Si;
    };
    let mut count = |unit: &str| {
        let atoms = unit.split(|c: char| {
            matches!(c, '*' | '/' | '^' | '(' | ')' | '·' | '⋅') || c.is_ascii_digit() || c == '-'
        });
        if atoms
            .clone()
            .any(|t| US_ATOMS.contains(&t.trim_end_matches(['²', '³', '⁻', '¹', '⁴'])))
        {
            us += 1;
        } else {
            si += 1;
        }
    };
    for item in &root.items {
        let exprs: Vec<&Expr> = match &item.kind {
            ItemKind::Param { value, .. } | ItemKind::Limit { value, .. } => vec![value],
            ItemKind::Material { args, .. } | ItemKind::Node { args, .. } => {
                args.iter().map(|a| &a.value).collect()
            }
            ItemKind::Link { element, .. } => element.args.iter().map(|a| &a.value).collect(),
            ItemKind::Buildup { elements, .. } => elements
                .iter()
                .flat_map(|e| e.element.args.iter().map(|a| &a.value))
                .collect(),
            ItemKind::Declaration { args, rows, .. } => args
                .iter()
                .map(|a| &a.value)
                .chain(rows.iter().flatten().flat_map(|r| [&r.key, &r.value]))
                .collect(),
            ItemKind::Use { args, .. } | ItemKind::Region { args, .. } => {
                args.iter().map(|a| &a.value).collect()
            }
            // Bodies of repetitions and sub-networks are counted through their expansion.
            ItemKind::Repeat { args, .. } => args.iter().map(|a| &a.value).collect(),
            ItemKind::Network { .. } => Vec::new(),
            ItemKind::Title { .. } | ItemKind::Import { .. } => Vec::new(),
        };
        for e in exprs {
            visit_units(e, &mut count);
        }
    }
    if us > si {
        crate::units::UnitSystem::Us
    } else {
        crate::units::UnitSystem::Si
    }
}

fn visit_units(e: &Expr, f: &mut dyn FnMut(&str)) {
    match &e.kind {
        ExprKind::Number {
            unit: Some((u, _)), ..
        } => f(u),
        ExprKind::Neg(x) | ExprKind::Paren(x) => visit_units(x, f),
        ExprKind::Chain { first, rest } => {
            visit_units(first, f);
            rest.iter().for_each(|(_, x)| visit_units(x, f));
        }
        ExprKind::Power { base, exponent } => {
            visit_units(base, f);
            visit_units(exponent, f);
        }
        ExprKind::Call { args, .. } => args.iter().for_each(|x| visit_units(x, f)),
        _ => {}
    }
}
