//! `caloris`: check and solve thermal network models from the command line.

mod console;
mod diff_cmd;
mod diff_render;
mod explain_cmd;
mod explore_cmd;
mod explore_report;
mod export_cmd;
mod files;
mod fmt_cmd;
mod git_rev;
mod init_cmd;
mod loader;
mod materials_cmd;
mod output;
mod plot;
mod progress;
mod report;
mod run_cmd;
mod run_report;
mod solve_cmd;

use caloris_compiler::units::UnitSystem;
use caloris_compiler::Analysis;
use clap::{Parser, Subcommand, ValueEnum};
use std::io::Read;
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
    /// A run or exploration was stopped with Ctrl-C; what was computed so far was written.
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
    /// When to colour the output (`auto`: on a terminal, unless NO_COLOR is set or TERM=dumb).
    #[arg(long, global = true, value_enum, default_value_t = console::ColorChoice::Auto)]
    color: console::ColorChoice,
    /// Print only errors and failing limits: no warnings, progress or status lines.
    #[arg(short, long, global = true)]
    quiet: bool,
    /// Fail (exit 1) when a model has warnings it does not accept.
    #[arg(long, global = true)]
    deny_warnings: bool,
}

#[derive(Subcommand)]
enum Command {
    /// Check a model's syntax, units and connectivity without solving it.
    #[command(
        after_help = "Examples:\n  caloris check examples/garden_office_wall.heat\n  caloris check examples/                  # every model in a folder\n  caloris check model.heat --case winter --deny-warnings"
    )]
    Check(solve_cmd::ModelArgs),
    /// Solve a model and report temperatures, heat flows and limit checks.
    #[command(
        after_help = "Examples:\n  caloris solve examples/garden_office_wall.heat\n  caloris solve model.heat --format json > results.json\n  caloris solve model.heat --set t_out=-12°C --units us"
    )]
    Solve(solve_cmd::SolveCli),
    /// Write the assembled steady system in Matrix Market files: DIR/A.mtx, DIR/b.mtx, DIR/nodes.csv.
    #[command(
        after_help = "Examples:\n  caloris export examples/garden_office_wall.heat -o matrix/\n  caloris export model.heat -o winter/ --case winter"
    )]
    Export(export_cmd::ExportCli),
    /// Rewrite model files in the one canonical layout (comments and blank lines kept).
    #[command(
        after_help = "Examples:\n  caloris fmt examples/\n  caloris fmt --check .                    # for CI: lists files that would change"
    )]
    Fmt {
        /// Model files or folders of them (`-` formats standard input to standard output).
        #[arg(required = true)]
        files: Vec<PathBuf>,
        /// Change nothing; list the files that would change and exit with 1 if there are any.
        #[arg(long)]
        check: bool,
    },
    /// Show how results move between two versions of a model: `diff OLD NEW` or `diff --rev REV FILE`.
    #[command(
        after_help = "Examples:\n  caloris diff old.heat new.heat\n  caloris diff --rev HEAD~1 model.heat --format markdown"
    )]
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
    #[command(
        after_help = "Examples:\n  caloris report examples/garden_office_wall.heat -o report/"
    )]
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
    /// Explain a diagnostic code (`caloris explain E202`): what it means and how to fix it.
    #[command(after_help = "Examples:\n  caloris explain E202\n  caloris explain W110")]
    Explain {
        /// A code such as `E202` or `W110`.
        code: String,
    },
    /// Start a model from a template: `caloris init wall` writes wall.heat (`-` prints it).
    #[command(
        after_help = "Examples:\n  caloris init wall\n  caloris init pipe boiler_room/flow_pipe.heat\n  caloris init part - | less"
    )]
    Init {
        /// Which template.
        #[arg(value_enum)]
        template: init_cmd::Template,
        /// File to write (default: TEMPLATE.heat in the current folder); never overwritten.
        file: Option<PathBuf>,
    },
    /// List the built-in material library (`import "caloris:materials"`), or search it.
    #[command(after_help = "Examples:\n  caloris materials\n  caloris materials wool")]
    Materials {
        /// Show only materials whose name or note contains this text.
        search: Option<String>,
    },
    /// Print a shell completion script: `caloris completions bash > /etc/bash_completion.d/caloris`.
    Completions {
        /// The shell to complete in.
        shell: clap_complete::Shell,
    },
    /// Print the manual page (roff): `caloris manpage > caloris.1 && man ./caloris.1`.
    Manpage,
    /// Run the language server on standard input and output (for editors; see docs/lsp.md).
    Lsp,
    /// Run a model through time (node capacities, schedules) and report temperatures, crossings,
    /// limits over the run and the energy balance.
    #[command(
        after_help = "Examples:\n  caloris run examples/allotment_standpipe_frost.heat --plot frost.svg\n  caloris run model.heat --every 30min --cross water=0°C"
    )]
    Run(Box<run_cmd::RunCli>),
    /// Solve a model over a range of parameter values and/or its named cases, checking every limit.
    #[command(
        after_help = "Examples:\n  caloris explore examples/hot_water_tank_jacket.heat\n  caloris explore model.heat --over jacket=10mm..80mm:8"
    )]
    Explore(Box<explore_cmd::ExploreCli>),
}

