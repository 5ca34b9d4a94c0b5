//! Design studies: one model solved at several parameter values without editing it — a sweep of
//! one or two parameters over a range, the model's named cases, or both — with every design limit
//! evaluated at every point, steady or over a transient run. Each point is a fresh analysis with
//! [`Options::overrides`], so a study sees exactly what `solve` or `run` would for those values; only
//! the sparse factorisation's symbolic analysis is shared between points (`factor_cache`), which
//! gives bit-for-bit the answers of fresh ones.

use crate::analysis::{analyze, Analysis, Options};
use crate::diagnostic::did_you_mean;
use crate::eval::{Evaluator, NameKinds};
use crate::factor_cache::FactorCache;
use crate::limits::{resolve_measure, LimitResult, Measure, Subject};
use crate::parser::parse_expr;
use crate::source::SourceLoader;
use crate::span::{FileId, Span};
use crate::syntax::{ExprKind, Ident};
use crate::transient::probe::Probe;
use crate::transient::run::{run_transient, Hooks, Record, RunOptions};
use crate::units::{Quantity, TempKind};
use serde::Serialize;
use std::sync::atomic::{AtomicBool, Ordering};
use std::sync::Arc;

/// One swept parameter and its values (SI).
#[derive(Clone, Debug, Serialize)]
pub struct Axis {
    pub param: String,
    pub values: Vec<Quantity>,
}

/// Steady solves, or a declared transient run at every point.
#[derive(Clone, Debug, PartialEq, Serialize)]
#[serde(rename_all = "snake_case", tag = "kind", content = "run")]
pub enum Mode {
    Steady,
    Transient(String),
}

/// What to compute.
#[derive(Clone, Debug)]
pub struct Plan {
    /// Zero, one or two swept parameters; points are every combination.
    pub axes: Vec<Axis>,
    /// Names of declared cases; empty for the model as written.
    pub cases: Vec<String>,
    pub mode: Mode,
    /// Extra quantities to report, written like a limit's measure: `temperature(tank.surface)`.
    pub measures: Vec<String>,
    /// Parameter values applied at every point (after the case, before the swept values).
    pub settings: Vec<(String, Quantity)>,
}

#[derive(Clone, Debug, Serialize)]
pub struct PointLimit {
    pub result: LimitResult,
    /// Transient: when the limit first fails, s from the run's start.
    pub first_failure: Option<f64>,
    /// Transient: when the worst value occurs.
    pub worst_time: Option<f64>,
}

#[derive(Clone, Debug, Serialize)]
pub struct PointMeasure {
    pub label: String,
    pub measure: Measure,
    /// SI; for a transient run the value at the end.
    pub value: f64,
    /// Transient temperature measures: lowest and highest over the run.
    pub min: Option<f64>,
    pub max: Option<f64>,
}

#[derive(Clone, Debug, Serialize)]
#[serde(rename_all = "snake_case", tag = "status")]
pub enum Outcome {
    Solved {
        limits: Vec<PointLimit>,
        measures: Vec<PointMeasure>,
    },
    /// The model has errors for these values (a thickness of zero), or the run failed.
    Failed { messages: Vec<String> },
}

#[derive(Clone, Debug, Serialize)]
pub struct Point {
    pub case: Option<String>,
    /// The swept values at this point, in axis order.
    pub values: Vec<(String, Quantity)>,
    pub outcome: Outcome,
}

impl Point {
    pub fn all_limits_pass(&self) -> bool {
        match &self.outcome {
            Outcome::Solved { limits, .. } => limits.iter().all(|l| l.result.passed),
            Outcome::Failed { .. } => false,
        }
    }
}

#[derive(Clone, Debug, Serialize)]
pub struct StudyResult {
    pub mode: Mode,
    pub axes: Vec<Axis>,
    pub cases: Vec<String>,
    pub measures: Vec<String>,
    pub limits: Vec<String>,
    pub points: Vec<Point>,
    /// Points planned (all combinations); fewer are present when interrupted.
    pub planned: usize,
    pub interrupted: bool,
    /// The model's warnings over all points, once each.
    pub warnings: Vec<crate::study_warnings::StudyWarning>,
}

/// Why a study could not start.
pub enum StudyError {
    /// The model as written has errors; nothing was computed.
    Model(Box<Analysis>),
    /// The study's own request does not fit the model (an unknown parameter, a wrong unit).
    Request(String),
}

/// Ways to follow and stop a study.
#[derive(Default)]
pub struct StudyHooks<'a> {
    pub cancel: Option<&'a AtomicBool>,
    /// Called with (points done, points planned) after each point.
    pub progress: Option<&'a mut dyn FnMut(usize, usize)>,
}

