//! Expressions: numbers with units, names, calls, brackets, signs, powers and the two chain
//! levels `+ -` and `* /`, read into flat lists so a generated sum of thousands of terms costs
//! no recursion depth in anything that walks the tree later.

use super::error::{PErr, BRACKET_CLOSE, CALL_SEP, VALUE};
use super::tokens::Tk;
use super::{Cx, Ex, In, MAX_EXPR_DEPTH};
use crate::diagnostic::Diagnostic;
use crate::lexer::Tok;
use crate::span::Span;
use crate::syntax::*;
use chumsky::input::InputRef;
use chumsky::prelude::*;
use chumsky::recursive::Indirect;

pub(crate) type P<'s, O> = Boxed<'s, 's, In<'s>, O, Ex>;

/// One token of the given kind.
pub fn tok<'s>(kind: Tok) -> impl Parser<'s, In<'s>, Tk, Ex> + Clone {
    any().filter(move |t: &Tk| t.kind == kind)
}

/// `p` when `intro` is next (without reading it), else nothing; once `intro` is seen, a
/// failure of `p` is the failure of the whole (a broken argument list after `(` is an error,
/// not a name without arguments followed by junk).
pub fn committed<'s, O, A, B>(intro: A, p: B) -> impl Parser<'s, In<'s>, Option<O>, Ex> + Clone
where
    A: Parser<'s, In<'s>, Tk, Ex> + Clone,
    B: Parser<'s, In<'s>, O, Ex> + Clone,
{
    choice((
        intro.clone().rewind().ignore_then(p).map(Some),
        intro.not().map(|_| None),
    ))
}

/// A name, as an [`Ident`].
pub fn name<'s>(cx: Cx<'s>, expected: &'static str) -> impl Parser<'s, In<'s>, Ident, Ex> + Clone {
    // A contextual word opening the next line's declaration (`case top`) is that
    // declaration, not the name this one left out.
    any()
        .filter(|t: &Tk| t.kind == Tok::Ident && !t.starts_line_decl)
        .map_with(move |_, e| cx.ident(e.span()))
        .labelled(expected)
}

/// A name that is not the next entry of a list of `NAME:` lines (a build-up's element, a
/// region's edge): `back:` left empty must not take the next line's `left` as its node.
pub fn name_in_entry<'s>(
    cx: Cx<'s>,
    expected: &'static str,
) -> impl Parser<'s, In<'s>, Ident, Ex> + Clone {
    any()
        .filter(|t: &Tk| {
            t.kind == Tok::Ident && !(t.first_on_line && (t.before_colon || t.starts_line_decl))
        })
        .map_with(move |_, e| cx.ident(e.span()))
        .labelled(expected)
}

