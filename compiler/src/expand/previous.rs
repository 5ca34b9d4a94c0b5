//! Whether a repeated body refers to `previous.NAME`: a walk over exactly the names a copy
//! renames (see `Renamer` in the parent module), nested blocks included, since a copy renames
//! those too.
//!
//! It runs once per repeat each time one is expanded, so for nested repeats once per copy of
//! every enclosing body: it allocates nothing and stops at the first mention. (It used to
//! serialise the body to JSON and search the text, which made 65 536 copies of a body of
//! fifteen nested repeats take minutes.)

use crate::syntax::{Arg, ElementCall, Expr, Ident, Item, ItemKind};

const PREFIX: &str = "previous.";

/// True when some name in `body` that a copy renames starts with `previous.`.
pub(super) fn mentions_previous(body: &[Item]) -> bool {
    body.iter().any(item)
}

fn item(item: &Item) -> bool {
    match &item.kind {
        ItemKind::Param { name, value } => ident(name) || expr(value),
        ItemKind::Material { name, args } | ItemKind::Node { name, args } => {
            ident(name) || args_mention(args)
        }
        ItemKind::Link {
            name,
            from,
            to,
            element,
        } => ident(name) || ident(from) || ident(to) || call(element),
        ItemKind::Buildup { name, elements } => {
            ident(name) || elements.iter().any(|e| call(&e.element))
        }
        ItemKind::Limit {
            name,
            subject,
            value,
            ..
        } => ident(name) || ident(subject) || expr(value),
        ItemKind::Repeat { name, args, body } => {
            ident(name) || args_mention(args) || mentions_previous(body)
        }
        // The network's own name is looked up, never renamed.
        ItemKind::Use { name, args, .. } => ident(name) || args_mention(args),
        ItemKind::Region { name, args, edges } => {
            ident(name)
                || args_mention(args)
                || edges
                    .iter()
                    .any(|e| ident(&e.node) || e.element.as_ref().is_some_and(call))
        }
        // Not allowed inside a block (E219) and copied unchanged.
        ItemKind::Title { .. }
        | ItemKind::Import { .. }
        | ItemKind::Network { .. }
        | ItemKind::Declaration { .. } => false,
    }
}

fn ident(id: &Ident) -> bool {
    id.name.starts_with(PREFIX)
}

fn call(c: &ElementCall) -> bool {
    ident(&c.kind) || args_mention(&c.args)
}

fn args_mention(args: &[Arg]) -> bool {
    args.iter().any(|a| expr(&a.value))
}

fn expr(e: &Expr) -> bool {
    let mut found = false;
    e.visit_names(&mut |id| found |= ident(id));
    found
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::parser::parse;
    use crate::span::FileId;

    fn body_of(src: &str) -> Vec<Item> {
        let (module, diags) = parse(src, FileId(0));
        assert!(diags.is_empty(), "{diags:?}");
        match module.items.into_iter().next().map(|i| i.kind) {
            Some(ItemKind::Repeat { body, .. }) => body,
            other => panic!("not a repeat: {other:?}"),
        }
    }

    #[test]
    fn finds_previous_where_a_copy_renames_it() {
        let cases = [
            ("link l: previous.t to t resistance(1 K/W)", true),
            ("link l: t to a resistance(r = previous.r)", true),
            ("param p = 2 * previous.x + 1", true),
            ("limit hot: temperature(previous.t) <= 80 °C", true),
            (
                "repeat inner (count = 2) {\n node n (load = previous.q)\n}",
                true,
            ),
            (
                "node t (load = 1 W)\nlink l: t to a resistance(1 K/W)",
                false,
            ),
            ("param p = previous_value", false),
        ];
        for (inner, want) in cases {
            let src = format!("repeat seg (count = 3, first = a) {{\n{inner}\n}}\n");
            assert_eq!(mentions_previous(&body_of(&src)), want, "{inner}");
        }
    }
}
