//! Uniform internal heat generation: a plane slab between two faces and a solid rod.
//!
//! A slab with uniform generation q̇ between faces at T₁ and T₂ has the parabolic profile
//! T(x) = T₁ + (T₂ − T₁)·x/L + q̇·x·(L − x)/(2k). Its exact
//! network equivalent has a node at the midplane carrying the generated heat q̇·A·L, two half
//! links of 4kA/L to the faces, and a link of −kA/L straight between the faces: these give the
//! exact midplane temperature (mean + q̇L²/(8k)) and the exact heat flow at each face
//! (kA/L·(T_other − T_face) + q̇AL/2). The negative link is a correction, not a path of its own;
//! only the sums at the faces have a meaning.
//!
//! A solid rod of radius r₀ with generation, cooled at its surface, has the centre-to-surface
//! rise q̇r₀²/(4k) (Sec. 3.5.2): a link of R = 1/(4πkL) from its axis to its surface with the
//! generated heat q̇πr₀²L put into the axis node.
// Diagnostics are returned by value throughout the compiler; boxing them here alone would
// split the element API.
#![allow(clippy::result_large_err)]

use super::shell::conductivity;
use super::{material, q, show, ArgSpec, Args, Built, ElementKind};
use crate::diagnostic::Diagnostic;
use crate::network::LinkLaw;
use crate::units::Dim;
use std::f64::consts::PI;

/// One end of a link the element makes.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum End {
    From,
    To,
    /// A node the element makes, named `LINK.suffix`.
    Internal(&'static str),
}

/// One link of an element that expands into several.
pub struct Part {
    pub suffix: &'static str,
    pub from: End,
    pub to: End,
    pub conductance: f64,
    pub formula: String,
}

/// What an element that makes its own nodes adds to the network.
pub struct Expansion {
    pub parts: Vec<Part>,
    /// Heat put into nodes, W.
    pub loads: Vec<(End, f64)>,
}

pub struct HeatedSlab;
pub struct HeatedRod;

const SLAB: &[ArgSpec] = &[
    material("the slab's material (gives k)").either("k"),
    q(
        "k",
        Dim::CONDUCTIVITY,
        "conductivity, instead of a material",
    )
    .either("material"),
    q(
        "thickness",
        Dim::LENGTH,
        "thickness L between the two faces",
    )
    .required(),
    q("area", Dim::AREA, "face area A").required(),
    q("q", Dim::VOLUMETRIC_POWER, "generated heat per volume q̇").either("power"),
    q("power", Dim::POWER, "total generated heat, instead of q").either("q"),
];

const ROD: &[ArgSpec] = &[
    material("the rod's material (gives k)").either("k"),
    q(
        "k",
        Dim::CONDUCTIVITY,
        "conductivity, instead of a material",
    )
    .either("material"),
    q("radius", Dim::LENGTH, "rod radius r₀").required(),
    q("length", Dim::LENGTH, "rod length L").required(),
    q("q", Dim::VOLUMETRIC_POWER, "generated heat per volume q̇").either("power"),
    q("power", Dim::POWER, "total generated heat, instead of q").either("q"),
];

/// q̇ from `q` or from `power` over the volume.
fn generation(a: &Args, volume: f64, example: &str) -> Result<f64, Diagnostic> {
    Ok(match a.one_of("q", "power", example)? {
        "q" => a.require("q", "q = 2 MW/m^3")?,
        _ => a.require("power", "power = 40 W")? / volume,
    })
}

