//! Hand-written recursive-descent parser with error recovery.
//!
//! Written by hand rather than with a combinator library so each message can say what was
//! expected in the analyst's words, and so recovery is simple: a broken declaration is skipped
//! up to the next declaration keyword and parsing goes on, giving several errors per file.

use crate::diagnostic::Diagnostic;
use crate::lexer::{lex, Tok, Token};
use crate::span::{FileId, Span};
use crate::syntax::*;

/// Deepest nesting of brackets, function calls, signs and exponents in one expression. Far
/// beyond anything written by hand or generated sensibly, yet every walk over the syntax tree
/// (parsing itself, evaluation, expansion, editor queries, comparison, drop) stays well inside
/// a 2 MB thread stack in an unoptimised build: parsing is the deepest, about 8 KB a level
/// there, so under 1 MB at the limit (compiler/tests/nesting_limits.rs runs every stage at
/// 2 MB). Long chains of `+ - * /` do not nest: they are flat lists.
pub const MAX_EXPR_DEPTH: usize = 100;

/// Deepest nesting of `repeat` and `network` blocks; the same as the expansion's limit, so the
/// block that crosses it is reported once, before the parser recurses any deeper.
pub const MAX_BLOCK_DEPTH: usize = crate::expand::MAX_DEPTH;

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
        depth: 0,
        blocks: 0,
    };
    let mut items = Vec::new();
    while !p.at_end() {
        let start = p.pos;
        match p.item() {
            Ok(item) => items.push(item),
            Err(d) => {
                p.diags.push(*d);
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
        depth: 0,
        blocks: 0,
    };
    let e = p.expr().map_err(|d| *d)?;
    if let Some(t) = p.peek_token() {
        return Err(*p.unexpected(t, "the end of the expression"));
    }
    // A part nested too deep was skipped and reported; the expression is not whole.
    if let Some(d) = p.diags.into_iter().next() {
        return Err(d);
    }
    Ok(e)
}

struct Parser<'a> {
    text: &'a str,
    file: FileId,
    tokens: Vec<Token>,
    pos: usize,
    diags: Vec<Diagnostic>,
    /// Nesting of the expression being read (see [`MAX_EXPR_DEPTH`]).
    depth: usize,
    /// Nesting of `{ }` blocks of declarations (see [`MAX_BLOCK_DEPTH`]).
    blocks: usize,
}

