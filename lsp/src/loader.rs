//! Reads imported model files for the compiler: from open editor buffers first (so unsaved
//! edits count), else from disk; relative to the importing file and never outside the project
//! folder (the nearest folder above the model holding `.git`, else the model's own folder),
//! as the command-line tool does.

use caloris_compiler::project_files::{joined, project_root, read_import};
use caloris_compiler::source::SourceLoader;
use std::collections::HashMap;
use std::path::{Component, Path, PathBuf};
use std::sync::Arc;

/// Open documents by path, handed to each analysis.
#[derive(Clone, Default)]
pub struct DocLoader {
    pub open: Arc<HashMap<PathBuf, Arc<str>>>,
}

/// The path an `import "path"` in the file named `from` refers to, without touching the disk.
pub fn resolve(from: &str, path: &str) -> Option<PathBuf> {
    let from = Path::new(from);
    if !from.is_absolute() {
        return None;
    }
    Some(normalize(&from.parent()?.join(path)))
}

fn normalize(p: &Path) -> PathBuf {
    let mut out = PathBuf::new();
    for c in p.components() {
        match c {
            Component::ParentDir => {
                out.pop();
            }
            Component::CurDir => {}
            c => out.push(c),
        }
    }
    out
}

impl SourceLoader for DocLoader {
    fn load(&self, from: &str, path: &str) -> Result<(String, String), String> {
        let target = resolve(from, path)
            .ok_or("save the model to a file first: imports are read relative to it")?;
        let root = project_root(Path::new(from));
        let name = target.display().to_string();
        // The same rule as on the command line (symbolic links followed, regular files
        // inside the project only); an open buffer counts when its real place passes it.
        let real = real_place(&joined(from, path));
        if !real.starts_with(&root) {
            return Err(format!(
                "it lies outside the project folder `{}`",
                root.display()
            ));
        }
        if let Some(text) = self.open.get(&target).or_else(|| self.open.get(&real)) {
            return Ok((name, text.to_string()));
        }
        let (_, text) = read_import(&root, from, path)?;
        Ok((name, text))
    }
}

/// Where `path` really is: every symbolic link resolved, also for a file not yet saved (its
/// folder resolved, its name kept).
fn real_place(path: &Path) -> PathBuf {
    if let Ok(p) = path.canonicalize() {
        return p;
    }
    match (
        path.parent().and_then(|d| d.canonicalize().ok()),
        path.file_name(),
    ) {
        (Some(dir), Some(file)) => dir.join(file),
        _ => path.to_path_buf(),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn resolves_relative_to_the_importing_file() {
        assert_eq!(
            resolve("/p/models/wall.heat", "../lib/materials.heat"),
            Some(PathBuf::from("/p/lib/materials.heat"))
        );
        assert_eq!(
            resolve("/p/models/wall.heat", "./m.heat"),
            Some(PathBuf::from("/p/models/m.heat"))
        );
        assert_eq!(resolve("untitled:1", "m.heat"), None);
    }

    #[test]
    fn prefers_open_buffers_and_stays_in_the_project() {
        let dir = std::env::temp_dir().join(format!("caloris-loader-{}", std::process::id()));
        std::fs::create_dir_all(dir.join(".git")).expect("temp dir");
        std::fs::write(dir.join("lib.heat"), "material a (k = 1 W/(m*K))\n").expect("write");
        let model = dir.join("m.heat").display().to_string();
        let mut open = HashMap::new();
        let loader = DocLoader::default();
        assert!(loader
            .load(&model, "lib.heat")
            .expect("from disk")
            .1
            .contains("material a"));
        open.insert(
            dir.join("lib.heat"),
            Arc::from("material b (k = 2 W/(m*K))\n"),
        );
        let loader = DocLoader {
            open: Arc::new(open),
        };
        assert!(loader
            .load(&model, "lib.heat")
            .expect("from buffer")
            .1
            .contains("material b"));
        assert!(loader
            .load(&model, "../elsewhere.heat")
            .expect_err("outside")
            .contains("outside the project"));
        assert!(loader.load(&model, "missing.heat").is_err());
        std::fs::remove_dir_all(&dir).ok();
    }

    /// An open buffer reached through a symbolic link inside the project is the same file;
    /// a link that leads outside is refused even when the target is open; a pipe is never
    /// opened.
    #[cfg(unix)]
    #[test]
    fn follows_links_like_the_command_line() {
        let scratch =
            std::env::temp_dir().join(format!("caloris-lsp-links-{}", std::process::id()));
        let _ = std::fs::remove_dir_all(&scratch);
        let dir = scratch.join("project");
        std::fs::create_dir_all(dir.join(".git")).expect("temp dir");
        std::fs::create_dir_all(dir.join("lib")).expect("lib dir");
        std::fs::write(dir.join("lib/real.heat"), "material a (k = 1 W/(m*K))\n").expect("write");
        std::os::unix::fs::symlink("lib", dir.join("shared")).expect("symlink");
        std::fs::write(scratch.join("secret.heat"), "material s (k = 1 W/(m*K))\n").expect("write");
        std::os::unix::fs::symlink(scratch.join("secret.heat"), dir.join("alias.heat"))
            .expect("symlink");
        let model = dir.join("m.heat").display().to_string();

        // Unsaved text of lib/real.heat wins also when imported as shared/real.heat.
        let real = dir.join("lib/real.heat").canonicalize().expect("real");
        let mut open = HashMap::new();
        open.insert(real, Arc::from("material b (k = 2 W/(m*K))\n"));
        open.insert(
            scratch.join("secret.heat").canonicalize().expect("secret"),
            Arc::from("material s (k = 3 W/(m*K))\n"),
        );
        let loader = DocLoader {
            open: Arc::new(open),
        };
        let (_, text) = loader
            .load(&model, "shared/real.heat")
            .expect("through the link");
        assert!(text.contains("material b"), "{text}");
        let err = loader.load(&model, "alias.heat").expect_err("outside");
        assert!(err.contains("outside the project"), "{err}");

        let fifo = dir.join("pipe.heat");
        let made = std::process::Command::new("mkfifo").arg(&fifo).status();
        if made.is_ok_and(|s| s.success()) {
            let err = loader.load(&model, "pipe.heat").expect_err("a pipe");
            assert!(err.contains("not a regular file"), "{err}");
        }
        std::fs::remove_dir_all(&scratch).ok();
    }
}
