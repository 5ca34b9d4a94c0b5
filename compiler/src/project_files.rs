//! Which files a model may import, and reading them: the one rule the command-line tool and
//! the language server share, so a model that loads in one loads the same way in the other.
//!
//! A model's project folder is the nearest folder above it that holds `.git`, else the model's
//! own folder. An import is resolved relative to the importing file, with every symbolic link
//! followed, and must be a regular file inside the project folder: a link that leads outside
//! is refused, and so is a pipe, a device or a folder (reading a pipe would wait forever).
//! The analysis itself never calls this module; callers hand it to [`crate::analyze`] through
//! their [`crate::source::SourceLoader`].

use std::path::{Component, Path, PathBuf};

/// Largest file an import may be (a generated model of a million nodes is about 170 MB).
pub const MAX_IMPORT_BYTES: u64 = 512 * 1024 * 1024;

/// The project folder of the model at `model`, with symbolic links resolved.
pub fn project_root(model: &Path) -> PathBuf {
    let dir = model
        .parent()
        .filter(|p| !p.as_os_str().is_empty())
        .map(Path::to_path_buf)
        .unwrap_or_else(|| PathBuf::from("."));
    let dir = dir.canonicalize().unwrap_or(dir);
    dir.ancestors()
        .find(|a| a.join(".git").exists())
        .map(Path::to_path_buf)
        .unwrap_or(dir)
}

/// The file `import "path"` in the file named `from` refers to, as written (not resolved),
/// with `.` and `name/..` removed so that a file reached again by another spelling has the
/// same name (import cycles are found by name).
pub fn joined(from: &str, path: &str) -> PathBuf {
    let base = Path::new(from).parent().unwrap_or(Path::new(""));
    let mut out = PathBuf::new();
    for c in base.join(path).components() {
        match c {
            Component::CurDir => {}
            Component::ParentDir
                if matches!(out.components().next_back(), Some(Component::Normal(_))) =>
            {
                out.pop();
            }
            c => out.push(c),
        }
    }
    out
}

/// The resolved path of an import, checked against the rule above. Errors are written to
/// follow "cannot import `path`: ".
pub fn resolve_import(root: &Path, from: &str, path: &str) -> Result<PathBuf, String> {
    let target = joined(from, path);
    let canonical = target.canonicalize().map_err(|e| e.to_string())?;
    if !canonical.starts_with(root) {
        return Err(format!(
            "it lies outside the project folder `{}`",
            root.display()
        ));
    }
    let meta = std::fs::metadata(&canonical).map_err(|e| e.to_string())?;
    if !meta.is_file() {
        return Err(if meta.is_dir() {
            "it is a folder, not a model file".to_string()
        } else {
            "it is not a regular file (a pipe, socket or device)".to_string()
        });
    }
    if meta.len() > MAX_IMPORT_BYTES {
        return Err(format!(
            "it is {} MB, more than the {} MB an import may be",
            meta.len() / (1024 * 1024),
            MAX_IMPORT_BYTES / (1024 * 1024)
        ));
    }
    Ok(canonical)
}

/// Read an import from disk: the name to show for it (the path as written) and its text.
pub fn read_import(root: &Path, from: &str, path: &str) -> Result<(String, String), String> {
    let canonical = resolve_import(root, from, path)?;
    let text = std::fs::read_to_string(&canonical).map_err(|e| e.to_string())?;
    Ok((joined(from, path).display().to_string(), text))
}

#[cfg(test)]
mod tests {
    use super::joined;
    use std::path::PathBuf;

    #[test]
    fn names_are_spelled_one_way() {
        assert_eq!(joined("x/a.heat", "../x/a.heat"), PathBuf::from("x/a.heat"));
        assert_eq!(
            joined("a.heat", "./lib/m.heat"),
            PathBuf::from("lib/m.heat")
        );
        assert_eq!(joined("a.heat", "../m.heat"), PathBuf::from("../m.heat"));
        assert_eq!(
            joined("/p/x/a.heat", "../../q.heat"),
            PathBuf::from("/q.heat")
        );
    }
}
