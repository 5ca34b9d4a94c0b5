//! The Caloris compiler: model text in; syntax tree, symbols, diagnostics, network and solution
//! out. It does no I/O of its own (imports come through a caller-supplied [`source::SourceLoader`]),
//! so the command-line tool and the language server share it unchanged.
//!
//! Pipeline: [`lexer`] → [`parser`] → [`elaborate`] (names, [`eval`] of units, [`elements`],
//! [`limits`]) → [`network`] → [`solve`] → [`results`]; [`analysis::analyze`] runs it all.

pub mod analysis;
pub mod assemble;
pub mod budget;
pub mod compare;
pub mod conductivity;
pub mod convection;
pub mod diagnostic;
pub mod elaborate;
pub mod elements;
pub mod eval;
pub mod expand;
pub mod export;
pub mod factor_cache;
pub mod fluid;
pub mod format;
pub mod formula;
pub mod insulation_loss;
pub mod laws;
pub mod lexer;
pub mod library;
pub mod limits;
pub mod lost_names;
pub mod network;
pub mod nonlinear;
pub mod parser;
pub mod project_files;
pub mod query;
pub mod radial;
pub mod region;
pub mod render;
pub mod results;
pub mod schema;
pub mod solve;
pub mod source;
pub mod span;
pub mod study;
pub mod study_warnings;
pub mod symbols;
pub mod syntax;
pub mod transient;
pub mod units;
pub mod vocabulary;

pub use analysis::{analyze, Analysis, Options};
pub use diagnostic::{Diagnostic, Severity};
