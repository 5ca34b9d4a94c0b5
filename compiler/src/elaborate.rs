//! Elaboration: from checked declarations to a network in SI units.
//!
//! Names are collected first (one namespace per model, duplicates reported), parameters are
//! evaluated on demand, then materials, nodes and links are checked argument by argument, and
//! build-up uses are expanded into chains of element links with named interface nodes.

use crate::diagnostic::{did_you_mean, Diagnostic};
use crate::elements::{self, shell, Material};
use crate::eval::{Evaluator, NameKinds};
use crate::limits::{self, LimitSpec};
use crate::network::{Group, Link, LinkFigure, Network, Node, NodeId};
use crate::radial::{self, UseArgs};
use crate::region;
use crate::schema;
use crate::source::Sources;
use crate::span::Span;
use crate::symbols::{Symbol, SymbolKind, SymbolTable};
use crate::syntax::*;
use rustc_hash::FxHashMap;

mod args;
mod materials;
mod transient_decls;
mod value_range;
use args::Value;
pub use transient_decls::{biot_number, fits_parameter, Biot, BIOT_LUMPED};
pub use value_range::range_error;

/// Everything elaboration produces. `network` is complete only when `diags` has no error.
pub struct Elaborated {
    pub network: Network,
    pub materials: Vec<Material>,
    pub limits: Vec<LimitSpec>,
    pub symbols: SymbolTable,
    /// Parameter values in SI, for hover.
    pub params: Vec<(String, Option<crate::units::Quantity>)>,
    pub title: Option<String>,
    pub diags: Vec<Diagnostic>,
    /// Declared transient runs and cases.
    pub studies: crate::transient::model::Studies,
}

struct Kinds<'a>(&'a SymbolTable);
impl NameKinds for Kinds<'_> {
    fn kind_of(&self, name: &str) -> Option<&'static str> {
        self.0.get(name).map(|s| s.kind.article())
    }
}

