//! Steady solve: assemble the conductance matrix of the free nodes and factor it with a sparse
//! Cholesky decomposition (the matrix is symmetric positive definite once every free node has a
//! path to a fixed temperature, which elaboration checks first).

use crate::network::{Network, NodeId};
use faer::linalg::solvers::Solve;
use faer::sparse::{SparseColMat, Triplet};
use faer::{Mat, Side};

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

/// Solve the linear steady network. Free nodes get unknowns; fixed nodes move to the right side.
pub fn solve_steady(net: &Network) -> Result<Temperatures, SolveError> {
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
    let mut temps: Vec<f64> = net
        .nodes
        .iter()
        .map(|nd| nd.fixed.unwrap_or(f64::NAN))
        .collect();
    if n == 0 {
        return Ok(Temperatures(temps));
    }
    let mut triplets = Vec::with_capacity(net.links.len() * 3 + n);
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
                triplets.push(Triplet::new(ia, ia, g));
                rhs[ia] += g * temps[b];
            }
            (usize::MAX, ib) => {
                triplets.push(Triplet::new(ib, ib, g));
                rhs[ib] += g * temps[a];
            }
            (ia, ib) => {
                triplets.push(Triplet::new(ia, ia, g));
                triplets.push(Triplet::new(ib, ib, g));
                // Only the lower triangle is read by the factorisation.
                let (r, c) = if ia > ib { (ia, ib) } else { (ib, ia) };
                triplets.push(Triplet::new(r, c, -g));
            }
        }
    }
    let x = solve_spd(n, &triplets, &rhs)?;
    for (k, &i) in free.iter().enumerate() {
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
    let a = SparseColMat::<usize, f64>::try_new_from_triplets(n, n, lower)
        .map_err(|_| SolveError::NotPositiveDefinite)?;
    let llt = a
        .sp_cholesky(Side::Lower)
        .map_err(|_| SolveError::NotPositiveDefinite)?;
    let mut x = Mat::<f64>::from_fn(n, 1, |i, _| b[i]);
    llt.solve_in_place(x.as_mut());
    let out: Vec<f64> = (0..n).map(|i| x[(i, 0)]).collect();
    if out.iter().any(|v| !v.is_finite()) {
        return Err(SolveError::NonFinite);
    }
    Ok(out)
}
