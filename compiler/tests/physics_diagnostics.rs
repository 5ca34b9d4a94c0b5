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

/// The whole radial build-up is judged: a thin insulation on a small steel pipe, under an
/// aluminium jacket, raises the loss over the bare pipe; the warning names the insulation, not
/// the jacket, and gives the break-even radius.
#[test]
fn thin_insulation_under_a_metal_jacket_raises_the_loss() {
    insta::assert_snapshot!(rendered(
        "material steel (k = 50 W/(m*K))\nmaterial foam (k = 0.2 W/(m*K))\nmaterial aluminium (k = 200 W/(m*K))\nnode water (fixed = 80 °C)\nnode room (fixed = 20 °C)\nbuildup lagged {\n  wall:   cylinder(steel, thickness = 2 mm)\n  foam:   cylinder(foam, thickness = 3 mm)\n  jacket: cylinder(aluminium, thickness = 0.5 mm)\n  air:    film(h = 10 W/(m^2*K))\n}\nlink tube: water to room lagged(inner_radius = 6 mm, length = 2 m)\n"
    ));
}

/// A metal jacket over thick insulation: no warning (its own k/h is metres, but the
/// insulation under it cuts the loss).
#[test]
fn a_metal_jacket_over_thick_insulation_gives_no_warning() {
    insta::assert_snapshot!(rendered(
        "material steel (k = 50 W/(m*K))\nmaterial wool (k = 0.04 W/(m*K))\nmaterial aluminium (k = 200 W/(m*K))\nnode steam (fixed = 165 °C)\nnode hall (fixed = 22 °C)\nbuildup lagged {\n  wall:   cylinder(steel, thickness = 5 mm)\n  wool:   cylinder(wool, thickness = 50 mm)\n  jacket: cylinder(aluminium, thickness = 0.8 mm)\n  air:    film(h = 9 W/(m^2*K))\n}\nlink main: steam to hall lagged(inner_radius = 40 mm, length = 25 m)\n"
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

/// The numbers of the whole-build-up check against tests/reference/gen_insulation.py (shell
/// resistances from ht 1.2.0 `R_cylinder`, Newton's law of cooling at the outer radius, the
/// break-even radius by scipy 1.17.1 `brentq`).
#[test]
fn insulation_loss_and_break_even_radius_against_ht_and_brentq() {
    use caloris_compiler::insulation_loss::{RadialBuildup, Shell};
    let reference: serde_json::Value = serde_json::from_str(include_str!(
        "../../tests/reference/insulation/break_even.json"
    ))
    .expect("reference JSON");
    let case = &reference["cases"][0];
    let shell = |index, k, r_in, r_out| Shell {
        index,
        k,
        r_in,
        r_out,
    };
    let b = RadialBuildup {
        spherical: false,
        length: 2.0,
        shells: vec![
            shell(0, 50.0, 0.006, 0.008),
            shell(1, 0.2, 0.008, 0.011),
            shell(2, 200.0, 0.011, 0.0115),
        ],
        h: 10.0,
        other: 0.0,
    };
    let c = b.compare().expect("insulated");
    let close = |a: f64, b: f64| (a / b - 1.0).abs() < 1e-9;
    assert_eq!(c.outermost, 1);
    assert!(close(
        c.watts(60.0),
        case["extra_loss_W"].as_f64().expect("W")
    ));
    assert!(close(
        c.percent(),
        case["extra_loss_percent"].as_f64().expect("%")
    ));
    assert!(close(
        c.break_even.expect("breaks even"),
        case["break_even_radius_m"].as_f64().expect("r")
    ));
}
