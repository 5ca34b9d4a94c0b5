//! Steady solve: assemble the conductance matrix of the free nodes and factor it with a sparse
//! Cholesky decomposition (the matrix is symmetric positive definite once every free node has a
//! path to a fixed temperature, which elaboration checks first).

use crate::factor_cache::FactorCache;
use crate::network::{Network, NodeId};
use faer::sparse::Triplet;

/// Node temperatures of a solved network, in kelvin, indexed like `Network::nodes`.
#[derive(Clone, Debug)]
pub struct Temperatures(pub Vec<f64>);

#[derive(Debug, Clone, PartialEq)]
pub enum SolveError {
    /// The factorisation failed: the matrix is not positive definite (a conductance of zero or
    /// an island that the connectivity check missed).
    NotPositiveDefinite,
    NonFinite,
}

/// The linear steady system of a network: the conductance matrix of its free nodes (lower
/// triangle, duplicates to be summed) and the right-hand side of loads plus the heat the fixed
/// nodes drive in. Free nodes get unknowns; fixed nodes move to the right side.
#[derive(Clone, Debug)]
pub struct SteadySystem {
    /// Network node id of each unknown, in unknown order.
    pub free: Vec<NodeId>,
    /// Lower-triangle entries of the conductance matrix, W/K.
    pub lower: Vec<Triplet<usize, usize, f64>>,
    /// Right-hand side, W.
    pub rhs: Vec<f64>,
}

/// The linear steady system of `net` (every link taken at its constant conductance).
pub fn steady_system(net: &Network) -> SteadySystem {
    let n_all = net.nodes.len();
    let mut index = vec![usize::MAX; n_all];
    let mut free: Vec<NodeId> = Vec::new();
    for (i, node) in net.nodes.iter().enumerate() {
        if node.fixed.is_none() {
            index[i] = free.len();
            free.push(i);
        }
    }
    let n = free.len();
    let fixed = |i: NodeId| net.nodes[i].fixed.unwrap_or(f64::NAN);
    let mut lower = Vec::with_capacity(net.links.len() * 3 + n);
    let mut rhs = vec![0.0; n];
    for &i in &free {
        rhs[index[i]] += net.nodes[i].load;
    }
    for link in &net.links {
        let g = link.conductance();
        let (a, b) = (link.from, link.to);
        match (index[a], index[b]) {
            (usize::MAX, usize::MAX) => {}
            (ia, usize::MAX) => {
                lower.push(Triplet::new(ia, ia, g));
                rhs[ia] += g * fixed(b);
            }
            (usize::MAX, ib) => {
                lower.push(Triplet::new(ib, ib, g));
                rhs[ib] += g * fixed(a);
            }
            (ia, ib) => {
                lower.push(Triplet::new(ia, ia, g));
                lower.push(Triplet::new(ib, ib, g));
                // Only the lower triangle is read by the factorisation.
                let (r, c) = if ia > ib { (ia, ib) } else { (ib, ia) };
                lower.push(Triplet::new(r, c, -g));
            }
        }
    }
    SteadySystem { free, lower, rhs }
}

/// Solve the linear steady network.
pub fn solve_steady(net: &Network) -> Result<Temperatures, SolveError> {
    solve_steady_with(net, None)
}

/// Solve the linear steady network, reusing the symbolic factorisation `cache` holds when the
/// network has the same pattern as the last one it solved (a study point, another case).
pub fn solve_steady_with(
    net: &Network,
    cache: Option<&FactorCache>,
) -> Result<Temperatures, SolveError> {
    let mut temps: Vec<f64> = net
        .nodes
        .iter()
        .map(|nd| nd.fixed.unwrap_or(f64::NAN))
        .collect();
    let sys = steady_system(net);
    if sys.free.is_empty() {
        return Ok(Temperatures(temps));
    }
    let x = match cache {
        Some(c) => c.solve_spd(sys.free.len(), &sys.lower, &sys.rhs)?,
        None => solve_spd(sys.free.len(), &sys.lower, &sys.rhs)?,
    };
    for (k, &i) in sys.free.iter().enumerate() {
        temps[i] = x[k];
    }
    Ok(Temperatures(temps))
}

/// Solve `A x = b` for a symmetric positive definite `A` given by its lower-triangle triplets
/// (duplicates are summed).
pub fn solve_spd(
    n: usize,
    lower: &[Triplet<usize, usize, f64>],
    b: &[f64],
) -> Result<Vec<f64>, SolveError> {
    crate::factor_cache::solve_spd_once(n, lower, b)
}
