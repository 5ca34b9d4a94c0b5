//! One analysis of one document version: what every feature reads.

use crate::isolate::{guarded, INTERNAL_ERROR};
use crate::loader::DocLoader;
use crate::proto::{self, lsp, uri_path};
use crate::settings::{Settings, Units};
use caloris_compiler::query::preferred_system;
use caloris_compiler::span::{FileId, LineIndex, Span};
use caloris_compiler::transient::{summarize, RunError, RunSummary};
use caloris_compiler::units::UnitSystem;
use caloris_compiler::{analyze, Analysis, Diagnostic, Options};
use lsp::{Location, Position, Range, Uri};
use std::sync::atomic::AtomicBool;
use std::sync::{Arc, OnceLock};

/// How far the analysis of a version has gone.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Stage {
    /// Syntax, names, units and connectivity are checked; the solve is still to come.
    Checked,
    /// Nothing more will come for this version: solved, or stopped by errors.
    Final,
}

/// The analysis of one version of a document.
pub struct Snapshot {
    pub uri: Uri,
    pub version: i32,
    pub stage: Stage,
    pub analysis: Analysis,
    /// The first transient run's summary, filled in by the worker after the solve (it may take
    /// seconds, so requests read it when it is there and never wait for it). Holds `None` when
    /// the model declares no run or has errors.
    pub transient: OnceLock<Option<Result<RunSummary, RunError>>>,
}

