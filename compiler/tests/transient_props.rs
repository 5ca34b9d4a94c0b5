//! Invariants of transient runs on random networks (proptest), and the nonlinear path of the
//! integrator checked through its `HeatSystem` interface.

use caloris_compiler::source::NoImports;
use caloris_compiler::transient::integrate::{integrate, Control, Settings, StepMode};
use caloris_compiler::transient::system::{Entry, HeatSystem};
use caloris_compiler::transient::{run_transient, Hooks, RunOptions};
use caloris_compiler::{analyze, Options};
use proptest::prelude::*;

/// A random connected network as model text: every free node is joined to an earlier node or a
/// boundary (a spanning tree), plus a few extra links; some nodes store no heat.
#[derive(Debug, Clone)]
struct Net {
    fixed: Vec<f64>,
    free: Vec<(f64, f64, Option<f64>)>, // (capacity J/K or 0, load W, initial °C)
    tree: Vec<(usize, f64)>,            // parent (index into fixed ++ free) and conductance
    extra: Vec<(usize, usize, f64)>,
    duration_h: f64,
    step_s: Option<f64>,
    ramp: bool,
}

fn net() -> impl Strategy<Value = Net> {
    (1usize..3, 1usize..7).prop_flat_map(|(nf, nv)| {
        (
            prop::collection::vec(-20.0f64..80.0, nf),
            prop::collection::vec(
                (
                    prop_oneof![Just(0.0), 10.0f64..1e6],
                    prop_oneof![Just(0.0), -50.0f64..200.0],
                    prop::option::of(-10.0f64..90.0),
                ),
                nv,
            ),
            prop::collection::vec((0usize..100, 0.01f64..50.0), nv),
            prop::collection::vec((0usize..100, 0usize..100, 0.01f64..50.0), 0..4),
            0.1f64..48.0,
            prop::option::of(1.0f64..3600.0),
            any::<bool>(),
        )
            .prop_map(
                move |(fixed, free, tree, extra, duration_h, step_s, ramp)| {
                    let tree = tree
                        .into_iter()
                        .enumerate()
                        .map(|(i, (p, g))| (p % (nf + i), g))
                        .collect();
                    let extra = extra
                        .into_iter()
                        .map(|(a, b, g)| (nf + a % nv, b % (nf + nv), g))
                        .filter(|(a, b, _)| a != b)
                        .collect();
                    Net {
                        fixed,
                        free,
                        tree,
                        extra,
                        duration_h,
                        step_s,
                        ramp,
                    }
                },
            )
    })
}

fn text(n: &Net) -> String {
    let nf = n.fixed.len();
    let name = |i: usize| {
        if i < nf {
            format!("b{i}")
        } else {
            format!("n{}", i - nf)
        }
    };
    let mut s = String::new();
    for (i, t) in n.fixed.iter().enumerate() {
        if n.ramp && i == 0 {
            s += &format!("schedule swing (repeat = 24 h) {{\n  0 h: {t} °C\n  12 h: {} °C\n}}\nnode b0 (fixed = swing)\n", t - 15.0);
        } else {
            s += &format!("node b{i} (fixed = {t} °C)\n");
        }
    }
    for (i, (c, q, init)) in n.free.iter().enumerate() {
        let mut args = Vec::new();
        if *c > 0.0 {
            args.push(format!("capacity = {c} J/K"));
            if let Some(t) = init {
                args.push(format!("initial = {t} °C"));
            }
        }
        if *q != 0.0 {
            args.push(format!("load = {q} W"));
        }
        s += &format!(
            "node n{i}{}\n",
            if args.is_empty() {
                String::new()
            } else {
                format!(" ({})", args.join(", "))
            }
        );
    }
    for (i, (p, g)) in n.tree.iter().enumerate() {
        s += &format!(
            "link t{i}: {} to {} conductance({g} W/K)\n",
            name(nf + i),
            name(*p)
        );
    }
    for (i, (a, b, g)) in n.extra.iter().enumerate() {
        s += &format!(
            "link x{i}: {} to {} conductance({g} W/K)\n",
            name(*a),
            name(*b)
        );
    }
    let step = n
        .step_s
        .map(|h| format!(", step = {h} s"))
        .unwrap_or_default();
    s += &format!("transient r (duration = {} h{step})\n", n.duration_h);
    s
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 96, ..ProptestConfig::default() })]

    /// First law: Σ C·ΔT = Σ ∫ boundary heat + ∫ loads, to round-off, for any network, step
    /// mode and schedule.
    #[test]
    fn energy_balance_closes_on_random_networks(n in net()) {
        let src = text(&n);
        let a = analyze("random.heat", &src, &NoImports, &Options { check_only: true, ..Options::default() });
        prop_assert!(!a.has_errors(), "{src}\n{:?}", a.diagnostics);
        let r = run_transient(&a.network, &a.limits, &a.studies.runs[0], &RunOptions::default(), Hooks::default());
        let r = r.map_err(|e| TestCaseError::fail(format!("{e}\n{src}")))?;
        let e = &r.energy;
        // Round-off is relative to the energy flows, or, when nothing flows, to what a 1 K
        // difference across every link would move over the run.
        let throughput: f64 = a.network.links.iter().map(|l| l.conductance()).sum::<f64>() * n.duration_h * 3600.0;
        let scale = e.boundaries.iter().map(|b| b.1.abs()).fold(e.stored.abs().max(e.loads.abs()), f64::max).max(throughput);
        prop_assert!(e.residual.abs() <= 1e-9 * scale, "{e:?}\n{src}");
        prop_assert!(r.temperatures.iter().flatten().all(|t| t.is_finite()));
        prop_assert_eq!(*r.times.last().unwrap_or(&0.0), n.duration_h * 3600.0);
    }
}

