//! Quantities watched during a run (a node temperature, a link's heat flow, ...) and their
//! quadratic interpolant within a step, through the values at t, t + γh and t + h (the TR-BDF2
//! stage value is second-order accurate, so the interpolant matches the method's order). Peaks
//! inside a step and the times at which a level is crossed come from this interpolant.

use crate::limits::{Measure, Subject};
use crate::network::{Network, NodeId};

/// A watched quantity, computed from every node's temperature.
#[derive(Clone, Debug, PartialEq)]
pub enum Probe {
    Temperature(NodeId),
    /// Heat flow through a link, W, positive from its first node to its second.
    LinkFlow(usize),
    /// Heat flow through a build-up use, W.
    GroupFlow(usize),
    /// A value that does not change during the run (a U-value of linear links).
    Constant(f64),
    /// The U-value (`u_value`) or R-value of links in series over `area`, from their
    /// resistances ΔT/Q at the current temperatures (links with radiation or k(T)).
    Series {
        links: Vec<usize>,
        area: f64,
        u_value: bool,
    },
    /// A heat flow divided by an area.
    PerArea(Box<Probe>, f64),
}

impl Probe {
    pub fn for_measure(net: &Network, m: Measure, s: Subject) -> Probe {
        match (m, s) {
            (Measure::Temperature, Subject::Node(n)) => Probe::Temperature(n),
            (Measure::HeatFlow, Subject::Link(l)) => Probe::LinkFlow(l),
            (Measure::HeatFlow, Subject::Group(g)) => Probe::GroupFlow(g),
            (Measure::HeatFlux, Subject::Link(l)) => Probe::PerArea(
                Box::new(Probe::LinkFlow(l)),
                net.links[l].area.unwrap_or(f64::NAN),
            ),
            (Measure::HeatFlux, Subject::Group(g)) => Probe::PerArea(
                Box::new(Probe::GroupFlow(g)),
                net.groups[g].area.unwrap_or(f64::NAN),
            ),
            (Measure::UValue | Measure::RValue, Subject::Link(l))
                if !net.links[l].law.is_linear() =>
            {
                Probe::Series {
                    links: vec![l],
                    area: net.links[l].area.unwrap_or(f64::NAN),
                    u_value: m == Measure::UValue,
                }
            }
            (Measure::UValue | Measure::RValue, Subject::Group(gi))
                if net.groups[gi]
                    .links
                    .iter()
                    .any(|&l| !net.links[l].law.is_linear()) =>
            {
                Probe::Series {
                    links: net.groups[gi].links.clone(),
                    area: net.groups[gi].area.unwrap_or(f64::NAN),
                    u_value: m == Measure::UValue,
                }
            }
            (Measure::UValue | Measure::RValue, Subject::Link(l)) => {
                let (g, a) = (
                    net.links[l].conductance(),
                    net.links[l].area.unwrap_or(f64::NAN),
                );
                Probe::Constant(if m == Measure::UValue { g / a } else { a / g })
            }
            (Measure::UValue | Measure::RValue, Subject::Group(gi)) => {
                let group = &net.groups[gi];
                let r: f64 = group
                    .links
                    .iter()
                    .map(|&l| 1.0 / net.links[l].conductance())
                    .sum();
                let a = group.area.unwrap_or(f64::NAN);
                Probe::Constant(if m == Measure::UValue {
                    1.0 / (r * a)
                } else {
                    r * a
                })
            }
            _ => Probe::Constant(f64::NAN),
        }
    }

    /// The value for the temperatures `t` of every node (K).
    pub fn value(&self, net: &Network, t: &[f64]) -> f64 {
        match self {
            Probe::Temperature(n) => t[*n],
            Probe::LinkFlow(l) => net.links[*l].heat_flow(t),
            Probe::GroupFlow(g) => {
                // As the steady results do: the temperature difference over the series
                // resistance, each link's ΔT/Q at these temperatures.
                let group = &net.groups[*g];
                let r: f64 = group
                    .links
                    .iter()
                    .map(|&l| 1.0 / net.links[l].conductance_at(t))
                    .sum();
                (t[group.from] - t[group.to]) / r
            }
            Probe::Constant(v) => *v,
            Probe::Series {
                links,
                area,
                u_value,
            } => {
                let r: f64 = links
                    .iter()
                    .map(|&l| 1.0 / net.links[l].conductance_at(t))
                    .sum();
                if *u_value {
                    1.0 / (r * area)
                } else {
                    r * area
                }
            }
            Probe::PerArea(p, a) => p.value(net, t) / a,
        }
    }
}

/// p(s) = a·s² + b·s + c on s ∈ [0, 1] (s = (time − t)/h).
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Quadratic {
    pub a: f64,
    pub b: f64,
    pub c: f64,
}

