//! Arguments checked against the schema (`crate::schema`): names (unknown ones with a
//! suggestion from the specs, duplicates, unnamed ones), values (dimension, temperature on a
//! scale or difference, material and schedule names, k(T) tables) and ranges, then whether the
//! required ones, alternatives and pairs are all there. Declarations (nodes, materials,
//! schedules, transient runs, build-up uses) go through [`Cx::decl_args`]; element kinds and
//! regions through [`Cx::args`], which builds the element's [`Args`].

use super::{Cx, Kinds};
use crate::conductivity::material_args as kt;
use crate::diagnostic::{did_you_mean, Diagnostic};
use crate::elements::{ArgValue, Args, ElementKind, Material};
use crate::eval::{expect_dim, expect_point};
use crate::schema::{ArgSpec, ArgType, Need, Range};
use crate::span::Span;
use crate::syntax::{Arg, Expr, ExprKind, Ident};
use crate::units::{Dim, Quantity, TempKind};
use rustc_hash::FxHashMap;

/// A checked argument value.
#[derive(Clone, Debug)]
pub(super) enum Value {
    Quantity(Quantity),
    Material(Material),
    /// The index of a checked schedule that fits the argument.
    Schedule(usize),
    /// k(T) points (K, W/(m·K)), temperatures rising.
    Table(Vec<(f64, f64)>),
    /// The name of a node, resolved by the declaration's own code.
    NodeName,
    /// One of the words of a [`ArgType::Choice`].
    Choice(&'static str),
}

/// The arguments of one declaration after checking.
#[derive(Default)]
pub(super) struct Checked {
    /// Values that passed their checks, with the span of the name (of the value when unnamed)
    /// and of the value.
    values: FxHashMap<&'static str, (Value, Span, Span)>,
    /// Every known argument written, in order, whether or not its value passed.
    pub written: Vec<(&'static str, Span)>,
    /// Nothing failed and nothing is missing.
    pub ok: bool,
}

impl Checked {
    pub fn value(&self, name: &str) -> Option<&Value> {
        self.values.get(name).map(|v| &v.0)
    }
    /// A quantity's value in SI.
    pub fn get(&self, name: &str) -> Option<f64> {
        match self.value(name) {
            Some(Value::Quantity(q)) => Some(q.value),
            _ => None,
        }
    }
    /// A quantity's value with its value span.
    pub fn with_span(&self, name: &str) -> Option<(f64, Span)> {
        match self.values.get(name) {
            Some((Value::Quantity(q), _, s)) => Some((q.value, *s)),
            _ => None,
        }
    }
    /// The span of the argument's name, when written.
    pub fn name_span(&self, name: &str) -> Option<Span> {
        self.written.iter().find(|w| w.0 == name).map(|w| w.1)
    }
    /// The span of the argument's value, when it passed.
    pub fn value_span(&self, name: &str) -> Option<Span> {
        self.values.get(name).map(|v| v.2)
    }
    pub fn is_written(&self, name: &str) -> bool {
        self.name_span(name).is_some()
    }
    /// Written, but its value failed a check (already reported).
    pub fn failed(&self, name: &str) -> bool {
        self.is_written(name) && !self.values.contains_key(name)
    }
}

impl Cx<'_> {
    /// Check a declaration's arguments against `specs`. `subject` names it in messages
    /// (``node `room` ``), `example` is a complete declaration for help texts, `at` is where a
    /// missing argument is reported (the declared name, or a build-up use's call), and
    /// `unnamed_first` lets the first argument go without its name (a build-up use).
    #[allow(clippy::too_many_arguments)]
    pub(super) fn decl_args(
        &mut self,
        specs: &[ArgSpec],
        subject: &str,
        example: &str,
        at: Span,
        args: &[Arg],
        unnamed_first: bool,
    ) -> Checked {
        let mut out = Checked {
            ok: true,
            ..Checked::default()
        };
        let mut suggested: Vec<&str> = Vec::new();
        for (i, arg) in args.iter().enumerate() {
            let spec = match &arg.name {
                Some(n) => match specs.iter().find(|s| s.name == n.name) {
                    Some(s) => s,
                    None => {
                        let known: Vec<&'static str> = specs.iter().map(|s| s.name).collect();
                        suggested.extend(self.unknown_arg(n, subject, &known));
                        out.ok = false;
                        continue;
                    }
                },
                None if unnamed_first && i == 0 && !specs.is_empty() => &specs[0],
                None => {
                    let message = if unnamed_first {
                        "only the first argument may be written without its name".to_string()
                    } else {
                        format!("the arguments of {subject} are written `name = value`")
                    };
                    self.diags.push(
                        Diagnostic::error("E204", message, arg.span)
                            .with_label("argument without a name")
                            .with_help(format!("write e.g. `{example}`")),
                    );
                    out.ok = false;
                    continue;
                }
            };
            let key_span = arg.name.as_ref().map_or(arg.span, |n| n.span);
            if let Some(prev) = out.name_span(spec.name) {
                self.duplicate_arg(spec.name, key_span, prev);
                out.ok = false;
                continue;
            }
            out.written.push((spec.name, key_span));
            match self.arg_value(spec, &arg.value) {
                Some(v) => {
                    out.values.insert(spec.name, (v, key_span, arg.value.span));
                }
                None => out.ok = false,
            }
        }
        out.ok &= self.needs(specs, subject, example, &out, &suggested, at);
        out
    }

