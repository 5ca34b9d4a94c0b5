//! Quantities for people: the preferred unit system first, the other in brackets.

use caloris_compiler::units::{format_quantity, Dim, Quantity, TempKind, UnitSystem};

pub fn other(s: UnitSystem) -> UnitSystem {
    match s {
        UnitSystem::Si => UnitSystem::Us,
        UnitSystem::Us => UnitSystem::Si,
    }
}

/// `75.3 °C (167.5 °F)`; a dimensionless number once.
pub fn both(q: Quantity, first: UnitSystem) -> String {
    let a = format_quantity(q, first);
    let b = format_quantity(q, other(first));
    if a == b {
        a
    } else {
        format!("{a} ({b})")
    }
}

pub fn one(q: Quantity, s: UnitSystem) -> String {
    format_quantity(q, s)
}

/// A temperature on a scale, from kelvin.
pub fn point(kelvin: f64) -> Quantity {
    Quantity {
        value: kelvin,
        dim: Dim::TEMPERATURE,
        kind: TempKind::Point,
    }
}

/// A quantity of a dimension (temperatures as differences).
pub fn q(value: f64, dim: Dim) -> Quantity {
    Quantity::new(value, dim)
}

/// A time from a run's start in the unit that suits it (`45 s`, `12.5 min`, `9.75 h`, `4 d`),
/// chosen like the command line's run report.
pub fn time(seconds: f64) -> String {
    let a = seconds.abs();
    let (unit, size) = if a < 120.0 {
        ("s", 1.0)
    } else if a < 7200.0 {
        ("min", 60.0)
    } else if a < 3.0 * 86400.0 {
        ("h", 3600.0)
    } else {
        ("d", 86400.0)
    };
    format!(
        "{} {unit}",
        caloris_compiler::units::format_number(seconds / size)
    )
}