impl HeatedSlab {
    fn expansion(&self, a: &Args) -> Result<Expansion, Diagnostic> {
        let example =
            "heated_slab(k = 1.4 W/(m*K), thickness = 300 mm, area = 4 m^2, q = 500 W/m^3)";
        let k = conductivity(a, example)?;
        let l = a.require("thickness", "thickness = 300 mm")?;
        let area = a.require("area", "area = 4 m^2")?;
        let qv = generation(a, area * l, example)?;
        let g = k * area / l;
        let p = qv * area * l;
        Ok(Expansion {
            parts: vec![
                Part {
                    suffix: "from_half",
                    from: End::Internal("centre"),
                    to: End::From,
                    conductance: 4.0 * g,
                    formula: format!(
                        "G = 4kA/L = {} (midplane to face); generated heat q̇AL = {} at the midplane, rise q̇L²/(8k) = {} over the mean face temperature",
                        show(4.0 * g, Dim::CONDUCTANCE),
                        show(p, Dim::POWER),
                        show(qv * l * l / (8.0 * k), Dim::TEMPERATURE)
                    ),
                },
                Part { suffix: "to_half", from: End::Internal("centre"), to: End::To, conductance: 4.0 * g, formula: format!("G = 4kA/L = {} (midplane to face)", show(4.0 * g, Dim::CONDUCTANCE)) },
                Part {
                    suffix: "through",
                    from: End::From,
                    to: End::To,
                    conductance: -g,
                    formula: format!("G = −kA/L = {} (correction that makes both face heat flows exact; not a path of its own)", show(-g, Dim::CONDUCTANCE)),
                },
            ],
            loads: vec![(End::Internal("centre"), p)],
        })
    }
}

impl ElementKind for HeatedSlab {
    fn name(&self) -> &'static str {
        "heated_slab"
    }
    fn summary(&self) -> &'static str {
        "plane slab with uniform heat generation between two faces: midplane node `LINK.centre`, rise q̇L²/(8k) over the mean face temperature"
    }
    fn params(&self) -> &'static [ArgSpec] {
        SLAB
    }
    fn internal_nodes(&self) -> &'static [&'static str] {
        &["centre"]
    }
    fn single_link(&self) -> bool {
        false
    }
    fn build(&self, a: &Args) -> Result<Built, Diagnostic> {
        let x = self.expansion(a)?;
        let g = -x.parts[2].conductance;
        Ok(Built {
            conductance: g,
            area: a.get("area"),
            formula: format!(
                "slab with generation: {} into the midplane node; face-to-face R = L/(kA) = {}",
                show(x.loads[0].1, Dim::POWER),
                show(1.0 / g, Dim::RESISTANCE)
            )
            .into(),
        })
    }
    fn expand(&self, a: &Args) -> Result<Option<Expansion>, Diagnostic> {
        self.expansion(a).map(Some)
    }
}

impl ElementKind for HeatedRod {
    fn name(&self) -> &'static str {
        "heated_rod"
    }
    fn summary(&self) -> &'static str {
        "solid rod with uniform heat generation, from its axis (FROM) to its surface (TO): R = 1/(4πkL), rise q̇r₀²/(4k)"
    }
    fn params(&self) -> &'static [ArgSpec] {
        ROD
    }
    fn single_link(&self) -> bool {
        false
    }
    fn build(&self, a: &Args) -> Result<Built, Diagnostic> {
        let x = self
            .expand(a)?
            .ok_or_else(|| a.missing(&["radius"], "radius = 5 mm"))?;
        Ok(Built {
            conductance: x.parts[0].conductance,
            area: None,
            formula: x.parts[0].formula.clone().into(),
        })
    }
    fn law(&self, a: &Args) -> Result<(LinkLaw, Built), Diagnostic> {
        let b = self.build(a)?;
        Ok((
            LinkLaw::Linear {
                conductance: b.conductance,
            },
            b,
        ))
    }
    fn expand(&self, a: &Args) -> Result<Option<Expansion>, Diagnostic> {
        let example = "heated_rod(copper, radius = 2 mm, length = 1 m, power = 12 W)";
        let k = conductivity(a, example)?;
        let r = a.require("radius", "radius = 2 mm")?;
        let l = a.require("length", "length = 1 m")?;
        let qv = generation(a, PI * r * r * l, example)?;
        let g = 4.0 * PI * k * l;
        let p = qv * PI * r * r * l;
        Ok(Some(Expansion {
            parts: vec![Part {
                suffix: "",
                from: End::From,
                to: End::To,
                conductance: g,
                formula: format!(
                    "R = 1/(4πkL) = {}; generated heat q̇πr₀²L = {} enters the axis node; rise q̇r₀²/(4k) = {}",
                    show(1.0 / g, Dim::RESISTANCE),
                    show(p, Dim::POWER),
                    show(qv * r * r / (4.0 * k), Dim::TEMPERATURE)
                ),
            }],
            loads: vec![(End::From, p)],
        }))
    }
}
