//! Evaluation of expressions to quantities, with dimension and temperature-kind checks.
//!
//! Temperatures are affine: a point on a scale (`20 °C`) and a difference (`5 K`) are different
//! kinds. The rules are in `docs/language.md`; every violation is a diagnostic at the operator.

use crate::diagnostic::{did_you_mean, Diagnostic};
use crate::span::Span;
use crate::syntax::{BinOp, Expr, ExprKind, Ident};
use crate::units::{parse_unit, Dim, Quantity, TempKind, Unit, UnitError};
use rustc_hash::FxHashMap;

mod functions;

/// What a name in an expression may refer to besides a parameter, for helpful errors.
pub trait NameKinds {
    /// "a material", "a node", ... when `name` is declared but is not a value.
    fn kind_of(&self, name: &str) -> Option<&'static str>;
}

#[derive(Clone, Copy, PartialEq)]
enum State {
    Pending,
    Active,
}

/// Evaluates parameters lazily (any order, cycles reported) and expressions that use them.
pub struct Evaluator<'a> {
    params: FxHashMap<&'a str, (&'a Ident, &'a Expr)>,
    /// Parameter names in declaration order: suggestions scan these, never the map, so what
    /// they offer does not hang on the hasher's order.
    order: Vec<&'a str>,
    values: FxHashMap<String, Option<Quantity>>,
    state: FxHashMap<String, State>,
    stack: Vec<&'a Ident>,
    /// Overrides of parameter values (studies, cases).
    overrides: FxHashMap<String, Quantity>,
    /// Each distinct unit spelling parsed once: a model repeats a handful of spellings
    /// (`1 cm^2`, `W/(m*K)`) on every one of its links.
    units: FxHashMap<String, Result<Unit, UnitError>>,
    pub diags: Vec<Diagnostic>,
    /// Spans of every parameter reference, for navigation.
    pub references: Vec<(String, Span)>,
}

impl<'a> Evaluator<'a> {
    pub fn new(params: impl IntoIterator<Item = (&'a Ident, &'a Expr)>) -> Self {
        let mut map = FxHashMap::default();
        let mut state = FxHashMap::default();
        let mut order = Vec::new();
        for (name, expr) in params {
            map.entry(name.name.as_str()).or_insert_with(|| {
                order.push(name.name.as_str());
                (name, expr)
            });
            state.insert(name.name.clone(), State::Pending);
        }
        Evaluator {
            params: map,
            order,
            values: FxHashMap::default(),
            state,
            stack: Vec::new(),
            overrides: FxHashMap::default(),
            units: FxHashMap::default(),
            diags: Vec::new(),
            references: Vec::new(),
        }
    }

    pub fn set_override(&mut self, name: &str, value: Quantity) {
        self.overrides.insert(name.to_string(), value);
    }

    /// The value of a parameter, evaluating it on first use. `None` when it failed (the error
    /// is reported once, at the parameter).
    pub fn param(&mut self, name: &str, others: &dyn NameKinds) -> Option<Quantity> {
        if let Some(q) = self.overrides.get(name) {
            return Some(*q);
        }
        if let Some(v) = self.values.get(name) {
            return *v;
        }
        let (&key, &(ident, _)) = self.params.get_key_value(name)?;
        if self.state.get(name) == Some(&State::Active) {
            let start = self.stack.iter().position(|i| i.name == name).unwrap_or(0);
            let chain: Vec<&'a Ident> = self.stack[start..].to_vec();
            self.report_cycle(ident, &chain);
            return None;
        }
        self.evaluate_dependencies(key, others);
        if let Some(v) = self.values.get(name) {
            return *v; // it closed a cycle, reported on the way
        }
        self.evaluate_now(key, others)
    }

    fn evaluate_now(&mut self, name: &'a str, others: &dyn NameKinds) -> Option<Quantity> {
        let &(ident, expr) = self.params.get(name)?;
        self.state.insert(name.to_string(), State::Active);
        self.stack.push(ident);
        let v = self.eval(expr, others);
        self.stack.pop();
        self.values.insert(name.to_string(), v);
        v
    }

