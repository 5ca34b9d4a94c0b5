//! Pass 9, limits: each design limit's value is evaluated and its measure and subject checked
//! against the assembled network (`crate::limits`).

use super::{Cx, Kinds};
use crate::limits::{self, LimitSpec};
use crate::syntax::{Item, ItemKind};

impl Cx<'_> {
    pub(super) fn limits(&mut self, items: &[&Item]) -> Vec<LimitSpec> {
        let mut specs = Vec::new();
        for item in items {
            let ItemKind::Limit {
                name,
                measure,
                subject,
                op,
                value,
            } = &item.kind
            else {
                continue;
            };
            let kinds = Kinds(&self.symbols);
            let q = self.ev.eval(value, &kinds);
            match limits::check_limit(
                name,
                measure,
                subject,
                *op,
                value,
                q,
                self.asm.net(),
                &mut self.symbols,
                self.sources,
            ) {
                Ok(spec) => specs.push(spec),
                Err(Some(d)) => self.diags.push(d),
                Err(None) => {}
            }
        }
        specs
    }
}
