//! What may be typed at a position: the completion context, found from the tokens of the
//! declaration around the cursor (the declaration being typed is usually incomplete, so the
//! syntax tree does not hold it yet).

use crate::analysis::Analysis;
use crate::elements::{self, shell};
use crate::lexer::{lex, Tok, Token};
use crate::schema;
use crate::span::{FileId, Span};
use crate::units::Dim;

/// Whose argument list the cursor is in.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum ArgOwner {
    /// An element call or a build-up use: `layer(...)`, `timber_wall(...)`. Inside a
    /// build-up, `supplied` are the arguments the link that uses it gives the element (its
    /// area; for a radial build-up also the radius it starts at and the length).
    Element {
        kind: String,
        in_buildup: bool,
        supplied: &'static [&'static str],
    },
    /// A declaration introduced by `word` (`node`, `material`, `transient`, `case`, ...), whose
    /// arguments the schema lists (`case`: the model's parameters).
    Declaration { word: &'static str },
}
/// The argument list the cursor is in: its owner, the index of the argument under the cursor
/// and its name when written `name = ...`.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct CallInfo {
    pub owner: ArgOwner,
    pub index: usize,
    pub arg: Option<String>,
    /// The names of the arguments written so far.
    pub given: Vec<String>,
}

/// What kind of word is expected at the cursor.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum Slot {
    /// The start of a declaration: keywords.
    Keyword,
    /// The name of a node (the ends of a link).
    Node,
    /// A link's kind: element kinds and build-ups.
    LinkKind,
    /// An element kind inside a build-up.
    ElementKind,
    /// An argument name; for the first argument also a value of the main argument.
    ArgName,
    /// The value of an argument (named, or the unnamed first one).
    ArgValue,
    /// A unit right after a number.
    Unit,
    /// The measure of a limit.
    Measure,
    /// The subject of a limit, for the given measure.
    LimitSubject { measure: String },
    /// An expression: parameters, functions and `pi`.
    Expression,
    /// Nothing to offer: a name being declared, inside a comment or string, mid-number.
    Nothing,
}

/// The completion context at a position.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct CompletionContext {
    pub slot: Slot,
    /// The partial word before the cursor that a completion replaces (empty at a fresh place).
    pub replace: Span,
    /// The argument list around the cursor, for argument names and signature help.
    pub call: Option<CallInfo>,
}

fn is_word(k: Tok) -> bool {
    k == Tok::Ident || k.starts_item() || k == Tok::To
}

/// The dimension the argument under the cursor expects, when it is a quantity.
pub fn expected_dim(call: &CallInfo, a: &Analysis) -> Option<Dim> {
    let name = call.arg.as_deref();
    let specs = match &call.owner {
        ArgOwner::Declaration { word: "case" } => {
            // A case gives a parameter a value of the parameter's own dimension.
            let p = a.params.iter().find(|p| Some(p.0.as_str()) == name)?;
            return p.1.map(|q| q.dim);
        }
        ArgOwner::Declaration { word } => schema::declaration(word)?.arg_specs(),
        ArgOwner::Element { kind, .. } => match elements::lookup(kind) {
            Some(k) => k.params(),
            None => super::buildup_use_args(a, kind)?,
        },
    };
    let spec = match name {
        Some(n) => specs.iter().find(|p| p.name == n)?,
        None if call.index == 0 && matches!(call.owner, ArgOwner::Element { .. }) => {
            specs.first()?
        }
        None => return None,
    };
    spec.ty.dim()
}

/// Whether token `i` of `toks` begins a declaration: a keyword, or a contextual word first on
/// its line and followed by a name.
fn starts_decl(text: &str, toks: &[Token], i: usize) -> bool {
    let t = toks[i];
    if t.kind.starts_item() {
        return true;
    }
    let word = &text[t.span.range()];
    let line_start = text[..t.span.start as usize]
        .rfind('\n')
        .map_or(0, |p| p + 1);
    t.kind == Tok::Ident
        && schema::contextual_words().any(|w| w == word)
        && text[line_start..t.span.start as usize].trim().is_empty()
        && toks.get(i + 1).is_some_and(|n| n.kind == Tok::Ident)
}

