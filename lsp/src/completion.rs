//! Completion: declaration words at the start of a declaration, names in scope where a name
//! goes, element kinds and build-ups for a link's kind, argument names inside an argument list,
//! materials where a material goes, and unit spellings after a number (those of the expected
//! dimension first). Words and arguments come from the compiler's schema.

use crate::proto::lsp;
use crate::snapshot::Snapshot;
use caloris_compiler::elements;
use caloris_compiler::query::{
    buildup_use_args, completion_context, expected_dim, ArgOwner, CallInfo, CompletionContext, Slot,
};
use caloris_compiler::schema::{self, ArgSpec, ArgType};
use caloris_compiler::symbols::SymbolKind;
use caloris_compiler::units::{parse_unit, unit_spellings, Dim};
use caloris_compiler::Analysis;
use lsp::{
    CompletionItem, CompletionItemKind, CompletionTextEdit, Documentation, Position, Range,
    TextEdit,
};

/// Prefixed and compound spellings offered besides the unit table's own.
const COMMON_UNITS: &[&str] = &[
    "mm",
    "cm",
    "km",
    "kW",
    "MW",
    "mW",
    "kJ",
    "MJ",
    "kg",
    "m^2",
    "cm^2",
    "mm^2",
    "ft^2",
    "in^2",
    "m^3",
    "W/(m*K)",
    "mW/(m*K)",
    "W/(m^2*K)",
    "m^2*K/W",
    "cm^2*K/W",
    "K/W",
    "W/K",
    "W/m^2",
    "kg/m^3",
    "J/(kg*K)",
    "Btu/h",
    "Btu/(h*ft*°F)",
    "Btu/(h*ft^2*°F)",
    "h*ft^2*°F/Btu",
    "h*°F/Btu",
    "Btu/(h*°F)",
    "Btu/(h*ft^2)",
    "lb/ft^3",
    "Btu/(lb*°F)",
];

pub fn completion(snap: &Snapshot, pos: Position) -> Vec<CompletionItem> {
    let ctx = completion_context(snap.text(), snap.offset(pos));
    let range = snap.range(ctx.replace);
    let a = &snap.analysis;
    let names = |kinds: &[SymbolKind]| -> Vec<(String, CompletionItemKind, String)> {
        a.symbols
            .symbols
            .iter()
            .filter(|s| kinds.contains(&s.kind))
            .map(|s| {
                (
                    s.name.clone(),
                    item_kind(s.kind),
                    s.kind.article().trim_start_matches("a ").to_string(),
                )
            })
            .collect()
    };
    let plain = |list: Vec<(String, CompletionItemKind, String)>| {
        list.into_iter()
            .map(|(l, k, d)| item(range, &l, &l, k, &d))
            .collect::<Vec<_>>()
    };
    match &ctx.slot {
        Slot::Keyword => schema::DECLARATIONS
            .iter()
            .map(|d| {
                let mut it = item(
                    range,
                    d.word,
                    &format!("{} ", d.word),
                    CompletionItemKind::KEYWORD,
                    d.doc,
                );
                it.documentation = Some(Documentation::String(format!(
                    "{}\n\ne.g. {}",
                    d.form, d.example
                )));
                it
            })
            .collect(),
        Slot::Node => plain(names(&[SymbolKind::Node, SymbolKind::GeneratedNode])),
        Slot::LinkKind => {
            let mut out = element_kinds(range);
            out.extend(plain(names(&[SymbolKind::Buildup])));
            out
        }
        Slot::ElementKind => element_kinds(range),
        Slot::ArgName => arg_names(snap, &ctx, range),
        Slot::ArgValue => {
            let material = ctx.call.as_ref().is_some_and(|c| wants_material(c, a));
            let choice = ctx.call.as_ref().and_then(|c| current_spec(c, a));
            if let Some(ArgSpec {
                ty: ArgType::Choice(words),
                doc,
                ..
            }) = choice
            {
                // A choice takes one of its words and nothing else.
                words
                    .iter()
                    .map(|w| item(range, w, w, CompletionItemKind::ENUM_MEMBER, doc))
                    .collect()
            } else if material {
                plain(names(&[SymbolKind::Material]))
            } else {
                expression(range, plain(names(&[SymbolKind::Param])))
            }
        }
        Slot::Unit => units(range, &ctx, snap),
        Slot::Measure => schema::MEASURES
            .iter()
            .map(|m| {
                item(
                    range,
                    m.name,
                    &format!("{}(", m.name),
                    CompletionItemKind::FUNCTION,
                    m.doc,
                )
            })
            .collect(),
        Slot::LimitSubject { measure } if measure == "temperature" => {
            plain(names(&[SymbolKind::Node, SymbolKind::GeneratedNode]))
        }
        Slot::LimitSubject { .. } => plain(names(&[SymbolKind::Link])),
        Slot::Expression => expression(range, plain(names(&[SymbolKind::Param]))),
        Slot::Nothing => Vec::new(),
    }
}

fn item(
    range: Range,
    label: &str,
    insert: &str,
    kind: CompletionItemKind,
    detail: &str,
) -> CompletionItem {
    CompletionItem {
        label: label.to_string(),
        kind: Some(kind),
        detail: (!detail.is_empty()).then(|| detail.to_string()),
        filter_text: Some(label.to_string()),
        text_edit: Some(CompletionTextEdit::Edit(TextEdit {
            range,
            new_text: insert.to_string(),
        })),
        ..CompletionItem::default()
    }
}

