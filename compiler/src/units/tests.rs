//! Conversion tests: NIST SP 811 exact factors, temperature rules, and an independent reference
//! computed with pint.

use super::*;

fn si(text: &str, v: f64) -> Quantity {
    parse_unit(text)
        .unwrap_or_else(|e| panic!("{text}: {e}"))
        .to_si(v)
}

fn close(a: f64, b: f64, rel: f64) -> bool {
    (a - b).abs() <= rel * a.abs().max(b.abs()).max(f64::MIN_POSITIVE)
}

#[track_caller]
fn check(text: &str, v: f64, want: f64, dim: Dim) {
    let q = si(text, v);
    assert!(
        close(q.value, want, 1e-14),
        "{v} {text} = {} SI, want {want}",
        q.value
    );
    assert_eq!(q.dim, dim, "{text}");
}

#[test]
fn nist_sp_811_lengths_masses_times() {
    // NIST SP 811 Appendix B: in = 0.0254 m, ft = 0.3048 m, yd = 0.9144 m, mi = 1609.344 m,
    // lb = 0.45359237 kg, min = 60 s, h = 3600 s, d = 86400 s (all exact).
    check("in", 1.0, 0.0254, Dim::LENGTH);
    check("ft", 1.0, 0.3048, Dim::LENGTH);
    check("yd", 1.0, 0.9144, Dim::LENGTH);
    check("mi", 1.0, 1609.344, Dim::LENGTH);
    check("lb", 1.0, 0.45359237, Dim::MASS);
    check("min", 1.0, 60.0, Dim::TIME);
    check("h", 1.0, 3600.0, Dim::TIME);
    check("d", 1.0, 86400.0, Dim::TIME);
    check("ft^2", 1.0, 0.3048 * 0.3048, Dim::AREA);
    check("in²", 1.0, 0.0254 * 0.0254, Dim::AREA);
    check("ft³", 1.0, 0.3048 * 0.3048 * 0.3048, Dim::VOLUME);
    check("L", 1.0, 1e-3, Dim::VOLUME);
    check("mL", 250.0, 2.5e-4, Dim::VOLUME);
}

#[test]
fn nist_sp_811_energy_and_power() {
    // NIST SP 811: Btu_IT = 1055.05585262 J, cal_IT = 4.1868 J, W·h = 3600 J (exact).
    check("Btu", 1.0, 1055.05585262, Dim::ENERGY);
    check("cal", 1.0, 4.1868, Dim::ENERGY);
    check("kcal", 1.0, 4186.8, Dim::ENERGY);
    check("Wh", 1.0, 3600.0, Dim::ENERGY);
    check("kWh", 1.0, 3.6e6, Dim::ENERGY);
    check("MWh", 1.0, 3.6e9, Dim::ENERGY);
    check("W*h", 1.0, 3600.0, Dim::ENERGY);
    check("kW·h", 1.0, 3.6e6, Dim::ENERGY);
    // Derived from the NIST SP 811 exact definitions: 1 Btu/h = 1055.05585262 J / 3600 s
    // = 0.29307107017... W.
    check("Btu/h", 1.0, 1055.05585262 / 3600.0, Dim::POWER);
    assert!(close(si("Btu/h", 1.0).value, 0.29307107017, 1e-11));
    check("kW", 2.5, 2500.0, Dim::POWER);
    check("mW", 1.0, 1e-3, Dim::POWER);
}

