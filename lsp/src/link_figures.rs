//! What hover and inlay hints say about links whose resistance is not one number (radiation,
//! k(T) conduction), the named figures of a link (a fin's efficiency) and a 2-D region's
//! solved field. Values come from the compiler's network and solution; nothing is computed
//! here beyond reading them.

use crate::display::{both, point, q};
use caloris_compiler::network::{Link, LinkLaw, Network};
use caloris_compiler::region::Region;
use caloris_compiler::results::Solution;
use caloris_compiler::units::{format_number, Dim, Quantity, UnitSystem};
use std::fmt::Write;

/// Why a link's resistance depends on its end temperatures; `None` for a linear link.
pub fn nonlinear_reason(link: &Link) -> Option<&'static str> {
    match link.law {
        LinkLaw::Linear { .. } => None,
        LinkLaw::Radiation { .. } => Some("radiation is nonlinear"),
        LinkLaw::Conduction { .. } => Some("the conductivity depends on temperature"),
        LinkLaw::Convection(_) => Some("the film coefficient depends on the temperatures"),
    }
}

/// The resistance line of a link's hover.
pub fn resistance_line(link: &Link, sol: Option<&Solution>, sys: UnitSystem) -> String {
    let reason = nonlinear_reason(link);
    let g = match (sol, reason) {
        (_, None) => link.conductance(),
        (Some(sol), Some(_)) => link.conductance_at(&sol.temperatures),
        (None, Some(reason)) => {
            return format!(
                "Resistance depends on the end temperatures ({reason}); it is shown once solved."
            )
        }
    };
    let mut out = format!(
        "Resistance **{}** · conductance {}",
        both(q(1.0 / g, Dim::RESISTANCE), sys),
        both(q(g, Dim::CONDUCTANCE), sys)
    );
    if let Some(reason) = reason {
        let _ = write!(out, " at the solved temperatures ({reason})");
    }
    out
}

/// `- \`fin_efficiency\` = 0.8312` lines for the link's named figures, those known before the
/// solve and, once solved, those at the solved temperatures (a fin's tip temperature), each in
/// both unit systems; or nothing.
pub fn figures(net: &Network, sol: Option<&Solution>, link: usize, sys: UnitSystem) -> String {
    let mut out = String::new();
    let solved = sol.map(|s| s.figures.as_slice()).unwrap_or_default();
    for f in net.figures.iter().chain(solved).filter(|f| f.link == link) {
        let shown = if f.dim.is_none() {
            format_number(f.value)
        } else {
            both(
                Quantity {
                    value: f.value,
                    dim: f.dim,
                    kind: f.kind,
                },
                sys,
            )
        };
        let _ = write!(out, "\n- `{}` = {shown}", f.name);
    }
    if out.is_empty() {
        out
    } else {
        format!("\n\nFigures:{out}")
    }
}

/// The groups and coefficients of a computed film at the solved temperatures, or nothing.
pub fn film(sol: &Solution, link: usize, sys: UnitSystem) -> String {
    let Some(f) = sol.films.iter().find(|f| f.link == link) else {
        return String::new();
    };
    let s = &f.state;
    let mut groups = Vec::new();
    for (name, v) in [("Re", s.reynolds), ("Gr", s.grashof), ("Ra", s.rayleigh)] {
        if let Some(v) = v {
            groups.push(format!("{name} = {}", format_number(v)));
        }
    }
    groups.push(format!("Pr = {}", format_number(s.prandtl)));
    groups.push(format!("Nu = {}", format_number(s.nusselt)));
    let mut out = format!(
        "\n\nFilm: {} in {} ({}), properties at {}\n- {}\n- h = {}",
        f.correlation,
        f.fluid,
        s.regime,
        both(point(s.property_temperature), sys),
        groups.join(" · "),
        both(q(s.h, Dim::HEAT_TRANSFER_COEFF), sys),
    );
    if s.h_radiation > 0.0 {
        let _ = write!(
            out,
            " · radiation h = {}\n- convection {} · radiation {}",
            both(q(s.h_radiation, Dim::HEAT_TRANSFER_COEFF), sys),
            both(q(s.q_convection, Dim::POWER), sys),
            both(q(s.q_radiation, Dim::POWER), sys),
        );
    }
    for (group, value, low, high) in &s.outside {
        let _ = write!(
            out,
            "\n- ⚠ {group} = {} is outside the correlation's range ({} … {})",
            format_number(*value),
            format_number(*low),
            format_number(*high)
        );
    }
    out
}

/// Size, cells and the solved temperature range of a region.
pub fn region(r: &Region, sol: Option<&Solution>, net: &Network, sys: UnitSystem) -> String {
    let mut out = format!(
        "**region** `{}` · {} × {}, {} thick · {} × {} = {} cells (`{}.i.j`, i from the left, j from the bottom)",
        r.name,
        both(q(r.width, Dim::LENGTH), sys),
        both(q(r.height, Dim::LENGTH), sys),
        both(q(r.thickness, Dim::LENGTH), sys),
        r.nx,
        r.ny,
        r.nx * r.ny,
        r.name,
    );
    let Some(sol) = sol else {
        return out;
    };
    let ((l, li, lj), (h, hi, hj)) = extremes(r, sol);
    let cell = |i: usize, j: usize| &net.nodes[r.cell(i, j)].name;
    let _ = write!(
        out,
        "\n\nLowest **{}** in `{}` · highest **{}** in `{}`",
        both(point(l), sys),
        cell(li, lj),
        both(point(h), sys),
        cell(hi, hj)
    );
    out
}

/// The coldest and the hottest cell: temperature, i and j.
fn extremes(r: &Region, sol: &Solution) -> ((f64, usize, usize), (f64, usize, usize)) {
    let mut lo = (f64::INFINITY, 1, 1);
    let mut hi = (f64::NEG_INFINITY, 1, 1);
    for j in 1..=r.ny {
        for i in 1..=r.nx {
            let t = sol.temperatures[r.cell(i, j)];
            if t < lo.0 {
                lo = (t, i, j);
            }
            if t > hi.0 {
                hi = (t, i, j);
            }
        }
    }
    (lo, hi)
}

/// The lowest and highest cell temperature of a solved region, K.
pub fn region_range(r: &Region, sol: &Solution) -> (f64, f64) {
    let (lo, hi) = extremes(r, sol);
    (lo.0, hi.0)
}
