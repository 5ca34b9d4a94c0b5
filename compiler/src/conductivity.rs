//! Temperature-dependent thermal conductivity: a linear coefficient or a table of (T, k)
//! points, and the Kirchhoff integral ∫k dT that turns conduction with k(T) into an exact heat
//! flow for any body whose shape factor does not depend on temperature.
// Diagnostics are returned by value throughout the compiler; boxing them here alone would
// split the element API.
#![allow(clippy::result_large_err)]

use serde::Serialize;

/// k(T) in SI (kelvin, W/(m·K)).
#[derive(Clone, Debug, PartialEq, Serialize)]
pub enum Conductivity {
    /// k(T) = k_ref + slope·(T − t_ref).
    Linear { k_ref: f64, slope: f64, t_ref: f64 },
    /// Straight lines between (T, k) points sorted by T; constant beyond the first and last.
    Table { points: Vec<(f64, f64)> },
}

impl Conductivity {
    /// k at temperature `t`, W/(m·K).
    pub fn k(&self, t: f64) -> f64 {
        match self {
            Conductivity::Linear {
                k_ref,
                slope,
                t_ref,
            } => k_ref + slope * (t - t_ref),
            Conductivity::Table { points } => {
                let (first, last) = (points[0], points[points.len() - 1]);
                if t <= first.0 {
                    return first.1;
                }
                if t >= last.0 {
                    return last.1;
                }
                let i = points
                    .partition_point(|p| p.0 <= t)
                    .clamp(1, points.len() - 1);
                let (a, b) = (points[i - 1], points[i]);
                a.1 + (b.1 - a.1) * (t - a.0) / (b.0 - a.0)
            }
        }
    }

    /// ∫ k(T) dT from `from` to `to` (negative when `to` < `from`), W/m.
    pub fn integral(&self, from: f64, to: f64) -> f64 {
        match self {
            // Exact: the mean of a linear function over an interval is its value at the midpoint.
            Conductivity::Linear { .. } => self.k(0.5 * (from + to)) * (to - from),
            Conductivity::Table { points } => {
                let (lo, hi, sign) = if to >= from {
                    (from, to, 1.0)
                } else {
                    (to, from, -1.0)
                };
                // Break points inside the interval; between them k is linear, so the trapezoid
                // rule is exact.
                let mut xs = vec![lo];
                xs.extend(points.iter().map(|p| p.0).filter(|&x| x > lo && x < hi));
                xs.push(hi);
                let sum: f64 = xs
                    .windows(2)
                    .map(|w| 0.5 * (self.k(w[0]) + self.k(w[1])) * (w[1] - w[0]))
                    .sum();
                sign * sum
            }
        }
    }

    /// The lowest k over a temperature range (k is piecewise linear, so at an end or a point).
    pub fn min_over(&self, lo: f64, hi: f64) -> f64 {
        let mut m = self.k(lo).min(self.k(hi));
        if let Conductivity::Table { points } = self {
            for p in points.iter().filter(|p| p.0 > lo && p.0 < hi) {
                m = m.min(p.1);
            }
        }
        m
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn linear_integral_is_k_at_mean_temperature_times_difference() {
        let c = Conductivity::Linear {
            k_ref: 0.035,
            slope: 1.5e-4,
            t_ref: 283.15,
        };
        let (t1, t2) = (423.15, 293.15);
        let exact = 0.035 * (t1 - t2)
            + 0.5 * 1.5e-4 * ((t1 - 283.15f64).powi(2) - (t2 - 283.15f64).powi(2));
        assert!((c.integral(t2, t1) - exact).abs() < 1e-12);
        assert!((c.integral(t1, t2) + exact).abs() < 1e-12);
    }

    #[test]
    fn table_interpolates_and_holds_its_ends() {
        let c = Conductivity::Table {
            points: vec![(283.15, 0.034), (323.15, 0.038), (373.15, 0.044)],
        };
        assert!((c.k(303.15) - 0.036).abs() < 1e-15);
        assert_eq!(c.k(200.0), 0.034);
        assert_eq!(c.k(500.0), 0.044);
        // ∫ from 273.15 to 383.15: 10 K at 0.034, trapezoids over the table, 10 K at 0.044.
        let want = 10.0 * 0.034 + 40.0 * 0.036 + 50.0 * 0.041 + 10.0 * 0.044;
        assert!((c.integral(273.15, 383.15) - want).abs() < 1e-12);
    }
}

/// Reading k(T) from a material declaration: `k = table(T₁, k₁, T₂, k₂, …)`, or `k` with
/// `k_slope` and the temperature `k_at` where `k` holds.
pub mod material_args {
    use super::Conductivity;
    use crate::diagnostic::Diagnostic;
    use crate::span::Span;
    use crate::syntax::{Expr, ExprKind, Ident};
    use crate::units::Dim;

