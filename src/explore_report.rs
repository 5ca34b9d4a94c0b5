//! Reports of `caloris explore`: a terminal table, CSV and JSON (one row or object per point),
//! and the chart over the first parameter (one panel per limit or tracked quantity, one curve per case and value of a second
//! parameter).

use crate::output::CAUTION;
use crate::plot::{Chart, HLine, Panel, Series};
use crate::run_report::{show_margin, show_measure, show_time, time_unit};
use caloris_compiler::limits::Measure;
use caloris_compiler::study::{Mode, Outcome, Point, StudyResult};
use caloris_compiler::units::{
    display_unit, format_number, parse_unit, Quantity, Unit, UnitSystem,
};
use comfy_table::{Cell, CellAlignment, Color, Table};
use serde_json::{json, Value};

/// How each swept parameter is shown: in the unit the user wrote it in, or the report's unit.
pub struct AxisUnits(pub Vec<Unit>);

impl AxisUnits {
    /// Take the unit from the first value as written (`25mm..150mm` shows millimetres).
    pub fn from_specs(result: &StudyResult, specs: &[String], system: UnitSystem) -> AxisUnits {
        let units = result
            .axes
            .iter()
            .zip(specs)
            .map(|(ax, spec)| {
                let q = ax.values.first().copied().unwrap_or(Quantity::number(0.0));
                let written = spec
                    .split_once('=')
                    .map(|(_, v)| v.split([',', '.']).next().unwrap_or(""))
                    .unwrap_or("");
                let unit_text = written
                    .trim()
                    .trim_start_matches(|c: char| {
                        c.is_ascii_digit() || c == '-' || c == '+' || c == '.'
                    })
                    .trim();
                match parse_unit(unit_text) {
                    Ok(u) if !unit_text.is_empty() && u.dim == q.dim => u,
                    _ => display_unit(q.dim, q.kind, system),
                }
            })
            .collect();
        AxisUnits(units)
    }
    pub fn show(&self, k: usize, q: Quantity) -> String {
        match self.0.get(k) {
            Some(u) if !u.text.is_empty() => {
                format!("{} {}", format_number(u.from_si(q.value)), u.text)
            }
            Some(u) => format_number(u.from_si(q.value)),
            None => format_number(q.value),
        }
    }
}

fn is_transient(r: &StudyResult) -> bool {
    matches!(r.mode, Mode::Transient(_))
}

fn new_table(headers: &[String]) -> Table {
    let mut t = Table::new();
    t.load_preset("     ──            ");
    t.set_header(headers.iter().map(Cell::new));
    t
}

pub fn describe(r: &StudyResult, units: &AxisUnits) -> String {
    let mut parts = Vec::new();
    for (k, ax) in r.axes.iter().enumerate() {
        let (a, b) = (ax.values.first(), ax.values.last());
        if let (Some(a), Some(b)) = (a, b) {
            parts.push(format!(
                "{} from {} to {} ({} values)",
                ax.param,
                units.show(k, *a),
                units.show(k, *b),
                ax.values.len()
            ));
        }
    }
    if !r.cases.is_empty() {
        parts.push(format!("cases {}", r.cases.join(", ")));
    }
    let mode = match &r.mode {
        Mode::Steady => "steady".to_string(),
        Mode::Transient(run) => {
            format!("transient run `{run}`, limits on the worst value of each run")
        }
    };
    format!(
        "Explored: {}; {mode}",
        if parts.is_empty() {
            "the model as written".into()
        } else {
            parts.join("; ")
        }
    )
}

