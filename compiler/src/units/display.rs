//! Display units for reports (SI or US customary) and number formatting.

use super::dimension::Dim;
use super::parse::parse_unit;
use super::{Quantity, TempKind, Unit, UnitSystem};

/// Significant digits shown by [`format_number`].
const SIGNIFICANT: i32 = 4;

/// Display units of the dimensions that are not bare temperatures: (dim, SI text, US text).
const DISPLAY: &[(Dim, &str, &str)] = &[
    (Dim::NONE, "", ""),
    (Dim::LENGTH, "m", "ft"),
    (Dim::AREA, "m²", "ft²"),
    (Dim::VOLUME, "m³", "ft³"),
    (Dim::TIME, "s", "h"),
    (Dim::MASS, "kg", "lb"),
    (Dim::POWER, "W", "Btu/h"),
    (Dim::ENERGY, "J", "Btu"),
    (Dim::CONDUCTIVITY, "W/(m·K)", "Btu/(h·ft·°F)"),
    (Dim::HEAT_TRANSFER_COEFF, "W/(m²·K)", "Btu/(h·ft²·°F)"),
    (Dim::AREA_RESISTANCE, "m²·K/W", "h·ft²·°F/Btu"),
    (Dim::RESISTANCE, "K/W", "h·°F/Btu"),
    (Dim::CONDUCTANCE, "W/K", "Btu/(h·°F)"),
    (Dim::HEAT_FLUX, "W/m²", "Btu/(h·ft²)"),
    (Dim::DENSITY, "kg/m³", "lb/ft³"),
    (Dim::SPECIFIC_HEAT, "J/(kg·K)", "Btu/(lb·°F)"),
    (Dim::CAPACITY, "J/K", "Btu/°F"),
    (Dim::VOLUMETRIC_POWER, "W/m³", "Btu/(h·ft³)"),
    (Dim::LINEAR_HEAT_FLOW, "W/m", "Btu/(h·ft)"),
];

/// The unit suffix of a JSON field name (`heat_flow_W`, `shape_factor_m`) for the dimensions
/// reports name figures in; `None` for a dimensionless figure, and for a dimension without a
/// suffix of its own, whose figure then carries the SI unit in base units (`kg·m/s`).
pub fn json_unit_suffix(dim: Dim) -> Option<&'static str> {
    const SUFFIX: &[(Dim, &str)] = &[
        (Dim::LENGTH, "m"),
        (Dim::AREA, "m2"),
        (Dim::TIME, "s"),
        (Dim::TEMPERATURE, "K"),
        (Dim::POWER, "W"),
        (Dim::LINEAR_HEAT_FLOW, "W_per_m"),
        (Dim::RESISTANCE, "K_per_W"),
        (Dim::CONDUCTANCE, "W_per_K"),
        (Dim::HEAT_TRANSFER_COEFF, "W_per_m2K"),
        (Dim::AREA_RESISTANCE, "m2K_per_W"),
        (Dim::CAPACITY, "J_per_K"),
    ];
    SUFFIX.iter().find(|(d, _)| *d == dim).map(|(_, s)| *s)
}

fn display_text(dim: Dim, kind: TempKind, system: UnitSystem) -> Option<&'static str> {
    if dim == Dim::TEMPERATURE {
        return Some(match (system, kind) {
            (UnitSystem::Si, TempKind::Point) => "°C",
            (UnitSystem::Si, _) => "K",
            (UnitSystem::Us, TempKind::Point) => "°F",
            (UnitSystem::Us, TempKind::Absolute) => "°R",
            (UnitSystem::Us, _) => "Δ°F",
        });
    }
    DISPLAY
        .iter()
        .find(|(d, _, _)| *d == dim)
        .map(|(_, si, us)| match system {
            UnitSystem::Si => *si,
            UnitSystem::Us => *us,
        })
}

