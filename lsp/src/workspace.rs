//! Model files of the workspace folders that are not open, analysed (check only) for workspace
//! symbols and for references and renames that cross files.

use crate::loader::DocLoader;
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

/// Check-only analyses of the given files (unreadable files are skipped).
pub fn analyze_files(paths: &[PathBuf], loader: &DocLoader) -> Vec<Arc<Snapshot>> {
    paths
        .iter()
        .filter_map(|p| {
            let text = match loader.open.get(p) {
                Some(t) => t.to_string(),
                None => std::fs::read_to_string(p).ok()?,
            };
            Some(Arc::new(Snapshot::analyze(
                path_uri(p)?,
                0,
                &text,
                loader,
                true,
            )))
        })
        .collect()
}
