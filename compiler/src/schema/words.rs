//! The other words of the language: functions and constants of expressions, the measures of
//! limits, the sides of a region and the keyword `to`.

use crate::limits::Measure;
use crate::units::Dim;

/// A standard function of expressions.
#[derive(Clone, Copy, Debug)]
pub struct FunctionSpec {
    pub name: &'static str,
    /// Its parameters' names, for signature text (`min(a, b)`).
    pub params: &'static [&'static str],
    pub doc: &'static str,
}

impl FunctionSpec {
    /// How it is called: `min(a, b)`.
    pub fn signature(&self) -> String {
        format!("{}({})", self.name, self.params.join(", "))
    }
}

/// The functions `crate::eval` knows.
pub const FUNCTIONS: &[FunctionSpec] = &[
    FunctionSpec {
        name: "sqrt",
        params: &["x"],
        doc: "square root; the argument's dimension must have even powers (`sqrt(4 m^2)` = `2 m`)",
    },
    FunctionSpec {
        name: "ln",
        params: &["x"],
        doc: "natural logarithm of a dimensionless number greater than zero",
    },
    FunctionSpec {
        name: "exp",
        params: &["x"],
        doc: "e raised to a dimensionless number",
    },
    FunctionSpec {
        name: "abs",
        params: &["x"],
        doc: "absolute value, same unit",
    },
    FunctionSpec {
        name: "min",
        params: &["a", "b"],
        doc: "the smaller of two values of the same dimension",
    },
    FunctionSpec {
        name: "max",
        params: &["a", "b"],
        doc: "the larger of two values of the same dimension",
    },
];

/// The function called `name`.
pub fn function(name: &str) -> Option<&'static FunctionSpec> {
    FUNCTIONS.iter().find(|f| f.name == name)
}

/// Named constants of expressions.
pub const CONSTANTS: &[(&str, &str)] = &[("pi", "π = 3.14159…")];

/// What a limit may measure.
#[derive(Clone, Copy, Debug)]
pub struct MeasureSpec {
    pub name: &'static str,
    pub measure: Measure,
    /// What it is measured on.
    pub subject: &'static str,
    /// The dimension of its value and of the limit.
    pub dim: Dim,
    pub doc: &'static str,
}

/// The measures `crate::limits` checks.
pub const MEASURES: &[MeasureSpec] = &[
    MeasureSpec {
        name: "temperature",
        measure: Measure::Temperature,
        subject: "node",
        dim: Dim::TEMPERATURE,
        doc: "temperature of a node",
    },
    MeasureSpec {
        name: "heat_flow",
        measure: Measure::HeatFlow,
        subject: "link",
        dim: Dim::POWER,
        doc: "heat flow through a link, positive from its first node to its second",
    },
    MeasureSpec {
        name: "heat_flux",
        measure: Measure::HeatFlux,
        subject: "link with an area",
        dim: Dim::HEAT_FLUX,
        doc: "heat flow per area of a link that has an area",
    },
    MeasureSpec {
        name: "u_value",
        measure: Measure::UValue,
        subject: "link with an area",
        dim: Dim::HEAT_TRANSFER_COEFF,
        doc: "U-value 1/(R·A) of a link with an area or a build-up",
    },
    MeasureSpec {
        name: "r_value",
        measure: Measure::RValue,
        subject: "link with an area",
        dim: Dim::AREA_RESISTANCE,
        doc: "R-value R·A of a link with an area or a build-up",
    },
];

/// The measure called `name`.
pub fn measure(name: &str) -> Option<&'static MeasureSpec> {
    MEASURES.iter().find(|m| m.name == name)
}

/// Keywords that begin no declaration.
pub const OTHER_KEYWORDS: &[(&str, &str)] = &[(
    "to",
    "between the two nodes of a link: `link NAME: FROM to TO KIND(...)`",
)];

/// The edges and faces a region's attachments name.
pub const REGION_SIDES: &[(&str, &str)] = &[
    ("left", "the edge at x = 0"),
    ("right", "the edge at x = width"),
    ("bottom", "the edge at y = 0"),
    ("top", "the edge at y = height"),
    ("front", "one face of the plate: every cell, over its area"),
    (
        "back",
        "the other face of the plate: every cell, over its area",
    ),
];
