//! Convection films whose coefficient h comes from a correlation and the fluid's properties at
//! the temperatures being solved: natural convection from walls, cylinders, plates and
//! spheres, forced flow across a cylinder, along a plate and through a pipe, and optionally
//! radiation from the same surface to surroundings at the fluid's temperature.
//!
//! A film's law is evaluated again at every Newton iterate and every time step
//! ([`FilmLaw::flow`]), so the surface temperature and h agree at the answer. The slopes Newton's
//! method needs come from central differences of the heat flow (h depends on the temperatures
//! through the properties and, in natural convection, through the temperature difference).

pub mod correlations;
pub mod report;

use crate::fluid::{Fluid, OutOfRange};
use crate::laws::STEFAN_BOLTZMANN;
use correlations as c;
use serde::Serialize;

/// The geometry and flow a film's correlation describes, SI units.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub enum Correlation {
    /// Vertical plate or wall of this height.
    NaturalWall {
        height: f64,
    },
    /// Long horizontal cylinder of this outer diameter.
    NaturalCylinder {
        diameter: f64,
    },
    /// Horizontal plate whose fluid side faces up (or down), characteristic length A/P.
    NaturalPlate {
        length: f64,
        facing_up: bool,
    },
    NaturalSphere {
        diameter: f64,
    },
    /// Cylinder in a cross flow of this approach velocity.
    Crossflow {
        velocity: f64,
        diameter: f64,
    },
    /// Flow along a flat plate of this length in the flow direction; `turbulent` from the
    /// leading edge (a tripped boundary layer), otherwise laminar then mixed.
    PlateFlow {
        velocity: f64,
        length: f64,
        turbulent: bool,
    },
    /// Fully developed flow at this mean velocity in a round pipe of this bore.
    PipeFlow {
        velocity: f64,
        diameter: f64,
        uniform_heat_flux: bool,
    },
}

impl Correlation {
    /// The correlation's published name, for reports.
    pub fn name(&self) -> &'static str {
        match self {
            Correlation::NaturalWall { .. } => "Churchill–Chu, vertical plate",
            Correlation::NaturalCylinder { .. } => "Churchill–Chu, horizontal cylinder",
            Correlation::NaturalPlate {
                facing_up: true, ..
            } => "Lloyd–Moran, horizontal plate, hot face up",
            Correlation::NaturalPlate { .. } => "McAdams, horizontal plate, hot face down",
            Correlation::NaturalSphere { .. } => "Churchill, sphere",
            Correlation::Crossflow { .. } => "Churchill–Bernstein, cylinder in cross flow",
            Correlation::PlateFlow {
                turbulent: true, ..
            } => "Schlichting–Gersten, turbulent flat plate",
            Correlation::PlateFlow { .. } => "Pohlhausen laminar / mixed flat plate",
            Correlation::PipeFlow { .. } => {
                "fully developed pipe flow: 3.66 or 4.36 laminar, Gnielinski turbulent"
            }
        }
    }

    fn natural(&self) -> bool {
        matches!(
            self,
            Correlation::NaturalWall { .. }
                | Correlation::NaturalCylinder { .. }
                | Correlation::NaturalPlate { .. }
                | Correlation::NaturalSphere { .. }
        )
    }

    /// The characteristic length of the Nusselt and Reynolds or Rayleigh numbers, m.
    pub fn length(&self) -> f64 {
        match *self {
            Correlation::NaturalWall { height } => height,
            Correlation::NaturalCylinder { diameter }
            | Correlation::NaturalSphere { diameter }
            | Correlation::Crossflow { diameter, .. }
            | Correlation::PipeFlow { diameter, .. } => diameter,
            Correlation::NaturalPlate { length, .. } | Correlation::PlateFlow { length, .. } => {
                length
            }
        }
    }
}

