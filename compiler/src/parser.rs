//! Hand-written recursive-descent parser with error recovery.
//!
//! Written by hand rather than with a combinator library so each message can say what was
//! expected in the analyst's words, and so recovery is simple: a broken declaration is skipped
//! up to the next declaration keyword and parsing goes on, giving several errors per file.

use crate::diagnostic::Diagnostic;
use crate::lexer::{lex, Tok, Token};
use crate::span::{FileId, Span};
use crate::syntax::*;

/// Parse one file. Always returns a module (possibly partial) and every syntax error found.
pub fn parse(text: &str, file: FileId) -> (Module, Vec<Diagnostic>) {
    let all = lex(text, file);
    let mut comments = Vec::new();
    let mut tokens = Vec::new();
    for t in all {
        if t.kind == Tok::Comment {
            comments.push(t.span);
        } else {
            tokens.push(t);
        }
    }
    let mut p = Parser {
        text,
        file,
        tokens,
        pos: 0,
        diags: Vec::new(),
    };
    let mut items = Vec::new();
    while !p.at_end() {
        let start = p.pos;
        match p.item() {
            Ok(item) => items.push(item),
            Err(d) => {
                p.diags.push(d);
                p.recover_to_item(start);
            }
        }
    }
    (Module { items, comments }, p.diags)
}

/// Parse a lone expression (used for test expectations and the language server).
pub fn parse_expr(text: &str, file: FileId) -> Result<Expr, Diagnostic> {
    let tokens = lex(text, file)
        .into_iter()
        .filter(|t| t.kind != Tok::Comment)
        .collect();
    let mut p = Parser {
        text,
        file,
        tokens,
        pos: 0,
        diags: Vec::new(),
    };
    let e = p.expr()?;
    if let Some(t) = p.peek_token() {
        return Err(p.unexpected(t, "the end of the expression"));
    }
    Ok(e)
}

struct Parser<'a> {
    text: &'a str,
    file: FileId,
    tokens: Vec<Token>,
    pos: usize,
    diags: Vec<Diagnostic>,
}

type PResult<T> = Result<T, Diagnostic>;

