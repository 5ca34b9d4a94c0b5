//! `caloris run`: a transient run of a model, with the run's settings from its `transient`
//! declaration, adjustable from the command line, and a case or parameter values applied.

use crate::progress::{catch_interrupt, stop_requested, Progress, STOP};
use crate::{
    colour_on, exit, loader, parse_settings, plot, read_model, run_report, usage, Format, Units,
};
use caloris_compiler::render::render_diagnostics;
use caloris_compiler::study::parse_value;
use caloris_compiler::transient::model::RunSpec;
use caloris_compiler::transient::{run_transient, Hooks, Record, RunOptions};
use caloris_compiler::units::{Dim, Quantity, TempKind};
use caloris_compiler::{analyze, Analysis, Diagnostic, Options};
use std::io::IsTerminal;
use std::path::{Path, PathBuf};

/// `caloris run` arguments.
#[derive(clap::Args)]
pub struct RunCli {
    /// Model file (`-` reads standard input).
    file: PathBuf,
    /// Which `transient` declaration to run (needed when the model has several).
    #[arg(long)]
    run: Option<String>,
    /// Replace the run's duration, e.g. `12h`.
    #[arg(long)]
    duration: Option<String>,
    /// Use a fixed step, e.g. `30s` (the default is the automatic step).
    #[arg(long)]
    step: Option<String>,
    /// Report every so often, e.g. `--every 15min` (the model's `output` interval otherwise).
    #[arg(long, value_name = "INTERVAL")]
    every: Option<String>,
    /// Report at these times instead, e.g. `--at 30min,2h,5.5h` (the start and end are always
    /// reported).
    #[arg(long, value_name = "TIMES")]
    at: Option<String>,
    /// Local error allowed per automatic step, e.g. `0.01K`.
    #[arg(long)]
    tolerance: Option<String>,
    /// Apply a case declared in the model.
    #[arg(long)]
    case: Option<String>,
    /// Set a parameter, e.g. `--set t_out=-12°C` (repeatable).
    #[arg(long, value_name = "NAME=VALUE")]
    set: Vec<String>,
    /// Report every time a node passes a temperature, e.g. `--cross water=0°C` (repeatable).
    #[arg(long, value_name = "NODE=TEMPERATURE")]
    cross: Vec<String>,
    /// Nodes to show (comma-separated, or `all`); the default is the nodes that store heat,
    /// scheduled boundaries and limit subjects.
    #[arg(long)]
    nodes: Option<String>,
    /// Output format.
    #[arg(long, value_enum, default_value_t = Format::Table)]
    format: Format,
    /// Unit system of the report.
    #[arg(long, value_enum, default_value_t = Units::Si)]
    units: Units,
    /// Also write a temperature–time chart as SVG.
    #[arg(long, value_name = "FILE.svg")]
    plot: Option<PathBuf>,
}

/// Analyse with overrides; print diagnostics; `None` (after printing) when the model has errors.
pub fn analyse(
    name: &str,
    text: &str,
    file: &Path,
    overrides: Vec<(String, Quantity)>,
    quiet_warnings: bool,
) -> Option<Analysis> {
    let loader = loader::FsLoader::for_model(file);
    let a = analyze(
        name,
        text,
        &loader,
        &Options {
            check_only: true,
            overrides,
            ..Options::default()
        },
    );
    let colour = colour_on(std::io::stderr().is_terminal());
    let shown: Vec<Diagnostic> = a
        .diagnostics
        .iter()
        .filter(|d| d.is_error() || !quiet_warnings)
        .cloned()
        .collect();
    eprint!("{}", render_diagnostics(&shown, &a.sources, colour));
    if a.has_errors() {
        let n = a.diagnostics.iter().filter(|d| d.is_error()).count();
        eprintln!(
            "{name}: {n} error{} — nothing was run",
            if n == 1 { "" } else { "s" }
        );
        return None;
    }
    Some(a)
}

