//! End-to-end tests of the `caloris` command line: exit codes, output formats, unit systems,
//! colour rules and imports, run on the built binary as an analyst or a CI job would.

use assert_cmd::Command;
use std::path::Path;

fn caloris() -> Command {
    let mut c = Command::cargo_bin("caloris").expect("binary built");
    c.current_dir(env!("CARGO_MANIFEST_DIR"));
    c
}

fn stdout_of(args: &[&str]) -> (i32, String, String) {
    let out = caloris().args(args).output().expect("runs");
    (
        out.status.code().unwrap_or(-1),
        String::from_utf8_lossy(&out.stdout).into_owned(),
        String::from_utf8_lossy(&out.stderr).into_owned(),
    )
}

#[test]
fn every_example_solves_with_exit_code_zero() {
    for e in std::fs::read_dir(Path::new(env!("CARGO_MANIFEST_DIR")).join("examples"))
        .expect("examples")
        .flatten()
    {
        let p = e.path();
        if p.extension().is_some_and(|x| x == "heat") {
            let rel = p
                .strip_prefix(env!("CARGO_MANIFEST_DIR"))
                .expect("inside")
                .display()
                .to_string();
            let (code, out, err) = stdout_of(&["solve", &rel]);
            // An example may show a failing limit on purpose (the frost example's steady state);
            // then its text says so, and the exit code must be the limit-failed one.
            let text = std::fs::read_to_string(&p).expect("readable");
            let wants_failure = text
                .lines()
                .any(|l| l.starts_with("# expect: limit") && l.ends_with(" fail"));
            assert_eq!(code, if wants_failure { 3 } else { 0 }, "{rel}: {err}");
            assert!(
                out.contains("confirm against local codes and licensed practice"),
                "{rel}: caution missing"
            );
            let (code, _, err) = stdout_of(&["check", &rel]);
            assert_eq!(code, 0, "check {rel}: {err}");
        }
    }
}

#[test]
fn json_output_follows_the_documented_contract() {
    let (code, out, _) = stdout_of(&[
        "solve",
        "examples/garden_office_wall.heat",
        "--format",
        "json",
    ]);
    assert_eq!(code, 0);
    let v: serde_json::Value = serde_json::from_str(&out).expect("valid JSON");
    for key in ["nodes", "links", "limits", "diagnostics"] {
        assert!(v[key].is_array(), "`{key}` must be an array");
    }
    let room = v["nodes"]
        .as_array()
        .and_then(|n| n.iter().find(|n| n["name"] == "room"))
        .expect("room node");
    // 20 °C held fixed: 293.15 K by the definition of the Celsius scale (NIST SP 811).
    assert!((room["temperature_K"].as_f64().expect("number") - 293.15).abs() < 1e-9);
    assert_eq!(room["fixed"], true);
    assert!(room["heat_load_W"].is_number());
    for l in v["links"].as_array().expect("links") {
        for key in ["name", "from", "to"] {
            assert!(l[key].is_string(), "link needs `{key}`: {l}");
        }
        assert!(l["heat_flow_W"].is_number() && l["resistance_K_per_W"].as_f64().expect("R") > 0.0);
    }
    for l in v["limits"].as_array().expect("limits") {
        assert!(l["passed"].is_boolean() && l["margin"].is_number(), "{l}");
    }
    // Heat flows out of the room through the wall and window: outward flows are positive from
    // `room` towards `outdoor` (sign convention of docs/json.md).
    let north = v["links"]
        .as_array()
        .and_then(|n| n.iter().find(|n| n["name"] == "north.inside"))
        .expect("north.inside");
    assert_eq!(north["from"], "room");
    assert!(north["heat_flow_W"].as_f64().expect("flow") > 0.0);
}

#[test]
fn a_model_with_errors_exits_1_and_points_into_the_file() {
    let (code, out, err) = stdout_of(&["solve", "tests/cases/errors/unknown_names.heat"]);
    assert_eq!(code, 1);
    assert!(out.is_empty() || !out.contains("Design limits"));
    assert!(
        err.contains("E102")
            && err.contains("unknown_names.heat:6:22")
            && err.contains("did you mean `plant_room`?"),
        "{err}"
    );
    let (code, out, _) = stdout_of(&[
        "solve",
        "tests/cases/errors/unknown_names.heat",
        "--format",
        "json",
    ]);
    assert_eq!(code, 1);
    let v: serde_json::Value = serde_json::from_str(&out).expect("JSON even with errors");
    assert_eq!(v["diagnostics"][0]["code"], "E102");
    assert_eq!(v["diagnostics"][0]["line"], 6);
    let (code, _, _) = stdout_of(&["check", "tests/cases/errors/parse_recovery.heat"]);
    assert_eq!(code, 1);
}

#[test]
fn a_failing_design_limit_exits_3() {
    let (code, out, _) = stdout_of(&["solve", "tests/cases/reference/limits_pass_fail.heat"]);
    assert_eq!(code, 3, "{out}");
    assert!(out.contains("FAIL") || out.contains("fail"), "{out}");
    // `check` does not solve, so it cannot judge limits: the model itself is sound.
    let (code, _, _) = stdout_of(&["check", "tests/cases/reference/limits_pass_fail.heat"]);
    assert_eq!(code, 0);
}

#[test]
fn usage_errors_exit_2() {
    let (code, _, err) = stdout_of(&["solve", "no/such/file.heat"]);
    assert_eq!(code, 2, "{err}");
    assert!(err.contains("no/such/file.heat"));
    let (code, _, _) = stdout_of(&["solve", "examples/led_lamp.heat", "--format", "yaml"]);
    assert_eq!(code, 2);
    let (code, _, _) = stdout_of(&["frobnicate"]);
    assert_eq!(code, 2);
}

