//! What the cursor is on: a declared name, a quantity literal, a declaration word, an element
//! kind, an argument name, a limit's measure or a function. Words and arguments are looked up
//! in the schema (`crate::schema`).

use crate::analysis::Analysis;
use crate::elements::{self, ElementKind};
use crate::schema::{self, ArgSpec, DeclSpec};
use crate::span::{FileId, Span};
use crate::symbols::Symbol;
use crate::syntax::{Arg, ElementCall, Expr, ExprKind, Item, ItemKind};
use crate::units::{parse_unit, Quantity};

/// The thing at a position of a file.
#[derive(Clone, Copy)]
pub enum Target<'a> {
    /// A declared name, at its declaration or at a use; `span` is the occurrence under the cursor.
    Symbol { symbol: &'a Symbol, span: Span },
    /// A number with its unit as written (`12.5 mm`, `-8 °C`), and its value in SI.
    Literal {
        span: Span,
        value: f64,
        unit: Option<&'a str>,
        quantity: Quantity,
    },
    /// The kind of an element call (`layer` in `layer(...)`).
    ElementKind {
        span: Span,
        kind: &'static dyn ElementKind,
    },
    /// The word that begins a declaration (`node`, `transient`).
    Declaration { span: Span, decl: &'static DeclSpec },
    /// A named argument (`thickness` in `thickness = 140 mm`) of an element kind, a build-up
    /// use or a declaration, which `owner` names (`layer`, `node`, `timber_wall`).
    ArgName {
        span: Span,
        owner: &'a str,
        param: &'static ArgSpec,
    },
    /// The measure of a limit (`u_value`); `doc` says what it measures.
    Measure {
        span: Span,
        name: &'static str,
        doc: &'static str,
    },
    /// A standard function or the constant `pi`.
    Function { span: Span, name: &'a str },
}

impl Target<'_> {
    /// The span of the text the target covers.
    pub fn span(&self) -> Span {
        match self {
            Target::Symbol { span, .. }
            | Target::Literal { span, .. }
            | Target::ElementKind { span, .. }
            | Target::Declaration { span, .. }
            | Target::ArgName { span, .. }
            | Target::Measure { span, .. }
            | Target::Function { span, .. } => *span,
        }
    }
}

/// The target at a byte offset of a file of the analysis, if any.
pub fn target_at(a: &Analysis, file: FileId, offset: u32) -> Option<Target<'_>> {
    if let Some(symbol) = a.symbols.at(file, offset) {
        let span = std::iter::once(symbol.def)
            .chain(symbol.refs.iter().copied())
            .find(|s| s.file == file && s.contains(offset))
            .unwrap_or(symbol.def);
        return Some(Target::Symbol { symbol, span });
    }
    let module = &a.modules.iter().find(|(id, _)| *id == file)?.1;
    let item = module.items.iter().find(|i| i.span.contains(offset))?;
    At {
        a,
        text: a.sources.text(file),
        offset,
    }
    .item(item)
}

/// What an item's parts are looked up against.
struct At<'a> {
    a: &'a Analysis,
    text: &'a str,
    offset: u32,
}

