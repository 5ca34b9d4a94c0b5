//! Thermal radiation between grey, diffuse surfaces: a surface to large surroundings, or two
//! surfaces that see each other through a view factor.
// Diagnostics are returned by value throughout the compiler; boxing them here alone would
// split the element API.
#![allow(clippy::result_large_err)]

use super::{q, show, ArgSpec, Args, Built, ElementKind};
use crate::diagnostic::Diagnostic;
use crate::laws::STEFAN_BOLTZMANN;
use crate::network::LinkLaw;
use crate::units::Dim;

/// Q = σ·A_x·(T_from⁴ − T_to⁴) with the radiative exchange area
/// A_x = 1 / [(1−ε₁)/(ε₁A₁) + 1/(A₁F₁₂) + (1−ε₂)/(ε₂A₂)]; for a small surface in large
/// surroundings (A₂ → ∞) A_x = ε₁A₁.
pub struct Radiation;

const RADIATION: &[ArgSpec] = &[
    q(
        "emissivity",
        Dim::NONE,
        "emissivity ε of the FROM surface: 0.9 for paint or glass, 0.05–0.2 for bright metal (common practice)",
    )
    .fraction()
    .required(),
    q("area", Dim::AREA, "area A of the FROM surface").required(),
    q(
        "emissivity_to",
        Dim::NONE,
        "emissivity of the TO surface, for two surfaces that see each other",
    )
    .fraction()
    .with("view_factor"),
    q("area_to", Dim::AREA, "area of the TO surface").with("emissivity_to"),
    q(
        "view_factor",
        Dim::NONE,
        "view factor F: the fraction of the radiation leaving the FROM surface that reaches the TO surface",
    )
    .fraction()
    .with("area_to"),
];

impl Radiation {
    /// The exchange area A_x (m²) and the formula text.
    fn exchange_area(&self, a: &Args) -> Result<(f64, String), Diagnostic> {
        let e1 = a.require("emissivity", "emissivity = 0.9")?;
        let a1 = a.require("area", "area = 1.5 m^2")?;
        // Emissivities and the view factor lie in 0 … 1: checked with the arguments
        // (`Range::Fraction`, E213).
        let pair = ["emissivity_to", "area_to", "view_factor"];
        let given: Vec<&str> = pair
            .iter()
            .copied()
            .filter(|n| a.get(n).is_some())
            .collect();
        if given.is_empty() {
            let ax = e1 * a1;
            return Ok((
                ax,
                format!(
                    "A_x = ε·A = {e1} × {} = {} (large surroundings)",
                    show(a1, Dim::AREA),
                    show(ax, Dim::AREA)
                ),
            ));
        }
        if given.len() < pair.len() {
            let missing: Vec<&str> = pair
                .iter()
                .copied()
                .filter(|n| a.get(n).is_none())
                .collect();
            let list = missing
                .iter()
                .map(|m| format!("`{m}`"))
                .collect::<Vec<_>>()
                .join(" and ");
            return Err(Diagnostic::error("E203", format!("radiation between two surfaces also needs {list}"), a.call_span)
                .with_label(format!("{list} missing"))
                .with_help("two surfaces that see each other need `emissivity_to`, `area_to` and `view_factor`; for a surface in large surroundings give only `emissivity` and `area`"));
        }
        let (e2, a2, f12) = (
            a.get("emissivity_to").unwrap_or(f64::NAN),
            a.get("area_to").unwrap_or(f64::NAN),
            a.get("view_factor").unwrap_or(f64::NAN),
        );
        // Reciprocity A₁F₁₂ = A₂F₂₁ with F₂₁ ≤ 1.
        if a1 * f12 > a2 * (1.0 + 1e-12) {
            return Err(Diagnostic::error(
                "E213",
                format!(
                    "A·F = {} is larger than `area_to` = {}: by reciprocity the view factor back would exceed 1",
                    show(a1 * f12, Dim::AREA),
                    show(a2, Dim::AREA)
                ),
                a.span("view_factor"),
            )
            .with_label("view factor too large for these areas")
            .with_secondary(a.span("area_to"), "area of the other surface")
            .with_help("check the view factor and the two areas: A₁·F₁₂ = A₂·F₂₁ and F₂₁ ≤ 1"));
        }
        let ax = 1.0 / ((1.0 - e1) / (e1 * a1) + 1.0 / (a1 * f12) + (1.0 - e2) / (e2 * a2));
        Ok((
            ax,
            format!(
                "A_x = 1/[(1−ε₁)/(ε₁A₁) + 1/(A₁F₁₂) + (1−ε₂)/(ε₂A₂)] with ε₁ = {e1}, A₁ = {}, F₁₂ = {f12}, ε₂ = {e2}, A₂ = {} → {}",
                show(a1, Dim::AREA),
                show(a2, Dim::AREA),
                show(ax, Dim::AREA)
            ),
        ))
    }
}

impl ElementKind for Radiation {
    fn name(&self) -> &'static str {
        "radiation"
    }
    fn summary(&self) -> &'static str {
        "grey-body radiation: Q = σ·A_x·(T₁⁴ − T₂⁴) (Stefan–Boltzmann law), nonlinear"
    }
    fn params(&self) -> &'static [ArgSpec] {
        RADIATION
    }
    fn build(&self, a: &Args) -> Result<Built, Diagnostic> {
        self.law(a).map(|(_, b)| b)
    }
    fn law(&self, a: &Args) -> Result<(LinkLaw, Built), Diagnostic> {
        let (ax, text) = self.exchange_area(a)?;
        // For reference only: the slope near room temperature; the solve uses the T⁴ law.
        let g_room = 4.0 * STEFAN_BOLTZMANN * ax * 293.15f64.powi(3);
        Ok((
            LinkLaw::Radiation { exchange_area: ax },
            Built {
                conductance: g_room,
                area: a.get("area"),
                formula: format!(
                    "Q = σ·A_x·(T₁⁴ − T₂⁴) in kelvin, σ = 5.670374419e-8 W/(m²·K⁴); {text}"
                )
                .into(),
            },
        ))
    }
}
