//! Elaboration: from checked declarations to a network in SI units, in named passes, each in
//! its own file and run in this order:
//!
//! 1. [`names`]: every name into the symbol table (one namespace per model; duplicates are
//!    E201), imported declarations that may not be imported set aside (W105);
//! 2. [`params`]: every parameter evaluated, so errors in unused ones are reported too;
//! 3. [`materials`]: each material's conductivity (constant, k(T) or a table) and capacity;
//! 4. [`schedules`]: the time tables boundary temperatures and loads may follow;
//! 5. [`nodes`]: declared nodes with their boundary temperatures, loads and what transient runs
//!    need of them ([`dynamics`]);
//! 6. [`generated`]: the interface nodes of build-up uses and elements' internal nodes, before
//!    any link, so that a link may end on one;
//! 7. [`regions`]: cells, the links between them, edges and faces;
//! 8. [`links`]: element links, the parts of elements that expand, build-up uses
//!    ([`buildups`]);
//! 9. [`limits`]: design limits against the assembled network;
//! 10. the Biot-number check of lumped bodies ([`dynamics`]) and [`studies`]: cases and
//!     transient runs;
//! 11. [`connectivity`]: unconnected boundaries, no fixed temperature, floating groups.
//!
//! Arguments are checked against the schema (`args`, `crate::schema`), and only the
//! [`Assembler`](crate::assemble::Assembler) puts nodes and links into the network.

mod args;
mod buildups;
mod connectivity;
mod context;
mod dynamics;
mod generated;
mod limits;
mod links;
mod materials;
mod names;
mod nodes;
mod params;
mod regions;
mod schedules;
mod studies;
mod value_range;

use crate::diagnostic::Diagnostic;
use crate::elements::Material;
use crate::eval::Evaluator;
use crate::limits::LimitSpec;
use crate::network::Network;
use crate::source::Sources;
use crate::symbols::SymbolTable;
use crate::syntax::{ItemKind, Module};
use context::{Cx, Kinds};

pub use buildups::check_buildup_kinds;
pub use connectivity::floating_groups;
pub use dynamics::{biot_number, Biot, BIOT_LUMPED};
pub use params::fits_parameter;
pub use value_range::range_error;

/// Everything elaboration produces. `network` is complete only when `diags` has no error.
pub struct Elaborated {
    pub network: Network,
    pub materials: Vec<Material>,
    pub limits: Vec<LimitSpec>,
    pub symbols: SymbolTable,
    /// Parameter values in SI, for hover.
    pub params: Vec<(String, Option<crate::units::Quantity>)>,
    pub title: Option<String>,
    pub diags: Vec<Diagnostic>,
    /// Declared transient runs and cases.
    pub studies: crate::transient::model::Studies,
}

/// Elaborate parsed modules (the root first, then imports) into a network.
pub fn elaborate(
    modules: &[&Module],
    sources: &Sources,
    overrides: &[(String, crate::units::Quantity)],
) -> Elaborated {
    let names::Names {
        items,
        symbols,
        title,
        diags,
    } = names::collect(modules);
    let params = items.iter().filter_map(|i| match &i.kind {
        ItemKind::Param { name, value } => Some((name, value)),
        _ => None,
    });
    let mut ev = Evaluator::new(params);
    for (n, q) in overrides {
        ev.set_override(n, *q);
    }
    let mut cx = Cx::new(ev, symbols, sources, diags);
    let params = cx.params(&items);
    cx.materials(&items);
    cx.schedules(&items);
    cx.nodes(&items);
    let buildups = buildups::declared(&items);
    cx.generated_nodes(&items, &buildups);
    cx.regions(&items);
    cx.links(&items, &buildups);
    let limits = cx.limits(&items);
    cx.biot_warnings();
    cx.studies(&items);
    cx.connectivity();

    for (name, span) in std::mem::take(&mut cx.ev.references) {
        cx.symbols.add_ref(&name, span);
    }
    let mut diags = cx.diags;
    diags.extend(cx.ev.diags);
    Elaborated {
        network: cx.asm.finish(cx.timed.dynamics),
        materials: cx.materials,
        limits,
        symbols: cx.symbols,
        params,
        title,
        diags,
        studies: cx.timed.studies,
    }
}

/// Names in sorted order, so that a suggestion does not hang on the hasher's order.
fn sorted<'a>(names: impl Iterator<Item = &'a str>) -> Vec<&'a str> {
    let mut v: Vec<&str> = names.collect();
    v.sort_unstable();
    v
}
