//! Transient runs checked against references outside Caloris: closed-form solutions of named
//! laws, and exact solutions computed with scipy (tests/reference/gen_transient.py, scipy 1.17.1,
//! numpy 2.4.6; the versions are recorded in each generated file).

use caloris_compiler::source::NoImports;
use caloris_compiler::transient::integrate::StepMode;
use caloris_compiler::transient::model::RunSpec;
use caloris_compiler::transient::{run_transient, Hooks, RunOptions, RunResult};
use caloris_compiler::{analyze, Analysis, Options};
use std::path::Path;

const C0: f64 = 273.15;

fn model(src: &str) -> Analysis {
    let a = analyze("test.heat", src, &NoImports, &Options::default());
    let errors: Vec<_> = a
        .diagnostics
        .iter()
        .filter(|d| d.is_error())
        .map(|d| format!("{} {}", d.code, d.message))
        .collect();
    assert!(errors.is_empty(), "{errors:?}");
    a
}

fn run_with(a: &Analysis, edit: impl FnOnce(&mut RunSpec), options: &RunOptions) -> RunResult {
    let mut spec = a.studies.runs[0].clone();
    edit(&mut spec);
    run_transient(&a.network, &a.limits, &spec, options, Hooks::default()).expect("run")
}

fn at(r: &RunResult, a: &Analysis, node: &str, time: f64) -> f64 {
    let n = a.network.node_id(node).expect("node");
    let c = r.recorded.iter().position(|&x| x == n).expect("recorded");
    let k = r
        .times
        .iter()
        .position(|&t| (t - time).abs() < 1e-9 * (1.0 + time))
        .unwrap_or_else(|| panic!("no output at {time} s: {:?}", r.times));
    r.temperatures[k][c]
}

/// A pot of stock (4.18 kJ/K) cooling through 2 W/K to a 20 °C kitchen: RC = 2090 s.
const POT: &str = "node stock (capacity = 4.18 kJ/K, initial = 80 °C)\nnode kitchen (fixed = 20 °C)\nlink lid_and_sides: stock to kitchen conductance(2 W/K)\ntransient cool (duration = 2 h, output = 5 min)\n";

/// Newton's law of cooling for a lumped body: T(t) = T∞ + (T0 − T∞)·exp(−t/RC).
fn newton_cooling(t: f64) -> f64 {
    C0 + 20.0 + 60.0 * (-t / 2090.0).exp()
}

#[test]
fn lumped_capacitance_cooling_follows_newtons_law() {
    let a = model(POT);
    let r = run_with(&a, |_| {}, &RunOptions::default());
    let worst = r
        .times
        .iter()
        .zip(&r.temperatures)
        .map(|(t, row)| (row[0] - newton_cooling(*t)).abs())
        .fold(0.0, f64::max);
    // A local tolerance of 0.01 K per step; the global error stays within a few times that.
    assert!(worst < 0.03, "largest error {worst} K");
    assert_eq!(r.times.len(), 25);
    // First law against the closed form: heat released C·(T0 − T)(t).
    let released = 4180.0 * (newton_cooling(0.0) - newton_cooling(7200.0));
    assert!(
        (r.energy.stored + released).abs() < 0.003 * released,
        "{:?} vs {released}",
        r.energy
    );
    assert!((r.energy.boundaries[0].1 + released).abs() < 0.003 * released);
}

#[test]
fn fixed_step_error_falls_as_the_square_of_the_step() {
    // TR-BDF2 is second order: halving the step divides the error by about four.
    let a = model(POT);
    let err = |h: f64| {
        let r = run_with(&a, |s| s.step = Some(h), &RunOptions::default());
        r.times
            .iter()
            .zip(&r.temperatures)
            .map(|(t, row)| (row[0] - newton_cooling(*t)).abs())
            .fold(0.0, f64::max)
    };
    let (e1, e2, e3) = (err(600.0), err(300.0), err(150.0));
    for ratio in [e1 / e2, e2 / e3] {
        assert!((3.5..4.5).contains(&ratio), "errors {e1} {e2} {e3}");
    }
}

#[test]
fn a_fixed_step_factors_the_step_matrix_once() {
    // 1440 steps of 5 s, no corners: one factorisation serves them all.
    let a = model(POT);
    let r = run_with(&a, |s| s.step = Some(5.0), &RunOptions::default());
    assert_eq!(r.stats.steps, 1440);
    assert_eq!(r.stats.factorisations, 1);
    // A duration that is not a whole number of steps adds one shortened last step.
    let r = run_with(&a, |s| s.step = Some(7.0), &RunOptions::default());
    assert_eq!(r.stats.steps, 1029);
    assert_eq!(r.stats.factorisations, 2);
    assert!(matches!(r.mode, StepMode::Fixed(h) if h == 7.0));
}