fn item_kind(k: SymbolKind) -> CompletionItemKind {
    match k {
        SymbolKind::Param => CompletionItemKind::CONSTANT,
        SymbolKind::Material => CompletionItemKind::STRUCT,
        SymbolKind::Node | SymbolKind::GeneratedNode => CompletionItemKind::VARIABLE,
        SymbolKind::Link => CompletionItemKind::FUNCTION,
        SymbolKind::Buildup => CompletionItemKind::CLASS,
        SymbolKind::BuildupElement => CompletionItemKind::FIELD,
        SymbolKind::Limit => CompletionItemKind::VALUE,
        SymbolKind::Schedule => CompletionItemKind::EVENT,
        SymbolKind::Case | SymbolKind::Transient => CompletionItemKind::MODULE,
    }
}

fn element_kinds(range: Range) -> Vec<CompletionItem> {
    elements::ALL
        .iter()
        .map(|k| {
            item(
                range,
                k.name(),
                &format!("{}(", k.name()),
                CompletionItemKind::FUNCTION,
                k.summary(),
            )
        })
        .collect()
}

/// The arguments of the list the cursor is in, from the schema (`case`: none, its arguments
/// are the model's parameters).
pub fn owner_specs(owner: &ArgOwner, a: &Analysis) -> &'static [ArgSpec] {
    match owner {
        ArgOwner::Declaration { word } => {
            schema::declaration(word).map_or(&[][..], |d| d.arg_specs())
        }
        ArgOwner::Element { kind, .. } => match elements::lookup(kind) {
            Some(k) => k.params(),
            None => buildup_use_args(a, kind).unwrap_or(&[]),
        },
    }
}

/// The spec of the argument under the cursor.
fn current_spec(call: &CallInfo, a: &Analysis) -> Option<&'static ArgSpec> {
    let specs = owner_specs(&call.owner, a);
    match &call.arg {
        Some(n) => specs.iter().find(|p| p.name == n),
        None if call.index == 0 && matches!(call.owner, ArgOwner::Element { .. }) => specs.first(),
        None => None,
    }
}

fn wants_material(call: &CallInfo, a: &Analysis) -> bool {
    current_spec(call, a).is_some_and(|p| p.ty == ArgType::Material)
}

fn arg_names(snap: &Snapshot, ctx: &CompletionContext, range: Range) -> Vec<CompletionItem> {
    let Some(call) = &ctx.call else {
        return Vec::new();
    };
    let a = &snap.analysis;
    let given = |n: &str| call.given.iter().any(|g| g == n);
    let field = |name: &str, detail: &str, doc: Option<String>| {
        let mut it = item(
            range,
            name,
            &format!("{name} = "),
            CompletionItemKind::FIELD,
            detail,
        );
        it.documentation = doc.map(Documentation::String);
        it
    };
    let mut out: Vec<CompletionItem> = match &call.owner {
        // A case sets the model's parameters.
        ArgOwner::Declaration { word: "case" } => a
            .symbols
            .names_of(SymbolKind::Param)
            .filter(|p| !given(p))
            .map(|p| field(p, "parameter", None))
            .collect(),
        owner => {
            let supplied: &[&str] = match owner {
                ArgOwner::Element { supplied, .. } => supplied,
                ArgOwner::Declaration { .. } => &[],
            };
            owner_specs(owner, a)
                .iter()
                .filter(|p| !(given(p.name) || supplied.contains(&p.name)))
                .map(|p| field(p.name, p.doc, Some(p.describe())))
                .collect()
        }
    };
    if call.index == 0 && wants_material(call, a) {
        out.extend(
            a.symbols
                .names_of(SymbolKind::Material)
                .map(|m| item(range, m, m, CompletionItemKind::STRUCT, "material")),
        );
    }
    out
}

fn expression(range: Range, mut params: Vec<CompletionItem>) -> Vec<CompletionItem> {
    params.extend(schema::FUNCTIONS.iter().map(|f| {
        item(
            range,
            f.name,
            &format!("{}(", f.name),
            CompletionItemKind::FUNCTION,
            f.doc,
        )
    }));
    params.extend(
        schema::CONSTANTS
            .iter()
            .map(|(c, d)| item(range, c, c, CompletionItemKind::CONSTANT, d)),
    );
    params
}

fn units(range: Range, ctx: &CompletionContext, snap: &Snapshot) -> Vec<CompletionItem> {
    let text = snap.text();
    // Inside a compound unit (`W/(m*`) only single spellings fit.
    let in_compound = text[..ctx.replace.start as usize].ends_with(['*', '/', '^', '(', '·', '⋅']);
    let expected: Option<Dim> = if in_compound {
        None
    } else {
        ctx.call
            .as_ref()
            .and_then(|c| expected_dim(c, &snap.analysis))
    };
    let mut candidates: Vec<(String, String)> = unit_spellings()
        .map(|(s, n)| (s.to_string(), n.to_string()))
        .collect();
    if !in_compound {
        candidates.extend(COMMON_UNITS.iter().map(|s| (s.to_string(), String::new())));
    }
    let mut out = Vec::new();
    for (i, (spelling, name)) in candidates.iter().enumerate() {
        let Ok(unit) = parse_unit(spelling) else {
            continue;
        };
        if expected.is_some_and(|d| d != unit.dim) {
            continue;
        }
        let detail = if name.is_empty() {
            unit.dim.describe()
        } else {
            name.clone()
        };
        let mut it = item(range, spelling, spelling, CompletionItemKind::UNIT, &detail);
        it.sort_text = Some(format!("{i:04}"));
        out.push(it);
    }
    out
}
