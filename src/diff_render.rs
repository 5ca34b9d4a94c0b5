//! Rendering a [`Comparison`]: a terminal table, Markdown for a pull-request comment, or JSON.
//! Table and Markdown share one list of sections so they always say the same thing.

use crate::output::CAUTION;
use caloris_compiler::compare::{Comparison, InputChange, LimitChange, Shown};
use caloris_compiler::limits::LimitResult;
use caloris_compiler::units::{format_quantity, Dim, Quantity, TempKind, UnitSystem};
use clap::ValueEnum;
use comfy_table::{Cell, CellAlignment, Color, Table};
use serde_json::json;

#[derive(Clone, Copy, ValueEnum)]
pub enum DiffFormat {
    Table,
    Markdown,
    Json,
}

/// Longest list shown in a table; the JSON output always has everything.
const MAX_ROWS: usize = 20;

struct Section {
    title: String,
    headers: Vec<&'static str>,
    rows: Vec<Vec<String>>,
    /// Columns holding numbers (right-aligned).
    numeric: Vec<usize>,
    /// Rows left out of a long list.
    more: usize,
    /// Row indices to highlight (a limit that fails now).
    alarm: Vec<usize>,
}

struct Fmt {
    system: UnitSystem,
    markdown: bool,
}

impl Fmt {
    fn q(&self, value: f64, dim: Dim, kind: TempKind) -> String {
        format_quantity(Quantity { value, dim, kind }, self.system)
    }
    fn signed(&self, value: f64, dim: Dim, kind: TempKind) -> String {
        let s = self.q(value, dim, kind);
        if value > 0.0 && !s.starts_with('-') {
            format!("+{s}")
        } else {
            s
        }
    }
    fn name(&self, s: &str) -> String {
        if self.markdown {
            format!("`{s}`")
        } else {
            s.to_string()
        }
    }
    fn strong(&self, s: &str) -> String {
        if self.markdown {
            format!("**{s}**")
        } else {
            s.to_string()
        }
    }
    fn shown(&self, s: &Option<Shown>) -> String {
        match s {
            None => "—".to_string(),
            Some(Shown::Written(t)) => self.name(t),
            Some(Shown::Value(q)) => format_quantity(*q, self.system),
        }
    }
}

fn percent(r: f64) -> String {
    if r.is_finite() {
        format!("{:+.1} %", r * 100.0)
    } else {
        String::new()
    }
}

fn input_label(f: &Fmt, c: &InputChange) -> String {
    match c.category {
        "title" => "title".to_string(),
        "parameter" => format!("parameter {}", f.name(&c.subject)),
        cat => format!("{cat} {} {}", f.name(&c.subject), c.property),
    }
}

fn verdict(f: &Fmt, l: &Option<LimitResult>) -> String {
    match l {
        None => "—".to_string(),
        Some(l) => {
            let value = f.q(l.actual, l.measure.dim(), l.kind());
            if l.passed {
                format!("pass ({value})")
            } else {
                f.strong(&format!("FAIL ({value})"))
            }
        }
    }
}

fn limit_row(f: &Fmt, l: &LimitChange) -> Vec<String> {
    let any = l.new.as_ref().or(l.old.as_ref());
    let condition = any.map_or(String::new(), |r| {
        format!(
            "{}({}) {} {}",
            r.measure.name(),
            r.subject,
            r.op,
            f.q(r.limit, r.measure.dim(), r.kind())
        )
    });
    let margin = |r: &Option<LimitResult>| {
        r.as_ref().map_or("—".to_string(), |r| {
            f.q(r.margin, r.measure.dim(), r.margin_kind())
        })
    };
    vec![
        f.name(&l.name),
        condition,
        verdict(f, &l.old),
        verdict(f, &l.new),
        margin(&l.old),
        margin(&l.new),
    ]
}

fn capped(rows: Vec<Vec<String>>) -> (Vec<Vec<String>>, usize) {
    let more = rows.len().saturating_sub(MAX_ROWS);
    (rows.into_iter().take(MAX_ROWS).collect(), more)
}

