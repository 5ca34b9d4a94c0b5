//! TR-BDF2: a trapezoidal stage to t + γh followed by a BDF2 stage to t + h (Bank et al. 1985;
//! Hosea & Shampine 1996). With γ = 2 − √2 both stages solve with the same matrix
//! c·diag(C) + G, c = 1/(d·h), d = γ/2, so one factorisation serves a whole step and every later
//! step of the same size. The method is L-stable (the fastest modes of a stiff network are damped,
//! not left to ring) and second order; the BDF2 stage is stiffly accurate, so nodes without
//! capacity (algebraic rows) end every step consistent with their neighbours.
//!
//! Error control (automatic step): the local error is estimated from the heat balances at the
//! three points of the step, τ = 2k·h·(f₀/γ − f_γ/(γ(1−γ)) + f₁/(1−γ)) with
//! k = (−3γ² + 4γ − 2)/(12(2 − γ)), filtered through the step matrix,
//! e = (C + d·h·G)⁻¹·τ (so stiff components are not over-estimated), and measured as the largest
//! |e| over the nodes in kelvin. A step with |e| above the tolerance is repeated with a smaller
//! step; after a step with |e| well below it the step grows. Steps are h₀·2ᵏ (a ladder of sizes)
//! except where a step is shortened to land on a schedule corner or the end of the run, so the
//! step changes rarely and factorisations repeat.

use super::factor::StepMatrices;
use super::system::{Entry, HeatSystem};
use super::RunError;

/// γ = 2 − √2.
pub const GAMMA: f64 = 2.0 - std::f64::consts::SQRT_2;
/// d = γ/2: the step matrix is C/(d·h) + G in both stages.
pub const D: f64 = GAMMA / 2.0;
/// Coefficients of the BDF2 stage: C·(x₁ − A₁·x_γ + A₀·x₀) = d·h·f₁.
const A1: f64 = 1.0 / (GAMMA * (2.0 - GAMMA));
const A0: f64 = (1.0 - GAMMA) * (1.0 - GAMMA) / (GAMMA * (2.0 - GAMMA));
/// Error constant of TR-BDF2: local error ≈ k·h³·x‴ (Hosea & Shampine 1996).
const K_ERR: f64 = (-3.0 * GAMMA * GAMMA + 4.0 * GAMMA - 2.0) / (12.0 * (2.0 - GAMMA));
/// Weights of the heat balances at t, t + γh and t + h in the step's energy identity:
/// Σ C·(x₁ − x₀) = h·(W0·P₀ + W1·P_γ + W2·P₁) for the net inflow P, exactly (see docs/transient.md).
pub const W0: f64 = 1.0 / (2.0 * (2.0 - GAMMA));
pub const W1: f64 = W0;
pub const W2: f64 = D;

const MAX_NEWTON: usize = 30;

/// How the step is chosen.
#[derive(Clone, Copy, Debug, PartialEq, serde::Serialize)]
#[serde(rename_all = "snake_case")]
pub enum StepMode {
    /// Every step this long (the last one shorter to end on time).
    Fixed(f64),
    /// Steps chosen to keep the local error estimate below the tolerance.
    Auto,
}

#[derive(Clone, Debug)]
pub struct Settings {
    /// s
    pub duration: f64,
    pub mode: StepMode,
    /// K: local error allowed per step (automatic step); reported against for a fixed step.
    pub tolerance: f64,
    pub max_steps: usize,
    /// First step of the automatic step, s; estimated when `None`.
    pub first_step: Option<f64>,
}

/// One accepted step, as the observer sees it.
pub struct StepView<'a> {
    pub t: f64,
    pub h: f64,
    pub x0: &'a [f64],
    pub xg: &'a [f64],
    pub x1: &'a [f64],
    /// Local error estimate, K.
    pub error: f64,
}

#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Control {
    Continue,
    Stop,
}

