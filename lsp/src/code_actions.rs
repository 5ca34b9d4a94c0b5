//! Code actions: the mechanical fixes diagnostics carry ("did you mean", unit spellings), and
//! "convert unit" on a quantity literal.

use crate::diagnostics;
use crate::proto::lsp;
use crate::snapshot::Snapshot;
use caloris_compiler::query::{target_at, unit_conversions, Target};
use caloris_compiler::span::FileId;
use lsp::{CodeAction, CodeActionKind, CodeActionOrCommand, Range, TextEdit, WorkspaceEdit};
use std::collections::HashMap;

fn edit(snap: &Snapshot, range: Range, text: String) -> WorkspaceEdit {
    let changes = HashMap::from([(
        snap.uri.clone(),
        vec![TextEdit {
            range,
            new_text: text,
        }],
    )]);
    WorkspaceEdit {
        changes: Some(changes),
        ..WorkspaceEdit::default()
    }
}

pub fn code_actions(snap: &Snapshot, range: Range) -> Vec<CodeActionOrCommand> {
    let mut out = Vec::new();
    let lsp_diags = diagnostics::to_lsp(snap);
    for d in &snap.analysis.diagnostics {
        let Some(fix) = &d.fix else { continue };
        if d.primary.span.file != FileId(0) || fix.span.file != FileId(0) {
            continue;
        }
        let at = snap.range(d.primary.span);
        if !crate::proto::touches(at, range) {
            continue;
        }
        let matching = lsp_diags
            .iter()
            .filter(|l| l.range == at && l.message.starts_with(&d.message))
            .cloned()
            .collect::<Vec<_>>();
        out.push(CodeActionOrCommand::CodeAction(CodeAction {
            title: fix.title.clone(),
            kind: Some(CodeActionKind::QUICKFIX),
            diagnostics: Some(matching),
            edit: Some(edit(snap, snap.range(fix.span), fix.replacement.clone())),
            is_preferred: Some(true),
            ..CodeAction::default()
        }));
    }
    let offset = snap.offset(range.start);
    if let Some(Target::Literal {
        span,
        value,
        unit: Some(unit),
        ..
    }) = target_at(&snap.analysis, FileId(0), offset)
    {
        for c in unit_conversions(value, unit) {
            out.push(CodeActionOrCommand::CodeAction(CodeAction {
                title: format!("Convert to {}: {}", c.unit, c.text),
                kind: Some(CodeActionKind::REFACTOR_REWRITE),
                edit: Some(edit(snap, snap.range(span), c.text)),
                ..CodeAction::default()
            }));
        }
    }
    out
}
