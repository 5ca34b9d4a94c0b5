//! Capacity figures of a solved network: each capacity node's capacity, its Biot number, its
//! lumped time constant R·C where one path carries most of its conductance, and the network's
//! slowest and fastest time constants.
//!
//! The network's time constants are the reciprocals of the eigenvalues λ of the generalised
//! eigenproblem G·v = λ·C·v over the free nodes (C·dT/dt = −G·T + ...): nodes without capacity are
//! eliminated first (G_red = G_cc − G_cz·G_zz⁻¹·G_zc, which is what they do at every instant), and
//! the problem is solved as the symmetric C^(−½)·G_red·C^(−½). Nonlinear links (radiation, k(T),
//! computed films) enter with the symmetric part of their slope at the solved temperatures, so
//! the figures describe small departures from the steady answer. Exact for up to
//! [`DENSE_LIMIT`] free nodes; larger networks are not analysed here (`None`).

use crate::network::{LinkId, Network};
use serde::Serialize;

/// The most free nodes whose time constants are computed (a dense eigenproblem).
pub const DENSE_LIMIT: usize = 400;

/// One path carries at least this share of a node's conductance for its R·C to be reported
/// (our own threshold: below it no single resistance describes the node).
pub const DOMINANT_SHARE: f64 = 0.9;

/// A node that stores heat.
#[derive(Clone, Debug, Serialize)]
pub struct NodeDynamics {
    pub node: usize,
    /// J/K
    pub capacity: f64,
    /// h·Lc/k for a node whose capacity comes from a material with a volume.
    pub biot: Option<f64>,
    /// R·C with R the resistance of the dominant link, s, and that link.
    pub rc: Option<(f64, LinkId)>,
}

/// The network's extreme time constants, s.
#[derive(Clone, Copy, Debug, Serialize)]
pub struct TimeConstants {
    pub slowest: f64,
    pub fastest: f64,
    /// How many modes (capacity nodes after elimination).
    pub modes: usize,
}

/// The slope of a link's heat flow per kelvin of difference at these temperatures.
fn slope(net: &Network, l: usize, t: &[f64]) -> f64 {
    let link = &net.links[l];
    let (_, d_from, d_to) = link.law.flow(t[link.from], t[link.to]);
    0.5 * (d_from - d_to)
}

/// Capacity figures per capacity node.
pub fn node_dynamics(net: &Network, t: &[f64]) -> Vec<NodeDynamics> {
    let caps = net.dynamics.capacity_vector(net.nodes.len());
    let mut total = vec![0.0; net.nodes.len()];
    let mut best: Vec<Option<(f64, LinkId)>> = vec![None; net.nodes.len()];
    for l in 0..net.links.len() {
        let g = slope(net, l, t);
        for n in [net.links[l].from, net.links[l].to] {
            total[n] += g;
            if best[n].is_none_or(|(b, _)| g > b) {
                best[n] = Some((g, l));
            }
        }
    }
    net.dynamics
        .capacities
        .iter()
        .filter(|c| net.nodes[c.node].fixed.is_none())
        .map(|c| {
            let n = c.node;
            let biot = c.lump.as_ref().and_then(|lump| {
                let v = lump.volume?;
                crate::elaborate::biot_number(net, n, v, lump.k).map(|b| b.number)
            });
            let rc = best[n]
                .filter(|(g, _)| *g > 0.0 && *g >= DOMINANT_SHARE * total[n])
                .map(|(g, l)| (caps[n] / g, l));
            NodeDynamics {
                node: n,
                capacity: caps[n],
                biot,
                rc,
            }
        })
        .collect()
}