#[test]
fn crossing_time_matches_the_closed_form() {
    // 20 + 60·exp(−t/2090) = 50 °C at t = 2090·ln 2 s.
    let src = format!("{POT}limit still_hot: temperature(stock) > 50 °C\n");
    let a = model(&src);
    let stock = a.network.node_id("stock").expect("node");
    let options = RunOptions {
        crossings: vec![(stock, C0 + 35.0)],
        ..RunOptions::default()
    };
    let (exact50, exact35) = (2090.0 * 2f64.ln(), 2090.0 * 4f64.ln());
    // The time error is the global temperature error (a few times the per-step tolerance)
    // divided by the cooling rate there (0.0144 K/s at 50 °C). Under local error control a
    // second-order method's global error scales as tolerance^(2/3): 10× tighter, about 4.6×
    // smaller.
    let mut errors = Vec::new();
    for tol in [0.01, 0.001] {
        let r = run_with(&a, |s| s.tolerance = Some(tol), &options);
        let first = r.limits[0]
            .first_failure
            .expect("limit fails during the run");
        assert!(!r.limits[0].result.passed);
        let c = &r.crossings[0];
        assert!(!c.rising);
        errors.push(((first - exact50).abs(), (c.time - exact35).abs()));
    }
    let (coarse, fine) = (errors[0], errors[1]);
    assert!(coarse.0 < 3.0 && coarse.1 < 3.0, "{errors:?}");
    assert!(fine.0 < 0.7 && fine.1 < 0.7, "{errors:?}");
    assert!(coarse.0 / fine.0 > 3.0, "{errors:?}");
}

fn reference_dir() -> std::path::PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join("../tests/reference/transient")
}

/// Run a generated model and compare every free node at the reference times.
fn check_reference(name: &str) -> (Analysis, RunResult) {
    let dir = reference_dir();
    let text = std::fs::read_to_string(dir.join(format!("{name}.heat"))).expect("model");
    let doc: serde_json::Value = serde_json::from_str(
        &std::fs::read_to_string(dir.join(format!("{name}.json"))).expect("reference"),
    )
    .expect("json");
    let times: Vec<f64> = doc["times_s"]
        .as_array()
        .expect("times")
        .iter()
        .filter_map(|v| v.as_f64())
        .collect();
    let tol = doc["tolerance_K"].as_f64().expect("tolerance");
    let a = model(&text);
    let options = RunOptions {
        times: Some(times.clone()),
        ..RunOptions::default()
    };
    let r = run_with(&a, |_| {}, &options);
    let mut failures = Vec::new();
    for (node, series) in doc["temperatures_K"].as_object().expect("temperatures") {
        for (k, t) in times.iter().enumerate() {
            let want = series[k].as_f64().expect("value");
            let got = at(&r, &a, node, *t);
            if (got - want).abs() > tol {
                failures.push(format!("{node} at {t} s: {got} K, reference {want} K"));
            }
        }
    }
    assert!(failures.is_empty(), "{name}:\n{}", failures.join("\n"));
    let scale = r
        .energy
        .boundaries
        .iter()
        .map(|b| b.1.abs())
        .fold(r.energy.stored.abs(), f64::max);
    assert!(
        r.energy.residual.abs() < 1e-9 * scale,
        "{name}: {:?}",
        r.energy
    );
    (a, r)
}

#[test]
fn two_node_network_matches_its_exact_eigen_solution() {
    check_reference("two_node");
}

#[test]
fn scheduled_inputs_and_a_node_without_capacity_match_the_matrix_exponential() {
    check_reference("ramp_network");
}

#[test]
fn a_stiff_network_stays_stable_and_accurate() {
    // Time constants from about 5 ms to over a day (ratio above 1e7, recorded by the generator).
    let doc: serde_json::Value = serde_json::from_str(
        &std::fs::read_to_string(reference_dir().join("stiff.json")).expect("reference"),
    )
    .expect("json");
    assert!(doc["stiffness_ratio"].as_f64().expect("ratio") > 1e6);
    let (a, r) = check_reference("stiff");
    // The automatic step grows far beyond the fastest time constant without oscillation.
    assert!(r.stats.largest_step > 1e5 * 5e-3, "{:?}", r.stats);
    assert!(r.stats.steps < 400, "{:?}", r.stats);
    // No ringing: the foil's temperature only falls (it starts hottest and settles towards the room).
    let foil = a.network.node_id("foil").expect("foil");
    let foil: Vec<f64> = r.temperatures.iter().map(|row| row[foil]).collect();
    assert!(foil.windows(2).all(|w| w[1] <= w[0] + 1e-9), "{foil:?}");
}