impl<'a> At<'a> {
    fn item(&self, item: &'a Item) -> Option<Target<'a>> {
        let offset = self.offset;
        if let Some(t) = self.word(item) {
            return Some(t);
        }
        let decl_args = |word: &'static str, args: &'a [Arg]| {
            let specs = schema::declaration(word).map_or(&[][..], |d| d.arg_specs());
            self.args(word, specs, args)
        };
        match &item.kind {
            ItemKind::Param { value, .. } => in_expr(value, offset),
            ItemKind::Material { args, .. } => decl_args("material", args),
            ItemKind::Node { args, .. } => decl_args("node", args),
            ItemKind::Link { element, .. } => self.call(element),
            ItemKind::Buildup { elements, .. } => {
                elements.iter().find_map(|e| self.call(&e.element))
            }
            ItemKind::Limit { measure, value, .. } => {
                if measure.span.contains(offset) {
                    let m = schema::measure(&measure.name)?;
                    return Some(Target::Measure {
                        span: measure.span,
                        name: m.name,
                        doc: m.doc,
                    });
                }
                in_expr(value, offset)
            }
            ItemKind::Declaration {
                word, args, rows, ..
            } => {
                let specs = schema::declaration(&word.name).map_or(&[][..], |d| d.arg_specs());
                self.args(&word.name, specs, args).or_else(|| {
                    rows.iter()
                        .flatten()
                        .flat_map(|r| [&r.key, &r.value])
                        .find_map(|e| in_expr(e, offset))
                })
            }
            ItemKind::Repeat { args, body, .. } => decl_args("repeat", args).or_else(|| {
                body.iter()
                    .find(|i| i.span.contains(offset))
                    .and_then(|i| self.item(i))
            }),
            ItemKind::Network { body, .. } => body
                .iter()
                .find(|i| i.span.contains(offset))
                .and_then(|i| self.item(i)),
            ItemKind::Use { args, .. } => args.iter().find_map(|a| in_expr(&a.value, offset)),
            ItemKind::Region { args, edges, .. } => decl_args("region", args).or_else(|| {
                edges
                    .iter()
                    .filter_map(|e| e.element.as_ref())
                    .find_map(|c| self.call(c))
            }),
            ItemKind::Title { .. } | ItemKind::Import { .. } => None,
        }
    }

    /// The declaration word that begins the item, when the cursor is on it.
    fn word(&self, item: &Item) -> Option<Target<'a>> {
        let word = match &item.kind {
            ItemKind::Declaration { word, .. } => word.name.as_str(),
            ItemKind::Title { .. } => "title",
            ItemKind::Import { .. } => "import",
            ItemKind::Param { .. } => "param",
            ItemKind::Material { .. } => "material",
            ItemKind::Node { .. } => "node",
            ItemKind::Link { .. } => "link",
            ItemKind::Buildup { .. } => "buildup",
            ItemKind::Limit { .. } => "limit",
            ItemKind::Repeat { .. } => "repeat",
            ItemKind::Network { .. } => "network",
            ItemKind::Use { .. } => "use",
            ItemKind::Region { .. } => "region",
        };
        let span = Span {
            end: item.span.start + word.len() as u32,
            ..item.span
        };
        let written = self.text.get(span.range())?;
        (written == word && span.contains(self.offset)).then_some(())?;
        Some(Target::Declaration {
            span,
            decl: schema::declaration(word)?,
        })
    }

    /// An argument name of `owner` (looked up in `specs`) or a value, under the cursor.
    fn args(
        &self,
        owner: &'a str,
        specs: &'static [ArgSpec],
        args: &'a [Arg],
    ) -> Option<Target<'a>> {
        args.iter().find_map(|arg: &'a Arg| {
            if let Some(name) = &arg.name {
                if name.span.contains(self.offset) {
                    return Some(Target::ArgName {
                        span: name.span,
                        owner,
                        param: schema::find(specs, &name.name)?,
                    });
                }
            }
            in_expr(&arg.value, self.offset)
        })
    }

    /// An element call or a build-up use (`timber_wall(area = ...)`).
    fn call(&self, call: &'a ElementCall) -> Option<Target<'a>> {
        let kind = elements::lookup(&call.kind.name);
        if call.kind.span.contains(self.offset) {
            return kind.map(|kind| Target::ElementKind {
                span: call.kind.span,
                kind,
            });
        }
        let specs = match kind {
            Some(k) => k.params(),
            None => super::buildup_use_args(self.a, &call.kind.name).unwrap_or(&[]),
        };
        self.args(&call.kind.name, specs, &call.args)
    }
}

fn in_expr(e: &Expr, offset: u32) -> Option<Target<'_>> {
    if !e.span.contains(offset) {
        return None;
    }
    match &e.kind {
        ExprKind::Number { value, unit, .. } => {
            literal(*value, unit.as_ref().map(|u| u.0.as_str()), e.span)
        }
        ExprKind::Neg(inner) => match &inner.kind {
            // `-8 °C` is one literal, as the evaluator reads it.
            ExprKind::Number { value, unit, .. } => {
                literal(-*value, unit.as_ref().map(|u| u.0.as_str()), e.span)
            }
            _ => in_expr(inner, offset),
        },
        ExprKind::Chain { first, rest } => {
            in_expr(first, offset).or_else(|| rest.iter().find_map(|(_, x)| in_expr(x, offset)))
        }
        ExprKind::Power { base, exponent } => {
            in_expr(base, offset).or_else(|| in_expr(exponent, offset))
        }
        ExprKind::Paren(inner) => in_expr(inner, offset),
        ExprKind::Call { func, args } => {
            if func.span.contains(offset) {
                return Some(Target::Function {
                    span: func.span,
                    name: &func.name,
                });
            }
            args.iter().find_map(|a| in_expr(a, offset))
        }
        ExprKind::Name(id) if id.name == "pi" => Some(Target::Function {
            span: id.span,
            name: &id.name,
        }),
        ExprKind::Name(_) | ExprKind::Missing => None,
    }
}

fn literal(value: f64, unit: Option<&str>, span: Span) -> Option<Target<'_>> {
    let quantity = match unit {
        Some(u) => parse_unit(u).ok()?.to_si(value),
        None => Quantity::number(value),
    };
    Some(Target::Literal {
        span,
        value,
        unit,
        quantity,
    })
}
