//! Convection films computed from a correlation: one element kind per geometry and flow, each
//! naming its fluid. The law and its checks live in `crate::convection`; here are the
//! arguments and the formula text.
// Diagnostics are returned by value throughout the compiler; boxing them here alone would
// split the element API.
#![allow(clippy::result_large_err)]

use super::{q, show, ArgSpec, Args, Built, ElementKind};
use crate::convection::{Correlation, FilmLaw};
use crate::diagnostic::Diagnostic;
use crate::fluid::{Fluid, AIR_PRESSURE_RANGE, ATMOSPHERE, FLUID_WORDS};
use crate::network::LinkLaw;
use crate::schema::choice;
use crate::units::Dim;

const FLUID: ArgSpec = choice(
    "fluid",
    FLUID_WORDS,
    "the fluid on the film's side: dry `air` or liquid `water`",
)
.required();
const PRESSURE: ArgSpec = q(
    "pressure",
    Dim::PRESSURE,
    "absolute pressure of the air, 0.1–2 bar",
)
.default("1 atm");
const AREA: ArgSpec = q("area", Dim::AREA, "surface area the film covers").required();
const EMISSIVITY: ArgSpec = q(
    "emissivity",
    Dim::NONE,
    "emissivity of the surface, to add radiation to surroundings at the fluid's temperature",
)
.fraction();
const DIRECTION: ArgSpec = choice(
    "direction",
    &["surface_to_fluid", "fluid_to_surface"],
    "which way the link runs: `fluid_to_surface` for an inner film of a build-up",
)
.default("surface_to_fluid");
const FACING: ArgSpec = choice(
    "facing",
    &["up", "down"],
    "which way the surface faces the fluid",
)
.required();
const WALL: ArgSpec = choice(
    "wall",
    &["temperature", "heat_flux"],
    "the laminar wall condition: uniform `temperature` (Nu = 3.66) or `heat_flux` (Nu = 4.36)",
)
.default("temperature");
const BOUNDARY_LAYER: ArgSpec = choice(
    "boundary_layer",
    &["natural", "turbulent"],
    "`natural`: laminar, turbulent after Re = 5·10⁵; `turbulent`: tripped at the leading edge",
)
.default("natural");

const fn length(name: &'static str, doc: &'static str) -> ArgSpec {
    q(name, Dim::LENGTH, doc).required()
}
const VELOCITY: ArgSpec = q("velocity", Dim::VELOCITY, "velocity of the fluid").required();

const WALL_ARGS: &[ArgSpec] = &[
    FLUID,
    length("height", "height of the wall or plate"),
    AREA,
    PRESSURE,
    EMISSIVITY,
    DIRECTION,
];
const CYLINDER_ARGS: &[ArgSpec] = &[
    FLUID,
    length("diameter", "outer diameter; a radial build-up supplies it"),
    AREA,
    PRESSURE,
    EMISSIVITY,
    DIRECTION,
];
const PLATE_ARGS: &[ArgSpec] = &[
    FLUID,
    FACING,
    length(
        "length",
        "characteristic length A/P: plate area over its perimeter",
    ),
    AREA,
    PRESSURE,
    EMISSIVITY,
    DIRECTION,
];
const SPHERE_ARGS: &[ArgSpec] = &[
    FLUID,
    length(
        "diameter",
        "outer diameter; a spherical build-up supplies it",
    ),
    AREA,
    PRESSURE,
    EMISSIVITY,
    DIRECTION,
];
const CROSSFLOW_ARGS: &[ArgSpec] = &[
    FLUID,
    VELOCITY,
    length("diameter", "outer diameter; a radial build-up supplies it"),
    AREA,
    PRESSURE,
    EMISSIVITY,
    DIRECTION,
];
const PLATE_FLOW_ARGS: &[ArgSpec] = &[
    FLUID,
    VELOCITY,
    length("length", "length of the plate in the flow direction"),
    AREA,
    BOUNDARY_LAYER,
    PRESSURE,
    EMISSIVITY,
    DIRECTION,
];
const PIPE_ARGS: &[ArgSpec] = &[
    FLUID,
    VELOCITY,
    length(
        "diameter",
        "bore of the pipe; a radial build-up supplies it",
    ),
    AREA,
    WALL,
    PRESSURE,
    DIRECTION,
];

