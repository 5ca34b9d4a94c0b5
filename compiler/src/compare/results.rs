//! Structure (what exists in one version only), limit verdicts and result movements.

use super::{
    close, pair_up, BuildupMovement, Comparison, LimitChange, LinkMovement, Movement,
    StructureChange,
};
use crate::analysis::Analysis;
use crate::limits::LimitResult;
use std::collections::BTreeMap;

pub(super) fn structure(old: &Analysis, new: &Analysis, out: &mut Vec<StructureChange>) {
    let nodes = |a: &Analysis| -> BTreeMap<String, String> {
        a.network
            .nodes
            .iter()
            .map(|n| {
                let d = match (n.fixed, n.generated) {
                    (Some(_), _) => "boundary",
                    (None, true) => "build-up interface",
                    (None, false) => "free",
                };
                (n.name.clone(), d.to_string())
            })
            .collect()
    };
    let links = |a: &Analysis| -> BTreeMap<String, String> {
        let net = &a.network;
        net.links
            .iter()
            .map(|l| {
                (
                    l.name.clone(),
                    format!(
                        "{} → {}, {}",
                        net.nodes[l.from].name, net.nodes[l.to].name, l.kind
                    ),
                )
            })
            .collect()
    };
    let groups = |a: &Analysis| -> BTreeMap<String, String> {
        let net = &a.network;
        net.groups
            .iter()
            .map(|g| {
                (
                    g.name.clone(),
                    format!(
                        "{} → {}, build-up {}",
                        net.nodes[g.from].name, net.nodes[g.to].name, g.buildup
                    ),
                )
            })
            .collect()
    };
    let limits = |a: &Analysis| -> BTreeMap<String, String> {
        a.limits
            .iter()
            .map(|l| {
                (
                    l.name.clone(),
                    format!("{}({}) {}", l.measure.name(), l.subject_name, l.op.symbol()),
                )
            })
            .collect()
    };
    for (what, f) in [
        (
            "build-up use",
            &groups as &dyn Fn(&Analysis) -> BTreeMap<String, String>,
        ),
        ("node", &nodes),
        ("link", &links),
        ("limit", &limits),
    ] {
        for (name, (o, n)) in pair_up(f(old), f(new)) {
            match (o, n) {
                (Some(d), None) => out.push(StructureChange {
                    what,
                    name,
                    added: false,
                    detail: d,
                }),
                (None, Some(d)) => out.push(StructureChange {
                    what,
                    name,
                    added: true,
                    detail: d,
                }),
                _ => {}
            }
        }
    }
}

pub(super) fn limits(old: &Analysis, new: &Analysis) -> Vec<LimitChange> {
    let get = |a: &Analysis| -> BTreeMap<String, LimitResult> {
        a.solution
            .as_ref()
            .map(|s| {
                s.limits
                    .iter()
                    .map(|l| (l.name.clone(), l.clone()))
                    .collect()
            })
            .unwrap_or_default()
    };
    let mut out: Vec<LimitChange> = pair_up(get(old), get(new))
        .into_iter()
        .map(|(name, (o, n))| LimitChange {
            name,
            old: o,
            new: n,
        })
        .collect();
    let rank = |l: &LimitChange| -> (u8, f64) {
        let class = match (&l.old, &l.new) {
            (Some(o), Some(n)) if o.passed && !n.passed => 0,
            (None, Some(n)) if !n.passed => 0,
            (Some(o), Some(n)) if !o.passed && n.passed => 1,
            (Some(_), Some(n)) if !n.passed => 2,
            _ => 3,
        };
        let moved = match (&l.old, &l.new) {
            (Some(o), Some(n)) => {
                ((n.margin - o.margin) / o.limit.abs().max(f64::MIN_POSITIVE)).abs()
            }
            _ => 0.0,
        };
        (class, moved)
    };
    out.sort_by(|a, b| {
        let (ra, rb) = (rank(a), rank(b));
        ra.0.cmp(&rb.0)
            .then(rb.1.total_cmp(&ra.1))
            .then_with(|| a.name.cmp(&b.name))
    });
    out
}

