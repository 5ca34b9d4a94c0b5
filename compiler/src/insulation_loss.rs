//! Whether the insulation of a radial build-up increases its heat loss, judged on the whole
//! build-up: the loss with every shell against the loss of the bare pipe, and the outer radius
//! at which the loss falls back to the bare pipe's (the break-even radius).
//!
//! The critical insulation radius k/h of one shell alone says when adding a little more of
//! that shell raises the loss; it misleads for a thin metal jacket over insulation (its k/h is
//! metres, yet it changes nothing) and says nothing about how much. Here the pipe is the run of
//! leading shells that conduct well (k ≥ 1 W/(m·K): metals, masonry; insulating materials sit far
//! below, at about 0.02–0.2 W/(m·K), common practice), the insulation is every shell after it,
//! and the resistances are the shell laws (R = ln(r₂/r₁)/(2πkL), (1/r₁ − 1/r₂)/(4πk)) and
//! Newton's law of cooling for the outer film at its radius. Other elements (an inner film, a
//! contact) keep the resistance they have in the model.

use std::f64::consts::PI;

/// Shells at least this conductive, from the bore outwards, are the pipe or vessel wall.
pub const CONDUCTOR_K: f64 = 1.0;

/// One shell of the build-up.
#[derive(Clone, Copy, Debug)]
pub struct Shell {
    /// Index of the element in the build-up.
    pub index: usize,
    /// W/(m·K)
    pub k: f64,
    /// m
    pub r_in: f64,
    /// m
    pub r_out: f64,
}

/// A radial build-up ending in a film, reduced to what the comparison needs.
#[derive(Clone, Debug)]
pub struct RadialBuildup {
    pub spherical: bool,
    /// Length of a cylindrical build-up, m (unused for a sphere).
    pub length: f64,
    pub shells: Vec<Shell>,
    /// The outer film's coefficient, W/(m²·K).
    pub h: f64,
    /// Every other element's resistance in series, K/W.
    pub other: f64,
}

/// How the insulation changes the loss.
#[derive(Clone, Copy, Debug)]
pub struct Comparison {
    /// Element index of the outermost insulating shell (where the warning points).
    pub outermost: usize,
    /// Total resistance with every shell, K/W.
    pub r_insulated: f64,
    /// Total resistance of the bare pipe (the film on the pipe's outer surface), K/W.
    pub r_bare: f64,
    /// The outer radius of the outermost insulating shell at which the loss equals the bare
    /// pipe's, m; `None` where no radius gets there (a sphere's conduction resistance is
    /// bounded).
    pub break_even: Option<f64>,
    /// The pipe's outer radius, m.
    pub pipe_radius: f64,
}

impl Comparison {
    /// True when the insulation raises the heat loss.
    pub fn increases_loss(&self) -> bool {
        self.r_insulated < self.r_bare
    }
    /// The rise in heat loss over the bare pipe's, in percent (R_bare/R − 1).
    pub fn percent(&self) -> f64 {
        100.0 * (self.r_bare / self.r_insulated - 1.0)
    }
    /// The rise in heat loss in W for a temperature difference ΔT across the build-up.
    pub fn watts(&self, delta_t: f64) -> f64 {
        delta_t * (1.0 / self.r_insulated - 1.0 / self.r_bare)
    }
}

impl RadialBuildup {
    fn shell_resistance(&self, k: f64, r1: f64, r2: f64) -> f64 {
        if self.spherical {
            (1.0 / r1 - 1.0 / r2) / (4.0 * PI * k)
        } else {
            (r2 / r1).ln() / (2.0 * PI * k * self.length)
        }
    }

    fn film_resistance(&self, r: f64) -> f64 {
        let area = if self.spherical {
            4.0 * PI * r * r
        } else {
            2.0 * PI * r * self.length
        };
        1.0 / (self.h * area)
    }

    /// The total resistance when the shell at position `j` ends at `x` and the shells after it
    /// keep their thickness.
    fn resistance_with(&self, j: usize, x: f64) -> f64 {
        let mut r = self.other;
        let mut shift = 0.0;
        let mut outer = 0.0;
        for (i, s) in self.shells.iter().enumerate() {
            let (r1, r2) = if i < j {
                (s.r_in, s.r_out)
            } else if i == j {
                shift = x - s.r_out;
                (s.r_in, x)
            } else {
                (s.r_in + shift, s.r_out + shift)
            };
            r += self.shell_resistance(s.k, r1, r2);
            outer = r2;
        }
        r + self.film_resistance(outer)
    }

