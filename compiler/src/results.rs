//! Derived results of a solved network: heat flows, node balances, boundary heat, build-up
//! U- and R-values, and limit verdicts.

use crate::limits::{self, LimitResult, LimitSpec, Measure, Subject};
use crate::network::{LinkFigure, Network};
use crate::solve::Temperatures;
use serde::Serialize;

mod solution_check;
pub mod time_constants;
pub use solution_check::BALANCE_TOLERANCE;

#[derive(Clone, Debug, Serialize)]
pub struct GroupResult {
    pub name: String,
    /// Total resistance of the chain, K/W.
    pub resistance: f64,
    /// W, positive from the link's first node to its second.
    pub heat_flow: f64,
    /// W/(m²·K), films included.
    pub u_value: Option<f64>,
    /// The U-value rounded to two significant figures, as ISO 6946 states results; shown
    /// labelled as rounded beside the unrounded value.
    pub u_value_rounded: Option<f64>,
    /// W/m: the heat flow per metre of a cylindrical (pipe) build-up.
    pub heat_flow_per_length: Option<f64>,
    /// m²·K/W
    pub r_value: Option<f64>,
}

/// Everything a steady solve yields, indexed like the network.
#[derive(Clone, Debug, Serialize)]
pub struct Solution {
    /// Kelvin, per node.
    pub temperatures: Vec<f64>,
    /// W, per link, positive from `from` to `to`.
    pub heat_flows: Vec<f64>,
    /// W, per node: heat load plus heat flowing in minus heat flowing out. Zero to round-off at
    /// free nodes; at a fixed node it is minus the heat its boundary supplies.
    pub residuals: Vec<f64>,
    /// The largest |residual| over free nodes, W.
    pub worst_residual: f64,
    /// W, per fixed node: heat the boundary delivers into the network (negative: it absorbs).
    pub boundary_heat: Vec<(usize, f64)>,
    pub groups: Vec<GroupResult>,
    pub limits: Vec<LimitResult>,
    /// How the nonlinear solve converged; `None` for a linear network (one direct solve).
    pub convergence: Option<crate::nonlinear::Convergence>,
    /// Computed convection films at the solved temperatures: groups, h, heat by convection and
    /// by radiation.
    pub films: Vec<crate::convection::report::FilmResult>,
    /// Figures of links at the solved temperatures (a fin's tip and base temperatures, its
    /// heat flow per fin), from `Network::solved_figures`.
    pub figures: Vec<LinkFigure>,
    /// Every free capacity node's capacity, Biot number and R·C (empty for a steady model).
    pub capacity_nodes: Vec<time_constants::NodeDynamics>,
    /// The network's slowest and fastest time constants (see [`time_constants`]).
    pub time_constants: Option<time_constants::TimeConstants>,
}

/// A U-value (W/(m²·K)) rounded to two significant figures in the unit a report shows it in,
/// as a reader rounds it: `0.28 W/(m²·K)`, `0.049 Btu/(h·ft²·°F)`.
pub fn rounded_u_value(u: f64, system: crate::units::UnitSystem) -> String {
    use crate::units::{display_unit, format_number, Dim, TempKind};
    let unit = display_unit(Dim::HEAT_TRANSFER_COEFF, TempKind::NotTemperature, system);
    let shown = round_significant(unit.from_si(u), 2);
    format!("{} {}", format_number(shown), unit.text)
}

/// `v` rounded to `digits` significant figures (0.2849 → 0.28 with two).
pub fn round_significant(v: f64, digits: i32) -> f64 {
    if v == 0.0 || !v.is_finite() {
        return v;
    }
    // A computed U-value is no exact decimal, so rounding its binary value half away from
    // zero is what rounding by hand would give.
    let scale = 10f64.powi(digits - 1 - v.abs().log10().floor() as i32);
    (v * scale).round() / scale
}

