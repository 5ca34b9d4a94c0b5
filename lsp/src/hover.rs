//! Hover: solved temperature and heat balance on a node; heat flow, direction, resistance and
//! formula on a link; SI value and dimension on a quantity; properties on a material; verdict
//! and margin on a limit.

use crate::display::{both, point, q};
use crate::hover_transient;
use crate::link_figures;
use crate::proto::lsp;
use crate::settings::Settings;
use crate::snapshot::{Snapshot, Stage};
use caloris_compiler::elements::{self, ElementKind};
use caloris_compiler::query::{format_significant, network_at, node_balance, target_at, Target};
use caloris_compiler::results::rounded_u_value;
use caloris_compiler::schema::{self, DeclSpec};
use caloris_compiler::span::FileId;
use caloris_compiler::symbols::{Symbol, SymbolKind};
use caloris_compiler::units::{format_number, Dim, Quantity, TempKind, UnitSystem};
use lsp::{Hover, HoverContents, MarkupContent, MarkupKind, Position};
use std::fmt::Write;

/// Caution shown beside design-limit verdicts (results can decide burns, mould or failures).
const CAUTION: &str = "_Engineering estimate from the stated model; where safety or compliance depends on it, confirm against local codes and licensed practice._";

pub fn hover(snap: &Snapshot, pos: Position, settings: &Settings) -> Option<Hover> {
    let offset = snap.offset(pos);
    let Some(target) = target_at(&snap.analysis, FileId(0), offset) else {
        return network_hover(snap, offset);
    };
    let sys = snap.system(settings);
    let value = match target {
        Target::Symbol { symbol, .. } => symbol_text(snap, symbol, sys),
        Target::Literal { span, quantity, .. } => {
            literal(&snap.text()[span.range()], quantity, sys)
        }
        Target::ElementKind { kind, .. } => element_kind(kind, false),
        Target::Declaration { decl, .. } => declaration(decl),
        Target::ArgName { owner, param, .. } => format!(
            "**{}** — argument of `{owner}`\n\n{}",
            param.name,
            param.describe()
        ),
        Target::Measure { name, doc, .. } => format!("**{name}** — limit measure\n\n{doc}"),
        Target::Function { name, .. } => function(name)?,
    };
    Some(Hover {
        contents: HoverContents::Markup(MarkupContent {
            kind: MarkupKind::Markdown,
            value,
        }),
        range: Some(snap.range(target.span())),
    })
}

/// A sub-network's name, at its declaration or in a `use`.
fn network_hover(snap: &Snapshot, offset: u32) -> Option<Hover> {
    let a = &snap.analysis;
    let n = network_at(a, FileId(0), offset)?;
    let span = std::iter::once(n.def)
        .chain(n.uses.iter().copied())
        .find(|s| s.file == FileId(0) && s.contains(offset))?;
    let text = a.sources.text(n.decl.file);
    let head = text
        .get(n.decl.range())
        .and_then(|d| d.lines().next())
        .unwrap_or_default()
        .trim_end_matches('{')
        .trim_end();
    let uses = n.uses.len();
    let mut value = format!(
        "**sub-network** `{}`\n\n```heat\n{head}\n```\n\nUsed {uses} time{}; each `use NAME: {}(...)` makes a copy whose names start with `NAME.`.",
        n.name,
        if uses == 1 { "" } else { "s" },
        n.name
    );
    if n.decl.file != FileId(0) {
        let _ = write!(value, "\n\nDeclared in `{}`.", a.sources.name(n.decl.file));
    }
    Some(Hover {
        contents: HoverContents::Markup(MarkupContent {
            kind: MarkupKind::Markdown,
            value,
        }),
        range: Some(snap.range(span)),
    })
}

fn symbol_text(snap: &Snapshot, s: &Symbol, sys: UnitSystem) -> String {
    let mut out = match s.kind {
        SymbolKind::Node | SymbolKind::GeneratedNode => node(snap, s, sys),
        SymbolKind::Link => link(snap, s, sys),
        SymbolKind::Material => material(snap, s, sys),
        SymbolKind::Param => param(snap, s, sys),
        SymbolKind::Buildup => buildup(snap, s, sys),
        SymbolKind::BuildupElement => buildup_element(snap, s),
        SymbolKind::Limit => limit(snap, s, sys),
        SymbolKind::Schedule => declared(snap, s, "schedule"),
        SymbolKind::Case => declared(snap, s, "case"),
        SymbolKind::Transient => format!(
            "{}\n\n{}",
            declared(snap, s, "transient run"),
            hover_transient::declaration_paragraph(snap, &s.name, sys)
        ),
    };
    if s.def.file != FileId(0) {
        let _ = write!(
            out,
            "\n\nDeclared in `{}`.",
            snap.analysis.sources.name(s.def.file)
        );
    }
    out
}

