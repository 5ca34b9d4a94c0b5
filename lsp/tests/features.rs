//! In-process feature tests: hover, definition, references and rename on the cabin model, with
//! the cursor given by a `$0` marker. Answers are rendered to text and snapshotted with insta.

mod support;

use caloris_lsp::navigation;
use caloris_lsp::proto::lsp::{HoverContents, PrepareRenameResponse};
use caloris_lsp::settings::{Settings, Units};
use caloris_lsp::{hover, rename};
use support::fixture::*;

fn hover_at(src: &str) -> String {
    hover_with(src, &Settings::default())
}

fn hover_with(src: &str, settings: &Settings) -> String {
    let (snap, pos) = analyse(src);
    assert!(
        !snap.analysis.has_errors(),
        "{:?}",
        snap.analysis.diagnostics
    );
    let Some(h) = hover::hover(&snap, pos, settings) else {
        return "(no hover)".into();
    };
    let HoverContents::Markup(m) = h.contents else {
        panic!("markdown expected")
    };
    let range = h
        .range
        .map(|r| range_text(snap.text(), r))
        .unwrap_or_default();
    format!("range {range}\n\n{}", m.value)
}

#[test]
fn hover_on_a_free_node_shows_temperature_in_both_systems_and_its_balance() {
    insta::assert_snapshot!(hover_at(&cabin_at("room    (load", 0)));
}

#[test]
fn hover_on_a_node_use_follows_the_unit_setting() {
    let us = Settings {
        units: Units::Us,
        ..Settings::default()
    };
    insta::assert_snapshot!(hover_with(&cabin_at("room)", 0), &us));
}

#[test]
fn hover_on_a_boundary_node_shows_the_heat_it_delivers() {
    insta::assert_snapshot!(hover_at(&cabin_at("outdoor (fixed", 0)));
}

#[test]
fn hover_on_a_build_up_face_node() {
    insta::assert_snapshot!(hover_at(&cabin_at("north.inside", 0)));
}

#[test]
fn hover_on_a_layer_link_shows_formula_resistance_and_flow() {
    let text = hover_at(&cabin_at("roof:", 0));
    // Fourier's law for a plane layer: R = L/(k·A) = 0.2 m / (0.04 W/(m·K) × 9 m²) = 0.5556 K/W.
    let r: f64 = 0.2 / (0.04 * 9.0);
    assert!(
        text.contains(&format!("Resistance **{:.4} K/W", r)),
        "{text}"
    );
    insta::assert_snapshot!(text);
}

#[test]
fn hover_on_a_build_up_link_shows_u_value_and_elements() {
    let text = hover_at(&cabin_at("north:", 0));
    // Series resistances per area: Rsi 0.13 + 0.14/0.040 + Rse 0.04 = 3.67 m²K/W (ISO 6946 film
    // values), so U = 1/3.67 = 0.2725 W/(m²·K).
    assert!(text.contains("U-value **0.2725 W/(m²·K)"), "{text}");
    insta::assert_snapshot!(text);
}

#[test]
fn hover_on_literals_gives_si_value_and_dimension() {
    // NIST SP 811: T/K = t/°C + 273.15.
    insta::assert_snapshot!("celsius", hover_at(&cabin_at("8 °C", 0)));
    insta::assert_snapshot!("square_metres", hover_at(&cabin_at("9 m²", 0)));
}

#[test]
fn hover_after_non_ascii_text_on_the_same_line_uses_utf16_columns() {
    // `m²` before the cursor is one UTF-16 unit but two bytes.
    let text = hover_at(&cabin_at("150 mm", 0));
    let line = CABIN
        .lines()
        .find(|l| l.contains("150 mm"))
        .expect("floor line");
    let bytes = line.find("150 mm").expect("literal");
    let units = line[..bytes].encode_utf16().count();
    assert_eq!(bytes, units + 1, "the line has one `²` before the literal");
    let want = format!("range 20:{}-20:{} `150 mm`", units + 1, units + 7);
    assert!(text.starts_with(&want), "{text}");
    assert!(text.contains("**0.15 m**"), "{text}");
}

#[test]
fn hover_on_an_imported_material_shows_its_properties() {
    insta::assert_snapshot!(hover_at(&cabin_at("wood_fibre, thickness = 140", 0)));
}

#[test]
fn hover_on_param_limit_kind_argument_and_measure() {
    insta::assert_snapshot!("param", hover_at(&cabin_at("wall_area)", 0)));
    insta::assert_snapshot!("limit", hover_at(&cabin_at("no_mould", 0)));
    insta::assert_snapshot!("kind", hover_at(&cabin_at("layer(k", 0)));
    insta::assert_snapshot!("argument", hover_at(&cabin_at("thickness = 200", 0)));
    insta::assert_snapshot!("measure", hover_at(&cabin_at("temperature(room", 0)));
    insta::assert_snapshot!("buildup", hover_at(&cabin_at("timber_wall(", 0)));
}

