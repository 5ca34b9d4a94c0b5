//! The text of `report.md`: title, caution, inputs as written, results, limit checks and the
//! two figures. Numbers are shown exactly as `caloris solve` shows them (four significant
//! digits, the same display units).

use super::profile::Profile;
use crate::output::CAUTION;
use caloris_compiler::syntax::{Arg, ElementCall, ItemKind};
use caloris_compiler::units::{
    format_number, format_quantity, Dim, Quantity, TempKind, UnitSystem,
};
use caloris_compiler::Analysis;
use std::fmt::Write;

/// What the report links to besides itself.
pub struct Figures<'a> {
    pub profile: Option<&'a Profile>,
    /// Why there is no profile, when there is none.
    pub no_profile: Option<String>,
    pub network: bool,
}

/// Escape Markdown's own characters in free text (titles, file names).
pub fn md_text(s: &str) -> String {
    let mut out = String::new();
    for c in s.chars() {
        if matches!(
            c,
            '\\' | '`' | '*' | '_' | '[' | ']' | '<' | '>' | '|' | '#'
        ) {
            out.push('\\');
        }
        out.push(c);
    }
    out
}

/// A name or written text as inline code.
fn code(s: &str) -> String {
    format!("`{}`", s.replace('`', "'").replace('|', "\\|"))
}

fn written(a: &Analysis, span: caloris_compiler::span::Span) -> String {
    let src = a.sources.text(span.file);
    src.get(span.range())
        .unwrap_or("")
        .split_whitespace()
        .collect::<Vec<_>>()
        .join(" ")
}

fn args_text(a: &Analysis, args: &[Arg]) -> String {
    args.iter()
        .map(|x| written(a, x.span))
        .collect::<Vec<_>>()
        .join(", ")
}

fn call_text(a: &Analysis, c: &ElementCall) -> String {
    format!("{}({})", c.kind.name, args_text(a, &c.args))
}

struct Table {
    out: String,
}

impl Table {
    fn new(headers: &[&str], numeric: &[usize]) -> Table {
        let mut out = format!("| {} |\n|", headers.join(" | "));
        for i in 0..headers.len() {
            out.push_str(if numeric.contains(&i) {
                "---:|"
            } else {
                "---|"
            });
        }
        out.push('\n');
        Table { out }
    }
    fn row(&mut self, cells: &[String]) {
        let _ = writeln!(self.out, "| {} |", cells.join(" | "));
    }
    fn finish(self) -> String {
        self.out + "\n"
    }
}

/// The whole report.
/// `## Diagnostics`: every warning of the model with its place and help, so a reviewer reading
/// only the report sees what the terminal showed.
fn diagnostics_section(out: &mut String, a: &Analysis) {
    out.push_str("## Diagnostics\n\n");
    if a.diagnostics.is_empty() {
        out.push_str("No warnings.\n\n");
        return;
    }
    for d in &a.diagnostics {
        let f = a.sources.get(d.primary.span.file);
        let lc = f.lines.line_col_chars(d.primary.span.start);
        let kind = if d.is_error() { "error" } else { "warning" };
        let _ = write!(
            out,
            "- **{kind} {}** at {}: {}",
            d.code,
            code(&format!("{}:{}:{}", f.name, lc.line + 1, lc.col + 1)),
            md_text(&d.message)
        );
        if let Some(h) = &d.help {
            let _ = write!(out, " — {}", md_text(h));
        }
        out.push('\n');
    }
    out.push('\n');
}

