//! The server over an in-process socket, driven as an editor would: edits in and out of order,
//! bursts of edits, closing, imports edited in another buffer, and requests right after an
//! edit. Checks that diagnostics carry the version they were computed for, that an older
//! analysis never follows a newer one, and that answers match the current text.

mod support;

use serde_json::{json, Value};
use std::time::Duration;
use support::client::position_of;
use support::fixture::{ScratchProject, CABIN};
use support::in_process::start;

const T: Duration = Duration::from_secs(30);

fn file_uri(p: &std::path::Path) -> String {
    format!("file://{}", p.display())
}

fn codes(diags: &Value) -> Vec<String> {
    diags
        .as_array()
        .into_iter()
        .flatten()
        .map(|d| d["code"].as_str().unwrap_or("").to_string())
        .collect()
}

const LIB: &str = "material wood_fibre (k = 0.040 W/(m*K))\nmaterial spruce (k = 0.12 W/(m*K))\n";

fn cabin_project(name: &str) -> (ScratchProject, String, String) {
    let project = ScratchProject::new(&format!("lsp-{name}"));
    std::fs::write(project.dir.join("materials.heat"), LIB).expect("write lib");
    std::fs::write(project.dir.join("model.heat"), CABIN).expect("write model");
    let (root, model) = (project.root_uri(), project.uri("model.heat"));
    (project, root, model)
}

#[test]
fn a_change_older_than_the_stored_version_is_dropped() {
    let (_dir, root, model) = cabin_project("stale");
    let mut c = start();
    c.initialize(&root);
    c.open(&model, 1, CABIN);
    assert_eq!(
        codes(&c.diagnostics(&model, 1, T).expect("v1")),
        Vec::<String>::new()
    );
    let typo = CABIN.replace("wood_fibre, thickness = 200", "wood_fiber, thickness = 200");
    c.change(&model, 3, &typo);
    // Arrives late: an older version must not replace version 3.
    c.change(&model, 2, CABIN);
    assert_eq!(codes(&c.diagnostics(&model, 3, T).expect("v3")), ["E102"]);
    let at = typo.find("wood_fiber, thickness = 200").expect("typo");
    let actions = c.request(
        "textDocument/codeAction",
        json!({"textDocument": {"uri": model}, "range": {"start": position_of(&typo, at), "end": position_of(&typo, at)}, "context": {"diagnostics": []}}),
    );
    assert_eq!(
        actions[0]["title"], "Replace with `wood_fibre`",
        "{actions}"
    );
    std::thread::sleep(Duration::from_millis(300));
    let late: Vec<Value> = c
        .drain()
        .into_iter()
        .filter(|m| m["params"]["version"] == 2)
        .collect();
    assert!(late.is_empty(), "published for a dropped version: {late:?}");
    c.shutdown();
}

#[test]
fn a_burst_of_edits_ends_with_the_newest_version() {
    let (_dir, root, model) = cabin_project("burst");
    let mut c = start();
    c.initialize(&root);
    c.open(&model, 1, CABIN);
    let bad = CABIN.replace("node ground ", "node grund ");
    for v in 2..=40 {
        c.change(&model, v, if v % 2 == 0 { &bad } else { CABIN });
    }
    c.change(&model, 41, &bad);
    let last = c.diagnostics(&model, 41, T).expect("v41");
    assert!(codes(&last).contains(&"E102".to_string()), "{last}");
    std::thread::sleep(Duration::from_millis(500));
    let mut versions: Vec<i64> = c
        .drain()
        .into_iter()
        .filter(|m| m["method"] == "textDocument/publishDiagnostics")
        .filter_map(|m| m["params"]["version"].as_i64())
        .collect();
    versions.push(41);
    // Nothing older may come after version 41.
    assert!(versions.iter().all(|&v| v <= 41), "{versions:?}");
    c.shutdown();
}

