//! Materials: their arguments checked through the schema, then k as a constant, a linear k(T)
//! (`k_slope` with `k_at`) or a table of points.

use super::args::Value;
use super::Cx;
use crate::conductivity::material_args as kt;
use crate::diagnostic::{did_you_mean, Diagnostic};
use crate::elements::{self, Material};
use crate::eval::expect_point;
use crate::schema::{self, ArgSpec, Need};
use crate::symbols::SymbolKind;
use crate::syntax::{Arg, Expr, ExprKind, Ident, Item, ItemKind};
use crate::units::Dim;

/// Range practitioners cite for solid building and engineering materials (common practice).
const K_TYPICAL: (f64, f64) = (0.01, 1000.0);

impl Cx<'_> {
    /// Pass 3: every material.
    pub(super) fn materials(&mut self, items: &[&Item]) {
        for item in items {
            if let ItemKind::Material { name, args } = &item.kind {
                self.owner = format!("material `{}`", name.name);
                self.material(name, args);
            }
        }
        self.owner.clear();
    }

    pub(super) fn material(&mut self, name: &Ident, args: &[Arg]) {
        // With k as a table, `k_slope` and `k_at` do not pair up: the table says how k changes
        // already, and `Parts::model` refuses either beside it (E207) rather than asking for
        // the other half of the pair.
        let table = args
            .iter()
            .any(|a| a.name.as_ref().is_some_and(|n| n.name == "k") && kt::is_table(&a.value));
        let c = if table {
            let specs: Vec<ArgSpec> = schema::MATERIAL
                .iter()
                .map(|s| match s.need {
                    Need::With(_) => s.optional(),
                    _ => *s,
                })
                .collect();
            let subject = format!("material `{}`", name.name);
            let example = format!("material {} (k = 0.04 W/(m*K))", name.name);
            self.decl_args(&specs, &subject, &example, name.span, args, false)
        } else {
            self.declared("material", name, args)
        };
        let mut k_of_t = kt::Parts::default();
        let k = match c.value("k") {
            Some(Value::Quantity(q)) => q.value,
            Some(Value::Table(points)) => {
                k_of_t.table = Some(points.clone());
                points[0].1
            }
            // Missing (E203) or failed its own check, reported either way.
            _ => return,
        };
        // A `k_slope` or `k_at` that failed its own check, or one without the other (E203 from
        // the schema's pair check), is reported already; saying more would only confuse.
        let pair = ["k_slope", "k_at"];
        if pair.iter().any(|n| c.failed(n))
            || (!table && c.is_written(pair[0]) != c.is_written(pair[1]))
        {
            return;
        }
        k_of_t.slope = c.with_span("k_slope");
        k_of_t.at = c.with_span("k_at");
        let conductivity = match k_of_t.model(k, name) {
            Ok(c) => c,
            Err(d) => {
                self.diags.push(d);
                return;
            }
        };
        // Only a material that passed its checks gets a slot: a link naming a failed one finds
        // no slot (and no error of its own), never the slot of the next material.
        self.material_index
            .insert(name.name.clone(), self.materials.len());
        self.materials.push(Material {
            name: name.name.clone(),
            span: name.span,
            k,
            density: c.get("density"),
            specific_heat: c.get("specific_heat"),
            conductivity,
        });
    }

    /// `k = table(T₁, k₁, T₂, k₂, …)`: the points, checked (k at the first point is the
    /// material's nominal k).
    pub(super) fn k_table(&mut self, e: &Expr) -> Option<Vec<(f64, f64)>> {
        let ExprKind::Call { args, .. } = &e.kind else {
            return None;
        };
        let mut points = Vec::new();
        let mut ok = true;
        for pair in args.chunks(2) {
            let t = self.quantity(&pair[0], Dim::TEMPERATURE, "a table temperature");
            let t = t.filter(
                |q| match expect_point(*q, "a table temperature", &pair[0]) {
                    Ok(()) => true,
                    Err(d) => {
                        self.diags.push(d);
                        false
                    }
                },
            );
            let k = pair.get(1).and_then(|v| {
                self.quantity(v, Dim::CONDUCTIVITY, "a table conductivity")
                    .filter(|q| self.positive(q.value, v, "k", Some(Dim::CONDUCTIVITY)))
            });
            match (t, k) {
                (Some(t), Some(k)) => points.push((t.value, k.value, pair[0].span)),
                _ => ok = false,
            }
        }
        match kt::check_table(e, args.len(), &points) {
            Some(d) => {
                self.diags.push(d);
                None
            }
            None if ok => Some(points.iter().map(|p| (p.0, p.1)).collect()),
            None => None,
        }
    }

    pub(super) fn conductivity_warning(&mut self, k: f64, e: &Expr) {
        if k < K_TYPICAL.0 || k > K_TYPICAL.1 {
            self.diags.push(
                Diagnostic::warning("W101", format!("k = {} lies outside the usual 0.01–1000 W/(m·K)", elements::show(k, Dim::CONDUCTIVITY)), e.span)
                    .with_label("unusual conductivity")
                    .with_help("check the value and its unit (a common slip is W/(m·K) vs mW/(m·K)); the range is common practice for solids"),
            );
        }
    }

    /// `NAME` of a declared material. The help names the spec's alternative (`k`, `capacity`).
    pub(super) fn material_ref(&mut self, spec: &ArgSpec, e: &Expr) -> Option<Material> {
        let other = match spec.need {
            Need::Either(o) | Need::Instead(o) => Some(o),
            _ => None,
        };
        let ExprKind::Name(id) = &e.kind else {
            let help = match other {
                Some(o) => format!("name a declared material, or give `{o} = ...` instead"),
                None => "name a declared material".to_string(),
            };
            self.diags.push(
                Diagnostic::error(
                    "E101",
                    format!("`{}` expects the name of a material", spec.name),
                    e.span,
                )
                .with_label("not a material name")
                .with_help(help),
            );
            return None;
        };
        if let Some(m) = self.material_named(&id.name).cloned() {
            self.symbols.add_ref(&id.name, id.span);
            return Some(m);
        }
        if self
            .symbols
            .get(&id.name)
            .is_some_and(|s| s.kind == SymbolKind::Material)
        {
            // The material failed its own check, which is reported there.
            self.symbols.add_ref(&id.name, id.span);
            return None;
        }
        let known: Vec<&str> = self.symbols.names_of(SymbolKind::Material).collect();
        let mut d = match self.symbols.get(&id.name) {
            Some(s) => Diagnostic::error(
                "E105",
                format!("`{}` is {}, not a material", id.name, s.kind.article()),
                id.span,
            )
            .with_label("a material was expected"),
            None => Diagnostic::error("E102", format!("unknown material `{}`", id.name), id.span)
                .with_label("no material has this name"),
        };
        // A material that gives a capacity needs its density and specific heat too.
        let example = if other == Some("capacity") {
            "k = 0.6 W/(m*K), density = 1000 kg/m^3, specific_heat = 4180 J/(kg*K)"
        } else {
            "k = 0.04 W/(m*K)"
        };
        d = match did_you_mean(&id.name, known) {
            Some(s) => d.with_help(format!("did you mean `{s}`?")).with_fix(
                format!("Replace with `{s}`"),
                id.span,
                s,
            ),
            None => d.with_help(format!(
                "declare it, e.g. `material {} ({example})`",
                id.name
            )),
        };
        self.diags.push(d);
        None
    }
}
