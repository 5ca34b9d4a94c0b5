//! Build-up uses (in pass 8, links): the arguments of the use checked against the schema's
//! entry for its geometry, each element built in turn — a radial one starting at the radius
//! where the one before it ended — and the chain kept as a group. Also the once-per-declaration
//! checks of the build-ups themselves.

use super::Cx;
use crate::diagnostic::{did_you_mean, Diagnostic};
use crate::elements::{self, shell, Figure};
use crate::network::{Group, NodeId};
use crate::radial::{self, UseArgs};
use crate::schema;
use crate::syntax::{BuildupElement, ElementCall, Ident, Item, ItemKind, Module};
use crate::units::Dim;
use rustc_hash::FxHashMap;

/// The build-ups a model declares, by name.
pub(super) type Buildups<'i> = FxHashMap<&'i str, &'i Vec<BuildupElement>>;

pub(super) fn declared<'i>(items: &[&'i Item]) -> Buildups<'i> {
    items
        .iter()
        .filter_map(|i| match &i.kind {
            ItemKind::Buildup { name, elements } => Some((name.name.as_str(), elements)),
            _ => None,
        })
        .collect()
}

impl Cx<'_> {
    /// The arguments of a link that uses a build-up, checked against the schema's entry for
    /// its geometry: the area of a plane build-up (needed only when an element takes an area),
    /// the bore radius (and the length of a cylindrical one) of a radial build-up.
    fn buildup_use_args(
        &mut self,
        call: &ElementCall,
        els: &[BuildupElement],
        geom: shell::Geometry,
    ) -> Option<UseArgs> {
        let needs_area = els
            .iter()
            .any(|e| elements::lookup(&e.element.kind.name).is_some_and(|k| k.takes_area()));
        let specs: Vec<schema::ArgSpec> = schema::buildup_use(geom)
            .iter()
            .map(|s| match s.name {
                "area" if !needs_area => s.optional(),
                _ => *s,
            })
            .collect();
        let (subject, example) = match geom {
            shell::Geometry::Plane => ("build-up", "area = 10 m^2"),
            shell::Geometry::Cylinder => ("radial build-up", "inner_radius = 27 mm, length = 12 m"),
            shell::Geometry::Sphere => ("radial build-up", "inner_radius = 1.2 m"),
        };
        let name = &call.kind.name;
        let c = self.decl_args(
            &specs,
            &format!("{subject} `{name}`"),
            &format!("{name}({example})"),
            call.span,
            &call.args,
            true,
        );
        c.ok.then(|| UseArgs {
            area: c.with_span("area"),
            inner_radius: c.with_span("inner_radius"),
            length: c.with_span("length"),
        })
    }

    /// A link that uses a build-up: a chain of element links through its interface nodes, and
    /// the group that holds them once every element built.
    pub(super) fn buildup_link(
        &mut self,
        name: &Ident,
        from: Option<NodeId>,
        to: Option<NodeId>,
        call: &ElementCall,
        els: &[BuildupElement],
    ) {
        let geom = shell::geometry(els.iter().map(|e| e.element.kind.name.as_str()));
        self.owner = format!("link `{}`", name.name);
        let Some(use_args) = self.buildup_use_args(call, els, geom) else {
            return;
        };
        let mut links = Vec::new();
        let mut prev = from;
        let mut complete = true;
        // Each shell starts at the radius where the one before it ended.
        let mut chain =
            radial::Chain::new(geom, use_args.inner_radius, use_args.length.map(|l| l.0));
        for (i, e) in els.iter().enumerate() {
            let next = if i + 1 == els.len() {
                to
            } else {
                self.asm.node_id(&format!("{}.{}", name.name, e.name.name))
            };
            let Some(kind) = elements::lookup(&e.element.kind.name) else {
                // Reported once at the build-up (below) rather than at every use.
                complete = false;
                continue;
            };
            if geom != shell::Geometry::Plane && chain.radius.is_none() {
                // A shell before this one failed its checks (reported there), so the radius
                // this element starts at is unknown; a "missing area" here would only echo it.
                complete = false;
                prev = next;
                continue;
            }
            self.owner = format!(
                "`{}` (`{}` of build-up `{}`) in link `{}`",
                kind.name(),
                e.name.name,
                call.kind.name,
                name.name
            );
            // The surface's diameter goes to computed films only: other kinds with a `diameter`
            // (a buried pipe) state their own.
            let supplied: Vec<_> = use_args
                .supplied(geom, chain.radius)
                .into_iter()
                .filter(|s| {
                    s.0 != "diameter" || elements::convection::is_computed_film(kind.name())
                })
                .collect();
            let args = self.args(kind, &e.element.args, e.element.span, &supplied);
            let built = args.as_ref().and_then(|a| self.checked_law(kind, a));
            chain.advance(
                i,
                kind,
                e.element.span,
                args.as_ref(),
                built.as_ref().map(|b| &b.1),
            );
            match (prev, next, built) {
                (Some(a), Some(b), Some((law, built))) => {
                    // Its group is set by the assembler when the group is added, once the use
                    // is known to be complete.
                    let id = self.asm.link(super::links::element_link(
                        format!("{}.{}", name.name, e.name.name),
                        e.span,
                        (a, b),
                        kind,
                        law,
                        built,
                    ));
                    links.push(id);
                    if let Some(args) = &args {
                        self.diags.extend(kind.warnings(args));
                        for f in kind.figures(args) {
                            self.asm.figure(id, f);
                        }
                        for (n, rule) in kind.solved_figures(args) {
                            self.asm.solved_figure(id, n, rule);
                        }
                    }
                }
                _ => complete = false,
            }
            prev = next;
        }
        if complete {
            // The loss the insulation adds in W needs the temperature difference, known here
            // when both ends are held.
            let held = |n: Option<NodeId>| n.and_then(|n| self.asm.net().nodes[n].fixed);
            let delta_t = held(from).zip(held(to)).map(|(a, b)| a - b);
            self.diags
                .extend(chain.insulation_warning(name, els, delta_t));
            // Reported always, not only inside the warning: a reviewer checks it either way.
            if let Some((i, r_crit)) = chain.critical_radius() {
                if let Some(&id) = links.get(i) {
                    self.asm
                        .figure(id, Figure::of("critical_radius", r_crit, Dim::LENGTH));
                }
            }
            if let Some(&film) = links.last() {
                if let Some(check) = chain.pending_check(name, els, film) {
                    self.asm.radius_check(check);
                }
            }
            if let (Some(a), Some(b)) = (from, to) {
                let area = if geom == shell::Geometry::Plane {
                    use_args.area.map(|a| a.0)
                } else {
                    None
                };
                self.asm.group(Group {
                    name: name.name.clone(),
                    span: name.span,
                    buildup: call.kind.name.clone(),
                    from: a,
                    to: b,
                    area,
                    length: match geom {
                        shell::Geometry::Cylinder => use_args.length.map(|l| l.0),
                        _ => None,
                    },
                    links,
                });
            }
        }
    }
}

