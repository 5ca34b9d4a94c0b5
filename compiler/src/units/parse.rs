//! The unit-expression parser.
//!
//! Grammar (no spaces allowed anywhere):
//!
//! ```text
//! unit    := power (mulop power)* ('/' power)*      -- no `*` after a `/`, see below
//! mulop   := '*' | '·' (U+00B7) | '⋅' (U+22C5)
//! power   := atom ('^' int | '^(' int ')' | superscript-int)?
//! atom    := symbol | '(' unit ')' | '1'
//! int     := ('-' | '−' | '+')? digits
//! superscript-int := '⁻'? ('⁰' | '¹' | '²' | ... | '⁹')+
//! ```
//!
//! `/` is left-associative (`W/m^2/K` = `W/(m²·K)`), but a `*` after a `/` at the same
//! parenthesis level is rejected as ambiguous: analysts who write `W/m*K` mean `W/(m*K)`, which
//! strict left-to-right reading would turn into `W·K/m`.

use super::dimension::Dim;
use super::suggest::{insert_operator_help, missing_operator_help, unknown_symbol};
use super::table::{lookup, TempSym, CELSIUS_ZERO_IN_K, FAHRENHEIT_ZERO_IN_R};
use super::{TempKind, Unit, UnitError};

#[derive(Clone, Debug, PartialEq)]
pub(super) enum Tok {
    Sym(String),
    Num(String),
    /// A run of superscript characters, already read as an integer (or `None` if malformed).
    Sup(Option<i32>),
    Caret,
    Star,
    Slash,
    LParen,
    RParen,
    Minus,
    Plus,
}

#[derive(Clone, Debug)]
pub(super) struct Token {
    pub(super) tok: Tok,
    pub(super) start: usize,
    pub(super) end: usize,
}

pub(super) fn err(
    start: usize,
    end: usize,
    message: impl Into<String>,
    help: Option<String>,
) -> UnitError {
    UnitError {
        start,
        end,
        message: message.into(),
        help,
    }
}

fn is_symbol_start(c: char) -> bool {
    c.is_alphabetic() || matches!(c, '_' | '°' | 'º' | '∆' | '℃' | '℉')
}

fn superscript_digit(c: char) -> Option<u32> {
    Some(match c {
        '⁰' => 0,
        '¹' => 1,
        '²' => 2,
        '³' => 3,
        '⁴' => 4,
        '⁵' => 5,
        '⁶' => 6,
        '⁷' => 7,
        '⁸' => 8,
        '⁹' => 9,
        _ => return None,
    })
}

fn tokenize(text: &str) -> Result<Vec<Token>, UnitError> {
    let mut out = Vec::new();
    let mut it = text.char_indices().peekable();
    while let Some(&(start, c)) = it.peek() {
        let single = |tok| Token {
            tok,
            start,
            end: start + c.len_utf8(),
        };
        if is_symbol_start(c) {
            let mut end = start;
            while let Some(&(i, d)) = it.peek() {
                if is_symbol_start(d) || d.is_ascii_digit() {
                    end = i + d.len_utf8();
                    it.next();
                } else {
                    break;
                }
            }
            out.push(Token {
                tok: Tok::Sym(text[start..end].to_string()),
                start,
                end,
            });
        } else if c.is_ascii_digit() || c == '.' {
            let mut end = start;
            while let Some(&(i, d)) = it.peek() {
                if d.is_ascii_digit() || d == '.' {
                    end = i + 1;
                    it.next();
                } else {
                    break;
                }
            }
            out.push(Token {
                tok: Tok::Num(text[start..end].to_string()),
                start,
                end,
            });
        } else if c == '⁻' || superscript_digit(c).is_some() {
            let mut end = start;
            let mut neg = false;
            let mut digits: Option<i64> = None;
            let mut ok = true;
            while let Some(&(i, d)) = it.peek() {
                if d == '⁻' {
                    ok &= !neg && digits.is_none();
                    neg = true;
                } else if let Some(v) = superscript_digit(d) {
                    digits = Some((digits.unwrap_or(0) * 10 + i64::from(v)).min(1 << 40));
                } else {
                    break;
                }
                end = i + d.len_utf8();
                it.next();
            }
            let value = match (ok, digits) {
                (true, Some(v)) => i32::try_from(if neg { -v } else { v }).ok(),
                _ => None,
            };
            out.push(Token {
                tok: Tok::Sup(value),
                start,
                end,
            });
        } else if c.is_whitespace() {
            let mut end = start;
            while let Some(&(i, d)) = it.peek() {
                if d.is_whitespace() {
                    end = i + d.len_utf8();
                    it.next();
                } else {
                    break;
                }
            }
            return Err(err(
                start,
                end,
                "spaces are not allowed inside a unit",
                Some(space_help(text)),
            ));
        } else {
            let tok = match c {
                '^' => Tok::Caret,
                '*' | '·' | '⋅' => Tok::Star,
                '/' => Tok::Slash,
                '(' => Tok::LParen,
                ')' => Tok::RParen,
                '-' | '−' => Tok::Minus,
                '+' => Tok::Plus,
                _ => {
                    let end = start + c.len_utf8();
                    let help = match c {
                        '%' => Some(
                            "percent is not a unit here; write a plain number (0.5 for 50 %)"
                                .to_string(),
                        ),
                        '×' | 'x' => Some("multiply units with `*` or `·`".to_string()),
                        '[' | '{' => Some("group with `(` and `)`".to_string()),
                        _ => None,
                    };
                    return Err(err(start, end, format!("unexpected `{c}` in a unit"), help));
                }
            };
            it.next();
            out.push(single(tok));
        }
    }
    Ok(out)
}

