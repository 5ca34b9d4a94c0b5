//! What sits between braces: table rows, build-up elements, region edges and blocks of
//! declarations, each part recovering on its own so one bad row, element or edge costs only
//! itself. An unclosed brace drops its declaration (its error names the brace), keeping the
//! errors found inside it.

use super::error::{PErr, PORT_SEP, ROW_COLON, ROW_END};
use super::expr::{committed, name, name_in_entry, tok, P};
use super::items::{arg_list, element_call, misspelt, skip_to_declaration, MaybeItem};
use super::tokens::{Tk, Word};
use super::{Cx, Ex, In, MAX_BLOCK_DEPTH};
use crate::diagnostic::Diagnostic;
use crate::lexer::Tok;
use crate::span::Span;
use crate::syntax::*;
use chumsky::input::Input as _;
use chumsky::input::InputRef;
use chumsky::prelude::*;

/// The next token exists, is not `}` and does not begin a declaration: a part of the braces'
/// content starts here.
fn part_starts<'s>() -> impl Parser<'s, In<'s>, (), Ex> + Clone {
    any()
        .filter(|t: &Tk| t.kind != Tok::RBrace && !t.starts_decl)
        .rewind()
        .ignored()
}

/// The closing `}` of a table or build-up: `Some(())` when found; otherwise the error says the
/// braces are not closed (at the declaration that starts first, or at the end of the file).
fn close<'s>(
    cx: Cx<'s>,
    what: &'static str,
    last: &'static str,
) -> impl Parser<'s, In<'s>, bool, Ex> + Clone {
    let at_declaration = any()
        .filter(|t: &Tk| t.starts_decl)
        .map_with(|_, e| e.span())
        .rewind()
        .validate(move |span: Span, _, emitter| {
            emitter.emit(PErr::custom(
                Diagnostic::error("E002", format!("this {what} is not closed"), span)
                    .with_label("a new declaration starts before `}`")
                    .with_help(format!("add `}}` after the {what}'s last {last}")),
            ));
            false
        });
    let at_end = end().validate(move |_, _, emitter| {
        emitter.emit(PErr::custom(
            Diagnostic::error("E002", format!("this {what} is not closed"), cx.eof)
                .with_label("the file ends before `}`")
                .with_help(format!("add `}}` after the {what}'s last {last}")),
        ));
        false
    });
    choice((tok(Tok::RBrace).to(true), at_declaration, at_end))
}

/// Rows `KEY: VALUE`, one per line, up to `}` (the `{` is read). `None` if never closed.
pub fn rows<'s>(
    cx: Cx<'s>,
    e: P<'s, Expr>,
) -> impl Parser<'s, In<'s>, Option<Vec<Row>>, Ex> + Clone {
    // The tokens of one line, read as an input of their own: a value never runs on into the
    // next row's key (`3 °C` followed by a row `-1 h: ...` is two rows, not a subtraction).
    // Read by hand rather than with `repeated`, which would leave a failed attempt at the next
    // line's first token, further on than the row's own error and so preferred to it.
    let line = custom(|inp: &mut InputRef<'s, '_, In<'s>, Ex>| {
        let before = inp.cursor();
        inp.skip();
        while inp.peek().is_some_and(|t| !t.first_on_line) {
            inp.skip();
        }
        let toks: &'s [(Tk, Span)] = inp.slice(&before..&inp.cursor());
        let last = toks[toks.len() - 1].1;
        Ok(toks.split_token_span(Span {
            start: last.end,
            ..last
        }))
    });
    let row = e
        .clone()
        .then_ignore(tok(Tok::Colon).labelled(ROW_COLON))
        .then(e)
        .then_ignore(end().labelled(ROW_END))
        .map(|(key, value)| Row {
            span: key.span.to(value.span),
            key,
            value,
        })
        .nested_in(line)
        .map_err(PErr::at_line_end);
    // A bad row keeps a placeholder (never evaluated: its error is reported) so the table
    // does not also look empty; reading resumes at the next line.
    let skip_row = any()
        .then(
            any()
                .filter(|t: &Tk| t.kind != Tok::RBrace && !t.kind.starts_item() && !t.first_on_line)
                .repeated(),
        )
        .map_with(|_, e| {
            let span: Span = e.span();
            let missing = Expr {
                kind: ExprKind::Missing,
                span,
            };
            Row {
                key: missing.clone(),
                value: missing,
                span,
            }
        });
    part_starts()
        .ignore_then(row.recover_with(via_parser(skip_row)))
        .repeated()
        .collect::<Vec<_>>()
        .then(close(cx, "table", "row"))
        .map(|(rows, closed)| closed.then_some(rows))
}

