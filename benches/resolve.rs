//! Benchmark (not a test): a cold steady solve against a re-solve after a value-only change, on
//! the generated grid of `grid_model.rs` (about 10⁵ nodes by default; `cargo bench --bench
//! resolve -- N` for another size), both measured in this one run. The target is a re-solve at
//! least 3× faster than the cold solve.
//!
//! The cold solve makes the sparsity analysis (fill-reducing ordering, elimination tree,
//! supernodes) and the numeric factorisation; the re-solve, of the model with another cell size
//! (every conductance changes, the pattern does not), reuses the analysis kept by a
//! `FactorCache`, as the points of a study do. Both include assembling the system from the
//! network and the triangular solves. Each is timed several times and the fastest run kept; the
//! whole analysis of a study point (text to temperatures) is shown beside for scale. A third
//! line re-solves after a change of a boundary temperature only, where the matrix is unchanged
//! and the cache reuses the numeric factorisation as well.

#[path = "grid_model.rs"]
mod grid_model;

use caloris_compiler::factor_cache::FactorCache;
use caloris_compiler::network::Network;
use caloris_compiler::solve::solve_steady_with;
use caloris_compiler::source::NoImports;
use caloris_compiler::study::parse_setting;
use caloris_compiler::{analyze, Options};
use std::sync::Arc;
use std::time::Instant;

const RUNS: usize = 5;

fn network(
    text: &str,
    cell: &str,
    check_only: bool,
    cache: Option<Arc<FactorCache>>,
) -> (Network, f64) {
    let overrides = vec![parse_setting(&format!("cell={cell}")).expect("setting")];
    let t0 = Instant::now();
    let a = analyze(
        "grid.heat",
        text,
        &NoImports,
        &Options {
            check_only,
            overrides,
            factor_cache: cache,
            ..Options::default()
        },
    );
    let secs = t0.elapsed().as_secs_f64();
    assert!(!a.has_errors(), "generated model has errors");
    (a.network, secs)
}

/// Fastest of `RUNS` timings of `f` (given the run's number), s.
fn fastest(mut f: impl FnMut(usize)) -> f64 {
    (0..RUNS)
        .map(|run| {
            let t0 = Instant::now();
            f(run);
            t0.elapsed().as_secs_f64()
        })
        .fold(f64::INFINITY, f64::min)
}

fn main() {
    let n: usize = std::env::args()
        .skip(1)
        .filter(|a| !a.starts_with("--"))
        .find_map(|a| a.parse().ok())
        .unwrap_or(100_000);
    let text = grid_model::model(n);
    let (base, _) = network(&text, "10 mm", true, None);
    // Two other cell sizes, taken in turn, so that every timed re-solve has new values.
    let changed = [
        network(&text, "12 mm", true, None).0,
        network(&text, "11 mm", true, None).0,
    ];
    println!(
        "Caloris re-solve benchmark: {} nodes, {} links (release build, fastest of {RUNS})",
        base.nodes.len(),
        base.links.len()
    );

    let cold = fastest(|_| {
        let fresh = FactorCache::default();
        solve_steady_with(&base, Some(&fresh)).expect("solves");
    });
    let cache = FactorCache::default();
    solve_steady_with(&base, Some(&cache)).expect("solves");
    let resolve = fastest(|run| {
        solve_steady_with(&changed[run % 2], Some(&cache)).expect("solves");
    });
    assert_eq!(cache.analysed(), 1, "the re-solves reuse the analysis");
    assert_eq!(cache.numeric_reused(), 0, "every re-solve has new values");

    // Only the right-hand side changes (a warmer room, in turn 22 and 23 °C): the matrix is
    // the same, so the numeric factorisation is reused as well.
    let warm = base
        .nodes
        .iter()
        .position(|n| n.name == "warm")
        .expect("warm boundary");
    let warmer: Vec<Network> = [22.0, 23.0]
        .iter()
        .map(|t| {
            let mut net = changed[1].clone();
            net.nodes[warm].fixed = Some(273.15 + t);
            net
        })
        .collect();
    solve_steady_with(&changed[1], Some(&cache)).expect("solves");
    let rhs_only = fastest(|run| {
        solve_steady_with(&warmer[run % 2], Some(&cache)).expect("solves");
    });
    assert_eq!(cache.numeric_reused(), RUNS);

    // The reused analysis gives what a fresh solve gives.
    let fresh = solve_steady_with(&changed[0], None).expect("solves");
    let reused = solve_steady_with(&changed[0], Some(&cache)).expect("solves");
    let worst = fresh
        .0
        .iter()
        .zip(&reused.0)
        .map(|(a, b)| (a - b).abs() / a.abs())
        .fold(0.0, f64::max);

    println!("  cold solve (analysis + factorisation + solve)    {cold:>8.4} s");
    println!("  re-solve, every conductance changed              {resolve:>8.4} s");
    println!(
        "  ratio cold / re-solve                            {:>8.2}×  (target ≥ 3×)",
        cold / resolve
    );
    println!(
        "  re-solve, a boundary temperature changed         {rhs_only:>8.4} s  ({:.1}× faster than cold)",
        cold / rhs_only
    );
    println!("  largest relative difference, reused vs fresh     {worst:>8.1e}");

    let cache = Arc::new(FactorCache::default());
    let (_, first) = network(&text, "10 mm", false, Some(cache.clone()));
    let (_, next) = network(&text, "12 mm", false, Some(cache.clone()));
    println!(
        "  a study point, text to temperatures: first {first:.3} s, next {next:.3} s (the solve is a small part of it)"
    );
}
