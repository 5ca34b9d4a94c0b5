#!/usr/bin/env python3
"""Independent reference for Caloris unit conversions, computed with the `pint` library.

Writes tests/reference/units_pint.json: for each case, the unit in Caloris spelling, a value,
the value converted by pint to SI base units, and the SI unit text Caloris is expected to show
for that dimension. The Rust test `units::tests::pint_reference` reads the JSON.

pint spellings: the International Table Btu is `Btu_it` (pint's plain `Btu` is 1055.056 J),
the International Table calorie is `cal_it` (pint's `kilocalorie` is thermochemical, so kcal is
written `kilocal_it`), and a Fahrenheit degree inside a compound unit is `delta_degF`.

Usage:  pip install pint && python3 tests/reference/units_pint.py
"""

import json
import pathlib

import pint

# (Caloris unit, value, pint unit, pint SI target, SI unit text Caloris shows)
CASES = [
    ("in", 1.0, "inch", "m", "m"),
    ("ft", 1.0, "foot", "m", "m"),
    ("yd", 1.0, "yard", "m", "m"),
    ("mi", 1.0, "mile", "m", "m"),
    ("mm", 12.5, "millimeter", "m", "m"),
    ("µm", 250.0, "micrometer", "m", "m"),
    ("ft²", 1.0, "foot ** 2", "m ** 2", "m²"),
    ("ft^3", 1.0, "foot ** 3", "m ** 3", "m³"),
    ("L", 1.0, "liter", "m ** 3", "m³"),
    ("lb", 1.0, "pound", "kg", "kg"),
    ("min", 1.0, "minute", "s", "s"),
    ("d", 1.0, "day", "s", "s"),
    ("Btu", 1.0, "Btu_it", "J", "J"),
    ("cal", 1.0, "cal_it", "J", "J"),
    ("kcal", 1.0, "kilocal_it", "J", "J"),
    ("kWh", 1.0, "kilowatt_hour", "J", "J"),
    ("Btu/h", 1.0, "Btu_it / hour", "W", "W"),
    ("Btu/(h*ft^2)", 1.0, "Btu_it / hour / foot ** 2", "W / m ** 2", "W/m²"),
    ("h*ft^2*°F/Btu", 1.0, "hour * foot ** 2 * delta_degF / Btu_it", "m ** 2 * K / W", "m²·K/W"),
    ("h·°F/Btu", 1.0, "hour * delta_degF / Btu_it", "K / W", "K/W"),
    ("Btu/(h*ft*°F)", 1.0, "Btu_it / (hour * foot * delta_degF)", "W / (m * K)", "W/(m·K)"),
    ("Btu/(h*ft²*°F)", 1.0, "Btu_it / (hour * foot ** 2 * delta_degF)", "W / (m ** 2 * K)", "W/(m²·K)"),
    ("Btu/(h·°F)", 1.0, "Btu_it / (hour * delta_degF)", "W / K", "W/K"),
    ("Btu/°F", 1.0, "Btu_it / delta_degF", "J / K", "J/K"),
    ("Btu/(lb*°F)", 1.0, "Btu_it / (pound * delta_degF)", "J / (kg * K)", "J/(kg·K)"),
    ("lb/ft^3", 1.0, "pound / foot ** 3", "kg / m ** 3", "kg/m³"),
    ("cm^2*K/W", 0.2, "centimeter ** 2 * K / W", "m ** 2 * K / W", "m²·K/W"),
    ("kPa", 101.325, "kilopascal", "Pa", "Pa"),
    ("°F", 68.0, "degF", "K", "K"),
    ("°F", 32.0, "degF", "K", "K"),
    ("°F", 212.0, "degF", "K", "K"),
    ("°F", -40.0, "degF", "K", "K"),
    ("degC", 20.0, "degC", "K", "K"),
    ("°R", 491.67, "degR", "K", "K"),
    ("Δ°F", 9.0, "delta_degF", "K", "K"),
    ("delta_degC", 5.0, "delta_degC", "K", "K"),
]


def main() -> None:
    ureg = pint.UnitRegistry()
    rows = []
    for ours, value, theirs, target, si_text in CASES:
        si = ureg.Quantity(value, theirs).to(target).magnitude
        rows.append(
            {
                "unit": ours,
                "value": value,
                "si_value": float(si),
                "si_unit": si_text,
                "pint_unit": theirs,
            }
        )
    out = {
        "generated_by": "tests/reference/units_pint.py",
        "library": "pint",
        "pint_version": pint.__version__,
        "conversions": rows,
    }
    path = pathlib.Path(__file__).with_name("units_pint.json")
    path.write_text(json.dumps(out, indent=2, ensure_ascii=False) + "\n", encoding="utf-8")
    print(f"wrote {len(rows)} conversions with pint {pint.__version__} to {path}")


if __name__ == "__main__":
    main()
