//! The edits a rename makes: the declaration, every use, and the generated names that contain
//! the renamed name (`north.inside` when the link `north` or the element `inside` is renamed).

use crate::analysis::Analysis;
use crate::lexer::{lex, Tok};
use crate::span::{FileId, Span};
use crate::symbols::{Symbol, SymbolKind};
use crate::syntax::ItemKind;

/// Whether `new_name` can replace the name of `symbol`; the error says why not.
pub fn check_new_name(a: &Analysis, symbol: &Symbol, new_name: &str) -> Result<(), String> {
    let tokens = lex(new_name, FileId(0));
    let single_ident = tokens.len() == 1
        && tokens[0].kind == Tok::Ident
        && tokens[0].span.len() as usize == new_name.len();
    if !single_ident || new_name.contains('.') {
        return Err(format!(
            "`{new_name}` is not a name: use letters, digits and `_`, not starting with a digit, and not a keyword"
        ));
    }
    match symbol.kind {
        SymbolKind::GeneratedNode => {
            return Err(format!(
                "`{}` is made by a build-up: rename the link or the build-up element instead",
                symbol.name
            ))
        }
        SymbolKind::BuildupElement => {
            let clash = a.symbols.symbols.iter().any(|s| {
                s.kind == SymbolKind::BuildupElement
                    && s.parent == symbol.parent
                    && s.name == new_name
            });
            if clash {
                return Err(format!(
                    "the build-up already has an element named `{new_name}`"
                ));
            }
        }
        _ => {
            if let Some(other) = a.symbols.get(new_name) {
                return Err(format!(
                    "`{new_name}` is already declared as {}",
                    other.kind.article()
                ));
            }
        }
    }
    Ok(())
}

/// The spans to replace and their new text when `symbol` is renamed to `new_name`, over every
/// file of the analysis.
pub fn rename_edits(a: &Analysis, symbol: &Symbol, new_name: &str) -> Vec<(Span, String)> {
    let mut edits: Vec<(Span, String)> = Vec::new();
    if symbol.kind == SymbolKind::GeneratedNode {
        return edits;
    }
    edits.push((symbol.def, new_name.to_string()));
    edits.extend(symbol.refs.iter().map(|r| (*r, new_name.to_string())));
    match symbol.kind {
        SymbolKind::Link => {
            // `north.inside` starts with the link's name.
            let old = symbol.name.len() as u32;
            for g in generated(a, |g| g.parent.as_deref() == Some(symbol.name.as_str())) {
                edits.extend(g.refs.iter().map(|r| {
                    (
                        Span {
                            end: r.start + old,
                            ..*r
                        },
                        new_name.to_string(),
                    )
                }));
            }
        }
        SymbolKind::BuildupElement => {
            let Some(buildup) = symbol.parent.as_deref() else {
                return edits;
            };
            // Every link that uses the build-up has a face named `link.element`.
            let users: Vec<String> = a
                .modules
                .iter()
                .flat_map(|(_, m)| m.items.iter())
                .filter_map(|i| match &i.kind {
                    ItemKind::Link { name, element, .. } if element.kind.name == buildup => {
                        Some(format!("{}.{}", name.name, symbol.name))
                    }
                    _ => None,
                })
                .collect();
            let old = symbol.name.len() as u32;
            for g in generated(a, |g| users.contains(&g.name)) {
                edits.extend(g.refs.iter().map(|r| {
                    (
                        Span {
                            start: r.end - old,
                            ..*r
                        },
                        new_name.to_string(),
                    )
                }));
            }
        }
        _ => {}
    }
    edits.sort_by_key(|e| (e.0.file, e.0.start));
    edits.dedup();
    edits
}

fn generated<'a>(
    a: &'a Analysis,
    keep: impl Fn(&Symbol) -> bool + 'a,
) -> impl Iterator<Item = &'a Symbol> + 'a {
    a.symbols
        .symbols
        .iter()
        .filter(move |s| s.kind == SymbolKind::GeneratedNode && keep(s))
}
