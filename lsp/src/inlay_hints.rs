//! Inlay hints: solved temperatures after node declarations, heat flows after links, and the
//! verdict and margin after limits. Only a solved analysis of the current version has hints;
//! the server asks the editor to refresh them when a solve finishes.

use crate::display::{both, one, point, q};
use crate::link_figures;
use crate::proto::{self, lsp};
use crate::settings::Settings;
use crate::snapshot::Snapshot;
use caloris_compiler::span::FileId;
use caloris_compiler::syntax::ItemKind;
use caloris_compiler::units::{Dim, Quantity, UnitSystem};
use lsp::{InlayHint, InlayHintLabel, InlayHintTooltip, Range};

pub fn inlay_hints(snap: &Snapshot, range: Range, settings: &Settings) -> Vec<InlayHint> {
    let a = &snap.analysis;
    let Some(sol) = &a.solution else {
        return Vec::new();
    };
    let sys = snap.system(settings);
    let net = &a.network;
    let lines = snap.lines(FileId(0));
    let mut out = Vec::new();
    for item in &a.root().items {
        let item_range = proto::range(lines, item.span);
        if !proto::overlaps(item_range, range) {
            continue;
        }
        let hint = match &item.kind {
            ItemKind::Node { name, .. } => net.node_id(&name.name).map(|n| {
                let node = &net.nodes[n];
                match sol.boundary_heat.iter().find(|b| b.0 == n) {
                    Some(&(_, heat)) if node.fixed.is_some() => {
                        let verb = if heat >= 0.0 { "delivers" } else { "absorbs" };
                        let w = q(heat.abs(), Dim::POWER);
                        (
                            format!("{verb} {}", one(w, sys)),
                            format!("boundary {verb} {}", both(w, sys)),
                        )
                    }
                    _ => {
                        let t = point(sol.temperatures[n]);
                        (
                            format!("= {}", one(t, sys)),
                            format!("solved temperature {}", both(t, sys)),
                        )
                    }
                }
            }),
            ItemKind::Link { name, .. } => {
                if let Some(g) = net.group_id(&name.name) {
                    let r = &sol.groups[g];
                    let mut label = flow_label(r.heat_flow, sys);
                    let mut tip =
                        format!("heat flow {}", both(q(r.heat_flow.abs(), Dim::POWER), sys));
                    if let Some(u) = r.u_value {
                        let u = q(u, Dim::HEAT_TRANSFER_COEFF);
                        label.push_str(&format!(", U = {}", one(u, sys)));
                        tip.push_str(&format!(", U-value {}", both(u, sys)));
                    }
                    Some((label, tip))
                } else {
                    net.link_id(&name.name).map(|l| {
                        let flow = sol.heat_flows[l];
                        let mut label = flow_label(flow, sys);
                        let mut tip = format!("heat flow {}", both(q(flow.abs(), Dim::POWER), sys));
                        let link = &net.links[l];
                        if let Some(reason) = link_figures::nonlinear_reason(link) {
                            let r = q(
                                1.0 / link.conductance_at(&sol.temperatures),
                                Dim::RESISTANCE,
                            );
                            label.push_str(&format!(", R = {} at solved T", one(r, sys)));
                            tip.push_str(&format!(
                                "; resistance {} at the solved temperatures ({reason})",
                                both(r, sys)
                            ));
                        }
                        (label, tip)
                    })
                }
            }
            ItemKind::Limit { name, .. } => {
                sol.limits.iter().find(|l| l.name == name.name).map(|r| {
                    let margin = Quantity {
                        value: r.margin.abs(),
                        dim: r.measure.dim(),
                        kind: r.margin_kind(),
                    };
                    let actual = Quantity {
                        value: r.actual,
                        dim: r.measure.dim(),
                        kind: r.kind(),
                    };
                    if r.passed {
                        (
                            format!("✓ margin {}", one(margin, sys)),
                            format!("holds: {} is {}", r.measure.name(), both(actual, sys)),
                        )
                    } else {
                        (
                            format!("✗ FAILS by {}", one(margin, sys)),
                            format!("fails: {} is {}", r.measure.name(), both(actual, sys)),
                        )
                    }
                })
            }
            ItemKind::Region { name, .. } => {
                net.regions.iter().find(|r| r.name == name.name).map(|r| {
                    let (lo, hi) = link_figures::region_range(r, sol);
                    (
                        format!("{} … {}", one(point(lo), sys), one(point(hi), sys)),
                        format!(
                            "cell temperatures from {} to {}",
                            both(point(lo), sys),
                            both(point(hi), sys)
                        ),
                    )
                })
            }
            _ => None,
        };
        if let Some((label, tooltip)) = hint {
            out.push(InlayHint {
                position: proto::position(lines, item.span.end),
                label: InlayHintLabel::String(label),
                kind: None,
                text_edits: None,
                tooltip: Some(InlayHintTooltip::String(tooltip)),
                padding_left: Some(true),
                padding_right: None,
                data: None,
            });
        }
    }
    out
}

/// `12.3 W →` when heat flows from the link's first node to its second, `← 12.3 W` otherwise.
fn flow_label(flow: f64, sys: UnitSystem) -> String {
    let w = one(q(flow.abs(), Dim::POWER), sys);
    if flow >= 0.0 {
        format!("{w} →")
    } else {
        format!("← {w}")
    }
}
