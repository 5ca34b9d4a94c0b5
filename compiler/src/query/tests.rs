use super::*;
use crate::source::NoImports;
use crate::span::FileId;
use crate::symbols::SymbolKind;
use crate::units::{Dim, UnitSystem};
use crate::{analyze, Analysis, Options};

const WALL: &str = "title \"Cabin wall\"
param wall_area = 2.4 m * 4.0 m
material wood_fibre (k = 0.040 W/(m*K))
node room    (fixed = 20 °C)
node outdoor (fixed = -8 °C)
buildup timber_wall {
  inside:     film(r = 0.13 m^2*K/W)
  insulation: layer(wood_fibre, thickness = 140 mm)
  outside:    film(r = 0.04 m²*K/W)
}
link north: room to outdoor timber_wall(area = wall_area)
limit no_mould: temperature(north.inside) >= 12.6 °C
";

fn solved(text: &str) -> Analysis {
    analyze("wall.heat", text, &NoImports, &Options::default())
}

fn at(text: &str, needle: &str) -> u32 {
    text.find(needle)
        .unwrap_or_else(|| panic!("`{needle}` not in text")) as u32
}

#[test]
fn target_finds_symbols_literals_kinds_and_measures() {
    let a = solved(WALL);
    assert!(!a.has_errors(), "{:?}", a.diagnostics);
    let t = target_at(&a, FileId(0), at(WALL, "wood_fibre, thickness") + 2);
    assert!(
        matches!(t, Some(Target::Symbol { symbol, .. }) if symbol.kind == SymbolKind::Material)
    );
    match target_at(&a, FileId(0), at(WALL, "140 mm") + 1) {
        Some(Target::Literal {
            quantity,
            span,
            value,
            unit,
        }) => {
            assert_eq!(&WALL[span.range()], "140 mm");
            assert_eq!((value, unit), (140.0, Some("mm")));
            assert!((quantity.value - 0.14).abs() < 1e-15);
            assert_eq!(quantity.dim, Dim::LENGTH);
        }
        _ => panic!("expected a literal"),
    }
    // `-8 °C` is one literal: 265.15 K (NIST SP 811: T/K = t/°C + 273.15).
    match target_at(&a, FileId(0), at(WALL, "8 °C") + 1) {
        Some(Target::Literal {
            quantity,
            span,
            value,
            ..
        }) => {
            assert_eq!(&WALL[span.range()], "-8 °C");
            assert_eq!(value, -8.0);
            assert!((quantity.value - 265.15).abs() < 1e-12);
        }
        _ => panic!("expected a literal"),
    }
    assert!(
        matches!(target_at(&a, FileId(0), at(WALL, "layer(")), Some(Target::ElementKind { kind, .. }) if kind.name() == "layer")
    );
    assert!(
        matches!(target_at(&a, FileId(0), at(WALL, "thickness")), Some(Target::ArgName { param, .. }) if param.name == "thickness")
    );
    assert!(matches!(
        target_at(&a, FileId(0), at(WALL, "temperature(")),
        Some(Target::Measure {
            name: "temperature",
            ..
        })
    ));
    let g = target_at(&a, FileId(0), at(WALL, "north.inside") + 7);
    assert!(
        matches!(g, Some(Target::Symbol { symbol, .. }) if symbol.kind == SymbolKind::GeneratedNode)
    );
}

#[test]
fn balance_of_a_free_node_closes() {
    let a = solved(WALL);
    let b = node_balance(&a, "north.inside").expect("solved");
    assert_eq!(b.links.len(), 2);
    assert!(b.boundary.is_none());
    let sum: f64 = b.links.iter().map(|l| l.1).sum::<f64>() + b.load;
    assert!(sum.abs() < 1e-9, "{sum}");
    let room = node_balance(&a, "room").expect("solved");
    // The warm boundary delivers what the wall loses.
    assert!(room.boundary.is_some_and(|q| q > 0.0));
}

#[test]
fn preferred_system_follows_the_written_units() {
    assert_eq!(preferred_system(&solved(WALL)), UnitSystem::Si);
    let us = "node a (fixed = 70 °F)\nnode b (fixed = 20 °F)\nlink w: a to b layer(k = 0.02 Btu/(h*ft*°F), thickness = 2 in, area = 10 ft^2)\n";
    assert_eq!(preferred_system(&solved(us)), UnitSystem::Us);
}

