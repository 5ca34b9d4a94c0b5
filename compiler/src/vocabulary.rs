//! Every word a model can be written with, read from the schema (`crate::schema`): for tools
//! that write or mutate model text (the fuzzer's dictionary, the robustness property tests), so
//! none keeps its own copy of the language.

use crate::schema::{self, DECLARATIONS, FUNCTIONS, MEASURES, REGION_SIDES};

/// Words the schema lists in no argument table: the names a copy of a `repeat` sees and the
/// call that writes a conductivity table.
const OTHER_NAMES: &[&str] = &["index", "first", "previous", "table"];

/// Every word of the schema (declaration words and keywords, every declaration's and element
/// kind's argument names and the words of its choices, functions and constants, limit measures, region sides) and
/// [`OTHER_NAMES`], sorted, each once.
pub fn words() -> Vec<&'static str> {
    let mut out: Vec<&'static str> = schema::keywords()
        .chain(schema::declaration_words())
        .chain(FUNCTIONS.iter().map(|f| f.name))
        .chain(schema::CONSTANTS.iter().map(|c| c.0))
        .chain(MEASURES.iter().map(|m| m.name))
        .chain(REGION_SIDES.iter().map(|s| s.0))
        .chain(OTHER_NAMES.iter().copied())
        .collect();
    for d in DECLARATIONS {
        out.extend(d.arg_specs().iter().map(|a| a.name));
    }
    for kind in schema::element_kinds() {
        out.push(kind.name());
        out.extend(kind.params().iter().map(|p| p.name));
        for p in kind.params() {
            if let schema::ArgType::Choice(words) = p.ty {
                out.extend(words.iter().copied());
            }
        }
    }
    out.sort_unstable();
    out.dedup();
    out
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::source::NoImports;
    use crate::{analyze, Options};

    #[test]
    fn holds_the_language_from_every_table() {
        let w = words();
        for word in [
            "node",
            "repeat",
            "schedule",
            "layer",
            "thickness",
            "u_value",
            "left",
        ] {
            assert!(w.contains(&word), "{word}");
        }
        assert!(w.windows(2).all(|p| p[0] < p[1]), "sorted and distinct");
    }

    /// Each argument listed here is one the compiler knows: a node accepts its own (no E204
    /// "unknown argument"), and every keyword is reserved (it cannot name a node).
    #[test]
    fn the_listed_words_are_the_compilers() {
        for arg in [
            "fixed", "load", "capacity", "material", "volume", "mass", "initial",
        ] {
            let a = analyze(
                "v.heat",
                &format!("node n ({arg} = 1)\n"),
                &NoImports,
                &Options::default(),
            );
            assert!(
                a.diagnostics.iter().all(|d| d.code != "E204"),
                "`{arg}` is not a node argument: {:?}",
                a.diagnostics
            );
        }
        for kw in schema::keywords() {
            let a = analyze(
                "v.heat",
                &format!("node {kw} (fixed = 1 °C)\n"),
                &NoImports,
                &Options::default(),
            );
            assert!(a.has_errors(), "`{kw}` named a node");
        }
    }
}