    /// Whether every required argument, alternative and pair is given; reports what is not.
    /// An argument written under a name the checker suggested it for (`araa` for `area`) is
    /// reported once, as the unknown name; `span` is where a missing one is reported.
    #[allow(clippy::too_many_arguments)]
    fn needs(
        &mut self,
        specs: &[ArgSpec],
        subject: &str,
        example: &str,
        c: &Checked,
        suggested: &[&str],
        span: Span,
    ) -> bool {
        let has = |n: &str| c.is_written(n) || suggested.contains(&n);
        let spec = |n: &str| specs.iter().find(|s| s.name == n);
        let mut ok = true;
        let missing: Vec<&ArgSpec> = specs
            .iter()
            .filter(|s| s.need == Need::Required && !has(s.name))
            .collect();
        if !missing.is_empty() {
            ok = false;
            let list = missing
                .iter()
                .map(|s| format!("`{}`", s.name))
                .collect::<Vec<_>>()
                .join(" and ");
            let what = missing
                .iter()
                .map(|s| format!("`{}` ({})", s.name, s.doc))
                .collect::<Vec<_>>()
                .join(" and ");
            self.diags.push(
                Diagnostic::error("E203", format!("{subject} needs {list}"), span)
                    .with_label(format!("{list} missing"))
                    .with_help(format!("add {what}, e.g. `{example}`")),
            );
        }
        let position = |n: &str| specs.iter().position(|x| x.name == n);
        for s in specs {
            match s.need {
                // Each pair once: from the first of the two in the specs.
                Need::Either(o) if !has(s.name) && !has(o) && position(o) > position(s.name) => {
                    ok = false;
                    self.diags.push(
                        Diagnostic::error(
                            "E203",
                            format!("{subject} needs `{}` or `{o}`", s.name),
                            span,
                        )
                        .with_label(format!("`{}` or `{o}` missing", s.name))
                        .with_help(format!(
                            "add `{}` ({}) or `{o}` ({}), e.g. `{example}`",
                            s.name,
                            s.doc,
                            spec(o).map_or("", |x| x.doc)
                        )),
                    );
                }
                Need::Either(o) | Need::Instead(o) if c.is_written(s.name) && c.is_written(o) => {
                    let (a, b) = (c.name_span(s.name), c.name_span(o));
                    // Reported at the later of the two, from that one's spec.
                    if let (Some(a), Some(b)) = (a, b) {
                        if a.start > b.start {
                            ok = false;
                            self.diags.push(
                                Diagnostic::error(
                                    "E207",
                                    format!("{subject} takes `{o}` or `{}`, not both", s.name),
                                    a,
                                )
                                .with_label(format!("`{}` given as well as `{o}`", s.name))
                                .with_secondary(b, format!("`{o}` given here"))
                                .with_help(format!(
                                    "keep one of them; `{o}` and `{}` are alternatives",
                                    s.name
                                )),
                            );
                        }
                    }
                }
                Need::With(o) if c.is_written(s.name) && !has(o) => {
                    ok = false;
                    let at = c.name_span(s.name).unwrap_or(span);
                    self.diags.push(
                        Diagnostic::error(
                            "E203",
                            format!("{subject} gives `{}` without `{o}`", s.name),
                            at,
                        )
                        .with_label(format!("`{o}` missing"))
                        .with_help(format!(
                            "`{}` goes together with `{o}`: add `{o}` ({}), or remove `{}`",
                            s.name,
                            spec(o).map_or("", |x| x.doc),
                            s.name
                        )),
                    );
                }
                _ => {}
            }
        }
        ok
    }

