//! The assembled steady system of a network in Matrix Market form (the NIST exchange format for
//! sparse matrices), so a solve can be checked against any other solver and benchmarked on the
//! very same matrix: the matrix `A`, the right-hand side `b` and the node behind each row.
//!
//! A linear network gives its conductance matrix, which is symmetric, written as its lower
//! triangle. A nonlinear one (radiation, k(T), computed films) gives the Jacobian of its heat
//! balances at the solution T*, with b = J·T* − F(T*): the system whose solution is T* again, so
//! the exported pair reproduces the reported temperatures. That Jacobian is symmetric only by
//! chance (a link's slopes at its two ends differ), so it is written whole unless it is exactly
//! symmetric. The writers take any `io::Write`, so the caller chooses files or memory and a
//! matrix of millions of rows streams out without a copy of the text.

use crate::network::{Network, NodeId};
use crate::nonlinear::assemble;
use crate::solve::steady_system;
use faer::sparse::{CreationError, SparseColMat, Triplet};
use std::io::{self, Write};

/// What the matrix of an exported system is.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum MatrixKind {
    /// The conductance matrix of a linear network, W/K.
    Conductance,
    /// The Jacobian of the heat balances of a nonlinear network at its solution, W/K.
    Jacobian,
}

/// The steady system A·T = b of the free nodes of a network.
pub struct SteadyExport {
    pub kind: MatrixKind,
    /// Network node of each row (and unknown), in row order.
    pub rows: Vec<NodeId>,
    /// Every entry of A with duplicates summed, columns in order and rows sorted within each.
    pub matrix: SparseColMat<usize, f64>,
    /// A equals its transpose exactly, so only the lower triangle is written.
    pub symmetric: bool,
    /// Right-hand side, W.
    pub rhs: Vec<f64>,
}

fn mirrored(lower: &[Triplet<usize, usize, f64>]) -> Vec<Triplet<usize, usize, f64>> {
    let mut all = Vec::with_capacity(lower.len() * 2);
    for t in lower {
        all.push(*t);
        if t.row != t.col {
            all.push(Triplet::new(t.col, t.row, t.val));
        }
    }
    all
}

/// The matrix with duplicates summed; fails only when memory runs out (every index comes from
/// the network's own links).
fn sparse(
    n: usize,
    entries: &[Triplet<usize, usize, f64>],
) -> Result<SparseColMat<usize, f64>, CreationError> {
    SparseColMat::try_new_from_triplets(n, n, entries)
}

impl SteadyExport {
    /// The conductance matrix of a linear network (no solve needed).
    pub fn linear(net: &Network) -> Result<SteadyExport, CreationError> {
        let sys = steady_system(net);
        let n = sys.free.len();
        Ok(SteadyExport {
            kind: MatrixKind::Conductance,
            rows: sys.free,
            matrix: sparse(n, &mirrored(&sys.lower))?,
            symmetric: true,
            rhs: sys.rhs,
        })
    }

    /// The Jacobian of a nonlinear network's heat balances at `temps` (its solution, kelvin,
    /// indexed like `net.nodes`).
    pub fn jacobian(net: &Network, temps: &[f64]) -> Result<SteadyExport, CreationError> {
        let asm = assemble(net, temps);
        let n = asm.free.len();
        let matrix = sparse(n, &asm.jacobian)?;
        let symmetric = is_symmetric(&matrix);
        Ok(SteadyExport {
            kind: MatrixKind::Jacobian,
            rows: asm.free,
            matrix,
            symmetric,
            rhs: asm.rhs,
        })
    }

    /// Entries written to `A.mtx`: the lower triangle when symmetric, else all.
    pub fn written_entries(&self) -> usize {
        let m = self.matrix.as_ref();
        if !self.symmetric {
            return m.compute_nnz();
        }
        (0..m.ncols())
            .map(|j| m.row_idx_of_col_raw(j).iter().filter(|&&i| i >= j).count())
            .sum()
    }