#[test]
fn hover_before_the_solve_says_so() {
    let (text, pos) = cursor(&cabin_at("room)", 0));
    let snap = caloris_lsp::snapshot::Snapshot::analyze(uri(MODEL_PATH), 1, &text, &loader(), true);
    let h = hover::hover(&snap, pos, &Settings::default()).expect("hover");
    let HoverContents::Markup(m) = h.contents else {
        panic!()
    };
    assert!(m.value.contains("_Solving…_"), "{}", m.value);
}

#[test]
fn hover_on_a_model_with_errors_explains_the_missing_values() {
    let src =
        cabin_at("room)", 0).replace("wood_fibre, thickness = 200", "wood_fiber, thickness = 200");
    let (snap, pos) = analyse(&src);
    let h = hover::hover(&snap, pos, &Settings::default()).expect("hover");
    let HoverContents::Markup(m) = h.contents else {
        panic!()
    };
    assert!(
        m.value.contains("Not solved: the model has errors"),
        "{}",
        m.value
    );
}

#[test]
fn definition_goes_to_the_declaration_in_this_or_the_imported_file() {
    let (snap, pos) = analyse(&cabin_at("wall_area)", 0));
    let here = navigation::definition(&snap, pos).expect("definition");
    let (snap2, pos2) = analyse(&cabin_at("wood_fibre, thickness = 200", 0));
    let there = navigation::definition(&snap2, pos2).expect("definition");
    let (snap3, pos3) = analyse(&cabin_at("timber_wall(", 0));
    let buildup = navigation::definition(&snap3, pos3).expect("definition");
    insta::assert_snapshot!(format!(
        "{}\n{}\n{}",
        location(&here, CABIN),
        location(&there, MATERIALS),
        location(&buildup, CABIN)
    ));
}

#[test]
fn references_list_declaration_and_uses() {
    let (snap, pos) = analyse(&cabin_at("room to outdoor layer", 0));
    let sym = navigation::symbol_at(&snap, pos).expect("symbol");
    let key = navigation::key(&snap, sym);
    let refs: Vec<String> = navigation::references(&snap, &key, true)
        .iter()
        .map(|l| location(l, CABIN))
        .collect();
    insta::assert_snapshot!(refs.join("\n"));
    assert_eq!(
        navigation::references(&snap, &key, false).len(),
        refs.len() - 1
    );
}

fn rename_at(src: &str, new_name: &str) -> String {
    let (snap, pos) = analyse(src);
    match rename::rename(&snap, &[], pos, new_name) {
        Ok(Some(edit)) => apply(
            &edit,
            &[("model.heat", CABIN), ("materials.heat", MATERIALS)],
        ),
        Ok(None) => "(nothing to rename)".into(),
        Err(e) => format!("error: {e}"),
    }
}

#[test]
fn rename_a_node_everywhere() {
    insta::assert_snapshot!(rename_at(&cabin_at("room)", 0), "cabin_air"));
}

#[test]
fn rename_a_link_renames_its_face_nodes() {
    insta::assert_snapshot!(rename_at(&cabin_at("north:", 0), "north_wall"));
}

#[test]
fn rename_a_build_up_element_renames_the_faces_named_after_it() {
    insta::assert_snapshot!(rename_at(&cabin_at("inside:", 0), "lining"));
}

#[test]
fn rename_an_imported_material_edits_both_files() {
    insta::assert_snapshot!(rename_at(
        &cabin_at("wood_fibre, thickness = 140", 0),
        "wood_fibre_board"
    ));
}

#[test]
fn rename_refuses_bad_and_taken_names_and_generated_nodes() {
    insta::assert_snapshot!(format!(
        "{}\n{}\n{}\n{}",
        rename_at(&cabin_at("room)", 0), "outdoor"),
        rename_at(&cabin_at("room)", 0), "2nd_room"),
        rename_at(&cabin_at("room)", 0), "node"),
        rename_at(&cabin_at("north.inside", 0), "x"),
    ));
}

#[test]
fn prepare_rename_gives_the_name_under_the_cursor() {
    let (snap, pos) = analyse(&cabin_at("ground  (fixed", 0));
    match rename::prepare(&snap, pos) {
        Ok(Some(PrepareRenameResponse::RangeWithPlaceholder { range, placeholder })) => {
            assert_eq!(placeholder, "ground");
            assert_eq!(range_text(snap.text(), range), "10:6-10:12 `ground`");
        }
        other => panic!("unexpected {other:?}"),
    }
    let (snap, pos) = analyse(&cabin_at("# Garden", 0));
    assert!(matches!(rename::prepare(&snap, pos), Ok(None)));
}
