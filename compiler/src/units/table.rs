//! The unit symbol table: every accepted spelling, its size in SI base units, and the SI
//! prefixes. Conversion factors are the exact definitions of NIST SP 811 ("Guide for the Use
//! of the International System of Units", Appendix B); derived factors are computed from them
//! rather than written out rounded.

use super::dimension::Dim;

/// NIST SP 811: inch, in = 2.54 E-02 m (exact).
pub const INCH: f64 = 0.0254;
/// NIST SP 811: foot, ft = 3.048 E-01 m (exact).
pub const FOOT: f64 = 0.3048;
/// NIST SP 811: yard, yd = 9.144 E-01 m (exact).
pub const YARD: f64 = 0.9144;
/// NIST SP 811: mile (international), mi = 1.609344 E+03 m (exact).
pub const MILE: f64 = 1609.344;
/// NIST SP 811: pound (avoirdupois), lb = 4.5359237 E-01 kg (exact).
pub const POUND: f64 = 0.45359237;
/// NIST SP 811: British thermal unit (International Table), Btu_IT = 1.05505585262 E+03 J (exact).
pub const BTU_IT: f64 = 1055.05585262;
/// NIST SP 811: calorie (International Table), cal_IT = 4.1868 J (exact).
pub const CAL_IT: f64 = 4.1868;
/// NIST SP 811: minute, min = 60 s (exact).
pub const MINUTE: f64 = 60.0;
/// NIST SP 811: hour, h = 3600 s (exact).
pub const HOUR: f64 = 3600.0;
/// NIST SP 811: day, d = 86 400 s (exact).
pub const DAY: f64 = 86400.0;
/// NIST SP 811: litre, L = 1 E-03 m³ (exact).
pub const LITRE: f64 = 1e-3;
/// NIST SP 811: watt hour, W·h = 3.6 E+03 J (exact).
pub const WATT_HOUR: f64 = 3600.0;
/// NIST SP 811: degree Fahrenheit (temperature interval) = 5/9 K, and degree Rankine = 5/9 K (exact).
pub const FAHRENHEIT_DEGREE: f64 = 5.0 / 9.0;
/// NIST SP 811: T(K) = t(°C) + 273.15 (exact).
pub const CELSIUS_ZERO_IN_K: f64 = 273.15;
/// NIST SP 811: T(K) = (t(°F) + 459.67)/1.8, i.e. 0 °F = 459.67 °R (exact).
pub const FAHRENHEIT_ZERO_IN_R: f64 = 459.67;

/// How a symbol takes part in temperature rules.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub(crate) enum TempSym {
    /// Not a temperature unit.
    No,
    /// °C: a point on its own (offset 273.15 K).
    Celsius,
    /// °F: a point on its own (offset 459.67 °R).
    Fahrenheit,
    /// K or °R: absolute on its own.
    Absolute,
    /// Δ°C, Δ°F: always a difference.
    Delta,
}

/// One accepted spelling.
#[derive(Debug)]
pub(crate) struct Symbol {
    pub spelling: &'static str,
    /// Size of one unit in SI base units (for temperatures: of one degree).
    pub scale: f64,
    pub dim: Dim,
    pub temp: TempSym,
    /// Takes SI prefixes (`k`, `m`, `µ`, ...).
    pub prefixable: bool,
    /// The name written in docs and suggestions.
    pub name: &'static str,
}

const fn sym(
    spelling: &'static str,
    scale: f64,
    dim: Dim,
    prefixable: bool,
    name: &'static str,
) -> Symbol {
    Symbol {
        spelling,
        scale,
        dim,
        temp: TempSym::No,
        prefixable,
        name,
    }
}

const fn temp(spelling: &'static str, scale: f64, t: TempSym, name: &'static str) -> Symbol {
    Symbol {
        spelling,
        scale,
        dim: Dim::TEMPERATURE,
        temp: t,
        prefixable: false,
        name,
    }
}

