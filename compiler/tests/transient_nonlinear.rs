//! Transient runs of networks with nonlinear links (radiation, k(T)) checked against references
//! outside Caloris: the closed-form solution of lumped cooling by radiation alone, the steady
//! Newton solve as the long-run limit, and the first law over a run.

use caloris_compiler::source::NoImports;
use caloris_compiler::transient::model::RunSpec;
use caloris_compiler::transient::system::{HeatSystem, NetworkSystem};
use caloris_compiler::transient::{run_transient, Hooks, RunOptions, RunResult};
use caloris_compiler::{analyze, Analysis, Options};

const C0: f64 = 273.15;
/// Stefan–Boltzmann constant, W/(m²·K⁴) (CODATA 2018, exact in the SI since 2019).
const SIGMA: f64 = 5.670374419e-8;

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

fn run_with(a: &Analysis, edit: impl FnOnce(&mut RunSpec)) -> RunResult {
    let mut spec = a.studies.runs[0].clone();
    edit(&mut spec);
    run_transient(
        &a.network,
        &a.limits,
        &spec,
        &RunOptions::default(),
        Hooks::default(),
    )
    .expect("run")
}

fn column(r: &RunResult, a: &Analysis, node: &str) -> Vec<f64> {
    let n = a.network.node_id(node).expect("node");
    let c = r.recorded.iter().position(|&x| x == n).expect("recorded");
    r.temperatures.iter().map(|row| row[c]).collect()
}

/// A 0.2 kg steel bracket (92 J/K) at 500 °C cooling by radiation alone (ε = 0.8, 0.02 m²) in a
/// vacuum furnace whose walls stay at 20 °C — large surroundings, so A_x = ε·A.
const BRACKET: &str = "node bracket (capacity = 92 J/K, initial = 500 °C)\n\
node walls (fixed = 20 °C)\n\
link glow: bracket to walls radiation(emissivity = 0.8, area = 0.02 m^2)\n\
transient cool (duration = 3 h, output = 5 min)\n";

/// Time for a lumped body to cool by radiation alone from `t0` to `t` (kelvin) with
/// surroundings at `s`: the closed-form solution of C·dT/dt = −ε·σ·A·(T⁴ − s⁴),
///   time = C/(4εσA·s³) · [ln((s+T)/(T−s)) − ln((s+T0)/(T0−s)) + 2(atan(T/s) − atan(T0/s))]
/// (lumped capacitance with radiation only; integrate 1/(T⁴ − s⁴) by partial fractions:
/// the closed form has ln and arctan terms).
fn radiative_cooling_time(c: f64, eps_area: f64, s: f64, t0: f64, t: f64) -> f64 {
    c / (4.0 * eps_area * SIGMA * s.powi(3))
        * (((s + t) / (t - s)).ln() - ((s + t0) / (t0 - s)).ln()
            + 2.0 * ((t / s).atan() - (t0 / s).atan()))
}

/// Inverse of [`radiative_cooling_time`] by bisection (the time falls monotonically with T).
fn radiative_cooling_temperature(c: f64, eps_area: f64, s: f64, t0: f64, time: f64) -> f64 {
    let (mut lo, mut hi) = (s * (1.0 + 1e-12), t0);
    for _ in 0..200 {
        let mid = 0.5 * (lo + hi);
        if radiative_cooling_time(c, eps_area, s, t0, mid) > time {
            lo = mid;
        } else {
            hi = mid;
        }
    }
    0.5 * (lo + hi)
}

#[test]
fn the_run_reports_a_nonlinear_system() {
    let a = model(BRACKET);
    let sys = NetworkSystem::new(&a.network, 0.0);
    assert!(!sys.is_linear());
    assert!(!sys.symmetric());
    let lin = model(
        "node pot (capacity = 4 kJ/K, initial = 80 °C)\nnode room (fixed = 20 °C)\nlink lid: pot to room conductance(2 W/K)\ntransient cool (duration = 1 h)\n",
    );
    assert!(NetworkSystem::new(&lin.network, 0.0).is_linear());
}

