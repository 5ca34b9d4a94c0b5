//! A transient run of a network: the initial state, the integration, and what is recorded along
//! the way — temperatures at the output times, crossings of stated levels, every design limit's
//! worst value over the run and when it first fails, each node's final and extreme values, and
//! the energy balance (stored = delivered by boundaries + loads, the first law).

use super::initial::initial_state;
use super::integrate::{
    integrate, Control, Settings, Stats, StepMode, StepView, GAMMA, W0, W1, W2,
};
use super::model::RunSpec;
use super::probe::{weights, Probe, Quadratic};
use super::system::{HeatSystem, NetworkSystem};
use super::{RunError, MAX_STEPS};
use crate::limits::{verdict, LimitResult, LimitSpec};
use crate::network::{Network, NodeId};
use serde::Serialize;
use std::sync::atomic::{AtomicBool, Ordering};

/// Local error allowed per step when the model states no `tolerance`, K.
pub const DEFAULT_TOLERANCE: f64 = 0.01;

/// Which node temperatures to keep at every output time.
#[derive(Clone, Debug, PartialEq)]
pub enum Record {
    All,
    Nodes(Vec<NodeId>),
    /// None: only final and extreme values, limits, crossings and energy (the language server).
    Nothing,
}

#[derive(Clone, Debug)]
pub struct RunOptions {
    pub record: Record,
    /// `(node, level in K)`: report every time the node's temperature passes the level.
    pub crossings: Vec<(NodeId, f64)>,
    /// Report at exactly these times (s from the start) instead of every output interval; the
    /// start and the end are always reported.
    pub times: Option<Vec<f64>>,
    pub max_steps: usize,
}

impl Default for RunOptions {
    fn default() -> Self {
        RunOptions {
            record: Record::All,
            crossings: Vec::new(),
            times: None,
            max_steps: MAX_STEPS,
        }
    }
}

/// Ways for a caller to follow and stop a run.
#[derive(Default)]
pub struct Hooks<'a> {
    /// Checked after every step; when set, the run stops and returns what it has.
    pub cancel: Option<&'a AtomicBool>,
    /// Called after every step with (time reached, duration), s.
    pub progress: Option<&'a mut dyn FnMut(f64, f64)>,
}

/// A node passing a level.
#[derive(Clone, Debug, Serialize)]
pub struct Crossing {
    pub node: NodeId,
    /// K
    pub level: f64,
    /// s from the run's start
    pub time: f64,
    pub rising: bool,
}

/// A design limit over the whole run.
#[derive(Clone, Debug, Serialize)]
pub struct LimitOverRun {
    /// The verdict on the worst value of the run.
    pub result: LimitResult,
    /// When the worst value occurs, s.
    pub worst_time: f64,
    /// When the limit first fails, s (0 when it fails from the start).
    pub first_failure: Option<f64>,
}

/// A node's temperature over the run, K and s.
#[derive(Clone, Copy, Debug, Serialize)]
pub struct NodeTrace {
    pub initial: f64,
    pub last: f64,
    pub min: f64,
    pub min_time: f64,
    pub max: f64,
    pub max_time: f64,
}

/// Energy over the run, J.
#[derive(Clone, Debug, Default, Serialize)]
pub struct Energy {
    /// Σ C·(T_end − T_start) over the nodes with capacity.
    pub stored: f64,
    /// Heat delivered into the network by each fixed node (negative: absorbed).
    pub boundaries: Vec<(NodeId, f64)>,
    /// Heat put in by loads.
    pub loads: f64,
    /// stored − (Σ boundaries + loads): zero to round-off.
    pub residual: f64,
}

