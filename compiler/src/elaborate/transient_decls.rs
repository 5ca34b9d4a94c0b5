//! Elaboration of what transient runs and studies need: `schedule` tables, node capacities and
//! initial temperatures, schedules that drive boundary temperatures and loads, the Biot-number
//! check, and the `case` and `transient` declarations. A child of `elaborate` so that it checks
//! arguments with the same context (evaluator, symbols, materials, diagnostics).

use super::args::{Checked, Value};
use super::{Cx, Kinds};
use crate::diagnostic::{did_you_mean, Diagnostic};
use crate::elements::{self, Material};
use crate::network::{Network, NodeId};
use crate::schema::ArgSpec;
use crate::span::Span;
use crate::symbols::SymbolKind;
use crate::syntax::{Arg, ExprKind, Ident, Item, ItemKind, Row};
use crate::transient::model::{
    Binding, CaseSpec, Driven, Dynamics, Lump, NodeCapacity, RunSpec, Studies,
};
use crate::transient::schedule::Schedule;
use crate::units::{Dim, Quantity, TempKind};
use rustc_hash::FxHashMap;

/// Biot number above which a body is not well described by one temperature (common practice).
pub const BIOT_LUMPED: f64 = 0.1;

/// What this pass collects while elaboration runs.
#[derive(Default)]
pub(super) struct Timed {
    pub dynamics: Dynamics,
    pub studies: Studies,
    schedule_index: FxHashMap<String, usize>,
}

/// The symbol kind of a contextual declaration word.
pub(super) fn symbol_kind(word: &str) -> SymbolKind {
    match word {
        "schedule" => SymbolKind::Schedule,
        "case" => SymbolKind::Case,
        _ => SymbolKind::Transient,
    }
}

