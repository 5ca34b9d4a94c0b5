//! `caloris lsp` as an editor runs it: the built binary over standard input and output,
//! speaking JSON-RPC. One session walks through every feature on a model that imports a
//! material library and uses `°C` and `m²` (UTF-16 columns).

#[path = "../lsp/tests/support/client.rs"]
mod client;
#[path = "../lsp/tests/support/fixture.rs"]
mod fixture;

use client::{position_of, RpcClient};
use fixture::{ScratchProject, CABIN};
use serde_json::{json, Value};
use std::process::{Command, Stdio};
use std::time::{Duration, Instant};

const T: Duration = Duration::from_secs(30);

fn spawn() -> (std::process::Child, RpcClient) {
    let mut child = Command::new(env!("CARGO_BIN_EXE_caloris"))
        .arg("lsp")
        .stdin(Stdio::piped())
        .stdout(Stdio::piped())
        .stderr(Stdio::inherit())
        .spawn()
        .expect("start caloris lsp");
    let stdin = child.stdin.take().expect("stdin");
    let stdout = child.stdout.take().expect("stdout");
    (child, RpcClient::new(Box::new(stdout), Box::new(stdin)))
}

fn at(text: &str, needle: &str) -> Value {
    position_of(
        text,
        text.find(needle)
            .unwrap_or_else(|| panic!("`{needle}` not in the text")),
    )
}

