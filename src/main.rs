//! `caloris`: check and solve thermal network models from the command line.

mod diff_cmd;
mod diff_render;
mod fmt_cmd;
mod git_rev;
mod loader;
mod output;
mod plot;
mod progress;
mod report;
mod run_cmd;
mod run_report;
mod study_cmd;
mod study_report;

use caloris_compiler::render::render_diagnostics;
use caloris_compiler::units::UnitSystem;
use caloris_compiler::{analyze, Analysis, Options};
use clap::{Parser, Subcommand, ValueEnum};
use std::io::{IsTerminal, Read};
use std::path::PathBuf;
use std::process::ExitCode;

/// Exit codes, documented in docs/cli.md.
pub mod exit {
    /// The model is sound (and every limit holds).
    pub const OK: u8 = 0;
    /// The model has errors; nothing was solved.
    pub const MODEL_ERROR: u8 = 1;
    /// The command line or a file could not be used.
    pub const USAGE: u8 = 2;
    /// The model solved but at least one design limit fails.
    pub const LIMIT_FAILED: u8 = 3;
    /// A run or study was stopped with Ctrl-C; what was computed so far was written.
    pub const INTERRUPTED: u8 = 130;
}

#[derive(Parser)]
#[command(
    name = "caloris",
    version,
    about = "Thermal resistance networks as text: check units, solve, verify design limits"
)]
struct Cli {
    #[command(subcommand)]
    command: Command,
}

#[derive(Subcommand)]
enum Command {
    /// Check a model's syntax, units and connectivity without solving it.
    Check {
        /// Model file (`-` reads standard input).
        file: PathBuf,
    },
    /// Solve a model and report temperatures, heat flows and limit checks.
    Solve {
        /// Model file (`-` reads standard input).
        file: PathBuf,
        /// Output format.
        #[arg(long, value_enum, default_value_t = Format::Table)]
        format: Format,
        /// Unit system of the report.
        #[arg(long, value_enum, default_value_t = Units::Si)]
        units: Units,
    },
    /// Rewrite model files in the one canonical layout (comments and blank lines kept).
    Fmt {
        /// Model files or folders of them (`-` formats standard input to standard output).
        #[arg(required = true)]
        files: Vec<PathBuf>,
        /// Change nothing; list the files that would change and exit with 1 if there are any.
        #[arg(long)]
        check: bool,
    },
    /// Show how results move between two versions of a model: `diff OLD NEW` or `diff --rev REV FILE`.
    Diff {
        /// OLD and NEW model files, or with --rev the one model file.
        #[arg(required = true, num_args = 1..=2, value_name = "FILE")]
        files: Vec<PathBuf>,
        /// Compare the working copy of FILE with FILE at this git revision (imports read from it too).
        #[arg(long, value_name = "REV")]
        rev: Option<String>,
        /// Output format: a terminal table, Markdown for a pull-request comment, or JSON.
        #[arg(long, value_enum, default_value_t = diff_render::DiffFormat::Table)]
        format: diff_render::DiffFormat,
        /// Unit system of the table and Markdown (JSON is always SI).
        #[arg(long, value_enum, default_value_t = Units::Si)]
        units: Units,
    },
    /// Write a Markdown report with figures: DIR/report.md, DIR/profile.svg, DIR/network.svg.
    Report {
        /// Model file (`-` reads standard input).
        file: PathBuf,
        /// Folder to write into (created when missing).
        #[arg(short = 'o', long = "out", value_name = "DIR")]
        out: PathBuf,
        /// Nodes of the temperature profile in order, comma-separated (default: through the first build-up).
        #[arg(long, value_delimiter = ',', value_name = "NODES")]
        path: Option<Vec<String>>,
        /// Unit system of the report.
        #[arg(long, value_enum, default_value_t = Units::Si)]
        units: Units,
    },
    /// Run the language server on standard input and output (for editors; see docs/lsp.md).
    Lsp,
    /// Run a model through time (node capacities, schedules) and report temperatures, crossings,
    /// limits over the run and the energy balance.
    Run(Box<run_cmd::RunCli>),
    /// Solve a model over a sweep of parameters and/or its named cases, checking every limit.
    Study(Box<study_cmd::StudyCli>),
}

#[derive(Clone, Copy, ValueEnum)]
enum Format {
    Table,
    Json,
    Csv,
}

#[derive(Clone, Copy, ValueEnum)]
enum Units {
    Si,
    Us,
}

