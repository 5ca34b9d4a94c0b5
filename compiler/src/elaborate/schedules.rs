//! Pass 4, schedules: every `schedule` table is checked before the nodes, which may follow
//! one (`fixed = NAME`, `load = NAME`).

use super::context::declarations;
use super::{Cx, Kinds};
use crate::diagnostic::Diagnostic;
use crate::schema::ArgSpec;
use crate::span::Span;
use crate::symbols::SymbolKind;
use crate::syntax::{Arg, ExprKind, Ident, Item, Row};
use crate::transient::schedule::Schedule;
use crate::units::{Dim, Quantity, TempKind};
use rustc_hash::FxHashMap;

impl Cx<'_> {
    /// Check every `schedule` (before nodes, which may use them).
    pub(super) fn schedules(&mut self, items: &[&Item]) {
        for (name, args, rows, _) in declarations(items, "schedule") {
            self.schedule(name, args, rows);
        }
    }

    pub(super) fn named_args<'x>(
        &mut self,
        args: &'x [Arg],
        what: &str,
        example: &str,
    ) -> Vec<(&'x Ident, &'x Arg)> {
        let mut seen: FxHashMap<&str, Span> = FxHashMap::default();
        let mut out = Vec::new();
        for arg in args {
            let Some(an) = &arg.name else {
                self.diags.push(
                    Diagnostic::error(
                        "E204",
                        format!("the arguments of {what} are written `name = value`"),
                        arg.span,
                    )
                    .with_label("argument without a name")
                    .with_help(format!("write e.g. `{example}`")),
                );
                continue;
            };
            if let Some(prev) = seen.insert(&an.name, an.span) {
                self.duplicate_arg(&an.name, an.span, prev);
                continue;
            }
            out.push((an, arg));
        }
        out
    }

    fn schedule(&mut self, name: &Ident, args: &[Arg], rows: Option<&[Row]>) {
        self.owner = format!("schedule `{}`", name.name);
        let repeat = self.declared("schedule", name, args).get("repeat");
        let Some(rows) = rows.filter(|r| !r.is_empty()) else {
            self.diags.push(
                Diagnostic::error("E203", format!("schedule `{}` has no rows", name.name), name.span)
                    .with_label("no `TIME: VALUE` rows")
                    .with_help("list the points in braces, one `TIME: VALUE` row per line, such as `0 h: 4 °C` and then `6 h: -3 °C`")
            );
            return;
        };
        let mut ok = true;
        let mut points: Vec<(f64, f64)> = Vec::new();
        let mut first: Option<(Quantity, Span)> = None;
        let mut kind = TempKind::NotTemperature;
        let mut last_time: Option<(f64, Span)> = None;
        for row in rows {
            let t = self.quantity(&row.key, Dim::TIME, "a schedule time");
            let v = self.ev.eval(&row.value, &Kinds(&self.symbols));
            let (Some(t), Some(v)) = (t, v) else {
                ok = false;
                continue;
            };
            if !self.in_range(v, "a schedule value", &row.value) {
                ok = false;
                continue;
            }
            match first {
                None => first = Some((v, row.value.span)),
                Some((q0, s0)) if q0.dim != v.dim => {
                    ok = false;
                    self.diags.push(
                        Diagnostic::error(
                            "E101",
                            format!(
                                "the values of a schedule must all be {}; this is {}",
                                q0.dim.describe(),
                                v.dim.describe()
                            ),
                            row.value.span,
                        )
                        .with_label(format!("{} here", v.dim.describe()))
                        .with_secondary(s0, "the first value sets the schedule's kind")
                        .with_help(
                            "a schedule gives either temperatures or heat loads; check the unit",
                        ),
                    );
                    continue;
                }
                Some(_) => {}
            }
            let clash = matches!(
                (kind, v.kind),
                (TempKind::Point, TempKind::Difference) | (TempKind::Difference, TempKind::Point)
            );
            if clash {
                ok = false;
                self.diags.push(
                    Diagnostic::error("E103", "a schedule mixes temperatures on a scale with temperature differences", row.value.span)
                        .with_label("different from the rows before it")
                        .with_help("write every value as a temperature (`°C`, `°F`, `K`) or every value as a difference (`Δ°C`)"),
                );
                continue;
            }
            // A point or a difference decides the schedule's kind; `K` alone fits either.
            if matches!(v.kind, TempKind::Point | TempKind::Difference)
                || kind == TempKind::NotTemperature
            {
                kind = v.kind;
            }
            if let Some((prev, prev_span)) = last_time {
                if t.value <= prev {
                    ok = false;
                    self.diags.push(
                        Diagnostic::error("E701", "the times of a schedule must increase from row to row", row.key.span)
                            .with_label("not later than the row before")
                            .with_secondary(prev_span, "previous time")
                            .with_help("order the rows by time; to make a step, put two rows a moment apart (e.g. `6 h` and `6.01 h`)"),
                    );
                    continue;
                }
            }
            if let Some(period) = repeat {
                if t.value < 0.0 || t.value > period {
                    ok = false;
                    self.diags.push(
                        Diagnostic::error("E701", "a repeating schedule's times must lie within one period, from 0 to `repeat`", row.key.span)
                            .with_label("outside the period")
                            .with_help("give times from 0 up to the period, e.g. `0 h` to `24 h` for `repeat = 24 h`"),
                    );
                    continue;
                }
            }
            last_time = Some((t.value, row.key.span));
            points.push((t.value, v.value));
        }
        if !ok {
            return;
        }
        let Some((q0, _)) = first else { return };
        self.timed
            .schedule_index
            .insert(name.name.clone(), self.timed.dynamics.schedules.len());
        self.timed.dynamics.schedules.push(Schedule {
            name: name.name.clone(),
            span: name.span,
            points,
            repeat,
            dim: q0.dim,
            kind,
        });
    }

    /// Whether schedule `i` fits an argument of dimension `dim`: a schedule of temperatures on
    /// a scale above 0 K for a temperature, of the same dimension otherwise.
    fn schedule_fits(&self, dim: Dim, i: usize) -> bool {
        let s = &self.timed.dynamics.schedules[i];
        if dim == Dim::TEMPERATURE {
            s.dim == Dim::TEMPERATURE
                && s.kind != TempKind::Difference
                && s.points.iter().all(|p| p.1 > 0.0)
        } else {
            s.dim == dim
        }
    }

    /// An argument that may follow a schedule (`fixed = NAME`, `load = NAME`) naming one: its
    /// index, or `Some(None)` when it does not fit or failed its own checks (reported). `None`
    /// when the value is not the name of a schedule, so the ordinary check applies.
    pub(super) fn schedule_value(
        &mut self,
        spec: &ArgSpec,
        dim: Dim,
        value: &crate::syntax::Expr,
    ) -> Option<Option<usize>> {
        let ExprKind::Name(id) = &value.kind else {
            return None;
        };
        if self.symbols.get(&id.name)?.kind != SymbolKind::Schedule {
            return None;
        }
        self.symbols.add_ref(&id.name, id.span);
        // A schedule that failed its own checks (reported there) has no index: say nothing
        // more here, rather than that a schedule is not a value.
        let Some(&i) = self.timed.schedule_index.get(&id.name) else {
            return Some(None);
        };
        if self.schedule_fits(dim, i) {
            return Some(Some(i));
        }
        let s = &self.timed.dynamics.schedules[i];
        let expects = if dim == Dim::TEMPERATURE {
            "temperatures".to_string()
        } else if dim == Dim::POWER {
            "heat loads (a power)".to_string()
        } else {
            format!("values of {}", dim.describe())
        };
        let d = if s.dim != dim {
            Diagnostic::error(
                "E101",
                format!(
                    "`{}` expects a schedule of {expects}; `{}` gives {}",
                    spec.name,
                    id.name,
                    s.dim.describe()
                ),
                id.span,
            )
            .with_label(format!("this schedule gives {}", s.dim.describe()))
            .with_secondary(s.span, "schedule declared here")
            .with_help("use a schedule whose values have the right unit")
        } else if s.kind == TempKind::Difference {
            Diagnostic::error(
                "E103",
                format!(
                    "`{}` expects temperatures on a scale; schedule `{}` gives differences",
                    spec.name, id.name
                ),
                id.span,
            )
            .with_label("a schedule of temperature differences")
            .with_secondary(s.span, "schedule declared here")
            .with_help("write the schedule's values in °C, °F or K")
        } else {
            Diagnostic::error(
                "E202",
                format!("schedule `{}` goes to or below absolute zero", id.name),
                id.span,
            )
            .with_label("below 0 K")
            .with_secondary(s.span, "schedule declared here")
            .with_help("check the schedule's values and their unit")
        };
        self.diags.push(d);
        Some(None)
    }
}