/// The completion context at byte `offset` of `text`.
pub fn completion_context(text: &str, offset: u32) -> CompletionContext {
    let file = FileId(0);
    let offset = offset.min(text.len() as u32);
    let all = lex(text, file);
    let here = Span::new(file, offset as usize, offset as usize);
    let nothing = |replace| CompletionContext {
        slot: Slot::Nothing,
        replace,
        call: None,
    };
    let mut replace = here;
    let mut unit_slot: Option<u32> = None;
    for t in &all {
        let inside = t.span.start < offset && offset <= t.span.end;
        match t.kind {
            Tok::Comment if t.span.start < offset && offset <= t.span.end => return nothing(here),
            Tok::Str if inside && offset < t.span.end => return nothing(here),
            Tok::UnterminatedStr if inside => return nothing(here),
            k if is_word(k) && inside => {
                replace = Span {
                    start: t.span.start,
                    ..here
                }
            }
            Tok::Number(num_len) if inside => match number_unit_start(text, t, num_len) {
                Some(u) if offset >= u => {
                    unit_slot = Some(t.span.start);
                    replace = Span {
                        start: last_atom_start(text, u, offset),
                        ..here
                    };
                }
                // Mid-number: nothing to complete, but signature help still wants the call.
                _ => {
                    let call = completion_context(text, t.span.start).call;
                    return CompletionContext {
                        slot: Slot::Nothing,
                        replace: here,
                        call,
                    };
                }
            },
            Tok::Number(num_len) if t.span.end <= offset => {
                let between = &text[t.span.end as usize..offset as usize];
                let has_unit = number_unit_start(text, t, num_len).is_some();
                let spaces = between.chars().all(|c| c == ' ' || c == '\t');
                let operators = between
                    .chars()
                    .all(|c| matches!(c, '*' | '/' | '^' | '(' | '·' | '⋅'));
                if !between.is_empty() && ((!has_unit && spaces) || (has_unit && operators)) {
                    // A number followed by a space: its unit comes next. Or `W/(m*`: the
                    // lexer leaves a trailing operator out of the unit, which goes on.
                    unit_slot = Some(t.span.start);
                }
            }
            _ => {}
        }
    }
    let before: Vec<Token> = all
        .iter()
        .copied()
        .filter(|t| t.kind != Tok::Comment && t.span.end <= replace.start)
        .collect();
    if let Some(number_start) = unit_slot {
        // Where the number stands says which argument the unit is for.
        let around = completion_context(text, number_start);
        return CompletionContext {
            slot: Slot::Unit,
            replace,
            call: around.call,
        };
    }
    let line_start = text[..replace.start as usize]
        .rfind('\n')
        .map(|i| i + 1)
        .unwrap_or(0);
    let fresh_line = text[line_start..replace.start as usize].trim().is_empty();
    let Some(k) = (0..before.len())
        .rev()
        .find(|&i| starts_decl(text, &before, i))
    else {
        let slot = if fresh_line {
            Slot::Keyword
        } else {
            Slot::Nothing
        };
        return CompletionContext {
            slot,
            replace,
            call: None,
        };
    };
    let decl = &before[k..];
    let words = |t: &Token| &text[t.span.range()];
    let rest = &decl[1..];
    let open = rest.iter().fold(0i32, |d, t| match t.kind {
        Tok::LParen | Tok::LBrace => d + 1,
        Tok::RParen | Tok::RBrace => d - 1,
        _ => d,
    });
    let ctx = |slot, call| CompletionContext {
        slot,
        replace,
        call,
    };
    // A new line outside any bracket starts a new declaration.
    if fresh_line && open <= 0 {
        return ctx(Slot::Keyword, None);
    }
    match decl[0].kind {
        Tok::Param => ctx(
            if rest.iter().any(|t| t.kind == Tok::Eq) {
                Slot::Expression
            } else {
                Slot::Nothing
            },
            None,
        ),
        Tok::Material | Tok::Node => {
            let word = if decl[0].kind == Tok::Material {
                "material"
            } else {
                "node"
            };
            match rest.iter().position(|t| t.kind == Tok::LParen) {
                Some(p) => args(
                    &rest[p + 1..],
                    ArgOwner::Declaration { word },
                    text,
                    replace,
                ),
                None => nothing(replace),
            }
        }
        Tok::Ident => contextual(words(&decl[0]), rest, fresh_line, text, replace),
        Tok::Link => match rest.len() {
            2 | 4 => ctx(Slot::Node, None),
            5 => ctx(Slot::LinkKind, None),
            n if n >= 7 && rest[6].kind == Tok::LParen => {
                let owner = ArgOwner::Element {
                    kind: words(&rest[5]).to_string(),
                    in_buildup: false,
                    supplied: &[],
                };
                args(&rest[7..], owner, text, replace)
            }
            _ => nothing(replace),
        },
        Tok::Buildup => buildup(rest, text, replace),
        Tok::Limit => match rest.len() {
            2 => ctx(Slot::Measure, None),
            4 => ctx(
                Slot::LimitSubject {
                    measure: words(&rest[2]).to_string(),
                },
                None,
            ),
            n if n >= 7 => ctx(Slot::Expression, None),
            _ => nothing(replace),
        },
        _ => nothing(replace),
    }
}

/// Where the unit text of a number token starts, if it has one.
fn number_unit_start(text: &str, t: &Token, num_len: u32) -> Option<u32> {
    let after = &text[(t.span.start + num_len) as usize..t.span.end as usize];
    let unit = after.trim_start();
    (!unit.is_empty()).then(|| t.span.end - unit.len() as u32)
}

/// The start of the unit atom being typed (`K` in `W/(m*K`).
fn last_atom_start(text: &str, unit_start: u32, offset: u32) -> u32 {
    let typed = &text[unit_start as usize..offset as usize];
    match typed.rfind(['*', '/', '^', '(', '·', '⋅']) {
        Some(i) => {
            unit_start + i as u32 + typed[i..].chars().next().map_or(1, |c| c.len_utf8()) as u32
        }
        None => unit_start,
    }
}

