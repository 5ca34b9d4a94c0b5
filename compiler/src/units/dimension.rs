//! Dimensions: exponents of the four base dimensions Caloris needs (length, mass, time,
//! temperature), their analyst-facing names and their SI unit text.

use serde::Serialize;

/// Exponents of the base dimensions. SI base units: m, kg, s, K.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, Default, Serialize)]
pub struct Dim {
    pub length: i8,
    pub mass: i8,
    pub time: i8,
    pub temperature: i8,
}

impl Dim {
    /// A dimension from its exponents of length, mass, time and temperature.
    pub const fn new(length: i8, mass: i8, time: i8, temperature: i8) -> Dim {
        Dim {
            length,
            mass,
            time,
            temperature,
        }
    }

    pub const NONE: Dim = Dim::new(0, 0, 0, 0);
    pub const LENGTH: Dim = Dim::new(1, 0, 0, 0);
    pub const AREA: Dim = Dim::new(2, 0, 0, 0);
    pub const VOLUME: Dim = Dim::new(3, 0, 0, 0);
    pub const TIME: Dim = Dim::new(0, 0, 1, 0);
    pub const MASS: Dim = Dim::new(0, 1, 0, 0);
    pub const TEMPERATURE: Dim = Dim::new(0, 0, 0, 1);
    /// W = kg·m²/s³
    pub const POWER: Dim = Dim::new(2, 1, -3, 0);
    /// J = kg·m²/s²
    pub const ENERGY: Dim = Dim::new(2, 1, -2, 0);
    /// W/(m·K)
    pub const CONDUCTIVITY: Dim = Dim::new(1, 1, -3, -1);
    /// W/(m·K²): how a conductivity changes with temperature (`k_slope` of a linear k(T)).
    pub const CONDUCTIVITY_SLOPE: Dim = Dim::new(1, 1, -3, -2);
    /// W/(m²·K), also the U-value
    pub const HEAT_TRANSFER_COEFF: Dim = Dim::new(0, 1, -3, -1);
    /// m²·K/W
    pub const AREA_RESISTANCE: Dim = Dim::new(0, -1, 3, 1);
    /// K/W
    pub const RESISTANCE: Dim = Dim::new(-2, -1, 3, 1);
    /// W/K
    pub const CONDUCTANCE: Dim = Dim::new(2, 1, -3, -1);
    /// W/m²
    pub const HEAT_FLUX: Dim = Dim::new(0, 1, -3, 0);
    /// kg/m³
    pub const DENSITY: Dim = Dim::new(-3, 1, 0, 0);
    /// J/(kg·K)
    pub const SPECIFIC_HEAT: Dim = Dim::new(2, 0, -2, -1);
    /// J/K
    pub const CAPACITY: Dim = Dim::new(2, 1, -2, -1);
    /// W/m³
    pub const VOLUMETRIC_POWER: Dim = Dim::new(-1, 1, -3, 0);
    /// W/m: heat flow per metre of pipe.
    pub const LINEAR_HEAT_FLOW: Dim = Dim::new(1, 1, -3, 0);
    /// m/s
    pub const VELOCITY: Dim = Dim::new(1, 0, -1, 0);
    /// N = kg·m/s²
    pub const FORCE: Dim = Dim::new(1, 1, -2, 0);
    /// Pa = kg/(m·s²)
    pub const PRESSURE: Dim = Dim::new(-1, 1, -2, 0);
    /// kg/s
    pub const MASS_FLOW: Dim = Dim::new(0, 1, -1, 0);
    /// m³/s
    pub const VOLUME_FLOW: Dim = Dim::new(3, 0, -1, 0);

    /// Product of two dimensions (exponents add; saturates at the i8 range, see
    /// [`Dim::checked_mul`] to detect that).
    #[allow(clippy::should_implement_trait)] // also implemented: `std::ops::Mul`
    pub fn mul(self, o: Dim) -> Dim {
        Dim {
            length: self.length.saturating_add(o.length),
            mass: self.mass.saturating_add(o.mass),
            time: self.time.saturating_add(o.time),
            temperature: self.temperature.saturating_add(o.temperature),
        }
    }

    /// Quotient of two dimensions (exponents subtract; saturates like [`Dim::mul`]).
    #[allow(clippy::should_implement_trait)] // also implemented: `std::ops::Div`
    pub fn div(self, o: Dim) -> Dim {
        Dim {
            length: self.length.saturating_sub(o.length),
            mass: self.mass.saturating_sub(o.mass),
            time: self.time.saturating_sub(o.time),
            temperature: self.temperature.saturating_sub(o.temperature),
        }
    }