/// A command line that cannot be used: the message on standard error, exit code 2.
fn usage(msg: impl std::fmt::Display) -> u8 {
    eprintln!("error: {msg}");
    exit::USAGE
}

/// `--set NAME=VALUE` options, each read as a parameter override.
fn parse_settings(
    texts: &[String],
) -> Result<Vec<(String, caloris_compiler::units::Quantity)>, String> {
    texts
        .iter()
        .map(|s| caloris_compiler::study::parse_setting(s).map_err(|e| format!("--set {e}")))
        .collect()
}

impl Units {
    fn system(self) -> UnitSystem {
        match self {
            Units::Si => UnitSystem::Si,
            Units::Us => UnitSystem::Us,
        }
    }
}

fn main() -> ExitCode {
    let cli = Cli::parse();
    let code = match cli.command {
        Command::Check { file } => run(&file, true, Format::Table, UnitSystem::Si),
        Command::Solve {
            file,
            format,
            units,
        } => run(&file, false, format, units.system()),
        Command::Fmt { files, check } => fmt_cmd::run(&files, check),
        Command::Diff {
            files,
            rev,
            format,
            units,
        } => diff_cmd::run(&files, rev.as_deref(), format, units.system()),
        Command::Report {
            file,
            out,
            path,
            units,
        } => report::run(&file, &out, path.as_deref(), units.system()),
        Command::Lsp => match caloris_lsp::run_stdio() {
            Ok(()) => exit::OK,
            Err(e) => {
                eprintln!("error: cannot start the language server: {e}");
                exit::USAGE
            }
        },
        Command::Run(c) => run_cmd::run(*c),
        Command::Study(c) => study_cmd::study(*c),
    };
    ExitCode::from(code)
}

fn colour_on(stream_is_terminal: bool) -> bool {
    stream_is_terminal && std::env::var_os("NO_COLOR").is_none_or(|v| v.is_empty())
}

fn read_model(file: &PathBuf) -> Result<(String, String), String> {
    if file.as_os_str() == "-" {
        let mut text = String::new();
        std::io::stdin()
            .read_to_string(&mut text)
            .map_err(|e| format!("cannot read standard input: {e}"))?;
        return Ok(("<stdin>".to_string(), text));
    }
    let text = std::fs::read_to_string(file)
        .map_err(|e| format!("cannot read `{}`: {e}", file.display()))?;
    Ok((file.display().to_string(), text))
}

fn run(file: &PathBuf, check_only: bool, format: Format, system: UnitSystem) -> u8 {
    let (name, text) = match read_model(file) {
        Ok(v) => v,
        Err(msg) => {
            eprintln!("error: {msg}");
            return exit::USAGE;
        }
    };
    let loader = loader::FsLoader::for_model(file);
    let analysis = analyze(
        &name,
        &text,
        &loader,
        &Options {
            check_only,
            ..Options::default()
        },
    );
    let colour = colour_on(std::io::stderr().is_terminal());
    let rendered = render_diagnostics(&analysis.diagnostics, &analysis.sources, colour);
    eprint!("{rendered}");
    if analysis.has_errors() {
        let n = analysis.diagnostics.iter().filter(|d| d.is_error()).count();
        eprintln!(
            "{name}: {n} error{} — nothing was solved",
            if n == 1 { "" } else { "s" }
        );
        if matches!(format, Format::Json) && !check_only {
            println!("{}", output::json(&analysis));
        }
        return exit::MODEL_ERROR;
    }
    if check_only {
        let net = &analysis.network;
        eprintln!(
            "{name}: ok — {} nodes, {} links, {} limits",
            net.nodes.len(),
            net.links.len(),
            analysis.limits.len()
        );
        return exit::OK;
    }
    print_solution(&analysis, format, system)
}

fn print_solution(analysis: &Analysis, format: Format, system: UnitSystem) -> u8 {
    let Some(sol) = &analysis.solution else {
        return exit::MODEL_ERROR;
    };
    let out = match format {
        Format::Table => {
            output::table(analysis, system, colour_on(std::io::stdout().is_terminal()))
        }
        Format::Json => output::json(analysis),
        Format::Csv => output::csv(analysis, system),
    };
    print!("{out}");
    if sol.limits.iter().any(|l| !l.passed) {
        exit::LIMIT_FAILED
    } else {
        exit::OK
    }
}