#[test]
fn a_session_over_stdio_uses_every_feature() {
    let project = ScratchProject::new("stdio");
    std::fs::write(project.dir.join("model.heat"), CABIN).expect("model");
    let root = project.root_uri();
    let model = project.uri("model.heat");
    let lib = project.uri("materials.heat");

    let (mut child, mut c) = spawn();
    let init = c.initialize(&root);
    let caps = &init["capabilities"];
    for cap in [
        "hoverProvider",
        "definitionProvider",
        "referencesProvider",
        "renameProvider",
        "documentSymbolProvider",
        "workspaceSymbolProvider",
        "completionProvider",
        "signatureHelpProvider",
        "semanticTokensProvider",
        "codeActionProvider",
        "inlayHintProvider",
        "documentFormattingProvider",
    ] {
        assert!(!caps[cap].is_null(), "{cap} not advertised: {caps}");
    }
    assert_eq!(init["serverInfo"]["name"], "caloris");

    // Open: diagnostics with the version.
    c.open(&model, 1, CABIN);
    assert_eq!(c.diagnostics(&model, 1, T).expect("v1"), json!([]));

    // Edit: an unknown material on a line with `m²` before it.
    let typo = CABIN.replace(
        "layer(k = 0.035 W/(m*K), area = 9 m², thickness = 150 mm)",
        "layer(k = 0.035 W/(m*K), area = 9 m², thickness = 150 mx)",
    );
    c.change(&model, 2, &typo);
    let d = c.diagnostics(&model, 2, T).expect("v2");
    assert_eq!(d[0]["code"], "E100", "{d}");
    let line = typo.lines().nth(19).expect("floor line");
    let col = line[..line.find("mx").expect("mx")].encode_utf16().count();
    assert_eq!(
        d[0]["range"]["start"],
        json!({"line": 19, "character": col}),
        "UTF-16 column after `m²`: {d}"
    );

    // Back to the good text; a request right after the edit answers for it.
    c.change(&model, 3, CABIN);
    let hover = c.request(
        "textDocument/hover",
        json!({"textDocument": {"uri": model}, "position": at(CABIN, "room    (load")}),
    );
    let text = hover["contents"]["value"].as_str().unwrap_or_default();
    assert!(
        text.contains("Temperature **19.53 °C (67.16 °F)**"),
        "{text}"
    );
    let hover = c.request(
        "textDocument/hover",
        json!({"textDocument": {"uri": model}, "position": at(CABIN, "150 mm")}),
    );
    assert!(
        hover["contents"]["value"]
            .as_str()
            .unwrap_or_default()
            .starts_with("`150 mm` = **0.15 m**"),
        "{hover}"
    );

    let hints = c.request(
        "textDocument/inlayHint",
        json!({"textDocument": {"uri": model}, "range": {"start": {"line": 0, "character": 0}, "end": {"line": 40, "character": 0}}}),
    );
    let labels: Vec<&str> = hints
        .as_array()
        .into_iter()
        .flatten()
        .filter_map(|h| h["label"].as_str())
        .collect();
    assert!(
        labels.contains(&"= 19.53 °C") && labels.contains(&"✓ margin 1.533 K"),
        "{labels:?}"
    );
    // The hint after `-8 °C)` sits at the line's end in UTF-16 units.
    let outdoor = hints
        .as_array()
        .into_iter()
        .flatten()
        .find(|h| h["position"]["line"] == 8)
        .expect("hint on line 9");
    assert_eq!(
        outdoor["position"]["character"],
        CABIN.lines().nth(8).expect("line").encode_utf16().count()
    );

    let def = c.request("textDocument/definition", json!({"textDocument": {"uri": model}, "position": at(CABIN, "wood_fibre, thickness = 200")}));
    assert_eq!(def["uri"], lib, "{def}");
    let refs = c.request(
        "textDocument/references",
        json!({"textDocument": {"uri": model}, "position": at(CABIN, "ground  (fixed"), "context": {"includeDeclaration": true}}),
    );
    assert_eq!(refs.as_array().map(Vec::len), Some(2), "{refs}");

    let prep = c.request(
        "textDocument/prepareRename",
        json!({"textDocument": {"uri": model}, "position": at(CABIN, "north:")}),
    );
    assert_eq!(prep["placeholder"], "north");
    let edit = c.request("textDocument/rename", json!({"textDocument": {"uri": model}, "position": at(CABIN, "north:"), "newName": "north_wall"}));
    assert_eq!(
        edit["changes"][&model].as_array().map(Vec::len),
        Some(2),
        "{edit}"
    );
    let refused = c.request_raw(
        "textDocument/rename",
        json!({"textDocument": {"uri": model}, "position": at(CABIN, "north:"), "newName": "roof"}),
    );
    assert!(
        refused["error"]["message"]
            .as_str()
            .unwrap_or_default()
            .contains("already declared"),
        "{refused}"
    );

    let outline = c.request(
        "textDocument/documentSymbol",
        json!({"textDocument": {"uri": model}}),
    );
    let names: Vec<&str> = outline
        .as_array()
        .into_iter()
        .flatten()
        .filter_map(|s| s["name"].as_str())
        .collect();
    assert!(
        names.contains(&"timber_wall") && names.contains(&"no_mould"),
        "{names:?}"
    );
    let ws = c.request("workspace/symbol", json!({"query": "spruce"}));
    assert_eq!(ws[0]["location"]["uri"], lib, "{ws}");

    let text = format!("{CABIN}link door: room to outdoor layer(");
    c.change(&model, 4, &text);
    let end = position_of(&text, text.len());
    let items = c.request(
        "textDocument/completion",
        json!({"textDocument": {"uri": model}, "position": end}),
    );
    let labels: Vec<&str> = items
        .as_array()
        .into_iter()
        .flatten()
        .filter_map(|i| i["label"].as_str())
        .collect();
    assert!(
        labels.contains(&"thickness") && labels.contains(&"spruce"),
        "{labels:?}"
    );
    let sig = c.request(
        "textDocument/signatureHelp",
        json!({"textDocument": {"uri": model}, "position": end}),
    );
    assert_eq!(
        sig["signatures"][0]["label"],
        "layer(material, k, thickness, area)"
    );

    c.change(&model, 5, CABIN);
    let tokens = c.request(
        "textDocument/semanticTokens/full",
        json!({"textDocument": {"uri": model}}),
    );
    let data = tokens["data"].as_array().map(Vec::len).unwrap_or(0);
    assert!(data > 0 && data % 5 == 0, "{tokens}");
    let pos = at(CABIN, "140 mm");
    let actions = c.request("textDocument/codeAction", json!({"textDocument": {"uri": model}, "range": {"start": pos, "end": pos}, "context": {"diagnostics": []}}));
    let titles: Vec<&str> = actions
        .as_array()
        .into_iter()
        .flatten()
        .filter_map(|a| a["title"].as_str())
        .collect();
    assert!(titles.contains(&"Convert to m: 0.14 m"), "{titles:?}");

    // Formatting answers with the formatter's canonical text (or no edits when already canonical).
    let edits = c.request(
        "textDocument/formatting",
        json!({"textDocument": {"uri": model}, "options": {"tabSize": 2, "insertSpaces": true}}),
    );
    let edits = edits
        .as_array()
        .expect("formatting answers with a list of edits");
    if let Some(e) = edits.first() {
        let new_text = e["newText"].as_str().expect("text");
        assert_eq!(
            caloris_compiler::format::format_source(new_text).as_deref(),
            Ok(new_text)
        );
    }

    c.shutdown();
    let status = wait_exit(&mut child);
    assert_eq!(status, Some(0), "exit status after shutdown/exit");
}

