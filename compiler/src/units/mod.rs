//! Units of measure: dimensions, the unit table, the unit-expression parser, and display units
//! for reports.
//!
//! Every quantity is carried in SI base units (m, kg, s, K); temperatures on a scale are carried
//! as absolute kelvin and marked [`TempKind::Point`]. The accepted spellings and the exact
//! conversion factors (NIST SP 811) are listed in `docs/units.md`.
//!
//! ```text
//! parse_unit("W/(m*K)")   -> scale 1, Dim::CONDUCTIVITY
//! parse_unit("°F")        -> Point: to_si(68.0) = 293.15 K
//! parse_unit("h*ft^2*°F/Btu").to_si(1.0) -> 0.17611... m²·K/W
//! ```

mod dimension;
mod display;
mod parse;
pub mod range;
mod suggest;
mod table;

pub use dimension::Dim;
pub use display::{display_unit, format_number, format_quantity, json_unit_suffix};
pub use parse::parse_unit;
pub use table::unit_spellings;
pub use table::{
    BTU_IT, CAL_IT, CELSIUS_ZERO_IN_K, DAY, FAHRENHEIT_DEGREE, FAHRENHEIT_ZERO_IN_R, FOOT, HOUR,
    INCH, LITRE, MILE, MINUTE, POUND, WATT_HOUR, YARD,
};

use serde::Serialize;

/// Temperature kind of a quantity (temperatures are affine).
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
pub enum TempKind {
    /// Not a bare temperature (any other dimension, including compound units that contain a
    /// temperature such as `W/(m*K)`).
    NotTemperature,
    /// A temperature on a scale: `°C`, `°F` alone.
    Point,
    /// A temperature difference: `Δ°C`, `Δ°F`, or a compound unit whose whole dimension is a
    /// temperature.
    Difference,
    /// `K` or `°R` alone: absolute, usable as a point or as a difference.
    Absolute,
}

/// A value in SI base units (temperature points as absolute kelvin).
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct Quantity {
    pub value: f64,
    pub dim: Dim,
    pub kind: TempKind,
}

impl Quantity {
    /// A quantity that is not a bare temperature.
    pub fn new(value: f64, dim: Dim) -> Quantity {
        let kind = if dim == Dim::TEMPERATURE {
            TempKind::Difference
        } else {
            TempKind::NotTemperature
        };
        Quantity { value, dim, kind }
    }

    /// A dimensionless number.
    pub fn number(value: f64) -> Quantity {
        Quantity::new(value, Dim::NONE)
    }
}

/// A parsed unit expression.
///
/// A value `v` written in this unit is `(v + offset) * scale` in SI base units. `offset` is
/// non-zero only for the temperature scales `°C` (273.15, scale 1) and `°F` (459.67, scale 5/9),
/// and only when they stand alone ([`TempKind::Point`]).
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct Unit {
    pub scale: f64,
    pub offset: f64,
    pub dim: Dim,
    pub kind: TempKind,
    /// The unit as written (for parsed units) or its display text (for display units).
    pub text: String,
}

impl Unit {
    /// Value written in this unit -> SI quantity (points: absolute kelvin).
    pub fn to_si(&self, v: f64) -> Quantity {
        let value = if self.kind == TempKind::Point {
            (v + self.offset) * self.scale
        } else {
            v * self.scale
        };
        Quantity {
            value,
            dim: self.dim,
            kind: self.kind,
        }
    }

    /// SI value -> number in this unit (inverse of [`Unit::to_si`]; for points applies the
    /// offset).
    pub fn from_si(&self, si: f64) -> f64 {
        if self.kind == TempKind::Point {
            si / self.scale - self.offset
        } else {
            si / self.scale
        }
    }

    /// The coherent SI unit of a dimension (scale 1), written in base units or its named SI
    /// unit, e.g. `W/(m·K)`.
    pub fn si(dim: Dim) -> Unit {
        let kind = if dim == Dim::TEMPERATURE {
            TempKind::Difference
        } else {
            TempKind::NotTemperature
        };
        let text = if dim.is_none() {
            String::new()
        } else {
            dim.si_unit()
        };
        Unit {
            scale: 1.0,
            offset: 0.0,
            dim,
            kind,
            text,
        }
    }
}

/// An error in a unit expression.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct UnitError {
    /// Byte offsets within the unit text (half-open).
    pub start: usize,
    pub end: usize,
    pub message: String,
    pub help: Option<String>,
}

impl std::fmt::Display for UnitError {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.write_str(&self.message)?;
        if let Some(h) = &self.help {
            write!(f, " (help: {h})")?;
        }
        Ok(())
    }
}

impl std::error::Error for UnitError {}

/// Output systems for reports.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
pub enum UnitSystem {
    Si,
    Us,
}

#[cfg(test)]
mod tests;
