//! Reused factorisations give the answers of fresh ones: the steady solve with a kept symbolic
//! analysis (and, for an unchanged matrix, a kept numeric factorisation) against a fresh solve
//! and against the series law; Newton's steps sharing one analysis; a study whose points share
//! one cache against the same points analysed one by one.

use caloris_compiler::factor_cache::FactorCache;
use caloris_compiler::network::Network;
use caloris_compiler::nonlinear::{solve_nonlinear, solve_nonlinear_with, NewtonSettings};
use caloris_compiler::solve::{solve_steady, solve_steady_with};
use caloris_compiler::source::NoImports;
use caloris_compiler::study::{
    parse_setting, parse_sweep, run_study, Mode, Outcome, Plan, StudyHooks,
};
use caloris_compiler::{analyze, Options};
use std::sync::Arc;

/// A chain of five slabs of different thickness between two fixed temperatures, each slab's
/// thickness a parameter.
fn chain(thickness: [f64; 5], t_hot: f64) -> String {
    let mut s = format!(
        "material pine (k = 0.12 W/(m*K))\nnode hot (fixed = {t_hot} °C)\nnode cold (fixed = -10 °C)\n"
    );
    for i in 1..5 {
        s.push_str(&format!("node n{i}\n"));
    }
    let names = ["hot", "n1", "n2", "n3", "n4", "cold"];
    for (i, t) in thickness.iter().enumerate() {
        s.push_str(&format!(
            "link s{i}: {} to {} layer(pine, thickness = {t} mm, area = 2 m^2)\n",
            names[i],
            names[i + 1]
        ));
    }
    s
}

fn network(text: &str) -> Network {
    let a = analyze(
        "chain.heat",
        text,
        &NoImports,
        &Options {
            check_only: true,
            ..Options::default()
        },
    );
    assert!(!a.has_errors(), "{:?}", a.diagnostics);
    a.network
}

/// Series law (Fourier's law through each slab, R = L/(k·A), the same heat through all):
/// T_k = T_hot − (T_hot − T_cold)·ΣR_before_k / ΣR.
fn series(thickness: [f64; 5], t_hot: f64) -> Vec<f64> {
    let r: Vec<f64> = thickness
        .iter()
        .map(|l| l / 1000.0 / (0.12 * 2.0))
        .collect();
    let total: f64 = r.iter().sum();
    (1..5)
        .map(|k| {
            let before: f64 = r[..k].iter().sum();
            273.15 + t_hot - (t_hot + 10.0) * before / total
        })
        .collect()
}

#[test]
fn a_kept_analysis_gives_the_fresh_answer_and_the_series_law() {
    let cache = FactorCache::default();
    let designs = [
        ([20.0, 45.0, 12.0, 80.0, 30.0], 20.0),
        ([25.0, 40.0, 15.0, 60.0, 35.0], 20.0),
        // The same matrix with another boundary temperature: only the right-hand side changes.
        ([25.0, 40.0, 15.0, 60.0, 35.0], 35.0),
        ([5.0, 140.0, 9.5, 22.0, 18.0], 35.0),
    ];
    for (thickness, t_hot) in designs {
        let net = network(&chain(thickness, t_hot));
        let fresh = solve_steady(&net).expect("solves");
        let kept = solve_steady_with(&net, Some(&cache)).expect("solves");
        // Bit for bit: the kept analysis is the very one a fresh solve makes.
        assert_eq!(
            fresh.0.iter().map(|t| t.to_bits()).collect::<Vec<_>>(),
            kept.0.iter().map(|t| t.to_bits()).collect::<Vec<_>>()
        );
        let exact = series(thickness, t_hot);
        let names = ["n1", "n2", "n3", "n4"];
        for (name, want) in names.iter().zip(exact) {
            let i = net
                .nodes
                .iter()
                .position(|n| &n.name == name)
                .expect("node");
            assert!(
                ((kept.0[i] - want) / want).abs() <= 1e-12,
                "{name}: {} K, series law {want} K",
                kept.0[i]
            );
        }
    }
    assert_eq!(cache.analysed(), 1, "one pattern, analysed once");
    assert_eq!(cache.reused(), designs.len() - 1);
    assert_eq!(
        cache.numeric_reused(),
        1,
        "the temperature-only change refactors nothing"
    );
}

