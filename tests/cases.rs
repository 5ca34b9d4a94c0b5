//! Data-driven model tests: every `tests/cases/**/*.heat` and `examples/*.heat` states its own
//! expectations in `# expect:` comment lines (format in tests/cases/README.md).

use caloris_compiler::eval::{Evaluator, NameKinds};
use caloris_compiler::limits::resolve_measure;
use caloris_compiler::parser::parse_expr;
use caloris_compiler::source::SourceLoader;
use caloris_compiler::span::FileId;
use caloris_compiler::syntax::{ExprKind, Ident};
use caloris_compiler::{analyze, Analysis, Options, Severity};
use std::path::{Path, PathBuf};

struct NoNames;
impl NameKinds for NoNames {
    fn kind_of(&self, _: &str) -> Option<&'static str> {
        None
    }
}

/// Reads imports relative to the importing file, never outside the repository (the CLI's own
/// loader lives in the binary).
struct RepoFiles<'a>(&'a Path);

impl SourceLoader for RepoFiles<'_> {
    fn load(&self, from: &str, path: &str) -> Result<(String, String), String> {
        let joined = Path::new(from).parent().unwrap_or(Path::new("")).join(path);
        let full = self
            .0
            .join(&joined)
            .canonicalize()
            .map_err(|e| e.to_string())?;
        let root = self.0.canonicalize().map_err(|e| e.to_string())?;
        if !full.starts_with(&root) {
            return Err("it lies outside the repository".into());
        }
        let text = std::fs::read_to_string(&full).map_err(|e| e.to_string())?;
        Ok((
            full.strip_prefix(&root)
                .unwrap_or(&full)
                .display()
                .to_string(),
            text,
        ))
    }
}

fn collect(dir: &Path, out: &mut Vec<PathBuf>) {
    let Ok(entries) = std::fs::read_dir(dir) else {
        return;
    };
    for e in entries.flatten() {
        let p = e.path();
        if p.is_dir() {
            collect(&p, out);
        } else if p.extension().is_some_and(|x| x == "heat") {
            out.push(p);
        }
    }
}

fn quantity(text: &str) -> Result<f64, String> {
    let e =
        parse_expr(text, FileId(0)).map_err(|d| format!("bad value `{text}`: {}", d.message))?;
    let mut ev = Evaluator::new(std::iter::empty());
    let q = ev
        .eval(&e, &NoNames)
        .ok_or_else(|| format!("bad value `{text}`: {:?}", ev.diags))?;
    Ok(q.value)
}

fn check_line(a: &Analysis, line: &str) -> Result<(), String> {
    let line = line.trim();
    if line == "ok" {
        let errs: Vec<_> = a
            .diagnostics
            .iter()
            .filter(|d| d.is_error())
            .map(|d| format!("{} {}", d.code, d.message))
            .collect();
        return if errs.is_empty() {
            Ok(())
        } else {
            Err(format!("expected no errors, got {errs:?}"))
        };
    }
    for (word, sev) in [("error", Severity::Error), ("warning", Severity::Warning)] {
        if let Some(rest) = line.strip_prefix(word).map(str::trim) {
            let (code, at) = rest
                .split_once(" at ")
                .ok_or("expected `CODE at LINE:COL`")?;
            let (l, c) = at.trim().split_once(':').ok_or("expected LINE:COL")?;
            let (l, c): (u32, u32) = (
                l.parse().map_err(|_| "bad line")?,
                c.parse().map_err(|_| "bad column")?,
            );
            let found = a.diagnostics.iter().any(|d| {
                let lc = a
                    .sources
                    .get(d.primary.span.file)
                    .lines
                    .line_col_chars(d.primary.span.start);
                d.severity == sev && d.code == code.trim() && lc.line + 1 == l && lc.col + 1 == c
            });
            return if found {
                Ok(())
            } else {
                let got: Vec<String> = a
                    .diagnostics
                    .iter()
                    .map(|d| {
                        let lc = a
                            .sources
                            .get(d.primary.span.file)
                            .lines
                            .line_col_chars(d.primary.span.start);
                        format!(
                            "{:?} {} at {}:{} {}",
                            d.severity,
                            d.code,
                            lc.line + 1,
                            lc.col + 1,
                            d.message
                        )
                    })
                    .collect();
                Err(format!("expected {word} {code} at {l}:{c}; got {got:#?}"))
            };
        }
    }
    let sol = a.solution.as_ref().ok_or_else(|| {
        format!(
            "model did not solve: {:?}",
            a.diagnostics.iter().map(|d| &d.message).collect::<Vec<_>>()
        )
    })?;
    if let Some(rest) = line.strip_prefix("limit ") {
        let (name, verdict) = rest
            .trim()
            .split_once(' ')
            .ok_or("expected `limit NAME pass|fail`")?;
        let l = sol
            .limits
            .iter()
            .find(|l| l.name == name)
            .ok_or(format!("no limit `{name}`"))?;
        let want = verdict.trim() == "pass";
        return if l.passed == want {
            Ok(())
        } else {
            Err(format!(
                "limit {name}: passed = {}, margin {}",
                l.passed, l.margin
            ))
        };
    }
    // MEASURE(SUBJECT) = VALUE ± TOL
    let (lhs, rhs) = line
        .split_once('=')
        .ok_or(format!("cannot read expectation `{line}`"))?;
    let (value, tol) = rhs.split_once('±').ok_or("expected `± TOLERANCE`")?;
    if let Some(inner) = lhs.trim().strip_prefix("figure(") {
        return check_figure(a, sol, inner, value, tol);
    }
    let lhs_expr = parse_expr(lhs.trim(), FileId(0)).map_err(|d| d.message)?;
    let ExprKind::Call { func, args } = lhs_expr.kind else {
        return Err("expected MEASURE(SUBJECT)".into());
    };
    let Some(ExprKind::Name(subject)) = args.first().map(|a| a.kind.clone()) else {
        return Err("expected a subject".into());
    };
    let mut symbols = a.symbols.clone();
    let (m, s) = resolve_measure(
        &Ident {
            name: func.name.clone(),
            span: func.span,
        },
        &subject,
        &a.network,
        &mut symbols,
    )
    .map_err(|d| d.map(|d| d.message).unwrap_or_default())?;
    let actual = sol.measure(&a.network, m, s);
    let expected = quantity(value.trim())?;
    let tol = quantity(tol.trim())?;
    if (actual - expected).abs() <= tol {
        Ok(())
    } else {
        Err(format!(
            "{}: expected {expected} ± {tol} (SI), got {actual} (difference {:e})",
            lhs.trim(),
            actual - expected
        ))
    }
}

