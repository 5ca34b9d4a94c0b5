//! Snapshots of the diagnostics the physics elements give for impossible geometry and risky
//! designs: the source with the error, as a person reads it in a terminal.

use caloris_compiler::render::render_diagnostics;
use caloris_compiler::source::NoImports;
use caloris_compiler::{analyze, Options};

fn rendered(src: &str) -> String {
    let a = analyze(
        "model.heat",
        src,
        &NoImports,
        &Options {
            check_only: true,
            ..Options::default()
        },
    );
    render_diagnostics(&a.diagnostics, &a.sources, false)
}

#[test]
fn shell_outer_radius_not_above_inner() {
    insta::assert_snapshot!(rendered(
        "node a (fixed = 80 °C)\nnode b (fixed = 10 °C)\nlink s: a to b cylinder(k = 0.04 W/(m*K), inner_radius = 30 mm, outer_radius = 20 mm, length = 1 m)\n"
    ));
}

#[test]
fn critical_insulation_radius_warning() {
    insta::assert_snapshot!(rendered(
        "material pvc (k = 0.16 W/(m*K))\nnode core (fixed = 60 °C)\nnode air (fixed = 20 °C)\nbuildup jacketed {\n  jacket:  cylinder(pvc, thickness = 2 mm)\n  outside: film(h = 8 W/(m^2*K))\n}\nlink cable: core to air jacketed(inner_radius = 1 mm, length = 1 m)\n"
    ));
}

#[test]
fn view_factor_breaking_reciprocity() {
    insta::assert_snapshot!(rendered(
        "node a (fixed = 300 °C)\nnode b (fixed = 20 °C)\nlink r: a to b radiation(emissivity = 0.9, area = 4 m^2, emissivity_to = 0.8, area_to = 1 m^2, view_factor = 0.5)\n"
    ));
}

#[test]
fn buried_pipe_breaking_the_surface() {
    insta::assert_snapshot!(rendered(
        "node a (fixed = 50 °C)\nnode b (fixed = 5 °C)\nlink p: a to b buried_pipe(k = 1.2 W/(m*K), diameter = 200 mm, depth = 80 mm, length = 10 m)\n"
    ));
}

#[test]
fn thick_fin_warning_and_fractional_count() {
    insta::assert_snapshot!(rendered(
        "node a (fixed = 60 °C)\nnode b (fixed = 20 °C)\nlink f: a to b fin(k = 0.5 W/(m*K), length = 20 mm, thickness = 10 mm, width = 20 mm, h = 30 W/(m^2*K))\nlink g: a to b fin(k = 200 W/(m*K), length = 20 mm, diameter = 3 mm, h = 20 W/(m^2*K), count = 2.5)\n"
    ));
}

#[test]
fn repetition_without_first_and_an_open_port() {
    insta::assert_snapshot!(rendered(
        "node a (fixed = 1 °C)\nrepeat seg (count = 4) {\n  node t\n  link l: previous.t to t resistance(1 K/W)\n}\nnetwork wall (inside, outside) {\n  link l: inside to outside resistance(1 K/W)\n}\nuse w: wall(inside = a)\n"
    ));
}

#[test]
fn newton_failure_is_an_error() {
    let src = "node oven (fixed = 220 °C)\nnode room (fixed = 22 °C)\nnode glass\nlink r: oven to glass radiation(emissivity = 0.9, area = 0.2 m^2)\nlink f: glass to room film(h = 8 W/(m^2*K), area = 0.2 m^2)\n";
    let a = analyze(
        "model.heat",
        src,
        &NoImports,
        &Options {
            newton_max_iterations: Some(1),
            ..Options::default()
        },
    );
    insta::assert_snapshot!(render_diagnostics(&a.diagnostics, &a.sources, false));
}
