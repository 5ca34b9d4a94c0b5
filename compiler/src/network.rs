//! The elaborated network: nodes, links and build-up groups in SI units, each mapped back to
//! the span that declared it so results can be shown where they came from.

use crate::span::Span;
use crate::units::{Dim, TempKind};
use serde::Serialize;

pub type NodeId = usize;
pub type LinkId = usize;

#[derive(Clone, Debug, Serialize)]
pub struct Node {
    pub name: String,
    /// Where the node was declared (for generated nodes: the build-up element that made it).
    pub span: Span,
    /// Boundary temperature in kelvin when the node is held fixed.
    pub fixed: Option<f64>,
    /// Heat put into the node, W.
    pub load: f64,
    /// True for interface nodes made by a build-up.
    pub generated: bool,
}

/// How a link's heat flow depends on its two end temperatures.
#[derive(Clone, Debug, Serialize)]
pub enum LinkLaw {
    /// Q = G·(T_from − T_to) with a constant conductance G in W/K.
    Linear { conductance: f64 },
    /// Q = σ·A_x·(T_from⁴ − T_to⁴) with temperatures in kelvin and the radiative exchange area
    /// A_x in m² (grey surfaces; see `crate::laws`).
    Radiation { exchange_area: f64 },
    /// Q = S·∫ k(T) dT from T_to to T_from: conduction with a temperature-dependent
    /// conductivity through a body whose geometry gives the conduction shape S in m.
    Conduction {
        shape: f64,
        conductivity: crate::conductivity::Conductivity,
    },
    /// Q = h·A·(T_s − T_f) (+ ε·σ·A·(T_s⁴ − T_f⁴)) with h from a convection correlation and the
    /// fluid's properties at these temperatures (see `crate::convection`).
    Convection(Box<crate::convection::FilmLaw>),
}

#[derive(Clone, Debug, Serialize)]
pub struct Link {
    pub name: String,
    pub span: Span,
    pub from: NodeId,
    pub to: NodeId,
    pub law: LinkLaw,
    /// The area the heat crosses, m², when the element has one (for flux and U-values).
    pub area: Option<f64>,
    /// Element kind (`layer`, `film`, ...).
    pub kind: String,
    /// The formula with its input values, for hover and reports.
    pub formula: crate::formula::Formula,
    /// The build-up use this link is an element of.
    pub group: Option<usize>,
}

impl Link {
    /// Conductance in W/K of a linear link; NaN for a nonlinear one, whose conductance depends
    /// on its end temperatures (use `conductance_at` with solved temperatures).
    pub fn conductance(&self) -> f64 {
        match self.law {
            LinkLaw::Linear { conductance } => conductance,
            _ => f64::NAN,
        }
    }
}

/// A link that uses a build-up: a chain of element links in series.
#[derive(Clone, Debug, Serialize)]
pub struct Group {
    pub name: String,
    pub span: Span,
    pub buildup: String,
    pub from: NodeId,
    pub to: NodeId,
    pub area: Option<f64>,
    /// The length of a cylindrical (pipe) build-up, m, for its heat loss per metre.
    pub length: Option<f64>,
    pub links: Vec<LinkId>,
}

#[derive(Clone, Debug, Default, Serialize)]
pub struct Network {
    pub nodes: Vec<Node>,
    pub links: Vec<Link>,
    pub groups: Vec<Group>,
    /// Capacities, initial temperatures and schedules for transient runs (empty when steady).
    pub dynamics: crate::transient::model::Dynamics,
    /// Named figures of links known before the solve (a fin's efficiency, a shape factor),
    /// for reports.
    pub figures: Vec<LinkFigure>,
    /// W110 checks to make once computed films are solved.
    pub radius_checks: Vec<RadiusCheck>,
    /// Figures of links that need the solved temperatures (a fin's tip temperature), worked
    /// out by `results::Solution`.
    pub solved_figures: Vec<SolvedFigure>,
    /// 2-D regions meshed into the network, for their temperature and flux fields.
    pub regions: Vec<crate::region::Region>,
}

/// A critical-radius check (W110) that waits for the solve: the outermost shell of a radial
/// build-up under a computed film, whose h is known only at the solved temperatures.
#[derive(Clone, Debug, Serialize)]
pub struct RadiusCheck {
    /// The computed film's link.
    pub film: LinkId,
    pub use_name: String,
    pub use_span: Span,
    pub shell: String,
    pub shell_span: Span,
    pub spherical: bool,
    /// W/(m·K) and m of the shell.
    pub k: f64,
    pub r_out: f64,
}

/// A named figure of one link, such as `fin_efficiency` or `shape_factor`, in SI units.
#[derive(Clone, Debug, Serialize)]
pub struct LinkFigure {
    pub link: LinkId,
    pub name: &'static str,
    pub value: f64,
    /// The figure's dimension (`Dim::NONE` for efficiencies and groups).
    pub dim: Dim,
    /// `Point` for a temperature on a scale, so reports convert it as one.
    pub kind: TempKind,
}

impl LinkFigure {
    /// The field name in the JSON report: the figure's name and its SI unit
    /// (`shape_factor_m`, `fin_tip_temperature_K`); a dimensionless figure keeps its name.
    pub fn json_name(&self) -> String {
        match crate::units::json_unit_suffix(self.dim) {
            Some(suffix) => format!("{}_{suffix}", self.name),
            None => self.name.to_string(),
        }
    }
}

/// How a figure follows from the solved temperatures and heat flow of its link.
#[derive(Clone, Copy, Debug, Serialize)]
pub enum FigureRule {
    /// T_to + ratio·(T_from − T_to): a temperature between the link's ends (a fin's tip, whose
    /// excess over the fluid is a known fraction of the base's).
    Between(f64),
    /// The temperature of the link's first node (a fin's base).
    FromTemperature,
    /// The link's heat flow divided by a number (per fin of an array), in W.
    HeatFlowOver(f64),
}

/// A figure of a link worked out once the network is solved.
#[derive(Clone, Debug, Serialize)]
pub struct SolvedFigure {
    pub link: LinkId,
    pub name: &'static str,
    pub rule: FigureRule,
}

impl SolvedFigure {
    /// The figure at solved temperatures (K) and the link's heat flow (W).
    pub fn at(&self, link: &Link, t: &[f64], heat_flow: f64) -> LinkFigure {
        let (value, dim, kind) = match self.rule {
            FigureRule::Between(r) => (
                t[link.to] + r * (t[link.from] - t[link.to]),
                Dim::TEMPERATURE,
                TempKind::Point,
            ),
            FigureRule::FromTemperature => (t[link.from], Dim::TEMPERATURE, TempKind::Point),
            FigureRule::HeatFlowOver(n) => (heat_flow / n, Dim::POWER, TempKind::NotTemperature),
        };
        LinkFigure {
            link: self.link,
            name: self.name,
            value,
            dim,
            kind,
        }
    }
}

impl Network {
    pub fn node_id(&self, name: &str) -> Option<NodeId> {
        self.nodes.iter().position(|n| n.name == name)
    }
    pub fn link_id(&self, name: &str) -> Option<LinkId> {
        self.links.iter().position(|l| l.name == name)
    }
    pub fn group_id(&self, name: &str) -> Option<usize> {
        self.groups.iter().position(|g| g.name == name)
    }
}
