//! The parser's error type: what chumsky gathers at the furthest failure, turned into the
//! project's one [`Diagnostic`] with a stable code.
//!
//! Every site labels what it expects in the analyst's words; when alternatives fail at the
//! same token the labelled one wins over chumsky's raw token lists, so each message names one
//! expectation, as a person would write it.

use super::tokens::Tk;
use super::{Cx, In};
use crate::diagnostic::Diagnostic;
use crate::lexer::Tok;
use crate::span::Span;
use chumsky::error::LabelError;
use chumsky::util::MaybeRef;
use chumsky::DefaultExpected;

/// Expectations with a wording of their own at the end of the file or of a line.
pub const ARG_SEP: &str = "`,` or `)` after an argument";
pub const VALUE: &str = "a value (a number with its unit, a name or a bracket)";
pub const ROW_COLON: &str = "`:` between the time and the value, as in `6 h: -4 °C`";
pub const ROW_END: &str = "the end of the row (one row per line)";
pub const END_OF_EXPRESSION: &str = "the end of the expression";
pub const CALL_SEP: &str = "`,` or `)` in the function's arguments";
pub const BRACKET_CLOSE: &str = "`)` to close the bracket";
pub const PORT_SEP: &str = "`,` or `)` after a port name";

/// Expectations of a closing `)`: when the line or file ends first, the `(` left open is the
/// place to show.
const CLOSERS: &[&str] = &[ARG_SEP, CALL_SEP, BRACKET_CLOSE, PORT_SEP];

#[derive(Clone, Debug)]
pub enum PErr {
    Expected {
        span: Span,
        found: Option<Tk>,
        /// What was expected here; one per error, the one a person would name (see `merge`).
        label: Option<&'static str>,
        /// Set by a labelled site; such an error wins over unlabelled ones at the same token.
        labelled: bool,
        /// The input ended at the end of a line (a table row), not of the file.
        line_end: bool,
    },
    /// A diagnostic worded at its site (unclosed blocks, numbers, nesting limits).
    Custom(Box<Diagnostic>),
}

impl PErr {
    pub fn custom(d: Diagnostic) -> PErr {
        PErr::Custom(Box::new(d))
    }

    /// For a row read on its own: running out of tokens means the line ended.
    pub fn at_line_end(mut self) -> PErr {
        if let PErr::Expected {
            found: None,
            line_end,
            ..
        } = &mut self
        {
            *line_end = true;
        }
        self
    }

    pub(crate) fn expected(
        span: Span,
        found: Option<Tk>,
        labels: impl IntoIterator<Item = &'static str>,
    ) -> PErr {
        PErr::Expected {
            span,
            found,
            label: labels.into_iter().next(),
            labelled: false,
            line_end: false,
        }
    }

    /// In a batch cut before the next declaration (see `tokens::Batches`), running out of
    /// tokens means meeting that declaration's first token: say so, as one whole parse would.
    pub fn found_at_cut(mut self, cx: &Cx) -> PErr {
        if let (
            PErr::Expected {
                span,
                found: found @ None,
                line_end: false,
                ..
            },
            Some((tk, next)),
        ) = (&mut self, cx.next)
        {
            if span.start >= next.start {
                *found = Some(tk);
                *span = next;
            }
        }
        self
    }