#[test]
fn nist_sp_811_thermal_compound_units() {
    let btu = 1055.05585262; // NIST SP 811, exact
    let ft = 0.3048; // NIST SP 811, exact
    let h = 3600.0;
    let deg_f = 5.0 / 9.0; // NIST SP 811: 1 °F (interval) = 5/9 K
                           // R-value: 1 h·ft²·°F/Btu = 3600 · 0.3048² · (5/9) / 1055.05585262 m²·K/W
                           // = 0.1761101838 m²·K/W (derived from the exact factors).
    let r_us = h * ft * ft * deg_f / btu;
    check("h*ft^2*°F/Btu", 1.0, r_us, Dim::AREA_RESISTANCE);
    check("h·ft²·°F/Btu", 1.0, r_us, Dim::AREA_RESISTANCE);
    check("ft^2*h*degF/Btu", 1.0, r_us, Dim::AREA_RESISTANCE);
    assert!(close(r_us, 0.1761101838, 1e-9));
    // Conductivity: 1 Btu/(h·ft·°F) = 1.730734666 W/(m·K) (derived).
    let k_us = btu / (h * ft * deg_f);
    check("Btu/(h*ft*°F)", 1.0, k_us, Dim::CONDUCTIVITY);
    check("Btu/h/ft/°F", 1.0, k_us, Dim::CONDUCTIVITY);
    check("Btu/(h·ft·Δ°F)", 1.0, k_us, Dim::CONDUCTIVITY);
    assert!(close(k_us, 1.730734666, 1e-9));
    // U-value: 1 Btu/(h·ft²·°F) = 5.678263337 W/(m²·K) (derived) = 1 / R-value factor.
    check(
        "Btu/(h*ft^2*°F)",
        1.0,
        btu / (h * ft * ft * deg_f),
        Dim::HEAT_TRANSFER_COEFF,
    );
    assert!(close(si("Btu/(h*ft^2*°F)", 1.0).value, 1.0 / r_us, 1e-14));
    assert!(close(si("Btu/(h*ft^2*°F)", 1.0).value, 5.678263337, 1e-9));
    check("h*°F/Btu", 1.0, h * deg_f / btu, Dim::RESISTANCE);
    check("Btu/(h*°F)", 1.0, btu / (h * deg_f), Dim::CONDUCTANCE);
    check("Btu/(h*ft^2)", 1.0, btu / (h * ft * ft), Dim::HEAT_FLUX);
    check("Btu/°F", 1.0, btu / deg_f, Dim::CAPACITY);
    // Specific heat: 1 Btu_IT/(lb·°F) = 4186.8 J/(kg·K) exactly (that is how the IT Btu is made).
    check("Btu/(lb*°F)", 1.0, 4186.8, Dim::SPECIFIC_HEAT);
    check("lb/ft^3", 1.0, 0.45359237 / (ft * ft * ft), Dim::DENSITY);
    // SI compounds.
    check("W/(m*K)", 0.04, 0.04, Dim::CONDUCTIVITY);
    check("W/(m*°C)", 0.04, 0.04, Dim::CONDUCTIVITY);
    check("W/(m²·K)", 7.7, 7.7, Dim::HEAT_TRANSFER_COEFF);
    check("W/m^2/K", 7.7, 7.7, Dim::HEAT_TRANSFER_COEFF);
    check("m^2*K/W", 0.13, 0.13, Dim::AREA_RESISTANCE);
    check("cm^2*K/W", 0.2, 0.2e-4, Dim::AREA_RESISTANCE);
    check("mm^2", 9.0, 9e-6, Dim::AREA);
    check("kg/m^3", 2300.0, 2300.0, Dim::DENSITY);
    check("J/(kg*K)", 1000.0, 1000.0, Dim::SPECIFIC_HEAT);
    check("kJ/(kg·K)", 1.0, 1000.0, Dim::SPECIFIC_HEAT);
    check("W/m³", 1.0, 1.0, Dim::VOLUMETRIC_POWER);
    check("s^-1", 2.0, 2.0, Dim::new(0, 0, -1, 0));
    check("m⁻¹", 2.0, 2.0, Dim::new(-1, 0, 0, 0));
    check("1/h", 3600.0, 1.0, Dim::new(0, 0, -1, 0));
    check("1/°F", 1.0, 1.8, Dim::new(0, 0, 0, -1));
    check("K/W", 2.5, 2.5, Dim::RESISTANCE);
    check("W/K", 0.8, 0.8, Dim::CONDUCTANCE);
}

