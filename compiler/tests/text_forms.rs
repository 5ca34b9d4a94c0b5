//! How a model's text may be written beyond the language's tokens: a leading byte-order mark,
//! CRLF line endings (kept through the formatter), and reciprocal units written with the
//! number one (`1/K`, `1/s`, `1/°F`, docs/units.md).

use caloris_compiler::format::format_source;
use caloris_compiler::source::NoImports;
use caloris_compiler::{analyze, Analysis, Options};

fn analyse(text: &str) -> Analysis {
    analyze("model.heat", text, &NoImports, &Options::default())
}

fn errors(a: &Analysis) -> Vec<String> {
    a.diagnostics
        .iter()
        .filter(|d| d.is_error())
        .map(|d| format!("{} {}", d.code, d.message))
        .collect()
}

const MODEL: &str = "node room (fixed = 20 °C)\nnode outdoor (fixed = -5 °C)\nlink wall: room to outdoor resistance(r = 0.5 K/W)\n";

#[test]
fn a_leading_byte_order_mark_is_skipped_and_spans_still_count_from_the_first_byte() {
    let text = format!("\u{FEFF}{MODEL}");
    let a = analyse(&text);
    assert!(errors(&a).is_empty(), "{:?}", errors(&a));
    // Ohm's law of heat: (20 − (−5)) K / 0.5 K/W = 50 W.
    let q = a.solution.as_ref().expect("solved").heat_flows[0];
    assert!((q - 50.0).abs() < 1e-12, "{q}");
    // The node's span points at its name in the text as written, mark included.
    let span = a.network.nodes[0].span;
    let at = &text[span.start as usize..];
    assert!(
        at.starts_with("node room") || at.starts_with("room"),
        "{at:?}"
    );
}

#[test]
fn a_byte_order_mark_anywhere_else_is_still_an_error() {
    let a = analyse(&format!("{MODEL}\u{FEFF}node x\n"));
    assert!(
        errors(&a).iter().any(|e| e.starts_with("E001")),
        "{:?}",
        errors(&a)
    );
}

#[test]
fn crlf_files_keep_their_line_endings_and_mark_through_fmt() {
    let crlf = format!(
        "\u{FEFF}{}",
        "node room   (fixed = 20 °C)  # the office\nnode outdoor (fixed = -5 °C)\nlink  wall: room to outdoor resistance(r = 0.5 K/W)\n"
            .replace('\n', "\r\n")
    );
    let out = format_source(&crlf).expect("formats");
    assert!(out.starts_with('\u{FEFF}'));
    // Every line ending is CRLF, none is a bare LF or a doubled CR.
    assert_eq!(
        out.matches('\n').count(),
        out.matches("\r\n").count(),
        "{out:?}"
    );
    assert!(!out.contains("\r\r"), "{out:?}");
    // The same layout as the LF file gets, and formatting again changes nothing.
    let lf =
        format_source(&crlf.trim_start_matches('\u{FEFF}').replace("\r\n", "\n")).expect("formats");
    assert_eq!(out.trim_start_matches('\u{FEFF}').replace("\r\n", "\n"), lf);
    assert_eq!(format_source(&out).expect("formats"), out);
}

#[test]
fn reciprocal_units_are_written_with_the_number_one() {
    // 1/°F = 1.8/K exactly (the size of the Fahrenheit degree, 5/9 K; NIST SP 811).
    let text = "param alpha = 0.004 1/K\nparam beta = 2 1/°F\nparam rate = 3 1/s\nparam per_mk = 5 1/(m*K)\nparam sum = alpha + beta\nnode a (fixed = 20 °C)\nnode b (fixed = 10 °C)\nlink x: a to b resistance(r = 1 K/W / (1 + sum * 1 K))\n";
    let a = analyse(text);
    assert!(errors(&a).is_empty(), "{:?}", errors(&a));
    // r = 1 K/W / (1 + (0.004 + 3.6)·1) = 1/4.604 K/W; Q = 10 K / r.
    let q = a.solution.as_ref().expect("solved").heat_flows[0];
    assert!((q - 10.0 * 4.604).abs() < 1e-9, "{q}");
}

#[test]
fn a_digit_after_a_number_without_a_space_is_still_part_of_the_number() {
    // `0.0041/K` is the number 0.0041 followed by `/K`, which is not a unit after a space:
    // the expression reads 0.0041 divided by a name `K`, an unknown name.
    let a = analyse("param alpha = 0.0041/K\n");
    assert!(!errors(&a).is_empty());
}
