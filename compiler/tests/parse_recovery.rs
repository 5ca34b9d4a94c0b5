//! What the parser keeps of a broken file: the outline of the syntax tree left after error
//! recovery for every `tests/cases/errors/recovery_*.heat` case, and the parser's own errors
//! (before analysis adds its echoes). The case files pin the diagnostics; this pins what was
//! read, so a port of the parser can be checked against both. A change that keeps more is an
//! improvement to record here, not a regression.

use caloris_compiler::parser::parse;
use caloris_compiler::span::FileId;
use caloris_compiler::syntax::{ExprKind, Item, ItemKind, Module};
use std::path::PathBuf;

/// One line per declaration: its kind and name, with what a block kept inside it (the rows of
/// a table by their keys, `?` for a placeholder row; the elements of a build-up; the edges of a
/// region; the declarations of a body).
fn outline(text: &str, items: &[Item]) -> Vec<String> {
    items.iter().map(|i| describe(text, i)).collect()
}

fn describe(text: &str, item: &Item) -> String {
    let name = item.name().map_or("", |n| n.name.as_str());
    match &item.kind {
        ItemKind::Title { .. } => "title".into(),
        ItemKind::Import { .. } => "import".into(),
        ItemKind::Param { .. } => format!("param {name}"),
        ItemKind::Material { .. } => format!("material {name}"),
        ItemKind::Node { .. } => format!("node {name}"),
        ItemKind::Link { .. } => format!("link {name}"),
        ItemKind::Limit { .. } => format!("limit {name}"),
        ItemKind::Use { .. } => format!("use {name}"),
        ItemKind::Buildup { elements, .. } => {
            let names: Vec<&str> = elements.iter().map(|e| e.name.name.as_str()).collect();
            format!("buildup {name} [{}]", names.join(", "))
        }
        ItemKind::Declaration { word, rows, .. } => match rows {
            None => format!("{} {name}", word.name),
            Some(rows) => {
                let keys: Vec<&str> = rows
                    .iter()
                    .map(|r| match r.key.kind {
                        ExprKind::Missing => "?",
                        _ => &text[r.key.span.range()],
                    })
                    .collect();
                format!("{} {name} [{}]", word.name, keys.join(", "))
            }
        },
        ItemKind::Repeat { body, .. } => {
            format!("repeat {name} {{{}}}", outline(text, body).join("; "))
        }
        ItemKind::Network { body, .. } => {
            format!("network {name} {{{}}}", outline(text, body).join("; "))
        }
        ItemKind::Region { edges, .. } => {
            let sides: Vec<&str> = edges.iter().map(|e| e.side.name.as_str()).collect();
            format!("region {name} [{}]", sides.join(", "))
        }
    }
}

fn case(name: &str) -> String {
    let path = PathBuf::from(env!("CARGO_MANIFEST_DIR"))
        .join("../tests/cases/errors")
        .join(name);
    std::fs::read_to_string(&path).unwrap_or_else(|e| panic!("{}: {e}", path.display()))
}

/// Parse a case file and compare what survives, and how many errors the parser alone gives.
fn assert_kept(file: &str, errors: usize, kept: &[&str]) {
    let text = case(file);
    let (module, diags): (Module, _) = parse(&text, FileId(0));
    let got = outline(&text, &module.items);
    assert_eq!(got, kept, "{file}: what the parser keeps");
    assert_eq!(
        diags.len(),
        errors,
        "{file}: the parser's errors: {:#?}",
        diags
            .iter()
            .map(|d| format!("{} {}", d.code, d.message))
            .collect::<Vec<_>>()
    );
}

#[test]
fn declaration_words_end_the_skip() {
    assert_kept(
        "recovery_declaration_words.heat",
        9,
        &[
            "title",
            "material door_foam",
            "node store",
            "node dock",
            "node leaf",
            "schedule dock_day [0 h, 12 h]",
            "case busy_day",
            "transient shift",
            "repeat hinge {node pin; link bolt}",
            "network strip {link gap}",
            "use curtain",
            "region panel [left, right]",
            "link sill",
            "link lintel",
            "link jamb",
        ],
    );
}

#[test]
fn unfinished_lines() {
    // A trailing `*` or `=` before a line opening a declaration leaves the parameter
    // unfinished (reported, dropped) and the `schedule` and `use` are read.
    assert_kept(
        "recovery_unfinished_line.heat",
        7,
        &[
            "node shed",
            "node garden",
            "node bench",
            "limit warm",
            "buildup roof_deck [board]",
            "transient evening",
            "schedule night [0 h]",
            "use pane",
            "link floor",
        ],
    );
}

#[test]
fn table_rows_keep_placeholders() {
    assert_kept(
        "recovery_table_rows.heat",
        7,
        &[
            "node bench",
            "node outside",
            "link glass",
            "schedule night_air [0 h, ?, ?, ?, ?, 15 h, ?, ?, ?, 23 h]",
            "transient overnight",
        ],
    );
}