/// For `m K` suggest `m*K`; for `W /m` suggest `W/m`.
fn space_help(text: &str) -> String {
    let words: Vec<&str> = text.split_whitespace().collect();
    for candidate in [words.join("*"), words.concat()] {
        if parse_unit(&candidate).is_ok() {
            return format!("write the unit without spaces: `{candidate}`");
        }
    }
    "write the unit without spaces, joining units with `*` or `/`".to_string()
}

/// Partial result of parsing a sub-expression.
#[derive(Clone, Copy, Debug)]
struct Val {
    scale: f64,
    dim: Dim,
    /// Set while the expression is exactly one symbol to the first power.
    lone: Option<TempSym>,
}

struct Parser<'a> {
    text: &'a str,
    toks: Vec<Token>,
    pos: usize,
}

impl<'a> Parser<'a> {
    fn peek(&self) -> Option<&Token> {
        self.toks.get(self.pos)
    }

    fn next(&mut self) -> Option<Token> {
        let t = self.toks.get(self.pos).cloned();
        self.pos += 1;
        t
    }

    fn end(&self) -> usize {
        self.text.len()
    }

    /// product/quotient chain
    fn expr(&mut self) -> Result<Val, UnitError> {
        let mut acc = self.power()?;
        let mut slash: Option<Token> = None;
        while let Some(op) = self.peek().cloned() {
            match op.tok {
                Tok::Star => {
                    self.next();
                    let rhs = self.operand(&op)?;
                    if let Some(s) = &slash {
                        let (a, b) = (s.end, self.toks[self.pos - 1].end);
                        let denom = &self.text[a..b];
                        return Err(err(
                            s.start,
                            b,
                            "`*` after `/` is ambiguous in a unit",
                            Some(format!(
                                "write `/({denom})` to divide by all of it, or move the factor \
                                 before the `/`"
                            )),
                        ));
                    }
                    acc = self.combine(acc, rhs, false, &op)?;
                }
                Tok::Slash => {
                    self.next();
                    let rhs = self.operand(&op)?;
                    acc = self.combine(acc, rhs, true, &op)?;
                    slash.get_or_insert(op);
                }
                _ => break,
            }
        }
        Ok(acc)
    }

    fn combine(&self, a: Val, b: Val, divide: bool, op: &Token) -> Result<Val, UnitError> {
        let dim = if divide {
            a.dim.checked_div(b.dim)
        } else {
            a.dim.checked_mul(b.dim)
        };
        let dim = dim.ok_or_else(|| err(op.start, op.end, "unit exponent too large", None))?;
        let scale = if divide {
            a.scale / b.scale
        } else {
            a.scale * b.scale
        };
        Ok(Val {
            scale,
            dim,
            lone: None,
        })
    }