/// Elaborate parsed modules (the root first, then imports) into a network.
pub fn elaborate(
    modules: &[&Module],
    sources: &Sources,
    overrides: &[(String, crate::units::Quantity)],
) -> Elaborated {
    let mut diags = Vec::new();
    let mut symbols = SymbolTable::default();
    let mut title = None;
    let mut items: Vec<&Item> = Vec::new();
    for (i, m) in modules.iter().enumerate() {
        for item in &m.items {
            if i > 0
                && matches!(
                    item.kind,
                    ItemKind::Node { .. }
                        | ItemKind::Link { .. }
                        | ItemKind::Limit { .. }
                        | ItemKind::Title { .. }
                        | ItemKind::Region { .. }
                )
            {
                diags.push(
                    Diagnostic::warning("W105", "an imported file's nodes, links, limits and title are not used", item.span)
                        .with_label("ignored in the importing model")
                        .with_help("imports bring in materials, parameters and build-ups; move this declaration into the model that uses it"),
                );
                continue;
            }
            items.push(item);
        }
    }
    // 1. Names.
    let mut by_name: FxHashMap<&str, &Item> = FxHashMap::default();
    for item in &items {
        if let ItemKind::Title { text } = &item.kind {
            title = Some(text.clone());
        }
        let Some(name) = item.name() else { continue };
        if let Some(first) = by_name.get(name.name.as_str()) {
            let first_name = first.name().map(|n| n.span).unwrap_or(first.span);
            diags.push(
                Diagnostic::error("E201", format!("`{}` is declared twice", name.name), name.span)
                    .with_label("declared again here")
                    .with_secondary(first_name, "first declared here")
                    .with_help("every parameter, material, node, link, build-up and limit needs its own name; rename one of them"),
            );
            continue;
        }
        by_name.insert(&name.name, item);
        let kind = match item.kind {
            ItemKind::Param { .. } => SymbolKind::Param,
            ItemKind::Material { .. } => SymbolKind::Material,
            ItemKind::Node { .. } => SymbolKind::Node,
            ItemKind::Link { .. } => SymbolKind::Link,
            ItemKind::Buildup { .. } => SymbolKind::Buildup,
            ItemKind::Declaration { ref word, .. } => transient_decls::symbol_kind(&word.name),
            // A region is a body that carries heat, like a link; its cells are generated nodes.
            ItemKind::Region { .. } => SymbolKind::Link,
            _ => SymbolKind::Limit,
        };
        symbols.push(Symbol {
            name: name.name.clone(),
            kind,
            def: name.span,
            decl: item.span,
            refs: Vec::new(),
            parent: None,
        });
        if let ItemKind::Buildup { elements, .. } = &item.kind {
            let mut seen: FxHashMap<&str, Span> = FxHashMap::default();
            for e in elements {
                if let Some(prev) = seen.insert(&e.name.name, e.name.span) {
                    diags.push(
                        Diagnostic::error(
                            "E201",
                            format!(
                                "build-up `{}` has two elements named `{}`",
                                name.name, e.name.name
                            ),
                            e.name.span,
                        )
                        .with_label("second element with this name")
                        .with_secondary(prev, "first one here")
                        .with_help(
                            "give each element its own name; it names the interface node after it",
                        ),
                    );
                }
                symbols.push(Symbol {
                    name: e.name.name.clone(),
                    kind: SymbolKind::BuildupElement,
                    def: e.name.span,
                    decl: e.span,
                    refs: Vec::new(),
                    parent: Some(name.name.clone()),
                });
            }
        }
    }

    let params = items.iter().filter_map(|i| match &i.kind {
        ItemKind::Param { name, value } => Some((name, value)),
        _ => None,
    });
    let mut ev = Evaluator::new(params);
    for (n, q) in overrides {
        ev.set_override(n, *q);
    }
    let mut cx = Cx {
        ev,
        symbols,
        sources,
        diags,
        materials: Vec::new(),
        material_index: FxHashMap::default(),
        timed: Default::default(),
        owner: String::new(),
    };

    // 2. Parameters (all of them, so errors in unused ones are reported too).
    let mut param_values = Vec::new();
    for item in &items {
        if let ItemKind::Param { name, .. } = &item.kind {
            let kinds = Kinds(&cx.symbols);
            let v = cx.ev.param(&name.name, &kinds);
            param_values.push((name.name.clone(), v));
        }
    }

    // 3. Materials.
    for item in &items {
        if let ItemKind::Material { name, args } = &item.kind {
            cx.owner = format!("material `{}`", name.name);
            cx.material(name, args);
        }
    }
    cx.owner.clear();
    cx.schedules(&items);
    cx.owner.clear();

    // 4. Nodes.
    let mut net = Network::default();
    for item in &items {
        if let ItemKind::Node { name, args } = &item.kind {
            cx.owner = format!("node `{}`", name.name);
            let checked = cx.declared("node", name, args);
            let (fixed, load) = cx.node_args(name, &checked);
            net.nodes.push(Node {
                name: name.name.clone(),
                span: name.span,
                fixed,
                load,
                generated: false,
            });
            cx.node_dynamics(net.nodes.len() - 1, name, &checked, fixed.is_some());
        }
    }

    // 5. Links: create generated interface nodes first so any link may end on one.
    let buildups: FxHashMap<&str, &Vec<BuildupElement>> = items
        .iter()
        .filter_map(|i| match &i.kind {
            ItemKind::Buildup { name, elements } => Some((name.name.as_str(), elements)),
            _ => None,
        })
        .collect();
    for item in &items {
        if let ItemKind::Link { name, element, .. } = &item.kind {
            if let Some(els) = buildups.get(element.kind.name.as_str()) {
                for e in els.iter().take(els.len().saturating_sub(1)) {
                    let gen = format!("{}.{}", name.name, e.name.name);
                    add_generated_node(
                        &mut net,
                        &mut cx.symbols,
                        gen,
                        e.name.span,
                        name,
                        item.span,
                    );
                }
            } else if let Some(kind) = elements::lookup(&element.kind.name) {
                for suffix in kind.internal_nodes() {
                    let gen = format!("{}.{suffix}", name.name);
                    add_generated_node(&mut net, &mut cx.symbols, gen, name.span, name, item.span);
                }
            }
        }
    }
    let mut plans = Vec::new();
    for item in &items {
        if let ItemKind::Region { name, args, .. } = &item.kind {
            cx.owner = format!("region `{}`", name.name);
            let Some(checked) = cx.args(&region::RegionArgs, args, item.span, &[]) else {
                continue;
            };
            match region::Plan::new(&name.name, name.span, checked) {
                Ok(mut plan) => {
                    for n in plan.add_nodes(&mut net) {
                        cx.symbols.push(Symbol {
                            name: n,
                            kind: SymbolKind::GeneratedNode,
                            def: name.span,
                            decl: item.span,
                            refs: Vec::new(),
                            parent: Some(name.name.clone()),
                        });
                    }
                    plans.push((item, plan));
                }
                Err(d) => cx.diags.push(d),
            }
        }
    }
    let node_index: FxHashMap<String, NodeId> = net
        .nodes
        .iter()
        .enumerate()
        .map(|(i, n)| (n.name.clone(), i))
        .collect();
    for (item, mut plan) in plans {
        if let ItemKind::Region { edges, .. } = &item.kind {
            plan.add_internal_links(&mut net);
            cx.region_edges(&mut plan, edges, &mut net, &node_index, &buildups);
            net.regions.push(plan.region);
        }
    }
    let mut used = vec![false; net.nodes.len()];
    for item in &items {
        let ItemKind::Link {
            name,
            from,
            to,
            element,
        } = &item.kind
        else {
            continue;
        };
        let a = cx.node_ref(from, &node_index, &buildups);
        let b = cx.node_ref(to, &node_index, &buildups);
        if let (Some(a), Some(b)) = (a, b) {
            if a == b {
                cx.diags.push(
                    Diagnostic::error(
                        "E208",
                        format!("link `{}` joins node `{}` to itself", name.name, from.name),
                        to.span,
                    )
                    .with_label("same node at both ends")
                    .with_secondary(from.span, "first end")
                    .with_help(
                        "a link carries heat between two different nodes; check the node names",
                    ),
                );
                continue;
            }
        }
        if let Some(els) = buildups.get(element.kind.name.as_str()) {
            cx.symbols.add_ref(&element.kind.name, element.kind.span);
            cx.buildup_link(&mut net, &node_index, name, a, b, element, els);
        } else if let Some(kind) = elements::lookup(&element.kind.name) {
            cx.owner = format!("`{}` in link `{}`", kind.name(), name.name);
            let args = cx.args(kind, &element.args, element.span, &[]);
            let built = args.as_ref().and_then(|args| cx.checked_law(kind, args));
            if let (Some(a), Some(b), Some((law, built))) = (a, b, built) {
                if let Some(args) = &args {
                    cx.diags.extend(kind.warnings(args));
                    net.figures
                        .extend(kind.figures(args).into_iter().map(|(n, v)| LinkFigure {
                            link: net.links.len(),
                            name: n,
                            value: v,
                        }));
                    match kind.expand(args) {
                        Ok(Some(x)) => {
                            cx.diags.extend(elements::expand_into(
                                &mut net,
                                &node_index,
                                name,
                                item.span,
                                a,
                                b,
                                kind,
                                x,
                            ));
                            continue;
                        }
                        Ok(None) => {}
                        Err(d) => {
                            cx.diags.push(d);
                            continue;
                        }
                    }
                }
                net.links.push(Link {
                    name: name.name.clone(),
                    span: item.span,
                    from: a,
                    to: b,
                    law,
                    area: built.area,
                    kind: kind.name().to_string(),
                    formula: built.formula,
                    group: None,
                });
            }
        } else {
            cx.unknown_kind(&element.kind, &buildups);
        }
        for id in [a, b].into_iter().flatten() {
            used[id] = true;
        }
    }
    for l in &net.links {
        used[l.from] = true;
        used[l.to] = true;
    }

    cx.owner.clear();
    // Links made without element arguments of their own (a region's cells, the parts an
    // element generates) are checked here, once per declaration.
    let mut reported = rustc_hash::FxHashSet::default();
    for l in &net.links {
        if let Some(d) = value_range::link_error(l) {
            if reported.insert(l.span) {
                cx.diags.push(d);
            }
        }
    }

    // 6. Limits.
    let mut limit_specs = Vec::new();
    for item in &items {
        if let ItemKind::Limit {
            name,
            measure,
            subject,
            op,
            value,
        } = &item.kind
        {
            let kinds = Kinds(&cx.symbols);
            let q = cx.ev.eval(value, &kinds);
            match limits::check_limit(
                name,
                measure,
                subject,
                *op,
                value,
                q,
                &net,
                &mut cx.symbols,
                sources,
            ) {
                Ok(spec) => limit_specs.push(spec),
                Err(Some(d)) => cx.diags.push(d),
                Err(None) => {}
            }
        }
    }
    cx.finish_dynamics(&items, &net);

    // 7. Connectivity, only when the network is otherwise sound (an unknown node name would
    // otherwise show up twice).
    let has_errors = cx
        .diags
        .iter()
        .chain(cx.ev.diags.iter())
        .any(|d| d.is_error());
    if !has_errors {
        for (i, n) in net.nodes.iter().enumerate() {
            if !used[i] && n.fixed.is_some() {
                cx.diags.push(
                    Diagnostic::warning(
                        "W102",
                        format!("boundary node `{}` is not connected to anything", n.name),
                        n.span,
                    )
                    .with_label("no link ends here")
                    .with_help("link it to the network or remove it"),
                );
            }
        }
        if !net.nodes.is_empty() && net.nodes.iter().all(|n| n.fixed.is_none()) {
            let first = &net.nodes[0];
            cx.diags.push(
                Diagnostic::error("E302", "the model has no fixed temperature", first.span)
                    .with_label("no node is held at a boundary temperature")
                    .with_help("fix at least one node, e.g. `node outdoor (fixed = -5 °C)`"),
            );
        } else {
            for group in net.floating_groups() {
                cx.diags.push(floating_error(&net, &group));
            }
        }
    }
    for (name, span) in std::mem::take(&mut cx.ev.references) {
        cx.symbols.add_ref(&name, span);
    }
    let mut diags = cx.diags;
    diags.extend(cx.ev.diags);
    net.dynamics = cx.timed.dynamics;
    Elaborated {
        network: net,
        materials: cx.materials,
        limits: limit_specs,
        symbols: cx.symbols,
        params: param_values,
        title,
        diags,
        studies: cx.timed.studies,
    }
}