impl Quadratic {
    /// Through (0, p0), (γ, pg), (1, p1).
    pub fn through(p0: f64, pg: f64, p1: f64, gamma: f64) -> Quadratic {
        let a = (pg - p0 - gamma * (p1 - p0)) / (gamma * (gamma - 1.0));
        Quadratic {
            a,
            b: p1 - p0 - a,
            c: p0,
        }
    }

    pub fn at(&self, s: f64) -> f64 {
        (self.a * s + self.b) * s + self.c
    }

    /// The lowest and highest values on [0, 1] as `(s, value)`.
    pub fn extremes(&self) -> ((f64, f64), (f64, f64)) {
        let mut lo = (0.0, self.c);
        let mut hi = (0.0, self.c);
        let mut consider = |s: f64| {
            let v = self.at(s);
            if v < lo.1 {
                lo = (s, v);
            }
            if v > hi.1 {
                hi = (s, v);
            }
        };
        consider(1.0);
        if self.a != 0.0 {
            let s = -self.b / (2.0 * self.a);
            if s > 0.0 && s < 1.0 {
                consider(s);
            }
        }
        (lo, hi)
    }

    /// Where p(s) passes `level` for s in (0, 1], earliest first, with `true` when rising.
    pub fn crossings(&self, level: f64) -> Vec<(f64, bool)> {
        let (a, b, c) = (self.a, self.b, self.c - level);
        let mut roots: Vec<f64> = Vec::new();
        let scale = a.abs() + b.abs() + c.abs();
        if scale == 0.0 {
            return Vec::new();
        }
        if a.abs() <= 1e-12 * scale {
            if b != 0.0 {
                roots.push(-c / b);
            }
        } else {
            let disc = b * b - 4.0 * a * c;
            if disc > 0.0 {
                // The numerically stable pair of roots.
                let q = -0.5 * (b + b.signum() * disc.sqrt());
                roots.push(q / a);
                if q != 0.0 {
                    roots.push(c / q);
                }
            }
        }
        let mut out: Vec<(f64, bool)> = roots
            .into_iter()
            .filter(|&s| s > 0.0 && s <= 1.0)
            .map(|s| (s, 2.0 * a * s + b > 0.0))
            .filter(|&(s, _)| {
                // A real crossing changes sign across the root.
                let before = self.at((s - 1e-9).max(0.0)) - level;
                let after = self.at((s + 1e-9).min(1.0 + 1e-9)) - level;
                before * after <= 0.0 && (before != 0.0 || after != 0.0)
            })
            .collect();
        out.sort_by(|x, y| x.0.total_cmp(&y.0));
        out
    }
}

/// Lagrange weights of the quadratic through s = 0, γ, 1, evaluated at `s`.
pub fn weights(s: f64, gamma: f64) -> [f64; 3] {
    [
        (s - gamma) * (s - 1.0) / gamma,
        s * (s - 1.0) / (gamma * (gamma - 1.0)),
        s * (s - gamma) / (1.0 - gamma),
    ]
}

#[cfg(test)]
mod tests {
    use super::*;
    const G: f64 = 2.0 - std::f64::consts::SQRT_2;

    #[test]
    fn quadratic_reproduces_its_points_and_finds_crossings() {
        let f = |s: f64| 3.0 * s * s - 4.0 * s + 1.0; // roots 1/3 and 1
        let q = Quadratic::through(f(0.0), f(G), f(1.0), G);
        for s in [0.0, 0.25, G, 0.8, 1.0] {
            assert!((q.at(s) - f(s)).abs() < 1e-12);
            let w = weights(s, G);
            assert!((w[0] * f(0.0) + w[1] * f(G) + w[2] * f(1.0) - f(s)).abs() < 1e-12);
        }
        let c = q.crossings(0.0);
        assert_eq!(c.len(), 2, "{c:?}");
        assert!((c[0].0 - 1.0 / 3.0).abs() < 1e-12 && !c[0].1);
        assert!((c[1].0 - 1.0).abs() < 1e-12 && c[1].1);
        let ((smin, vmin), (smax, vmax)) = q.extremes();
        assert!((smin - 2.0 / 3.0).abs() < 1e-12 && (vmin + 1.0 / 3.0).abs() < 1e-12);
        assert_eq!((smax, vmax), (0.0, 1.0));
    }

    #[test]
    fn a_straight_line_crosses_once() {
        let q = Quadratic::through(10.0, 10.0 - 4.0 * G, 6.0, G);
        assert!(q.a.abs() < 1e-12);
        assert_eq!(q.crossings(8.0), vec![(0.5, false)]);
        assert!(q.crossings(11.0).is_empty());
    }
}
