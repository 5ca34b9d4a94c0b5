//! Progress and interruption for long runs: a progress bar that appears only once a run has
//! taken about a second and only when standard error is a terminal, and a Ctrl-C handler that
//! asks the run to stop cleanly (a second Ctrl-C ends the program at once).

use indicatif::{ProgressBar, ProgressDrawTarget, ProgressStyle};
use std::io::IsTerminal;
use std::sync::atomic::{AtomicBool, Ordering};
use std::time::{Duration, Instant};

/// Set by Ctrl-C; runs and studies check it after every step or point.
pub static STOP: AtomicBool = AtomicBool::new(false);

/// Runs longer than this get a progress bar.
const SHOW_AFTER: Duration = Duration::from_secs(1);

/// Install the Ctrl-C handler (once per process).
pub fn catch_interrupt() {
    let _ = ctrlc::set_handler(|| {
        if STOP.swap(true, Ordering::SeqCst) {
            // Asked twice: the user does not want to wait for the clean stop.
            std::process::exit(i32::from(crate::exit::INTERRUPTED));
        }
    });
}

pub fn stop_requested() -> bool {
    STOP.load(Ordering::SeqCst)
}

/// A progress bar that stays hidden for the first second and when stderr is not a terminal.
pub struct Progress {
    bar: Option<ProgressBar>,
    started: Instant,
    enabled: bool,
    message: String,
}

impl Progress {
    pub fn new(message: impl Into<String>) -> Progress {
        Progress {
            bar: None,
            started: Instant::now(),
            enabled: std::io::stderr().is_terminal() && !crate::console::quiet(),
            message: message.into(),
        }
    }

    /// Report `done` of `total` (any unit; the bar shows the fraction).
    pub fn update(&mut self, done: f64, total: f64) {
        if !self.enabled {
            return;
        }
        if self.bar.is_none() {
            if self.started.elapsed() < SHOW_AFTER {
                return;
            }
            let bar = ProgressBar::with_draw_target(Some(1000), ProgressDrawTarget::stderr())
                .with_elapsed(self.started.elapsed());
            // Short enough for an 80-column terminal, so the line never wraps.
            let style = ProgressStyle::with_template(
                "{msg:.bold} [{bar:24}] {percent:>3}% {elapsed} (~{eta} left) Ctrl-C: stop, keep results",
            )
            .unwrap_or_else(|_| ProgressStyle::default_bar())
            .progress_chars("=> ");
            bar.set_style(style);
            bar.set_message(self.message.clone());
            self.bar = Some(bar);
        }
        if let Some(bar) = &self.bar {
            let frac = if total > 0.0 {
                (done / total).clamp(0.0, 1.0)
            } else {
                0.0
            };
            bar.set_position((frac * 1000.0) as u64);
        }
    }

    pub fn finish(&mut self) {
        if let Some(bar) = self.bar.take() {
            bar.finish_and_clear();
        }
    }
}
