//! Design limits: what they measure, checking them against the network, and their verdicts.

use crate::diagnostic::{did_you_mean, Diagnostic};
use crate::eval::{expect_dim, expect_point};
use crate::network::Network;
use crate::schema::MEASURES;
use crate::source::Sources;
use crate::span::Span;
use crate::symbols::SymbolTable;
use crate::syntax::{CmpOp, Expr, Ident};
use crate::units::{Dim, Quantity, TempKind};
use serde::Serialize;

/// What a limit measures.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Measure {
    Temperature,
    HeatFlow,
    HeatFlux,
    UValue,
    RValue,
}

impl Measure {
    /// Its entry in the schema ([`MEASURES`]): name, dimension, doc.
    fn spec(self) -> Option<&'static crate::schema::MeasureSpec> {
        MEASURES.iter().find(|m| m.measure == self)
    }
    pub fn name(self) -> &'static str {
        self.spec().map(|m| m.name).unwrap_or("")
    }
    pub fn dim(self) -> Dim {
        self.spec().map(|m| m.dim).unwrap_or(Dim::NONE)
    }
}

/// What a limit or a measure refers to.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case", tag = "type", content = "index")]
pub enum Subject {
    Node(usize),
    Link(usize),
    Group(usize),
}

/// A checked limit, ready to evaluate on a solution.
#[derive(Clone, Debug, Serialize)]
pub struct LimitSpec {
    pub name: String,
    pub span: Span,
    pub measure: Measure,
    pub subject_name: String,
    pub subject: Subject,
    pub op: CmpOp,
    /// The limit value in SI (kelvin for temperatures).
    pub value: f64,
    /// The value as the model writes it (`1.2 kWh/d`, `max_surface`), spaces collapsed.
    pub written: String,
}

/// Resolve `measure(subject)` against the network.
pub fn resolve_measure(
    measure: &Ident,
    subject: &Ident,
    net: &Network,
    symbols: &mut SymbolTable,
) -> Result<(Measure, Subject), Option<Diagnostic>> {
    let Some(m) = crate::schema::measure(&measure.name).map(|m| m.measure) else {
        let names = MEASURES.iter().map(|m| m.name);
        let mut d = Diagnostic::error(
            "E401",
            format!("unknown measure `{}`", measure.name),
            measure.span,
        )
        .with_label("not a measure");
        let list = MEASURES
            .iter()
            .map(|m| format!("`{}`", m.name))
            .collect::<Vec<_>>()
            .join(", ");
        d = match did_you_mean(&measure.name, names) {
            Some(s) => d
                .with_help(format!("did you mean `{s}`? Measures are {list}"))
                .with_fix(format!("Replace with `{s}`"), measure.span, s),
            None => d.with_help(format!("measures are {list}")),
        };
        return Err(Some(d));
    };
    let node = net.node_id(&subject.name);
    let group = net.group_id(&subject.name);
    let link = net.link_id(&subject.name);
    let found = match m {
        Measure::Temperature => node.map(Subject::Node),
        Measure::HeatFlow => group.map(Subject::Group).or(link.map(Subject::Link)),
        Measure::HeatFlux | Measure::UValue | Measure::RValue => group
            .filter(|&g| net.groups[g].area.is_some())
            .map(Subject::Group)
            .or(link
                .filter(|&l| net.links[l].area.is_some())
                .map(Subject::Link)),
    };
    if let Some(s) = found {
        symbols.add_ref(&subject.name, subject.span);
        return Ok((m, s));
    }
    // Explain why not.
    if symbols.get(&subject.name).is_none() && node.is_none() && link.is_none() && group.is_none() {
        let known: Vec<&str> = net
            .nodes
            .iter()
            .map(|n| n.name.as_str())
            .chain(net.links.iter().map(|l| l.name.as_str()))
            .collect();
        let mut d = Diagnostic::error(
            "E102",
            format!("unknown name `{}`", subject.name),
            subject.span,
        )
        .with_label("no node or link has this name");
        if let Some(s) = did_you_mean(&subject.name, known) {
            d = d.with_help(format!("did you mean `{s}`?")).with_fix(
                format!("Replace with `{s}`"),
                subject.span,
                s,
            );
        }
        // A link whose declaration failed is already reported; say nothing more then.
        return Err(Some(d));
    }
    if symbols.get(&subject.name).is_some() && node.is_none() && link.is_none() && group.is_none() {
        let sym = symbols.get(&subject.name).map(|s| s.kind);
        if matches!(
            sym,
            Some(crate::symbols::SymbolKind::Node | crate::symbols::SymbolKind::Link)
        ) {
            return Err(None);
        }
    }
    let what = match m {
        Measure::Temperature => "a node",
        Measure::HeatFlow => "a link",
        _ => "a link with an area (layer, film, contact or a build-up)",
    };
    let is = if node.is_some() {
        "a node"
    } else if link.is_some() || group.is_some() {
        "a link without an area"
    } else {
        symbols
            .get(&subject.name)
            .map(|s| s.kind.article())
            .unwrap_or("something else")
    };
    let is = if m == Measure::Temperature && (link.is_some() || group.is_some()) {
        "a link"
    } else {
        is
    };
    Err(Some(
        Diagnostic::error("E402", format!("`{}` needs {what}; `{}` is {is}", measure.name, subject.name), subject.span)
            .with_label(format!("{is} here"))
            .with_help(match m {
                Measure::Temperature => "name a node, e.g. a build-up's surface node `wall.inside`".to_string(),
                _ => "name a link; `resistance` and `conductance` links have no area, so no flux or U-value".to_string(),
            }),
    ))
}

