//! The bundled material library: it checks cleanly, every material states k, density and
//! specific heat, and every one is marked with its source or as a typical value from memory.

use caloris_compiler::source::NoImports;
use caloris_compiler::{analyze, Options};

#[test]
fn every_library_material_is_complete_and_marked() {
    let path = concat!(env!("CARGO_MANIFEST_DIR"), "/library/materials.heat");
    let text = std::fs::read_to_string(path).expect("library file");
    let a = analyze(
        "library/materials.heat",
        &text,
        &NoImports,
        &Options {
            check_only: true,
            ..Options::default()
        },
    );
    assert!(a.diagnostics.is_empty(), "{:?}", a.diagnostics);
    assert!(a.materials.len() >= 25, "{} materials", a.materials.len());
    for m in &a.materials {
        assert!(
            m.density.is_some() && m.specific_heat.is_some(),
            "`{}` lacks density or specific heat",
            m.name
        );
        // The declaration's last line carries its mark.
        let decl_end = text[m.span.start as usize..]
            .find(")  ")
            .map(|i| m.span.start as usize + i)
            .expect("a comment after the declaration");
        let line_end = text[decl_end..]
            .find('\n')
            .map(|i| decl_end + i)
            .unwrap_or(text.len());
        let note = &text[decl_end..line_end];
        assert!(
            note.contains("from memory") || note.contains("source:"),
            "`{}` is not marked: {note}",
            m.name
        );
    }
    assert!(
        text.contains("NOT design values") && text.contains("data sheet"),
        "the caution is missing"
    );
}
