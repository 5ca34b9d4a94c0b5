//! Extended surfaces: straight fins of rectangular section and pin fins of uniform section,
//! with an adiabatic or a convective tip (the classical closed-form solutions of the fin equation
//! θ'' = m²θ).
//!
//! The fin is a link from its base node to the fluid node: G = Q/θ_b, with θ_b the base excess
//! temperature. `count` identical fins act in parallel.
// Diagnostics are returned by value throughout the compiler; boxing them here alone would
// split the element API.
#![allow(clippy::result_large_err)]

use super::{material, q, show, ArgSpec, Args, Built, ElementKind, Figure};
use crate::diagnostic::Diagnostic;
use crate::network::FigureRule;
use crate::units::Dim;
use std::f64::consts::PI;

pub struct Fin;

/// Most identical fins one link may stand for (a typing slip must not pass as a count).
pub const MAX_COUNT: u32 = 1_000_000;

const FIN: &[ArgSpec] = &[
    material("the fin's material (gives k)").either("k"),
    q(
        "k",
        Dim::CONDUCTIVITY,
        "conductivity of the fin, instead of a material",
    )
    .either("material"),
    q("length", Dim::LENGTH, "length L from base to tip").required(),
    q(
        "thickness",
        Dim::LENGTH,
        "thickness t of a straight rectangular fin",
    )
    .either("diameter"),
    q(
        "width",
        Dim::LENGTH,
        "width w of a straight rectangular fin",
    )
    .either("diameter"),
    q(
        "diameter",
        Dim::LENGTH,
        "diameter D of a pin fin, instead of thickness and width",
    )
    .either("thickness"),
    q(
        "h",
        Dim::HEAT_TRANSFER_COEFF,
        "heat transfer coefficient on the fin's sides",
    )
    .required(),
    q(
        "tip_h",
        Dim::HEAT_TRANSFER_COEFF,
        "heat transfer coefficient on the tip",
    )
    .default("none: an adiabatic tip"),
    q("count", Dim::NONE, "number of identical fins in parallel")
        .count(MAX_COUNT)
        .default("1"),
];

/// The fin's solution at its arguments.
pub struct FinSolution {
    /// Conductance of all fins, W/K.
    pub conductance: f64,
    /// η = Q / (h·A_f), A_f the fin's convecting area (sides, plus tip when it convects).
    pub efficiency: f64,
    /// ε = Q / (h·A_c·θ_b): heat with the fin over heat from its base area without it.
    pub effectiveness: f64,
    /// m·L, the fin parameter.
    pub ml: f64,
    /// Biot number h·(t/2)/k (or h·(D/4)/k for a pin), for the 1-D assumption.
    pub biot: f64,
    /// θ_tip/θ_b: the tip's excess temperature over the base's, 1/cosh(mL) for an adiabatic
    /// tip and 1/(cosh mL + (h_tip/mk)·sinh mL) for a convective one.
    pub tip_ratio: f64,
    /// Number of identical fins the link stands for.
    pub count: f64,
    pub formula: String,
}

pub fn solve(a: &Args) -> Result<FinSolution, Diagnostic> {
    let example =
        "fin(aluminium, length = 30 mm, thickness = 1.5 mm, width = 40 mm, h = 25 W/(m^2*K))";
    let k = super::shell::conductivity(a, example)?;
    let l = a.require("length", "length = 30 mm")?;
    let h = a.require("h", "h = 25 W/(m^2*K)")?;
    let (ac, p, half_thickness, shape) = if a.get("diameter").is_some() {
        if a.get("thickness").is_some() || a.get("width").is_some() {
            let other = if a.get("thickness").is_some() {
                "thickness"
            } else {
                "width"
            };
            return Err(Diagnostic::error("E207", "a fin is either a pin (`diameter`) or a straight fin (`thickness` and `width`)", a.span(other))
                .with_label(format!("`{other}` given as well as `diameter`"))
                .with_secondary(a.span("diameter"), "`diameter` given here")
                .with_help("keep `diameter` for a pin fin, or `thickness` and `width` for a straight rectangular fin"));
        }
        let d = a.require("diameter", "diameter = 4 mm")?;
        (
            PI * d * d / 4.0,
            PI * d,
            d / 4.0,
            format!("pin D = {}", show(d, Dim::LENGTH)),
        )
    } else {
        if a.get("thickness").is_none() && a.get("width").is_none() {
            return Err(a.missing(&["diameter", "thickness"], example));
        }
        let t = a.require("thickness", "thickness = 1.5 mm")?;
        let w = a.require("width", "width = 40 mm")?;
        (
            t * w,
            2.0 * (w + t),
            t / 2.0,
            format!(
                "straight t = {}, w = {}",
                show(t, Dim::LENGTH),
                show(w, Dim::LENGTH)
            ),
        )
    };
    // A whole number from 1 to MAX_COUNT: checked with the arguments (`Range::Count`).
    let count = a.get("count").unwrap_or(1.0);
    let m = (h * p / (k * ac)).sqrt();
    let big_m = (h * p * k * ac).sqrt();
    let ml = m * l;
    // θ(L)/θ_b of the same closed-form solutions (θ = T − T_fluid).
    let tip_ratio = match a.get("tip_h") {
        None => 1.0 / ml.cosh(),
        Some(ht) => 1.0 / (ml.cosh() + ht / (m * k) * ml.sinh()),
    };
    let (g1, tip_text, a_f) = match a.get("tip_h") {
        None => (
            big_m * ml.tanh(),
            "adiabatic tip: G = √(hPkA_c)·tanh(mL)".to_string(),
            h * p * l,
        ),
        Some(ht) => {
            let r = ht / (m * k);
            (
                big_m * (ml.sinh() + r * ml.cosh()) / (ml.cosh() + r * ml.sinh()),
                format!("convective tip (h_tip = {}): G = √(hPkA_c)·(sinh mL + (h_tip/mk)·cosh mL)/(cosh mL + (h_tip/mk)·sinh mL)", show(ht, Dim::HEAT_TRANSFER_COEFF)),
                h * p * l + ht * ac,
            )
        }
    };
    let efficiency = g1 / a_f;
    let g = count * g1;
    Ok(FinSolution {
        conductance: g,
        efficiency,
        effectiveness: g1 / (h * ac),
        ml,
        biot: h * half_thickness / k,
        tip_ratio,
        count,
        formula: format!(
            "{shape}, L = {}, m = √(hP/(kA_c)) = {:.4} 1/m, mL = {ml:.4}; {tip_text}; η = {efficiency:.4}{}; R = {}",
            show(l, Dim::LENGTH),
            m,
            if count > 1.0 { format!(", {count} fins in parallel") } else { String::new() },
            show(1.0 / g, Dim::RESISTANCE)
        ),
    })
}

