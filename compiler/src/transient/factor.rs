//! Factorisations of the step matrix A = c·diag(C) + G (c = 1/(d·h)), sharing one symbolic
//! analysis (the sparsity pattern never changes) and cached per value of c, so that a run whose
//! step stays the same factors once, and a step that returns to an earlier size reuses its
//! factorisation.
//!
//! A linear network gives a symmetric G, stored as its lower triangle and factored by sparse
//! Cholesky. A nonlinear one (radiation, k(T)) gives the Jacobian of its heat balances, which is
//! not symmetric (a link's slopes at its two ends differ), stored whole and factored by sparse LU.

use super::system::Entry;
use crate::solve::SolveError;
use faer::linalg::solvers::Solve;
use faer::sparse::linalg::solvers::{Llt, Lu, SymbolicLlt, SymbolicLu};
use faer::sparse::SparseColMat;
use faer::{MatMut, Side};

/// How many factorisations are kept (the step sizes of the automatic step are powers of two
/// apart, so a few cover the sizes in use).
const CACHE: usize = 6;

/// The sparsity analysis shared by every factorisation of one run.
enum Symbolic {
    Llt(SymbolicLlt<usize>),
    Lu(SymbolicLu<usize>),
}

enum Numeric {
    Llt(Llt<usize, f64>),
    // Boxed: the LU holds its supernodal parts inline and would size every cache slot.
    Lu(Box<Lu<usize, f64>>),
}

pub struct StepMatrices {
    n: usize,
    /// Lower triangle of G (symmetric), or every entry of G (general).
    g: SparseColMat<usize, f64>,
    /// Position of each diagonal entry in `g`'s values.
    diag: Vec<usize>,
    /// Position in `g`'s values of each assembled entry, in assembly order (to refill values).
    slots: Vec<usize>,
    capacity: Vec<f64>,
    symbolic: Symbolic,
    cache: Vec<(u64, Numeric)>,
    /// Numeric factorisations made so far.
    pub factorisations: usize,
    /// Triangular solves made so far.
    pub solves: usize,
}

fn position(g: &SparseColMat<usize, f64>, row: usize, col: usize) -> Option<usize> {
    let ptr = g.symbolic().col_ptr();
    let rows = &g.symbolic().row_idx()[ptr[col]..ptr[col + 1]];
    rows.iter().position(|&r| r == row).map(|p| ptr[col] + p)
}

impl StepMatrices {
    /// Analyse the pattern of G given by its lower-triangle entries (every diagonal present).
    pub fn new(n: usize, entries: &[Entry], capacity: &[f64]) -> Result<StepMatrices, SolveError> {
        StepMatrices::with_pattern(n, entries, capacity, true)
    }

    /// Analyse the pattern of a general (not necessarily symmetric) G given by all its entries
    /// (every diagonal present); factored by sparse LU.
    pub fn general(
        n: usize,
        entries: &[Entry],
        capacity: &[f64],
    ) -> Result<StepMatrices, SolveError> {
        StepMatrices::with_pattern(n, entries, capacity, false)
    }

    fn with_pattern(
        n: usize,
        entries: &[Entry],
        capacity: &[f64],
        symmetric: bool,
    ) -> Result<StepMatrices, SolveError> {
        let g = SparseColMat::<usize, f64>::try_new_from_triplets(n, n, entries)
            .map_err(|_| SolveError::NotPositiveDefinite)?;
        let diag = (0..n)
            .map(|j| position(&g, j, j))
            .collect::<Option<Vec<_>>>()
            .ok_or(SolveError::NotPositiveDefinite)?;
        let slots = entries
            .iter()
            .map(|e| position(&g, e.row, e.col))
            .collect::<Option<Vec<_>>>()
            .ok_or(SolveError::NotPositiveDefinite)?;
        let symbolic = if symmetric {
            Symbolic::Llt(
                SymbolicLlt::try_new(g.symbolic(), Side::Lower)
                    .map_err(|_| SolveError::NotPositiveDefinite)?,
            )
        } else {
            Symbolic::Lu(SymbolicLu::try_new(g.symbolic()).map_err(|_| SolveError::NonFinite)?)
        };
        Ok(StepMatrices {
            n,
            g,
            diag,
            slots,
            capacity: capacity.to_vec(),
            symbolic,
            cache: Vec::new(),
            factorisations: 0,
            solves: 0,
        })
    }