#[test]
fn rename_of_a_link_and_an_element_edits_generated_names() {
    let a = solved(WALL);
    let link = a.symbols.get("north").expect("link");
    let edits = rename_edits(&a, link, "east");
    let mut text = WALL.to_string();
    for (span, new) in edits.iter().rev() {
        text.replace_range(span.range(), new);
    }
    assert!(
        text.contains("link east: room") && text.contains("temperature(east.inside)"),
        "{text}"
    );
    let elem = a
        .symbols
        .symbols
        .iter()
        .find(|s| s.kind == SymbolKind::BuildupElement && s.name == "inside")
        .expect("element");
    let mut text = WALL.to_string();
    for (span, new) in rename_edits(&a, elem, "lining").iter().rev() {
        text.replace_range(span.range(), new);
    }
    assert!(
        text.contains("  lining:     film") && text.contains("temperature(north.lining)"),
        "{text}"
    );
    assert!(!solved(&text).has_errors());
}

#[test]
fn new_names_are_checked() {
    let a = solved(WALL);
    let node = a.symbols.get("room").expect("node");
    assert!(check_new_name(&a, node, "lounge").is_ok());
    assert!(check_new_name(&a, node, "outdoor")
        .expect_err("taken")
        .contains("already declared"));
    assert!(check_new_name(&a, node, "2nd").is_err());
    assert!(check_new_name(&a, node, "link").is_err());
    assert!(check_new_name(&a, node, "a.b").is_err());
    let gen = a.symbols.get("north.inside").expect("generated");
    assert!(check_new_name(&a, gen, "x").is_err());
}

#[test]
fn conversions_use_exact_factors() {
    // NIST SP 811: 1 in = 0.0254 m exactly, so 140 mm = 5.511811... in.
    let c = unit_conversions(140.0, "mm");
    assert!(c.iter().any(|c| c.text == "0.14 m"), "{c:?}");
    assert!(c.iter().any(|c| c.text == "5.51181 in"), "{c:?}");
    assert!(!c.iter().any(|c| c.unit == "mm"));
    // NIST SP 811: t/°F = 1.8 t/°C + 32, so 20 °C = 68 °F; T/K = t/°C + 273.15.
    let t = unit_conversions(20.0, "°C");
    let texts: Vec<&str> = t.iter().map(|c| c.text.as_str()).collect();
    assert_eq!(texts, ["68 °F", "293.15 K"]);
    // A difference converts without the offset: 5 K = 9 Δ°F.
    let d = unit_conversions(5.0, "Δ°C");
    assert!(d.iter().any(|c| c.text == "9 Δ°F"), "{d:?}");
    assert!(unit_conversions(1.0, "furlong").is_empty());
}

#[test]
fn every_conversion_candidate_parses() {
    for value in [1.0, 20.0] {
        for unit in [
            "m",
            "m^2",
            "m^3",
            "s",
            "kg",
            "W",
            "J",
            "W/(m*K)",
            "W/(m^2*K)",
            "m^2*K/W",
            "K/W",
            "W/K",
            "W/m^2",
            "kg/m^3",
            "J/(kg*K)",
            "°C",
            "K",
        ] {
            for c in unit_conversions(value, unit) {
                let (n, u) = c.text.split_once(' ').expect("number and unit");
                let back = crate::units::parse_unit(u)
                    .expect(u)
                    .to_si(n.parse::<f64>().expect(n));
                let orig = crate::units::parse_unit(unit).expect(unit).to_si(value);
                assert!(
                    (back.value - orig.value).abs() <= 1e-5 * orig.value.abs(),
                    "{unit} -> {}",
                    c.text
                );
            }
        }
    }
}

#[test]
fn format_significant_trims() {
    assert_eq!(format_significant(140.0 * 0.001, 6), "0.14");
    assert_eq!(format_significant(-0.0000001, 6), "-1e-7");
    assert_eq!(format_significant(1234567.0, 6), "1234567");
    assert_eq!(format_significant(2.5e12, 6), "2.5e12");
    assert_eq!(format_significant(-1e-20, 2), "-1e-20");
}

fn ctx(text_with_cursor: &str) -> CompletionContext {
    let offset = text_with_cursor.find('|').expect("cursor") as u32;
    let text = text_with_cursor.replacen('|', "", 1);
    completion_context(&text, offset)
}

