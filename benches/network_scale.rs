//! Benchmark (not a test): time and peak memory of `check` and `solve` on generated networks of
//! 10⁴ to 10⁶ nodes, and of the parser alone on the same text. Run with `cargo bench --bench network_scale` (optionally followed by `--
//! SIZES`, e.g. `-- 10000 100000`). Each size runs in a fresh child process so that the peak
//! resident memory (VmHWM from /proc) belongs to that size alone.
//!
//! The model is the grid of `grid_model.rs`, shared with the re-solve benchmark.

#[path = "grid_model.rs"]
mod grid_model;

use caloris_compiler::source::NoImports;
use caloris_compiler::{analyze, Options};
use grid_model::model;
use std::process::Command;
use std::time::Instant;

fn peak_rss_mib() -> f64 {
    let status = std::fs::read_to_string("/proc/self/status").unwrap_or_default();
    status
        .lines()
        .find_map(|l| l.strip_prefix("VmHWM:"))
        .and_then(|v| v.trim().trim_end_matches("kB").trim().parse::<f64>().ok())
        .map_or(f64::NAN, |kb| kb / 1024.0)
}

/// The parser alone on the same text: how much of `check` is reading the text.
fn run_parse(n: usize) {
    let text = model(n);
    let t0 = Instant::now();
    let (module, diags) = caloris_compiler::parser::parse(&text, caloris_compiler::span::FileId(0));
    let secs = t0.elapsed().as_secs_f64();
    assert!(diags.is_empty(), "generated model has syntax errors");
    let mib = text.len() as f64 / (1024.0 * 1024.0);
    println!(
        "{:>9} decls {:>15}  parse  {:>8.3} s  peak {:>8.1} MiB  ({:.1} MiB/s of text)",
        module.items.len(),
        "",
        secs,
        peak_rss_mib(),
        mib / secs,
    );
}

fn run_one(n: usize, solve: bool) {
    let text = model(n);
    let t0 = Instant::now();
    let a = analyze(
        "grid.heat",
        &text,
        &NoImports,
        &Options {
            check_only: !solve,
            ..Options::default()
        },
    );
    let secs = t0.elapsed().as_secs_f64();
    assert!(!a.has_errors(), "generated model has errors");
    if solve {
        assert!(a.solution.is_some(), "no solution");
    }
    println!(
        "{:>9} nodes {:>9} links  {:<5}  {:>8.3} s  peak {:>8.1} MiB  (model text {:.1} MiB, {:.1} MiB/s)",
        a.network.nodes.len(),
        a.network.links.len(),
        if solve { "solve" } else { "check" },
        secs,
        peak_rss_mib(),
        text.len() as f64 / (1024.0 * 1024.0),
        text.len() as f64 / (1024.0 * 1024.0) / secs,
    );
}

fn main() {
    let args: Vec<String> = std::env::args()
        .skip(1)
        .filter(|a| !a.starts_with("--"))
        .collect();
    if let [mode, n] = args.as_slice() {
        if let Ok(n) = n.parse() {
            if mode == "parse" {
                run_parse(n);
                return;
            }
            run_one(n, mode == "solve");
            return;
        }
    }
    let sizes: Vec<usize> = if args.is_empty() {
        vec![10_000, 100_000, 1_000_000]
    } else {
        args.iter().filter_map(|a| a.parse().ok()).collect()
    };
    let me = std::env::current_exe().expect("own path");
    println!("Caloris network scale benchmark (release build, one process per row)");
    for n in sizes {
        for mode in ["parse", "check", "solve"] {
            let status = Command::new(&me).args([mode, &n.to_string()]).status();
            if !matches!(status, Ok(s) if s.success()) {
                println!("{n} nodes {mode}: failed ({status:?})");
            }
        }
    }
}
