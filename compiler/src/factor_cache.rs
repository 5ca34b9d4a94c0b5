//! Sparse factorisations that reuse their symbolic analysis (fill-reducing ordering, elimination
//! tree, supernodes) whenever a system has the same sparsity pattern as the one before, so that
//! only the numeric factorisation is repeated: the steps of Newton's method, and the points and
//! cases of a study, where only values change.
//!
//! A system is given, as everywhere in the compiler, by its entries in assembly order. Two
//! systems have the same pattern exactly when their (row, column) sequences are equal, which is
//! checked entry by entry (no hash that could collide); their values are then scattered into the
//! stored compressed pattern through the position of each entry. The first solve of a pattern
//! goes through the very same scatter, so a reused factorisation gives bit-for-bit the answer of
//! a fresh one. The last numeric factorisation is kept as well, for a system whose matrix did
//! not change at all (only its right-hand side). One cache may serve several threads: the analysis is shared by reference and
//! only swapped under a short lock.

use crate::solve::SolveError;
use faer::linalg::solvers::Solve;
use faer::sparse::linalg::solvers::{Llt, Lu, SymbolicLlt, SymbolicLu};
use faer::sparse::{SparseColMat, SparseColMatRef, SymbolicSparseColMat, Triplet};
use faer::{MatMut, Side};
use std::sync::atomic::{AtomicUsize, Ordering};
use std::sync::{Arc, Mutex};

type Entries = [Triplet<usize, usize, f64>];

/// Which factorisation a pattern is analysed for.
#[derive(Clone, Copy, PartialEq, Eq, Debug)]
enum Kind {
    /// Symmetric positive definite, lower triangle given: sparse Cholesky.
    Llt,
    /// General: sparse LU.
    Lu,
}

enum Analysis {
    Llt(SymbolicLlt<usize>),
    Lu(SymbolicLu<usize>),
}

enum Numeric {
    Llt(Llt<usize, f64>),
    // Boxed: the LU holds its supernodal parts inline.
    Lu(Box<Lu<usize, f64>>),
}

/// The last numeric factorisation of a pattern and the values it was made from: a system whose
/// matrix is unchanged (a study over a boundary temperature or a heat load changes only the
/// right-hand side) needs only the triangular solves.
struct Factored {
    vals: Vec<f64>,
    numeric: Numeric,
}

/// One analysed pattern.
struct Pattern {
    n: usize,
    /// Row and column of every entry, in assembly order.
    keys: Vec<(u32, u32)>,
    /// Position of every entry in the compressed values.
    slots: Vec<usize>,
    csc: SymbolicSparseColMat<usize>,
    analysis: Analysis,
    /// Kept only for a pattern that is kept (see [`Pattern::analyse`]).
    last: Mutex<Option<Arc<Factored>>>,
}

impl Pattern {
    fn matches(&self, n: usize, entries: &Entries) -> bool {
        self.n == n
            && !self.keys.is_empty()
            && self.keys.len() == entries.len()
            && self
                .keys
                .iter()
                .zip(entries)
                .all(|(&(r, c), t)| r as usize == t.row && c as usize == t.col)
    }

    /// The pattern of `entries`; `keep` keeps their keys for matching later systems (a one-off
    /// solve does without them).
    fn analyse(n: usize, entries: &Entries, kind: Kind, keep: bool) -> Result<Pattern, SolveError> {
        let keys = if keep {
            entries
                .iter()
                .map(|t| Some((u32::try_from(t.row).ok()?, u32::try_from(t.col).ok()?)))
                .collect::<Option<Vec<_>>>()
                .ok_or(SolveError::NotPositiveDefinite)?
        } else {
            Vec::new()
        };
        let a = SparseColMat::<usize, f64>::try_new_from_triplets(n, n, entries)
            .map_err(|_| SolveError::NotPositiveDefinite)?;
        let csc = a
            .symbolic()
            .to_owned()
            .map_err(|_| SolveError::NotPositiveDefinite)?;
        let (ptr, rows) = (csc.col_ptr(), csc.row_idx());
        // Rows are sorted within each column.
        let slots = entries
            .iter()
            .map(|t| {
                let col = &rows[ptr[t.col]..ptr[t.col + 1]];
                col.binary_search(&t.row).ok().map(|p| ptr[t.col] + p)
            })
            .collect::<Option<Vec<_>>>()
            .ok_or(SolveError::NotPositiveDefinite)?;
        let analysis = match kind {
            Kind::Llt => Analysis::Llt(
                SymbolicLlt::try_new(csc.as_ref(), Side::Lower)
                    .map_err(|_| SolveError::NotPositiveDefinite)?,
            ),
            Kind::Lu => Analysis::Lu(
                SymbolicLu::try_new(csc.as_ref()).map_err(|_| SolveError::NotPositiveDefinite)?,
            ),
        };
        Ok(Pattern {
            n,
            keys,
            slots,
            csc,
            analysis,
            last: Mutex::new(None),
        })
    }

