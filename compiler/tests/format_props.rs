//! Property tests of the formatter on generated models: valid declarations written with random
//! whitespace, line breaks, blank lines and comments. For every such text the formatted output
//! is a fixed point, holds the same comments in the same order, and analyses to the same
//! network and solution.

mod common;

use caloris_compiler::format::format_source;
use caloris_compiler::lexer::lex;
use caloris_compiler::span::FileId;
use proptest::prelude::*;

/// One declaration as a list of tokens.
type Decl = Vec<String>;

fn toks(s: &str) -> Decl {
    // Numbers with their units are written as one token, e.g. `0.04 W/(m*K)`; split on `|`.
    s.split('|').map(str::to_string).collect()
}

fn quantity(v: f64, unit: &str) -> String {
    format!("{v} {unit}")
}

/// A small valid model: materials, nodes in a chain from a warm to a cold boundary, a
/// build-up, links of several kinds, parameters and limits.
fn model() -> impl Strategy<Value = Vec<Decl>> {
    (
        prop::collection::vec(0.02f64..2.0, 1..4), // conductivities
        prop::collection::vec(1.0f64..200.0, 1..5), // thicknesses, mm
        -30.0f64..-0.5,                            // cold side, °C
        10.0f64..60.0,                             // warm side, °C
        prop::collection::vec(0.1f64..5.0, 0..3),  // extra resistances
        0.0f64..10.0,                              // heat load
        any::<bool>(),
    )
        .prop_map(|(ks, ts, cold, warm, extra, load, with_title)| {
            let mut d: Vec<Decl> = Vec::new();
            if with_title {
                d.push(toks("title|\"Generated wall\""));
            }
            d.push(toks(&format!(
                "param|area|=|{}|*|{}",
                quantity(2.4, "m"),
                quantity(3.0, "m")
            )));
            d.push(toks(&format!(
                "param|h_in|=|1|/|(|{}|)",
                quantity(0.13, "m^2*K/W")
            )));
            for (i, k) in ks.iter().enumerate() {
                d.push(toks(&format!(
                    "material|m{i}|(|k|=|{}|)",
                    quantity(*k, "W/(m*K)")
                )));
            }
            d.push(toks(&format!(
                "node|warm|(|fixed|=|{}|)",
                quantity(warm, "°C")
            )));
            d.push(toks(&format!(
                "node|cold|(|fixed|=|-|{}|)",
                quantity(-cold, "degC")
            )));
            d.push(toks(&format!(
                "node|mid|(|load|=|{}|)",
                quantity(load, "W")
            )));
            let mut b = toks("buildup|wall|{");
            b.extend(toks("inside|:|film|(|h|=|h_in|)"));
            for (i, t) in ts.iter().enumerate() {
                let m = i % ks.len();
                b.extend(toks(&format!(
                    "l{i}|:|layer|(|m{m}|,|thickness|=|{}|)",
                    quantity(*t, "mm")
                )));
            }
            b.extend(toks(&format!(
                "outside|:|film|(|r|=|{}|)",
                quantity(0.04, "m^2*K/W")
            )));
            b.push("}".into());
            d.push(b);
            d.push(toks("link|w|:|warm|to|mid|wall|(|area|=|area|)"));
            d.push(toks(&format!(
                "link|out|:|mid|to|cold|film|(|h|=|{}|,|area|=|area|)",
                quantity(25.0, "W/(m^2*K)")
            )));
            for (i, r) in extra.iter().enumerate() {
                d.push(toks(&format!(
                    "link|x{i}|:|warm|to|cold|resistance|(|{}|)",
                    quantity(*r, "K/W")
                )));
            }
            d.push(toks(&format!(
                "limit|surface|:|temperature|(|w.inside|)|>=|{}",
                quantity(12.6, "°C")
            )));
            d.push(toks(&format!(
                "limit|u|:|u_value|(|w|)|<=|{}",
                quantity(0.3, "W/(m^2*K)")
            )));
            d
        })
}

/// Whitespace to put between two tokens, by choice index; comments carry their own newline.
fn gap(choice: u8, comment_no: &mut usize) -> String {
    match choice % 12 {
        0..=3 => " ".into(),
        4 => "".into(),
        5 => "\n".into(),
        6 => "\n\n\n".into(),
        7 => "  \t ".into(),
        8 => "\n    ".into(),
        9 | 10 => {
            *comment_no += 1;
            format!("  # note {comment_no}\n")
        }
        _ => {
            *comment_no += 1;
            format!("\n\n# remark {comment_no}\n")
        }
    }
}

/// Whether `a` + `sep` + `b` still lexes as the two tokens `a` and `b`.
fn keeps_tokens(a: &str, sep: &str, b: &str) -> bool {
    let text = format!("{a}{sep}{b}");
    let t = lex(&text, FileId(0));
    t.len() == 2
        && t[0].span.range() == (0..a.len())
        && t[1].span.start as usize == a.len() + sep.len()
}

fn render(decls: &[Decl], choices: &[u8]) -> String {
    let all: Vec<&String> = decls.iter().flatten().collect();
    let mut out = String::new();
    let mut comment_no = 0;
    for (i, t) in all.iter().enumerate() {
        if i > 0 {
            let mut sep = gap(choices[i % choices.len()], &mut comment_no);
            // A unit runs on over `*`, `/` and digits written right after it (`2 m*3 m` is
            // one quantity), so nothing is glued to a number that carries a unit.
            if sep.is_empty() && all[i - 1].contains(' ') {
                sep = " ".into();
            }
            if !sep.contains('\n') && !keeps_tokens(all[i - 1], &sep, t) {
                sep = if keeps_tokens(all[i - 1], " ", t) {
                    " ".into()
                } else {
                    "\n".into()
                };
            }
            out.push_str(&sep);
        }
        out.push_str(t);
    }
    out.push('\n');
    out
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 256, ..ProptestConfig::default() })]

    #[test]
    fn formatting_is_idempotent_keeps_comments_and_meaning(
        decls in model(),
        choices in prop::collection::vec(any::<u8>(), 1..200),
    ) {
        let text = render(&decls, &choices);
        let before = common::analyse(&text);
        prop_assert!(!before.has_errors(), "generated model has errors: {:?}\n{text}",
            before.diagnostics.iter().map(|d| &d.message).collect::<Vec<_>>());
        let once = format_source(&text).map_err(|d| TestCaseError::fail(format!("refused: {d:?}\n{text}")))?;
        let twice = format_source(&once).map_err(|d| TestCaseError::fail(format!("refused again: {d:?}")))?;
        prop_assert_eq!(&once, &twice, "not idempotent for\n{}", text);
        prop_assert_eq!(common::comments(&text), common::comments(&once));
        let after = common::analyse(&once);
        prop_assert_eq!(common::fingerprint(&before), common::fingerprint(&after));
        prop_assert!(!once.contains("\n\n\n"), "blank lines not collapsed");
        prop_assert!(once.lines().all(|l| l == l.trim_end()), "trailing blanks left");
    }
}
