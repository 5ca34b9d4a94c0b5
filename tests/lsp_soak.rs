//! SOAK TEST of the language server: `caloris lsp` (the built binary over stdio) takes 3000
//! random edits of one document (characters typed and deleted anywhere, fragments of the
//! examples pasted in, now and then a fresh example), mostly sent as fast as a client can and
//! in some bursts one analysed version at a time, with requests for every feature at random
//! positions in between (some past the end of the text).
//! Every 100 edits the server must publish diagnostics for the latest version and answer a
//! request; at the end every request has had its answer, none an internal error, nothing was
//! reported as a panic on standard error, and the server shuts down cleanly.

#[path = "../lsp/tests/support/client.rs"]
mod client;
#[path = "../lsp/tests/support/corpus.rs"]
mod corpus;
#[path = "../lsp/tests/support/fixture.rs"]
mod fixture;

use client::{position_of, RpcClient};
use fixture::{ScratchProject, CABIN};
use serde_json::{json, Value};
use std::collections::HashSet;
use std::io::Read;
use std::process::{Command, Stdio};
use std::sync::{Arc, Mutex};
use std::time::Duration;

const EDITS: usize = 3000;
const CHECK_EVERY: usize = 100;
/// How long the server may take to catch up at a checkpoint (a debug build on a busy machine).
const CATCH_UP: Duration = Duration::from_secs(60);
/// The document is replaced by a fresh example when edits have made it larger than this.
const MAX_TEXT: usize = 24 * 1024;