fn wait_exit(child: &mut std::process::Child) -> Option<i32> {
    for _ in 0..100 {
        if let Ok(Some(s)) = child.try_wait() {
            return s.code();
        }
        std::thread::sleep(Duration::from_millis(50));
    }
    let _ = child.kill();
    None
}

#[test]
fn closing_the_input_without_shutdown_ends_the_server() {
    let (mut child, c) = spawn();
    drop(c);
    drop(child.stdin.take());
    // Dropping the client closes our end of the pipe; the server must not hang.
    assert!(
        wait_exit(&mut child).is_some(),
        "server still running after its input closed"
    );
}

/// The first number after `word ` in `text` (`lowest -5.44 °C` → -5.44).
fn number_after(text: &str, word: &str) -> Option<f64> {
    let rest = &text[text.find(word)? + word.len()..];
    rest.split_whitespace().next()?.parse().ok()
}

#[test]
fn hover_gets_the_transient_run_of_the_frost_example() {
    let path = std::path::Path::new(env!("CARGO_MANIFEST_DIR"))
        .join("examples/allotment_standpipe_frost.heat");
    let text = std::fs::read_to_string(&path).expect("example");
    let uri = format!("file://{}", path.display());
    // The same run through the command line, as the reference for the figures.
    let out = Command::new(env!("CARGO_BIN_EXE_caloris"))
        .args(["run", "--format", "json"])
        .arg(&path)
        .output()
        .expect("caloris run");
    let report: Value = serde_json::from_slice(&out.stdout).expect("run json");
    let water = report["nodes"]
        .as_array()
        .and_then(|n| n.iter().find(|n| n["name"] == "water"))
        .expect("water in the run report");
    let lowest_c = water["min_K"].as_f64().expect("min_K") - 273.15;
    let final_c = water["final_K"].as_f64().expect("final_K") - 273.15;

    let (mut child, mut c) = spawn();
    c.initialize(&format!("file://{}", path.parent().expect("dir").display()));
    c.open(&uri, 1, &text);
    c.diagnostics(&uri, 1, T).expect("diagnostics");
    let mut seen = Vec::new();
    let hover = (0..600).find_map(|_| {
        let h = c.request(
            "textDocument/hover",
            json!({"textDocument": {"uri": uri}, "position": at(&text, "water   (")}),
        );
        let v = h["contents"]["value"]
            .as_str()
            .unwrap_or_default()
            .to_string();
        if v.contains("Transient `overnight`: final") {
            return Some(v);
        }
        // Until the run is done the hover answers at once and says so.
        seen.push(v.contains("Transient `overnight`: _running…_"));
        std::thread::sleep(Duration::from_millis(100));
        None
    });
    let hover = hover.unwrap_or_else(|| panic!("no transient figures in hover after 60 s"));
    assert!(seen.iter().all(|&running| running), "{seen:?}");
    // The run's paragraph (the node's time constants above it say "slowest" too).
    let run = hover
        .find("Transient `overnight`")
        .map_or(hover.as_str(), |i| &hover[i..]);
    let shown_final = number_after(run, "final **").expect("final");
    let shown_lowest = number_after(run, "lowest ").expect("lowest");
    assert!((shown_final - final_c).abs() < 0.01, "{hover} vs {final_c}");
    assert!(
        (shown_lowest - lowest_c).abs() < 0.01,
        "{hover} vs {lowest_c}"
    );

    let decl = c.request(
        "textDocument/hover",
        json!({"textDocument": {"uri": uri}, "position": at(&text, "overnight (")}),
    );
    let table = decl["contents"]["value"].as_str().unwrap_or_default();
    assert!(table.contains("| `water` |"), "{table}");
    c.shutdown();
    assert_eq!(wait_exit(&mut child), Some(0));
}

