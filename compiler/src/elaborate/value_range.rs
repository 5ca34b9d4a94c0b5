//! Values the solver cannot compute with: an input outside the range of `units::range`, and a
//! derived conductance that is not a finite positive number. Both are E108 at the place (the
//! value, or the element call with the argument that caused it), never an infinite resistance
//! or a temperature of 10¹⁶ °C in the results.

use super::Cx;
use crate::diagnostic::Diagnostic;
use crate::elements::{self, ArgValue, Args};
use crate::network::{Link, LinkLaw};
use crate::syntax::Expr;
use crate::units::range::{self, OutOfRange};
use crate::units::{format_number, Dim, Quantity};

/// The diagnostic for a value outside the range, or `None` when it is within it. `what` names
/// the parameter (`area`, or a phrase such as `a table conductivity`) and `owner` what it
/// belongs to (`` `film` in link `wall` ``, ``node `room` ``), or is empty.
pub fn range_error(
    q: Quantity,
    what: &str,
    owner: &str,
    e: &Expr,
    source: &str,
) -> Option<Diagnostic> {
    let problem = range::check(q).err()?;
    let written = source.get(e.span.range()).unwrap_or("this value");
    let what = if what.contains(' ') {
        what.to_string()
    } else {
        format!("`{what}`")
    };
    let subject = if owner.is_empty() {
        what
    } else {
        format!("{what} of {owner}")
    };
    let temperature = q.dim == Dim::TEMPERATURE;
    let si = if temperature {
        " K".to_string()
    } else {
        match q.dim.si_unit().as_str() {
            "1" => String::new(),
            u => format!(" {u}"),
        }
    };
    let (lo, hi) = range::bounds(q.dim);
    let value = format!("{}{si}", format_number(q.value));
    let d = match problem {
        OutOfRange::BelowAbsoluteZero => {
            return Some(
                Diagnostic::error(
                    "E202",
                    format!("{subject} is below absolute zero (`{written}` is {value})"),
                    e.span,
                )
                .with_label("below 0 K")
                .with_help("check the value and its unit (°C, °F or K)"),
            )
        }
        OutOfRange::NotFinite => Diagnostic::error(
            "E108",
            format!("{subject} is not a finite number: `{written}` overflows"),
            e.span,
        )
        .with_label("too large to compute with"),
        OutOfRange::TooLarge => Diagnostic::error(
            "E108",
            format!("{subject} is {value}, too large to compute with"),
            e.span,
        )
        .with_label(format!("above {}{si}", format_number(hi))),
        OutOfRange::TooSmall => Diagnostic::error(
            "E108",
            format!("{subject} is {value}, too small to compute with"),
            e.span,
        )
        .with_label(format!("below {}{si} but not zero", format_number(lo))),
    };
    let help = if temperature {
        format!(
            "a temperature must lie between 0 K and {} K, and a temperature difference within ±{} K; check the value and its unit",
            format_number(range::HOTTEST),
            format_number(range::HOTTEST)
        )
    } else {
        format!(
            "{} must be 0 or between {}{si} and {}{si} in magnitude; check the value and its unit prefix",
            q.dim.describe(),
            format_number(lo),
            format_number(hi)
        )
    };
    Some(d.with_help(help))
}

/// E108 for a link law whose conductance (or exchange area, or conduction shape) is not a
/// finite positive number, pointing at the argument most likely to have caused it: the one
/// furthest from 1 in SI, i.e. with the largest |log₁₀|.
pub fn law_error(kind: &str, law: &LinkLaw, args: &Args) -> Option<Diagnostic> {
    let (what, v) = law_value(law);
    if usable(v) {
        return None;
    }
    let culprit = args
        .values
        .iter()
        .filter_map(|(name, (value, span))| match value {
            ArgValue::Quantity(x) if *x != 0.0 => Some((*name, x.abs().log10().abs(), *span)),
            _ => None,
        })
        .max_by(|a, b| a.1.total_cmp(&b.1).then_with(|| b.0.cmp(a.0)));
    let shown = shown(v);
    let mut d = Diagnostic::error(
        "E108",
        format!("`{kind}` gives a {what} of {shown}, which cannot be computed with"),
        culprit.map(|c| c.2).unwrap_or(args.call_span),
    );
    d = match culprit {
        Some((name, _, _)) => d
            .with_label(format!("`{name}` is the most extreme argument"))
            .with_secondary(args.call_span, format!("this `{kind}`"))
            .with_help(format!(
                "the resistance of this element overflows or vanishes; check `{name}` and the other arguments against each other (a wall far thinner than its radius, an area or coefficient far from the rest)"
            )),
        None => d
            .with_label(format!("this `{kind}`"))
            .with_help("check the element's arguments against each other"),
    };
    Some(d)
}

/// E108 for a link made without element arguments of its own (a region's cells, the parts an
/// element generates) whose law is not a finite number with a finite reciprocal. A generated
/// part may be negative: `heated_slab`'s correction link is (see `elements::generation`).
pub fn link_error(link: &Link) -> Option<Diagnostic> {
    let (what, v) = law_value(&link.law);
    if usable(v.abs()) {
        return None;
    }
    let shown = match what {
        "conductance" if v.is_finite() => elements::show(v, Dim::CONDUCTANCE),
        _ => shown(v),
    };
    Some(
        Diagnostic::error(
            "E108",
            format!(
                "link `{}` (`{}`) has a {what} of {shown}, which cannot be computed with",
                link.name, link.kind
            ),
            link.span,
        )
        .with_label(format!(
            "{what} not a finite number with a finite reciprocal"
        ))
        .with_help("check this declaration's sizes and coefficients against each other"),
    )
}

/// What a law's size is called and its value: the conductance (W/K), the radiative exchange
/// area (m²) or the conduction shape (m).
fn law_value(law: &LinkLaw) -> (&'static str, f64) {
    match law {
        LinkLaw::Linear { conductance } => ("conductance", *conductance),
        LinkLaw::Radiation { exchange_area } => ("radiative exchange area", *exchange_area),
        LinkLaw::Conduction { shape, .. } => ("conduction shape factor", *shape),
        LinkLaw::Convection(f) => ("film area", f.area),
    }
}

/// A law's value as the message shows it: `infinity` and `not a number` spelled out.
fn shown(v: f64) -> String {
    if v.is_nan() {
        "not a number".to_string()
    } else if v.is_infinite() {
        "infinity".to_string()
    } else {
        format_number(v)
    }
}

/// A finite positive number whose reciprocal (the resistance) is finite too.
fn usable(v: f64) -> bool {
    v.is_finite() && v > 0.0 && v.recip().is_finite()
}

impl Cx<'_> {
    /// Report a value outside the range (see [`range_error`]); true when it is within it.
    pub(super) fn in_range(&mut self, q: Quantity, what: &str, e: &Expr) -> bool {
        let src = self.sources.text(e.span.file);
        match range_error(q, what, &self.owner, e, src) {
            Some(d) => {
                self.diags.push(d);
                false
            }
            None => true,
        }
    }
}

impl Cx<'_> {
    /// The element's law, or `None` after reporting why it cannot be built (its own checks, or
    /// a conductance that is not a finite positive number).
    pub(super) fn checked_law(
        &mut self,
        kind: &dyn elements::ElementKind,
        args: &Args,
    ) -> Option<(LinkLaw, elements::Built)> {
        match kind.law(args) {
            Ok((law, built)) => match law_error(kind.name(), &law, args) {
                Some(d) => {
                    self.diags.push(d);
                    None
                }
                None => Some((law, built)),
            },
            Err(d) => {
                self.diags.push(d);
                None
            }
        }
    }
}