struct NoNames;
impl NameKinds for NoNames {
    fn kind_of(&self, _: &str) -> Option<&'static str> {
        None
    }
}

/// A value written as in a model, `60 mm`, `-8 °C`, `0.3 W/(m^2*K)`, in SI.
pub fn parse_value(text: &str) -> Result<Quantity, String> {
    let e = parse_expr(text.trim(), FileId(0))
        .map_err(|d| format!("cannot read `{}`: {}", text.trim(), d.message))?;
    let mut ev = Evaluator::new(std::iter::empty());
    match ev.eval(&e, &NoNames) {
        Some(q) if ev.diags.is_empty() => Ok(q),
        _ => Err(format!(
            "cannot read `{}`: {}",
            text.trim(),
            ev.diags
                .first()
                .map(|d| d.message.clone())
                .unwrap_or_default()
        )),
    }
}

/// `NAME=VALUE`.
pub fn parse_setting(text: &str) -> Result<(String, Quantity), String> {
    let (name, value) = text
        .split_once('=')
        .ok_or_else(|| format!("`{text}`: write NAME=VALUE, e.g. `t_out=-8°C`"))?;
    Ok((name.trim().to_string(), parse_value(value)?))
}

/// `NAME=FROM..TO` (11 points), `NAME=FROM..TO:N` (N points, ends included) or
/// `NAME=V1,V2,...`.
pub fn parse_sweep(text: &str) -> Result<Axis, String> {
    let (name, spec) = text
        .split_once('=')
        .ok_or_else(|| format!("`{text}`: write NAME=FROM..TO:N, e.g. `jacket=25mm..150mm:6`"))?;
    let name = name.trim().to_string();
    let values = if let Some((from, rest)) = spec.split_once("..") {
        let (to, count) = match rest.rsplit_once(':') {
            Some((to, n)) => (
                to,
                n.trim()
                    .parse::<usize>()
                    .map_err(|_| format!("`{}` is not a number of points", n.trim()))?,
            ),
            None => (rest, 11),
        };
        if !(2..=10_000).contains(&count) {
            return Err(format!("a range needs from 2 to 10000 points, not {count}"));
        }
        let (a, b) = (parse_value(from)?, parse_value(to)?);
        if a.dim != b.dim {
            return Err(format!(
                "`{}` and `{}` are different kinds of quantity ({} and {})",
                from.trim(),
                to.trim(),
                a.dim.describe(),
                b.dim.describe()
            ));
        }
        let kind = if a.kind == TempKind::Point || b.kind == TempKind::Point {
            TempKind::Point
        } else {
            a.kind
        };
        (0..count)
            .map(|i| Quantity {
                value: a.value + (b.value - a.value) * i as f64 / (count - 1) as f64,
                dim: a.dim,
                kind,
            })
            .collect()
    } else {
        let v: Vec<Quantity> = spec.split(',').map(parse_value).collect::<Result<_, _>>()?;
        if let Some(d) = v.iter().find(|q| q.dim != v[0].dim) {
            return Err(format!(
                "the values of `{name}` mix {} and {}",
                v[0].dim.describe(),
                d.dim.describe()
            ));
        }
        v
    };
    Ok(Axis {
        param: name,
        values,
    })
}

fn check_param(a: &Analysis, name: &str, q: Quantity) -> Result<(), String> {
    let Some((_, base)) = a.params.iter().find(|(n, _)| n == name) else {
        let hint = did_you_mean(name, a.params.iter().map(|(n, _)| n.as_str()))
            .map(|s| format!("; did you mean `{s}`?"))
            .unwrap_or_default();
        return Err(format!("the model has no parameter `{name}`{hint}"));
    };
    let Some(base) = base else { return Ok(()) };
    if base.dim != q.dim {
        return Err(format!(
            "parameter `{name}` is {}; the value given is {}",
            base.dim.describe(),
            q.dim.describe()
        ));
    }
    let clash = matches!(
        (base.kind, q.kind),
        (TempKind::Point, TempKind::Difference) | (TempKind::Difference, TempKind::Point)
    );
    if clash {
        return Err(format!(
            "parameter `{name}` is {}; write the value the same way",
            if base.kind == TempKind::Point {
                "a temperature on a scale (°C, °F, K)"
            } else {
                "a temperature difference (K, Δ°C)"
            }
        ));
    }
    Ok(())
}

