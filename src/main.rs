//! `caloris`: check and solve thermal network models from the command line.

mod loader;
mod output;

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

fn main() -> ExitCode {
    let cli = Cli::parse();
    let code = match cli.command {
        Command::Check { file } => run(&file, true, Format::Table, UnitSystem::Si),
        Command::Solve {
            file,
            format,
            units,
        } => {
            let system = match units {
                Units::Si => UnitSystem::Si,
                Units::Us => UnitSystem::Us,
            };
            run(&file, false, format, system)
        }
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
