//! What a solve says about its computed films: the dimensionless groups and coefficients at
//! the solved temperatures, and the checks of each correlation's and fluid's range there.

use super::FilmState;
use crate::diagnostic::Diagnostic;
use crate::network::{LinkLaw, Network};
use crate::units::format_number;
use serde::Serialize;

/// One computed film at the solved temperatures.
#[derive(Clone, Debug, Serialize)]
pub struct FilmResult {
    pub link: usize,
    pub correlation: &'static str,
    pub fluid: String,
    #[serde(flatten)]
    pub state: FilmState,
}

/// The films of a network at node temperatures `t` (kelvin).
pub fn film_results(net: &Network, t: &[f64]) -> Vec<FilmResult> {
    net.links
        .iter()
        .enumerate()
        .filter_map(|(i, l)| match &l.law {
            LinkLaw::Convection(f) => Some(FilmResult {
                link: i,
                correlation: f.correlation.name(),
                fluid: f.fluid.describe(),
                state: f.state(t[l.from], t[l.to]),
            }),
            _ => None,
        })
        .collect()
}

fn range_text(low: f64, high: f64) -> String {
    match (low > 0.0, high.is_finite()) {
        (true, true) => format!("{} … {}", format_number(low), format_number(high)),
        (true, false) => format!("at least {}", format_number(low)),
        (false, true) => format!("up to {}", format_number(high)),
        (false, false) => "any value".to_string(),
    }
}

/// W110 for the radial build-ups whose outermost shell sits under a computed film, with the
/// film's h (convection and radiation together) at the solved temperatures.
pub fn critical_radius(net: &Network, films: &[FilmResult]) -> Vec<Diagnostic> {
    net.radius_checks
        .iter()
        .filter_map(|c| {
            let f = films.iter().find(|f| f.link == c.film)?;
            let h = f.state.h + f.state.h_radiation;
            crate::radial::critical_radius_diagnostic(
                &c.use_name,
                c.use_span,
                (&c.shell, c.shell_span),
                c.spherical,
                c.k,
                c.r_out,
                h,
                ", convection and radiation at the solved temperatures",
            )
        })
        .collect()
}

/// E505 for a film whose property temperature lies outside its fluid's range at the answer
/// (the answer used the properties at the range's end, so it is not reported); W120 for a
/// dimensionless group outside the correlation's range (the correlation is extrapolated; the
/// answer stands, with the warning); W121 for pipe flow in the transition between laminar and
/// turbulent, where the Nusselt number is interpolated.
pub fn checks(net: &Network, films: &[FilmResult]) -> Vec<Diagnostic> {
    let mut out = Vec::new();
    for f in films {
        let link = &net.links[f.link];
        if let Some(o) = f.state.properties_outside {
            out.push(
                Diagnostic::error(
                    "E505",
                    format!(
                        "the film `{}` needs the properties of {} at {:.2} °C, outside the range they hold for ({:.2} °C … {:.2} °C)",
                        link.name,
                        f.fluid,
                        o.temperature - 273.15,
                        o.low - 273.15,
                        o.high - 273.15
                    ),
                    link.span,
                )
                .with_label("fluid properties out of range at the solved temperatures")
                .with_help("no temperatures are reported; check the fixed temperatures and loads, or state the film's h directly with `film(h = …)`"),
            );
        }
        for &(group, value, low, high) in &f.state.outside {
            out.push(
                Diagnostic::warning(
                    "W120",
                    format!(
                        "`{}`: {group} = {} at the solved temperatures is outside the range of {} ({})",
                        link.name,
                        format_number(value),
                        f.correlation,
                        range_text(low, high)
                    ),
                    link.span,
                )
                .with_label(format!("{group} outside the correlation's range"))
                .with_help("the correlation is extrapolated: treat h as an estimate, or choose a correlation that covers this case (docs/elements.md lists each range)"),
            );
        }
        if f.state.regime == "transitional" {
            out.push(
                Diagnostic::warning(
                    "W121",
                    format!(
                        "`{}`: Re = {} lies between laminar (below 2300) and turbulent (from 3000) pipe flow; Nu is interpolated between the two",
                        link.name,
                        format_number(f.state.reynolds.unwrap_or(f64::NAN))
                    ),
                    link.span,
                )
                .with_label("transitional pipe flow")
                .with_help("transitional flow is unsteady and hard to predict; treat h as an estimate, or change the velocity or bore out of the transition"),
            );
        }
    }
    out
}