pub fn report(a: &Analysis, model: &str, figures: &Figures, system: UnitSystem) -> String {
    let net = &a.network;
    let q = |value: f64, dim: Dim, kind: TempKind| {
        format_quantity(Quantity { value, dim, kind }, system)
    };
    let temp = |v: f64| q(v, Dim::TEMPERATURE, TempKind::Point);
    let power = |v: f64| q(v, Dim::POWER, TempKind::NotTemperature);
    let plain = |v: f64, d: Dim| q(v, d, TempKind::NotTemperature);
    let mut out = String::new();
    let title = a.title.clone().unwrap_or_else(|| model.to_string());
    let _ = writeln!(out, "# {}\n", md_text(&title));
    let _ = writeln!(
        out,
        "Report on the model {} made by `caloris report` (version {}).\n",
        code(model),
        env!("CARGO_PKG_VERSION")
    );
    let _ = writeln!(out, "> **Caution.** {CAUTION}\n");

    let sol = a.solution.as_ref();
    out.push_str("## Summary\n\n");
    let fixed = net.nodes.iter().filter(|n| n.fixed.is_some()).count();
    let generated = net.nodes.iter().filter(|n| n.generated).count();
    let plural =
        |n: usize, one: &str, many: &str| format!("{n} {}", if n == 1 { one } else { many });
    let _ = writeln!(
        out,
        "- {} ({fixed} at fixed temperatures, {generated} made by build-ups), {}, {}.",
        plural(net.nodes.len(), "node", "nodes"),
        plural(net.links.len(), "link", "links"),
        plural(net.groups.len(), "build-up use", "build-up uses")
    );
    if let Some(sol) = sol {
        let failing: Vec<String> = sol
            .limits
            .iter()
            .filter(|l| !l.passed)
            .map(|l| code(&l.name))
            .collect();
        match (sol.limits.len(), failing.len()) {
            (0, _) => out.push_str("- The model states no design limits.\n"),
            (1, 0) => out.push_str("- The one design limit holds.\n"),
            (n, 0) => {
                let _ = writeln!(out, "- Every design limit holds ({n} of {n}).");
            }
            (n, f) => {
                let _ = writeln!(
                    out,
                    "- **{f} of {n} design limits fail:** {}.",
                    failing.join(", ")
                );
            }
        }
        // The residual's digits are round-off and vary with the CPU; a report states the bound.
        let scale = sol.heat_flows.iter().fold(1.0f64, |m, q| m.max(q.abs()));
        if sol.worst_residual <= 1e-9 * scale {
            out.push_str(
                "- Energy balance: closes at every solved node (worst residual below 1e-9 of the largest heat flow).\n",
            );
        } else {
            let _ = writeln!(
                out,
                "- Energy balance: the worst residual at a solved node is {:.3e} W.",
                sol.worst_residual
            );
        }
    }
    out.push('\n');
    diagnostics_section(&mut out, a);

    out.push_str("## Inputs\n\n");
    inputs(&mut out, a, system);

    let Some(sol) = sol else {
        out.push_str("## Results\n\nThe model did not solve.\n");
        return out;
    };
    out.push_str("## Results\n\n### Temperatures\n\n");
    let mut t = Table::new(&["node", "temperature", ""], &[1]);
    for (i, node) in net.nodes.iter().enumerate() {
        let state = if node.fixed.is_some() {
            "fixed"
        } else if node.generated {
            "build-up interface"
        } else {
            ""
        };
        t.row(&[
            code(&node.name),
            temp(sol.temperatures[i]),
            state.to_string(),
        ]);
    }
    out.push_str(&t.finish());

    out.push_str("### Heat flows\n\nPositive from the link's first node to its second.\n\n");
    let mut t = Table::new(
        &[
            "link",
            "from → to",
            "kind",
            "resistance",
            "heat flow",
            "heat flux",
        ],
        &[3, 4, 5],
    );
    for (i, l) in net.links.iter().enumerate() {
        let qf = sol.heat_flows[i];
        let flux = l
            .area
            .map(|ar| plain(qf / ar, Dim::HEAT_FLUX))
            .unwrap_or_default();
        t.row(&[
            code(&l.name),
            format!(
                "{} → {}",
                code(&net.nodes[l.from].name),
                code(&net.nodes[l.to].name)
            ),
            l.kind.clone(),
            plain(1.0 / l.conductance_at(&sol.temperatures), Dim::RESISTANCE),
            power(qf),
            flux,
        ]);
    }
    out.push_str(&t.finish());

    if !sol.films.is_empty() {
        out.push_str("### Computed films\n\nAt the solved temperatures: properties at the film temperature (the bulk temperature for pipe flow); heat from the surface into the fluid.\n\n");
        let mut t = Table::new(
            &[
                "film",
                "correlation",
                "Re",
                "Ra",
                "Pr",
                "Nu",
                "h",
                "convection",
                "radiation",
            ],
            &[2, 3, 4, 5, 6, 7, 8],
        );
        let group = |v: Option<f64>| v.map(|v| format!("{v:.4e}")).unwrap_or_else(|| "—".into());
        for f in &sol.films {
            let s = &f.state;
            t.row(&[
                code(&net.links[f.link].name),
                format!("{} in {} ({})", f.correlation, f.fluid, s.regime),
                group(s.reynolds),
                group(s.rayleigh),
                format!("{:.4}", s.prandtl),
                format!("{:.4}", s.nusselt),
                plain(s.h, Dim::HEAT_TRANSFER_COEFF),
                power(s.q_convection),
                power(s.q_radiation),
            ]);
        }
        out.push_str(&t.finish());
    }

    if !sol.groups.is_empty() {
        out.push_str("### Build-up U- and R-values\n\nSurface films included; U = 1/(R·A), R-value = R·A. The rounded U-value is given to two significant figures, as ISO 6946 states results; the unrounded value beside it is what the model computes.\n\n");
        let mut t = Table::new(
            &[
                "build-up use",
                "build-up",
                "area",
                "resistance",
                "R-value",
                "U-value",
                "U-value (rounded, 2 s.f.)",
                "heat flow",
            ],
            &[2, 3, 4, 5, 6, 7],
        );
        for (g, r) in net.groups.iter().zip(&sol.groups) {
            t.row(&[
                code(&r.name),
                code(&g.buildup),
                g.area.map(|v| plain(v, Dim::AREA)).unwrap_or_default(),
                plain(r.resistance, Dim::RESISTANCE),
                r.r_value
                    .map(|v| plain(v, Dim::AREA_RESISTANCE))
                    .unwrap_or_default(),
                r.u_value
                    .map(|v| plain(v, Dim::HEAT_TRANSFER_COEFF))
                    .unwrap_or_default(),
                r.u_value
                    .map(|v| caloris_compiler::results::rounded_u_value(v, system))
                    .unwrap_or_default(),
                power(r.heat_flow),
            ]);
        }
        out.push_str(&t.finish());
    }

    out.push_str("### Boundaries\n\nHeat each fixed temperature delivers into the network (negative: it absorbs heat).\n\n");
    let mut t = Table::new(&["boundary", "heat delivered"], &[1]);
    for &(i, qb) in &sol.boundary_heat {
        t.row(&[code(&net.nodes[i].name), power(qb)]);
    }
    out.push_str(&t.finish());

    out.push_str("## Design limits\n\n");
    if sol.limits.is_empty() {
        out.push_str("The model states no design limits.\n\n");
    } else {
        out.push_str(
            "The margin is how far the value is inside the limit; negative when it fails. The margin % is of the limit (a temperature limit in kelvin).\n\n",
        );
        let mut t = Table::new(
            &[
                "limit",
                "condition",
                "value",
                "margin",
                "margin %",
                "verdict",
            ],
            &[2, 3, 4],
        );
        for l in &sol.limits {
            let dim = l.measure.dim();
            let verdict = if l.passed {
                "pass".to_string()
            } else {
                "**FAIL**".to_string()
            };
            t.row(&[
                code(&l.name),
                format!(
                    "{}({}) {}",
                    l.measure.name(),
                    l.subject,
                    l.limit_text(&q(l.limit, dim, l.kind()))
                ),
                q(l.actual, dim, l.kind()),
                q(l.margin, dim, l.margin_kind()),
                crate::output::percent(l.margin_percent),
                verdict,
            ]);
        }
        out.push_str(&t.finish());
    }

    out.push_str("## Figures\n\n");
    match figures.profile {
        Some(p) => profile_section(&mut out, a, p, system),
        None => {
            let _ = writeln!(
                out,
                "No temperature profile: {}.\n",
                figures
                    .no_profile
                    .as_deref()
                    .unwrap_or("no path of nodes to draw")
            );
        }
    }
    if figures.network {
        out.push_str("### The network\n\nNodes stand in columns by temperature (warmest on the left); each link is labelled with its heat flow.\n\n![Drawing of the solved network](network.svg)\n\n");
    } else {
        let _ = writeln!(
            out,
            "The network has {} nodes, too many to draw legibly; see the tables above.\n",
            net.nodes.len()
        );
    }
    out
}

