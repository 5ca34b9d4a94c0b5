//! Repetition and sub-networks: generated names, a discretised fin that converges to the fin
//! formula, a wall type used in several rooms, and the errors of misuse.

use caloris_compiler::source::NoImports;
use caloris_compiler::{analyze, Analysis, Options};

fn run(src: &str) -> Analysis {
    analyze("model.heat", src, &NoImports, &Options::default())
}

fn codes(a: &Analysis) -> Vec<&'static str> {
    a.diagnostics
        .iter()
        .filter(|d| d.is_error())
        .map(|d| d.code)
        .collect()
}

/// A straight aluminium fin split into `n` segments: each segment conducts along the fin
/// (Fourier's law) and loses heat from its sides (Newton's law of cooling), its node at the
/// segment's middle; the tip segment is adiabatic.
fn discretised_fin(n: usize) -> f64 {
    let src = format!(
        "param n = {n}\nparam seg = 50 mm / n\nmaterial alu (k = 200 W/(m*K))\n\
         node base (fixed = 80 °C)\nnode air (fixed = 20 °C)\n\
         repeat fin (count = n, first = base) {{\n\
           node t\n\
           link axial: previous.t to t layer(alu, thickness = seg * (1 - 0.5 * max(0, 2 - index)), area = 2 mm * 40 mm)\n\
           link skin: t to air film(h = 25 W/(m^2*K), area = 2 * (40 mm + 2 mm) * seg)\n\
         }}\n"
    );
    let a = run(&src);
    let sol = a
        .solution
        .as_ref()
        .unwrap_or_else(|| panic!("{:?}", a.diagnostics));
    let i = a
        .network
        .link_id("fin.1.axial")
        .expect("generated link name");
    sol.heat_flows[i]
}

/// Fin equation, closed-form solution with an adiabatic tip: Q = √(hPkA_c)·tanh(mL)·θ_b.
fn fin_formula() -> f64 {
    let (h, k, t, w, l) = (25.0f64, 200.0f64, 0.002f64, 0.040f64, 0.050f64);
    let (p, ac) = (2.0 * (w + t), t * w);
    let m = (h * p / (k * ac)).sqrt();
    (h * p * k * ac).sqrt() * (m * l).tanh() * 60.0
}

#[test]
fn discretised_fin_converges_to_the_fin_formula() {
    let exact = fin_formula();
    let errors: Vec<f64> = [5, 20, 80]
        .iter()
        .map(|&n| (discretised_fin(n) - exact).abs() / exact)
        .collect();
    // Second order in the segment length: each fourfold refinement cuts the error about 16×.
    assert!(errors[2] < 1e-4, "{errors:?}");
    assert!(
        errors[0] / errors[1] > 10.0 && errors[1] / errors[2] > 10.0,
        "{errors:?}"
    );
}

#[test]
fn generated_names_reach_results_and_limits() {
    let a = run("node base (fixed = 50 °C)\nnode air (fixed = 20 °C)\n\
                 repeat cell (count = 3) {\n  node body (load = index * 1 W)\n  link strap: body to base resistance(2 K/W)\n}\n\
                 limit warmest: temperature(cell.3.body) < 60 °C\n");
    let sol = a.solution.as_ref().expect("solves");
    for (i, load) in [(1, 1.0), (2, 2.0), (3, 3.0)] {
        let n = a.network.node_id(&format!("cell.{i}.body")).expect("node");
        assert!((sol.temperatures[n] - (323.15 + 2.0 * load)).abs() < 1e-9);
    }
    assert!(sol.limits[0].passed && (sol.limits[0].actual - 329.15).abs() < 1e-9);
}

#[test]
fn nested_repetition_names_both_indices() {
    let a = run("node base (fixed = 50 °C)\nrepeat row (count = 2) {\n  repeat col (count = 3) {\n    node c (load = 1 W)\n    link l: c to base resistance(1 K/W)\n  }\n}\n");
    assert!(
        a.network.node_id("row.2.col.3.c").is_some(),
        "{:?}",
        a.network.nodes.iter().map(|n| &n.name).collect::<Vec<_>>()
    );
    assert_eq!(a.network.nodes.len(), 7);
}