/// A whole expression.
pub fn expr<'s>(cx: Cx<'s>) -> P<'s, Expr> {
    let mut unary: Recursive<Indirect<'s, 's, In<'s>, Expr, Ex>> = Recursive::declare();
    let mut sum: Recursive<Indirect<'s, 's, In<'s>, Expr, Ex>> = Recursive::declare();

    let number = any()
        .filter(|t: &Tk| matches!(t.kind, Tok::Number(_)))
        // A number that cannot be read is reported and stands as a placeholder, so the
        // declaration it is in is kept and its uses do not turn into further errors.
        .validate(move |t: Tk, e, emitter| {
            let span = e.span();
            number(cx, t, span).unwrap_or_else(|err| {
                emitter.emit(err);
                Expr {
                    kind: ExprKind::Missing,
                    span,
                }
            })
        });

    let call_args = tok(Tok::LParen)
        .ignore_then(
            sum.clone()
                .separated_by(tok(Tok::Comma))
                .collect::<Vec<_>>(),
        )
        .then_ignore(tok(Tok::RParen).labelled(CALL_SEP));
    // Once `(` follows a name it is a call: a broken argument list fails the expression
    // rather than leaving the bracket behind (`.then_ignore(...not())` is the commit).
    // A declaration opening the next line is not an operand: `param a = 2 *` followed by
    // `schedule night {` leaves the expression unfinished at the end of its line.
    let operand_name = any()
        .filter(|t: &Tk| t.kind == Tok::Ident && !t.starts_line_decl)
        .map_with(move |_, e| cx.ident(e.span()))
        .labelled("a name");
    let name_or_call = operand_name
        .then(committed(tok(Tok::LParen), call_args))
        .map_with(|(id, args), e| match args {
            None => Expr {
                span: id.span,
                kind: ExprKind::Name(id),
            },
            Some(args) => Expr {
                kind: ExprKind::Call { func: id, args },
                span: e.span(),
            },
        });

    let bracket = tok(Tok::LParen)
        .ignore_then(sum.clone())
        .then_ignore(tok(Tok::RParen).labelled(BRACKET_CLOSE))
        .map_with(|inner, e| Expr {
            span: e.span(),
            kind: ExprKind::Paren(Box::new(inner)),
        });

    let primary = choice((number, name_or_call, bracket)).labelled(VALUE);

    let power = primary
        .then(tok(Tok::Caret).ignore_then(unary.clone()).or_not())
        .then_ignore(tok(Tok::Caret).not())
        .map(|(base, exponent)| match exponent {
            None => base,
            Some(exponent) => Expr {
                span: base.span.to(exponent.span),
                kind: ExprKind::Power {
                    base: Box::new(base),
                    exponent: Box::new(exponent),
                },
            },
        });

    // Unsigned operands first: they are the common case, and each alternative tried and
    // failed costs an error value.
    let signed = choice((
        power,
        tok(Tok::Minus)
            .ignore_then(unary.clone())
            .map_with(|inner, e| Expr {
                span: e.span(),
                kind: ExprKind::Neg(Box::new(inner)),
            }),
        // A plus sign adds nothing; the value keeps its own span.
        tok(Tok::Plus).ignore_then(unary.clone()),
    ));

    // Every level of nesting (a bracket, a function's arguments, a sign, an exponent) passes
    // through here, so this is where the depth is counted and cut off. The counter lives in
    // the parser state, which chumsky rolls back whenever it backtracks.
    let enter = custom(|inp: &mut InputRef<'s, '_, In<'s>, Ex>| {
        let here = inp.cursor();
        if inp.state().expr >= MAX_EXPR_DEPTH {
            let span = inp.span_since(&here);
            return Err(PErr::expected(span, None, []));
        }
        inp.state().expr += 1;
        Ok(())
    });
    let leave = custom(|inp: &mut InputRef<'s, '_, In<'s>, Ex>| {
        inp.state().expr -= 1;
        Ok(())
    });
    unary.define(choice((
        enter.ignore_then(signed).then_ignore(leave),
        too_deep(cx),
    )));

    let product = chain(unary, |k| match k {
        Tok::Star => Some(BinOp::Mul),
        Tok::Slash => Some(BinOp::Div),
        _ => None,
    });
    sum.define(chain(product, |k| match k {
        Tok::Plus => Some(BinOp::Add),
        Tok::Minus => Some(BinOp::Sub),
        _ => None,
    }));
    sum.boxed()
}

/// Operands joined by the operators of one precedence level, as one flat [`ExprKind::Chain`].
fn chain<'s>(
    operand: impl Parser<'s, In<'s>, Expr, Ex> + Clone + 's,
    op_of: fn(Tok) -> Option<BinOp>,
) -> impl Parser<'s, In<'s>, Expr, Ex> + Clone {
    let op = any().try_map(move |t: Tk, span: Span| {
        op_of(t.kind).ok_or_else(|| {
            <PErr as chumsky::error::LabelError<In<'s>, &'static str>>::expected_found(
                [],
                Some(t.into()),
                span,
            )
        })
    });
    operand
        .clone()
        .then(op.then(operand).repeated().collect::<Vec<_>>())
        // An operator left over means the operand after it was broken: fail here.
        .then_ignore(op.not())
        .map(|(first, rest)| {
            let Some((_, last)) = rest.last() else {
                return first;
            };
            let span = first.span.to(last.span);
            Expr {
                kind: ExprKind::Chain {
                    first: Box::new(first),
                    rest,
                },
                span,
            }
        })
}

