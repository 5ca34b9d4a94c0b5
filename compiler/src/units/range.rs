//! The range of values the solver can compute with.
//!
//! Every input quantity, after conversion to SI, must be finite and, unless it is zero, lie
//! within [`SMALLEST`]…[`LARGEST`] in magnitude; temperatures must lie between 0 K and
//! [`HOTTEST`]. The bounds are far outside anything physical (a length of 10⁻³⁰ m is fifteen
//! orders below an atomic nucleus; 10⁶ K is hotter than the surface of any star used as a
//! boundary) yet far inside what a double can hold, so that products such as h·A or quotients
//! such as 1/(h·A) of two in-range values stay finite and keep their precision. A value outside
//! them is a slip — a wrong unit prefix, an exponent typed twice, a literal that overflowed —
//! and computing with it gives infinite resistances or temperatures of 10¹⁶ °C instead of an
//! answer. See docs/units.md ("Range of values").

use super::{Dim, Quantity, TempKind};

/// Smallest magnitude of a non-zero input value, SI.
pub const SMALLEST: f64 = 1e-30;
/// Largest magnitude of an input value, SI.
pub const LARGEST: f64 = 1e30;
/// Hottest temperature (and largest temperature difference) a model may state, K.
pub const HOTTEST: f64 = 1e6;

/// How a value falls outside the range.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum OutOfRange {
    /// Infinite or not a number (an overflowed literal or computation).
    NotFinite,
    /// Non-zero but smaller in magnitude than the smallest value.
    TooSmall,
    /// Larger in magnitude than the largest value (or hotter than [`HOTTEST`]).
    TooLarge,
    /// A temperature on a scale below 0 K.
    BelowAbsoluteZero,
}

/// Whether a quantity is within the range the solver can compute with.
pub fn check(q: Quantity) -> Result<(), OutOfRange> {
    let v = q.value;
    if !v.is_finite() {
        return Err(OutOfRange::NotFinite);
    }
    let largest = if q.dim == Dim::TEMPERATURE {
        HOTTEST
    } else {
        LARGEST
    };
    if q.dim == Dim::TEMPERATURE && q.kind == TempKind::Point && v < 0.0 {
        return Err(OutOfRange::BelowAbsoluteZero);
    }
    if v.abs() > largest {
        return Err(OutOfRange::TooLarge);
    }
    if v != 0.0 && v.abs() < SMALLEST {
        return Err(OutOfRange::TooSmall);
    }
    Ok(())
}

/// The bounds of the range for a dimension, SI: (smallest non-zero magnitude, largest).
pub fn bounds(dim: Dim) -> (f64, f64) {
    if dim == Dim::TEMPERATURE {
        (SMALLEST, HOTTEST)
    } else {
        (SMALLEST, LARGEST)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn q(value: f64, dim: Dim) -> Quantity {
        Quantity::new(value, dim)
    }

    #[test]
    fn ordinary_and_zero_values_pass() {
        assert_eq!(check(q(0.0, Dim::AREA)), Ok(()));
        assert_eq!(check(q(-3.2, Dim::POWER)), Ok(()));
        assert_eq!(check(q(1e-30, Dim::LENGTH)), Ok(()));
        assert_eq!(check(q(1e30, Dim::AREA)), Ok(()));
        let hot = Quantity {
            value: 1e6,
            dim: Dim::TEMPERATURE,
            kind: TempKind::Point,
        };
        assert_eq!(check(hot), Ok(()));
    }

    #[test]
    fn values_outside_the_range_are_named() {
        assert_eq!(
            check(q(f64::INFINITY, Dim::AREA)),
            Err(OutOfRange::NotFinite)
        );
        assert_eq!(check(q(f64::NAN, Dim::NONE)), Err(OutOfRange::NotFinite));
        assert_eq!(check(q(4.9e-324, Dim::AREA)), Err(OutOfRange::TooSmall));
        assert_eq!(check(q(-2e30, Dim::POWER)), Err(OutOfRange::TooLarge));
        let t = |value, kind| Quantity {
            value,
            dim: Dim::TEMPERATURE,
            kind,
        };
        assert_eq!(check(t(1e308, TempKind::Point)), Err(OutOfRange::TooLarge));
        assert_eq!(
            check(t(-1.0, TempKind::Point)),
            Err(OutOfRange::BelowAbsoluteZero)
        );
        // A difference may be negative, but not larger than the hottest temperature.
        assert_eq!(check(t(-40.0, TempKind::Difference)), Ok(()));
        assert_eq!(
            check(t(2e6, TempKind::Difference)),
            Err(OutOfRange::TooLarge)
        );
    }
}