#[allow(clippy::too_many_arguments)]
pub fn check_limit(
    name: &Ident,
    measure: &Ident,
    subject: &Ident,
    op: CmpOp,
    value: &Expr,
    q: Option<Quantity>,
    net: &Network,
    symbols: &mut SymbolTable,
    sources: &Sources,
) -> Result<LimitSpec, Option<Diagnostic>> {
    let (m, s) = resolve_measure(measure, subject, net, symbols)?;
    let q = q.ok_or(None)?;
    let src = sources.text(value.span.file);
    expect_dim(q, m.dim(), &format!("a `{}` limit", m.name()), value, src).map_err(Some)?;
    if m == Measure::Temperature {
        expect_point(q, "a temperature limit", value).map_err(Some)?;
    }
    Ok(LimitSpec {
        name: name.name.clone(),
        span: name.span,
        measure: m,
        subject_name: subject.name.clone(),
        subject: s,
        op,
        value: q.value,
        written: src
            .get(value.span.range())
            .unwrap_or_default()
            .split_whitespace()
            .collect::<Vec<_>>()
            .join(" "),
    })
}

/// Whether two texts write the same number in the same unit, whatever the spelling
/// (`0.30 W/(m^2*K)` and `0.3 W/(m²·K)`), so that a report does not repeat it.
fn same_quantity_text(a: &str, b: &str) -> bool {
    fn split(s: &str) -> Option<(f64, String)> {
        let s = s.trim();
        let end = s
            .char_indices()
            .find(|&(i, c)| {
                !(c.is_ascii_digit() || c == '.' || c == '-' || (i > 0 && matches!(c, 'e' | 'E')))
            })
            .map_or(s.len(), |(i, _)| i);
        let value: f64 = s[..end].parse().ok()?;
        let unit: String = s[end..]
            .replace("^2", "²")
            .replace("^3", "³")
            .replace(['*', '.'], "·")
            .chars()
            .filter(|c| !c.is_whitespace())
            .collect();
        Some((value, unit))
    }
    match (split(a), split(b)) {
        (Some((x, u)), Some((y, v))) => u == v && (x - y).abs() <= 1e-9 * x.abs().max(y.abs()),
        _ => false,
    }
}

