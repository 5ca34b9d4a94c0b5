//! Benchmark (not a test): time and peak memory of `check` and `solve` on generated networks of
//! 10⁴ to 10⁶ nodes, and of the parser alone on the same text. Run with `cargo bench --bench network_scale` (optionally followed by `--
//! SIZES`, e.g. `-- 10000 100000`). Each size runs in a fresh child process so that the peak
//! resident memory (VmHWM from /proc) belongs to that size alone.
//!
//! The model is a square grid of free nodes (a wall section meshed by hand, the densest sparsity
//! an analyst's model reaches), linked to its neighbours by layer elements, with a warm boundary
//! along one edge, a cold one along the opposite edge and a heat load on every 97th node.

use caloris_compiler::source::NoImports;
use caloris_compiler::{analyze, Options};
use std::fmt::Write as _;
use std::process::Command;
use std::time::Instant;

fn model(n: usize) -> String {
    let side = (n as f64).sqrt().ceil() as usize;
    let mut s = String::with_capacity(side * side * 160);
    s.push_str("material brick (k = 0.77 W/(m*K))\nparam cell = 10 mm\n");
    s.push_str("node warm (fixed = 21 °C)\nnode cold (fixed = -4 °C)\n");
    for i in 0..side {
        for j in 0..side {
            if (i * side + j).is_multiple_of(97) {
                let _ = writeln!(s, "node c{i}_{j} (load = 0.01 W)");
            } else {
                let _ = writeln!(s, "node c{i}_{j}");
            }
        }
    }
    for i in 0..side {
        for j in 0..side {
            if j + 1 < side {
                let _ = writeln!(s, "link h{i}_{j}: c{i}_{j} to c{i}_{} layer(brick, thickness = cell, area = 1 cm^2)", j + 1);
            }
            if i + 1 < side {
                let _ = writeln!(s, "link v{i}_{j}: c{i}_{j} to c{}_{j} layer(brick, thickness = cell, area = 1 cm^2)", i + 1);
            }
        }
        let _ = writeln!(
            s,
            "link w{i}: warm to c{i}_0 film(h = 8 W/(m^2*K), area = 1 cm^2)"
        );
        let _ = writeln!(
            s,
            "link e{i}: c{i}_{} to cold film(h = 25 W/(m^2*K), area = 1 cm^2)",
            side - 1
        );
    }
    s
}

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
