//! The language server on computed convection films: the hover of such a link gives the
//! correlation, its dimensionless groups and h at the solved temperatures (the same values as
//! the compiler's solution), and completion offers a choice argument's words.

mod support;

use caloris_lsp::proto::lsp::{CompletionTextEdit, HoverContents};
use caloris_lsp::settings::Settings;
use caloris_lsp::{completion, hover};
use support::fixture::*;

/// A sous-vide water bath (demo values): its side wall loses heat to the kitchen.
const BATH: &str = "node bath (load = 40 W)
node kitchen (fixed = 21 °C)
link side: bath to kitchen natural_wall(fluid = air, height = 0.2 m, area = 0.25 m^2, emissivity = 0.9)
";

#[test]
fn hover_of_a_computed_film_shows_its_groups_and_h() {
    let (snap, pos) = analyse(&BATH.replace("side:", "$0side:"));
    assert!(snap.solved(), "{:#?}", snap.analysis.diagnostics);
    let h = hover::hover(&snap, pos, &Settings::default()).expect("hover");
    let HoverContents::Markup(m) = h.contents else {
        panic!("markdown expected")
    };
    let text = m.value;
    assert!(text.contains("Churchill–Chu, vertical plate"), "{text}");
    assert!(
        text.contains("Ra = ") && text.contains("Pr = ") && text.contains("Nu = "),
        "{text}"
    );
    assert!(text.contains("radiation h = "), "{text}");
    let sol = snap.analysis.solution.as_ref().expect("solved");
    let film = &sol.films[0];
    // The hover shows the solution's own h (four significant digits as the display rounds).
    let shown = format!("{:.3}", film.state.h);
    assert!(
        text.contains(&shown[..4]),
        "h {} not in the hover: {text}",
        film.state.h
    );
    // The 40 W leave by convection and radiation together.
    assert!((film.state.q_convection + film.state.q_radiation - 40.0).abs() < 1e-9);
}

#[test]
fn completion_offers_the_words_of_a_choice() {
    let (snap, pos) = analyse(&BATH.replace("fluid = air", "fluid = $0"));
    let labels: Vec<String> = completion::completion(&snap, pos)
        .into_iter()
        .filter(|i| matches!(i.text_edit, Some(CompletionTextEdit::Edit(_))))
        .map(|i| i.label)
        .collect();
    assert_eq!(labels, ["air", "water"]);
}
