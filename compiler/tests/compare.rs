//! `compare` on pairs of models with known changes. Expected values are worked out by hand from
//! Fourier's law for a plane layer (R = L/(k·A)), Newton's law of cooling for a film
//! (R = 1/(h·A)) and resistances in series (R = ΣRᵢ, Q = ΔT/R); the derivations are written
//! beside each check.

use caloris_compiler::compare::{compare, Comparison, Shown};
use caloris_compiler::source::NoImports;
use caloris_compiler::{analyze, Analysis, Options};

fn analyse(text: &str) -> Analysis {
    let a = analyze("m.heat", text, &NoImports, &Options::default());
    assert!(!a.has_errors(), "{:?}", a.diagnostics);
    a
}

fn diff(old: &str, new: &str) -> Comparison {
    compare(&analyse(old), &analyse(new))
}

fn wall(thickness_mm: f64) -> String {
    format!(
        "material board (k = 0.04 W/(m*K))
node warm (fixed = 20 °C)
node cold (fixed = 0 °C)
buildup w {{
  inside:  film(h = 8 W/(m^2*K))
  core:    layer(board, thickness = {thickness_mm} mm)
  outside: film(h = 25 W/(m^2*K))
}}
link north: warm to cold w(area = 10 m^2)
limit loss: heat_flow(north) < 60 W
limit dry:  temperature(north.inside) >= 19 °C
"
    )
}

fn close(a: f64, b: f64, tol: f64) -> bool {
    (a - b).abs() <= tol * b.abs().max(1.0)
}

