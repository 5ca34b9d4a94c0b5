//! Seed inputs: every `.heat` file below the given folders, in a stable order.

use std::path::{Path, PathBuf};

pub struct Seed {
    pub name: String,
    pub text: String,
}

/// Files larger than this are left out as seeds: mutating them costs more than it finds.
pub const MAX_SEED_BYTES: usize = 256 * 1024;

pub fn load(dirs: &[PathBuf]) -> Vec<Seed> {
    let mut files = Vec::new();
    for d in dirs {
        collect(d, &mut files);
    }
    files.sort();
    files.dedup();
    files
        .into_iter()
        .filter_map(|p| {
            let bytes = std::fs::read(&p).ok()?;
            if bytes.len() > MAX_SEED_BYTES {
                return None;
            }
            Some(Seed {
                name: p.display().to_string(),
                text: String::from_utf8_lossy(&bytes).into_owned(),
            })
        })
        .collect()
}

fn collect(path: &Path, out: &mut Vec<PathBuf>) {
    if path.is_file() {
        if path.extension().is_some_and(|e| e == "heat") {
            out.push(path.to_path_buf());
        }
        return;
    }
    let Ok(entries) = std::fs::read_dir(path) else {
        return;
    };
    for e in entries.flatten() {
        collect(&e.path(), out);
    }
}