impl<'a> Parser<'a> {
    fn at_end(&self) -> bool {
        self.pos >= self.tokens.len()
    }
    fn peek(&self) -> Option<Tok> {
        self.tokens.get(self.pos).map(|t| t.kind)
    }
    fn peek_token(&self) -> Option<Token> {
        self.tokens.get(self.pos).copied()
    }
    fn slice(&self, span: Span) -> &'a str {
        &self.text[span.range()]
    }
    fn eof_span(&self) -> Span {
        let end = self.text.trim_end().len();
        Span::new(self.file, end, end)
    }
    fn prev_end(&self) -> Span {
        match self.pos.checked_sub(1).and_then(|i| self.tokens.get(i)) {
            Some(t) => Span {
                start: t.span.end,
                ..t.span
            },
            None => Span::new(self.file, 0, 0),
        }
    }
    fn bump(&mut self) -> Token {
        let t = self.tokens[self.pos];
        self.pos += 1;
        t
    }
    fn eat(&mut self, kind: Tok) -> Option<Token> {
        if self.peek() == Some(kind) {
            Some(self.bump())
        } else {
            None
        }
    }

    fn unexpected(&self, t: Token, expected: &str) -> Diagnostic {
        match t.kind {
            Tok::Unknown => {
                let ch = self.slice(t.span);
                Diagnostic::error("E001", format!("unexpected character `{ch}`"), t.span)
                    .with_label("not part of the language")
                    .with_help(format!("remove it; {expected} was expected here"))
            }
            Tok::UnterminatedStr => Diagnostic::error("E003", "unterminated string", t.span)
                .with_label("this string has no closing quote")
                .with_help("add `\"` at the end of the string, on the same line"),
            _ => Diagnostic::error(
                "E002",
                format!(
                    "expected {expected}, found {}",
                    describe(t.kind, self.slice(t.span))
                ),
                t.span,
            )
            .with_label(format!("expected {expected}")),
        }
    }

    fn expect(&mut self, kind: Tok, expected: &str) -> PResult<Token> {
        match self.peek_token() {
            Some(t) if t.kind == kind => Ok(self.bump()),
            Some(t) => Err(self.unexpected(t, expected)),
            None => Err(Diagnostic::error(
                "E002",
                format!("expected {expected}, found the end of the file"),
                self.eof_span(),
            )
            .with_label(format!("expected {expected}"))),
        }
    }

    fn ident(&mut self, expected: &str) -> PResult<Ident> {
        let t = self.expect(Tok::Ident, expected)?;
        Ok(Ident {
            name: self.slice(t.span).to_string(),
            span: t.span,
        })
    }

    /// Skip to the next declaration keyword after a broken declaration.
    fn recover_to_item(&mut self, start: usize) {
        if self.pos == start {
            self.pos += 1;
        }
        while let Some(k) = self.peek() {
            if k.starts_item() || self.at_contextual_item() {
                break;
            }
            self.pos += 1;
        }
    }

    fn item(&mut self) -> PResult<Item> {
        let Some(t) = self.peek_token() else {
            unreachable_eof()
        };
        let kind = match t.kind {
            Tok::Title => {
                self.bump();
                let s = self.string("the model's title in quotes, e.g. `title \"Garden office wall\"`")?;
                ItemKind::Title { text: s.0 }
            }
            Tok::Import => {
                self.bump();
                let (path, path_span) = self.string("the path of a model file in quotes")?;
                ItemKind::Import { path, path_span }
            }
            Tok::Param => {
                self.bump();
                let name = self.ident("the parameter's name")?;
                self.expect(Tok::Eq, "`=` and the parameter's value")?;
                let value = self.expr()?;
                ItemKind::Param { name, value }
            }
            Tok::Material => {
                self.bump();
                let name = self.ident("the material's name")?;
                let args = self.arg_list("the material's properties in parentheses, e.g. `(k = 0.04 W/(m*K))`")?;
                ItemKind::Material { name, args }
            }
            Tok::Node => {
                self.bump();
                let name = self.ident("the node's name")?;
                let args = if self.peek() == Some(Tok::LParen) { self.arg_list("`(`")? } else { Vec::new() };
                ItemKind::Node { name, args }
            }
            Tok::Link => {
                self.bump();
                let name = self.ident("the link's name")?;
                self.expect(Tok::Colon, "`:` after the link's name, as in `link name: a to b layer(...)`")?;
                let from = self.ident("the node the link starts from")?;
                self.expect(Tok::To, "`to` between the link's two nodes")?;
                let to = self.ident("the node the link goes to")?;
                let element = self.element_call("the link's kind, e.g. `layer(...)`, `film(...)`")?;
                ItemKind::Link { name, from, to, element }
            }
            Tok::Buildup => {
                self.bump();
                let name = self.ident("the build-up's name")?;
                self.expect(Tok::LBrace, "`{` to open the build-up's list of layers")?;
                let elements = self.buildup_elements()?;
                ItemKind::Buildup { name, elements }
            }
            Tok::Limit => {
                self.bump();
                let name = self.ident("the limit's name")?;
                self.expect(Tok::Colon, "`:` after the limit's name, as in `limit name: temperature(x) < 60 °C`")?;
                let measure = self.ident("a measure such as `temperature`, `heat_flow` or `u_value`")?;
                self.expect(Tok::LParen, "`(` and the node or link the limit is about")?;
                let subject = self.ident("the node or link the limit is about")?;
                self.expect(Tok::RParen, "`)`")?;
                let op = match self.peek_token() {
                    Some(t) => match t.kind {
                        Tok::Lt => CmpOp::Lt,
                        Tok::Le => CmpOp::Le,
                        Tok::Gt => CmpOp::Gt,
                        Tok::Ge => CmpOp::Ge,
                        _ => return Err(self.unexpected(t, "a comparison `<`, `<=`, `>` or `>=`")),
                    },
                    None => return Err(self.expect(Tok::Lt, "a comparison").unwrap_err()),
                };
                self.bump();
                let value = self.expr()?;
                ItemKind::Limit { name, measure, subject, op, value }
            }
            Tok::Ident if self.at_contextual_item() => self.contextual_item()?,
            _ => {
                return Err(self.unexpected(
                    t,
                    "a declaration (`param`, `material`, `node`, `link`, `buildup`, `limit`, `repeat`, `network`, `use`, `title` or `import`)",
                ))
            }
        };
        Ok(Item {
            kind,
            span: t.span.to(self.prev_end()),
        })
    }

    fn string(&mut self, expected: &str) -> PResult<(String, Span)> {
        let t = self.expect(Tok::Str, expected)?;
        let raw = self.slice(t.span);
        let inner = &raw[1..raw.len() - 1];
        Ok((inner.replace("\\\"", "\"").replace("\\\\", "\\"), t.span))
    }

    fn buildup_elements(&mut self) -> PResult<Vec<BuildupElement>> {
        let mut out = Vec::new();
        loop {
            match self.peek_token() {
                Some(t) if t.kind == Tok::RBrace => {
                    self.bump();
                    return Ok(out);
                }
                Some(t) if t.kind.starts_item() => {
                    return Err(
                        Diagnostic::error("E002", "this build-up is not closed", t.span)
                            .with_label("a new declaration starts before `}`")
                            .with_help("add `}` after the build-up's last element"),
                    )
                }
                None => {
                    return Err(Diagnostic::error(
                        "E002",
                        "this build-up is not closed",
                        self.eof_span(),
                    )
                    .with_label("the file ends before `}`")
                    .with_help("add `}` after the build-up's last element"))
                }
                Some(_) => {
                    let start = self.pos;
                    match self.buildup_element() {
                        Ok(e) => out.push(e),
                        Err(d) => {
                            // Resume at the next element line, `}` or declaration.
                            self.diags.push(d);
                            if self.pos == start {
                                self.pos += 1;
                            }
                            while let Some(t) = self.peek_token() {
                                let next_is_colon = self.tokens.get(self.pos + 1).map(|n| n.kind)
                                    == Some(Tok::Colon);
                                if t.kind == Tok::RBrace
                                    || t.kind.starts_item()
                                    || (t.kind == Tok::Ident && next_is_colon)
                                {
                                    break;
                                }
                                self.pos += 1;
                            }
                        }
                    }
                }
            }
        }
    }

    fn buildup_element(&mut self) -> PResult<BuildupElement> {
        let name = self
            .ident("an element name, as in `insulation: layer(wood_fibre, thickness = 140 mm)`")?;
        self.expect(Tok::Colon, "`:` after the element's name")?;
        let element = self.element_call("the element's kind, e.g. `layer(...)` or `film(...)`")?;
        let span = name.span.to(element.span);
        Ok(BuildupElement {
            name,
            element,
            span,
        })
    }

    fn element_call(&mut self, expected: &str) -> PResult<ElementCall> {
        let kind = self.ident(expected)?;
        let args = self.arg_list("`(` and the element's arguments")?;
        let span = kind.span.to(self.prev_end());
        Ok(ElementCall { kind, args, span })
    }

    fn arg_list(&mut self, expected: &str) -> PResult<Vec<Arg>> {
        self.expect(Tok::LParen, expected)?;
        let mut args = Vec::new();
        if self.eat(Tok::RParen).is_some() {
            return Ok(args);
        }
        loop {
            let named = self.peek() == Some(Tok::Ident)
                && self.tokens.get(self.pos + 1).map(|t| t.kind) == Some(Tok::Eq);
            let name = if named {
                let n = self.ident("an argument name")?;
                self.bump();
                Some(n)
            } else {
                None
            };
            let value = self.expr()?;
            let span = name
                .as_ref()
                .map(|n| n.span)
                .unwrap_or(value.span)
                .to(value.span);
            args.push(Arg { name, value, span });
            match self.peek_token() {
                Some(t) if t.kind == Tok::Comma => {
                    self.bump();
                    if self.eat(Tok::RParen).is_some() {
                        return Ok(args);
                    }
                }
                Some(t) if t.kind == Tok::RParen => {
                    self.bump();
                    return Ok(args);
                }
                Some(t) => return Err(self.unexpected(t, "`,` or `)` after an argument")),
                None => {
                    return Err(self
                        .expect(Tok::RParen, "`)` to close the arguments")
                        .unwrap_err())
                }
            }
        }
    }

    pub fn expr(&mut self) -> PResult<Expr> {
        let mut lhs = self.term()?;
        loop {
            let op = match self.peek() {
                Some(Tok::Plus) => BinOp::Add,
                Some(Tok::Minus) => BinOp::Sub,
                _ => return Ok(lhs),
            };
            self.bump();
            let rhs = self.term()?;
            lhs = binary(op, lhs, rhs);
        }
    }

    fn term(&mut self) -> PResult<Expr> {
        let mut lhs = self.unary()?;
        loop {
            let op = match self.peek() {
                Some(Tok::Star) => BinOp::Mul,
                Some(Tok::Slash) => BinOp::Div,
                _ => return Ok(lhs),
            };
            self.bump();
            let rhs = self.unary()?;
            lhs = binary(op, lhs, rhs);
        }
    }

    fn unary(&mut self) -> PResult<Expr> {
        if let Some(t) = self.eat(Tok::Minus) {
            let inner = self.unary()?;
            let span = t.span.to(inner.span);
            return Ok(Expr {
                kind: ExprKind::Neg(Box::new(inner)),
                span,
            });
        }
        if self.eat(Tok::Plus).is_some() {
            return self.unary();
        }
        self.power()
    }

    fn power(&mut self) -> PResult<Expr> {
        let base = self.primary()?;
        if self.eat(Tok::Caret).is_some() {
            let exp = self.unary()?;
            return Ok(binary(BinOp::Pow, base, exp));
        }
        Ok(base)
    }

    fn primary(&mut self) -> PResult<Expr> {
        let Some(t) = self.peek_token() else {
            return Err(Diagnostic::error(
                "E002",
                "expected a value, found the end of the file",
                self.eof_span(),
            )
            .with_label("expected a value"));
        };
        match t.kind {
            Tok::Number(num_len) => {
                self.bump();
                let full = self.slice(t.span);
                let num_text = &full[..num_len as usize];
                let value: f64 = num_text.parse().map_err(|_| {
                    Diagnostic::error("E004", format!("`{num_text}` is not a number"), t.span)
                        .with_help("write numbers like `12`, `0.5` or `1.2e-3`")
                })?;
                let rest = &full[num_len as usize..];
                let unit_text = rest.trim_start();
                let unit = if unit_text.is_empty() {
                    None
                } else {
                    let start = t.span.end as usize - unit_text.len();
                    Some((
                        unit_text.to_string(),
                        Span::new(self.file, start, t.span.end as usize),
                    ))
                };
                Ok(Expr {
                    kind: ExprKind::Number {
                        value,
                        text: num_text.to_string(),
                        unit,
                    },
                    span: t.span,
                })
            }
            Tok::Ident => {
                let id = self.ident("a name")?;
                if self.peek() == Some(Tok::LParen) {
                    self.bump();
                    let mut args = Vec::new();
                    if self.eat(Tok::RParen).is_none() {
                        loop {
                            args.push(self.expr()?);
                            if self.eat(Tok::Comma).is_some() {
                                continue;
                            }
                            self.expect(Tok::RParen, "`,` or `)` in the function's arguments")?;
                            break;
                        }
                    }
                    let span = id.span.to(self.prev_end());
                    return Ok(Expr {
                        kind: ExprKind::Call { func: id, args },
                        span,
                    });
                }
                Ok(Expr {
                    span: id.span,
                    kind: ExprKind::Name(id),
                })
            }
            Tok::LParen => {
                self.bump();
                let inner = self.expr()?;
                let close = self.expect(Tok::RParen, "`)` to close the bracket")?;
                Ok(Expr {
                    span: t.span.to(close.span),
                    kind: ExprKind::Paren(Box::new(inner)),
                })
            }
            _ => Err(self.unexpected(t, "a value (a number with its unit, a name or a bracket)")),
        }
    }
}

