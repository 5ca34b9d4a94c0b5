//! Capacity figures: the network's slowest and fastest time constants against scipy's
//! generalised eigenproblem (tests/reference/gen_time_constants.py), a single node's R·C
//! against Newton's law of cooling (τ = R·C), and the Biot number reported without a warning.

use caloris_compiler::source::NoImports;
use caloris_compiler::{analyze, Analysis, Options};

fn solved(text: &str) -> Analysis {
    let a = analyze("model.heat", text, &NoImports, &Options::default());
    assert!(!a.has_errors(), "{:?}", a.diagnostics);
    assert!(a.solution.is_some());
    a
}

const SMALL_NETWORK: &str = "node ambient (fixed = 20 °C)
node board (capacity = 1000 J/K, load = 10 W)
node case_top (capacity = 500 J/K)
node joint
node chassis (capacity = 2000 J/K)
link board_case: board to case_top resistance(r = 0.5 K/W)
link case_joint: case_top to joint resistance(r = 0.2 K/W)
link joint_chassis: joint to chassis resistance(r = 0.3 K/W)
link joint_air: joint to ambient resistance(r = 1 K/W)
link chassis_air: chassis to ambient resistance(r = 2 K/W)
link board_air: board to ambient resistance(r = 4 K/W)
";

/// scipy 1.17.1 `linalg.eigh(G_red, C)` after eliminating the node without capacity (numpy
/// 2.4.6), checked in the generator against the decay of the slowest mode by `solve_ivp`.
#[test]
fn slowest_and_fastest_time_constants_against_scipy_eigh() {
    let reference: serde_json::Value = serde_json::from_str(include_str!(
        "../../tests/reference/time_constants/small_network.json"
    ))
    .expect("reference JSON");
    let a = solved(SMALL_NETWORK);
    let tc = a
        .solution
        .as_ref()
        .and_then(|s| s.time_constants)
        .expect("time constants");
    let close = |x: f64, key: &str| {
        let want = reference[key].as_f64().expect(key);
        assert!((x / want - 1.0).abs() < 1e-10, "{key}: {x} vs {want}");
    };
    close(tc.slowest, "slowest_s");
    close(tc.fastest, "fastest_s");
    assert_eq!(tc.modes, 3);
}

/// One capacity node on one film: τ = R·C = C/(h·A) (Newton's law of cooling), which is also
/// the network's only time constant; its Biot number h·(V/A)/k is reported below 0.1 too.
#[test]
fn a_single_lumped_body_has_time_constant_rc_and_its_biot_number() {
    let a = solved(
        "material steel (k = 45 W/(m*K), density = 7850 kg/m^3, specific_heat = 460 J/(kg*K))
node air (fixed = 20 °C)
node ball (material = steel, volume = 1e-4 m^3, initial = 200 °C)
link cooling: ball to air film(h = 25 W/(m^2*K), area = 0.0105 m^2)
",
    );
    let sol = a.solution.as_ref().expect("solved");
    let c = 7850.0 * 460.0 * 1e-4;
    let rc = c / (25.0 * 0.0105);
    let node = &sol.capacity_nodes[0];
    assert!((node.capacity / c - 1.0).abs() < 1e-12);
    let (tau, link) = node.rc.expect("one path");
    assert!((tau / rc - 1.0).abs() < 1e-12, "{tau} vs {rc}");
    assert_eq!(a.network.links[link].name, "cooling");
    let tc = sol.time_constants.expect("time constants");
    assert!((tc.slowest / rc - 1.0).abs() < 1e-12);
    assert!((tc.fastest / rc - 1.0).abs() < 1e-12);
    // Bi = h·(V/A)/k = 25 × (1e-4 / 0.0105) / 45, by hand; below 0.1, so no warning W701.
    let bi = 25.0 * (1e-4 / 0.0105) / 45.0;
    assert!((node.biot.expect("biot") / bi - 1.0).abs() < 1e-12);
    assert!(a.diagnostics.iter().all(|d| d.code != "W701"));
}
