//! In-process feature tests for editing help: completion, signature help, inlay hints,
//! outline and workspace symbols, semantic tokens, code actions and diagnostics.

mod support;

use caloris_lsp::proto::lsp::{
    CodeActionOrCommand, CompletionTextEdit, DiagnosticSeverity, InlayHintLabel, ParameterLabel,
    Position, Range,
};
use caloris_lsp::settings::Settings;
use caloris_lsp::snapshot::Snapshot;
use caloris_lsp::{
    code_actions, completion, diagnostics, inlay_hints, semantic_tokens, signature_help, symbols,
};
use std::sync::Arc;
use support::fixture::*;

/// Labels (and details) offered at the marker.
fn complete(src: &str) -> String {
    let (snap, pos) = analyse(src);
    let items = completion::completion(&snap, pos);
    let mut out = String::new();
    if let Some(CompletionTextEdit::Edit(e)) = items.first().and_then(|i| i.text_edit.clone()) {
        out.push_str(&format!("replaces {}\n", range_text(snap.text(), e.range)));
    }
    for i in &items {
        let insert = match &i.text_edit {
            Some(CompletionTextEdit::Edit(e)) => e.new_text.clone(),
            _ => String::new(),
        };
        out.push_str(&format!(
            "{:<16} {:<18} {}\n",
            i.label,
            format!("{insert:?}"),
            i.detail.clone().unwrap_or_default()
        ));
    }
    out
}

#[test]
fn completion_offers_keywords_at_the_start_of_a_line() {
    insta::assert_snapshot!(complete(&format!("{CABIN}li$0")));
}

#[test]
fn completion_offers_nodes_then_kinds_in_a_link() {
    insta::assert_snapshot!("ends", complete(&format!("{CABIN}link door: room to $0")));
    insta::assert_snapshot!(
        "kinds",
        complete(&format!("{CABIN}link door: room to outdoor $0"))
    );
}

#[test]
fn completion_offers_the_arguments_not_yet_given_and_materials_first() {
    insta::assert_snapshot!(
        "first",
        complete(&format!("{CABIN}link door: room to outdoor layer($0"))
    );
    insta::assert_snapshot!(
        "rest",
        complete(&format!(
            "{CABIN}link door: room to outdoor layer(spruce, thickness = 40 mm, $0"
        ))
    );
    insta::assert_snapshot!(
        "buildup",
        complete(&format!("{CABIN}link door: room to outdoor timber_wall($0"))
    );
}

#[test]
fn completion_offers_units_of_the_expected_dimension() {
    insta::assert_snapshot!(
        "unit_for_thickness",
        complete(&format!(
            "{CABIN}link door: room to outdoor layer(spruce, thickness = 40 $0"
        ))
    );
    insta::assert_snapshot!(
        "unit_after_degree",
        complete(&format!("{CABIN}node porch (fixed = 4 °$0"))
    );
    // Inside a compound unit every spelling fits, and only the atom is replaced.
    let c = complete(&format!("{CABIN}material cork (k = 0.04 W/(m*$0"));
    assert!(c.starts_with("replaces 24:30-24:30 ``"), "{c}");
    assert!(c.contains("\nK ") && c.contains("\n°F "), "{c}");
}

#[test]
fn completion_in_expressions_and_limits() {
    insta::assert_snapshot!(
        "expression",
        complete(&format!("{CABIN}param door_area = 2 * $0"))
    );
    insta::assert_snapshot!("measure", complete(&format!("{CABIN}limit warm: $0")));
    let subjects = complete(&format!("{CABIN}limit warm: temperature($0"));
    assert!(
        subjects.contains("\nnorth.inside ") && subjects.contains("\nroom "),
        "{subjects}"
    );
    let links = complete(&format!("{CABIN}limit loss: heat_flow($0"));
    assert!(
        links.contains("\nroof ") && !links.contains("\nroom "),
        "{links}"
    );
    assert_eq!(complete(&format!("{CABIN}# a comment $0")), "");
}