fn declarations<'i>(
    items: &'i [&'i Item],
    which: &'static str,
) -> impl Iterator<Item = (&'i Ident, &'i [Arg], Option<&'i [Row]>, Span)> + 'i {
    items.iter().filter_map(move |i| match &i.kind {
        ItemKind::Declaration {
            word,
            name,
            args,
            rows,
        } if word.name == which => Some((name, args.as_slice(), rows.as_deref(), i.span)),
        _ => None,
    })
}

impl Cx<'_> {
    /// Check every `schedule` (before nodes, which may use them).
    pub(super) fn schedules(&mut self, items: &[&Item]) {
        for (name, args, rows, _) in declarations(items, "schedule") {
            self.schedule(name, args, rows);
        }
    }

    fn named_args<'x>(
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

    /// Capacity, initial temperature and schedules of a node just added to the network, from
    /// its checked arguments.
    pub(super) fn node_dynamics(&mut self, node: NodeId, name: &Ident, c: &Checked, fixed: bool) {
        for (arg, what) in [("fixed", Driven::Fixed), ("load", Driven::Load)] {
            if let (Some(&Value::Schedule(schedule)), Some(span)) =
                (c.value(arg), c.value_span(arg))
            {
                self.timed.dynamics.bindings.push(Binding {
                    node,
                    what,
                    schedule,
                    span,
                });
            }
        }
        let named = |n: &str| c.get(n).zip(c.name_span(n));
        let capacity = named("capacity");
        let material = match (c.value("material"), c.name_span("material")) {
            (Some(Value::Material(m)), Some(s)) => Some((m.clone(), s)),
            _ => None,
        };
        let material_failed = c.failed("material");
        let (volume, mass, initial) = (named("volume"), named("mass"), named("initial"));
        let storing = ["capacity", "material", "volume", "mass", "initial"];
        let given: Vec<(&str, Span)> = c
            .written
            .iter()
            .copied()
            .filter(|w| storing.contains(&w.0))
            .collect();
        // What failed, or stands without what it needs (both reported already), says no more.
        let mut failed = ["capacity", "volume", "mass", "initial"]
            .iter()
            .any(|n| c.failed(n))
            || (c.is_written("capacity") && c.is_written("material"))
            || (!c.is_written("material") && (c.is_written("volume") || c.is_written("mass")));
        if fixed {
            if let Some(&(arg, span)) = given.first() {
                self.diags.push(
                    Diagnostic::error("E702", format!("node `{}` is fixed, so `{arg}` has no effect", name.name), span)
                        .with_label("on a boundary temperature")
                        .with_help("a fixed node's temperature is given for all time; put the capacity on a free node linked to it, or remove `fixed`"),
                );
            }
            return;
        }
        let mut stored = None;
        match (capacity, &material) {
            // Both given: E207 from the schema's `Instead` check.
            (Some(_), Some(_)) => {}
            (Some((value, span)), None) => {
                stored = Some(NodeCapacity {
                    node,
                    capacity: value,
                    span,
                    lump: None,
                })
            }
            (None, Some((m, span))) => {
                stored = self.material_capacity(node, name, m, *span, volume, mass)
            }
            (None, None) => {}
        }
        if material.is_some() && stored.is_none() {
            failed = true;
        }
        if let Some(c) = stored {
            self.timed.dynamics.capacities.push(c);
        } else if let Some((_, s)) = initial {
            if !failed && !material_failed {
                self.diags.push(
                    Diagnostic::error("E704", format!("node `{}` stores no heat, so `initial` has no effect", name.name), s)
                        .with_label("no capacity on this node")
                        .with_help("give the node a `capacity = ...` (or `material = ..., volume = ...`); a node without capacity always follows its neighbours"),
                );
            }
            return;
        }
        if let Some((t, s)) = initial {
            self.timed.dynamics.initial.push((node, t, s));
        }
    }

    fn alternatives(&mut self, a: &str, b: &str, span_a: Span, span_b: Span) {
        self.diags.push(
            Diagnostic::error(
                "E207",
                format!("a node takes `{a}` or `{b}`, not both"),
                span_b,
            )
            .with_label(format!("`{b}` given as well as `{a}`"))
            .with_secondary(span_a, format!("`{a}` given here"))
            .with_help(format!(
                "keep one of them; `{a}` and `{b}` state the capacity two ways"
            )),
        );
    }

    fn material_capacity(
        &mut self,
        node: NodeId,
        name: &Ident,
        m: &Material,
        span: Span,
        volume: Option<(f64, Span)>,
        mass: Option<(f64, Span)>,
    ) -> Option<NodeCapacity> {
        let missing = |what: &str, example: &str| {
            Diagnostic::error(
                "E703",
                format!(
                    "material `{}` has no `{what}`, needed for the capacity of node `{}`",
                    m.name, name.name
                ),
                span,
            )
            .with_label(format!("`{what}` missing"))
            .with_secondary(m.span, "material declared here")
            .with_help(format!("add it to the material, e.g. `{what} = {example}`"))
        };
        let (v, ms) = match (volume, mass) {
            (Some(v), Some(ms)) => {
                self.alternatives("volume", "mass", v.1, ms.1);
                return None;
            }
            (None, None) => {
                self.diags.push(
                    Diagnostic::error(
                        "E203",
                        format!(
                            "node `{}` needs the `volume` or `mass` of its material",
                            name.name
                        ),
                        span,
                    )
                    .with_label("`volume` or `mass` missing")
                    .with_help("add it, e.g. `material = water, volume = 2.5 L`"),
                );
                return None;
            }
            (v, ms) => (v.map(|v| v.0), ms.map(|m| m.0)),
        };
        let Some(cp) = m.specific_heat else {
            self.diags.push(missing("specific_heat", "4180 J/(kg*K)"));
            return None;
        };
        let (capacity, volume) = match (v, ms) {
            (Some(v), _) => {
                let Some(rho) = m.density else {
                    self.diags.push(missing("density", "1000 kg/m^3"));
                    return None;
                };
                (rho * v * cp, Some(v))
            }
            (None, Some(mass)) => (mass * cp, m.density.map(|rho| mass / rho)),
            (None, None) => return None,
        };
        Some(NodeCapacity {
            node,
            capacity,
            span,
            lump: Some(Lump {
                material: m.name.clone(),
                k: m.k,
                volume,
            }),
        })
    }

    /// After links and limits: the Biot-number check, cases and transient runs.
    pub(super) fn finish_dynamics(&mut self, items: &[&Item], net: &Network) {
        self.biot_warnings(net);
        for (name, args, rows, _) in declarations(items, "case") {
            self.no_rows(name, rows, "a case");
            self.case(name, args);
        }
        for (name, args, rows, _) in declarations(items, "transient") {
            self.no_rows(name, rows, "a transient run");
            self.run(name, args);
        }
        if let Some(first) = self.timed.studies.runs.first() {
            if self.timed.dynamics.capacities.is_empty() && !net.nodes.is_empty() {
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

    fn biot_warnings(&mut self, net: &Network) {
        let temps = representative_temperatures(net, &self.timed.dynamics.initial);
        for c in &self.timed.dynamics.capacities {
            let Some(lump) = &c.lump else { continue };
            let Some(volume) = lump.volume else { continue };
            let Some(biot) = biot_number_at(net, c.node, volume, lump.k, &temps) else {
                continue;
            };
            if biot.number > BIOT_LUMPED {
                self.diags.push(
                    Diagnostic::warning(
                        "W701",
                        format!("node `{}` may not be one temperature: Biot number h·Lc/k = {:.3} is above {BIOT_LUMPED}", net.nodes[c.node].name, biot.number),
                        c.span,
                    )
                    .with_label(format!(
                        "h = {}, Lc = V/A = {}, k = {}",
                        elements::show(biot.h, Dim::HEAT_TRANSFER_COEFF),
                        elements::show(biot.length, Dim::LENGTH),
                        elements::show(lump.k, Dim::CONDUCTIVITY)
                    ))
                    .with_help(
                        "inside the body the temperature varies by more than the lumped model allows (Bi > 0.1 is common practice); split the body into \
                         several nodes joined by `layer` links, or read the result as a rough estimate (a stirred or convecting liquid mixes better than conduction alone suggests)",
                    ),
                );
            }
        }
    }
}

/// A Biot number with its parts.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Biot {
    pub number: f64,
    /// Area-weighted mean film coefficient over the node's film links, W/(m²·K).
    pub h: f64,
    /// Characteristic length V / A_surface, m.
    pub length: f64,
    /// Total area of the node's film links, m².
    pub surface: f64,
}

/// Bi = h·Lc/k with Lc = V/A, where A is the total area of the `film` links that touch the node
/// and h their area-weighted mean coefficient (ΣG/ΣA). `None` when the node has neither a film
/// nor a radiation link. Radiation links at the node add their linearised coefficient (see [`biot_number_at`]), at
/// the fixed temperatures and stated initial ones (the mean fixed temperature elsewhere).
pub fn biot_number(net: &Network, node: NodeId, volume: f64, k: f64) -> Option<Biot> {
    let temps = representative_temperatures(net, &net.dynamics.initial);
    biot_number_at(net, node, volume, k, &temps)
}

/// Node temperatures to judge temperature-dependent links by before any solve: fixed values,
/// stated initial temperatures, and the mean fixed temperature (20 °C without one) elsewhere.
pub fn representative_temperatures(
    net: &Network,
    initial: &[(NodeId, f64, crate::span::Span)],
) -> Vec<f64> {
    let fixed: Vec<f64> = net.nodes.iter().filter_map(|n| n.fixed).collect();
    let mean = if fixed.is_empty() {
        293.15
    } else {
        fixed.iter().sum::<f64>() / fixed.len() as f64
    };
    let mut t: Vec<f64> = net.nodes.iter().map(|n| n.fixed.unwrap_or(mean)).collect();
    for &(node, v, _) in initial {
        if let Some(slot) = t.get_mut(node) {
            if net.nodes[node].fixed.is_none() {
                *slot = v;
            }
        }
    }
    t
}

/// [`biot_number`] with the links' conductances taken at node temperatures `temps` (K). The
/// surface coefficient combines convection (`film` links) and radiation, h = h_c + h_r with
/// h_r = ΔQ/ΔT per area of the radiating surface, as the lumped-capacitance criterion asks
/// (common practice); the surface is the film links' area, or the radiating area when the body
/// has no film link.
pub fn biot_number_at(
    net: &Network,
    node: NodeId,
    volume: f64,
    k: f64,
    temps: &[f64],
) -> Option<Biot> {
    let (mut g, mut a) = (0.0, 0.0);
    let (mut g_rad, mut a_rad) = (0.0, 0.0);
    for l in &net.links {
        if l.from != node && l.to != node {
            continue;
        }
        if l.kind == "film" || matches!(l.law, crate::network::LinkLaw::Convection(_)) {
            if let Some(area) = l.area {
                g += l.conductance_at(temps);
                a += area;
            }
        } else if matches!(l.law, crate::network::LinkLaw::Radiation { .. }) {
            g_rad += l.conductance_at(temps);
            // The link's area is its FROM surface's.
            if l.from == node {
                a_rad += l.area.unwrap_or(0.0);
            }
        }
    }
    if a <= 0.0 {
        a = a_rad;
    }
    g += g_rad;
    if a <= 0.0 || k <= 0.0 || !g.is_finite() {
        return None;
    }
    let h = g / a;
    let length = volume / a;
    Some(Biot {
        number: h * length / k,
        h,
        length,
        surface: a,
    })
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