/// Every unit spelling. Lookup takes an exact entry before trying a prefix split, so `min` is
/// the minute, `Pa` the pascal and `mi` the mile.
pub(crate) const SYMBOLS: &[Symbol] = &[
    // SI base and derived units (prefixable). `g` is the gram so that `kg` is a prefix form.
    sym("m", 1.0, Dim::LENGTH, true, "metre"),
    sym("g", 1e-3, Dim::MASS, true, "gram"),
    sym("s", 1.0, Dim::TIME, true, "second"),
    sym("W", 1.0, Dim::POWER, true, "watt"),
    sym("J", 1.0, Dim::ENERGY, true, "joule"),
    sym("N", 1.0, Dim::FORCE, true, "newton"),
    sym("Pa", 1.0, Dim::PRESSURE, true, "pascal"),
    sym("L", LITRE, Dim::VOLUME, true, "litre"),
    sym("bar", 1e5, Dim::PRESSURE, true, "bar"),
    // Convenience spellings.
    sym("m2", 1.0, Dim::AREA, false, "square metre"),
    sym("m3", 1.0, Dim::VOLUME, false, "cubic metre"),
    // Time outside the SI (no prefixes).
    sym("min", MINUTE, Dim::TIME, false, "minute"),
    // Pressure outside the SI: the standard atmosphere (NIST SP 811, exact).
    sym(
        "atm",
        101_325.0,
        Dim::PRESSURE,
        false,
        "standard atmosphere",
    ),
    sym("h", HOUR, Dim::TIME, false, "hour"),
    sym("d", DAY, Dim::TIME, false, "day"),
    // Energy.
    sym("Wh", WATT_HOUR, Dim::ENERGY, false, "watt hour"),
    sym("kWh", 1e3 * WATT_HOUR, Dim::ENERGY, false, "kilowatt hour"),
    sym("MWh", 1e6 * WATT_HOUR, Dim::ENERGY, false, "megawatt hour"),
    sym(
        "Btu",
        BTU_IT,
        Dim::ENERGY,
        false,
        "British thermal unit (International Table)",
    ),
    sym(
        "cal",
        CAL_IT,
        Dim::ENERGY,
        false,
        "calorie (International Table)",
    ),
    sym(
        "kcal",
        1e3 * CAL_IT,
        Dim::ENERGY,
        false,
        "kilocalorie (International Table)",
    ),
    // US customary length and mass.
    sym("in", INCH, Dim::LENGTH, false, "inch"),
    sym("ft", FOOT, Dim::LENGTH, false, "foot"),
    sym("yd", YARD, Dim::LENGTH, false, "yard"),
    sym("mi", MILE, Dim::LENGTH, false, "mile"),
    sym("lb", POUND, Dim::MASS, false, "pound (mass)"),
    // Temperatures.
    temp("K", 1.0, TempSym::Absolute, "kelvin"),
    temp("°C", 1.0, TempSym::Celsius, "degree Celsius"),
    temp("degC", 1.0, TempSym::Celsius, "degree Celsius"),
    temp("℃", 1.0, TempSym::Celsius, "degree Celsius"),
    temp(
        "°F",
        FAHRENHEIT_DEGREE,
        TempSym::Fahrenheit,
        "degree Fahrenheit",
    ),
    temp(
        "degF",
        FAHRENHEIT_DEGREE,
        TempSym::Fahrenheit,
        "degree Fahrenheit",
    ),
    temp(
        "℉",
        FAHRENHEIT_DEGREE,
        TempSym::Fahrenheit,
        "degree Fahrenheit",
    ),
    temp("°R", FAHRENHEIT_DEGREE, TempSym::Absolute, "degree Rankine"),
    temp(
        "degR",
        FAHRENHEIT_DEGREE,
        TempSym::Absolute,
        "degree Rankine",
    ),
    temp("Δ°C", 1.0, TempSym::Delta, "Celsius degree (difference)"),
    temp("∆°C", 1.0, TempSym::Delta, "Celsius degree (difference)"),
    temp(
        "delta_degC",
        1.0,
        TempSym::Delta,
        "Celsius degree (difference)",
    ),
    temp(
        "Δ°F",
        FAHRENHEIT_DEGREE,
        TempSym::Delta,
        "Fahrenheit degree (difference)",
    ),
    temp(
        "∆°F",
        FAHRENHEIT_DEGREE,
        TempSym::Delta,
        "Fahrenheit degree (difference)",
    ),
    temp(
        "delta_degF",
        FAHRENHEIT_DEGREE,
        TempSym::Delta,
        "Fahrenheit degree (difference)",
    ),
];

