//! Radial build-ups: the bore a link gives, the radius each shell starts at, and the critical
//! insulation radius check. Kept apart from elaboration so plane build-ups read as before.
// Diagnostics are returned by value throughout the compiler; boxing them here alone would
// split the element API.
#![allow(clippy::result_large_err)]

use crate::diagnostic::Diagnostic;
use crate::elements::{self, shell, shell::Geometry, Args, Built, ElementKind};
use crate::insulation_loss;
use crate::span::Span;
use crate::syntax::{BuildupElement, Ident};
use crate::units::Dim;
use std::f64::consts::PI;

/// What the link using a build-up supplies to its elements.
pub struct UseArgs {
    pub area: Option<(f64, Span)>,
    pub inner_radius: Option<(f64, Span)>,
    pub length: Option<(f64, Span)>,
}

impl UseArgs {
    /// Arguments supplied to the next element: the area, or the current radius (and length) of
    /// a radial build-up with the matching surface area for films and contacts.
    pub fn supplied(
        &self,
        geom: Geometry,
        radius: Option<(f64, Span)>,
    ) -> Vec<(&'static str, f64, Span)> {
        let mut v = Vec::new();
        match geom {
            Geometry::Plane => v.extend(self.area.map(|(a, s)| ("area", a, s))),
            Geometry::Cylinder => {
                if let Some((l, ls)) = self.length {
                    v.push(("length", l, ls));
                    v.extend(radius.map(|(r, rs)| ("area", 2.0 * PI * r * l, rs)));
                }
                v.extend(radius.map(|(r, rs)| ("inner_radius", r, rs)));
                // For computed films only (the caller filters): the surface's diameter.
                v.extend(radius.map(|(r, rs)| ("diameter", 2.0 * r, rs)));
            }
            Geometry::Sphere => {
                if let Some((r, rs)) = radius {
                    v.push(("inner_radius", r, rs));
                    v.push(("area", 4.0 * PI * r * r, rs));
                    v.push(("diameter", 2.0 * r, rs));
                }
            }
        }
        v
    }
}

/// The names [`UseArgs::supplied`] gives the elements of a build-up of this geometry, so that
/// the editor does not offer them inside one.
pub fn supplied_names(geom: Geometry) -> &'static [&'static str] {
    match geom {
        Geometry::Plane => &["area"],
        Geometry::Cylinder => &["length", "area", "inner_radius"],
        Geometry::Sphere => &["inner_radius", "area"],
    }
}

/// E210: an element states what the build-up's use supplies.
pub fn supplied_inside(name: &str, span: Span) -> Diagnostic {
    let help = if name == "area" {
        "remove `area` here and give it where the build-up is used: `link name: a to b my_buildup(area = 10 m^2)`".to_string()
    } else {
        format!("remove `{name}` here; the link that uses the build-up gives the bore (`inner_radius`, and `length` for a pipe), and each shell starts where the one before it ends")
    };
    Diagnostic::error(
        "E210",
        format!("an element of a build-up takes its {name} from the link that uses the build-up"),
        span,
    )
    .with_label(format!("{name} given inside a build-up"))
    .with_help(help)
}

/// Walks a build-up from the bore outwards.
pub struct Chain {
    geom: Geometry,
    /// The length of a cylindrical build-up, m.
    length: Option<f64>,
    /// The radius the next element starts at, with the span that set it.
    pub radius: Option<(f64, Span)>,
    /// The outermost shell so far: element index, k, outer radius.
    last_shell: Option<(usize, f64, f64)>,
    /// The film coefficient after the last shell, and that film's resistance.
    outer_h: Option<(f64, f64)>,
    /// Every shell so far, for the whole build-up's insulation check.
    shells: Vec<insulation_loss::Shell>,
    /// The resistance of every element that is neither a shell nor the outer film, K/W.
    other: f64,
    /// False once an element's resistance is unknown here (a computed film, a failed element):
    /// the insulation check then says nothing rather than guess.
    known: bool,
    /// The last element is a computed film: its h is known only once solved, so the outermost
    /// shell's critical radius is checked after the solve ([`Chain::pending_check`]).
    computed_outer: bool,
}

