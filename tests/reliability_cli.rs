//! Every reproducer in tests/cases/reliability/ through the built `caloris` binary, as an
//! analyst or a CI job would meet it: `check`, `solve` (table and JSON), `fmt --check` and `run`
//! end with an ordinary exit status (never a panic, an abort or a kill), within a time limit,
//! and `solve` reports exactly the error codes the file expects of itself.

#[path = "../lsp/tests/support/corpus.rs"]
mod corpus;

use corpus::{expected_errors, reliability_cases};
use std::collections::BTreeSet;
use std::io::Read;
use std::path::Path;
use std::process::{Command, Stdio};
use std::time::{Duration, Instant};

/// Far above what any of these takes (each ends in well under a second in a release build);
/// only a hang or a runaway allocation comes near it.
const LIMIT: Duration = Duration::from_secs(60);

/// The codes of the errors the rendered report shows (`[E220] Error: ...`).
fn reported_errors(output: &str) -> BTreeSet<String> {
    output
        .lines()
        .filter_map(|l| {
            let l = l.trim_start();
            let code = l.strip_prefix('[')?.split(']').next()?;
            l.contains("] Error:").then(|| code.to_string())
        })
        .collect()
}

struct Ran {
    code: Option<i32>,
    output: String,
}

/// Run the binary with a time limit; a run past it is killed and reported as a hang.
fn run(args: &[&str], file: &Path) -> Ran {
    let mut child = Command::new(env!("CARGO_BIN_EXE_caloris"))
        .args(args)
        .arg(file)
        .env("NO_COLOR", "1")
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .expect("the binary starts");
    // Read both pipes while the child runs: a report larger than a pipe's buffer would
    // otherwise block the child and look like a hang.
    let drain = |pipe: Option<Box<dyn Read + Send>>| {
        std::thread::spawn(move || {
            let mut text = String::new();
            if let Some(mut p) = pipe {
                let _ = p.read_to_string(&mut text);
            }
            text
        })
    };
    let out = drain(
        child
            .stdout
            .take()
            .map(|p| Box::new(p) as Box<dyn Read + Send>),
    );
    let err = drain(
        child
            .stderr
            .take()
            .map(|p| Box::new(p) as Box<dyn Read + Send>),
    );
    let start = Instant::now();
    let status = loop {
        if let Some(status) = child.try_wait().expect("wait") {
            break Some(status);
        }
        if start.elapsed() > LIMIT {
            let _ = child.kill();
            let _ = child.wait();
            break None;
        }
        std::thread::sleep(Duration::from_millis(20));
    };
    let output = out.join().unwrap_or_default() + &err.join().unwrap_or_default();
    Ran {
        code: status.and_then(|s| s.code()),
        output,
    }
}

#[test]
fn every_reproducer_ends_in_an_ordinary_exit_from_every_command() {
    let mut failures = Vec::new();
    for file in reliability_cases() {
        let name = file
            .file_name()
            .unwrap_or_default()
            .to_string_lossy()
            .to_string();
        let text = std::fs::read_to_string(&file).expect("case text");
        let expected = expected_errors(&text);
        let commands: &[&[&str]] = &[
            &["check"],
            &["solve"],
            &["solve", "--format", "json"],
            &["fmt", "--check"],
            &["run"],
        ];
        for args in commands {
            let ran = run(args, &file);
            let what = format!("{name}: caloris {}", args.join(" "));
            match ran.code {
                // 0 fine, 1 errors in the model, 2 a usage error (`run` without a
                // transient), 3 a failed limit.
                Some(0..=3) if !ran.output.contains("panicked") => {}
                Some(c) => failures.push(format!("{what}: exit {c}\n{}", tail(&ran.output))),
                None => failures.push(format!("{what}: killed by a signal or past {LIMIT:?}")),
            }
            if args == &["solve"] {
                let got = reported_errors(&ran.output);
                if got != expected {
                    failures.push(format!(
                        "{what}: errors {got:?}, the file expects {expected:?}"
                    ));
                }
            }
        }
    }
    assert!(failures.is_empty(), "{}", failures.join("\n\n"));
}

fn tail(s: &str) -> String {
    let lines: Vec<&str> = s.lines().collect();
    lines[lines.len().saturating_sub(12)..].join("\n")
}