/// SplitMix64: the same edits on every run.
struct Rng(u64);
impl Rng {
    fn next(&mut self) -> u64 {
        self.0 = self.0.wrapping_add(0x9E37_79B9_7F4A_7C15);
        let mut z = self.0;
        z = (z ^ (z >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
        z = (z ^ (z >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
        z ^ (z >> 31)
    }
    fn below(&mut self, n: usize) -> usize {
        (self.next() % n.max(1) as u64) as usize
    }
}

/// A char boundary of `text` at random (the end included).
fn boundary(rng: &mut Rng, text: &str) -> usize {
    let mut i = rng.below(text.len() + 1);
    while !text.is_char_boundary(i) {
        i -= 1;
    }
    i
}

const TYPED: &[&str] = &[
    "a", "e", "x", "_", "1", "0", ".", " ", " ", "\n", "(", ")", "{", "}", "=", ",", ":", "*", "/",
    "^", "-", "+", "#", "\"", "°", "²", "µ", "é", "😀", "m", "K", "W", "node ", "link ", "param ",
    "layer(", "film(", "repeat ", "to ", "°C", "mm", "W/(m*K)",
];

fn examples() -> Vec<String> {
    corpus::examples()
        .iter()
        .map(|p| std::fs::read_to_string(p).expect("example"))
        .collect()
}

/// One random edit of `text`.
fn edit(rng: &mut Rng, text: &str, examples: &[String]) -> String {
    match rng.below(10) {
        // Typing.
        0..=3 => {
            let at = boundary(rng, text);
            let what = TYPED[rng.below(TYPED.len())];
            format!("{}{what}{}", &text[..at], &text[at..])
        }
        // Deleting a few characters, or a whole selection.
        4..=6 => {
            let a = boundary(rng, text);
            let len = if rng.below(8) == 0 {
                200
            } else {
                1 + rng.below(5)
            };
            let mut b = (a + len).min(text.len());
            while !text.is_char_boundary(b) {
                b -= 1;
            }
            format!("{}{}", &text[..a], &text[b..])
        }
        // Pasting a fragment of an example.
        7 | 8 => {
            let src = &examples[rng.below(examples.len())];
            let a = boundary(rng, src);
            let mut b = (a + 1 + rng.below(300)).min(src.len());
            while !src.is_char_boundary(b) {
                b -= 1;
            }
            let at = boundary(rng, text);
            format!("{}{}{}", &text[..at], &src[a..b], &text[at..])
        }
        // Undoing a lot: a fresh example, or the model that imports the library.
        _ if rng.below(10) == 0 => {
            if rng.below(2) == 0 {
                CABIN.to_string()
            } else {
                examples[rng.below(examples.len())].clone()
            }
        }
        _ => {
            // Cut a line and paste it elsewhere.
            let lines: Vec<&str> = text.split_inclusive('\n').collect();
            if lines.len() < 2 {
                return text.to_string();
            }
            let i = rng.below(lines.len());
            let line = lines[i];
            let mut rest: Vec<&str> = lines.clone();
            rest.remove(i);
            let j = rng.below(rest.len() + 1);
            rest.insert(j, line);
            rest.concat()
        }
    }
}

/// A request for one of the server's features at a random place of `text`.
fn feature_request(rng: &mut Rng, uri: &str, text: &str) -> (&'static str, Value) {
    let doc = json!({"uri": uri});
    let pos = if rng.below(12) == 0 {
        // A client whose view is ahead of or behind the server's.
        json!({"line": text.lines().count() + rng.below(3), "character": rng.below(200)})
    } else {
        position_of(text, boundary(rng, text))
    };
    let range = json!({"start": {"line": 0, "character": 0}, "end": {"line": 400, "character": 0}});
    match rng.below(11) {
        0 => (
            "textDocument/hover",
            json!({"textDocument": doc, "position": pos}),
        ),
        1 => (
            "textDocument/completion",
            json!({"textDocument": doc, "position": pos}),
        ),
        2 => (
            "textDocument/signatureHelp",
            json!({"textDocument": doc, "position": pos}),
        ),
        3 => (
            "textDocument/definition",
            json!({"textDocument": doc, "position": pos}),
        ),
        4 => (
            "textDocument/references",
            json!({"textDocument": doc, "position": pos, "context": {"includeDeclaration": true}}),
        ),
        5 => (
            "textDocument/prepareRename",
            json!({"textDocument": doc, "position": pos}),
        ),
        6 => (
            "textDocument/semanticTokens/full",
            json!({"textDocument": doc}),
        ),
        7 => (
            "textDocument/inlayHint",
            json!({"textDocument": doc, "range": range}),
        ),
        8 => ("textDocument/documentSymbol", json!({"textDocument": doc})),
        9 => (
            "textDocument/codeAction",
            json!({"textDocument": doc, "range": {"start": pos, "end": pos}, "context": {"diagnostics": []}}),
        ),
        _ => (
            "textDocument/formatting",
            json!({"textDocument": doc, "options": {"tabSize": 2, "insertSpaces": true}}),
        ),
    }
}

/// Responses among `msgs`: their ids leave `pending`; an error other than a cancellation
/// (the server may drop a request a newer edit made stale) is a failure.
fn settle(msgs: &[Value], pending: &mut HashSet<i64>, methods: &[(i64, &str)]) {
    for m in msgs {
        if m.get("method").is_some() {
            continue;
        }
        let Some(id) = m.get("id").and_then(Value::as_i64) else {
            continue;
        };
        pending.remove(&id);
        if let Some(e) = m.get("error") {
            let code = e["code"].as_i64().unwrap_or(0);
            let method = methods
                .iter()
                .find(|(i, _)| *i == id)
                .map_or("?", |(_, m)| *m);
            assert!(
                code == -32800 || code == -32801,
                "{method} (request {id}) answered with an error: {e}"
            );
        }
    }
}

#[test]
fn the_server_survives_thousands_of_random_edits() {
    let project = ScratchProject::new("soak");
    let root = project.root_uri();
    let uri = project.uri("model.heat");

    let mut child = Command::new(env!("CARGO_BIN_EXE_caloris"))
        .arg("lsp")
        .stdin(Stdio::piped())
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .expect("start caloris lsp");
    let stdin = child.stdin.take().expect("stdin");
    let stdout = child.stdout.take().expect("stdout");
    let mut stderr = child.stderr.take().expect("stderr");
    let errors = Arc::new(Mutex::new(String::new()));
    let sink = errors.clone();
    std::thread::spawn(move || {
        let mut buf = String::new();
        let _ = stderr.read_to_string(&mut buf);
        if let Ok(mut e) = sink.lock() {
            *e = buf;
        }
    });
    let mut c = RpcClient::new(Box::new(stdout), Box::new(stdin));
    c.initialize(&root);

    let examples = examples();
    let mut rng = Rng(0x50AC);
    let mut text = CABIN.to_string();
    let mut version = 1i64;
    c.open(&uri, version, &text);
    let mut pending: HashSet<i64> = HashSet::new();
    let mut methods: Vec<(i64, &str)> = Vec::new();
    let mut requests = 0usize;
    for i in 1..=EDITS {
        text = edit(&mut rng, &text, &examples);
        if text.len() > MAX_TEXT {
            text = examples[rng.below(examples.len())].clone();
        }
        version += 1;
        c.change(&uri, version, &text);
        // One burst in five goes at a typist's pace: each version analysed before the next
        // edit, so intermediate texts are checked and solved, not only skipped as stale.
        let paced = (i / CHECK_EVERY) % 5 == 2;
        if paced {
            assert!(
                c.diagnostics(&uri, version, CATCH_UP).is_some(),
                "no diagnostics for version {version} (edit {i}); text:\n{text}"
            );
            let msgs = c.drain();
            settle(&msgs, &mut pending, &methods);
        }
        if rng.below(4) == 0 {
            let (method, params) = feature_request(&mut rng, &uri, &text);
            let id = c.send_request(method, params);
            pending.insert(id);
            methods.push((id, method));
            requests += 1;
        }
        if i % CHECK_EVERY == 0 {
            assert!(
                matches!(child.try_wait(), Ok(None)),
                "the server died after {i} edits: {:?}\n{}",
                child.try_wait(),
                errors.lock().map(|e| e.clone()).unwrap_or_default()
            );
            // (A paced edit has already taken the diagnostics of this version.)
            assert!(
                paced || c.diagnostics(&uri, version, CATCH_UP).is_some(),
                "no diagnostics for version {version} (edit {i}) within {CATCH_UP:?}; text:\n{text}"
            );
            let id = c.send_request(
                "textDocument/documentSymbol",
                json!({"textDocument": {"uri": uri}}),
            );
            let answer = c.wait_for(
                |m| m.get("id") == Some(&json!(id)) && m.get("method").is_none(),
                CATCH_UP,
            );
            assert!(
                answer.is_some(),
                "no answer to a request after {i} edits; text:\n{text}"
            );
            let msgs = c.drain();
            settle(&msgs, &mut pending, &methods);
        }
    }
    // Every request sent along the way is answered.
    for id in pending.clone() {
        if let Some(m) = c.wait_for(
            |m| m.get("id") == Some(&json!(id)) && m.get("method").is_none(),
            CATCH_UP,
        ) {
            settle(&[m], &mut pending, &methods);
        }
    }
    assert!(
        pending.is_empty(),
        "{} of {requests} requests were never answered: {pending:?}",
        pending.len()
    );
    c.shutdown();
    let mut status = None;
    for _ in 0..100 {
        if let Ok(Some(s)) = child.try_wait() {
            status = s.code();
            break;
        }
        std::thread::sleep(Duration::from_millis(100));
    }
    assert_eq!(status, Some(0), "exit status after shutdown/exit");
    let stderr = errors.lock().map(|e| e.clone()).unwrap_or_default();
    assert!(
        !stderr.contains("panicked"),
        "the server reported a panic:\n{stderr}"
    );
    println!("{EDITS} edits, {requests} feature requests, all answered");
}
