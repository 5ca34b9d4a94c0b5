//! Result reports: a terminal table, the JSON contract (docs/json.md) and CSV.

use caloris_compiler::network::LinkFigure;
use caloris_compiler::units::{display_unit, format_number, Dim, Quantity, TempKind, UnitSystem};
use caloris_compiler::Analysis;
use comfy_table::{Cell, CellAlignment, Color, Table};
use serde_json::{json, Value};

pub const CAUTION: &str = "Results are engineering estimates from the stated model. Where safety or compliance depends on them \
(burns, condensation, frozen pipes, fire, overheated parts), confirm against local codes and licensed practice.";

fn show(value: f64, dim: Dim, kind: TempKind, system: UnitSystem) -> String {
    caloris_compiler::units::format_quantity(Quantity { value, dim, kind }, system)
}

fn num(value: f64, dim: Dim, kind: TempKind, system: UnitSystem) -> (f64, String) {
    let u = display_unit(dim, kind, system);
    (u.from_si(value), u.text.clone())
}

fn new_table(headers: &[&str]) -> Table {
    let mut t = Table::new();
    t.load_preset("     ──            ");
    t.set_header(headers.iter().map(Cell::new));
    t
}

fn right(t: &mut Table, cols: &[usize]) {
    for &c in cols {
        if let Some(col) = t.column_mut(c) {
            col.set_cell_alignment(CellAlignment::Right);
        }
    }
}

/// The human-readable report.
pub fn table(a: &Analysis, system: UnitSystem, colour: bool) -> String {
    let Some(sol) = &a.solution else {
        return String::new();
    };
    let net = &a.network;
    let mut out = String::new();
    if let Some(t) = &a.title {
        out.push_str(&format!("{t}\n\n"));
    }
    let temp = |v| show(v, Dim::TEMPERATURE, TempKind::Point, system);
    let power = |v| show(v, Dim::POWER, TempKind::NotTemperature, system);

    let mut t = new_table(&["node", "temperature", "", "heat load"]);
    for (i, n) in net.nodes.iter().enumerate() {
        let state = if n.fixed.is_some() { "fixed" } else { "" };
        let load = if n.load != 0.0 {
            power(n.load)
        } else {
            String::new()
        };
        t.add_row(vec![
            Cell::new(&n.name),
            Cell::new(temp(sol.temperatures[i])),
            Cell::new(state),
            Cell::new(load),
        ]);
    }
    right(&mut t, &[1, 3]);
    out.push_str(&format!("Nodes\n{t}\n\n"));

    let mut t = new_table(&[
        "link",
        "from → to",
        "kind",
        "resistance",
        "heat flow",
        "heat flux",
    ]);
    for (i, l) in net.links.iter().enumerate() {
        let q = sol.heat_flows[i];
        let flux = l
            .area
            .map(|a| show(q / a, Dim::HEAT_FLUX, TempKind::NotTemperature, system))
            .unwrap_or_default();
        t.add_row(vec![
            Cell::new(&l.name),
            Cell::new(format!(
                "{} → {}",
                net.nodes[l.from].name, net.nodes[l.to].name
            )),
            Cell::new(&l.kind),
            Cell::new(show(
                1.0 / l.conductance_at(&sol.temperatures),
                Dim::RESISTANCE,
                TempKind::NotTemperature,
                system,
            )),
            Cell::new(power(q)),
            Cell::new(flux),
        ]);
    }
    right(&mut t, &[3, 4, 5]);
    out.push_str(&format!("Links (heat flow positive from → to)\n{t}\n\n"));

    if !sol.groups.is_empty() {
        out.push_str(&groups_table(a, system));
    }

    let figures = link_figures(a);
    if !figures.is_empty() {
        let mut t = new_table(&["link", "figure", "value"]);
        for f in figures {
            t.add_row(vec![
                Cell::new(&net.links[f.link].name),
                Cell::new(f.name),
                Cell::new(show(f.value, f.dim, f.kind, system)),
            ]);
        }
        right(&mut t, &[2]);
        out.push_str(&format!("Element figures\n{t}\n\n"));
    }

    if !sol.films.is_empty() {
        out.push_str(&films_table(a, system));
    }
    if !sol.capacity_nodes.is_empty() {
        out.push_str(&capacities_table(a, system));
    }

    for r in &net.regions {
        let field = r.field(&sol.temperatures, &sol.heat_flows);
        let (lo, hi) = field
            .iter()
            .fold((f64::INFINITY, f64::NEG_INFINITY), |(lo, hi), c| {
                (lo.min(c.temperature_k), hi.max(c.temperature_k))
            });
        out.push_str(&format!(
            "Region {}: {} × {} cells, {} to {} (the field and heat flux vectors are in the JSON output)\n\n",
            r.name,
            r.nx,
            r.ny,
            temp(lo),
            temp(hi)
        ));
    }

    let mut t = new_table(&["boundary", "heat delivered"]);
    for &(i, q) in &sol.boundary_heat {
        t.add_row(vec![Cell::new(&net.nodes[i].name), Cell::new(power(q))]);
    }
    right(&mut t, &[1]);
    out.push_str(&format!(
        "Boundaries (heat delivered into the network; negative = absorbed)\n{t}\n\n"
    ));

    if !sol.limits.is_empty() {
        let mut t = new_table(&[
            "limit", "measure", "value", "limit", "margin", "margin %", "verdict",
        ]);
        for l in &sol.limits {
            let dim = l.measure_dim();
            let verdict = if l.passed { "pass" } else { "FAIL" };
            let mut v = Cell::new(verdict);
            if colour {
                v = v.fg(if l.passed { Color::Green } else { Color::Red });
            }
            t.add_row(vec![
                Cell::new(&l.name),
                Cell::new(format!("{}({})", l.measure.name(), l.subject)),
                Cell::new(show(l.actual, dim, l.kind(), system)),
                Cell::new(l.limit_text(&show(l.limit, dim, l.kind(), system))),
                Cell::new(show(l.margin, dim, l.margin_kind(), system)),
                Cell::new(percent(l.margin_percent)),
                v,
            ]);
        }
        right(&mut t, &[2, 4, 5]);
        out.push_str(&format!("Design limits\n{t}\n\n"));
    }
    if let Some(c) = &sol.convergence {
        out.push_str(&format!(
            "Nonlinear solve: {}, {} iterations, final residual {:.3e} W.\n",
            c.method, c.iterations, c.final_residual
        ));
    }
    out.push_str(&format!(
        "Energy balance: worst residual at a free node {:.3e} W.\n\n{CAUTION}\n",
        sol.worst_residual
    ));
    out
}