/// Words that start a declaration only where a declaration may start, followed by a name; they
/// stay ordinary names everywhere else, so they need no tokens of their own.
const CONTEXTUAL: &[&str] = &["repeat", "network", "use", "region"];

impl Parser<'_> {
    fn at_contextual_item(&self) -> bool {
        match (self.tokens.get(self.pos), self.tokens.get(self.pos + 1)) {
            (Some(t), Some(n)) => {
                t.kind == Tok::Ident
                    && n.kind == Tok::Ident
                    && CONTEXTUAL.contains(&self.slice(t.span))
            }
            _ => false,
        }
    }

    /// `repeat NAME (ARGS) { ... }`, `network NAME (PORTS) { ... }`, `use NAME: NETWORK(ARGS)`.
    fn contextual_item(&mut self) -> PResult<ItemKind> {
        let keyword = self.bump();
        match self.slice(keyword.span) {
            "repeat" => {
                let name = self.ident("the repetition's name")?;
                let args = self.arg_list("`(count = N)` after the repetition's name")?;
                let body = self.body("`{` to open the declarations to repeat")?;
                Ok(ItemKind::Repeat { name, args, body })
            }
            "network" => {
                let name = self.ident("the sub-network's name")?;
                self.expect(
                    Tok::LParen,
                    "`(` and the sub-network's port nodes, e.g. `(inside, outside)`",
                )?;
                let mut ports = Vec::new();
                if self.eat(Tok::RParen).is_none() {
                    loop {
                        ports.push(self.ident("a port node name")?);
                        if self.eat(Tok::Comma).is_some() {
                            continue;
                        }
                        self.expect(Tok::RParen, "`,` or `)` after a port name")?;
                        break;
                    }
                }
                let body = self.body("`{` to open the sub-network's declarations")?;
                Ok(ItemKind::Network { name, ports, body })
            }
            "region" => {
                let name = self.ident("the region's name")?;
                let args = self.arg_list("`(` and the region's material, size and cell counts")?;
                let open = self.expect(Tok::LBrace, "`{` to open the region's edge attachments")?;
                let mut edges = Vec::new();
                while self.eat(Tok::RBrace).is_none() {
                    if self.at_end() {
                        return Err(Diagnostic::error(
                            "E002",
                            "this region is not closed",
                            open.span,
                        )
                        .with_label("`{` opened here")
                        .with_help("add `}` after the last edge attachment"));
                    }
                    let side = self.ident(
                        "an edge (`left`, `right`, `bottom`, `top`) or face (`front`, `back`)",
                    )?;
                    self.expect(Tok::Colon, "`:` after the edge, as in `left: hot_bar`")?;
                    let node = self.ident("the node this edge is attached to")?;
                    let element = if self.peek() == Some(Tok::Ident)
                        && self.tokens.get(self.pos + 1).map(|t| t.kind) == Some(Tok::LParen)
                    {
                        Some(self.element_call("an element such as `film(h = 10 W/(m^2*K))`")?)
                    } else {
                        None
                    };
                    let span = side.span.to(self.prev_end());
                    edges.push(RegionEdge {
                        side,
                        node,
                        element,
                        span,
                    });
                }
                Ok(ItemKind::Region { name, args, edges })
            }
            _ => {
                let name = self.ident("the name of this use")?;
                self.expect(Tok::Colon, "`:` after the name, as in `use kitchen: room_wall(inside = kitchen, outside = garden)`")?;
                let network = self.ident("the sub-network to use")?;
                let args = self.arg_list("`(` and the ports and parameters of the use")?;
                Ok(ItemKind::Use {
                    name,
                    network,
                    args,
                })
            }
        }
    }

    /// `{ declarations }`; a broken declaration inside is skipped up to the next one or `}`.
    fn body(&mut self, expected: &str) -> PResult<Vec<Item>> {
        let open = self.expect(Tok::LBrace, expected)?;
        let mut items = Vec::new();
        loop {
            match self.peek() {
                Some(Tok::RBrace) => {
                    self.bump();
                    return Ok(items);
                }
                None => {
                    return Err(
                        Diagnostic::error("E002", "this block is not closed", open.span)
                            .with_label("`{` opened here")
                            .with_help("add `}` after the block's last declaration"),
                    )
                }
                Some(_) => {
                    let start = self.pos;
                    match self.item() {
                        Ok(item) => items.push(item),
                        Err(d) => {
                            self.diags.push(d);
                            if self.pos == start {
                                self.pos += 1;
                            }
                            while let Some(k) = self.peek() {
                                if k == Tok::RBrace || k.starts_item() || self.at_contextual_item()
                                {
                                    break;
                                }
                                self.pos += 1;
                            }
                        }
                    }
                }
            }
        }
    }
}