fn floating_error(net: &Network, group: &[NodeId]) -> Diagnostic {
    let names: Vec<&str> = group.iter().map(|&i| net.nodes[i].name.as_str()).collect();
    let shown = if names.len() > 6 {
        format!("{}, … ({} nodes)", names[..6].join(", "), names.len())
    } else {
        names.join(", ")
    };
    let first = &net.nodes[group[0]];
    let mut d = Diagnostic::error(
        "E301",
        format!("no path to any boundary temperature from: {shown}"),
        first.span,
    )
    .with_label("floating: its temperature is undetermined")
    .with_help("link these nodes to a node with a fixed temperature; without one the network equations are singular");
    for &i in group.iter().skip(1).take(5) {
        d = d.with_secondary(
            net.nodes[i].span,
            format!("`{}` is in the same floating group", net.nodes[i].name),
        );
    }
    d
}

struct Cx<'a> {
    ev: Evaluator<'a>,
    symbols: SymbolTable,
    sources: &'a Sources,
    diags: Vec<Diagnostic>,
    materials: Vec<Material>,
    material_index: FxHashMap<String, usize>,
    timed: transient_decls::Timed,
    /// What the arguments being checked belong to (`` `film` ``, ``node `room` ``), for
    /// messages about values out of range; empty outside a declaration.
    owner: String,
}

