//! End-to-end tests of the options every command shares (`--color`, `-q`, `--deny-warnings`,
//! `--units auto`) and of `check`/`solve` over folders with `--set` and `--case`.

use assert_cmd::Command;

fn caloris(args: &[&str], env: &[(&str, &str)]) -> (i32, String, String) {
    let mut c = Command::cargo_bin("caloris").expect("binary built");
    c.current_dir(env!("CARGO_MANIFEST_DIR"));
    c.env_remove("NO_COLOR").env_remove("TERM");
    for (k, v) in env {
        c.env(k, v);
    }
    let out = c.args(args).output().expect("runs");
    (
        out.status.code().unwrap_or(-1),
        String::from_utf8_lossy(&out.stdout).into_owned(),
        String::from_utf8_lossy(&out.stderr).into_owned(),
    )
}

const ESC: char = '\u{1b}';

#[test]
fn color_always_colours_a_pipe_and_never_or_term_dumb_do_not() {
    let bad = "tests/cases/errors/unknown_names.heat";
    let (_, _, err) = caloris(&["check", bad, "--color", "always"], &[]);
    assert!(err.contains(ESC), "--color always must colour: {err}");
    let (_, _, err) = caloris(&["check", bad, "--color", "never"], &[]);
    assert!(!err.contains(ESC), "{err}");
    // Not a terminal, so auto never colours here; TERM=dumb must not switch it on either.
    let (_, _, err) = caloris(&["check", bad], &[("TERM", "dumb")]);
    assert!(!err.contains(ESC), "{err}");
    let (code, _, _) = caloris(&["check", bad, "--color", "sometimes"], &[]);
    assert_eq!(code, 2);
}

#[test]
fn a_failing_limit_is_summarised_on_stderr_with_its_name() {
    let (code, _, err) = caloris(
        &["solve", "tests/cases/reference/limits_pass_fail.heat"],
        &[],
    );
    assert_eq!(code, 3);
    let line = err
        .lines()
        .find(|l| l.contains("design limit"))
        .unwrap_or_else(|| panic!("no summary line: {err}"));
    assert!(line.contains(" of "), "{line}");
    assert!(line.contains("fail:"), "{line}");
}

#[test]
fn quiet_hides_warnings_and_status_but_not_errors() {
    let warn = "tests/cases/reference/shell_critical_radius_cable.heat";
    let (code, _, err) = caloris(&["check", warn], &[]);
    assert_eq!(code, 0);
    assert!(err.contains("W110"), "{err}");
    assert!(err.contains("ok —"), "{err}");
    let (code, _, err) = caloris(&["check", "-q", warn], &[]);
    assert_eq!(code, 0);
    assert!(
        err.is_empty(),
        "quiet must print nothing for a sound model: {err}"
    );
    let (code, _, err) = caloris(
        &["check", "-q", "tests/cases/errors/unknown_names.heat"],
        &[],
    );
    assert_eq!(code, 1);
    assert!(err.contains("error"), "{err}");
}

#[test]
fn deny_warnings_fails_a_model_with_warnings_only() {
    let warn = "tests/cases/reference/shell_critical_radius_cable.heat";
    let (code, _, err) = caloris(&["check", "--deny-warnings", warn], &[]);
    assert_eq!(code, 1, "{err}");
    assert!(err.contains("1 warning denied"), "{err}");
    let (code, _, _) = caloris(&["solve", "--deny-warnings", warn], &[]);
    assert_eq!(code, 1);
    let (code, _, _) = caloris(&["check", "--deny-warnings", "examples/led_lamp.heat"], &[]);
    assert_eq!(code, 0);
}

#[test]
fn check_takes_folders_and_reports_every_model() {
    let (code, _, err) = caloris(&["check", "examples"], &[]);
    assert_eq!(code, 0, "{err}");
    let n_examples = std::fs::read_dir(concat!(env!("CARGO_MANIFEST_DIR"), "/examples"))
        .expect("examples")
        .flatten()
        .filter(|e| e.path().extension().is_some_and(|x| x == "heat"))
        .count();
    assert_eq!(err.matches(": ok — ").count(), n_examples, "{err}");
    // The worst outcome decides the exit code: a model with errors among sound ones gives 1.
    let (code, _, _) = caloris(
        &[
            "check",
            "examples/led_lamp.heat",
            "tests/cases/errors/unknown_names.heat",
        ],
        &[],
    );
    assert_eq!(code, 1);
}