/// The part of an expression nested deeper than [`MAX_EXPR_DEPTH`]: reported once (E005)
/// and skipped up to the bracket that closes the level it starts in, so the enclosing
/// levels and the rest of the declaration still parse. It becomes a placeholder that is
/// never evaluated. Fails (taking nothing) when the depth is within the limit.
fn too_deep<'s>(cx: Cx<'s>) -> impl Parser<'s, In<'s>, Expr, Ex> + Clone {
    custom(move |inp: &mut InputRef<'s, '_, In<'s>, Ex>| {
        let here = inp.cursor();
        if inp.state().expr < MAX_EXPR_DEPTH {
            let span = inp.span_since(&here);
            return Err(PErr::expected(span, None, []));
        }
        if inp.peek().is_none() {
            // Nothing left to skip: the ordinary end-of-file error says what is missing.
            return Ok(Expr {
                kind: ExprKind::Missing,
                span: cx.eof,
            });
        }
        let start = inp.save();
        inp.skip();
        let first = inp.span_since(start.cursor());
        inp.rewind(start);
        let mut open = 0usize;
        let mut end = first;
        loop {
            let before = inp.cursor();
            let Some(t) = inp.peek() else { break };
            match t.kind {
                Tok::LParen => open += 1,
                Tok::RParen if open == 0 => break,
                Tok::RParen => open -= 1,
                // Unbalanced brackets must not swallow the declarations that follow.
                _ if t.first_on_line && t.starts_decl => break,
                _ => {}
            }
            inp.skip();
            end = inp.span_since(&before);
        }
        inp.emit(PErr::custom(
            Diagnostic::error(
                "E005",
                format!("expression nested more than {MAX_EXPR_DEPTH} deep"),
                first,
            )
            .with_label(format!(
                "level {} of brackets, calls, signs or powers starts here",
                MAX_EXPR_DEPTH + 1
            ))
            .with_help(
                "split the expression: give an inner part its own `param` and use its name here",
            ),
        ));
        Ok(Expr {
            kind: ExprKind::Missing,
            span: first.to(end),
        })
    })
}

/// A number token: its value, the text of its digits and the unit written after it.
fn number(cx: Cx, t: Tk, span: Span) -> Result<Expr, PErr> {
    let Tok::Number(num_len) = t.kind else {
        unreachable!("filtered to numbers")
    };
    let full = cx.slice(span);
    let num_text = &full[..num_len as usize];
    let value: f64 = num_text.parse().map_err(|_| {
        PErr::custom(
            Diagnostic::error("E004", format!("`{num_text}` is not a number"), span)
                .with_help("write numbers like `12`, `0.5` or `1.2e-3`"),
        )
    })?;
    representable(num_text, value, span)?;
    let unit_text = full[num_len as usize..].trim_start();
    let unit = (!unit_text.is_empty()).then(|| {
        let start = span.end as usize - unit_text.len();
        (
            unit_text.to_string(),
            Span::new(cx.file, start, span.end as usize),
        )
    });
    Ok(Expr {
        kind: ExprKind::Number { value, unit },
        span,
    })
}

/// E004 for a literal that a double cannot hold: one that overflows to infinity, or one with
/// non-zero digits that underflows to zero. Either would silently become a different number.
fn representable(text: &str, value: f64, span: Span) -> Result<(), PErr> {
    let mantissa = text.split(['e', 'E']).next().unwrap_or(text);
    let nonzero = mantissa.chars().any(|c| c.is_ascii_digit() && c != '0');
    let (problem, help) = if value.is_infinite() {
        (
            "too large",
            "numbers above about 1.8e308 cannot be read; check the exponent",
        )
    } else if value == 0.0 && nonzero {
        (
            "too small",
            "numbers below about 5e-324 (other than 0) cannot be read; check the exponent",
        )
    } else {
        return Ok(());
    };
    Err(PErr::custom(
        Diagnostic::error(
            "E004",
            format!("`{text}` is a number {problem} to read"),
            span,
        )
        .with_label(format!("number {problem}"))
        .with_help(help),
    ))
}