/// What is known about the transient run of a snapshot.
pub enum TransientState<'a> {
    /// The model declares no run (or cannot be run).
    NotDeclared,
    /// Declared; the run has not finished yet.
    Running,
    Failed(&'a RunError),
    Done(&'a RunSummary),
}

impl Snapshot {
    /// Analyse `text` as the document `uri` (imports through `loader`); `check_only` stops
    /// before the solve.
    pub fn analyze(
        uri: Uri,
        version: i32,
        text: &str,
        loader: &DocLoader,
        check_only: bool,
    ) -> Snapshot {
        Snapshot::analyze_until(uri, version, text, loader, check_only, None)
    }

    /// [`Snapshot::analyze`] that stops early once `cancel` is set (a newer edit has made
    /// this version stale); a stopped snapshot has `analysis.cancelled` set and must not be
    /// shown.
    pub fn analyze_until(
        uri: Uri,
        version: i32,
        text: &str,
        loader: &DocLoader,
        check_only: bool,
        cancel: Option<Arc<AtomicBool>>,
    ) -> Snapshot {
        let options = Options {
            check_only,
            cancel,
            ..Options::default()
        };
        Snapshot::analyze_options(uri, version, text, loader, &options)
    }

    /// Analyse `text` as the document `uri` with the compiler's options as given (the check
    /// alone when `options.check_only`).
    pub fn analyze_options(
        uri: Uri,
        version: i32,
        text: &str,
        loader: &DocLoader,
        options: &Options,
    ) -> Snapshot {
        let name = uri_path(&uri)
            .map(|p| p.display().to_string())
            .unwrap_or_else(|| uri.as_str().to_string());
        let analysis = analyze(&name, text, loader, options);
        let stage = if options.check_only && !analysis.has_errors() {
            Stage::Checked
        } else {
            Stage::Final
        };
        Snapshot {
            uri,
            version,
            stage,
            analysis,
            transient: OnceLock::new(),
        }
    }

    /// [`Snapshot::analyze`], except that a panic in the compiler does not escape: the
    /// document then gets a final snapshot with an internal-error diagnostic ([`INTERNAL_ERROR`])
    /// — holding the check of the text when only the solve failed, so names and hover keep
    /// working, or else the bare text. Call it on a thread with the analysis stack
    /// ([`crate::isolate::on_analysis_thread`]). `size_budget` replaces the compiler's model
    /// size budget when given.
    pub fn analyze_safely(
        uri: Uri,
        version: i32,
        text: &str,
        loader: &DocLoader,
        check_only: bool,
        cancel: Option<Arc<AtomicBool>>,
        size_budget: Option<u64>,
    ) -> Snapshot {
        Snapshot::analyze_with(uri, version, text, check_only, &|uri, check| {
            let options = Options {
                check_only: check,
                cancel: cancel.clone(),
                size_budget,
                ..Options::default()
            };
            Snapshot::analyze_options(uri, version, text, loader, &options)
        })
    }

    /// [`Snapshot::analyze_safely`] with the analysis given, so tests can make it fail.
    pub fn analyze_with(
        uri: Uri,
        version: i32,
        text: &str,
        check_only: bool,
        analyze: &dyn Fn(Uri, bool) -> Snapshot,
    ) -> Snapshot {
        let failure = match guarded(|| analyze(uri.clone(), check_only)) {
            Ok(snap) => return snap,
            Err(message) => message,
        };
        let checked = if check_only {
            None
        } else {
            guarded(|| analyze(uri.clone(), true)).ok()
        };
        let what = if checked.is_some() {
            "solving this model"
        } else {
            "checking this file"
        };
        let mut snap = checked.unwrap_or_else(|| {
            let name = uri_path(&uri)
                .map(|p| p.display().to_string())
                .unwrap_or_else(|| uri.as_str().to_string());
            Snapshot {
                uri,
                version,
                stage: Stage::Final,
                analysis: Analysis::unanalysed(&name, text),
                transient: OnceLock::new(),
            }
        });
        snap.stage = Stage::Final;
        snap.analysis.diagnostics.push(
            Diagnostic::error(
                INTERNAL_ERROR,
                format!("internal error while {what}: {failure}"),
                Span::new(FileId(0), 0, 0),
            )
            .with_label("internal error")
            .with_help("this is a fault in Caloris, not in the model; the editor keeps working; please report the file"),
        );
        snap
    }

    /// True when the worker should run the model's transient run for this snapshot.
    pub fn wants_transient(&self) -> bool {
        self.stage == Stage::Final
            && self.solved()
            && !self.analysis.has_errors()
            && !self.analysis.studies.runs.is_empty()
    }

    /// Run the first transient of the model and keep its summary; nothing is kept when `cancel`
    /// stopped it (a newer edit made this snapshot stale). Blocks for the length of the run.
    pub fn run_transient(&self, cancel: &AtomicBool) {
        let summary = summarize(&self.analysis, cancel);
        if matches!(&summary, Some(Ok(s)) if s.stopped_early) {
            return;
        }
        let _ = self.transient.set(summary);
    }

    pub fn transient_state(&self) -> TransientState<'_> {
        if self.analysis.studies.runs.is_empty() || self.analysis.has_errors() {
            return TransientState::NotDeclared;
        }
        match self.transient.get() {
            None => TransientState::Running,
            Some(None) => TransientState::NotDeclared,
            Some(Some(Err(e))) => TransientState::Failed(e),
            Some(Some(Ok(s))) => TransientState::Done(s),
        }
    }

    /// The document's own text.
    pub fn text(&self) -> &str {
        self.analysis.sources.text(FileId(0))
    }

    pub fn lines(&self, file: FileId) -> &LineIndex {
        &self.analysis.sources.get(file).lines
    }

    /// The protocol range of a span in any file of the analysis.
    pub fn range(&self, span: Span) -> Range {
        proto::range(self.lines(span.file), span)
    }

    /// The byte offset of a position in the document.
    pub fn offset(&self, pos: Position) -> u32 {
        proto::offset(self.lines(FileId(0)), pos)
    }

    /// The URI of a file of the analysis (the document itself or an imported file).
    pub fn uri_of(&self, file: FileId) -> Option<Uri> {
        if file == FileId(0) {
            return Some(self.uri.clone());
        }
        proto::path_uri(std::path::Path::new(self.analysis.sources.name(file)))
    }

    pub fn location(&self, span: Span) -> Option<Location> {
        Some(Location {
            uri: self.uri_of(span.file)?,
            range: self.range(span),
        })
    }

    /// The unit system to show first.
    pub fn system(&self, settings: &Settings) -> UnitSystem {
        match settings.units {
            Units::Si => UnitSystem::Si,
            Units::Us => UnitSystem::Us,
            Units::Auto => preferred_system(&self.analysis),
        }
    }

    /// True when the solve has run and produced results.
    pub fn solved(&self) -> bool {
        self.analysis.solution.is_some()
    }
}
