//! "Convert unit": the same quantity written in other common units of its dimension.

use crate::units::{parse_unit, Dim, TempKind};

/// One way to rewrite a literal.
#[derive(Clone, Debug, PartialEq)]
pub struct Conversion {
    /// The unit as it will be written.
    pub unit: &'static str,
    /// The literal in that unit, e.g. `0.14 m`.
    pub text: String,
}

/// Units offered per dimension, SI first, each a spelling the unit parser accepts.
const CANDIDATES: &[(Dim, &[&str])] = &[
    (Dim::LENGTH, &["m", "cm", "mm", "in", "ft"]),
    (Dim::AREA, &["m^2", "cm^2", "mm^2", "ft^2", "in^2"]),
    (Dim::VOLUME, &["m^3", "L", "ft^3"]),
    (Dim::TIME, &["s", "min", "h", "d"]),
    (Dim::MASS, &["kg", "g", "lb"]),
    (Dim::POWER, &["W", "kW", "Btu/h"]),
    (Dim::ENERGY, &["J", "kJ", "kWh", "Btu"]),
    (Dim::CONDUCTIVITY, &["W/(m*K)", "mW/(m*K)", "Btu/(h*ft*°F)"]),
    (Dim::HEAT_TRANSFER_COEFF, &["W/(m^2*K)", "Btu/(h*ft^2*°F)"]),
    (
        Dim::AREA_RESISTANCE,
        &["m^2*K/W", "cm^2*K/W", "h*ft^2*°F/Btu"],
    ),
    (Dim::RESISTANCE, &["K/W", "h*°F/Btu"]),
    (Dim::CONDUCTANCE, &["W/K", "Btu/(h*°F)"]),
    (Dim::HEAT_FLUX, &["W/m^2", "Btu/(h*ft^2)"]),
    (Dim::DENSITY, &["kg/m^3", "lb/ft^3"]),
    (Dim::SPECIFIC_HEAT, &["J/(kg*K)", "Btu/(lb*°F)"]),
];

const TEMPERATURE_POINTS: &[&str] = &["°C", "°F", "K"];
const TEMPERATURE_DIFFERENCES: &[&str] = &["K", "Δ°C", "Δ°F"];

/// The literal `value unit` (as written) in the other common units of its dimension; empty
/// when the unit is unknown or has no alternatives. Values keep 6 significant digits.
pub fn unit_conversions(value: f64, unit: &str) -> Vec<Conversion> {
    let Ok(from) = parse_unit(unit) else {
        return Vec::new();
    };
    let si = from.to_si(value);
    let list: &[&str] = if from.dim == Dim::TEMPERATURE {
        match from.kind {
            TempKind::Point => TEMPERATURE_POINTS,
            _ => TEMPERATURE_DIFFERENCES,
        }
    } else {
        CANDIDATES
            .iter()
            .find(|(d, _)| *d == from.dim)
            .map(|(_, l)| *l)
            .unwrap_or(&[])
    };
    list.iter()
        .filter(|u| **u != unit.trim())
        .filter_map(|u| {
            let mut to = parse_unit(u).ok()?;
            if to.dim != from.dim {
                return None;
            }
            // `K` alone converts a point as an absolute temperature.
            if from.kind == TempKind::Point && to.kind == TempKind::Absolute {
                to.kind = TempKind::Point;
                to.offset = 0.0;
            }
            if from.kind == TempKind::Point && to.kind != TempKind::Point {
                return None;
            }
            let v = to.from_si(si.value);
            Some(Conversion {
                unit: u,
                text: format!("{} {u}", format_significant(v, 6)),
            })
        })
        .collect()
}

/// A number with at most `digits` significant digits, trailing zeros dropped, never `-0`,
/// plain notation from 1e-4 up to 1e9 (whole numbers keep all their digits there) and
/// scientific notation beyond.
pub fn format_significant(v: f64, digits: i32) -> String {
    if !v.is_finite() {
        return v.to_string();
    }
    if v == 0.0 {
        return "0".to_string();
    }
    let exp = v.abs().log10().floor() as i32;
    let trim = |s: String| {
        if s.contains('.') {
            s.trim_end_matches('0').trim_end_matches('.').to_string()
        } else {
            s
        }
    };
    let s = if (-4..9).contains(&exp) {
        let decimals = usize::try_from(digits - 1 - exp).unwrap_or(0);
        trim(format!("{v:.decimals$}"))
    } else {
        let d = usize::try_from(digits - 1).unwrap_or(0);
        let s = format!("{v:.d$e}");
        match s.split_once('e') {
            Some((m, e)) => format!("{}e{e}", trim(m.to_string())),
            None => s,
        }
    };
    if s == "-0" {
        "0".to_string()
    } else {
        s
    }
}