fn summary(f: &Fmt, c: &Comparison) -> Vec<String> {
    let mut out = Vec::new();
    if c.is_empty() {
        out.push("No change in inputs, network or results.".to_string());
    }
    let n = c.inputs.len();
    match n {
        0 if c.is_empty() => {}
        0 => out.push("No input changed.".to_string()),
        1 => out.push("1 input changed.".to_string()),
        _ => out.push(format!("{n} inputs changed.")),
    }
    let (added, removed) = (
        c.structure.iter().filter(|s| s.added).count(),
        c.structure.iter().filter(|s| !s.added).count(),
    );
    if added + removed > 0 {
        out.push(format!(
            "{added} added and {removed} removed (nodes, links, build-up uses, limits)."
        ));
    }
    if let Some(t) = c.temperatures.first() {
        out.push(format!(
            "Largest temperature change: {} at {}.",
            f.signed(t.delta, Dim::TEMPERATURE, TempKind::Difference),
            f.name(&t.name)
        ));
    }
    if let Some(l) = c.links.first() {
        out.push(format!(
            "Largest heat-flow change: {} through {}.",
            f.signed(l.delta_heat_flow, Dim::POWER, TempKind::NotTemperature),
            f.name(&l.name)
        ));
    }
    let to_fail: Vec<String> = c
        .limits
        .iter()
        .filter(|l| l.flipped() && l.fails_now())
        .map(|l| f.name(&l.name))
        .collect();
    let to_pass: Vec<String> = c
        .limits
        .iter()
        .filter(|l| l.flipped() && !l.fails_now())
        .map(|l| f.name(&l.name))
        .collect();
    let failing: Vec<String> = c
        .limits
        .iter()
        .filter(|l| l.fails_now())
        .map(|l| f.name(&l.name))
        .collect();
    if !to_fail.is_empty() {
        out.push(f.strong(&format!(
            "Now failing (was passing): {}.",
            to_fail.join(", ")
        )));
    }
    if !to_pass.is_empty() {
        out.push(format!(
            "Now passing (was failing): {}.",
            to_pass.join(", ")
        ));
    }
    let total = c.limits.iter().filter(|l| l.new.is_some()).count();
    if failing.is_empty() {
        if total > 0 {
            out.push(format!(
                "All {total} design limit{} hold in the new version.",
                if total == 1 { "" } else { "s" }
            ));
        }
    } else {
        out.push(f.strong(&format!(
            "{} of {total} design limits fail in the new version: {}.",
            failing.len(),
            failing.join(", ")
        )));
    }
    if !c.both_solved {
        out.push("One version did not solve, so results are not compared.".to_string());
    }
    out
}