/// A computed film: correlation, fluid, surface area, and which end of the link is the fluid.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct FilmLaw {
    pub correlation: Correlation,
    pub fluid: Fluid,
    /// m²
    pub area: f64,
    /// Emissivity of the surface when it also radiates to surroundings at the fluid's
    /// temperature.
    pub emissivity: Option<f64>,
    /// True when the FROM end of the link is the fluid (an inner film of a build-up).
    pub fluid_at_from: bool,
}

/// Everything one evaluation of a film yields, for the solve and for reports.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct FilmState {
    /// Convective coefficient, W/(m²·K).
    pub h: f64,
    /// Linearised radiative coefficient εσ(Ts² + Tf²)(Ts + Tf), W/(m²·K); 0 without emissivity.
    pub h_radiation: f64,
    /// Heat from the surface into the fluid by convection and by radiation, W.
    pub q_convection: f64,
    pub q_radiation: f64,
    /// Temperature the properties were taken at, K (film or bulk temperature).
    pub property_temperature: f64,
    pub reynolds: Option<f64>,
    pub grashof: Option<f64>,
    pub rayleigh: Option<f64>,
    pub prandtl: f64,
    pub nusselt: f64,
    /// laminar, mixed, turbulent, transitional; for natural convection the branch used.
    pub regime: &'static str,
    /// Groups outside the correlation's range: (group, value, low, high).
    pub outside: Vec<(&'static str, f64, f64, f64)>,
    /// The property temperature outside the fluid's range.
    pub properties_outside: Option<OutOfRange>,
}

impl FilmLaw {
    /// (surface, fluid) temperatures from the link's (from, to) ends.
    fn ends(&self, t_from: f64, t_to: f64) -> (f64, f64) {
        if self.fluid_at_from {
            (t_to, t_from)
        } else {
            (t_from, t_to)
        }
    }

