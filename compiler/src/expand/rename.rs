//! One copy of a body with its names made its own: local names prefixed with the copy's
//! (`seg.3.NAME`), ports bound to the nodes they were given, `index` and `count` replaced by
//! numbers, and `previous.NAME` by the copy before (or the `first` node).

use crate::diagnostic::Diagnostic;
use crate::syntax::*;
use rustc_hash::{FxHashMap, FxHashSet};

/// Names declared directly in a body.
pub(super) fn declared(body: &[Item]) -> FxHashSet<String> {
    body.iter()
        .filter_map(|i| i.name().map(|n| n.name.clone()))
        .collect()
}

/// Renames one copy of a body.
pub(super) struct Renamer<'a> {
    pub prefix: String,
    pub locals: &'a FxHashSet<String>,
    pub ports: FxHashMap<String, String>,
    /// `index` and `count` of a repetition.
    pub index: Option<(f64, f64)>,
    /// What `previous.X` becomes: `Some(prefix_of_previous_copy)`, or for copy 1 the `first`
    /// node (`Some(None)` when none was given).
    pub previous: Option<Option<String>>,
}

impl Renamer<'_> {
    fn name(&self, n: &str) -> String {
        if let Some(bound) = self.ports.get(n) {
            return bound.clone();
        }
        let head = n.split('.').next().unwrap_or(n);
        if self.locals.contains(head) {
            return format!("{}.{n}", self.prefix);
        }
        if let (Some(rest), Some(prev)) = (n.strip_prefix("previous."), &self.previous) {
            return match prev {
                Some(p) if self.index.is_some_and(|(i, _)| i > 1.0) => format!("{p}.{rest}"),
                Some(first) => first.clone(),
                None => n.to_string(),
            };
        }
        n.to_string()
    }

    pub fn ident(&self, id: &Ident) -> Ident {
        Ident {
            name: self.name(&id.name),
            span: id.span,
        }
    }

    fn expr(&self, e: &Expr) -> Expr {
        let kind = match &e.kind {
            ExprKind::Name(id) => match (id.name.as_str(), self.index) {
                (n @ ("index" | "count"), Some((i, c))) if !self.locals.contains(n) => {
                    let value = if n == "index" { i } else { c };
                    ExprKind::Number { value, unit: None }
                }
                _ => ExprKind::Name(self.ident(id)),
            },
            ExprKind::Neg(x) => ExprKind::Neg(Box::new(self.expr(x))),
            ExprKind::Chain { first, rest } => ExprKind::Chain {
                first: Box::new(self.expr(first)),
                rest: rest.iter().map(|(op, x)| (*op, self.expr(x))).collect(),
            },
            ExprKind::Power { base, exponent } => ExprKind::Power {
                base: Box::new(self.expr(base)),
                exponent: Box::new(self.expr(exponent)),
            },
            ExprKind::Call { func, args } => ExprKind::Call {
                func: func.clone(),
                args: args.iter().map(|a| self.expr(a)).collect(),
            },
            ExprKind::Paren(x) => ExprKind::Paren(Box::new(self.expr(x))),
            other => other.clone(),
        };
        Expr { kind, span: e.span }
    }

    fn args(&self, args: &[Arg]) -> Vec<Arg> {
        args.iter()
            .map(|a| Arg {
                name: a.name.clone(),
                value: self.expr(&a.value),
                span: a.span,
            })
            .collect()
    }

    fn call(&self, c: &ElementCall) -> ElementCall {
        ElementCall {
            kind: self.ident(&c.kind),
            args: self.args(&c.args),
            span: c.span,
        }
    }

    pub fn item(&self, item: &Item, diags: &mut Vec<Diagnostic>) -> Item {
        let kind = match &item.kind {
            ItemKind::Param { name, value } => ItemKind::Param {
                name: self.ident(name),
                value: self.expr(value),
            },
            ItemKind::Material { name, args } => ItemKind::Material {
                name: self.ident(name),
                args: self.args(args),
            },
            ItemKind::Node { name, args } => ItemKind::Node {
                name: self.ident(name),
                args: self.args(args),
            },
            ItemKind::Link {
                name,
                from,
                to,
                element,
            } => ItemKind::Link {
                name: self.ident(name),
                from: self.ident(from),
                to: self.ident(to),
                element: self.call(element),
            },
            ItemKind::Buildup { name, elements } => ItemKind::Buildup {
                name: self.ident(name),
                elements: elements
                    .iter()
                    .map(|e| BuildupElement {
                        name: e.name.clone(),
                        element: self.call(&e.element),
                        span: e.span,
                    })
                    .collect(),
            },
            ItemKind::Limit {
                name,
                measure,
                subject,
                op,
                value,
            } => ItemKind::Limit {
                name: self.ident(name),
                measure: measure.clone(),
                subject: self.ident(subject),
                op: *op,
                value: self.expr(value),
            },
            ItemKind::Repeat { name, args, body } => ItemKind::Repeat {
                name: self.ident(name),
                args: self.args(args),
                body: body.iter().map(|b| self.item(b, diags)).collect(),
            },
            ItemKind::Use {
                name,
                network,
                args,
            } => ItemKind::Use {
                name: self.ident(name),
                network: network.clone(),
                args: self.args(args),
            },
            ItemKind::Region { name, args, edges } => ItemKind::Region {
                name: self.ident(name),
                args: self.args(args),
                edges: edges
                    .iter()
                    .map(|e| RegionEdge {
                        side: e.side.clone(),
                        node: self.ident(&e.node),
                        element: e.element.as_ref().map(|c| self.call(c)),
                        span: e.span,
                    })
                    .collect(),
            },
            ItemKind::Title { .. }
            | ItemKind::Import { .. }
            | ItemKind::Network { .. }
            | ItemKind::Declaration { .. } => {
                let what = match &item.kind {
                    ItemKind::Network { .. } => "a sub-network",
                    ItemKind::Declaration { word, .. } => match word.name.as_str() {
                        "schedule" => "a schedule",
                        "case" => "a case",
                        _ => "a transient run",
                    },
                    _ => "a title or an import",
                };
                diags.push(
                    Diagnostic::error(
                        "E219",
                        format!("{what} cannot be declared inside a block"),
                        item.span,
                    )
                    .with_label("not allowed here")
                    .with_help("move it to the top level of the file"),
                );
                item.kind.clone()
            }
        };
        Item {
            kind,
            span: item.span,
        }
    }
}
