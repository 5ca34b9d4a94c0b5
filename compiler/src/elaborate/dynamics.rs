//! What transient runs need of each node — capacity, initial temperature, the schedules that
//! drive its boundary temperature or load — checked as the node is declared (pass 5), and the
//! Biot-number check of lumped bodies once the links exist (pass 10).

use super::args::{Checked, Value};
use super::Cx;
use crate::diagnostic::Diagnostic;
use crate::elements::{self, Material};
use crate::network::{Network, NodeId};
use crate::span::Span;
use crate::syntax::Ident;
use crate::transient::model::{Binding, Driven, Lump, NodeCapacity};
use crate::units::Dim;

/// Biot number above which a body is not well described by one temperature (common practice).
pub const BIOT_LUMPED: f64 = 0.1;

impl Cx<'_> {
    /// Capacity, initial temperature and schedules of a node just added to the network, from
    /// its checked arguments.
    pub(super) fn node_dynamics(&mut self, node: NodeId, name: &Ident, c: &Checked, fixed: bool) {
        for (arg, what) in [("fixed", Driven::Fixed), ("load", Driven::Load)] {
            if let (Some(&Value::Schedule(schedule)), Some(span)) =
                (c.value(arg), c.value_span(arg))
            {
                self.timed.dynamics.bindings.push(Binding {
                    node,
                    what,
                    schedule,
                    span,
                });
            }
        }
        let named = |n: &str| c.get(n).zip(c.name_span(n));
        let capacity = named("capacity");
        let material = match (c.value("material"), c.name_span("material")) {
            (Some(Value::Material(m)), Some(s)) => Some((m.clone(), s)),
            _ => None,
        };
        let material_failed = c.failed("material");
        let (volume, mass, initial) = (named("volume"), named("mass"), named("initial"));
        let storing = ["capacity", "material", "volume", "mass", "initial"];
        let given: Vec<(&str, Span)> = c
            .written
            .iter()
            .copied()
            .filter(|w| storing.contains(&w.0))
            .collect();
        // What failed, or stands without what it needs (both reported already), says no more.
        let mut failed = ["capacity", "volume", "mass", "initial"]
            .iter()
            .any(|n| c.failed(n))
            || (c.is_written("capacity") && c.is_written("material"))
            || (!c.is_written("material") && (c.is_written("volume") || c.is_written("mass")));
        if fixed {
            if let Some(&(arg, span)) = given.first() {
                self.diags.push(
                    Diagnostic::error("E702", format!("node `{}` is fixed, so `{arg}` has no effect", name.name), span)
                        .with_label("on a boundary temperature")
                        .with_help("a fixed node's temperature is given for all time; put the capacity on a free node linked to it, or remove `fixed`"),
                );
            }
            return;
        }
        let mut stored = None;
        match (capacity, &material) {
            // Both given: E207 from the schema's `Instead` check.
            (Some(_), Some(_)) => {}
            (Some((value, span)), None) => {
                stored = Some(NodeCapacity {
                    node,
                    capacity: value,
                    span,
                    lump: None,
                })
            }
            (None, Some((m, span))) => {
                stored = self.material_capacity(node, name, m, *span, volume, mass)
            }
            (None, None) => {}
        }
        if material.is_some() && stored.is_none() {
            failed = true;
        }
        if let Some(c) = stored {
            self.timed.dynamics.capacities.push(c);
        } else if let Some((_, s)) = initial {
            if !failed && !material_failed {
                self.diags.push(
                    Diagnostic::error("E704", format!("node `{}` stores no heat, so `initial` has no effect", name.name), s)
                        .with_label("no capacity on this node")
                        .with_help("give the node a `capacity = ...` (or `material = ..., volume = ...`); a node without capacity always follows its neighbours"),
                );
            }
            return;
        }
        if let Some((t, s)) = initial {
            self.timed.dynamics.initial.push((node, t, s));
        }
    }

    fn alternatives(&mut self, a: &str, b: &str, span_a: Span, span_b: Span) {
        self.diags.push(
            Diagnostic::error(
                "E207",
                format!("a node takes `{a}` or `{b}`, not both"),
                span_b,
            )
            .with_label(format!("`{b}` given as well as `{a}`"))
            .with_secondary(span_a, format!("`{a}` given here"))
            .with_help(format!(
                "keep one of them; `{a}` and `{b}` state the capacity two ways"
            )),
        );
    }

    fn material_capacity(
        &mut self,
        node: NodeId,
        name: &Ident,
        m: &Material,
        span: Span,
        volume: Option<(f64, Span)>,
        mass: Option<(f64, Span)>,
    ) -> Option<NodeCapacity> {
        let missing = |what: &str, example: &str| {
            Diagnostic::error(
                "E703",
                format!(
                    "material `{}` has no `{what}`, needed for the capacity of node `{}`",
                    m.name, name.name
                ),
                span,
            )
            .with_label(format!("`{what}` missing"))
            .with_secondary(m.span, "material declared here")
            .with_help(format!("add it to the material, e.g. `{what} = {example}`"))
        };
        let (v, ms) = match (volume, mass) {
            (Some(v), Some(ms)) => {
                self.alternatives("volume", "mass", v.1, ms.1);
                return None;
            }
            (None, None) => {
                self.diags.push(
                    Diagnostic::error(
                        "E203",
                        format!(
                            "node `{}` needs the `volume` or `mass` of its material",
                            name.name
                        ),
                        span,
                    )
                    .with_label("`volume` or `mass` missing")
                    .with_help("add it, e.g. `material = water, volume = 2.5 L`"),
                );
                return None;
            }
            (v, ms) => (v.map(|v| v.0), ms.map(|m| m.0)),
        };
        let Some(cp) = m.specific_heat else {
            self.diags.push(missing("specific_heat", "4180 J/(kg*K)"));
            return None;
        };
        let (capacity, volume) = match (v, ms) {
            (Some(v), _) => {
                let Some(rho) = m.density else {
                    self.diags.push(missing("density", "1000 kg/m^3"));
                    return None;
                };
                (rho * v * cp, Some(v))
            }
            (None, Some(mass)) => (mass * cp, m.density.map(|rho| mass / rho)),
            (None, None) => return None,
        };
        Some(NodeCapacity {
            node,
            capacity,
            span,
            lump: Some(Lump {
                material: m.name.clone(),
                k: m.k,
                volume,
            }),
        })
    }

    /// W701 for every lumped body whose Biot number is above [`BIOT_LUMPED`].
    pub(super) fn biot_warnings(&mut self) {
        let net = self.asm.net();
        let temps = representative_temperatures(net, &self.timed.dynamics.initial);
        for c in &self.timed.dynamics.capacities {
            let Some(lump) = &c.lump else { continue };
            let Some(volume) = lump.volume else { continue };
            let Some(biot) = biot_number_at(net, c.node, volume, lump.k, &temps) else {
                continue;
            };
            if biot.number > BIOT_LUMPED {
                self.diags.push(
                    Diagnostic::warning(
                        "W701",
                        format!("node `{}` may not be one temperature: Biot number h·Lc/k = {:.3} is above {BIOT_LUMPED}", net.nodes[c.node].name, biot.number),
                        c.span,
                    )
                    .with_label(format!(
                        "h = {}, Lc = V/A = {}, k = {}",
                        elements::show(biot.h, Dim::HEAT_TRANSFER_COEFF),
                        elements::show(biot.length, Dim::LENGTH),
                        elements::show(lump.k, Dim::CONDUCTIVITY)
                    ))
                    .with_help(
                        "inside the body the temperature varies by more than the lumped model allows (Bi > 0.1 is common practice); split the body into \
                         several nodes joined by `layer` links, or read the result as a rough estimate (a stirred or convecting liquid mixes better than conduction alone suggests)",
                    ),
                );
            }
        }
    }
}