    /// Evaluate every parameter `root` depends on, deepest first, with an explicit stack
    /// instead of recursion: a chain of thousands of parameters, written in any order, then
    /// costs no stack depth, because each one's own evaluation finds its dependencies done.
    /// A cycle met on the way is reported here (E104), at the parameter that closes it, and
    /// its members are given no value.
    fn evaluate_dependencies(&mut self, root: &'a str, others: &dyn NameKinds) {
        // The path from `root` down: each parameter, its dependencies, the next one to visit.
        let mut path: Vec<(&'a str, Vec<&'a str>, usize)> =
            vec![(root, self.dependencies(root), 0)];
        let mut on_path: FxHashMap<&'a str, usize> = FxHashMap::from_iter([(root, 0)]);
        while let Some(top) = path.len().checked_sub(1) {
            let (name, deps, next) = &mut path[top];
            let Some(&dep) = deps.get(*next) else {
                let name = *name;
                path.pop();
                on_path.remove(name);
                // The root itself is left to the caller.
                if top > 0 && !self.values.contains_key(name) {
                    self.evaluate_now(name, others);
                }
                continue;
            };
            *next += 1;
            if self.values.contains_key(dep) || self.state.get(dep) == Some(&State::Active) {
                // Done, or being evaluated further up (the ordinary check in `param` reports
                // a cycle through it).
                continue;
            }
            if let Some(&k) = on_path.get(dep) {
                let chain: Vec<&'a Ident> = path[k..]
                    .iter()
                    .filter_map(|(n, ..)| self.params.get(n).map(|(i, _)| *i))
                    .collect();
                if let Some(&first) = chain.first() {
                    self.report_cycle(first, &chain);
                }
                for (n, ..) in &path[k..] {
                    self.values.insert((*n).to_string(), None);
                }
                continue;
            }
            on_path.insert(dep, path.len());
            let deps = self.dependencies(dep);
            path.push((dep, deps, 0));
        }
    }

