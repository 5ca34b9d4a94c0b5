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
