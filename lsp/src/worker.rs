//! One task per open document: analyse the newest text off the async runtime, publish the fast
//! check at once and the solved analysis when ready, drop whatever a newer edit superseded.

use crate::diagnostics;
use crate::documents::Job;
use crate::isolate::{on_analysis_thread, INTERNAL_ERROR};
use crate::loader::DocLoader;
use crate::proto::lsp;
use crate::server::State;
use crate::snapshot::{Snapshot, Stage};
use lsp::{MessageType, Uri};
use std::sync::atomic::{AtomicBool, Ordering};
use std::sync::Arc;
use tokio::sync::watch;
use tower_lsp_server::Client;

/// True when a newer job (or a close) is waiting.
fn superseded(jobs: &watch::Receiver<Job>) -> bool {
    jobs.has_changed().unwrap_or(true)
}

async fn analyze(
    client: &Client,
    uri: &Uri,
    job: &Job,
    jobs: &watch::Receiver<Job>,
    loader: DocLoader,
    check_only: bool,
    size_budget: Option<u64>,
) -> Option<(Arc<Snapshot>, Vec<lsp::Diagnostic>)> {
    let (uri2, text, version) = (uri.clone(), job.text.clone(), job.version);
    // A newer edit stops this analysis where the compiler next looks (between expansions,
    // before the solve), so a slow model never holds back the analysis of what is typed next.
    let (cancel, watcher) = cancel_on_newer(jobs);
    // Off the async runtime, on a thread with a known stack; a compiler panic becomes an
    // internal-error diagnostic of this document (see `Snapshot::analyze_safely`).
    let done = tokio::task::spawn_blocking(move || {
        on_analysis_thread(|| {
            let snap = Snapshot::analyze_safely(
                uri2,
                version,
                &text,
                &loader,
                check_only,
                Some(cancel),
                size_budget,
            );
            let diags = diagnostics::to_lsp(&snap);
            (Arc::new(snap), diags)
        })
    })
    .await;
    watcher.abort();
    let message = match done {
        // Stale: the caller finds the newer job waiting and analyses that instead.
        Ok(Ok((snap, _))) if snap.analysis.cancelled => return None,
        Ok(Ok(v)) => return Some(v),
        Ok(Err(message)) => message,
        Err(e) => e.to_string(),
    };
    // Only converting the diagnostics or starting the thread can get here; still say so in
    // the document and keep serving.
    client
        .log_message(
            MessageType::ERROR,
            format!("caloris: analysis of {} failed: {message}", uri.as_str()),
        )
        .await;
    let internal = lsp::Diagnostic {
        severity: Some(lsp::DiagnosticSeverity::ERROR),
        code: Some(lsp::NumberOrString::String(INTERNAL_ERROR.to_string())),
        source: Some("caloris".into()),
        message: format!("internal error: the analysis of this file failed: {message}"),
        ..lsp::Diagnostic::default()
    };
    client
        .publish_diagnostics(uri.clone(), vec![internal], Some(job.version))
        .await;
    None
}

/// A flag that is set as soon as a job newer than the one `jobs` last saw arrives (or the
/// document's channel closes), and the task that watches for it (abort it when done).
fn cancel_on_newer(jobs: &watch::Receiver<Job>) -> (Arc<AtomicBool>, tokio::task::JoinHandle<()>) {
    let cancel = Arc::new(AtomicBool::new(false));
    let (flag, mut newer) = (cancel.clone(), jobs.clone());
    let watcher = tokio::spawn(async move {
        let _ = newer.changed().await;
        flag.store(true, Ordering::Relaxed);
    });
    (cancel, watcher)
}

