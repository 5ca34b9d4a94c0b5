//! Fixture models for the feature tests: a cabin model that imports a material library, with a
//! `$0` cursor marker, analysed in process; and renderers that turn protocol answers into text
//! that reads well in snapshots.
#![allow(dead_code)]

use caloris_lsp::loader::DocLoader;
use caloris_lsp::proto::lsp::{self, Position, Range, Uri, WorkspaceEdit};
use caloris_lsp::snapshot::Snapshot;
use std::collections::HashMap;
use std::path::PathBuf;
use std::str::FromStr;
use std::sync::Arc;

/// Demo model with invented values (a garden cabin with a small heater).
pub const CABIN: &str = "# Garden cabin on a winter night: demo model with invented values
title \"Garden cabin\"
import \"materials.heat\"

param wall_area = 2.4 m * 4.0 m
param roof_area = 9 m²

node room    (load = 150 W)
node outdoor (fixed = -8 °C)
node ground  (fixed = 6 °C)

buildup timber_wall {
  inside:     film(r = 0.13 m²*K/W)
  insulation: layer(wood_fibre, thickness = 140 mm)
  outside:    film(r = 0.04 m^2*K/W)
}

link north: room to outdoor timber_wall(area = wall_area)
link roof:  room to outdoor layer(wood_fibre, thickness = 200 mm, area = roof_area)
link floor: room to ground  layer(k = 0.035 W/(m*K), area = 9 m², thickness = 150 mm)

limit comfort:  temperature(room) >= 18 °C
limit no_mould: temperature(north.inside) >= 12.6 °C
";

pub const MATERIALS: &str = "# Shared material library (demo values)
material wood_fibre (k = 0.040 W/(m*K), density = 160 kg/m^3, specific_heat = 2100 J/(kg*K))
material spruce     (k = 0.12 W/(m*K))
";

pub const MODEL_PATH: &str = "/cabin/model.heat";
pub const LIB_PATH: &str = "/cabin/materials.heat";

pub fn uri(path: &str) -> Uri {
    Uri::from_str(&format!("file://{path}")).expect("uri")
}

pub fn loader() -> DocLoader {
    let open = HashMap::from([(PathBuf::from(LIB_PATH), Arc::<str>::from(MATERIALS))]);
    DocLoader {
        open: Arc::new(open),
    }
}

/// Strip the `$0` marker; return the text and the marker's position (UTF-16 columns, counted
/// here independently of the server's line index).
pub fn cursor(src: &str) -> (String, Position) {
    let at = src.find("$0").expect("a $0 marker");
    let text = src.replacen("$0", "", 1);
    let before = &text[..at];
    let line = before.matches('\n').count() as u32;
    let start = before.rfind('\n').map(|i| i + 1).unwrap_or(0);
    let character = before[start..].encode_utf16().count() as u32;
    (text, Position { line, character })
}

/// The cabin model with the marker placed before the `nth` (0-based) occurrence of `needle`.
pub fn cabin_at(needle: &str, nth: usize) -> String {
    let (i, _) = CABIN
        .match_indices(needle)
        .nth(nth)
        .unwrap_or_else(|| panic!("`{needle}` #{nth} not in the model"));
    format!("{}$0{}", &CABIN[..i], &CABIN[i..])
}

/// Analyse (and solve) a model text with the marker removed.
pub fn analyse(src: &str) -> (Snapshot, Position) {
    let (text, pos) = cursor(src);
    (
        Snapshot::analyze(uri(MODEL_PATH), 1, &text, &loader(), false),
        pos,
    )
}

/// The text a range covers, for the file it is in.
fn slice(text: &str, r: Range) -> String {
    let lines: Vec<&str> = text.split('\n').collect();
    let col = |p: Position| {
        let line = lines.get(p.line as usize).copied().unwrap_or("");
        let mut units = 0;
        for (i, c) in line.char_indices() {
            if units >= p.character {
                return i;
            }
            units += c.len_utf16() as u32;
        }
        line.len()
    };
    if r.start.line == r.end.line {
        let line = lines.get(r.start.line as usize).copied().unwrap_or("");
        line[col(r.start)..col(r.end).max(col(r.start))].to_string()
    } else {
        format!("<lines {}-{}>", r.start.line + 1, r.end.line + 1)
    }
}