/// A declaration shown as written (schedules, cases, transient runs).
fn declared(snap: &Snapshot, s: &Symbol, what: &str) -> String {
    let text = snap.analysis.sources.text(s.decl.file);
    let decl = text.get(s.decl.range()).unwrap_or_default();
    format!("**{what}** `{}`\n\n```heat\n{decl}\n```", s.name)
}

/// Why there are no solved values, when there are none.
fn unsolved(snap: &Snapshot) -> &'static str {
    if snap.analysis.has_errors() {
        "_Not solved: the model has errors (see the problems list)._"
    } else if snap.stage == Stage::Checked {
        "_Solving…_"
    } else {
        "_Not solved._"
    }
}

fn node(snap: &Snapshot, s: &Symbol, sys: UnitSystem) -> String {
    let mut out = steady_node(snap, s, sys);
    let run = snap
        .analysis
        .network
        .node_id(&s.name)
        .and_then(|id| hover_transient::node_paragraph(snap, id, sys));
    if let Some(run) = run {
        let _ = write!(out, "\n\n{run}");
    }
    out
}

fn steady_node(snap: &Snapshot, s: &Symbol, sys: UnitSystem) -> String {
    let a = &snap.analysis;
    let net = &a.network;
    let mut out = format!("**node** `{}`", s.name);
    let Some(id) = net.node_id(&s.name) else {
        return format!("{out}\n\n{}", unsolved(snap));
    };
    let n = &net.nodes[id];
    out.push_str(" · ");
    if let Some(t) = n.fixed {
        let _ = write!(out, "boundary, fixed at {}", both(point(t), sys));
    } else if n.generated {
        out.push_str(&made_by(a, s));
    } else if n.load != 0.0 {
        let _ = write!(out, "free, heat load {}", both(q(n.load, Dim::POWER), sys));
    } else {
        out.push_str("free");
    }
    let Some(b) = node_balance(a, &s.name) else {
        return format!("{out}\n\n{}", unsolved(snap));
    };
    let _ = write!(
        out,
        "\n\nTemperature **{}**",
        both(point(b.temperature), sys)
    );
    out.push_str("\n\nHeat balance (into the node):\n");
    // Flows far below the network's largest are solver round-off; their digits differ between
    // machines (SIMD kernels), so they are shown as zero.
    let scale = a.solution.as_ref().map_or(0.0, |s| {
        s.heat_flows.iter().fold(0.0f64, |m, q| m.max(q.abs()))
    });
    let noise = 1e-9 * scale.max(1.0);
    let clean = |w: f64| if w.abs() < noise { 0.0 } else { w };
    for &(l, into) in &b.links {
        let into = clean(into);
        let link = &net.links[l];
        let far = if link.to == id { link.from } else { link.to };
        let dir = if into >= 0.0 { "in from" } else { "out to" };
        let _ = write!(
            out,
            "\n- {dir} `{}` via link `{}`: {}",
            net.nodes[far].name,
            link.name,
            signed(into, sys)
        );
    }
    if b.load != 0.0 {
        let _ = write!(out, "\n- heat load: {}", signed(b.load, sys));
    }
    match b.boundary {
        Some(bq) => {
            let verb = if bq >= 0.0 { "delivers" } else { "absorbs" };
            let power = both(q(bq.abs(), Dim::POWER), sys);
            let _ = write!(out, "\n\nThe boundary {verb} **{power}**.");
        }
        None => {
            if b.residual.abs() < noise {
                out.push_str("\n- sum: 0 W (closes to round-off)");
            } else {
                let _ = write!(out, "\n- sum: {} W", format_number(b.residual));
            }
        }
    }
    out.push_str(&hover_transient::capacity_lines(a, id, sys));
    out
}