pub fn table(
    title: Option<&str>,
    r: &StudyResult,
    units: &AxisUnits,
    system: UnitSystem,
    colour: bool,
) -> String {
    let mut out = String::new();
    if let Some(t) = title {
        out.push_str(&format!("{t}\n\n"));
    }
    out.push_str(&describe(r, units));
    out.push_str("\n\n");
    let transient = is_transient(r);
    let mut headers: Vec<String> = Vec::new();
    if !r.cases.is_empty() {
        headers.push("case".into());
    }
    headers.extend(r.axes.iter().map(|a| a.param.clone()));
    for l in &r.limits {
        headers.push(l.clone());
        headers.push("margin".into());
        if transient {
            headers.push("first fails at".into());
        }
    }
    headers.extend(r.measures.iter().cloned());
    headers.push("verdict".into());
    let mut t = new_table(&headers);
    for p in &r.points {
        let mut row = Vec::new();
        if !r.cases.is_empty() {
            row.push(Cell::new(p.case.clone().unwrap_or_default()));
        }
        for (k, (_, q)) in p.values.iter().enumerate() {
            row.push(Cell::new(units.show(k, *q)));
        }
        match &p.outcome {
            Outcome::Solved { limits, measures } => {
                for l in limits {
                    let res = &l.result;
                    row.push(Cell::new(show_measure(res.measure, res.actual, system)));
                    row.push(Cell::new(show_margin(res.measure, res.margin, system)));
                    if transient {
                        row.push(Cell::new(
                            l.first_failure.map(show_time).unwrap_or_else(|| "—".into()),
                        ));
                    }
                }
                for m in measures {
                    row.push(Cell::new(show_measure(m.measure, m.value, system)));
                }
                let ok = p.all_limits_pass();
                let mut v = Cell::new(if limits.is_empty() {
                    "—"
                } else if ok {
                    "pass"
                } else {
                    "FAIL"
                });
                if colour && !limits.is_empty() {
                    v = v.fg(if ok { Color::Green } else { Color::Red });
                }
                row.push(v);
            }
            Outcome::Failed { messages } => {
                let span = r.limits.len() * if transient { 3 } else { 2 } + r.measures.len();
                for _ in 0..span {
                    row.push(Cell::new("—"));
                }
                row.push(Cell::new(format!(
                    "error: {}",
                    messages.first().cloned().unwrap_or_default()
                )));
            }
        }
        t.add_row(row);
    }
    let first_value_col = usize::from(!r.cases.is_empty());
    for c in first_value_col..t.column_count().saturating_sub(1) {
        if let Some(col) = t.column_mut(c) {
            col.set_cell_alignment(CellAlignment::Right);
        }
    }
    out.push_str(&format!("{t}\n\n"));
    let passing = r.points.iter().filter(|p| p.all_limits_pass()).count();
    if !r.limits.is_empty() && !r.points.is_empty() {
        out.push_str(&format!(
            "{passing} of {} points meet every limit.\n",
            r.points.len()
        ));
    }
    if r.interrupted {
        out.push_str(&format!(
            "INTERRUPTED after {} of {} points.\n",
            r.points.len(),
            r.planned
        ));
    }
    if !r.warnings.is_empty() {
        out.push_str("\nWarnings (each once over all points):\n");
        for w in &r.warnings {
            out.push_str(&format!(
                "  {} at {}:{}:{} ({} of {} points): {}\n",
                w.code,
                w.file,
                w.line,
                w.column,
                w.points,
                r.points.len(),
                w.message
            ));
        }
    }
    out.push('\n');
    out.push_str(CAUTION);
    out.push('\n');
    out
}

fn csv_field(s: &str) -> String {
    if s.contains([',', '"', '\n']) {
        format!("\"{}\"", s.replace('"', "\"\""))
    } else {
        s.to_string()
    }
}

fn unit_text(m: Measure, system: UnitSystem) -> String {
    let kind = if m == Measure::Temperature {
        caloris_compiler::units::TempKind::Point
    } else {
        caloris_compiler::units::TempKind::NotTemperature
    };
    display_unit(m.dim(), kind, system).text
}

fn margin_unit(m: Measure, system: UnitSystem) -> Unit {
    let kind = if m == Measure::Temperature {
        caloris_compiler::units::TempKind::Difference
    } else {
        caloris_compiler::units::TempKind::NotTemperature
    };
    display_unit(m.dim(), kind, system)
}