    /// The operand after a binary operator, with a clear error when it is missing.
    fn operand(&mut self, op: &Token) -> Result<Val, UnitError> {
        match self.peek().map(|t| &t.tok) {
            None | Some(Tok::RParen) => {
                let what = if op.tok == Tok::Slash { "`/`" } else { "`*`" };
                Err(err(
                    op.start,
                    op.end,
                    format!("expected a unit after {what}"),
                    Some("remove the operator or add the unit it applies to".to_string()),
                ))
            }
            Some(Tok::Star) if op.tok == Tok::Star => {
                let t = self.toks[self.pos].clone();
                Err(err(
                    op.start,
                    t.end,
                    "`**` is not a power in a unit",
                    Some("write powers with `^`, as in `m^2`, or `m²`".to_string()),
                ))
            }
            _ => self.power(),
        }
    }

    fn power(&mut self) -> Result<Val, UnitError> {
        let base = self.atom()?;
        let (n, start, end) = match self.peek().cloned() {
            Some(Token {
                tok: Tok::Caret,
                start,
                end,
            }) => {
                self.next();
                let (n, e) = self.caret_exponent(start, end)?;
                (n, start, e)
            }
            Some(Token {
                tok: Tok::Sup(v),
                start,
                end,
            }) => {
                self.next();
                let n = v.ok_or_else(|| {
                    err(
                        start,
                        end,
                        "malformed superscript exponent",
                        Some("write e.g. `m²`, `m⁻¹`, or `m^-1`".to_string()),
                    )
                })?;
                (n, start, end)
            }
            _ => return Ok(base),
        };
        let dim = base.dim.powi(n).ok_or_else(|| {
            err(
                start,
                end,
                format!("exponent {n} is too large for a unit"),
                None,
            )
        })?;
        let lone = if n == 1 { base.lone } else { None };
        Ok(Val {
            scale: base.scale.powi(n),
            dim,
            lone,
        })
    }

    /// The integer after `^` (optionally in parentheses); returns it and its end offset.
    fn caret_exponent(&mut self, cs: usize, ce: usize) -> Result<(i32, usize), UnitError> {
        let paren = matches!(self.peek().map(|t| &t.tok), Some(Tok::LParen));
        if paren {
            self.next();
        }
        let mut neg = false;
        let sign_start = self.peek().map(|t| t.start);
        match self.peek().map(|t| &t.tok) {
            Some(Tok::Minus) => {
                neg = true;
                self.next();
            }
            Some(Tok::Plus) => {
                self.next();
            }
            _ => {}
        }
        let Some(t) = self.next() else {
            return Err(err(cs, ce, "expected an integer exponent after `^`", None));
        };
        let n = match &t.tok {
            Tok::Num(s) if s.contains('.') => {
                return Err(err(
                    sign_start.unwrap_or(t.start),
                    t.end,
                    "a unit exponent must be an integer",
                    Some("units take whole powers such as `^2` or `^-1`".to_string()),
                ))
            }
            Tok::Num(s) => s.parse::<i32>().map_err(|_| {
                err(
                    t.start,
                    t.end,
                    format!("exponent `{s}` is too large for a unit"),
                    None,
                )
            })?,
            _ => {
                return Err(err(
                    t.start,
                    t.end,
                    format!(
                        "expected an integer exponent after `^`, found `{}`",
                        self.slice(&t)
                    ),
                    None,
                ))
            }
        };
        let mut end = t.end;
        if paren {
            match self.next() {
                Some(Token {
                    tok: Tok::RParen,
                    end: e,
                    ..
                }) => end = e,
                _ => return Err(err(cs, end, "expected `)` after the exponent", None)),
            }
        }
        Ok((if neg { -n } else { n }, end))
    }