pub(super) fn results(
    old: &Analysis,
    new: &Analysis,
    so: &crate::results::Solution,
    sn: &crate::results::Solution,
    c: &mut Comparison,
) {
    let (no, nn) = (&old.network, &new.network);
    let by_name = |names: Vec<&String>, values: &[f64]| -> BTreeMap<String, f64> {
        names
            .into_iter()
            .cloned()
            .zip(values.iter().copied())
            .collect()
    };
    // Temperatures: moves below a nanokelvin are solver round-off, not a change.
    let t_old = by_name(no.nodes.iter().map(|n| &n.name).collect(), &so.temperatures);
    let t_new = by_name(nn.nodes.iter().map(|n| &n.name).collect(), &sn.temperatures);
    for (name, (o, n)) in pair_up(t_old, t_new) {
        if let (Some(o), Some(n)) = (o, n) {
            if (n - o).abs() > 1e-9 {
                c.temperatures.push(Movement {
                    name,
                    old: o,
                    new: n,
                    delta: n - o,
                });
            }
        }
    }
    // Network order of the new version, for ties; looked up by name once.
    let index = |names: Vec<&String>| -> std::collections::HashMap<String, usize> {
        names
            .into_iter()
            .cloned()
            .enumerate()
            .map(|(i, n)| (n, i))
            .collect()
    };
    let (node_ix, link_ix) = (
        index(nn.nodes.iter().map(|n| &n.name).collect()),
        index(nn.links.iter().map(|l| &l.name).collect()),
    );
    let group_ix = index(nn.groups.iter().map(|g| &g.name).collect());
    let node_order = |name: &str| node_ix.get(name).copied().unwrap_or(usize::MAX);
    order_by_effect(&mut c.temperatures, |m| m.delta, |m| node_order(&m.name));
    let scale = so
        .heat_flows
        .iter()
        .chain(&sn.heat_flows)
        .fold(1e-300f64, |m, q| m.max(q.abs()));
    let moved = |o: f64, n: f64| (n - o).abs() > 1e-9 * scale;
    let links = |net: &crate::network::Network,
                 s: &crate::results::Solution|
     -> BTreeMap<String, (f64, f64)> {
        net.links
            .iter()
            .zip(&s.heat_flows)
            .map(|(l, q)| {
                (
                    l.name.clone(),
                    (1.0 / l.conductance_at(&s.temperatures), *q),
                )
            })
            .collect()
    };
    for (name, (o, n)) in pair_up(links(no, so), links(nn, sn)) {
        if let (Some(o), Some(n)) = (o, n) {
            if moved(o.1, n.1) || !close(o.0, n.0) {
                c.links.push(LinkMovement {
                    name,
                    old_resistance: o.0,
                    new_resistance: n.0,
                    old_heat_flow: o.1,
                    new_heat_flow: n.1,
                    delta_heat_flow: n.1 - o.1,
                });
            }
        }
    }
    order_by_effect(
        &mut c.links,
        |l| l.delta_heat_flow,
        |l| link_ix.get(&l.name).copied().unwrap_or(usize::MAX),
    );
    let groups = |s: &crate::results::Solution| -> BTreeMap<String, crate::results::GroupResult> {
        s.groups
            .iter()
            .map(|g| (g.name.clone(), g.clone()))
            .collect()
    };
    for (name, (o, n)) in pair_up(groups(so), groups(sn)) {
        if let (Some(o), Some(n)) = (o, n) {
            let opt_close = |a: Option<f64>, b: Option<f64>| match (a, b) {
                (Some(a), Some(b)) => close(a, b),
                (None, None) => true,
                _ => false,
            };
            if moved(o.heat_flow, n.heat_flow)
                || !opt_close(o.u_value, n.u_value)
                || !close(o.resistance, n.resistance)
            {
                c.buildups.push(BuildupMovement {
                    name,
                    old_u_value: o.u_value,
                    new_u_value: n.u_value,
                    old_r_value: o.r_value,
                    new_r_value: n.r_value,
                    old_heat_flow: o.heat_flow,
                    new_heat_flow: n.heat_flow,
                });
            }
        }
    }
    let ratio = |b: &BuildupMovement| match (b.old_u_value, b.new_u_value) {
        (Some(o), Some(n)) if o != 0.0 => ((n - o) / o).abs(),
        _ => ((b.new_heat_flow - b.old_heat_flow) / b.old_heat_flow.abs().max(f64::MIN_POSITIVE))
            .abs(),
    };
    order_by_effect(&mut c.buildups, ratio, |b| {
        group_ix.get(&b.name).copied().unwrap_or(usize::MAX)
    });
    let bounds =
        |net: &crate::network::Network, s: &crate::results::Solution| -> BTreeMap<String, f64> {
            s.boundary_heat
                .iter()
                .map(|&(i, q)| (net.nodes[i].name.clone(), q))
                .collect()
        };
    for (name, (o, n)) in pair_up(bounds(no, so), bounds(nn, sn)) {
        if let (Some(o), Some(n)) = (o, n) {
            if moved(o, n) {
                c.boundaries.push(Movement {
                    name,
                    old: o,
                    new: n,
                    delta: n - o,
                });
            }
        }
    }
    order_by_effect(&mut c.boundaries, |m| m.delta, |m| node_order(&m.name));
}

/// Largest |size| first; sizes equal to nine digits (the same heat flow through every layer of
/// a wall) keep the network's order, so a chain reads from one end to the other.
fn order_by_effect<T>(v: &mut [T], size: impl Fn(&T) -> f64, index: impl Fn(&T) -> usize) {
    let largest = v.iter().map(|x| size(x).abs()).fold(0.0, f64::max);
    let key = |x: &T| -> i64 {
        if largest > 0.0 && largest.is_finite() {
            (size(x).abs() / largest * 1e9).round() as i64
        } else {
            0
        }
    };
    v.sort_by_key(|x| (std::cmp::Reverse(key(x)), index(x)));
}