/// The context inside an argument list; `toks` are the tokens after its `(` up to the cursor.
fn args(toks: &[Token], owner: ArgOwner, text: &str, replace: Span) -> CompletionContext {
    let mut depth = 0i32;
    let mut index = 0;
    let mut current_start = 0;
    let mut given = Vec::new();
    for (i, t) in toks.iter().enumerate() {
        match t.kind {
            Tok::LParen => depth += 1,
            Tok::RParen if depth == 0 => {
                return CompletionContext {
                    slot: Slot::Nothing,
                    replace,
                    call: None,
                }
            }
            Tok::RParen => depth -= 1,
            Tok::Comma if depth == 0 => {
                index += 1;
                current_start = i + 1;
            }
            Tok::Eq if depth == 0 && i > 0 && toks[i - 1].kind == Tok::Ident => {
                given.push(text[toks[i - 1].span.range()].to_string())
            }
            _ => {}
        }
    }
    let current = &toks[current_start..];
    let arg = match current {
        [name, eq, ..] if name.kind == Tok::Ident && eq.kind == Tok::Eq => {
            Some(text[name.span.range()].to_string())
        }
        _ => None,
    };
    let slot = if depth > 0 {
        Slot::Expression
    } else if current.is_empty() {
        Slot::ArgName
    } else {
        Slot::ArgValue
    };
    if slot == Slot::ArgValue && arg.is_some() && current.len() > 2 {
        // A value is already written after `name =`; nothing more to offer until `,`.
        let call = CallInfo {
            owner,
            index,
            arg,
            given,
        };
        return CompletionContext {
            slot: Slot::Nothing,
            replace,
            call: Some(call),
        };
    }
    if let Some(a) = &arg {
        given.retain(|g| g != a);
    }
    CompletionContext {
        slot,
        replace,
        call: Some(CallInfo {
            owner,
            index,
            arg,
            given,
        }),
    }
}

/// The context inside a build-up declaration (`rest` follows the keyword).
fn buildup(rest: &[Token], text: &str, replace: Span) -> CompletionContext {
    let nothing = CompletionContext {
        slot: Slot::Nothing,
        replace,
        call: None,
    };
    let Some(brace) = rest.iter().position(|t| t.kind == Tok::LBrace) else {
        return nothing;
    };
    // Walk `name : kind ( args )` elements; `state` counts the parts of the current element.
    let body = &rest[brace + 1..];
    let mut state = 0;
    let mut i = 0;
    // The element kinds so far decide the build-up's geometry, so what its use supplies.
    let mut kinds: Vec<&str> = Vec::new();
    while i < body.len() {
        let t = body[i];
        match (state, t.kind) {
            (_, Tok::RBrace) => return nothing,
            (2, Tok::Ident) => {
                kinds.push(&text[t.span.range()]);
                state += 1
            }
            (0, Tok::Ident) | (1, Tok::Colon) => state += 1,
            (3, Tok::LParen) => {
                // Find the matching `)`; if it is not there, the cursor is inside.
                let mut depth = 0;
                let mut close = None;
                for (j, u) in body.iter().enumerate().skip(i + 1) {
                    match u.kind {
                        Tok::LParen => depth += 1,
                        Tok::RParen if depth == 0 => {
                            close = Some(j);
                            break;
                        }
                        Tok::RParen => depth -= 1,
                        _ => {}
                    }
                }
                match close {
                    Some(j) => {
                        i = j;
                        state = 0;
                    }
                    None => {
                        let kind = text[body[i - 1].span.range()].to_string();
                        let geom = shell::geometry(kinds.iter().copied());
                        return args(
                            &body[i + 1..],
                            ArgOwner::Element {
                                kind,
                                in_buildup: true,
                                supplied: crate::radial::supplied_names(geom),
                            },
                            text,
                            replace,
                        );
                    }
                }
            }
            _ => state = 0,
        }
        i += 1;
    }
    match state {
        2 => CompletionContext {
            slot: Slot::ElementKind,
            replace,
            call: None,
        },
        _ => nothing,
    }
}

/// The context inside a declaration introduced by a contextual word (`rest` follows the word).
fn contextual(
    word: &str,
    rest: &[Token],
    fresh_line: bool,
    text: &str,
    replace: Span,
) -> CompletionContext {
    let slot = |slot| CompletionContext {
        slot,
        replace,
        call: None,
    };
    let Some(decl) = schema::declaration(word) else {
        return slot(Slot::Nothing);
    };
    // Inside the braces of a repetition or a sub-network, declarations follow.
    if rest.iter().any(|t| t.kind == Tok::LBrace) {
        let body = matches!(decl.word, "repeat" | "network");
        return slot(if body && fresh_line {
            Slot::Keyword
        } else {
            Slot::Nothing
        });
    }
    let takes_args = matches!(
        decl.args,
        schema::DeclArgs::Fixed(_) | schema::DeclArgs::Parameters
    );
    match rest.iter().position(|t| t.kind == Tok::LParen) {
        Some(p) if takes_args => args(
            &rest[p + 1..],
            ArgOwner::Declaration { word: decl.word },
            text,
            replace,
        ),
        _ => slot(Slot::Nothing),
    }
}