/// The display unit for a dimension and temperature kind in a system.
///
/// SI: point °C, difference K, absolute K, power W, length m, area m², resistance K/W,
/// conductance W/K, U-value W/(m²·K), area resistance m²·K/W, heat flux W/m², energy J, time s,
/// conductivity W/(m·K), capacity J/K (and m³, kg, kg/m³, J/(kg·K), W/m³).
/// US: °F point, Δ°F difference, °R absolute, Btu/h, ft, ft², h·°F/Btu, Btu/(h·°F),
/// Btu/(h·ft²·°F), h·ft²·°F/Btu, Btu/(h·ft²), Btu, h, Btu/(h·ft·°F), Btu/°F (and ft³, lb,
/// lb/ft³, Btu/(lb·°F), Btu/(h·ft³)).
/// Any other dimension falls back to its SI unit written in base units (`kg·m/s`).
/// The unit's `kind` is the requested kind for temperatures (a difference shown in `K` is a
/// `Difference`), otherwise `NotTemperature`.
pub fn display_unit(dim: Dim, kind: TempKind, system: UnitSystem) -> Unit {
    let kind = if dim == Dim::TEMPERATURE {
        match kind {
            TempKind::Point | TempKind::Absolute => kind,
            _ => TempKind::Difference,
        }
    } else {
        TempKind::NotTemperature
    };
    let mut unit = match display_text(dim, kind, system) {
        Some("") => Unit::si(Dim::NONE),
        Some(text) => parse_unit(text).unwrap_or_else(|_| Unit::si(dim)),
        None => Unit::si(dim),
    };
    unit.kind = kind;
    if kind != TempKind::Point {
        unit.offset = 0.0;
    }
    unit
}

/// A number for humans: 4 significant digits (more for large whole numbers), trailing zeros
/// dropped, scientific notation below 0.001 and from 1 000 000 up, never `-0`.
/// `format_number(12.3449) == "12.34"`, `format_number(2.5e-5) == "2.5e-5"`.
pub fn format_number(v: f64) -> String {
    if v.is_nan() {
        return "NaN".to_string();
    }
    if v.is_infinite() {
        return if v > 0.0 { "inf" } else { "-inf" }.to_string();
    }
    if v == 0.0 {
        return "0".to_string();
    }
    let exp = v.abs().log10().floor() as i32;
    let s = if (-3..6).contains(&exp) {
        let decimals = usize::try_from(SIGNIFICANT - 1 - exp).unwrap_or(0);
        trim_fraction(&format!("{v:.decimals$}"))
    } else {
        let digits = usize::try_from(SIGNIFICANT - 1).unwrap_or(0);
        let s = format!("{v:.digits$e}");
        match s.split_once('e') {
            Some((mantissa, e)) => format!("{}e{e}", trim_fraction(mantissa)),
            None => s,
        }
    };
    if s == "-0" {
        "0".to_string()
    } else {
        s
    }
}

fn trim_fraction(s: &str) -> String {
    if s.contains('.') {
        s.trim_end_matches('0').trim_end_matches('.').to_string()
    } else {
        s.to_string()
    }
}