/// The slowest and fastest time constants of the network, or `None` without capacity nodes,
/// above [`DENSE_LIMIT`] free nodes, or when a capacity node has no path to a fixed
/// temperature (an eigenvalue of zero: it never settles).
pub fn network_time_constants(net: &Network, t: &[f64]) -> Option<TimeConstants> {
    let caps = net.dynamics.capacity_vector(net.nodes.len());
    let free: Vec<usize> = (0..net.nodes.len())
        .filter(|&i| net.nodes[i].fixed.is_none())
        .collect();
    if free.len() > DENSE_LIMIT || !free.iter().any(|&i| caps[i] > 0.0) {
        return None;
    }
    let mut pos = vec![usize::MAX; net.nodes.len()];
    for (k, &i) in free.iter().enumerate() {
        pos[i] = k;
    }
    let n = free.len();
    let mut g = vec![vec![0.0; n]; n];
    for l in 0..net.links.len() {
        let s = slope(net, l, t);
        let (a, b) = (pos[net.links[l].from], pos[net.links[l].to]);
        if a != usize::MAX {
            g[a][a] += s;
        }
        if b != usize::MAX {
            g[b][b] += s;
        }
        if a != usize::MAX && b != usize::MAX {
            g[a][b] -= s;
            g[b][a] -= s;
        }
    }
    let (c_idx, z_idx): (Vec<usize>, Vec<usize>) = (0..n).partition(|&k| caps[free[k]] > 0.0);
    let reduced = eliminate(&g, &c_idx, &z_idx)?;
    let m = c_idx.len();
    let inv_sqrt: Vec<f64> = c_idx
        .iter()
        .map(|&k| caps[free[k]].sqrt().recip())
        .collect();
    let a = faer::Mat::<f64>::from_fn(m, m, |i, j| reduced[i][j] * inv_sqrt[i] * inv_sqrt[j]);
    let lambda = a.self_adjoint_eigenvalues(faer::Side::Lower).ok()?;
    let (lo, hi) = (*lambda.first()?, *lambda.last()?);
    let scale = hi.abs().max(f64::MIN_POSITIVE);
    // A zero (or NaN) eigenvalue: a capacity node that never settles.
    if lo.is_nan() || lo <= 1e-12 * scale || !hi.is_finite() {
        return None;
    }
    Some(TimeConstants {
        slowest: 1.0 / lo,
        fastest: 1.0 / hi,
        modes: m,
    })
}

/// G_cc − G_cz·G_zz⁻¹·G_zc by Gaussian elimination with partial pivoting on G_zz; `None` when
/// G_zz is singular (a node without capacity that no path holds).
fn eliminate(g: &[Vec<f64>], c: &[usize], z: &[usize]) -> Option<Vec<Vec<f64>>> {
    let (nc, nz) = (c.len(), z.len());
    // [G_zz | G_zc] reduced to [I | X], X = G_zz⁻¹·G_zc.
    let mut m: Vec<Vec<f64>> = z
        .iter()
        .map(|&i| z.iter().chain(c).map(|&j| g[i][j]).collect())
        .collect();
    for col in 0..nz {
        let piv = (col..nz).max_by(|&a, &b| m[a][col].abs().total_cmp(&m[b][col].abs()))?;
        if m[piv][col].abs() < 1e-300 {
            return None;
        }
        m.swap(col, piv);
        let p = m[col][col];
        for v in m[col].iter_mut() {
            *v /= p;
        }
        let pivot_row = m[col].clone();
        for (r, row) in m.iter_mut().enumerate() {
            if r != col && row[col] != 0.0 {
                let f = row[col];
                for (v, pv) in row.iter_mut().zip(&pivot_row) {
                    *v -= f * pv;
                }
            }
        }
    }
    let mut out: Vec<Vec<f64>> = c
        .iter()
        .map(|&i| c.iter().map(|&j| g[i][j]).collect())
        .collect();
    for (a, &i) in c.iter().enumerate() {
        for (k, &zk) in z.iter().enumerate() {
            let gik = g[i][zk];
            if gik != 0.0 {
                for b in 0..nc {
                    out[a][b] -= gik * m[k][nz + b];
                }
            }
        }
    }
    Some(out)
}