/// A body cooling by radiation alone to a sink at 0 K: C·dT/dt = −ε·σ·A·T⁴, a nonlinear heat
/// balance, linearised for the integrator as G = 4kC·T³ and rhs = 3kC·T⁴ (k = εσA/C).
struct RadiativeCooling {
    capacity: [f64; 1],
    k: f64,
}

impl HeatSystem for RadiativeCooling {
    fn len(&self) -> usize {
        1
    }
    fn capacity(&self) -> &[f64] {
        &self.capacity
    }
    fn is_linear(&self) -> bool {
        false
    }
    fn assemble(&self, _t: f64, x: &[f64], g: Option<&mut Vec<Entry>>, rhs: &mut [f64]) {
        let (c, t) = (self.capacity[0], x[0]);
        rhs[0] = 3.0 * self.k * c * t.powi(4);
        if let Some(g) = g {
            g.clear();
            g.push(Entry::new(0, 0, 4.0 * self.k * c * t.powi(3)));
        }
    }
    fn corners(&self, _t0: f64, _t1: f64, _out: &mut Vec<f64>) {}
}

#[test]
fn the_nonlinear_path_follows_stefan_boltzmann_cooling() {
    // A 0.1 m² black plate (ε = 0.9) of 500 J/K at 600 K facing deep space. Closed form of
    // dT/dt = −k·T⁴: T(t) = (T0⁻³ + 3k·t)^(−1/3) (Stefan–Boltzmann law, σ = 5.670374419e-8 W/(m²·K⁴)).
    let sigma = 5.670374419e-8;
    let sys = RadiativeCooling {
        capacity: [500.0],
        k: 0.9 * sigma * 0.1 / 500.0,
    };
    let exact = |t: f64| (600f64.powi(-3) + 3.0 * sys.k * t).powf(-1.0 / 3.0);
    let settings = Settings {
        duration: 20000.0,
        mode: StepMode::Auto,
        tolerance: 0.01,
        max_steps: 100_000,
        first_step: None,
    };
    let mut worst = 0.0f64;
    let mut on_step = |v: &caloris_compiler::transient::integrate::StepView| {
        worst = worst.max((v.x1[0] - exact(v.t + v.h)).abs());
        Control::Continue
    };
    let stats = integrate(&sys, &[600.0], &settings, &mut on_step).expect("run");
    assert!(worst < 0.05, "largest error {worst} K, {stats:?}");
    assert!(stats.newton_iterations >= 2 * stats.steps, "{stats:?}");
    assert_eq!(stats.end_time, 20000.0);
}