    /// Product, or `None` when an exponent leaves the i8 range.
    pub fn checked_mul(self, o: Dim) -> Option<Dim> {
        Some(Dim {
            length: self.length.checked_add(o.length)?,
            mass: self.mass.checked_add(o.mass)?,
            time: self.time.checked_add(o.time)?,
            temperature: self.temperature.checked_add(o.temperature)?,
        })
    }

    /// Quotient, or `None` when an exponent leaves the i8 range.
    pub fn checked_div(self, o: Dim) -> Option<Dim> {
        Some(Dim {
            length: self.length.checked_sub(o.length)?,
            mass: self.mass.checked_sub(o.mass)?,
            time: self.time.checked_sub(o.time)?,
            temperature: self.temperature.checked_sub(o.temperature)?,
        })
    }

    /// Integer power; `None` when an exponent leaves the i8 range.
    pub fn powi(self, n: i32) -> Option<Dim> {
        let p = |e: i8| -> Option<i8> { i8::try_from(i32::from(e).checked_mul(n)?).ok() };
        Some(Dim {
            length: p(self.length)?,
            mass: p(self.mass)?,
            time: p(self.time)?,
            temperature: p(self.temperature)?,
        })
    }

    /// Integer root; `None` if `n` is not positive or an exponent is not divisible by `n`.
    pub fn root(self, n: i32) -> Option<Dim> {
        if n <= 0 {
            return None;
        }
        let r = |e: i8| -> Option<i8> {
            let e = i32::from(e);
            if e % n == 0 {
                i8::try_from(e / n).ok()
            } else {
                None
            }
        };
        Some(Dim {
            length: r(self.length)?,
            mass: r(self.mass)?,
            time: r(self.time)?,
            temperature: r(self.temperature)?,
        })
    }

    /// True for a dimensionless quantity.
    pub fn is_none(self) -> bool {
        self == Dim::NONE
    }

    /// The analyst's word for this dimension; `None` if it has no common name.
    pub fn name(self) -> Option<&'static str> {
        named(self).map(|n| n.name)
    }

    /// The SI unit text used in messages and output (`"W/(m²·K)"`); for dimensions without a
    /// named unit a product of base units such as `"kg·m²/s³"`. Dimensionless gives `"1"`.
    pub fn si_unit(self) -> String {
        match named(self) {
            Some(n) => n.si.to_string(),
            None => trade_unit_text(self),
        }
    }

    /// Message text: `"a power (W)"`, `"an area (m²)"`, `"a dimensionless number"`, or
    /// `"a quantity in kg·m/s"` when the dimension has no common name.
    pub fn describe(self) -> String {
        if self.is_none() {
            return "a dimensionless number".to_string();
        }
        match named(self) {
            Some(n) => {
                let article = match n.name.chars().next() {
                    Some('a' | 'e' | 'i' | 'o' | 'u') => "an",
                    _ => "a",
                };
                format!("{article} {} ({})", n.name, n.si)
            }
            None => format!("a quantity in {}", trade_unit_text(self)),
        }
    }
}

impl std::ops::Mul for Dim {
    type Output = Dim;
    fn mul(self, o: Dim) -> Dim {
        Dim::mul(self, o)
    }
}

impl std::ops::Div for Dim {
    type Output = Dim;
    fn div(self, o: Dim) -> Dim {
        Dim::div(self, o)
    }
}

impl std::fmt::Display for Dim {
    /// Writes the SI unit text, as [`Dim::si_unit`].
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.write_str(&self.si_unit())
    }
}

struct Named {
    dim: Dim,
    name: &'static str,
    si: &'static str,
}

