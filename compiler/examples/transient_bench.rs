//! Time per step of a transient run on large networks: a square grid of storing nodes (a slab
//! discretised in 2-D) held at 0 °C along one edge and starting at 20 °C.
//!
//!     cargo run --release -p caloris-compiler --example transient_bench [SIDE ...]
//!
//! For each grid it reports the set-up (initial state, symbolic analysis, first factorisation)
//! and the time per step with a fixed step (one factorisation reused by every step) and with the
//! automatic step. Figures depend on the machine; nothing here is asserted.

use caloris_compiler::network::{Link, LinkLaw, Network, Node};
use caloris_compiler::span::Span;
use caloris_compiler::transient::model::{NodeCapacity, RunSpec};
use caloris_compiler::transient::{run_transient, Hooks, Record, RunOptions};
use std::time::Instant;

fn grid(side: usize) -> Network {
    let mut net = Network::default();
    let id = |r: usize, c: usize| r * side + c;
    for r in 0..side {
        for c in 0..side {
            net.nodes.push(Node {
                name: format!("n{r}_{c}"),
                span: Span::default(),
                fixed: None,
                load: 0.0,
                generated: false,
            });
            net.dynamics.capacities.push(NodeCapacity {
                node: id(r, c),
                capacity: 1000.0,
                span: Span::default(),
                lump: None,
            });
            net.dynamics
                .initial
                .push((id(r, c), 293.15, Span::default()));
        }
    }
    let edge = net.nodes.len();
    for c in 0..side {
        net.nodes.push(Node {
            name: format!("edge{c}"),
            span: Span::default(),
            fixed: Some(273.15),
            load: 0.0,
            generated: false,
        });
    }
    let mut link = |a: usize, b: usize| {
        net.links.push(Link {
            name: format!("l{}", net.links.len()),
            span: Span::default(),
            from: a,
            to: b,
            law: LinkLaw::Linear { conductance: 1.0 },
            area: None,
            kind: "conductance".into(),
            formula: Default::default(),
            group: None,
        });
    };
    for r in 0..side {
        for c in 0..side {
            if c + 1 < side {
                link(id(r, c), id(r, c + 1));
            }
            if r + 1 < side {
                link(id(r, c), id(r + 1, c));
            }
        }
    }
    for c in 0..side {
        link(id(0, c), edge + c);
    }
    net
}

fn spec(duration: f64, step: Option<f64>) -> RunSpec {
    RunSpec {
        name: "bench".into(),
        span: Span::default(),
        duration,
        step,
        output: Some(duration),
        tolerance: None,
        start: 0.0,
    }
}

fn main() {
    let sides: Vec<usize> = std::env::args()
        .skip(1)
        .filter_map(|a| a.parse().ok())
        .collect();
    let sides = if sides.is_empty() {
        vec![100, 317]
    } else {
        sides
    };
    let options = RunOptions {
        record: Record::Nothing,
        ..RunOptions::default()
    };
    println!(
        "{:>8} {:>9} {:>12} {:>14} {:>12} {:>16} {:>8} {:>8}",
        "nodes",
        "links",
        "set-up",
        "fixed: /step",
        "factorised",
        "automatic: /step",
        "steps",
        "factor."
    );
    for side in sides {
        let net = grid(side);
        let run = |s: &RunSpec| {
            let t = Instant::now();
            let r = run_transient(&net, &[], s, &options, Hooks::default()).expect("run");
            (t.elapsed().as_secs_f64(), r)
        };
        // Set-up: one step; the fixed-step cost is the difference to a longer run.
        let (t1, _) = run(&spec(10.0, Some(10.0)));
        let n = 50;
        let (tn, rn) = run(&spec(10.0 * n as f64, Some(10.0)));
        let per_fixed = (tn - t1) / (n - 1) as f64;
        // Automatic step over one time constant of the whole slab (C/G·side² ≈ 1000·side² s).
        let tau = 1000.0 * (side * side) as f64 / 10.0;
        let (ta, ra) = run(&spec(tau, None));
        let per_auto = (ta - t1) / ra.stats.steps.max(1) as f64;
        println!(
            "{:>8} {:>9} {:>10.3} s {:>11.2} ms {:>12} {:>13.2} ms {:>8} {:>8}",
            side * side,
            net.links.len(),
            t1,
            per_fixed * 1e3,
            format!(
                "{} time{}",
                rn.stats.factorisations,
                if rn.stats.factorisations == 1 {
                    ""
                } else {
                    "s"
                }
            ),
            per_auto * 1e3,
            ra.stats.steps,
            ra.stats.factorisations
        );
    }
}
