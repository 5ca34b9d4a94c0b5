//! Every convection correlation against `ht` 1.2.0 at points inside its range
//! (tests/reference/films/correlations.json, written by tests/reference/gen_films.py; each
//! entry's source function is named in the file's `sources`).

use caloris_compiler::convection::correlations as c;
use serde_json::Value;

fn reference() -> Value {
    let text = std::fs::read_to_string(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/../tests/reference/films/correlations.json"
    ))
    .expect("tests/reference/films/correlations.json");
    serde_json::from_str(&text).expect("valid JSON")
}

fn f(p: &Value, k: &str) -> f64 {
    p[k].as_f64().unwrap_or_else(|| panic!("`{k}` in {p}"))
}

/// Compare `ours` with ht's Nusselt number at every point of `key` (1e-12 relative: the same
/// formula evaluated in another language).
fn check(key: &str, ours: impl Fn(&Value) -> f64) {
    let r = reference();
    let points = r["points"][key].as_array().expect(key);
    assert!(points.len() >= 3, "{key}: several points");
    for p in points {
        let (got, want) = (ours(p), f(p, "nu"));
        assert!(
            (got - want).abs() <= 1e-12 * want.abs(),
            "{key} at {p}: {got} against {want} from {}",
            r["sources"][key]
        );
    }
}

#[test]
fn natural_convection_against_ht_conv_free_immersed() {
    check("vertical_plate_churchill_chu", |p| {
        c::vertical_plate_churchill_chu(f(p, "ra"), f(p, "pr"))
    });
    check("horizontal_cylinder_churchill_chu", |p| {
        c::horizontal_cylinder_churchill_chu(f(p, "ra"), f(p, "pr"))
    });
    check("plate_facing_up_lloyd_moran", |p| {
        c::plate_facing_up_lloyd_moran(f(p, "ra"))
    });
    check("plate_facing_down_mcadams", |p| {
        c::plate_facing_down_mcadams(f(p, "ra"))
    });
    check("sphere_churchill", |p| {
        c::sphere_churchill(f(p, "ra"), f(p, "pr"))
    });
}

#[test]
fn forced_external_flow_against_ht_conv_external() {
    check("cylinder_crossflow_churchill_bernstein", |p| {
        c::cylinder_crossflow_churchill_bernstein(f(p, "re"), f(p, "pr"))
    });
    check("plate_laminar_pohlhausen", |p| {
        c::plate_laminar_pohlhausen(f(p, "re"), f(p, "pr"))
    });
    check("plate_turbulent_schlichting", |p| {
        c::plate_turbulent_schlichting(f(p, "re"), f(p, "pr"))
    });
    check("plate_mixed", |p| c::plate_mixed(f(p, "re"), f(p, "pr")));
}

#[test]
fn pipe_flow_against_ht_conv_internal() {
    check("pipe_gnielinski", |p| {
        let re = f(p, "re");
        // The friction factor Caloris uses is the one the reference used.
        assert!((c::petukhov_friction(re) - f(p, "f")).abs() <= 1e-14);
        c::pipe(re, f(p, "pr"), false).0
    });
    let lam = &reference()["points"]["pipe_laminar"];
    assert_eq!(c::pipe(1000.0, 0.7, false).0, f(lam, "wall_temperature"));
    assert!((c::pipe(1000.0, 0.7, true).0 - f(lam, "heat_flux")).abs() < 1e-15);
}

#[test]
fn pipe_flow_is_continuous_through_the_transition() {
    // Interpolated between 2300 and 3000 (docs/elements.md): no jump at either end.
    for wall in [false, true] {
        let below = c::pipe(2300.0 - 1e-9, 7.0, wall).0;
        let at = c::pipe(2300.0, 7.0, wall).0;
        assert!((below - at).abs() < 1e-9);
        let top = c::pipe(3000.0 - 1e-9, 7.0, wall).0;
        let turbulent = c::pipe(3000.0, 7.0, wall).0;
        assert!((top - turbulent).abs() < 1e-6 * turbulent);
    }
}
