//! The one analysis entry point shared by the command-line tool and the language server:
//! source text in; syntax trees, symbols, diagnostics, network and solution out.

use crate::diagnostic::{Diagnostic, Severity};
use crate::elaborate::{check_buildup_kinds, elaborate};
use crate::elements::Material;
use crate::factor_cache::FactorCache;
use crate::limits::LimitSpec;
use crate::network::Network;
use crate::nonlinear::{newton_failure, solve_nonlinear_with, NewtonSettings};
use crate::parser::parse;
use crate::results::Solution;
use crate::solve::{solve_steady_with, SolveError};
use crate::source::{SourceLoader, Sources};
use crate::span::{FileId, Span};
use crate::symbols::SymbolTable;
use crate::syntax::{ItemKind, Module};
use crate::units::Quantity;
use std::sync::atomic::{AtomicBool, Ordering};
use std::sync::Arc;

/// Options of one analysis.
#[derive(Clone, Debug, Default)]
pub struct Options {
    /// Stop after checking (no solve), as `caloris check` and the fast path of the editor do.
    pub check_only: bool,
    /// Parameter values that replace the model's own (studies and cases).
    pub overrides: Vec<(String, Quantity)>,
    /// Most Newton steps a nonlinear solve may take (default 60).
    pub newton_max_iterations: Option<usize>,
    /// Most declarations and region cells the model may make once expanded (default
    /// [`crate::budget::MODEL_BUDGET`]; the editor may ask for less).
    pub size_budget: Option<u64>,
    /// Set by the caller to stop the analysis early (a newer edit supersedes it); a stopped
    /// analysis has `cancelled` set and no solution.
    pub cancel: Option<Arc<AtomicBool>>,
    /// Symbolic factorisations kept between analyses whose networks have the same sparsity
    /// pattern (the points of a study); `None` analyses afresh.
    pub factor_cache: Option<Arc<FactorCache>>,
}

impl Options {
    fn cancelled(&self) -> bool {
        self.cancel
            .as_ref()
            .is_some_and(|c| c.load(Ordering::Relaxed))
    }
}

/// Everything known about a model after analysis.
pub struct Analysis {
    pub sources: Sources,
    /// Parsed files; index 0 is the root model.
    pub modules: Vec<(FileId, Module)>,
    pub diagnostics: Vec<Diagnostic>,
    pub symbols: SymbolTable,
    pub title: Option<String>,
    pub network: Network,
    pub materials: Vec<Material>,
    pub limits: Vec<LimitSpec>,
    pub params: Vec<(String, Option<Quantity>)>,
    /// Present when the model has no errors and the solve succeeded.
    pub solution: Option<Solution>,
    /// Transient runs and cases the model declares.
    pub studies: crate::transient::model::Studies,
    /// The caller stopped the analysis before it finished (see [`Options::cancel`]).
    pub cancelled: bool,
}

impl Analysis {
    pub fn has_errors(&self) -> bool {
        self.diagnostics.iter().any(|d| d.is_error())
    }
    pub fn root(&self) -> &Module {
        &self.modules[0].1
    }

    /// The document `text` with nothing analysed: no declarations, no diagnostics. What a
    /// caller reports when the analysis itself could not be completed (the language server
    /// after an internal error), so every reader still finds the text and its line index.
    pub fn unanalysed(name: &str, text: &str) -> Analysis {
        let mut sources = Sources::default();
        let root = sources.add(name, text);
        Analysis {
            sources,
            modules: vec![(root, Module::default())],
            diagnostics: Vec::new(),
            symbols: SymbolTable::default(),
            title: None,
            network: Network::default(),
            materials: Vec::new(),
            limits: Vec::new(),
            params: Vec::new(),
            solution: None,
            studies: Default::default(),
            cancelled: false,
        }
    }
}

