//! Reading a model as it was at a git revision (`caloris diff --rev`): the file itself and,
//! through [`RevLoader`], the files it imports, all from that same revision.

use caloris_compiler::source::SourceLoader;
use std::path::{Component, Path, PathBuf};
use std::process::Command;

/// A model file located in its git repository.
pub struct RepoFile {
    /// The repository's top folder.
    pub root: PathBuf,
    /// The file's path from the top folder, with `/` separators, as `git show REV:PATH` wants.
    pub rel: String,
}

fn git(root: &Path, args: &[&str]) -> Result<String, String> {
    let out = Command::new("git")
        .arg("-C")
        .arg(root)
        .args(args)
        .output()
        .map_err(|e| format!("cannot run git: {e}"))?;
    if !out.status.success() {
        return Err(String::from_utf8_lossy(&out.stderr).trim().to_string());
    }
    String::from_utf8(out.stdout).map_err(|_| "git printed text that is not UTF-8".to_string())
}

/// Find the repository that holds `file` and the file's path inside it.
pub fn locate(file: &Path) -> Result<RepoFile, String> {
    let abs = file
        .canonicalize()
        .map_err(|e| format!("cannot find `{}`: {e}", file.display()))?;
    let dir = abs.parent().unwrap_or(Path::new("/"));
    let top = git(dir, &["rev-parse", "--show-toplevel"])?;
    let root = PathBuf::from(top.trim())
        .canonicalize()
        .map_err(|e| format!("cannot open the repository: {e}"))?;
    let rel = abs.strip_prefix(&root).map_err(|_| {
        format!(
            "`{}` is not inside the repository `{}`",
            file.display(),
            root.display()
        )
    })?;
    let rel = rel
        .components()
        .map(|c| c.as_os_str().to_string_lossy().into_owned())
        .collect::<Vec<_>>()
        .join("/");
    Ok(RepoFile { root, rel })
}

/// The text of `rel` at revision `rev`.
pub fn show(root: &Path, rev: &str, rel: &str) -> Result<String, String> {
    git(root, &["show", &format!("{rev}:{rel}")])
}

/// The name an old version is shown under in messages: `REV:path`.
pub fn display_name(rev: &str, rel: &str) -> String {
    format!("{rev}:{rel}")
}

/// Resolves imports of a file read from a revision against that same revision.
pub struct RevLoader {
    pub root: PathBuf,
    pub rev: String,
}

impl SourceLoader for RevLoader {
    fn load(&self, from: &str, path: &str) -> Result<(String, String), String> {
        let from_rel = from.strip_prefix(&format!("{}:", self.rev)).unwrap_or(from);
        let base = Path::new(from_rel)
            .parent()
            .map(Path::to_path_buf)
            .unwrap_or_default();
        let rel = normalise(&base.join(path)).ok_or("it lies outside the repository")?;
        let text = show(&self.root, &self.rev, &rel)?;
        Ok((display_name(&self.rev, &rel), text))
    }
}

/// Resolve `.` and `..` without touching the file system; `None` when the path climbs out.
fn normalise(p: &Path) -> Option<String> {
    let mut parts: Vec<String> = Vec::new();
    for c in p.components() {
        match c {
            Component::Normal(s) => parts.push(s.to_string_lossy().into_owned()),
            Component::CurDir => {}
            Component::ParentDir => {
                parts.pop()?;
            }
            Component::RootDir | Component::Prefix(_) => return None,
        }
    }
    Some(parts.join("/"))
}

#[cfg(test)]
mod tests {
    use super::normalise;
    use std::path::Path;

    #[test]
    fn paths_are_resolved_inside_the_repository_only() {
        assert_eq!(
            normalise(Path::new("models/../lib/./m.heat")).as_deref(),
            Some("lib/m.heat")
        );
        assert_eq!(
            normalise(Path::new("models/m.heat")).as_deref(),
            Some("models/m.heat")
        );
        assert_eq!(normalise(Path::new("../outside.heat")), None);
        assert_eq!(normalise(Path::new("/etc/passwd")), None);
    }
}
