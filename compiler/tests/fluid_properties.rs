//! Fluid properties against the outside references they come from, at points between the
//! table's temperatures: CoolProp 8.0.0 for dry air (Lemmon et al. 2000 equation of state,
//! Lemmon–Jacobsen 2004 transport) and iapws 1.5.5 for liquid water (IAPWS-95, IAPWS 2008
//! viscosity, IAPWS 2011 conductivity). The points were written by
//! tests/reference/gen_fluids.py, which also checked iapws against CoolProp's own water.

use caloris_compiler::fluid::{Fluid, ATMOSPHERE};
use serde_json::Value;

fn points(key: &str) -> Vec<Value> {
    let text = std::fs::read_to_string(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/../tests/reference/fluids/points.json"
    ))
    .expect("tests/reference/fluids/points.json");
    let v: Value = serde_json::from_str(&text).expect("valid JSON");
    v[key].as_array().expect("a list of points").clone()
}

fn check(fluid: Fluid, key: &str, tolerance: [f64; 5]) -> usize {
    let names = [
        "density",
        "specific heat",
        "viscosity",
        "conductivity",
        "expansion",
    ];
    let mut n = 0;
    for p in points(key) {
        let t = p["T"].as_f64().expect("T");
        let want: Vec<f64> = p["values"]
            .as_array()
            .expect("values")
            .iter()
            .map(|x| x.as_f64().expect("number"))
            .collect();
        let (got, outside) = fluid.properties(t);
        assert!(outside.is_none(), "{key} at {t} K is inside the range");
        let got = [
            got.density,
            got.specific_heat,
            got.viscosity,
            got.conductivity,
            got.expansion,
        ];
        for i in 0..5 {
            let rel = (got[i] - want[i]).abs() / want[i].abs().max(1e-12);
            // β passes through zero near 4 °C in water: there it is compared to 1e-9 1/K.
            let floor = if i == 4 { 1e-9 } else { 0.0 };
            assert!(
                (got[i] - want[i]).abs() <= tolerance[i] * want[i].abs() + floor,
                "{key} {} at {t} K: {} against {} ({}), relative {rel:.2e}",
                names[i],
                got[i],
                want[i],
                p["source"]
            );
        }
        n += 1;
    }
    n
}

#[test]
fn air_at_one_atmosphere_matches_coolprop() {
    let air = Fluid::Air {
        pressure: ATMOSPHERE,
    };
    assert_eq!(check(air, "air", [1e-7; 5]), 12);
}

#[test]
fn air_at_two_bar_is_within_the_stated_ideal_gas_scaling() {
    // The module states 0.4 % from 0.1 to 2 bar against CoolProp's real gas.
    let air = Fluid::Air { pressure: 2e5 };
    assert_eq!(check(air, "air_2bar", [4e-3, 4e-3, 4e-3, 4e-3, 1e-2]), 3);
}

#[test]
fn liquid_water_matches_iapws() {
    let n = check(Fluid::Water, "water", [1e-6, 1e-6, 1e-6, 1e-6, 1e-4]);
    assert_eq!(n, 12);
}
