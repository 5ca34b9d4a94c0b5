//! `caloris check` and `caloris solve`: one model, several, or folders of them, with a case or
//! parameter values applied; diagnostics on standard error, the report on standard output.

use crate::console::{self, plural};
use crate::{exit, files, loader, output, parse_settings, read_model, usage, Format, Units};
use caloris_compiler::units::Quantity;
use caloris_compiler::{analyze, Analysis, Options};
use std::path::PathBuf;

/// Arguments shared by `check` and `solve`.
#[derive(clap::Args)]
pub struct ModelArgs {
    /// Model files or folders of them (`-` reads standard input).
    #[arg(required = true)]
    pub files: Vec<PathBuf>,
    /// Apply a case declared in the model.
    #[arg(long)]
    pub case: Option<String>,
    /// Set a parameter, e.g. `--set t_out=-12°C` (repeatable).
    #[arg(long, value_name = "NAME=VALUE")]
    pub set: Vec<String>,
}

/// `caloris solve` arguments.
#[derive(clap::Args)]
pub struct SolveCli {
    #[command(flatten)]
    pub model: ModelArgs,
    /// Output format.
    #[arg(long, value_enum, default_value_t = Format::Table)]
    pub format: Format,
    /// Unit system of the report (`auto`: the one most of the model is written in).
    #[arg(long, value_enum, default_value_t = Units::Si)]
    pub units: Units,
}

/// What one model came to, for the exit code of several.
fn worst(a: u8, b: u8) -> u8 {
    // Usage problems outrank model errors, which outrank failing limits.
    let rank = |c: u8| match c {
        exit::USAGE => 3,
        exit::MODEL_ERROR => 2,
        exit::LIMIT_FAILED => 1,
        _ => 0,
    };
    if rank(b) > rank(a) {
        b
    } else {
        a
    }
}

pub fn check(args: ModelArgs) -> u8 {
    each_model(&args, |path, settings| {
        let (name, a) = match analyse_one(path, &args, settings, true) {
            Ok(v) => v,
            Err(code) => return code,
        };
        if a.has_errors() {
            return exit::MODEL_ERROR;
        }
        if let Some(code) = deny_warnings(&name, &a) {
            return code;
        }
        let net = &a.network;
        console::status(format!(
            "{name}: ok — {}, {}, {}",
            plural(net.nodes.len(), "node", "nodes"),
            plural(net.links.len(), "link", "links"),
            plural(a.limits.len(), "limit", "limits")
        ));
        exit::OK
    })
}

pub fn solve(args: SolveCli) -> u8 {
    let paths = match files::expand(&args.model.files) {
        Ok(p) => p,
        Err(e) => return usage(e),
    };
    if paths.len() > 1 && matches!(args.format, Format::Csv) {
        return usage(
            "CSV holds one model: give one file, or run `caloris solve --format csv` per file",
        );
    }
    let several = paths.len() > 1;
    let mut jsons = Vec::new();
    let code = each_model(&args.model, |path, settings| {
        let (name, a) = match analyse_one(path, &args.model, settings, false) {
            Ok(v) => v,
            Err(code) => return code,
        };
        if a.has_errors() {
            if matches!(args.format, Format::Json) {
                jsons.push(output::json(&a));
            }
            return exit::MODEL_ERROR;
        }
        if let Some(code) = deny_warnings(&name, &a) {
            return code;
        }
        let system = args.units.system_for(&a);
        let Some(sol) = &a.solution else {
            return exit::MODEL_ERROR;
        };
        match args.format {
            Format::Table => {
                if several {
                    println!("== {name} ==");
                }
                print!("{}", output::table(&a, system, console::stdout_colour()));
            }
            Format::Json => jsons.push(output::json(&a)),
            Format::Csv => print!("{}", output::csv(&a, system)),
        }
        let failing: Vec<&str> = sol
            .limits
            .iter()
            .filter(|l| !l.passed)
            .map(|l| l.name.as_str())
            .collect();
        if failing.is_empty() {
            exit::OK
        } else {
            // On stderr too, so a CI log shows it when the report goes to a file.
            eprintln!(
                "{name}: {} of {} fail: {}",
                failing.len(),
                plural(sol.limits.len(), "design limit", "design limits"),
                failing.join(", ")
            );
            exit::LIMIT_FAILED
        }
    });
    if matches!(args.format, Format::Json) && !jsons.is_empty() {
        if several {
            // Several models: one JSON array of the one-model reports, in the order given.
            println!("[{}]", jsons.join(",\n").trim_end());
        } else {
            print!("{}", jsons.concat());
        }
    }
    code
}

/// Under `--deny-warnings`, fail a model that has warnings.
pub(crate) fn deny_warnings(name: &str, a: &Analysis) -> Option<u8> {
    let n = console::denied_warnings(&a.diagnostics);
    (n > 0).then(|| {
        eprintln!(
            "{name}: {} denied by --deny-warnings",
            plural(n, "warning", "warnings")
        );
        exit::MODEL_ERROR
    })
}

/// Run `f` on every model named by the arguments; the worst exit code wins.
fn each_model(args: &ModelArgs, mut f: impl FnMut(&PathBuf, &[(String, Quantity)]) -> u8) -> u8 {
    let paths = match files::expand(&args.files) {
        Ok(p) => p,
        Err(e) => return usage(e),
    };
    if paths.is_empty() {
        return usage("no `.heat` files found in the folders given");
    }
    let settings = match parse_settings(&args.set) {
        Ok(v) => v,
        Err(e) => return usage(e),
    };
    paths
        .iter()
        .fold(exit::OK, |code, p| worst(code, f(p, &settings)))
}

/// Read and analyse one model with the case and settings applied; print its diagnostics.
pub(crate) fn analyse_one(
    path: &PathBuf,
    args: &ModelArgs,
    settings: &[(String, Quantity)],
    check_only: bool,
) -> Result<(String, Analysis), u8> {
    let (name, text) = read_model(path).map_err(usage)?;
    let loader = loader::FsLoader::for_model(path);
    let run = |overrides: Vec<(String, Quantity)>| {
        analyze(
            &name,
            &text,
            &loader,
            &Options {
                check_only,
                overrides,
                ..Options::default()
            },
        )
    };
    let mut overrides = Vec::new();
    if let Some(case) = &args.case {
        // The model as written tells which cases exist; errors show in the final analysis.
        let base = run(settings.to_vec());
        let Some(spec) = base.studies.case(case) else {
            if base.has_errors() {
                console::print_diagnostics(&base.diagnostics, &base.sources);
                return Err(exit::MODEL_ERROR);
            }
            let names: Vec<&str> = base.studies.cases.iter().map(|c| c.name.as_str()).collect();
            return Err(usage(if names.is_empty() {
                format!("{name}: no case `{case}`: the model declares none")
            } else {
                format!(
                    "{name}: no case `{case}`; the model's cases are {}",
                    names.join(", ")
                )
            }));
        };
        overrides.extend(spec.overrides.iter().cloned());
    }
    overrides.extend(settings.iter().cloned());
    let a = run(overrides);
    console::print_diagnostics(&a.diagnostics, &a.sources);
    if let Err(e) = settings
        .iter()
        .try_for_each(|(n, q)| crate::run_cmd::check_setting(&a, n, *q))
    {
        return Err(usage(format!("{name}: {e}")));
    }
    if a.has_errors() {
        let n = a.diagnostics.iter().filter(|d| d.is_error()).count();
        eprintln!(
            "{name}: {} — nothing was solved",
            plural(n, "error", "errors")
        );
    }
    Ok((name, a))
}