#[test]
fn radiative_cooling_follows_the_closed_form() {
    let a = model(BRACKET);
    let r = run_with(&a, |_| {});
    let (c, eps_area, s, t0) = (92.0, 0.8 * 0.02, C0 + 20.0, C0 + 500.0);
    let temps = column(&r, &a, "bracket");
    assert!(
        temps.last().copied().unwrap_or(f64::NAN) < C0 + 150.0,
        "cools well down"
    );
    let mut worst = 0.0f64;
    for (time, &got) in r.times.iter().zip(&temps) {
        let exact = radiative_cooling_temperature(c, eps_area, s, t0, *time);
        worst = worst.max((got - exact).abs());
    }
    // Default tolerance 0.01 K per step; the global error stays within a few times that.
    assert!(worst < 0.05, "largest deviation {worst} K, {:?}", r.stats);
    eprintln!(
        "default tolerance: largest deviation {worst} K, {:?}",
        r.stats
    );
    // A tighter tolerance converges on the closed form (second-order method).
    let fine = run_with(&a, |s| s.tolerance = Some(1e-4));
    let mut worst_fine = 0.0f64;
    for (time, &got) in fine.times.iter().zip(&column(&fine, &a, "bracket")) {
        let exact = radiative_cooling_temperature(c, eps_area, s, t0, *time);
        worst_fine = worst_fine.max((got - exact).abs());
    }
    assert!(worst_fine < 5e-3, "largest deviation {worst_fine} K");
    assert!(worst_fine < worst / 4.0, "{worst_fine} vs {worst}");
    // Heat released equals C·(T0 − T_end) (first law against the closed form).
    let released = -r.energy.boundaries[0].1;
    let expected = c * (t0 - radiative_cooling_temperature(c, eps_area, s, t0, 3.0 * 3600.0));
    assert!(
        (released - expected).abs() < 1e-3 * expected,
        "{released} J vs {expected} J"
    );
}

#[test]
fn radiative_cooling_with_a_fixed_step_is_second_order() {
    let a = model(BRACKET);
    let worst = |h: f64| {
        let r = run_with(&a, |s| s.step = Some(h));
        r.times
            .iter()
            .zip(&column(&r, &a, "bracket"))
            .map(|(t, &got)| {
                (got - radiative_cooling_temperature(92.0, 0.016, C0 + 20.0, C0 + 500.0, *t)).abs()
            })
            .fold(0.0, f64::max)
    };
    let (e10, e5) = (worst(10.0), worst(5.0));
    assert!(e10 < 0.1, "largest deviation {e10} K with 10 s steps");
    // TR-BDF2 is second order: halving the step quarters the error.
    let ratio = e10 / e5;
    assert!((3.5..4.5).contains(&ratio), "{e10} K / {e5} K = {ratio}");
}

/// The oven door of examples/bakery_oven_door.heat with the glass storing heat, starting cold:
/// radiation on both faces and across the gap.
const DOOR: &str = "param pane = 0.60 m * 0.35 m\n\
material oven_glass (k = 1.1 W/(m*K))\n\
node oven_chamber (fixed = 250 °C)\n\
node bakery (fixed = 28 °C)\n\
node gap_stream (fixed = 45 °C)\n\
node inner_pane_in (capacity = 1.2 kJ/K, initial = 28 °C)\n\
node inner_pane_out (capacity = 1.2 kJ/K, initial = 28 °C)\n\
node outer_pane_in (capacity = 0.8 kJ/K, initial = 28 °C)\n\
node outer_pane_out\n\
link chamber_air: oven_chamber to inner_pane_in film(h = 18 W/(m^2*K), area = pane)\n\
link chamber_glow: oven_chamber to inner_pane_in radiation(emissivity = 0.9, area = pane)\n\
link inner_pane: inner_pane_in to inner_pane_out layer(oven_glass, thickness = 6 mm, area = pane)\n\
link gap_air_in: inner_pane_out to gap_stream film(h = 20 W/(m^2*K), area = pane)\n\
link gap_air_out: outer_pane_in to gap_stream film(h = 20 W/(m^2*K), area = pane)\n\
link gap_glow: inner_pane_out to outer_pane_in radiation(emissivity = 0.15, area = pane, emissivity_to = 0.15, area_to = pane, view_factor = 1)\n\
link outer_pane: outer_pane_in to outer_pane_out layer(oven_glass, thickness = 4 mm, area = pane)\n\
link bakery_air: outer_pane_out to bakery film(h = 8 W/(m^2*K), area = pane)\n\
link bakery_glow: outer_pane_out to bakery radiation(emissivity = 0.9, area = pane)\n\
limit touch: temperature(outer_pane_out) <= 60 °C\n\
limit door_loss: heat_flow(inner_pane) < 650 W\n\
transient warm (duration = 6 h, output = 30 min)\n";

