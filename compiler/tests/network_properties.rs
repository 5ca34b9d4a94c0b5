//! Property tests over randomly generated models, run through the whole pipeline (text → parse →
//! units → network → sparse solve): the energy balance closes (first law: at every free node the
//! heat in equals the heat out, and what the boundaries deliver equals what the loads add), and the
//! series/parallel rules for thermal resistances hold (the thermal analogue of Ohm's law).

use caloris_compiler::source::NoImports;
use caloris_compiler::{analyze, Options};
use proptest::prelude::*;

#[derive(Clone, Debug)]
struct RandomModel {
    fixed: Vec<f64>,                     // °C of each boundary node
    loads: Vec<Option<f64>>,             // W on each free node
    links: Vec<(usize, usize, u8, f64)>, // from, to (indices over all nodes), kind, size
}

fn node_name(i: usize, n_fixed: usize) -> String {
    if i < n_fixed {
        format!("b{i}")
    } else {
        format!("n{}", i - n_fixed)
    }
}

impl RandomModel {
    fn text(&self) -> String {
        let nf = self.fixed.len();
        let mut s = String::from("material filler (k = 0.8 W/(m*K))\n");
        for (i, t) in self.fixed.iter().enumerate() {
            s += &format!("node b{i} (fixed = {t} °C)\n");
        }
        for (i, q) in self.loads.iter().enumerate() {
            match q {
                Some(q) => s += &format!("node n{i} (load = {q} W)\n"),
                None => s += &format!("node n{i}\n"),
            }
        }
        for (k, (a, b, kind, x)) in self.links.iter().enumerate() {
            let (a, b) = (node_name(*a, nf), node_name(*b, nf));
            let element = match kind % 5 {
                0 => format!("resistance({x} K/W)"),
                1 => format!("conductance({x} W/K)"),
                2 => format!("layer(filler, thickness = {x} mm, area = 0.5 m^2)"),
                3 => format!("film(h = {x} W/(m^2*K), area = 2 m^2)"),
                _ => format!("contact(r = {x} cm^2*K/W, area = 3 cm^2)"),
            };
            s += &format!("link l{k}: {a} to {b} {element}\n");
        }
        s
    }
}

fn model() -> impl Strategy<Value = RandomModel> {
    (1usize..4, 1usize..40).prop_flat_map(|(nf, nfree)| {
        let n = nf + nfree;
        (
            prop::collection::vec(-40.0f64..400.0, nf),
            prop::collection::vec(prop::option::of(-50.0f64..200.0), nfree),
            // A spanning tree joins every free node to an earlier node, so every free node has a
            // path to a boundary; extra links add loops.
            prop::collection::vec((0usize..1000, 0u8..5, 0.05f64..50.0), nfree),
            prop::collection::vec((0usize..n, 0usize..n, 0u8..5, 0.05f64..50.0), 0..(2 * n)),
        )
            .prop_map(move |(fixed, loads, tree, extra)| {
                let mut links = Vec::new();
                for (j, (pick, kind, x)) in tree.into_iter().enumerate() {
                    let me = nf + j;
                    links.push((pick % me, me, kind, x));
                }
                for (a, b, kind, x) in extra {
                    if a != b {
                        links.push((a, b, kind, x));
                    }
                }
                RandomModel {
                    fixed,
                    loads,
                    links,
                }
            })
    })
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 200, ..ProptestConfig::default() })]

    #[test]
    fn energy_balance_closes_on_random_networks(m in model()) {
        let text = m.text();
        let a = analyze("random.heat", &text, &NoImports, &Options::default());
        prop_assert!(!a.has_errors(), "{:?}\n{text}", a.diagnostics.iter().map(|d| &d.message).collect::<Vec<_>>());
        let sol = a.solution.as_ref().expect("solved");
        let scale = sol.heat_flows.iter().fold(1.0f64, |s, q| s.max(q.abs()));
        // Kirchhoff's current law at each free node, to round-off.
        prop_assert!(sol.worst_residual <= 1e-9 * scale, "residual {} at scale {scale}", sol.worst_residual);
        // Globally: heat from the boundaries + heat loads = 0 (steady state, first law).
        let loads: f64 = m.loads.iter().flatten().sum();
        let delivered: f64 = sol.boundary_heat.iter().map(|(_, q)| q).sum();
        prop_assert!((delivered + loads).abs() <= 1e-9 * scale.max(loads.abs()), "{delivered} + {loads}");
        // Without loads every free temperature lies between the extreme boundary temperatures
        // (maximum principle for the discrete Laplace equation).
        if m.loads.iter().all(Option::is_none) {
            let lo = m.fixed.iter().cloned().fold(f64::INFINITY, f64::min) + 273.15;
            let hi = m.fixed.iter().cloned().fold(f64::NEG_INFINITY, f64::max) + 273.15;
            for t in &sol.temperatures {
                prop_assert!(*t >= lo - 1e-9 && *t <= hi + 1e-9, "{t} outside [{lo}, {hi}]");
            }
        }
    }

    #[test]
    fn series_and_parallel_resistances_combine_like_ohms_law(
        r in prop::collection::vec(0.01f64..100.0, 1..8),
        dt in 1.0f64..200.0,
        parallel in any::<bool>(),
    ) {
        let mut text = format!("node hot (fixed = {dt} °C)\nnode cold (fixed = 0 °C)\n");
        if parallel {
            for (i, ri) in r.iter().enumerate() {
                text += &format!("link p{i}: hot to cold resistance({ri} K/W)\n");
            }
        } else {
            let names: Vec<String> = (0..=r.len()).map(|i| match i {
                0 => "hot".to_string(),
                i if i == r.len() => "cold".to_string(),
                i => { text += &format!("node m{i}\n"); format!("m{i}") }
            }).collect();
            for (i, ri) in r.iter().enumerate() {
                text += &format!("link s{i}: {} to {} resistance({ri} K/W)\n", names[i], names[i + 1]);
            }
        }
        let a = analyze("sp.heat", &text, &NoImports, &Options::default());
        let sol = a.solution.as_ref().expect("solved");
        let total: f64 = sol.boundary_heat.iter().filter(|(i, _)| a.network.nodes[*i].name == "hot").map(|(_, q)| q).sum();
        let expected = if parallel {
            dt * r.iter().map(|x| 1.0 / x).sum::<f64>()   // conductances add in parallel
        } else {
            dt / r.iter().sum::<f64>()                    // resistances add in series
        };
        prop_assert!((total - expected).abs() <= 1e-9 * expected.abs().max(1.0), "{total} vs {expected}");
    }
}