/// Natural convection from a vertical wall or plate (Churchill–Chu).
pub struct NaturalWall;
/// Natural convection from a long horizontal cylinder (Churchill–Chu).
pub struct NaturalCylinder;
/// Natural convection from a horizontal plate (Lloyd–Moran facing up, McAdams facing down).
pub struct NaturalPlate;
/// Natural convection from a sphere (Churchill).
pub struct NaturalSphere;
/// A cylinder in cross flow (Churchill–Bernstein).
pub struct CrossflowCylinder;
/// Flow along a flat plate (Pohlhausen laminar, Schlichting–Gersten turbulent, mixed).
pub struct PlateFlow;
/// Fully developed flow in a pipe (3.66 / 4.36 laminar, Gnielinski turbulent).
pub struct PipeFlow;

/// The fluid with its pressure; E222 for a pressure that does not apply or is outside the range.
fn fluid(a: &Args) -> Result<Fluid, Diagnostic> {
    let word = a
        .choice("fluid")
        .ok_or_else(|| a.missing(&["fluid"], "fluid = air"))?;
    let pressure = a.get("pressure");
    match (word, pressure) {
        ("water", Some(_)) => Err(Diagnostic::error(
            "E222",
            format!("`pressure` of `{}` applies to air only", a.kind),
            a.span("pressure"),
        )
        .with_label("pressure given for water")
        .with_help("remove it: the water properties are those of the liquid at 1 atm (saturated liquid above 100 °C)")),
        ("water", None) => Ok(Fluid::Water),
        (_, p) => {
            let p = p.unwrap_or(ATMOSPHERE);
            let (lo, hi) = AIR_PRESSURE_RANGE;
            if !(lo..=hi).contains(&p) {
                return Err(Diagnostic::error(
                    "E222",
                    format!(
                        "`pressure` of `{}` is {} bar; the air properties hold from 0.1 to 2 bar (absolute)",
                        a.kind,
                        crate::units::format_number(p / 1e5)
                    ),
                    a.span("pressure"),
                )
                .with_label("outside 0.1–2 bar")
                .with_help("give the absolute pressure of the air, e.g. `pressure = 1 atm`; at higher pressures the density is no longer that of an ideal gas scaled from 1 atm, so state h directly with `film(h = …)`"));
            }
            Ok(Fluid::Air { pressure: p })
        }
    }
}

/// The film law of a use, and what the formula text says about it.
fn film_law(
    a: &Args,
    correlation: Correlation,
    text: String,
) -> Result<(LinkLaw, Built), Diagnostic> {
    let area = a.require("area", "area = 2 m^2")?;
    let law = FilmLaw {
        correlation,
        fluid: fluid(a)?,
        area,
        emissivity: a.get("emissivity"),
        fluid_at_from: a.choice("direction") == Some("fluid_to_surface"),
    };
    // For reference only (the solve evaluates h at every iterate): a surface 10 K above the
    // fluid at 20 °C, or 10 K below it at 60 °C for water, inside both fluids' ranges.
    let (ts, tf) = (303.15, 293.15);
    let (t_from, t_to) = if law.fluid_at_from {
        (tf, ts)
    } else {
        (ts, tf)
    };
    let g = law.heat_flow(t_from, t_to) / (t_from - t_to);
    let radiation = match law.emissivity {
        Some(e) => format!(" + radiation ε·σ·A·(T_s⁴ − T_f⁴) with ε = {e} to surroundings at the fluid's temperature"),
        None => String::new(),
    };
    let formula = format!(
        "Q = h·A·(T_s − T_f){radiation}, A = {}; h = Nu·k/L from {} in {}, {text}; evaluated at the solved temperatures",
        show(area, Dim::AREA),
        correlation.name(),
        law.fluid.describe()
    );
    Ok((
        LinkLaw::Convection(Box::new(law)),
        Built {
            conductance: g,
            area: Some(area),
            formula,
        },
    ))
}

macro_rules! film_kind {
    ($ty:ident, $name:literal, $summary:literal, $args:ident, |$a:ident| $corr:expr) => {
        impl ElementKind for $ty {
            fn name(&self) -> &'static str {
                $name
            }
            fn summary(&self) -> &'static str {
                $summary
            }
            fn params(&self) -> &'static [ArgSpec] {
                $args
            }
            fn build(&self, a: &Args) -> Result<Built, Diagnostic> {
                self.law(a).map(|(_, b)| b)
            }
            fn law(&self, $a: &Args) -> Result<(LinkLaw, Built), Diagnostic> {
                let (corr, text): (Correlation, String) = $corr;
                film_law($a, corr, text)
            }
        }
    };
}

