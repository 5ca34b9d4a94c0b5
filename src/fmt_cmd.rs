//! `caloris fmt`: rewrite model files in the canonical layout, or with `--check` list the ones
//! that are not. Exit codes: 0 all formatted, 1 a file would change (`--check`) or has syntax
//! errors (it is then left as written), 2 a file could not be read or written.

use crate::exit;
use caloris_compiler::format::format_source;
use caloris_compiler::render::render_diagnostics;
use caloris_compiler::source::Sources;
use std::io::{Read, Write};
use std::path::{Path, PathBuf};

/// Run `caloris fmt [--check] FILES...`; folders are searched for `*.heat` files.
pub fn run(inputs: &[PathBuf], check: bool) -> u8 {
    if inputs.iter().any(|f| f.as_os_str() == "-") {
        if inputs.len() > 1 {
            eprintln!("error: `-` (standard input) cannot be combined with file names");
            return exit::USAGE;
        }
        return stdin(check);
    }
    let files = match crate::files::expand(inputs) {
        Ok(f) => f,
        Err(e) => return crate::usage(e),
    };
    let mut code = exit::OK;
    let (mut changed, mut unchanged) = (0, 0);
    for file in &files {
        let text = match std::fs::read_to_string(file) {
            Ok(t) => t,
            Err(e) => {
                eprintln!("error: cannot read `{}`: {e}", file.display());
                code = exit::USAGE;
                continue;
            }
        };
        let formatted = match format_source(&text) {
            Ok(f) => f,
            Err(diags) => {
                report_errors(&file.display().to_string(), &text, &diags);
                code = code.max(exit::MODEL_ERROR);
                continue;
            }
        };
        if formatted == text {
            unchanged += 1;
            continue;
        }
        changed += 1;
        if check {
            println!("{}", file.display());
            code = code.max(exit::MODEL_ERROR);
        } else if let Err(e) = write_replacing(file, &formatted) {
            eprintln!("error: cannot write `{}`: {e}", file.display());
            code = exit::USAGE;
        }
    }
    let verb = if check {
        "would be reformatted"
    } else {
        "reformatted"
    };
    crate::console::status(format!(
        "{} {verb}, {unchanged} already formatted",
        crate::console::plural(changed, "file", "files")
    ));
    code
}

fn stdin(check: bool) -> u8 {
    let mut text = String::new();
    if let Err(e) = std::io::stdin().read_to_string(&mut text) {
        eprintln!("error: cannot read standard input: {e}");
        return exit::USAGE;
    }
    match format_source(&text) {
        Ok(formatted) if check => {
            if formatted == text {
                exit::OK
            } else {
                println!("<stdin>");
                exit::MODEL_ERROR
            }
        }
        Ok(formatted) => {
            let mut out = std::io::stdout();
            if out
                .write_all(formatted.as_bytes())
                .and_then(|_| out.flush())
                .is_err()
            {
                return exit::USAGE;
            }
            exit::OK
        }
        Err(diags) => {
            report_errors("<stdin>", &text, &diags);
            exit::MODEL_ERROR
        }
    }
}

fn report_errors(name: &str, text: &str, diags: &[caloris_compiler::Diagnostic]) {
    let mut sources = Sources::default();
    sources.add(name, text);
    eprint!(
        "{}",
        render_diagnostics(diags, &sources, crate::console::stderr_colour())
    );
    eprintln!("{name}: not formatted (fix the errors above first; the file was left as written)");
}

/// Write through a temporary file in the same folder and rename it over the original, so an
/// interrupted write never leaves a half-written model.
fn write_replacing(file: &Path, text: &str) -> std::io::Result<()> {
    let name = file
        .file_name()
        .map(|n| n.to_string_lossy().into_owned())
        .unwrap_or_default();
    let tmp = file.with_file_name(format!(".{name}.caloris-fmt.tmp"));
    let result = (|| {
        std::fs::write(&tmp, text)?;
        if let Ok(meta) = std::fs::metadata(file) {
            std::fs::set_permissions(&tmp, meta.permissions())?;
        }
        std::fs::rename(&tmp, file)
    })();
    if result.is_err() {
        let _ = std::fs::remove_file(&tmp);
    }
    result
}
