//! Pass 2, parameters: every parameter is evaluated, so errors in unused ones are reported
//! too; the values in SI are kept for hover. A `case` or `--set` replaces a parameter's value
//! only by one of the same dimension and kind ([`fits_parameter`]).

use super::{Cx, Kinds};
use crate::diagnostic::Diagnostic;
use crate::syntax::{Item, ItemKind};
use crate::units::{Quantity, TempKind};

impl Cx<'_> {
    pub(super) fn params(&mut self, items: &[&Item]) -> Vec<(String, Option<Quantity>)> {
        let mut param_values = Vec::new();
        for item in items {
            if let ItemKind::Param { name, .. } = &item.kind {
                let kinds = Kinds(&self.symbols);
                let v = self.ev.param(&name.name, &kinds);
                param_values.push((name.name.clone(), v));
            }
        }
        param_values
    }
}

/// A value that replaces a parameter must have the parameter's dimension and, for
/// temperatures, the same kind (a point for a point, a difference for a difference).
#[allow(clippy::result_large_err)] // the one Diagnostic type, as `eval::expect_dim` returns it
pub fn fits_parameter(
    name: &str,
    base: Quantity,
    q: Quantity,
    expr: &crate::syntax::Expr,
    source: &str,
) -> Result<(), Diagnostic> {
    if base.dim != q.dim {
        let written = source.get(expr.span.range()).unwrap_or("this value");
        return Err(Diagnostic::error(
            "E101",
            format!(
                "parameter `{name}` is {}; `{written}` is {}",
                base.dim.describe(),
                q.dim.describe()
            ),
            expr.span,
        )
        .with_label(format!("{} here", q.dim.describe()))
        .with_help(format!(
            "give `{name}` a value in a unit of {}",
            base.dim.describe()
        )));
    }
    let clash = matches!(
        (base.kind, q.kind),
        (TempKind::Point, TempKind::Difference) | (TempKind::Difference, TempKind::Point)
    );
    if clash {
        let (is, was) = if q.kind == TempKind::Point {
            ("a temperature on a scale", "a difference")
        } else {
            ("a difference", "a temperature on a scale")
        };
        return Err(Diagnostic::error(
            "E103",
            format!("parameter `{name}` is {was}; this value is {is}"),
            expr.span,
        )
        .with_label(is)
        .with_help("use the same kind of temperature as the parameter's own value"));
    }
    Ok(())
}