/// The binary itself on the inputs that once killed it (its worker thread overflowed its stack
/// at about 950 nested brackets or a 3 700-term sum, and the process went with it): it reports
/// them and goes on answering for another document.
#[test]
fn deep_and_long_documents_do_not_take_the_server_down() {
    let project = ScratchProject::new("stdio-deep");
    std::fs::write(project.dir.join("model.heat"), CABIN).expect("model");
    let doc = |name: &str| project.uri(name);
    let corpus = std::path::Path::new(env!("CARGO_MANIFEST_DIR"))
        .join("tests/cases/reliability/lsp_stack_overflow_parens_1000.heat");
    let brackets = |n: usize| {
        format!(
            "node a (fixed = 20 °C)\nnode b (load = 1 W)\nparam p = {}1 W{}\nlink l: a to b resistance(1 K/W)\n",
            "(".repeat(n),
            ")".repeat(n)
        )
    };
    let sum = format!(
        "node a (fixed = 20 °C)\nnode b (load = p)\nparam p = {}1 mW\nlink l: a to b resistance(1 K/W)\n",
        "1 mW + ".repeat(19_999)
    );
    let heavy = [
        (
            "corpus.heat",
            std::fs::read_to_string(corpus).expect("corpus file"),
            1,
        ),
        ("parens_1000.heat", brackets(1_000), 1),
        ("parens_5000.heat", brackets(5_000), 1),
        ("sum_20000.heat", sum, 0),
    ];

    let (mut child, mut c) = spawn();
    c.initialize(&project.root_uri());
    for (name, text, errors) in &heavy {
        let uri = doc(name);
        c.open(&uri, 1, text);
        let diags = c.diagnostics(&uri, 1, T).expect("diagnostics");
        let codes: Vec<&str> = diags
            .as_array()
            .into_iter()
            .flatten()
            .filter_map(|d| d["code"].as_str())
            .collect();
        assert_eq!(codes, vec!["E005"; *errors], "{name}");
        for method in [
            "textDocument/semanticTokens/full",
            "textDocument/documentSymbol",
        ] {
            c.request(method, json!({"textDocument": {"uri": uri}}));
        }
        c.request(
            "textDocument/hover",
            json!({"textDocument": {"uri": uri}, "position": at(text, "param p")}),
        );
    }
    let model = doc("model.heat");
    c.open(&model, 1, CABIN);
    c.diagnostics(&model, 1, T).expect("the cabin is analysed");
    let hover = c.request(
        "textDocument/hover",
        json!({"textDocument": {"uri": model}, "position": at(CABIN, "room    (load")}),
    );
    let shown = hover["contents"]["value"].as_str().unwrap_or_default();
    assert!(shown.contains("Temperature **"), "{shown}");
    c.shutdown();
    assert_eq!(wait_exit(&mut child), Some(0));
}

/// An editor that goes away (its end of the pipes closed) while an analysis runs: the server
/// ends at once rather than finishing the analysis for no one. It used to wait for every
/// analysis on its blocking threads, and two servers left behind by a failed test ran on
/// for over 25 minutes.
#[test]
fn the_server_ends_when_its_client_goes_away_mid_analysis() {
    let project = ScratchProject::new("stdio-gone");
    // 100 000 copies of fourteen nested repetitions of one empty copy: about 13 s of
    // expansion in a debug build, in little memory.
    let text = format!(
        "repeat outer (count = 100000) {{\n{}{}}}\n",
        "repeat r (count = 1) {\n".repeat(14),
        "}\n".repeat(14)
    );
    let (mut child, mut c) = spawn();
    c.initialize(&project.root_uri());
    c.open(&project.uri("model.heat"), 1, &text);
    // Long enough for the analysis to start, far shorter than it takes.
    std::thread::sleep(Duration::from_millis(1500));
    assert!(
        matches!(child.try_wait(), Ok(None)),
        "still serving while analysing"
    );
    drop(c);
    let gone = Instant::now();
    let mut status = None;
    while gone.elapsed() < Duration::from_secs(5) {
        if let Ok(Some(s)) = child.try_wait() {
            status = Some(s);
            break;
        }
        std::thread::sleep(Duration::from_millis(50));
    }
    if status.is_none() {
        let _ = child.kill();
        let _ = child.wait();
    }
    assert!(
        status.is_some(),
        "the server still ran 5 s after its client went away"
    );
}