#[test]
fn signature_help_marks_the_argument_under_the_cursor() {
    let show = |src: &str| {
        let (snap, pos) = analyse(src);
        let Some(h) = signature_help::signature_help(&snap, pos) else {
            return "(none)".to_string();
        };
        let sig = &h.signatures[0];
        let active = h
            .active_parameter
            .and_then(|a| sig.parameters.as_ref()?.get(a as usize).cloned());
        let active = match active.map(|p| p.label) {
            Some(ParameterLabel::LabelOffsets([s, e])) => sig
                .label
                .encode_utf16()
                .skip(s as usize)
                .take((e - s) as usize)
                .collect::<Vec<u16>>(),
            _ => Vec::new(),
        };
        format!(
            "{} [active: {}]",
            sig.label,
            String::from_utf16_lossy(&active)
        )
    };
    insta::assert_snapshot!(format!(
        "{}\n{}\n{}\n{}\n{}",
        show(&format!("{CABIN}link door: room to outdoor layer($0")),
        show(&format!(
            "{CABIN}link door: room to outdoor layer(spruce, thickness = 4$0"
        )),
        show(&format!(
            "{CABIN}link door: room to outdoor film(h = 8 W/(m^2*K), $0"
        )),
        show(&cabin_at("wood_fibre, thickness = 140", 0)),
        show(&format!("{CABIN}node porch ($0")),
    ));
}

/// The model with each hint written in where it appears, as `⟦label⟧`.
fn with_hints(snap: &Snapshot, range: Range) -> String {
    let hints = inlay_hints::inlay_hints(snap, range, &Settings::default());
    let mut lines: Vec<String> = snap.text().split('\n').map(str::to_string).collect();
    for h in hints.iter().rev() {
        let InlayHintLabel::String(label) = &h.label else {
            panic!("string labels")
        };
        let line = &mut lines[h.position.line as usize];
        // Convert the UTF-16 column back to bytes independently of the server.
        let mut units = 0;
        let mut at = line.len();
        for (i, c) in line.char_indices() {
            if units >= h.position.character {
                at = i;
                break;
            }
            units += c.len_utf16() as u32;
        }
        line.insert_str(at, &format!(" ⟦{label}⟧"));
    }
    lines.join("\n")
}

fn everything() -> Range {
    Range {
        start: Position {
            line: 0,
            character: 0,
        },
        end: Position {
            line: 999,
            character: 0,
        },
    }
}

#[test]
fn inlay_hints_show_temperatures_flows_and_limit_margins() {
    let (snap, _) = analyse(&format!("$0{CABIN}"));
    insta::assert_snapshot!(with_hints(&snap, everything()));
}

#[test]
fn inlay_hints_only_in_the_requested_range_and_only_when_solved() {
    let (snap, _) = analyse(&format!("$0{CABIN}"));
    let links = Range {
        start: Position {
            line: 17,
            character: 0,
        },
        end: Position {
            line: 19,
            character: 0,
        },
    };
    assert_eq!(
        inlay_hints::inlay_hints(&snap, links, &Settings::default()).len(),
        2
    );
    let checked = Snapshot::analyze(uri(MODEL_PATH), 1, CABIN, &loader(), true);
    assert!(inlay_hints::inlay_hints(&checked, everything(), &Settings::default()).is_empty());
}

#[test]
fn a_failing_limit_shows_by_how_much() {
    let (snap, _) = analyse(&format!("$0{}", CABIN.replace(">= 18 °C", ">= 21 °C")));
    let text = with_hints(&snap, everything());
    let line = text
        .lines()
        .find(|l| l.starts_with("limit comfort"))
        .expect("limit line");
    insta::assert_snapshot!(line);
}

#[test]
fn document_symbols_outline_the_model() {
    let (snap, _) = analyse(&format!("$0{CABIN}"));
    insta::assert_snapshot!(outline(&symbols::document_symbols(
        &snap,
        &Settings::default()
    )));
}