/// Formats a quantity in the system's display unit, e.g. `"12.34 °C"`, `"0.2843 W/(m²·K)"`;
/// a dimensionless number has no unit text.
pub fn format_quantity(q: Quantity, system: UnitSystem) -> String {
    let unit = display_unit(q.dim, q.kind, system);
    let n = format_number(unit.from_si(q.value));
    if unit.text.is_empty() {
        n
    } else {
        format!("{n} {}", unit.text)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    const KINDS: [TempKind; 4] = [
        TempKind::NotTemperature,
        TempKind::Point,
        TempKind::Difference,
        TempKind::Absolute,
    ];

    fn all_display_units() -> Vec<(Dim, TempKind, UnitSystem, Unit)> {
        let mut out = Vec::new();
        for system in [UnitSystem::Si, UnitSystem::Us] {
            for kind in KINDS {
                out.push((
                    Dim::TEMPERATURE,
                    kind,
                    system,
                    display_unit(Dim::TEMPERATURE, kind, system),
                ));
            }
            for (dim, _, _) in DISPLAY {
                let k = TempKind::NotTemperature;
                out.push((*dim, k, system, display_unit(*dim, k, system)));
            }
        }
        out
    }

    #[test]
    fn display_texts() {
        let t = |d, k, s| display_unit(d, k, s).text;
        use TempKind::*;
        use UnitSystem::*;
        assert_eq!(t(Dim::TEMPERATURE, Point, Si), "°C");
        assert_eq!(t(Dim::TEMPERATURE, Difference, Si), "K");
        assert_eq!(t(Dim::TEMPERATURE, Absolute, Si), "K");
        assert_eq!(t(Dim::TEMPERATURE, Point, Us), "°F");
        assert_eq!(t(Dim::TEMPERATURE, Difference, Us), "Δ°F");
        assert_eq!(t(Dim::TEMPERATURE, NotTemperature, Us), "Δ°F");
        assert_eq!(t(Dim::TEMPERATURE, Absolute, Us), "°R");
        assert_eq!(t(Dim::POWER, NotTemperature, Si), "W");
        assert_eq!(t(Dim::POWER, NotTemperature, Us), "Btu/h");
        assert_eq!(t(Dim::POWER, Point, Us), "Btu/h");
        assert_eq!(t(Dim::RESISTANCE, NotTemperature, Us), "h·°F/Btu");
        assert_eq!(t(Dim::CONDUCTIVITY, NotTemperature, Us), "Btu/(h·ft·°F)");
        assert_eq!(t(Dim::HEAT_TRANSFER_COEFF, NotTemperature, Si), "W/(m²·K)");
        assert_eq!(t(Dim::AREA_RESISTANCE, NotTemperature, Us), "h·ft²·°F/Btu");
        assert_eq!(t(Dim::TIME, NotTemperature, Us), "h");
        assert_eq!(t(Dim::NONE, NotTemperature, Us), "");
        assert_eq!(t(Dim::new(1, 1, -1, 0), NotTemperature, Us), "kg·m/s");
        assert_eq!(t(Dim::new(0, 0, -1, 0), NotTemperature, Si), "1/s");
    }

    #[test]
    fn display_units_have_their_dimension_and_kind() {
        for (dim, kind, system, u) in all_display_units() {
            assert_eq!(u.dim, dim, "{} ({system:?})", u.text);
            if dim == Dim::TEMPERATURE {
                let want = if kind == TempKind::NotTemperature {
                    TempKind::Difference
                } else {
                    kind
                };
                assert_eq!(u.kind, want, "{}", u.text);
                assert_eq!(u.offset != 0.0, kind == TempKind::Point, "{}", u.text);
            } else {
                assert_eq!(u.kind, TempKind::NotTemperature, "{}", u.text);
                assert_eq!(u.offset, 0.0);
            }
        }
    }

    #[test]
    fn display_unit_texts_parse_back_to_the_same_unit() {
        for (_, _, _, u) in all_display_units() {
            if u.text.is_empty() {
                continue;
            }
            let p = parse_unit(&u.text).expect(&u.text);
            assert_eq!(p.dim, u.dim, "{}", u.text);
            assert_eq!(p.scale, u.scale, "{}", u.text);
        }
    }

    #[test]
    fn round_trip_every_display_unit() {
        for (_, _, _, u) in all_display_units() {
            for v in [
                -40.0, -1.5, 0.0, 1e-7, 0.3, 1.0, 20.0, 68.0, 1234.5678, 3.2e9,
            ] {
                let back = u.from_si(u.to_si(v).value);
                assert!(
                    (back - v).abs() <= 1e-12 * v.abs().max(1.0),
                    "{} {v} -> {back}",
                    u.text
                );
            }
            for si in [0.0, 1.0, 273.15, 293.15, 5e-3] {
                let back = u.to_si(u.from_si(si)).value;
                assert!(
                    (back - si).abs() <= 1e-12 * si.abs().max(1.0),
                    "{} {si} -> {back}",
                    u.text
                );
            }
        }
    }

    #[test]
    fn numbers() {
        assert_eq!(format_number(0.0), "0");
        assert_eq!(format_number(-0.0), "0");
        assert_eq!(format_number(-0.00001), "-1e-5");
        assert_eq!(format_number(12.3449), "12.34");
        assert_eq!(format_number(20.000000000000004), "20");
        assert_eq!(format_number(19.999999999999996), "20");
        assert_eq!(format_number(-8.0), "-8");
        assert_eq!(format_number(0.3), "0.3");
        assert_eq!(format_number(0.17611018), "0.1761");
        assert_eq!(format_number(0.001), "0.001");
        assert_eq!(format_number(0.00123456), "0.001235");
        assert_eq!(format_number(123456.7), "123457");
        assert_eq!(format_number(999999.4), "999999");
        assert_eq!(format_number(1.5e6), "1.5e6");
        assert_eq!(format_number(2.5e-5), "2.5e-5");
        assert_eq!(format_number(-1234.56), "-1235");
        assert_eq!(format_number(f64::NAN), "NaN");
        assert_eq!(format_number(f64::INFINITY), "inf");
        assert_eq!(format_number(-1e-300), "-1e-300");
        for v in [-0.00004, -4e-4, -0.4] {
            assert_ne!(format_number(v), "-0");
        }
    }

    #[test]
    fn quantities() {
        let p = |v: f64| Quantity {
            value: v,
            dim: Dim::TEMPERATURE,
            kind: TempKind::Point,
        };
        assert_eq!(format_quantity(p(285.49), UnitSystem::Si), "12.34 °C");
        assert_eq!(format_quantity(p(293.15), UnitSystem::Si), "20 °C");
        assert_eq!(format_quantity(p(293.15), UnitSystem::Us), "68 °F");
        assert_eq!(format_quantity(p(233.15), UnitSystem::Us), "-40 °F");
        assert_eq!(format_quantity(p(273.15), UnitSystem::Si), "0 °C");
        let d = Quantity {
            value: 5.0,
            dim: Dim::TEMPERATURE,
            kind: TempKind::Difference,
        };
        assert_eq!(format_quantity(d, UnitSystem::Si), "5 K");
        assert_eq!(format_quantity(d, UnitSystem::Us), "9 Δ°F");
        let a = Quantity {
            value: 293.15,
            dim: Dim::TEMPERATURE,
            kind: TempKind::Absolute,
        };
        assert_eq!(format_quantity(a, UnitSystem::Si), "293.1 K"); // 293.15 is 293.1499… in binary
        assert_eq!(format_quantity(a, UnitSystem::Us), "527.7 °R");
        assert_eq!(
            format_quantity(Quantity::new(3.2, Dim::POWER), UnitSystem::Si),
            "3.2 W"
        );
        assert_eq!(
            format_quantity(Quantity::new(0.29307107017, Dim::POWER), UnitSystem::Us),
            "1 Btu/h"
        );
        assert_eq!(
            format_quantity(
                Quantity::new(0.2843, Dim::HEAT_TRANSFER_COEFF),
                UnitSystem::Si
            ),
            "0.2843 W/(m²·K)"
        );
        assert_eq!(
            format_quantity(Quantity::number(0.9), UnitSystem::Us),
            "0.9"
        );
        assert_eq!(
            format_quantity(Quantity::new(-0.0, Dim::POWER), UnitSystem::Si),
            "0 W"
        );
        assert_eq!(
            format_quantity(Quantity::new(2.0, Dim::new(1, 1, -1, 0)), UnitSystem::Us),
            "2 kg·m/s"
        );
    }
}
