//! Formatter snapshots (messy input → canonical output) and unit checks of its rules.

use super::format_source;

fn fmt(text: &str) -> String {
    match format_source(text) {
        Ok(s) => s,
        Err(d) => panic!("refused: {d:?}"),
    }
}

/// Format, check idempotence, and show input and output together for the snapshot.
fn show(text: &str) -> String {
    let once = fmt(text);
    let twice = fmt(&once);
    assert_eq!(once, twice, "formatting is not idempotent");
    format!("--- input\n{text}\n--- formatted\n{once}")
}

#[test]
fn messy_declarations() {
    insta::assert_snapshot!(show(
        "title   \"Garden office\"\nparam wall_area=2.4 m *3.6 m-window_area\nparam window_area = 1.2 m *0.9 m\nmaterial gypsum(k=0.25 W/(m*K))   material wood_fibre ( k = 0.040 W/(m*K) )\nnode room(fixed=20 °C)\nnode   outdoor (fixed = -8 °C)\nnode slug\nlink north :room to outdoor wall( area=wall_area )\nlimit   t:temperature( room )>=12.6 °C\n"
    ));
}

#[test]
fn buildup_block_with_comments_and_blank_lines() {
    insta::assert_snapshot!(show(
        "\n\n# Cold-store door panel\n\n\n\nbuildup door_panel{warm_side:film(h=7.7 W/(m^2*K))\n      skin:layer(steel,thickness=0.6 mm) # galvanised\n\n\n   # the core carries nearly all of the resistance\n core :   layer(pir_foam, thickness = 100mm)\n\n  cold_side: film(h = 12 W/(m^2*K))   }\nlink door: corridor to store door_panel(area = 2.1 m^2)   # whole leaf\nlink frame: corridor to store resistance(2.8 K/W)  # steel frame\n\n\n"
    ));
}

#[test]
fn comments_inside_a_declaration_break_its_group() {
    insta::assert_snapshot!(show(
        "material concrete (k = 1.65 W/(m*K), # dense, from the supplier\n  density = 2300 kg/m^3, specific_heat = 1000 J/(kg*K))\nlink a: # why this link exists\n  room to wall layer(concrete, thickness = 200 mm, area = 3 m^2)\nparam x = 2 m +\n  # half of the gap\n  3 m\n"
    ));
}

#[test]
fn a_group_broken_after_its_bracket_gets_one_item_per_line() {
    insta::assert_snapshot!(show(
        "material concrete (\n  k = 1.65 W/(m*K), density = 2300 kg/m^3,\n\n  specific_heat = 1000 J/(kg*K))\nmaterial steel (k = 50 W/(m*K),\n  density = 7850 kg/m^3)\nnode n (\n)\n"
    ));
}

#[test]
fn expressions_signs_and_calls() {
    insta::assert_snapshot!(show(
        "param a=-(  b+c )*sqrt( 4*2 cm^2/pi )\nparam b = 2 m*h\nparam c = 2 m * h\nparam d=max(1 m,-2 m)^2\nparam e = 1/(7.7 W/(m^2*K))\nparam f = -  -3 K\nparam g = t_out+(t_in-t_out)/2\nlimit l : u_value(north)≤0.30 W/(m²·K)\n"
    ));
}

#[test]
fn aligned_trailing_comments_and_declarations_in_runs() {
    insta::assert_snapshot!(show(
        "node porch_air (fixed = 35 °C) # summer evening\nnode junction (load = 3.2 W)   # the LED die\nnode slug\nnode heatsink_with_a_long_name\n\n# free nodes below\nnode board (load = 0.1 W)\nlink die_attach:  junction to slug     contact(r = 0.2 cm^2*K/W, area = chip_area)\nlink slug_body:   slug     to board    resistance(6.5 K/W)\n# a comment inside the run\nlink sink_film_long_name: board to porch_air film(h = 9 W/(m^2*K), area = 0.02 m^2)\n"
    ));
}

#[test]
fn several_declarations_on_one_line_and_one_declaration_on_several() {
    insta::assert_snapshot!(show(
        "node a node b (fixed = 1 °C) link\nab\n:\na\nto\nb\nresistance\n(\n1 K/W)\ntitle \"x\" import \"lib/materials.heat\""
    ));
}

#[test]
fn empty_and_comment_only_files() {
    assert_eq!(fmt(""), "");
    assert_eq!(fmt("\n\n   \n"), "");
    assert_eq!(
        fmt("# only a note   \n\n\n# and another\n"),
        "# only a note\n\n# and another\n"
    );
    assert_eq!(
        fmt("node a # no newline at the end"),
        "node a  # no newline at the end\n"
    );
    assert_eq!(fmt("buildup b {}\n"), "buildup b {}\n");
}

/// A CRLF file keeps its line endings (the layout is the LF file's); tabs become spaces.
#[test]
fn windows_line_endings_and_tabs() {
    assert_eq!(
        fmt("node\ta\t(fixed = 1 °C)\r\n\r\n\r\nnode b # x\r\n"),
        "node a (fixed = 1 °C)\r\n\r\nnode b  # x\r\n"
    );
    assert_eq!(
        fmt("node\ta\t(fixed = 1 °C)\n\n\nnode b # x\n"),
        "node a (fixed = 1 °C)\n\nnode b  # x\n"
    );
}

#[test]
fn syntax_errors_are_refused_not_formatted() {
    let err = format_source("node a (fixed = )\nparam x = 3 m\n").expect_err("must refuse");
    assert_eq!(err[0].code, "E002");
    let err = format_source("title \"no end\n").expect_err("must refuse");
    assert_eq!(err[0].code, "E003");
}

#[test]
fn verification_catches_a_changed_token() {
    let input = super::pieces::pieces("param a = 5 h\n");
    let err = super::verify(&input, "param a = 5 k\n").expect_err("different unit must be caught");
    assert_eq!(err[0].code, "E009");
    assert!(super::verify(&input, "param a = 5 h\n").is_ok());
    assert!(super::verify(&input, "param a = 5 h\nnode b\n").is_err());
}

/// Constructs the parser does not know yet still get a readable layout: the line rules need
/// only brackets, keywords and the analyst's line breaks.
fn layout_unchecked(text: &str) -> String {
    let p = super::pieces::pieces(text);
    let mut lines = super::layout::layout(&p);
    super::align::align_heads(&mut lines);
    super::align::render(&lines)
}

#[test]
fn unknown_blocks_keep_one_entry_per_line() {
    let text = "node plate_edge\nregion plate {material=steel\n  size = 2 m # square\n cells=10 segments(count = 4) { node tip\nlink a: b to c resistance(1 K/W) }}\n";
    insta::assert_snapshot!(format!("{}\n---\n{}", text, layout_unchecked(text)));
    let once = layout_unchecked(text);
    assert_eq!(layout_unchecked(&once), once);
}