/// Every figure of every link, those known before the solve and those at the solved
/// temperatures, in link order (a link's own figures in the order its element gives them).
pub fn link_figures(a: &Analysis) -> Vec<&LinkFigure> {
    let solved = a.solution.as_ref().map(|s| s.figures.as_slice());
    let mut all: Vec<&LinkFigure> = a
        .network
        .figures
        .iter()
        .chain(solved.unwrap_or_default())
        .collect();
    all.sort_by_key(|f| f.link);
    all
}

/// Capacity nodes: capacity, Biot number (the warning W701 stays for Bi > 0.1), the lumped
/// time constant R·C where one path dominates, and the network's slowest and fastest.
fn capacities_table(a: &Analysis, system: UnitSystem) -> String {
    let (net, Some(sol)) = (&a.network, a.solution.as_ref()) else {
        return String::new();
    };
    let nt = TempKind::NotTemperature;
    let mut t = new_table(&["node", "capacity", "Biot number", "R·C", "through"]);
    for d in &sol.capacity_nodes {
        t.add_row(vec![
            Cell::new(&net.nodes[d.node].name),
            Cell::new(show(d.capacity, Dim::CAPACITY, nt, system)),
            Cell::new(d.biot.map(format_number).unwrap_or_else(|| "—".into())),
            Cell::new(
                d.rc.map(|(tau, _)| show(tau, Dim::TIME, nt, system))
                    .unwrap_or_else(|| "—".into()),
            ),
            Cell::new(
                d.rc.map(|(_, l)| net.links[l].name.clone())
                    .unwrap_or_default(),
            ),
        ]);
    }
    right(&mut t, &[1, 2, 3]);
    let mut out = format!(
        "Capacity nodes (R·C where one link carries at least 90 % of the node's conductance)\n{t}\n"
    );
    match &sol.time_constants {
        Some(tc) => out.push_str(&format!(
            "Network time constants ({} modes, at the solved temperatures): slowest {}, fastest {}\n\n",
            tc.modes,
            show(tc.slowest, Dim::TIME, nt, system),
            show(tc.fastest, Dim::TIME, nt, system)
        )),
        None => out.push_str("Network time constants: not computed (no capacity node held by a path to a fixed temperature, or more free nodes than the dense analysis takes)\n\n"),
    }
    out
}

