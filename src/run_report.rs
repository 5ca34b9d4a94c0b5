//! Reports of a transient run: a terminal table, CSV (one row per output time) and JSON (the
//! contract in docs/transient.md), and the temperature–time chart.

use crate::output::CAUTION;
use crate::plot::{Chart, HLine, Marker, Panel, Series};
use caloris_compiler::limits::Measure;
use caloris_compiler::transient::integrate::StepMode;
use caloris_compiler::transient::RunResult;
use caloris_compiler::units::{
    display_unit, format_number, format_quantity, Dim, Quantity, TempKind, UnitSystem,
};
use caloris_compiler::Analysis;
use comfy_table::{Cell, CellAlignment, Color, Table};
use serde_json::{json, Value};

/// A unit for times of a run of this length: s, min, h or d, and its size in seconds.
pub fn time_unit(span: f64) -> (&'static str, f64) {
    if span < 120.0 {
        ("s", 1.0)
    } else if span < 7200.0 {
        ("min", 60.0)
    } else if span < 3.0 * 86400.0 {
        ("h", 3600.0)
    } else {
        ("d", 86400.0)
    }
}

/// A time in the unit that suits it, `5.43 h`.
pub fn show_time(t: f64) -> String {
    let (u, s) = time_unit(t.abs());
    format!("{} {u}", format_number(t / s))
}

pub fn show_temp(k: f64, system: UnitSystem) -> String {
    format_quantity(
        Quantity {
            value: k,
            dim: Dim::TEMPERATURE,
            kind: TempKind::Point,
        },
        system,
    )
}

/// Energy with a prefix that keeps the number short (J, kJ, MJ, GJ), or Btu.
pub fn show_energy(j: f64, system: UnitSystem) -> String {
    if system == UnitSystem::Us {
        return format_quantity(Quantity::new(j, Dim::ENERGY), system);
    }
    let a = j.abs();
    let (div, unit) = if a >= 1e9 {
        (1e9, "GJ")
    } else if a >= 1e6 {
        (1e6, "MJ")
    } else if a >= 1e3 {
        (1e3, "kJ")
    } else {
        (1.0, "J")
    };
    format!("{} {unit}", format_number(j / div))
}

fn measure_quantity(m: Measure, v: f64) -> Quantity {
    let kind = if m == Measure::Temperature {
        TempKind::Point
    } else {
        TempKind::NotTemperature
    };
    Quantity {
        value: v,
        dim: m.dim(),
        kind,
    }
}

pub fn show_measure(m: Measure, v: f64, system: UnitSystem) -> String {
    format_quantity(measure_quantity(m, v), system)
}

pub fn show_margin(m: Measure, v: f64, system: UnitSystem) -> String {
    let kind = if m == Measure::Temperature {
        TempKind::Difference
    } else {
        TempKind::NotTemperature
    };
    format_quantity(
        Quantity {
            value: v,
            dim: m.dim(),
            kind,
        },
        system,
    )
}

fn new_table(headers: &[&str]) -> Table {
    let mut t = Table::new();
    t.load_preset("     ──            ");
    t.set_header(headers.iter().map(Cell::new));
    t
}

fn right(t: &mut Table, from: usize) {
    for c in from..t.column_count() {
        if let Some(col) = t.column_mut(c) {
            col.set_cell_alignment(CellAlignment::Right);
        }
    }
}

fn plural(n: usize, one: &str, many: &str) -> String {
    format!("{n} {}", if n == 1 { one } else { many })
}

