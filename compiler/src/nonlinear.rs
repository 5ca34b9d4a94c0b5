//! Steady solve of networks with nonlinear links (radiation, k(T), computed convection films)
//! by Newton's method with a damped step.
//!
//! Each step solves J·δ = −F, where F is the heat balance of every free node and J its
//! Jacobian. J is not symmetric once a link's slopes differ at its two ends (radiation gives
//! 4σA·T_from³ and 4σA·T_to³), so the exact Newton step uses a sparse LU factorisation; the
//! starting point comes from the linear solver's sparse Cholesky on the network linearised at
//! the mean boundary temperature. Linear networks never come here.
//!
//! [`assemble`] is the reusable piece: the balance and Jacobian (or, equivalently, the
//! linearised conductance matrix and right-hand side) for given node temperatures, for any
//! caller that steps a network through time as well.
// Diagnostics are returned by value throughout the compiler; boxing them here alone would
// split the element API.
#![allow(clippy::result_large_err)]

use crate::factor_cache::FactorCache;
use crate::network::{LinkLaw, Network, NodeId};
use crate::solve::{solve_steady_with, SolveError, Temperatures};
use faer::sparse::Triplet;
use serde::Serialize;

/// The heat balance of the free nodes of a network at given temperatures, linearised.
#[derive(Clone, Debug)]
pub struct Assembly {
    /// Network node id of each unknown, in unknown order.
    pub free: Vec<NodeId>,
    /// For each network node, its unknown's index, or `usize::MAX` for a fixed node.
    pub index: Vec<usize>,
    /// Per unknown: heat flowing out through links minus the node's load, W. Zero at the
    /// steady solution.
    pub residual: Vec<f64>,
    /// ∂residual/∂T of the unknowns, W/K, every entry (duplicates are to be summed). For a
    /// linear network this is the conductance matrix of the free nodes.
    pub jacobian: Vec<Triplet<usize, usize, f64>>,
    /// Right-hand side b of the linearised system J·T = b at these temperatures (b = J·T − F):
    /// loads plus the heat the fixed nodes drive in, with a correction for curved laws.
    pub rhs: Vec<f64>,
    /// The largest |heat flow| of any link, W, to judge the residual against.
    pub flow_scale: f64,
}

/// Balance, Jacobian and linearised right-hand side at node temperatures `temps` (kelvin,
/// indexed like `net.nodes`; fixed nodes must hold their fixed values).
pub fn assemble(net: &Network, temps: &[f64]) -> Assembly {
    let mut index = vec![usize::MAX; net.nodes.len()];
    let mut free = Vec::new();
    for (i, node) in net.nodes.iter().enumerate() {
        if node.fixed.is_none() {
            index[i] = free.len();
            free.push(i);
        }
    }
    let n = free.len();
    let mut residual: Vec<f64> = free.iter().map(|&i| -net.nodes[i].load).collect();
    let mut jacobian = Vec::with_capacity(net.links.len() * 4);
    let mut flow_scale: f64 = 0.0;
    for link in &net.links {
        let (q, d_from, d_to) = link.law.flow(temps[link.from], temps[link.to]);
        flow_scale = flow_scale.max(q.abs());
        let (a, b) = (index[link.from], index[link.to]);
        // Heat leaves `from` and enters `to`.
        if a != usize::MAX {
            residual[a] += q;
            jacobian.push(Triplet::new(a, a, d_from));
            if b != usize::MAX {
                jacobian.push(Triplet::new(a, b, d_to));
            }
        }
        if b != usize::MAX {
            residual[b] -= q;
            jacobian.push(Triplet::new(b, b, -d_to));
            if a != usize::MAX {
                jacobian.push(Triplet::new(b, a, -d_from));
            }
        }
    }
    let mut rhs: Vec<f64> = residual.iter().map(|r| -r).collect();
    for t in &jacobian {
        rhs[t.row] += t.val * temps[free[t.col]];
    }
    debug_assert_eq!(rhs.len(), n);
    Assembly {
        free,
        index,
        residual,
        jacobian,
        rhs,
        flow_scale,
    }
}