    /// Replace G's values by new entries of the same pattern and order (a nonlinear network
    /// linearised about new temperatures); every cached factorisation becomes stale.
    pub fn set_values(&mut self, entries: &[Entry]) {
        let vals = self.g.val_mut();
        vals.iter_mut().for_each(|v| *v = 0.0);
        for (e, &p) in entries.iter().zip(&self.slots) {
            vals[p] += e.val;
        }
        self.cache.clear();
    }

    /// The factorisation of c·diag(C) + G, made now or taken from the cache; returns its key.
    pub fn factor(&mut self, c: f64) -> Result<usize, SolveError> {
        let key = c.to_bits();
        if let Some(pos) = self.cache.iter().position(|(k, _)| *k == key) {
            let entry = self.cache.remove(pos);
            self.cache.push(entry);
            return Ok(self.cache.len() - 1);
        }
        let mut a = self.g.clone();
        {
            let vals = a.val_mut();
            for (j, &p) in self.diag.iter().enumerate() {
                vals[p] += c * self.capacity[j];
            }
        }
        let numeric = match &self.symbolic {
            Symbolic::Llt(s) => Numeric::Llt(
                Llt::try_new_with_symbolic(s.clone(), a.as_ref(), Side::Lower)
                    .map_err(|_| SolveError::NotPositiveDefinite)?,
            ),
            Symbolic::Lu(s) => Numeric::Lu(Box::new(
                Lu::try_new_with_symbolic(s.clone(), a.as_ref())
                    .map_err(|_| SolveError::NonFinite)?,
            )),
        };
        self.factorisations += 1;
        if self.cache.len() >= CACHE {
            self.cache.remove(0);
        }
        self.cache.push((key, numeric));
        Ok(self.cache.len() - 1)
    }

    /// Solve A·x = b in place with the factorisation `key` returned by [`StepMatrices::factor`].
    pub fn solve(&mut self, key: usize, b: &mut [f64]) {
        self.solves += 1;
        let rhs = MatMut::from_column_major_slice_mut(b, self.n, 1);
        match &self.cache[key].1 {
            Numeric::Llt(f) => f.solve_in_place(rhs),
            // A zero pivot in LU shows up as non-finite values, which the caller checks.
            Numeric::Lu(f) => f.solve_in_place(rhs),
        }
    }

    /// True when G is stored as the lower triangle of a symmetric matrix.
    pub fn is_symmetric(&self) -> bool {
        matches!(self.symbolic, Symbolic::Llt(_))
    }

    /// The diagonal of G, W/K.
    pub fn diagonal(&self) -> Vec<f64> {
        self.diag.iter().map(|&p| self.g.val()[p]).collect()
    }

    /// y = G·x from the stored entries.
    pub fn mul_g(&self, x: &[f64], y: &mut [f64]) {
        y.iter_mut().for_each(|v| *v = 0.0);
        let mirror = self.is_symmetric();
        let s = self.g.symbolic();
        let (ptr, rows, vals) = (s.col_ptr(), s.row_idx(), self.g.val());
        for j in 0..self.n {
            for p in ptr[j]..ptr[j + 1] {
                let (i, v) = (rows[p], vals[p]);
                y[i] += v * x[j];
                if mirror && i != j {
                    y[j] += v * x[i];
                }
            }
        }
    }

    /// Stored entries of G: its lower triangle when symmetric, else all of them (for sub-systems such as the consistent initial state).
    pub fn entries(&self) -> Vec<Entry> {
        let s = self.g.symbolic();
        let (ptr, rows, vals) = (s.col_ptr(), s.row_idx(), self.g.val());
        let mut out = Vec::with_capacity(vals.len());
        for j in 0..self.n {
            for p in ptr[j]..ptr[j + 1] {
                out.push(Entry::new(rows[p], j, vals[p]));
            }
        }
        out
    }
}

/// Solve A·x = b for a general sparse A given by all its entries (duplicates summed), by
/// sparse LU.
pub fn solve_general(n: usize, entries: &[Entry], b: &[f64]) -> Result<Vec<f64>, SolveError> {
    if n == 0 {
        return Ok(Vec::new());
    }
    let a = SparseColMat::<usize, f64>::try_new_from_triplets(n, n, entries)
        .map_err(|_| SolveError::NonFinite)?;
    let lu = a.sp_lu().map_err(|_| SolveError::NonFinite)?;
    let mut x = b.to_vec();
    lu.solve_in_place(MatMut::from_column_major_slice_mut(&mut x, n, 1));
    if x.iter().any(|v| !v.is_finite()) {
        return Err(SolveError::NonFinite);
    }
    Ok(x)
}
