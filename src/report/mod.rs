//! `caloris report FILE -o DIR [--path a,b,c]`: a Markdown report of a solved model with two
//! hand-written SVG figures, `DIR/report.md`, `DIR/profile.svg` and `DIR/network.svg`.
//! Exit codes as for `solve`: 0, 1 model errors (nothing written), 2 unusable command line or
//! folder, 3 written but a design limit fails.

mod markdown;
mod network_svg;
mod profile;
mod svg;

use crate::exit;
use crate::loader::FsLoader;
use caloris_compiler::render::render_diagnostics;
use caloris_compiler::{analyze, Options};
use std::path::{Path, PathBuf};

pub fn run(file: &PathBuf, dir: &Path, path: Option<&[String]>, units: crate::Units) -> u8 {
    let (name, text) = match crate::read_model(file) {
        Ok(v) => v,
        Err(msg) => {
            eprintln!("error: {msg}");
            return exit::USAGE;
        }
    };
    let a = analyze(
        &name,
        &text,
        &FsLoader::for_model(file),
        &Options::default(),
    );
    let colour = crate::console::stderr_colour();
    eprint!("{}", render_diagnostics(&a.diagnostics, &a.sources, colour));
    let Some(sol) = &a.solution else {
        eprintln!("{name}: the model has errors — no report written");
        return exit::MODEL_ERROR;
    };
    let net = &a.network;
    let system = units.system_for(&a);
    let chosen = match path {
        Some(names) => match profile::named_path(net, names) {
            Ok(p) => Some((p, "the path given with `--path`".to_string())),
            Err(msg) => {
                eprintln!("error: {msg}");
                return exit::USAGE;
            }
        },
        None => profile::default_path(net, sol),
    };
    let prof =
        chosen.map(|(nodes, origin)| profile::profile(net, &sol.temperatures, nodes, origin));
    let title = a.title.clone().unwrap_or_else(|| name.clone());
    let mut files: Vec<(&str, String)> = Vec::new();
    if let Some(p) = &prof {
        let names: Vec<&str> = p
            .nodes
            .iter()
            .map(|&i| net.nodes[i].name.as_str())
            .collect();
        let chart_title = format!(
            "Temperature from {} to {}",
            names.first().unwrap_or(&""),
            names.last().unwrap_or(&"")
        );
        files.push((
            "profile.svg",
            profile::svg(p, net, sol, system, &chart_title),
        ));
    }
    let drawing = network_svg::svg(net, sol, system, &title);
    let figures = markdown::Figures {
        profile: prof.as_ref(),
        no_profile: prof.is_none().then(|| "every node is at one temperature, or no chain of links joins the warmest and coldest nodes".to_string()),
        network: drawing.is_some(),
    };
    if let Some(d) = drawing {
        files.push(("network.svg", d));
    }
    files.insert(
        0,
        ("report.md", markdown::report(&a, &name, &figures, system)),
    );
    if let Err(e) = std::fs::create_dir_all(dir) {
        eprintln!("error: cannot create `{}`: {e}", dir.display());
        return exit::USAGE;
    }
    // A figure this run does not draw must not linger from an earlier run.
    for stale in ["profile.svg", "network.svg"] {
        if !files.iter().any(|(f, _)| *f == stale) {
            let _ = std::fs::remove_file(dir.join(stale));
        }
    }
    for (file_name, content) in &files {
        let target = dir.join(file_name);
        if let Err(e) = std::fs::write(&target, content) {
            eprintln!("error: cannot write `{}`: {e}", target.display());
            return exit::USAGE;
        }
    }
    let written: Vec<String> = files
        .iter()
        .map(|(f, _)| dir.join(f).display().to_string())
        .collect();
    eprintln!("wrote {}", written.join(", "));
    if sol.limits.iter().any(|l| !l.passed) {
        exit::LIMIT_FAILED
    } else {
        exit::OK
    }
}