/// How a nonlinear solve went, for reports.
#[derive(Clone, Debug, Serialize)]
pub struct Convergence {
    pub method: &'static str,
    /// Newton steps taken.
    pub iterations: usize,
    /// Largest |heat balance| at a free node after the last step, W.
    pub final_residual: f64,
}

/// Limits of the Newton iteration.
#[derive(Clone, Copy, Debug)]
pub struct NewtonSettings {
    pub max_iterations: usize,
    /// Converged when the worst node balance is below this fraction of the largest link flow.
    pub relative_tolerance: f64,
}

impl Default for NewtonSettings {
    fn default() -> Self {
        NewtonSettings {
            max_iterations: 60,
            relative_tolerance: 1e-12,
        }
    }
}

#[derive(Clone, Debug, PartialEq)]
pub enum NewtonError {
    /// No convergence within the allowed steps, or no step reduced the imbalance.
    NoConvergence {
        iterations: usize,
        residual: f64,
        stalled: bool,
    },
    /// A linear solve inside the iteration failed.
    Linear(SolveError),
    /// A temperature-dependent conductivity falls to zero or below between the solved end
    /// temperatures of this link.
    NonPhysicalConductivity {
        link: usize,
        t_low: f64,
        t_high: f64,
    },
}

fn worst(residual: &[f64]) -> f64 {
    residual.iter().fold(0.0, |m: f64, r| m.max(r.abs()))
}

fn norm2(residual: &[f64]) -> f64 {
    residual.iter().map(|r| r * r).sum::<f64>().sqrt()
}

/// Solve a network with nonlinear links.
pub fn solve_nonlinear(
    net: &Network,
    settings: NewtonSettings,
) -> Result<(Temperatures, Convergence), NewtonError> {
    solve_nonlinear_with(net, settings, &FactorCache::default())
}

/// Solve a network with nonlinear links, the factorisations sharing the symbolic analysis in
/// `cache`: every Newton step has the Jacobian pattern of the first (the links and free nodes
/// never change), and a study's next point usually has it too.
pub fn solve_nonlinear_with(
    net: &Network,
    settings: NewtonSettings,
    cache: &FactorCache,
) -> Result<(Temperatures, Convergence), NewtonError> {
    let mut t = initial_guess(net, cache).map_err(NewtonError::Linear)?.0;
    let mut asm = assemble(net, &t);
    let n = asm.free.len();
    let tolerance =
        |a: &Assembly| settings.relative_tolerance * a.flow_scale.max(f64::MIN_POSITIVE);
    let mut iterations = 0;
    loop {
        let res = worst(&asm.residual);
        if res <= tolerance(&asm) || n == 0 {
            check_conductivities(net, &t)?;
            return Ok((
                Temperatures(t),
                Convergence {
                    method: "Newton's method, damped",
                    iterations,
                    final_residual: res,
                },
            ));
        }
        if iterations >= settings.max_iterations {
            return Err(NewtonError::NoConvergence {
                iterations,
                residual: res,
                stalled: false,
            });
        }
        iterations += 1;
        let step = cache
            .solve_general(n, &asm.jacobian, &asm.residual)
            .map_err(NewtonError::Linear)?;
        // Damping: halve the step until the imbalance falls and every temperature stays above
        // absolute zero (radiation and k(T) have no meaning below it).
        let f0 = norm2(&asm.residual);
        let mut alpha = 1.0;
        let mut accepted = None;
        while alpha >= 1.0 / 1024.0 {
            let mut trial = t.clone();
            let mut valid = true;
            for (k, &i) in asm.free.iter().enumerate() {
                trial[i] = t[i] - alpha * step[k];
                valid &= trial[i].is_finite() && trial[i] > 0.0;
            }
            if valid {
                let a = assemble(net, &trial);
                if norm2(&a.residual) < (1.0 - 1e-4 * alpha) * f0 {
                    accepted = Some((trial, a));
                    break;
                }
            }
            alpha *= 0.5;
        }
        match accepted {
            Some((trial, a)) => {
                t = trial;
                asm = a;
            }
            None => {
                // Round-off floor: no step can reduce an imbalance that is already at the
                // precision of the sums; accept it when it is tiny, otherwise fail loudly.
                if res <= 1e-9 * asm.flow_scale {
                    check_conductivities(net, &t)?;
                    return Ok((
                        Temperatures(t),
                        Convergence {
                            method: "Newton's method, damped",
                            iterations,
                            final_residual: res,
                        },
                    ));
                }
                return Err(NewtonError::NoConvergence {
                    iterations,
                    residual: res,
                    stalled: true,
                });
            }
        }
    }
}

