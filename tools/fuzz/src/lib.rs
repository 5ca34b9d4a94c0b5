//! A mutation fuzzer for the Caloris compiler that needs only a stable toolchain.
//!
//! Seeds (the examples, the case files and any folder given) are mutated ([`mutate`]) and each
//! input goes through the stages the tools run ([`oracle`]): analysis with the solve, span
//! checks, rendering, editor queries, formatting and the transient run. Inputs run in a worker
//! process ([`worker`], driven by [`child`]) so that a stack overflow or an abort becomes a
//! finding with its input instead of the end of the campaign; a hang is killed after its time
//! limit and memory growth is watched. Findings are minimized and saved ([`findings`]).

pub mod campaign;
pub mod child;
pub mod editor;
pub mod findings;
pub mod mutate;
pub mod oracle;
pub mod panics;
pub mod proc_mem;
pub mod rng;
pub mod seeds;
pub mod worker;

/// The command line's result reports (table, JSON, CSV), compiled from its own source file so
/// the fuzzer checks the very code `caloris solve` runs (the CLI is a binary, not a library).
#[path = "../../../src/output.rs"]
#[allow(dead_code)]
pub mod output;
