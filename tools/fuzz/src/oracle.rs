//! What one input is put through, in the order the tools do it: analysis with the solve (as
//! `caloris solve` and the language server), span checks, rendering, the command line's result
//! reports, editor queries (the compiler's and the language server's features), the formatter
//! and the first transient run, after which the editor is asked again. Each stage is announced
//! before it starts, so a crash that kills the process is pinned to its stage.

use crate::output;
use caloris_compiler::format::format_source;
use caloris_compiler::query;
use caloris_compiler::render::render_diagnostics;
use caloris_compiler::source::Sources;
use caloris_compiler::span::{FileId, Span};
use caloris_compiler::units::UnitSystem;
use caloris_compiler::{analyze, Analysis, Options};
use caloris_lsp::loader::DocLoader;
use caloris_lsp::snapshot::{Snapshot, Stage};
use std::collections::BTreeSet;
use std::sync::atomic::AtomicBool;
use std::sync::{Arc, OnceLock};

/// A problem found without the process dying: a caught panic, a span outside its text, a
/// non-finite result reported as a success, a formatter that does not reach a fixed point.
pub struct Problem {
    pub kind: &'static str,
    pub stage: &'static str,
    /// What identifies the problem across inputs (a panic's location, a diagnostic code).
    pub key: String,
    pub detail: String,
}

/// What an input did, for coverage: its diagnostic codes and how far it went.
#[derive(Default)]
pub struct Trace {
    pub codes: BTreeSet<&'static str>,
    pub solved: bool,
    pub ran: bool,
    pub formatted: bool,
}

impl Trace {
    /// A key that differs when the input reached different code.
    pub fn features(&self) -> String {
        let mut s: Vec<&str> = self.codes.iter().copied().collect();
        if self.solved {
            s.push("solved");
        }
        if self.ran {
            s.push("ran");
        }
        if self.formatted {
            s.push("formatted");
        }
        if s.is_empty() {
            "-".into()
        } else {
            s.join(",")
        }
    }
}