#[test]
fn hover_right_after_an_edit_answers_for_the_new_text() {
    let (_dir, root, model) = cabin_project("hover");
    let mut c = start();
    c.initialize(&root);
    c.open(&model, 1, CABIN);
    let hotter = CABIN.replace("load = 150 W", "load = 300 W");
    c.change(&model, 2, &hotter);
    let at = hotter.find("room)").expect("room use");
    let h = c.request(
        "textDocument/hover",
        json!({"textDocument": {"uri": model}, "position": position_of(&hotter, at)}),
    );
    let text = h["contents"]["value"]
        .as_str()
        .unwrap_or_default()
        .to_string();
    assert!(text.contains("heat load 300 W"), "{text}");
    // Double the load: the room's rise above the weighted boundary temperature doubles.
    let (g_out, g_ground) = (9.6 / 3.67 + 1.8, 0.035 * 9.0 / 0.15);
    let t = (300.0 + g_out * -8.0 + g_ground * 6.0) / (g_out + g_ground);
    assert!(
        text.contains(&format!("Temperature **{t:.2} °C")),
        "expected {t:.2} °C in {text}"
    );
    c.shutdown();
}

#[test]
fn the_editor_is_asked_to_refresh_inlay_hints_when_the_solve_is_done() {
    let (_dir, root, model) = cabin_project("refresh");
    let mut c = start();
    c.initialize(&root);
    c.open(&model, 1, CABIN);
    assert!(c
        .wait_for(|m| m["method"] == "workspace/inlayHint/refresh", T)
        .is_some());
    let hints = c.request(
        "textDocument/inlayHint",
        json!({"textDocument": {"uri": model}, "range": {"start": {"line": 0, "character": 0}, "end": {"line": 30, "character": 0}}}),
    );
    assert_eq!(hints.as_array().map(Vec::len), Some(8), "{hints}");
    c.shutdown();
}

#[test]
fn closing_clears_diagnostics() {
    let (_dir, root, model) = cabin_project("close");
    let mut c = start();
    c.initialize(&root);
    c.open(&model, 1, &CABIN.replace("node ground ", "node grund "));
    assert!(!codes(&c.diagnostics(&model, 1, T).expect("v1")).is_empty());
    c.notify(
        "textDocument/didClose",
        json!({"textDocument": {"uri": model}}),
    );
    let cleared = c
        .wait_for(
            |m| {
                m["method"] == "textDocument/publishDiagnostics"
                    && m["params"]["uri"] == model
                    && m["params"]["version"].is_null()
            },
            T,
        )
        .expect("cleared");
    assert_eq!(cleared["params"]["diagnostics"], json!([]));
    c.shutdown();
}

#[test]
fn editing_an_imported_file_in_another_buffer_updates_the_importer() {
    let (dir, root, model) = cabin_project("imports");
    let lib = file_uri(&dir.dir.join("materials.heat"));
    let mut c = start();
    c.initialize(&root);
    c.open(&model, 1, CABIN);
    assert!(codes(&c.diagnostics(&model, 1, T).expect("v1")).is_empty());
    c.open(&lib, 1, LIB);
    // Rename from the library reaches the open model that imports it.
    let at = LIB.find("wood_fibre").expect("wood_fibre");
    let edit = c.request(
        "textDocument/rename",
        json!({"textDocument": {"uri": lib}, "position": position_of(LIB, at), "newName": "wood_wool"}),
    );
    assert_eq!(
        edit["changes"][&lib].as_array().map(Vec::len),
        Some(1),
        "{edit}"
    );
    assert_eq!(
        edit["changes"][&model].as_array().map(Vec::len),
        Some(2),
        "{edit}"
    );
    c.change(&lib, 2, &LIB.replace("wood_fibre", "wood_wool"));
    // The model's text did not change, so its version stays 1; its imports did.
    let d = c
        .wait_for(
            |m| {
                m["method"] == "textDocument/publishDiagnostics"
                    && m["params"]["uri"] == model
                    && !codes(&m["params"]["diagnostics"]).is_empty()
            },
            T,
        )
        .expect("new diagnostics for the importer");
    assert_eq!(codes(&d["params"]["diagnostics"]), ["E102", "E102"]);
    c.shutdown();
}
