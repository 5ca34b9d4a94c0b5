//! Declarations: the file's items, each kind by its first token, and the recovery that skips a
//! broken one up to the next declaration.

use super::blocks;
use super::error::{PErr, ARG_SEP};
use super::expr::{committed, expr, name, name_in_entry, tok, P};
use super::tokens::{Tk, Word};
use super::{Cx, Ex, In};
use crate::diagnostic::Diagnostic;
use crate::lexer::Tok;
use crate::span::Span;
use crate::syntax::*;
use chumsky::prelude::*;
use chumsky::recursive::Indirect;

/// What a top-level token that starts nothing was expected to be.
pub const DECLARATION: &str = "a declaration (`param`, `material`, `node`, `link`, `buildup`, `limit`, `repeat`, `network`, `use`, `region`, `schedule`, `case`, `transient`, `title` or `import`)";

/// A declaration that parsed, or `None` for one left out of the tree with its error reported
/// (an unclosed table or block, a block nested too deep).
pub type MaybeItem = Option<Item>;

/// The whole file.
pub fn module<'s>(cx: Cx<'s>) -> impl Parser<'s, In<'s>, Vec<Item>, Ex> {
    let item = item(cx);
    item.recover_with(via_parser(skip_to_declaration(false).to(None)))
        .repeated()
        .collect::<Vec<MaybeItem>>()
        .map(|items| items.into_iter().flatten().collect())
        .then_ignore(end())
}

/// Skip a broken declaration: at least one token, then up to the next declaration (or, in a
/// block, its closing `}`).
pub fn skip_to_declaration<'s>(in_block: bool) -> impl Parser<'s, In<'s>, (), Ex> + Clone {
    any()
        .then(
            any()
                .filter(move |t: &Tk| !(t.starts_decl || in_block && t.kind == Tok::RBrace))
                .repeated(),
        )
        .ignored()
}

/// One declaration (recursive: blocks hold declarations).
pub fn item<'s>(cx: Cx<'s>) -> P<'s, MaybeItem> {
    let mut item: Recursive<Indirect<'s, 's, In<'s>, MaybeItem, Ex>> = Recursive::declare();
    let e = expr(cx);
    let args = |label| arg_list(cx, e.clone(), label);

    let title = intro(cx, Tok::Title, "title")
        .ignore_then(string(
            cx,
            "the model's title in quotes, e.g. `title \"Garden office wall\"`",
        ))
        .map(|(text, _)| ItemKind::Title { text });
    let import = intro(cx, Tok::Import, "import")
        .ignore_then(string(cx, "the path of a model file in quotes"))
        .map(|(path, path_span)| ItemKind::Import { path, path_span });
    let param = intro(cx, Tok::Param, "param")
        .ignore_then(name(cx, "the parameter's name"))
        .then_ignore(tok(Tok::Eq).labelled("`=` and the parameter's value"))
        .then(e.clone())
        .map(|(name, value)| ItemKind::Param { name, value });
    let material = intro(cx, Tok::Material, "material")
        .ignore_then(name(cx, "the material's name"))
        .then(args(
            "the material's properties in parentheses, e.g. `(k = 0.04 W/(m*K))`",
        ))
        .map(|(name, args)| ItemKind::Material { name, args });

    // A node may stand alone; anything else on its line must be its property list.
    let node_args_follow =
        any().filter(|t: &Tk| t.kind == Tok::LParen || !t.first_on_line && !t.kind.starts_item());
    let node = intro(cx, Tok::Node, "node")
        .ignore_then(name(cx, "the node's name"))
        .then(
            committed(node_args_follow, args(
                    "`(` to open the node's properties, as in `node attic (fixed = 5 °C)` or `node die (load = 2 W)`",
                )),
        )
        .map(|(name, args)| ItemKind::Node {
            name,
            args: args.unwrap_or_default(),
        });

    let link = intro(cx, Tok::Link, "link")
        .ignore_then(name(cx, "the link's name"))
        .then_ignore(
            tok(Tok::Colon)
                .labelled("`:` after the link's name, as in `link name: a to b layer(...)`"),
        )
        .then(name(cx, "the node the link starts from"))
        .then_ignore(tok(Tok::To).labelled("`to` between the link's two nodes"))
        .then(name(cx, "the node the link goes to"))
        .then(element_call(
            cx,
            e.clone(),
            "the link's kind, e.g. `layer(...)`, `film(...)`",
        ))
        .map(|(((name, from), to), element)| ItemKind::Link {
            name,
            from,
            to,
            element,
        });

    let buildup = intro(cx, Tok::Buildup, "buildup")
        .ignore_then(name(cx, "the build-up's name"))
        .then_ignore(tok(Tok::LBrace).labelled("`{` to open the build-up's list of layers"))
        .then(blocks::buildup_elements(cx, e.clone()))
        .map(|(name, elements)| elements.map(|elements| ItemKind::Buildup { name, elements }));

    let comparison = any()
        .try_map(|t: Tk, span: Span| match t.kind {
            Tok::Lt => Ok(CmpOp::Lt),
            Tok::Le => Ok(CmpOp::Le),
            Tok::Gt => Ok(CmpOp::Gt),
            Tok::Ge => Ok(CmpOp::Ge),
            _ => Err(PErr::expected(span, Some(t), [])),
        })
        .labelled("a comparison `<`, `<=`, `>` or `>=`");
    let limit = intro(cx, Tok::Limit, "limit")
        .ignore_then(name(cx, "the limit's name"))
        .then_ignore(
            tok(Tok::Colon)
                .labelled("`:` after the limit's name, as in `limit name: temperature(x) < 60 °C`"),
        )
        .then(name(
            cx,
            "a measure such as `temperature`, `heat_flow` or `u_value`",
        ))
        .then_ignore(tok(Tok::LParen).labelled("`(` and the node or link the limit is about"))
        .then(name(cx, "the node or link the limit is about"))
        .then_ignore(tok(Tok::RParen).labelled("`)`"))
        .then(comparison)
        .then(e.clone())
        .map(
            |((((name, measure), subject), op), value)| ItemKind::Limit {
                name,
                measure,
                subject,
                op,
                value,
            },
        );

    // `WORD NAME [(ARGS)] [{ ROWS }]` for `schedule`, `case` and `transient`.
    let declaration = choice((
        any()
            .filter(|t: &Tk| t.kind == Tok::Ident && t.word == Word::Declaration && t.before_name)
            .map_with(move |_, e| cx.ident(e.span())),
        misspelt(cx, "schedule"),
        misspelt(cx, "case"),
        misspelt(cx, "transient"),
    ))
    .then(name(cx, "the declaration's name"))
    .then(committed(tok(Tok::LParen), args("`(`")))
    .then(committed(
        tok(Tok::LBrace),
        tok(Tok::LBrace).ignore_then(blocks::rows(cx, e.clone())),
    ))
    .map(|(((word, name), args), rows)| match rows {
        // An unclosed table drops the declaration; its error is reported.
        Some(None) => None,
        rows => Some(ItemKind::Declaration {
            word,
            name,
            args: args.unwrap_or_default(),
            rows: rows.flatten(),
        }),
    });

    let contextual = blocks::block_items(cx, e.clone(), item.clone());

    // The kinds are told apart by their first token, so their order only matters for speed:
    // the commonest first.
    let kind = choice((
        node.map(Some),
        link.map(Some),
        param.map(Some),
        material.map(Some),
        limit.map(Some),
        buildup,
        declaration,
        contextual,
        title.map(Some),
        import.map(Some),
    ))
    .labelled(DECLARATION);
    item.define(kind.map_with(|kind, e| {
        kind.map(|kind| Item {
            kind,
            span: e.span(),
        })
    }));
    item.boxed()
}

