//! Repetitions and sub-networks: expanded into plain declarations before elaboration.
//!
//! `repeat seg (count = 8, first = base) { ... }` makes eight copies of its body; copy i's
//! names become `seg.i.NAME`, `index` is i, `count` is 8, and `previous.NAME` is copy i−1's
//! node (the `first` node for copy 1), so a rod or fin split into segments needs no copy-paste.
//! `network NAME (PORTS) { ... }` declares a reusable sub-network and `use kitchen: NAME(...)`
//! places one copy whose names become `kitchen.NAME`, its ports bound to the given nodes and
//! its `param`s replaced by the given values. The generated names are ordinary names: results
//! and limits refer to them like any other.
// Diagnostics are returned by value throughout the compiler; boxing them here alone would
// split the element API.
#![allow(clippy::result_large_err)]

mod previous;
mod rename;

use rename::{declared, Renamer};

use crate::budget::{over_budget, Counter};
use crate::diagnostic::{did_you_mean, Diagnostic};
use crate::eval::{Evaluator, NameKinds};
use crate::span::Span;
use crate::syntax::*;
use crate::units::{Dim, Quantity};
use rustc_hash::{FxHashMap, FxHashSet};
use std::sync::atomic::{AtomicBool, Ordering};

/// Most copies one repetition may make, so a typing slip cannot exhaust memory.
pub const MAX_COPIES: usize = 100_000;
/// Deepest nesting of repetitions and uses (a sub-network that uses itself stops here).
pub const MAX_DEPTH: usize = 16;

/// The expanded modules (same order as given), the diagnostics of expansion, and the spans of
/// every repeated body, where one mistake would otherwise be reported once per copy.
pub struct Expanded {
    pub modules: Vec<Module>,
    pub diags: Vec<Diagnostic>,
    pub bodies: Vec<Span>,
}

struct NoKinds;
impl NameKinds for NoKinds {
    fn kind_of(&self, _: &str) -> Option<&'static str> {
        None
    }
}

/// Expand every `repeat` and `use` of the given modules (the root first, then imports).
pub fn expand_modules(
    modules: &[&Module],
    overrides: &[(String, Quantity)],
    budget: u64,
    cancel: Option<&AtomicBool>,
) -> Expanded {
    let mut networks: FxHashMap<String, (&Item, &Vec<Ident>, &Vec<Item>)> = FxHashMap::default();
    let mut params = Vec::new();
    for m in modules {
        for item in &m.items {
            match &item.kind {
                ItemKind::Network { name, ports, body } => {
                    networks
                        .entry(name.name.clone())
                        .or_insert((item, ports, body));
                }
                ItemKind::Param { name, value } => params.push((name, value)),
                _ => {}
            }
        }
    }
    let mut ev = Evaluator::new(params);
    for (n, q) in overrides {
        ev.set_override(n, *q);
    }
    let bodies_of = networks
        .iter()
        .map(|(k, (_, _, body))| (k.clone(), body.as_slice()))
        .collect();
    let mut x = Expander {
        networks,
        bodies_of,
        ev,
        diags: Vec::new(),
        bodies: Vec::new(),
        made: 0,
        budget,
        over: false,
        cancel,
        active: Vec::new(),
    };
    let out = modules
        .iter()
        .map(|m| Module {
            items: x.items(&m.items, 0),
            comments: m.comments.clone(),
        })
        .collect();
    let mut diags = x.diags;
    diags.append(&mut x.ev.diags);
    Expanded {
        modules: out,
        diags,
        bodies: x.bodies,
    }
}

/// The budget check for a model with nothing to expand: its regions' cells and its plain
/// declarations together must stay within [`MODEL_BUDGET`] (E220 at the region that crosses it).
pub fn check_budget(
    modules: &[&Module],
    overrides: &[(String, Quantity)],
    budget: u64,
) -> Option<Diagnostic> {
    let params = modules
        .iter()
        .flat_map(|m| &m.items)
        .filter_map(|i| match &i.kind {
            ItemKind::Param { name, value } => Some((name, value)),
            _ => None,
        });
    let mut ev = Evaluator::new(params);
    for (n, q) in overrides {
        ev.set_override(n, *q);
    }
    let mut count = |e: &Expr| {
        let n = ev.diags.len();
        let q = ev.eval(e, &NoKinds);
        ev.diags.truncate(n);
        q.filter(|q| q.dim == Dim::NONE).map(|q| q.value)
    };
    let networks = FxHashMap::default();
    // Called once per model, so the nesting is named as it is counted.
    let mut counter = Counter::new(&networks, &mut count).describing();
    let mut made: u64 = 0;
    for item in modules.iter().flat_map(|m| &m.items) {
        let size = counter.item(item, MAX_DEPTH);
        if made.saturating_add(size.total) > budget {
            let span = item.name().map(|n| n.span).unwrap_or(item.span);
            return Some(over_budget("region", span, &size, made, budget));
        }
        made += size.total;
    }
    None
}

