//! What changed between two versions of a model, for review: the inputs that changed, the
//! nodes, links and limits added or removed, and how the results moved, each list ordered by
//! size of effect (largest first). Works from two [`Analysis`] values; rendering is the
//! caller's business (the CLI prints a table, Markdown or JSON).

use crate::analysis::Analysis;
use crate::elements;
use crate::eval::{Evaluator, NameKinds};
use crate::limits::LimitResult;
use crate::syntax::{Arg, ElementCall, Expr, ItemKind};
use crate::units::{Dim, Quantity, TempKind};
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
    inputs(old, new, &mut c.inputs);
    structure(old, new, &mut c.structure);
    c.limits = limits(old, new);
    if let (Some(so), Some(sn)) = (&old.solution, &new.solution) {
        c.both_solved = true;
        results(old, new, so, sn, &mut c);
    }
    c
}

fn relative(old: Option<Quantity>, new: Option<Quantity>) -> Option<f64> {
    match (old, new) {
        (Some(o), Some(n)) if o.dim == n.dim && o.value != 0.0 => {
            Some((n.value - o.value) / o.value.abs())
        }
        _ => None,
    }
}

/// Same number to round-off, or both absent.
fn same_value(a: Option<Quantity>, b: Option<Quantity>) -> bool {
    match (a, b) {
        (Some(a), Some(b)) => a.dim == b.dim && close(a.value, b.value),
        (None, None) => true,
        _ => false,
    }
}

fn close(a: f64, b: f64) -> bool {
    (a - b).abs() <= 1e-12 * a.abs().max(b.abs()) || a == b
}

#[allow(clippy::too_many_arguments)]
fn push_value(
    out: &mut Vec<InputChange>,
    category: &'static str,
    subject: &str,
    property: &str,
    old: Option<Quantity>,
    new: Option<Quantity>,
    drive: f64,
) {
    if same_value(old, new) {
        return;
    }
    out.push(InputChange {
        category,
        subject: subject.to_string(),
        property: property.to_string(),
        old: old.map(Shown::Value),
        new: new.map(Shown::Value),
        relative: None,
        delta: None,
    });
    set_size(out.last_mut(), old, new, drive);
}

/// Fill in how big a numeric change is; see [`InputChange::relative`].
fn set_size(
    change: Option<&mut InputChange>,
    old: Option<Quantity>,
    new: Option<Quantity>,
    drive: f64,
) {
    let (Some(c), Some(o), Some(n)) = (change, old, new) else {
        return;
    };
    if o.dim != n.dim {
        return;
    }
    if o.kind == TempKind::Point || n.kind == TempKind::Point {
        let d = n.value - o.value;
        c.delta = Some(Quantity {
            value: d,
            dim: Dim::TEMPERATURE,
            kind: TempKind::Difference,
        });
        c.relative = Some(
            d / if drive > 0.0 {
                drive
            } else {
                o.value.abs().max(f64::MIN_POSITIVE)
            },
        );
    } else {
        c.relative = relative(Some(o), Some(n));
    }
}

