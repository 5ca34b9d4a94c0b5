//! SOAK TEST of the language server: `caloris lsp` (the built binary over stdio) takes 3000
//! random edits of one document (characters typed and deleted anywhere, fragments and whole
//! lines of the examples and of the reliability reproducers pasted in, now and then a fresh
//! file, and renames the server proposed applied as a client applies them), mostly sent as fast
//! as a client can and in some bursts one analysed version at a time, with requests for every
//! feature in between (hover, completion, signature help, definition, references, rename,
//! semantic tokens, inlay hints, symbols, code actions, formatting), at random places and at
//! names, some past the end of the text.
//!
//! Every 50 edits is a checkpoint: the server must publish diagnostics for the latest version,
//! and their codes and lines must be those of the batch analysis of the same text (the
//! compiler's `analyze` with the loader, options and size budget the server uses): the fast
//! check first, and the solve's when the solve adds or removes any. Every other checkpoint
//! opens a file afresh, so some compare working models and some broken ones (the test counts
//! both). At the end every request has had its answer, none an internal error, nothing was
//! reported as a panic on standard error, and the server shuts down cleanly.

#[path = "../lsp/tests/support/client.rs"]
mod client;
#[path = "../lsp/tests/support/corpus.rs"]
mod corpus;
#[path = "../lsp/tests/support/fixture.rs"]
mod fixture;
mod soak;

use caloris_compiler::span::FileId;
use caloris_compiler::{analyze, Options};
use caloris_lsp::isolate::on_analysis_thread;
use caloris_lsp::loader::DocLoader;
use caloris_lsp::proto::lsp::TextEdit;
use client::RpcClient;
use fixture::{apply_edits, ScratchProject, CABIN};
use serde_json::{json, Value};
use soak::{edit, feature_request, floor, place, Rng, Sources, MAX_TEXT};
use std::collections::{HashMap, HashSet};
use std::io::Read;
use std::path::Path;
use std::process::{Command, Stdio};
use std::sync::{Arc, Mutex};
use std::time::{Duration, Instant};

const EDITS: usize = 3000;
const CHECK_EVERY: usize = 50;
/// How long the server may take to catch up at a checkpoint (a debug build on a busy machine).
const CATCH_UP: Duration = Duration::from_secs(60);
/// The server's `sizeBudget` (and the batch analysis's): pasted counts of 100 000 whose guard
/// an edit has broken make models of 10⁵–10⁶ declarations, seconds each in a debug build and
/// beside the point here (the bounded fuzz campaign uses the same budget).
const SIZE_BUDGET: u64 = 20_000;

/// What the requests got, beyond being answered.
#[derive(Default)]
struct Answers {
    /// References answers that found something.
    references: usize,
    /// Renames answered with edits, and those refused with a reason.
    renames: usize,
    refused_renames: usize,
}

/// Responses among `msgs`: their ids leave `pending`. An error is a failure, except a
/// cancellation (the server may drop a request a newer edit made stale) and a rename refused
/// with a reason (invalid params: a keyword, not a name, a name made by a build-up).
fn settle(
    msgs: &[Value],
    pending: &mut HashSet<i64>,
    methods: &HashMap<i64, &str>,
    answers: &mut Answers,
) {
    for m in msgs {
        if m.get("method").is_some() {
            continue;
        }
        let Some(id) = m.get("id").and_then(Value::as_i64) else {
            continue;
        };
        pending.remove(&id);
        let method = methods.get(&id).copied().unwrap_or("?");
        if let Some(e) = m.get("error") {
            let code = e["code"].as_i64().unwrap_or(0);
            let refused = code == -32602 && method.ends_with("ename");
            if refused && method == "textDocument/rename" {
                answers.refused_renames += 1;
            }
            assert!(
                code == -32800 || code == -32801 || refused,
                "{method} (request {id}) answered with an error: {e}"
            );
            continue;
        }
        let result = &m["result"];
        match method {
            "textDocument/references" if result.as_array().is_some_and(|a| !a.is_empty()) => {
                answers.references += 1;
            }
            "textDocument/rename" if result["changes"].is_object() => answers.renames += 1,
            _ => {}
        }
    }
}

/// Diagnostics as (code, zero-based line of their start), sorted: what the comparison reads.
type Sites = Vec<(String, u64)>;