fn sections(c: &Comparison, f: &Fmt) -> Vec<Section> {
    let mut out = Vec::new();
    let temp = |v: f64| f.q(v, Dim::TEMPERATURE, TempKind::Point);
    let power = |v: f64| f.q(v, Dim::POWER, TempKind::NotTemperature);
    if !c.inputs.is_empty() {
        let change = |i: &InputChange| match i.delta {
            Some(d) => f.signed(d.value, d.dim, d.kind),
            None => i.relative.map(percent).unwrap_or_default(),
        };
        let rows = c
            .inputs
            .iter()
            .map(|i| {
                vec![
                    input_label(f, i),
                    f.shown(&i.old),
                    f.shown(&i.new),
                    change(i),
                ]
            })
            .collect();
        let (rows, more) = capped(rows);
        out.push(Section {
            title: "Changed inputs (largest relative change first)".into(),
            headers: vec!["input", "was", "now", "change"],
            rows,
            numeric: vec![3],
            more,
            alarm: vec![],
        });
    }
    if !c.structure.is_empty() {
        let rows = c
            .structure
            .iter()
            .map(|s| {
                vec![
                    (if s.added { "added" } else { "removed" }).to_string(),
                    s.what.to_string(),
                    f.name(&s.name),
                    s.detail.clone(),
                ]
            })
            .collect();
        let (rows, more) = capped(rows);
        out.push(Section {
            title: "Network changes".into(),
            headers: vec!["change", "what", "name", "detail"],
            rows,
            numeric: vec![],
            more,
            alarm: vec![],
        });
    }
    if !c.limits.is_empty() {
        let alarm = c
            .limits
            .iter()
            .enumerate()
            .filter(|(_, l)| l.fails_now())
            .map(|(i, _)| i)
            .collect();
        let rows = c.limits.iter().map(|l| limit_row(f, l)).collect();
        out.push(Section {
            title: "Design limits (flips first)".into(),
            headers: vec![
                "limit",
                "condition",
                "was",
                "now",
                "margin was",
                "margin now",
            ],
            rows,
            numeric: vec![4, 5],
            more: 0,
            alarm,
        });
    }
    if !c.temperatures.is_empty() {
        let rows = c
            .temperatures
            .iter()
            .map(|m| {
                vec![
                    f.name(&m.name),
                    temp(m.old),
                    temp(m.new),
                    f.signed(m.delta, Dim::TEMPERATURE, TempKind::Difference),
                ]
            })
            .collect();
        let (rows, more) = capped(rows);
        out.push(Section {
            title: "Temperatures (largest movement first)".into(),
            headers: vec!["node", "was", "now", "Δ"],
            rows,
            numeric: vec![1, 2, 3],
            more,
            alarm: vec![],
        });
    }
    if !c.links.is_empty() {
        let res = |v: f64| f.q(v, Dim::RESISTANCE, TempKind::NotTemperature);
        let rows = c
            .links
            .iter()
            .map(|l| {
                let rel = if l.old_heat_flow != 0.0 {
                    percent(l.delta_heat_flow / l.old_heat_flow.abs())
                } else {
                    String::new()
                };
                vec![
                    f.name(&l.name),
                    res(l.old_resistance),
                    res(l.new_resistance),
                    power(l.old_heat_flow),
                    power(l.new_heat_flow),
                    f.signed(l.delta_heat_flow, Dim::POWER, TempKind::NotTemperature),
                    rel,
                ]
            })
            .collect();
        let (rows, more) = capped(rows);
        out.push(Section {
            title: "Heat flows (largest change first)".into(),
            headers: vec![
                "link",
                "resistance was",
                "resistance now",
                "heat flow was",
                "heat flow now",
                "Δ",
                "Δ %",
            ],
            rows,
            numeric: vec![1, 2, 3, 4, 5, 6],
            more,
            alarm: vec![],
        });
    }
    if !c.buildups.is_empty() {
        let u = |v: Option<f64>| {
            v.map(|v| f.q(v, Dim::HEAT_TRANSFER_COEFF, TempKind::NotTemperature))
                .unwrap_or_default()
        };
        let r = |v: Option<f64>| {
            v.map(|v| f.q(v, Dim::AREA_RESISTANCE, TempKind::NotTemperature))
                .unwrap_or_default()
        };
        let rows = c
            .buildups
            .iter()
            .map(|b| {
                vec![
                    f.name(&b.name),
                    u(b.old_u_value),
                    u(b.new_u_value),
                    r(b.old_r_value),
                    r(b.new_r_value),
                    power(b.old_heat_flow),
                    power(b.new_heat_flow),
                ]
            })
            .collect();
        let (rows, more) = capped(rows);
        out.push(Section {
            title: "Build-ups (films included)".into(),
            headers: vec![
                "build-up use",
                "U was",
                "U now",
                "R was",
                "R now",
                "heat flow was",
                "heat flow now",
            ],
            rows,
            numeric: vec![1, 2, 3, 4, 5, 6],
            more,
            alarm: vec![],
        });
    }
    if !c.boundaries.is_empty() {
        let rows = c
            .boundaries
            .iter()
            .map(|m| {
                vec![
                    f.name(&m.name),
                    power(m.old),
                    power(m.new),
                    f.signed(m.delta, Dim::POWER, TempKind::NotTemperature),
                ]
            })
            .collect();
        let (rows, more) = capped(rows);
        out.push(Section {
            title: "Heat delivered by boundaries".into(),
            headers: vec!["boundary", "was", "now", "Δ"],
            rows,
            numeric: vec![1, 2, 3],
            more,
            alarm: vec![],
        });
    }
    out
}