    /// The parameters an unevaluated parameter's value refers to, in the order evaluation
    /// meets them.
    fn dependencies(&self, name: &str) -> Vec<&'a str> {
        let mut out = Vec::new();
        if self.values.contains_key(name) {
            return out;
        }
        if let Some(&(_, expr)) = self.params.get(name) {
            expr.visit_names(&mut |id| {
                if id.name == "pi" || self.overrides.contains_key(&id.name) {
                    return;
                }
                if let Some((&key, _)) = self.params.get_key_value(id.name.as_str()) {
                    out.push(key);
                }
            });
        }
        out
    }

    /// E104 at `closing`, whose value leads back to itself through `chain` (which starts with
    /// it).
    fn report_cycle(&mut self, closing: &Ident, chain: &[&Ident]) {
        let name = &closing.name;
        let names: Vec<&str> = chain.iter().map(|i| i.name.as_str()).collect();
        let mut d = Diagnostic::error(
            "E104",
            format!(
                "parameter `{name}` depends on itself: {} -> {name}",
                names.join(" -> ")
            ),
            closing.span,
        )
        .with_label("defined in a cycle")
        .with_help("give one of these parameters a value that does not refer back to the others");
        for i in chain.iter().skip(1) {
            d = d.with_secondary(i.span, format!("`{}` is part of the cycle", i.name));
        }
        self.diags.push(d);
    }

    /// Evaluate an expression to a quantity in SI units.
    pub fn eval(&mut self, e: &Expr, others: &dyn NameKinds) -> Option<Quantity> {
        match &e.kind {
            ExprKind::Number { value, unit, .. } => self.literal(*value, unit.as_ref(), e.span),
            ExprKind::Paren(inner) => self.eval(inner, others),
            ExprKind::Missing => None,
            ExprKind::Name(id) => self.name(id, others),
            ExprKind::Neg(inner) => {
                if let ExprKind::Number { value, unit, .. } = &inner.kind {
                    // `-8 °C` is a point below zero on the scale, not the negation of a point.
                    return self.literal(-value, unit.as_ref(), e.span);
                }
                let q = self.eval(inner, others)?;
                if q.kind == TempKind::Point {
                    self.diags.push(
                        Diagnostic::error(
                            "E103",
                            "a temperature on a scale cannot be negated",
                            e.span,
                        )
                        .with_label("negating a temperature point")
                        .with_help("negate a difference instead, e.g. `-(t_in - t_out)`"),
                    );
                    return None;
                }
                Some(Quantity {
                    value: -q.value,
                    ..q
                })
            }
            ExprKind::Chain { first, rest } => self.chain(first, rest, others),
            ExprKind::Power { base, exponent } => {
                let a = self.eval(base, others);
                let b = self.eval(exponent, others);
                self.power(a?, b?, exponent.span)
            }
            ExprKind::Call { func, args } => {
                let vals: Vec<Option<Quantity>> =
                    args.iter().map(|a| self.eval(a, others)).collect();
                let vals: Option<Vec<Quantity>> = vals.into_iter().collect();
                self.call(func, &vals?, args, e.span)
            }
        }
    }

    fn literal(
        &mut self,
        value: f64,
        unit: Option<&(String, Span)>,
        span: Span,
    ) -> Option<Quantity> {
        let Some((text, uspan)) = unit else {
            return Some(Quantity {
                value,
                dim: Dim::NONE,
                kind: TempKind::NotTemperature,
            });
        };
        if !self.units.contains_key(text.as_str()) {
            self.units.insert(text.clone(), parse_unit(text));
        }
        match &self.units[text.as_str()] {
            Ok(u) => Some(u.to_si(value)),
            Err(err) => {
                let err = err.clone();
                let at = Span {
                    start: uspan.start + err.start as u32,
                    end: uspan.start + err.end as u32,
                    ..*uspan
                };
                let mut d = Diagnostic::error("E100", err.message.clone(), at)
                    .with_label("not a known unit");
                d = d.with_help(err.help.clone().unwrap_or_else(|| {
                    "write a unit such as `m`, `mm`, `in`, `W`, `W/(m*K)` or `°C`; docs/units.md lists every spelling".into()
                }));
                let _ = span;
                self.diags.push(d);
                None
            }
        }
    }

    fn name(&mut self, id: &Ident, others: &dyn NameKinds) -> Option<Quantity> {
        if id.name == "pi" {
            return Some(Quantity {
                value: std::f64::consts::PI,
                dim: Dim::NONE,
                kind: TempKind::NotTemperature,
            });
        }
        if self.params.contains_key(id.name.as_str()) || self.overrides.contains_key(&id.name) {
            self.references.push((id.name.clone(), id.span));
            return self.param(&id.name, others);
        }
        let d = if let Some(kind) = others.kind_of(&id.name) {
            Diagnostic::error(
                "E105",
                format!("`{}` is {kind}, not a value", id.name),
                id.span,
            )
            .with_label(format!("{kind} used in arithmetic"))
            .with_help(
                "only parameters (`param`) and numbers with units can be used in expressions",
            )
        } else {
            let mut d = Diagnostic::error("E102", format!("unknown name `{}`", id.name), id.span)
                .with_label("no parameter has this name");
            let names: Vec<&str> = self.order.iter().copied().chain(["pi"]).collect();
            if let Some(s) = did_you_mean(&id.name, names) {
                d = d.with_help(format!("did you mean `{s}`?")).with_fix(
                    format!("Replace with `{s}`"),
                    id.span,
                    s,
                );
            } else {
                d = d.with_help(format!("declare it, e.g. `param {} = 1 m`", id.name));
            }
            d
        };
        self.diags.push(d);
        None
    }

    /// `a + b - c ...` left to right, in a loop however long the chain. Every operand is
    /// evaluated so each one's own errors are reported; the first failure ends the value.
    fn chain(
        &mut self,
        first: &Expr,
        rest: &[(BinOp, Expr)],
        others: &dyn NameKinds,
    ) -> Option<Quantity> {
        let mut acc = self.eval(first, others);
        let mut lhs_span = first.span;
        for (op, rhs) in rest {
            let b = self.eval(rhs, others);
            let span = first.span.to(rhs.span);
            acc = match (acc, b) {
                (Some(a), Some(b)) => self.binary(*op, a, b, span, lhs_span, rhs.span),
                _ => None,
            };
            lhs_span = span;
        }
        acc
    }

    fn binary(
        &mut self,
        op: BinOp,
        a: Quantity,
        b: Quantity,
        span: Span,
        ls: Span,
        rs: Span,
    ) -> Option<Quantity> {
        use TempKind::*;
        let plain = NotTemperature;
        match op {
            BinOp::Add | BinOp::Sub => {
                if a.dim != b.dim {
                    let verb = if op == BinOp::Add { "add" } else { "subtract" };
                    self.diags.push(
                        Diagnostic::error("E101", format!("cannot {verb} {} and {}", a.dim.describe(), b.dim.describe()), span)
                            .with_secondary(ls, a.dim.describe())
                            .with_secondary(rs, b.dim.describe())
                            .with_label("the two sides have different dimensions")
                            .with_help("both sides of `+` and `-` must be the same kind of quantity; check the units"),
                    );
                    return None;
                }
                let value = if op == BinOp::Add {
                    a.value + b.value
                } else {
                    a.value - b.value
                };
                let kind = match (op, a.kind, b.kind) {
                    (BinOp::Add, Point, Point) => {
                        self.diags.push(
                            Diagnostic::error("E103", "cannot add two temperatures on a scale", span)
                                .with_label("point + point has no meaning")
                                .with_help("add a temperature difference (`5 K`) to a temperature, or for a mean write `t_a + (t_b - t_a) / 2`"),
                        );
                        return None;
                    }
                    (BinOp::Sub, Point, Point) => Difference,
                    (BinOp::Sub, Difference, Point) | (BinOp::Sub, Absolute, Point) => {
                        self.diags.push(
                            Diagnostic::error(
                                "E103",
                                "cannot subtract a temperature on a scale from a difference",
                                span,
                            )
                            .with_label("difference - point has no meaning")
                            .with_help("write the temperature first: `t - 5 K`"),
                        );
                        return None;
                    }
                    (_, Point, _) | (_, _, Point) => Point,
                    (_, Difference, _) | (_, _, Difference) => Difference,
                    (_, Absolute, Absolute) => Absolute,
                    (_, k, _) => k,
                };
                Some(Quantity {
                    value,
                    dim: a.dim,
                    kind,
                })
            }
            BinOp::Mul | BinOp::Div => {
                for (q, s) in [(a, ls), (b, rs)] {
                    if q.kind == Point && (a.dim.is_none() || b.dim.is_none()) {
                        self.diags.push(
                            Diagnostic::error("E103", "cannot scale a temperature on a scale", s)
                                .with_label("a temperature point")
                                .with_help("scale a difference instead (`(t - t_ref) * 2`), or use kelvin for absolute temperature"),
                        );
                        return None;
                    }
                }
                let (value, dim) = if op == BinOp::Mul {
                    (a.value * b.value, a.dim.mul(b.dim))
                } else {
                    if b.value == 0.0 {
                        self.diags.push(
                            Diagnostic::error("E106", "division by zero", rs)
                                .with_label("this is zero")
                                .with_help("check the divisor"),
                        );
                        return None;
                    }
                    (a.value / b.value, a.dim.div(b.dim))
                };
                let kind = if dim == Dim::TEMPERATURE {
                    match (a.kind, b.kind) {
                        (Absolute, _) | (_, Absolute) => Absolute,
                        _ => Difference,
                    }
                } else {
                    plain
                };
                Some(Quantity { value, dim, kind })
            }
        }
    }

    /// `a ^ b`: the exponent is a plain number, whole when the base has a unit.
    fn power(&mut self, a: Quantity, b: Quantity, rs: Span) -> Option<Quantity> {
        let plain = TempKind::NotTemperature;
        if !b.dim.is_none() {
            self.diags.push(
                Diagnostic::error(
                    "E101",
                    format!(
                        "an exponent must be a dimensionless number, not {}",
                        b.dim.describe()
                    ),
                    rs,
                )
                .with_label("exponent with a unit"),
            );
            return None;
        }
        let dim = if a.dim.is_none() {
            Some(Dim::NONE)
        } else if b.value.fract() == 0.0 && b.value.abs() <= 12.0 {
            a.dim.powi(b.value as i32)
        } else {
            None
        };
        let Some(dim) = dim else {
            self.diags.push(
                Diagnostic::error(
                    "E101",
                    format!(
                        "{} can only be raised to a whole-number power",
                        a.dim.describe()
                    ),
                    rs,
                )
                .with_label("not a whole number")
                .with_help("use `sqrt` for square roots of areas and similar"),
            );
            return None;
        };
        let kind = if dim == Dim::TEMPERATURE {
            a.kind
        } else {
            plain
        };
        Some(Quantity {
            value: a.value.powf(b.value),
            dim,
            kind,
        })
    }
}

