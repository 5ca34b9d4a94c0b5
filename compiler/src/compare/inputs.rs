//! Changed inputs: parameters, materials, boundary temperatures and loads, element arguments
//! as written, limit thresholds.

use super::{close, pair_up, InputChange, Shown};
use crate::analysis::Analysis;
use crate::elements;
use crate::eval::{Evaluator, NameKinds};
use crate::syntax::{Arg, ElementCall, Expr, ItemKind};
use crate::units::{Dim, Quantity, TempKind};
use std::collections::BTreeMap;

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

pub(super) fn inputs(old: &Analysis, new: &Analysis, out: &mut Vec<InputChange>) {
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
    let in_both: std::collections::BTreeSet<String> = wo
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