/// Serve one document until it is closed.
pub async fn run(state: Arc<State>, client: Client, uri: Uri, mut jobs: watch::Receiver<Job>) {
    let mut pending = true;
    loop {
        if !pending && jobs.changed().await.is_err() {
            return;
        }
        pending = false;
        let job = jobs.borrow_and_update().clone();
        if job.closed {
            client
                .publish_diagnostics(uri.clone(), Vec::new(), None)
                .await;
            return;
        }
        let loader = state.docs.loader();
        let budget = state.settings().size_budget;
        let Some((check, diags)) =
            analyze(&client, &uri, &job, &jobs, loader.clone(), true, budget).await
        else {
            continue;
        };
        if superseded(&jobs) {
            pending = true;
            continue;
        }
        if !state.docs.install(check.clone()) {
            continue;
        }
        client
            .publish_diagnostics(uri.clone(), diags.clone(), Some(job.version))
            .await;
        if check.stage == Stage::Final {
            continue;
        }
        // Let a burst of typing settle before the solve.
        let delay = state.settings().solve_delay;
        tokio::select! {
            _ = tokio::time::sleep(delay) => {}
            changed = jobs.changed() => {
                if changed.is_err() {
                    return;
                }
                pending = true;
                continue;
            }
        }
        let Some((full, full_diags)) =
            analyze(&client, &uri, &job, &jobs, loader, false, budget).await
        else {
            continue;
        };
        if superseded(&jobs) {
            pending = true;
            continue;
        }
        if !state.docs.install(full.clone()) {
            continue;
        }
        if full_diags != diags {
            client
                .publish_diagnostics(uri.clone(), full_diags, Some(job.version))
                .await;
        }
        if state.inlay_refresh() {
            let c = client.clone();
            // Not awaited here: the worker must not wait on the editor's answer.
            tokio::spawn(async move {
                let _ = c.inlay_hint_refresh().await;
            });
        }
        if full.wants_transient() {
            match transient(&client, &full, &mut jobs).await {
                Ran::Finished => {}
                Ran::Superseded => pending = true,
                Ran::Closed => return,
            }
        }
    }
}

enum Ran {
    Finished,
    /// Stopped because a newer job is waiting.
    Superseded,
    /// The document's channel is gone.
    Closed,
}

/// Run the snapshot's transient on a blocking thread, stopping it when a newer job arrives.
/// Hover reads the result from the snapshot whenever it is there, so nothing is published.
async fn transient(client: &Client, snap: &Arc<Snapshot>, jobs: &mut watch::Receiver<Job>) -> Ran {
    let cancel = Arc::new(AtomicBool::new(false));
    let (snap2, cancel2) = (snap.clone(), cancel.clone());
    let run = tokio::task::spawn_blocking(move || {
        let failed = on_analysis_thread(|| snap2.run_transient(&cancel2)).err();
        if failed.is_some() {
            // No summary: hover then shows no run, rather than one running for ever.
            let _ = snap2.transient.set(None);
        }
        failed
    });
    tokio::select! {
        done = run => {
            let failed = match done {
                Ok(failed) => failed,
                Err(e) => Some(e.to_string()),
            };
            if let Some(message) = failed {
                client
                    .log_message(
                        MessageType::ERROR,
                        format!("caloris: the transient run of {} failed: {message}", snap.uri.as_str()),
                    )
                    .await;
            }
            Ran::Finished
        }
        changed = jobs.changed() => {
            // The run sees the flag between steps and ends soon; its result is dropped.
            cancel.store(true, Ordering::Relaxed);
            if changed.is_ok() { Ran::Superseded } else { Ran::Closed }
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use std::time::Duration;

    fn job(version: i32) -> Job {
        Job {
            version,
            text: Arc::from("node a (fixed = 20 °C)\n"),
            revision: 0,
            closed: false,
        }
    }

    /// The analysis of a version is told to stop when the next version arrives, and not
    /// before.
    #[tokio::test]
    async fn a_newer_job_cancels_the_running_analysis() {
        let (send, mut jobs) = watch::channel(job(1));
        jobs.borrow_and_update();
        let (cancel, watcher) = cancel_on_newer(&jobs);
        tokio::time::sleep(Duration::from_millis(20)).await;
        assert!(!cancel.load(Ordering::Relaxed), "no newer job yet");
        send.send(job(2)).expect("send");
        // The watcher runs on the runtime; give it the moment it needs, generously.
        for _ in 0..500 {
            if cancel.load(Ordering::Relaxed) {
                break;
            }
            tokio::time::sleep(Duration::from_millis(10)).await;
        }
        assert!(cancel.load(Ordering::Relaxed), "the newer job set the flag");
        watcher.await.expect("watcher ends");
        // The analysis itself stops at its next look: nothing is solved for a stale version.
        let loader = DocLoader::default();
        let snap = Snapshot::analyze_until(
            "file:///tmp/stale.heat".parse().expect("uri"),
            1,
            "node a (fixed = 20 °C)\nnode b (load = 1 W)\nlink l: a to b resistance(1 K/W)\n",
            &loader,
            false,
            Some(cancel),
        );
        assert!(snap.analysis.cancelled);
        assert!(snap.analysis.solution.is_none());
    }
}