/// Report unknown element kinds inside build-up declarations once, where they are written.
pub fn check_buildup_kinds(module: &Module) -> Vec<Diagnostic> {
    let mut out = Vec::new();
    for item in &module.items {
        if let ItemKind::Buildup {
            elements: els,
            name,
        } = &item.kind
        {
            if els.is_empty() {
                out.push(
                    Diagnostic::error("E203", format!("build-up `{}` has no elements", name.name), name.span)
                        .with_label("empty build-up")
                        .with_help("list its layers and films from one side to the other, e.g. `inside: film(h = 8 W/(m^2*K))`"),
                );
            }
            out.extend(shell::check_mixed(els));
            for e in els.iter().filter(|e| {
                elements::lookup(&e.element.kind.name).is_some_and(|k| !k.single_link())
            }) {
                out.push(
                    Diagnostic::error(
                        "E217",
                        format!(
                            "`{}` cannot be an element of a build-up",
                            e.element.kind.name
                        ),
                        e.element.kind.span,
                    )
                    .with_label("makes its own nodes and heat")
                    .with_help("declare it as a link of its own between the two nodes it joins"),
                );
            }
            for e in els {
                if elements::lookup(&e.element.kind.name).is_none() {
                    let names = elements::ALL.iter().map(|k| k.name());
                    let mut d = Diagnostic::error(
                        "E206",
                        format!("unknown element kind `{}`", e.element.kind.name),
                        e.element.kind.span,
                    )
                    .with_label("not an element kind");
                    d = match did_you_mean(&e.element.kind.name, names) {
                        Some(s) => d.with_help(format!("did you mean `{s}`?")).with_fix(
                            format!("Replace with `{s}`"),
                            e.element.kind.span,
                            s,
                        ),
                        None => d.with_help(format!(
                            "a build-up element is one of {}",
                            elements::ALL
                                .iter()
                                .map(|k| format!("`{}(...)`", k.name()))
                                .collect::<Vec<_>>()
                                .join(", ")
                        )),
                    };
                    out.push(d);
                }
            }
        }
    }
    out
}
