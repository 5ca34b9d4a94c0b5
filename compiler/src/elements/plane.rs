//! Plane layers, convection films, contact resistances and explicit resistances/conductances.

use super::{material, q, ArgSpec, Args, Built, ElementKind, Formula};
use crate::diagnostic::Diagnostic;
use crate::units::Dim;

/// Conduction through a plane layer: R = L/(k·A) (Fourier's law, 1-D steady).
pub struct Layer;
/// Convection film: R = 1/(h·A) (Newton's law of cooling), or a surface resistance R = r/A.
pub struct Film;
/// Contact between two surfaces: R = R″/A.
pub struct Contact;
pub struct Resistance;
pub struct Conductance;

const LAYER: &[ArgSpec] = &[
    material("a declared material (gives k)").either("k"),
    q(
        "k",
        Dim::CONDUCTIVITY,
        "thermal conductivity, instead of a material",
    )
    .either("material"),
    q("thickness", Dim::LENGTH, "layer thickness L").required(),
    q("area", Dim::AREA, "area the heat crosses").required(),
];

impl ElementKind for Layer {
    fn name(&self) -> &'static str {
        "layer"
    }
    fn summary(&self) -> &'static str {
        "plane layer: R = L/(k·A) (Fourier's law)"
    }
    fn params(&self) -> &'static [ArgSpec] {
        LAYER
    }
    fn build(&self, a: &Args) -> Result<Built, Diagnostic> {
        let example = "layer(gypsum, thickness = 12.5 mm, area = 2 m^2)";
        let k = match a.one_of("material", "k", example)? {
            "material" => a.material("material").map(|m| m.k).unwrap_or(f64::NAN),
            _ => a.require("k", example)?,
        };
        let l = a.require("thickness", "thickness = 100 mm")?;
        let area = a.require("area", "area = 2 m^2")?;
        let g = k * area / l;
        Ok(Built {
            conductance: g,
            area: Some(area),
            formula: Formula::new(
                "R = L/(k·A) = {} / ({} × {}) = {}",
                &[
                    (l, Dim::LENGTH),
                    (k, Dim::CONDUCTIVITY),
                    (area, Dim::AREA),
                    (1.0 / g, Dim::RESISTANCE),
                ],
            ),
        })
    }
    fn law(&self, a: &Args) -> Result<(crate::network::LinkLaw, Built), Diagnostic> {
        // A/L: with k(T) the heat flow is (A/L)·∫k dT, k at the mean temperature for linear k.
        let b = self.build(a)?;
        let shape =
            a.require("area", "area = 2 m^2")? / a.require("thickness", "thickness = 100 mm")?;
        Ok(super::shell::conduction_law(a, shape, b))
    }
}

const FILM: &[ArgSpec] = &[
    q("h", Dim::HEAT_TRANSFER_COEFF, "heat transfer coefficient").either("r"),
    q(
        "r",
        Dim::AREA_RESISTANCE,
        "surface resistance per area, instead of h (e.g. ISO 6946 Rsi/Rse)",
    )
    .either("h"),
    q("area", Dim::AREA, "surface area").required(),
];

impl ElementKind for Film {
    fn name(&self) -> &'static str {
        "film"
    }
    fn summary(&self) -> &'static str {
        "convection film: R = 1/(h·A) (Newton's law of cooling), or R = r/A"
    }
    fn params(&self) -> &'static [ArgSpec] {
        FILM
    }
    fn build(&self, a: &Args) -> Result<Built, Diagnostic> {
        let which = a.one_of("h", "r", "film(h = 8 W/(m^2*K), area = 2 m^2)")?;
        let area = a.require("area", "area = 2 m^2")?;
        let (g, formula) = if which == "h" {
            let h = a.require("h", "h = 8 W/(m^2*K)")?;
            let g = h * area;
            (
                g,
                Formula::new(
                    "R = 1/(h·A) = 1 / ({} × {}) = {}",
                    &[
                        (h, Dim::HEAT_TRANSFER_COEFF),
                        (area, Dim::AREA),
                        (1.0 / g, Dim::RESISTANCE),
                    ],
                ),
            )
        } else {
            let r = a.require("r", "r = 0.13 m^2*K/W")?;
            let g = area / r;
            (
                g,
                Formula::new(
                    "R = r/A = {} / {} = {}",
                    &[
                        (r, Dim::AREA_RESISTANCE),
                        (area, Dim::AREA),
                        (1.0 / g, Dim::RESISTANCE),
                    ],
                ),
            )
        };
        Ok(Built {
            conductance: g,
            area: Some(area),
            formula,
        })
    }
}

const CONTACT: &[ArgSpec] = &[
    q("r", Dim::AREA_RESISTANCE, "contact resistance per area R″").required(),
    q("area", Dim::AREA, "contact area").required(),
];

impl ElementKind for Contact {
    fn name(&self) -> &'static str {
        "contact"
    }
    fn summary(&self) -> &'static str {
        "contact resistance: R = R″/A"
    }
    fn params(&self) -> &'static [ArgSpec] {
        CONTACT
    }
    fn build(&self, a: &Args) -> Result<Built, Diagnostic> {
        let r = a.require("r", "r = 0.5 cm^2*K/W")?;
        let area = a.require("area", "area = 9 mm^2")?;
        let g = area / r;
        Ok(Built {
            conductance: g,
            area: Some(area),
            formula: Formula::new(
                "R = R″/A = {} / {} = {}",
                &[
                    (r, Dim::AREA_RESISTANCE),
                    (area, Dim::AREA),
                    (1.0 / g, Dim::RESISTANCE),
                ],
            ),
        })
    }
}

const RESISTANCE: &[ArgSpec] = &[q("r", Dim::RESISTANCE, "thermal resistance").required()];

impl ElementKind for Resistance {
    fn name(&self) -> &'static str {
        "resistance"
    }
    fn summary(&self) -> &'static str {
        "a stated thermal resistance R (K/W)"
    }
    fn params(&self) -> &'static [ArgSpec] {
        RESISTANCE
    }
    fn build(&self, a: &Args) -> Result<Built, Diagnostic> {
        let r = a.require("r", "resistance(2.5 K/W)")?;
        Ok(Built {
            conductance: 1.0 / r,
            area: None,
            formula: Formula::new("R = {}", &[(r, Dim::RESISTANCE)]),
        })
    }
}

const CONDUCTANCE: &[ArgSpec] = &[q("g", Dim::CONDUCTANCE, "thermal conductance").required()];

impl ElementKind for Conductance {
    fn name(&self) -> &'static str {
        "conductance"
    }
    fn summary(&self) -> &'static str {
        "a stated thermal conductance G (W/K)"
    }
    fn params(&self) -> &'static [ArgSpec] {
        CONDUCTANCE
    }
    fn build(&self, a: &Args) -> Result<Built, Diagnostic> {
        let g = a.require("g", "conductance(0.8 W/K)")?;
        Ok(Built {
            conductance: g,
            area: None,
            formula: Formula::new(
                "R = 1/G = 1 / {} = {}",
                &[(g, Dim::CONDUCTANCE), (1.0 / g, Dim::RESISTANCE)],
            ),
        })
    }
}