#[test]
fn completion_context_by_place() {
    assert_eq!(ctx("|").slot, Slot::Keyword);
    assert_eq!(ctx("node a\nno|").slot, Slot::Keyword);
    assert_eq!(ctx("node a\nno|").replace.start, 7);
    assert_eq!(ctx("link x: |").slot, Slot::Node);
    assert_eq!(ctx("link x: a to b|").slot, Slot::Node);
    assert_eq!(ctx("link x: a to b |").slot, Slot::LinkKind);
    let c = ctx("link x: a to b layer(|");
    assert_eq!(c.slot, Slot::ArgName);
    assert_eq!(c.call.as_ref().map(|c| c.index), Some(0));
    let c = ctx("link x: a to b layer(wood, thickness = 1|");
    assert_eq!(c.slot, Slot::Nothing);
    let c = ctx("link x: a to b layer(wood, thickness = 1 |");
    assert_eq!(c.slot, Slot::Unit);
    let c = ctx("link x: a to b layer(wood, thickness = 1 m, |");
    assert_eq!(c.slot, Slot::ArgName);
    let call = c.call.expect("call");
    assert_eq!(
        (call.index, call.given.clone()),
        (2, vec!["thickness".to_string()])
    );
    let c = ctx("link x: a to b layer(k = |");
    assert_eq!(c.slot, Slot::ArgValue);
    assert_eq!(c.call.and_then(|c| c.arg), Some("k".to_string()));
    assert_eq!(
        ctx("link x: a to b layer(k = sqrt(|").slot,
        Slot::Expression
    );
    assert_eq!(ctx("node a (fixed = 20 °|").slot, Slot::Unit);
    assert_eq!(ctx("node a (fixed = 20 °C) # warm |").slot, Slot::Nothing);
    assert_eq!(ctx("param x = 2 m * |").slot, Slot::Expression);
    assert_eq!(ctx("param x|").slot, Slot::Nothing);
    assert_eq!(ctx("limit l: |").slot, Slot::Measure);
    assert_eq!(
        ctx("limit l: temperature(|").slot,
        Slot::LimitSubject {
            measure: "temperature".into()
        }
    );
    assert_eq!(ctx("limit l: temperature(a) < |").slot, Slot::Expression);
    assert_eq!(ctx("buildup w {\n  inside: |").slot, Slot::ElementKind);
    let c = ctx("buildup w {\n  inside: film(h = 8 W/(m^2*K))\n  core: layer(|");
    assert_eq!(c.slot, Slot::ArgName);
    assert_eq!(
        c.call.map(|c| c.owner),
        Some(ArgOwner::Element {
            kind: "layer".into(),
            in_buildup: true,
            supplied: &["area"],
        })
    );
    assert_eq!(ctx("buildup w {\n  |").slot, Slot::Nothing);
    let c = ctx("link x: a to b layer(wood, thickness = 14 m|");
    assert_eq!(c.slot, Slot::Unit);
    let a = solved(WALL);
    assert_eq!(
        c.call.as_ref().and_then(|c| expected_dim(c, &a)),
        Some(Dim::LENGTH)
    );
    let c = ctx("node n (fixed = 20 |");
    assert_eq!(
        c.call.as_ref().and_then(|c| expected_dim(c, &a)),
        Some(Dim::TEMPERATURE)
    );
    let c = ctx("link x: a to b timber_wall(area = 2 |");
    assert_eq!(
        c.call.as_ref().and_then(|c| expected_dim(c, &a)),
        Some(Dim::AREA)
    );
    let u = ctx("material m (k = 0.04 W/(m*K|");
    assert_eq!(u.slot, Slot::Unit);
    assert_eq!(u.replace.end - u.replace.start, 1);
    assert_eq!(ctx("title \"a |").slot, Slot::Nothing);
}

