//! What changed between two versions of a model, for review: the inputs that changed, the
//! nodes, links and limits added or removed, and how the results moved, each list ordered by
//! size of effect (largest first). Works from two [`Analysis`] values; rendering is the
//! caller's business (the CLI prints a table, Markdown or JSON).

mod inputs;
mod results;

use crate::analysis::Analysis;
use crate::limits::LimitResult;
use crate::units::Quantity;
use serde::Serialize;
use std::collections::BTreeMap;

/// An input value as shown to a reviewer: the text the analyst wrote, or a value computed from
/// it (parameters, conductivities, boundary temperatures) for the caller to format in units.
#[derive(Clone, Debug, PartialEq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Shown {
    Written(String),
    Value(Quantity),
}

/// One changed input.
#[derive(Clone, Debug, Serialize)]
pub struct InputChange {
    /// `parameter`, `material`, `node`, `build-up element`, `link`, `limit` or `title`.
    pub category: &'static str,
    /// What it belongs to: `wood_fibre`, `timber_wall.insulation`, `north`.
    pub subject: String,
    /// Which property: `k`, `thickness`, `fixed`, `kind`, `threshold`...
    pub property: String,
    /// `None` when the input did not exist in that version.
    pub old: Option<Shown>,
    pub new: Option<Shown>,
    /// (new − old) / |old| when both are numbers of one dimension; for temperatures on a scale,
    /// the change relative to the old model's largest difference between boundary temperatures
    /// (the temperature difference that drives the heat flows). Used to order the list.
    pub relative: Option<f64>,
    /// new − old, for temperatures on a scale (a difference in kelvin).
    pub delta: Option<Quantity>,
}

/// A node, link, build-up use or limit that exists in only one version.
#[derive(Clone, Debug, Serialize)]
pub struct StructureChange {
    /// `node`, `link`, `build-up use` or `limit`.
    pub what: &'static str,
    pub name: String,
    /// True when added in the new version, false when removed.
    pub added: bool,
    /// A short description (`room → outdoor, film`).
    pub detail: String,
}

/// A result that moved: a temperature (K), a heat flow (W).
#[derive(Clone, Debug, Serialize)]
pub struct Movement {
    pub name: String,
    pub old: f64,
    pub new: f64,
    pub delta: f64,
}

/// A link present in both versions whose resistance or heat flow moved.
#[derive(Clone, Debug, Serialize)]
pub struct LinkMovement {
    pub name: String,
    /// K/W
    pub old_resistance: f64,
    pub new_resistance: f64,
    /// W, positive from the link's first node to its second.
    pub old_heat_flow: f64,
    pub new_heat_flow: f64,
    pub delta_heat_flow: f64,
}

/// A build-up use whose U-value, R-value or heat flow moved.
#[derive(Clone, Debug, Serialize)]
pub struct BuildupMovement {
    pub name: String,
    pub old_u_value: Option<f64>,
    pub new_u_value: Option<f64>,
    pub old_r_value: Option<f64>,
    pub new_r_value: Option<f64>,
    pub old_heat_flow: f64,
    pub new_heat_flow: f64,
}

/// A limit's verdict in both versions.
#[derive(Clone, Debug, Serialize)]
pub struct LimitChange {
    pub name: String,
    pub old: Option<LimitResult>,
    pub new: Option<LimitResult>,
}

impl LimitChange {
    /// True when the limit passed in one version and fails in the other.
    pub fn flipped(&self) -> bool {
        matches!((&self.old, &self.new), (Some(o), Some(n)) if o.passed != n.passed)
    }
    /// True when the limit fails in the new version (whether or not it existed before).
    pub fn fails_now(&self) -> bool {
        self.new.as_ref().is_some_and(|n| !n.passed)
    }
}

/// Everything a reviewer needs to see about a change of model.
#[derive(Clone, Debug, Default, Serialize)]
pub struct Comparison {
    pub old_title: Option<String>,
    pub new_title: Option<String>,
    pub inputs: Vec<InputChange>,
    pub structure: Vec<StructureChange>,
    /// Kelvin differences; largest first. Only nodes in both versions.
    pub temperatures: Vec<Movement>,
    /// Links in both versions; largest heat-flow change first.
    pub links: Vec<LinkMovement>,
    pub buildups: Vec<BuildupMovement>,
    /// Heat delivered by each boundary, W; largest change first.
    pub boundaries: Vec<Movement>,
    /// Every limit of either version: flips to fail first, then flips to pass, then the rest by
    /// how much their margin moved.
    pub limits: Vec<LimitChange>,
    /// Both versions solved, so the result lists are complete.
    pub both_solved: bool,
}

impl Comparison {
    pub fn any_limit_fails_now(&self) -> bool {
        self.limits.iter().any(LimitChange::fails_now)
    }
    /// True when nothing a reviewer would care about differs.
    pub fn is_empty(&self) -> bool {
        self.inputs.is_empty()
            && self.structure.is_empty()
            && self.temperatures.is_empty()
            && self.links.is_empty()
            && self.buildups.is_empty()
            && self.boundaries.is_empty()
            && !self
                .limits
                .iter()
                .any(|l| l.flipped() || l.old.is_none() || l.new.is_none())
    }
}

/// Compare two analyses of a model: `old` before the change, `new` after it.
pub fn compare(old: &Analysis, new: &Analysis) -> Comparison {
    let mut c = Comparison {
        old_title: old.title.clone(),
        new_title: new.title.clone(),
        ..Comparison::default()
    };
    inputs::inputs(old, new, &mut c.inputs);
    results::structure(old, new, &mut c.structure);
    c.limits = results::limits(old, new);
    if let (Some(so), Some(sn)) = (&old.solution, &new.solution) {
        c.both_solved = true;
        results::results(old, new, so, sn, &mut c);
    }
    c
}

/// Join two keyed maps: every key with its value in each (absent → `None`).
fn pair_up<K: Ord, V>(
    old: BTreeMap<K, V>,
    mut new: BTreeMap<K, V>,
) -> BTreeMap<K, (Option<V>, Option<V>)> {
    let mut out = BTreeMap::new();
    for (k, v) in old {
        let n = new.remove(&k);
        out.insert(k, (Some(v), n));
    }
    for (k, v) in new {
        out.insert(k, (None, Some(v)));
    }
    out
}

/// Same number to round-off.
fn close(a: f64, b: f64) -> bool {
    (a - b).abs() <= 1e-12 * a.abs().max(b.abs()) || a == b
}