impl<'a> Cx<'a> {
    fn text(&self, span: Span) -> &str {
        self.sources.text(span.file)
    }

    /// The checked material declared under `name`; `None` for an unknown one and for one that
    /// failed its own checks.
    fn material_named(&self, name: &str) -> Option<&Material> {
        self.material_index
            .get(name)
            .and_then(|&i| self.materials.get(i))
    }

    /// Check a declaration's arguments against the schema's entry for `word`.
    fn declared(&mut self, word: &str, name: &Ident, args: &[Arg]) -> args::Checked {
        let Some(d) = schema::declaration(word) else {
            return args::Checked::default();
        };
        let subject = format!("{} `{}`", d.noun, name.name);
        // The schema's example, with the analyst's own name in it.
        let example = match d.example.split_once(' ') {
            Some((word, rest)) => {
                let end = rest
                    .find(|c: char| !(c.is_alphanumeric() || c == '_'))
                    .unwrap_or(rest.len());
                format!("{word} {}{}", name.name, &rest[end..])
            }
            None => d.example.to_string(),
        };
        self.decl_args(d.arg_specs(), &subject, &example, name.span, args, false)
    }

    /// A node's boundary temperature and load (a schedule's value at time 0 for one that
    /// follows a schedule, as a steady solve uses).
    fn node_args(&mut self, name: &Ident, c: &args::Checked) -> (Option<f64>, f64) {
        let value = |n: &str| match c.value(n) {
            Some(Value::Quantity(q)) => Some(q.value),
            Some(Value::Schedule(i)) => Some(self.timed.dynamics.schedules[*i].value(0.0)),
            _ => None,
        };
        let (fixed, load) = (value("fixed"), value("load"));
        if let (Some(_), Some(_), Some(ls)) = (fixed, load, c.name_span("load")) {
            self.diags.push(
                Diagnostic::error(
                    "E209",
                    format!(
                        "node `{}` is fixed, so a load on it has no effect",
                        name.name
                    ),
                    ls,
                )
                .with_label("load on a fixed node")
                .with_help("put the load on a free node linked to it, or remove `fixed`"),
            );
        }
        (fixed, load.unwrap_or(0.0))
    }

