//! Reads imported model files for the compiler: from open editor buffers first (so unsaved
//! edits count), else from disk; relative to the importing file and never outside the project
//! folder (the nearest folder above the model holding `.git`, else the model's own folder),
//! as the command-line tool does.

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

fn project_root(model: &Path) -> PathBuf {
    let dir = model.parent().map(Path::to_path_buf).unwrap_or_default();
    dir.ancestors()
        .find(|a| a.join(".git").exists())
        .map(Path::to_path_buf)
        .unwrap_or(dir)
}

impl SourceLoader for DocLoader {
    fn load(&self, from: &str, path: &str) -> Result<(String, String), String> {
        let target = resolve(from, path)
            .ok_or("save the model to a file first: imports are read relative to it")?;
        let root = project_root(Path::new(from));
        if !target.starts_with(&root) {
            return Err(format!(
                "it lies outside the project folder `{}`",
                root.display()
            ));
        }
        let name = target.display().to_string();
        if let Some(text) = self.open.get(&target) {
            return Ok((name, text.to_string()));
        }
        let text = std::fs::read_to_string(&target).map_err(|e| e.to_string())?;
        Ok((name, text))
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
}
