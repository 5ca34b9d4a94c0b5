//! The document store: per open document its version, text and newest analysis.
//!
//! Edits are applied under one lock, in the order of their versions: a change whose version is
//! not newer than the stored one is dropped (handlers may run out of order). Each document has
//! a worker task ([`crate::worker`]) fed through a `watch` channel, so it only ever sees the
//! newest text; an analysis is stored only if it is for the stored version, so an older
//! analysis never replaces a newer one.

use crate::loader::DocLoader;
use crate::proto::{lsp, uri_path};
use crate::snapshot::{Snapshot, Stage};
use caloris_compiler::span::{LineCol, LineIndex};
use lsp::{TextDocumentContentChangeEvent, Uri};
use std::collections::HashMap;
use std::path::{Path, PathBuf};
use std::sync::{Arc, Mutex, MutexGuard};
use std::time::Duration;
use tokio::sync::watch;

/// One unit of work for a document's worker: analyse this text as this version.
#[derive(Clone, Debug)]
pub struct Job {
    pub version: i32,
    pub text: Arc<str>,
    /// Bumped when a file the document imports changed, to analyse the same text again.
    pub revision: u64,
    /// The document was closed: clear its diagnostics and stop.
    pub closed: bool,
}

struct Doc {
    uri: Uri,
    version: i32,
    text: Arc<str>,
    revision: u64,
    snapshot: Option<Arc<Snapshot>>,
    jobs: watch::Sender<Job>,
    updates: watch::Sender<u64>,
}

/// How far the analysis a request needs must have gone.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Need {
    /// Names, spans and diagnostics of the current text.
    Checked,
    /// Solved values of the current text (or nothing more to come).
    Final,
}

#[derive(Default)]
pub struct Documents {
    docs: Mutex<HashMap<String, Doc>>,
}

