//! Snapshots of the diagnostics for schedules, capacities, cases and transient runs, rendered
//! with the source as a person sees them in a terminal.

use caloris_compiler::render::render_diagnostics;
use caloris_compiler::source::NoImports;
use caloris_compiler::{analyze, Options};

fn render(src: &str) -> String {
    let a = analyze(
        "model.heat",
        src,
        &NoImports,
        &Options {
            check_only: true,
            ..Options::default()
        },
    );
    let codes: Vec<&str> = a.diagnostics.iter().map(|d| d.code).collect();
    format!(
        "codes: {codes:?}\n\n{}",
        render_diagnostics(&a.diagnostics, &a.sources, false)
    )
}

const BASE: &str =
    "node outdoor (fixed = -2 °C)\nnode shed\nlink wall: shed to outdoor conductance(3 W/K)\n";

#[test]
fn schedule_rows_out_of_order_and_outside_the_period() {
    let src = format!("{BASE}schedule night (repeat = 24 h) {{\n  0 h: 3 °C\n  6 h: -4 °C\n  5 h: -3 °C\n  26 h: 2 °C\n}}\n");
    insta::assert_snapshot!(render(&src));
}

#[test]
fn schedule_values_of_two_kinds() {
    let src = format!("{BASE}schedule mixed {{\n  0 h: 3 °C\n  6 h: 40 W\n  8 h: 2 K\n}}\nschedule empty (repeat = 1 d)\n");
    insta::assert_snapshot!(render(&src));
}

#[test]
fn a_schedule_that_does_not_fit_its_use() {
    let src = "schedule heater {\n  0 h: 0 W\n  2 h: 500 W\n}\nschedule swing {\n  0 h: 2 Δ°C\n  6 h: 5 Δ°C\n}\nnode outdoor (fixed = heater)\nnode yard (fixed = swing)\nnode shed (load = swing)\nlink a: shed to outdoor conductance(3 W/K)\nlink b: shed to yard conductance(3 W/K)\n";
    insta::assert_snapshot!(render(src));
}

#[test]
fn capacity_arguments_that_do_not_fit() {
    let src = "material oak (k = 0.17 W/(m*K), density = 700 kg/m^3)\nmaterial felt (k = 0.05 W/(m*K))\nnode outdoor (fixed = -2 °C, capacity = 5 kJ/K)\nnode bench (material = oak, volume = 0.02 m^3)\nnode lid (capacity = 2 kJ/K, material = oak, mass = 3 kg)\nnode pad (material = felt)\nnode cushion (mass = 2 kg)\nnode floor (initial = 5 °C)\nnode seat (material = oka, volume = 1 L)\nlink a: bench to outdoor conductance(1 W/K)\nlink b: lid to outdoor conductance(1 W/K)\nlink c: pad to outdoor conductance(1 W/K)\nlink d: cushion to outdoor conductance(1 W/K)\nlink e: floor to outdoor conductance(1 W/K)\nlink f: seat to outdoor conductance(1 W/K)\n";
    insta::assert_snapshot!(render(src));
}

#[test]
fn cases_and_runs_that_do_not_fit() {
    let src = format!(
        "param t_out = -2 °C\nparam gap = 5 mm\n{BASE}case winter (t_outt = -10 °C, gap = 3 W, shed = 2 °C)\ncase bad (t_out = 4 K)\ntransient night (step = 1 min, tolerance = 20 °C)\ntransient fine (duration = 10 d, step = 1 ms)\ntransient other (duration = 2 h, pace = 3 s)\n"
    );
    insta::assert_snapshot!(render(&src));
}

#[test]
fn a_body_that_is_not_lumped_and_a_run_with_nothing_to_store() {
    // Biot number of a 0.3 m steel cube in a 25 W/(m²·K) film: Lc = V/A = 0.3³/0.3² ... with
    // the film on one face, Lc = 0.3 m and Bi = 25 · 0.3 / 45 = 0.167.
    let src = "material steel (k = 45 W/(m*K), density = 7850 kg/m^3, specific_heat = 460 J/(kg*K))\nnode air (fixed = 20 °C)\nnode anvil (material = steel, volume = 0.027 m^3, initial = 300 °C)\nlink top: anvil to air film(h = 25 W/(m^2*K), area = 0.09 m^2)\ntransient cool (duration = 12 h)\n";
    insta::assert_snapshot!(render(src));
    let src = format!("{BASE}transient quick (duration = 1 h)\n");
    insta::assert_snapshot!(render(&src));
}

#[test]
fn broken_tables() {
    let src = "schedule a {\n  0 h 3 °C\n  2 h: 4 °C 5\n  4 h: \n}\nschedule b {\n  0 h: 1 °C\nnode x (fixed = 1 °C)\n";
    insta::assert_snapshot!(render(src));
}
