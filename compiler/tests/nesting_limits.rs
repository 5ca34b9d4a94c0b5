//! Deep and long input: the parser cuts nesting at its limits with E005, long operator chains
//! and parameter chains cost no recursion, and a model that passes the parser cannot overflow a
//! later stage. Every stage runs here on threads with the 8 MB stack a command-line main
//! thread has and with the 2 MB of a test thread or a default async worker; tests run
//! unoptimised, where frames are largest.

use caloris_compiler::analysis::MAX_IMPORT_DEPTH;
use caloris_compiler::compare::compare;
use caloris_compiler::format::format_source;
use caloris_compiler::parser::{parse_expr, MAX_BLOCK_DEPTH, MAX_EXPR_DEPTH};
use caloris_compiler::query::{completion_context, highlights, networks, target_at};
use caloris_compiler::source::NoImports;
use caloris_compiler::span::{FileId, LineIndex};
use caloris_compiler::units::Quantity;
use caloris_compiler::{analyze, Analysis, Options};

const MAIN_STACK: usize = 8 * 1024 * 1024;
const SMALL_STACK: usize = 2 * 1024 * 1024;

fn analyse(text: &str) -> Analysis {
    analyze("model.heat", text, &NoImports, &Options::default())
}

fn errors(a: &Analysis) -> Vec<(&'static str, usize, usize)> {
    let index = LineIndex::new(a.sources.text(FileId(0)));
    a.diagnostics
        .iter()
        .filter(|d| d.is_error())
        .map(|d| {
            let at = index.line_col_chars(d.primary.span.start);
            (d.code, at.line as usize + 1, at.col as usize + 1)
        })
        .collect()
}

fn param(a: &Analysis, name: &str) -> Option<Quantity> {
    a.params.iter().find(|p| p.0 == name).and_then(|p| p.1)
}

/// Run `f` on a thread with the main thread's stack; a stack overflow aborts the whole test
/// binary, which fails the run as surely as an assertion.
fn on_main_stack<T: Send>(f: impl FnOnce() -> T + Send) -> T {
    on_stack(MAIN_STACK, f)
}

fn on_stack<T: Send>(size: usize, f: impl FnOnce() -> T + Send) -> T {
    std::thread::scope(|s| {
        std::thread::Builder::new()
            .stack_size(size)
            .spawn_scoped(s, f)
            .expect("thread")
            .join()
            .expect("no panic")
    })
}

/// `levels` levels of one kind of nesting around `1`, as the right side of `param p = `:
/// each opener is one level and the innermost value one more.
fn nested(kind: &str, levels: usize) -> String {
    let n = levels - 1;
    match kind {
        "brackets" => format!("{}1 W{}", "(".repeat(n), ")".repeat(n)),
        "calls" => format!("{}1 W{}", "abs(".repeat(n), ")".repeat(n)),
        "signs" => format!("{}1 W", "- ".repeat(n)),
        "powers" => format!("{}1", "1 ^ ".repeat(n)),
        _ => unreachable!(),
    }
}

/// Column (1-based) where the level after the last allowed one starts in `param p = ...`.
fn first_column_too_deep(kind: &str) -> usize {
    let opener = match kind {
        "brackets" => 1,
        "signs" => 2,
        "calls" | "powers" => 4,
        _ => unreachable!(),
    };
    "param p = ".len() + 1 + opener * MAX_EXPR_DEPTH
}

#[test]
fn each_kind_of_nesting_is_cut_at_the_limit_once() {
    for kind in ["brackets", "calls", "signs", "powers"] {
        let at = analyse(&format!("param p = {}\n", nested(kind, MAX_EXPR_DEPTH)));
        assert!(errors(&at).is_empty(), "{kind}: {:?}", at.diagnostics);
        let v = param(&at, "p").expect("a value");
        let expected = if kind == "signs" && (MAX_EXPR_DEPTH - 1) % 2 == 1 {
            -1.0
        } else {
            1.0
        };
        assert_eq!(v.value, expected, "{kind}");

        for levels in [MAX_EXPR_DEPTH + 1, 5_000] {
            let text = format!("param p = {}\nparam q = 2 W\n", nested(kind, levels));
            let a = on_main_stack(|| analyse(&text));
            assert_eq!(
                errors(&a),
                [("E005", 1, first_column_too_deep(kind))],
                "{kind} {levels}"
            );
            // The declaration after it still parses and evaluates.
            assert_eq!(
                param(&a, "q").map(|q| q.value),
                Some(2.0),
                "{kind} {levels}"
            );
        }
    }
}

#[test]
fn a_lone_expression_too_deep_is_refused_with_e005() {
    let err = parse_expr(&nested("brackets", 3_000), FileId(0)).expect_err("too deep");
    assert_eq!(err.code, "E005");
    assert!(parse_expr(&nested("brackets", MAX_EXPR_DEPTH), FileId(0)).is_ok());
}

