//! Completion, signature help and hover read the compiler's schema: each case the server's own
//! lists used to get wrong (8 of the 15 declaration words, two of the node's arguments, no k(T)
//! arguments for materials, `area` offered to a radial build-up's use) is checked against the
//! schema itself, so the test fails if either drifts.

mod support;

use caloris_compiler::schema;
use caloris_lsp::proto::lsp::{HoverContents, ParameterLabel};
use caloris_lsp::settings::Settings;
use caloris_lsp::{completion, hover, signature_help};
use support::fixture::*;

/// The labels completion offers at the marker.
fn labels(src: &str) -> Vec<String> {
    let (snap, pos) = analyse(src);
    completion::completion(&snap, pos)
        .into_iter()
        .map(|i| i.label)
        .collect()
}

fn names(specs: &[schema::ArgSpec]) -> Vec<String> {
    specs.iter().map(|s| s.name.to_string()).collect()
}

/// A pipe run lagged with a radial build-up, and a plane one, in invented numbers.
const LAGGING: &str = "node steam (fixed = 150 °C)
node plant_room (fixed = 15 °C)
material steel (k = 50 W/(m*K))
material wool  (k = 0.04 W/(m*K))
buildup lagging {
  wall: cylinder(steel, thickness = 3 mm)
  wool: cylinder(wool, thickness = 50 mm)
  skin: film(h = 10 W/(m^2*K))
}
buildup board {
  core: layer(wool, thickness = 40 mm)
}
";

#[test]
fn keyword_completion_offers_every_declaration_word() {
    let got = labels(&format!("{CABIN}$0"));
    let want: Vec<String> = schema::declaration_words().map(str::to_string).collect();
    assert_eq!(got, want);
    // The contextual words are among them (the server's list once stopped at `limit`).
    for w in [
        "schedule",
        "case",
        "transient",
        "repeat",
        "network",
        "use",
        "region",
    ] {
        assert!(got.iter().any(|g| g == w), "{w}: {got:?}");
    }
    // Also on the first line inside a repetition's braces.
    let inside = labels(&format!("{CABIN}repeat seg (count = 3) {{\n  $0"));
    assert_eq!(inside, want);
}

#[test]
fn node_completion_offers_every_node_argument_not_yet_given() {
    assert_eq!(
        labels(&format!("{CABIN}node porch ($0")),
        names(schema::NODE)
    );
    let rest = labels(&format!("{CABIN}node porch (capacity = 2 kJ/K, $0"));
    let want: Vec<String> = names(schema::NODE)
        .into_iter()
        .filter(|n| n != "capacity")
        .collect();
    assert_eq!(rest, want);
    assert!(rest.iter().any(|n| n == "initial"), "{rest:?}");
}

#[test]
fn material_completion_offers_the_k_of_t_arguments() {
    let got = labels(&format!("{CABIN}material cork (k = 0.04 W/(m*K), $0"));
    assert_eq!(got, ["k_slope", "k_at", "density", "specific_heat"]);
    assert_eq!(
        labels(&format!("{CABIN}material cork ($0")),
        names(schema::MATERIAL)
    );
}

#[test]
fn a_radial_build_up_use_is_offered_its_bore_not_an_area() {
    let radial = labels(&format!(
        "{LAGGING}link run: steam to plant_room lagging($0"
    ));
    assert_eq!(radial, ["inner_radius", "length"]);
    let plane = labels(&format!(
        "{LAGGING}link panel: steam to plant_room board($0"
    ));
    assert_eq!(plane, ["area"]);
    // Inside a radial build-up a shell gets its radius and length from the use as well.
    let shell = labels(&format!(
        "{LAGGING}buildup jacket {{\n  inner: cylinder(steel, thickness = 2 mm)\n  outer: cylinder($0"
    ));
    assert!(
        !shell
            .iter()
            .any(|l| l == "area" || l == "inner_radius" || l == "length"),
        "{shell:?}"
    );
    assert!(shell.iter().any(|l| l == "thickness"), "{shell:?}");
    // The unit after `inner_radius = 27 ` is a length.
    let units = labels(&format!(
        "{LAGGING}link run: steam to plant_room lagging(inner_radius = 27 $0"
    ));
    assert!(
        units.iter().any(|u| u == "mm") && !units.iter().any(|u| u == "m^2"),
        "{units:?}"
    );
}