/// `measure(subject)` against a network.
fn resolve(a: &Analysis, text: &str) -> Result<(Measure, Subject), String> {
    let e = parse_expr(text.trim(), FileId(0)).map_err(|d| format!("`{text}`: {}", d.message))?;
    let ExprKind::Call { func, args } = e.kind else {
        return Err(format!(
            "`{text}`: write MEASURE(SUBJECT), e.g. `temperature(water)`"
        ));
    };
    let [arg] = args.as_slice() else {
        return Err(format!("`{text}`: a measure takes one node or link"));
    };
    let ExprKind::Name(subject) = &arg.kind else {
        return Err(format!("`{text}`: name a node or link"));
    };
    let mut symbols = a.symbols.clone();
    resolve_measure(
        &Ident {
            name: func.name.clone(),
            span: Span::default(),
        },
        subject,
        &a.network,
        &mut symbols,
    )
    .map_err(|d| {
        format!(
            "`{text}`: {}",
            d.map(|d| d.message)
                .unwrap_or_else(|| "not usable here".into())
        )
    })
}

/// Check the plan against the model as written, then solve every point in order (cases outer,
/// then the first axis, then the second). A cancelled study returns the points done so far.
pub fn run_study(
    name: &str,
    text: &str,
    loader: &dyn SourceLoader,
    plan: &Plan,
    mut hooks: StudyHooks,
) -> Result<StudyResult, StudyError> {
    let base = analyze(
        name,
        text,
        loader,
        &Options {
            check_only: true,
            ..Options::default()
        },
    );
    if base.has_errors() {
        return Err(StudyError::Model(Box::new(base)));
    }
    if plan.axes.len() > 2 {
        return Err(StudyError::Request(
            "at most two parameters may be given with --over".into(),
        ));
    }
    for ax in &plan.axes {
        for q in &ax.values {
            check_param(&base, &ax.param, *q).map_err(StudyError::Request)?;
        }
    }
    if plan.axes.len() == 2 && plan.axes[0].param == plan.axes[1].param {
        return Err(StudyError::Request(format!(
            "`{}` is swept twice",
            plan.axes[0].param
        )));
    }
    for (n, q) in &plan.settings {
        check_param(&base, n, *q).map_err(StudyError::Request)?;
    }
    let mut case_overrides = Vec::new();
    for c in &plan.cases {
        match base.studies.case(c) {
            Some(spec) => case_overrides.push((Some(c.clone()), spec.overrides.clone())),
            None => {
                let known: Vec<&str> = base.studies.cases.iter().map(|c| c.name.as_str()).collect();
                let hint = match did_you_mean(c, known.iter().copied()) {
                    Some(s) => format!("; did you mean `{s}`?"),
                    None if known.is_empty() => "; the model declares no `case`".to_string(),
                    None => format!("; the model's cases are {}", known.join(", ")),
                };
                return Err(StudyError::Request(format!("no case `{c}`{hint}")));
            }
        }
    }
    if case_overrides.is_empty() {
        case_overrides.push((None, Vec::new()));
    }
    if let Mode::Transient(run) = &plan.mode {
        if base.studies.run(run).is_none() {
            return Err(StudyError::Request(format!(
                "the model declares no transient run `{run}`"
            )));
        }
    }
    for m in &plan.measures {
        resolve(&base, m).map_err(StudyError::Request)?;
    }
    if plan.measures.is_empty() && base.limits.is_empty() {
        return Err(StudyError::Request("the model states no limits; name what to report with `--track`, e.g. `--track temperature(node)`".into()));
    }

    let first: Vec<Option<Quantity>> = plan
        .axes
        .first()
        .map(|a| a.values.iter().copied().map(Some).collect())
        .unwrap_or_else(|| vec![None]);
    let second: Vec<Option<Quantity>> = plan
        .axes
        .get(1)
        .map(|a| a.values.iter().copied().map(Some).collect())
        .unwrap_or_else(|| vec![None]);
    let planned = case_overrides.len() * first.len() * second.len();
    // Points usually differ only in values, so the sparse factorisation's symbolic analysis is
    // made once and reused while the pattern stays the same.
    let factor_cache = Arc::new(FactorCache::default());
    let mut result = StudyResult {
        mode: plan.mode.clone(),
        axes: plan.axes.clone(),
        cases: plan.cases.clone(),
        measures: plan.measures.clone(),
        limits: base.limits.iter().map(|l| l.name.clone()).collect(),
        points: Vec::new(),
        planned,
        interrupted: false,
        warnings: Vec::new(),
    };
    'all: for (case, co) in &case_overrides {
        for v1 in &first {
            for v2 in &second {
                if hooks.cancel.is_some_and(|c| c.load(Ordering::Relaxed)) {
                    result.interrupted = true;
                    break 'all;
                }
                let mut values = Vec::new();
                for (ax, v) in plan.axes.iter().zip([v1, v2]) {
                    if let Some(v) = v {
                        values.push((ax.param.clone(), *v));
                    }
                }
                let mut overrides = co.clone();
                overrides.extend(plan.settings.iter().cloned());
                overrides.extend(values.iter().cloned());
                let outcome = point(
                    name,
                    text,
                    loader,
                    plan,
                    overrides,
                    Shared {
                        cancel: hooks.cancel,
                        factor_cache: &factor_cache,
                    },
                    &mut result.warnings,
                );
                if hooks.cancel.is_some_and(|c| c.load(Ordering::Relaxed)) {
                    // A point cut short is not a result.
                    result.interrupted = true;
                    break 'all;
                }
                result.points.push(Point {
                    case: case.clone(),
                    values,
                    outcome,
                });
                if let Some(p) = hooks.progress.as_mut() {
                    p(result.points.len(), planned);
                }
            }
        }
    }
    Ok(result)
}