#[test]
fn long_operator_chains_and_parameter_chains_evaluate_exactly() {
    let terms = 50_000;
    let text = format!(
        "param sum = {}1\nparam product = 1 W{}\nparam difference = 100 W{}\n",
        "1 + ".repeat(terms - 1),
        " * 2 / 2".repeat(terms / 2),
        " - 1 mW".repeat(terms),
    );
    let a = on_main_stack(|| analyse(&text));
    assert!(errors(&a).is_empty(), "{:?}", a.diagnostics);
    assert_eq!(param(&a, "sum").map(|q| q.value), Some(terms as f64));
    assert_eq!(param(&a, "product").map(|q| q.value), Some(1.0));
    let d = param(&a, "difference").expect("difference").value;
    assert!((d - 50.0).abs() < 1e-9, "{d}");

    // Each parameter refers to the one declared after it: evaluated deepest first.
    let n = 20_000;
    let mut chain = String::new();
    for i in (1..=n).rev() {
        chain.push_str(&format!("param p{i} = p{} + 1 W\n", i - 1));
    }
    chain.push_str("param p0 = 0 W\n");
    let a = on_main_stack(|| analyse(&chain));
    assert!(errors(&a).is_empty(), "{:?}", &a.diagnostics[..1]);
    assert_eq!(param(&a, &format!("p{n}")).map(|q| q.value), Some(n as f64));
}

#[test]
fn blocks_nested_beyond_the_limit_are_cut_once() {
    let block = |levels: usize| {
        let mut t = String::from("node a (fixed = 20 °C)\n");
        for i in 0..levels {
            t.push_str(&format!("repeat r{i} (count = 1) {{\n"));
        }
        t.push_str("node x (load = 1 W)\nlink l: a to x resistance(1 K/W)\n");
        t.push_str(&"}\n".repeat(levels));
        t.push_str("node after (fixed = 5 °C)\n");
        t
    };
    let ok = analyse(&block(MAX_BLOCK_DEPTH));
    assert!(errors(&ok).is_empty(), "{:?}", ok.diagnostics);
    assert!(ok.solution.is_some());
    for levels in [MAX_BLOCK_DEPTH + 1, 3_000] {
        let text = block(levels);
        let a = on_main_stack(|| analyse(&text));
        // Reported at the `{` of the first level too many, which is line LIMIT + 2.
        let col = format!("repeat r{MAX_BLOCK_DEPTH} (count = 1) ").len() + 1;
        assert_eq!(errors(&a), [("E005", MAX_BLOCK_DEPTH + 2, col)], "{levels}");
        assert!(a.symbols.get("after").is_some(), "{levels}");
    }
}

/// The worst a model can be and still pass the parser: blocks nested to the limit, and in the
/// innermost one expressions nested to the limit in parameters, loads, element arguments and
/// limits, each level also holding a chain. A sub-network used from there adds its own levels.
fn worst_accepted() -> String {
    let deep = |inner: &str| {
        let mut e = inner.to_string();
        // A bracket and a call per step: two levels, plus the innermost value.
        for _ in 0..(MAX_EXPR_DEPTH - 1) / 2 {
            e = format!("abs(({e}) + 0 W - 0 W)");
        }
        e
    };
    let mut t = String::from(
        "node a (fixed = 20 °C)\nnetwork part (x) {\n  node s\n  link l: x to s resistance(1 K/W)\n}\n",
    );
    for i in 0..MAX_BLOCK_DEPTH - 1 {
        t.push_str(&format!("repeat r{i} (count = 1) {{\n"));
    }
    t.push_str(&format!("param p = {}\n", deep("1 W")));
    t.push_str(&format!("node x (load = {})\n", deep("p")));
    t.push_str(&format!(
        "link l: a to x resistance({})\n",
        deep("1 K/W").replace(" W", " K/W")
    ));
    t.push_str(&format!(
        "limit hot: temperature(x) < 20 °C + {}\n",
        deep("80 K").replace(" W", " K")
    ));
    t.push_str("use u: part(x = x)\n");
    t.push_str(&"}\n".repeat(MAX_BLOCK_DEPTH - 1));
    t
}

/// Every stage that reads a syntax tree, on each stack size.
fn every_stage(text: &str) -> Analysis {
    on_stack(SMALL_STACK, || stages(text));
    on_main_stack(|| stages(text))
}