    fn slice(&self, t: &Token) -> &'a str {
        &self.text[t.start..t.end]
    }

    fn atom(&mut self) -> Result<Val, UnitError> {
        let Some(t) = self.next() else {
            return Err(err(self.end(), self.end(), "expected a unit", None));
        };
        match &t.tok {
            Tok::Sym(s) => match lookup(s) {
                Some(r) => Ok(Val {
                    scale: r.scale,
                    dim: r.symbol.dim,
                    lone: Some(r.symbol.temp),
                }),
                None => Err(unknown_symbol(self.text, &self.toks, self.pos - 1)),
            },
            Tok::LParen => {
                if matches!(self.peek().map(|t| &t.tok), Some(Tok::RParen)) {
                    return Err(err(t.start, t.end + 1, "empty parentheses in a unit", None));
                }
                let inner = self.expr()?;
                match self.next() {
                    Some(Token {
                        tok: Tok::RParen, ..
                    }) => Ok(inner),
                    Some(other) => Err(err(
                        other.start,
                        other.end,
                        format!(
                            "expected `)` or an operator, found `{}`",
                            self.slice(&other)
                        ),
                        Some(missing_operator_help(&self.toks, self.pos - 1)),
                    )),
                    None => Err(err(
                        t.start,
                        t.end,
                        "unclosed `(` in a unit",
                        Some("add the matching `)`".to_string()),
                    )),
                }
            }
            Tok::Num(s) if s == "1" => Ok(Val {
                scale: 1.0,
                dim: Dim::NONE,
                lone: None,
            }),
            Tok::Num(_) => Err(err(
                t.start,
                t.end,
                "a number cannot stand inside a unit",
                Some("only `1` may, as in `1/s`; write the number before the unit".to_string()),
            )),
            Tok::RParen => Err(err(t.start, t.end, "unmatched `)` in a unit", None)),
            Tok::Minus => Err(err(
                t.start,
                t.end,
                "unexpected `-` in a unit",
                Some("a negative power is written `^-1` or `⁻¹` after the unit".to_string()),
            )),
            _ => Err(err(
                t.start,
                t.end,
                format!("expected a unit, found `{}`", self.slice(&t)),
                None,
            )),
        }
    }
}

/// Parse a unit written compactly, e.g. `W/(m*K)`, `m^2`, `m²`, `h*ft^2*°F/Btu`, `°C`,
/// `delta_degF`, `kWh`, `µm`. Spellings are listed in `docs/units.md`.
/// Deepest bracket nesting a unit may have.
const MAX_UNIT_DEPTH: usize = 16;

pub fn parse_unit(text: &str) -> Result<Unit, UnitError> {
    if text.is_empty() {
        return Err(err(0, 0, "empty unit", None));
    }
    let toks = tokenize(text)?;
    // The unit parser recurses per bracket; no real unit nests more than two or three deep.
    let mut depth = 0usize;
    for t in &toks {
        match t.tok {
            Tok::LParen => depth += 1,
            Tok::RParen => depth = depth.saturating_sub(1),
            _ => {}
        }
        if depth > MAX_UNIT_DEPTH {
            return Err(err(
                t.start,
                t.end,
                format!("brackets in a unit nested more than {MAX_UNIT_DEPTH} deep"),
                Some("write the unit with fewer brackets, e.g. `W/(m^2*K)`".to_string()),
            ));
        }
    }
    let mut p = Parser { text, toks, pos: 0 };
    let v = p.expr()?;
    if let Some(t) = p.peek().cloned() {
        let (message, help) = match t.tok {
            Tok::RParen => ("unmatched `)` in a unit".to_string(), None),
            _ => (
                format!("expected `*` or `/` before `{}`", p.slice(&t)),
                Some(
                    insert_operator_help(text, &p.toks, p.pos)
                        .unwrap_or_else(|| missing_operator_help(&p.toks, p.pos)),
                ),
            ),
        };
        return Err(err(t.start, t.end, message, help));
    }
    let (kind, offset) = match v.lone {
        Some(TempSym::Celsius) => (TempKind::Point, CELSIUS_ZERO_IN_K),
        Some(TempSym::Fahrenheit) => (TempKind::Point, FAHRENHEIT_ZERO_IN_R),
        Some(TempSym::Absolute) => (TempKind::Absolute, 0.0),
        Some(TempSym::Delta) => (TempKind::Difference, 0.0),
        _ if v.dim == Dim::TEMPERATURE => (TempKind::Difference, 0.0),
        _ => (TempKind::NotTemperature, 0.0),
    };
    Ok(Unit {
        scale: v.scale,
        offset,
        dim: v.dim,
        kind,
        text: text.to_string(),
    })
}

#[cfg(test)]
#[path = "parse_tests.rs"]
mod tests;