/// One row per point; units in the header.
pub fn csv(r: &StudyResult, units: &AxisUnits, system: UnitSystem) -> String {
    let transient = is_transient(r);
    let first = r.points.iter().find_map(|p| match &p.outcome {
        Outcome::Solved { limits, measures } => Some((limits.clone(), measures.clone())),
        _ => None,
    });
    let mut head = vec!["case".to_string()];
    for (k, ax) in r.axes.iter().enumerate() {
        head.push(format!(
            "{} [{}]",
            ax.param,
            units.0.get(k).map(|u| u.text.clone()).unwrap_or_default()
        ));
    }
    if let Some((limits, measures)) = &first {
        for l in limits {
            let m = l.result.measure;
            head.push(format!("{} [{}]", l.result.name, unit_text(m, system)));
            head.push(format!(
                "{} margin [{}]",
                l.result.name,
                margin_unit(m, system).text
            ));
            head.push(format!("{} passed", l.result.name));
            if transient {
                head.push(format!("{} first fails at [s]", l.result.name));
            }
        }
        for m in measures {
            head.push(format!("{} [{}]", m.label, unit_text(m.measure, system)));
        }
    }
    head.push("error".into());
    let mut out = head
        .iter()
        .map(|h| csv_field(h))
        .collect::<Vec<_>>()
        .join(",")
        + "\n";
    for p in &r.points {
        let mut row = vec![csv_field(p.case.as_deref().unwrap_or(""))];
        for (k, (_, q)) in p.values.iter().enumerate() {
            row.push(
                units
                    .0
                    .get(k)
                    .map(|u| u.from_si(q.value))
                    .unwrap_or(q.value)
                    .to_string(),
            );
        }
        match &p.outcome {
            Outcome::Solved { limits, measures } => {
                for l in limits {
                    let m = l.result.measure;
                    let u = display_unit(m.dim(), l.result.kind(), system);
                    row.push(u.from_si(l.result.actual).to_string());
                    row.push(margin_unit(m, system).from_si(l.result.margin).to_string());
                    row.push(l.result.passed.to_string());
                    if transient {
                        row.push(l.first_failure.map(|t| t.to_string()).unwrap_or_default());
                    }
                }
                for m in measures {
                    let kind = if m.measure == Measure::Temperature {
                        caloris_compiler::units::TempKind::Point
                    } else {
                        caloris_compiler::units::TempKind::NotTemperature
                    };
                    row.push(
                        display_unit(m.measure.dim(), kind, system)
                            .from_si(m.value)
                            .to_string(),
                    );
                }
                row.push(String::new());
            }
            Outcome::Failed { messages } => {
                let n = first
                    .as_ref()
                    .map(|(l, m)| l.len() * if transient { 4 } else { 3 } + m.len())
                    .unwrap_or(0);
                row.extend(std::iter::repeat_n(String::new(), n));
                row.push(csv_field(&messages.join("; ")));
            }
        }
        out.push_str(&row.join(","));
        out.push('\n');
    }
    out
}

fn point_json(p: &Point) -> Value {
    let values: Vec<Value> = p
        .values
        .iter()
        .map(|(n, q)| json!({"param": n, "value": q.value, "unit": q.dim.si_unit()}))
        .collect();
    let outcome = match &p.outcome {
        Outcome::Solved { limits, measures } => json!({
            "status": "solved",
            "limits": limits.iter().map(|l| json!({
                "name": l.result.name, "measure": l.result.measure.name(), "subject": l.result.subject, "op": l.result.op, "limit_as_written": l.result.written,
                "value": l.result.actual, "limit": l.result.limit, "unit": l.result.measure.dim().si_unit(),
                "passed": l.result.passed, "margin": l.result.margin,
                "first_failure_s": l.first_failure, "worst_time_s": l.worst_time,
            })).collect::<Vec<_>>(),
            "tracked": measures.iter().map(|m| json!({
                "quantity": m.label, "value": m.value, "unit": m.measure.dim().si_unit(), "min": m.min, "max": m.max,
            })).collect::<Vec<_>>(),
        }),
        Outcome::Failed { messages } => json!({"status": "failed", "errors": messages}),
    };
    json!({"case": p.case, "values": values, "outcome": outcome, "all_limits_pass": p.all_limits_pass()})
}

pub fn json(title: Option<&str>, r: &StudyResult) -> Value {
    json!({
        "title": title,
        "mode": r.mode,
        "axes": r.axes.iter().map(|a| json!({"param": a.param, "values": a.values.iter().map(|q| q.value).collect::<Vec<_>>(), "unit": a.values.first().map(|q| q.dim.si_unit())})).collect::<Vec<_>>(),
        "cases": r.cases,
        "points": r.points.iter().map(point_json).collect::<Vec<_>>(),
        "planned": r.planned,
        "interrupted": r.interrupted,
        "warnings": r.warnings,
        "caution": CAUTION,
    })
}