    pub fn into_diagnostic(self, cx: &Cx) -> Diagnostic {
        let (span, found, label, line_end) = match self {
            PErr::Custom(d) => return *d,
            PErr::Expected {
                span,
                found,
                label,
                line_end,
                ..
            } => (span, found, label, line_end),
        };
        let labels: Vec<&str> = label.into_iter().collect();
        let expected = match labels.as_slice() {
            [] => "something else".to_string(),
            [one] => one.to_string(),
            [init @ .., last] => format!("{} or {last}", init.join(", ")),
        };
        let runs_off_line = found.is_none_or(|t| t.first_on_line);
        if let ([closer], true) = (labels.as_slice(), runs_off_line) {
            if CLOSERS.contains(closer) {
                if let Some(open) = cx.open_paren_before(span) {
                    let stop = match found {
                        Some(_) => cx.end_before(span),
                        None => span,
                    };
                    let end = if found.is_none() && !line_end {
                        "file"
                    } else {
                        "line"
                    };
                    return Diagnostic::error(
                        "E002",
                        format!("this `(` is not closed before the end of the {end}"),
                        open,
                    )
                    .with_label("`(` opened here")
                    .with_secondary(stop, format!("the {end} ends here; expected {closer}"))
                    .with_help("add `)` after the last argument, on the line where they end");
                }
            }
        }
        let Some(t) = found else {
            if line_end && labels == [ROW_COLON] {
                return Diagnostic::error(
                    "E002",
                    "expected `:` and a value, found the end of the line",
                    span,
                )
                .with_label("expected `:`")
                .with_help("write each row as `TIME: VALUE`, e.g. `6 h: -4 °C`");
            }
            let expected = match labels.as_slice() {
                [ARG_SEP] => "`)` to close the arguments".to_string(),
                [VALUE] => "a value".to_string(),
                _ => expected,
            };
            let end = if line_end { "line" } else { "file" };
            return Diagnostic::error(
                "E002",
                format!("expected {expected}, found the end of the {end}"),
                span,
            )
            .with_label(format!("expected {expected}"));
        };
        match t.kind {
            Tok::Unknown => {
                let ch = cx.slice(span);
                Diagnostic::error("E001", format!("unexpected character `{ch}`"), span)
                    .with_label("not part of the language")
                    .with_help(format!("remove it; {expected} was expected here"))
            }
            Tok::UnterminatedStr => Diagnostic::error("E003", "unterminated string", span)
                .with_label("this string has no closing quote")
                .with_help("add `\"` at the end of the string, on the same line"),
            // A declaration keyword on a later line means the previous declaration was left
            // unfinished: point at where it stops, not at the innocent next line.
            // So does the next entry of a `NAME:` list, or a `}` on a line of its own.
            _ if t.starts_line_decl
                || t.first_on_line
                    && (t.before_colon && t.kind == Tok::Ident || t.kind == Tok::RBrace) =>
            {
                let (what, next) = if t.starts_line_decl {
                    ("declaration", "a new one with")
                } else {
                    ("line", "with")
                };
                Diagnostic::error(
                    "E002",
                    format!("expected {expected}, found the end of the line"),
                    cx.end_before(span),
                )
                .with_label(format!("expected {expected} here"))
                .with_help(format!(
                    "the {what} stops here; the next line starts {next} {}",
                    describe(t.kind, cx.slice(span))
                ))
            }
            _ => Diagnostic::error(
                "E002",
                format!(
                    "expected {expected}, found {}",
                    describe(t.kind, cx.slice(span))
                ),
                span,
            )
            .with_label(format!("expected {expected}")),
        }
    }
}

/// How a message names the token found.
pub fn describe(kind: Tok, text: &str) -> String {
    match kind {
        Tok::Ident => format!("the name `{text}`"),
        Tok::Number(_) => format!("`{text}`"),
        _ => kind.noun().to_string(),
    }
}

impl<'s> chumsky::error::Error<'s, In<'s>> for PErr {
    fn merge(self, other: Self) -> Self {
        match (self, other) {
            (a @ PErr::Custom(_), _) => a,
            (_, b @ PErr::Custom(_)) => b,
            // Of two labelled expectations at one token, the one tried first is the more
            // specific: `(,)` wants a value before it wants a separator.
            (a @ PErr::Expected { labelled: true, .. }, PErr::Expected { .. }) => a,
            // Two raw token expectations: keep one that names something.
            (
                PErr::Expected {
                    label: la,
                    labelled: false,
                    ..
                },
                PErr::Expected {
                    span,
                    found,
                    label: lb,
                    labelled: false,
                    line_end,
                },
            ) => PErr::Expected {
                span,
                found,
                label: lb.or(la),
                labelled: false,
                line_end,
            },
            (_, b) => b,
        }
    }
}

impl<'s> LabelError<'s, In<'s>, &'static str> for PErr {
    fn expected_found<E: IntoIterator<Item = &'static str>>(
        expected: E,
        found: Option<MaybeRef<'s, Tk>>,
        span: Span,
    ) -> Self {
        PErr::expected(span, found.map(|t| *t), expected)
    }

    fn label_with(&mut self, label: &'static str) {
        if let PErr::Expected {
            label: l, labelled, ..
        } = self
        {
            *l = Some(label);
            *labelled = true;
        }
    }
}

impl<'s> LabelError<'s, In<'s>, DefaultExpected<'s, Tk>> for PErr {
    fn expected_found<E: IntoIterator<Item = DefaultExpected<'s, Tk>>>(
        expected: E,
        found: Option<MaybeRef<'s, Tk>>,
        span: Span,
    ) -> Self {
        let labels = expected.into_iter().filter_map(|e| match e {
            DefaultExpected::Token(t) => Some(t.kind.noun()),
            DefaultExpected::EndOfInput => Some("the end of the input"),
            _ => None,
        });
        PErr::expected(span, found.map(|t| *t), labels)
    }
}
