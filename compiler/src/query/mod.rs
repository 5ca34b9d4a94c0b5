//! Questions an editor asks about an analysed model, answered from the [`Analysis`] alone: what
//! is at a position, how each token should be coloured, what may be typed at a place, which
//! spans a rename must edit, how a node's heat balances and what a literal converts to.
//!
//! The language server maps these answers to protocol types; it holds no parsing or physics of
//! its own, so everything that needs the syntax tree, the lexer or the units lives here.
//!
//! [`Analysis`]: crate::analysis::Analysis

mod at;
mod balance;
mod buildups;
mod context;
mod convert;
mod highlight;
mod networks;
mod rename;

pub use at::{target_at, Target};
pub use balance::{node_balance, preferred_system, NodeBalance};
pub use buildups::{buildup_geometry, buildup_use_args};
pub use context::{completion_context, expected_dim, ArgOwner, CallInfo, CompletionContext, Slot};
pub use convert::{format_significant, unit_conversions, Conversion};
pub use highlight::{highlights, Class, Highlight};
pub use networks::{network_at, networks, NetworkRefs};
pub use rename::{check_new_name, rename_edits};

#[cfg(test)]
mod tests;
