//! Conduction shape factors: two-dimensional and three-dimensional conduction between two
//! isothermal surfaces in a medium of conductivity k, written R = 1/(k·S) with the shape
//! factor S in metres.
// Diagnostics are returned by value throughout the compiler; boxing them here alone would
// split the element API.
#![allow(clippy::result_large_err)]

use super::shell::{conduction_law, conductivity};
use super::{material, q, show, ArgSpec, Args, Built, ElementKind, Figure};
use crate::diagnostic::Diagnostic;
use crate::network::LinkLaw;
use crate::units::Dim;
use std::f64::consts::PI;

/// A horizontal isothermal cylinder buried in a semi-infinite medium: S = 2πL/arccosh(2z/D).
pub struct BuriedPipe;
/// An isothermal sphere buried in a semi-infinite medium: S = 2πD/(1 − D/(4z)).
pub struct BuriedSphere;
/// Two parallel isothermal cylinders in an infinite medium:
/// S = 2πL/arccosh((4w² − D₁² − D₂²)/(2D₁D₂)).
pub struct ParallelCylinders;

const MEDIUM: ArgSpec = material("the surrounding medium (soil, concrete), gives k").either("k");
const MEDIUM_K: ArgSpec = q(
    "k",
    Dim::CONDUCTIVITY,
    "conductivity of the medium, instead of a material",
)
.either("material");

const PIPE: &[ArgSpec] = &[
    MEDIUM,
    MEDIUM_K,
    q("diameter", Dim::LENGTH, "outer diameter D of the pipe").required(),
    q(
        "depth",
        Dim::LENGTH,
        "depth z of the pipe's axis below the surface",
    )
    .required(),
    q("length", Dim::LENGTH, "buried length L (L ≫ D)").required(),
];
const SPHERE: &[ArgSpec] = &[
    MEDIUM,
    MEDIUM_K,
    q("diameter", Dim::LENGTH, "diameter D of the sphere").required(),
    q(
        "depth",
        Dim::LENGTH,
        "depth z of the sphere's centre below the surface",
    )
    .required(),
];
const PAIR: &[ArgSpec] = &[
    MEDIUM,
    MEDIUM_K,
    q("diameter", Dim::LENGTH, "diameter D₁ of the FROM cylinder").required(),
    q("diameter_to", Dim::LENGTH, "diameter D₂ of the TO cylinder").required(),
    q("spacing", Dim::LENGTH, "distance w between the two axes").required(),
    q("length", Dim::LENGTH, "length L of the run (L ≫ D, w)").required(),
];

/// E215: the geometry is outside the range where the shape factor holds.
fn out_of_range(a: &Args, arg: &str, message: String, label: &str, help: &str) -> Diagnostic {
    Diagnostic::error("E215", message, a.span(arg))
        .with_label(label.to_string())
        .with_help(help.to_string())
}

fn finish(a: &Args, s: f64, text: String) -> Result<(LinkLaw, Built), Diagnostic> {
    let k = conductivity(a, "material = soil")?;
    let g = k * s;
    let built = Built {
        conductance: g,
        area: None,
        formula: format!(
            "R = 1/(k·S), {text} = {}; k = {} → R = {}",
            show(s, Dim::LENGTH),
            show(k, Dim::CONDUCTIVITY),
            show(1.0 / g, Dim::RESISTANCE)
        )
        .into(),
    };
    Ok(conduction_law(a, s, built))
}

/// The shape factor S of a use, in m, for reports: the law keeps it for a k(T) medium; at
/// constant k it is the conductance over k.
fn shape_figure(kind: &dyn ElementKind, a: &Args) -> Vec<Figure> {
    let s = match kind.law(a) {
        Ok((LinkLaw::Conduction { shape, .. }, _)) => shape,
        Ok((law, b)) => match (law, conductivity(a, "")) {
            (LinkLaw::Linear { .. }, Ok(k)) => b.conductance / k,
            _ => return Vec::new(),
        },
        Err(_) => return Vec::new(),
    };
    vec![Figure::of("shape_factor", s, Dim::LENGTH)]
}

