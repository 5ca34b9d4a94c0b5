//! The warnings of a study, once each: every point is a fresh analysis and would repeat the
//! model's warnings (a Biot number, a critical radius) at every point; here each warning is kept
//! once, at its place in the model, with how many points gave it and its message at the first.

use crate::analysis::Analysis;
use serde::Serialize;

/// A warning of the model at one or more points of a study.
#[derive(Clone, Debug, Serialize)]
pub struct StudyWarning {
    pub code: &'static str,
    /// The message at the first point that gave it (its numbers may move from point to point).
    pub message: String,
    pub help: Option<String>,
    pub file: String,
    /// 1-based line and character column.
    pub line: usize,
    pub column: usize,
    /// How many points gave this warning.
    pub points: usize,
}

/// Adds a point's warnings to `into`, one entry per code and place.
pub fn collect(into: &mut Vec<StudyWarning>, a: &Analysis) {
    for d in a.diagnostics.iter().filter(|d| !d.is_error()) {
        let f = a.sources.get(d.primary.span.file);
        let lc = f.lines.line_col_chars(d.primary.span.start);
        let (line, column) = (lc.line as usize + 1, lc.col as usize + 1);
        match into
            .iter_mut()
            .find(|w| w.code == d.code && w.file == f.name && w.line == line && w.column == column)
        {
            Some(w) => w.points += 1,
            None => into.push(StudyWarning {
                code: d.code,
                message: d.message.clone(),
                help: d.help.clone(),
                file: f.name.clone(),
                line,
                column,
                points: 1,
            }),
        }
    }
}