/// Check that a quantity has the expected dimension; the message names what was expected and
/// what was found, in the analyst's words.
pub fn expect_dim(
    q: Quantity,
    expected: Dim,
    what: &str,
    expr: &Expr,
    source: &str,
) -> Result<(), Diagnostic> {
    if q.dim == expected {
        return Ok(());
    }
    let written = source.get(expr.span.range()).unwrap_or("this value");
    Err(Diagnostic::error(
        "E101",
        format!(
            "{what} expects {}; `{written}` is {}",
            expected.describe(),
            q.dim.describe()
        ),
        expr.span,
    )
    .with_label(format!("{} here", q.dim.describe()))
    .with_help(format!(
        "write {what} in a unit of {}, e.g. `{}`",
        expected.name().unwrap_or("the right dimension"),
        expected.si_unit()
    )))
}

/// Check that a temperature can be used as a point on a scale.
pub fn expect_point(q: Quantity, what: &str, expr: &Expr) -> Result<(), Diagnostic> {
    if q.kind == TempKind::Difference {
        return Err(Diagnostic::error(
            "E103",
            format!(
                "{what} expects a temperature on a scale, but this is a temperature difference"
            ),
            expr.span,
        )
        .with_label("a difference")
        .with_help("write the temperature in °C or °F (e.g. `20 °C`), or absolute in K"));
    }
    Ok(())
}
