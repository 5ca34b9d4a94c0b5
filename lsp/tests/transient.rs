//! Transient figures in hover: "running…" until the worker's run is in the snapshot, then the
//! node's final, peak and lowest temperatures and a table on the `transient` declaration.

mod support;

use caloris_lsp::hover;
use caloris_lsp::proto::lsp::HoverContents;
use caloris_lsp::settings::Settings;
use caloris_lsp::snapshot::{Snapshot, TransientState};
use std::sync::atomic::AtomicBool;
use support::fixture::*;

/// A pot of soup cooling on a worktop (demo values): C = 2000 J/K, R = 0.5 K/W, so the time
/// constant RC is 1000 s and the run lasts one time constant.
const POT: &str = "# Soup pot cooling on a worktop (demo values)
node kitchen (fixed = 20 °C)
node pot     (capacity = 2000 J/K, initial = 90 °C)
link lid: pot to kitchen resistance(0.5 K/W)
transient cooling (duration = 1000 s, output = 100 s)
transient longer (duration = 3000 s)
";

fn at(needle: &str) -> String {
    let i = POT.find(needle).expect("needle");
    format!("{}$0{}", &POT[..i], &POT[i..])
}

fn hover_text(snap: &Snapshot, src_with_cursor: &str) -> String {
    let (_, pos) = cursor(src_with_cursor);
    let h = hover::hover(snap, pos, &Settings::default()).expect("hover");
    let HoverContents::Markup(m) = h.contents else {
        panic!("markdown expected")
    };
    m.value
}

fn ran(needle: &str) -> (Snapshot, String) {
    let src = at(needle);
    let (snap, _) = analyse(&src);
    assert!(snap.wants_transient(), "{:?}", snap.analysis.diagnostics);
    snap.run_transient(&AtomicBool::new(false));
    let text = hover_text(&snap, &src);
    (snap, text)
}

#[test]
fn node_hover_says_running_until_the_run_is_there() {
    let src = at("pot     (");
    let (snap, _) = analyse(&src);
    let text = hover_text(&snap, &src);
    assert!(text.contains("Transient `cooling`: _running…_"), "{text}");
}

#[test]
fn node_hover_shows_final_peak_and_lowest_of_the_run() {
    let (snap, text) = ran("pot     (");
    // Newton's law of cooling, lumped: T(t) = T∞ + (T0 − T∞)·exp(−t/RC); at t = RC,
    // 20 + 70·e⁻¹ = 45.752 °C.
    let TransientState::Done(s) = snap.transient_state() else {
        panic!("run expected")
    };
    let pot = s.nodes.iter().find(|n| n.name == "pot").expect("pot");
    let exact = 273.15 + 20.0 + 70.0 * (-1.0f64).exp();
    assert!(
        (pot.final_k - exact).abs() < 0.05,
        "{} vs {exact}",
        pot.final_k
    );
    assert!(text.contains("Transient `cooling`: final **45.7"), "{text}");
    insta::assert_snapshot!(text);
}

#[test]
fn declaration_hover_tabulates_the_run() {
    let (_, text) = ran("cooling (");
    insta::assert_snapshot!(text);
}

#[test]
fn a_second_transient_points_to_the_command_line() {
    let (_, text) = ran("longer (");
    assert!(
        text.contains("runs only the first transient (`cooling`)"),
        "{text}"
    );
}

#[test]
fn a_cancelled_run_leaves_the_snapshot_running() {
    let src = at("pot     (");
    let (snap, _) = analyse(&src);
    snap.run_transient(&AtomicBool::new(true));
    assert!(matches!(snap.transient_state(), TransientState::Running));
}