/// Build-up uses: resistance, R- and U-value (also rounded to two significant figures, as
/// ISO 6946 states a U-value, and labelled so), heat flow, and per metre for a pipe.
fn groups_table(a: &Analysis, system: UnitSystem) -> String {
    let Some(sol) = a.solution.as_ref() else {
        return String::new();
    };
    let nt = TempKind::NotTemperature;
    let per_length = sol.groups.iter().any(|g| g.heat_flow_per_length.is_some());
    let mut headers = vec![
        "build-up use",
        "resistance",
        "R-value",
        "U-value",
        "U-value (rounded, 2 s.f.)",
        "heat flow",
    ];
    if per_length {
        headers.push("heat flow per metre");
    }
    let mut t = new_table(&headers);
    let opt = |v: Option<f64>, dim| v.map(|v| show(v, dim, nt, system)).unwrap_or_default();
    for g in &sol.groups {
        // Rounded in the unit shown, as a reader rounds it (a US report rounds Btu/(h·ft²·°F)).
        let rounded = g
            .u_value
            .map(|v| caloris_compiler::results::rounded_u_value(v, system));
        let mut row = vec![
            Cell::new(&g.name),
            Cell::new(show(g.resistance, Dim::RESISTANCE, nt, system)),
            Cell::new(opt(g.r_value, Dim::AREA_RESISTANCE)),
            Cell::new(opt(g.u_value, Dim::HEAT_TRANSFER_COEFF)),
            Cell::new(rounded.unwrap_or_default()),
            Cell::new(show(g.heat_flow, Dim::POWER, nt, system)),
        ];
        if per_length {
            row.push(Cell::new(opt(
                g.heat_flow_per_length,
                Dim::LINEAR_HEAT_FLOW,
            )));
        }
        t.add_row(row);
    }
    right(&mut t, &[1, 2, 3, 4, 5, 6]);
    format!("Build-ups (films included)\n{t}\n\n")
}

/// Computed films at the solved temperatures: the correlation, the groups, h and the heat by
/// convection and by radiation, each on its own.
fn films_table(a: &Analysis, system: UnitSystem) -> String {
    let (net, Some(sol)) = (&a.network, a.solution.as_ref()) else {
        return String::new();
    };
    let group = |v: Option<f64>| v.map(|v| format!("{v:.4e}")).unwrap_or_else(|| "—".into());
    let coeff = |v: f64| {
        show(
            v,
            Dim::HEAT_TRANSFER_COEFF,
            TempKind::NotTemperature,
            system,
        )
    };
    let power = |v: f64| show(v, Dim::POWER, TempKind::NotTemperature, system);
    let mut t = new_table(&[
        "film",
        "at",
        "Re",
        "Gr",
        "Ra",
        "Pr",
        "Nu",
        "h",
        "h radiation",
        "convection",
        "radiation",
    ]);
    let mut names = String::new();
    for f in &sol.films {
        let s = &f.state;
        let name = &net.links[f.link].name;
        t.add_row(vec![
            Cell::new(name),
            Cell::new(show(
                s.property_temperature,
                Dim::TEMPERATURE,
                TempKind::Point,
                system,
            )),
            Cell::new(group(s.reynolds)),
            Cell::new(group(s.grashof)),
            Cell::new(group(s.rayleigh)),
            Cell::new(format!("{:.4}", s.prandtl)),
            Cell::new(format!("{:.4}", s.nusselt)),
            Cell::new(coeff(s.h)),
            Cell::new(coeff(s.h_radiation)),
            Cell::new(power(s.q_convection)),
            Cell::new(power(s.q_radiation)),
        ]);
        names.push_str(&format!(
            "  {name}: {} in {} ({})\n",
            f.correlation, f.fluid, s.regime
        ));
    }
    right(&mut t, &[1, 2, 3, 4, 5, 6, 7, 8, 9, 10]);
    format!(
        "Computed films (properties at the film temperature, bulk temperature for pipe flow; heat from the surface)\n{t}\n{names}\n"
    )
}

/// The JSON of a computed film at the solved temperatures.
fn film_json(f: &caloris_compiler::convection::report::FilmResult) -> Value {
    let s = &f.state;
    json!({
        "correlation": f.correlation,
        "fluid": f.fluid,
        "regime": s.regime,
        "property_temperature_K": s.property_temperature,
        "reynolds": s.reynolds,
        "grashof": s.grashof,
        "rayleigh": s.rayleigh,
        "prandtl": s.prandtl,
        "nusselt": s.nusselt,
        "h_W_per_m2K": s.h,
        "h_radiation_W_per_m2K": s.h_radiation,
        "convection_W": s.q_convection,
        "radiation_W": s.q_radiation,
        "outside_range": s.outside.iter().map(|(g, v, lo, hi)| json!({"group": g, "value": v, "low": lo, "high": if hi.is_finite() { Some(*hi) } else { None }})).collect::<Vec<_>>(),
    })
}

