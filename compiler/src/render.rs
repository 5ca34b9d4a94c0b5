//! Terminal rendering of diagnostics with ariadne (byte spans, optional colour).

use crate::diagnostic::{Diagnostic, Severity};
use crate::source::Sources;
use ariadne::{Color, Config, IndexType, Label, Report, ReportKind};

/// Render diagnostics as a person reads them in a terminal. `colour` is decided by the caller
/// (a terminal, and no `NO_COLOR`).
pub fn render_diagnostics(diags: &[Diagnostic], sources: &Sources, colour: bool) -> String {
    let mut out = Vec::new();
    // One cache for every report: building it splits each file into lines, and doing that per
    // diagnostic made thousands of diagnostics on a large file take seconds.
    let mut cache = ariadne::sources(
        sources
            .iter()
            .map(|(_, n, t)| (n.to_string(), t.to_string())),
    );
    for d in diags {
        render_one(d, sources, colour, &mut cache, &mut out);
    }
    String::from_utf8_lossy(&out).into_owned()
}

fn render_one(
    d: &Diagnostic,
    sources: &Sources,
    colour: bool,
    cache: &mut impl ariadne::Cache<String>,
    out: &mut Vec<u8>,
) {
    let (kind, col) = match d.severity {
        Severity::Error => (ReportKind::Error, Color::Red),
        Severity::Warning => (ReportKind::Warning, Color::Yellow),
        Severity::Note => (ReportKind::Advice, Color::Cyan),
    };
    let name = |s: crate::span::Span| sources.name(s.file).to_string();
    let primary = d.primary.span;
    let config = Config::default()
        .with_color(colour)
        .with_index_type(IndexType::Byte);
    let mut report = Report::build(kind, (name(primary), primary.range()))
        .with_config(config)
        .with_code(d.code)
        .with_message(&d.message);
    // Labels in the order they stand in their file: ariadne starts a new snippet (headed with
    // the primary's position) at a label above the one before it, so a "first declared here"
    // on line 1 after a primary on line 3 would read as if it were at line 3.
    let mut spans: Vec<crate::span::Span> = std::iter::once(primary)
        .chain(d.secondary.iter().map(|s| s.span))
        .collect();
    spans.sort();
    let order = |s: crate::span::Span| spans.iter().position(|&x| x == s).unwrap_or(0) as i32;
    let mut label = Label::new((name(primary), primary.range()))
        .with_color(col)
        .with_order(order(primary));
    if !d.primary.message.is_empty() {
        label = label.with_message(&d.primary.message);
    }
    report = report.with_label(label);
    for s in &d.secondary {
        report = report.with_label(
            Label::new((name(s.span), s.span.range()))
                .with_message(&s.message)
                .with_color(Color::Blue)
                .with_order(order(s.span)),
        );
    }
    if let Some(h) = &d.help {
        report = report.with_help(h);
    }
    // Writing into a Vec cannot fail; a failure here would only lose this one report.
    let _ = report.finish().write(cache, &mut *out);
}