fn inputs(old: &Analysis, new: &Analysis, out: &mut Vec<InputChange>) {
    let fixed = old.network.nodes.iter().filter_map(|n| n.fixed);
    let drive = fixed.clone().fold(f64::MIN, f64::max) - fixed.fold(f64::MAX, f64::min);
    let drive = if drive.is_finite() { drive } else { 0.0 };
    if old.title != new.title {
        let shown = |t: &Option<String>| t.clone().map(Shown::Written);
        out.push(InputChange {
            category: "title",
            subject: String::new(),
            property: "title".into(),
            old: shown(&old.title),
            new: shown(&new.title),
            relative: None,
            delta: None,
        });
    }
    // Parameters, by value: a parameter rewritten without changing its value is no change.
    let params =
        |a: &Analysis| -> BTreeMap<String, Option<Quantity>> { a.params.iter().cloned().collect() };
    for (name, (o, n)) in pair_up(params(old), params(new)) {
        push_value(
            out,
            "parameter",
            &name,
            "value",
            o.flatten(),
            n.flatten(),
            drive,
        );
    }
    // Materials.
    let mats = |a: &Analysis| -> BTreeMap<String, [Option<Quantity>; 3]> {
        a.materials
            .iter()
            .map(|m| {
                let q = |v: Option<f64>, d| v.map(|v| Quantity::new(v, d));
                (
                    m.name.clone(),
                    [
                        Some(Quantity::new(m.k, Dim::CONDUCTIVITY)),
                        q(m.density, Dim::DENSITY),
                        q(m.specific_heat, Dim::SPECIFIC_HEAT),
                    ],
                )
            })
            .collect()
    };
    for (name, (o, n)) in pair_up(mats(old), mats(new)) {
        for (i, prop) in ["k", "density", "specific_heat"].iter().enumerate() {
            push_value(
                out,
                "material",
                &name,
                prop,
                o.and_then(|o| o[i]),
                n.and_then(|n| n[i]),
                drive,
            );
        }
    }
    // Boundary temperatures and heat loads of declared nodes.
    let nodes = |a: &Analysis| -> BTreeMap<String, (Option<Quantity>, Option<Quantity>)> {
        a.network
            .nodes
            .iter()
            .filter(|n| !n.generated)
            .map(|n| {
                let fixed = n.fixed.map(|k| Quantity {
                    value: k,
                    dim: Dim::TEMPERATURE,
                    kind: TempKind::Point,
                });
                let load = (n.load != 0.0).then(|| Quantity::new(n.load, Dim::POWER));
                (n.name.clone(), (fixed, load))
            })
            .collect()
    };
    for (name, (o, n)) in pair_up(nodes(old), nodes(new)) {
        // A node that appears or disappears is reported under structure.
        if let (Some(o), Some(n)) = (o, n) {
            push_value(out, "node", &name, "fixed", o.0, n.0, drive);
            push_value(out, "node", &name, "load", o.1, n.1, drive);
        }
    }
    // Element arguments as written, in build-ups and links. A link that exists in one version
    // only is reported under structure instead, with its ends and kind.
    let (wo, wn) = (written_args(old), written_args(new));
    let is_link = |w: &BTreeMap<ArgKey, (String, Option<Quantity>)>, name: &str| {
        w.contains_key(&("link", name.to_string(), "kind".to_string()))
    };
    let in_both: Vec<String> = wo
        .keys()
        .filter(|k| k.0 == "link" && k.2 == "kind" && is_link(&wn, &k.1))
        .map(|k| k.1.clone())
        .collect();
    for (key, (o, n)) in pair_up(wo, wn) {
        let (category, subject, property) = key;
        if category == "link" && !in_both.contains(&subject) {
            continue;
        }
        match (&o, &n) {
            (Some(a), Some(b)) if a.0 == b.0 => continue,
            (None, None) => continue,
            _ => {}
        }
        let (ov, nv) = (o.as_ref().and_then(|x| x.1), n.as_ref().and_then(|x| x.1));
        out.push(InputChange {
            category,
            subject,
            property,
            old: o.map(|x| Shown::Written(x.0)),
            new: n.map(|x| Shown::Written(x.0)),
            relative: None,
            delta: None,
        });
        set_size(out.last_mut(), ov, nv, drive);
    }
    // Limit thresholds and conditions.
    let lims = |a: &Analysis| -> BTreeMap<String, (String, Quantity)> {
        a.limits
            .iter()
            .map(|l| {
                let kind = if l.measure == crate::limits::Measure::Temperature {
                    TempKind::Point
                } else {
                    TempKind::NotTemperature
                };
                let cond = format!("{}({}) {}", l.measure.name(), l.subject_name, l.op.symbol());
                (
                    l.name.clone(),
                    (
                        cond,
                        Quantity {
                            value: l.value,
                            dim: l.measure.dim(),
                            kind,
                        },
                    ),
                )
            })
            .collect()
    };
    for (name, (o, n)) in pair_up(lims(old), lims(new)) {
        let (Some(o), Some(n)) = (o, n) else { continue };
        if o.0 != n.0 {
            out.push(InputChange {
                category: "limit",
                subject: name.clone(),
                property: "condition".into(),
                old: Some(Shown::Written(o.0)),
                new: Some(Shown::Written(n.0)),
                relative: None,
                delta: None,
            });
        }
        push_value(
            out,
            "limit",
            &name,
            "threshold",
            Some(o.1),
            Some(n.1),
            drive,
        );
    }
    out.sort_by(|a, b| {
        let size = |c: &InputChange| c.relative.map_or(f64::INFINITY, f64::abs);
        size(b).total_cmp(&size(a)).then_with(|| {
            (a.category, &a.subject, &a.property).cmp(&(b.category, &b.subject, &b.property))
        })
    });
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

struct Kinds<'a>(&'a Analysis);
impl NameKinds for Kinds<'_> {
    fn kind_of(&self, name: &str) -> Option<&'static str> {
        self.0.symbols.get(name).map(|s| s.kind.article())
    }
}