trait MeasureDim {
    fn measure_dim(&self) -> Dim;
}
impl MeasureDim for caloris_compiler::limits::LimitResult {
    fn measure_dim(&self) -> Dim {
        self.measure.dim()
    }
}

/// The JSON contract: see docs/json.md.
pub fn json(a: &Analysis) -> String {
    let net = &a.network;
    let sol = a.solution.as_ref();
    // Looked up per node and per link: index them once, so the report stays linear in the
    // model's size (a row of 40 000 fins has as many figures as links).
    let mut boundary_heat = vec![None; net.nodes.len()];
    for &(node, q) in sol.map(|s| s.boundary_heat.as_slice()).unwrap_or_default() {
        if let Some(slot) = boundary_heat.get_mut(node) {
            slot.get_or_insert(q);
        }
    }
    let mut figures_of = vec![serde_json::Map::new(); net.links.len()];
    for f in link_figures(a) {
        if let Some(m) = figures_of.get_mut(f.link) {
            m.insert(f.json_name(), json!(f.value));
        }
    }
    let mut film_of = vec![Value::Null; net.links.len()];
    for f in sol.map(|s| s.films.as_slice()).unwrap_or_default() {
        if let Some(slot) = film_of.get_mut(f.link) {
            *slot = film_json(f);
        }
    }
    let mut dynamics_of = vec![None; net.nodes.len()];
    for d in sol.map(|s| s.capacity_nodes.as_slice()).unwrap_or_default() {
        if let Some(slot) = dynamics_of.get_mut(d.node) {
            *slot = Some(d);
        }
    }
    let nodes: Vec<Value> = net
        .nodes
        .iter()
        .enumerate()
        .map(|(i, n)| {
            let d = dynamics_of[i];
            json!({
                "capacity_J_per_K": d.map(|d| d.capacity),
                "biot": d.and_then(|d| d.biot),
                "rc_time_constant_s": d.and_then(|d| d.rc.map(|r| r.0)),
                "name": n.name,
                "temperature_K": sol.map(|s| s.temperatures[i]),
                "fixed": n.fixed.is_some(),
                "heat_load_W": n.load,
                "balance_W": sol.map(|s| if n.fixed.is_some() { 0.0 } else { s.residuals[i] }),
                "boundary_heat_W": boundary_heat[i],
            })
        })
        .collect();
    let links: Vec<Value> = net
        .links
        .iter()
        .enumerate()
        .map(|(i, l)| {
            let q = sol.map(|s| s.heat_flows[i]);
            json!({
                "name": l.name,
                "from": net.nodes[l.from].name,
                "to": net.nodes[l.to].name,
                "kind": l.kind,
                "heat_flow_W": q,
                "resistance_K_per_W": sol.map(|s| 1.0 / l.conductance_at(&s.temperatures)).unwrap_or(1.0 / l.conductance()),
                "area_m2": l.area,
                "heat_flux_W_per_m2": l.area.and_then(|a| q.map(|q| q / a)),
                "buildup_use": l.group.map(|g| net.groups[g].name.clone()),
                "formula": l.formula,
                "figures": std::mem::take(&mut figures_of[i]),
                "film": std::mem::take(&mut film_of[i]),
            })
        })
        .collect();
    let groups: Vec<Value> = sol
        .map(|s| {
            s.groups
                .iter()
                .zip(&net.groups)
                .map(|(r, g)| {
                    json!({
                        "name": r.name, "buildup": g.buildup, "from": net.nodes[g.from].name, "to": net.nodes[g.to].name,
                        "resistance_K_per_W": r.resistance, "heat_flow_W": r.heat_flow, "area_m2": g.area,
                        "u_value_W_per_m2K": r.u_value, "u_value_rounded_W_per_m2K": r.u_value_rounded,
                        "r_value_m2K_per_W": r.r_value, "heat_flow_per_length_W_per_m": r.heat_flow_per_length,
                    })
                })
                .collect()
        })
        .unwrap_or_default();
    let limits: Vec<Value> = sol
        .map(|s| {
            s.limits
                .iter()
                .map(|l| {
                    let (unit, _) = si_unit(l.measure.dim());
                    json!({
                        "name": l.name, "measure": l.measure.name(), "subject": l.subject, "op": l.op,
                        "value": l.actual, "limit": l.limit, "limit_as_written": l.written, "unit": unit, "passed": l.passed, "margin": l.margin,
                        "margin_percent": finite(l.margin_percent),
                    })
                })
                .collect()
        })
        .unwrap_or_default();
    let diagnostics = diagnostics_json(a);
    let doc = json!({
        "title": a.title,
        "nodes": nodes,
        "links": links,
        "buildups": groups,
        "limits": limits,
        "balance": sol.map(|s| json!({"worst_residual_W": s.worst_residual})),
        "regions": net.regions.iter().map(|r| json!({
            "name": r.name, "cells_x": r.nx, "cells_y": r.ny, "width_m": r.width, "height_m": r.height, "thickness_m": r.thickness,
            "cells": sol.map(|s| r.field(&s.temperatures, &s.heat_flows)),
        })).collect::<Vec<Value>>(),
        "time_constants": sol.and_then(|s| s.time_constants.as_ref()).map(|t| json!({"slowest_s": t.slowest, "fastest_s": t.fastest, "modes": t.modes})),
        "nonlinear_solve": sol.and_then(|s| s.convergence.as_ref()).map(|c| json!({"method": c.method, "iterations": c.iterations, "final_residual_W": c.final_residual})),
        "diagnostics": diagnostics,
        "caution": CAUTION,
    });
    serde_json::to_string_pretty(&doc).unwrap_or_default() + "\n"
}

