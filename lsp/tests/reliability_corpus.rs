//! Every reproducer in tests/cases/reliability/ opened in the server: each document gets the
//! error codes it expects of itself (the same as the command line reports), the server answers
//! a request on each, and it is still serving at the end.

mod support;

use serde_json::{json, Value};
use std::collections::BTreeSet;
use std::time::Duration;
use support::corpus::{expected_errors, reliability_cases};
use support::in_process::start;

/// Far above what any of these takes; only a hang comes near it.
const T: Duration = Duration::from_secs(60);

fn error_codes(diags: &Value) -> BTreeSet<String> {
    diags
        .as_array()
        .into_iter()
        .flatten()
        .filter(|d| d["severity"] == json!(1))
        .map(|d| d["code"].as_str().unwrap_or("").to_string())
        .collect()
}

#[test]
fn every_reproducer_gets_its_expected_errors_and_the_server_keeps_serving() {
    let dir = std::env::temp_dir().join(format!("caloris-lsp-corpus-{}", std::process::id()));
    let _ = std::fs::remove_dir_all(&dir);
    std::fs::create_dir_all(dir.join(".git")).expect("dir");
    let root = format!("file://{}", dir.display());
    let mut c = start();
    c.initialize(&root);
    let mut failures = Vec::new();
    for file in reliability_cases() {
        let name = file
            .file_name()
            .unwrap_or_default()
            .to_string_lossy()
            .to_string();
        let text = std::fs::read_to_string(&file).expect("case");
        std::fs::write(dir.join(&name), &text).expect("copy");
        let uri = format!("file://{}/{name}", dir.display());
        let expected = expected_errors(&text);
        c.open(&uri, 1, &text);
        // The check is published first and the solve's errors (E504) after it: wait for the
        // publication that has them all.
        let want = expected.clone();
        let u = uri.clone();
        let got = c.wait_for(
            move |m| {
                m["method"] == "textDocument/publishDiagnostics"
                    && m["params"]["uri"] == u
                    && error_codes(&m["params"]["diagnostics"]) == want
            },
            T,
        );
        if got.is_none() {
            let seen: Vec<BTreeSet<String>> = c
                .drain()
                .iter()
                .filter(|m| m["params"]["uri"] == uri)
                .map(|m| error_codes(&m["params"]["diagnostics"]))
                .collect();
            failures.push(format!("{name}: expected {expected:?}, published {seen:?}"));
            continue;
        }
        let resp = c.request_raw(
            "textDocument/documentSymbol",
            json!({"textDocument": {"uri": uri}}),
        );
        if resp.get("error").is_some() {
            failures.push(format!("{name}: documentSymbol failed: {resp}"));
        }
        c.notify(
            "textDocument/didClose",
            json!({"textDocument": {"uri": uri}}),
        );
    }
    // Still serving: a small model of its own is checked after all of them.
    let last = format!("file://{}/after.heat", dir.display());
    let ok = "node a (fixed = 20 °C)\nnode b (load = 2 W)\nlink l: a to b resistance(1 K/W)\n";
    c.open(&last, 1, ok);
    let diags = c
        .diagnostics(&last, 1, T)
        .expect("the server still publishes");
    assert!(error_codes(&diags).is_empty(), "{diags}");
    c.shutdown();
    let _ = std::fs::remove_dir_all(&dir);
    assert!(failures.is_empty(), "{}", failures.join("\n"));
}
