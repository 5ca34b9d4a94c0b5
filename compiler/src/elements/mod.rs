//! Link kinds: what arguments each takes and the thermal conductance it gives.
//!
//! Adding an element is adding one type that implements [`ElementKind`] and listing it in
//! [`ALL`]; the parser, checker, language server and docs pick it up from here.

pub mod convection;
pub mod fin;
pub mod generation;
mod plane;
pub mod radiation;
pub mod shape_factor;
pub mod shell;

use crate::diagnostic::Diagnostic;
use crate::span::Span;
use crate::units::Dim;
use rustc_hash::FxHashMap;

/// A material as declared, in SI units.
#[derive(Clone, Debug, serde::Serialize)]
pub struct Material {
    pub name: String,
    pub span: Span,
    /// Thermal conductivity, W/(m·K).
    pub k: f64,
    /// kg/m³
    pub density: Option<f64>,
    /// J/(kg·K)
    pub specific_heat: Option<f64>,
    /// k(T) when the conductivity depends on temperature; `k` is then its value at the
    /// reference temperature (`k_at`) or at the table's first point.
    pub conductivity: Option<crate::conductivity::Conductivity>,
}

pub use crate::formula::{show, Formula};
pub use crate::schema::{material, quantity as q, ArgSpec, ArgType};

#[derive(Clone, Debug)]
pub enum ArgValue {
    Quantity(f64),
    Material(Material),
    /// One of the words of a choice (`air`).
    Choice(&'static str),
}

/// The checked arguments of one element use, by name.
pub struct Args {
    pub kind: &'static str,
    pub values: FxHashMap<&'static str, (ArgValue, Span)>,
    /// The whole element call, for "missing argument" errors.
    pub call_span: Span,
}

impl Args {
    pub fn get(&self, name: &str) -> Option<f64> {
        match self.values.get(name) {
            Some((ArgValue::Quantity(v), _)) => Some(*v),
            _ => None,
        }
    }
    pub fn material(&self, name: &str) -> Option<&Material> {
        match self.values.get(name) {
            Some((ArgValue::Material(m), _)) => Some(m),
            _ => None,
        }
    }
    pub fn choice(&self, name: &str) -> Option<&'static str> {
        match self.values.get(name) {
            Some((ArgValue::Choice(w), _)) => Some(w),
            _ => None,
        }
    }
    pub fn span(&self, name: &str) -> Span {
        self.values.get(name).map(|v| v.1).unwrap_or(self.call_span)
    }
    /// A required argument.
    pub fn require(&self, name: &str, example: &str) -> Result<f64, Diagnostic> {
        self.get(name).ok_or_else(|| self.missing(&[name], example))
    }
    /// Exactly one of two alternative arguments (`h` or `r`, `material` or `k`).
    pub fn one_of(&self, a: &str, b: &str, example: &str) -> Result<&'static str, Diagnostic> {
        let has = |n: &str| self.values.contains_key(n);
        match (has(a), has(b)) {
            (true, false) => Ok(self.key(a)),
            (false, true) => Ok(self.key(b)),
            (false, false) => Err(self.missing(&[a, b], example)),
            (true, true) => Err(Diagnostic::error(
                "E207",
                format!("`{}` takes `{a}` or `{b}`, not both", self.kind),
                self.span(b),
            )
            .with_label(format!("`{b}` given as well as `{a}`"))
            .with_secondary(self.span(a), format!("`{a}` given here"))
            .with_help(format!(
                "remove one of them; `{a}` and `{b}` say the same thing two ways"
            ))),
        }
    }
    fn key(&self, n: &str) -> &'static str {
        self.values.keys().copied().find(|k| *k == n).unwrap_or("")
    }
    pub fn missing(&self, names: &[&str], example: &str) -> Diagnostic {
        let list = names
            .iter()
            .map(|n| format!("`{n}`"))
            .collect::<Vec<_>>()
            .join(" or ");
        Diagnostic::error(
            "E203",
            format!("`{}` needs {list}", self.kind),
            self.call_span,
        )
        .with_label(format!("{list} missing"))
        .with_help(format!("add it, e.g. `{example}`"))
    }
}