impl ElementKind for BuriedPipe {
    fn figures(&self, a: &Args) -> Vec<Figure> {
        shape_figure(self, a)
    }
    fn name(&self) -> &'static str {
        "buried_pipe"
    }
    fn summary(&self) -> &'static str {
        "horizontal pipe buried in the ground: S = 2πL/arccosh(2z/D), R = 1/(k·S)"
    }
    fn params(&self) -> &'static [ArgSpec] {
        PIPE
    }
    fn build(&self, a: &Args) -> Result<Built, Diagnostic> {
        self.law(a).map(|(_, b)| b)
    }
    fn law(&self, a: &Args) -> Result<(LinkLaw, Built), Diagnostic> {
        let d = a.require("diameter", "diameter = 110 mm")?;
        let z = a.require("depth", "depth = 0.8 m")?;
        let l = a.require("length", "length = 40 m")?;
        if z <= d / 2.0 {
            return Err(out_of_range(
                a,
                "depth",
                format!("the pipe's axis at depth {} is not below half its diameter ({}): the pipe would break the surface", show(z, Dim::LENGTH), show(d / 2.0, Dim::LENGTH)),
                "depth ≤ D/2",
                "`depth` is measured from the surface to the pipe's axis and must exceed D/2",
            ));
        }
        let s = 2.0 * PI * l / (2.0 * z / d).acosh();
        finish(
            a,
            s,
            format!(
                "S = 2πL/arccosh(2z/D) = 2π × {} / arccosh(2 × {} / {})",
                show(l, Dim::LENGTH),
                show(z, Dim::LENGTH),
                show(d, Dim::LENGTH)
            ),
        )
    }
}

impl ElementKind for BuriedSphere {
    fn figures(&self, a: &Args) -> Vec<Figure> {
        shape_figure(self, a)
    }
    fn name(&self) -> &'static str {
        "buried_sphere"
    }
    fn summary(&self) -> &'static str {
        "sphere buried in the ground: S = 2πD/(1 − D/(4z)), R = 1/(k·S)"
    }
    fn params(&self) -> &'static [ArgSpec] {
        SPHERE
    }
    fn build(&self, a: &Args) -> Result<Built, Diagnostic> {
        self.law(a).map(|(_, b)| b)
    }
    fn law(&self, a: &Args) -> Result<(LinkLaw, Built), Diagnostic> {
        let d = a.require("diameter", "diameter = 1.5 m")?;
        let z = a.require("depth", "depth = 2 m")?;
        if z <= d / 2.0 {
            return Err(out_of_range(
                a,
                "depth",
                format!("the sphere's centre at depth {} is not below its radius ({}): the sphere would break the surface", show(z, Dim::LENGTH), show(d / 2.0, Dim::LENGTH)),
                "depth ≤ D/2",
                "`depth` is measured from the surface to the sphere's centre and must exceed D/2",
            ));
        }
        let s = 2.0 * PI * d / (1.0 - d / (4.0 * z));
        finish(
            a,
            s,
            format!(
                "S = 2πD/(1 − D/(4z)) = 2π × {} / (1 − {} / (4 × {}))",
                show(d, Dim::LENGTH),
                show(d, Dim::LENGTH),
                show(z, Dim::LENGTH)
            ),
        )
    }
}

impl ElementKind for ParallelCylinders {
    fn figures(&self, a: &Args) -> Vec<Figure> {
        shape_figure(self, a)
    }
    fn name(&self) -> &'static str {
        "parallel_cylinders"
    }
    fn summary(&self) -> &'static str {
        "two parallel cylinders in a medium: S = 2πL/arccosh((4w² − D₁² − D₂²)/(2D₁D₂)), R = 1/(k·S)"
    }
    fn params(&self) -> &'static [ArgSpec] {
        PAIR
    }
    fn build(&self, a: &Args) -> Result<Built, Diagnostic> {
        self.law(a).map(|(_, b)| b)
    }
    fn law(&self, a: &Args) -> Result<(LinkLaw, Built), Diagnostic> {
        let d1 = a.require("diameter", "diameter = 60 mm")?;
        let d2 = a.require("diameter_to", "diameter_to = 60 mm")?;
        let w = a.require("spacing", "spacing = 200 mm")?;
        let l = a.require("length", "length = 20 m")?;
        if w <= (d1 + d2) / 2.0 {
            return Err(out_of_range(
                a,
                "spacing",
                format!("axes {} apart, but the cylinders' radii add up to {}: they would overlap", show(w, Dim::LENGTH), show((d1 + d2) / 2.0, Dim::LENGTH)),
                "spacing ≤ (D₁ + D₂)/2",
                "`spacing` is the distance between the two axes and must exceed the sum of the radii",
            ));
        }
        let s = 2.0 * PI * l / ((4.0 * w * w - d1 * d1 - d2 * d2) / (2.0 * d1 * d2)).acosh();
        finish(
            a,
            s,
            format!(
                "S = 2πL/arccosh((4w² − D₁² − D₂²)/(2D₁D₂)) with L = {}, w = {}, D₁ = {}, D₂ = {}",
                show(l, Dim::LENGTH),
                show(w, Dim::LENGTH),
                show(d1, Dim::LENGTH),
                show(d2, Dim::LENGTH)
            ),
        )
    }
}