#[test]
fn thicker_insulation_moves_heat_flow_and_surface_temperature_as_series_resistance_says() {
    // Per square metre: R = 1/h_in + L/k + 1/h_out (series resistance, Fourier's law for the
    // layer, Newton's law of cooling for the films).
    //   100 mm: R = 0.125 + 0.1/0.04 + 0.04 = 2.665 m²K/W;  Q = 20 K × 10 m² / 2.665 = 75.0469 W
    //   140 mm: R = 0.125 + 0.14/0.04 + 0.04 = 3.665 m²K/W; Q = 200 / 3.665 = 54.5703 W
    //   inner surface T = 20 °C − (Q/A)·(1/h_in): 19.0619 °C → 19.3179 °C
    let c = diff(&wall(100.0), &wall(140.0));
    let (a, k, dt, h_in, h_out) = (10.0, 0.04, 20.0, 8.0, 25.0);
    let r_per_area = |l: f64| 1.0 / h_in + l / k + 1.0 / h_out;
    let q = |l: f64| dt * a / r_per_area(l);
    let t_inside = |l: f64| 20.0 - q(l) / a / h_in;

    assert_eq!(c.inputs.len(), 1, "{:#?}", c.inputs);
    let i = &c.inputs[0];
    assert_eq!(
        (i.category, i.subject.as_str(), i.property.as_str()),
        ("build-up element", "w.core", "thickness")
    );
    assert_eq!(i.old, Some(Shown::Written("100 mm".into())));
    assert_eq!(i.new, Some(Shown::Written("140 mm".into())));
    assert!(close(i.relative.unwrap_or(f64::NAN), 0.4, 1e-12));

    assert!(c.structure.is_empty());
    // The core layer's own resistance: L/(k·A) = 0.1/0.4 = 0.25 K/W → 0.14/0.4 = 0.35 K/W.
    let core = c
        .links
        .iter()
        .find(|l| l.name == "north.core")
        .expect("core moved");
    assert!(close(core.old_resistance, 0.25, 1e-12) && close(core.new_resistance, 0.35, 1e-12));
    assert!(close(core.old_heat_flow, q(0.1), 1e-10) && close(core.new_heat_flow, q(0.14), 1e-10));
    assert!(close(core.delta_heat_flow, q(0.14) - q(0.1), 1e-9));
    assert!(
        close(q(0.14) - q(0.1), -20.4766, 1e-5),
        "hand value: 54.5703 − 75.0469 W"
    );
    // Every element of the chain carries the same heat; the film resistances did not move.
    assert_eq!(c.links.len(), 3);
    let inside = c
        .links
        .iter()
        .find(|l| l.name == "north.inside")
        .expect("film listed");
    assert!(
        close(inside.old_resistance, 1.0 / (h_in * a), 1e-12)
            && close(inside.new_resistance, inside.old_resistance, 1e-15)
    );
    // Order: equal heat-flow changes keep the chain's order.
    assert_eq!(
        c.links.iter().map(|l| l.name.as_str()).collect::<Vec<_>>(),
        ["north.inside", "north.core", "north.outside"]
    );

    let t = c
        .temperatures
        .iter()
        .find(|m| m.name == "north.inside")
        .expect("inner surface moved");
    assert!(
        close(t.old - 273.15, t_inside(0.1), 1e-10) && close(t.new - 273.15, t_inside(0.14), 1e-10)
    );
    assert!(
        close(t.delta, 0.2560, 1e-3),
        "hand value: 19.3179 − 19.0619 K, got {}",
        t.delta
    );
    // Largest temperature movement first: the inner surface moves +0.256 K, the face between
    // core and outer film (Q/A)/h_out = 0.3002 °C → 0.2183 °C, −0.0819 K.
    assert_eq!(
        c.temperatures
            .iter()
            .map(|m| m.name.as_str())
            .collect::<Vec<_>>(),
        ["north.inside", "north.core"]
    );
    assert!(close(
        c.temperatures[1].delta,
        (q(0.14) - q(0.1)) / a / h_out,
        1e-9
    ));
    assert!(c
        .temperatures
        .windows(2)
        .all(|w| w[0].delta.abs() >= w[1].delta.abs()));

    let b = &c.buildups[0];
    assert!(close(b.old_u_value.unwrap_or(f64::NAN), 1.0 / 2.665, 1e-12));
    assert!(close(b.new_u_value.unwrap_or(f64::NAN), 1.0 / 3.665, 1e-12));
    assert!(close(b.old_r_value.unwrap_or(f64::NAN), 2.665, 1e-12));

    // Boundaries: the warm side delivers Q, the cold side absorbs it.
    let warm = c
        .boundaries
        .iter()
        .find(|m| m.name == "warm")
        .expect("warm boundary");
    assert!(close(warm.delta, q(0.14) - q(0.1), 1e-9));

    // Limits: heat_flow < 60 W fails at 75.05 W and passes at 54.57 W; the surface limit passes
    // in both (19.06 and 19.32 °C ≥ 19 °C).
    let loss = c.limits.iter().find(|l| l.name == "loss").expect("limit");
    assert!(loss.flipped() && !loss.fails_now());
    assert!(!c.any_limit_fails_now());
    assert_eq!(c.limits[0].name, "loss", "flips come first");
}

#[test]
fn thinner_insulation_flips_a_limit_to_fail() {
    let c = diff(&wall(140.0), &wall(100.0));
    let loss = c.limits.iter().find(|l| l.name == "loss").expect("limit");
    assert!(loss.flipped() && loss.fails_now());
    assert!(c.any_limit_fails_now());
    // Margin: 60 W − 75.0469 W = −15.0469 W.
    let m = loss.new.as_ref().map(|n| n.margin).unwrap_or(f64::NAN);
    assert!(close(m, 60.0 - 200.0 / 2.665, 1e-10));
}

#[test]
fn boundary_temperature_change_is_sized_against_the_driving_difference() {
    // Outdoor 0 °C → −5 °C: a 5 K change of a 20 K driving difference, 25 %; the heat flow
    // rises by the same 25 % because the network is linear (Q = ΔT/R).
    let new = wall(100.0).replace("fixed = 0 °C", "fixed = -5 °C");
    let c = diff(&wall(100.0), &new);
    let i = &c.inputs[0];
    assert_eq!((i.category, i.property.as_str()), ("node", "fixed"));
    assert!(close(i.relative.unwrap_or(f64::NAN), -0.25, 1e-12));
    assert!(close(
        i.delta.map(|d| d.value).unwrap_or(f64::NAN),
        -5.0,
        1e-12
    ));
    let core = c
        .links
        .iter()
        .find(|l| l.name == "north.core")
        .expect("moved");
    assert!(close(core.new_heat_flow / core.old_heat_flow, 1.25, 1e-12));
}