/// What the stepping did.
#[derive(Clone, Debug, Default, serde::Serialize)]
pub struct Stats {
    pub steps: usize,
    pub rejected: usize,
    pub factorisations: usize,
    pub solves: usize,
    pub newton_iterations: usize,
    pub smallest_step: f64,
    pub largest_step: f64,
    /// Largest local error estimate of an accepted step, K.
    pub largest_error: f64,
    /// Time reached, s (the duration unless stopped).
    pub end_time: f64,
    /// True when the observer stopped the run early.
    pub stopped: bool,
}

struct Stepper<'s> {
    sys: &'s dyn HeatSystem,
    mats: StepMatrices,
    linear: bool,
    symmetric: bool,
    cap: Vec<f64>,
    entries: Vec<Entry>,
    rhs: Vec<f64>,
    tmp: Vec<f64>,
    newton: usize,
}

fn mul_entries(entries: &[Entry], symmetric: bool, x: &[f64], y: &mut [f64]) {
    y.iter_mut().for_each(|v| *v = 0.0);
    for e in entries {
        y[e.row] += e.val * x[e.col];
        if symmetric && e.row != e.col {
            y[e.col] += e.val * x[e.row];
        }
    }
}

fn max_abs(v: &[f64]) -> f64 {
    v.iter().fold(
        0.0f64,
        |m, x| if x.is_nan() { f64::NAN } else { m.max(x.abs()) },
    )
}

impl Stepper<'_> {
    /// Net heat into each unknown, f = rhs − G·x, at time `t`.
    fn balance(&mut self, t: f64, x: &[f64], f: &mut [f64]) {
        if self.linear {
            self.sys.assemble(t, x, None, &mut self.rhs);
            self.mats.mul_g(x, &mut self.tmp);
        } else {
            self.sys
                .assemble(t, x, Some(&mut self.entries), &mut self.rhs);
            mul_entries(&self.entries, self.symmetric, x, &mut self.tmp);
        }
        for ((f, r), g) in f.iter_mut().zip(&self.rhs).zip(&self.tmp) {
            *f = r - g;
        }
    }

    /// Solve a stage (c·C + G)·x = known + rhs(t, x); `x` holds the first guess and receives
    /// the solution. Returns the key of the factorisation last used.
    fn stage(&mut self, t: f64, c: f64, known: &[f64], x: &mut [f64]) -> Result<usize, RunError> {
        if self.linear {
            self.sys.assemble(t, x, None, &mut self.rhs);
            let key = self.mats.factor(c).map_err(|_| RunError::Singular)?;
            for ((x, k), r) in x.iter_mut().zip(known).zip(&self.rhs) {
                *x = k + r;
            }
            self.mats.solve(key, x);
            return Ok(key);
        }
        for _ in 0..MAX_NEWTON {
            self.sys
                .assemble(t, x, Some(&mut self.entries), &mut self.rhs);
            self.mats.set_values(&self.entries);
            let key = self.mats.factor(c).map_err(|_| RunError::Singular)?;
            for ((t, k), r) in self.tmp.iter_mut().zip(known).zip(&self.rhs) {
                *t = k + r;
            }
            self.mats.solve(key, &mut self.tmp);
            self.newton += 1;
            let mut change = 0.0f64;
            let mut size = 1.0f64;
            let mut above_zero = true;
            for (x, &new) in x.iter_mut().zip(&self.tmp) {
                change = change.max((new - *x).abs());
                size = size.max(new.abs());
                above_zero &= new > 0.0;
                *x = new;
            }
            if change.is_nan() {
                return Err(RunError::NonFinite { time: t });
            }
            // An iterate at or below absolute zero has left the range where T⁴ and k(T) mean
            // anything: the step is too long for the linearisation to hold.
            if !above_zero {
                return Err(RunError::NoConvergence { time: t });
            }
            if change <= 1e-11 * size {
                return Ok(key);
            }
        }
        Err(RunError::NoConvergence { time: t })
    }
}