#[test]
fn workspace_symbols_match_fuzzily_across_documents() {
    let (snap, _) = analyse(&format!("$0{CABIN}"));
    let lib = Snapshot::analyze(uri(LIB_PATH), 1, MATERIALS, &loader(), true);
    let snaps = vec![Arc::new(snap), Arc::new(lib)];
    let found: Vec<String> = ["wf", "oo"]
        .iter()
        .flat_map(|q| symbols::workspace_symbols(&snaps, q))
        .map(|s| {
            let file = match &s.location {
                caloris_lsp::proto::lsp::OneOf::Left(l) => l.uri.as_str().to_string(),
                caloris_lsp::proto::lsp::OneOf::Right(w) => w.uri.as_str().to_string(),
            };
            format!("{:?} {} {file}", s.kind, s.name)
        })
        .collect();
    insta::assert_snapshot!(found.join("\n"));
}

#[test]
fn semantic_tokens_cover_the_line_with_utf16_columns() {
    let (snap, _) = analyse(&format!("$0{CABIN}"));
    let tokens = semantic_tokens::semantic_tokens(&snap);
    let (mut line, mut col) = (0u32, 0u32);
    let mut out = String::new();
    let lines: Vec<&str> = snap.text().split('\n').collect();
    for t in &tokens.data {
        line += t.delta_line;
        col = if t.delta_line == 0 {
            col + t.delta_start
        } else {
            t.delta_start
        };
        let units: Vec<u16> = lines[line as usize].encode_utf16().collect();
        let text = String::from_utf16_lossy(&units[col as usize..(col + t.length) as usize]);
        let ty = semantic_tokens::TYPES[t.token_type as usize].as_str();
        if (19..=20).contains(&line) || line == 8 {
            out.push_str(&format!(
                "{}:{} {ty}/{} `{text}`\n",
                line + 1,
                col + 1,
                t.token_modifiers_bitset
            ));
        }
    }
    insta::assert_snapshot!(out);
}

/// Thousands of tokens on one line, with characters of one and two UTF-16 units before and
/// among them: every token's position is the one the line index gives for it alone (the
/// tokens are counted along the line, so a long line is not walked once per token).
#[test]
fn semantic_tokens_on_a_long_line_match_the_line_index() {
    let terms: Vec<String> = (0..1000)
        .map(|i| {
            if i % 7 == 0 {
                format!("{i} °C")
            } else {
                format!("{i} K")
            }
        })
        .collect();
    let src = format!(
        "$0# façade 😀 test\nparam sum_😀 = {}\n  node café (fixed = 20 °C) # ok\n",
        terms.join(" + ")
    );
    let (snap, _) = analyse(&src);
    let tokens = semantic_tokens::semantic_tokens(&snap);
    let lines = snap.lines(caloris_compiler::span::FileId(0));
    let expected: Vec<(u32, u32, u32)> =
        caloris_compiler::query::highlights(&snap.analysis, caloris_compiler::span::FileId(0))
            .iter()
            .map(|h| {
                let a = lines.line_col_utf16(h.span.start);
                let b = lines.line_col_utf16(h.span.end);
                (a.line, a.col, b.col - a.col)
            })
            .filter(|&(_, _, len)| len > 0)
            .collect();
    let (mut line, mut col) = (0u32, 0u32);
    let got: Vec<(u32, u32, u32)> = tokens
        .data
        .iter()
        .map(|t| {
            line += t.delta_line;
            col = if t.delta_line == 0 {
                col + t.delta_start
            } else {
                t.delta_start
            };
            (line, col, t.length)
        })
        .collect();
    assert!(got.len() > 2000, "{} tokens", got.len());
    assert_eq!(got, expected);
}

fn actions_at(src: &str) -> String {
    let (snap, pos) = analyse(src);
    let range = Range {
        start: pos,
        end: pos,
    };
    let mut out = String::new();
    for a in code_actions::code_actions(&snap, range) {
        let CodeActionOrCommand::CodeAction(a) = a else {
            continue;
        };
        let edit = a
            .edit
            .as_ref()
            .and_then(|e| e.changes.as_ref())
            .and_then(|c| c.values().next())
            .and_then(|v| v.first())
            .cloned();
        let edit = edit
            .map(|e| format!("{} -> {:?}", range_text(snap.text(), e.range), e.new_text))
            .unwrap_or_default();
        let fixes = a.diagnostics.map(|d| d.len()).unwrap_or(0);
        out.push_str(&format!(
            "{:?} {} | {edit} | diagnostics: {fixes}\n",
            a.kind.map(|k| k.as_str().to_string()),
            a.title
        ));
    }
    out
}