const NAMED: &[Named] = &[
    Named {
        dim: Dim::LINEAR_HEAT_FLOW,
        name: "heat flow per length",
        si: "W/m",
    },
    Named {
        dim: Dim::NONE,
        name: "dimensionless",
        si: "1",
    },
    Named {
        dim: Dim::LENGTH,
        name: "length",
        si: "m",
    },
    Named {
        dim: Dim::AREA,
        name: "area",
        si: "m²",
    },
    Named {
        dim: Dim::VOLUME,
        name: "volume",
        si: "m³",
    },
    Named {
        dim: Dim::TIME,
        name: "time",
        si: "s",
    },
    Named {
        dim: Dim::MASS,
        name: "mass",
        si: "kg",
    },
    Named {
        dim: Dim::TEMPERATURE,
        name: "temperature",
        si: "K",
    },
    Named {
        dim: Dim::POWER,
        name: "power",
        si: "W",
    },
    Named {
        dim: Dim::ENERGY,
        name: "energy",
        si: "J",
    },
    Named {
        dim: Dim::CONDUCTIVITY,
        name: "thermal conductivity",
        si: "W/(m·K)",
    },
    Named {
        dim: Dim::CONDUCTIVITY_SLOPE,
        name: "conductivity slope",
        si: "W/(m·K²)",
    },
    Named {
        dim: Dim::HEAT_TRANSFER_COEFF,
        name: "heat transfer coefficient",
        si: "W/(m²·K)",
    },
    Named {
        dim: Dim::AREA_RESISTANCE,
        name: "area-specific thermal resistance",
        si: "m²·K/W",
    },
    Named {
        dim: Dim::RESISTANCE,
        name: "thermal resistance",
        si: "K/W",
    },
    Named {
        dim: Dim::CONDUCTANCE,
        name: "thermal conductance",
        si: "W/K",
    },
    Named {
        dim: Dim::HEAT_FLUX,
        name: "heat flux",
        si: "W/m²",
    },
    Named {
        dim: Dim::DENSITY,
        name: "density",
        si: "kg/m³",
    },
    Named {
        dim: Dim::SPECIFIC_HEAT,
        name: "specific heat capacity",
        si: "J/(kg·K)",
    },
    Named {
        dim: Dim::CAPACITY,
        name: "heat capacity",
        si: "J/K",
    },
    Named {
        dim: Dim::VOLUMETRIC_POWER,
        name: "volumetric power",
        si: "W/m³",
    },
    Named {
        dim: Dim::VELOCITY,
        name: "velocity",
        si: "m/s",
    },
    Named {
        dim: Dim::FORCE,
        name: "force",
        si: "N",
    },
    Named {
        dim: Dim::PRESSURE,
        name: "pressure",
        si: "Pa",
    },
    Named {
        dim: Dim::MASS_FLOW,
        name: "mass flow rate",
        si: "kg/s",
    },
    Named {
        dim: Dim::VOLUME_FLOW,
        name: "volume flow rate",
        si: "m³/s",
    },
];

fn named(d: Dim) -> Option<&'static Named> {
    NAMED.iter().find(|n| n.dim == d)
}

/// Superscript digits for an exponent (`2` → `²`, `-1` → `⁻¹`).
pub(crate) fn superscript(n: i32) -> String {
    let mut s = String::new();
    if n < 0 {
        s.push('⁻');
    }
    for c in n.unsigned_abs().to_string().chars() {
        s.push(match c {
            '0' => '⁰',
            '1' => '¹',
            '2' => '²',
            '3' => '³',
            '4' => '⁴',
            '5' => '⁵',
            '6' => '⁶',
            '7' => '⁷',
            '8' => '⁸',
            _ => '⁹',
        });
    }
    s
}

/// The dimension in the trade's units: heat as W (J where one second per watt is left over),
/// then m, s and K — `W/(m·K²)` for a conductivity slope rather than `kg·m/(s³·K²)`. A
/// dimension without mass keeps the base units (`m/s`, `1/K`). The text parses back with
/// [`crate::units::parse_unit`] to the same dimension at scale 1.
pub(crate) fn trade_unit_text(d: Dim) -> String {
    let w = i32::from(d.mass);
    if w == 0 {
        return base_unit_text(d);
    }
    // Every kilogram comes with m²/s³ in a watt.
    let length = i32::from(d.length) - 2 * w;
    let time = i32::from(d.time) + 3 * w;
    let heat = match time {
        0 => "W",
        t if t == w => "J",
        // Seconds left over on both sides (a momentum, a viscosity): not a heat quantity, and
        // the base units read better.
        _ => return base_unit_text(d),
    };
    let time = 0;
    unit_text(&[
        (heat, w),
        ("m", length),
        ("s", time),
        ("K", i32::from(d.temperature)),
    ])
}

/// The dimension written as a product of SI base units: `kg·m²/s³`, `1/s`, `m/(kg·K)`.
/// The text parses back with [`crate::units::parse_unit`] to the same dimension at scale 1.
pub(crate) fn base_unit_text(d: Dim) -> String {
    unit_text(&[
        ("kg", i32::from(d.mass)),
        ("m", i32::from(d.length)),
        ("s", i32::from(d.time)),
        ("K", i32::from(d.temperature)),
    ])
}