#[test]
fn contextual_declarations_get_argument_completion_and_signature_help() {
    assert_eq!(
        labels(&format!("{CABIN}transient night ($0")),
        names(schema::TRANSIENT)
    );
    assert_eq!(
        labels(&format!("{CABIN}schedule frost ($0")),
        names(schema::SCHEDULE)
    );
    // A case sets parameters.
    let case = labels(&format!("{CABIN}case bigger (wall_area = 12 m^2, $0"));
    assert_eq!(case, ["roof_area"]);
    let (snap, pos) = analyse(&format!("{CABIN}transient night (duration = 12 h, $0"));
    let h = signature_help::signature_help(&snap, pos).expect("signature help");
    let sig = &h.signatures[0];
    assert_eq!(
        sig.label,
        format!("transient({})", names(schema::TRANSIENT).join(", "))
    );
    let active = h.active_parameter.expect("active") as usize;
    let Some(ParameterLabel::LabelOffsets([s, e])) =
        sig.parameters.as_ref().map(|p| p[active].label.clone())
    else {
        panic!("offsets")
    };
    assert_eq!(&sig.label[s as usize..e as usize], "step");
    let (snap, pos) = analyse(&format!(
        "{LAGGING}link run: steam to plant_room lagging($0"
    ));
    let h = signature_help::signature_help(&snap, pos).expect("signature help");
    assert_eq!(h.signatures[0].label, "lagging(inner_radius, length)");
}

fn hover_text(src: &str) -> String {
    let (snap, pos) = analyse(src);
    let h = hover::hover(&snap, pos, &Settings::default()).expect("a hover");
    let HoverContents::Markup(m) = h.contents else {
        panic!("markdown expected")
    };
    m.value
}

#[test]
fn hover_on_declaration_words_and_arguments_shows_the_schema_docs() {
    let node = hover_text(&cabin_at("node outdoor", 0));
    let spec = schema::declaration("node").expect("node");
    assert!(
        node.starts_with(&format!("**node** — {}", spec.doc)),
        "{node}"
    );
    for a in schema::NODE {
        assert!(
            node.contains(&format!("- `{}`: {}", a.name, a.describe())),
            "{node}"
        );
    }
    let text = format!("{CABIN}transient night (duration = 12 h)\n");
    let run = hover_text(&text.replace("transient night", "$0transient night"));
    assert!(run.starts_with("**transient** — "), "{run}");
    assert!(run.contains("contextual word"), "{run}");
    let duration = hover_text(&text.replace("duration =", "$0duration ="));
    let spec = schema::TRANSIENT[0];
    assert_eq!(
        duration,
        format!(
            "**duration** — argument of `transient`\n\n{}",
            spec.describe()
        )
    );
    let fixed = hover_text(&cabin_at("fixed = -8", 0));
    assert!(fixed.contains("argument of `node`"), "{fixed}");
    assert!(fixed.contains("or the name of a schedule"), "{fixed}");
    let lib = format!(
        "{CABIN}material cork (k = 0.04 W/(m*K), k_slope = 1e-4 W/(m*K^2), k_at = 10 °C)\n"
    );
    let slope = hover_text(&lib.replace("k_slope =", "$0k_slope ="));
    assert!(slope.contains("together with `k_at`"), "{slope}");
    let area = hover_text(&cabin_at("area = wall_area", 0));
    assert!(area.contains("argument of `timber_wall`"), "{area}");
}