/// A limit's margin in percent of the limit (`12.5 %`); `—` for a limit of zero.
pub fn percent(v: f64) -> String {
    if v.is_finite() {
        format!("{} %", format_number(v))
    } else {
        "—".to_string()
    }
}

/// The analysis's diagnostics for a JSON report (`solve`, `run`): code, severity, message,
/// place and help.
pub fn diagnostics_json(a: &Analysis) -> Vec<Value> {
    a.diagnostics
        .iter()
        .map(|d| {
            let f = a.sources.get(d.primary.span.file);
            let lc = f.lines.line_col_chars(d.primary.span.start);
            json!({
                "code": d.code, "severity": d.severity, "message": d.message, "file": f.name,
                "line": lc.line + 1, "column": lc.col + 1, "help": d.help,
            })
        })
        .collect()
}

/// A number for JSON, `null` when it is not finite (JSON has no NaN).
fn finite(v: f64) -> Option<f64> {
    v.is_finite().then_some(v)
}

fn si_unit(dim: Dim) -> (String, ()) {
    (dim.si_unit(), ())
}

fn csv_field(s: &str) -> String {
    if s.contains([',', '"', '\n']) {
        format!("\"{}\"", s.replace('"', "\"\""))
    } else {
        s.to_string()
    }
}

/// One row per node and per link, for spreadsheets.
pub fn csv(a: &Analysis, system: UnitSystem) -> String {
    let Some(sol) = &a.solution else {
        return String::new();
    };
    let net = &a.network;
    let (_, tu) = num(0.0, Dim::TEMPERATURE, TempKind::Point, system);
    let (_, pu) = num(0.0, Dim::POWER, TempKind::NotTemperature, system);
    let (_, ru) = num(0.0, Dim::RESISTANCE, TempKind::NotTemperature, system);
    let mut out = format!("record,name,from,to,temperature [{tu}],heat_load [{pu}],heat_flow [{pu}],resistance [{ru}]\n");
    for (i, n) in net.nodes.iter().enumerate() {
        let (t, _) = num(
            sol.temperatures[i],
            Dim::TEMPERATURE,
            TempKind::Point,
            system,
        );
        let (l, _) = num(n.load, Dim::POWER, TempKind::NotTemperature, system);
        out.push_str(&format!(
            "{},{},,,{t},{l},,\n",
            if n.fixed.is_some() {
                "fixed_node"
            } else {
                "node"
            },
            csv_field(&n.name)
        ));
    }
    for (i, l) in net.links.iter().enumerate() {
        let (q, _) = num(
            sol.heat_flows[i],
            Dim::POWER,
            TempKind::NotTemperature,
            system,
        );
        let (r, _) = num(
            1.0 / l.conductance_at(&sol.temperatures),
            Dim::RESISTANCE,
            TempKind::NotTemperature,
            system,
        );
        out.push_str(&format!(
            "link,{},{},{},,,{q},{r}\n",
            csv_field(&l.name),
            csv_field(&net.nodes[l.from].name),
            csv_field(&net.nodes[l.to].name)
        ));
    }
    out
}