/// The elements of a build-up up to `}` (the `{` is read). `None` if never closed.
pub fn buildup_elements<'s>(
    cx: Cx<'s>,
    e: P<'s, Expr>,
) -> impl Parser<'s, In<'s>, Option<Vec<BuildupElement>>, Ex> + Clone {
    let element = name(
        cx,
        "an element name, as in `insulation: layer(wood_fibre, thickness = 140 mm)`",
    )
    .then_ignore(tok(Tok::Colon).labelled("`:` after the element's name"))
    .then(element_call(
        cx,
        e,
        "the element's kind, e.g. `layer(...)` or `film(...)`",
    ))
    .map(|(name, element)| BuildupElement {
        span: name.span.to(element.span),
        name,
        element,
    });
    // Resume at the next element line (`name:`), `}` or declaration.
    let skip = any()
        .then(
            any()
                .filter(|t: &Tk| {
                    t.kind != Tok::RBrace
                        && !t.starts_decl
                        && !(t.kind == Tok::Ident && t.before_colon)
                })
                .repeated(),
        )
        .to(None);
    part_starts()
        .ignore_then(element.map(Some).recover_with(via_parser(skip)))
        .repeated()
        .collect::<Vec<_>>()
        .then(close(cx, "build-up", "element"))
        .map(|(elements, closed)| closed.then(|| elements.into_iter().flatten().collect()))
}

/// A contextual word before a name: `repeat`, `network`, `use` or `region`.
fn word<'s>(cx: Cx<'s>, w: &'static str) -> impl Parser<'s, In<'s>, (), Ex> + Clone {
    let exact = any()
        .filter(move |t: &Tk| t.kind == Tok::Ident && t.word == Word::Block && t.before_name)
        .try_map(move |t: Tk, span: Span| {
            if cx.slice(span) == w {
                Ok(())
            } else {
                Err(PErr::expected(span, Some(t), []))
            }
        });
    choice((exact, misspelt(cx, w).ignored()))
}

/// `repeat NAME (ARGS) { ... }`, `network NAME (PORTS) { ... }`, `use NAME: NETWORK(ARGS)`,
/// `region NAME (ARGS) { ... }`.
pub fn block_items<'s>(
    cx: Cx<'s>,
    e: P<'s, Expr>,
    item: impl Parser<'s, In<'s>, MaybeItem, Ex> + Clone + 's,
) -> impl Parser<'s, In<'s>, Option<ItemKind>, Ex> + Clone {
    let args = |label| arg_list(cx, e.clone(), label);
    let repeat = word(cx, "repeat")
        .ignore_then(name(cx, "the repetition's name"))
        .then(args("`(count = N)` after the repetition's name"))
        .then(body(item.clone(), "`{` to open the declarations to repeat"))
        .map(|((name, args), body)| body.map(|body| ItemKind::Repeat { name, args, body }));

    let ports = tok(Tok::LParen)
        .labelled("`(` and the sub-network's port nodes, e.g. `(inside, outside)`")
        .ignore_then(
            name(cx, "a port node name")
                .separated_by(tok(Tok::Comma))
                .collect::<Vec<_>>(),
        )
        .then_ignore(tok(Tok::RParen).labelled(PORT_SEP));
    let network = word(cx, "network")
        .ignore_then(name(cx, "the sub-network's name"))
        .then(ports)
        .then(body(item, "`{` to open the sub-network's declarations"))
        .map(|((name, ports), body)| body.map(|body| ItemKind::Network { name, ports, body }));

    let use_ = word(cx, "use")
        .ignore_then(name(cx, "the name of this use"))
        .then_ignore(tok(Tok::Colon).labelled(
            "`:` after the name, as in `use kitchen: room_wall(inside = kitchen, outside = garden)`",
        ))
        .then(name(cx, "the sub-network to use"))
        .then(args("`(` and the ports and parameters of the use"))
        .map(|((name, network), args)| {
            Some(ItemKind::Use {
                name,
                network,
                args,
            })
        });

    let region = word(cx, "region")
        .ignore_then(name(cx, "the region's name"))
        .then(args("`(` and the region's material, size and cell counts"))
        .then(region_edges(cx, e))
        .map(|((name, args), edges)| edges.map(|edges| ItemKind::Region { name, args, edges }));

    choice((repeat, network, use_, region))
}

/// `{ SIDE: NODE [ELEMENT(...)] ... }`, one edge per line; a bad edge is skipped to the next
/// line and the others kept. `None` if the braces are never closed.
fn region_edges<'s>(
    cx: Cx<'s>,
    e: P<'s, Expr>,
) -> impl Parser<'s, In<'s>, Option<Vec<RegionEdge>>, Ex> + Clone {
    let element_follows = any().filter(|t: &Tk| t.kind == Tok::Ident && t.before_paren);
    let edge = name(
        cx,
        "an edge (`left`, `right`, `bottom`, `top`) or face (`front`, `back`)",
    )
    .then_ignore(tok(Tok::Colon).labelled("`:` after the edge, as in `left: hot_bar`"))
    .then(name_in_entry(cx, "the node this edge is attached to"))
    .then(committed(
        element_follows,
        element_call(cx, e, "an element such as `film(h = 10 W/(m^2*K))`"),
    ))
    .map_with(|((side, node), element), e| RegionEdge {
        side,
        node,
        element,
        span: e.span(),
    });
    let skip = any()
        .then(
            any()
                .filter(|t: &Tk| t.kind != Tok::RBrace && !t.starts_decl && !t.first_on_line)
                .repeated(),
        )
        .to(None);
    let not_closed = move |open: Span| {
        PErr::custom(
            Diagnostic::error("E002", "this region is not closed", open)
                .with_label("`{` opened here")
                .with_help("add `}` after the last edge attachment"),
        )
    };
    tok(Tok::LBrace)
        .labelled("`{` to open the region's edge attachments")
        .map_with(|_, e| e.span())
        .then(
            part_starts()
                .ignore_then(edge.map(Some).recover_with(via_parser(skip)))
                .repeated()
                .collect::<Vec<_>>(),
        )
        .then(tok(Tok::RBrace).or_not())
        .validate(move |((open, edges), closed), _, emitter| {
            if closed.is_none() {
                emitter.emit(not_closed(open));
                return None;
            }
            Some(edges.into_iter().flatten().collect())
        })
}

