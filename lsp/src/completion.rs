//! Completion: keywords at the start of a declaration, names in scope where a name goes,
//! element kinds and build-ups for a link's kind, argument names inside an element call,
//! materials where a material goes, and unit spellings after a number (those of the expected
//! dimension first).

use crate::proto::lsp;
use crate::snapshot::Snapshot;
use caloris_compiler::elements::{self, ArgType};
use caloris_compiler::query::{
    completion_context, expected_dim, ArgOwner, CallInfo, CompletionContext, Slot,
};
use caloris_compiler::schema::MEASURES;
use caloris_compiler::symbols::SymbolKind;
use caloris_compiler::units::{parse_unit, unit_spellings, Dim};
use lsp::{CompletionItem, CompletionItemKind, CompletionTextEdit, Position, Range, TextEdit};

const KEYWORDS: &[(&str, &str)] = &[
    ("title", "the model's title: title \"Garden office wall\""),
    (
        "import",
        "materials, parameters and build-ups of another file: import \"lib/materials.heat\"",
    ),
    ("param", "a named value: param wall_area = 2.4 m * 4 m"),
    (
        "material",
        "a material: material wood_fibre (k = 0.04 W/(m*K))",
    ),
    ("node", "a temperature node: node room (fixed = 20 °C)"),
    (
        "link",
        "heat path between two nodes: link wall: room to outdoor layer(...)",
    ),
    (
        "buildup",
        "layers and films in series, used by links: buildup wall { ... }",
    ),
    (
        "limit",
        "a design limit: limit touch: temperature(case) < 60 °C",
    ),
];

const FUNCTIONS: &[(&str, &str)] = &[
    ("sqrt", "square root"),
    ("ln", "natural logarithm (dimensionless)"),
    ("exp", "exponential (dimensionless)"),
    ("abs", "absolute value"),
    ("min", "smaller of two values"),
    ("max", "larger of two values"),
    ("pi", "π"),
];

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
        Slot::Keyword => KEYWORDS
            .iter()
            .map(|(k, d)| item(range, k, &format!("{k} "), CompletionItemKind::KEYWORD, d))
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
            let material = ctx.call.as_ref().is_some_and(wants_material);
            if material {
                plain(names(&[SymbolKind::Material]))
            } else {
                expression(range, plain(names(&[SymbolKind::Param])))
            }
        }
        Slot::Unit => units(range, &ctx, snap),
        Slot::Measure => MEASURES
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

fn wants_material(call: &CallInfo) -> bool {
    let ArgOwner::Element { kind, .. } = &call.owner else {
        return false;
    };
    let Some(params) = elements::lookup(kind).map(|k| k.params()) else {
        return false;
    };
    let spec = match &call.arg {
        Some(n) => params.iter().find(|p| p.name == n),
        None if call.index == 0 => params.first(),
        None => None,
    };
    spec.is_some_and(|p| p.ty == ArgType::Material)
}

fn arg_names(snap: &Snapshot, ctx: &CompletionContext, range: Range) -> Vec<CompletionItem> {
    let Some(call) = &ctx.call else {
        return Vec::new();
    };
    let field = |name: &str, doc: &str| {
        item(
            range,
            name,
            &format!("{name} = "),
            CompletionItemKind::FIELD,
            doc,
        )
    };
    let given = |n: &str| call.given.iter().any(|g| g == n);
    let mut out: Vec<CompletionItem> = match &call.owner {
        ArgOwner::Node => [
            ("fixed", "boundary temperature: fixed = 20 °C"),
            ("load", "heat put into the node: load = 3 W"),
        ]
        .iter()
        .filter(|(n, _)| !given(n))
        .map(|(n, d)| field(n, d))
        .collect(),
        ArgOwner::Material => [
            ("k", "thermal conductivity: k = 0.04 W/(m*K)"),
            ("density", "density: density = 2300 kg/m^3"),
            (
                "specific_heat",
                "specific heat capacity: specific_heat = 1000 J/(kg*K)",
            ),
        ]
        .iter()
        .filter(|(n, _)| !given(n))
        .map(|(n, d)| field(n, d))
        .collect(),
        ArgOwner::Element { kind, in_buildup } => {
            let is_buildup = snap
                .analysis
                .symbols
                .get(kind)
                .is_some_and(|s| s.kind == SymbolKind::Buildup);
            if is_buildup {
                if given("area") {
                    Vec::new()
                } else {
                    vec![field("area", "the area the build-up covers")]
                }
            } else if let Some(k) = elements::lookup(kind) {
                k.params()
                    .iter()
                    .filter(|p| !(given(p.name) || (*in_buildup && p.name == "area")))
                    .map(|p| field(p.name, p.doc))
                    .collect()
            } else {
                Vec::new()
            }
        }
    };
    if call.index == 0 && wants_material(call) {
        out.extend(
            snap.analysis
                .symbols
                .names_of(SymbolKind::Material)
                .map(|m| item(range, m, m, CompletionItemKind::STRUCT, "material")),
        );
    }
    out
}

fn expression(range: Range, mut params: Vec<CompletionItem>) -> Vec<CompletionItem> {
    params.extend(FUNCTIONS.iter().map(|(f, d)| {
        let insert = if *f == "pi" {
            f.to_string()
        } else {
            format!("{f}(")
        };
        item(range, f, &insert, CompletionItemKind::FUNCTION, d)
    }));
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