/// An SI prefix: its spellings and power of ten.
pub(crate) struct Prefix {
    pub spellings: &'static [&'static str],
    pub exp10: i32,
}

/// The SI prefixes accepted on prefixable units. `µ` may be the micro sign (U+00B5), the Greek
/// letter mu (U+03BC) or ASCII `u`.
pub(crate) const PREFIXES: &[Prefix] = &[
    Prefix {
        spellings: &["p"],
        exp10: -12,
    },
    Prefix {
        spellings: &["n"],
        exp10: -9,
    },
    Prefix {
        spellings: &["µ", "μ", "u"],
        exp10: -6,
    },
    Prefix {
        spellings: &["m"],
        exp10: -3,
    },
    Prefix {
        spellings: &["c"],
        exp10: -2,
    },
    Prefix {
        spellings: &["d"],
        exp10: -1,
    },
    Prefix {
        spellings: &["k"],
        exp10: 3,
    },
    Prefix {
        spellings: &["M"],
        exp10: 6,
    },
    Prefix {
        spellings: &["G"],
        exp10: 9,
    },
];

/// 10^n, correctly rounded for |n| <= 22 (the powers of ten that are exact in f64 and their
/// reciprocals), so `1 mm` is exactly the double nearest 0.001 m.
pub(crate) fn pow10(n: i32) -> f64 {
    if n >= 0 {
        10f64.powi(n)
    } else {
        1.0 / 10f64.powi(-n)
    }
}

/// A spelling resolved to a symbol, possibly with a prefix.
#[derive(Debug, Clone, Copy)]
pub(crate) struct Resolved {
    pub symbol: &'static Symbol,
    pub scale: f64,
}

/// Resolves one spelling: an exact table entry first, then prefix + prefixable unit.
pub(crate) fn lookup(text: &str) -> Option<Resolved> {
    if let Some(s) = SYMBOLS.iter().find(|s| s.spelling == text) {
        return Some(Resolved {
            symbol: s,
            scale: s.scale,
        });
    }
    for p in PREFIXES {
        for ps in p.spellings {
            if let Some(rest) = text.strip_prefix(ps) {
                if let Some(s) = SYMBOLS.iter().find(|s| s.spelling == rest && s.prefixable) {
                    // g is 1e-3 kg: fold the two powers of ten so kg is exactly 1.
                    let scale = if s.spelling == "g" {
                        pow10(p.exp10 - 3)
                    } else {
                        s.scale * pow10(p.exp10)
                    };
                    return Some(Resolved { symbol: s, scale });
                }
            }
        }
    }
    None
}

/// Every unprefixed spelling with its name, in table order (for completion lists and docs),
/// e.g. `("Btu", "British thermal unit (International Table)")`.
pub fn unit_spellings() -> impl Iterator<Item = (&'static str, &'static str)> {
    SYMBOLS.iter().map(|s| (s.spelling, s.name))
}

