//! The size budget of one model: how many declarations and region cells it may make once every
//! `repeat`, `use` and `region` is expanded.
//!
//! Each block has its own limit (copies per `repeat`, cells per region, nesting depth), but
//! nesting multiplies them: two nested repeats of 100 000 copies are 10¹⁰ declarations, far
//! past any machine's memory. So before a block is expanded, [`size_of`] counts what it would
//! make — by walking its syntax, never by making it — and the expander refuses a block that
//! would take the model past [`MODEL_BUDGET`] with E220, naming the nesting and the total.

use crate::diagnostic::Diagnostic;
use crate::span::Span;
use crate::syntax::{Arg, Expr, Item, ItemKind};
use rustc_hash::FxHashMap;

/// Most declarations plus region cells one model may make after expansion. Millions of nodes
/// are legitimate models; 10¹⁰ are a typing slip. Sized so that a model at the budget still
/// fits the memory of an ordinary workstation.
pub const MODEL_BUDGET: u64 = 5_000_000;

/// What a list of items would make, and the chain of nested blocks that makes most of it
/// (outermost first) for the message.
#[derive(Clone, Debug, Default)]
pub struct Size {
    pub total: u64,
    pub chain: Vec<String>,
}

/// Counts what items would make. `count` evaluates a `count`, `cells_x` or `cells_y` to a
/// number where it can (a count that depends on a copy's `index` cannot be known before the
/// copy exists; it counts as 1 here and is checked again when the copy is expanded).
pub struct Counter<'a> {
    pub networks: &'a FxHashMap<String, &'a [Item]>,
    pub count: &'a mut dyn FnMut(&Expr) -> Option<f64>,
    memo: FxHashMap<String, Size>,
    /// Whether to name the nesting in [`Size::chain`]. Only a refused block's message needs
    /// it, and the expander counts every nested block once per copy of what encloses it, so
    /// the names are left out of the counts that fit (see [`Counter::describing`]).
    describe: bool,
}

impl<'a> Counter<'a> {
    pub fn new(
        networks: &'a FxHashMap<String, &'a [Item]>,
        count: &'a mut dyn FnMut(&Expr) -> Option<f64>,
    ) -> Self {
        Counter {
            networks,
            count,
            memo: FxHashMap::default(),
            describe: false,
        }
    }

    /// The same count with the chain of nested blocks named, for the message of E220.
    pub fn describing(mut self) -> Self {
        self.describe = true;
        self
    }

    /// What `items` would make, nested at most `depth_left` more levels (deeper blocks are
    /// refused with E218 by the expander and make nothing).
    pub fn size_of(&mut self, items: &[Item], depth_left: usize) -> Size {
        let mut size = Size::default();
        let mut biggest = 0;
        for item in items {
            let s = self.item(item, depth_left);
            if s.total > biggest && !s.chain.is_empty() {
                biggest = s.total;
                size.chain = s.chain.clone();
            }
            size.total = size.total.saturating_add(s.total);
        }
        size
    }

