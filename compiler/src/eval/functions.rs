//! Calls of the standard functions in expressions (`sqrt`, `ln`, `exp`, `abs`, `min`, `max`,
//! `pi`), each with its rule for dimensions and temperature kinds.

use super::Evaluator;
use crate::diagnostic::{did_you_mean, Diagnostic};
use crate::span::Span;
use crate::syntax::{Expr, Ident};
use crate::units::{Dim, Quantity, TempKind};

impl Evaluator<'_> {
    pub(super) fn call(
        &mut self,
        func: &Ident,
        vals: &[Quantity],
        args: &[Expr],
        span: Span,
    ) -> Option<Quantity> {
        // The functions and their arities come from the schema; the match below computes them.
        let arity = match crate::schema::function(&func.name) {
            Some(f) => f.params.len(),
            None => {
                let names = crate::schema::FUNCTIONS.iter().map(|f| f.name);
                let list = names.clone().collect::<Vec<_>>();
                let (last, rest) = list.split_last().unwrap_or((&"", &[]));
                let mut d = Diagnostic::error(
                    "E107",
                    format!("unknown function `{}`", func.name),
                    func.span,
                )
                .with_label("not a function")
                .with_help(format!("the functions are {} and {last}", rest.join(", ")));
                if let Some(s) = did_you_mean(&func.name, names) {
                    d = d.with_help(format!("did you mean `{s}`?")).with_fix(
                        format!("Replace with `{s}`"),
                        func.span,
                        s,
                    );
                }
                self.diags.push(d);
                return None;
            }
        };
        if vals.len() != arity {
            self.diags.push(
                Diagnostic::error(
                    "E107",
                    format!(
                        "`{}` takes {arity} argument{}, not {}",
                        func.name,
                        if arity == 1 { "" } else { "s" },
                        vals.len()
                    ),
                    span,
                )
                .with_label("wrong number of arguments"),
            );
            return None;
        }
        let plain = TempKind::NotTemperature;
        let a = vals[0];
        match func.name.as_str() {
            "sqrt" => {
                let Some(dim) = a.dim.root(2) else {
                    self.diags.push(
                        Diagnostic::error(
                            "E101",
                            format!("the square root of {} has no unit", a.dim.describe()),
                            args[0].span,
                        )
                        .with_label("dimension with odd powers"),
                    );
                    return None;
                };
                if a.value < 0.0 {
                    self.diags.push(
                        Diagnostic::error("E106", "square root of a negative value", args[0].span)
                            .with_label("negative"),
                    );
                    return None;
                }
                Some(Quantity {
                    value: a.value.sqrt(),
                    dim,
                    kind: plain,
                })
            }
            "ln" | "exp" => {
                if !a.dim.is_none() {
                    self.diags.push(
                        Diagnostic::error(
                            "E101",
                            format!(
                                "`{}` needs a dimensionless argument, not {}",
                                func.name,
                                a.dim.describe()
                            ),
                            args[0].span,
                        )
                        .with_label("has a unit")
                        .with_help("divide by a reference value first, e.g. `ln(r_out / r_in)`"),
                    );
                    return None;
                }
                if func.name == "ln" && a.value <= 0.0 {
                    self.diags.push(
                        Diagnostic::error(
                            "E106",
                            "logarithm of a value that is not positive",
                            args[0].span,
                        )
                        .with_label("not positive"),
                    );
                    return None;
                }
                let v = if func.name == "ln" {
                    a.value.ln()
                } else {
                    a.value.exp()
                };
                Some(Quantity {
                    value: v,
                    dim: Dim::NONE,
                    kind: plain,
                })
            }
            "abs" => Some(Quantity {
                value: a.value.abs(),
                ..a
            }),
            _ => {
                let b = vals[1];
                if a.dim != b.dim {
                    self.diags.push(
                        Diagnostic::error(
                            "E101",
                            format!(
                                "`{}` compares {} with {}",
                                func.name,
                                a.dim.describe(),
                                b.dim.describe()
                            ),
                            span,
                        )
                        .with_label("arguments of different dimensions"),
                    );
                    return None;
                }
                let pick = if func.name == "min" {
                    a.value <= b.value
                } else {
                    a.value >= b.value
                };
                Some(if pick { a } else { b })
            }
        }
    }
}