/// The error is boxed: every level of expression nesting holds a few of these results on the
/// stack, and a bare diagnostic would more than double each one.
type PResult<T> = Result<T, Box<Diagnostic>>;

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

    #[cold]
    #[inline(never)]
    fn unexpected(&self, t: Token, expected: &str) -> Box<Diagnostic> {
        Box::new(match t.kind {
            Tok::Unknown => {
                let ch = self.slice(t.span);
                Diagnostic::error("E001", format!("unexpected character `{ch}`"), t.span)
                    .with_label("not part of the language")
                    .with_help(format!("remove it; {expected} was expected here"))
            }
            Tok::UnterminatedStr => Diagnostic::error("E003", "unterminated string", t.span)
                .with_label("this string has no closing quote")
                .with_help("add `\"` at the end of the string, on the same line"),
            // A declaration keyword on a later line means the previous declaration was left
            // unfinished: point at where it stops, not at the innocent next line.
            k if k.starts_item() && self.on_later_line(t) => Diagnostic::error(
                "E002",
                format!("expected {expected}, found the end of the line"),
                self.prev_end(),
            )
            .with_label(format!("expected {expected} here"))
            .with_help(format!(
                "the declaration stops here; the next line starts a new one with {}",
                describe(t.kind, self.slice(t.span))
            )),
            _ => Diagnostic::error(
                "E002",
                format!(
                    "expected {expected}, found {}",
                    describe(t.kind, self.slice(t.span))
                ),
                t.span,
            )
            .with_label(format!("expected {expected}")),
        })
    }

    fn on_later_line(&self, t: Token) -> bool {
        let before = self.prev_end();
        before.end < t.span.start
            && self.text[before.end as usize..t.span.start as usize].contains('\n')
    }

    fn expect(&mut self, kind: Tok, expected: &str) -> PResult<Token> {
        match self.peek_token() {
            Some(t) if t.kind == kind => Ok(self.bump()),
            Some(t) => Err(self.unexpected(t, expected)),
            None => Err(self.eof_error(expected)),
        }
    }

    #[cold]
    #[inline(never)]
    fn eof_error(&self, expected: &str) -> Box<Diagnostic> {
        Box::new(
            Diagnostic::error(
                "E002",
                format!("expected {expected}, found the end of the file"),
                self.eof_span(),
            )
            .with_label(format!("expected {expected}")),
        )
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
        while !self.at_end() && !self.at_declaration() {
            self.pos += 1;
        }
    }

    /// A declaration starts at the current token: a keyword, or a contextual word followed by
    /// a name (`schedule`, `case` and `transient` only at the start of a line). Every recovery
    /// loop stops here, so a broken declaration never swallows the next one.
    fn at_declaration(&self) -> bool {
        self.peek().is_some_and(|k| k.starts_item())
            || (self.at_declaration_word(self.pos) && self.starts_line(self.pos))
            || self.at_contextual_item()
    }

    fn item(&mut self) -> PResult<Item> {
        let Some(t) = self.peek_token() else {
            return Err(self.eof_error("a declaration"));
        };
        let kind = self.item_kind(t)?;
        Ok(Item {
            kind,
            span: t.span.to(self.prev_end()),
        })
    }

    /// One declaration, by its first token. Each kind is parsed in its own function: blocks
    /// recurse through here, and one small frame per level keeps deep nesting cheap on the
    /// stack (unoptimised builds give a function one slot per temporary of every branch).
    fn item_kind(&mut self, t: Token) -> PResult<ItemKind> {
        match t.kind {
            Tok::Title => self.title_item(),
            Tok::Import => self.import_item(),
            Tok::Param => self.param_item(),
            Tok::Material => self.material_item(),
            Tok::Node => self.node_item(),
            Tok::Link => self.link_item(),
            Tok::Buildup => self.buildup_item(),
            Tok::Limit => self.limit_item(),
            Tok::Ident if self.at_declaration_word(self.pos) => self.declaration(),
            Tok::Ident if self.at_contextual_item() => self.contextual_item(),
            _ => Err(self.unexpected(
                t,
                "a declaration (`param`, `material`, `node`, `link`, `buildup`, `limit`, `repeat`, `network`, `use`, `region`, `schedule`, `case`, `transient`, `title` or `import`)",
            )),
        }
    }

    fn title_item(&mut self) -> PResult<ItemKind> {
        self.bump();
        let s = self.string("the model's title in quotes, e.g. `title \"Garden office wall\"`")?;
        Ok(ItemKind::Title { text: s.0 })
    }

    fn import_item(&mut self) -> PResult<ItemKind> {
        self.bump();
        let (path, path_span) = self.string("the path of a model file in quotes")?;
        Ok(ItemKind::Import { path, path_span })
    }

    fn param_item(&mut self) -> PResult<ItemKind> {
        self.bump();
        let name = self.ident("the parameter's name")?;
        self.expect(Tok::Eq, "`=` and the parameter's value")?;
        let value = self.expr()?;
        Ok(ItemKind::Param { name, value })
    }

    fn material_item(&mut self) -> PResult<ItemKind> {
        self.bump();
        let name = self.ident("the material's name")?;
        let args =
            self.arg_list("the material's properties in parentheses, e.g. `(k = 0.04 W/(m*K))`")?;
        Ok(ItemKind::Material { name, args })
    }

    fn node_item(&mut self) -> PResult<ItemKind> {
        self.bump();
        let name = self.ident("the node's name")?;
        // A node may stand alone; anything else on its line must be its property list.
        let args = match self.peek_token() {
            Some(t) if t.kind == Tok::LParen || !self.on_later_line(t) && !t.kind.starts_item() => self.arg_list(
                "`(` to open the node's properties, as in `node attic (fixed = 5 °C)` or `node die (load = 2 W)`",
            )?,
            _ => Vec::new(),
        };
        Ok(ItemKind::Node { name, args })
    }

    fn link_item(&mut self) -> PResult<ItemKind> {
        self.bump();
        let name = self.ident("the link's name")?;
        self.expect(
            Tok::Colon,
            "`:` after the link's name, as in `link name: a to b layer(...)`",
        )?;
        let from = self.ident("the node the link starts from")?;
        self.expect(Tok::To, "`to` between the link's two nodes")?;
        let to = self.ident("the node the link goes to")?;
        let element = self.element_call("the link's kind, e.g. `layer(...)`, `film(...)`")?;
        Ok(ItemKind::Link {
            name,
            from,
            to,
            element,
        })
    }

    fn buildup_item(&mut self) -> PResult<ItemKind> {
        self.bump();
        let name = self.ident("the build-up's name")?;
        self.expect(Tok::LBrace, "`{` to open the build-up's list of layers")?;
        let elements = self.buildup_elements()?;
        Ok(ItemKind::Buildup { name, elements })
    }

    fn limit_item(&mut self) -> PResult<ItemKind> {
        self.bump();
        let name = self.ident("the limit's name")?;
        self.expect(
            Tok::Colon,
            "`:` after the limit's name, as in `limit name: temperature(x) < 60 °C`",
        )?;
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
            None => return Err(self.eof_error("a comparison `<`, `<=`, `>` or `>=`")),
        };
        self.bump();
        let value = self.expr()?;
        Ok(ItemKind::Limit {
            name,
            measure,
            subject,
            op,
            value,
        })
    }

    /// A contextual declaration word (`schedule`, `case`, `transient`) followed by a name.
    fn at_declaration_word(&self, i: usize) -> bool {
        let is_word =
            |t: &Token| t.kind == Tok::Ident && DECLARATION_WORDS.contains(&self.slice(t.span));
        self.tokens.get(i).is_some_and(is_word)
            && self.tokens.get(i + 1).is_some_and(|t| t.kind == Tok::Ident)
    }

    /// True when token `i` is the first on its line.
    fn starts_line(&self, i: usize) -> bool {
        match (
            i.checked_sub(1).and_then(|p| self.tokens.get(p)),
            self.tokens.get(i),
        ) {
            (Some(prev), Some(t)) => {
                self.text[prev.span.end as usize..t.span.start as usize].contains('\n')
            }
            _ => true,
        }
    }

    fn declaration(&mut self) -> PResult<ItemKind> {
        let word = self.ident("a declaration word")?;
        let name = self.ident(&format!("the {}'s name", word.name))?;
        let args = if self.peek() == Some(Tok::LParen) {
            self.arg_list("`(`")?
        } else {
            Vec::new()
        };
        let rows = if self.eat(Tok::LBrace).is_some() {
            Some(self.rows()?)
        } else {
            None
        };
        Ok(ItemKind::Declaration {
            word,
            name,
            args,
            rows,
        })
    }

    /// Rows `KEY: VALUE`, one per line, up to `}`.
    fn rows(&mut self) -> PResult<Vec<Row>> {
        let mut out = Vec::new();
        loop {
            match self.peek_token() {
                Some(t) if t.kind == Tok::RBrace => {
                    self.bump();
                    return Ok(out);
                }
                Some(t) if self.at_declaration() => {
                    return Err(Box::new(
                        Diagnostic::error("E002", "this table is not closed", t.span)
                            .with_label("a new declaration starts before `}`")
                            .with_help("add `}` after the table's last row"),
                    ))
                }
                None => {
                    return Err(Box::new(
                        Diagnostic::error("E002", "this table is not closed", self.eof_span())
                            .with_label("the file ends before `}`")
                            .with_help("add `}` after the table's last row"),
                    ))
                }
                Some(_) => {
                    let start = self.pos;
                    match self.row() {
                        Ok(r) => out.push(r),
                        Err(d) => {
                            // Keep a placeholder row (never evaluated: the error is reported)
                            // so the table does not also look empty; resume at the next line.
                            let missing = Expr {
                                kind: ExprKind::Missing,
                                span: d.primary.span,
                            };
                            out.push(Row {
                                key: missing.clone(),
                                value: missing,
                                span: d.primary.span,
                            });
                            self.diags.push(*d);
                            if self.pos == start {
                                self.pos += 1;
                            }
                            while self
                                .peek()
                                .is_some_and(|k| k != Tok::RBrace && !k.starts_item())
                                && !self.starts_line(self.pos)
                            {
                                self.pos += 1;
                            }
                        }
                    }
                }
            }
        }
    }

    /// One row, confined to its line so that a value never runs on into the next row's key
    /// (`3 °C` followed by a row `-1 h: ...` is two rows, not a subtraction).
    fn row(&mut self) -> PResult<Row> {
        let mut end = self.pos + 1;
        while end < self.tokens.len() && !self.starts_line(end) {
            end += 1;
        }
        let line_end = self.tokens[end - 1].span;
        let line_end = Span {
            start: line_end.end,
            ..line_end
        };
        let tail = self.tokens.split_off(end);
        let parsed = self.row_on_line(line_end);
        self.tokens.extend(tail);
        parsed.map_err(|mut d| {
            if d.message.ends_with("found the end of the file") {
                d.message = d
                    .message
                    .replace("found the end of the file", "found the end of the line");
                d.primary.span = line_end;
            }
            d
        })
    }

    fn row_on_line(&mut self, line_end: Span) -> PResult<Row> {
        let key = self.expr()?;
        if self.eat(Tok::Colon).is_none() {
            return Err(match self.peek_token() {
                Some(t) => {
                    self.unexpected(t, "`:` between the time and the value, as in `6 h: -4 °C`")
                }
                None => Box::new(
                    Diagnostic::error(
                        "E002",
                        "expected `:` and a value, found the end of the line",
                        line_end,
                    )
                    .with_label("expected `:`")
                    .with_help("write each row as `TIME: VALUE`, e.g. `6 h: -4 °C`"),
                ),
            });
        }
        let value = self.expr()?;
        if let Some(t) = self.peek_token() {
            return Err(self.unexpected(t, "the end of the row (one row per line)"));
        }
        let span = key.span.to(value.span);
        Ok(Row { key, value, span })
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
                Some(t) if self.at_declaration() => {
                    return Err(Box::new(
                        Diagnostic::error("E002", "this build-up is not closed", t.span)
                            .with_label("a new declaration starts before `}`")
                            .with_help("add `}` after the build-up's last element"),
                    ))
                }
                None => {
                    return Err(Box::new(
                        Diagnostic::error("E002", "this build-up is not closed", self.eof_span())
                            .with_label("the file ends before `}`")
                            .with_help("add `}` after the build-up's last element"),
                    ))
                }
                Some(_) => {
                    let start = self.pos;
                    match self.buildup_element() {
                        Ok(e) => out.push(e),
                        Err(d) => {
                            // Resume at the next element line, `}` or declaration.
                            self.diags.push(*d);
                            if self.pos == start {
                                self.pos += 1;
                            }
                            while let Some(t) = self.peek_token() {
                                let next_is_colon = self.tokens.get(self.pos + 1).map(|n| n.kind)
                                    == Some(Tok::Colon);
                                if t.kind == Tok::RBrace
                                    || self.at_declaration()
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
            // A keyword before `=` is an argument name too: `layer(material = brick)`.
            let named = self
                .peek()
                .is_some_and(|k| k == Tok::Ident || k.starts_item() || k == Tok::To)
                && self.tokens.get(self.pos + 1).map(|t| t.kind) == Some(Tok::Eq);
            let name = if named {
                let t = self.bump();
                let n = Ident {
                    name: self.slice(t.span).to_string(),
                    span: t.span,
                };
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
                None => return Err(self.eof_error("`)` to close the arguments")),
            }
        }
    }

    pub fn expr(&mut self) -> PResult<Expr> {
        self.chain(Self::term, |k| match k {
            Tok::Plus => Some(BinOp::Add),
            Tok::Minus => Some(BinOp::Sub),
            _ => None,
        })
    }

    fn term(&mut self) -> PResult<Expr> {
        self.chain(Self::unary, |k| match k {
            Tok::Star => Some(BinOp::Mul),
            Tok::Slash => Some(BinOp::Div),
            _ => None,
        })
    }

    /// Operands joined by the operators of one precedence level, read in a loop into one flat
    /// [`ExprKind::Chain`]: a generated sum of thousands of terms is a list, so nothing that
    /// walks the tree later recurses once per term.
    fn chain(
        &mut self,
        operand: fn(&mut Self) -> PResult<Expr>,
        op_of: fn(Tok) -> Option<BinOp>,
    ) -> PResult<Expr> {
        let first = operand(self)?;
        let mut rest = Vec::new();
        while let Some(op) = self.peek().and_then(op_of) {
            self.bump();
            rest.push((op, operand(self)?));
        }
        let Some((_, last)) = rest.last() else {
            return Ok(first);
        };
        let span = first.span.to(last.span);
        Ok(Expr {
            kind: ExprKind::Chain {
                first: Box::new(first),
                rest,
            },
            span,
        })
    }

    /// Every level of nesting (a bracket, a function's arguments, a sign, an exponent) passes
    /// through here, so this is where the depth is counted and cut off.
    fn unary(&mut self) -> PResult<Expr> {
        if self.depth >= MAX_EXPR_DEPTH {
            return Ok(self.too_deep());
        }
        self.depth += 1;
        let e = self.signed();
        self.depth -= 1;
        e
    }

    fn signed(&mut self) -> PResult<Expr> {
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
            let exponent = self.unary()?;
            let span = base.span.to(exponent.span);
            return Ok(Expr {
                kind: ExprKind::Power {
                    base: Box::new(base),
                    exponent: Box::new(exponent),
                },
                span,
            });
        }
        Ok(base)
    }

    /// The part of an expression nested deeper than [`MAX_EXPR_DEPTH`]: reported once (E005)
    /// and skipped up to the bracket that closes the level it starts in, so the enclosing
    /// levels and the rest of the declaration still parse. It becomes a placeholder that is
    /// never evaluated.
    #[cold]
    #[inline(never)]
    fn too_deep(&mut self) -> Expr {
        let Some(first) = self.peek_token() else {
            // Nothing left to skip: the ordinary end-of-file error says what is missing.
            return Expr {
                kind: ExprKind::Missing,
                span: self.eof_span(),
            };
        };
        let mut end = first.span;
        let mut open = 0usize;
        while let Some(t) = self.peek_token() {
            match t.kind {
                Tok::LParen => open += 1,
                Tok::RParen if open == 0 => break,
                Tok::RParen => open -= 1,
                // Unbalanced brackets must not swallow the declarations that follow.
                _ if self.on_later_line(t) && self.at_declaration() => break,
                _ => {}
            }
            end = t.span;
            self.bump();
        }
        self.diags.push(
            Diagnostic::error(
                "E005",
                format!("expression nested more than {MAX_EXPR_DEPTH} deep"),
                first.span,
            )
            .with_label(format!(
                "level {} of brackets, calls, signs or powers starts here",
                MAX_EXPR_DEPTH + 1
            ))
            .with_help(
                "split the expression: give an inner part its own `param` and use its name here",
            ),
        );
        Expr {
            kind: ExprKind::Missing,
            span: first.span.to(end),
        }
    }

    fn primary(&mut self) -> PResult<Expr> {
        let Some(t) = self.peek_token() else {
            return Err(Box::new(
                Diagnostic::error(
                    "E002",
                    "expected a value, found the end of the file",
                    self.eof_span(),
                )
                .with_label("expected a value"),
            ));
        };
        match t.kind {
            Tok::Number(num_len) => self.number(t, num_len as usize),
            Tok::Ident => self.name_or_call(),
            Tok::LParen => self.bracket(t),
            _ => Err(self.unexpected(t, "a value (a number with its unit, a name or a bracket)")),
        }
    }

    fn number(&mut self, t: Token, num_len: usize) -> PResult<Expr> {
        self.bump();
        let full = self.slice(t.span);
        let num_text = &full[..num_len];
        let value: f64 = num_text.parse().map_err(|_| {
            Diagnostic::error("E004", format!("`{num_text}` is not a number"), t.span)
                .with_help("write numbers like `12`, `0.5` or `1.2e-3`")
        })?;
        number_representable(num_text, value, t.span)?;
        let rest = &full[num_len..];
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

    fn name_or_call(&mut self) -> PResult<Expr> {
        let id = self.ident("a name")?;
        if self.eat(Tok::LParen).is_none() {
            return Ok(Expr {
                span: id.span,
                kind: ExprKind::Name(id),
            });
        }
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
        Ok(Expr {
            kind: ExprKind::Call { func: id, args },
            span,
        })
    }

    fn bracket(&mut self, open: Token) -> PResult<Expr> {
        self.bump();
        let inner = self.expr()?;
        let close = self.expect(Tok::RParen, "`)` to close the bracket")?;
        Ok(Expr {
            span: open.span.to(close.span),
            kind: ExprKind::Paren(Box::new(inner)),
        })
    }
}

impl Parser<'_> {
    fn at_contextual_item(&self) -> bool {
        match (self.tokens.get(self.pos), self.tokens.get(self.pos + 1)) {
            (Some(t), Some(n)) => {
                t.kind == Tok::Ident
                    && n.kind == Tok::Ident
                    && BLOCK_WORDS.contains(&self.slice(t.span))
            }
            _ => false,
        }
    }

    /// `repeat NAME (ARGS) { ... }`, `network NAME (PORTS) { ... }`, `use NAME: NETWORK(ARGS)`,
    /// `region NAME (ARGS) { ... }`.
    fn contextual_item(&mut self) -> PResult<ItemKind> {
        let keyword = self.bump();
        match self.slice(keyword.span) {
            "repeat" => self.repeat_item(),
            "network" => self.network_item(),
            "region" => self.region_item(),
            _ => self.use_item(),
        }
    }

    fn repeat_item(&mut self) -> PResult<ItemKind> {
        let name = self.ident("the repetition's name")?;
        let args = self.arg_list("`(count = N)` after the repetition's name")?;
        let body = self.body("`{` to open the declarations to repeat")?;
        Ok(ItemKind::Repeat { name, args, body })
    }

    fn network_item(&mut self) -> PResult<ItemKind> {
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

    fn region_item(&mut self) -> PResult<ItemKind> {
        let name = self.ident("the region's name")?;
        let args = self.arg_list("`(` and the region's material, size and cell counts")?;
        let open = self.expect(Tok::LBrace, "`{` to open the region's edge attachments")?;
        let mut edges = Vec::new();
        while self.eat(Tok::RBrace).is_none() {
            if self.at_end() {
                return Err(Box::new(
                    Diagnostic::error("E002", "this region is not closed", open.span)
                        .with_label("`{` opened here")
                        .with_help("add `}` after the last edge attachment"),
                ));
            }
            let side =
                self.ident("an edge (`left`, `right`, `bottom`, `top`) or face (`front`, `back`)")?;
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

    fn use_item(&mut self) -> PResult<ItemKind> {
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

    /// `{ declarations }`; a broken declaration inside is skipped up to the next one or `}`.
    fn body(&mut self, expected: &str) -> PResult<Vec<Item>> {
        let open = self.expect(Tok::LBrace, expected)?;
        if self.blocks >= MAX_BLOCK_DEPTH {
            return Err(self.block_too_deep(open));
        }
        self.blocks += 1;
        let items = self.body_items(open);
        self.blocks -= 1;
        items
    }

    /// A block nested deeper than [`MAX_BLOCK_DEPTH`]: skipped to its closing `}` without
    /// reading what is inside (which is what would recurse), and reported once at its `{`.
    #[cold]
    #[inline(never)]
    fn block_too_deep(&mut self, open: Token) -> Box<Diagnostic> {
        let mut open_blocks = 1usize;
        while let Some(k) = self.peek() {
            self.bump();
            match k {
                Tok::LBrace => open_blocks += 1,
                Tok::RBrace if open_blocks == 1 => break,
                Tok::RBrace => open_blocks -= 1,
                _ => {}
            }
        }
        Box::new(
            Diagnostic::error(
                "E005",
                format!("blocks nested more than {MAX_BLOCK_DEPTH} deep"),
                open.span,
            )
            .with_label(format!("block level {} opens here", MAX_BLOCK_DEPTH + 1))
            .with_help(format!(
                "at most {MAX_BLOCK_DEPTH} levels of `repeat` and `network` blocks may nest; merge levels into one `repeat` with a larger count, or write a repetition of count 1 as its plain body"
            )),
        )
    }

    fn body_items(&mut self, open: Token) -> PResult<Vec<Item>> {
        let mut items = Vec::new();
        loop {
            match self.peek() {
                Some(Tok::RBrace) => {
                    self.bump();
                    return Ok(items);
                }
                None => {
                    return Err(Box::new(
                        Diagnostic::error("E002", "this block is not closed", open.span)
                            .with_label("`{` opened here")
                            .with_help("add `}` after the block's last declaration"),
                    ))
                }
                Some(_) => {
                    let start = self.pos;
                    match self.item() {
                        Ok(item) => items.push(item),
                        Err(d) => {
                            self.diags.push(*d);
                            if self.pos == start {
                                self.pos += 1;
                            }
                            while let Some(k) = self.peek() {
                                if k == Tok::RBrace || self.at_declaration() {
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

fn describe(kind: Tok, text: &str) -> String {
    match kind {
        Tok::Ident => format!("the name `{text}`"),
        Tok::Number(_) => format!("`{text}`"),
        _ => kind.to_string(),
    }
}

/// E004 for a literal that a double cannot hold: one that overflows to infinity, or one with
/// non-zero digits that underflows to zero. Either would silently become a different number.
fn number_representable(text: &str, value: f64, span: Span) -> PResult<()> {
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
    Err(Box::new(
        Diagnostic::error(
            "E004",
            format!("`{text}` is a number {problem} to read"),
            span,
        )
        .with_label(format!("number {problem}"))
        .with_help(help),
    ))
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
    fn keywords_may_name_arguments() {
        let (m, d) = parse(
            "link a: x to y layer(material = brick, thickness = 1 cm, area = 1 m^2)\n",
            FileId(0),
        );
        assert!(d.is_empty(), "{d:?}");
        let ItemKind::Link { element, .. } = &m.items[0].kind else {
            panic!("not a link")
        };
        assert_eq!(
            element.args[0].name.as_ref().map(|n| n.name.as_str()),
            Some("material")
        );
    }

    #[test]
    fn contextual_declarations_and_rows() {
        let src = "node case (fixed = 20 °C)\nschedule night (repeat = 24 h) {\n  0 h: 3 °C\n  6 h: -2 °C\n}\ncase winter (t = -8 °C)\ntransient run1 (duration = 2 h)\n";
        let (m, d) = parse(src, FileId(0));
        assert!(d.is_empty(), "{d:?}");
        assert_eq!(m.items.len(), 4);
        let ItemKind::Declaration { word, rows, .. } = &m.items[1].kind else {
            panic!("not a declaration")
        };
        assert_eq!(word.name, "schedule");
        assert_eq!(rows.as_ref().map(Vec::len), Some(2));
    }

    #[test]
    fn a_row_ends_at_its_line_and_errors_recover_to_the_next_row() {
        // The second row's leading minus must not be read as a subtraction from the first value.
        let src =
            "schedule s {\n  0 h: 3 °C\n  -1 h: 2 °C\n  oops\n  5 h: 1 °C\n}\nparam p = 1 m\n";
        let (m, d) = parse(src, FileId(0));
        assert_eq!(d.len(), 1, "{d:?}");
        assert!(
            d[0].message.contains("found the end of the line"),
            "{}",
            d[0].message
        );
        let ItemKind::Declaration { rows, .. } = &m.items[0].kind else {
            panic!("not a declaration")
        };
        let rows = rows.as_ref().expect("rows");
        assert_eq!(rows.len(), 4);
        assert_eq!(rows[2].key.kind, ExprKind::Missing);
        assert_eq!(m.items.len(), 2);
    }

    #[test]
    fn recovers_and_reports_several_errors() {
        let src = "node a (fixed = )\nparam x = 3 m\nlink b a to c film()\nparam y = 1\n";
        let (m, d) = parse(src, FileId(0));
        assert_eq!(d.len(), 2, "{d:?}");
        assert_eq!(m.items.len(), 2);
    }
}