/// A k(T) that reaches zero between a link's end temperatures makes the answer meaningless.
fn check_conductivities(net: &Network, t: &[f64]) -> Result<(), NewtonError> {
    for (i, l) in net.links.iter().enumerate() {
        if let LinkLaw::Conduction { conductivity, .. } = &l.law {
            let (lo, hi) = (t[l.from].min(t[l.to]), t[l.from].max(t[l.to]));
            if conductivity.min_over(lo, hi) <= 0.0 {
                return Err(NewtonError::NonPhysicalConductivity {
                    link: i,
                    t_low: lo,
                    t_high: hi,
                });
            }
        }
    }
    Ok(())
}

/// Start from the network linearised at the mean boundary temperature (its links' slopes there).
fn initial_guess(net: &Network, cache: &FactorCache) -> Result<Temperatures, SolveError> {
    let fixed: Vec<f64> = net.nodes.iter().filter_map(|n| n.fixed).collect();
    let mean = if fixed.is_empty() {
        293.15
    } else {
        fixed.iter().sum::<f64>() / fixed.len() as f64
    };
    let mut lin = net.clone();
    for l in &mut lin.links {
        if let LinkLaw::Convection(_) = l.law {
            // A natural-convection h vanishes with the temperature difference on some plates;
            // the secant over a typical 20 K difference starts every film with a sound slope.
            let g = l.law.conductance_at(mean + 10.0, mean - 10.0);
            l.law = LinkLaw::Linear { conductance: g };
        } else if !l.law.is_linear() {
            let g = l.law.flow(mean, mean).1;
            l.law = LinkLaw::Linear { conductance: g };
        }
    }
    solve_steady_with(&lin, Some(cache))
}

/// E502: the nonlinear solve did not converge; never a silent wrong answer.
pub fn newton_failure(net: &Network, e: NewtonError) -> crate::Diagnostic {
    let span = net
        .links
        .iter()
        .find(|l| !l.law.is_linear())
        .map(|l| l.span)
        .unwrap_or_default();
    let (msg, help) = match e {
        NewtonError::NoConvergence { iterations, residual, stalled } => (
            format!(
                "the nonlinear solve did not converge: after {iterations} Newton step{} the worst heat balance is still {residual:.3e} W{}",
                if iterations == 1 { "" } else { "s" },
                if stalled { " and no damped step reduces it" } else { "" }
            ),
            "no temperatures are reported; check the nonlinear links (emissivities, areas, k(T) tables) for values far from the rest of the network, or give fixed temperatures closer to the expected range",
        ),
        NewtonError::NonPhysicalConductivity { link, t_low, t_high } => {
            let l = &net.links[link];
            return crate::Diagnostic::error(
                "E503",
                format!(
                    "the conductivity of `{}` falls to zero or below between {:.2} °C and {:.2} °C, where the solve puts its two faces",
                    l.name,
                    t_low - 273.15,
                    t_high - 273.15
                ),
                l.span,
            )
            .with_label("k(T) not positive over this link's temperatures")
            .with_help("the linear k(T) is extrapolated beyond where it holds; use a `table(...)` of measured points (it holds its end values) or a smaller `k_slope`");
        }
        NewtonError::Linear(_) => (
            "a linear solve inside the nonlinear iteration failed".to_string(),
            "check for conductances that are extremely small or large compared with the rest of the network",
        ),
    };
    crate::Diagnostic::error("E502", msg, span)
        .with_label("first nonlinear link of the model")
        .with_help(help)
}
