//! Warnings reach every output: `solve` and `run` JSON, `explore` JSON and table (once over all points,
//! not once per point) and the Diagnostics section of `report.md`.

use assert_cmd::Command;
use serde_json::Value;
use std::path::PathBuf;

fn caloris() -> Command {
    let mut c = Command::cargo_bin("caloris").expect("binary built");
    c.current_dir(env!("CARGO_MANIFEST_DIR"));
    c
}

fn out(args: &[&str]) -> (i32, String, String) {
    let o = caloris().args(args).output().expect("runs");
    (
        o.status.code().unwrap_or(-1),
        String::from_utf8_lossy(&o.stdout).into_owned(),
        String::from_utf8_lossy(&o.stderr).into_owned(),
    )
}

fn scratch(name: &str) -> PathBuf {
    let dir = std::env::temp_dir().join(format!("caloris-warnings-{}", std::process::id()));
    std::fs::create_dir_all(&dir).expect("temp dir");
    dir.join(name)
}

/// A jacketed wire whose jacket raises the heat loss (W110) at every thickness swept.
const CABLE: &str = "param t = 2 mm\nmaterial pvc (k = 0.16 W/(m*K))\nnode core (fixed = 60 °C)\nnode air (fixed = 20 °C)\nbuildup jacketed {\n  jacket:  cylinder(pvc, thickness = t)\n  outside: film(h = 8 W/(m^2*K))\n}\nlink sleeved: core to air jacketed(inner_radius = 1 mm, length = 1 m)\n";

#[test]
fn explore_reports_each_warning_once_with_the_points_that_gave_it() {
    let file = scratch("cable_study.heat");
    std::fs::write(&file, CABLE).expect("written");
    let f = file.to_str().expect("utf-8 path");
    let args = [
        "explore",
        f,
        "--over",
        "t=1mm..3mm:5",
        "--track",
        "heat_flow(sleeved)",
    ];
    let (code, json, _) = out(&[&args[..], &["--format", "json"]].concat());
    assert_eq!(code, 0);
    let v: Value = serde_json::from_str(&json).expect("json");
    let w = v["warnings"].as_array().expect("warnings");
    assert_eq!(w.len(), 1, "{w:?}");
    assert_eq!(w[0]["code"], "W110");
    assert_eq!(w[0]["points"], 5);
    assert_eq!(
        (w[0]["line"].as_u64(), w[0]["column"].as_u64()),
        (Some(6), Some(12))
    );
    let (_, table, _) = out(&args);
    assert_eq!(table.matches("W110 at").count(), 1, "{table}");
    assert!(table.contains("(5 of 5 points)"), "{table}");
}

#[test]
fn solve_run_and_report_carry_the_warnings() {
    let cable = "tests/cases/reference/shell_critical_radius_cable.heat";
    let (_, json, _) = out(&["solve", cable, "--format", "json"]);
    let v: Value = serde_json::from_str(&json).expect("json");
    assert!(v["diagnostics"]
        .as_array()
        .expect("diagnostics")
        .iter()
        .any(|d| d["code"] == "W110"));
    let dir = scratch("cable_report");
    let (code, _, _) = out(&["report", cable, "-o", dir.to_str().expect("utf-8")]);
    assert_eq!(code, 0);
    let md = std::fs::read_to_string(dir.join("report.md")).expect("report");
    let section = md
        .split("## Diagnostics")
        .nth(1)
        .expect("a Diagnostics section");
    assert!(
        section
            .split("## Inputs")
            .next()
            .unwrap_or("")
            .contains("warning W110"),
        "{md}"
    );
    // A transient run's JSON has its diagnostics too (empty for a clean model).
    let (_, json, _) = out(&[
        "run",
        "examples/allotment_standpipe_frost.heat",
        "--format",
        "json",
    ]);
    let v: Value = serde_json::from_str(&json).expect("run json");
    assert!(v["diagnostics"].is_array(), "{v}");
}