/// `{ declarations }` of a repetition or sub-network; a broken declaration inside is skipped up
/// to the next one or `}`. `None` if the block is never closed or nests too deep.
fn body<'s>(
    item: impl Parser<'s, In<'s>, MaybeItem, Ex> + Clone + 's,
    expected: &'static str,
) -> impl Parser<'s, In<'s>, Option<Vec<Item>>, Ex> + Clone {
    let items = part_or_declaration()
        .ignore_then(item.recover_with(via_parser(skip_to_declaration(true).to(None))))
        .repeated()
        .collect::<Vec<MaybeItem>>();
    let enter = custom(|inp: &mut InputRef<'s, '_, In<'s>, Ex>| {
        inp.state().blocks += 1;
        Ok(())
    });
    let leave = custom(|inp: &mut InputRef<'s, '_, In<'s>, Ex>| {
        inp.state().blocks -= 1;
        Ok(())
    });
    let inside = enter
        .ignore_then(items)
        .then(tok(Tok::RBrace).or_not())
        .then_ignore(leave);
    // One level of blocks takes more stack than chumsky's own growth check leaves room for
    // in an unoptimised build, so each level makes sure of a generous margin itself. What is
    // inside the braces never fails (parts recover, the close is checked below), so running
    // it through `inp.parse` loses no error position.
    let inside = custom(move |inp: &mut InputRef<'s, '_, In<'s>, Ex>| {
        stacker::maybe_grow(STACK_MARGIN, STACK_SEGMENT, || inp.parse(&inside))
    });
    tok(Tok::LBrace)
        .labelled(expected)
        .map_with(|_, e| e.span())
        .then(choice((too_deep(), inside.map(Some))))
        .validate(move |(open, inside), _, emitter| match inside {
            None => {
                emitter.emit(PErr::custom(too_deep_error(open)));
                None
            }
            Some((_, None)) => {
                emitter.emit(PErr::custom(
                    Diagnostic::error("E002", "this block is not closed", open)
                        .with_label("`{` opened here")
                        .with_help("add `}` after the block's last declaration"),
                ));
                None
            }
            Some((items, Some(_))) => Some(items.into_iter().flatten().collect()),
        })
}

/// Stack kept free before reading one more level of blocks, and the size of each extra
/// segment when it is not.
const STACK_MARGIN: usize = 512 * 1024;
const STACK_SEGMENT: usize = 4 * 1024 * 1024;

/// A declaration inside a block may start with anything but `}` (a broken one is skipped).
fn part_or_declaration<'s>() -> impl Parser<'s, In<'s>, (), Ex> + Clone {
    any()
        .filter(|t: &Tk| t.kind != Tok::RBrace)
        .rewind()
        .ignored()
}

/// A block nested deeper than [`MAX_BLOCK_DEPTH`]: skipped to its closing `}` without reading
/// what is inside (which is what would recurse). Fails, taking nothing, within the limit.
fn too_deep<'s>() -> impl Parser<'s, In<'s>, Option<(Vec<MaybeItem>, Option<Tk>)>, Ex> + Clone {
    custom(|inp: &mut InputRef<'s, '_, In<'s>, Ex>| {
        let here = inp.cursor();
        if inp.state().blocks < MAX_BLOCK_DEPTH {
            let span = inp.span_since(&here);
            return Err(PErr::expected(span, None, []));
        }
        let mut open_blocks = 1usize;
        while let Some(t) = inp.next() {
            match t.kind {
                Tok::LBrace => open_blocks += 1,
                Tok::RBrace if open_blocks == 1 => break,
                Tok::RBrace => open_blocks -= 1,
                _ => {}
            }
        }
        Ok(None)
    })
}

fn too_deep_error(open: Span) -> Diagnostic {
    Diagnostic::error(
        "E005",
        format!("blocks nested more than {MAX_BLOCK_DEPTH} deep"),
        open,
    )
    .with_label(format!("block level {} opens here", MAX_BLOCK_DEPTH + 1))
    .with_help(format!(
        "at most {MAX_BLOCK_DEPTH} levels of `repeat` and `network` blocks may nest; merge levels into one `repeat` with a larger count, or write a repetition of count 1 as its plain body"
    ))
}
