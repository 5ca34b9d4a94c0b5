//! Computed convection films inside the solves: at the steady answer the surface temperature
//! and h agree (the reported h, area and temperatures give back the heat flow, and the surface
//! balance closes); in a transient run h follows the temperatures, checked against an
//! independent fourth-order Runge–Kutta integration of the same lumped body written here, and
//! the run ends at the steady answer with the first law closed.

use caloris_compiler::network::LinkLaw;
use caloris_compiler::source::NoImports;
use caloris_compiler::transient::{run_transient, Hooks, RunOptions};
use caloris_compiler::{analyze, Analysis, Options};

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

/// An LED driver (6 W) in a small aluminium box on a shelf: the heat leaves through a side
/// wall by natural convection and radiation, and through the lid facing up.
const DRIVER_BOX: &str = "node box (load = 6 W)\n\
node room (fixed = 24 °C)\n\
link side: box to room natural_wall(fluid = air, height = 0.12 m, area = 0.048 m^2, emissivity = 0.85)\n\
link lid:  box to room natural_plate(fluid = air, facing = up, length = 0.05 m, area = 0.04 m^2)\n";

#[test]
fn at_the_answer_h_and_the_surface_temperature_agree() {
    let a = model(DRIVER_BOX);
    let sol = a.solution.as_ref().expect("solved");
    assert!(sol.convergence.is_some(), "solved by Newton's method");
    let box_t = sol.temperatures[a.network.node_id("box").expect("box")];
    let room_t = sol.temperatures[a.network.node_id("room").expect("room")];
    assert_eq!(sol.films.len(), 2);
    let mut total = 0.0;
    for f in &sol.films {
        let link = &a.network.links[f.link];
        let area = link.area.expect("area");
        // Newton's law of cooling with the reported h, plus the reported radiation.
        let q = f.state.h * area * (box_t - room_t) + f.state.q_radiation;
        assert!((q - sol.heat_flows[f.link]).abs() < 1e-9, "{}", link.name);
        // The Stefan–Boltzmann law with the exact σ for the radiative part.
        let eps = if link.name == "side" { 0.85 } else { 0.0 };
        let q_rad = eps * 5.670374419e-8 * area * (box_t.powi(4) - room_t.powi(4));
        assert!((f.state.q_radiation - q_rad).abs() < 1e-12);
        assert!((f.state.property_temperature - 0.5 * (box_t + room_t)).abs() < 1e-12);
        total += sol.heat_flows[f.link];
    }
    // The box's balance: all of the 6 W leaves through the two films.
    assert!((total - 6.0).abs() < 1e-9, "{total}");
}

/// A 3 L stock pot of water (12.5 kJ/K with its steel) at 95 °C left on a worktop, cooling
/// through its side (a vertical wall) to kitchen air at 21 °C.
const STOCK_POT: &str = "node pot (capacity = 12.5 kJ/K, initial = 95 °C)\n\
node kitchen (fixed = 21 °C)\n\
link side: pot to kitchen natural_wall(fluid = air, height = 0.16 m, area = 0.1 m^2, emissivity = 0.3)\n\
transient cool (duration = 4 h, output = 30 min)\n";

#[test]
fn in_a_transient_run_h_follows_the_temperatures() {
    let a = model(STOCK_POT);
    let spec = a.studies.runs[0].clone();
    let r = run_transient(
        &a.network,
        &a.limits,
        &spec,
        &RunOptions::default(),
        Hooks::default(),
    )
    .expect("run");
    let pot = a.network.node_id("pot").expect("pot");
    let col = r.recorded.iter().position(|&x| x == pot).expect("recorded");
    let link = &a.network.links[0];
    let LinkLaw::Convection(film) = &link.law else {
        panic!("a computed film")
    };
    let (c, t_air) = (12.5e3, 21.0 + 273.15);
    // Reference: C·dT/dt = −Q(T), classical RK4 with 1 s steps (independent of the run's
    // TR-BDF2 integrator and its error control).
    let dtdt = |t: f64| -film.heat_flow(t, t_air) / c;
    let (mut t, mut time, h): (f64, f64, f64) = (95.0 + 273.15, 0.0, 1.0);
    for (k, &out) in r.times.iter().enumerate() {
        while time < out - 1e-9 {
            let step = h.min(out - time);
            let k1 = dtdt(t);
            let k2 = dtdt(t + 0.5 * step * k1);
            let k3 = dtdt(t + 0.5 * step * k2);
            let k4 = dtdt(t + step * k3);
            t += step / 6.0 * (k1 + 2.0 * k2 + 2.0 * k3 + k4);
            time += step;
        }
        let got = r.temperatures[k][col];
        // The run's default automatic step holds 0.01 K per step (docs/transient.md).
        assert!((got - t).abs() < 0.03, "at {out} s: {got} K against {t} K");
    }
    // Cooling slows as h falls with the temperature difference: each half hour loses less.
    let drops: Vec<f64> = r
        .temperatures
        .windows(2)
        .map(|w| w[0][col] - w[1][col])
        .collect();
    assert!(drops.windows(2).all(|d| d[1] < d[0]), "{drops:?}");
    // The first law over the run.
    assert!(r.energy.residual.abs() < 1e-6 * r.energy.stored.abs());
}

#[test]
fn a_loaded_body_settles_at_the_steady_answer() {
    let src = "node drum (capacity = 40 kJ/K, initial = 20 °C, load = 150 W)\n\
node shed (fixed = 12 °C)\n\
link skin: drum to shed natural_cylinder(fluid = air, diameter = 0.58 m, area = 1.6 m^2)\n\
transient warm (duration = 3 d, output = 6 h)\n";
    let a = model(src);
    let steady = a.solution.as_ref().expect("steady solve").temperatures[0];
    let r = run_transient(
        &a.network,
        &a.limits,
        &a.studies.runs[0],
        &RunOptions::default(),
        Hooks::default(),
    )
    .expect("run");
    let last = r.temperatures.last().expect("rows")[0];
    assert!((last - steady).abs() < 0.02, "{last} K against {steady} K");
}