/// The keyword `kind`, or a slip for it at the start of a line (reported, then read as meant so
/// that what it declares exists and its uses raise no further errors).
fn intro<'s>(cx: Cx<'s>, kind: Tok, word: &'static str) -> impl Parser<'s, In<'s>, (), Ex> + Clone {
    choice((tok(kind).ignored(), misspelt(cx, word).ignored()))
}

/// A name first on its line that is a slip for the declaration word `word` (E006, with the
/// word as a fix); yields the word as written correctly, at the slip's place.
pub fn misspelt<'s>(cx: Cx<'s>, word: &'static str) -> impl Parser<'s, In<'s>, Ident, Ex> + Clone {
    any()
        .filter(move |t: &Tk| t.meant() == Some(word))
        .validate(move |_, e, emitter| {
            let span: Span = e.span();
            let written = cx.slice(span);
            emitter.emit(PErr::custom(
                Diagnostic::error(
                    "E006",
                    format!("`{written}` is not a declaration word"),
                    span,
                )
                .with_label(format!("did you mean `{word}`?"))
                .with_help(format!(
                    "declarations start with a word of the language, written in lower case: `{word}`"
                ))
                .with_fix(format!("write `{word}`"), span, word),
            ));
            Ident {
                name: word.to_string(),
                span,
            }
        })
}

/// A string in quotes, unescaped, with its span.
fn string<'s>(
    cx: Cx<'s>,
    expected: &'static str,
) -> impl Parser<'s, In<'s>, (String, Span), Ex> + Clone {
    tok(Tok::Str)
        .map_with(move |_, e| {
            let span: Span = e.span();
            let raw = cx.slice(span);
            let inner = &raw[1..raw.len() - 1];
            (inner.replace("\\\"", "\"").replace("\\\\", "\\"), span)
        })
        .labelled(expected)
}

/// `kind(arguments)`: an element such as `layer(gypsum, thickness = 12.5 mm)`.
pub fn element_call<'s>(
    cx: Cx<'s>,
    e: P<'s, Expr>,
    expected: &'static str,
) -> impl Parser<'s, In<'s>, ElementCall, Ex> + Clone {
    name_in_entry(cx, expected)
        .then(arg_list(cx, e, "`(` and the element's arguments"))
        .map_with(|(kind, args), e| ElementCall {
            kind,
            args,
            span: e.span(),
        })
}

/// `(name = value, value, ...)`, a trailing comma allowed.
pub fn arg_list<'s>(
    cx: Cx<'s>,
    e: P<'s, Expr>,
    expected: &'static str,
) -> impl Parser<'s, In<'s>, Vec<Arg>, Ex> + Clone {
    // A keyword before `=` is an argument name too: `layer(material = brick)`.
    // Decided by the token's own flag, not by trying `=`: a failed try would leave an error at
    // the token after the name, further on than the real one at the name.
    let arg_name = any()
        .filter(|t: &Tk| {
            t.before_eq && (t.kind == Tok::Ident || t.kind.starts_item() || t.kind == Tok::To)
        })
        .map_with(move |_, e| cx.ident(e.span()))
        .then_ignore(tok(Tok::Eq));
    let arg = arg_name.or_not().then(e).map(|(name, value)| Arg {
        span: name
            .as_ref()
            .map(|n| n.span)
            .unwrap_or(value.span)
            .to(value.span),
        name,
        value,
    });
    tok(Tok::LParen)
        .labelled(expected)
        .ignore_then(
            arg.separated_by(tok(Tok::Comma))
                .allow_trailing()
                .collect::<Vec<_>>(),
        )
        .then_ignore(tok(Tok::RParen).labelled(ARG_SEP))
}