fn published_sites(diags: &Value) -> Sites {
    let mut out: Sites = diags
        .as_array()
        .into_iter()
        .flatten()
        .map(|d| {
            (
                d["code"].as_str().unwrap_or("?").to_string(),
                d["range"]["start"]["line"].as_u64().unwrap_or(u64::MAX),
            )
        })
        .collect();
    out.sort();
    out
}

/// The batch analysis of `text` as the document at `path`, as the server makes it: the same
/// entry point, options, loader (open buffers first, here only the document itself) and
/// analysis stack. Returns the sites and whether any is an error.
fn batch_sites(path: &Path, text: &str, check_only: bool) -> (Sites, bool) {
    let name = path.display().to_string();
    let loader = DocLoader {
        open: Arc::new(HashMap::from([(path.to_path_buf(), Arc::from(text))])),
    };
    let options = Options {
        check_only,
        size_budget: Some(SIZE_BUDGET),
        ..Options::default()
    };
    on_analysis_thread(|| {
        let a = analyze(&name, text, &loader, &options);
        let mut out: Sites = a
            .diagnostics
            .iter()
            .map(|d| {
                // The library is the only other file the project holds, and it has no errors:
                // every diagnostic is the document's own.
                assert_eq!(
                    d.primary.span.file,
                    FileId(0),
                    "{} in another file; text:\n{text}",
                    d.code
                );
                let start = floor(text, d.primary.span.start as usize);
                (
                    d.code.to_string(),
                    text[..start].matches('\n').count() as u64,
                )
            })
            .collect();
        out.sort();
        (out, a.has_errors())
    })
    .expect("the batch analysis")
}

/// The edits of a rename answer, when they are all in `uri` (a rename that reaches into the
/// library on disk is not applied: the document alone would then name what is not there).
fn rename_edits(answer: &Value, uri: &str) -> Option<Vec<TextEdit>> {
    let changes = answer.get("result")?.get("changes")?.as_object()?;
    if changes.len() != 1 {
        return None;
    }
    let edits: Vec<TextEdit> = serde_json::from_value(changes.get(uri)?.clone()).ok()?;
    (!edits.is_empty()).then_some(edits)
}

#[derive(Default)]
struct Checkpoints {
    compared: usize,
    with_errors: usize,
    clean: usize,
    /// Checkpoints whose solve changed the diagnostics, compared a second time.
    solved: usize,
}

