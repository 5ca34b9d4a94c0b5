//! Radial build-ups: the bore a link gives, the radius each shell starts at, and the critical
//! insulation radius check. Kept apart from elaboration so plane build-ups read as before.
// Diagnostics are returned by value throughout the compiler; boxing them here alone would
// split the element API.
#![allow(clippy::result_large_err)]

use crate::diagnostic::Diagnostic;
use crate::elements::{self, shell, shell::Geometry, Args, Built, ElementKind};
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
    /// The radius the next element starts at, with the span that set it.
    pub radius: Option<(f64, Span)>,
    /// The outermost shell so far: element index, k, outer radius.
    last_shell: Option<(usize, f64, f64)>,
    /// The film coefficient after the last shell.
    outer_h: Option<f64>,
}

impl Chain {
    pub fn new(geom: Geometry, bore: Option<(f64, Span)>) -> Chain {
        Chain {
            geom,
            radius: bore,
            last_shell: None,
            outer_h: None,
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
        match (args, built) {
            (Some(a), Some(_)) if is_shell => {
                let r_out = shell::outer_radius(a);
                if let (Some(r_out), Ok(k)) = (r_out, shell::conductivity(a, "")) {
                    self.last_shell = Some((i, k, r_out));
                }
                self.radius = r_out.map(|r| (r, span));
                self.outer_h = None;
            }
            (Some(_), Some(b)) if kind.name() == "film" => {
                self.outer_h = b.area.map(|area| b.conductance / area)
            }
            _ if is_shell => self.radius = None,
            _ => {}
        }
    }

    /// The outermost shell's index and its critical insulation radius (k/h for a cylinder, 2k/h
    /// for a sphere), when a film follows it.
    pub fn critical_radius(&self) -> Option<(usize, f64)> {
        let ((i, k, _), h) = (self.last_shell?, self.outer_h?);
        Some((
            i,
            shell::critical_radius(self.geom == Geometry::Sphere, k, h),
        ))
    }

    /// W110 when the outermost shell, followed by a film, ends below the critical radius.
    pub fn critical_radius_warning(
        &self,
        use_name: &Ident,
        els: &[BuildupElement],
    ) -> Option<Diagnostic> {
        let ((i, k, r_out), h) = (self.last_shell?, self.outer_h?);
        let spherical = self.geom == Geometry::Sphere;
        let r_crit = shell::critical_radius(spherical, k, h);
        if r_out >= r_crit {
            return None;
        }
        let e = &els[i];
        let formula = if spherical { "2k/h" } else { "k/h" };
        let show = elements::show;
        Some(
            Diagnostic::warning(
                "W110",
                format!(
                    "in `{}`, the outer radius of `{}` ({}) is below the critical insulation radius {formula} = {} (k = {}, h = {}): this insulation increases the heat loss",
                    use_name.name,
                    e.name.name,
                    show(r_out, Dim::LENGTH),
                    show(r_crit, Dim::LENGTH),
                    show(k, Dim::CONDUCTIVITY),
                    show(h, Dim::HEAT_TRANSFER_COEFF),
                ),
                e.element.span,
            )
            .with_label("insulation thinner than the critical radius")
            .with_secondary(use_name.span, "used here")
            .with_help(format!(
                "below r = {formula} the growing outer surface sheds more heat than the layer holds back; to cut the heat loss, make the outer radius well above {}, or use a material with lower k",
                show(r_crit, Dim::LENGTH)
            )),
        )
    }
}