/// Analyse a model given its name and text. Imports are read through `loader`.
pub fn analyze(name: &str, text: &str, loader: &dyn SourceLoader, options: &Options) -> Analysis {
    crate::diagnostic::reset_suggestion_budget();
    let mut sources = Sources::default();
    let root = sources.add(name, text);
    let mut diagnostics = Vec::new();
    let mut modules = Vec::new();
    load_module(
        root,
        &mut sources,
        loader,
        &mut modules,
        &mut diagnostics,
        &mut vec![name.to_string()],
    );
    let module_refs: Vec<&Module> = modules.iter().map(|(_, m)| m).collect();
    // Repetitions and sub-network uses become plain declarations; the parsed modules stay as
    // written for the editor.
    // Most models have nothing to expand; copying their syntax trees would double the memory
    // of large generated models for nothing.
    let needs_expansion = module_refs.iter().any(|m| {
        m.items.iter().any(|i| {
            matches!(
                i.kind,
                ItemKind::Repeat { .. } | ItemKind::Use { .. } | ItemKind::Network { .. }
            )
        })
    });
    let budget = options.size_budget.unwrap_or(crate::budget::MODEL_BUDGET);
    let expanded = if needs_expansion {
        crate::expand::expand_modules(
            &module_refs,
            &options.overrides,
            budget,
            options.cancel.as_deref(),
        )
    } else {
        crate::expand::Expanded {
            modules: Vec::new(),
            diags: Vec::new(),
            bodies: Vec::new(),
        }
    };
    diagnostics.extend(expanded.diags);
    if !needs_expansion {
        diagnostics.extend(crate::expand::check_budget(
            &module_refs,
            &options.overrides,
            budget,
        ));
    }
    // A model past its size budget is not built at all: elaborating what was expanded before
    // the refusal would only add echoes of the missing part.
    let over_budget = diagnostics.iter().any(|d| d.code == "E220");
    let module_refs: Vec<&Module> = if over_budget || options.cancelled() {
        Vec::new()
    } else if needs_expansion {
        expanded.modules.iter().collect()
    } else {
        module_refs
    };
    for m in &module_refs {
        diagnostics.extend(check_buildup_kinds(m));
    }
    let el = elaborate(&module_refs, &sources, &options.overrides);
    let has_syntax_errors = diagnostics
        .iter()
        .any(|d| d.is_error() && matches!(d.code, "E001" | "E002" | "E003" | "E004" | "E005"));
    let expansion_failed = diagnostics.iter().any(|d| d.is_error());
    // An unconnected boundary is expected when a repetition or use could not be expanded.
    diagnostics.extend(
        el.diags
            .into_iter()
            .filter(|d| !(expansion_failed && d.code == "W102")),
    );
    crate::expand::dedup_copies(&mut diagnostics, &expanded.bodies);
    if has_syntax_errors || over_budget {
        // A declaration lost to a syntax error leaves nodes unlinked; reporting them as floating
        // would bury the real mistake under its echoes.
        diagnostics.retain(|d| !matches!(d.code, "E301" | "E302" | "W102"));
    }
    if has_syntax_errors {
        let lost = crate::lost_names::lost_names(&sources, &diagnostics);
        crate::lost_names::drop_echoes(&mut diagnostics, &lost);
    }
    diagnostics.sort_by_key(|d| (d.primary.span.file, d.primary.span.start, d.severity));
    diagnostics.dedup_by(|a, b| a.primary.span == b.primary.span && a.message == b.message);
    let mut analysis = Analysis {
        sources,
        modules,
        diagnostics,
        symbols: el.symbols,
        title: el.title,
        network: el.network,
        materials: el.materials,
        limits: el.limits,
        params: el.params,
        solution: None,
        studies: el.studies,
        cancelled: false,
    };
    if options.cancelled() {
        analysis.cancelled = true;
        return analysis;
    }
    if !options.check_only {
        solve_analysed(&mut analysis, options);
    }
    analysis
}

/// Solve an analysed model that has no errors (what [`analyze`] does unless
/// [`Options::check_only`]): the steady temperatures, the checks made at the answer, or the
/// diagnostic of a failed solve. A caller that checked first (`caloris export` solves only a
/// nonlinear model) finishes the analysis with this.
pub fn solve_analysed(analysis: &mut Analysis, options: &Options) {
    if analysis.has_errors() || analysis.solution.is_some() {
        return;
    }
    if !analysis.network.links.iter().all(|l| l.law.is_linear()) {
        let settings = NewtonSettings {
            max_iterations: options
                .newton_max_iterations
                .unwrap_or(NewtonSettings::default().max_iterations),
            ..NewtonSettings::default()
        };
        let fresh = FactorCache::default();
        let cache = options.factor_cache.as_deref().unwrap_or(&fresh);
        match solve_nonlinear_with(&analysis.network, settings, cache) {
            Ok((t, conv)) => {
                let mut sol = Solution::new(&analysis.network, t, &analysis.limits);
                sol.convergence = Some(conv);
                // The ranges of the correlations and fluids are judged at the answer, where
                // the surface temperatures and h agree (iterates may stray outside them).
                let mut checks = crate::convection::report::checks(&analysis.network, &sol.films);
                checks.extend(crate::convection::report::critical_radius(
                    &analysis.network,
                    &sol.films,
                ));
                let failed = checks.iter().any(|d| d.severity == Severity::Error);
                analysis.diagnostics.extend(checks);
                if !failed {
                    analysis.solution = Some(sol);
                }
            }
            Err(e) => analysis
                .diagnostics
                .push(newton_failure(&analysis.network, e)),
        }
    } else {
        match solve_steady_with(&analysis.network, options.factor_cache.as_deref()) {
            Ok(t) => {
                analysis.solution = Some(Solution::new(&analysis.network, t, &analysis.limits))
            }
            Err(e) => {
                let span = analysis
                    .network
                    .nodes
                    .first()
                    .map(|n| n.span)
                    .unwrap_or_default();
                let msg = match e {
                    SolveError::NotPositiveDefinite => {
                        "the network equations could not be solved (matrix not positive definite)"
                    }
                    SolveError::NonFinite => {
                        "the solve produced values that are not finite numbers"
                    }
                };
                analysis.diagnostics.push(
                    Diagnostic::error("E501", msg, span)
                        .with_label("while solving this model")
                        .with_help("check for conductances that are extremely small or large compared with the rest of the network"),
                );
            }
        }
    }
    // A solution with a non-finite value or an open energy balance is never reported.
    if let Some(d) = analysis
        .solution
        .as_ref()
        .and_then(|s| s.unusable(&analysis.network))
    {
        analysis.solution = None;
        analysis.diagnostics.push(d);
    }
}

