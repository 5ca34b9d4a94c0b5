//! Latency of `caloris lsp` on a generated 5,000-line model, measured as an editor sees it:
//! the release binary over stdio, the time from sending `didChange` to receiving
//! `publishDiagnostics` for that version (the fast check), and to the server's
//! `workspace/inlayHint/refresh` request (the solve is done and hints can be fetched).
//!
//!     cargo bench --bench lsp_latency            # 40 edits
//!     CALORIS_BENCH_EDITS=100 cargo bench --bench lsp_latency
//!
//! Not a test: it prints figures and asserts nothing about speed.

#[path = "../lsp/tests/support/client.rs"]
mod client;

use client::RpcClient;
use serde_json::json;
use std::fmt::Write;
use std::process::{Command, Stdio};
use std::time::{Duration, Instant};

const LINES: usize = 5000;

/// A district-heating pipe rack, discretised: invented demo values, about `LINES` lines.
fn model(edit: usize) -> String {
    let mut s = String::new();
    let _ = writeln!(
        s,
        "# Generated benchmark model: a long pipe rack in segments (invented values)"
    );
    let _ = writeln!(s, "title \"Pipe rack benchmark\"");
    let _ = writeln!(s, "param seg_len = 0.5 m");
    let _ = writeln!(s, "param pipe_area = 0.1 m * seg_len");
    // The value the benchmark edits.
    let _ = writeln!(s, "param lag_thickness = {} mm", 40 + edit % 20);
    for i in 0..40 {
        let _ = writeln!(
            s,
            "material lagging_{i} (k = {:.3} W/(m*K))",
            0.030 + 0.001 * i as f64
        );
    }
    for b in 0..40 {
        let _ = writeln!(s, "buildup lag_{b} {{");
        let _ = writeln!(s, "  inside:  film(h = {} W/(m^2*K))", 800 + b);
        let _ = writeln!(
            s,
            "  lagging: layer(lagging_{b}, thickness = lag_thickness)"
        );
        let _ = writeln!(s, "  outside: film(r = 0.04 m²*K/W)");
        let _ = writeln!(s, "}}");
    }
    let _ = writeln!(s, "node steam (fixed = 180 °C)");
    let _ = writeln!(s, "node ambient (fixed = -5 °C)");
    let used = s.lines().count() + 4;
    // Each segment: a node, a link along the pipe and a link through the lagging: 3 lines.
    let segments = (LINES - used) / 3;
    for i in 0..segments {
        let _ = writeln!(s, "node seg_{i}");
    }
    for i in 0..segments {
        let prev = if i == 0 {
            "steam".to_string()
        } else {
            format!("seg_{}", i - 1)
        };
        let _ = writeln!(s, "link along_{i}: {prev} to seg_{i} conductance(2.5 W/K)");
    }
    for i in 0..segments {
        let _ = writeln!(
            s,
            "link loss_{i}: seg_{i} to ambient lag_{}(area = pipe_area)",
            i % 40
        );
    }
    let _ = writeln!(
        s,
        "limit touch_first: temperature(loss_0.lagging) >= -50 °C"
    );
    let _ = writeln!(
        s,
        "limit touch_last: temperature(seg_{}) <= 200 °C",
        segments - 1
    );
    while s.lines().count() < LINES {
        let _ = writeln!(s, "# end");
    }
    s
}

fn stats(mut v: Vec<f64>) -> (f64, f64, f64, f64) {
    v.sort_by(|a, b| a.total_cmp(b));
    let at = |q: f64| v[((v.len() - 1) as f64 * q).round() as usize];
    (at(0.5), at(0.9), v[0], v[v.len() - 1])
}

fn main() {
    let edits: usize = std::env::var("CALORIS_BENCH_EDITS")
        .ok()
        .and_then(|v| v.parse().ok())
        .unwrap_or(40);
    let dir = std::env::temp_dir().join(format!("caloris-lsp-bench-{}", std::process::id()));
    std::fs::create_dir_all(&dir).expect("temp dir");
    let path = dir.join("rack.heat");
    let text = model(0);
    std::fs::write(&path, &text).expect("write model");
    let uri = format!("file://{}", path.display());
    let mut child = Command::new(env!("CARGO_BIN_EXE_caloris"))
        .arg("lsp")
        .stdin(Stdio::piped())
        .stdout(Stdio::piped())
        .stderr(Stdio::inherit())
        .spawn()
        .expect("start caloris lsp");
    let stdin = child.stdin.take().expect("stdin");
    let stdout = child.stdout.take().expect("stdout");
    let mut c = RpcClient::new(Box::new(stdout), Box::new(stdin));
    c.initialize(&format!("file://{}", dir.display()));
    // No pause before the solve: measure the work, not the debounce.
    c.notify(
        "workspace/didChangeConfiguration",
        json!({"settings": {"caloris": {"solveDelayMs": 0}}}),
    );
    let t0 = Instant::now();
    c.open(&uri, 1, &text);
    let first = c
        .diagnostics(&uri, 1, Duration::from_secs(120))
        .expect("first diagnostics");
    assert_eq!(first, json!([]), "the generated model should be clean");
    let opened = t0.elapsed();
    c.wait_for(
        |m| m["method"] == "workspace/inlayHint/refresh",
        Duration::from_secs(120),
    )
    .expect("first solve");
    let solved_first = t0.elapsed();

    let timeout = Duration::from_secs(120);
    let (mut check, mut solve) = (Vec::new(), Vec::new());
    for i in 0..edits + 3 {
        let version = i as i64 + 2;
        let new_text = model(i + 1);
        let sent = Instant::now();
        c.change(&uri, version, &new_text);
        let (at, d) = {
            let u = uri.clone();
            c.wait_for_timed(
                move |m| {
                    m["method"] == "textDocument/publishDiagnostics"
                        && m["params"]["uri"] == u
                        && m["params"]["version"] == version
                },
                timeout,
            )
            .expect("diagnostics for the edit")
        };
        assert_eq!(d["params"]["diagnostics"], json!([]));
        let (done, _) = c
            .wait_for_timed(|m| m["method"] == "workspace/inlayHint/refresh", timeout)
            .expect("solve after the edit");
        if i >= 3 {
            check.push((at - sent).as_secs_f64() * 1e3);
            solve.push((done - sent).as_secs_f64() * 1e3);
        }
    }
    c.shutdown();
    let _ = child.wait();
    let _ = std::fs::remove_dir_all(&dir);

    println!(
        "model: {} lines, {} bytes",
        text.lines().count(),
        text.len()
    );
    println!(
        "open: diagnostics after {:.1} ms, solved after {:.1} ms",
        opened.as_secs_f64() * 1e3,
        solved_first.as_secs_f64() * 1e3
    );
    let (m, p90, lo, hi) = stats(check);
    println!("didChange -> publishDiagnostics ({edits} edits): median {m:.1} ms, p90 {p90:.1} ms (min {lo:.1}, max {hi:.1})");
    let (m, p90, lo, hi) = stats(solve);
    println!("didChange -> solved, inlay hints refreshable:  median {m:.1} ms, p90 {p90:.1} ms (min {lo:.1}, max {hi:.1})");
}