    /// Check one value against its spec: type and dimension, then range.
    pub(super) fn arg_value(&mut self, spec: &ArgSpec, e: &Expr) -> Option<Value> {
        let name = spec.name;
        match spec.ty {
            ArgType::Material => self.material_ref(spec, e).map(Value::Material),
            ArgType::Node => match &e.kind {
                ExprKind::Name(_) => Some(Value::NodeName),
                _ => {
                    self.diags.push(
                        Diagnostic::error(
                            "E105",
                            format!("`{name}` expects the name of a node"),
                            e.span,
                        )
                        .with_label("not a node name")
                        .with_help(format!("write e.g. `{name} = base`")),
                    );
                    None
                }
            },
            ArgType::Choice(words) => self.choice(spec, words, e).map(Value::Choice),
            ArgType::Conductivity if kt::is_table(e) => self.k_table(e).map(Value::Table),
            ArgType::Scheduled(dim) => match self.schedule_value(spec, dim, e) {
                Some(v) => v.map(Value::Schedule),
                None => self.plain_value(spec, e),
            },
            _ => self.plain_value(spec, e),
        }
    }

    /// A value that is a quantity (not a name of a material, node or schedule).
    fn plain_value(&mut self, spec: &ArgSpec, e: &Expr) -> Option<Value> {
        let name = spec.name;
        let dim = spec.ty.dim().unwrap_or(Dim::NONE);
        let q = if let Range::Count(_) = spec.range {
            // A count has a bound of its own (E216), which says more than the range of values.
            self.dimensioned(e, dim, name)?
        } else {
            self.quantity(e, dim, name)?
        };
        match spec.ty {
            ArgType::Temperature | ArgType::Scheduled(Dim::TEMPERATURE) => {
                if let Err(d) = expect_point(q, name, e) {
                    self.diags.push(d);
                    return None;
                }
            }
            ArgType::TemperatureDifference if q.kind == TempKind::Point => {
                self.diags.push(
                    Diagnostic::error(
                        "E103",
                        format!(
                            "`{name}` is a temperature difference, not a temperature on a scale"
                        ),
                        e.span,
                    )
                    .with_label("a temperature on a scale")
                    .with_help(format!("write it in K or Δ°C, e.g. `{name} = 0.01 K`")),
                );
                return None;
            }
            _ => {}
        }
        if !self.in_spec_range(spec, q.value, e) {
            return None;
        }
        if dim == Dim::CONDUCTIVITY {
            self.conductivity_warning(q.value, e);
        }
        Some(Value::Quantity(q))
    }

    /// The range check of a spec; reports and returns false outside it.
    fn in_spec_range(&mut self, spec: &ArgSpec, v: f64, e: &Expr) -> bool {
        let name = spec.name;
        let dim = spec.ty.dim();
        let written = self.written_with_value(e, v, dim);
        let d = match spec.range {
            Range::Any => return true,
            Range::Positive => return self.positive(v, e, name, dim),
            Range::Fraction if !self.positive(v, e, name, dim) => return false,
            Range::Fraction if v <= 1.0 => return true,
            Range::Fraction => Diagnostic::error(
                "E213",
                self.owned(format!("{name} must lie between 0 and 1; {written} is not")),
                e.span,
            )
            .with_label("outside 0 … 1")
            .with_help(format!(
                "give a value greater than 0 and at most 1 (`{name}`: {})",
                spec.doc
            )),
            Range::Count(max) if v.fract() == 0.0 && (1.0..=max as f64).contains(&v) => {
                return true
            }
            Range::Count(max) => Diagnostic::error(
                "E216",
                self.owned(format!(
                    "`{name}` must be a whole number from 1 to {max}; {written} is not"
                )),
                e.span,
            )
            .with_label("not a usable count")
            .with_help(format!(
                "give the {}, e.g. `{name} = 10`; check the number for a slip",
                spec.doc
            )),
            Range::AboveAbsoluteZero if v > 0.0 => return true,
            Range::AboveAbsoluteZero => Diagnostic::error(
                "E202",
                self.owned(format!("`{name}` is at or below absolute zero")),
                e.span,
            )
            .with_label("below 0 K")
            .with_help("check the value and its unit (°C, °F or K)"),
        };
        self.diags.push(d);
        false
    }