fn time_arg(text: &Option<String>, what: &str) -> Result<Option<f64>, String> {
    let Some(t) = text else { return Ok(None) };
    let q = parse_value(t)?;
    if q.dim != Dim::TIME || q.value <= 0.0 {
        return Err(format!(
            "--{what} expects a positive time such as `12h` or `30min`, not `{t}`"
        ));
    }
    Ok(Some(q.value))
}

/// The run to do: the model's (by name, or its only one) with command-line changes.
fn run_spec(a: &Analysis, args: &RunCli) -> Result<RunSpec, String> {
    let runs = &a.studies.runs;
    let mut spec = match (&args.run, runs.len()) {
        (Some(name), _) => a.studies.run(name).cloned().ok_or_else(|| {
            let names: Vec<&str> = runs.iter().map(|r| r.name.as_str()).collect();
            if names.is_empty() {
                format!("the model declares no transient run `{name}`")
            } else {
                format!(
                    "no transient run `{name}`; the model declares {}",
                    names.join(", ")
                )
            }
        })?,
        (None, 1) => runs[0].clone(),
        (None, 0) => RunSpec {
            name: "command line".into(),
            span: Default::default(),
            duration: 0.0,
            step: None,
            output: None,
            tolerance: None,
            start: 0.0,
        },
        (None, _) => {
            let names: Vec<&str> = runs.iter().map(|r| r.name.as_str()).collect();
            return Err(format!(
                "the model declares several transient runs ({}); choose one with --run",
                names.join(", ")
            ));
        }
    };
    if let Some(d) = time_arg(&args.duration, "duration")? {
        spec.duration = d;
    }
    if spec.duration <= 0.0 {
        return Err("the model declares no transient run; add `transient NAME (duration = ...)` or give --duration".into());
    }
    if let Some(s) = time_arg(&args.step, "step")? {
        spec.step = Some(s);
    }
    if let Some(o) = time_arg(&args.every, "every")? {
        spec.output = Some(o);
    }
    if let Some(t) = &args.tolerance {
        let q = parse_value(t)?;
        if q.dim != Dim::TEMPERATURE || q.kind == TempKind::Point || q.value <= 0.0 {
            return Err(format!(
                "--tolerance expects a positive temperature difference such as `0.01K`, not `{t}`"
            ));
        }
        spec.tolerance = Some(q.value);
    }
    if let Some(o) = spec.output {
        if spec.duration / o > caloris_compiler::transient::MAX_OUTPUTS as f64 {
            return Err(format!(
                "reporting every {o} s would report the run more than {} times; give a longer --every",
                caloris_compiler::transient::MAX_OUTPUTS
            ));
        }
    }
    if let Some(h) = spec.step {
        if spec.duration / h > caloris_compiler::transient::MAX_STEPS as f64 {
            return Err(format!(
                "a step of {h} s needs more than {} steps",
                caloris_compiler::transient::MAX_STEPS
            ));
        }
    }
    Ok(spec)
}

/// Nodes named in a comma-separated list, or `all`.
pub fn node_list(a: &Analysis, text: &str) -> Result<Vec<usize>, String> {
    if text.trim() == "all" {
        return Ok((0..a.network.nodes.len()).collect());
    }
    text.split(',')
        .map(|n| {
            let n = n.trim();
            a.network.node_id(n).ok_or_else(|| {
                let hint = caloris_compiler::diagnostic::did_you_mean(
                    n,
                    a.network.nodes.iter().map(|x| x.name.as_str()),
                )
                .map(|s| format!("; did you mean `{s}`?"))
                .unwrap_or_default();
                format!("no node `{n}`{hint}")
            })
        })
        .collect()
}