/// `figure(LINK, NAME) = VALUE ± TOL`: a named figure of a link (before or after the solve),
/// compared in SI.
fn check_figure(
    a: &Analysis,
    sol: &caloris_compiler::results::Solution,
    inner: &str,
    value: &str,
    tol: &str,
) -> Result<(), String> {
    let (link, name) = inner
        .trim_end_matches(')')
        .split_once(',')
        .ok_or("expected `figure(LINK, NAME)`")?;
    let (link, name) = (link.trim(), name.trim());
    let id = a.network.link_id(link).ok_or(format!("no link `{link}`"))?;
    let actual = a
        .network
        .figures
        .iter()
        .chain(&sol.figures)
        .find(|f| f.link == id && f.name == name)
        .map(|f| f.value)
        .ok_or(format!("link `{link}` has no figure `{name}`"))?;
    let expected = quantity(value.trim())?;
    let tol = quantity(tol.trim())?;
    if (actual - expected).abs() <= tol {
        Ok(())
    } else {
        Err(format!(
            "figure({link}, {name}): expected {expected} ± {tol} (SI), got {actual} (difference {:e})",
            actual - expected
        ))
    }
}

#[test]
fn every_case_meets_its_stated_expectations() {
    let root = Path::new(env!("CARGO_MANIFEST_DIR"));
    let mut files = Vec::new();
    collect(&root.join("tests/cases"), &mut files);
    collect(&root.join("examples"), &mut files);
    files.sort();
    assert!(files.len() >= 10, "too few case files: {files:?}");
    let mut failures = Vec::new();
    let mut checks = 0;
    for f in &files {
        let text = std::fs::read_to_string(f).expect("readable case file");
        let name = f.strip_prefix(root).unwrap_or(f).display().to_string();
        let a = analyze(&name, &text, &RepoFiles(root), &Options::default());
        let expects: Vec<&str> = text
            .lines()
            .filter_map(|l| l.trim().strip_prefix("# expect:"))
            .collect();
        let is_example = name.starts_with("examples");
        if expects.is_empty() && !is_example {
            failures.push(format!("{name}: no `# expect:` lines"));
        }
        // Examples must at least check cleanly and solve.
        if is_example && a.solution.is_none() {
            failures.push(format!(
                "{name}: example does not solve: {:?}",
                a.diagnostics.iter().map(|d| &d.message).collect::<Vec<_>>()
            ));
        }
        // Errors that no line expects are failures too.
        let expected_errors: Vec<&str> = expects
            .iter()
            .filter(|e| e.trim().starts_with("error"))
            .copied()
            .collect();
        if !expected_errors.is_empty() {
            let n = a.diagnostics.iter().filter(|d| d.is_error()).count();
            if n != expected_errors.len() {
                failures.push(format!(
                    "{name}: {} errors expected, {n} reported: {:?}",
                    expected_errors.len(),
                    a.diagnostics
                        .iter()
                        .map(|d| (&d.code, &d.message))
                        .collect::<Vec<_>>()
                ));
            }
        }
        for e in &expects {
            checks += 1;
            if let Err(msg) = check_line(&a, e) {
                failures.push(format!("{name}: `{}`: {msg}", e.trim()));
            }
        }
        if let Some(sol) = &a.solution {
            // Round-off in a node's balance is relative to the heat passing through it: with
            // thousands of links into one node that is far more than the largest single flow.
            let mut through = vec![0.0f64; a.network.nodes.len()];
            for (l, q) in a.network.links.iter().zip(&sol.heat_flows) {
                through[l.from] += q.abs();
                through[l.to] += q.abs();
            }
            let scale = through.iter().fold(1.0f64, |m, q| m.max(*q));
            if sol.worst_residual > 1e-9 * scale {
                failures.push(format!(
                    "{name}: energy balance does not close: {}",
                    sol.worst_residual
                ));
            }
        }
    }
    println!("{} files, {checks} expectations checked", files.len());
    assert!(
        failures.is_empty(),
        "{} failure(s):\n{}",
        failures.len(),
        failures.join("\n")
    );
}