    /// The arguments of a link that uses a build-up, checked against the schema's entry for
    /// its geometry: the area of a plane build-up (needed only when an element takes an area),
    /// the bore radius (and the length of a cylindrical one) of a radial build-up.
    fn buildup_use_args(
        &mut self,
        call: &ElementCall,
        els: &[BuildupElement],
        geom: shell::Geometry,
    ) -> Option<UseArgs> {
        let needs_area = els
            .iter()
            .any(|e| elements::lookup(&e.element.kind.name).is_some_and(|k| k.takes_area()));
        let specs: Vec<schema::ArgSpec> = schema::buildup_use(geom)
            .iter()
            .map(|s| match s.name {
                "area" if !needs_area => s.optional(),
                _ => *s,
            })
            .collect();
        let (subject, example) = match geom {
            shell::Geometry::Plane => ("build-up", "area = 10 m^2"),
            shell::Geometry::Cylinder => ("radial build-up", "inner_radius = 27 mm, length = 12 m"),
            shell::Geometry::Sphere => ("radial build-up", "inner_radius = 1.2 m"),
        };
        let name = &call.kind.name;
        let c = self.decl_args(
            &specs,
            &format!("{subject} `{name}`"),
            &format!("{name}({example})"),
            call.span,
            &call.args,
            true,
        );
        c.ok.then(|| UseArgs {
            area: c.with_span("area"),
            inner_radius: c.with_span("inner_radius"),
            length: c.with_span("length"),
        })
    }