/// Factors with their exponents as `a·b²/(c·d³)`; `1` when every exponent is zero.
fn unit_text(parts: &[(&str, i32)]) -> String {
    let factor = |sym: &str, e: i32| -> String {
        if e == 1 {
            sym.to_string()
        } else {
            format!("{sym}{}", superscript(e))
        }
    };
    let num: Vec<String> = parts
        .iter()
        .filter(|(_, e)| *e > 0)
        .map(|(s, e)| factor(s, *e))
        .collect();
    let den: Vec<String> = parts
        .iter()
        .filter(|(_, e)| *e < 0)
        .map(|(s, e)| factor(s, -*e))
        .collect();
    let num_text = if num.is_empty() {
        "1".to_string()
    } else {
        num.join("·")
    };
    match den.len() {
        0 => num_text,
        1 => format!("{num_text}/{}", den[0]),
        _ => format!("{num_text}/({})", den.join("·")),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn constants_are_consistent_products() {
        let w = Dim::POWER;
        let m = Dim::LENGTH;
        let k = Dim::TEMPERATURE;
        assert_eq!(Dim::ENERGY, w.mul(Dim::TIME));
        assert_eq!(Dim::CONDUCTIVITY, w.div(m.mul(k)));
        assert_eq!(Dim::HEAT_TRANSFER_COEFF, w.div(Dim::AREA.mul(k)));
        assert_eq!(Dim::AREA_RESISTANCE, Dim::AREA.mul(k).div(w));
        assert_eq!(Dim::RESISTANCE, k.div(w));
        assert_eq!(Dim::CONDUCTANCE, w.div(k));
        assert_eq!(Dim::HEAT_FLUX, w.div(Dim::AREA));
        assert_eq!(Dim::DENSITY, Dim::MASS.div(Dim::VOLUME));
        assert_eq!(Dim::SPECIFIC_HEAT, Dim::ENERGY.div(Dim::MASS.mul(k)));
        assert_eq!(Dim::CAPACITY, Dim::ENERGY.div(k));
        assert_eq!(Dim::VOLUMETRIC_POWER, w.div(Dim::VOLUME));
        assert_eq!(Dim::AREA, m.powi(2).expect("m²"));
        assert_eq!(Dim::VOLUME, m.mul(m).mul(m));
        assert_eq!(Dim::VOLUME, m * m * m);
        assert_eq!(Dim::RESISTANCE, k / w);
        // R = L / (k·A) is a thermal resistance; U = 1/R″.
        assert_eq!(Dim::RESISTANCE, m.div(Dim::CONDUCTIVITY.mul(Dim::AREA)));
        assert_eq!(
            Dim::HEAT_TRANSFER_COEFF,
            Dim::NONE.div(Dim::AREA_RESISTANCE)
        );
    }

    #[test]
    fn powers_and_roots() {
        assert_eq!(Dim::AREA.root(2), Some(Dim::LENGTH));
        assert_eq!(Dim::VOLUME.root(3), Some(Dim::LENGTH));
        assert_eq!(Dim::VOLUME.root(2), None);
        assert_eq!(Dim::AREA.root(0), None);
        assert_eq!(Dim::AREA.root(-2), None);
        assert_eq!(Dim::HEAT_FLUX.powi(-1), Some(Dim::new(0, -1, 3, 0)));
        assert_eq!(Dim::LENGTH.powi(0), Some(Dim::NONE));
        assert_eq!(Dim::LENGTH.powi(127), Some(Dim::new(127, 0, 0, 0)));
        assert_eq!(Dim::LENGTH.powi(128), None);
        assert_eq!(Dim::AREA.powi(100), None);
        assert_eq!(Dim::LENGTH.powi(i32::MAX), None);
        assert_eq!(Dim::NONE.powi(i32::MAX), Some(Dim::NONE));
    }

    #[test]
    fn overflow_saturates_or_is_reported() {
        let big = Dim::new(100, 0, 0, 0);
        assert_eq!(big.checked_mul(big), None);
        assert_eq!(big.mul(big).length, 127);
        assert_eq!(big.checked_div(big), Some(Dim::NONE));
        assert_eq!(Dim::new(-100, 0, 0, 0).checked_div(big), None);
    }

    #[test]
    fn names() {
        assert_eq!(Dim::NONE.name(), Some("dimensionless"));
        assert!(Dim::NONE.is_none());
        assert!(!Dim::LENGTH.is_none());
        assert_eq!(Dim::LENGTH.name(), Some("length"));
        assert_eq!(Dim::AREA.name(), Some("area"));
        assert_eq!(Dim::POWER.name(), Some("power"));
        assert_eq!(Dim::CONDUCTIVITY.name(), Some("thermal conductivity"));
        assert_eq!(
            Dim::HEAT_TRANSFER_COEFF.name(),
            Some("heat transfer coefficient")
        );
        assert_eq!(Dim::RESISTANCE.name(), Some("thermal resistance"));
        assert_eq!(
            Dim::AREA_RESISTANCE.name(),
            Some("area-specific thermal resistance")
        );
        assert_eq!(Dim::TEMPERATURE.name(), Some("temperature"));
        assert_eq!(Dim::new(1, 1, 1, 1).name(), None);
        // Every named dimension is distinct.
        for (i, a) in NAMED.iter().enumerate() {
            for b in &NAMED[i + 1..] {
                assert_ne!(a.dim, b.dim, "{} and {}", a.name, b.name);
            }
        }
    }

    /// Dimensions without a name of their own are written in the trade's units.
    #[test]
    fn unnamed_dimensions_read_in_the_trades_units() {
        assert_eq!(Dim::CONDUCTIVITY_SLOPE.si_unit(), "W/(m·K²)");
        assert_eq!(Dim::new(0, 1, -3, -2).si_unit(), "W/(m²·K²)");
        assert_eq!(Dim::new(-1, 1, -2, -1).si_unit(), "J/(m³·K)");
        assert_eq!(Dim::new(1, 1, -1, 0).si_unit(), "kg·m/s");
        assert_eq!(Dim::new(0, 0, 0, -1).si_unit(), "1/K");
        assert!(Dim::CONDUCTIVITY_SLOPE.describe().contains("W/(m·K²)"));
        for d in [
            Dim::CONDUCTIVITY_SLOPE,
            Dim::new(-1, 1, -2, -1),
            Dim::new(3, 2, -6, -1),
        ] {
            let u = crate::units::parse_unit(&d.si_unit()).expect("parses");
            assert_eq!((u.dim, u.scale), (d, 1.0), "{}", d.si_unit());
        }
    }

    #[test]
    fn si_unit_texts() {
        assert_eq!(Dim::LENGTH.si_unit(), "m");
        assert_eq!(Dim::AREA.si_unit(), "m²");
        assert_eq!(Dim::POWER.si_unit(), "W");
        assert_eq!(Dim::CONDUCTIVITY.si_unit(), "W/(m·K)");
        assert_eq!(Dim::HEAT_TRANSFER_COEFF.si_unit(), "W/(m²·K)");
        assert_eq!(Dim::AREA_RESISTANCE.si_unit(), "m²·K/W");
        assert_eq!(Dim::RESISTANCE.si_unit(), "K/W");
        assert_eq!(Dim::CONDUCTANCE.si_unit(), "W/K");
        assert_eq!(Dim::SPECIFIC_HEAT.si_unit(), "J/(kg·K)");
        assert_eq!(Dim::NONE.si_unit(), "1");
        assert_eq!(Dim::new(2, 1, -3, 1).si_unit(), "W·K");
        assert_eq!(Dim::new(0, 0, -1, 0).si_unit(), "1/s");
        assert_eq!(Dim::new(-1, -1, 0, -1).si_unit(), "1/(kg·m·K)");
        assert_eq!(Dim::new(1, 1, -1, 0).si_unit(), "kg·m/s");
        assert_eq!(Dim::new(12, 0, 0, 0).si_unit(), "m¹²");
        assert_eq!(format!("{}", Dim::HEAT_FLUX), "W/m²");
    }

    #[test]
    fn descriptions() {
        assert_eq!(Dim::POWER.describe(), "a power (W)");
        assert_eq!(Dim::LENGTH.describe(), "a length (m)");
        assert_eq!(Dim::AREA.describe(), "an area (m²)");
        assert_eq!(Dim::ENERGY.describe(), "an energy (J)");
        assert_eq!(Dim::NONE.describe(), "a dimensionless number");
        assert_eq!(Dim::new(1, 1, -1, 0).describe(), "a quantity in kg·m/s");
        assert_eq!(
            Dim::CONDUCTIVITY.describe(),
            "a thermal conductivity (W/(m·K))"
        );
    }

    #[test]
    fn superscripts() {
        assert_eq!(superscript(2), "²");
        assert_eq!(superscript(-1), "⁻¹");
        assert_eq!(superscript(10), "¹⁰");
        assert_eq!(superscript(-128), "⁻¹²⁸");
    }
}