/// The chart: x is the first parameter given with `--over`.
pub fn chart(title: Option<&str>, r: &StudyResult, units: &AxisUnits, system: UnitSystem) -> Chart {
    let transient = is_transient(r);
    // Curves: one per (case, value of the second parameter).
    let mut keys: Vec<(Option<String>, Option<f64>)> = Vec::new();
    for p in &r.points {
        let key = (p.case.clone(), p.values.get(1).map(|v| v.1.value));
        if !keys.contains(&key) {
            keys.push(key);
        }
    }
    let label = |key: &(Option<String>, Option<f64>)| {
        let mut parts = Vec::new();
        if let Some(c) = &key.0 {
            parts.push(c.clone());
        }
        if let (Some(v), Some(ax)) = (key.1, r.axes.get(1)) {
            let q = Quantity {
                value: v,
                ..ax.values[0]
            };
            parts.push(format!("{} = {}", ax.param, units.show(1, q)));
        }
        if parts.is_empty() {
            "model".to_string()
        } else {
            parts.join(", ")
        }
    };
    let x_of = |p: &Point| {
        p.values
            .first()
            .map(|(_, q)| {
                units
                    .0
                    .first()
                    .map(|u| u.from_si(q.value))
                    .unwrap_or(q.value)
            })
            .unwrap_or(f64::NAN)
    };
    let mut panels = Vec::new();
    type Getter = Box<dyn Fn(&Point) -> Option<f64>>;
    // (heading, axis unit, value getter, limit line)
    let mut quantities: Vec<(String, String, Getter, Option<HLine>)> = Vec::new();
    let sample = r.points.iter().find_map(|p| match &p.outcome {
        Outcome::Solved { limits, measures } => Some((limits.clone(), measures.clone())),
        _ => None,
    });
    let Some((limits, measures)) = sample else {
        return Chart {
            title: title.unwrap_or("Explored").into(),
            x_label: String::new(),
            panels,
            footnote: String::new(),
        };
    };
    for (k, l) in limits.iter().enumerate() {
        let m = l.result.measure;
        let u = display_unit(m.dim(), l.result.kind(), system);
        let what = if transient {
            ", worst over the run"
        } else {
            ""
        };
        let line = HLine {
            label: format!(
                "{}: {} {}",
                l.result.name,
                l.result.op,
                show_measure(m, l.result.limit, system)
            ),
            y: u.from_si(l.result.limit),
        };
        let unit = u.clone();
        quantities.push((
            format!(
                "{}: {}({}){what}",
                l.result.name,
                m.name(),
                l.result.subject
            ),
            u.text.clone(),
            Box::new(move |p: &Point| match &p.outcome {
                Outcome::Solved { limits, .. } => {
                    limits.get(k).map(|l| unit.from_si(l.result.actual))
                }
                _ => None,
            }),
            Some(line),
        ));
        let failure = move |p: &Point| match &p.outcome {
            Outcome::Solved { limits, .. } => limits.get(k).and_then(|l| l.first_failure),
            _ => None,
        };
        let latest = r.points.iter().filter_map(failure).fold(f64::NAN, f64::max);
        if transient && latest.is_finite() {
            let (tu, ts) = time_unit(latest);
            quantities.push((
                format!("{}: time when it first fails", l.result.name),
                tu.to_string(),
                Box::new(move |p: &Point| failure(p).map(|t| t / ts)),
                None,
            ));
        }
    }
    for (k, m) in measures.iter().enumerate() {
        let kind = if m.measure == Measure::Temperature {
            caloris_compiler::units::TempKind::Point
        } else {
            caloris_compiler::units::TempKind::NotTemperature
        };
        let u = display_unit(m.measure.dim(), kind, system);
        let what = if transient {
            ", at the end of the run"
        } else {
            ""
        };
        let unit = u.clone();
        quantities.push((
            format!("{}{what}", m.label),
            u.text.clone(),
            Box::new(move |p: &Point| match &p.outcome {
                Outcome::Solved { measures, .. } => measures.get(k).map(|m| unit.from_si(m.value)),
                _ => None,
            }),
            None,
        ));
    }
    for (heading, y_label, get, line) in quantities {
        let series = keys
            .iter()
            .map(|key| Series {
                label: label(key),
                points: r
                    .points
                    .iter()
                    .filter(|p| (p.case.clone(), p.values.get(1).map(|v| v.1.value)) == *key)
                    .map(|p| (x_of(p), get(p).unwrap_or(f64::NAN)))
                    .collect(),
            })
            .collect();
        panels.push(Panel {
            heading,
            y_label,
            series,
            hlines: line.into_iter().collect(),
            markers: Vec::new(),
        });
    }
    let x_label = r
        .axes
        .first()
        .map(|a| {
            format!(
                "{} [{}]",
                a.param,
                units.0.first().map(|u| u.text.clone()).unwrap_or_default()
            )
        })
        .unwrap_or_default();
    Chart {
        title: title.map(|t| format!("{t} — explored")).unwrap_or_else(|| "Explored".into()),
        x_label,
        panels,
        footnote: "Engineering estimate from the stated model; confirm against local codes and licensed practice where safety depends on it.".into(),
    }
}