    /// Attach a region's edges and faces to their nodes, each through its element if it has one.
    fn region_edges(
        &mut self,
        plan: &mut region::Plan,
        edges: &[RegionEdge],
        net: &mut Network,
        index: &FxHashMap<String, NodeId>,
        buildups: &FxHashMap<&str, &Vec<BuildupElement>>,
    ) {
        let mut seen: FxHashMap<&str, Span> = FxHashMap::default();
        for e in edges {
            let sides: Vec<&'static str> = schema::REGION_SIDES.iter().map(|s| s.0).collect();
            if !sides.contains(&e.side.name.as_str()) {
                self.unknown_arg(&e.side, &format!("region `{}`", plan.region.name), &sides);
                continue;
            }
            if let Some(prev) = seen.insert(&e.side.name, e.side.span) {
                self.duplicate_arg(&e.side.name, e.side.span, prev);
                continue;
            }
            let Some(node) = self.node_ref(&e.node, index, buildups) else {
                continue;
            };
            let element = match &e.element {
                None => None,
                Some(call) => {
                    let Some(kind) = elements::lookup(&call.kind.name)
                        .filter(|k| k.takes_area() && k.single_link())
                    else {
                        self.diags.push(
                            Diagnostic::error("E206", format!("`{}` cannot attach a region's edge", call.kind.name), call.kind.span)
                                .with_label("not an element with an area")
                                .with_help("attach an edge through `film`, `contact`, `radiation` or `layer`, or to a node directly (`left: hot_bar`)"),
                        );
                        continue;
                    };
                    let area = plan.cell_area(&e.side.name);
                    self.owner = format!(
                        "`{}` on side `{}` of region `{}`",
                        kind.name(),
                        e.side.name,
                        plan.region.name
                    );
                    let Some(args) =
                        self.args(kind, &call.args, call.span, &[("area", area, e.side.span)])
                    else {
                        continue;
                    };
                    match self.checked_law(kind, &args) {
                        Some((law, _)) => Some((kind.name(), law)),
                        None => continue,
                    }
                }
            };
            plan.attach(net, &e.side.name, node, element);
        }
    }

    fn unknown_kind(&mut self, kind: &Ident, buildups: &FxHashMap<&str, &Vec<BuildupElement>>) {
        let names: Vec<&str> = elements::ALL
            .iter()
            .map(|k| k.name())
            .chain(sorted(buildups.keys().copied()))
            .collect();
        let mut d = Diagnostic::error(
            "E206",
            format!("unknown link kind `{}`", kind.name),
            kind.span,
        )
        .with_label("not an element kind or build-up");
        let list = elements::ALL
            .iter()
            .map(|k| format!("`{}`", k.name()))
            .collect::<Vec<_>>()
            .join(", ");
        d = match did_you_mean(&kind.name, names) {
            Some(s) => d.with_help(format!("did you mean `{s}`?")).with_fix(
                format!("Replace with `{s}`"),
                kind.span,
                s,
            ),
            None => d.with_help(format!("use one of {list}, or the name of a `buildup`")),
        };
        self.diags.push(d);
    }

    fn node_ref(
        &mut self,
        id: &Ident,
        index: &FxHashMap<String, NodeId>,
        buildups: &FxHashMap<&str, &Vec<BuildupElement>>,
    ) -> Option<NodeId> {
        if let Some(&i) = index.get(&id.name) {
            self.symbols.add_ref(&id.name, id.span);
            return Some(i);
        }
        let mut d;
        if let Some(s) = self.symbols.get(&id.name) {
            d = Diagnostic::error(
                "E105",
                format!("`{}` is {}, not a node", id.name, s.kind.article()),
                id.span,
            )
            .with_label("a link's ends must be nodes")
            .with_secondary(s.def, "declared here");
        } else {
            d = Diagnostic::error("E102", format!("unknown node `{}`", id.name), id.span)
                .with_label("no node has this name");
            if let Some(s) = did_you_mean(&id.name, in_declaration_order(index)) {
                d = d.with_help(format!("did you mean `{s}`?")).with_fix(
                    format!("Replace with `{s}`"),
                    id.span,
                    s,
                );
            } else if let Some((link, elem)) = id.name.split_once('.') {
                let _ = buildups;
                d = d.with_help(format!(
                    "`{link}.{elem}` would be the face after element `{elem}` of a link `{link}` that uses a build-up; the last element's far face is the link's `to` node"
                ));
            } else {
                d = d.with_help(format!("declare it, e.g. `node {}`", id.name));
            }
        }
        self.diags.push(d);
        None
    }