/// One wall type in four rooms; ISO 6946 conventional surface resistances (Rsi = 0.13,
/// Rse = 0.04 m²K/W) around 0.2 m of k = 0.04 insulation: R = 5.17 m²K/W per area.
#[test]
fn a_sub_network_used_in_four_rooms() {
    let src = "node outdoor (fixed = -5 °C)\n\
        node kitchen (fixed = 21 °C)\nnode lounge (fixed = 20 °C)\nnode bedroom (fixed = 18 °C)\nnode bathroom (fixed = 22 °C)\n\
        network outer_wall (room, outside) {\n\
          param area = 10 m^2\n\
          node surface\n\
          link inner: room to surface film(r = 0.13 m^2*K/W, area = area)\n\
          link body: surface to outside buildup_core(area = area)\n\
          limit no_mould: temperature(surface) > 12.6 °C\n\
        }\n\
        buildup buildup_core {\n  wool: layer(k = 0.04 W/(m*K), thickness = 200 mm)\n  outside: film(r = 0.04 m^2*K/W)\n}\n\
        use kitchen_wall:  outer_wall(room = kitchen, outside = outdoor, area = 9 m^2)\n\
        use lounge_wall:   outer_wall(room = lounge, outside = outdoor, area = 16 m^2)\n\
        use bedroom_wall:  outer_wall(room = bedroom, outside = outdoor)\n\
        use bathroom_wall: outer_wall(room = bathroom, outside = outdoor, area = 5 m^2)\n";
    let a = run(src);
    let sol = a
        .solution
        .as_ref()
        .unwrap_or_else(|| panic!("{:?}", a.diagnostics));
    let r = 0.13 + 0.2 / 0.04 + 0.04;
    for (wall, t_room, area) in [
        ("kitchen_wall", 21.0, 9.0),
        ("lounge_wall", 20.0, 16.0),
        ("bedroom_wall", 18.0, 10.0),
        ("bathroom_wall", 22.0, 5.0),
    ] {
        let g = a
            .network
            .group_id(&format!("{wall}.body"))
            .expect("build-up use inside the sub-network");
        let q = (t_room + 5.0) * area / r;
        assert!((sol.groups[g].heat_flow - q * (r - 0.13) / r * r / (r - 0.13)).abs() < 1e-9 * q);
        let n = a
            .network
            .node_id(&format!("{wall}.surface"))
            .expect("surface node");
        assert!((sol.temperatures[n] - 273.15 - (t_room - q / area * 0.13)).abs() < 1e-9);
    }
    assert_eq!(sol.limits.len(), 4);
    assert!(sol.limits.iter().all(|l| l.passed));
}

#[test]
fn misuse_is_reported_where_it_is_written() {
    // `previous` without `first`.
    assert_eq!(codes(&run("node a (fixed = 1 °C)\nrepeat s (count = 2) {\n  node t\n  link l: previous.t to t resistance(1 K/W)\n}\n")), ["E203"]);
    // A count that is not whole.
    assert_eq!(codes(&run("node a (fixed = 1 °C)\nrepeat s (count = 2.5) {\n  node t\n  link l: a to t resistance(1 K/W)\n}\n")), ["E216"]);
    // Unknown sub-network, with a suggestion.
    let a = run("node a (fixed = 1 °C)\nnetwork wall (x) {\n  node s\n  link l: x to s resistance(1 K/W)\n}\nuse w: wal(x = a)\n");
    assert_eq!(codes(&a), ["E102"]);
    let d = a
        .diagnostics
        .iter()
        .find(|d| d.code == "E102")
        .expect("E102");
    assert!(d.help.as_deref().unwrap_or("").contains("`wall`"), "{d:?}");
    // A port left open, and an argument the sub-network does not take.
    let a = run("node a (fixed = 1 °C)\nnetwork wall (x, y) {\n  link l: x to y resistance(1 K/W)\n}\nuse w: wall(x = a, thickness = 2 m)\n");
    let mut c = codes(&a);
    c.sort();
    assert_eq!(c, ["E203", "E204"]);
    // A sub-network that uses itself ends with an error, not a hang.
    let a = run("node a (fixed = 1 °C)\nnetwork loop (x) {\n  use inner: loop(x = x)\n}\nuse w: loop(x = a)\n");
    assert!(codes(&a).contains(&"E218"), "{:?}", a.diagnostics);
    // One mistake in a repeated body is reported once, not once per copy.
    let a = run("node a (fixed = 1 °C)\nrepeat s (count = 50) {\n  node t\n  link l: a to t resistance(1 m)\n}\n");
    assert_eq!(codes(&a), ["E101"]);
}

#[test]
fn a_broken_line_inside_a_block_does_not_lose_the_rest() {
    use caloris_compiler::parser::parse;
    use caloris_compiler::span::FileId;
    use caloris_compiler::syntax::ItemKind;
    let src = "repeat seg (count = 3) {\n  node t\n  link l: t to ) resistance(1 K/W)\n  node u\n}\nnode after\n\
               region r (k = 1 W/(m*K), thickness = 1 m, width = 1 m, height = 1 m, cells_x = 2, cells_y = 2) {\n  left: after\n}\n\
               network n (a) {\n  node inner\n}\nuse x: n(a = after)\n";
    let (m, diags) = parse(src, FileId(0));
    assert_eq!(diags.len(), 1, "{diags:?}");
    assert_eq!(diags[0].code, "E002");
    let ItemKind::Repeat { body, .. } = &m.items[0].kind else {
        panic!("{:?}", m.items[0])
    };
    assert_eq!(
        body.len(),
        2,
        "the nodes before and after the broken link survive"
    );
    let kinds: Vec<&str> = m
        .items
        .iter()
        .map(|i| match i.kind {
            ItemKind::Repeat { .. } => "repeat",
            ItemKind::Node { .. } => "node",
            ItemKind::Region { .. } => "region",
            ItemKind::Network { .. } => "network",
            ItemKind::Use { .. } => "use",
            _ => "other",
        })
        .collect();
    assert_eq!(kinds, ["repeat", "node", "region", "network", "use"]);
}

#[test]
fn the_new_words_stay_ordinary_names_elsewhere() {
    // `region`, `repeat`, `use` and `network` start a declaration only where one may start.
    let a = run("param region = 2 m\nparam use = region * 2\nnode network (fixed = 10 °C)\nnode repeat\nlink l: repeat to network resistance(use / 1 m * 1 K/W)\n");
    assert!(!a.has_errors(), "{:?}", a.diagnostics);
    assert!((a.solution.expect("solves").temperatures[1] - 283.15).abs() < 1e-12);
}
