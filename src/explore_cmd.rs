//! `caloris explore`: the model solved over a range of one or two parameters and/or its named
//! cases, steady or transient, with every limit evaluated at every point.

use crate::explore_report::{self, AxisUnits};
use crate::progress::{catch_interrupt, stop_requested, Progress, STOP};
use crate::run_cmd::analyse;
use crate::{colour_on, exit, loader, parse_settings, plot, read_model, usage, Format, Units};
use caloris_compiler::render::render_diagnostics;
use caloris_compiler::study::{
    parse_sweep, run_study, Mode, Outcome, Plan, StudyError, StudyHooks,
};
use std::io::IsTerminal;
use std::path::PathBuf;

/// `caloris explore` arguments.
#[derive(clap::Args)]
pub struct ExploreCli {
    /// Model file (`-` reads standard input).
    file: PathBuf,
    /// A parameter over a range: `NAME=FROM..TO:N` (N values, ends included; 11 by default) or
    /// `NAME=V1,V2,...`. At most twice.
    #[arg(long, value_name = "NAME=FROM..TO:N")]
    over: Vec<String>,
    /// A case declared in the model (repeatable; `all` for every case). Without --over and
    /// --case, every case is solved.
    #[arg(long)]
    case: Vec<String>,
    /// Run the model's transient run at every point (name it when there are several).
    #[arg(long, num_args = 0..=1, default_missing_value = "", value_name = "RUN")]
    transient: Option<String>,
    /// Also report a quantity at every point, written like a limit's measure:
    /// `temperature(tank.surface)`.
    #[arg(long, value_name = "MEASURE(SUBJECT)")]
    track: Vec<String>,
    /// Set a parameter at every point, e.g. `--set t_out=-12°C` (repeatable).
    #[arg(long, value_name = "NAME=VALUE")]
    set: Vec<String>,
    /// Output format.
    #[arg(long, value_enum, default_value_t = Format::Table)]
    format: Format,
    /// Unit system of the report.
    #[arg(long, value_enum, default_value_t = Units::Si)]
    units: Units,
    /// Also write the chart over the first parameter as SVG.
    #[arg(long, value_name = "FILE.svg")]
    plot: Option<PathBuf>,
}

pub fn explore(args: ExploreCli) -> u8 {
    let (name, text) = match read_model(&args.file) {
        Ok(v) => v,
        Err(msg) => return usage(msg),
    };
    let mut axes = Vec::new();
    for s in &args.over {
        match parse_sweep(s) {
            Ok(a) => axes.push(a),
            Err(e) => return usage(format!("--over {e}")),
        }
    }
    let settings = match parse_settings(&args.set) {
        Ok(v) => v,
        Err(e) => return usage(e),
    };
    // The model as written: its diagnostics are shown once, and its cases and runs listed.
    let Some(base) = analyse(&name, &text, &args.file, Vec::new(), false) else {
        return exit::MODEL_ERROR;
    };
    let all_cases: Vec<String> = base.studies.cases.iter().map(|c| c.name.clone()).collect();
    let mut cases: Vec<String> = Vec::new();
    for c in &args.case {
        if c == "all" {
            cases.extend(all_cases.iter().cloned());
        } else {
            cases.push(c.clone());
        }
    }
    if axes.is_empty() && args.case.is_empty() {
        if all_cases.is_empty() {
            return usage("nothing to explore: give --over NAME=FROM..TO:N, or declare `case` lines in the model (or name them with --case)");
        }
        cases = all_cases.clone();
    }
    let mode = match &args.transient {
        None => Mode::Steady,
        Some(n) if !n.is_empty() => Mode::Transient(n.clone()),
        Some(_) => match base.studies.runs.as_slice() {
            [one] => Mode::Transient(one.name.clone()),
            [] => return usage("--transient: the model declares no `transient` run"),
            many => {
                let names: Vec<&str> = many.iter().map(|r| r.name.as_str()).collect();
                return usage(format!("--transient: the model declares several runs ({}); name one, e.g. --transient {}", names.join(", "), names[0]));
            }
        },
    };
    if args.plot.is_some() && axes.is_empty() {
        return usage("--plot draws the chart over a parameter; add --over NAME=FROM..TO:N");
    }
    let plan = Plan {
        axes,
        cases,
        mode,
        measures: args.track.clone(),
        settings,
    };
    catch_interrupt();
    let mut progress = Progress::new("explore");
    let mut on_progress = |done: usize, total: usize| progress.update(done as f64, total as f64);
    let loader = loader::FsLoader::for_model(&args.file);
    let outcome = run_study(
        &name,
        &text,
        &loader,
        &plan,
        StudyHooks {
            cancel: Some(&STOP),
            progress: Some(&mut on_progress),
        },
    );
    progress.finish();
    let r = match outcome {
        Ok(r) => r,
        Err(StudyError::Request(msg)) => return usage(msg),
        Err(StudyError::Model(a)) => {
            eprint!(
                "{}",
                render_diagnostics(
                    &a.diagnostics,
                    &a.sources,
                    colour_on(std::io::stderr().is_terminal())
                )
            );
            return exit::MODEL_ERROR;
        }
    };
    let units_system = args.units.system_for(&base);
    let units = AxisUnits::from_specs(&r, &args.over, units_system);
    let title = base.title.as_deref();
    let out = match args.format {
        Format::Table => explore_report::table(
            title,
            &r,
            &units,
            units_system,
            colour_on(std::io::stdout().is_terminal()),
        ),
        Format::Csv => explore_report::csv(&r, &units, units_system),
        Format::Json => {
            serde_json::to_string_pretty(&explore_report::json(title, &r)).unwrap_or_default()
                + "\n"
        }
    };
    print!("{out}");
    if let Some(path) = &args.plot {
        let svg = plot::svg(&explore_report::chart(title, &r, &units, units_system));
        if let Err(e) = std::fs::write(path, svg) {
            return usage(format!("cannot write `{}`: {e}", path.display()));
        }
        eprintln!("wrote {}", path.display());
    }
    if r.interrupted || stop_requested() {
        eprintln!(
            "interrupted: {} of {} points written",
            r.points.len(),
            r.planned
        );
        return exit::INTERRUPTED;
    }
    if r.points
        .iter()
        .any(|p| matches!(p.outcome, Outcome::Failed { .. }))
    {
        exit::MODEL_ERROR
    } else if r.points.iter().any(|p| !p.all_limits_pass()) {
        exit::LIMIT_FAILED
    } else {
        exit::OK
    }
}
