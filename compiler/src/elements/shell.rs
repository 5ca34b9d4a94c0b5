//! Cylindrical and spherical shells: pipe walls, lagging and tank insulation.
//!
//! A shell is stated by its inner radius and either its outer radius or its thickness. Inside a
//! build-up used with `inner_radius` (and `length` for a cylinder), the inner radius of each
//! shell is the outer radius of the one before it, so an analyst states the bore once.
// Diagnostics are returned by value throughout the compiler; boxing them here alone would
// split the element API.
#![allow(clippy::result_large_err)]

use super::{material, q, show, ArgSpec, Args, Built, ElementKind, Formula};
use crate::diagnostic::Diagnostic;
use crate::units::Dim;
use std::f64::consts::PI;

/// Conduction through a cylindrical shell: R = ln(r₂/r₁)/(2π·k·L).
pub struct Cylinder;
/// Conduction through a spherical shell: R = (1/r₁ − 1/r₂)/(4π·k).
pub struct Sphere;

/// The arguments both shells take; a cylinder adds its length.
macro_rules! shell_params {
    ($($extra:expr),*) => {
        &[
            material("a declared material (gives k)").either("k"),
            q(
                "k",
                Dim::CONDUCTIVITY,
                "thermal conductivity, instead of a material",
            )
            .either("material"),
            q(
                "inner_radius",
                Dim::LENGTH,
                "inner radius r₁ (supplied by the build-up inside one)",
            )
            .required(),
            q("outer_radius", Dim::LENGTH, "outer radius r₂").either("thickness"),
            q(
                "thickness",
                Dim::LENGTH,
                "wall thickness r₂ − r₁, instead of the outer radius",
            )
            .either("outer_radius"),
            $($extra),*
        ]
    };
}

const CYLINDER: &[ArgSpec] = shell_params!(q(
    "length",
    Dim::LENGTH,
    "length of the pipe run L (supplied by the build-up inside one)"
)
.required());

const SPHERE: &[ArgSpec] = shell_params!();

/// The geometry both shells share: conductivity and the two radii, checked.
pub struct Radii {
    pub k: f64,
    pub r1: f64,
    pub r2: f64,
}

/// Conductivity from `material` or `k`.
pub fn conductivity(a: &Args, example: &str) -> Result<f64, Diagnostic> {
    Ok(match a.one_of("material", "k", example)? {
        "material" => a.material("material").map(|m| m.k).unwrap_or(f64::NAN),
        _ => a.require("k", example)?,
    })
}

/// The outer radius a shell ends at, from `outer_radius` or `inner_radius + thickness`.
pub fn outer_radius(a: &Args) -> Option<f64> {
    a.get("outer_radius")
        .or_else(|| Some(a.get("inner_radius")? + a.get("thickness")?))
}

fn radii(a: &Args, example: &str) -> Result<Radii, Diagnostic> {
    let k = conductivity(a, example)?;
    let r1 = a.require("inner_radius", "inner_radius = 25 mm")?;
    let r2 = match a.one_of("outer_radius", "thickness", example)? {
        "outer_radius" => {
            let r2 = a.require("outer_radius", "outer_radius = 30 mm")?;
            if r2 <= r1 {
                return Err(Diagnostic::error(
                    "E211",
                    format!(
                        "the outer radius {} is not larger than the inner radius {}",
                        show(r2, Dim::LENGTH),
                        show(r1, Dim::LENGTH)
                    ),
                    a.span("outer_radius"),
                )
                .with_label("outer radius ≤ inner radius")
                .with_secondary(a.span("inner_radius"), "inner radius here")
                .with_help("a shell needs r_out > r_in; give the outer radius, or state the wall as `thickness = ...`"));
            }
            r2
        }
        _ => r1 + a.require("thickness", "thickness = 5 mm")?,
    };
    Ok(Radii { k, r1, r2 })
}

impl ElementKind for Cylinder {
    fn name(&self) -> &'static str {
        "cylinder"
    }
    fn summary(&self) -> &'static str {
        "cylindrical shell: R = ln(r₂/r₁)/(2π·k·L) (Fourier's law in radial coordinates)"
    }
    fn params(&self) -> &'static [ArgSpec] {
        CYLINDER
    }
    fn build(&self, a: &Args) -> Result<Built, Diagnostic> {
        let example = "cylinder(steel, inner_radius = 25 mm, thickness = 3 mm, length = 10 m)";
        let Radii { k, r1, r2 } = radii(a, example)?;
        let l = a.require("length", "length = 10 m")?;
        let g = 2.0 * PI * k * l / (r2 / r1).ln();
        Ok(Built {
            conductance: g,
            area: None,
            formula: Formula::new(
                "R = ln(r₂/r₁)/(2π·k·L) = ln({} / {}) / (2π × {} × {}) = {}",
                &[
                    (r2, Dim::LENGTH),
                    (r1, Dim::LENGTH),
                    (k, Dim::CONDUCTIVITY),
                    (l, Dim::LENGTH),
                    (1.0 / g, Dim::RESISTANCE),
                ],
            ),
        })
    }
    fn law(&self, a: &Args) -> Result<(crate::network::LinkLaw, Built), Diagnostic> {
        let b = self.build(a)?;
        let shape = b.conductance / conductivity(a, "")?;
        Ok(conduction_law(a, shape, b))
    }
}