fn binary(op: BinOp, lhs: Expr, rhs: Expr) -> Expr {
    let span = lhs.span.to(rhs.span);
    Expr {
        kind: ExprKind::Binary {
            op,
            lhs: Box::new(lhs),
            rhs: Box::new(rhs),
        },
        span,
    }
}

fn describe(kind: Tok, text: &str) -> String {
    match kind {
        Tok::Ident => format!("the name `{text}`"),
        Tok::Number(_) => format!("`{text}`"),
        _ => kind.to_string(),
    }
}

fn unreachable_eof() -> ! {
    // `item` is only called when a token remains.
    panic!("parser asked for an item at the end of the file")
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn parses_a_small_model() {
        let src = "title \"t\"\nparam a = 2 m * 3 m\nnode room (fixed = 20 °C)\nlink w: room to out layer(k = 1 W/(m*K), thickness = 1 cm, area = a)\n";
        let (m, d) = parse(src, FileId(0));
        assert!(d.is_empty(), "{d:?}");
        assert_eq!(m.items.len(), 4);
    }

    #[test]
    fn recovers_and_reports_several_errors() {
        let src = "node a (fixed = )\nparam x = 3 m\nlink b a to c film()\nparam y = 1\n";
        let (m, d) = parse(src, FileId(0));
        assert_eq!(d.len(), 2, "{d:?}");
        assert_eq!(m.items.len(), 2);
    }
}