#[test]
fn code_actions_apply_did_you_mean_fixes() {
    let src = cabin_at("wood_fibre, thickness = 200", 0).replace(
        "$0wood_fibre, thickness = 200",
        "$0wood_fiber, thickness = 200",
    );
    insta::assert_snapshot!(actions_at(&src));
}

#[test]
fn code_actions_convert_a_literal_to_other_units() {
    insta::assert_snapshot!("convert_length", actions_at(&cabin_at("140 mm", 0)));
    insta::assert_snapshot!("convert_temperature", actions_at(&cabin_at("-8 °C", 0)));
}

#[test]
fn diagnostics_carry_code_help_and_related_locations() {
    let src = format!("$0{CABIN}node room (fixed = 20 °C)\n");
    let (snap, _) = analyse(&src);
    let diags = diagnostics::to_lsp(&snap);
    let text = snap.text();
    let mut out = String::new();
    for d in &diags {
        out.push_str(&format!(
            "{:?} {:?} {} {}\n",
            d.severity,
            d.code,
            range_text(text, d.range),
            d.message
        ));
        for r in d.related_information.iter().flatten() {
            out.push_str(&format!(
                "  related {} {}\n",
                location(&r.location, text),
                r.message
            ));
        }
    }
    insta::assert_snapshot!(out);
    assert_eq!(diags[0].severity, Some(DiagnosticSeverity::ERROR));
}

#[test]
fn a_problem_in_an_imported_file_is_shown_at_the_import() {
    let mut open = std::collections::HashMap::new();
    open.insert(
        std::path::PathBuf::from(LIB_PATH),
        Arc::<str>::from("material wood_fibre (k = 0.040 W/(m*K)\n"),
    );
    let loader = caloris_lsp::loader::DocLoader {
        open: Arc::new(open),
    };
    let snap = Snapshot::analyze(uri(MODEL_PATH), 1, CABIN, &loader, true);
    let diags = diagnostics::to_lsp(&snap);
    let d = diags
        .iter()
        .find(|d| d.message.starts_with("in imported file"))
        .expect("import diagnostic");
    assert_eq!(range_text(CABIN, d.range), "3:8-3:24 `\"materials.heat\"`");
    let related = d.related_information.as_ref().expect("related");
    assert!(
        related[0].location.uri.as_str().ends_with("materials.heat"),
        "{related:?}"
    );
    let missing = Snapshot::analyze(
        uri(MODEL_PATH),
        1,
        &CABIN.replace("materials.heat", "nowhere.heat"),
        &caloris_lsp::loader::DocLoader::default(),
        true,
    );
    let d = diagnostics::to_lsp(&missing);
    assert_eq!(
        d[0].code,
        Some(caloris_lsp::proto::lsp::NumberOrString::String(
            "E601".into()
        ))
    );
}

#[test]
fn formatting_returns_the_canonical_layout_as_one_edit_and_refuses_broken_text() {
    let messy = "# cabin\nnode   room(fixed=20 °C)   # inside\n\n\n\nnode outdoor (fixed = -8 °C)\nlink w : room to outdoor resistance( 0.5 K/W )\n";
    let (snap, _) = analyse(&format!("$0{messy}"));
    let edits = caloris_lsp::formatting::format_document(&snap).expect("formatted");
    assert_eq!(edits.len(), 1);
    // The edit covers the whole document (last line is empty after the final newline).
    assert_eq!(edits[0].range.start, Position::new(0, 0));
    assert_eq!(edits[0].range.end, Position::new(7, 0));
    let expected = caloris_compiler::format::format_source(messy).expect("formats");
    assert_eq!(edits[0].new_text, expected);
    assert!(expected.contains("# inside") && !expected.contains("\n\n\n"));
    // Already canonical: no edits.
    let (snap, _) = analyse(&format!("$0{expected}"));
    assert_eq!(
        caloris_lsp::formatting::format_document(&snap),
        Some(Vec::new())
    );
    // Syntax errors: nothing is touched.
    let (snap, _) = analyse("$0node room (fixed = 20 °C\nlink");
    assert_eq!(caloris_lsp::formatting::format_document(&snap), None);
}