#[test]
fn solve_applies_a_case_and_a_setting() {
    let tank = "examples/hot_water_tank_jacket.heat";
    let json = |args: &[&str]| -> serde_json::Value {
        let mut all = vec!["solve", tank, "--format", "json"];
        all.extend_from_slice(args);
        let (code, out, err) = caloris(&all, &[]);
        assert!(code == 0 || code == 3, "{err}");
        serde_json::from_str(&out).expect("json")
    };
    let boundary = |v: &serde_json::Value| -> f64 {
        v["nodes"]
            .as_array()
            .expect("nodes")
            .iter()
            .filter_map(|n| n["boundary_heat_W"].as_f64())
            .map(f64::abs)
            .fold(0.0, f64::max)
    };
    let base = boundary(&json(&[]));
    let cold = boundary(&json(&["--case", "cold_cupboard"]));
    let set = boundary(&json(&["--set", "cupboard=12°C"]));
    // A colder cupboard draws more heat from the tank; the case and the setting are the same change.
    assert!(cold > base, "{cold} vs {base}");
    assert!((cold - set).abs() <= 1e-9 * cold, "{cold} vs {set}");
    let (code, _, err) = caloris(&["solve", tank, "--case", "hot_attic"], &[]);
    assert_eq!(code, 2);
    assert!(err.contains("cold_cupboard"), "{err}");
}

#[test]
fn several_models_as_json_give_one_array() {
    let (code, out, err) = caloris(
        &[
            "solve",
            "examples/led_lamp.heat",
            "examples/garden_office_wall.heat",
            "--format",
            "json",
        ],
        &[],
    );
    assert_eq!(code, 0, "{err}");
    let v: serde_json::Value = serde_json::from_str(&out).expect("one JSON value");
    assert_eq!(v.as_array().map(Vec::len), Some(2));
}

#[test]
fn units_auto_follows_the_model() {
    let (code, out, _) = caloris(
        &[
            "solve",
            "tests/cases/reference/us_units.heat",
            "--units",
            "auto",
        ],
        &[],
    );
    assert!(code == 0 || code == 3);
    assert!(out.contains("°F"), "{out}");
    let (_, out, _) = caloris(
        &[
            "solve",
            "examples/garden_office_wall.heat",
            "--units",
            "auto",
        ],
        &[],
    );
    assert!(out.contains("°C") && !out.contains("°F"), "{out}");
}

/// Every code string in the compiler's source, e.g. `"E202"`.
fn codes_in(dir: &std::path::Path, out: &mut Vec<String>) {
    for e in std::fs::read_dir(dir).expect("source folder").flatten() {
        let p = e.path();
        if p.is_dir() {
            codes_in(&p, out);
        } else if p.extension().is_some_and(|x| x == "rs") {
            let text = std::fs::read_to_string(&p).expect("source");
            let b = text.as_bytes();
            for i in 0..b.len().saturating_sub(5) {
                let code = &b[i + 1..i + 5];
                if b[i] == b'"'
                    && b[i + 5] == b'"'
                    && (code[0] == b'E' || code[0] == b'W')
                    && code[1..].iter().all(u8::is_ascii_digit)
                {
                    out.push(String::from_utf8_lossy(code).into_owned());
                }
            }
        }
    }
}

#[test]
fn explain_knows_every_code_the_compiler_emits() {
    let mut codes = Vec::new();
    codes_in(
        &std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("compiler/src"),
        &mut codes,
    );
    codes.sort();
    codes.dedup();
    assert!(codes.len() > 40, "{codes:?}");
    for c in &codes {
        let (code, out, err) = caloris(&["explain", c], &[]);
        assert_eq!(
            code, 0,
            "`caloris explain {c}` failed (document it in docs/diagnostics.md): {err}"
        );
        assert!(
            out.starts_with(c.as_str()) && out.contains("How to fix it:"),
            "{out}"
        );
    }
    let (code, _, err) = caloris(&["explain", "e2020"], &[]);
    assert_eq!(code, 2);
    assert!(err.contains("did you mean"), "{err}");
    let (_, out, _) = caloris(&["explain", "e202"], &[]);
    assert!(out.contains("not positive"), "{out}");
}

#[test]
fn run_reports_every_interval_and_the_old_option_is_gone() {
    let model = "examples/allotment_standpipe_frost.heat";
    let (code, out, err) = caloris(&["run", model, "--every", "1h", "--format", "json"], &[]);
    assert!(code == 0 || code == 3, "{err}");
    let v: serde_json::Value = serde_json::from_str(&out).expect("json");
    let times: Vec<f64> = v["times_s"]
        .as_array()
        .expect("a list of reported times")
        .iter()
        .filter_map(serde_json::Value::as_f64)
        .collect();
    assert!(times.len() >= 3, "{times:?}");
    // Reported times sit on the hour (the end of the run may fall between).
    for t in &times[..times.len() - 1] {
        assert!((t / 3600.0 - (t / 3600.0).round()).abs() < 1e-9, "{t}");
    }
    let (code, _, _) = caloris(&["run", model, "--output", "1h"], &[]);
    assert_eq!(code, 2);
}

