//! Nothing in one document takes the server down: deeply nested and very long expressions are
//! analysed (E005 where they nest too deep) and every request on them is answered, and a
//! failing analysis becomes an internal-error diagnostic (E900) of its document while the
//! other documents keep being served. The in-process runtime here has tokio's default 2 MB
//! worker stacks, smaller than the server binary's.

mod support;

use caloris_lsp::isolate::INTERNAL_ERROR;
use caloris_lsp::snapshot::{Snapshot, Stage};
use caloris_lsp::workspace::analyze_files_with;
use serde_json::{json, Value};
use std::time::Duration;
use support::client::position_of;
use support::fixture::{loader, uri, CABIN, MATERIALS};
use support::in_process::start;

const T: Duration = Duration::from_secs(60);

struct Project(std::path::PathBuf);

impl Drop for Project {
    fn drop(&mut self) {
        let _ = std::fs::remove_dir_all(&self.0);
    }
}

fn codes(diags: &Value) -> Vec<String> {
    diags
        .as_array()
        .into_iter()
        .flatten()
        .map(|d| d["code"].as_str().unwrap_or("").to_string())
        .collect()
}

fn parens(n: usize) -> String {
    format!(
        "node a (fixed = 20 °C)\nnode b (load = 1 W)\nparam p = {}1 W{}\nlink l: a to b resistance(1 K/W)\n",
        "(".repeat(n),
        ")".repeat(n)
    )
}

fn long_sum(terms: usize) -> String {
    format!(
        "node a (fixed = 20 °C)\nnode b (load = p)\nparam p = {}1 mW\nlink l: a to b resistance(1 K/W)\n",
        "1 mW + ".repeat(terms - 1)
    )
}

#[test]
fn deep_and_long_documents_leave_the_server_serving() {
    let dir = std::env::temp_dir().join(format!("caloris-lsp-resilience-{}", std::process::id()));
    let _ = std::fs::remove_dir_all(&dir);
    std::fs::create_dir_all(dir.join(".git")).expect("dir");
    let _guard = Project(dir.clone());
    std::fs::write(dir.join("materials.heat"), MATERIALS).expect("lib");
    let root = format!("file://{}", dir.display());
    let doc = |name: &str| format!("file://{}/{name}", dir.display());

    let mut c = start();
    c.initialize(&root);
    let heavy = [
        ("parens_1000.heat", parens(1_000), vec!["E005"]),
        ("parens_5000.heat", parens(5_000), vec!["E005"]),
        ("sum_20000.heat", long_sum(20_000), vec![]),
    ];
    for (name, text, expected) in &heavy {
        let u = doc(name);
        c.open(&u, 1, text);
        let diags = c
            .diagnostics(&u, 1, T)
            .unwrap_or_else(|| panic!("diagnostics of {name}"));
        assert_eq!(codes(&diags), *expected, "{name}: {diags}");
        // Every request that reads the document's syntax or text is answered.
        let at_end = position_of(text, text.len() - 1);
        let in_expr = position_of(text, text.find("param p = ").expect("param") + 500);
        for (method, params) in [
            (
                "textDocument/hover",
                json!({"textDocument": {"uri": u}, "position": in_expr}),
            ),
            (
                "textDocument/hover",
                json!({"textDocument": {"uri": u}, "position": at_end}),
            ),
            (
                "textDocument/semanticTokens/full",
                json!({"textDocument": {"uri": u}}),
            ),
            (
                "textDocument/documentSymbol",
                json!({"textDocument": {"uri": u}}),
            ),
            (
                "textDocument/formatting",
                json!({"textDocument": {"uri": u}, "options": {"tabSize": 2, "insertSpaces": true}}),
            ),
            (
                "textDocument/completion",
                json!({"textDocument": {"uri": u}, "position": in_expr}),
            ),
            (
                "textDocument/inlayHint",
                json!({"textDocument": {"uri": u}, "range": {"start": {"line": 0, "character": 0}, "end": {"line": 9, "character": 0}}}),
            ),
        ] {
            let resp = c.request_raw(method, params);
            assert!(resp.get("error").is_none(), "{name} {method}: {resp}");
        }
    }
    // The sum was evaluated: 20 000 terms of 1 mW heat `b` by 20 K through 1 K/W.
    let sum = doc("sum_20000.heat");
    let text = &heavy[2].1;
    let hover = c.request(
        "textDocument/hover",
        json!({"textDocument": {"uri": sum}, "position": position_of(text, text.find("node b").expect("b") + 5)}),
    );
    let shown = hover["contents"]["value"].as_str().unwrap_or_default();
    assert!(shown.contains("40 °C"), "{shown}");

    // Another document is still analysed and answered.
    let model = doc("model.heat");
    std::fs::write(dir.join("model.heat"), CABIN).expect("model");
    c.open(&model, 1, CABIN);
    let diags = c
        .diagnostics(&model, 1, T)
        .expect("the cabin's diagnostics");
    assert!(codes(&diags).is_empty(), "{diags}");
    let room = CABIN.find("room    (load").expect("room");
    let hover = c.request(
        "textDocument/hover",
        json!({"textDocument": {"uri": model}, "position": position_of(CABIN, room)}),
    );
    let shown = hover["contents"]["value"].as_str().unwrap_or_default();
    assert!(shown.contains("**node** `room`"), "{shown}");
    c.shutdown();
}