    /// Evaluate the film at the link's end temperatures (kelvin).
    pub fn state(&self, t_from: f64, t_to: f64) -> FilmState {
        let (ts, tf) = self.ends(t_from, t_to);
        let corr = self.correlation;
        let t_props = match corr {
            // Internal flow: properties at the bulk (fluid) temperature.
            Correlation::PipeFlow { .. } => tf,
            _ => 0.5 * (ts + tf),
        };
        let (p, properties_outside) = self.fluid.properties(t_props);
        let (pr, nu_kin, l) = (p.prandtl(), p.kinematic_viscosity(), corr.length());
        let dt = ts - tf;
        let mut out = Vec::new();
        let mut check = |range: &[c::Validity], values: &[(&'static str, f64)]| {
            for v in range {
                if let Some(&(_, x)) = values.iter().find(|(g, _)| *g == v.group) {
                    if !v.holds(x) {
                        out.push((v.group, x, v.low, v.high));
                    }
                }
            }
        };
        let (mut re, mut gr, mut ra) = (None, None, None);
        let (nusselt, regime) = if corr.natural() {
            let g = c::GRAVITY * (p.expansion * dt).abs() * l.powi(3) / (nu_kin * nu_kin);
            let r = g * pr;
            gr = Some(g);
            ra = Some(r);
            let groups = [("Ra", r), ("Pr", pr)];
            match corr {
                Correlation::NaturalWall { .. } => {
                    check(c::VERTICAL_PLATE_RANGE, &groups);
                    (
                        c::vertical_plate_churchill_chu(r, pr),
                        "laminar and turbulent",
                    )
                }
                Correlation::NaturalCylinder { .. } => {
                    check(c::HORIZONTAL_CYLINDER_RANGE, &groups);
                    (
                        c::horizontal_cylinder_churchill_chu(r, pr),
                        "laminar and turbulent",
                    )
                }
                Correlation::NaturalSphere { .. } => {
                    check(c::SPHERE_RANGE, &groups);
                    (c::sphere_churchill(r, pr), "laminar and turbulent")
                }
                Correlation::NaturalPlate { facing_up, .. } => {
                    // The unstable case: fluid lighter at the surface rises away from a face
                    // looking up. β·ΔT > 0 means the fluid at the surface is lighter.
                    let lighter_at_surface = p.expansion * dt > 0.0;
                    if facing_up == lighter_at_surface {
                        check(c::PLATE_UP_RANGE, &groups);
                        let branch = if r <= 1e7 {
                            "0.54·Ra^(1/4)"
                        } else {
                            "0.15·Ra^(1/3)"
                        };
                        (c::plate_facing_up_lloyd_moran(r), branch)
                    } else {
                        check(c::PLATE_DOWN_RANGE, &groups);
                        (c::plate_facing_down_mcadams(r), "stable, 0.27·Ra^(1/4)")
                    }
                }
                _ => unreachable!("natural() lists the natural-convection correlations"),
            }
        } else {
            match corr {
                Correlation::Crossflow { velocity, .. } => {
                    let r = velocity * l / nu_kin;
                    re = Some(r);
                    check(c::CROSSFLOW_RANGE, &[("Re·Pr", r * pr)]);
                    (c::cylinder_crossflow_churchill_bernstein(r, pr), "all Re")
                }
                Correlation::PlateFlow {
                    velocity,
                    turbulent,
                    ..
                } => {
                    let r = velocity * l / nu_kin;
                    re = Some(r);
                    let groups = [("Re", r), ("Pr", pr)];
                    if turbulent {
                        check(c::PLATE_TURBULENT_RANGE, &groups);
                        (c::plate_turbulent_schlichting(r, pr), "turbulent")
                    } else if r <= c::PLATE_TRANSITION_RE {
                        check(c::PLATE_LAMINAR_RANGE, &groups);
                        (c::plate_mixed(r, pr), "laminar")
                    } else {
                        check(c::PLATE_TURBULENT_RANGE, &groups);
                        (c::plate_mixed(r, pr), "mixed")
                    }
                }
                Correlation::PipeFlow {
                    velocity,
                    uniform_heat_flux,
                    ..
                } => {
                    let r = velocity * l / nu_kin;
                    re = Some(r);
                    let (nu, regime) = c::pipe(r, pr, uniform_heat_flux);
                    if regime == "turbulent" {
                        check(c::PIPE_TURBULENT_RANGE, &[("Re", r), ("Pr", pr)]);
                    }
                    (nu, regime)
                }
                _ => unreachable!("the forced correlations"),
            }
        };
        let h = nusselt * p.conductivity / l;
        let (h_radiation, q_radiation) = match self.emissivity {
            Some(e) => (
                e * STEFAN_BOLTZMANN * (ts * ts + tf * tf) * (ts + tf),
                e * STEFAN_BOLTZMANN * self.area * (ts.powi(4) - tf.powi(4)),
            ),
            None => (0.0, 0.0),
        };
        FilmState {
            h,
            h_radiation,
            q_convection: h * self.area * dt,
            q_radiation,
            property_temperature: t_props,
            reynolds: re,
            grashof: gr,
            rayleigh: ra,
            prandtl: pr,
            nusselt,
            regime,
            outside: out,
            properties_outside,
        }
    }

    /// Heat flow from the link's FROM end to its TO end, W.
    pub fn heat_flow(&self, t_from: f64, t_to: f64) -> f64 {
        let s = self.state(t_from, t_to);
        let q = s.q_convection + s.q_radiation;
        if self.fluid_at_from {
            -q
        } else {
            q
        }
    }

    /// Heat flow and its slopes with respect to the two end temperatures (central differences;
    /// the heat flow is smooth in each temperature, continuous in slope where ΔT passes zero).
    pub fn flow(&self, t_from: f64, t_to: f64) -> (f64, f64, f64) {
        const D: f64 = 1e-3; // K
        let q = self.heat_flow(t_from, t_to);
        let d_from =
            (self.heat_flow(t_from + D, t_to) - self.heat_flow(t_from - D, t_to)) / (2.0 * D);
        let d_to =
            (self.heat_flow(t_from, t_to + D) - self.heat_flow(t_from, t_to - D)) / (2.0 * D);
        (q, d_from, d_to)
    }
}