#[test]
fn completions_and_the_manual_page_come_from_the_command_definitions() {
    let (code, out, err) = caloris(&["completions", "bash"], &[]);
    assert_eq!(code, 0, "{err}");
    for word in ["solve", "explain", "--deny-warnings", "--every"] {
        assert!(out.contains(word), "bash completion lacks {word}");
    }
    let (code, out, _) = caloris(&["completions", "zsh"], &[]);
    assert_eq!(code, 0);
    assert!(out.contains("#compdef caloris"), "{out}");
    let (code, out, _) = caloris(&["manpage"], &[]);
    assert_eq!(code, 0);
    assert!(
        out.starts_with(".ie") || out.contains(".TH caloris"),
        "{}",
        &out[..200.min(out.len())]
    );
    assert!(out.contains("solve"), "the manual lists the commands");
}

#[test]
fn every_command_help_ends_with_examples() {
    for cmd in [
        "check", "solve", "export", "fmt", "diff", "report", "explain", "run", "explore",
    ] {
        let (code, out, _) = caloris(&[cmd, "--help"], &[]);
        assert_eq!(code, 0);
        let tail = out
            .split("Examples:")
            .nth(1)
            .unwrap_or_else(|| panic!("{cmd}: {out}"));
        assert!(tail.contains(&format!("caloris {cmd} ")), "{cmd}: {tail}");
    }
}

#[test]
fn init_writes_each_template_once_and_it_checks_solves_and_is_formatted() {
    let dir = tempfile::tempdir().expect("temp dir");
    for t in ["wall", "pipe", "part"] {
        let path = dir.path().join(format!("{t}.heat"));
        let p = path.to_str().expect("utf-8 path");
        let (code, _, err) = caloris(&["init", t, p], &[]);
        assert_eq!(code, 0, "{err}");
        let text = std::fs::read_to_string(&path).expect("written");
        assert!(text.contains("CAUTION"), "{t}: templates carry the caution");
        let (code, out, err) = caloris(&["solve", p], &[]);
        assert_eq!(
            code, 0,
            "{t} must solve with every limit passing: {out}{err}"
        );
        assert!(!err.contains("warning"), "{t}: {err}");
        let (code, _, err) = caloris(&["fmt", "--check", p], &[]);
        assert_eq!(code, 0, "{t} must be in canonical layout: {err}");
        // A second init must not replace the analyst's file.
        std::fs::write(&path, "# mine\n").expect("write");
        let (code, _, err) = caloris(&["init", t, p], &[]);
        assert_eq!(code, 2);
        assert!(err.contains("already exists"), "{err}");
        assert_eq!(std::fs::read_to_string(&path).expect("kept"), "# mine\n");
    }
}

#[test]
fn the_material_library_is_built_in_and_importable_from_any_folder() {
    let (code, out, err) = caloris(&["materials"], &[]);
    assert_eq!(code, 0, "{err}");
    assert!(
        out.contains("mineral_wool") && out.contains("not design values"),
        "{out}"
    );
    let (code, out, _) = caloris(&["materials", "WOOL"], &[]);
    assert_eq!(code, 0);
    assert!(
        out.contains("glass_wool") && !out.contains("softwood"),
        "{out}"
    );
    let (code, _, _) = caloris(&["materials", "unobtainium"], &[]);
    assert_eq!(code, 2);
    // A model in a folder far from the repository imports it by name.
    let dir = tempfile::tempdir().expect("temp dir");
    let model = dir.path().join("shed.heat");
    std::fs::write(
        &model,
        "import \"caloris:materials\"\nnode room (fixed = 20 °C)\nnode out (fixed = 0 °C)\n\
         link wall: room to out layer(mineral_wool, thickness = 100 mm, area = 1 m^2)\n",
    )
    .expect("write");
    let (code, out, err) = caloris(
        &["solve", model.to_str().expect("utf-8"), "--format", "json"],
        &[],
    );
    assert_eq!(code, 0, "{err}");
    let v: serde_json::Value = serde_json::from_str(&out).expect("json");
    let q = v["links"][0]["heat_flow_W"].as_f64().expect("flow");
    // Fourier's law: q = k·A·ΔT/L with the library's k = 0.037 W/(m·K) for mineral wool.
    assert!((q - 0.037 * 1.0 * 20.0 / 0.1).abs() < 1e-9, "{q}");
    std::fs::write(&model, "import \"caloris:metals\"\n").expect("write");
    let (code, _, err) = caloris(&["check", model.to_str().expect("utf-8")], &[]);
    assert_eq!(code, 1);
    assert!(
        err.contains("E601") && err.contains("caloris:materials"),
        "{err}"
    );
}

#[test]
fn the_library_file_is_in_canonical_layout() {
    let (code, out, err) = caloris(&["fmt", "--check", "library/materials.heat"], &[]);
    assert_eq!(code, 0, "{out}{err}");
}