#[test]
fn buildup_elements_resume_at_the_next_name() {
    assert_kept(
        "recovery_buildup_elements.heat",
        5,
        &[
            "material plywood",
            "material wood_fibre",
            "material softwood",
            "node office",
            "node garden",
            "buildup office_wall [inside, battens, sheathing, outside]",
            "link wall",
        ],
    );
}

#[test]
fn unclosed_blocks_are_lost() {
    assert_kept(
        "recovery_unclosed_buildup.heat",
        2,
        &[
            "material spruce",
            "node landing",
            "node loft",
            "link hatch",
            "link frame",
        ],
    );
    assert_kept(
        "recovery_unclosed_table.heat",
        3,
        &[
            "param wall_h",
            "node kiln",
            "node shed",
            "link wall",
            "transient bisque",
            "case slow_cool",
        ],
    );
    // The open region is lost; the repetition after it is read.
    assert_kept(
        "recovery_unclosed_region.heat",
        3,
        &[
            "material screed",
            "node boiler_room",
            "node ground",
            "node pump",
            "link pump_feet",
            "repeat pipes {node loop}",
        ],
    );
    // Everything after the open `{` went into the sub-network's body, and is lost with it.
    assert_kept(
        "recovery_unclosed_block.heat",
        1,
        &["node shed", "link door"],
    );
}

#[test]
fn missing_brackets_and_the_end_of_the_file() {
    assert_kept(
        "recovery_missing_paren.heat",
        9,
        &[
            "material pine",
            "node workshop",
            "node yard",
            "node vice",
            "network lamp_post {}",
            "buildup bench_top [top]",
            "repeat stool {link legs}",
            "use post",
            "link wall",
        ],
    );
    assert_kept(
        "recovery_end_of_file.heat",
        1,
        &[
            "node frame_air",
            "node soil",
            "node night_sky",
            "link glazing",
        ],
    );
}

#[test]
fn lexical_errors() {
    // `wall` and `bore` keep the first number of `1.2.3 mm` and `2..5 mm`; a number too large
    // or too small to read is a placeholder, and its declaration is kept.
    assert_kept(
        "recovery_bad_numbers.heat",
        6,
        &[
            "material lagging_wool",
            "node steam",
            "node cellar",
            "node pipe_surface",
            "param film_h",
            "param wall",
            "param bore",
            "link lagging",
            "link air",
            "param tiny",
        ],
    );
    assert_kept(
        "recovery_unterminated_strings.heat",
        4,
        &["node oven", "node bakery", "link door"],
    );
    assert_kept(
        "recovery_unknown_characters.heat",
        8,
        &[
            "node loft",
            "param jacket",
            "param height",
            "node pipe",
            "link jacket_wall",
            "param mass",
            "param spare",
            "param cover",
            "param cap",
            "param gap",
        ],
    );
}

const SLAB_HEAD: &str = "region slab (screed, thickness = 60 mm, width = 2 m, height = 3 m, cells_x = 4, cells_y = 6) {\n";

/// The number of edges each region of `text` kept, and the parser's error count.
fn region_edges(text: &str) -> (Vec<usize>, usize, Vec<String>) {
    let (module, diags) = parse(text, FileId(0));
    let edges = module
        .items
        .iter()
        .filter_map(|i| match &i.kind {
            ItemKind::Region { edges, .. } => Some(edges.len()),
            _ => None,
        })
        .collect();
    (edges, diags.len(), outline(text, &module.items))
}

#[test]
fn a_region_with_one_bad_edge_keeps_its_other_edges() {
    let good = format!(
        "{SLAB_HEAD}  top: boiler_room film(h = 7 W/(m^2*K))\n  bottom: ground\n  left: wall\n  right: wall\n}}\nnode pump (load = 25 W)\n"
    );
    let (edges, errors, _) = region_edges(&good);
    assert_eq!((edges, errors), (vec![4], 0), "the well-formed region");

    // The same region with the `:` of one edge missing: the bad edge is skipped to the end of
    // its line, the three good edges are kept, and so is the declaration after the region.
    let bad = good.replace("bottom: ground", "bottom ground");
    let (edges, errors, kept) = region_edges(&bad);
    assert_eq!(edges, vec![3], "edges kept of the broken region");
    assert_eq!(errors, 1);
    assert_eq!(kept, ["region slab [top, left, right]", "node pump"]);

    // One bad edge per region of the case file: each region keeps its other edges.
    assert_kept(
        "recovery_region_edges.heat",
        3,
        &[
            "material aspen",
            "node sauna",
            "node underside",
            "node wall",
            "region board [top, left, right]",
            "region slat [bottom]",
            "region backrest [front, left]",
            "limit board_warm",
        ],
    );
}