#[test]
fn another_pattern_is_analysed_afresh() {
    let cache = FactorCache::default();
    let net = network(&chain([20.0, 45.0, 12.0, 80.0, 30.0], 20.0));
    solve_steady_with(&net, Some(&cache)).expect("solves");
    let mut text = chain([20.0, 45.0, 12.0, 80.0, 30.0], 20.0);
    text.push_str("link bypass: n1 to n3 layer(pine, thickness = 300 mm, area = 0.1 m^2)\n");
    let other = network(&text);
    let kept = solve_steady_with(&other, Some(&cache)).expect("solves");
    let fresh = solve_steady(&other).expect("solves");
    assert_eq!(kept.0, fresh.0);
    assert_eq!(cache.analysed(), 2);
}

/// A kiln wall of two k(T) courses and a film: nonlinear, solved by Newton's method.
const KILN: &str = "param h = 12 W/(m^2*K)\nmaterial firebrick (k = 0.12 W/(m*K), k_slope = 2.5e-4 W/(m*K^2), k_at = 20 °C)\nnode kiln (fixed = 900 °C)\nnode yard (fixed = 25 °C)\nnode middle\nnode outer\nlink hot_course: kiln to middle layer(firebrick, thickness = 60 mm, area = 1.8 m^2)\nlink cool_course: middle to outer layer(firebrick, thickness = 55 mm, area = 1.8 m^2)\nlink film: outer to yard film(h = h, area = 1.8 m^2)\nlimit touch: temperature(outer) <= 200 °C\n";

#[test]
fn newton_steps_share_one_analysis_and_give_the_fresh_answer() {
    let net = network(KILN);
    let cache = FactorCache::default();
    let (kept, conv) =
        solve_nonlinear_with(&net, NewtonSettings::default(), &cache).expect("converges");
    let (fresh, _) = solve_nonlinear(&net, NewtonSettings::default()).expect("converges");
    assert_eq!(kept.0, fresh.0);
    assert!(conv.iterations >= 2, "{conv:?}");
    // One analysis for the linearised start (Cholesky) and one for the Jacobian (LU), whose
    // pattern every later step shares.
    assert_eq!(cache.analysed(), 2);
    assert_eq!(cache.reused(), conv.iterations - 1);
}

fn outcome_bits(o: &Outcome) -> Vec<u64> {
    match o {
        Outcome::Solved { limits, measures } => limits
            .iter()
            .map(|l| l.result.actual.to_bits())
            .chain(measures.iter().map(|m| m.value.to_bits()))
            .collect(),
        Outcome::Failed { messages } => panic!("{messages:?}"),
    }
}

#[test]
fn a_study_with_one_cache_equals_its_points_analysed_alone() {
    for model in [
        KILN.to_string(),
        chain([20.0, 45.0, 12.0, 80.0, 30.0], 20.0)
            + "param h = 1 W/(m^2*K)\nlimit touch: temperature(n4) <= 200 °C\n",
    ] {
        let plan = Plan {
            axes: vec![parse_sweep("h=6 W/(m^2*K)..30 W/(m^2*K):5").expect("sweep")],
            cases: Vec::new(),
            mode: Mode::Steady,
            measures: Vec::new(),
            settings: Vec::new(),
        };
        let r = match run_study("m.heat", &model, &NoImports, &plan, StudyHooks::default()) {
            Ok(r) => r,
            Err(_) => panic!("study refused"),
        };
        assert_eq!(r.points.len(), 5);
        for p in &r.points {
            let (name, q) = &p.values[0];
            let alone = analyze(
                "m.heat",
                &model,
                &NoImports,
                &Options {
                    overrides: vec![(name.clone(), *q)],
                    ..Options::default()
                },
            );
            let sol = alone.solution.expect("solves");
            let want: Vec<u64> = sol.limits.iter().map(|l| l.actual.to_bits()).collect();
            assert_eq!(outcome_bits(&p.outcome), want, "{name} = {}", q.value);
        }
    }
    // A cache handed in through the options is used by the analysis.
    let cache = Arc::new(FactorCache::default());
    for h in ["8 W/(m^2*K)", "16 W/(m^2*K)"] {
        let a = analyze(
            "kiln.heat",
            KILN,
            &NoImports,
            &Options {
                overrides: vec![parse_setting(&format!("h={h}")).expect("setting")],
                factor_cache: Some(cache.clone()),
                ..Options::default()
            },
        );
        assert!(a.solution.is_some());
    }
    assert_eq!(
        cache.analysed(),
        2,
        "the second analysis reuses both analyses"
    );
}