/// One line on how the run was stepped.
pub fn stepping(r: &RunResult) -> String {
    let st = &r.stats;
    let how = match r.mode {
        StepMode::Fixed(h) => format!("fixed step {}", show_time(h)),
        StepMode::Auto => format!(
            "automatic step (tolerance {} K per step)",
            format_number(r.tolerance)
        ),
    };
    let range = if st.steps == 0 || r.mode != StepMode::Auto {
        String::new()
    } else if st.smallest_step == st.largest_step {
        format!(", every step {}", show_time(st.smallest_step))
    } else {
        format!(
            ", steps from {} to {}",
            show_time(st.smallest_step),
            show_time(st.largest_step)
        )
    };
    format!(
        "{how}: {} ({} rejected), {}{range}; largest local error estimate {} K",
        plural(st.steps, "step", "steps"),
        st.rejected,
        plural(st.factorisations, "factorisation", "factorisations"),
        format_number(st.largest_error)
    )
}

/// Which recorded columns the table and chart show: `shown` are network node ids.
pub fn table(
    a: &Analysis,
    r: &RunResult,
    shown: &[usize],
    system: UnitSystem,
    colour: bool,
) -> String {
    let net = &a.network;
    let mut out = String::new();
    if let Some(t) = &a.title {
        out.push_str(&format!("{t}\n\n"));
    }
    let start = if r.start != 0.0 {
        format!(", schedules from clock time {}", show_time(r.start))
    } else {
        String::new()
    };
    out.push_str(&format!(
        "Transient run `{}`: {}{start}\n{}\n\n",
        r.name,
        show_time(r.duration),
        stepping(r)
    ));
    if r.interrupted {
        out.push_str(&format!(
            "INTERRUPTED at {} — the results below cover the run up to then.\n\n",
            show_time(r.stats.end_time)
        ));
    }

    let (tu, ts) = time_unit(r.duration);
    let temp_unit = display_unit(Dim::TEMPERATURE, TempKind::Point, system).text;
    let columns: Vec<(usize, usize)> = shown
        .iter()
        .filter_map(|&n| r.recorded.iter().position(|&x| x == n).map(|c| (n, c)))
        .collect();
    let mut headers = vec![format!("time [{tu}]")];
    headers.extend(columns.iter().map(|&(n, _)| net.nodes[n].name.clone()));
    let mut t = new_table(&headers.iter().map(String::as_str).collect::<Vec<_>>());
    let rows = r.times.len();
    let every = rows.div_ceil(25).max(1);
    let u = display_unit(Dim::TEMPERATURE, TempKind::Point, system);
    for (i, (time, temps)) in r.times.iter().zip(&r.temperatures).enumerate() {
        if i % every != 0 && i + 1 != rows {
            continue;
        }
        let mut row = vec![Cell::new(format_number(time / ts))];
        row.extend(
            columns
                .iter()
                .map(|&(_, c)| Cell::new(format!("{:.2}", u.from_si(temps[c])))),
        );
        t.add_row(row);
    }
    right(&mut t, 0);
    let thinned = if every > 1 {
        format!(", one output in {every} shown (CSV and JSON have all {rows})")
    } else {
        String::new()
    };
    out.push_str(&format!("Temperatures [{temp_unit}]{thinned}\n{t}\n\n"));

    if !r.crossings.is_empty() {
        let mut t = new_table(&["node", "crosses", "direction", "at"]);
        for c in &r.crossings {
            t.add_row(vec![
                Cell::new(&net.nodes[c.node].name),
                Cell::new(show_temp(c.level, system)),
                Cell::new(if c.rising { "rising" } else { "falling" }),
                Cell::new(show_time(c.time)),
            ]);
        }
        right(&mut t, 3);
        out.push_str(&format!("Crossings\n{t}\n\n"));
    }

    if !r.limits.is_empty() {
        let mut t = new_table(&[
            "limit",
            "measure",
            "worst value",
            "at",
            "limit",
            "margin",
            "verdict",
            "first fails at",
        ]);
        for l in &r.limits {
            let res = &l.result;
            let mut v = Cell::new(if res.passed { "pass" } else { "FAIL" });
            if colour {
                v = v.fg(if res.passed { Color::Green } else { Color::Red });
            }
            t.add_row(vec![
                Cell::new(&res.name),
                Cell::new(format!("{}({})", res.measure.name(), res.subject)),
                Cell::new(show_measure(res.measure, res.actual, system)),
                Cell::new(show_time(l.worst_time)),
                Cell::new(res.limit_text(&show_measure(res.measure, res.limit, system))),
                Cell::new(show_margin(res.measure, res.margin, system)),
                v,
                Cell::new(l.first_failure.map(show_time).unwrap_or_else(|| "—".into())),
            ]);
        }
        right(&mut t, 2);
        out.push_str(&format!(
            "Design limits over the run (worst value of the run)\n{t}\n\n"
        ));
    }

    let mut t = new_table(&["", "energy"]);
    t.add_row(vec![
        Cell::new("stored in the nodes (change)"),
        Cell::new(show_energy(r.energy.stored, system)),
    ]);
    for &(b, e) in &r.energy.boundaries {
        t.add_row(vec![
            Cell::new(format!("delivered by boundary {}", net.nodes[b].name)),
            Cell::new(show_energy(e, system)),
        ]);
    }
    t.add_row(vec![
        Cell::new("put in by loads"),
        Cell::new(show_energy(r.energy.loads, system)),
    ]);
    t.add_row(vec![
        Cell::new("balance residual (stored − delivered)"),
        Cell::new(show_energy(r.energy.residual, system)),
    ]);
    right(&mut t, 1);
    out.push_str(&format!("Energy over the run (first law)\n{t}\n\n"));
    for n in &r.notes {
        out.push_str(&format!("Note: {n}\n\n"));
    }
    out.push_str(CAUTION);
    out.push('\n');
    out
}

