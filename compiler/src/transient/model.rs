//! What a model states for transient runs and studies, in SI units: node capacities and initial
//! temperatures, schedules and the nodes they drive ([`Dynamics`], carried by the network), and
//! the declared runs and cases ([`Studies`]).

use super::schedule::Schedule;
use crate::network::NodeId;
use crate::span::Span;
use crate::units::Quantity;
use serde::Serialize;

/// A node that stores heat.
#[derive(Clone, Debug, Serialize)]
pub struct NodeCapacity {
    pub node: NodeId,
    /// J/K
    pub capacity: f64,
    /// The argument that gave the capacity (`capacity = ...` or `material = ...`).
    pub span: Span,
    /// For a capacity from a material: what the Biot-number check needs.
    pub lump: Option<Lump>,
}

/// A body whose capacity comes from a material, treated as one lumped temperature.
#[derive(Clone, Debug, Serialize)]
pub struct Lump {
    pub material: String,
    /// W/(m·K)
    pub k: f64,
    /// m³, when stated or derivable (mass / density).
    pub volume: Option<f64>,
}

/// What a schedule drives on a node.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Driven {
    /// The boundary temperature of a fixed node.
    Fixed,
    /// The heat load of a free node.
    Load,
}

#[derive(Clone, Debug, Serialize)]
pub struct Binding {
    pub node: NodeId,
    pub what: Driven,
    /// Index into [`Dynamics::schedules`].
    pub schedule: usize,
    pub span: Span,
}

/// Capacities, initial temperatures and schedules of a network. Empty for a purely steady model.
#[derive(Clone, Debug, Default, Serialize)]
pub struct Dynamics {
    pub capacities: Vec<NodeCapacity>,
    /// `(node, kelvin, span)` for nodes with a stated `initial` temperature.
    pub initial: Vec<(NodeId, f64, Span)>,
    pub schedules: Vec<Schedule>,
    pub bindings: Vec<Binding>,
}

impl Dynamics {
    /// Heat capacity of every node, J/K (zero for nodes that store no heat).
    pub fn capacity_vector(&self, n_nodes: usize) -> Vec<f64> {
        let mut c = vec![0.0; n_nodes];
        for nc in &self.capacities {
            if let Some(slot) = c.get_mut(nc.node) {
                *slot += nc.capacity;
            }
        }
        c
    }
    pub fn schedule_of(&self, node: NodeId, what: Driven) -> Option<&Schedule> {
        self.bindings
            .iter()
            .find(|b| b.node == node && b.what == what)
            .and_then(|b| self.schedules.get(b.schedule))
    }
}

/// A declared transient run: `transient NAME (duration = ..., step = ..., output = ...)`.
#[derive(Clone, Debug, Serialize)]
pub struct RunSpec {
    pub name: String,
    pub span: Span,
    /// s
    pub duration: f64,
    /// A fixed step in s; `None` for the automatic step.
    pub step: Option<f64>,
    /// Interval between reported times, s.
    pub output: Option<f64>,
    /// Local error allowed per step, K (automatic step).
    pub tolerance: Option<f64>,
    /// The schedules' clock time at which the run starts, s.
    pub start: f64,
}

/// A named set of parameter values: `case winter (t_out = -10 °C)`.
#[derive(Clone, Debug, Serialize)]
pub struct CaseSpec {
    pub name: String,
    pub span: Span,
    pub overrides: Vec<(String, Quantity)>,
}

/// Runs and cases declared in a model.
#[derive(Clone, Debug, Default, Serialize)]
pub struct Studies {
    pub runs: Vec<RunSpec>,
    pub cases: Vec<CaseSpec>,
}

impl Studies {
    pub fn run(&self, name: &str) -> Option<&RunSpec> {
        self.runs.iter().find(|r| r.name == name)
    }
    pub fn case(&self, name: &str) -> Option<&CaseSpec> {
        self.cases.iter().find(|c| c.name == name)
    }
}