fn stages(text: &str) -> Analysis {
    {
        let a = analyse(text);
        let checked = analyze(
            "model.heat",
            text,
            &NoImports,
            &Options {
                check_only: true,
                ..Options::default()
            },
        );
        let _ = compare(&checked, &a);
        let _ = format_source(text);
        let _ = highlights(&a, FileId(0));
        let _ = networks(&a);
        // Every position of the first and last few hundred bytes, and a sample between.
        let len = text.len() as u32;
        let offsets = (0..len.min(400))
            .chain(len.saturating_sub(400)..len)
            .chain((0..len).step_by(97));
        for offset in offsets {
            let _ = target_at(&a, FileId(0), offset);
        }
        let _ = completion_context(text, len);
        let _ = completion_context(text, len / 2);
        // Derived walks: copies, comparison, debug text, JSON, and the drops of all of them.
        let module = &a.modules[0].1;
        let copy = module.clone();
        assert_eq!(&copy, module);
        let _ = format!("{copy:?}");
        let _ = serde_json::to_string(&copy).expect("json");
        drop(checked);
        a
    }
}

#[test]
fn a_model_at_every_limit_passes_every_stage() {
    let text = worst_accepted();
    let a = every_stage(&text);
    assert!(errors(&a).is_empty(), "{:?}", a.diagnostics);
    assert!(a.solution.is_some());
    let prefix: String = (0..MAX_BLOCK_DEPTH - 1)
        .map(|i| format!("r{i}.1."))
        .collect();
    assert!(a.network.node_id(&format!("{prefix}u.s")).is_some());
    assert_eq!(param(&a, &format!("{prefix}p")).map(|q| q.value), Some(1.0));
}

#[test]
fn input_beyond_every_limit_passes_every_stage() {
    let long_sum = format!("param p = {}1\n", "1 + ".repeat(20_000));
    let deep = format!(
        "param p = {}\nnode a (fixed = 1 °C)\n",
        nested("brackets", 5_000)
    );
    let mixed = format!(
        "param p = {}1{}\n",
        "(1 + abs(".repeat(3_000),
        "))".repeat(3_000)
    );
    let mut blocks = String::new();
    for i in 0..2_400 {
        blocks.push_str(&format!("repeat r{i} (count = 1) {{\n"));
    }
    blocks.push_str(&"}\n".repeat(2_400));
    for text in [long_sum, deep, mixed, blocks] {
        every_stage(&text);
    }
}

/// Files `f0.heat`, `f1.heat`, ... each importing the next, up to `last`, which imports
/// `back_to` (a cycle) or nothing.
struct Chain {
    last: usize,
    back_to: Option<usize>,
}

impl caloris_compiler::source::SourceLoader for Chain {
    fn load(&self, _from: &str, path: &str) -> Result<(String, String), String> {
        let i: usize = path
            .strip_prefix('f')
            .and_then(|p| p.strip_suffix(".heat"))
            .and_then(|n| n.parse().ok())
            .ok_or("not in the chain")?;
        let text = match (i == self.last, self.back_to) {
            (false, _) => format!("import \"f{}.heat\"\nparam p{i} = {i} W\n", i + 1),
            (true, Some(j)) => format!("import \"f{j}.heat\"\nparam p{i} = {i} W\n"),
            (true, None) => format!("param p{i} = {i} W\n"),
        };
        Ok((path.to_string(), text))
    }
}

#[test]
fn a_chain_of_imports_loads_to_its_limit_and_stops_there_once() {
    let root = "import \"f1.heat\"\nnode a (fixed = 1 °C)\n";
    let chain = |last: usize| {
        on_stack(SMALL_STACK, move || {
            analyze(
                "f0.heat",
                root,
                &Chain {
                    last,
                    back_to: None,
                },
                &Options::default(),
            )
        })
    };
    let n = MAX_IMPORT_DEPTH;
    let a = chain(n);
    assert_eq!(a.modules.len(), n + 1);
    assert_eq!(param(&a, &format!("p{n}")).map(|q| q.value), Some(n as f64));
    assert!(errors(&a).is_empty(), "{:?}", &a.diagnostics[..1]);

    // Files f0 to f64 are read; the import in f64 is one too many, reported once.
    let a = chain(3_000);
    assert_eq!(a.modules.len(), MAX_IMPORT_DEPTH + 1);
    let deep: Vec<&str> = a
        .diagnostics
        .iter()
        .filter(|d| d.code == "E602")
        .map(|d| d.message.as_str())
        .collect();
    assert_eq!(
        deep,
        [format!(
            "imports nest more than {MAX_IMPORT_DEPTH} files deep"
        )]
    );

    // A cycle at the far end is reported once, with the whole chain.
    let a = on_stack(SMALL_STACK, || {
        analyze(
            "f0.heat",
            root,
            &Chain {
                last: 50,
                back_to: Some(7),
            },
            &Options::default(),
        )
    });
    let cycles: Vec<&str> = a
        .diagnostics
        .iter()
        .filter(|d| d.code == "E602")
        .map(|d| d.message.as_str())
        .collect();
    assert_eq!(cycles.len(), 1, "{cycles:?}");
    assert!(
        cycles[0].starts_with("import cycle: f0.heat -> f1.heat")
            && cycles[0].ends_with("f49.heat -> f50.heat -> f7.heat"),
        "{}",
        cycles[0]
    );
}
