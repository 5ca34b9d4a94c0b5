//! Newton's method on networks with radiation: convergence is reported, failure is an error,
//! and solutions obey the maximum principle and close the heat balance.

use caloris_compiler::source::NoImports;
use caloris_compiler::{analyze, Options};
use proptest::prelude::*;

const OVEN: &str =
    "node oven (fixed = 220 °C)\nnode kitchen (fixed = 22 °C)\nnode glass_in\nnode glass_out\n\
link conv_in: oven to glass_in film(h = 12 W/(m^2*K), area = 0.2 m^2)\n\
link rad_in: oven to glass_in radiation(emissivity = 0.9, area = 0.2 m^2)\n\
link glass: glass_in to glass_out layer(k = 1 W/(m*K), thickness = 6 mm, area = 0.2 m^2)\n\
link conv_out: glass_out to kitchen film(h = 8 W/(m^2*K), area = 0.2 m^2)\n\
link rad_out: glass_out to kitchen radiation(emissivity = 0.9, area = 0.2 m^2)\n";

#[test]
fn convergence_is_reported() {
    let a = analyze("oven.heat", OVEN, &NoImports, &Options::default());
    let sol = a.solution.expect("solves");
    let c = sol
        .convergence
        .expect("a nonlinear solve reports its convergence");
    assert!(c.iterations >= 2 && c.iterations <= 10, "{c:?}");
    assert!(c.final_residual <= 1e-9, "{c:?}");
}

#[test]
fn a_linear_network_reports_no_newton_iterations() {
    let src = "node a (fixed = 20 °C)\nnode b (fixed = 0 °C)\nlink w: a to b resistance(2 K/W)\n";
    let a = analyze("lin.heat", src, &NoImports, &Options::default());
    assert!(a.solution.expect("solves").convergence.is_none());
}

#[test]
fn too_few_iterations_is_an_error_not_an_answer() {
    let opts = Options {
        newton_max_iterations: Some(1),
        ..Options::default()
    };
    let a = analyze("oven.heat", OVEN, &NoImports, &opts);
    assert!(a.solution.is_none());
    let d = a
        .diagnostics
        .iter()
        .find(|d| d.code == "E502")
        .expect("E502 reported");
    assert!(d.message.contains("after 1 Newton step"), "{}", d.message);
    assert!(d.message.contains(" W"), "{}", d.message);
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(48))]
    /// A chain of free nodes between two boundaries, each step a film, a layer or radiation:
    /// with no loads every temperature lies between the two boundary temperatures, the same heat
    /// flows through every step, and the balance closes.
    #[test]
    fn radiating_chains_obey_the_maximum_principle(
        t_hot in 50.0f64..900.0,
        t_cold in -40.0f64..40.0,
        steps in proptest::collection::vec((0usize..3, 0.05f64..1.0, 0.1f64..50.0), 2..7),
    ) {
        let mut src = format!("node n0 (fixed = {t_hot} °C)\nnode n{} (fixed = {t_cold} °C)\n", steps.len());
        for i in 1..steps.len() {
            src += &format!("node n{i}\n");
        }
        for (i, (kind, eps, g)) in steps.iter().enumerate() {
            let law = match kind {
                0 => format!("radiation(emissivity = {eps}, area = {g} m^2)"),
                1 => format!("film(h = {g} W/(m^2*K), area = 1 m^2)"),
                _ => format!("radiation(emissivity = {eps}, area = 1 m^2, emissivity_to = {eps}, area_to = {} m^2, view_factor = 1)", 1.0 + g),
            };
            src += &format!("link s{i}: n{i} to n{} {law}\n", i + 1);
        }
        let a = analyze("chain.heat", &src, &NoImports, &Options::default());
        let sol = a.solution.as_ref().expect("solves");
        let (hi, lo) = (t_hot + 273.15, t_cold + 273.15);
        for t in &sol.temperatures {
            prop_assert!(*t <= hi + 1e-9 && *t >= lo - 1e-9, "{t} outside [{lo}, {hi}]");
        }
        let q0 = sol.heat_flows[0];
        prop_assert!(q0 > 0.0);
        for q in &sol.heat_flows {
            prop_assert!((q - q0).abs() <= 1e-9 * q0.abs(), "{q} vs {q0}");
        }
        prop_assert!(sol.worst_residual <= 1e-9 * q0.abs());
    }
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(64))]
    /// Fourier's law with the Kirchhoff transform: a slab whose k is linear in T carries exactly
    /// the heat flow of k at the mean face temperature.
    #[test]
    fn linear_k_slab_equals_k_at_mean_temperature(
        k0 in 0.02f64..5.0, slope_frac in -0.0015f64..0.003, t_at in -20.0f64..300.0,
        t1 in -50.0f64..600.0, t2 in -50.0f64..600.0, thick in 0.005f64..0.5, area in 0.01f64..20.0,
    ) {
        let slope = slope_frac * k0;
        // Keep k positive over the faces' range.
        let k = |t: f64| k0 + slope * (t - t_at);
        prop_assume!(k(t1) > 0.0 && k(t2) > 0.0);
        let src = format!(
            "material m (k = {k0} W/(m*K), k_slope = {slope} W/(m*K^2), k_at = {t_at} °C)\n\
             node a (fixed = {t1} °C)\nnode b (fixed = {t2} °C)\nlink s: a to b layer(m, thickness = {thick} m, area = {area} m^2)\n"
        );
        let a = analyze("slab.heat", &src, &NoImports, &Options::default());
        let sol = a.solution.as_ref().expect("solves");
        let want = k(0.5 * (t1 + t2)) * area * (t1 - t2) / thick;
        prop_assert!((sol.heat_flows[0] - want).abs() <= 1e-12 * want.abs().max(1e-9), "{} vs {want}", sol.heat_flows[0]);
    }
}

#[test]
fn conductivity_falling_to_zero_is_an_error() {
    let src = "material odd (k = 0.05 W/(m*K), k_slope = -4e-4 W/(m*K^2), k_at = 0 °C)\n\
               node hot (fixed = 300 °C)\nnode cold (fixed = 0 °C)\nnode mid\n\
               link a: hot to mid layer(odd, thickness = 50 mm, area = 1 m^2)\n\
               link b: mid to cold film(h = 5 W/(m^2*K), area = 1 m^2)\n";
    let a = analyze("odd.heat", src, &NoImports, &Options::default());
    assert!(a.solution.is_none());
    assert!(
        a.diagnostics
            .iter()
            .any(|d| d.code == "E503" || d.code == "E502"),
        "{:?}",
        a.diagnostics
    );
}
