//! Client settings: which unit system to show first, and how long to wait after typing before
//! solving.

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
}

impl Default for Settings {
    fn default() -> Self {
        Settings {
            units: Units::Auto,
            solve_delay: Duration::from_millis(50),
        }
    }
}

impl Settings {
    /// Read settings from `initializationOptions` or `workspace/didChangeConfiguration`
    /// (`{"units": "us", "solveDelayMs": 100}`, optionally under a `caloris` key). Unknown
    /// keys and values of the wrong type are ignored and keep the current value.
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
        s
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn merge_reads_known_keys_and_ignores_the_rest() {
        let s = Settings::default()
            .merge(&serde_json::json!({"caloris": {"units": "us", "solveDelayMs": 5, "x": 1}}));
        assert_eq!(
            s,
            Settings {
                units: Units::Us,
                solve_delay: Duration::from_millis(5)
            }
        );
        let t = s.merge(&serde_json::json!({"units": "metric", "solveDelayMs": "fast"}));
        assert_eq!(t, s);
    }
}