#[test]
fn a_failing_analysis_becomes_an_internal_error_of_its_document() {
    let u = uri("/cabin/model.heat");
    // The solve fails: the check of the text is kept, so names still resolve.
    let snap = Snapshot::analyze_with(u.clone(), 3, CABIN, false, &|uri, check| {
        if check {
            Snapshot::analyze(uri, 3, CABIN, &loader(), true)
        } else {
            panic!("the solve broke")
        }
    });
    assert_eq!(snap.stage, Stage::Final);
    assert_eq!(snap.version, 3);
    assert!(snap.analysis.symbols.get("room").is_some());
    let last = snap.analysis.diagnostics.last().expect("a diagnostic");
    assert_eq!(last.code, INTERNAL_ERROR);
    assert!(
        last.message.contains("solving this model: the solve broke"),
        "{}",
        last.message
    );

    // The check fails too: the bare text, so positions and the line index still work.
    let snap = Snapshot::analyze_with(u.clone(), 4, CABIN, false, &|_, _| panic!("broken"));
    assert_eq!(snap.text(), CABIN);
    let codes: Vec<&str> = snap.analysis.diagnostics.iter().map(|d| d.code).collect();
    assert_eq!(codes, [INTERNAL_ERROR]);
    assert!(snap.analysis.diagnostics[0]
        .message
        .contains("checking this file: broken"));
}

#[test]
fn one_failing_file_of_the_workspace_leaves_the_others() {
    let dir =
        std::env::temp_dir().join(format!("caloris-lsp-workspace-fail-{}", std::process::id()));
    let _ = std::fs::remove_dir_all(&dir);
    std::fs::create_dir_all(&dir).expect("dir");
    let _guard = Project(dir.clone());
    let good = dir.join("good.heat");
    let bad = dir.join("bad.heat");
    std::fs::write(&good, "node a (fixed = 1 °C)\n").expect("good");
    std::fs::write(&bad, "node b (fixed = 2 °C)\n").expect("bad");
    let snaps = analyze_files_with(&[good, bad], &loader(), &|uri, text| {
        if uri.as_str().ends_with("bad.heat") {
            panic!("this one breaks")
        }
        Snapshot::analyze(uri, 0, text, &loader(), true)
    });
    assert_eq!(snaps.len(), 2);
    assert!(
        !snaps[0].analysis.has_errors(),
        "{:?}",
        snaps[0].analysis.diagnostics
    );
    assert!(snaps[0].analysis.symbols.get("a").is_some());
    let codes: Vec<&str> = snaps[1]
        .analysis
        .diagnostics
        .iter()
        .map(|d| d.code)
        .collect();
    assert_eq!(codes, [INTERNAL_ERROR]);
}
