//! The model size budget (E220): nested repeats, sub-network fan-out and regions inside repeats
//! are counted before anything is expanded, so an oversized model stops at once with an error
//! naming the nesting, and a cancelled analysis stops without a result.

use std::sync::atomic::AtomicBool;
use std::sync::Arc;
use std::time::Instant;

use caloris_compiler::source::NoImports;
use caloris_compiler::{analyze, Analysis, Options};

fn run_with(src: &str, options: &Options) -> Analysis {
    analyze("model.heat", src, &NoImports, options)
}

fn run(src: &str) -> Analysis {
    run_with(src, &Options::default())
}

fn errors(a: &Analysis) -> Vec<(&'static str, String)> {
    a.diagnostics
        .iter()
        .filter(|d| d.is_error())
        .map(|d| (d.code, d.message.clone()))
        .collect()
}

const ENDS: &str = "node a (fixed = 20 °C)\nnode b (fixed = 0 °C)\n";

#[test]
fn nested_repeats_of_ten_billion_copies_stop_before_expanding() {
    let src = format!(
        "{ENDS}repeat outer (count = 100000) {{\n  repeat inner (count = 100000) {{\n    node t\n    \
         link s: t to b resistance(1 K/W)\n  }}\n}}\n"
    );
    let start = Instant::now();
    let a = run(&src);
    let errs = errors(&a);
    assert_eq!(errs.len(), 1, "{errs:?}");
    let (code, message) = &errs[0];
    assert_eq!(*code, "E220");
    // Both blocks of the nesting are named, outermost first, with the copies of each.
    assert!(
        message.contains("`repeat outer` (100 000 copies) › `repeat inner` (100 000 copies)"),
        "{message}"
    );
    assert!(message.contains("5 000 000"), "{message}");
    assert!(a.solution.is_none());
    // Nothing of the 10^10 copies was made: no generated node exists.
    assert_eq!(a.network.nodes.len(), 0, "no elaboration after E220");
    // Generous: counting is arithmetic on the syntax, expanding would take minutes.
    assert!(start.elapsed().as_secs() < 20);
    // The error points at the outer block's name, where the multiplication starts.
    let d = a.diagnostics.iter().find(|d| d.code == "E220").unwrap();
    assert_eq!(
        &src[d.primary.span.start as usize..d.primary.span.end as usize],
        "outer"
    );
}

#[test]
fn sub_network_fan_out_is_counted_through_every_level() {
    // Ten levels, each using the next ten times: 10^10 copies of the innermost two links.
    let mut src = String::from(ENDS);
    src.push_str("network n9 (p) {\n  node q\n  link l: p to q resistance(1 K/W)\n  link s: q to b resistance(1 K/W)\n}\n");
    for level in (0..9).rev() {
        src.push_str(&format!("network n{level} (p) {{\n"));
        for u in 0..10 {
            src.push_str(&format!("  use u{u}: n{}(p = p)\n", level + 1));
        }
        src.push_str("}\n");
    }
    src.push_str("use top: n0(p = a)\n");
    let a = run(&src);
    let errs = errors(&a);
    assert_eq!(errs.len(), 1, "{errs:?}");
    assert_eq!(errs[0].0, "E220");
    assert!(errs[0].1.contains("`use top` of `n0`"), "{}", errs[0].1);
}

#[test]
fn regions_inside_repeats_count_their_cells() {
    // 100 copies of a 200 × 300 region: each region is within its own cell limit, the whole is
    // 6 000 000 cells.
    let src = format!(
        "{ENDS}material al (k = 200 W/(m*K))\nrepeat row (count = 100) {{\n  \
         region plate (al, thickness = 2 mm, width = 100 mm, height = 60 mm, cells_x = 200, cells_y = 300) {{\n    \
         left: a\n    right: b\n  }}\n}}\n"
    );
    let a = run(&src);
    let errs = errors(&a);
    assert_eq!(errs.len(), 1, "{errs:?}");
    assert_eq!(errs[0].0, "E220");
    assert!(
        errs[0].1.contains("`region plate` (60 000 cells)"),
        "{}",
        errs[0].1
    );
}

#[test]
fn a_model_within_the_budget_solves_and_a_smaller_budget_refuses_it() {
    // 20 × 30 copies of one node and two links: 1 800 declarations.
    let src = format!(
        "{ENDS}repeat row (count = 20) {{\n  repeat col (count = 30) {{\n    node t\n    \
         link s: t to b resistance(1 K/W)\n    link u: a to t resistance(1 K/W)\n  }}\n}}\n"
    );
    let a = run(&src);
    assert!(errors(&a).is_empty(), "{:?}", errors(&a));
    let sol = a.solution.as_ref().expect("solved");
    // Each copy is a divider of two equal resistances: 10 °C (Kirchhoff's current law).
    let t = a.network.node_id("row.7.col.11.t").expect("generated node");
    assert!((sol.temperatures[t] - (10.0 + 273.15)).abs() < 1e-9);

    let small = Options {
        size_budget: Some(1_000),
        ..Options::default()
    };
    let a = run_with(&src, &small);
    let errs = errors(&a);
    assert_eq!(errs.len(), 1, "{errs:?}");
    assert_eq!(errs[0].0, "E220");
    assert!(errs[0].1.contains("at most 1 000"), "{}", errs[0].1);
}

