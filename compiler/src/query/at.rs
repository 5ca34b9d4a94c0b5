//! What the cursor is on: a declared name, a quantity literal, an element kind, an argument
//! name, a limit's measure or a function.

use crate::analysis::Analysis;
use crate::elements::{self, ArgSpec, ElementKind};
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
    /// A named argument of an element call (`thickness` in `thickness = 140 mm`).
    ArgName {
        span: Span,
        kind: &'static dyn ElementKind,
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
    in_item(item, offset)
}

fn in_item(item: &Item, offset: u32) -> Option<Target<'_>> {
    match &item.kind {
        ItemKind::Param { value, .. } => in_expr(value, offset),
        ItemKind::Material { args, .. } | ItemKind::Node { args, .. } => {
            args.iter().find_map(|a| in_expr(&a.value, offset))
        }
        ItemKind::Link { element, .. } => in_call(element, offset),
        ItemKind::Buildup { elements, .. } => {
            elements.iter().find_map(|e| in_call(&e.element, offset))
        }
        ItemKind::Limit { measure, value, .. } => {
            if measure.span.contains(offset) {
                let m = crate::schema::measure(&measure.name)?;
                return Some(Target::Measure {
                    span: measure.span,
                    name: m.name,
                    doc: m.doc,
                });
            }
            in_expr(value, offset)
        }
        ItemKind::Declaration { args, rows, .. } => args
            .iter()
            .map(|a| &a.value)
            .chain(rows.iter().flatten().flat_map(|r| [&r.key, &r.value]))
            .find_map(|e| in_expr(e, offset)),
        ItemKind::Repeat { args, body, .. } => args
            .iter()
            .find_map(|a| in_expr(&a.value, offset))
            .or_else(|| {
                body.iter()
                    .find(|i| i.span.contains(offset))
                    .and_then(|i| in_item(i, offset))
            }),
        ItemKind::Network { body, .. } => body
            .iter()
            .find(|i| i.span.contains(offset))
            .and_then(|i| in_item(i, offset)),
        ItemKind::Use { args, .. } => args.iter().find_map(|a| in_expr(&a.value, offset)),
        ItemKind::Region { args, edges, .. } => args
            .iter()
            .find_map(|a| in_expr(&a.value, offset))
            .or_else(|| {
                edges
                    .iter()
                    .filter_map(|e| e.element.as_ref())
                    .find_map(|c| in_call(c, offset))
            }),
        ItemKind::Title { .. } | ItemKind::Import { .. } => None,
    }
}

fn in_call(call: &ElementCall, offset: u32) -> Option<Target<'_>> {
    let kind = elements::lookup(&call.kind.name);
    if call.kind.span.contains(offset) {
        return kind.map(|kind| Target::ElementKind {
            span: call.kind.span,
            kind,
        });
    }
    call.args.iter().find_map(|arg: &Arg| {
        if let (Some(name), Some(kind)) = (&arg.name, kind) {
            if name.span.contains(offset) {
                let param = kind.params().iter().find(|p| p.name == name.name)?;
                return Some(Target::ArgName {
                    span: name.span,
                    kind,
                    param,
                });
            }
        }
        in_expr(&arg.value, offset)
    })
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
