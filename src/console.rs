//! What the terminal gets: colour, quiet mode and how warnings count, decided once from the
//! global options and the environment, so every command follows the same rules.

use caloris_compiler::render::render_diagnostics;
use caloris_compiler::source::Sources;
use caloris_compiler::Diagnostic;
use std::io::IsTerminal;
use std::sync::OnceLock;

/// `--color`: when to colour the output.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq, clap::ValueEnum)]
pub enum ColorChoice {
    /// On a terminal, unless `NO_COLOR` is set or `TERM=dumb`.
    #[default]
    Auto,
    /// Always, even into a pipe or a file.
    Always,
    /// Never.
    Never,
}

/// The settings every command shares (set once in `main`).
#[derive(Clone, Copy, Debug, Default)]
pub struct Console {
    pub color: ColorChoice,
    /// `-q`: print errors and failing limits only, no warnings, progress or status lines.
    pub quiet: bool,
    /// `--deny-warnings`: a warning the model does not accept makes the command fail.
    pub deny_warnings: bool,
}

static CONSOLE: OnceLock<Console> = OnceLock::new();

/// Install the global settings (first call wins; tests never call it).
pub fn init(c: Console) {
    let _ = CONSOLE.set(c);
}

pub fn get() -> Console {
    CONSOLE.get().copied().unwrap_or_default()
}

/// Colour decision for one stream, given whether it is a terminal.
pub fn colour_for(choice: ColorChoice, is_terminal: bool) -> bool {
    match choice {
        ColorChoice::Always => true,
        ColorChoice::Never => false,
        ColorChoice::Auto => {
            let no_color = std::env::var_os("NO_COLOR").is_some_and(|v| !v.is_empty());
            let dumb = std::env::var_os("TERM").is_some_and(|t| t == "dumb");
            is_terminal && !no_color && !dumb
        }
    }
}

/// Colour on standard output?
pub fn stdout_colour() -> bool {
    colour_for(get().color, std::io::stdout().is_terminal())
}

/// Colour on standard error?
pub fn stderr_colour() -> bool {
    colour_for(get().color, std::io::stderr().is_terminal())
}

/// Quiet mode on?
pub fn quiet() -> bool {
    get().quiet
}

/// A status line for standard error (success lines, "wrote FILE"); silent under `-q`.
pub fn status(line: impl std::fmt::Display) {
    if !quiet() {
        eprintln!("{line}");
    }
}

/// Print diagnostics on standard error: errors always, warnings unless `-q`.
pub fn print_diagnostics(diags: &[Diagnostic], sources: &Sources) {
    let shown: Vec<Diagnostic> = diags
        .iter()
        .filter(|d| d.is_error() || !quiet())
        .cloned()
        .collect();
    eprint!("{}", render_diagnostics(&shown, sources, stderr_colour()));
}

/// Under `--deny-warnings`, the number of warnings that make the command fail.
pub fn denied_warnings(diags: &[Diagnostic]) -> usize {
    if !get().deny_warnings {
        return 0;
    }
    diags
        .iter()
        .filter(|d| d.severity == caloris_compiler::Severity::Warning)
        .count()
}

/// "1 limit", "2 limits".
pub fn plural(n: usize, one: &str, many: &str) -> String {
    format!("{n} {}", if n == 1 { one } else { many })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn explicit_choices_ignore_the_terminal() {
        assert!(colour_for(ColorChoice::Always, false));
        assert!(!colour_for(ColorChoice::Never, true));
        assert!(!colour_for(ColorChoice::Auto, false));
    }

    #[test]
    fn plural_forms() {
        assert_eq!(plural(1, "limit", "limits"), "1 limit");
        assert_eq!(plural(0, "limit", "limits"), "0 limits");
        assert_eq!(plural(3, "error", "errors"), "3 errors");
    }
}