type ArgKey = (&'static str, String, String);

/// Every element argument as written (whitespace collapsed) with its value where it has one:
/// keyed by (category, owner, property). Build-ups come from every file; links from the model.
fn written_args(a: &Analysis) -> BTreeMap<ArgKey, (String, Option<Quantity>)> {
    let params = a
        .modules
        .iter()
        .flat_map(|(_, m)| &m.items)
        .filter_map(|i| match &i.kind {
            ItemKind::Param { name, value } => Some((name, value)),
            _ => None,
        });
    let mut ev = Evaluator::new(params);
    let kinds = Kinds(a);
    let mut out = BTreeMap::new();
    let text = |e: &Expr| -> String {
        let src = a.sources.text(e.span.file);
        src.get(e.span.range())
            .unwrap_or("")
            .split_whitespace()
            .collect::<Vec<_>>()
            .join(" ")
    };
    let mut call = |category: &'static str,
                    owner: &str,
                    call: &ElementCall,
                    main: &str,
                    out: &mut BTreeMap<ArgKey, (String, Option<Quantity>)>| {
        out.insert(
            (category, owner.to_string(), "kind".to_string()),
            (call.kind.name.clone(), None),
        );
        for (i, Arg { name, value, .. }) in call.args.iter().enumerate() {
            let prop = match name {
                Some(n) => n.name.clone(),
                None if i == 0 => main.to_string(),
                None => format!("argument {}", i + 1),
            };
            let v = ev.eval(value, &kinds);
            out.insert((category, owner.to_string(), prop), (text(value), v));
        }
    };
    let main_arg = |kind: &str| {
        elements::lookup(kind)
            .and_then(|k| k.params().first())
            .map_or("area", |p| p.name)
    };
    for (idx, (_, m)) in a.modules.iter().enumerate() {
        for item in &m.items {
            match &item.kind {
                ItemKind::Buildup { name, elements } => {
                    for e in elements {
                        call(
                            "build-up element",
                            &format!("{}.{}", name.name, e.name.name),
                            &e.element,
                            main_arg(&e.element.kind.name),
                            &mut out,
                        );
                    }
                }
                ItemKind::Link { name, element, .. } if idx == 0 => {
                    call(
                        "link",
                        &name.name,
                        element,
                        main_arg(&element.kind.name),
                        &mut out,
                    );
                }
                _ => {}
            }
        }
    }
    // Where a link's ends moved is an input change too.
    for l in &a.network.links {
        if l.group.is_none() {
            let ends = format!(
                "{} → {}",
                a.network.nodes[l.from].name, a.network.nodes[l.to].name
            );
            out.insert(("link", l.name.clone(), "ends".into()), (ends, None));
        }
    }
    for g in &a.network.groups {
        let ends = format!(
            "{} → {}",
            a.network.nodes[g.from].name, a.network.nodes[g.to].name
        );
        out.insert(("link", g.name.clone(), "ends".into()), (ends, None));
    }
    out
}

fn structure(old: &Analysis, new: &Analysis, out: &mut Vec<StructureChange>) {
    let nodes = |a: &Analysis| -> BTreeMap<String, String> {
        a.network
            .nodes
            .iter()
            .map(|n| {
                let d = match (n.fixed, n.generated) {
                    (Some(_), _) => "boundary",
                    (None, true) => "build-up interface",
                    (None, false) => "free",
                };
                (n.name.clone(), d.to_string())
            })
            .collect()
    };
    let links = |a: &Analysis| -> BTreeMap<String, String> {
        let net = &a.network;
        net.links
            .iter()
            .map(|l| {
                (
                    l.name.clone(),
                    format!(
                        "{} → {}, {}",
                        net.nodes[l.from].name, net.nodes[l.to].name, l.kind
                    ),
                )
            })
            .collect()
    };
    let groups = |a: &Analysis| -> BTreeMap<String, String> {
        let net = &a.network;
        net.groups
            .iter()
            .map(|g| {
                (
                    g.name.clone(),
                    format!(
                        "{} → {}, build-up {}",
                        net.nodes[g.from].name, net.nodes[g.to].name, g.buildup
                    ),
                )
            })
            .collect()
    };
    let limits = |a: &Analysis| -> BTreeMap<String, String> {
        a.limits
            .iter()
            .map(|l| {
                (
                    l.name.clone(),
                    format!("{}({}) {}", l.measure.name(), l.subject_name, l.op.symbol()),
                )
            })
            .collect()
    };
    for (what, f) in [
        (
            "build-up use",
            &groups as &dyn Fn(&Analysis) -> BTreeMap<String, String>,
        ),
        ("node", &nodes),
        ("link", &links),
        ("limit", &limits),
    ] {
        for (name, (o, n)) in pair_up(f(old), f(new)) {
            match (o, n) {
                (Some(d), None) => out.push(StructureChange {
                    what,
                    name,
                    added: false,
                    detail: d,
                }),
                (None, Some(d)) => out.push(StructureChange {
                    what,
                    name,
                    added: true,
                    detail: d,
                }),
                _ => {}
            }
        }
    }
}

fn limits(old: &Analysis, new: &Analysis) -> Vec<LimitChange> {
    let get = |a: &Analysis| -> BTreeMap<String, LimitResult> {
        a.solution
            .as_ref()
            .map(|s| {
                s.limits
                    .iter()
                    .map(|l| (l.name.clone(), l.clone()))
                    .collect()
            })
            .unwrap_or_default()
    };
    let mut out: Vec<LimitChange> = pair_up(get(old), get(new))
        .into_iter()
        .map(|(name, (o, n))| LimitChange {
            name,
            old: o,
            new: n,
        })
        .collect();
    let rank = |l: &LimitChange| -> (u8, f64) {
        let class = match (&l.old, &l.new) {
            (Some(o), Some(n)) if o.passed && !n.passed => 0,
            (None, Some(n)) if !n.passed => 0,
            (Some(o), Some(n)) if !o.passed && n.passed => 1,
            (Some(_), Some(n)) if !n.passed => 2,
            _ => 3,
        };
        let moved = match (&l.old, &l.new) {
            (Some(o), Some(n)) => {
                ((n.margin - o.margin) / o.limit.abs().max(f64::MIN_POSITIVE)).abs()
            }
            _ => 0.0,
        };
        (class, moved)
    };
    out.sort_by(|a, b| {
        let (ra, rb) = (rank(a), rank(b));
        ra.0.cmp(&rb.0)
            .then(rb.1.total_cmp(&ra.1))
            .then_with(|| a.name.cmp(&b.name))
    });
    out
}

fn results(
    old: &Analysis,
    new: &Analysis,
    so: &crate::results::Solution,
    sn: &crate::results::Solution,
    c: &mut Comparison,
) {
    let (no, nn) = (&old.network, &new.network);
    let by_name = |names: Vec<&String>, values: &[f64]| -> BTreeMap<String, f64> {
        names
            .into_iter()
            .cloned()
            .zip(values.iter().copied())
            .collect()
    };
    // Temperatures: moves below a nanokelvin are solver round-off, not a change.
    let t_old = by_name(no.nodes.iter().map(|n| &n.name).collect(), &so.temperatures);
    let t_new = by_name(nn.nodes.iter().map(|n| &n.name).collect(), &sn.temperatures);
    for (name, (o, n)) in pair_up(t_old, t_new) {
        if let (Some(o), Some(n)) = (o, n) {
            if (n - o).abs() > 1e-9 {
                c.temperatures.push(Movement {
                    name,
                    old: o,
                    new: n,
                    delta: n - o,
                });
            }
        }
    }
    let node_order = |name: &str| nn.node_id(name).unwrap_or(usize::MAX);
    order_by_effect(&mut c.temperatures, |m| m.delta, |m| node_order(&m.name));
    let scale = so
        .heat_flows
        .iter()
        .chain(&sn.heat_flows)
        .fold(1e-300f64, |m, q| m.max(q.abs()));
    let moved = |o: f64, n: f64| (n - o).abs() > 1e-9 * scale;
    let links = |net: &crate::network::Network,
                 s: &crate::results::Solution|
     -> BTreeMap<String, (f64, f64)> {
        net.links
            .iter()
            .zip(&s.heat_flows)
            .map(|(l, q)| (l.name.clone(), (1.0 / l.conductance(), *q)))
            .collect()
    };
    for (name, (o, n)) in pair_up(links(no, so), links(nn, sn)) {
        if let (Some(o), Some(n)) = (o, n) {
            if moved(o.1, n.1) || !close(o.0, n.0) {
                c.links.push(LinkMovement {
                    name,
                    old_resistance: o.0,
                    new_resistance: n.0,
                    old_heat_flow: o.1,
                    new_heat_flow: n.1,
                    delta_heat_flow: n.1 - o.1,
                });
            }
        }
    }
    order_by_effect(
        &mut c.links,
        |l| l.delta_heat_flow,
        |l| nn.link_id(&l.name).unwrap_or(usize::MAX),
    );
    let groups = |s: &crate::results::Solution| -> BTreeMap<String, crate::results::GroupResult> {
        s.groups
            .iter()
            .map(|g| (g.name.clone(), g.clone()))
            .collect()
    };
    for (name, (o, n)) in pair_up(groups(so), groups(sn)) {
        if let (Some(o), Some(n)) = (o, n) {
            let opt_close = |a: Option<f64>, b: Option<f64>| match (a, b) {
                (Some(a), Some(b)) => close(a, b),
                (None, None) => true,
                _ => false,
            };
            if moved(o.heat_flow, n.heat_flow)
                || !opt_close(o.u_value, n.u_value)
                || !close(o.resistance, n.resistance)
            {
                c.buildups.push(BuildupMovement {
                    name,
                    old_u_value: o.u_value,
                    new_u_value: n.u_value,
                    old_r_value: o.r_value,
                    new_r_value: n.r_value,
                    old_heat_flow: o.heat_flow,
                    new_heat_flow: n.heat_flow,
                });
            }
        }
    }
    let ratio = |b: &BuildupMovement| match (b.old_u_value, b.new_u_value) {
        (Some(o), Some(n)) if o != 0.0 => ((n - o) / o).abs(),
        _ => ((b.new_heat_flow - b.old_heat_flow) / b.old_heat_flow.abs().max(f64::MIN_POSITIVE))
            .abs(),
    };
    order_by_effect(&mut c.buildups, ratio, |b| {
        nn.group_id(&b.name).unwrap_or(usize::MAX)
    });
    let bounds =
        |net: &crate::network::Network, s: &crate::results::Solution| -> BTreeMap<String, f64> {
            s.boundary_heat
                .iter()
                .map(|&(i, q)| (net.nodes[i].name.clone(), q))
                .collect()
        };
    for (name, (o, n)) in pair_up(bounds(no, so), bounds(nn, sn)) {
        if let (Some(o), Some(n)) = (o, n) {
            if moved(o, n) {
                c.boundaries.push(Movement {
                    name,
                    old: o,
                    new: n,
                    delta: n - o,
                });
            }
        }
    }
    order_by_effect(&mut c.boundaries, |m| m.delta, |m| node_order(&m.name));
}

/// Largest |size| first; sizes equal to nine digits (the same heat flow through every layer of
/// a wall) keep the network's order, so a chain reads from one end to the other.
fn order_by_effect<T>(v: &mut [T], size: impl Fn(&T) -> f64, index: impl Fn(&T) -> usize) {
    let largest = v.iter().map(|x| size(x).abs()).fold(0.0, f64::max);
    let key = |x: &T| -> i64 {
        if largest > 0.0 && largest.is_finite() {
            (size(x).abs() / largest * 1e9).round() as i64
        } else {
            0
        }
    };
    v.sort_by_key(|x| (std::cmp::Reverse(key(x)), index(x)));
}
