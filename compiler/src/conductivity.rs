//! Temperature-dependent thermal conductivity: a linear coefficient or a table of (T, k)
//! points, and the Kirchhoff integral ∫k dT that turns conduction with k(T) into an exact heat
//! flow for any body whose shape factor does not depend on temperature.

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