/// The verdict of one limit on a solution.
#[derive(Clone, Debug, Serialize)]
pub struct LimitResult {
    pub name: String,
    pub measure: Measure,
    pub subject: String,
    pub op: &'static str,
    /// Actual value, SI.
    pub actual: f64,
    /// The limit, SI.
    pub limit: f64,
    pub passed: bool,
    /// How far inside the limit the value is (negative when it fails), SI; a temperature
    /// margin is a difference in kelvin.
    pub margin: f64,
    /// The margin as a percentage of the limit: 100·margin/|limit|, the limit of a temperature
    /// taken in kelvin so the figure does not depend on the scale it was written in; NaN for a
    /// limit of zero.
    pub margin_percent: f64,
    /// The limit as the model writes it (`1.2 kWh/d`).
    pub written: String,
    pub span: Span,
}

impl LimitResult {
    /// The limit for a report that shows it as `shown` (`50 W`): with the model's own writing
    /// first when that says something else (`1.2 kWh/d (50 W)`, `max_surface (60 °C)`), so a
    /// reviewer finds the number they wrote.
    pub fn limit_text(&self, shown: &str) -> String {
        if self.written.is_empty() || same_quantity_text(&self.written, shown) {
            format!("{} {shown}", self.op)
        } else {
            format!("{} {} ({shown})", self.op, self.written)
        }
    }

    /// Kind for displaying actual and limit values.
    pub fn kind(&self) -> TempKind {
        if self.measure == Measure::Temperature {
            TempKind::Point
        } else {
            TempKind::NotTemperature
        }
    }
    pub fn margin_kind(&self) -> TempKind {
        if self.measure == Measure::Temperature {
            TempKind::Difference
        } else {
            TempKind::NotTemperature
        }
    }
}

pub fn verdict(spec: &LimitSpec, actual: f64) -> LimitResult {
    let margin = if spec.op.is_upper() {
        spec.value - actual
    } else {
        actual - spec.value
    };
    let passed = match spec.op {
        CmpOp::Lt => actual < spec.value,
        CmpOp::Le => actual <= spec.value,
        CmpOp::Gt => actual > spec.value,
        CmpOp::Ge => actual >= spec.value,
    };
    LimitResult {
        name: spec.name.clone(),
        measure: spec.measure,
        subject: spec.subject_name.clone(),
        op: spec.op.symbol(),
        actual,
        limit: spec.value,
        passed,
        margin,
        margin_percent: if spec.value == 0.0 {
            f64::NAN
        } else {
            100.0 * margin / spec.value.abs()
        },
        written: spec.written.clone(),
        span: spec.span,
    }
}

#[cfg(test)]
mod written_limits {
    use super::*;

    fn result(written: &str) -> LimitResult {
        LimitResult {
            name: "standby_loss".into(),
            measure: Measure::HeatFlow,
            subject: "wall".into(),
            op: "<=",
            actual: 70.9,
            limit: 50.0,
            passed: false,
            margin: -20.9,
            margin_percent: -41.8,
            written: written.into(),
            span: Span::default(),
        }
    }

    #[test]
    fn a_limit_written_in_another_unit_is_shown_as_written_too() {
        assert_eq!(
            result("1.2 kWh/d").limit_text("50 W"),
            "<= 1.2 kWh/d (50 W)"
        );
        assert_eq!(result("max_loss").limit_text("50 W"), "<= max_loss (50 W)");
        // 60 °C in a US report.
        assert_eq!(result("60 °C").limit_text("140 °F"), "<= 60 °C (140 °F)");
    }

    #[test]
    fn the_same_quantity_in_another_spelling_is_not_repeated() {
        assert_eq!(result("50 W").limit_text("50 W"), "<= 50 W");
        assert_eq!(
            result("0.30 W/(m^2*K)").limit_text("0.3 W/(m²·K)"),
            "<= 0.3 W/(m²·K)"
        );
        assert_eq!(result("").limit_text("50 W"), "<= 50 W");
    }
}