#[test]
fn contextual_declarations_and_radial_build_ups_have_their_own_argument_lists() {
    let owner = |src: &str| ctx(src).call.map(|c| c.owner);
    let decl = |word| Some(ArgOwner::Declaration { word });
    assert_eq!(
        owner("node a (fixed = 1 °C)\ntransient run (|"),
        decl("transient")
    );
    assert_eq!(owner("schedule night (|"), decl("schedule"));
    assert_eq!(owner("region plate (al, |"), decl("region"));
    assert_eq!(owner("repeat seg (|"), decl("repeat"));
    assert_eq!(owner("case windy (|"), decl("case"));
    assert_eq!(owner("node a (|"), decl("node"));
    assert_eq!(owner("material m (k = 1 W/(m*K), |"), decl("material"));
    // Not a declaration: `case` is an ordinary name after `=`, and a node may be called `use`.
    assert_eq!(
        owner("link x: a to b layer(k = case|"),
        Some(ArgOwner::Element {
            kind: "layer".into(),
            in_buildup: false,
            supplied: &[],
        })
    );
    // The first line inside a repetition's braces starts a declaration.
    assert_eq!(ctx("repeat seg (count = 3) {\n  |").slot, Slot::Keyword);
    assert_eq!(ctx("schedule s {\n  |").slot, Slot::Nothing);
    // Elements of a radial build-up get their radius and length from the use, too.
    let c = ctx(
        "buildup lagging {\n  wall: cylinder(k = 50 W/(m*K), thickness = 3 mm)\n  foam: cylinder(|",
    );
    assert_eq!(
        c.call.map(|c| c.owner),
        Some(ArgOwner::Element {
            kind: "cylinder".into(),
            in_buildup: true,
            supplied: &["length", "area", "inner_radius"],
        })
    );
    let a = solved(WALL);
    let dim = |src: &str| ctx(src).call.as_ref().and_then(|c| expected_dim(c, &a));
    assert_eq!(dim("transient run (duration = 2 |"), Some(Dim::TIME));
    assert_eq!(dim("node n (capacity = 2 |"), Some(Dim::CAPACITY));
    assert_eq!(dim("material m (k_at = 2 |"), Some(Dim::TEMPERATURE));
}

#[test]
fn highlights_classify_names_by_what_they_name() {
    let a = solved(WALL);
    let h = highlights(&a, FileId(0));
    let class_of = |needle: &str| {
        h.iter()
            .find(|x| &WALL[x.span.range()] == needle)
            .map(|x| (x.class, x.declaration))
    };
    assert_eq!(class_of("title"), Some((Class::Keyword, false)));
    assert_eq!(
        class_of("wall_area"),
        Some((Class::Symbol(SymbolKind::Param), true))
    );
    assert_eq!(class_of("2.4"), Some((Class::Number, false)));
    assert_eq!(class_of("m²*K/W"), Some((Class::Unit, false)));
    assert_eq!(class_of("layer"), Some((Class::ElementKind, false)));
    assert_eq!(class_of("thickness"), Some((Class::ArgName, false)));
    assert_eq!(class_of("temperature"), Some((Class::Measure, false)));
    assert_eq!(
        class_of("north.inside"),
        Some((Class::Symbol(SymbolKind::GeneratedNode), false))
    );
    assert_eq!(
        class_of("timber_wall"),
        Some((Class::Symbol(SymbolKind::Buildup), true))
    );
    // Spans never overlap and come in order.
    assert!(h.windows(2).all(|w| w[0].span.end <= w[1].span.start));
}

mod properties {
    use super::*;
    use proptest::prelude::*;

    /// Text made of the language's pieces and the non-ASCII characters that matter for columns.
    fn model_text() -> impl Strategy<Value = String> {
        let pieces = prop::sample::select(vec![
            "node ",
            "link ",
            "material ",
            "param ",
            "buildup ",
            "limit ",
            "title ",
            "import ",
            " to ",
            "a",
            "b",
            "x.y",
            "(",
            ")",
            "{",
            "}",
            ",",
            ":",
            "=",
            " ",
            "\n",
            "12",
            ".5",
            " mm",
            " °C",
            " m²",
            "*",
            "/",
            "^",
            "-",
            "# c",
            "\"s",
            "layer",
            "film",
            "k",
            "°",
            "²",
            "😀",
        ]);
        prop::collection::vec(pieces, 0..40).prop_map(|v| v.concat())
    }

    proptest! {
        #[test]
        fn queries_never_panic_and_stay_in_bounds(text in model_text()) {
            let a = analyze("p.heat", &text, &NoImports, &Options { check_only: true, ..Options::default() });
            let hs = highlights(&a, FileId(0));
            for w in hs.windows(2) {
                prop_assert!(w[0].span.end <= w[1].span.start);
            }
            for h in &hs {
                prop_assert!(text.is_char_boundary(h.span.start as usize) && text.is_char_boundary(h.span.end as usize));
            }
            for (offset, _) in text.char_indices().chain(std::iter::once((text.len(), ' '))) {
                let c = completion_context(&text, offset as u32);
                prop_assert!(c.replace.start <= c.replace.end && c.replace.end as usize <= text.len());
                prop_assert!(text.is_char_boundary(c.replace.start as usize));
                if let Some(t) = target_at(&a, FileId(0), offset as u32) {
                    prop_assert!(t.span().end as usize <= text.len());
                }
            }
        }
    }
}
