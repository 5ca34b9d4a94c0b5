//! Pass 10, studies: `case` declarations (a set of parameter values) and `transient` runs.

use super::context::declarations;
use super::params::fits_parameter;
use super::{Cx, Kinds};
use crate::diagnostic::{did_you_mean, Diagnostic};
use crate::symbols::SymbolKind;
use crate::syntax::{Arg, Ident, Item, Row};
use crate::transient::model::{CaseSpec, RunSpec};

impl Cx<'_> {
    /// Pass 10: every `case` and `transient` declaration, after links and limits.
    pub(super) fn studies(&mut self, items: &[&Item]) {
        for (name, args, rows, _) in declarations(items, "case") {
            self.no_rows(name, rows, "a case");
            self.case(name, args);
        }
        for (name, args, rows, _) in declarations(items, "transient") {
            self.no_rows(name, rows, "a transient run");
            self.run(name, args);
        }
        if let Some(first) = self.timed.studies.runs.first() {
            if self.timed.dynamics.capacities.is_empty() && !self.asm.net().nodes.is_empty() {
                self.diags.push(
                    Diagnostic::warning("W702", "no node has a capacity, so a transient run is a series of steady states", first.span)
                        .with_label("nothing stores heat")
                        .with_help("give the bodies that store heat a `capacity = ...` or `material = ..., volume = ...`"),
                );
            }
        }
    }

    fn no_rows(&mut self, name: &Ident, rows: Option<&[Row]>, what: &str) {
        if let Some(r) = rows.and_then(|r| r.first()) {
            self.diags.push(
                Diagnostic::error("E204", format!("{what} takes no table of rows"), r.span)
                    .with_label("row not expected here")
                    .with_help(format!(
                        "remove the braces after `{}`; tables belong to `schedule`",
                        name.name
                    )),
            );
        }
    }

    fn case(&mut self, name: &Ident, args: &[Arg]) {
        let mut overrides = Vec::new();
        let mut ok = true;
        for (an, arg) in self.named_args(args, "a case", "t_out = -10 °C") {
            let is_param = self.symbols.get(&an.name).map(|s| s.kind);
            if is_param != Some(SymbolKind::Param) {
                ok = false;
                let d = match is_param {
                    Some(k) => Diagnostic::error(
                        "E105",
                        format!("`{}` is {}, not a parameter", an.name, k.article()),
                        an.span,
                    )
                    .with_label("a case sets parameters")
                    .with_help(
                        "declare the value as a `param` and use it in the model, then set it here",
                    ),
                    None => {
                        let d = Diagnostic::error(
                            "E102",
                            format!("unknown parameter `{}`", an.name),
                            an.span,
                        )
                        .with_label("no parameter has this name");
                        match did_you_mean(&an.name, self.symbols.names_of(SymbolKind::Param)) {
                            Some(s) => d.with_help(format!("did you mean `{s}`?")).with_fix(
                                format!("Replace with `{s}`"),
                                an.span,
                                s,
                            ),
                            None => d.with_help(format!(
                                "a case sets parameters; declare `param {} = ...` first",
                                an.name
                            )),
                        }
                    }
                };
                self.diags.push(d);
                continue;
            }
            self.symbols.add_ref(&an.name, an.span);
            let kinds = Kinds(&self.symbols);
            let base = self.ev.param(&an.name, &kinds);
            let Some(q) = self.ev.eval(&arg.value, &kinds) else {
                ok = false;
                continue;
            };
            if let Some(base) = base {
                if let Err(d) = fits_parameter(
                    &an.name,
                    base,
                    q,
                    &arg.value,
                    self.sources.text(arg.value.span.file),
                ) {
                    ok = false;
                    self.diags.push(d);
                    continue;
                }
            }
            overrides.push((an.name.clone(), q));
        }
        if ok {
            self.timed.studies.cases.push(CaseSpec {
                name: name.name.clone(),
                span: name.span,
                overrides,
            });
        }
    }

    fn run(&mut self, name: &Ident, args: &[Arg]) {
        self.owner = format!("transient run `{}`", name.name);
        let c = self.declared("transient", name, args);
        // Missing (E203) or failed its own check: reported either way.
        let Some(duration) = c.get("duration") else {
            return;
        };
        let spec = RunSpec {
            name: name.name.clone(),
            span: name.span,
            duration,
            step: c.get("step"),
            output: c.get("output"),
            tolerance: c.get("tolerance"),
            start: c.get("start").unwrap_or(0.0),
        };
        if let Some(step) = spec.step {
            if spec.duration / step > crate::transient::MAX_STEPS as f64 {
                self.diags.push(
                    Diagnostic::error(
                        "E705",
                        format!(
                            "a step this short needs more than {} steps",
                            crate::transient::MAX_STEPS
                        ),
                        name.span,
                    )
                    .with_label("too many steps")
                    .with_help("lengthen `step`, or leave it out for the automatic step"),
                );
                return;
            }
        }
        if let Some(every) = spec.output {
            if spec.duration / every > crate::transient::MAX_OUTPUTS as f64 {
                let span = c.value_span("output").unwrap_or(name.span);
                self.diags.push(
                    Diagnostic::error(
                        "E708",
                        format!(
                            "an `output` interval this short would report the run more than {} times",
                            crate::transient::MAX_OUTPUTS
                        ),
                        span,
                    )
                    .with_label("too many reported times")
                    .with_help("lengthen `output` (e.g. `output = 1 min` for a run of hours), or leave it out for 100 reports"),
                );
                return;
            }
        }
        if c.ok {
            self.timed.studies.runs.push(spec);
        }
    }
}