#[test]
fn us_units_report_fahrenheit_and_btu() {
    let (code, out, _) = stdout_of(&["solve", "examples/garden_office_wall.heat", "--units", "us"]);
    assert_eq!(code, 0);
    // 20 °C = 68 °F exactly (NIST SP 811: t/°F = 1.8·t/°C + 32).
    assert!(out.contains("68 °F"), "{out}");
    assert!(out.contains("Btu/h"), "{out}");
}

#[test]
fn csv_output_has_a_header_and_one_row_per_result() {
    let (code, out, _) = stdout_of(&["solve", "examples/led_lamp.heat", "--format", "csv"]);
    assert_eq!(code, 0);
    let first = out.lines().next().expect("header");
    assert!(first.contains(','), "{first}");
    assert!(out.contains("junction"));
}

#[test]
fn no_colour_when_piped_or_with_no_color() {
    let out = caloris()
        .args(["check", "tests/cases/errors/units_mismatch.heat"])
        .env("NO_COLOR", "1")
        .output()
        .expect("runs");
    assert!(!String::from_utf8_lossy(&out.stderr).contains('\u{1b}'));
    let out = caloris()
        .args(["check", "tests/cases/errors/units_mismatch.heat"])
        .env_remove("NO_COLOR")
        .output()
        .expect("runs");
    // Not a terminal: still no escape codes.
    assert!(!String::from_utf8_lossy(&out.stderr).contains('\u{1b}'));
}

#[test]
fn standard_input_is_read_with_a_dash() {
    let model =
        "node a (fixed = 30 °C)\nnode b (fixed = 10 °C)\nlink r: a to b resistance(4 K/W)\n";
    let out = caloris()
        .args(["solve", "-", "--format", "json"])
        .write_stdin(model)
        .output()
        .expect("runs");
    assert_eq!(out.status.code(), Some(0));
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).expect("json");
    // Ohm's-law analogue: Q = ΔT / R = 20 K / 4 K/W = 5 W.
    assert!((v["links"][0]["heat_flow_W"].as_f64().expect("flow") - 5.0).abs() < 1e-12);
}

#[test]
fn garbage_input_never_panics() {
    let inputs: [&[u8]; 6] = [
        b"\xff\xfe\x00binary",
        b"link",
        b"node (((((((((((",
        b"param x = 1 m ^ ^ 2\nparam y = ((((",
        b"buildup w {\n a: layer(",
        b"limit l: temperature(",
    ];
    for input in inputs {
        let out = caloris()
            .args(["check", "-"])
            .write_stdin(input)
            .output()
            .expect("runs");
        let code = out.status.code();
        assert!(
            code == Some(1) || code == Some(2),
            "input {input:?} gave {code:?}: {}",
            String::from_utf8_lossy(&out.stderr)
        );
        assert!(!String::from_utf8_lossy(&out.stderr).contains("panicked"));
    }
}

#[test]
fn imports_resolve_relative_to_the_importing_file_and_stay_inside_the_project() {
    let dir = tempfile::tempdir().expect("tempdir");
    let root = dir.path().join("project");
    std::fs::create_dir_all(root.join(".git")).expect("mkdir");
    std::fs::create_dir_all(root.join("lib")).expect("mkdir");
    std::fs::create_dir_all(root.join("models")).expect("mkdir");
    std::fs::write(
        root.join("lib/materials.heat"),
        "material cork (k = 0.045 W/(m*K))\n",
    )
    .expect("write");
    std::fs::write(
        root.join("models/hut.heat"),
        "import \"../lib/materials.heat\"\nnode in (fixed = 18 °C)\nnode out (fixed = 3 °C)\nlink w: in to out layer(cork, thickness = 45 mm, area = 1 m^2)\n",
    )
    .expect("write");
    let out = caloris()
        .current_dir(&root)
        .args(["solve", "models/hut.heat", "--format", "json"])
        .output()
        .expect("runs");
    assert_eq!(
        out.status.code(),
        Some(0),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).expect("json");
    // Fourier's law: Q = k·A·ΔT/L = 0.045 · 1 · 15 / 0.045 = 15 W.
    assert!((v["links"][0]["heat_flow_W"].as_f64().expect("flow") - 15.0).abs() < 1e-9);

    // A cycle of imports is reported, not followed forever.
    std::fs::write(root.join("lib/a.heat"), "import \"b.heat\"\n").expect("write");
    std::fs::write(root.join("lib/b.heat"), "import \"a.heat\"\n").expect("write");
    std::fs::write(
        root.join("models/loop.heat"),
        "import \"../lib/a.heat\"\nnode x (fixed = 1 °C)\n",
    )
    .expect("write");
    let out = caloris()
        .current_dir(&root)
        .args(["check", "models/loop.heat"])
        .output()
        .expect("runs");
    assert_eq!(out.status.code(), Some(1));
    assert!(String::from_utf8_lossy(&out.stderr).contains("E602"));

    // Nothing outside the project root is read.
    std::fs::write(
        dir.path().join("secret.heat"),
        "material x (k = 1 W/(m*K))\n",
    )
    .expect("write");
    std::fs::write(
        root.join("models/escape.heat"),
        "import \"../../secret.heat\"\nnode x (fixed = 1 °C)\n",
    )
    .expect("write");
    let out = caloris()
        .current_dir(&root)
        .args(["check", "models/escape.heat"])
        .output()
        .expect("runs");
    assert_eq!(out.status.code(), Some(1));
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(
        err.contains("E601") && err.contains("outside the project"),
        "{err}"
    );
}
