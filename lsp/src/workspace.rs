//! Model files of the workspace folders that are not open, analysed (check only) for workspace
//! symbols and for references and renames that cross files.

use crate::isolate::on_analysis_thread;
use crate::loader::DocLoader;
use crate::proto::lsp::Uri;
use crate::proto::path_uri;
use crate::snapshot::Snapshot;
use std::path::{Path, PathBuf};
use std::sync::Arc;

/// At most this many files are read, so a huge folder cannot stall the server.
const MAX_FILES: usize = 2000;
const MAX_DEPTH: usize = 12;

/// `.heat` files under the roots, skipping hidden folders and build output.
pub fn heat_files(roots: &[PathBuf]) -> Vec<PathBuf> {
    let mut out = Vec::new();
    for root in roots {
        walk(root, 0, &mut out);
    }
    out.sort();
    out.dedup();
    out
}

fn walk(dir: &Path, depth: usize, out: &mut Vec<PathBuf>) {
    if depth > MAX_DEPTH || out.len() >= MAX_FILES {
        return;
    }
    let Ok(entries) = std::fs::read_dir(dir) else {
        return;
    };
    let mut entries: Vec<_> = entries.flatten().collect();
    entries.sort_by_key(|e| e.file_name());
    for e in entries {
        let path = e.path();
        let name = e.file_name().to_string_lossy().to_string();
        let Ok(ft) = e.file_type() else { continue };
        if ft.is_dir() {
            if !name.starts_with('.') && name != "target" && name != "node_modules" {
                walk(&path, depth + 1, out);
            }
        } else if ft.is_file() && path.extension().is_some_and(|x| x == "heat") {
            out.push(path);
            if out.len() >= MAX_FILES {
                return;
            }
        }
    }
}

/// Check-only analyses of the given files (unreadable files are skipped), on one thread with
/// the analysis stack. A file whose analysis fails keeps its place with an internal-error
/// diagnostic, so the other files' results still count.
pub fn analyze_files(paths: &[PathBuf], loader: &DocLoader) -> Vec<Arc<Snapshot>> {
    analyze_files_with(paths, loader, &|uri, text| {
        Snapshot::analyze(uri, 0, text, loader, true)
    })
}

/// [`analyze_files`] with the analysis of one file given, so tests can make one fail.
pub fn analyze_files_with(
    paths: &[PathBuf],
    loader: &DocLoader,
    analyze: &(dyn Fn(Uri, &str) -> Snapshot + Sync),
) -> Vec<Arc<Snapshot>> {
    let all = on_analysis_thread(|| {
        paths
            .iter()
            .filter_map(|p| {
                let text = match loader.open.get(p) {
                    Some(t) => t.to_string(),
                    None => std::fs::read_to_string(p).ok()?,
                };
                let uri = path_uri(p)?;
                let snap =
                    Snapshot::analyze_with(uri, 0, &text, true, &|uri, _| analyze(uri, &text));
                Some(Arc::new(snap))
            })
            .collect()
    });
    all.unwrap_or_default()
}
