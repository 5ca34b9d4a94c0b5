//! The language server on the newer declarations: a radiation link (resistance at the solved
//! temperatures), a fin's figures, a 2-D region, a sub-network with its uses, a repetition, and
//! the outline of all of them.

mod support;

use caloris_lsp::proto::lsp::{HoverContents, InlayHintLabel};
use caloris_lsp::settings::Settings;
use caloris_lsp::snapshot::Snapshot;
use caloris_lsp::{hover, inlay_hints, navigation, symbols};
use support::fixture::*;

/// A potting shed with a wood stove (demo values).
const SHED: &str = "# Potting shed with a wood stove (demo values)
title \"Potting shed\"
param pane = 0.5 m^2
material steel (k = 50 W/(m*K))

node stove    (fixed = 250 °C)
node shed_air (fixed = 15 °C)
node yard     (fixed = 2 °C)
node panel

link glow:  stove to panel radiation(emissivity = 0.9, area = pane)
link skin:  panel to shed_air film(h = 8 W/(m^2*K), area = pane)
link spine: stove to shed_air fin(steel, length = 40 mm, thickness = 2 mm, width = 100 mm, h = 8 W/(m^2*K))

region plate (steel, thickness = 2 mm, width = 100 mm, height = 60 mm, cells_x = 4, cells_y = 3) {
  left:  stove
  front: shed_air film(h = 10 W/(m^2*K))
}

network wall (inside, outside) {
  param area = 4 m^2
  node surface
  link inner: inside to surface film(h = 8 W/(m^2*K), area = area)
  link board: surface to outside resistance(0.5 K/W)
}
use north_wall: wall(inside = shed_air, outside = yard)
use south_wall: wall(inside = shed_air, outside = yard, area = 6 m^2)

repeat rib (count = 3, first = stove) {
  node t
  link along: previous.t to t layer(steel, thickness = 10 mm, area = 20 mm^2)
  link cool:  t to shed_air film(h = 8 W/(m^2*K), area = 0.002 m^2)
}

schedule evening {
  0 h: 15 °C
  4 h: 10 °C
}
case cold (pane = 0.4 m^2)
";

fn at(needle: &str, nth: usize) -> String {
    let i = SHED
        .match_indices(needle)
        .nth(nth)
        .unwrap_or_else(|| panic!("`{needle}` #{nth}"))
        .0;
    format!("{}$0{}", &SHED[..i], &SHED[i..])
}

fn solved(src: &str) -> (Snapshot, caloris_lsp::proto::lsp::Position) {
    let (snap, pos) = analyse(src);
    assert!(
        !snap.analysis.has_errors() && snap.solved(),
        "{:#?}",
        snap.analysis.diagnostics
    );
    (snap, pos)
}

fn hover_at(needle: &str, nth: usize) -> String {
    let (snap, pos) = solved(&at(needle, nth));
    let h = hover::hover(&snap, pos, &Settings::default()).expect("hover");
    let HoverContents::Markup(m) = h.contents else {
        panic!("markdown expected")
    };
    m.value
}

#[test]
fn radiation_link_shows_its_resistance_at_the_solved_temperatures() {
    let text = hover_at("glow:", 0);
    assert!(
        text.contains("at the solved temperatures (radiation is nonlinear)"),
        "{text}"
    );
    assert!(!text.contains("NaN"), "{text}");
    // Stefan–Boltzmann law for a grey surface of emissivity ε facing large surroundings:
    // Q = σ·ε·A·(T₁⁴ − T₂⁴), σ = 5.670374419e-8 W/(m²·K⁴) (CODATA 2018); R = ΔT/Q.
    let (snap, _) = solved(&at("glow:", 0));
    let net = &snap.analysis.network;
    let t = &snap
        .analysis
        .solution
        .as_ref()
        .expect("solved")
        .temperatures;
    let (t1, t2) = (
        t[net.node_id("stove").expect("stove")],
        t[net.node_id("panel").expect("panel")],
    );
    let q = 5.670374419e-8 * 0.9 * 0.5 * (t1.powi(4) - t2.powi(4));
    let r = (t1 - t2) / q;
    let shown: f64 = text
        .split("Resistance **")
        .nth(1)
        .and_then(|s| s.split_whitespace().next())
        .and_then(|s| s.parse().ok())
        .expect("resistance number");
    assert!(
        (shown - r).abs() / r < 1e-3,
        "shown {shown} K/W, law {r} K/W"
    );
    insta::assert_snapshot!(text);
}