impl ElementKind for Fin {
    fn name(&self) -> &'static str {
        "fin"
    }
    fn summary(&self) -> &'static str {
        "straight or pin fin from base to fluid: G = √(hPkA_c)·tanh(mL) (adiabatic tip), efficiency reported"
    }
    fn params(&self) -> &'static [ArgSpec] {
        FIN
    }
    fn build(&self, a: &Args) -> Result<Built, Diagnostic> {
        let s = solve(a)?;
        Ok(Built {
            conductance: s.conductance,
            area: None,
            formula: s.formula.into(),
        })
    }
    fn figures(&self, a: &Args) -> Vec<Figure> {
        match solve(a) {
            Ok(s) => vec![
                Figure::number("fin_efficiency", s.efficiency),
                Figure::number("fin_effectiveness", s.effectiveness),
                Figure::number("fin_mL", s.ml),
                Figure::number("fin_biot", s.biot),
                Figure::number("fin_tip_ratio", s.tip_ratio),
            ],
            Err(_) => Vec::new(),
        }
    }
    fn solved_figures(&self, a: &Args) -> Vec<(&'static str, FigureRule)> {
        match solve(a) {
            // The link runs from the base node to the fluid node, so the base is its first end
            // and the tip lies between the two at θ_tip/θ_b.
            Ok(s) => vec![
                ("fin_base_temperature", FigureRule::FromTemperature),
                ("fin_tip_temperature", FigureRule::Between(s.tip_ratio)),
                ("fin_heat_flow_per_fin", FigureRule::HeatFlowOver(s.count)),
                ("fin_array_heat_flow", FigureRule::HeatFlowOver(1.0)),
            ],
            Err(_) => Vec::new(),
        }
    }
    fn warnings(&self, a: &Args) -> Vec<Diagnostic> {
        match solve(a) {
            // Common practice: the 1-D fin equation holds while h·(t/2)/k stays below about 0.1.
            Ok(s) if s.biot > 0.1 => vec![Diagnostic::warning(
                "W111",
                format!("the fin's Biot number h·(t/2)/k = {:.3} is above 0.1: the temperature across its thickness is not uniform, and the 1-D fin formula overstates its heat flow", s.biot),
                a.call_span,
            )
            .with_label("thick or poorly conducting fin")
            .with_help("check h and k; for such a fin use a 2-D `region` or a finer model")],
            _ => Vec::new(),
        }
    }
}

#[cfg(test)]
mod tests {
    use crate::source::NoImports;
    use crate::{analyze, Options};

    fn figure(src: &str, name: &str) -> f64 {
        let a = analyze("fin.heat", src, &NoImports, &Options::default());
        assert!(!a.has_errors(), "{:?}", a.diagnostics);
        a.network
            .figures
            .iter()
            .find(|f| f.name == name)
            .map(|f| f.value)
            .expect("figure reported")
    }

    const BASE: &str = "node b (fixed = 60 °C)\nnode air (fixed = 20 °C)\n";

    /// Fin efficiency of the adiabatic-tip solution: an adiabatic-tip fin has η = tanh(mL)/(mL).
    #[test]
    fn adiabatic_tip_efficiency_is_tanh_ml_over_ml() {
        let src = format!("{BASE}link f: b to air fin(k = 180 W/(m*K), length = 40 mm, thickness = 2 mm, width = 50 mm, h = 60 W/(m^2*K))\n");
        let (h, k, t, w, l) = (60.0f64, 180.0f64, 0.002f64, 0.05f64, 0.04f64);
        let ml = (h * 2.0 * (w + t) / (k * t * w)).sqrt() * l;
        assert!((figure(&src, "fin_efficiency") - ml.tanh() / ml).abs() < 1e-14);
        assert!((figure(&src, "fin_mL") - ml).abs() < 1e-12);
    }

    /// Corrected-length approximation: a convective tip is close to an adiabatic one of corrected length
    /// L_c = L + D/4 (pin); the approximation is within a few tenths of a percent here.
    #[test]
    fn convective_tip_matches_corrected_length_approximation() {
        let tip = figure(
            &format!("{BASE}link f: b to air fin(k = 16 W/(m*K), length = 25 mm, diameter = 3 mm, h = 40 W/(m^2*K), tip_h = 40 W/(m^2*K))\n"),
            "fin_efficiency",
        );
        let (h, k, d, l) = (40.0f64, 16.0f64, 0.003f64, 0.025f64);
        let mlc = (4.0 * h / (k * d)).sqrt() * (l + d / 4.0);
        let approx = mlc.tanh() / mlc;
        assert!((tip / approx - 1.0).abs() < 5e-3, "{tip} vs {approx}");
    }
}