/// Keep one of each diagnostic (same code, same place) raised inside a repeated body.
pub fn dedup_copies(diags: &mut Vec<Diagnostic>, bodies: &[Span]) {
    let mut seen = FxHashSet::default();
    diags.retain(|d| {
        let s = d.primary.span;
        let inside = bodies
            .iter()
            .any(|b| b.file == s.file && b.start <= s.start && s.end <= b.end);
        !inside || seen.insert((d.code, s.file, s.start, s.end))
    });
}

struct Expander<'a> {
    networks: FxHashMap<String, (&'a Item, &'a Vec<Ident>, &'a Vec<Item>)>,
    /// Each sub-network's body, for counting what a `use` would make.
    bodies_of: FxHashMap<String, &'a [Item]>,
    ev: Evaluator<'a>,
    diags: Vec<Diagnostic>,
    bodies: Vec<Span>,
    /// Declarations and region cells made so far, against [`MODEL_BUDGET`].
    made: u64,
    /// Most declarations and region cells the model may make.
    budget: u64,
    /// Set once the budget is refused (or the caller cancelled): nothing more is expanded.
    over: bool,
    cancel: Option<&'a AtomicBool>,
    /// The sub-networks being expanded, outermost first: a `use` of one of them closes a
    /// cycle. The size count treats a cycle as empty, so it must never be expanded.
    active: Vec<String>,
}

