//! The argument reference of `docs/language.md`, written from the schema so that the docs
//! cannot drift from what the compiler checks (a test compares the two).

use super::{
    buildup_use, element_kinds, ArgSpec, DeclArgs, CONSTANTS, DECLARATIONS, FUNCTIONS, MEASURES,
    OTHER_KEYWORDS, REGION_SIDES,
};
use crate::elements::shell::Geometry;
use std::fmt::Write;

/// Marks the start of the generated reference in `docs/language.md`.
pub const BEGIN: &str = "<!-- BEGIN generated from compiler/src/schema: do not edit by hand -->";
/// Marks its end.
pub const END: &str = "<!-- END generated from compiler/src/schema -->";

/// The reference, from [`BEGIN`] to [`END`] inclusive.
pub fn markdown_reference() -> String {
    let mut out = format!("{BEGIN}\n\n");
    out.push_str("### Declaration words\n\n");
    out.push_str("| word | form | what it declares |\n|---|---|---|\n");
    for d in DECLARATIONS {
        let word = if d.reserved {
            format!("`{}`", d.word)
        } else {
            format!("`{}` (contextual)", d.word)
        };
        let _ = writeln!(out, "| {word} | `{}` | {} |", d.form, d.doc);
    }
    for (k, doc) in OTHER_KEYWORDS {
        let _ = writeln!(out, "| `{k}` (keyword) | | {doc} |");
    }
    out.push('\n');
    for d in DECLARATIONS {
        if let DeclArgs::Fixed(specs) = d.args {
            let _ = writeln!(out, "### Arguments of `{}`\n", d.word);
            let _ = writeln!(out, "Example: `{}`\n", d.example);
            table(&mut out, specs);
        }
    }
    let _ = writeln!(
        out,
        "### Arguments of a link that uses a build-up\n\nThe first may be written without its name.\n"
    );
    for (geom, what) in [
        (Geometry::Plane, "Plane build-up"),
        (
            Geometry::Cylinder,
            "Cylindrical build-up (`cylinder` shells)",
        ),
        (Geometry::Sphere, "Spherical build-up (`sphere` shells)"),
    ] {
        let _ = writeln!(out, "{what}:\n");
        table(&mut out, buildup_use(geom));
    }
    out.push_str("### Arguments of the element kinds\n\n");
    out.push_str("The first argument may be written without its name. Inside a build-up, `area` comes from the link that uses it (for a radial build-up also `inner_radius` and `length`). Formulas and sources are in [elements.md](elements.md).\n\n");
    for k in element_kinds() {
        let _ = writeln!(out, "`{}`: {}\n", k.name(), k.summary());
        table(&mut out, k.params());
    }
    out.push_str("### Sides of a region\n\n| side | where |\n|---|---|\n");
    for (s, doc) in REGION_SIDES {
        let _ = writeln!(out, "| `{s}` | {doc} |");
    }
    out.push_str("\n### Functions and constants\n\n| name | meaning |\n|---|---|\n");
    for f in FUNCTIONS {
        let _ = writeln!(out, "| `{}` | {} |", f.signature(), f.doc);
    }
    for (c, doc) in CONSTANTS {
        let _ = writeln!(out, "| `{c}` | {doc} |");
    }
    out.push_str(
        "\n### Measures of limits\n\n| measure | subject | value | meaning |\n|---|---|---|---|\n",
    );
    for m in MEASURES {
        let _ = writeln!(
            out,
            "| `{}` | {} | {} | {} |",
            m.name,
            m.subject,
            m.dim.describe(),
            m.doc
        );
    }
    let _ = write!(out, "\n{END}");
    out
}

fn table(out: &mut String, specs: &[ArgSpec]) {
    out.push_str("| argument | value | needed | range | default | meaning |\n");
    out.push_str("|---|---|---|---|---|---|\n");
    for s in specs {
        let range = s.range.describe();
        let _ = writeln!(
            out,
            "| `{}` | {} | {} | {} | {} | {} |",
            s.name,
            s.ty.describe(),
            s.need.describe(),
            if range.is_empty() {
                "—".into()
            } else {
                range
            },
            s.default.unwrap_or("—"),
            s.doc
        );
    }
    out.push('\n');
}
