//! Transient runs: node capacities C·dT/dt = Σ G·(Tj − T) + Q, integrated with the implicit,
//! L-stable TR-BDF2 method.
//!
//! The pieces: [`model`] (what the model states), [`schedule`] (piecewise-linear inputs),
//! [`system`] (the one interface between network and integrator: assemble G and the right-hand
//! side for the current temperatures), [`factor`] (sparse Cholesky factorisations of
//! C/(d·h) + G, one per step size, reused while the step stays the same; sparse LU for the
//! non-symmetric Jacobian of radiation and k(T) links), [`integrate`] (the
//! stepping and its error control), [`run`] (outputs, events, limits over time, energy balance)
//! and [`summary`] (final and peak values for the language server). The method and its error
//! control are described in docs/transient.md.

pub mod factor;
mod initial;
pub mod integrate;
pub mod model;
pub mod probe;
pub mod run;
pub mod schedule;
pub mod summary;
pub mod system;

pub use run::{run_transient, Hooks, Record, RunOptions, RunResult};
pub use summary::{summarize, NodeSummary, RunSummary};

/// Upper bound on the number of steps of one run, so that no input can make a run endless.
pub const MAX_STEPS: usize = 10_000_000;

/// Upper bound on the number of reported times of one run: each keeps every node's
/// temperature, so an interval far shorter than the run would exhaust memory.
pub const MAX_OUTPUTS: usize = 100_000;

/// Why a transient run could not be completed.
#[derive(Clone, Debug, PartialEq)]
pub enum RunError {
    /// The step matrix could not be factored (not positive definite).
    Singular,
    /// A temperature became NaN or infinite.
    NonFinite { time: f64 },
    /// The automatic step fell below the smallest allowed step.
    StepTooSmall { time: f64, step: f64 },
    /// More than [`MAX_STEPS`] steps (or the caller's limit) would be needed.
    TooManySteps { time: f64 },
    /// The output interval would report more than [`MAX_OUTPUTS`] times.
    TooManyOutputs { interval: f64 },
    /// The Newton iteration of a nonlinear network did not converge even with small steps.
    NoConvergence { time: f64 },
    /// The steady solution a nonlinear network starts from could not be found.
    SteadyStart(crate::nonlinear::NewtonError),
    /// The k(T) of this link fell to zero or below between its end temperatures at `time`.
    NonPhysicalConductivity { time: f64, link: String },
    /// A computed film needed its fluid's properties outside their range at `time` (K).
    FilmOutOfRange {
        time: f64,
        link: String,
        fluid: String,
        temperature: f64,
        low: f64,
        high: f64,
    },
}

impl std::fmt::Display for RunError {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match self {
            RunError::Singular => write!(
                f,
                "the step matrix C/(d·h) + G could not be factored (not positive definite)"
            ),
            RunError::NonFinite { time } => write!(
                f,
                "temperatures stopped being finite numbers at t = {time:.6e} s"
            ),
            RunError::StepTooSmall { time, step } => {
                write!(f, "the automatic step fell to {step:.3e} s at t = {time:.6e} s without meeting the tolerance")
            }
            RunError::TooManySteps { time } => write!(
                f,
                "the run needs more steps than allowed (stopped at t = {time:.6e} s)"
            ),
            RunError::TooManyOutputs { interval } => write!(
                f,
                "an output interval of {interval:.3e} s would report more than {MAX_OUTPUTS} times"
            ),
            RunError::NoConvergence { time } => write!(
                f,
                "Newton's method for the radiation or k(T) links did not converge at t = {time:.6e} s"
            ),
            RunError::NonPhysicalConductivity { time, link } => write!(
                f,
                "the conductivity of `{link}` falls to zero or below between its end temperatures at t = {time:.6e} s"
            ),
            RunError::FilmOutOfRange { time, link, fluid, temperature, low, high } => write!(
                f,
                "at t = {time:.6e} s the film `{link}` needs the properties of {fluid} at {:.2} °C, outside the range they hold for ({:.2} °C … {:.2} °C)",
                temperature - 273.15,
                low - 273.15,
                high - 273.15
            ),
            RunError::SteadyStart(e) => match e {
                crate::nonlinear::NewtonError::NoConvergence { iterations, residual, .. } => write!(
                    f,
                    "the steady state the run starts from was not found: after {iterations} Newton steps the worst heat balance is still {residual:.3e} W"
                ),
                crate::nonlinear::NewtonError::NonPhysicalConductivity { t_low, t_high, .. } => write!(
                    f,
                    "in the steady state the run starts from, a k(T) falls to zero or below between {:.2} °C and {:.2} °C",
                    t_low - 273.15,
                    t_high - 273.15
                ),
                crate::nonlinear::NewtonError::Linear(_) => write!(
                    f,
                    "the steady state the run starts from could not be solved (a linear solve inside Newton's method failed)"
                ),
            },
        }
    }
}

impl std::error::Error for RunError {}