#[test]
fn added_and_removed_nodes_links_and_limits_are_listed() {
    let old = wall(100.0);
    let new = format!(
        "{}node frame_core\nlink frame_in: warm to frame_core resistance(2 K/W)\nlink frame_out: frame_core to cold resistance(3 K/W)\n",
        old.replace("limit dry:  temperature(north.inside) >= 19 °C\n", "")
    );
    let c = diff(&old, &new);
    let names: Vec<(bool, &str, &str)> = c
        .structure
        .iter()
        .map(|s| (s.added, s.what, s.name.as_str()))
        .collect();
    assert!(names.contains(&(true, "node", "frame_core")), "{names:?}");
    assert!(
        names.contains(&(true, "link", "frame_in")) && names.contains(&(true, "link", "frame_out"))
    );
    assert!(names.contains(&(false, "limit", "dry")));
    // A new parallel path of 5 K/W carries 20 K / 5 K/W = 4 W more from the warm boundary.
    let warm = c
        .boundaries
        .iter()
        .find(|m| m.name == "warm")
        .expect("warm");
    assert!(close(warm.delta, 4.0, 1e-9));
    // The wall itself did not move.
    assert!(c.temperatures.iter().all(|t| !t.name.starts_with("north")));
}

#[test]
fn rewriting_without_changing_values_is_no_change() {
    let old = "param a = 2 m * 5 m\nmaterial board (k = 0.04 W/(m*K))\nnode warm (fixed = 20 °C)\nnode cold (fixed = 0 °C)\nlink l: warm to cold layer(board, thickness = 100 mm, area = a)\n";
    let new = "# same model, new layout\nparam a=10 m^2\nmaterial board(k=0.04 W/(m*K))\nnode warm(fixed=20 °C) node cold(fixed=0 °C)\nlink l:warm to cold layer(board,thickness=100  mm,area=a)\n";
    let c = diff(old, new);
    assert!(c.is_empty(), "{c:#?}");
    // And a real change of value behind an unchanged argument shows at the parameter.
    let c = diff(old, &old.replace("2 m * 5 m", "2 m * 6 m"));
    assert_eq!(c.inputs.len(), 1);
    assert_eq!(
        (c.inputs[0].category, c.inputs[0].subject.as_str()),
        ("parameter", "a")
    );
    assert!(close(c.inputs[0].relative.unwrap_or(f64::NAN), 0.2, 1e-12));
}

#[test]
fn material_and_element_kind_changes() {
    let old = wall(100.0);
    let new = old.replace("k = 0.04", "k = 0.032").replace(
        "outside: film(h = 25 W/(m^2*K))",
        "outside: film(r = 0.04 m^2*K/W)",
    );
    let c = diff(&old, &new);
    let k = c
        .inputs
        .iter()
        .find(|i| i.category == "material")
        .expect("k change");
    assert!(close(k.relative.unwrap_or(f64::NAN), -0.2, 1e-12));
    // h = 25 W/(m²K) and r = 0.04 m²K/W are the same film (1/25 = 0.04), written two ways:
    // both arguments are listed, and the film's resistance does not move.
    let film: Vec<&str> = c
        .inputs
        .iter()
        .filter(|i| i.subject == "w.outside")
        .map(|i| i.property.as_str())
        .collect();
    assert_eq!(film, ["h", "r"]);
    let outside = c
        .links
        .iter()
        .find(|l| l.name == "north.outside")
        .expect("listed: its heat flow moved");
    assert!(close(outside.new_resistance, outside.old_resistance, 1e-12));
}
