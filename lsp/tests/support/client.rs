//! A small blocking JSON-RPC client for driving the language server in tests and the latency
//! benchmark: Content-Length framing, requests with ids, notifications, and a backlog of
//! everything the server sent. Requests from the server (`workspace/inlayHint/refresh`, ...)
//! are answered with `null` and also kept in the backlog.
#![allow(dead_code)]

use serde_json::{json, Value};
use std::io::{BufRead, BufReader, Read, Write};
use std::sync::mpsc::{channel, Receiver, RecvTimeoutError};
use std::sync::{Arc, Mutex};
use std::time::{Duration, Instant};

pub struct RpcClient {
    writer: Arc<Mutex<Box<dyn Write + Send>>>,
    incoming: Receiver<(Instant, Value)>,
    backlog: Vec<(Instant, Value)>,
    next_id: i64,
}

fn write_message(w: &mut dyn Write, v: &Value) -> std::io::Result<()> {
    let body = serde_json::to_vec(v)?;
    write!(w, "Content-Length: {}\r\n\r\n", body.len())?;
    w.write_all(&body)?;
    w.flush()
}

fn read_message(r: &mut dyn BufRead) -> Option<Value> {
    let mut len = None;
    loop {
        let mut line = String::new();
        if r.read_line(&mut line).ok()? == 0 {
            return None;
        }
        let line = line.trim_end();
        if line.is_empty() {
            break;
        }
        if let Some(v) = line.strip_prefix("Content-Length: ") {
            len = v.parse::<usize>().ok();
        }
    }
    let mut body = vec![0; len?];
    r.read_exact(&mut body).ok()?;
    serde_json::from_slice(&body).ok()
}

impl RpcClient {
    pub fn new(reader: Box<dyn Read + Send>, writer: Box<dyn Write + Send>) -> RpcClient {
        let writer: Arc<Mutex<Box<dyn Write + Send>>> = Arc::new(Mutex::new(writer));
        let (tx, incoming) = channel();
        // Weak, so dropping the client closes the server's input.
        let replier = Arc::downgrade(&writer);
        std::thread::spawn(move || {
            let mut reader = BufReader::new(reader);
            while let Some(msg) = read_message(&mut reader) {
                if msg.get("method").is_some() && msg.get("id").is_some() {
                    let reply = json!({"jsonrpc": "2.0", "id": msg["id"].clone(), "result": null});
                    if let Some(w) = replier.upgrade() {
                        if let Ok(mut w) = w.lock() {
                            let _ = write_message(&mut **w, &reply);
                        }
                    }
                }
                if tx.send((Instant::now(), msg)).is_err() {
                    return;
                }
            }
        });
        RpcClient {
            writer,
            incoming,
            backlog: Vec::new(),
            next_id: 1,
        }
    }

    fn send(&mut self, v: &Value) {
        let mut w = self.writer.lock().expect("writer lock");
        write_message(&mut **w, v).expect("write to the server");
    }

    pub fn notify(&mut self, method: &str, params: Value) {
        self.send(&json!({"jsonrpc": "2.0", "method": method, "params": params}));
    }

    /// Send a request without waiting; returns its id.
    pub fn send_request(&mut self, method: &str, params: Value) -> i64 {
        let id = self.next_id;
        self.next_id += 1;
        self.send(&json!({"jsonrpc": "2.0", "id": id, "method": method, "params": params}));
        id
    }

    /// Send a request and wait for its response (the whole message, with `result` or `error`).
    pub fn request_raw(&mut self, method: &str, params: Value) -> Value {
        let id = self.send_request(method, params);
        self.wait_for(
            |m| m.get("id") == Some(&json!(id)) && m.get("method").is_none(),
            Duration::from_secs(30),
        )
        .unwrap_or_else(|| panic!("no response to {method}"))
    }

