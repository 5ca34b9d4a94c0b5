//! Properties of the fluids a convection film can name, as functions of temperature: dry air
//! at a stated pressure and liquid water.
//!
//! The values are the published reference formulations, tabulated by
//! `tests/reference/gen_fluids.py` into [`tables`] and interpolated here:
//! - air: the equation of state of Lemmon, Jacobsen, Penoncello and Friend (2000) and the
//!   viscosity and conductivity of Lemmon and Jacobsen (2004), as CoolProp 8.0.0 evaluates
//!   them, at one atmosphere from −50 °C to 400 °C. At another pressure the density scales as
//!   for an ideal gas (ρ ∝ p) and the other properties are those at one atmosphere; from 0.1 to
//!   2 bar that is within 0.4 % of the real-gas values (the generator measured it);
//! - water: IAPWS-95 (density, specific heat, expansion coefficient), the IAPWS 2008 viscosity
//!   and the IAPWS 2011 thermal conductivity, as `iapws` 1.5.5 evaluates them, for liquid at
//!   one atmosphere from 1 °C to 99.9 °C and saturated liquid above, to 181 °C.
//!
//! Cubic Hermite interpolation between tabulated values and slopes keeps every property and its
//! slope continuous, which Newton's method needs, and stays within 1e-7 relative of the
//! formulations for air and 1e-6 for water (the check points are in
//! tests/reference/fluids/points.json).

mod tables;

use serde::Serialize;

/// One atmosphere, Pa (the standard atmosphere, exact by definition).
pub const ATMOSPHERE: f64 = 101_325.0;

/// The pressures the air properties hold for, Pa.
pub const AIR_PRESSURE_RANGE: (f64, f64) = (0.1e5, 2.0e5);

/// A fluid a film can name.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub enum Fluid {
    /// Dry air at this absolute pressure, Pa.
    Air { pressure: f64 },
    /// Liquid water.
    Water,
}

/// The words the language uses for the fluids (`fluid = air`).
pub const FLUID_WORDS: &[&str] = &["air", "water"];

/// Properties at one temperature, SI units.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct Properties {
    /// kg/m³
    pub density: f64,
    /// J/(kg·K)
    pub specific_heat: f64,
    /// Dynamic viscosity, Pa·s.
    pub viscosity: f64,
    /// W/(m·K)
    pub conductivity: f64,
    /// Isobaric expansion coefficient β, 1/K (negative for water below about 4 °C).
    pub expansion: f64,
}

impl Properties {
    /// Kinematic viscosity ν = μ/ρ, m²/s.
    pub fn kinematic_viscosity(&self) -> f64 {
        self.viscosity / self.density
    }
    /// Thermal diffusivity α = k/(ρ·c_p), m²/s.
    pub fn diffusivity(&self) -> f64 {
        self.conductivity / (self.density * self.specific_heat)
    }
    /// Prandtl number Pr = c_p·μ/k.
    pub fn prandtl(&self) -> f64 {
        self.specific_heat * self.viscosity / self.conductivity
    }
}

/// Evenly spaced rows of (value, slope) pairs for the five properties.
pub struct Table {
    /// Temperature of the first row, K.
    pub first: f64,
    /// K between rows.
    pub step: f64,
    pub rows: &'static [[f64; 10]],
}

impl Table {
    pub fn range(&self) -> (f64, f64) {
        (
            self.first,
            self.first + self.step * (self.rows.len() - 1) as f64,
        )
    }

    /// Cubic Hermite interpolation; `t` is clamped into the table's range (callers check the
    /// range themselves, see [`Fluid::properties`]).
    fn at(&self, t: f64) -> [f64; 5] {
        let (lo, hi) = self.range();
        let t = t.clamp(lo, hi);
        let last = self.rows.len() - 2;
        let i = (((t - lo) / self.step).floor() as usize).min(last);
        let s = (t - (lo + i as f64 * self.step)) / self.step;
        let (a, b) = (&self.rows[i], &self.rows[i + 1]);
        let (h00, h10, h01, h11) = (
            (1.0 + 2.0 * s) * (1.0 - s) * (1.0 - s),
            s * (1.0 - s) * (1.0 - s),
            s * s * (3.0 - 2.0 * s),
            s * s * (s - 1.0),
        );
        let mut out = [0.0; 5];
        for (p, o) in out.iter_mut().enumerate() {
            let (v0, d0, v1, d1) = (a[2 * p], a[2 * p + 1], b[2 * p], b[2 * p + 1]);
            *o = h00 * v0 + h10 * self.step * d0 + h01 * v1 + h11 * self.step * d1;
        }
        out
    }
}

/// A temperature outside the range a fluid's properties hold for.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct OutOfRange {
    /// K
    pub temperature: f64,
    /// K
    pub low: f64,
    /// K
    pub high: f64,
}

impl Fluid {
    /// The word the language writes for the fluid.
    pub fn word(&self) -> &'static str {
        match self {
            Fluid::Air { .. } => "air",
            Fluid::Water => "water",
        }
    }

    /// What the model says, for formulas: `air at 1 atm`, `air at 0.8 bar`, `liquid water`.
    pub fn describe(&self) -> String {
        match self {
            Fluid::Air { pressure } if (pressure - ATMOSPHERE).abs() < 1e-9 => {
                "air at 1 atm".to_string()
            }
            Fluid::Air { pressure } => {
                format!("air at {} bar", crate::units::format_number(pressure / 1e5))
            }
            Fluid::Water => "liquid water".to_string(),
        }
    }

    fn table(&self) -> &'static Table {
        match self {
            Fluid::Air { .. } => &tables::AIR,
            Fluid::Water => &tables::WATER,
        }
    }

    /// The temperatures the properties hold for, K.
    pub fn range(&self) -> (f64, f64) {
        self.table().range()
    }

    /// Properties at `t` (kelvin). Outside the range the values at the nearest end are
    /// returned with the error, so a caller iterating towards an answer can go on and decide
    /// at the answer.
    pub fn properties(&self, t: f64) -> (Properties, Option<OutOfRange>) {
        let table = self.table();
        let (low, high) = table.range();
        let [density, specific_heat, viscosity, conductivity, expansion] = table.at(t);
        let density = match self {
            // Ideal-gas scaling from one atmosphere (see the module docs).
            Fluid::Air { pressure } => density * pressure / ATMOSPHERE,
            Fluid::Water => density,
        };
        let outside = (!(low..=high).contains(&t)).then_some(OutOfRange {
            temperature: t,
            low,
            high,
        });
        (
            Properties {
                density,
                specific_heat,
                viscosity,
                conductivity,
                expansion,
            },
            outside,
        )
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn interpolation_reproduces_the_table_rows() {
        for table in [&tables::AIR, &tables::WATER] {
            for (i, row) in table.rows.iter().enumerate() {
                let v = table.at(table.first + i as f64 * table.step);
                for p in 0..5 {
                    assert!((v[p] - row[2 * p]).abs() <= 1e-12 * row[2 * p].abs());
                }
            }
        }
    }

    #[test]
    fn air_prandtl_number_near_room_temperature() {
        // Dry air at 25 °C, 1 atm: Pr ≈ 0.707 (common practice, from memory).
        let (p, out) = Fluid::Air {
            pressure: ATMOSPHERE,
        }
        .properties(298.15);
        assert!(out.is_none());
        assert!((p.prandtl() - 0.707).abs() < 0.003, "{}", p.prandtl());
    }

    #[test]
    fn outside_the_range_is_reported() {
        let (_, out) = Fluid::Water.properties(270.0);
        let out = out.expect("below 1 °C");
        assert_eq!(out.low, 274.15);
    }
}