/// What made a generated node, from its symbol's parent (the link or region that declares it):
/// names themselves cannot tell, since a repetition or a use puts dots before the link's name
/// (`row.2.north.inside`).
fn made_by(a: &caloris_compiler::Analysis, s: &Symbol) -> String {
    let Some(parent) = s.parent.as_deref() else {
        return "made by a declaration".to_string();
    };
    let own = s
        .name
        .strip_prefix(parent)
        .and_then(|r| r.strip_prefix('.'))
        .unwrap_or(&s.name);
    if a.network.group_id(parent).is_some() {
        format!("face after element `{own}` of link `{parent}`")
    } else if a.network.regions.iter().any(|r| r.name == parent) {
        format!("cell or face `{own}` of region `{parent}`")
    } else {
        format!("internal node `{own}` of link `{parent}`")
    }
}

fn signed(w: f64, sys: UnitSystem) -> String {
    let s = both(q(w, Dim::POWER), sys);
    if w > 0.0 {
        format!("+{s}")
    } else {
        s
    }
}

fn link(snap: &Snapshot, s: &Symbol, sys: UnitSystem) -> String {
    let a = &snap.analysis;
    let net = &a.network;
    let sol = a.solution.as_ref();
    if let Some(g) = net.group_id(&s.name) {
        let group = &net.groups[g];
        let (from, to) = (&net.nodes[group.from].name, &net.nodes[group.to].name);
        let mut out = format!(
            "**link** `{}` · build-up `{}` from `{from}` to `{to}`",
            s.name, group.buildup
        );
        if let Some(area) = group.area {
            let _ = write!(out, ", area {}", both(q(area, Dim::AREA), sys));
        }
        let Some(sol) = sol else {
            return format!("{out}\n\n{}", unsolved(snap));
        };
        let r = &sol.groups[g];
        out.push_str("\n\n");
        out.push_str(&flow_line(r.heat_flow, from, to, sys));
        let _ = write!(
            out,
            "\n\nTotal resistance **{}**",
            both(q(r.resistance, Dim::RESISTANCE), sys)
        );
        if let (Some(u), Some(rv)) = (r.u_value, r.r_value) {
            let _ = write!(
                out,
                " · U-value **{}** · R-value {}",
                both(q(u, Dim::HEAT_TRANSFER_COEFF), sys),
                both(q(rv, Dim::AREA_RESISTANCE), sys)
            );
        }
        if let Some(u) = r.u_value {
            let _ = write!(
                out,
                "\n\nU-value rounded to two significant figures, as ISO 6946 states it: {} ({})",
                rounded_u_value(u, sys),
                rounded_u_value(u, crate::display::other(sys))
            );
        }
        if let Some(per_m) = r.heat_flow_per_length {
            let _ = write!(
                out,
                "\n\nHeat flow per metre of pipe: {}",
                both(q(per_m, Dim::LINEAR_HEAT_FLOW), sys)
            );
        }
        let _ = write!(out, "\n\nElements in series from `{from}`:\n");
        for &l in &group.links {
            let link = &net.links[l];
            let element = link.name.rsplit('.').next().unwrap_or(&link.name);
            let _ = write!(
                out,
                "\n- `{element}` ({}): `{}` → `{}` at {}",
                link.kind,
                link.formula,
                net.nodes[link.to].name,
                both(point(sol.temperatures[link.to]), sys)
            );
        }
        for &l in &group.links {
            out.push_str(&link_figures::film(sol, l, sys));
        }
        return out;
    }
    if let Some(r) = net.regions.iter().find(|r| r.name == s.name) {
        let out = link_figures::region(r, sol, net, sys);
        return match sol {
            Some(_) => out,
            None => format!("{out}\n\n{}", unsolved(snap)),
        };
    }
    let Some(l) = net.link_id(&s.name) else {
        return format!("**link** `{}`\n\n{}", s.name, unsolved(snap));
    };
    let link = &net.links[l];
    let (from, to) = (&net.nodes[link.from].name, &net.nodes[link.to].name);
    let mut out = format!(
        "**link** `{}` · {} from `{from}` to `{to}`",
        s.name, link.kind
    );
    if let Some(kind) = elements::lookup(&link.kind) {
        let _ = write!(out, "\n\n{}", kind.summary());
    }
    let _ = write!(out, "\n\n```text\n{}\n```", link.formula);
    let _ = write!(out, "\n\n{}", link_figures::resistance_line(link, sol, sys));
    out.push_str(&link_figures::figures(net, sol, l, sys));
    let Some(sol) = sol else {
        return format!("{out}\n\n{}", unsolved(snap));
    };
    out.push_str(&link_figures::film(sol, l, sys));
    let flow = sol.heat_flows[l];
    let _ = write!(out, "\n\n{}", flow_line(flow, from, to, sys));
    if let Some(area) = link.area {
        let _ = write!(
            out,
            "\n\nHeat flux {}",
            both(q(flow.abs() / area, Dim::HEAT_FLUX), sys)
        );
    }
    let _ = write!(
        out,
        "\n\nTemperatures: `{from}` {}, `{to}` {}",
        both(point(sol.temperatures[link.from]), sys),
        both(point(sol.temperatures[link.to]), sys)
    );
    out
}