    /// Send a request and return its result; panics on an error response.
    pub fn request(&mut self, method: &str, params: Value) -> Value {
        let resp = self.request_raw(method, params);
        if let Some(e) = resp.get("error") {
            panic!("{method} failed: {e}");
        }
        resp["result"].clone()
    }

    /// The first message (from the backlog, then as they arrive) that `pred` accepts, removed
    /// from the backlog; `None` after `timeout`.
    pub fn wait_for(&mut self, pred: impl Fn(&Value) -> bool, timeout: Duration) -> Option<Value> {
        self.wait_for_timed(pred, timeout).map(|m| m.1)
    }

    /// As [`wait_for`], with the instant the message arrived.
    pub fn wait_for_timed(
        &mut self,
        pred: impl Fn(&Value) -> bool,
        timeout: Duration,
    ) -> Option<(Instant, Value)> {
        if let Some(i) = self.backlog.iter().position(|m| pred(&m.1)) {
            return Some(self.backlog.remove(i));
        }
        let deadline = Instant::now() + timeout;
        loop {
            let left = deadline.saturating_duration_since(Instant::now());
            match self.incoming.recv_timeout(left) {
                Ok(m) if pred(&m.1) => return Some(m),
                Ok(m) => self.backlog.push(m),
                Err(RecvTimeoutError::Timeout) | Err(RecvTimeoutError::Disconnected) => {
                    return None
                }
            }
        }
    }

    /// Everything received so far that no wait took, in arrival order.
    pub fn drain(&mut self) -> Vec<Value> {
        while let Ok(m) = self.incoming.try_recv() {
            self.backlog.push(m);
        }
        self.backlog.drain(..).map(|m| m.1).collect()
    }

    /// `initialize` + `initialized`, with a workspace folder and inlay-hint refresh support.
    pub fn initialize(&mut self, root_uri: &str) -> Value {
        self.initialize_with(root_uri, Value::Null)
    }

    /// [`RpcClient::initialize`] with `initializationOptions` (the server's settings).
    pub fn initialize_with(&mut self, root_uri: &str, options: Value) -> Value {
        let caps = json!({
            "workspace": {"inlayHint": {"refreshSupport": true}, "configuration": false},
            "textDocument": {"publishDiagnostics": {"relatedInformation": true, "versionSupport": true}}
        });
        let result = self.request(
            "initialize",
            json!({"processId": null, "rootUri": root_uri, "capabilities": caps, "workspaceFolders": [{"uri": root_uri, "name": "root"}], "initializationOptions": options}),
        );
        self.notify("initialized", json!({}));
        result
    }

    pub fn open(&mut self, uri: &str, version: i64, text: &str) {
        self.notify("textDocument/didOpen", json!({"textDocument": {"uri": uri, "languageId": "heat", "version": version, "text": text}}));
    }

    pub fn change(&mut self, uri: &str, version: i64, text: &str) {
        self.notify("textDocument/didChange", json!({"textDocument": {"uri": uri, "version": version}, "contentChanges": [{"text": text}]}));
    }

    /// The next `publishDiagnostics` for `uri` with exactly `version`.
    pub fn diagnostics(&mut self, uri: &str, version: i64, timeout: Duration) -> Option<Value> {
        let uri = uri.to_string();
        self.wait_for(
            move |m| {
                m["method"] == "textDocument/publishDiagnostics"
                    && m["params"]["uri"] == uri
                    && m["params"]["version"] == json!(version)
            },
            timeout,
        )
        .map(|m| m["params"]["diagnostics"].clone())
    }

    pub fn shutdown(&mut self) {
        self.request("shutdown", Value::Null);
        self.notify("exit", Value::Null);
    }
}

/// A position in `text` at byte `offset`, in UTF-16 code units as the protocol counts.
pub fn position_of(text: &str, offset: usize) -> Value {
    let before = &text[..offset];
    let line = before.matches('\n').count();
    let line_start = before.rfind('\n').map(|i| i + 1).unwrap_or(0);
    let character = before[line_start..].encode_utf16().count();
    json!({"line": line, "character": character})
}
