//! The one diagnostic type every phase produces, and its terminal rendering.
//!
//! The CLI renders with ariadne; the language server converts the same value (secondary labels
//! become related information). Codes are stable so docs and tests can name them; the full list
//! is in `docs/diagnostics.md`.

use crate::span::Span;
use serde::Serialize;

#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord, Serialize)]
#[serde(rename_all = "lowercase")]
pub enum Severity {
    Error,
    Warning,
    Note,
}

/// A labelled place in a source file.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct Label {
    pub span: Span,
    pub message: String,
}

/// An error, warning or note about a model, with the place it concerns and how to fix it.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct Diagnostic {
    /// Stable code such as `E201`; errors start with `E`, warnings with `W`.
    pub code: &'static str,
    pub severity: Severity,
    pub message: String,
    /// The main place; its message says what is wrong there.
    pub primary: Label,
    /// Other places that explain the error (the first declaration of a duplicate, ...).
    pub secondary: Vec<Label>,
    /// How to fix it, in the analyst's words.
    pub help: Option<String>,
    /// A mechanical fix an editor can apply: replace the text at `span` with `replacement`.
    pub fix: Option<Fix>,
}

/// A text edit that resolves a diagnostic ("did you mean", unit spelling).
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct Fix {
    pub title: String,
    pub span: Span,
    pub replacement: String,
}

impl Diagnostic {
    pub fn error(code: &'static str, message: impl Into<String>, span: Span) -> Diagnostic {
        Diagnostic::new(Severity::Error, code, message, span)
    }
    pub fn warning(code: &'static str, message: impl Into<String>, span: Span) -> Diagnostic {
        Diagnostic::new(Severity::Warning, code, message, span)
    }
    fn new(severity: Severity, code: &'static str, message: impl Into<String>, span: Span) -> Self {
        Diagnostic {
            code,
            severity,
            message: message.into(),
            primary: Label {
                span,
                message: String::new(),
            },
            secondary: Vec::new(),
            help: None,
            fix: None,
        }
    }
    /// Text shown at the primary place (under the carets).
    pub fn with_label(mut self, message: impl Into<String>) -> Self {
        self.primary.message = message.into();
        self
    }
    pub fn with_secondary(mut self, span: Span, message: impl Into<String>) -> Self {
        self.secondary.push(Label {
            span,
            message: message.into(),
        });
        self
    }
    pub fn with_help(mut self, help: impl Into<String>) -> Self {
        self.help = Some(help.into());
        self
    }
    pub fn with_fix(
        mut self,
        title: impl Into<String>,
        span: Span,
        replacement: impl Into<String>,
    ) -> Self {
        self.fix = Some(Fix {
            title: title.into(),
            span,
            replacement: replacement.into(),
        });
        self
    }
    pub fn is_error(&self) -> bool {
        self.severity == Severity::Error
    }
}

/// Names longer than this get no suggestion: a slip in a name that long is not what the
/// edit-distance search is for, and it would cost time quadratic in the length.
const SUGGEST_MAX_LEN: usize = 96;
/// Most character pairs one suggestion compares (the searches cost about the product of the two
/// lengths per candidate), so a model with millions of names and many unknown ones stays fast.
const SUGGEST_MAX_WORK: usize = 4_000_000;
/// Most character pairs all the suggestions of one analysis compare together (about a quarter
/// of a second). An unknown name inside a `repeat` is looked up once per copy over every
/// generated name; the copies' errors are merged into one, so later searches only cost time.
const SUGGEST_ANALYSIS_WORK: usize = 20_000_000;

thread_local! {
    /// What is left of [`SUGGEST_ANALYSIS_WORK`] for the analysis running on this thread.
    static SUGGEST_LEFT: std::cell::Cell<usize> = const { std::cell::Cell::new(SUGGEST_ANALYSIS_WORK) };
}

/// Give the analysis starting on this thread its whole suggestion budget.
pub(crate) fn reset_suggestion_budget() {
    SUGGEST_LEFT.with(|left| left.set(SUGGEST_ANALYSIS_WORK));
}

/// "did you mean `x`?" for the closest candidate within a small edit distance.
pub fn did_you_mean<'a>(
    name: &str,
    candidates: impl IntoIterator<Item = &'a str>,
) -> Option<&'a str> {
    let left = SUGGEST_LEFT.with(|l| l.get());
    if name.len() > SUGGEST_MAX_LEN || left == 0 {
        return None;
    }
    let cap = SUGGEST_MAX_WORK.min(left);
    let mut best: Option<(f64, &str)> = None;
    let mut work = 0usize;
    for c in candidates
        .into_iter()
        .filter(|c| c.len() <= SUGGEST_MAX_LEN)
    {
        work += name.len().max(1) * c.len().max(1);
        if work > cap {
            work = cap;
            break;
        }
        let score = strsim::jaro_winkler(name, c);
        let close = score > 0.8 || strsim::levenshtein(name, c) <= name.len().min(c.len()) / 3 + 1;
        if close && c != name && best.is_none_or(|(s, _)| score > s) {
            best = Some((score, c));
        }
    }
    SUGGEST_LEFT.with(|l| l.set(left - work.min(left)));
    best.map(|(_, c)| c)
}
