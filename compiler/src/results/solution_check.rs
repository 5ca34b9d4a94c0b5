//! E504: a solution that must not be reported. The inputs are range-checked during
//! elaboration, so this is the last guard: a temperature or heat flow that is not a finite
//! number, an energy balance that does not close, or temperatures that break the maximum
//! principle (heat cannot make a node colder than every boundary without being taken out) —
//! the sign of network equations too ill-conditioned for a double to solve.

use super::Solution;
use crate::network::Network;
use crate::units::{format_quantity, Dim, Quantity, TempKind, UnitSystem};
use crate::Diagnostic;

/// Relative imbalance above which a solved network is not trusted: far above the round-off of
/// a sound solve (the case tests hold every model to 1e-9) and far below the imbalance of a
/// solve ruined by conductances tens of orders of magnitude apart.
pub const BALANCE_TOLERANCE: f64 = 1e-6;

const HELP: &str = "check for conductances many orders of magnitude apart (a tiny area or coefficient beside ordinary ones) and for values with a wrong unit prefix";

impl Solution {
    /// E504 when the solution cannot be reported: a temperature or heat flow that is not a
    /// finite number, an energy balance that does not close at a free node, or a free node
    /// outside the range the boundaries and loads allow. Printing such a solution would show
    /// `inf` or `NaN`, or temperatures that no heat balance supports.
    pub fn unusable(&self, net: &Network) -> Option<Diagnostic> {
        self.not_finite(net)
            .or_else(|| self.open_balance(net))
            .or_else(|| self.outside_boundaries(net))
    }

    fn not_finite(&self, net: &Network) -> Option<Diagnostic> {
        if let Some((n, _)) = net
            .nodes
            .iter()
            .zip(&self.temperatures)
            .find(|(_, t)| !t.is_finite())
        {
            return Some(
                Diagnostic::error(
                    "E504",
                    format!(
                        "the solve gave node `{}` a temperature that is not a finite number",
                        n.name
                    ),
                    n.span,
                )
                .with_label("no finite temperature")
                .with_help(HELP),
            );
        }
        let bad_link = net
            .links
            .iter()
            .zip(&self.heat_flows)
            .find(|(_, q)| !q.is_finite())
            .map(|(l, _)| (&l.name, l.span));
        let bad_group = net
            .groups
            .iter()
            .zip(&self.groups)
            .find(|(_, g)| {
                ![g.resistance, g.heat_flow].iter().all(|v| v.is_finite())
                    || ![g.u_value, g.r_value]
                        .iter()
                        .flatten()
                        .all(|v| v.is_finite())
            })
            .map(|(g, _)| (&g.name, g.span));
        let (name, span) = bad_link.or(bad_group)?;
        Some(
            Diagnostic::error(
                "E504",
                format!("the solve gave link `{name}` a heat flow that is not a finite number"),
                span,
            )
            .with_label("no finite heat flow")
            .with_help(HELP),
        )
    }

    fn open_balance(&self, net: &Network) -> Option<Diagnostic> {
        // A flow G·(Ta − Tb) carries a round-off of about G·|T|·ε, so a node's balance can be
        // held no closer than the sum of those over its links; beyond that, the imbalance must
        // stay small beside the largest heat flow or load in the model.
        let t = &self.temperatures;
        let mut round_off = vec![0.0f64; net.nodes.len()];
        for l in &net.links {
            let r = l.conductance_at(t).abs() * t[l.from].abs().max(t[l.to].abs()) * f64::EPSILON;
            round_off[l.from] += r;
            round_off[l.to] += r;
        }
        let scale = self
            .heat_flows
            .iter()
            .chain(net.nodes.iter().map(|n| &n.load))
            .fold(0.0f64, |m, q| m.max(q.abs()));
        let excess = |i: usize| self.residuals[i].abs() - 64.0 * round_off[i];
        let worst = (0..net.nodes.len())
            .filter(|&i| net.nodes[i].fixed.is_none())
            .max_by(|&a, &b| excess(a).total_cmp(&excess(b)))?;
        if excess(worst) <= BALANCE_TOLERANCE * scale {
            return None;
        }
        let node = &net.nodes[worst];
        Some(
            Diagnostic::error(
                "E504",
                format!(
                    "the energy balance does not close: heat into and out of node `{}` differ by {}, against flows of up to {}",
                    node.name,
                    power(self.residuals[worst].abs()),
                    power(scale)
                ),
                node.span,
            )
            .with_label("heat in and out do not balance here")
            .with_help(HELP),
        )
    }

    /// The maximum principle: where every link passes heat from warm to cold (no negative
    /// conductance), heat put in cannot make a node colder than the coldest boundary and heat
    /// taken out cannot make one hotter than the hottest. A solve that breaks it lost the
    /// answer to round-off.
    fn outside_boundaries(&self, net: &Network) -> Option<Diagnostic> {
        let t = &self.temperatures;
        if net.links.iter().any(|l| {
            let g = l.conductance_at(t);
            g.is_nan() || g <= 0.0
        }) {
            return None;
        }
        let fixed = || net.nodes.iter().filter_map(|n| n.fixed);
        let coldest = fixed().fold(f64::INFINITY, f64::min);
        let hottest = fixed().fold(f64::NEG_INFINITY, f64::max);
        let heated = net.nodes.iter().any(|n| n.load > 0.0);
        let cooled = net.nodes.iter().any(|n| n.load < 0.0);
        let slack = 1e-9 * coldest.abs().max(hottest.abs()).max(1.0);
        let (i, bound, side) = net
            .nodes
            .iter()
            .enumerate()
            .filter(|(_, n)| n.fixed.is_none())
            .find_map(|(i, _)| {
                if !cooled && t[i] < coldest - slack {
                    Some((i, coldest, "colder than the coldest boundary"))
                } else if !heated && t[i] > hottest + slack {
                    Some((i, hottest, "hotter than the hottest boundary"))
                } else {
                    None
                }
            })?;
        let node = &net.nodes[i];
        let shown = |v: f64| {
            format_quantity(
                Quantity {
                    value: v,
                    dim: Dim::TEMPERATURE,
                    kind: TempKind::Point,
                },
                UnitSystem::Si,
            )
        };
        let why = if side.starts_with("colder") {
            "no heat is taken out anywhere"
        } else {
            "no heat is put in anywhere"
        };
        Some(
            Diagnostic::error(
                "E504",
                format!(
                    "the solve gave node `{}` {}, {side} ({}) although {why}: the network equations lost their answer to round-off",
                    node.name,
                    shown(t[i]),
                    shown(bound)
                ),
                node.span,
            )
            .with_label(side)
            .with_help(HELP),
        )
    }
}

fn power(v: f64) -> String {
    format_quantity(
        Quantity {
            value: v,
            dim: Dim::POWER,
            kind: TempKind::NotTemperature,
        },
        UnitSystem::Si,
    )
}