impl Chain {
    pub fn new(geom: Geometry, bore: Option<(f64, Span)>, length: Option<f64>) -> Chain {
        Chain {
            geom,
            length,
            radius: bore,
            last_shell: None,
            outer_h: None,
            shells: Vec::new(),
            other: 0.0,
            known: true,
            computed_outer: false,
        }
    }

    pub fn advance(
        &mut self,
        i: usize,
        kind: &dyn ElementKind,
        span: Span,
        args: Option<&Args>,
        built: Option<&Built>,
    ) {
        let is_shell = matches!(kind.name(), "cylinder" | "sphere");
        // A film followed by anything is an inner element, no longer the outer film.
        if let Some((_, r)) = self.outer_h.take() {
            self.other += r;
        }
        self.computed_outer = false;
        match (args, built) {
            (Some(_), Some(_)) if elements::convection::is_computed_film(kind.name()) => {
                self.computed_outer = true;
                self.known = false;
            }
            (Some(a), Some(_)) if is_shell => {
                let r_out = shell::outer_radius(a);
                if let (Some(r_out), Ok(k)) = (r_out, shell::conductivity(a, "")) {
                    self.last_shell = Some((i, k, r_out));
                    match self.radius {
                        Some((r_in, _)) => self.shells.push(insulation_loss::Shell {
                            index: i,
                            k,
                            r_in,
                            r_out,
                        }),
                        None => self.known = false,
                    }
                }
                self.radius = r_out.map(|r| (r, span));
            }
            (Some(_), Some(b)) if kind.name() == "film" => {
                self.outer_h = b
                    .area
                    .map(|area| (b.conductance / area, 1.0 / b.conductance));
                if self.outer_h.is_none() {
                    self.known = false;
                }
            }
            (Some(_), Some(b)) if b.conductance.is_finite() && b.conductance > 0.0 => {
                self.other += 1.0 / b.conductance
            }
            _ if is_shell => {
                self.radius = None;
                self.known = false;
            }
            _ => self.known = false,
        }
    }

    /// The outermost shell's index and its critical insulation radius (k/h for a cylinder, 2k/h
    /// for a sphere), when a film follows it.
    pub fn critical_radius(&self) -> Option<(usize, f64)> {
        let ((i, k, _), (h, _)) = (self.last_shell?, self.outer_h?);
        Some((
            i,
            shell::critical_radius(self.geom == Geometry::Sphere, k, h),
        ))
    }

    /// The whole build-up against the bare pipe, when it ends in a film and every element's
    /// resistance is known.
    pub fn insulation(&self) -> Option<insulation_loss::Comparison> {
        let (h, _) = self.outer_h?;
        if !self.known {
            return None;
        }
        let spherical = self.geom == Geometry::Sphere;
        let b = insulation_loss::RadialBuildup {
            spherical,
            length: if spherical { 1.0 } else { self.length? },
            shells: self.shells.clone(),
            h,
            other: self.other,
        };
        b.compare()
    }