    /// A message about an argument, led by what the argument belongs to (`` `cylinder`
    /// (`wall` of build-up `lagged`) in link `main`: ``) when a declaration is being checked, so
    /// that the message alone says where to look.
    fn owned(&self, message: String) -> String {
        if self.owner.is_empty() {
            message
        } else {
            format!("{}: {message}", self.owner)
        }
    }

    /// An argument's value as written, in backticks, and — when it is not a number written
    /// out (a parameter, an expression) — the value it came to: `` `t` (= -0.003 m) ``.
    fn written_with_value(&self, e: &Expr, v: f64, dim: Option<Dim>) -> String {
        let written = self.written(e);
        let literal = match &e.kind {
            ExprKind::Number { .. } => true,
            ExprKind::Neg(x) => matches!(x.kind, ExprKind::Number { .. }),
            _ => false,
        };
        match dim {
            Some(dim) if !literal => format!("`{written}` (= {})", crate::elements::show(v, dim)),
            _ => format!("`{written}`"),
        }
    }

    /// The text of an expression as written.
    fn written(&self, e: &Expr) -> String {
        self.text(e.span)
            .get(e.span.range())
            .unwrap_or("")
            .to_string()
    }

    /// Evaluate an argument value and check its dimension, without the range check.
    fn dimensioned(&mut self, e: &Expr, dim: Dim, what: &str) -> Option<Quantity> {
        let kinds = Kinds(&self.symbols);
        let q = self.ev.eval(e, &kinds)?;
        let src = self.sources.text(e.span.file);
        match expect_dim(q, dim, what, e, src) {
            Ok(()) => Some(q),
            Err(d) => {
                self.diags.push(d);
                None
            }
        }
    }

    /// Evaluate an argument value and check its dimension and the range of values.
    pub(super) fn quantity(&mut self, e: &Expr, dim: Dim, what: &str) -> Option<Quantity> {
        let q = self.dimensioned(e, dim, what)?;
        self.in_range(q, what, e).then_some(q)
    }

    pub(super) fn positive(&mut self, v: f64, e: &Expr, what: &str, dim: Option<Dim>) -> bool {
        if v > 0.0 && v.is_finite() {
            return true;
        }
        let written = self.written_with_value(e, v, dim);
        self.diags.push(
            Diagnostic::error(
                "E202",
                self.owned(format!(
                    "{what} must be greater than zero; {written} is not"
                )),
                e.span,
            )
            .with_label(if v == 0.0 { "zero" } else { "not positive" })
            .with_help(format!("give {what} a positive value")),
        );
        false
    }