impl Solution {
    pub fn new(net: &Network, temps: Temperatures, limit_specs: &[LimitSpec]) -> Solution {
        let t = temps.0;
        let flows: Vec<f64> = net.links.iter().map(|l| l.heat_flow(&t)).collect();
        let mut residuals: Vec<f64> = net.nodes.iter().map(|n| n.load).collect();
        for (l, q) in net.links.iter().zip(&flows) {
            residuals[l.from] -= q;
            residuals[l.to] += q;
        }
        let worst_residual = net
            .nodes
            .iter()
            .zip(&residuals)
            .filter(|(n, _)| n.fixed.is_none())
            .map(|(_, r)| r.abs())
            .fold(0.0, f64::max);
        let boundary_heat = net
            .nodes
            .iter()
            .enumerate()
            .filter(|(_, n)| n.fixed.is_some())
            .map(|(i, _)| (i, -residuals[i]))
            .collect();
        let groups = net
            .groups
            .iter()
            .map(|g| {
                let resistance: f64 = g
                    .links
                    .iter()
                    .map(|&l| 1.0 / net.links[l].conductance_at(&t))
                    .sum();
                let heat_flow = (t[g.from] - t[g.to]) / resistance;
                let u_value = g.area.map(|a| 1.0 / (resistance * a));
                GroupResult {
                    name: g.name.clone(),
                    resistance,
                    heat_flow,
                    u_value,
                    u_value_rounded: u_value.map(|u| round_significant(u, 2)),
                    heat_flow_per_length: g.length.map(|l| heat_flow / l),
                    r_value: g.area.map(|a| resistance * a),
                }
            })
            .collect();
        let mut sol = Solution {
            temperatures: t,
            heat_flows: flows,
            residuals,
            worst_residual,
            boundary_heat,
            groups,
            limits: Vec::new(),
            convergence: None,
            films: Vec::new(),
            figures: Vec::new(),
            capacity_nodes: Vec::new(),
            time_constants: None,
        };
        if !net.dynamics.capacities.is_empty() {
            sol.capacity_nodes = time_constants::node_dynamics(net, &sol.temperatures);
            sol.time_constants = time_constants::network_time_constants(net, &sol.temperatures);
        }
        sol.figures = net
            .solved_figures
            .iter()
            .map(|f| {
                f.at(
                    &net.links[f.link],
                    &sol.temperatures,
                    sol.heat_flows[f.link],
                )
            })
            .collect();
        sol.films = crate::convection::report::film_results(net, &sol.temperatures);
        sol.limits = limit_specs
            .iter()
            .map(|s| limits::verdict(s, sol.measure(net, s.measure, s.subject)))
            .collect();
        sol
    }

    /// The value of a measure on this solution, SI.
    pub fn measure(&self, net: &Network, m: Measure, s: Subject) -> f64 {
        match (m, s) {
            (Measure::Temperature, Subject::Node(n)) => self.temperatures[n],
            (Measure::HeatFlow, Subject::Link(l)) => self.heat_flows[l],
            (Measure::HeatFlow, Subject::Group(g)) => self.groups[g].heat_flow,
            (Measure::HeatFlux, Subject::Link(l)) => {
                self.heat_flows[l] / net.links[l].area.unwrap_or(f64::NAN)
            }
            (Measure::HeatFlux, Subject::Group(g)) => {
                self.groups[g].heat_flow / net.groups[g].area.unwrap_or(f64::NAN)
            }
            (Measure::UValue, Subject::Link(l)) => {
                net.links[l].conductance_at(&self.temperatures)
                    / net.links[l].area.unwrap_or(f64::NAN)
            }
            (Measure::UValue, Subject::Group(g)) => self.groups[g].u_value.unwrap_or(f64::NAN),
            (Measure::RValue, Subject::Link(l)) => {
                net.links[l].area.unwrap_or(f64::NAN)
                    / net.links[l].conductance_at(&self.temperatures)
            }
            (Measure::RValue, Subject::Group(g)) => self.groups[g].r_value.unwrap_or(f64::NAN),
            _ => f64::NAN,
        }
    }

    /// Total heat delivered by all boundaries with a positive delivery (the heat that crosses
    /// the network from warm to cold boundaries, plus loads that leave through them).
    pub fn total_boundary_inflow(&self) -> f64 {
        self.boundary_heat
            .iter()
            .map(|b| b.1)
            .filter(|q| *q > 0.0)
            .sum()
    }
}