#[test]
fn temperature_points() {
    // NIST SP 811: T(K) = (t(°F) + 459.67)/1.8 and T(K) = t(°C) + 273.15.
    let f = parse_unit("°F").expect("°F");
    assert_eq!(f.kind, TempKind::Point);
    assert!(close(f.to_si(32.0).value, 273.15, 1e-14));
    assert!(close(f.to_si(212.0).value, 373.15, 1e-14));
    assert!(close(f.to_si(68.0).value, 293.15, 1e-14));
    assert!(close(f.to_si(-40.0).value, 233.15, 1e-14));
    assert!(close(f.to_si(-459.67).value + 1.0, 1.0, 1e-14));
    assert_eq!(f.to_si(68.0).kind, TempKind::Point);
    let c = parse_unit("°C").expect("°C");
    assert!(close(c.to_si(-40.0).value, 233.15, 1e-15));
    assert_eq!(c.to_si(20.0).value, 293.15);
    assert_eq!(c.to_si(0.0).value, 273.15);
    // -40 °F = -40 °C.
    assert!(close(c.from_si(f.to_si(-40.0).value), -40.0, 1e-13));
    assert!(close(f.from_si(c.to_si(100.0).value), 212.0, 1e-14));
    assert!(close(f.from_si(273.15), 32.0, 1e-13));
    for spelling in ["degC", "℃", "(°C)", "°C^1"] {
        let u = parse_unit(spelling).expect(spelling);
        assert_eq!(
            (u.kind, u.offset, u.scale),
            (TempKind::Point, 273.15, 1.0),
            "{spelling}"
        );
    }
    for spelling in ["degF", "℉"] {
        let u = parse_unit(spelling).expect(spelling);
        assert_eq!(u.kind, TempKind::Point);
        assert!(close(u.to_si(68.0).value, 293.15, 1e-14));
    }
}

#[test]
fn absolute_temperatures() {
    // NIST SP 811: T(K) = T(°R)/1.8.
    for (text, v, want) in [
        ("K", 293.15, 293.15),
        ("°R", 491.67, 273.15),
        ("degR", 527.67, 293.15),
    ] {
        let u = parse_unit(text).expect(text);
        assert_eq!(u.kind, TempKind::Absolute, "{text}");
        assert_eq!(u.offset, 0.0);
        let q = u.to_si(v);
        assert_eq!((q.kind, q.dim), (TempKind::Absolute, Dim::TEMPERATURE));
        assert!(close(q.value, want, 1e-14), "{v} {text} = {}", q.value);
    }
}

#[test]
fn temperature_differences() {
    // NIST SP 811: a Fahrenheit (and Rankine) degree is 5/9 K; a Celsius degree is 1 K.
    for (text, v, want) in [
        ("Δ°F", 9.0, 5.0),
        ("∆°F", 9.0, 5.0),
        ("delta_degF", 1.8, 1.0),
        ("Δ°C", 5.0, 5.0),
        ("∆°C", 5.0, 5.0),
        ("delta_degC", 5.0, 5.0),
    ] {
        let u = parse_unit(text).expect(text);
        assert_eq!((u.kind, u.offset), (TempKind::Difference, 0.0), "{text}");
        let q = u.to_si(v);
        assert_eq!((q.kind, q.dim), (TempKind::Difference, Dim::TEMPERATURE));
        assert!(close(q.value, want, 1e-14), "{v} {text} = {}", q.value);
        assert!(close(u.from_si(want), v, 1e-14));
    }
    // A compound whose whole dimension is a temperature is a difference.
    for text in ["°F*m/m", "W*K/W", "(°C*s)/s"] {
        let u = parse_unit(text).expect(text);
        assert_eq!(
            (u.kind, u.dim, u.offset),
            (TempKind::Difference, Dim::TEMPERATURE, 0.0)
        );
    }
    assert!(close(si("°F*m/m", 9.0).value, 5.0, 1e-14));
}