impl Documents {
    fn lock(&self) -> MutexGuard<'_, HashMap<String, Doc>> {
        // A panic while holding the lock leaves plain data behind; keep serving.
        self.docs.lock().unwrap_or_else(|e| e.into_inner())
    }

    /// Open a document. Returns the job receiver for its new worker, or `None` when it was
    /// already open (then this counts as a change).
    pub fn open(&self, uri: &Uri, version: i32, text: String) -> Option<watch::Receiver<Job>> {
        let text: Arc<str> = Arc::from(text);
        let mut docs = self.lock();
        if let Some(doc) = docs.get_mut(uri.as_str()) {
            if version > doc.version {
                doc.version = version;
                doc.text = text.clone();
                doc.jobs.send_replace(Job {
                    version,
                    text,
                    revision: doc.revision,
                    closed: false,
                });
            }
            return None;
        }
        let job = Job {
            version,
            text: text.clone(),
            revision: 0,
            closed: false,
        };
        let (jobs, rx) = watch::channel(job);
        let (updates, _) = watch::channel(0);
        docs.insert(
            uri.as_str().to_string(),
            Doc {
                uri: uri.clone(),
                version,
                text,
                revision: 0,
                snapshot: None,
                jobs,
                updates,
            },
        );
        Some(rx)
    }

    /// Apply the changes of one `didChange` if its version is newer than the stored one.
    /// Returns false when the change was dropped (unknown document or stale version).
    pub fn change(
        &self,
        uri: &Uri,
        version: i32,
        changes: Vec<TextDocumentContentChangeEvent>,
    ) -> bool {
        let mut docs = self.lock();
        let Some(doc) = docs.get_mut(uri.as_str()) else {
            return false;
        };
        if version <= doc.version {
            return false;
        }
        let mut text = doc.text.to_string();
        for c in changes {
            match c.range {
                None => text = c.text,
                Some(r) => {
                    let index = LineIndex::new(&text);
                    let start = index.offset_utf16(LineCol {
                        line: r.start.line,
                        col: r.start.character,
                    }) as usize;
                    let end = index.offset_utf16(LineCol {
                        line: r.end.line,
                        col: r.end.character,
                    }) as usize;
                    if start <= end && end <= text.len() {
                        text.replace_range(start..end, &c.text);
                    }
                }
            }
        }
        doc.version = version;
        doc.text = Arc::from(text);
        doc.jobs.send_replace(Job {
            version,
            text: doc.text.clone(),
            revision: doc.revision,
            closed: false,
        });
        true
    }

    /// Close a document: its worker clears its diagnostics and stops.
    pub fn close(&self, uri: &Uri) {
        if let Some(doc) = self.lock().remove(uri.as_str()) {
            doc.jobs.send_replace(Job {
                version: doc.version,
                text: doc.text,
                revision: doc.revision,
                closed: true,
            });
        }
    }

    /// Analyse again every open document whose last analysis read one of `paths` (an import
    /// changed), except `except`.
    pub fn touch_dependents(&self, paths: &[PathBuf], except: Option<&Uri>) {
        let names: Vec<String> = paths.iter().map(|p| p.display().to_string()).collect();
        let mut docs = self.lock();
        for doc in docs.values_mut() {
            if except.is_some_and(|u| u.as_str() == doc.uri.as_str()) {
                continue;
            }
            let Some(snap) = &doc.snapshot else { continue };
            let reads = snap
                .analysis
                .sources
                .iter()
                .skip(1)
                .any(|(_, name, _)| names.iter().any(|n| n == name));
            if reads {
                doc.revision += 1;
                doc.jobs.send_replace(Job {
                    version: doc.version,
                    text: doc.text.clone(),
                    revision: doc.revision,
                    closed: false,
                });
            }
        }
    }

    /// A loader that sees the open documents' current texts.
    pub fn loader(&self) -> DocLoader {
        let open: HashMap<PathBuf, Arc<str>> = self
            .lock()
            .values()
            .filter_map(|d| Some((uri_path(&d.uri)?, d.text.clone())))
            .collect();
        DocLoader {
            open: Arc::new(open),
        }
    }

    /// Store an analysis if it is for the document's current version; false when it is stale
    /// or the document was closed. Waiting requests are woken.
    pub fn install(&self, snap: Arc<Snapshot>) -> bool {
        let mut docs = self.lock();
        let Some(doc) = docs.get_mut(snap.uri.as_str()) else {
            return false;
        };
        if snap.version != doc.version {
            return false;
        }
        // A check of the same version must not replace its finished solve.
        if let Some(old) = &doc.snapshot {
            if old.version == snap.version
                && old.stage == Stage::Final
                && snap.stage == Stage::Checked
            {
                return false;
            }
        }
        doc.snapshot = Some(snap);
        doc.updates.send_modify(|n| *n += 1);
        true
    }

    /// The analysis of the document's current text, waiting up to `timeout` for it. With
    /// [`Need::Final`], a checked analysis of the current text is returned if the solve does
    /// not finish in time. `None` if the document is not open or nothing current is ready.
    pub async fn snapshot(
        &self,
        uri: &Uri,
        need: Need,
        timeout: Duration,
    ) -> Option<Arc<Snapshot>> {
        let deadline = tokio::time::Instant::now() + timeout;
        loop {
            let (current, mut rx) = {
                let docs = self.lock();
                let doc = docs.get(uri.as_str())?;
                let current = doc.snapshot.clone().filter(|s| s.version == doc.version);
                (current, doc.updates.subscribe())
            };
            if let Some(s) = &current {
                if need == Need::Checked || s.stage == Stage::Final {
                    return current;
                }
            }
            match tokio::time::timeout_at(deadline, rx.changed()).await {
                Ok(Ok(())) => continue,
                Ok(Err(_)) => return None,
                Err(_) => return current,
            }
        }
    }

    /// The newest analysis of every open document.
    pub fn snapshots(&self) -> Vec<Arc<Snapshot>> {
        self.lock()
            .values()
            .filter_map(|d| d.snapshot.clone())
            .collect()
    }

    /// The paths of the open documents.
    pub fn open_paths(&self) -> Vec<PathBuf> {
        self.lock()
            .values()
            .filter_map(|d| uri_path(&d.uri))
            .collect()
    }

    /// True when the document at `path` is open.
    pub fn is_open(&self, path: &Path) -> bool {
        self.lock()
            .values()
            .any(|d| uri_path(&d.uri).as_deref() == Some(path))
    }

    /// The stored version of a document.
    pub fn version(&self, uri: &Uri) -> Option<i32> {
        self.lock().get(uri.as_str()).map(|d| d.version)
    }
}