    /// The comparison with the bare pipe, or `None` when the build-up has no insulation
    /// (every shell conducts well) or no shell at all.
    pub fn compare(&self) -> Option<Comparison> {
        let pipe = self
            .shells
            .iter()
            .take_while(|s| s.k >= CONDUCTOR_K)
            .count();
        // The outermost insulating shell: the one that, thickened, brings the loss down.
        let j = self.shells.iter().rposition(|s| s.k < CONDUCTOR_K)?;
        if j < pipe {
            return None;
        }
        let pipe_radius = match pipe {
            0 => self.shells.first()?.r_in,
            n => self.shells[n - 1].r_out,
        };
        let r_bare = self.other
            + self.shells[..pipe]
                .iter()
                .map(|s| self.shell_resistance(s.k, s.r_in, s.r_out))
                .sum::<f64>()
            + self.film_resistance(pipe_radius);
        let current = self.shells[j].r_out;
        let r_insulated = self.resistance_with(j, current);
        let break_even = if r_insulated < r_bare {
            self.break_even(j, current, r_bare)
        } else {
            None
        };
        Some(Comparison {
            outermost: self.shells[j].index,
            r_insulated,
            r_bare,
            break_even,
            pipe_radius,
        })
    }

    /// The outer radius of shell `j` above `from` at which the resistance reaches `target`:
    /// bracketed by doubling, then bisected (the resistance rises monotonically beyond the
    /// critical radius, which lies below any radius where it has come back up).
    fn break_even(&self, j: usize, from: f64, target: f64) -> Option<f64> {
        let mut lo = from;
        let mut hi = from;
        for _ in 0..80 {
            hi *= 2.0;
            if self.resistance_with(j, hi) >= target {
                break;
            }
            lo = hi;
        }
        if self.resistance_with(j, hi) < target {
            return None;
        }
        for _ in 0..200 {
            let mid = 0.5 * (lo + hi);
            if self.resistance_with(j, mid) < target {
                lo = mid;
            } else {
                hi = mid;
            }
            if hi - lo <= 1e-15 * hi {
                break;
            }
        }
        Some(0.5 * (lo + hi))
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn wire(k: f64, r1: f64, r2: f64, h: f64) -> RadialBuildup {
        RadialBuildup {
            spherical: false,
            length: 1.0,
            shells: vec![Shell {
                index: 0,
                k,
                r_in: r1,
                r_out: r2,
            }],
            h,
            other: 0.0,
        }
    }

    /// A jacket below the critical radius: with one shell the break-even radius r solves
    /// ln(r/r₁)/k + 1/(h·r) = 1/(h·r₁) (shell law and Newton's law of cooling per metre), which
    /// lies above the critical radius k/h.
    #[test]
    fn break_even_radius_of_a_single_jacket_solves_the_closed_equation() {
        let (k, h, r1) = (0.16, 8.0, 0.001);
        let c = wire(k, r1, 0.003, h).compare().expect("insulated");
        assert!(c.increases_loss());
        let r = c.break_even.expect("breaks even");
        let residual = (r / r1).ln() / k + 1.0 / (h * r) - 1.0 / (h * r1);
        assert!(residual.abs() < 1e-9, "{residual}");
        assert!(r > k / h);
    }

    /// A thin metal jacket over thick insulation changes nothing worth a warning.
    #[test]
    fn a_metal_jacket_over_insulation_is_not_insulation_below_its_critical_radius() {
        let b = RadialBuildup {
            spherical: false,
            length: 10.0,
            shells: vec![
                Shell {
                    index: 0,
                    k: 50.0,
                    r_in: 0.04,
                    r_out: 0.045,
                },
                Shell {
                    index: 1,
                    k: 0.04,
                    r_in: 0.045,
                    r_out: 0.095,
                },
                Shell {
                    index: 2,
                    k: 200.0,
                    r_in: 0.095,
                    r_out: 0.0958,
                },
            ],
            h: 9.0,
            other: 0.0,
        };
        let c = b.compare().expect("has insulation");
        assert!(!c.increases_loss());
        assert_eq!(c.outermost, 1);
        assert!((c.pipe_radius - 0.045).abs() < 1e-15);
    }

    /// A build-up of metal alone has no insulation to judge.
    #[test]
    fn a_bare_metal_wall_is_not_judged() {
        assert!(wire(50.0, 0.04, 0.045, 9.0).compare().is_none());
    }
}
