//! `caloris export FILE -o DIR`: the assembled steady system in Matrix Market files (`A.mtx`,
//! `b.mtx`) and the node of each row (`nodes.csv`), for checking a solve with another solver.

use crate::console::{self, plural};
use crate::solve_cmd::{analyse_one, deny_warnings, ModelArgs};
use crate::{exit, parse_settings, usage};
use caloris_compiler::analysis::solve_analysed;
use caloris_compiler::export::{MatrixKind, SteadyExport};
use caloris_compiler::Options;
use std::io::{BufWriter, Write};
use std::path::{Path, PathBuf};

/// `caloris export` arguments.
#[derive(clap::Args)]
pub struct ExportCli {
    /// Model file (`-` reads standard input).
    pub file: PathBuf,
    /// Folder to write A.mtx, b.mtx and nodes.csv into (created when missing).
    #[arg(short = 'o', long = "out", value_name = "DIR")]
    pub out: PathBuf,
    /// Apply a case declared in the model.
    #[arg(long)]
    pub case: Option<String>,
    /// Set a parameter, e.g. `--set t_out=-12°C` (repeatable).
    #[arg(long, value_name = "NAME=VALUE")]
    pub set: Vec<String>,
}

pub fn run(args: ExportCli) -> u8 {
    let settings = match parse_settings(&args.set) {
        Ok(v) => v,
        Err(e) => return usage(e),
    };
    let model = ModelArgs {
        files: vec![args.file.clone()],
        case: args.case.clone(),
        set: args.set.clone(),
    };
    // Checked first, as `check` does: a linear model's matrix needs no solve.
    let (name, mut a) = match analyse_one(&args.file, &model, &settings, true) {
        Ok(v) => v,
        Err(code) => return code,
    };
    if a.has_errors() {
        return exit::MODEL_ERROR;
    }
    if let Some(code) = deny_warnings(&name, &a) {
        return code;
    }
    let linear = a.network.links.iter().all(|l| l.law.is_linear());
    let built = if linear {
        SteadyExport::linear(&a.network)
    } else {
        // The Jacobian is taken at the solution, so a nonlinear model is solved as `solve`
        // would; only what the solve adds is printed (the check's diagnostics already were).
        let before = a.diagnostics.len();
        solve_analysed(&mut a, &Options::default());
        console::print_diagnostics(&a.diagnostics[before..], &a.sources);
        let Some(sol) = &a.solution else {
            eprintln!("{name}: the nonlinear solve failed — nothing was exported");
            return exit::MODEL_ERROR;
        };
        SteadyExport::jacobian(&a.network, &sol.temperatures)
    };
    let system = match built {
        Ok(s) => s,
        Err(e) => return usage(format!("{name}: cannot build the matrix: {e:?}")),
    };
    if let Err(e) = write_all(&args.out, &system, &name, &a.network) {
        return usage(e);
    }
    console::status(format!(
        "{name}: wrote {} of {} ({}, {}) to {}",
        match system.kind {
            MatrixKind::Conductance => "the conductance matrix",
            MatrixKind::Jacobian => "the Jacobian at the solution",
        },
        plural(system.rows.len(), "row", "rows"),
        plural(system.written_entries(), "entry", "entries"),
        if system.symmetric {
            "symmetric, lower triangle"
        } else {
            "general"
        },
        args.out.display()
    ));
    exit::OK
}

fn write_all(
    dir: &Path,
    system: &SteadyExport,
    name: &str,
    net: &caloris_compiler::network::Network,
) -> Result<(), String> {
    std::fs::create_dir_all(dir)
        .map_err(|e| format!("cannot create the folder `{}`: {e}", dir.display()))?;
    let write = |file: &str, f: &dyn Fn(&mut dyn Write) -> std::io::Result<()>| {
        let path = dir.join(file);
        let fail = |e: std::io::Error| format!("cannot write `{}`: {e}", path.display());
        let mut w = BufWriter::new(std::fs::File::create(&path).map_err(fail)?);
        f(&mut w).and_then(|()| w.flush()).map_err(fail)
    };
    write("A.mtx", &|w| system.write_matrix(w, name))?;
    write("b.mtx", &|w| system.write_rhs(w, name))?;
    write("nodes.csv", &|w| system.write_nodes(w, net))
}
