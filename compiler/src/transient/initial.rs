//! The state a transient run starts from: stated initial temperatures, and the steady state of
//! the network at time 0 for every other node (linear, or by Newton when links are nonlinear).

use super::factor::StepMatrices;
use super::system::{HeatSystem, NetworkSystem};
use super::RunError;
use crate::network::Network;

/// Steady solution at the start (when some node needs it), stated initial temperatures, and
/// nodes without capacity made consistent with the rest.
pub(super) fn initial_state(sys: &NetworkSystem, net: &Network) -> Result<Vec<f64>, RunError> {
    let n = sys.len();
    if n == 0 {
        return Ok(Vec::new());
    }
    if !sys.is_linear() {
        return initial_state_nonlinear(sys, net);
    }
    let mut stated = vec![None; n];
    for &(node, t, _) in &net.dynamics.initial {
        if sys.index[node] != usize::MAX {
            stated[sys.index[node]] = Some(t);
        }
    }
    let cap = sys.capacity();
    let mut entries = Vec::new();
    let mut rhs = vec![0.0; n];
    let zeros = vec![0.0; n];
    sys.assemble(0.0, &zeros, Some(&mut entries), &mut rhs);
    let mut x = vec![0.0; n];
    let steady_needed = stated.iter().any(|s| s.is_none());
    let mut mats = None;
    if steady_needed {
        let mut m = StepMatrices::new(n, &entries, cap).map_err(|_| RunError::Singular)?;
        let key = m.factor(0.0).map_err(|_| RunError::Singular)?;
        x.copy_from_slice(&rhs);
        m.solve(key, &mut x);
        mats = Some(m);
    }
    let any_stated = stated.iter().any(|s| s.is_some());
    for (k, s) in stated.iter().enumerate() {
        if let Some(t) = s {
            x[k] = *t;
        }
    }
    let algebraic: Vec<usize> = (0..n).filter(|&k| cap[k] == 0.0).collect();
    if any_stated && !algebraic.is_empty() {
        // Solve G_aa·x_a = rhs_a − G_ad·x_d for the nodes that store no heat.
        let entries = mats.as_ref().map(|m| m.entries()).unwrap_or(entries);
        let mut slot = vec![usize::MAX; n];
        for (a, &k) in algebraic.iter().enumerate() {
            slot[k] = a;
        }
        let mut sub = Vec::new();
        let mut b: Vec<f64> = algebraic.iter().map(|&k| rhs[k]).collect();
        for e in &entries {
            match (slot[e.row], slot[e.col]) {
                (usize::MAX, usize::MAX) => {}
                (r, usize::MAX) => b[r] -= e.val * x[e.col],
                (usize::MAX, c) => b[c] -= e.val * x[e.row],
                (r, c) => sub.push(faer::sparse::Triplet::new(r, c, e.val)),
            }
        }
        let xa =
            crate::solve::solve_spd(algebraic.len(), &sub, &b).map_err(|_| RunError::Singular)?;
        for (a, &k) in algebraic.iter().enumerate() {
            x[k] = xa[a];
        }
    }
    if x.iter().any(|v| !v.is_finite()) {
        return Err(RunError::NonFinite { time: 0.0 });
    }
    Ok(x)
}

/// The initial state of a network with nonlinear links: the steady solution at the start by the
/// steady solver's damped Newton method (schedules at their start values), the stated `initial`
/// temperatures over it, then the nodes without capacity made consistent by Newton's method on
/// their own balances.
fn initial_state_nonlinear(sys: &NetworkSystem, net: &Network) -> Result<Vec<f64>, RunError> {
    let n = sys.len();
    let mut stated = vec![None; n];
    for &(node, t, _) in &net.dynamics.initial {
        if sys.index[node] != usize::MAX {
            stated[sys.index[node]] = Some(t);
        }
    }
    let mut x = vec![0.0; n];
    if stated.iter().any(|s| s.is_none()) {
        let mut at_start = net.clone();
        for (i, node) in at_start.nodes.iter_mut().enumerate() {
            if node.fixed.is_some() {
                node.fixed = Some(sys.fixed_temperature(i, 0.0));
            } else {
                node.load = sys.load(i, 0.0);
            }
        }
        let (temps, _) = crate::nonlinear::solve_nonlinear(
            &at_start,
            crate::nonlinear::NewtonSettings::default(),
        )
        .map_err(RunError::SteadyStart)?;
        for (k, &i) in sys.free.iter().enumerate() {
            x[k] = temps.0[i];
        }
    }
    for (k, s) in stated.iter().enumerate() {
        if let Some(t) = s {
            x[k] = *t;
        }
    }
    let cap = sys.capacity();
    let algebraic: Vec<usize> = (0..n).filter(|&k| cap[k] == 0.0).collect();
    if stated.iter().any(|s| s.is_some()) && !algebraic.is_empty() {
        // Newton on G_aa·x_a = rhs_a − G_ad·x_d, G and rhs linearised about the current x.
        let mut slot = vec![usize::MAX; n];
        for (a, &k) in algebraic.iter().enumerate() {
            slot[k] = a;
        }
        let (mut entries, mut rhs) = (Vec::new(), vec![0.0; n]);
        let mut converged = false;
        for _ in 0..60 {
            sys.assemble(0.0, &x, Some(&mut entries), &mut rhs);
            let mut sub = Vec::new();
            let mut b: Vec<f64> = algebraic.iter().map(|&k| rhs[k]).collect();
            for e in &entries {
                match (slot[e.row], slot[e.col]) {
                    (usize::MAX, _) => {}
                    (r, usize::MAX) => b[r] -= e.val * x[e.col],
                    (r, c) => sub.push(faer::sparse::Triplet::new(r, c, e.val)),
                }
            }
            let xa = crate::transient::factor::solve_general(algebraic.len(), &sub, &b)
                .map_err(|_| RunError::Singular)?;
            let (mut change, mut size) = (0.0f64, 1.0f64);
            for (a, &k) in algebraic.iter().enumerate() {
                change = change.max((xa[a] - x[k]).abs());
                size = size.max(xa[a].abs());
                x[k] = xa[a];
            }
            if !change.is_finite() {
                return Err(RunError::NonFinite { time: 0.0 });
            }
            if change <= 1e-11 * size {
                converged = true;
                break;
            }
        }
        if !converged {
            return Err(RunError::NoConvergence { time: 0.0 });
        }
    }
    if x.iter().any(|v| !v.is_finite()) {
        return Err(RunError::NonFinite { time: 0.0 });
    }
    Ok(x)
}
