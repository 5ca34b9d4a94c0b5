//! Every word a model can be written with: the keywords, the block and declaration words, the
//! element kinds with their argument names, the limit measures, the functions, region sides and
//! the arguments of nodes, repetitions and transient runs. For tools that write or mutate model
//! text (the fuzzer's dictionary, the robustness property tests), so none keeps its own copy of
//! the language; the lists that have a home elsewhere in the compiler are read from there.

use crate::elements;
use crate::limits::MEASURES;
use crate::region::SIDES;
use crate::syntax::{BLOCK_WORDS, DECLARATION_WORDS};

/// The lexer's reserved words.
pub const KEYWORDS: &[&str] = &[
    "title", "import", "param", "material", "node", "link", "buildup", "limit", "to",
];

/// The functions an expression may call (`pi` takes no arguments).
pub const FUNCTIONS: &[&str] = &["sqrt", "ln", "exp", "abs", "min", "max", "pi"];

/// Argument and key names that belong to no element kind: a node's, a repetition's (and the
/// names a copy sees), a region's cell counts, a schedule's and a transient run's.
pub const ARGUMENTS: &[&str] = &[
    "fixed",
    "load",
    "capacity",
    "material",
    "volume",
    "mass",
    "initial",
    "count",
    "first",
    "index",
    "previous",
    "cells_x",
    "cells_y",
    "repeat",
    "duration",
    "step",
    "output",
    "tolerance",
    "start",
    "table",
];

/// All of the above, sorted, each once.
pub fn words() -> Vec<&'static str> {
    let mut out: Vec<&'static str> = KEYWORDS
        .iter()
        .chain(BLOCK_WORDS)
        .chain(DECLARATION_WORDS)
        .chain(FUNCTIONS)
        .chain(ARGUMENTS)
        .chain(SIDES)
        .copied()
        .chain(MEASURES.iter().map(|m| m.0))
        .collect();
    for kind in elements::ALL {
        out.push(kind.name());
        out.extend(kind.params().iter().map(|p| p.name));
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
        for kw in KEYWORDS {
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
