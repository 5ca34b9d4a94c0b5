//! The command line on models that once panicked or reported non-finite results as a success
//! (tests/cases/reliability/): a clear error in every output format, exit 1, never a panic.

use assert_cmd::Command;

fn solve(file: &str, format: &str) -> (i32, String, String) {
    let out = Command::cargo_bin("caloris")
        .expect("binary built")
        .current_dir(env!("CARGO_MANIFEST_DIR"))
        .args(["solve", file, "--format", format])
        .output()
        .expect("runs");
    (
        out.status.code().unwrap_or(-1),
        String::from_utf8_lossy(&out.stdout).into_owned(),
        String::from_utf8_lossy(&out.stderr).into_owned(),
    )
}

/// The error codes of a JSON report, and whether it carries any result.
fn json_errors(out: &str) -> (Vec<String>, bool) {
    let v: serde_json::Value = serde_json::from_str(out).expect("valid JSON");
    let codes = v["diagnostics"]
        .as_array()
        .expect("diagnostics")
        .iter()
        .filter(|d| d["severity"] == "error")
        .map(|d| d["code"].as_str().unwrap_or("").to_string())
        .collect();
    let solved = v["nodes"]
        .as_array()
        .is_some_and(|n| n.iter().any(|n| !n["temperature_K"].is_null()));
    (codes, solved)
}

#[test]
fn json_solve_of_a_buildup_link_with_an_error_reports_it_and_exits_1() {
    for (file, want) in [
        (
            "tests/cases/reliability/panic_solve_json_buildup_error.heat",
            vec!["E102"],
        ),
        (
            "tests/cases/reliability/panic_solve_json_output_rs_257.heat",
            vec!["E203", "E102"],
        ),
    ] {
        let (code, out, err) = solve(file, "json");
        assert_eq!(code, 1, "{file}: {err}");
        assert!(!err.contains("panicked"), "{file}: {err}");
        let (codes, solved) = json_errors(&out);
        assert_eq!(codes, want, "{file}");
        assert!(!solved, "{file}: no temperatures from a model with errors");
        // The table and CSV reports agree.
        for format in ["table", "csv"] {
            let (code, _, err) = solve(file, format);
            assert_eq!(code, 1, "{file} --format {format}: {err}");
            assert!(!err.contains("panicked"), "{file}: {err}");
        }
    }
}

#[test]
fn non_finite_inputs_and_results_exit_1_with_their_code_and_no_inf() {
    for (file, want) in [
        ("nonfinite_inf_literal_exit0.heat", "E004"),
        ("nonfinite_huge_fixed_temperature.heat", "E108"),
        ("nonfinite_subnormal_area_exit0.heat", "E108"),
        ("nonfinite_subnormal_area_garbage_solve.heat", "E108"),
        ("nonfinite_kt_table_subnormal_formula.heat", "E108"),
        ("ill_conditioned_round_off.heat", "E504"),
    ] {
        let path = format!("tests/cases/reliability/{file}");
        let (code, out, err) = solve(&path, "json");
        assert_eq!(code, 1, "{file}: {err}");
        let (codes, solved) = json_errors(&out);
        assert_eq!(codes, [want], "{file}");
        assert!(!solved, "{file}");
        assert!(!out.contains("inf K/W"), "{file}: {out}");
        let (code, out, err) = solve(&path, "table");
        assert_eq!(code, 1, "{file}");
        assert!(err.contains(&format!("[{want}]")), "{file}: {err}");
        assert!(
            !out.contains("inf") && !out.contains("NaN"),
            "{file}: {out}"
        );
    }
}