    /// W110 when the build-up's insulation, taken as a whole, loses more heat than the bare
    /// pipe: by how much (in W when both ends are held at known temperatures, and in %), and
    /// the outer radius where the loss falls back to the bare pipe's.
    pub fn insulation_warning(
        &self,
        use_name: &Ident,
        els: &[BuildupElement],
        delta_t: Option<f64>,
    ) -> Option<Diagnostic> {
        let c = self.insulation()?;
        if !c.increases_loss() {
            return None;
        }
        let e = els.get(c.outermost)?;
        let show = elements::show;
        let spherical = self.geom == Geometry::Sphere;
        let shape = if spherical { "vessel" } else { "pipe" };
        let how_much = match delta_t {
            Some(dt) => format!(
                "{} more ({:.1} %)",
                show(c.watts(dt).abs(), Dim::POWER),
                c.percent()
            ),
            None => format!("{:.1} % more", c.percent()),
        };
        let back = match c.break_even {
            Some(r) => format!(
                "the loss falls back to the bare {shape}'s at an outer radius of {} (the break-even radius)",
                show(r, Dim::LENGTH)
            ),
            None => format!("no outer radius of `{}` brings the loss back to the bare {shape}'s", e.name.name),
        };
        let critical = self
            .critical_radius()
            .filter(|(i, _)| *i == c.outermost)
            .map(|(_, r)| {
                format!(
                    "; its critical radius {} = {}",
                    if spherical { "2k/h" } else { "k/h" },
                    show(r, Dim::LENGTH)
                )
            })
            .unwrap_or_default();
        Some(
            Diagnostic::warning(
                "W110",
                format!(
                    "in `{}`, the insulation up to `{}` increases the heat loss over the bare {shape} (outer radius {}): {how_much}; {back}{critical}",
                    use_name.name,
                    e.name.name,
                    show(c.pipe_radius, Dim::LENGTH),
                ),
                e.element.span,
            )
            .with_label("insulation that raises the heat loss")
            .with_secondary(use_name.span, "used here")
            .with_help(match c.break_even {
                // Beyond a hundred times the pipe's radius no one would lag it so.
                Some(r) if r > 100.0 * c.pipe_radius => format!(
                    "no practical thickness of `{}` brings the loss below the bare {shape}'s; to cut it, use a material with lower k; where the extra loss is wanted (a cable shedding heat through its jacket), keep it",
                    e.name.name
                ),
                Some(r) => format!(
                    "to cut the heat loss, make the outer radius well above {}, or use a material with lower k; where the extra loss is wanted (a cable shedding heat through its jacket), keep it",
                    show(r, Dim::LENGTH)
                ),
                None => "to cut the heat loss, use a material with lower k; where the extra loss is wanted, keep it".to_string(),
            }),
        )
    }

    /// The same check for a computed outer film, to be made once the film's h is solved.
    pub fn pending_check(
        &self,
        use_name: &Ident,
        els: &[BuildupElement],
        film: usize,
    ) -> Option<crate::network::RadiusCheck> {
        let (i, k, r_out) = self.last_shell?;
        if !self.computed_outer {
            return None;
        }
        let e = &els[i];
        Some(crate::network::RadiusCheck {
            film,
            use_name: use_name.name.clone(),
            use_span: use_name.span,
            shell: e.name.name.clone(),
            shell_span: e.element.span,
            spherical: self.geom == Geometry::Sphere,
            k,
            r_out,
        })
    }
}

/// W110 for a shell of conductivity `k` ending at `r_out` under a film of coefficient `h`;
/// `note` says where h came from when it was computed.
#[allow(clippy::too_many_arguments)]
pub fn critical_radius_diagnostic(
    use_name: &str,
    use_span: Span,
    (shell, shell_span): (&str, Span),
    spherical: bool,
    k: f64,
    r_out: f64,
    h: f64,
    note: &str,
) -> Option<Diagnostic> {
    let r_crit = shell::critical_radius(spherical, k, h);
    if r_out >= r_crit {
        return None;
    }
    let formula = if spherical { "2k/h" } else { "k/h" };
    let show = elements::show;
    Some(
        Diagnostic::warning(
            "W110",
            format!(
                "in `{use_name}`, the outer radius of `{shell}` ({}) is below the critical insulation radius {formula} = {} (k = {}, h = {}{note}): this insulation increases the heat loss",
                show(r_out, Dim::LENGTH),
                show(r_crit, Dim::LENGTH),
                show(k, Dim::CONDUCTIVITY),
                show(h, Dim::HEAT_TRANSFER_COEFF),
            ),
            shell_span,
        )
        .with_label("insulation thinner than the critical radius")
        .with_secondary(use_span, "used here")
        .with_help(format!(
            "below r = {formula} the growing outer surface sheds more heat than the layer holds back; to cut the heat loss, make the outer radius well above {}, or use a material with lower k",
            show(r_crit, Dim::LENGTH)
        )),
    )
}