    /// `A.mtx`. `model` names the model in a comment line.
    pub fn write_matrix(&self, w: &mut dyn Write, model: &str) -> io::Result<()> {
        let shape = if self.symmetric {
            "symmetric"
        } else {
            "general"
        };
        writeln!(w, "%%MatrixMarket matrix coordinate real {shape}")?;
        writeln!(w, "% steady system of {model}, written by caloris export")?;
        match self.kind {
            MatrixKind::Conductance => writeln!(
                w,
                "% conductance matrix of the free nodes, W/K (the model is linear); rows as in nodes.csv"
            )?,
            MatrixKind::Jacobian => writeln!(
                w,
                "% Jacobian of the heat balances at the solution, W/K (the model is nonlinear: radiation, k(T) or computed films); rows as in nodes.csv{}",
                if self.symmetric { "" } else { "; not symmetric, so written whole" }
            )?,
        }
        let m = self.matrix.as_ref();
        let n = m.ncols();
        writeln!(w, "{n} {n} {}", self.written_entries())?;
        for j in 0..n {
            for (&i, v) in m.row_idx_of_col_raw(j).iter().zip(m.val_of_col(j)) {
                if !self.symmetric || i >= j {
                    // `{:e}` writes the shortest text that reads back to the same f64.
                    writeln!(w, "{} {} {v:e}", i + 1, j + 1)?;
                }
            }
        }
        Ok(())
    }

    /// `b.mtx`, a dense column.
    pub fn write_rhs(&self, w: &mut dyn Write, model: &str) -> io::Result<()> {
        writeln!(w, "%%MatrixMarket matrix array real general")?;
        writeln!(w, "% right-hand side of the steady system of {model}, W")?;
        if self.kind == MatrixKind::Jacobian {
            writeln!(
                w,
                "% b = J*T - F(T) at the solution T, so that A*T = b holds there"
            )?;
        }
        writeln!(w, "{} 1", self.rhs.len())?;
        for v in &self.rhs {
            writeln!(w, "{v:e}")?;
        }
        Ok(())
    }

    /// `nodes.csv`: `row,node`, rows counted from 1 as in the Matrix Market files.
    pub fn write_nodes(&self, w: &mut dyn Write, net: &Network) -> io::Result<()> {
        writeln!(w, "row,node")?;
        for (k, &i) in self.rows.iter().enumerate() {
            writeln!(w, "{},{}", k + 1, csv_field(&net.nodes[i].name))?;
        }
        Ok(())
    }
}

/// A CSV field, quoted when it holds a comma, quote or line break (RFC 4180).
fn csv_field(s: &str) -> String {
    if s.contains([',', '"', '\n', '\r']) {
        format!("\"{}\"", s.replace('"', "\"\""))
    } else {
        s.to_string()
    }
}

/// True when every stored entry (i, j) has an equal entry (j, i).
fn is_symmetric(m: &SparseColMat<usize, f64>) -> bool {
    let m = m.as_ref();
    (0..m.ncols()).all(|j| {
        m.row_idx_of_col_raw(j)
            .iter()
            .zip(m.val_of_col(j))
            .all(|(&i, v)| {
                let rows = m.row_idx_of_col_raw(i);
                rows.binary_search(&j)
                    .is_ok_and(|p| m.val_of_col(i)[p] == *v)
            })
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn csv_fields_are_quoted_only_when_needed() {
        // RFC 4180: fields with commas or quotes are quoted, quotes doubled.
        assert_eq!(csv_field("wall.inside"), "wall.inside");
        assert_eq!(csv_field("slab[1,2]"), "\"slab[1,2]\"");
        assert_eq!(csv_field("a\"b"), "\"a\"\"b\"");
    }

    #[test]
    fn symmetry_is_exact() -> Result<(), CreationError> {
        let t = |r, c, v| Triplet::new(r, c, v);
        let a = sparse(
            2,
            &[t(0, 0, 2.0), t(1, 0, -1.0), t(0, 1, -1.0), t(1, 1, 2.0)],
        )?;
        assert!(is_symmetric(&a));
        let b = sparse(
            2,
            &[t(0, 0, 2.0), t(1, 0, -1.0), t(0, 1, -1.5), t(1, 1, 2.0)],
        )?;
        assert!(!is_symmetric(&b));
        Ok(())
    }
}