#[test]
fn the_server_survives_thousands_of_random_edits() {
    let started = Instant::now();
    let project = ScratchProject::new("soak");
    let root = project.root_uri();
    let uri = project.uri("model.heat");
    let path = project.dir.join("model.heat");

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
    c.initialize_with(&root, json!({"sizeBudget": SIZE_BUDGET}));

    let sources = Sources::load();
    let mut rng = Rng(0x50AC);
    let mut text = CABIN.to_string();
    let mut version = 1i64;
    c.open(&uri, version, &text);
    let mut pending: HashSet<i64> = HashSet::new();
    let mut methods: HashMap<i64, &str> = HashMap::new();
    let mut answers = Answers::default();
    let mut checks = Checkpoints::default();
    let mut requests = 0usize;
    let mut applied_renames = 0usize;
    // A rename the server proposed, to be applied as the next edit.
    let mut renamed: Option<String> = None;
    for i in 1..=EDITS {
        // Every other checkpoint sees a file opened afresh (a model that works, mostly), the
        // others what 50 edits have made of one.
        text = if i % (2 * CHECK_EVERY) == 0 {
            renamed = None;
            sources.restart(&mut rng)
        } else {
            match renamed.take() {
                Some(t) => t,
                None => edit(&mut rng, &text, &sources),
            }
        };
        if text.len() > MAX_TEXT {
            text = sources.fresh(&mut rng);
        }
        version += 1;
        c.change(&uri, version, &text);
        // One burst in five goes at a typist's pace: each version analysed before the next
        // edit, so intermediate texts are checked and solved, not only skipped as stale.
        let paced = (i / 100) % 5 == 2;
        let checkpoint = i % CHECK_EVERY == 0;
        if paced || checkpoint {
            let first = c.diagnostics(&uri, version, CATCH_UP);
            let Some(first) = first else {
                panic!(
                    "no diagnostics for version {version} (edit {i}) within {CATCH_UP:?}; \
                     server alive: {:?}\n{}\ntext:\n{text}",
                    child.try_wait(),
                    errors.lock().map(|e| e.clone()).unwrap_or_default()
                );
            };
            if checkpoint {
                // The server publishes the fast check first; the solve's diagnostics follow
                // only when they differ, and then this version's next publication has them.
                let (checked, check_errors) = batch_sites(&path, &text, true);
                assert_eq!(
                    published_sites(&first),
                    checked,
                    "edit {i}: the server's diagnostics (left) differ from the batch check \
                     (right) of version {version}; text:\n{text}"
                );
                checks.compared += 1;
                let mut has_errors = check_errors;
                if !check_errors {
                    let (solved, solve_errors) = batch_sites(&path, &text, false);
                    if solved != checked {
                        let second = c.diagnostics(&uri, version, CATCH_UP).unwrap_or_else(|| {
                            panic!("edit {i}: the solve's diagnostics of version {version} were never published; text:\n{text}")
                        });
                        assert_eq!(
                            published_sites(&second),
                            solved,
                            "edit {i}: the server's diagnostics after the solve (left) differ \
                             from the batch solve (right) of version {version}; text:\n{text}"
                        );
                        checks.solved += 1;
                    }
                    has_errors = solve_errors;
                }
                if has_errors {
                    checks.with_errors += 1;
                } else {
                    checks.clean += 1;
                }
                assert!(
                    matches!(child.try_wait(), Ok(None)),
                    "the server died after {i} edits: {:?}\n{}",
                    child.try_wait(),
                    errors.lock().map(|e| e.clone()).unwrap_or_default()
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
            }
            // With this version analysed, a rename now and then, applied as an editor applies
            // it: the next edit is the server's own.
            if paced && rng.below(6) == 0 {
                let method = "textDocument/rename";
                let id = c.send_request(
                    method,
                    json!({"textDocument": {"uri": uri}, "position": place(&mut rng, &text), "newName": format!("renamed_{i}")}),
                );
                methods.insert(id, method);
                requests += 1;
                let answer = c
                    .wait_for(
                        |m| m.get("id") == Some(&json!(id)) && m.get("method").is_none(),
                        CATCH_UP,
                    )
                    .unwrap_or_else(|| panic!("no answer to a rename (edit {i}); text:\n{text}"));
                settle(
                    std::slice::from_ref(&answer),
                    &mut pending,
                    &methods,
                    &mut answers,
                );
                if let Some(edits) = rename_edits(&answer, &uri) {
                    renamed = Some(apply_edits(&text, &edits));
                    applied_renames += 1;
                }
            }
            let msgs = c.drain();
            settle(&msgs, &mut pending, &methods, &mut answers);
        }
        if rng.below(4) == 0 {
            let (method, params) = feature_request(&mut rng, &uri, &text);
            let id = c.send_request(method, params);
            pending.insert(id);
            methods.insert(id, method);
            requests += 1;
        }
    }
    // Every request sent along the way is answered.
    for id in pending.clone() {
        if let Some(m) = c.wait_for(
            |m| m.get("id") == Some(&json!(id)) && m.get("method").is_none(),
            CATCH_UP,
        ) {
            settle(&[m], &mut pending, &methods, &mut answers);
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
    println!(
        "{EDITS} edits ({applied_renames} of them renames the server proposed), {requests} \
         feature requests, all answered ({} references found something, {} renames with edits, \
         {} refused); {} checkpoints compared with the batch analysis ({} with errors, {} \
         clean, {} compared again after the solve); {:.1} s",
        answers.references,
        answers.renames,
        answers.refused_renames,
        checks.compared,
        checks.with_errors,
        checks.clean,
        checks.solved,
        started.elapsed().as_secs_f64()
    );
    // The comparisons are not empty ones: the edits reach both broken and working models, and
    // the navigation requests land on names.
    assert_eq!(checks.compared, EDITS / CHECK_EVERY);
    assert!(
        checks.with_errors >= 5 && checks.clean >= 5,
        "checkpoints with errors {}, clean {}: the edits no longer reach both",
        checks.with_errors,
        checks.clean
    );
    assert!(
        checks.solved > 0,
        "no checkpoint compared the solve's diagnostics"
    );
    assert!(answers.references > 0 && answers.renames > 0 && applied_renames > 0);
}