impl ElementKind for Sphere {
    fn name(&self) -> &'static str {
        "sphere"
    }
    fn summary(&self) -> &'static str {
        "spherical shell: R = (1/r₁ − 1/r₂)/(4π·k) (Fourier's law in spherical coordinates)"
    }
    fn params(&self) -> &'static [ArgSpec] {
        SPHERE
    }
    fn build(&self, a: &Args) -> Result<Built, Diagnostic> {
        let example = "sphere(mineral_wool, inner_radius = 1.2 m, thickness = 100 mm)";
        let Radii { k, r1, r2 } = radii(a, example)?;
        let g = 4.0 * PI * k / (1.0 / r1 - 1.0 / r2);
        Ok(Built {
            conductance: g,
            area: None,
            formula: Formula::new(
                "R = (1/r₁ − 1/r₂)/(4π·k) = (1/{} − 1/{}) / (4π × {}) = {}",
                &[
                    (r1, Dim::LENGTH),
                    (r2, Dim::LENGTH),
                    (k, Dim::CONDUCTIVITY),
                    (1.0 / g, Dim::RESISTANCE),
                ],
            ),
        })
    }
    fn law(&self, a: &Args) -> Result<(crate::network::LinkLaw, Built), Diagnostic> {
        let b = self.build(a)?;
        let shape = b.conductance / conductivity(a, "")?;
        Ok(conduction_law(a, shape, b))
    }
}

/// The critical insulation radius r_c = k/h of a cylinder (2k/h of a sphere): while the outer
/// radius of insulation is below it, adding insulation increases the heat loss, because the
/// outer surface grows faster than the conduction resistance.
pub fn critical_radius(spherical: bool, k: f64, h: f64) -> f64 {
    if spherical {
        2.0 * k / h
    } else {
        k / h
    }
}

/// How a build-up's elements are laid out: side by side on one area, or nested around a bore.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Geometry {
    Plane,
    Cylinder,
    Sphere,
}

/// The geometry a build-up's element kinds imply: any `cylinder` makes it cylindrical, any
/// `sphere` spherical; plane layers cannot sit in a radial build-up.
pub fn geometry<'a>(kinds: impl Iterator<Item = &'a str>) -> Geometry {
    let mut g = Geometry::Plane;
    for k in kinds {
        match k {
            "cylinder" => g = Geometry::Cylinder,
            "sphere" if g == Geometry::Plane => g = Geometry::Sphere,
            _ => {}
        }
    }
    g
}

/// Check that a build-up does not mix plane layers, cylinders and spheres (reported once, at
/// the build-up's declaration).
pub fn check_mixed(elements: &[crate::syntax::BuildupElement]) -> Option<Diagnostic> {
    let first_of = |kind: &str| elements.iter().find(|e| e.element.kind.name == kind);
    let mut found: Vec<&crate::syntax::BuildupElement> = ["layer", "cylinder", "sphere"]
        .iter()
        .filter_map(|k| first_of(k))
        .collect();
    found.sort_by_key(|e| e.span.start);
    if found.len() < 2 {
        return None;
    }
    let (a, b) = (found[0], found[1]);
    Some(
        Diagnostic::error(
            "E212",
            format!("a build-up cannot mix `{}` and `{}` elements", a.element.kind.name, b.element.kind.name),
            b.element.kind.span,
        )
        .with_label(format!("`{}` here", b.element.kind.name))
        .with_secondary(a.element.kind.span, format!("`{}` here", a.element.kind.name))
        .with_help("a build-up is plane (`layer`), cylindrical (`cylinder`, around a pipe) or spherical (`sphere`, around a tank); split it into two build-ups"),
    )
}

/// The law of a conduction element with conduction shape S (m; A/L for a plane layer): linear
/// with G = k·S for a constant k, or S·∫k dT when the material's k depends on temperature.
pub fn conduction_law(a: &Args, shape: f64, built: Built) -> (crate::network::LinkLaw, Built) {
    use crate::network::LinkLaw;
    match a.material("material").and_then(|m| m.conductivity.clone()) {
        Some(conductivity) => {
            let formula = format!(
                "Q = S·∫k(T)dT over the layer's two face temperatures (Kirchhoff transform), S = {}; k(T) of `{}`; at constant k: {}",
                show(shape, Dim::LENGTH),
                a.material("material").map(|m| m.name.as_str()).unwrap_or(""),
                built.formula
            );
            (
                LinkLaw::Conduction {
                    shape,
                    conductivity,
                },
                Built {
                    formula: formula.into(),
                    ..built
                },
            )
        }
        None => (
            LinkLaw::Linear {
                conductance: built.conductance,
            },
            built,
        ),
    }
}