#[test]
fn a_fixed_step_far_beyond_the_fastest_time_constant_does_not_ring() {
    // L-stability: a 10-minute step on a 5 ms mode damps it instead of alternating its sign.
    let text = std::fs::read_to_string(reference_dir().join("stiff.heat")).expect("model");
    let a = model(&text);
    let r = run_with(&a, |s| s.step = Some(600.0), &RunOptions::default());
    let foil = a.network.node_id("foil").expect("foil");
    let block = a.network.node_id("block").expect("block");
    for row in &r.temperatures[1..] {
        // The foil sits between the block and the room, close to the block.
        let (f, b) = (row[foil], row[block]);
        assert!(f <= b + 1e-6 && f > C0 + 21.0, "foil {f} block {b}");
    }
    assert_eq!(r.stats.factorisations, 1);
}

#[test]
fn the_steady_limit_of_a_long_run_is_the_steady_solution() {
    // Loads and several storing nodes; after 40 slowest time constants the run must sit on the
    // steady solve of the same network.
    let src = "node room (fixed = 20 °C)\nnode ground (fixed = 8 °C)\nnode server (capacity = 30 kJ/K, load = 450 W, initial = 20 °C)\nnode rack (capacity = 80 kJ/K, initial = 20 °C)\nnode air\nnode slab (capacity = 2 MJ/K, initial = 10 °C)\nlink s_r: server to rack conductance(25 W/K)\nlink r_a: rack to air conductance(40 W/K)\nlink a_room: air to room conductance(30 W/K)\nlink a_slab: air to slab conductance(60 W/K)\nlink slab_ground: slab to ground conductance(15 W/K)\ntransient settle (duration = 40 d)\n";
    let a = model(src);
    let steady = a.solution.as_ref().expect("steady solution");
    let r = run_with(&a, |_| {}, &RunOptions::default());
    let last = r.temperatures.last().expect("final state");
    for (i, n) in a.network.nodes.iter().enumerate() {
        let c = r.recorded.iter().position(|&x| x == i).expect("recorded");
        assert!(
            (last[c] - steady.temperatures[i]).abs() < 1e-6,
            "{}: {} vs {}",
            n.name,
            last[c],
            steady.temperatures[i]
        );
    }
}

#[test]
fn energy_stored_plus_energy_out_equals_energy_in() {
    // A scheduled load and a daily outdoor schedule: Σ C·ΔT = Σ boundary heat + load energy.
    let src = "schedule weather (repeat = 24 h) {\n  0 h: -2 °C\n  14 h: 9 °C\n}\nschedule heater {\n  0 h: 0 W\n  3 h: 0 W\n  3.5 h: 800 W\n  9 h: 800 W\n  9.5 h: 0 W\n}\nnode outdoor (fixed = weather)\nnode cabin (capacity = 350 kJ/K, load = heater)\nnode walls (capacity = 4 MJ/K)\nlink in_film: cabin to walls conductance(45 W/K)\nlink out: walls to outdoor conductance(28 W/K)\nlink vent: cabin to outdoor conductance(6 W/K)\ntransient three_days (duration = 3 d)\n";
    let a = model(src);
    let r = run_with(&a, |_| {}, &RunOptions::default());
    let e = &r.energy;
    let delivered: f64 = e.boundaries.iter().map(|b| b.1).sum::<f64>() + e.loads;
    // The heater runs once: 5.5 h at 800 W and two 30-minute ramps averaging 400 W.
    let heater = (5.5 * 800.0 + 2.0 * 0.5 * 400.0) * 3600.0;
    assert!(
        (e.loads - heater).abs() < 1e-6 * heater,
        "{} vs {heater}",
        e.loads
    );
    assert!(
        (e.stored - delivered).abs() < 1e-9 * delivered.abs().max(e.loads),
        "{e:?}"
    );
}

#[test]
fn a_cancelled_run_returns_what_it_reached() {
    use std::sync::atomic::{AtomicBool, Ordering};
    let a = model(POT);
    let stop = AtomicBool::new(false);
    let mut steps = 0;
    let mut progress = |_t: f64, _d: f64| {
        steps += 1;
        if steps == 100 {
            stop.store(true, Ordering::Relaxed);
        }
    };
    let mut spec = a.studies.runs[0].clone();
    spec.step = Some(10.0);
    let r = run_transient(
        &a.network,
        &a.limits,
        &spec,
        &RunOptions::default(),
        Hooks {
            cancel: Some(&stop),
            progress: Some(&mut progress),
        },
    )
    .expect("run");
    assert!(r.interrupted);
    assert_eq!(r.stats.steps, 100);
    assert_eq!(r.stats.end_time, 1000.0);
    assert_eq!(*r.times.last().expect("times"), 1000.0);
    let last = r.temperatures.last().expect("row")[0];
    assert!((last - newton_cooling(1000.0)).abs() < 0.01);
    assert!(r.energy.residual.abs() < 1e-6);
}