    /// dk/dT: W/(m·K²).
    pub const SLOPE_DIM: Dim = Dim::CONDUCTIVITY_SLOPE;

    pub fn is_table(e: &Expr) -> bool {
        matches!(&e.kind, ExprKind::Call { func, .. } if func.name == "table")
    }

    /// The k(T) pieces found among a material's arguments.
    #[derive(Default)]
    pub struct Parts {
        pub slope: Option<(f64, Span)>,
        pub at: Option<(f64, Span)>,
        pub table: Option<Vec<(f64, f64)>>,
        /// A `k_slope` or `k_at` was written but failed its check (already reported).
        pub failed: bool,
    }

    impl Parts {
        /// The conductivity model, or `None` for a constant k.
        pub fn model(&self, k: f64, material: &Ident) -> Result<Option<Conductivity>, Diagnostic> {
            match (&self.table, self.slope, self.at) {
                (None, None, None) => Ok(None),
                (Some(points), None, None) => Ok(Some(Conductivity::Table { points: points.clone() })),
                (Some(_), Some((_, s)), _) | (Some(_), None, Some((_, s))) => Err(Diagnostic::error(
                    "E207",
                    format!("material `{}` gives k as a table and as a slope", material.name),
                    s,
                )
                .with_label("not with a table")
                .with_help("a table already says how k changes with temperature; remove `k_slope` and `k_at`")),
                (None, Some(_), None) => Err(Diagnostic::error("E203", format!("material `{}` gives `k_slope` without `k_at`", material.name), material.span)
                    .with_label("`k_at` missing")
                    .with_help("say at which temperature `k` holds, e.g. `k = 0.035 W/(m*K), k_slope = 1.6e-4 W/(m*K^2), k_at = 10 °C`")),
                (None, None, Some((_, s))) => Err(Diagnostic::error("E203", format!("material `{}` gives `k_at` without `k_slope`", material.name), s)
                    .with_label("`k_slope` missing")
                    .with_help("add `k_slope = ... W/(m*K^2)` for a linear k(T), or remove `k_at` for a constant k")),
                (None, Some((slope, _)), Some((at, _))) => Ok(Some(Conductivity::Linear { k_ref: k, slope, t_ref: at })),
            }
        }
    }

    /// E214 for a table that is not pairs of rising temperatures.
    pub fn check_table(e: &Expr, n_args: usize, points: &[(f64, f64, Span)]) -> Option<Diagnostic> {
        let help = "write `k = table(10 °C, 0.034 W/(m*K), 50 °C, 0.039 W/(m*K), 100 °C, 0.045 W/(m*K))`: pairs of a temperature and k, temperatures rising";
        if n_args % 2 == 1 || n_args < 4 {
            let msg = if n_args % 2 == 1 {
                "a k(T) table needs pairs of a temperature and a conductivity"
            } else {
                "a k(T) table needs at least two points"
            };
            return Some(
                Diagnostic::error("E214", msg, e.span)
                    .with_label(format!("{n_args} values"))
                    .with_help(help),
            );
        }
        for w in points.windows(2) {
            if w[1].0 <= w[0].0 {
                return Some(
                    Diagnostic::error(
                        "E214",
                        "the temperatures of a k(T) table must rise from point to point",
                        w[1].2,
                    )
                    .with_label("not above the temperature before it")
                    .with_secondary(w[0].2, "previous point")
                    .with_help(help),
                );
            }
        }
        None
    }
}
