//! `caloris materials [SEARCH]`: list the built-in material library, or the materials whose
//! name or note contains SEARCH, with the values a model would import.

use crate::{exit, usage};
use caloris_compiler::source::NoImports;
use caloris_compiler::{analyze, library, Options};

pub fn run(search: Option<&str>) -> u8 {
    let text = library::MATERIALS;
    let a = analyze(
        "caloris:materials",
        text,
        &NoImports,
        &Options {
            check_only: true,
            ..Options::default()
        },
    );
    let wanted = search.map(str::to_lowercase);
    let mut rows = Vec::new();
    for m in &a.materials {
        let start = m.span.start as usize;
        // The note is the comment closing the declaration's last line.
        let note = text
            .get(start..)
            .and_then(|rest| {
                let end = rest.find("\n\n").unwrap_or(rest.len());
                let decl = &rest[..end];
                let line = decl
                    .lines()
                    .find(|l| l.trim_start().starts_with(')') || l.contains(")  #"))?;
                line.split_once('#').map(|(_, n)| n.trim().to_string())
            })
            .unwrap_or_default();
        let hay = format!("{} {note}", m.name).to_lowercase();
        if wanted.as_ref().is_some_and(|w| !hay.contains(w.as_str())) {
            continue;
        }
        let k = if m.conductivity.is_some() {
            format!("{:.3} W/(m·K), k(T)", m.k)
        } else {
            format!("{:.3} W/(m·K)", m.k)
        };
        let rho = m.density.map(|d| format!("{d} kg/m³")).unwrap_or_default();
        let cp = m
            .specific_heat
            .map(|c| format!("{c} J/(kg·K)"))
            .unwrap_or_default();
        rows.push([m.name.clone(), k, rho, cp, note]);
    }
    if rows.is_empty() {
        return usage(format!(
            "no material in the built-in library matches `{}`; `caloris materials` lists them all",
            search.unwrap_or_default()
        ));
    }
    let heads = ["material", "k", "density", "specific heat", "note"];
    let width = |c: usize| {
        rows.iter()
            .map(|r| r[c].chars().count())
            .chain([heads[c].len()])
            .max()
            .unwrap_or(0)
    };
    let w: Vec<usize> = (0..4).map(width).collect();
    let line = |r: [&str; 5]| {
        let mut s = String::new();
        for (c, cell) in r.iter().take(4).enumerate() {
            s += cell;
            s += &" ".repeat(w[c] - cell.chars().count() + 2);
        }
        s + r[4]
    };
    println!("{}", line(heads).trim_end());
    for r in &rows {
        println!("{}", line([&r[0], &r[1], &r[2], &r[3], &r[4]]).trim_end());
    }
    println!(
        "\nimport \"caloris:materials\" to use them. Typical values for first estimates, not design values: take k from the product's data sheet for a design."
    );
    exit::OK
}