/// What every point of one study shares.
#[derive(Clone, Copy)]
struct Shared<'a> {
    cancel: Option<&'a AtomicBool>,
    factor_cache: &'a Arc<FactorCache>,
}

fn point(
    name: &str,
    text: &str,
    loader: &dyn SourceLoader,
    plan: &Plan,
    overrides: Vec<(String, Quantity)>,
    shared: Shared,
    warnings: &mut Vec<crate::study_warnings::StudyWarning>,
) -> Outcome {
    let Shared {
        cancel,
        factor_cache,
    } = shared;
    let transient = matches!(plan.mode, Mode::Transient(_));
    let a = analyze(
        name,
        text,
        loader,
        &Options {
            check_only: transient,
            overrides,
            factor_cache: Some(factor_cache.clone()),
            ..Options::default()
        },
    );
    crate::study_warnings::collect(warnings, &a);
    if a.has_errors() {
        return Outcome::Failed {
            messages: a
                .diagnostics
                .iter()
                .filter(|d| d.is_error())
                .map(|d| format!("{} {}", d.code, d.message))
                .collect(),
        };
    }
    let measures: Vec<(String, Measure, Subject)> = plan
        .measures
        .iter()
        .filter_map(|m| {
            resolve(&a, m)
                .ok()
                .map(|(me, s)| (m.trim().to_string(), me, s))
        })
        .collect();
    match &plan.mode {
        Mode::Steady => {
            let Some(sol) = &a.solution else {
                return Outcome::Failed {
                    messages: a
                        .diagnostics
                        .iter()
                        .map(|d| format!("{} {}", d.code, d.message))
                        .collect(),
                };
            };
            Outcome::Solved {
                limits: sol
                    .limits
                    .iter()
                    .map(|l| PointLimit {
                        result: l.clone(),
                        first_failure: None,
                        worst_time: None,
                    })
                    .collect(),
                measures: measures
                    .into_iter()
                    .map(|(label, m, s)| PointMeasure {
                        label,
                        measure: m,
                        value: sol.measure(&a.network, m, s),
                        min: None,
                        max: None,
                    })
                    .collect(),
            }
        }
        Mode::Transient(run) => {
            let Some(spec) = a.studies.run(run) else {
                return Outcome::Failed {
                    messages: vec![format!("no transient run `{run}`")],
                };
            };
            let options = RunOptions {
                record: Record::Nothing,
                ..RunOptions::default()
            };
            match run_transient(
                &a.network,
                &a.limits,
                spec,
                &options,
                Hooks {
                    cancel,
                    progress: None,
                },
            ) {
                Err(e) => Outcome::Failed {
                    messages: vec![e.to_string()],
                },
                Ok(r) => {
                    let last: Vec<f64> = r.nodes.iter().map(|n| n.last).collect();
                    Outcome::Solved {
                        limits: r
                            .limits
                            .iter()
                            .map(|l| PointLimit {
                                result: l.result.clone(),
                                first_failure: l.first_failure,
                                worst_time: Some(l.worst_time),
                            })
                            .collect(),
                        measures: measures
                            .into_iter()
                            .map(|(label, m, s)| {
                                let value =
                                    Probe::for_measure(&a.network, m, s).value(&a.network, &last);
                                let (min, max) = match s {
                                    Subject::Node(n) if m == Measure::Temperature => {
                                        (Some(r.nodes[n].min), Some(r.nodes[n].max))
                                    }
                                    _ => (None, None),
                                };
                                PointMeasure {
                                    label,
                                    measure: m,
                                    value,
                                    min,
                                    max,
                                }
                            })
                            .collect(),
                    }
                }
            }
        }
    }
}