fn profile_section(out: &mut String, a: &Analysis, p: &Profile, system: UnitSystem) {
    let net = &a.network;
    let Some(sol) = &a.solution else { return };
    let names: Vec<String> = p.nodes.iter().map(|&i| code(&net.nodes[i].name)).collect();
    let _ = writeln!(
        out,
        "### Temperature profile\n\nAlong {}: {}.\n",
        names.join(" → "),
        p.origin
    );
    out.push_str("![Temperature profile along the path](profile.svg)\n\n");
    let (dim, what) = if p.per_area {
        (
            Dim::AREA_RESISTANCE,
            "resistance per area from the first node",
        )
    } else {
        (Dim::RESISTANCE, "resistance from the first node")
    };
    out.push_str("The horizontal position is the thermal resistance passed from the first node; where one heat flow crosses every step, the temperature falls along a straight line (Fourier's law).\n\n");
    let mut t = Table::new(&["node", what, "temperature"], &[1, 2]);
    for (&i, &x) in p.nodes.iter().zip(&p.position) {
        let tq = Quantity {
            value: sol.temperatures[i],
            dim: Dim::TEMPERATURE,
            kind: TempKind::Point,
        };
        t.row(&[
            code(&net.nodes[i].name),
            format_quantity(Quantity::new(x, dim), system),
            format_quantity(tq, system),
        ]);
    }
    out.push_str(&t.finish());
}

