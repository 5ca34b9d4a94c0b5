//! Client settings: which unit system to show first, how long to wait after typing before
//! solving, and how large a model the editor expands.

use caloris_compiler::budget::MODEL_BUDGET;
use serde_json::Value;
use std::time::Duration;

/// Which unit system hovers and inlay hints show first (the other follows in brackets).
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Units {
    /// The system most of the model's quantities are written in.
    Auto,
    Si,
    Us,
}

#[derive(Clone, Debug, PartialEq)]
pub struct Settings {
    pub units: Units,
    /// Pause after the last edit before the full solve starts; the fast check runs at once.
    pub solve_delay: Duration,
    /// Most declarations and region cells an open model may expand to (E220 past it); `None`
    /// is the compiler's own budget. A slow machine may ask for less.
    pub size_budget: Option<u64>,
}

impl Default for Settings {
    fn default() -> Self {
        Settings {
            units: Units::Auto,
            solve_delay: Duration::from_millis(50),
            size_budget: None,
        }
    }
}

impl Settings {
    /// Read settings from `initializationOptions` or `workspace/didChangeConfiguration`
    /// (`{"units": "us", "solveDelayMs": 100, "sizeBudget": 100000}`, optionally under a
    /// `caloris` key). Unknown keys and values of the wrong type are ignored and keep the
    /// current value; a budget is at least 1 and at most the compiler's.
    pub fn merge(&self, value: &Value) -> Settings {
        let v = value.get("caloris").unwrap_or(value);
        let mut s = self.clone();
        match v.get("units").and_then(Value::as_str) {
            Some("auto") => s.units = Units::Auto,
            Some("si") => s.units = Units::Si,
            Some("us") => s.units = Units::Us,
            _ => {}
        }
        if let Some(ms) = v.get("solveDelayMs").and_then(Value::as_u64) {
            s.solve_delay = Duration::from_millis(ms.min(10_000));
        }
        if let Some(n) = v.get("sizeBudget").and_then(Value::as_u64) {
            s.size_budget = Some(n.clamp(1, MODEL_BUDGET));
        }
        s
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn merge_reads_known_keys_and_ignores_the_rest() {
        let s = Settings::default()
            .merge(&serde_json::json!({"caloris": {"units": "us", "solveDelayMs": 5, "sizeBudget": 20000, "x": 1}}));
        assert_eq!(
            s,
            Settings {
                units: Units::Us,
                solve_delay: Duration::from_millis(5),
                size_budget: Some(20_000),
            }
        );
        let t = s.merge(
            &serde_json::json!({"units": "metric", "solveDelayMs": "fast", "sizeBudget": -3}),
        );
        assert_eq!(t, s);
        let big = s.merge(&serde_json::json!({"sizeBudget": u64::MAX}));
        assert_eq!(big.size_budget, Some(MODEL_BUDGET));
    }
}
