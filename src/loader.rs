//! Reads imported model files for the compiler, relative to the importing file and never
//! outside the project root (the nearest folder above the model that holds `.git`, or the
//! model's own folder).

use caloris_compiler::source::SourceLoader;
use std::path::{Path, PathBuf};

pub struct FsLoader {
    root: PathBuf,
}

impl FsLoader {
    pub fn for_model(model: &Path) -> FsLoader {
        let dir = model
            .parent()
            .filter(|p| !p.as_os_str().is_empty())
            .map(Path::to_path_buf)
            .unwrap_or_else(|| PathBuf::from("."));
        let dir = dir.canonicalize().unwrap_or(dir);
        let root = dir
            .ancestors()
            .find(|a| a.join(".git").exists())
            .map(Path::to_path_buf)
            .unwrap_or(dir);
        FsLoader { root }
    }
}

impl SourceLoader for FsLoader {
    fn load(&self, from: &str, path: &str) -> Result<(String, String), String> {
        let base = Path::new(from)
            .parent()
            .map(Path::to_path_buf)
            .unwrap_or_default();
        let joined = if base.as_os_str().is_empty() {
            PathBuf::from(path)
        } else {
            base.join(path)
        };
        let canonical = joined.canonicalize().map_err(|e| format!("{e}"))?;
        if !canonical.starts_with(&self.root) {
            return Err(format!(
                "it lies outside the project folder `{}`",
                self.root.display()
            ));
        }
        let text = std::fs::read_to_string(&canonical).map_err(|e| format!("{e}"))?;
        Ok((joined.display().to_string(), text))
    }
}