    /// Factor the matrix with these entries' values (or take the last factorisation when they
    /// are the same, bit for bit) and solve for `b`.
    fn solve(&self, entries: &Entries, b: &[f64], counts: &Counts) -> Result<Vec<f64>, SolveError> {
        let mut vals = vec![0.0; self.csc.row_idx().len()];
        for (t, &p) in entries.iter().zip(&self.slots) {
            vals[p] += t.val;
        }
        let kept = !self.keys.is_empty();
        let last = if kept { lock(&self.last).clone() } else { None };
        let same = |f: &Factored| {
            f.vals.len() == vals.len()
                && f.vals
                    .iter()
                    .zip(&vals)
                    .all(|(a, b)| a.to_bits() == b.to_bits())
        };
        let factored = match last {
            Some(f) if same(&f) => {
                counts.numeric_reused.fetch_add(1, Ordering::Relaxed);
                f
            }
            _ => {
                let a = SparseColMatRef::new(self.csc.as_ref(), &vals);
                let numeric = match &self.analysis {
                    Analysis::Llt(s) => Numeric::Llt(
                        Llt::try_new_with_symbolic(s.clone(), a, Side::Lower)
                            .map_err(|_| SolveError::NotPositiveDefinite)?,
                    ),
                    Analysis::Lu(s) => Numeric::Lu(Box::new(
                        Lu::try_new_with_symbolic(s.clone(), a)
                            .map_err(|_| SolveError::NotPositiveDefinite)?,
                    )),
                };
                let f = Arc::new(Factored { vals, numeric });
                if kept {
                    *lock(&self.last) = Some(f.clone());
                }
                f
            }
        };
        let mut x = b.to_vec();
        let rhs = MatMut::from_column_major_slice_mut(&mut x, self.n, 1);
        match &factored.numeric {
            Numeric::Llt(f) => f.solve_in_place(rhs),
            // A zero pivot in LU shows up as non-finite values, checked below.
            Numeric::Lu(f) => f.solve_in_place(rhs),
        }
        if x.iter().any(|v| !v.is_finite()) {
            return Err(SolveError::NonFinite);
        }
        Ok(x)
    }
}

/// A poisoned lock only means another solve panicked; what it guards is always whole.
fn lock<T>(m: &Mutex<T>) -> std::sync::MutexGuard<'_, T> {
    m.lock().unwrap_or_else(|e| e.into_inner())
}

/// How a cache was used.
#[derive(Default)]
struct Counts {
    analysed: AtomicUsize,
    reused: AtomicUsize,
    numeric_reused: AtomicUsize,
}

/// Solve A·x = b once, for a symmetric positive definite A given by its lower-triangle entries
/// (duplicates summed), by sparse Cholesky: exactly what a [`FactorCache`] computes, without
/// keeping the pattern.
pub fn solve_spd_once(n: usize, lower: &Entries, b: &[f64]) -> Result<Vec<f64>, SolveError> {
    if n == 0 {
        return Ok(Vec::new());
    }
    Pattern::analyse(n, lower, Kind::Llt, false)?.solve(lower, b, &Counts::default())
}

/// The latest analysed pattern of each kind, and how often one was reused.
#[derive(Default)]
pub struct FactorCache {
    llt: Mutex<Option<Arc<Pattern>>>,
    lu: Mutex<Option<Arc<Pattern>>>,
    counts: Counts,
}

impl std::fmt::Debug for FactorCache {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.debug_struct("FactorCache")
            .field("analysed", &self.analysed())
            .field("reused", &self.reused())
            .field("numeric_reused", &self.numeric_reused())
            .finish()
    }
}

impl FactorCache {
    /// Solve A·x = b for a symmetric positive definite A given by its lower-triangle entries
    /// (duplicates summed), by sparse Cholesky.
    pub fn solve_spd(&self, n: usize, lower: &Entries, b: &[f64]) -> Result<Vec<f64>, SolveError> {
        self.solve(Kind::Llt, n, lower, b)
    }

    /// Solve A·x = b for a general A given by all its entries (duplicates summed), by sparse LU.
    pub fn solve_general(
        &self,
        n: usize,
        entries: &Entries,
        b: &[f64],
    ) -> Result<Vec<f64>, SolveError> {
        self.solve(Kind::Lu, n, entries, b)
    }

    /// Symbolic analyses made so far.
    pub fn analysed(&self) -> usize {
        self.counts.analysed.load(Ordering::Relaxed)
    }

    /// Solves that reused an earlier analysis.
    pub fn reused(&self) -> usize {
        self.counts.reused.load(Ordering::Relaxed)
    }

    /// Solves whose matrix was unchanged, so that the numeric factorisation was reused too.
    pub fn numeric_reused(&self) -> usize {
        self.counts.numeric_reused.load(Ordering::Relaxed)
    }

    fn solve(
        &self,
        kind: Kind,
        n: usize,
        entries: &Entries,
        b: &[f64],
    ) -> Result<Vec<f64>, SolveError> {
        if n == 0 {
            return Ok(Vec::new());
        }
        let slot = match kind {
            Kind::Llt => &self.llt,
            Kind::Lu => &self.lu,
        };
        let held = lock(slot).clone();
        let pattern = match held {
            Some(p) if p.matches(n, entries) => {
                self.counts.reused.fetch_add(1, Ordering::Relaxed);
                p
            }
            _ => {
                let p = Arc::new(Pattern::analyse(n, entries, kind, true)?);
                self.counts.analysed.fetch_add(1, Ordering::Relaxed);
                *lock(slot) = Some(p.clone());
                p
            }
        };
        pattern.solve(entries, b, &self.counts)
    }
}
