//! The canonical formatter behind `caloris fmt` and the language server's formatting request.
//!
//! It works on the token stream (comments included) with light structure rather than on the
//! syntax tree, so that declarations added to the language later are laid out sensibly without
//! teaching the formatter about each one (rules in [`layout`]). Only whitespace changes: before
//! the result is returned it is lexed again and must give the same tokens, in the same order,
//! as the input, and parse without errors; otherwise the file is left alone and E009 says why.
//! Text with syntax errors is refused rather than risk losing what the analyst wrote.

mod align;
mod layout;
mod pieces;
mod spacing;
#[cfg(test)]
mod tests;

use crate::diagnostic::Diagnostic;
use crate::parser::parse;
use crate::span::{FileId, Span};
use pieces::Piece;

/// Format a model file's text into the canonical layout.
///
/// Returns the formatted text (ending in one newline, or empty for a file with no tokens), or
/// the syntax errors that stop formatting. Formatting is idempotent and only changes whitespace.
pub fn format_source(text: &str) -> Result<String, Vec<Diagnostic>> {
    // A file keeps its line endings and its byte-order mark: the layout is made on the text
    // with plain `\n` endings and written back as the file had them, so a CRLF file stays
    // CRLF (a comment would otherwise keep its `\r` and the other lines lose theirs).
    let bom = text.starts_with('\u{FEFF}');
    let crlf = text.contains("\r\n");
    if bom || crlf {
        let plain = text.trim_start_matches('\u{FEFF}').replace("\r\n", "\n");
        let out = format_plain(&plain)?;
        let out = if crlf { out.replace('\n', "\r\n") } else { out };
        return Ok(if bom { format!("\u{FEFF}{out}") } else { out });
    }
    format_plain(text)
}

/// The canonical layout of text with `\n` line endings and no byte-order mark.
fn format_plain(text: &str) -> Result<String, Vec<Diagnostic>> {
    let (_, diags) = parse(text, FileId(0));
    let errors: Vec<Diagnostic> = diags.into_iter().filter(Diagnostic::is_error).collect();
    if !errors.is_empty() {
        return Err(errors);
    }
    let input = pieces::pieces(text);
    let mut lines = layout::layout(&input);
    align::align_heads(&mut lines);
    let out = align::render(&lines);
    verify(&input, &out)?;
    Ok(out)
}

/// Whether `text` is already in the canonical layout.
pub fn is_formatted(text: &str) -> Result<bool, Vec<Diagnostic>> {
    format_source(text).map(|f| f == text)
}

/// The output must hold exactly the input's tokens and still parse.
fn verify(input: &[Piece], out: &str) -> Result<(), Vec<Diagnostic>> {
    let again = pieces::pieces(out);
    let differs = input
        .iter()
        .zip(&again)
        .position(|(a, b)| a.kind != b.kind || a.text != b.text);
    let at = match differs {
        Some(k) => Some(k),
        None if input.len() != again.len() => Some(input.len().min(again.len())),
        None => None,
    };
    let reparse_failed = at.is_none() && parse(out, FileId(0)).1.iter().any(Diagnostic::is_error);
    if at.is_none() && !reparse_failed {
        return Ok(());
    }
    let span = at
        .and_then(|k| input.get(k).or(input.last()))
        .map_or(Span::default(), |p| Span::new(FileId(0), p.start, p.end));
    Err(vec![Diagnostic::error(
        "E009",
        "the formatter could not lay out this file without changing its tokens",
        span,
    )
    .with_label("layout stopped here")
    .with_help(
        "the file was left as written; please report this file so the formatter can be fixed",
    )])
}