    #[allow(clippy::too_many_arguments)]
    fn buildup_link(
        &mut self,
        net: &mut Network,
        index: &FxHashMap<String, NodeId>,
        name: &Ident,
        from: Option<NodeId>,
        to: Option<NodeId>,
        call: &ElementCall,
        els: &[BuildupElement],
    ) {
        let geom = shell::geometry(els.iter().map(|e| e.element.kind.name.as_str()));
        self.owner = format!("link `{}`", name.name);
        let Some(use_args) = self.buildup_use_args(call, els, geom) else {
            return;
        };
        let mut links = Vec::new();
        let mut prev = from;
        let mut complete = true;
        // Each shell starts at the radius where the one before it ended.
        let mut chain = radial::Chain::new(geom, use_args.inner_radius);
        for (i, e) in els.iter().enumerate() {
            let next = if i + 1 == els.len() {
                to
            } else {
                index
                    .get(&format!("{}.{}", name.name, e.name.name))
                    .copied()
            };
            let Some(kind) = elements::lookup(&e.element.kind.name) else {
                // Reported once at the build-up (below) rather than at every use.
                complete = false;
                continue;
            };
            if geom != shell::Geometry::Plane && chain.radius.is_none() {
                // A shell before this one failed its checks (reported there), so the radius
                // this element starts at is unknown; a "missing area" here would only echo it.
                complete = false;
                prev = next;
                continue;
            }
            self.owner = format!(
                "`{}` (`{}` of build-up `{}`) in link `{}`",
                kind.name(),
                e.name.name,
                call.kind.name,
                name.name
            );
            // The surface's diameter goes to computed films only: other kinds with a `diameter`
            // (a buried pipe) state their own.
            let supplied: Vec<_> = use_args
                .supplied(geom, chain.radius)
                .into_iter()
                .filter(|s| {
                    s.0 != "diameter" || elements::convection::is_computed_film(kind.name())
                })
                .collect();
            let args = self.args(kind, &e.element.args, e.element.span, &supplied);
            let built = args.as_ref().and_then(|a| self.checked_law(kind, a));
            chain.advance(
                i,
                kind,
                e.element.span,
                args.as_ref(),
                built.as_ref().map(|b| &b.1),
            );
            match (prev, next, built) {
                (Some(a), Some(b), Some((law, built))) => {
                    if let Some(args) = &args {
                        self.diags.extend(kind.warnings(args));
                        net.figures
                            .extend(kind.figures(args).into_iter().map(|(n, v)| LinkFigure {
                                link: net.links.len(),
                                name: n,
                                value: v,
                            }));
                    }
                    links.push(net.links.len());
                    net.links.push(Link {
                        name: format!("{}.{}", name.name, e.name.name),
                        span: e.span,
                        from: a,
                        to: b,
                        law,
                        area: built.area,
                        kind: kind.name().to_string(),
                        formula: built.formula,
                        // Set below, once the use is known to be complete: a link must never
                        // name a group that was not pushed (or another use's group).
                        group: None,
                    });
                }
                _ => complete = false,
            }
            prev = next;
        }
        if complete {
            self.diags.extend(chain.critical_radius_warning(name, els));
            if let Some(&film) = links.last() {
                net.radius_checks
                    .extend(chain.pending_check(name, els, film));
            }
            if let (Some(a), Some(b)) = (from, to) {
                let area = if geom == shell::Geometry::Plane {
                    use_args.area.map(|a| a.0)
                } else {
                    None
                };
                let group_id = net.groups.len();
                for &l in &links {
                    net.links[l].group = Some(group_id);
                }
                net.groups.push(Group {
                    name: name.name.clone(),
                    span: name.span,
                    buildup: call.kind.name.clone(),
                    from: a,
                    to: b,
                    area,
                    links,
                });
            }
        }
    }
}