#[test]
fn top_level_regions_share_the_budget() {
    let src = format!(
        "{ENDS}material al (k = 200 W/(m*K))\n\
         region p1 (al, thickness = 2 mm, width = 100 mm, height = 60 mm, cells_x = 30, cells_y = 30) {{\n  left: a\n  right: b\n}}\n\
         region p2 (al, thickness = 2 mm, width = 100 mm, height = 60 mm, cells_x = 30, cells_y = 30) {{\n  left: a\n  right: b\n}}\n"
    );
    let ok = run(&src);
    assert!(errors(&ok).is_empty(), "{:?}", errors(&ok));
    let small = Options {
        size_budget: Some(1_500),
        ..Options::default()
    };
    let a = run_with(&src, &small);
    let errs = errors(&a);
    assert_eq!(errs.len(), 1, "{errs:?}");
    assert_eq!(errs[0].0, "E220");
}

#[test]
fn counts_that_depend_on_the_copy_index_are_counted_per_copy() {
    // Copy i of the outer block holds i inner copies: 1 + 2 + ... + 40 = 820 inner copies of
    // two declarations (1 640), plus the outer copies themselves.
    let src = format!(
        "{ENDS}repeat outer (count = 40) {{\n  repeat inner (count = index) {{\n    node t\n    \
         link s: t to b resistance(1 K/W)\n  }}\n}}\n"
    );
    let fits = Options {
        size_budget: Some(2_000),
        ..Options::default()
    };
    let a = run_with(&src, &fits);
    assert!(errors(&a).is_empty(), "{:?}", errors(&a));
    assert!(a.network.node_id("outer.40.inner.40.t").is_some());
    assert!(a.network.node_id("outer.3.inner.4.t").is_none());

    let tight = Options {
        size_budget: Some(1_600),
        ..Options::default()
    };
    let a = run_with(&src, &tight);
    assert_eq!(
        errors(&a).first().map(|e| e.0),
        Some("E220"),
        "{:?}",
        errors(&a)
    );
}

#[test]
fn a_cancelled_analysis_stops_without_a_result() {
    let src = format!("{ENDS}link ab: a to b resistance(2 K/W)\n");
    let cancel = Arc::new(AtomicBool::new(true));
    let options = Options {
        cancel: Some(cancel),
        ..Options::default()
    };
    let a = run_with(&src, &options);
    assert!(a.cancelled);
    assert!(a.solution.is_none());

    let a = run(&src);
    assert!(!a.cancelled);
    assert!(a.solution.is_some());
}

#[test]
fn uses_of_a_missing_network_count_and_cycles_are_never_expanded() {
    // Six levels of ten uses each, ending in a network nobody declared: 10^6 uses, each an
    // error. With a budget of 100 000 it is refused before a single use is tried.
    let mut src = String::from(ENDS);
    for level in 0..6 {
        src.push_str(&format!("network n{level} (p) {{\n"));
        for u in 0..10 {
            src.push_str(&format!("  use u{u}: n{}(p = p)\n", level + 1));
        }
        src.push_str("}\n");
    }
    src.push_str("use top: n0(p = a)\n");
    let small = Options {
        size_budget: Some(100_000),
        ..Options::default()
    };
    let a = run_with(&src, &small);
    assert_eq!(
        errors(&a).iter().map(|e| e.0).collect::<Vec<_>>(),
        ["E220"],
        "{:?}",
        errors(&a)
    );

    // Two networks that use each other, ten times each way: the use that closes the cycle
    // is E218 at once, naming the cycle, instead of 10^16 copies down to the depth limit.
    let src = format!(
        "{ENDS}network ping (p) {{\n{}}}\nnetwork pong (p) {{\n{}}}\nuse top: ping(p = a)\n",
        (0..10)
            .map(|u| format!("  use u{u}: pong(p = p)\n"))
            .collect::<String>(),
        (0..10)
            .map(|u| format!("  use v{u}: ping(p = p)\n"))
            .collect::<String>(),
    );
    let start = Instant::now();
    let a = run(&src);
    let errs = errors(&a);
    assert!(
        !errs.is_empty() && errs.iter().all(|e| e.0 == "E218"),
        "{errs:?}"
    );
    assert!(
        errs[0].1.contains("`ping` → `pong` → `ping`"),
        "{}",
        errs[0].1
    );
    assert!(start.elapsed().as_secs() < 20);
}

#[test]
fn copies_of_an_empty_body_count_one_each() {
    // 10^10 copies that make nothing: counted as nothing they were all expanded, for ever.
    let src = format!(
        "{ENDS}repeat outer (count = 100000) {{\n  repeat inner (count = 100000) {{\n  }}\n}}\n"
    );
    let start = Instant::now();
    let a = run(&src);
    let errs = errors(&a);
    assert_eq!(errs.len(), 1, "{errs:?}");
    assert_eq!(errs[0].0, "E220");
    assert!(
        errs[0].1.contains("would make 10 000 000 000"),
        "{}",
        errs[0].1
    );
    assert!(start.elapsed().as_secs() < 20);

    // Exactly so: 1 500 copies, each a chain of two repeats of one empty copy (one each), and
    // the two end nodes fit a budget of 1 502, not one of 1 501.
    let src = format!(
        "{ENDS}repeat outer (count = 1500) {{\n  repeat a (count = 1) {{\n    repeat b (count = 1) {{\n    }}\n  }}\n}}\n"
    );
    for (budget, fits) in [(1_502, true), (1_501, false)] {
        let a = run_with(
            &src,
            &Options {
                size_budget: Some(budget),
                ..Options::default()
            },
        );
        let codes: Vec<&str> = errors(&a).iter().map(|e| e.0).collect();
        assert_eq!(codes.is_empty(), fits, "budget {budget}: {codes:?}");
    }
}