/// Longest chain of imports (model → file → file ...).
pub const MAX_IMPORT_DEPTH: usize = 64;

/// Parse a file and, depth first, the files it imports. `stack` holds the chain of files being
/// imported, to report cycles.
fn load_module(
    root: FileId,
    sources: &mut Sources,
    loader: &dyn SourceLoader,
    modules: &mut Vec<(FileId, Module)>,
    diags: &mut Vec<Diagnostic>,
    stack: &mut Vec<String>,
) {
    // Depth first, in the order the imports are written, with the files being imported on an
    // explicit stack: a chain of files, each importing the next, costs no recursion.
    let mut frames = vec![open_module(root, sources, modules, diags)];
    while let Some(frame) = frames.last_mut() {
        let Some((path, span)) = frame.imports.next() else {
            frames.pop();
            // Every frame but the root's pushed its name when it was opened.
            if !frames.is_empty() {
                stack.pop();
            }
            continue;
        };
        if stack.len() > MAX_IMPORT_DEPTH {
            // A chain this long is a cycle the names did not reveal (a folder linked into
            // itself), or a mistake; either way it must end.
            diags.push(
                Diagnostic::error("E602", format!("imports nest more than {MAX_IMPORT_DEPTH} files deep"), span)
                    .with_label("this import is one too many")
                    .with_help("the chain probably leads back to itself through a linked folder; import the shared file once, from the model"),
            );
            // The file's other imports are as deep: leave them all.
            frame.imports = Vec::new().into_iter();
            continue;
        }
        let from = frame.name.clone();
        // Built-in libraries come from the compiler itself, the same for every caller.
        let loaded = crate::library::resolve(&path).unwrap_or_else(|| loader.load(&from, &path));
        match loaded {
            Ok((name, text)) => {
                if stack.contains(&name) {
                    let chain = stack
                        .iter()
                        .chain(std::iter::once(&name))
                        .cloned()
                        .collect::<Vec<_>>()
                        .join(" -> ");
                    diags.push(
                        Diagnostic::error("E602", format!("import cycle: {chain}"), span)
                            .with_label("this import leads back to a file that is being imported")
                            .with_help(
                                "move the shared declarations into a file that imports neither",
                            ),
                    );
                    continue;
                }
                if sources.find(&name).is_some() {
                    continue; // already imported through another path
                }
                let child = sources.add(name.clone(), text);
                stack.push(name);
                frames.push(open_module(child, sources, modules, diags));
            }
            Err(msg) => diags.push(
                Diagnostic::error("E601", format!("cannot import `{path}`: {msg}"), span)
                    .with_label("this file cannot be read")
                    .with_help(
                        "paths are relative to the importing file and must stay inside the project",
                    ),
            ),
        }
    }
}

/// A file being imported: its name and the imports it has yet to load.
struct ImportFrame {
    name: String,
    imports: std::vec::IntoIter<(String, Span)>,
}

/// Parse the file `id`, keep its module, and return what it imports.
fn open_module(
    id: FileId,
    sources: &Sources,
    modules: &mut Vec<(FileId, Module)>,
    diags: &mut Vec<Diagnostic>,
) -> ImportFrame {
    let (module, parse_diags) = parse(sources.text(id), id);
    diags.extend(parse_diags);
    let imports: Vec<(String, Span)> = module
        .items
        .iter()
        .filter_map(|i| match &i.kind {
            ItemKind::Import { path, path_span } => Some((path.clone(), *path_span)),
            _ => None,
        })
        .collect();
    modules.push((id, module));
    ImportFrame {
        name: sources.name(id).to_string(),
        imports: imports.into_iter(),
    }
}
