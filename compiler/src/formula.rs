//! A link's formula with its input values, as hover, reports and JSON show it. The common
//! elements keep a template and the numbers, written out only when something shows them:
//! formatting four quantities with their units for every link was a quarter of the time of
//! checking a large model, and most links' formulas are never read.

use crate::units::{format_quantity, Dim, Quantity, TempKind, UnitSystem};
use serde::{Serialize, Serializer};
use std::fmt;

/// Most values one template takes.
const MAX_VALUES: usize = 5;

#[derive(Clone, Debug, PartialEq)]
pub enum Formula {
    /// `text` with each `{}` standing for the next value, shown with its SI unit as
    /// [`show`] writes it.
    Template {
        text: &'static str,
        values: [f64; MAX_VALUES],
        dims: [Dim; MAX_VALUES],
    },
    /// A formula written out already (rare kinds, and formulas built around another).
    Text(String),
}

impl Formula {
    /// A template and its values, one for each `{}` in the text, in order.
    pub fn new(text: &'static str, quantities: &[(f64, Dim)]) -> Formula {
        debug_assert_eq!(text.matches("{}").count(), quantities.len(), "{text}");
        debug_assert!(quantities.len() <= MAX_VALUES, "{text}");
        let mut values = [0.0; MAX_VALUES];
        let mut dims = [Dim::NONE; MAX_VALUES];
        for (i, &(v, d)) in quantities.iter().take(MAX_VALUES).enumerate() {
            values[i] = v;
            dims[i] = d;
        }
        Formula::Template { text, values, dims }
    }
}

impl Default for Formula {
    fn default() -> Self {
        Formula::Text(String::new())
    }
}

impl From<String> for Formula {
    fn from(text: String) -> Self {
        Formula::Text(text)
    }
}

impl fmt::Display for Formula {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            Formula::Text(t) => f.write_str(t),
            Formula::Template { text, values, dims } => {
                let mut pieces = text.split("{}");
                f.write_str(pieces.next().unwrap_or(""))?;
                for (i, piece) in pieces.enumerate() {
                    if let (Some(&v), Some(&d)) = (values.get(i), dims.get(i)) {
                        f.write_str(&show(v, d))?;
                    }
                    f.write_str(piece)?;
                }
                Ok(())
            }
        }
    }
}

/// A value with its SI unit, as formulas write it (a temperature as a difference).
pub fn show(value: f64, dim: Dim) -> String {
    let kind = if dim == Dim::TEMPERATURE {
        TempKind::Difference
    } else {
        TempKind::NotTemperature
    };
    format_quantity(Quantity { value, dim, kind }, UnitSystem::Si)
}

/// As the text it reads: the JSON report carries the formula as a string.
impl Serialize for Formula {
    fn serialize<S: Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        s.collect_str(self)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_template_reads_as_the_formatted_text() {
        let (l, k, a) = (0.1, 0.77, 2.0);
        let r = l / (k * a);
        let lazy = Formula::new(
            "R = L/(k·A) = {} / ({} × {}) = {}",
            &[
                (l, Dim::LENGTH),
                (k, Dim::CONDUCTIVITY),
                (a, Dim::AREA),
                (r, Dim::RESISTANCE),
            ],
        );
        let eager = format!(
            "R = L/(k·A) = {} / ({} × {}) = {}",
            show(l, Dim::LENGTH),
            show(k, Dim::CONDUCTIVITY),
            show(a, Dim::AREA),
            show(r, Dim::RESISTANCE)
        );
        assert_eq!(lazy.to_string(), eager);
        assert_eq!(
            serde_json::to_value(&lazy).expect("json"),
            serde_json::Value::String(eager)
        );
        let one = Formula::new("R = {}", &[(2.5, Dim::RESISTANCE)]);
        assert_eq!(
            one.to_string(),
            format!("R = {}", show(2.5, Dim::RESISTANCE))
        );
    }
}