fn flow_line(flow: f64, from: &str, to: &str, sys: UnitSystem) -> String {
    let (a, b) = if flow >= 0.0 { (from, to) } else { (to, from) };
    format!(
        "Heat flow **{}** from `{a}` to `{b}`",
        both(q(flow.abs(), Dim::POWER), sys)
    )
}

fn material(snap: &Snapshot, s: &Symbol, sys: UnitSystem) -> String {
    let mut out = format!("**material** `{}`", s.name);
    match snap.analysis.materials.iter().find(|m| m.name == s.name) {
        Some(m) => {
            let _ = write!(
                out,
                "\n\n- conductivity k = {}",
                both(q(m.k, Dim::CONDUCTIVITY), sys)
            );
            if let Some(d) = m.density {
                let _ = write!(out, "\n- density = {}", both(q(d, Dim::DENSITY), sys));
            }
            if let Some(c) = m.specific_heat {
                let _ = write!(
                    out,
                    "\n- specific heat = {}",
                    both(q(c, Dim::SPECIFIC_HEAT), sys)
                );
            }
        }
        None => out.push_str("\n\n_Its properties have errors (see the problems list)._"),
    }
    let _ = write!(
        out,
        "\n\nUsed {} time{}.",
        s.refs.len(),
        if s.refs.len() == 1 { "" } else { "s" }
    );
    out
}

fn param(snap: &Snapshot, s: &Symbol, sys: UnitSystem) -> String {
    match snap
        .analysis
        .params
        .iter()
        .find(|p| p.0 == s.name)
        .and_then(|p| p.1)
    {
        Some(v) => format!(
            "**param** `{}` = **{}** — {}",
            s.name,
            both(v, sys),
            describe(v)
        ),
        None => format!(
            "**param** `{}`\n\n_Its value has errors (see the problems list)._",
            s.name
        ),
    }
}

fn describe(v: Quantity) -> String {
    match v.kind {
        TempKind::Point => "a temperature on a scale".to_string(),
        TempKind::Difference => "a temperature difference (K)".to_string(),
        TempKind::Absolute => "an absolute temperature (K)".to_string(),
        TempKind::NotTemperature => v.dim.describe(),
    }
}

fn buildup(snap: &Snapshot, s: &Symbol, sys: UnitSystem) -> String {
    let a = &snap.analysis;
    let mut out = format!("**build-up** `{}`", s.name);
    // The build-up's elements are the symbols whose parent it is, in declaration order; found
    // the same way wherever the build-up is declared (a file, a repetition, a sub-network).
    let els: Vec<&Symbol> = a
        .symbols
        .symbols
        .iter()
        .filter(|e| {
            e.kind == SymbolKind::BuildupElement && e.parent.as_deref() == Some(s.name.as_str())
        })
        .collect();
    if !els.is_empty() {
        let _ = writeln!(
            out,
            " — {} element{}, in order:",
            els.len(),
            if els.len() == 1 { "" } else { "s" }
        );
        for e in els {
            let _ = write!(out, "\n- `{}`: `{}`", e.name, element_call_text(snap, e));
        }
    }
    let users: Vec<usize> = a
        .network
        .groups
        .iter()
        .enumerate()
        .filter(|(_, g)| g.buildup == s.name)
        .map(|(i, _)| i)
        .collect();
    if !users.is_empty() {
        out.push_str("\n\nUsed by:\n");
        for g in users {
            let group = &a.network.groups[g];
            let _ = write!(out, "\n- link `{}`", group.name);
            if let Some(u) = a.solution.as_ref().and_then(|sol| sol.groups[g].u_value) {
                let _ = write!(
                    out,
                    ": U-value {}",
                    both(q(u, Dim::HEAT_TRANSFER_COEFF), sys)
                );
            }
        }
    }
    out
}