/// What an element contributes to the network.
#[derive(Clone, Debug)]
pub struct Built {
    /// W/K
    pub conductance: f64,
    /// m², when the heat crosses a definite area.
    pub area: Option<f64>,
    /// The formula with the input values, for hover and reports.
    pub formula: Formula,
}

/// A named figure of an element, in SI units.
#[derive(Clone, Copy, Debug)]
pub struct Figure {
    pub name: &'static str,
    pub value: f64,
    pub dim: Dim,
}

impl Figure {
    /// A dimensionless figure (an efficiency, a group).
    pub fn number(name: &'static str, value: f64) -> Figure {
        Figure {
            name,
            value,
            dim: Dim::NONE,
        }
    }
    pub fn of(name: &'static str, value: f64, dim: Dim) -> Figure {
        Figure { name, value, dim }
    }
}

/// A kind of link.
pub trait ElementKind: Sync {
    fn name(&self) -> &'static str;
    /// One line for completion and hover.
    fn summary(&self) -> &'static str;
    /// The arguments (see `crate::schema`); the first is the main argument that may be written
    /// without its name.
    fn params(&self) -> &'static [ArgSpec];
    /// Whether the element takes an `area` (so a build-up can supply it).
    fn takes_area(&self) -> bool {
        self.params().iter().any(|p| p.name == "area")
    }
    fn build(&self, args: &Args) -> Result<Built, Diagnostic>;
    /// How the link's heat flow depends on its end temperatures. Most elements are linear with
    /// the conductance `build` gives; radiation and k(T) conduction override this.
    #[allow(clippy::result_large_err)]
    fn law(&self, args: &Args) -> Result<(crate::network::LinkLaw, Built), Diagnostic> {
        let b = self.build(args)?;
        Ok((
            crate::network::LinkLaw::Linear {
                conductance: b.conductance,
            },
            b,
        ))
    }
    /// Nodes the element makes for itself, named `LINK.suffix` (a heated slab's midplane).
    fn internal_nodes(&self) -> &'static [&'static str] {
        &[]
    }
    /// False for elements that make nodes or put heat into nodes: they cannot sit in a build-up.
    fn single_link(&self) -> bool {
        true
    }
    /// For elements that become several links and put heat into nodes; `None` for one link.
    #[allow(clippy::result_large_err)]
    fn expand(&self, _args: &Args) -> Result<Option<generation::Expansion>, Diagnostic> {
        Ok(None)
    }
    /// Named figures of a use known from its arguments, for reports (a fin's efficiency, a
    /// shape factor, ...).
    fn figures(&self, _args: &Args) -> Vec<Figure> {
        Vec::new()
    }
    /// Figures of a use that follow from the solved temperatures (a fin's tip temperature).
    fn solved_figures(&self, _args: &Args) -> Vec<(&'static str, crate::network::FigureRule)> {
        Vec::new()
    }
    /// Warnings about a use whose arguments are valid but outside where the formula holds well.
    fn warnings(&self, _args: &Args) -> Vec<Diagnostic> {
        Vec::new()
    }
}

/// Every element kind the language knows.
pub static ALL: &[&dyn ElementKind] = &[
    &plane::Layer,
    &plane::Film,
    &plane::Contact,
    &plane::Resistance,
    &plane::Conductance,
    &shell::Cylinder,
    &shell::Sphere,
    &radiation::Radiation,
    &shape_factor::BuriedPipe,
    &shape_factor::BuriedSphere,
    &shape_factor::ParallelCylinders,
    &fin::Fin,
    &generation::HeatedSlab,
    &generation::HeatedRod,
    &convection::NaturalWall,
    &convection::NaturalCylinder,
    &convection::NaturalPlate,
    &convection::NaturalSphere,
    &convection::CrossflowCylinder,
    &convection::PlateFlow,
    &convection::PipeFlow,
];

pub fn lookup(name: &str) -> Option<&'static dyn ElementKind> {
    ALL.iter().copied().find(|k| k.name() == name)
}