/// One row per output time: time, every recorded node's temperature, every boundary's heat.
pub fn csv(a: &Analysis, r: &RunResult, system: UnitSystem) -> String {
    let net = &a.network;
    let (tu, ts) = time_unit(r.duration);
    let tunit = display_unit(Dim::TEMPERATURE, TempKind::Point, system);
    let punit = display_unit(Dim::POWER, TempKind::NotTemperature, system);
    let field = |s: &str| {
        if s.contains([',', '"', '\n']) {
            format!("\"{}\"", s.replace('"', "\"\""))
        } else {
            s.to_string()
        }
    };
    let mut out = format!("time [{tu}]");
    for &n in &r.recorded {
        out.push_str(&format!(
            ",{}",
            field(&format!("{} [{}]", net.nodes[n].name, tunit.text))
        ));
    }
    for &b in &r.fixed_nodes {
        out.push_str(&format!(
            ",{}",
            field(&format!("heat from {} [{}]", net.nodes[b].name, punit.text))
        ));
    }
    out.push('\n');
    for (i, time) in r.times.iter().enumerate() {
        out.push_str(&format!("{}", time / ts));
        for v in &r.temperatures[i] {
            out.push_str(&format!(",{}", tunit.from_si(*v)));
        }
        for q in &r.boundary_heat[i] {
            out.push_str(&format!(",{}", punit.from_si(*q)));
        }
        out.push('\n');
    }
    out
}