fn heading(c: &Comparison, old: &str, new: &str) -> (String, Option<String>) {
    let title = match (&c.old_title, &c.new_title) {
        (_, Some(t)) => Some(t.clone()),
        (Some(t), None) => Some(t.clone()),
        _ => None,
    };
    (format!("{old} → {new}"), title)
}

/// The terminal report.
pub fn table(c: &Comparison, old: &str, new: &str, system: UnitSystem, colour: bool) -> String {
    let f = Fmt {
        system,
        markdown: false,
    };
    let (files, title) = heading(c, old, new);
    let mut out = format!("Caloris diff: {files}\n");
    if let Some(t) = title {
        out.push_str(&format!("{t}\n"));
    }
    out.push('\n');
    for line in summary(&f, c) {
        out.push_str(&format!("{line}\n"));
    }
    for s in sections(c, &f) {
        let mut t = Table::new();
        t.load_preset("     ──            ");
        t.set_header(s.headers.iter().map(Cell::new));
        for (i, row) in s.rows.iter().enumerate() {
            let alarm = colour && s.alarm.contains(&i);
            t.add_row(row.iter().map(|v| {
                if alarm {
                    Cell::new(v).fg(Color::Red)
                } else {
                    Cell::new(v)
                }
            }));
        }
        for &col in &s.numeric {
            if let Some(c) = t.column_mut(col) {
                c.set_cell_alignment(CellAlignment::Right);
            }
        }
        out.push_str(&format!("\n{}\n{t}\n", s.title));
        if s.more > 0 {
            out.push_str(&format!(
                "… and {} more (all of them with --format json)\n",
                s.more
            ));
        }
    }
    out.push_str(&format!("\n{CAUTION}\n"));
    out
}

fn md_cell(s: &str) -> String {
    s.replace('|', "\\|").replace('\n', " ")
}

/// Markdown for a pull-request comment.
pub fn markdown(c: &Comparison, old: &str, new: &str, system: UnitSystem) -> String {
    let f = Fmt {
        system,
        markdown: true,
    };
    let (files, title) = heading(c, old, new);
    let mut out = format!("### Caloris diff: {}\n\n", md_cell(&files));
    if let Some(t) = title {
        out.push_str(&format!("**{}**\n\n", md_cell(&t)));
    }
    for line in summary(&f, c) {
        out.push_str(&format!("- {line}\n"));
    }
    for s in sections(c, &f) {
        out.push_str(&format!("\n#### {}\n\n", s.title));
        out.push_str(&format!("| {} |\n", s.headers.join(" | ")));
        let align: Vec<&str> = (0..s.headers.len())
            .map(|i| {
                if s.numeric.contains(&i) {
                    "---:"
                } else {
                    "---"
                }
            })
            .collect();
        out.push_str(&format!("|{}|\n", align.join("|")));
        for row in &s.rows {
            out.push_str(&format!(
                "| {} |\n",
                row.iter()
                    .map(|c| md_cell(c))
                    .collect::<Vec<_>>()
                    .join(" | ")
            ));
        }
        if s.more > 0 {
            out.push_str(&format!(
                "\n… and {} more (all of them with `--format json`).\n",
                s.more
            ));
        }
    }
    out.push_str(&format!("\n> {CAUTION}\n"));
    out
}

/// The whole comparison as JSON, SI units (kelvin, watts, K/W, W/(m²·K)).
pub fn json(c: &Comparison, old: &str, new: &str) -> String {
    let doc = json!({
        "old": old,
        "new": new,
        "units": "SI: temperatures in K, heat flows in W, resistances in K/W, U-values in W/(m^2*K), R-values in m^2*K/W",
        "any_limit_fails_now": c.any_limit_fails_now(),
        "comparison": c,
        "caution": CAUTION,
    });
    serde_json::to_string_pretty(&doc).unwrap_or_default() + "\n"
}