pub fn file_text(u: &Uri) -> &'static str {
    if u.as_str().ends_with("materials.heat") {
        MATERIALS
    } else {
        CABIN
    }
}

fn file_name(u: &Uri) -> &str {
    u.as_str().rsplit('/').next().unwrap_or("")
}

/// `file:line:col `text``, 1-based, for a location.
pub fn location(l: &lsp::Location, text: &str) -> String {
    format!(
        "{}:{}:{} `{}`",
        file_name(&l.uri),
        l.range.start.line + 1,
        l.range.start.character + 1,
        slice(text, l.range)
    )
}

pub fn range_text(text: &str, r: Range) -> String {
    format!(
        "{}:{}-{}:{} `{}`",
        r.start.line + 1,
        r.start.character + 1,
        r.end.line + 1,
        r.end.character + 1,
        slice(text, r)
    )
}

/// Apply a workspace edit to `texts` (by file name) and show each changed file.
pub fn apply(edit: &WorkspaceEdit, texts: &[(&str, &str)]) -> String {
    let mut out = String::new();
    let mut changes: Vec<_> = edit.changes.iter().flatten().collect();
    changes.sort_by(|a, b| a.0.as_str().cmp(b.0.as_str()));
    for (u, edits) in changes {
        let name = file_name(u);
        let text = texts
            .iter()
            .find(|t| t.0 == name)
            .map(|t| t.1)
            .unwrap_or_else(|| panic!("no text for {name}"));
        let result = apply_edits(text, edits);
        out.push_str(&format!("--- {name} ({} edits)\n{result}", edits.len()));
    }
    out
}

/// `text` with `edits` made, their ranges read in the original text (as the protocol has
/// them), last first.
pub fn apply_edits(text: &str, edits: &[lsp::TextEdit]) -> String {
    let mut edits = edits.to_vec();
    edits.sort_by_key(|e| (e.range.start.line, e.range.start.character));
    let mut result = text.to_string();
    for e in edits.iter().rev() {
        let start = offset(&result, e.range.start);
        let end = offset(&result, e.range.end);
        result.replace_range(start..end, &e.new_text);
    }
    result
}

fn offset(text: &str, p: Position) -> usize {
    let mut line_start = 0;
    for _ in 0..p.line {
        line_start += text[line_start..].find('\n').map(|i| i + 1).unwrap_or(0);
    }
    let line = &text[line_start..];
    let mut units = 0;
    for (i, c) in line.char_indices() {
        if units >= p.character || c == '\n' {
            return line_start + i;
        }
        units += c.len_utf16() as u32;
    }
    text.len()
}

/// A document outline as indented lines: kind, name and detail, children below their parent.
pub fn outline(list: &[lsp::DocumentSymbol]) -> String {
    fn walk(list: &[lsp::DocumentSymbol], depth: usize, out: &mut String) {
        for s in list {
            out.push_str(&format!(
                "{}{:?} {} — {}\n",
                "  ".repeat(depth),
                s.kind,
                s.name,
                s.detail.clone().unwrap_or_default()
            ));
            if let Some(c) = &s.children {
                walk(c, depth + 1, out);
            }
        }
    }
    let mut out = String::new();
    walk(list, 0, &mut out);
    out
}

/// A project folder in the temp directory for a server that reads files: marked as a project
/// root by `.git`, holding [`MATERIALS`] as `materials.heat`, removed when dropped.
pub struct ScratchProject {
    pub dir: PathBuf,
}

impl ScratchProject {
    /// `caloris-NAME-PID` in the temp directory, empty but for the library.
    pub fn new(name: &str) -> ScratchProject {
        let dir = std::env::temp_dir().join(format!("caloris-{name}-{}", std::process::id()));
        let _ = std::fs::remove_dir_all(&dir);
        std::fs::create_dir_all(dir.join(".git")).expect("project folder");
        std::fs::write(dir.join("materials.heat"), MATERIALS).expect("material library");
        ScratchProject { dir }
    }

    /// The folder's URI, for `initialize`.
    pub fn root_uri(&self) -> String {
        format!("file://{}", self.dir.display())
    }

    /// The URI of `file` in the folder.
    pub fn uri(&self, file: &str) -> String {
        format!("file://{}", self.dir.join(file).display())
    }
}

impl Drop for ScratchProject {
    fn drop(&mut self) {
        let _ = std::fs::remove_dir_all(&self.dir);
    }
}
