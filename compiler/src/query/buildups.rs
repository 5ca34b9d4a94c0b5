//! Build-ups as the editor sees them: the geometry a build-up's elements give it, and so the
//! arguments a link that uses it takes (`area`, or the bore of a radial one).

use crate::analysis::Analysis;
use crate::elements::shell::{self, Geometry};
use crate::schema::{self, ArgSpec};
use crate::syntax::{BuildupElement, Item, ItemKind};

fn find<'a>(items: &'a [Item], name: &str) -> Option<&'a [BuildupElement]> {
    items.iter().find_map(|item| match &item.kind {
        ItemKind::Buildup { name: n, elements } if n.name == name => Some(elements.as_slice()),
        ItemKind::Network { body, .. } | ItemKind::Repeat { body, .. } => find(body, name),
        _ => None,
    })
}

/// The geometry of the build-up called `name` in the model or its imports (a declaration inside
/// a sub-network or repetition counts by its name as written there).
pub fn buildup_geometry(a: &Analysis, name: &str) -> Option<Geometry> {
    let els = a.modules.iter().find_map(|(_, m)| find(&m.items, name))?;
    Some(shell::geometry(
        els.iter().map(|e| e.element.kind.name.as_str()),
    ))
}

/// The arguments a link that uses the build-up `name` takes, from the schema.
pub fn buildup_use_args(a: &Analysis, name: &str) -> Option<&'static [ArgSpec]> {
    buildup_geometry(a, name).map(schema::buildup_use)
}