pub fn json(a: &Analysis, r: &RunResult) -> Value {
    let net = &a.network;
    let caps = net.dynamics.capacity_vector(net.nodes.len());
    let nodes: Vec<Value> = net
        .nodes
        .iter()
        .enumerate()
        .map(|(i, n)| {
            let tr = &r.nodes[i];
            let series = r.recorded.iter().position(|&x| x == i).map(|c| r.temperatures.iter().map(|row| row[c]).collect::<Vec<f64>>());
            json!({
                "name": n.name, "fixed": n.fixed.is_some(), "capacity_J_per_K": caps[i],
                "temperatures_K": series, "initial_K": tr.initial, "final_K": tr.last,
                "min_K": tr.min, "min_time_s": tr.min_time, "max_K": tr.max, "max_time_s": tr.max_time,
            })
        })
        .collect();
    let boundaries: Vec<Value> = r
        .fixed_nodes
        .iter()
        .enumerate()
        .map(|(k, &b)| {
            json!({
                "name": net.nodes[b].name,
                "heat_W": r.boundary_heat.iter().map(|row| row[k]).collect::<Vec<f64>>(),
                "energy_J": r.energy.boundaries.get(k).map(|e| e.1),
            })
        })
        .collect();
    let crossings: Vec<Value> = r
        .crossings
        .iter()
        .map(|c| json!({"node": net.nodes[c.node].name, "level_K": c.level, "time_s": c.time, "direction": if c.rising { "rising" } else { "falling" }}))
        .collect();
    let limits: Vec<Value> = r
        .limits
        .iter()
        .map(|l| {
            let res = &l.result;
            json!({
                "name": res.name, "measure": res.measure.name(), "subject": res.subject, "op": res.op, "limit_as_written": res.written,
                "worst": res.actual, "worst_time_s": l.worst_time, "limit": res.limit, "unit": res.measure.dim().si_unit(),
                "passed": res.passed, "margin": res.margin, "first_failure_s": l.first_failure,
            })
        })
        .collect();
    let step = match r.mode {
        StepMode::Fixed(h) => json!({"fixed_s": h}),
        StepMode::Auto => json!("automatic"),
    };
    json!({
        "title": a.title,
        "run": {"name": r.name, "duration_s": r.duration, "start_s": r.start, "step": step, "tolerance_K": r.tolerance, "output_interval_s": r.output_interval},
        "times_s": r.times,
        "nodes": nodes,
        "boundaries": boundaries,
        "crossings": crossings,
        "limits": limits,
        "energy": {"stored_J": r.energy.stored, "loads_J": r.energy.loads, "residual_J": r.energy.residual},
        "stats": r.stats,
        "interrupted": r.interrupted,
        "notes": r.notes,
        "diagnostics": crate::output::diagnostics_json(a),
        "caution": CAUTION,
    })
}

/// Temperature–time curves of the shown nodes, temperature limits as dashed lines and the
/// times at which they first fail as markers.
pub fn chart(a: &Analysis, r: &RunResult, shown: &[usize], system: UnitSystem) -> Chart {
    let net = &a.network;
    let (tu, ts) = time_unit(r.duration);
    let u = display_unit(Dim::TEMPERATURE, TempKind::Point, system);
    let series = shown
        .iter()
        .filter_map(|&n| {
            let c = r.recorded.iter().position(|&x| x == n)?;
            Some(Series {
                label: net.nodes[n].name.clone(),
                points: r
                    .times
                    .iter()
                    .zip(&r.temperatures)
                    .map(|(t, row)| (t / ts, u.from_si(row[c])))
                    .collect(),
            })
        })
        .collect();
    let mut hlines = Vec::new();
    let mut markers = Vec::new();
    for l in &r.limits {
        let res = &l.result;
        if res.measure != Measure::Temperature {
            continue;
        }
        hlines.push(HLine {
            label: format!("{}: {} {}", res.name, res.op, show_temp(res.limit, system)),
            y: u.from_si(res.limit),
        });
        if let Some(t) = l.first_failure {
            markers.push(Marker {
                x: t / ts,
                y: u.from_si(res.limit),
                label: format!("{} fails at {}", res.name, show_time(t)),
            });
        }
    }
    let title = match &a.title {
        Some(t) => format!("{t} — run `{}`", r.name),
        None => format!("Transient run `{}`", r.name),
    };
    Chart {
        title,
        x_label: format!("time [{tu}]"),
        panels: vec![Panel { heading: String::new(), y_label: format!("temperature [{}]", u.text), series, hlines, markers }],
        footnote: "Engineering estimate from the stated model; confirm against local codes and licensed practice where safety depends on it.".into(),
    }
}