#[test]
fn fin_link_lists_its_figures() {
    let text = hover_at("spine:", 0);
    assert!(text.contains("Figures:"), "{text}");
    insta::assert_snapshot!(text);
}

#[test]
fn region_hover_gives_size_cells_and_temperature_range() {
    let text = hover_at("plate (", 0);
    assert!(text.contains("4 × 3 = 12 cells"), "{text}");
    insta::assert_snapshot!(text);
}

#[test]
fn network_names_navigate_between_declaration_and_uses() {
    let (snap, pos) = solved(&at("wall(inside", 1));
    let def = navigation::definition(&snap, pos).expect("definition");
    assert_eq!(location(&def, SHED), "model.heat:20:9 `wall`");
    let refs = navigation::network_references(&snap, pos, true).expect("references");
    let shown: Vec<String> = refs.iter().map(|l| location(l, SHED)).collect();
    insta::assert_snapshot!(shown.join("\n"));
    let (snap, pos) = solved(&at("wall (inside", 0));
    let text = match hover::hover(&snap, pos, &Settings::default()).map(|h| h.contents) {
        Some(HoverContents::Markup(m)) => m.value,
        _ => panic!("hover on the network name"),
    };
    assert!(text.contains("Used 2 times"), "{text}");
}

#[test]
fn outline_has_repetitions_networks_uses_regions_and_studies() {
    let (snap, _) = solved(&format!("$0{SHED}"));
    insta::assert_snapshot!(outline(&symbols::document_symbols(
        &snap,
        &Settings::default()
    )));
}

#[test]
fn inlay_hints_label_nonlinear_resistance_and_region_range() {
    let (snap, _) = solved(&format!("$0{SHED}"));
    let everything = caloris_lsp::proto::lsp::Range {
        start: Default::default(),
        end: caloris_lsp::proto::lsp::Position {
            line: 999,
            character: 0,
        },
    };
    let labels: Vec<String> = inlay_hints::inlay_hints(&snap, everything, &Settings::default())
        .into_iter()
        .map(|h| match h.label {
            InlayHintLabel::String(s) => format!("{}: {s}", h.position.line + 1),
            _ => panic!("string labels"),
        })
        .collect();
    insta::assert_snapshot!(labels.join("\n"));
}

/// Greenhouse bays along a path (demo values): a build-up declared inside a repetition, so its
/// faces get names with dots before the link's own (`bay.2.wall.inner`), and a region's cells.
const BAYS: &str = "# Greenhouse bays along a path (demo values)
material spruce (k = 0.12 W/(m*K))
node bench   (fixed = 18 °C)
node outdoor (fixed = 4 °C)
repeat bay (count = 2) {
  buildup panel {
    inner: film(r = 0.13 m^2*K/W)
    board: layer(spruce, thickness = 20 mm)
  }
  link wall: bench to outdoor panel(area = 3 m^2)
}
region shelf (spruce, thickness = 20 mm, width = 400 mm, height = 300 mm, cells_x = 2, cells_y = 1) {
  left:  bench
  right: outdoor
}
limit dry:  temperature(bay.2.wall.inner) > 5 °C
limit warm: temperature(shelf.1.1) > 5 °C
";

fn bays_hover(needle: &str) -> String {
    let i = BAYS.find(needle).unwrap_or_else(|| panic!("`{needle}`"));
    let (snap, pos) = solved(&format!("{}$0{}", &BAYS[..i], &BAYS[i..]));
    match hover::hover(&snap, pos, &Settings::default()).map(|h| h.contents) {
        Some(HoverContents::Markup(m)) => m.value,
        _ => panic!("a hover on `{needle}`"),
    }
}

#[test]
fn generated_nodes_name_what_made_them_from_the_symbol_table() {
    let face = bays_hover("bay.2.wall.inner)");
    assert!(
        face.contains("face after element `inner` of link `bay.2.wall`"),
        "{face}"
    );
    let cell = bays_hover("shelf.1.1)");
    assert!(cell.contains("of region `shelf`"), "{cell}");
    assert!(!cell.contains("element"), "{cell}");
    // The build-up inside the repetition lists its own elements, and an element its kind.
    let buildup = bays_hover("panel {");
    assert!(buildup.contains("2 elements, in order"), "{buildup}");
    assert!(
        buildup.contains("- `board`: `layer(spruce, thickness = 20 mm)`"),
        "{buildup}"
    );
    let element = bays_hover("board:");
    assert!(element.contains("of build-up `bay.1.panel`"), "{element}");
    assert!(element.contains("Fourier's law"), "{element}");
}