/// Everything a run yields. Times are seconds from the run's start.
#[derive(Clone, Debug, Serialize)]
pub struct RunResult {
    pub name: String,
    pub duration: f64,
    pub start: f64,
    pub mode: StepMode,
    pub tolerance: f64,
    pub output_interval: f64,
    pub recorded: Vec<NodeId>,
    pub times: Vec<f64>,
    /// `[output][recorded node]`, K.
    pub temperatures: Vec<Vec<f64>>,
    pub fixed_nodes: Vec<NodeId>,
    /// `[output][fixed node]`: heat each boundary delivers, W.
    pub boundary_heat: Vec<Vec<f64>>,
    /// Per node, indexed like the network.
    pub nodes: Vec<NodeTrace>,
    pub crossings: Vec<Crossing>,
    pub limits: Vec<LimitOverRun>,
    pub energy: Energy,
    pub stats: Stats,
    /// True when the run was stopped before its end (Ctrl-C, a newer edit).
    pub interrupted: bool,
    /// Remarks for the reader (a fixed step whose error estimate exceeds the tolerance).
    pub notes: Vec<String>,
}

/// A time step that reads well: the smallest of 1, 2, 5, 10, 15, 30 s, 1, 2, 5, 10, 15, 30 min,
/// 1, 2, 3, 6, 12 h, 1, 2, 5, 10 d ... not below `at_least`.
pub fn nice_interval(at_least: f64) -> f64 {
    const NICE: &[f64] = &[
        1.0, 2.0, 5.0, 10.0, 15.0, 30.0, 60.0, 120.0, 300.0, 600.0, 900.0, 1800.0, 3600.0, 7200.0,
        10800.0, 21600.0, 43200.0, 86400.0, 172800.0, 432000.0, 864000.0,
    ];
    if at_least < 1.0 {
        // Below a second: 1, 2, 5 × a power of ten.
        let p = 10f64.powf(at_least.log10().floor());
        return [1.0, 2.0, 5.0, 10.0]
            .iter()
            .map(|m| m * p)
            .find(|&v| v >= at_least * (1.0 - 1e-12))
            .unwrap_or(at_least);
    }
    NICE.iter()
        .copied()
        .find(|&v| v >= at_least * (1.0 - 1e-12))
        .unwrap_or_else(|| (at_least / 86400.0).ceil() * 86400.0)
}