/// The element call of a build-up element as written (`layer(material = spruce, ...)`): its
/// declaration after the name and the `:`.
fn element_call_text<'s>(snap: &'s Snapshot, e: &Symbol) -> &'s str {
    let text = snap.analysis.sources.text(e.decl.file);
    text.get(e.def.end as usize..e.decl.end as usize)
        .unwrap_or_default()
        .trim_start()
        .trim_start_matches(':')
        .trim_start()
}

fn buildup_element(snap: &Snapshot, s: &Symbol) -> String {
    let parent = s.parent.as_deref().unwrap_or("?");
    let text = snap.analysis.sources.text(s.decl.file);
    let mut out = format!(
        "**element** `{}` of build-up `{parent}`\n\n```heat\n{}\n```",
        s.name,
        text.get(s.decl.range()).unwrap_or_default()
    );
    let call = element_call_text(snap, s);
    let kind = call.split('(').next().map(str::trim);
    if let Some(kind) = kind.and_then(elements::lookup) {
        let _ = write!(out, "\n\n{}", kind.summary());
    }
    let _ = write!(
        out,
        "\n\nEach link using `{parent}` gets a node `LINK.{}` at the element's far face.",
        s.name
    );
    out
}

fn limit(snap: &Snapshot, s: &Symbol, sys: UnitSystem) -> String {
    let a = &snap.analysis;
    let text = a.sources.text(s.decl.file);
    let mut out = format!(
        "**limit** `{}`\n\n```heat\n{}\n```",
        s.name,
        text.get(s.decl.range()).unwrap_or_default()
    );
    let Some(r) = a
        .solution
        .as_ref()
        .and_then(|sol| sol.limits.iter().find(|l| l.name == s.name))
    else {
        return format!("{out}\n\n{}", unsolved(snap));
    };
    let dim = r.measure.dim();
    let actual = both(
        Quantity {
            value: r.actual,
            dim,
            kind: r.kind(),
        },
        sys,
    );
    let margin = both(
        Quantity {
            value: r.margin.abs(),
            dim,
            kind: r.margin_kind(),
        },
        sys,
    );
    if r.passed {
        let _ = write!(
            out,
            "\n\n✓ **holds**: {} is {actual}, margin {margin}",
            r.measure.name()
        );
    } else {
        let _ = write!(
            out,
            "\n\n✗ **fails**: {} is {actual}, {margin} beyond the limit",
            r.measure.name()
        );
    }
    let _ = write!(out, "\n\n{CAUTION}");
    out
}

fn literal(written: &str, v: Quantity, sys: UnitSystem) -> String {
    let n = format_significant(v.value, 6);
    let si = if v.dim.is_none() {
        n
    } else {
        format!("{n} {}", v.dim.si_unit())
    };
    let mut out = format!("`{written}` = **{si}** — {}", describe(v));
    if !v.dim.is_none() {
        let _ = write!(out, "\n\n= {}", both(v, sys));
    }
    out
}

/// The hover text of a declaration word: what it declares, how it is written, an example and
/// its arguments, from the schema.
fn declaration(d: &DeclSpec) -> String {
    let mut out = format!(
        "**{}** — {}\n\n```heat\n{}\n```\n\ne.g. `{}`",
        d.word, d.doc, d.form, d.example
    );
    if !d.reserved {
        out.push_str(
            "\n\nA contextual word: it begins a declaration only at the start of a line, followed by a name; elsewhere it is an ordinary name.",
        );
    }
    let specs = d.arg_specs();
    if !specs.is_empty() {
        out.push_str("\n\nArguments:\n");
        for p in specs {
            let _ = write!(out, "\n- `{}`: {}", p.name, p.describe());
        }
    }
    out
}

/// The hover text of an element kind; `in_buildup` leaves out the area a build-up supplies.
pub fn element_kind(kind: &dyn ElementKind, in_buildup: bool) -> String {
    let mut out = format!(
        "**{}** — {}\n\nArguments (the first may be written without its name):\n",
        kind.name(),
        kind.summary()
    );
    for p in kind
        .params()
        .iter()
        .filter(|p| !(in_buildup && p.name == "area"))
    {
        let _ = write!(out, "\n- `{}`: {}", p.name, p.describe());
    }
    out
}

fn function(name: &str) -> Option<String> {
    if let Some(f) = schema::function(name) {
        return Some(format!("**{}** — {}", f.signature(), f.doc));
    }
    let (c, doc) = schema::CONSTANTS.iter().find(|c| c.0 == name)?;
    Some(format!("**{c}** — {doc}"))
}