    /// What one item would make.
    pub fn item(&mut self, item: &Item, depth_left: usize) -> Size {
        match &item.kind {
            ItemKind::Network { .. } => Size::default(),
            ItemKind::Repeat { name, args, body } => {
                if depth_left == 0 {
                    return Size::default();
                }
                let copies = self.arg(args, "count", 0).unwrap_or(1);
                let inner = self.size_of(body, depth_left - 1);
                let chain = self.chain(inner.chain, || {
                    format!("`repeat {}` ({} copies)", name.name, group(copies))
                });
                Size {
                    // A copy that makes nothing still costs its expansion: each counts at
                    // least one, so 10¹⁰ copies of an empty body are refused too.
                    total: copies.saturating_mul(inner.total.max(1)),
                    chain,
                }
            }
            ItemKind::Use { name, network, .. } => {
                if depth_left == 0 {
                    return Size::default();
                }
                let inner = match self.memo.get(&network.name) {
                    Some(s) => s.clone(),
                    None => {
                        // An unknown network makes nothing but still costs its error: each
                        // use counts one, so 10¹⁰ uses of a misspelt name are refused too.
                        let Some(body) = self.networks.get(&network.name).copied() else {
                            return Size {
                                total: 1,
                                chain: Vec::new(),
                            };
                        };
                        // Mark the network while it is being counted, so a network that uses
                        // itself counts as empty here (the expander reports the cycle).
                        self.memo.insert(network.name.clone(), Size::default());
                        let s = self.size_of(body, depth_left - 1);
                        self.memo.insert(network.name.clone(), s.clone());
                        s
                    }
                };
                let chain = self.chain(inner.chain, || {
                    format!("`use {}` of `{}`", name.name, network.name)
                });
                Size {
                    // The use itself counts one: an empty network used 10¹⁰ times is still
                    // 10¹⁰ expansions.
                    total: inner.total.saturating_add(1),
                    chain,
                }
            }
            ItemKind::Region { name, args, .. } => {
                let nx = self.arg(args, "cells_x", usize::MAX).unwrap_or(1);
                let ny = self.arg(args, "cells_y", usize::MAX).unwrap_or(1);
                let mut cells = nx.saturating_mul(ny);
                if cells > crate::region::MAX_CELLS as u64 {
                    // Past the region's own limit: the region reports E216 and makes nothing.
                    cells = 0;
                }
                let chain = self.chain(Vec::new(), || {
                    format!("`region {}` ({} cells)", name.name, group(cells))
                });
                Size {
                    total: cells.saturating_add(1),
                    chain,
                }
            }
            _ => Size {
                total: 1,
                chain: Vec::new(),
            },
        }
    }

    /// `this` block in front of the chain `inner` nested in it, when describing.
    fn chain(&self, inner: Vec<String>, this: impl FnOnce() -> String) -> Vec<String> {
        if !self.describe {
            return Vec::new();
        }
        let mut chain = vec![this()];
        chain.extend(inner);
        chain
    }

    /// A whole, positive count argument (named, or the first positional one when
    /// `positional` is 0), or `None` when it is missing or not a usable number.
    fn arg(&mut self, args: &[Arg], key: &str, positional: usize) -> Option<u64> {
        let a = args.iter().enumerate().find_map(|(i, a)| match &a.name {
            Some(n) if n.name == key => Some(a),
            None if i == positional => Some(a),
            _ => None,
        })?;
        let v = (self.count)(&a.value)?;
        // Anything above 2⁶³ is already far past every budget; saturate rather than wrap.
        (v.is_finite() && v >= 1.0).then_some(if v >= 9.2e18 { u64::MAX } else { v as u64 })
    }
}

/// The E220 error for a block that would make `size` more, with `made` already made, against
/// `budget` ([`MODEL_BUDGET`] unless the caller set another).
pub fn over_budget(what: &str, span: Span, size: &Size, made: u64, budget: u64) -> Diagnostic {
    let total = made.saturating_add(size.total);
    let nesting = if size.chain.len() > 1 {
        format!(" (nesting: {})", size.chain.join(" › "))
    } else {
        String::new()
    };
    Diagnostic::error(
        "E220",
        format!(
            "this {what} would make {} declarations and region cells{nesting}, taking the model to {}; a model may make at most {}",
            big(size.total),
            big(total),
            group(budget)
        ),
        span,
    )
    .with_label("too large to build")
    .with_help("nested counts multiply: lower a `count` or the cells of a region, or split the model into several files")
}

/// `12 345 678` (thin groups of three), or `1.0e15` for numbers too long to read.
fn big(n: u64) -> String {
    if n >= 1_000_000_000_000 {
        if n == u64::MAX {
            "more than 1.8e19".to_string()
        } else {
            format!("{:.1e}", n as f64)
        }
    } else {
        group(n)
    }
}

fn group(n: u64) -> String {
    let digits = n.to_string();
    let mut out = String::new();
    for (i, c) in digits.chars().enumerate() {
        if i > 0 && (digits.len() - i).is_multiple_of(3) {
            out.push(' ');
        }
        out.push(c);
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn groups_digits_in_threes() {
        assert_eq!(group(5_000_000), "5 000 000");
        assert_eq!(group(999), "999");
        assert_eq!(big(10_000_000_000_000), "1.0e13");
    }
}