fn len(a: &Args, name: &str) -> Result<f64, Diagnostic> {
    a.require(name, &format!("{name} = 100 mm"))
}

film_kind!(NaturalWall, "natural_wall",
    "natural convection from a vertical wall or plate (Churchill–Chu), h from the fluid's properties",
    WALL_ARGS, |a| {
        let height = len(a, "height")?;
        (Correlation::NaturalWall { height }, format!("L = height = {}", show(height, Dim::LENGTH)))
    });
film_kind!(NaturalCylinder, "natural_cylinder",
    "natural convection from a horizontal cylinder or pipe (Churchill–Chu), h from the fluid's properties",
    CYLINDER_ARGS, |a| {
        let diameter = len(a, "diameter")?;
        (Correlation::NaturalCylinder { diameter }, format!("L = D = {}", show(diameter, Dim::LENGTH)))
    });
film_kind!(
    NaturalPlate,
    "natural_plate",
    "natural convection from a horizontal plate facing up or down (Lloyd–Moran, McAdams)",
    PLATE_ARGS,
    |a| {
        let length = len(a, "length")?;
        let facing = a
            .choice("facing")
            .ok_or_else(|| a.missing(&["facing"], "facing = up"))?;
        let facing_up = facing == "up";
        (
            Correlation::NaturalPlate { length, facing_up },
            format!("L = A/P = {}", show(length, Dim::LENGTH)),
        )
    }
);
film_kind!(
    NaturalSphere,
    "natural_sphere",
    "natural convection from a sphere (Churchill), h from the fluid's properties",
    SPHERE_ARGS,
    |a| {
        let diameter = len(a, "diameter")?;
        (
            Correlation::NaturalSphere { diameter },
            format!("L = D = {}", show(diameter, Dim::LENGTH)),
        )
    }
);
film_kind!(
    CrossflowCylinder,
    "crossflow_cylinder",
    "forced flow across a cylinder (Churchill–Bernstein), h from the fluid's properties",
    CROSSFLOW_ARGS,
    |a| {
        let diameter = len(a, "diameter")?;
        let velocity = a.require("velocity", "velocity = 3 m/s")?;
        (
            Correlation::Crossflow { velocity, diameter },
            format!(
                "L = D = {}, velocity {}",
                show(diameter, Dim::LENGTH),
                show(velocity, Dim::VELOCITY)
            ),
        )
    }
);
film_kind!(PlateFlow, "plate_flow",
    "forced flow along a flat plate: laminar (Pohlhausen), mixed or turbulent (Schlichting–Gersten)",
    PLATE_FLOW_ARGS, |a| {
        let length = len(a, "length")?;
        let velocity = a.require("velocity", "velocity = 3 m/s")?;
        let turbulent = a.choice("boundary_layer") == Some("turbulent");
        (Correlation::PlateFlow { velocity, length, turbulent }, format!("L = {}, velocity {}", show(length, Dim::LENGTH), show(velocity, Dim::VELOCITY)))
    });
film_kind!(
    PipeFlow,
    "pipe_flow",
    "fully developed flow in a pipe: Nu = 3.66 or 4.36 laminar, Gnielinski turbulent",
    PIPE_ARGS,
    |a| {
        let diameter = len(a, "diameter")?;
        let velocity = a.require("velocity", "velocity = 1 m/s")?;
        let uniform_heat_flux = a.choice("wall") == Some("heat_flux");
        (
            Correlation::PipeFlow {
                velocity,
                diameter,
                uniform_heat_flux,
            },
            format!(
                "L = D = {}, mean velocity {}",
                show(diameter, Dim::LENGTH),
                show(velocity, Dim::VELOCITY)
            ),
        )
    }
);

/// True for the kinds above: a radial build-up supplies their `diameter`.
pub fn is_computed_film(kind: &str) -> bool {
    matches!(
        kind,
        "natural_wall"
            | "natural_cylinder"
            | "natural_plate"
            | "natural_sphere"
            | "crossflow_cylinder"
            | "plate_flow"
            | "pipe_flow"
    )
}