/// Report unknown element kinds inside build-up declarations once, where they are written.
pub fn check_buildup_kinds(module: &Module) -> Vec<Diagnostic> {
    let mut out = Vec::new();
    for item in &module.items {
        if let ItemKind::Buildup {
            elements: els,
            name,
        } = &item.kind
        {
            if els.is_empty() {
                out.push(
                    Diagnostic::error("E203", format!("build-up `{}` has no elements", name.name), name.span)
                        .with_label("empty build-up")
                        .with_help("list its layers and films from one side to the other, e.g. `inside: film(h = 8 W/(m^2*K))`"),
                );
            }
            out.extend(shell::check_mixed(els));
            for e in els.iter().filter(|e| {
                elements::lookup(&e.element.kind.name).is_some_and(|k| !k.single_link())
            }) {
                out.push(
                    Diagnostic::error(
                        "E217",
                        format!(
                            "`{}` cannot be an element of a build-up",
                            e.element.kind.name
                        ),
                        e.element.kind.span,
                    )
                    .with_label("makes its own nodes and heat")
                    .with_help("declare it as a link of its own between the two nodes it joins"),
                );
            }
            for e in els {
                if elements::lookup(&e.element.kind.name).is_none() {
                    let names = elements::ALL.iter().map(|k| k.name());
                    let mut d = Diagnostic::error(
                        "E206",
                        format!("unknown element kind `{}`", e.element.kind.name),
                        e.element.kind.span,
                    )
                    .with_label("not an element kind");
                    d = match did_you_mean(&e.element.kind.name, names) {
                        Some(s) => d.with_help(format!("did you mean `{s}`?")).with_fix(
                            format!("Replace with `{s}`"),
                            e.element.kind.span,
                            s,
                        ),
                        None => d.with_help(format!(
                            "a build-up element is one of {}",
                            elements::ALL
                                .iter()
                                .map(|k| format!("`{}(...)`", k.name()))
                                .collect::<Vec<_>>()
                                .join(", ")
                        )),
                    };
                    out.push(d);
                }
            }
        }
    }
    out
}

/// A node made by a declaration (a build-up face, an element's internal node): in the network,
/// and in the symbol table as a child of the declaration that made it, for navigation.
fn add_generated_node(
    net: &mut Network,
    symbols: &mut SymbolTable,
    name: String,
    span: Span,
    parent: &Ident,
    decl: Span,
) {
    net.nodes.push(Node {
        name: name.clone(),
        span,
        fixed: None,
        load: 0.0,
        generated: true,
    });
    symbols.push(Symbol {
        name,
        kind: SymbolKind::GeneratedNode,
        def: parent.span,
        decl,
        refs: Vec::new(),
        parent: Some(parent.name.clone()),
    });
}

/// Names in sorted order, so that a suggestion does not hang on the hasher's order.
fn sorted<'a>(names: impl Iterator<Item = &'a str>) -> Vec<&'a str> {
    let mut v: Vec<&str> = names.collect();
    v.sort_unstable();
    v
}

/// The node names of an index in the order the nodes were declared (by id), so that a suggestion
/// does not hang on the hasher's order. Linear, not a sort: models reach millions of nodes.
fn in_declaration_order(index: &FxHashMap<String, NodeId>) -> impl Iterator<Item = &str> {
    let len = index.values().max().map_or(0, |&m| m + 1);
    let mut by_id: Vec<Option<&str>> = vec![None; len];
    for (name, &id) in index {
        by_id[id] = Some(name.as_str());
    }
    by_id.into_iter().flatten()
}