/// Integrate C·dx/dt = f(t, x) from `x0` at t = 0 to `settings.duration`, calling `on_step`
/// after every accepted step.
pub fn integrate(
    sys: &dyn HeatSystem,
    x0: &[f64],
    settings: &Settings,
    on_step: &mut dyn FnMut(&StepView) -> Control,
) -> Result<Stats, RunError> {
    let n = sys.len();
    let duration = settings.duration;
    let mut stats = Stats {
        smallest_step: f64::INFINITY,
        ..Stats::default()
    };
    let mut entries = Vec::new();
    let mut rhs = vec![0.0; n];
    sys.assemble(0.0, x0, Some(&mut entries), &mut rhs);
    let cap = sys.capacity().to_vec();
    let symmetric = sys.symmetric();
    let mats = if symmetric {
        StepMatrices::new(n, &entries, &cap)
    } else {
        StepMatrices::general(n, &entries, &cap)
    }
    .map_err(|_| RunError::Singular)?;
    let mut st = Stepper {
        sys,
        mats,
        linear: sys.is_linear(),
        symmetric,
        cap,
        entries,
        rhs,
        tmp: vec![0.0; n],
        newton: 0,
    };

    let mut x = x0.to_vec();
    let mut f = vec![0.0; n];
    st.balance(0.0, &x, &mut f);
    let (mut xg, mut x1, mut fg, mut f1, mut known, mut tau) = (
        vec![0.0; n],
        vec![0.0; n],
        vec![0.0; n],
        vec![0.0; n],
        vec![0.0; n],
        vec![0.0; n],
    );

    let tol = settings.tolerance;
    let hmax = duration / 10.0;
    let hmin = duration * 1e-12;
    let h0 = match settings.mode {
        StepMode::Fixed(h) => h.min(duration),
        StepMode::Auto => settings
            .first_step
            .unwrap_or_else(|| first_step(&f, &st.cap, &st.mats.diagonal(), tol, duration)),
    };
    let mut level: i32 = 0;
    let mut corners = Vec::new();
    let mut t = 0.0;
    let mut fixed_index: u64 = 0;
    while duration - t > 1e-12 * duration {
        if stats.steps >= settings.max_steps {
            return Err(RunError::TooManySteps { time: t });
        }
        let nominal = h0 * 2f64.powi(level);
        let mut target = match settings.mode {
            StepMode::Fixed(h) => ((fixed_index + 1) as f64 * h).min(duration),
            StepMode::Auto => (t + nominal).min(duration),
        };
        let mut clipped = target < t + nominal;
        if settings.mode == StepMode::Auto {
            corners.clear();
            sys.corners(t, target, &mut corners);
            if let Some(tc) = corners
                .iter()
                .copied()
                .filter(|&c| c > t + hmin)
                .reduce(f64::min)
            {
                if tc < target {
                    target = tc;
                    clipped = true;
                }
            }
        }
        // No sliver of a step left before the end.
        if duration - target < 1e-9 * duration {
            target = duration;
        }
        let h = target - t;
        let c = 1.0 / (D * h);

        // Trapezoidal stage to t + γh.
        for i in 0..n {
            known[i] = c * st.cap[i] * x[i] + f[i];
        }
        xg.copy_from_slice(&x);
        let mut stages = st.stage(t + GAMMA * h, c, &known, &mut xg);
        if stages.is_ok() {
            st.balance(t + GAMMA * h, &xg, &mut fg);
            // BDF2 stage to t + h.
            for i in 0..n {
                known[i] = c * st.cap[i] * (A1 * xg[i] - A0 * x[i]);
                x1[i] = xg[i] + (xg[i] - x[i]) * (1.0 - GAMMA) / GAMMA;
            }
            stages = st.stage(target, c, &known, &mut x1);
        }
        let key = match stages {
            Ok(key) => key,
            // Newton's method converges once the step is short enough (the capacity term
            // c·C dominates the Jacobian), so the automatic step retries a quarter as long.
            Err(e @ (RunError::NoConvergence { .. } | RunError::NonFinite { .. }))
                if !st.linear && settings.mode == StepMode::Auto =>
            {
                stats.rejected += 1;
                if h <= hmin {
                    return Err(RunError::NoConvergence {
                        time: match e {
                            RunError::NoConvergence { time } | RunError::NonFinite { time } => time,
                            _ => t,
                        },
                    });
                }
                let new_level = (h / 4.0 / h0).log2().floor() as i32;
                level = new_level.min(level - 1);
                continue;
            }
            Err(e) => return Err(e),
        };
        st.balance(target, &x1, &mut f1);
        // Error estimate.
        for i in 0..n {
            tau[i] = 2.0
                * K_ERR
                * h
                * (f[i] / GAMMA - fg[i] / (GAMMA * (1.0 - GAMMA)) + f1[i] / (1.0 - GAMMA));
        }
        st.mats.solve(key, &mut tau);
        let error = c * max_abs(&tau);
        if error.is_nan() || max_abs(&x1).is_nan() {
            return Err(RunError::NonFinite { time: target });
        }
        let ratio = if error > 0.0 {
            0.9 * (tol / error).cbrt()
        } else {
            f64::INFINITY
        };
        if settings.mode == StepMode::Auto && error > tol {
            stats.rejected += 1;
            if h <= hmin {
                return Err(RunError::StepTooSmall { time: t, step: h });
            }
            // Down the ladder to the first size below ratio·h.
            let wanted = h * ratio.max(1e-3);
            let new_level = (wanted / h0).log2().floor() as i32;
            level = new_level.min(level - 1);
            continue;
        }

        let control = on_step(&StepView {
            t,
            h,
            x0: &x,
            xg: &xg,
            x1: &x1,
            error,
        });
        stats.steps += 1;
        stats.smallest_step = stats.smallest_step.min(h);
        stats.largest_step = stats.largest_step.max(h);
        stats.largest_error = stats.largest_error.max(error);
        std::mem::swap(&mut x, &mut x1);
        std::mem::swap(&mut f, &mut f1);
        t = target;
        fixed_index += 1;
        if settings.mode == StepMode::Auto && !clipped && ratio >= 2.0 {
            // Up the ladder as far as the estimate allows (at most 16×), never past hmax.
            let mut up = (ratio.log2().floor() as i32).min(4);
            while up > 0 && nominal * 2f64.powi(up) > hmax {
                up -= 1;
            }
            level += up;
        }
        if control == Control::Stop {
            stats.stopped = true;
            break;
        }
    }
    stats.end_time = t;
    stats.factorisations = st.mats.factorisations;
    stats.solves = st.mats.solves;
    stats.newton_iterations = st.newton;
    if stats.steps == 0 {
        stats.smallest_step = 0.0;
    }
    Ok(stats)
}

