//! Schedules: boundary temperatures and heat loads that follow a table of (time, value) points,
//! linear between points, held before the first and after the last, or repeated with a period
//! (a daily outdoor temperature).

use crate::span::Span;
use crate::units::{Dim, TempKind};
use serde::Serialize;

/// A checked schedule in SI units.
#[derive(Clone, Debug, Serialize)]
pub struct Schedule {
    pub name: String,
    pub span: Span,
    /// `(time in s, value in SI)`, times strictly increasing; with `repeat` they lie in
    /// `[0, repeat]`.
    pub points: Vec<(f64, f64)>,
    /// The period in seconds of a repeating schedule.
    pub repeat: Option<f64>,
    pub dim: Dim,
    pub kind: TempKind,
}

impl Schedule {
    /// The value at time `t` (s on the schedule's clock).
    pub fn value(&self, t: f64) -> f64 {
        match self.repeat {
            None => interpolate(&self.points, t),
            Some(period) => {
                let tau = t.rem_euclid(period);
                let (first, last) = (self.points[0], self.points[self.points.len() - 1]);
                // Wrap around: the segment from the last point to the first point of the next
                // period, seen from both ends.
                if tau < first.0 {
                    interpolate(&[(last.0 - period, last.1), first], tau)
                } else if tau > last.0 {
                    interpolate(&[last, (first.0 + period, first.1)], tau)
                } else {
                    interpolate(&self.points, tau)
                }
            }
        }
    }

    /// Times in `(t0, t1]` where the schedule has a corner, in increasing order.
    pub fn corners(&self, t0: f64, t1: f64, out: &mut Vec<f64>) {
        if self.points.len() < 2 {
            return;
        }
        match self.repeat {
            None => out.extend(
                self.points
                    .iter()
                    .map(|p| p.0)
                    .filter(|&t| t > t0 && t <= t1),
            ),
            Some(period) => {
                let mut k = (t0 / period).floor() - 1.0;
                // A run spans at most a bounded number of periods (the step count is bounded).
                while k * period <= t1 {
                    for p in &self.points {
                        let t = k * period + p.0;
                        if t > t0 && t <= t1 {
                            out.push(t);
                        }
                    }
                    k += 1.0;
                }
            }
        }
    }
}

/// Linear interpolation in increasing points, holding the end values outside them. At a time
/// given twice (a step in the table) the later point wins.
fn interpolate(points: &[(f64, f64)], t: f64) -> f64 {
    let i = points.partition_point(|p| p.0 <= t);
    if i == 0 {
        return points[0].1;
    }
    if i == points.len() {
        return points[i - 1].1;
    }
    let (a, b) = (points[i - 1], points[i]);
    if b.0 <= a.0 {
        return b.1;
    }
    a.1 + (b.1 - a.1) * (t - a.0) / (b.0 - a.0)
}

#[cfg(test)]
mod tests {
    use super::*;

    fn sched(points: &[(f64, f64)], repeat: Option<f64>) -> Schedule {
        Schedule {
            name: "s".into(),
            span: Span::default(),
            points: points.to_vec(),
            repeat,
            dim: Dim::POWER,
            kind: TempKind::NotTemperature,
        }
    }

    #[test]
    fn linear_between_points_and_held_outside() {
        let s = sched(&[(0.0, 10.0), (10.0, 20.0), (30.0, 0.0)], None);
        assert_eq!(s.value(-5.0), 10.0);
        assert_eq!(s.value(5.0), 15.0);
        assert_eq!(s.value(20.0), 10.0);
        assert_eq!(s.value(99.0), 0.0);
    }

    #[test]
    fn repeating_wraps_from_the_last_point_to_the_first() {
        // Points at 6 h and 18 h of a 24 h day: midnight lies halfway between 18 h and 30 h.
        let h = 3600.0;
        let s = sched(&[(6.0 * h, 0.0), (18.0 * h, 12.0)], Some(24.0 * h));
        assert!((s.value(0.0) - 6.0).abs() < 1e-12);
        assert!((s.value(24.0 * h) - 6.0).abs() < 1e-12);
        assert!((s.value(12.0 * h) - 6.0).abs() < 1e-12);
        assert!((s.value(30.0 * h) - 0.0).abs() < 1e-12);
        assert!((s.value(-6.0 * h) - 12.0).abs() < 1e-12);
        let mut c = Vec::new();
        s.corners(0.0, 48.0 * h, &mut c);
        assert_eq!(c, vec![6.0 * h, 18.0 * h, 30.0 * h, 42.0 * h]);
    }

    #[test]
    fn corners_of_a_plain_schedule() {
        let s = sched(&[(0.0, 1.0), (5.0, 2.0), (9.0, 2.0)], None);
        let mut c = Vec::new();
        s.corners(0.0, 8.0, &mut c);
        assert_eq!(c, vec![5.0]);
    }
}