/// A Biot number with its parts.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Biot {
    pub number: f64,
    /// Area-weighted mean film coefficient over the node's film links, W/(m²·K).
    pub h: f64,
    /// Characteristic length V / A_surface, m.
    pub length: f64,
    /// Total area of the node's film links, m².
    pub surface: f64,
}

/// Bi = h·Lc/k with Lc = V/A, where A is the total area of the `film` links that touch the node
/// and h their area-weighted mean coefficient (ΣG/ΣA). `None` when the node has neither a film
/// nor a radiation link. Radiation links at the node add their linearised coefficient (see [`biot_number_at`]), at
/// the fixed temperatures and stated initial ones (the mean fixed temperature elsewhere).
pub fn biot_number(net: &Network, node: NodeId, volume: f64, k: f64) -> Option<Biot> {
    let temps = representative_temperatures(net, &net.dynamics.initial);
    biot_number_at(net, node, volume, k, &temps)
}

/// Node temperatures to judge temperature-dependent links by before any solve: fixed values,
/// stated initial temperatures, and the mean fixed temperature (20 °C without one) elsewhere.
pub fn representative_temperatures(
    net: &Network,
    initial: &[(NodeId, f64, crate::span::Span)],
) -> Vec<f64> {
    let fixed: Vec<f64> = net.nodes.iter().filter_map(|n| n.fixed).collect();
    let mean = if fixed.is_empty() {
        293.15
    } else {
        fixed.iter().sum::<f64>() / fixed.len() as f64
    };
    let mut t: Vec<f64> = net.nodes.iter().map(|n| n.fixed.unwrap_or(mean)).collect();
    for &(node, v, _) in initial {
        if let Some(slot) = t.get_mut(node) {
            if net.nodes[node].fixed.is_none() {
                *slot = v;
            }
        }
    }
    t
}

/// [`biot_number`] with the links' conductances taken at node temperatures `temps` (K). The
/// surface coefficient combines convection (`film` links) and radiation, h = h_c + h_r with
/// h_r = ΔQ/ΔT per area of the radiating surface, as the lumped-capacitance criterion asks
/// (common practice); the surface is the film links' area, or the radiating area when the body
/// has no film link.
pub fn biot_number_at(
    net: &Network,
    node: NodeId,
    volume: f64,
    k: f64,
    temps: &[f64],
) -> Option<Biot> {
    let (mut g, mut a) = (0.0, 0.0);
    let (mut g_rad, mut a_rad) = (0.0, 0.0);
    for l in &net.links {
        if l.from != node && l.to != node {
            continue;
        }
        if l.kind == "film" || matches!(l.law, crate::network::LinkLaw::Convection(_)) {
            if let Some(area) = l.area {
                g += l.conductance_at(temps);
                a += area;
            }
        } else if matches!(l.law, crate::network::LinkLaw::Radiation { .. }) {
            g_rad += l.conductance_at(temps);
            // The link's area is its FROM surface's.
            if l.from == node {
                a_rad += l.area.unwrap_or(0.0);
            }
        }
    }
    if a <= 0.0 {
        a = a_rad;
    }
    g += g_rad;
    if a <= 0.0 || k <= 0.0 || !g.is_finite() {
        return None;
    }
    let h = g / a;
    let length = volume / a;
    Some(Biot {
        number: h * length / k,
        h,
        length,
        surface: a,
    })
}
