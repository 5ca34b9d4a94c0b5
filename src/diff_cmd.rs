//! `caloris diff OLD NEW` and `caloris diff --rev REV FILE`: how a change of model moves its
//! results. Exit codes as for `solve`: 0 fine, 1 either version has errors, 2 a file or
//! revision cannot be read, 3 the new version solves but a design limit fails.

use crate::diff_render::{self, DiffFormat};
use crate::exit;
use crate::git_rev;
use crate::loader::FsLoader;
use caloris_compiler::compare::compare;
use caloris_compiler::render::render_diagnostics;
use caloris_compiler::source::SourceLoader;
use caloris_compiler::{analyze, Analysis, Options};
use std::path::{Path, PathBuf};

/// One side of the comparison: a name for people, the text and where its imports come from.
struct Version {
    name: String,
    text: String,
    loader: Box<dyn SourceLoader>,
}

fn working_copy(file: &PathBuf) -> Result<Version, String> {
    let text = std::fs::read_to_string(file)
        .map_err(|e| format!("cannot read `{}`: {e}", file.display()))?;
    Ok(Version {
        name: file.display().to_string(),
        text,
        loader: Box::new(FsLoader::for_model(file)),
    })
}

fn at_revision(file: &Path, rev: &str) -> Result<Version, String> {
    let located = git_rev::locate(file)?;
    let text = git_rev::show(&located.root, rev, &located.rel)
        .map_err(|e| format!("cannot read `{}` at `{rev}`: {e}", located.rel))?;
    Ok(Version {
        name: git_rev::display_name(rev, &located.rel),
        text,
        loader: Box::new(git_rev::RevLoader {
            root: located.root,
            rev: rev.to_string(),
        }),
    })
}

/// Run the command; `files` are OLD and NEW, or with `rev` the one FILE.
pub fn run(files: &[PathBuf], rev: Option<&str>, format: DiffFormat, units: crate::Units) -> u8 {
    let versions = match (rev, files) {
        (Some(rev), [file]) => {
            at_revision(file, rev).and_then(|old| Ok((old, working_copy(file)?)))
        }
        (None, [old, new]) => working_copy(old).and_then(|o| Ok((o, working_copy(new)?))),
        (Some(_), _) => {
            Err("with --rev give exactly one model file: `caloris diff --rev REV FILE`".to_string())
        }
        (None, _) => Err(
            "give two model files: `caloris diff OLD NEW` (or `caloris diff --rev REV FILE`)"
                .to_string(),
        ),
    };
    let (old, new) = match versions {
        Ok(v) => v,
        Err(msg) => {
            eprintln!("error: {msg}");
            return exit::USAGE;
        }
    };
    let analyse = |v: &Version| analyze(&v.name, &v.text, v.loader.as_ref(), &Options::default());
    let (a_old, a_new) = (analyse(&old), analyse(&new));
    let (old_ok, new_ok) = (report_errors(&a_old), report_errors(&a_new));
    if !(old_ok && new_ok) {
        return exit::MODEL_ERROR;
    }
    let cmp = compare(&a_old, &a_new);
    let system = units.system_for(&a_new);
    let colour = crate::console::stdout_colour();
    let out = match format {
        DiffFormat::Table => diff_render::table(&cmp, &old.name, &new.name, system, colour),
        DiffFormat::Markdown => diff_render::markdown(&cmp, &old.name, &new.name, system),
        DiffFormat::Json => diff_render::json(&cmp, &old.name, &new.name),
    };
    print!("{out}");
    if cmp.any_limit_fails_now() {
        exit::LIMIT_FAILED
    } else {
        exit::OK
    }
}

/// Print a version's errors; true when it has none.
fn report_errors(a: &Analysis) -> bool {
    if !a.has_errors() {
        return true;
    }
    let errors: Vec<_> = a
        .diagnostics
        .iter()
        .filter(|d| d.is_error())
        .cloned()
        .collect();
    let colour = crate::console::stderr_colour();
    eprint!("{}", render_diagnostics(&errors, &a.sources, colour));
    eprintln!(
        "{}: {} error{} — cannot compare",
        a.sources.name(a.modules[0].0),
        errors.len(),
        if errors.len() == 1 { "" } else { "s" }
    );
    false
}
