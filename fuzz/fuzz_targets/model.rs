//! Coverage-guided: every input goes through the same stages as the stable fuzzer's worker
//! (analysis and solve, reports, editor queries, formatting, the transient run). Any problem
//! the oracle reports (a caught panic, a span outside the text, a formatter that changes the
//! model) is turned into a crash so libFuzzer keeps the input; an abort, a hang past
//! `-timeout` or memory past `-rss_limit_mb` it catches itself.
#![no_main]

use caloris_fuzz::oracle::{exercise, Observer, Problem};
use libfuzzer_sys::fuzz_target;

/// Declarations and region cells an input may expand to.
const SIZE_BUDGET: u64 = 20_000;

struct CrashOnProblem;

impl Observer for CrashOnProblem {
    fn stage(&mut self, _name: &'static str) {}
    fn problem(&mut self, p: Problem) {
        panic!("{} in {}: {} — {}", p.kind, p.stage, p.key, p.detail);
    }
}

fuzz_target!(|data: &[u8]| {
    // The tools read models as UTF-8 and refuse other bytes before parsing.
    if let Ok(text) = std::str::from_utf8(data) {
        // A smaller model budget than the tools' own, as the stable fuzzer's bounded run uses:
        // what is past it ends in E220 at once, so the time goes to the paths, not to building
        // legitimately large models.
        exercise(text, Some(SIZE_BUDGET), &mut CrashOnProblem);
    }
});