    /// One of the words a [`ArgType::Choice`] argument takes (E221 otherwise).
    fn choice(
        &mut self,
        spec: &ArgSpec,
        words: &'static [&'static str],
        e: &Expr,
    ) -> Option<&'static str> {
        if let ExprKind::Name(id) = &e.kind {
            if let Some(w) = words.iter().find(|w| **w == id.name) {
                return Some(w);
            }
        }
        let list = words
            .iter()
            .map(|w| format!("`{w}`"))
            .collect::<Vec<_>>()
            .join(", ");
        let written = self.written(e);
        let of = if self.owner.is_empty() {
            String::new()
        } else {
            format!(" of {}", self.owner)
        };
        let mut d = Diagnostic::error(
            "E221",
            format!("`{}`{of} is one of {list}; `{written}` is not", spec.name),
            e.span,
        )
        .with_label(format!("not one of {list}"));
        let slip = match &e.kind {
            ExprKind::Name(id) => did_you_mean(&id.name, words.iter().copied()),
            _ => None,
        };
        d = match slip {
            Some(s) => d.with_help(format!("did you mean `{s}`?")).with_fix(
                format!("Replace with `{s}`"),
                e.span,
                s,
            ),
            None => d.with_help(format!("write e.g. `{} = {}`", spec.name, words[0])),
        };
        self.diags.push(d);
        None
    }

    pub(super) fn duplicate_arg(&mut self, name: &str, span: Span, prev: Span) {
        self.diags.push(
            Diagnostic::error("E205", format!("`{name}` is given twice"), span)
                .with_label("given again")
                .with_secondary(prev, "first given here")
                .with_help("keep one of them"),
        );
    }

    /// E204 for an argument name `what` does not take; returns the name suggested instead.
    pub(super) fn unknown_arg(
        &mut self,
        an: &Ident,
        what: &str,
        known: &[&'static str],
    ) -> Option<&'static str> {
        let list = known
            .iter()
            .map(|k| format!("`{k}`"))
            .collect::<Vec<_>>()
            .join(", ");
        let mut d = Diagnostic::error(
            "E204",
            format!("{what} has no argument `{}`", an.name),
            an.span,
        )
        .with_label("unknown argument");
        let suggestion = did_you_mean(&an.name, known.iter().copied());
        d = match suggestion {
            Some(s) => d
                .with_help(format!("did you mean `{s}`? It takes {list}"))
                .with_fix(format!("Replace with `{s}`"), an.span, s),
            None => d.with_help(format!("it takes {list}")),
        };
        self.diags.push(d);
        suggestion
    }

    /// Check an element's arguments against its specs. `supplied` are the arguments a build-up
    /// use or a region gives the element (its area, the radius it starts at): written inside
    /// as well, they are E210.
    pub(super) fn args(
        &mut self,
        kind: &'static dyn ElementKind,
        args: &[Arg],
        call_span: Span,
        supplied: &[(&'static str, f64, Span)],
    ) -> Option<Args> {
        let specs = kind.params();
        let mut values = FxHashMap::default();
        let mut ok = true;
        let mut seen: FxHashMap<&'static str, Span> = FxHashMap::default();
        for (i, arg) in args.iter().enumerate() {
            let spec = match &arg.name {
                Some(n) => match specs.iter().find(|s| s.name == n.name) {
                    Some(s) => s,
                    None => {
                        let known: Vec<&'static str> = specs.iter().map(|s| s.name).collect();
                        self.unknown_arg(n, &format!("`{}`", kind.name()), &known);
                        ok = false;
                        continue;
                    }
                },
                None if i == 0 => &specs[0],
                None => {
                    self.diags.push(
                        Diagnostic::error(
                            "E204",
                            "only the first argument may be written without its name",
                            arg.span,
                        )
                        .with_label("argument without a name")
                        .with_help(format!(
                            "write `name = value`; `{}` takes {}",
                            kind.name(),
                            specs
                                .iter()
                                .map(|s| format!("`{}`", s.name))
                                .collect::<Vec<_>>()
                                .join(", ")
                        )),
                    );
                    ok = false;
                    continue;
                }
            };
            let key_span = arg.name.as_ref().map(|n| n.span).unwrap_or(arg.span);
            if let Some(&prev) = seen.get(spec.name) {
                self.duplicate_arg(spec.name, key_span, prev);
                ok = false;
                continue;
            }
            seen.insert(spec.name, key_span);
            if supplied.iter().any(|s| s.0 == spec.name) {
                self.diags
                    .push(crate::radial::supplied_inside(spec.name, arg.span));
                ok = false;
                continue;
            }
            match self.arg_value(spec, &arg.value) {
                Some(Value::Quantity(q)) => {
                    values.insert(spec.name, (ArgValue::Quantity(q.value), arg.value.span));
                }
                Some(Value::Material(m)) => {
                    values.insert(spec.name, (ArgValue::Material(m), arg.value.span));
                }
                Some(Value::Choice(w)) => {
                    values.insert(spec.name, (ArgValue::Choice(w), arg.value.span));
                }
                // Element kinds take quantities, materials and choices only (see `crate::schema`).
                Some(_) | None => ok = false,
            }
        }
        for &(name, v, span) in supplied {
            if specs.iter().any(|p| p.name == name) {
                values.insert(name, (ArgValue::Quantity(v), span));
            }
        }
        ok.then_some(Args {
            kind: kind.name(),
            values,
            call_span,
        })
    }
}