/// Where the stages report.
pub trait Observer {
    fn stage(&mut self, name: &'static str);
    fn problem(&mut self, p: Problem);
}

/// Run every stage on `text`, each under `catch_unwind`; `size_budget` as in `Options`.
pub fn exercise(text: &str, size_budget: Option<u64>, obs: &mut dyn Observer) -> Trace {
    let mut trace = Trace::default();
    obs.stage("analyze");
    // The analysis the language server makes of an open document (the full one, with the
    // solve, as `Snapshot::analyze` makes it but with the budget given); the command line's is
    // the same call with its own loader.
    let Some(snap) = guarded(obs, "analyze", || {
        let uri = crate::editor::doc_uri();
        let options = Options {
            size_budget,
            ..Options::default()
        };
        let analysis = analyze(
            crate::editor::DOC_PATH,
            text,
            &DocLoader::default(),
            &options,
        );
        Arc::new(Snapshot {
            uri,
            version: 1,
            stage: Stage::Final,
            analysis,
            transient: OnceLock::new(),
        })
    }) else {
        return trace;
    };
    let a = &snap.analysis;
    trace.codes = a.diagnostics.iter().map(|d| d.code).collect();
    trace.solved = a.solution.is_some();

    obs.stage("spans");
    for p in span_problems(a) {
        obs.problem(p);
    }
    if let Some(sol) = &a.solution {
        let bad = sol
            .temperatures
            .iter()
            .chain(&sol.heat_flows)
            .any(|v| !v.is_finite());
        if bad && !a.has_errors() {
            obs.problem(Problem {
                kind: "non-finite",
                stage: "solve",
                key: "solution".into(),
                detail: "the solve reported success with a temperature or heat flow that is not a finite number".into(),
            });
        }
    }

    obs.stage("render");
    guarded(obs, "render", || {
        render_diagnostics(&a.diagnostics, &a.sources, false).len()
    });

    // What `caloris solve` prints: JSON always (it reports errors too), the table and CSV of
    // a model without errors.
    obs.stage("output");
    guarded(obs, "output", || {
        let mut n = output::json(a).len();
        if !a.has_errors() && a.solution.is_some() {
            n += output::table(a, UnitSystem::Si, false).len();
            n += output::table(a, UnitSystem::Us, true).len();
            n += output::csv(a, UnitSystem::Si).len();
        }
        n
    });

    let offsets = crate::editor::offsets(text, a.diagnostics.iter().map(|d| d.primary.span));
    obs.stage("query");
    guarded(obs, "query", || queries(a, text, &offsets));

    obs.stage("editor");
    guarded(obs, "editor", || crate::editor::features(&snap, &offsets));

    obs.stage("format");
    if let Some(p) = guarded(obs, "format", || format_problem(text, &mut trace)).flatten() {
        obs.problem(p);
    }

    if snap.wants_transient() {
        obs.stage("run");
        let cancel = AtomicBool::new(false);
        if guarded(obs, "run", || snap.run_transient(&cancel)).is_none() {
            return trace;
        }
        if let Some(Some(result)) = snap.transient.get() {
            trace.ran = result.is_ok();
            if let Ok(s) = result {
                let bad = s.nodes.iter().any(|n| {
                    !(n.final_k.is_finite() && n.max_k.is_finite() && n.min_k.is_finite())
                });
                if bad {
                    obs.problem(Problem {
                        kind: "non-finite",
                        stage: "run",
                        key: "summary".into(),
                        detail: "the transient run finished with a temperature that is not a finite number".into(),
                    });
                }
            }
        }
        // Hovers and inlay hints now show the run's figures.
        obs.stage("editor-run");
        guarded(obs, "editor-run", || {
            crate::editor::features(&snap, &offsets)
        });
    }
    trace
}

fn guarded<T>(obs: &mut dyn Observer, stage: &'static str, f: impl FnOnce() -> T) -> Option<T> {
    match std::panic::catch_unwind(std::panic::AssertUnwindSafe(f)) {
        Ok(v) => Some(v),
        Err(payload) => {
            let (location, message) = crate::panics::take(&payload);
            obs.problem(Problem {
                kind: "panic",
                stage,
                key: location.clone(),
                detail: format!("{message} at {location}"),
            });
            None
        }
    }
}

fn span_ok(sources: &Sources, s: Span) -> bool {
    if (s.file.0 as usize) >= sources.len() {
        return false;
    }
    let text = sources.text(s.file);
    let (a, b) = (s.start as usize, s.end as usize);
    a <= b && b <= text.len() && text.is_char_boundary(a) && text.is_char_boundary(b)
}

/// Every diagnostic, fix and symbol span must lie inside its file's text, on char boundaries:
/// the renderer and the language server slice the text with them.
pub fn span_problems(a: &Analysis) -> Vec<Problem> {
    let mut out = Vec::new();
    for d in &a.diagnostics {
        let spans = std::iter::once(d.primary.span)
            .chain(d.secondary.iter().map(|l| l.span))
            .chain(d.fix.iter().map(|f| f.span));
        for s in spans {
            if !span_ok(&a.sources, s) {
                out.push(Problem {
                    kind: "span",
                    stage: "analyze",
                    key: d.code.to_string(),
                    detail: format!(
                        "{} `{}` has the span {}..{} in file {}, outside the text or inside a character",
                        d.code, d.message, s.start, s.end, s.file.0
                    ),
                });
            }
        }
    }
    for sym in &a.symbols.symbols {
        for s in [sym.def, sym.decl]
            .into_iter()
            .chain(sym.refs.iter().copied())
        {
            if !span_ok(&a.sources, s) {
                out.push(Problem {
                    kind: "span",
                    stage: "analyze",
                    key: "symbol".into(),
                    detail: format!(
                        "symbol `{}` has the span {}..{} outside its text or inside a character",
                        sym.name, s.start, s.end
                    ),
                });
                break;
            }
        }
    }
    out
}

/// The compiler's own editor queries (what the language server builds on), at `offsets`.
fn queries(a: &Analysis, text: &str, offsets: &[usize]) -> usize {
    let file = FileId(0);
    let mut n = query::highlights(a, file).len();
    for &off in offsets {
        let mut off = off.min(text.len());
        while !text.is_char_boundary(off) {
            off -= 1;
        }
        let off = off as u32;
        n += query::completion_context(text, off).replace.len() as usize;
        if query::network_at(a, file, off).is_some() {
            n += 1;
        }
        if let Some(query::Target::Symbol { symbol, .. }) = query::target_at(a, file, off) {
            if query::check_new_name(a, symbol, "renamed").is_ok() {
                n += query::rename_edits(a, symbol, "renamed").len();
            }
            n += query::node_balance(a, &symbol.name).is_some() as usize;
        }
    }
    n
}

/// Formatting must reach a fixed point: formatting the output again changes nothing.
fn format_problem(text: &str, trace: &mut Trace) -> Option<Problem> {
    let once = format_source(text).ok()?;
    trace.formatted = true;
    match format_source(&once) {
        Ok(twice) if twice == once => None,
        Ok(_) => Some(Problem {
            kind: "format",
            stage: "format",
            key: "not idempotent".into(),
            detail: "formatting the formatter's output changes it again".into(),
        }),
        Err(d) => Some(Problem {
            kind: "format",
            stage: "format",
            key: format!(
                "output rejected {}",
                d.first().map(|d| d.code).unwrap_or("?")
            ),
            detail: format!(
                "the formatter's output does not parse: {}",
                d.first().map(|d| d.message.as_str()).unwrap_or("?")
            ),
        }),
    }
}