#[test]
fn temperatures_inside_compounds_are_sizes_of_a_degree() {
    for text in [
        "W/(m*°C)",
        "W/(m*°F)",
        "°C^2",
        "1/°C",
        "°F/s",
        "K/W",
        "°R*m",
    ] {
        let u = parse_unit(text).expect(text);
        assert_eq!(u.kind, TempKind::NotTemperature, "{text}");
        assert_eq!(u.offset, 0.0, "{text}");
    }
    assert!(close(si("°F/s", 1.8).value, 1.0, 1e-14));
    assert!(close(si("W/(m*°F)", 1.0).value, 1.8, 1e-14));
    assert_eq!(si("°C^2", 1.0).dim, Dim::new(0, 0, 0, 2));
}

#[test]
fn not_temperature_kind_for_other_units() {
    for text in ["m", "W", "kWh", "1/s", "Btu/h"] {
        assert_eq!(
            parse_unit(text).expect(text).kind,
            TempKind::NotTemperature,
            "{text}"
        );
    }
}

#[test]
fn to_si_from_si_round_trip_for_parsed_units() {
    for text in [
        "°F",
        "°C",
        "K",
        "°R",
        "Δ°F",
        "Btu/h",
        "h*ft^2*°F/Btu",
        "mm",
        "kWh",
        "lb/ft^3",
    ] {
        let u = parse_unit(text).expect(text);
        for v in [-40.0, 0.0, 0.5, 20.0, 1e4] {
            assert!(
                close(u.from_si(u.to_si(v).value) + 1.0, v + 1.0, 1e-13),
                "{text} {v}"
            );
        }
    }
}

#[test]
fn text_is_kept_as_written() {
    assert_eq!(parse_unit("W/(m*K)").expect("unit").text, "W/(m*K)");
    assert_eq!(parse_unit("m²").expect("unit").text, "m²");
}

#[test]
fn si_unit_texts_parse_back() {
    for d in [
        Dim::LENGTH,
        Dim::CONDUCTIVITY,
        Dim::HEAT_TRANSFER_COEFF,
        Dim::AREA_RESISTANCE,
        Dim::SPECIFIC_HEAT,
        Dim::VOLUMETRIC_POWER,
        Dim::new(1, 1, -1, 0),
        Dim::new(0, 0, -1, 0),
        Dim::new(-1, -1, 0, -1),
        Dim::new(3, -2, 4, -5),
    ] {
        let u = parse_unit(&d.si_unit()).expect("si unit text");
        assert_eq!((u.dim, u.scale), (d, 1.0), "{}", d.si_unit());
    }
    assert_eq!(parse_unit("1").expect("1").dim, Dim::NONE);
}

#[test]
fn unit_spellings_are_listed() {
    let all: Vec<_> = unit_spellings().collect();
    assert!(all.contains(&("Btu", "British thermal unit (International Table)")));
    assert!(all.iter().all(|(s, _)| parse_unit(s).is_ok()));
}

/// Independent reference: tests/reference/units_pint.json, written by
/// tests/reference/units_pint.py with the Python library pint 0.25.3 (the version is also
/// recorded in the file). Each conversion must agree to a relative 1e-12.
#[test]
fn pint_reference() {
    let text = include_str!("../../../tests/reference/units_pint.json");
    let json: serde_json::Value = serde_json::from_str(text).expect("valid JSON");
    assert_eq!(json["library"], "pint");
    assert!(json["pint_version"].as_str().is_some());
    let rows = json["conversions"].as_array().expect("conversions");
    assert!(rows.len() >= 25, "only {} conversions", rows.len());
    for row in rows {
        let unit = row["unit"].as_str().expect("unit");
        let value = row["value"].as_f64().expect("value");
        let want = row["si_value"].as_f64().expect("si_value");
        let q = si(unit, value);
        assert!(
            close(q.value, want, 1e-12),
            "{value} {unit}: ours {} pint {want}",
            q.value
        );
        assert_eq!(
            q.dim.si_unit(),
            row["si_unit"].as_str().expect("si_unit"),
            "{unit}"
        );
    }
}