fn inputs(out: &mut String, a: &Analysis, system: UnitSystem) {
    let items = || {
        a.modules
            .iter()
            .enumerate()
            .flat_map(|(m, (_, module))| module.items.iter().map(move |i| (m, i)))
    };
    let imported = a.modules.len() > 1;
    let from = |m: usize| {
        if m == 0 {
            String::new()
        } else {
            format!(" (from {})", code(a.sources.name(a.modules[m].0)))
        }
    };

    let params: Vec<_> = items()
        .filter_map(|(m, i)| {
            if let ItemKind::Param { name, value } = &i.kind {
                Some((m, name, value))
            } else {
                None
            }
        })
        .collect();
    if !params.is_empty() {
        out.push_str("### Parameters\n\n");
        let mut t = Table::new(&["parameter", "written", "value"], &[2]);
        for (m, name, value) in params {
            let v = a.params.iter().find(|p| p.0 == name.name).and_then(|p| p.1);
            let shown = v
                .map(|q| {
                    if q.dim == Dim::NONE {
                        format_number(q.value)
                    } else {
                        format_quantity(q, system)
                    }
                })
                .unwrap_or_default();
            t.row(&[
                format!("{}{}", code(&name.name), from(m)),
                code(&written(a, value.span)),
                shown,
            ]);
        }
        out.push_str(&t.finish());
    }
    if !a.materials.is_empty() {
        out.push_str("### Materials\n\n");
        let mut t = Table::new(
            &["material", "conductivity k", "density", "specific heat"],
            &[1, 2, 3],
        );
        for m in &a.materials {
            let opt = |v: Option<f64>, d: Dim| {
                v.map(|v| format_quantity(Quantity::new(v, d), system))
                    .unwrap_or_default()
            };
            let origin = if imported && m.span.file != a.modules[0].0 {
                format!(" (from {})", code(a.sources.name(m.span.file)))
            } else {
                String::new()
            };
            t.row(&[
                format!("{}{origin}", code(&m.name)),
                format_quantity(Quantity::new(m.k, Dim::CONDUCTIVITY), system),
                opt(m.density, Dim::DENSITY),
                opt(m.specific_heat, Dim::SPECIFIC_HEAT),
            ]);
        }
        out.push_str(&t.finish());
    }
    out.push_str("### Nodes\n\n");
    let mut t = Table::new(&["node", "boundary temperature", "heat load"], &[1, 2]);
    for node in a.network.nodes.iter().filter(|n| !n.generated) {
        let fixed = node
            .fixed
            .map(|k| {
                format_quantity(
                    Quantity {
                        value: k,
                        dim: Dim::TEMPERATURE,
                        kind: TempKind::Point,
                    },
                    system,
                )
            })
            .unwrap_or_else(|| "solved".into());
        let load = if node.load != 0.0 {
            format_quantity(Quantity::new(node.load, Dim::POWER), system)
        } else {
            String::new()
        };
        t.row(&[code(&node.name), fixed, load]);
    }
    out.push_str(&t.finish());

    let buildups: Vec<_> = items()
        .filter_map(|(m, i)| {
            if let ItemKind::Buildup { name, elements } = &i.kind {
                Some((m, name, elements))
            } else {
                None
            }
        })
        .collect();
    for (m, name, elements) in buildups {
        let _ = writeln!(
            out,
            "### Build-up {}{}\n\nElements in order from a link's first node to its second.\n",
            code(&name.name),
            from(m)
        );
        let mut t = Table::new(&["element", "as written"], &[]);
        for e in elements {
            t.row(&[code(&e.name.name), code(&call_text(a, &e.element))]);
        }
        out.push_str(&t.finish());
    }
    let links: Vec<_> = a
        .root()
        .items
        .iter()
        .filter_map(|i| {
            if let ItemKind::Link {
                name,
                from,
                to,
                element,
            } = &i.kind
            {
                Some((name, from, to, element))
            } else {
                None
            }
        })
        .collect();
    if !links.is_empty() {
        out.push_str("### Links\n\n");
        let mut t = Table::new(&["link", "from → to", "as written", "resistance"], &[3]);
        for (name, from, to, element) in links {
            let net = &a.network;
            let r = match (net.group_id(&name.name), net.link_id(&name.name)) {
                (Some(g), _) => a.solution.as_ref().map(|s| s.groups[g].resistance),
                (None, Some(l)) => a
                    .solution
                    .as_ref()
                    .map(|s| 1.0 / net.links[l].conductance_at(&s.temperatures)),
                _ => None,
            };
            let r = r
                .map(|r| format_quantity(Quantity::new(r, Dim::RESISTANCE), system))
                .unwrap_or_default();
            t.row(&[
                code(&name.name),
                format!("{} → {}", code(&from.name), code(&to.name)),
                code(&call_text(a, element)),
                r,
            ]);
        }
        out.push_str(&t.finish());
    }
}