/// A first step from each storing node's initial rate of change r = f/C and own time constant
/// τ = C/G_ii: for x ≈ r·τ·(1 − e^(−t/τ)) the local error k·h³·|x‴| ≈ k·h³·r/τ² meets the tolerance
/// at h = τ·(tol/(k·r·τ))^(1/3). The smallest over the nodes, kept between 1e-9 and 1e-2 of the
/// run; the error control corrects it from the first step on.
fn first_step(f: &[f64], cap: &[f64], diag: &[f64], tol: f64, duration: f64) -> f64 {
    let mut h = duration / 100.0;
    for i in 0..f.len() {
        if cap[i] > 0.0 && f[i] != 0.0 && diag[i] > 0.0 {
            let (rate, tau) = ((f[i] / cap[i]).abs(), cap[i] / diag[i]);
            h = h.min(tau * (tol / (K_ERR.abs() * rate * tau)).cbrt());
        }
    }
    h.clamp(duration * 1e-9, duration / 100.0)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn stage_coefficients_are_consistent() {
        // The BDF2 stage reproduces a constant: A1 − A0 = 1.
        assert!((A1 - A0 - 1.0).abs() < 1e-15);
        // The energy identity's weights sum to one.
        assert!((W0 + W1 + W2 - 1.0).abs() < 1e-15);
        // Hosea & Shampine's error constant for γ = 2 − √2.
        assert!((K_ERR + 0.040440114519881).abs() < 1e-12);
    }
}