impl Expander<'_> {
    /// Whether expanding `item` keeps the model within its budget; reports E220 when not. A
    /// region's cells count as made at once (a repeat's and a use's as their copies are made).
    fn within_budget(&mut self, item: &Item, depth: usize) -> bool {
        let ev = &mut self.ev;
        let mut count = |e: &Expr| {
            // Counting must not report: a count that needs a copy's `index` is unknown here
            // and is reported, if wrong, when the copy is expanded.
            let n = ev.diags.len();
            let q = ev.eval(e, &NoKinds);
            ev.diags.truncate(n);
            q.filter(|q| q.dim == Dim::NONE).map(|q| q.value)
        };
        let size = Counter::new(&self.bodies_of, &mut count).item(item, MAX_DEPTH - depth);
        let fits = self.made.saturating_add(size.total) <= self.budget;
        if !fits {
            let size = Counter::new(&self.bodies_of, &mut count)
                .describing()
                .item(item, MAX_DEPTH - depth);
            let (what, span) = match &item.kind {
                ItemKind::Repeat { name, .. } => ("`repeat`", name.span),
                ItemKind::Use { name, .. } => ("`use`", name.span),
                ItemKind::Region { name, .. } => ("region", name.span),
                _ => ("block", item.span),
            };
            self.diags
                .push(over_budget(what, span, &size, self.made, self.budget));
            self.over = true;
        } else if matches!(item.kind, ItemKind::Region { .. }) {
            self.made += size.total - 1;
        }
        fits
    }

    fn items(&mut self, items: &[Item], depth: usize) -> Vec<Item> {
        let mut out = Vec::new();
        for item in items {
            if self.over {
                break;
            }
            if self.cancel.is_some_and(|c| c.load(Ordering::Relaxed)) {
                self.over = true;
                break;
            }
            if matches!(
                item.kind,
                ItemKind::Repeat { .. } | ItemKind::Use { .. } | ItemKind::Region { .. }
            ) && depth < MAX_DEPTH
                && !self.within_budget(item, depth)
            {
                break;
            }
            match &item.kind {
                ItemKind::Network { .. } => {}
                ItemKind::Repeat { .. } | ItemKind::Use { .. } if depth >= MAX_DEPTH => {
                    self.diags.push(
                        Diagnostic::error("E218", format!("repetitions and sub-networks nest more than {MAX_DEPTH} deep"), item.span)
                            .with_label("nested too deep")
                            .with_help("a sub-network that uses itself (directly or through another) never ends; break the cycle"),
                    );
                }
                ItemKind::Repeat { name, args, body } => {
                    self.bodies.push(item.span);
                    if let Some((count, first)) = self.repeat_args(name, args, body) {
                        let locals = declared(body);
                        for i in 1..=count {
                            let r = Renamer {
                                prefix: format!("{}.{i}", name.name),
                                locals: &locals,
                                ports: FxHashMap::default(),
                                index: Some((i as f64, count as f64)),
                                previous: Some(if i == 1 {
                                    first.clone()
                                } else {
                                    Some(format!("{}.{}", name.name, i - 1))
                                }),
                            };
                            let copy: Vec<Item> =
                                body.iter().map(|b| r.item(b, &mut self.diags)).collect();
                            let before = self.made;
                            out.extend(self.items(&copy, depth + 1));
                            // Counted as the size count counts it: a copy that made nothing
                            // counts one (see `budget::Counter`).
                            if self.made == before {
                                self.made += 1;
                            }
                        }
                    }
                }
                ItemKind::Use {
                    name,
                    network,
                    args,
                } => {
                    if let Some(at) = self.active.iter().position(|n| *n == network.name) {
                        let chain = self.active[at..]
                            .iter()
                            .chain(std::iter::once(&network.name))
                            .map(|n| format!("`{n}`"))
                            .collect::<Vec<_>>()
                            .join(" → ");
                        self.diags.push(
                            Diagnostic::error(
                                "E218",
                                format!("sub-network `{}` uses itself: {chain}", network.name),
                                network.span,
                            )
                            .with_label("this use closes the cycle")
                            .with_help("a sub-network that uses itself (directly or through another) never ends; break the cycle"),
                        );
                        continue;
                    }
                    self.bodies.push(item.span);
                    // Counted as the size count counts it (see `budget::Counter`).
                    self.made += 1;
                    if let Some(copy) = self.use_network(name, network, args) {
                        self.active.push(network.name.clone());
                        out.extend(self.items(&copy, depth + 1));
                        self.active.pop();
                    }
                }
                _ => {
                    self.made += 1;
                    out.push(item.clone());
                }
            }
        }
        out
    }

    /// `count` (a whole number ≥ 1) and `first` (a node for `previous` in copy 1).
    fn repeat_args(
        &mut self,
        name: &Ident,
        args: &[Arg],
        body: &[Item],
    ) -> Option<(usize, Option<String>)> {
        let mut count = None;
        let mut first = None;
        // A misspelt `count` is reported once, as the unknown name.
        let mut suggested_count = false;
        for (i, a) in args.iter().enumerate() {
            let key = a
                .name
                .as_ref()
                .map(|n| n.name.as_str())
                .unwrap_or(if i == 0 { "count" } else { "" });
            match key {
                "count" => count = Some(a),
                "first" => match &a.value.kind {
                    ExprKind::Name(id) => first = Some(id.name.clone()),
                    _ => self.diags.push(
                        Diagnostic::error(
                            "E105",
                            "`first` names the node that copy 1's `previous` stands for",
                            a.value.span,
                        )
                        .with_label("not a node name")
                        .with_help("write e.g. `first = fin_base`"),
                    ),
                },
                _ => {
                    // The names a repetition takes are the schema's (`schema::REPEAT`).
                    let span = a.name.as_ref().map(|n| n.span).unwrap_or(a.span);
                    let known = crate::schema::REPEAT.iter().map(|s| s.name);
                    let list = list(known.clone());
                    let mut d = Diagnostic::error(
                        "E204",
                        format!("`repeat` takes {list}, not `{key}`"),
                        span,
                    )
                    .with_label("unknown argument");
                    let suggestion = did_you_mean(key, known);
                    suggested_count |= suggestion == Some("count");
                    d = match suggestion {
                        Some(s) => d.with_help(format!("did you mean `{s}`?")).with_fix(
                            format!("Replace with `{s}`"),
                            span,
                            s,
                        ),
                        None => {
                            d.with_help("write `repeat seg (count = 10, first = base) { ... }`")
                        }
                    };
                    self.diags.push(d);
                }
            }
        }
        let Some(c) = count else {
            if suggested_count {
                return None;
            }
            self.diags.push(
                Diagnostic::error(
                    "E203",
                    format!("`repeat {}` needs a `count`", name.name),
                    name.span,
                )
                .with_label("`count` missing")
                .with_help(format!(
                    "write `repeat {} (count = 10) {{ ... }}`",
                    name.name
                )),
            );
            return None;
        };
        let q = self.ev.eval(&c.value, &NoKinds)?;
        let n = q.value;
        if q.dim != Dim::NONE || n.fract() != 0.0 || !(1.0..=MAX_COPIES as f64).contains(&n) {
            self.diags.push(
                Diagnostic::error(
                    "E216",
                    format!("`count` must be a whole number from 1 to {MAX_COPIES}"),
                    c.value.span,
                )
                .with_label("not a usable count")
                .with_help(
                    "give the number of copies, e.g. `count = 10`, or a dimensionless parameter",
                ),
            );
            return None;
        }
        let uses_previous = previous::mentions_previous(body);
        if uses_previous && first.is_none() {
            self.diags.push(
                Diagnostic::error("E203", format!("`repeat {}` uses `previous`, which copy 1 does not have", name.name), name.span)
                    .with_label("`first` missing")
                    .with_help("say which node `previous` means in copy 1, e.g. `(count = 10, first = fin_base)`"),
            );
            return None;
        }
        Some((n as usize, first))
    }

    fn use_network(&mut self, name: &Ident, network: &Ident, args: &[Arg]) -> Option<Vec<Item>> {
        let Some(&(_, ports, body)) = self.networks.get(&network.name) else {
            let mut d = Diagnostic::error(
                "E102",
                format!("unknown sub-network `{}`", network.name),
                network.span,
            )
            .with_label("no `network` has this name");
            // Sorted so that the suggestion does not hang on the hasher's order.
            let mut names: Vec<&str> = self.networks.keys().map(String::as_str).collect();
            names.sort_unstable();
            d = match did_you_mean(&network.name, names) {
                Some(s) => d.with_help(format!("did you mean `{s}`?")).with_fix(
                    format!("Replace with `{s}`"),
                    network.span,
                    s,
                ),
                None => d.with_help(
                    "declare it with `network NAME (PORTS) { ... }`, or import the file that does",
                ),
            };
            self.diags.push(d);
            return None;
        };
        // In declaration order: the list and suggestion of an unknown argument read it.
        let params: Vec<&str> = body
            .iter()
            .filter_map(|i| match &i.kind {
                ItemKind::Param { name, .. } => Some(name.name.as_str()),
                _ => None,
            })
            .collect();
        let mut bound: FxHashMap<String, String> = FxHashMap::default();
        let mut replaced: FxHashMap<String, Expr> = FxHashMap::default();
        let mut ok = true;
        for a in args {
            let Some(key) = &a.name else {
                self.diags.push(
                    Diagnostic::error(
                        "E204",
                        "the ports and parameters of a use are written `name = value`",
                        a.span,
                    )
                    .with_label("argument without a name")
                    .with_help(format!(
                        "`{}` has ports {}",
                        network.name,
                        list(ports.iter().map(|p| p.name.as_str()))
                    )),
                );
                ok = false;
                continue;
            };
            if ports.iter().any(|p| p.name == key.name) {
                match &a.value.kind {
                    ExprKind::Name(id) => {
                        bound.insert(key.name.clone(), id.name.clone());
                    }
                    _ => {
                        self.diags.push(
                            Diagnostic::error(
                                "E105",
                                format!("port `{}` must be given a node", key.name),
                                a.value.span,
                            )
                            .with_label("not a node name")
                            .with_help(
                                "write the name of a node of this model, e.g. `inside = kitchen`",
                            ),
                        );
                        ok = false;
                    }
                }
            } else if params.contains(&key.name.as_str()) {
                replaced.insert(key.name.clone(), a.value.clone());
            } else {
                let known: Vec<&str> = ports
                    .iter()
                    .map(|p| p.name.as_str())
                    .chain(params.iter().copied())
                    .collect();
                let mut d = Diagnostic::error(
                    "E204",
                    format!(
                        "sub-network `{}` has no port or parameter `{}`",
                        network.name, key.name
                    ),
                    key.span,
                )
                .with_label("unknown argument");
                d = match did_you_mean(&key.name, known.iter().copied()) {
                    Some(s) => d.with_help(format!("did you mean `{s}`?")).with_fix(
                        format!("Replace with `{s}`"),
                        key.span,
                        s,
                    ),
                    None => d.with_help(format!("it takes {}", list(known.iter().copied()))),
                };
                self.diags.push(d);
                ok = false;
            }
        }
        let missing: Vec<&str> = ports
            .iter()
            .map(|p| p.name.as_str())
            .filter(|p| !bound.contains_key(*p))
            .collect();
        if !missing.is_empty() {
            self.diags.push(
                Diagnostic::error(
                    "E203",
                    format!(
                        "use `{}` leaves port{} {} unconnected",
                        name.name,
                        if missing.len() == 1 { "" } else { "s" },
                        list(missing.iter().copied())
                    ),
                    name.span,
                )
                .with_label("ports missing")
                .with_help(format!(
                    "connect every port to a node, e.g. `{} = some_node`",
                    missing[0]
                )),
            );
            ok = false;
        }
        if !ok {
            return None;
        }
        let locals = declared(body);
        let r = Renamer {
            prefix: name.name.clone(),
            locals: &locals,
            ports: bound,
            index: None,
            previous: None,
        };
        Some(
            body.iter()
                .map(|b| match &b.kind {
                    // A replaced parameter takes the use's value, written in the outer scope.
                    ItemKind::Param { name: pn, .. } if replaced.contains_key(&pn.name) => Item {
                        kind: ItemKind::Param {
                            name: r.ident(pn),
                            value: replaced[&pn.name].clone(),
                        },
                        span: b.span,
                    },
                    _ => r.item(b, &mut self.diags),
                })
                .collect(),
        )
    }
}

fn list<'a>(names: impl Iterator<Item = &'a str>) -> String {
    let v: Vec<String> = names.map(|n| format!("`{n}`")).collect();
    if v.is_empty() {
        "none".into()
    } else {
        v.join(", ")
    }
}