#[test]
fn a_long_run_with_radiation_ends_at_the_steady_newton_solution() {
    let a = model(DOOR);
    let steady = a
        .solution
        .as_ref()
        .expect("steady solve")
        .temperatures
        .clone();
    let r = run_with(&a, |_| {});
    for node in [
        "inner_pane_in",
        "inner_pane_out",
        "outer_pane_in",
        "outer_pane_out",
    ] {
        let n = a.network.node_id(node).expect("node");
        let last = r.nodes[n].last;
        assert!(
            (last - steady[n]).abs() < 1e-6,
            "{node}: run ends at {last} K, steady Newton solve gives {} K",
            steady[n]
        );
        assert!(
            (r.nodes[n].initial - steady[n]).abs() > 1.0 || node == "outer_pane_out",
            "{node} starts away from the steady state"
        );
    }
    // The limits over the run read the links' own laws: the worst heat flow through the inner
    // pane is its steady value or above (it rises while the panes warm), and finite.
    let door_loss = &r.limits[1];
    let inner = a.network.link_id("inner_pane").expect("link");
    let steady_flow = a.network.links[inner].heat_flow(&steady);
    assert!(door_loss.result.actual.is_finite());
    assert!(
        door_loss.result.actual >= steady_flow - 1e-6,
        "{:?}",
        door_loss
    );
}

/// A kiln's spy-hole plug: a hot face radiating to the kiln interior, an insulating layer whose
/// conductivity rises with temperature (k(T)), and a steel cap with film and radiation to the
/// room. The kiln heats up on a schedule.
const PLUG: &str = "material fibre (k = 0.08 W/(m*K), k_slope = 2e-4 W/(m*K^2), k_at = 20 °C)\n\
schedule firing {\n  0 h: 20 °C\n  2 h: 900 °C\n}\n\
node kiln (fixed = firing)\n\
node room (fixed = 20 °C)\n\
node hot_face (capacity = 0.4 kJ/K)\n\
node mid (capacity = 0.3 kJ/K)\n\
node cap (capacity = 0.6 kJ/K)\n\
link glow_in: kiln to hot_face radiation(emissivity = 0.85, area = 0.01 m^2)\n\
link fibre_a: hot_face to mid layer(fibre, thickness = 40 mm, area = 0.01 m^2)\n\
link fibre_b: mid to cap layer(fibre, thickness = 40 mm, area = 0.01 m^2)\n\
link cap_air: cap to room film(h = 10 W/(m^2*K), area = 0.012 m^2)\n\
link cap_glow: cap to room radiation(emissivity = 0.7, area = 0.012 m^2)\n\
transient firing_up (duration = 4 h, output = 2 min)\n";

#[test]
fn energy_stored_plus_energy_out_equals_energy_in_with_radiation_and_k_of_t() {
    let a = model(PLUG);
    assert!(a
        .network
        .links
        .iter()
        .any(|l| matches!(l.law, caloris_compiler::network::LinkLaw::Conduction { .. })));
    let r = run_with(&a, |_| {});
    let kiln = a.network.node_id("kiln").expect("kiln");
    let delivered: f64 = r.energy.boundaries.iter().map(|b| b.1).sum();
    let into = r
        .energy
        .boundaries
        .iter()
        .find(|b| b.0 == kiln)
        .expect("kiln")
        .1;
    assert!(into > 1e5, "the kiln delivers heat: {into} J");
    // First law: stored = delivered by the boundaries (no loads), to round-off.
    assert!(
        (r.energy.stored - delivered).abs() < 1e-9 * into,
        "stored {} J, delivered {} J",
        r.energy.stored,
        delivered
    );
    // Stored heat from the temperatures alone: Σ C·ΔT.
    let c = [("hot_face", 400.0), ("mid", 300.0), ("cap", 600.0)];
    let stored: f64 = c
        .iter()
        .map(|(n, c)| {
            let t = &r.nodes[a.network.node_id(n).expect("node")];
            c * (t.last - t.initial)
        })
        .sum();
    assert!((stored - r.energy.stored).abs() < 1e-9 * stored.abs());
    // The boundary heat recorded every 2 min, integrated by the trapezoidal rule, agrees with
    // the run's own energy account (an independent quadrature, so only to its accuracy).
    let k = r
        .fixed_nodes
        .iter()
        .position(|&n| n == kiln)
        .expect("fixed");
    let trapezoid: f64 = r
        .times
        .windows(2)
        .zip(r.boundary_heat.windows(2))
        .map(|(t, q)| 0.5 * (t[1] - t[0]) * (q[0][k] + q[1][k]))
        .sum();
    assert!(
        (trapezoid - into).abs() < 5e-3 * into,
        "trapezoid {trapezoid} J vs {into} J"
    );
}
