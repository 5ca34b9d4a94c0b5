//! BOUNDED FUZZING CAMPAIGN in the test suite: 400 mutated models from the fixed seed below,
//! each through analysis, solve, rendering, the CLI's reports, the language server's features,
//! formatting and the transient run, in worker processes. Any crash, caught panic, hang,
//! memory blow-up, span outside its text, non-finite success or formatter without a fixed
//! point fails the test, with the reproducer saved under the target folder. Takes about 20 s
//! in a debug build; longer campaigns: `cargo run --release -p caloris-fuzz -- --seconds 300`.
//!
//! Slowness alone is not judged here: a debug build is ten to thirty times slower than a
//! release build, so the per-input budget is left to release campaigns, and inputs are kept
//! to 32 KiB (release campaigns go to 256 KiB) and models to 20 000 declarations once
//! expanded (`Options::size_budget`; release campaigns use the compiler's 5 000 000), so no
//! input has a reason to come near the hang limit.

use std::path::PathBuf;
use std::process::Command;

const EXECS: &str = "400";
const SEED: &str = "20261203";

#[test]
fn bounded_fuzz_campaign_finds_nothing() {
    let out = PathBuf::from(env!("CARGO_TARGET_TMPDIR")).join("fuzz-findings-bounded");
    let _ = std::fs::remove_dir_all(&out);
    let run = Command::new(env!("CARGO_BIN_EXE_caloris-fuzz"))
        .args(["--execs", EXECS, "--seed", SEED, "--minimize-seconds", "0"])
        .args(["--max-input-kb", "32", "--size-budget", "20000"])
        .args(["--budget-ms", "600000", "--hang-seconds", "20"])
        .args(["--memory-mb", "500"])
        .arg("--out")
        .arg(&out)
        .output()
        .expect("the fuzzer runs");
    let stdout = String::from_utf8_lossy(&run.stdout);
    let stderr = String::from_utf8_lossy(&run.stderr);
    println!("{stdout}");
    assert!(
        run.status.code().is_some_and(|c| c == 0 || c == 1),
        "the fuzzer failed to run ({}):\n{stderr}",
        run.status
    );
    assert!(
        stdout.contains(&format!("executions: {EXECS} in")),
        "the campaign did not run its {EXECS} executions:\n{stdout}\n{stderr}"
    );

    let index = std::fs::read_to_string(out.join("findings.tsv")).expect("the findings index");
    let failing: Vec<&str> = index.lines().skip(1).collect();
    assert!(
        failing.is_empty(),
        "the bounded campaign (seed {SEED}) found {} problem(s); reproducers in {}:\n{}\n\
         replay one with `cargo run --release -p caloris-fuzz -- --replay FILE`",
        failing.len(),
        out.display(),
        failing.join("\n")
    );
}