/// The nodes worth showing by default: those that store heat, scheduled boundaries and limit
/// subjects (at most eight), or every free node when there are none of those.
pub fn default_nodes(a: &Analysis) -> Vec<usize> {
    let net = &a.network;
    let mut v: Vec<usize> = Vec::new();
    let mut push = |n: usize| {
        if !v.contains(&n) {
            v.push(n);
        }
    };
    for c in &net.dynamics.capacities {
        push(c.node);
    }
    for l in &a.limits {
        if let caloris_compiler::limits::Subject::Node(n) = l.subject {
            push(n);
        }
    }
    for b in &net.dynamics.bindings {
        push(b.node);
    }
    if v.is_empty() {
        v = (0..net.nodes.len())
            .filter(|&i| net.nodes[i].fixed.is_none())
            .collect();
    }
    v.sort_unstable();
    v.truncate(8);
    v
}

pub fn run(args: RunCli) -> u8 {
    let (name, text) = match read_model(&args.file) {
        Ok(v) => v,
        Err(msg) => return usage(msg),
    };
    let settings = match parse_settings(&args.set) {
        Ok(v) => v,
        Err(e) => return usage(e),
    };
    let Some(mut a) = analyse(&name, &text, &args.file, settings.clone(), false) else {
        return exit::MODEL_ERROR;
    };
    if let Err(e) = settings
        .iter()
        .try_for_each(|(n, q)| check_setting(&a, n, *q))
    {
        return usage(e);
    }
    if let Some(case) = &args.case {
        let Some(spec) = a.studies.case(case) else {
            let names: Vec<&str> = a.studies.cases.iter().map(|c| c.name.as_str()).collect();
            return usage(if names.is_empty() {
                format!("no case `{case}`: the model declares none")
            } else {
                format!(
                    "no case `{case}`; the model's cases are {}",
                    names.join(", ")
                )
            });
        };
        let mut overrides = spec.overrides.clone();
        overrides.extend(settings);
        a = match analyse(&name, &text, &args.file, overrides, true) {
            Some(a) => a,
            None => return exit::MODEL_ERROR,
        };
    }
    let units = args.units.system_for(&a);
    let spec = match run_spec(&a, &args) {
        Ok(s) => s,
        Err(e) => return usage(e),
    };
    let mut crossings = Vec::new();
    for c in &args.cross {
        let Some((node, level)) = c.split_once('=') else {
            return usage(format!(
                "--cross `{c}`: write NODE=TEMPERATURE, e.g. `water=0°C`"
            ));
        };
        let ids = match node_list(&a, node) {
            Ok(v) => v,
            Err(e) => return usage(format!("--cross: {e}")),
        };
        let q = match parse_value(level) {
            Ok(q) if q.dim == Dim::TEMPERATURE && q.kind != TempKind::Difference => q,
            Ok(_) => {
                return usage(format!(
                    "--cross `{c}`: the level must be a temperature such as `0°C`"
                ))
            }
            Err(e) => return usage(format!("--cross {e}")),
        };
        crossings.extend(ids.into_iter().map(|id| (id, q.value)));
    }
    let shown = match &args.nodes {
        Some(list) => match node_list(&a, list) {
            Ok(v) => v,
            Err(e) => return usage(format!("--nodes: {e}")),
        },
        None => default_nodes(&a),
    };
    let record = match args.format {
        Format::Table if args.plot.is_none() => Record::Nodes(shown.clone()),
        _ if args.nodes.is_some() => Record::Nodes(shown.clone()),
        _ => Record::All,
    };
    catch_interrupt();
    let mut progress = Progress::new(format!("run `{}`", spec.name));
    let mut on_progress = |t: f64, d: f64| progress.update(t, d);
    let times = match &args.at {
        Some(list) => match list
            .split(',')
            .map(|t| time_arg(&Some(t.trim().to_string()), "at"))
            .collect::<Result<Vec<_>, _>>()
        {
            Ok(v) => Some(v.into_iter().flatten().collect()),
            Err(e) => return usage(e),
        },
        None => None,
    };
    let options = RunOptions {
        record,
        crossings,
        times,
        ..RunOptions::default()
    };
    let outcome = run_transient(
        &a.network,
        &a.limits,
        &spec,
        &options,
        Hooks {
            cancel: Some(&STOP),
            progress: Some(&mut on_progress),
        },
    );
    progress.finish();
    let r = match outcome {
        Ok(r) => r,
        Err(e) => {
            let d = match e {
                // Radiation and k(T) links: Newton's method at a step or at the start failed,
                // or a k(T) left the range where it is positive.
                caloris_compiler::transient::RunError::NoConvergence { .. }
                | caloris_compiler::transient::RunError::SteadyStart(_)
                | caloris_compiler::transient::RunError::NonPhysicalConductivity { .. }
                | caloris_compiler::transient::RunError::FilmOutOfRange { .. } => {
                    let help = if matches!(e, caloris_compiler::transient::RunError::FilmOutOfRange { .. }) {
                        "no temperatures are reported; the computed film's fluid left the temperatures its properties hold for: check the schedules, loads and initial temperatures, or state the film's h with `film(h = …)`"
                    } else if matches!(
                        e,
                        caloris_compiler::transient::RunError::NoConvergence { .. }
                            | caloris_compiler::transient::RunError::SteadyStart(
                                caloris_compiler::nonlinear::NewtonError::NoConvergence { .. }
                            )
                    ) {
                        "no temperatures are reported; with a fixed `step`, shorten it or leave it out for the automatic step (which shortens steps until Newton's method converges); otherwise check the radiation and k(T) links for values far from the rest of the network"
                    } else {
                        "no temperatures are reported; the linear k(T) is extrapolated beyond where it holds: use a `table(...)` of measured points (it holds its end values) or a smaller `k_slope`"
                    };
                    Diagnostic::error("E707", format!("transient run `{}` failed: {e}", spec.name), spec.span)
                        .with_label("this run")
                        .with_help(help)
                }
                _ => Diagnostic::error("E706", format!("transient run `{}` failed: {e}", spec.name), spec.span)
                    .with_label("this run")
                    .with_help("check for extreme capacity or conductance values; a fixed `step` that is very short or long can also be the cause"),
            };
            eprint!(
                "{}",
                render_diagnostics(&[d], &a.sources, colour_on(std::io::stderr().is_terminal()))
            );
            return exit::MODEL_ERROR;
        }
    };
    let out = match args.format {
        Format::Table => run_report::table(
            &a,
            &r,
            &shown,
            units,
            colour_on(std::io::stdout().is_terminal()),
        ),
        Format::Csv => run_report::csv(&a, &r, units),
        Format::Json => {
            serde_json::to_string_pretty(&run_report::json(&a, &r)).unwrap_or_default() + "\n"
        }
    };
    print!("{out}");
    if let Some(path) = &args.plot {
        let svg = plot::svg(&run_report::chart(&a, &r, &shown, units));
        if let Err(e) = std::fs::write(path, svg) {
            return usage(format!("cannot write `{}`: {e}", path.display()));
        }
        eprintln!("wrote {}", path.display());
    }
    if r.interrupted || stop_requested() {
        eprintln!(
            "interrupted: results up to {} written",
            run_report::show_time(r.stats.end_time)
        );
        return exit::INTERRUPTED;
    }
    if r.limits.iter().any(|l| !l.result.passed) {
        exit::LIMIT_FAILED
    } else {
        exit::OK
    }
}

/// A `--set` value must name a parameter and fit its unit.
pub fn check_setting(a: &Analysis, name: &str, q: Quantity) -> Result<(), String> {
    let Some((_, base)) = a.params.iter().find(|(n, _)| n == name) else {
        let hint = caloris_compiler::diagnostic::did_you_mean(
            name,
            a.params.iter().map(|(n, _)| n.as_str()),
        )
        .map(|s| format!("; did you mean `{s}`?"))
        .unwrap_or_default();
        return Err(format!("--set: the model has no parameter `{name}`{hint}"));
    };
    match base {
        Some(b) if b.dim != q.dim => Err(format!(
            "--set: parameter `{name}` is {}, the value given is {}",
            b.dim.describe(),
            q.dim.describe()
        )),
        _ => Ok(()),
    }
}