/// Every spelling a suggestion may name: table entries, then the prefixed forms (first prefix
/// spelling only, plus `u` for micro).
pub(crate) fn known_spellings() -> Vec<String> {
    let mut out: Vec<String> = SYMBOLS.iter().map(|s| s.spelling.to_string()).collect();
    for s in SYMBOLS.iter().filter(|s| s.prefixable) {
        for p in PREFIXES {
            for ps in p.spellings.iter().filter(|ps| **ps != "μ") {
                out.push(format!("{ps}{}", s.spelling));
            }
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    fn scale(text: &str) -> f64 {
        lookup(text).expect(text).scale
    }

    #[test]
    fn exact_entries_beat_prefix_splits() {
        assert_eq!(lookup("min").expect("min").symbol.name, "minute");
        assert_eq!(lookup("mi").expect("mi").symbol.name, "mile");
        assert_eq!(lookup("Pa").expect("Pa").symbol.name, "pascal");
        assert_eq!(lookup("mm").expect("mm").symbol.name, "metre");
        assert_eq!(lookup("m2").expect("m2").symbol.dim, Dim::AREA);
        assert_eq!(lookup("kWh").expect("kWh").scale, 3.6e6);
        assert_eq!(lookup("kcal").expect("kcal").scale, 4186.8);
        assert_eq!(lookup("d").expect("d").symbol.name, "day");
        assert_eq!(lookup("dm").expect("dm").symbol.name, "metre");
    }

    #[test]
    fn prefixes() {
        assert_eq!(scale("kg"), 1.0);
        assert_eq!(scale("g"), 1e-3);
        assert_eq!(scale("mg"), 1e-6);
        assert_eq!(scale("mm"), 1e-3);
        assert_eq!(scale("cm"), 1e-2);
        assert_eq!(scale("km"), 1e3);
        assert_eq!(scale("µm"), 1e-6);
        assert_eq!(scale("μm"), 1e-6);
        assert_eq!(scale("um"), 1e-6);
        assert_eq!(scale("nm"), 1e-9);
        assert_eq!(scale("pm"), 1e-12);
        assert_eq!(scale("kW"), 1e3);
        assert_eq!(scale("MW"), 1e6);
        assert_eq!(scale("GW"), 1e9);
        assert_eq!(scale("mW"), 1e-3);
        assert_eq!(scale("kJ"), 1e3);
        assert_eq!(scale("MJ"), 1e6);
        assert_eq!(scale("kPa"), 1e3);
        assert_eq!(scale("ms"), 1e-3);
        assert_eq!(scale("mL"), 1e-6);
        assert_eq!(scale("dL"), 1e-4);
        assert_eq!(scale("L"), 1e-3);
        assert_eq!(scale("kN"), 1e3);
    }

    #[test]
    fn no_prefixes_outside_the_si() {
        for t in [
            "kh", "mh", "kmin", "kd", "cd", "kft", "min2", "kBtu", "mK", "kK", "m°C", "k°F",
            "mdegC", "kin", "Mlb", "kWhh", "mm2", "mcal",
        ] {
            assert!(lookup(t).is_none(), "{t} should not resolve");
        }
    }

    #[test]
    fn pow10_is_correctly_rounded() {
        assert_eq!(pow10(-3), 0.001);
        assert_eq!(pow10(-6), 1e-6);
        assert_eq!(pow10(-9), 1e-9);
        assert_eq!(pow10(-12), 1e-12);
        assert_eq!(pow10(-15), 1e-15);
        assert_eq!(pow10(9), 1e9);
        assert_eq!(pow10(0), 1.0);
    }

    #[test]
    fn spellings_are_unique_and_resolve() {
        let all = known_spellings();
        for (i, a) in all.iter().enumerate() {
            assert!(lookup(a).is_some(), "{a}");
            assert!(!all[i + 1..].contains(a), "duplicate spelling {a}");
        }
    }

    #[test]
    fn nist_sp_811_exact_constants() {
        // NIST SP 811 Appendix B exact values.
        assert_eq!(INCH, 2.54e-2);
        assert_eq!(FOOT, 0.3048);
        assert!((FOOT - 12.0 * INCH).abs() < 1e-16);
        assert!((YARD - 3.0 * FOOT).abs() < 1e-15);
        assert!((MILE - 5280.0 * FOOT).abs() < 1e-12);
        assert_eq!(POUND, 0.45359237);
        assert_eq!(BTU_IT, 1055.05585262);
        assert_eq!(CAL_IT, 4.1868);
        // The IT Btu is the heat that raises 1 lb of water by 1 °F at 1 cal_IT/(g·°C):
        // 1 Btu_IT = 1000 * 0.45359237 * (5/9) * 4.1868 J exactly.
        assert!((BTU_IT - 1000.0 * POUND * FAHRENHEIT_DEGREE * CAL_IT).abs() / BTU_IT < 1e-15);
        assert_eq!(HOUR, 60.0 * MINUTE);
        assert_eq!(DAY, 24.0 * HOUR);
        assert!((FAHRENHEIT_DEGREE - 1.0 / 1.8).abs() < 1e-16);
    }
}
