//! Source files of one analysis and the loader through which imports are read.
//!
//! The compiler does no I/O of its own: the CLI supplies a loader that reads files below the
//! project root, the language server one that prefers unsaved editor buffers.

use crate::span::{FileId, LineIndex};

/// Reads imported model files on the compiler's behalf.
pub trait SourceLoader {
    /// Resolve `path` as written in an `import` of the file `from`, and return the canonical name
    /// of the imported file and its text, or a message saying why it cannot be read.
    fn load(&self, from: &str, path: &str) -> Result<(String, String), String>;
}

/// A loader for models that import nothing (tests, stdin).
pub struct NoImports;

impl SourceLoader for NoImports {
    fn load(&self, _from: &str, path: &str) -> Result<(String, String), String> {
        Err(format!(
            "imports are not available here (cannot read `{path}`)"
        ))
    }
}

/// One source file: its name as shown to people, its text and line index.
#[derive(Clone, Debug)]
pub struct SourceFile {
    pub name: String,
    pub text: String,
    pub lines: LineIndex,
}

/// All files of one analysis, indexed by [`FileId`].
#[derive(Clone, Debug, Default)]
pub struct Sources {
    files: Vec<SourceFile>,
}

impl Sources {
    pub fn add(&mut self, name: impl Into<String>, text: impl Into<String>) -> FileId {
        let text = text.into();
        let lines = LineIndex::new(&text);
        self.files.push(SourceFile {
            name: name.into(),
            text,
            lines,
        });
        FileId(self.files.len() as u32 - 1)
    }
    pub fn get(&self, id: FileId) -> &SourceFile {
        &self.files[id.0 as usize]
    }
    pub fn name(&self, id: FileId) -> &str {
        &self.get(id).name
    }
    pub fn text(&self, id: FileId) -> &str {
        &self.get(id).text
    }
    pub fn find(&self, name: &str) -> Option<FileId> {
        self.files
            .iter()
            .position(|f| f.name == name)
            .map(|i| FileId(i as u32))
    }
    pub fn iter(&self) -> impl Iterator<Item = (FileId, &str, &str)> {
        self.files
            .iter()
            .enumerate()
            .map(|(i, f)| (FileId(i as u32), f.name.as_str(), f.text.as_str()))
    }
    pub fn len(&self) -> usize {
        self.files.len()
    }
    pub fn is_empty(&self) -> bool {
        self.files.is_empty()
    }
}
