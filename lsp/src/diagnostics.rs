//! Compiler diagnostics as protocol diagnostics: secondary labels become related information,
//! the help text follows the message, and a problem inside an imported file is shown at the
//! `import` that brings it in (with the place itself as related information).

use crate::loader::resolve;
use crate::proto::lsp;
use crate::snapshot::Snapshot;
use caloris_compiler::span::{FileId, Span};
use caloris_compiler::syntax::ItemKind;
use caloris_compiler::{Diagnostic, Severity};
use lsp::{DiagnosticRelatedInformation, DiagnosticSeverity, NumberOrString};
use std::collections::HashMap;

/// Every diagnostic of the snapshot, for the document.
pub fn to_lsp(snap: &Snapshot) -> Vec<lsp::Diagnostic> {
    let sites = import_sites(snap);
    snap.analysis
        .diagnostics
        .iter()
        .filter_map(|d| convert(snap, d, &sites))
        .collect()
}

fn convert(
    snap: &Snapshot,
    d: &Diagnostic,
    sites: &HashMap<FileId, Span>,
) -> Option<lsp::Diagnostic> {
    let mut message = d.message.clone();
    let mut related: Vec<DiagnosticRelatedInformation> = Vec::new();
    let file = d.primary.span.file;
    let range = if file == FileId(0) {
        snap.range(d.primary.span)
    } else {
        let site = sites.get(&file)?;
        message = format!(
            "in imported file `{}`: {message}",
            snap.analysis.sources.name(file)
        );
        let here = if d.primary.message.is_empty() {
            "here".to_string()
        } else {
            d.primary.message.clone()
        };
        related.extend(snap.location(d.primary.span).map(|location| {
            DiagnosticRelatedInformation {
                location,
                message: here,
            }
        }));
        snap.range(*site)
    };
    if let Some(help) = &d.help {
        message.push_str("\nhelp: ");
        message.push_str(help);
    }
    for l in &d.secondary {
        if let Some(location) = snap.location(l.span) {
            related.push(DiagnosticRelatedInformation {
                location,
                message: l.message.clone(),
            });
        }
    }
    Some(lsp::Diagnostic {
        range,
        severity: Some(match d.severity {
            Severity::Error => DiagnosticSeverity::ERROR,
            Severity::Warning => DiagnosticSeverity::WARNING,
            Severity::Note => DiagnosticSeverity::INFORMATION,
        }),
        code: Some(NumberOrString::String(d.code.to_string())),
        source: Some("caloris".to_string()),
        message,
        related_information: (!related.is_empty()).then_some(related),
        ..lsp::Diagnostic::default()
    })
}

/// For each imported file, the `import` in the document through which it was reached.
fn import_sites(snap: &Snapshot) -> HashMap<FileId, Span> {
    let a = &snap.analysis;
    let mut parent: HashMap<FileId, (FileId, Span)> = HashMap::new();
    for (id, module) in &a.modules {
        for item in &module.items {
            let ItemKind::Import { path, path_span } = &item.kind else {
                continue;
            };
            let Some(target) = resolve(a.sources.name(*id), path) else {
                continue;
            };
            if let Some(child) = a.sources.find(&target.display().to_string()) {
                parent.entry(child).or_insert((*id, *path_span));
            }
        }
    }
    let mut out = HashMap::new();
    for &child in parent.keys() {
        let mut at = child;
        // Climb to the document; the bound guards against a malformed chain.
        for _ in 0..a.sources.len() {
            match parent.get(&at) {
                Some(&(FileId(0), span)) => {
                    out.insert(child, span);
                    break;
                }
                Some(&(up, _)) => at = up,
                None => break,
            }
        }
    }
    out
}
