//! Every span of a syntax tree lies inside its text: a walk over a parsed module (declarations,
//! names, arguments, expressions, table rows, build-up elements, region edges, block bodies and
//! comments) that fails on the first span out of bounds or off a character boundary. Error
//! recovery builds partial trees and placeholders, which is where a bad span would come from.

use caloris_compiler::span::Span;
use caloris_compiler::syntax::{
    Arg, ElementCall, Expr, ExprKind, Ident, Item, ItemKind, Module, RegionEdge, Row,
};

/// Check every span of `module`, parsed from `text`.
pub fn assert_tree_spans(text: &str, module: &Module) {
    let w = Walk { text };
    for c in &module.comments {
        w.span(*c, "a comment");
    }
    w.items(&module.items);
}

struct Walk<'a> {
    text: &'a str,
}

impl Walk<'_> {
    fn span(&self, s: Span, what: &str) {
        let (a, b) = (s.start as usize, s.end as usize);
        assert!(
            a <= b && b <= self.text.len(),
            "{what} has the span {a}..{b} in a text of {} bytes:\n{}",
            self.text.len(),
            self.text
        );
        assert!(
            self.text.is_char_boundary(a) && self.text.is_char_boundary(b),
            "{what} has the span {a}..{b}, not on character boundaries:\n{}",
            self.text
        );
    }

    fn ident(&self, id: &Ident, what: &str) {
        self.span(id.span, what);
    }

    fn items(&self, items: &[Item]) {
        for item in items {
            self.item(item);
        }
    }

    fn item(&self, item: &Item) {
        self.span(item.span, "a declaration");
        match &item.kind {
            ItemKind::Title { .. } => {}
            ItemKind::Import { path_span, .. } => self.span(*path_span, "an import's path"),
            ItemKind::Param { name, value } => {
                self.ident(name, "a parameter's name");
                self.expr(value);
            }
            ItemKind::Material { name, args } | ItemKind::Node { name, args } => {
                self.ident(name, "a declared name");
                self.args(args);
            }
            ItemKind::Link {
                name,
                from,
                to,
                element,
            } => {
                self.ident(name, "a link's name");
                self.ident(from, "a link's first node");
                self.ident(to, "a link's second node");
                self.element(element);
            }
            ItemKind::Buildup { name, elements } => {
                self.ident(name, "a build-up's name");
                for e in elements {
                    self.span(e.span, "a build-up element");
                    self.ident(&e.name, "a build-up element's name");
                    self.element(&e.element);
                }
            }
            ItemKind::Limit {
                name,
                measure,
                subject,
                value,
                ..
            } => {
                self.ident(name, "a limit's name");
                self.ident(measure, "a limit's measure");
                self.ident(subject, "a limit's subject");
                self.expr(value);
            }
            ItemKind::Declaration {
                word,
                name,
                args,
                rows,
            } => {
                self.ident(word, "a declaration word");
                self.ident(name, "a declared name");
                self.args(args);
                for r in rows.iter().flatten() {
                    self.row(r);
                }
            }
            ItemKind::Repeat { name, args, body } => {
                self.ident(name, "a repetition's name");
                self.args(args);
                self.items(body);
            }
            ItemKind::Network { name, ports, body } => {
                self.ident(name, "a sub-network's name");
                for p in ports {
                    self.ident(p, "a port");
                }
                self.items(body);
            }
            ItemKind::Use {
                name,
                network,
                args,
            } => {
                self.ident(name, "a use's name");
                self.ident(network, "a used sub-network");
                self.args(args);
            }
            ItemKind::Region { name, args, edges } => {
                self.ident(name, "a region's name");
                self.args(args);
                for e in edges {
                    self.edge(e);
                }
            }
        }
    }

    fn row(&self, r: &Row) {
        self.span(r.span, "a table row");
        self.expr(&r.key);
        self.expr(&r.value);
    }

    fn edge(&self, e: &RegionEdge) {
        self.span(e.span, "a region edge");
        self.ident(&e.side, "an edge's side");
        self.ident(&e.node, "an edge's node");
        if let Some(el) = &e.element {
            self.element(el);
        }
    }

    fn element(&self, e: &ElementCall) {
        self.span(e.span, "an element");
        self.ident(&e.kind, "an element's kind");
        self.args(&e.args);
    }

    fn args(&self, args: &[Arg]) {
        for a in args {
            self.span(a.span, "an argument");
            if let Some(n) = &a.name {
                self.ident(n, "an argument's name");
            }
            self.expr(&a.value);
        }
    }

    /// Recursion is bounded by the parser's expression depth limit.
    fn expr(&self, e: &Expr) {
        self.span(e.span, "an expression");
        match &e.kind {
            ExprKind::Number { unit, .. } => {
                if let Some((_, s)) = unit {
                    self.span(*s, "a number's unit");
                }
            }
            ExprKind::Name(id) => self.ident(id, "a name in an expression"),
            ExprKind::Neg(x) | ExprKind::Paren(x) => self.expr(x),
            ExprKind::Chain { first, rest } => {
                self.expr(first);
                for (_, x) in rest {
                    self.expr(x);
                }
            }
            ExprKind::Power { base, exponent } => {
                self.expr(base);
                self.expr(exponent);
            }
            ExprKind::Call { func, args } => {
                self.ident(func, "a function's name");
                for x in args {
                    self.expr(x);
                }
            }
            ExprKind::Missing => {}
        }
    }
}
