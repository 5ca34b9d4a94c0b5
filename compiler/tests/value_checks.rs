//! Values the solver cannot compute with: materials that fail their k(T) check, inputs out of
//! range, and solutions that must not be reported (E504).

use caloris_compiler::results::Solution;
use caloris_compiler::solve::Temperatures;
use caloris_compiler::source::NoImports;
use caloris_compiler::{analyze, Analysis, Options};

fn analyse(text: &str) -> Analysis {
    analyze("model.heat", text, &NoImports, &Options::default())
}

fn codes(a: &Analysis) -> Vec<&str> {
    a.diagnostics
        .iter()
        .filter(|d| d.is_error())
        .map(|d| d.code)
        .collect()
}

fn conductance(a: &Analysis, link: &str) -> Option<f64> {
    a.network
        .links
        .iter()
        .find(|l| l.name == link)
        .map(|l| l.conductance())
}

const FAILED_KT: &str =
    include_str!("../../tests/cases/reliability/kt_failed_materials_keep_no_slot.heat");

#[test]
fn a_failed_kt_material_leaves_its_links_out_and_the_next_materials_their_own_values() {
    let a = analyse(FAILED_KT);
    // Only the materials' own errors: no panic, no echo at the links that use them.
    assert_eq!(codes(&a), ["E101", "E203"]);
    assert_eq!(conductance(&a, "l_foam"), None);
    assert_eq!(conductance(&a, "l_cork"), None);
    // Fourier's law for a plane layer, G = k·A/L, by hand:
    // brick 0.5 W/(m·K) × 2 m² / 0.1 m = 10 W/K; stone 2 × 2 / 0.1 = 40 W/K.
    let g = |l| conductance(&a, l).expect("link built");
    assert!((g("l_brick") - 10.0).abs() < 1e-12, "{}", g("l_brick"));
    assert!((g("l_stone") - 40.0).abs() < 1e-12, "{}", g("l_stone"));
    assert!(a
        .materials
        .iter()
        .all(|m| m.name != "foam" && m.name != "cork"));
}

#[test]
fn the_same_model_with_the_kt_declarations_mended_solves_to_the_hand_calculation() {
    let mended = FAILED_KT
        .replace("k_slope = 2 W/(m*K)", "k_slope = 0.0002 W/(m*K^2)")
        .replace(
            "k_slope = 0.0001 W/(m*K^2))",
            "k_slope = 0.0001 W/(m*K^2), k_at = 10 °C)",
        )
        .lines()
        .filter(|l| !l.starts_with("link l_foam") && !l.starts_with("link l_cork"))
        .collect::<Vec<_>>()
        .join("\n");
    let a = analyse(&mended);
    assert_eq!(codes(&a), Vec::<&str>::new());
    let sol = a.solution.as_ref().expect("solved");
    let mid = a
        .network
        .nodes
        .iter()
        .position(|n| n.name == "mid")
        .expect("node");
    // G_brick = 10 W/K, G_stone = 40 W/K: T = (10 × 100 °C + 40 × 0 °C) / 50 = 20 °C.
    assert!((sol.temperatures[mid] - 293.15).abs() < 1e-9);
}

#[test]
fn out_of_range_values_name_the_parameter_and_its_owner() {
    let a = analyse(
        "node a (fixed = 20 °C)\nnode b (fixed = 0 °C, load = 2e31 W)\nlink l: a to b film(h = 8 W/(m^2*K), area = 1e-31 m^2)\n",
    );
    let messages: Vec<_> = a
        .diagnostics
        .iter()
        .filter(|d| d.code == "E108")
        .map(|d| d.message.as_str())
        .collect();
    assert_eq!(
        messages,
        [
            "`load` of node `b` is 2e31 W, too large to compute with",
            "`area` of `film` in link `l` is 1e-31 m², too small to compute with",
        ]
    );
    let help = a.diagnostics[1].help.as_deref().unwrap_or("");
    assert!(help.contains("between 1e-30 m² and 1e30 m²"), "{help}");
}

#[test]
fn values_at_the_ends_of_the_range_are_accepted() {
    let a = analyse(
        "node a (fixed = 1e6 K)\nnode b (fixed = 1 K)\nlink l: a to b film(h = 1e-15 W/(m^2*K), area = 1e-15 m^2)\nlink m: a to b resistance(1e30 K/W)\n",
    );
    assert_eq!(codes(&a), Vec::<&str>::new());
    assert!(a.solution.is_some());
}

#[test]
fn a_solution_with_a_non_finite_value_is_unusable() {
    let a = analyse(
        "node a (fixed = 20 °C)\nnode b (fixed = 0 °C)\nnode c\nlink l: a to c resistance(1 K/W)\nlink m: c to b resistance(1 K/W)\n",
    );
    let sol = a.solution.as_ref().expect("solved");
    assert!(sol.unusable(&a.network).is_none());
    let mut t = sol.temperatures.clone();
    t[2] = f64::NAN;
    let broken = Solution::new(&a.network, Temperatures(t), &[]);
    let d = broken.unusable(&a.network).expect("E504");
    assert_eq!(d.code, "E504");
    assert!(d.message.contains("node `c`"), "{}", d.message);
    // A finite temperature that no heat balance supports: 100 °C between 20 °C and 0 °C
    // boundaries leaves 160 W unaccounted for at `c`.
    let mut t = sol.temperatures.clone();
    t[2] = 373.15;
    let d = Solution::new(&a.network, Temperatures(t), &[])
        .unusable(&a.network)
        .expect("E504");
    assert!(d.message.contains("energy balance"), "{}", d.message);
}

/// A range error names what the argument belongs to and the parameter, and shows the value
/// that came through a `param` (a reviewer need not work it out).
#[test]
fn a_range_error_names_the_element_and_the_value_of_a_parameter() {
    let a = analyse(
        "param t = 5 mm - 8 mm\nmaterial wool (k = 0.04 W/(m*K))\nnode a (fixed = 1 °C)\nnode b (fixed = 2 °C)\n\
         buildup lagged {\n  lagging: cylinder(wool, thickness = t)\n  outside: film(h = 9 W/(m^2*K))\n}\n\
         link main: a to b lagged(inner_radius = 27 mm, length = 1 m)\n\
         link glow: a to b radiation(area = 1 m^2, emissivity = 2)\n",
    );
    let messages: Vec<&str> = a
        .diagnostics
        .iter()
        .filter(|d| d.is_error())
        .map(|d| d.message.as_str())
        .collect();
    assert_eq!(
        messages,
        [
            "`cylinder` (`lagging` of build-up `lagged`) in link `main`: thickness must be greater than zero; `t` (= -0.003 m) is not",
            "`radiation` in link `glow`: emissivity must lie between 0 and 1; `2` is not",
        ],
        "{:?}",
        a.diagnostics
    );
}
