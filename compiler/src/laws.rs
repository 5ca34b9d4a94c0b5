//! How each link law turns its two end temperatures into a heat flow, with the slopes Newton's
//! method needs. Linear links keep their constant conductance; radiation and conduction with
//! k(T) and computed convection films are the nonlinear ones.

use crate::network::{Link, LinkLaw};

/// Stefan–Boltzmann constant, W/(m²·K⁴): exact in the SI since 2019 (CODATA 2018 value
/// 5.670374419e-8, derived from the defined h, c and k_B).
pub const STEFAN_BOLTZMANN: f64 = 5.670374419e-8;

impl LinkLaw {
    pub fn is_linear(&self) -> bool {
        matches!(self, LinkLaw::Linear { .. })
    }

    /// Heat flow from `from` to `to` (W) and its partial derivatives with respect to the two
    /// end temperatures (W/K). Temperatures in kelvin.
    pub fn flow(&self, t_from: f64, t_to: f64) -> (f64, f64, f64) {
        match self {
            LinkLaw::Linear { conductance } => {
                (conductance * (t_from - t_to), *conductance, -conductance)
            }
            LinkLaw::Radiation { exchange_area } => {
                let c = STEFAN_BOLTZMANN * exchange_area;
                (
                    c * (t_from.powi(4) - t_to.powi(4)),
                    4.0 * c * t_from.powi(3),
                    -4.0 * c * t_to.powi(3),
                )
            }
            LinkLaw::Conduction {
                shape,
                conductivity,
            } => (
                shape * conductivity.integral(t_to, t_from),
                shape * conductivity.k(t_from),
                -shape * conductivity.k(t_to),
            ),
            LinkLaw::Convection(film) => film.flow(t_from, t_to),
        }
    }

    /// The conductance that carries the same heat flow at these end temperatures (Q/ΔT), or the
    /// slope where they are equal.
    pub fn conductance_at(&self, t_from: f64, t_to: f64) -> f64 {
        let (q, d_from, _) = self.flow(t_from, t_to);
        let dt = t_from - t_to;
        if dt.abs() > 1e-9 * (t_from.abs() + t_to.abs()).max(1.0) {
            q / dt
        } else {
            d_from
        }
    }
}

impl Link {
    /// Heat flow in W, positive from `from` to `to`, at node temperatures `t` (kelvin).
    pub fn heat_flow(&self, t: &[f64]) -> f64 {
        self.law.flow(t[self.from], t[self.to]).0
    }
    /// Q/ΔT at node temperatures `t`, W/K (the constant conductance of a linear link).
    pub fn conductance_at(&self, t: &[f64]) -> f64 {
        self.law.conductance_at(t[self.from], t[self.to])
    }
}