/// Run the network through `spec`. The initial state is the steady solution at the start time
/// (schedules at their start values), replaced by the stated `initial` temperatures; nodes without
/// capacity are then set consistent with their neighbours.
pub fn run_transient(
    net: &Network,
    limits: &[LimitSpec],
    spec: &RunSpec,
    options: &RunOptions,
    mut hooks: Hooks,
) -> Result<RunResult, RunError> {
    let sys = NetworkSystem::new(net, spec.start);
    let duration = spec.duration;
    let tolerance = spec.tolerance.unwrap_or(DEFAULT_TOLERANCE);
    let output_interval = spec
        .output
        .unwrap_or_else(|| nice_interval(duration / 100.0))
        .min(duration);
    let mode = match spec.step {
        Some(h) => StepMode::Fixed(h.min(duration)),
        None => StepMode::Auto,
    };
    let x0 = initial_state(&sys, net)?;
    let n_all = net.nodes.len();
    let mut s0 = vec![0.0; n_all];
    sys.full_state(0.0, &x0, &mut s0);

    let recorded: Vec<NodeId> = match &options.record {
        Record::All => (0..n_all).collect(),
        Record::Nodes(v) => v.clone(),
        Record::Nothing => Vec::new(),
    };
    let fixed_nodes: Vec<NodeId> = (0..n_all)
        .filter(|&i| net.nodes[i].fixed.is_some())
        .collect();
    let mut fixed_slot = vec![usize::MAX; n_all];
    for (k, &i) in fixed_nodes.iter().enumerate() {
        fixed_slot[i] = k;
    }
    // Links that touch a fixed node, for the heat each boundary delivers.
    let boundary_links: Vec<usize> = (0..net.links.len())
        .filter(|&l| {
            fixed_slot[net.links[l].from] != usize::MAX || fixed_slot[net.links[l].to] != usize::MAX
        })
        .collect();
    let boundary_flows = |s: &[f64], out: &mut Vec<f64>| {
        out.clear();
        out.resize(fixed_nodes.len(), 0.0);
        for &l in &boundary_links {
            let link = &net.links[l];
            let q = link.heat_flow(s);
            if fixed_slot[link.from] != usize::MAX {
                out[fixed_slot[link.from]] += q;
            }
            if fixed_slot[link.to] != usize::MAX {
                out[fixed_slot[link.to]] -= q;
            }
        }
    };
    let total_load = |t: f64| -> f64 { sys.free.iter().map(|&i| sys.load(i, t)).sum() };
    let probes: Vec<Probe> = limits
        .iter()
        .map(|l| Probe::for_measure(net, l.measure, l.subject))
        .collect();

    let mut q0 = Vec::new();
    boundary_flows(&s0, &mut q0);
    let mut result = RunResult {
        name: spec.name.clone(),
        duration,
        start: spec.start,
        mode,
        tolerance,
        output_interval,
        recorded: recorded.clone(),
        times: vec![0.0],
        temperatures: vec![recorded.iter().map(|&i| s0[i]).collect()],
        fixed_nodes: fixed_nodes.clone(),
        boundary_heat: vec![q0.clone()],
        nodes: s0
            .iter()
            .map(|&v| NodeTrace {
                initial: v,
                last: v,
                min: v,
                min_time: 0.0,
                max: v,
                max_time: 0.0,
            })
            .collect(),
        crossings: Vec::new(),
        limits: Vec::new(),
        energy: Energy {
            boundaries: fixed_nodes.iter().map(|&i| (i, 0.0)).collect(),
            ..Energy::default()
        },
        stats: Stats::default(),
        interrupted: false,
        notes: Vec::new(),
    };
    let mut limit_state: Vec<(f64, f64, Option<f64>)> = limits
        .iter()
        .zip(&probes)
        .map(|(l, p)| {
            let v = p.value(net, &s0);
            let fails = !verdict(l, v).passed;
            (v, 0.0, fails.then_some(0.0))
        })
        .collect();
    let mut p0: Vec<f64> = probes.iter().map(|p| p.value(net, &s0)).collect();
    let mut load0 = total_load(0.0);
    let output_times: Vec<f64> = match &options.times {
        Some(list) => {
            let mut v: Vec<f64> = list
                .iter()
                .copied()
                .filter(|&t| t > 0.0 && t < duration)
                .collect();
            v.sort_by(f64::total_cmp);
            v.dedup();
            v.push(duration);
            v
        }
        None => {
            let n = (duration / output_interval - 1e-9).ceil();
            // NaN (a zero or non-finite interval) is refused with the too-large counts.
            if n.is_nan() || n > super::MAX_OUTPUTS as f64 {
                return Err(RunError::TooManyOutputs {
                    interval: output_interval,
                });
            }
            let n = n as usize;
            (1..=n)
                .map(|k| (k as f64 * output_interval).min(duration))
                .collect()
        }
    };
    let mut next_output = 0usize;

    let mut sg = vec![0.0; n_all];
    let mut s1 = vec![0.0; n_all];
    let (mut qg, mut q1) = (Vec::new(), Vec::new());
    let start_state = s0.clone();
    let capacity_all = net.dynamics.capacity_vector(n_all);
    // Links with k(T): a conductivity that falls to zero between a link's end temperatures
    // makes the run meaningless, so the run stops there with an error (as the steady solve does).
    let kt_links: Vec<usize> = (0..net.links.len())
        .filter(|&l| matches!(net.links[l].law, crate::network::LinkLaw::Conduction { .. }))
        .collect();
    let mut non_physical: Option<(f64, usize)> = None;
    // Computed films: h follows the temperatures through time; their fluid's range is checked
    // at every step (an error), their correlation's range noted once per film.
    let film_links: Vec<usize> = (0..net.links.len())
        .filter(|&l| matches!(net.links[l].law, crate::network::LinkLaw::Convection(_)))
        .collect();
    let mut film_outside: Option<RunError> = None;
    let mut film_notes: Vec<(usize, String)> = Vec::new();

    let mut on_step = |v: &StepView| -> Control {
        let (t, h) = (v.t, v.h);
        let t1 = t + h;
        sys.full_state(t + GAMMA * h, v.xg, &mut sg);
        sys.full_state(t1, v.x1, &mut s1);
        boundary_flows(&sg, &mut qg);
        boundary_flows(&s1, &mut q1);
        // Outputs inside (t, t1].
        while next_output < output_times.len() && output_times[next_output] <= t1 + 1e-9 * h {
            let to = output_times[next_output];
            let w = weights(((to - t) / h).clamp(0.0, 1.0), GAMMA);
            result.times.push(to);
            result.temperatures.push(
                recorded
                    .iter()
                    .map(|&i| w[0] * s0[i] + w[1] * sg[i] + w[2] * s1[i])
                    .collect(),
            );
            result.boundary_heat.push(
                (0..q0.len())
                    .map(|k| w[0] * q0[k] + w[1] * qg[k] + w[2] * q1[k])
                    .collect(),
            );
            next_output += 1;
        }
        for (i, tr) in result.nodes.iter_mut().enumerate() {
            for (val, time) in [(sg[i], t + GAMMA * h), (s1[i], t1)] {
                if val < tr.min {
                    tr.min = val;
                    tr.min_time = time;
                }
                if val > tr.max {
                    tr.max = val;
                    tr.max_time = time;
                }
            }
            tr.last = s1[i];
        }
        for (k, (spec, probe)) in limits.iter().zip(&probes).enumerate() {
            let (pg, p1) = (probe.value(net, &sg), probe.value(net, &s1));
            let q = Quadratic::through(p0[k], pg, p1, GAMMA);
            let ((smin, vmin), (smax, vmax)) = q.extremes();
            let state = &mut limit_state[k];
            let upper = spec.op.is_upper();
            let (s_worst, v_worst) = if upper { (smax, vmax) } else { (smin, vmin) };
            if (upper && v_worst > state.0) || (!upper && v_worst < state.0) {
                state.0 = v_worst;
                state.1 = t + s_worst * h;
            }
            if state.2.is_none() {
                let into_failure = q
                    .crossings(spec.value)
                    .into_iter()
                    .find(|&(_, rising)| rising == upper);
                if let Some((s, _)) = into_failure {
                    state.2 = Some(t + s * h);
                } else if !verdict(spec, p1).passed {
                    state.2 = Some(t1);
                }
            }
            p0[k] = p1;
        }
        for &(node, level) in &options.crossings {
            let q = Quadratic::through(s0[node], sg[node], s1[node], GAMMA);
            for (s, rising) in q.crossings(level) {
                if result.crossings.len() < 10_000 {
                    result.crossings.push(Crossing {
                        node,
                        level,
                        time: t + s * h,
                        rising,
                    });
                }
            }
        }
        let (loadg, load1) = (total_load(t + GAMMA * h), total_load(t1));
        result.energy.loads += h * (W0 * load0 + W1 * loadg + W2 * load1);
        for (k, e) in result.energy.boundaries.iter_mut().enumerate() {
            e.1 += h * (W0 * q0[k] + W1 * qg[k] + W2 * q1[k]);
        }
        load0 = load1;
        std::mem::swap(&mut s0, &mut s1);
        std::mem::swap(&mut q0, &mut q1);
        if let Some(p) = hooks.progress.as_mut() {
            p(t1, duration);
        }
        for &l in &kt_links {
            let link = &net.links[l];
            if let crate::network::LinkLaw::Conduction { conductivity, .. } = &link.law {
                let (a, b) = (s0[link.from], s0[link.to]);
                if conductivity.min_over(a.min(b), a.max(b)) <= 0.0 {
                    non_physical = Some((t1, l));
                    return Control::Stop;
                }
            }
        }
        for &l in &film_links {
            let link = &net.links[l];
            if let crate::network::LinkLaw::Convection(film) = &link.law {
                let s = film.state(s0[link.from], s0[link.to]);
                if let Some(o) = s.properties_outside {
                    film_outside = Some(RunError::FilmOutOfRange {
                        time: t1,
                        link: link.name.clone(),
                        fluid: film.fluid.describe(),
                        temperature: o.temperature,
                        low: o.low,
                        high: o.high,
                    });
                    return Control::Stop;
                }
                if let Some(&(group, value, low, high)) = s.outside.first() {
                    if !film_notes.iter().any(|n| n.0 == l) {
                        film_notes.push((l, format!(
                            "film `{}`: from t = {t1:.6e} s {group} = {value:.4e} is outside the range of {} ({low:.4e} … {high:.4e}); h is extrapolated",
                            link.name,
                            film.correlation.name()
                        )));
                    }
                }
            }
        }
        let stop = hooks.cancel.is_some_and(|c| c.load(Ordering::Relaxed));
        if stop {
            Control::Stop
        } else {
            Control::Continue
        }
    };

    let stats = if sys.is_empty() {
        // Only fixed nodes: their schedules are the whole answer.
        quiet_run(&sys, duration, output_interval, &mut on_step)
    } else {
        let settings = Settings {
            duration,
            mode,
            tolerance,
            max_steps: options.max_steps,
            first_step: None,
        };
        integrate(&sys, &x0, &settings, &mut on_step)?
    };
    if let Some(e) = film_outside {
        return Err(e);
    }
    result.notes.extend(film_notes.into_iter().map(|n| n.1));
    if let Some((time, link)) = non_physical {
        return Err(RunError::NonPhysicalConductivity {
            time,
            link: net.links[link].name.clone(),
        });
    }
    // `s0` holds the final state now.
    if stats.stopped {
        result.interrupted = true;
        if result.times.last().is_some_and(|&t| t < stats.end_time) {
            result.times.push(stats.end_time);
            result
                .temperatures
                .push(recorded.iter().map(|&i| s0[i]).collect());
            result.boundary_heat.push(q0.clone());
        }
    }
    result.energy.stored = capacity_all
        .iter()
        .zip(s0.iter().zip(&start_state))
        .map(|(c, (a, b))| c * (a - b))
        .sum();
    let delivered: f64 =
        result.energy.boundaries.iter().map(|b| b.1).sum::<f64>() + result.energy.loads;
    result.energy.residual = result.energy.stored - delivered;
    result.limits = limits
        .iter()
        .zip(limit_state)
        .map(|(spec, (worst, time, first))| LimitOverRun {
            result: verdict(spec, worst),
            worst_time: time,
            first_failure: first,
        })
        .collect();
    if let StepMode::Fixed(h) = mode {
        if stats.largest_error > tolerance {
            result.notes.push(format!(
                "with the fixed step of {h} s the largest local error estimate is {:.3e} K, above the tolerance {:.3e} K; a shorter step would change the result",
                stats.largest_error, tolerance
            ));
        }
    }
    result.stats = stats;
    Ok(result)
}

/// A run with no free node: step from output to output so the observer still sees the schedules.
fn quiet_run(
    sys: &NetworkSystem,
    duration: f64,
    interval: f64,
    on_step: &mut dyn FnMut(&StepView) -> Control,
) -> Stats {
    let mut stats = Stats::default();
    let mut t = 0.0;
    while duration - t > 1e-12 * duration {
        let t1 = (t + interval).min(duration);
        let control = on_step(&StepView {
            t,
            h: t1 - t,
            x0: &[],
            xg: &[],
            x1: &[],
            error: 0.0,
        });
        stats.steps += 1;
        t = t1;
        if control == Control::Stop {
            stats.stopped = true;
            break;
        }
    }
    let _ = sys;
    stats.end_time = t;
    stats
}