#[derive(Clone, Copy, ValueEnum)]
enum Format {
    Table,
    Json,
    Csv,
}

#[derive(Clone, Copy, ValueEnum)]
enum Units {
    /// SI units (°C, W, m).
    Si,
    /// US customary units (°F, Btu/h, ft).
    Us,
    /// The system most of the model's quantities are written in.
    Auto,
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
    /// The system to report `a` in.
    fn system_for(self, a: &Analysis) -> UnitSystem {
        match self {
            Units::Si => UnitSystem::Si,
            Units::Us => UnitSystem::Us,
            Units::Auto => caloris_compiler::query::preferred_system(a),
        }
    }
}

fn main() -> ExitCode {
    let cli = Cli::parse();
    console::init(console::Console {
        color: cli.color,
        quiet: cli.quiet,
        deny_warnings: cli.deny_warnings,
    });
    let code = match cli.command {
        Command::Check(args) => solve_cmd::check(args),
        Command::Solve(args) => solve_cmd::solve(args),
        Command::Export(args) => export_cmd::run(args),
        Command::Fmt { files, check } => fmt_cmd::run(&files, check),
        Command::Diff {
            files,
            rev,
            format,
            units,
        } => diff_cmd::run(&files, rev.as_deref(), format, units),
        Command::Report {
            file,
            out,
            path,
            units,
        } => report::run(&file, &out, path.as_deref(), units),
        Command::Explain { code } => explain_cmd::run(&code),
        Command::Init { template, file } => init_cmd::run(template, file),
        Command::Materials { search } => materials_cmd::run(search.as_deref()),
        Command::Completions { shell } => {
            let mut cmd = <Cli as clap::CommandFactory>::command();
            clap_complete::generate(shell, &mut cmd, "caloris", &mut std::io::stdout());
            exit::OK
        }
        Command::Manpage => {
            let cmd = <Cli as clap::CommandFactory>::command();
            match clap_mangen::Man::new(cmd).render(&mut std::io::stdout()) {
                Ok(()) => exit::OK,
                Err(e) if e.kind() == std::io::ErrorKind::BrokenPipe => exit::OK,
                Err(e) => usage(format!("cannot write the manual page: {e}")),
            }
        }
        Command::Lsp => match caloris_lsp::run_stdio() {
            Ok(()) => exit::OK,
            Err(e) => {
                eprintln!("error: cannot start the language server: {e}");
                exit::USAGE
            }
        },
        Command::Run(c) => run_cmd::run(*c),
        Command::Explore(c) => explore_cmd::explore(*c),
    };
    ExitCode::from(code)
}

fn colour_on(stream_is_terminal: bool) -> bool {
    console::colour_for(console::get().color, stream_is_terminal)
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
