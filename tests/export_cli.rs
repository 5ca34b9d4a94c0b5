//! `caloris export`: the Matrix Market files are read back here (the format as the NIST Matrix
//! Market exchange format defines it: a `%%MatrixMarket` banner, `%` comments, a size line,
//! 1-based entries; a symmetric matrix stores its lower triangle), solved with a small dense
//! solver written in this file (Gaussian elimination with partial pivoting, the textbook
//! method), and the answer compared with what `caloris solve --format json` reports.

use assert_cmd::Command;
use std::collections::HashMap;
use std::path::Path;

fn caloris(args: &[&str]) -> (i32, String, String) {
    let mut c = Command::cargo_bin("caloris").expect("binary built");
    c.current_dir(env!("CARGO_MANIFEST_DIR"));
    let out = c.args(args).output().expect("runs");
    (
        out.status.code().unwrap_or(-1),
        String::from_utf8_lossy(&out.stdout).into_owned(),
        String::from_utf8_lossy(&out.stderr).into_owned(),
    )
}

/// A matrix read from a coordinate file, dense, with its banner and comment lines.
struct Read {
    banner: String,
    comments: Vec<String>,
    dense: Vec<Vec<f64>>,
}

fn data_lines(text: &str) -> (String, Vec<String>, Vec<&str>) {
    let mut lines = text.lines();
    let banner = lines.next().unwrap_or_default().to_string();
    let mut comments = Vec::new();
    let mut data = Vec::new();
    for l in lines {
        if let Some(c) = l.strip_prefix('%') {
            comments.push(c.to_string());
        } else if !l.trim().is_empty() {
            data.push(l);
        }
    }
    (banner, comments, data)
}

fn numbers(line: &str) -> Vec<f64> {
    line.split_whitespace()
        .map(|w| {
            w.parse::<f64>()
                .unwrap_or_else(|_| panic!("not a number: {w}"))
        })
        .collect()
}

fn read_coordinate(path: &Path) -> Read {
    let text = std::fs::read_to_string(path).expect("A.mtx written");
    let (banner, comments, data) = data_lines(&text);
    let symmetric = banner.ends_with(" symmetric");
    assert!(
        banner.starts_with("%%MatrixMarket matrix coordinate real "),
        "{banner}"
    );
    let size = numbers(data[0]);
    let (n, nnz) = (size[0] as usize, size[2] as usize);
    assert_eq!(size[0], size[1], "square");
    assert_eq!(data.len() - 1, nnz, "the size line counts the entries");
    let mut dense = vec![vec![0.0; n]; n];
    for l in &data[1..] {
        let v = numbers(l);
        let (i, j) = (v[0] as usize - 1, v[1] as usize - 1);
        if symmetric {
            assert!(i >= j, "a symmetric file holds the lower triangle: {l}");
            dense[j][i] += v[2];
            if i != j {
                dense[i][j] += v[2];
            }
        } else {
            dense[i][j] += v[2];
        }
    }
    Read {
        banner,
        comments,
        dense,
    }
}

fn read_array(path: &Path) -> Vec<f64> {
    let text = std::fs::read_to_string(path).expect("b.mtx written");
    let (banner, _, data) = data_lines(&text);
    assert_eq!(banner, "%%MatrixMarket matrix array real general");
    let size = numbers(data[0]);
    assert_eq!(size[1], 1.0);
    let b: Vec<f64> = data[1..].iter().map(|l| numbers(l)[0]).collect();
    assert_eq!(b.len(), size[0] as usize);
    b
}

/// Gaussian elimination with partial pivoting.
fn dense_solve(mut a: Vec<Vec<f64>>, mut b: Vec<f64>) -> Vec<f64> {
    let n = b.len();
    for k in 0..n {
        let p = (k..n)
            .max_by(|&x, &y| a[x][k].abs().total_cmp(&a[y][k].abs()))
            .expect("a row");
        a.swap(k, p);
        b.swap(k, p);
        let (upper, lower) = a.split_at_mut(k + 1);
        let pivot = &upper[k];
        for (i, row) in lower.iter_mut().enumerate() {
            let f = row[k] / pivot[k];
            for (x, p) in row[k..].iter_mut().zip(&pivot[k..]) {
                *x -= f * p;
            }
            b[k + 1 + i] -= f * b[k];
        }
    }
    let mut x = vec![0.0; n];
    for i in (0..n).rev() {
        let s: f64 = (i + 1..n).map(|j| a[i][j] * x[j]).sum();
        x[i] = (b[i] - s) / a[i][i];
    }
    x
}

fn row_nodes(dir: &Path) -> Vec<String> {
    let text = std::fs::read_to_string(dir.join("nodes.csv")).expect("nodes.csv written");
    let mut lines = text.lines();
    assert_eq!(lines.next(), Some("row,node"));
    lines
        .enumerate()
        .map(|(k, l)| {
            let (row, name) = l.split_once(',').expect("two fields");
            assert_eq!(row, (k + 1).to_string(), "rows counted from 1");
            name.to_string()
        })
        .collect()
}

fn solved_temperatures(model: &str, extra: &[&str]) -> HashMap<String, f64> {
    let mut args = vec!["solve", model, "--format", "json"];
    args.extend_from_slice(extra);
    let (code, out, err) = caloris(&args);
    assert!(code == 0 || code == 3, "{err}");
    let v: serde_json::Value = serde_json::from_str(&out).expect("JSON");
    v["nodes"]
        .as_array()
        .expect("nodes")
        .iter()
        .map(|n| {
            (
                n["name"].as_str().expect("name").to_string(),
                n["temperature_K"].as_f64().expect("temperature"),
            )
        })
        .collect()
}

/// Export, solve the files, and compare with the tool's own solve; returns the matrix read.
fn export_and_compare(model: &str, extra: &[&str]) -> Read {
    let dir = tempfile::tempdir().expect("temp dir");
    let out = dir.path().join("system");
    let out_s = out.to_str().expect("utf-8 path");
    let mut args = vec!["export", model, "-o", out_s];
    args.extend_from_slice(extra);
    let (code, _, err) = caloris(&args);
    assert_eq!(code, 0, "{err}");
    let a = read_coordinate(&out.join("A.mtx"));
    let b = read_array(&out.join("b.mtx"));
    let names = row_nodes(&out);
    assert_eq!(names.len(), b.len());
    let x = dense_solve(a.dense.clone(), b);
    let solved = solved_temperatures(model, extra);
    for (name, t) in names.iter().zip(&x) {
        let reported = solved[name];
        assert!(
            ((t - reported) / reported).abs() <= 1e-9,
            "{model} {name}: the exported system gives {t} K, solve reports {reported} K"
        );
    }
    a
}

#[test]
fn a_linear_model_exports_its_symmetric_conductance_matrix() {
    // Loads and fixed temperatures both feed b (the heat balance of every free node).
    let a = export_and_compare("examples/led_lamp.heat", &[]);
    assert!(a.banner.ends_with(" symmetric"), "{}", a.banner);
    assert!(
        a.comments.iter().any(|c| c.contains("conductance matrix")),
        "{:?}",
        a.comments
    );
    // A conductance matrix has positive diagonals and rows that sum to at least zero (the
    // links to fixed nodes add only to the diagonal): the thermal form of Kirchhoff's law.
    for (i, row) in a.dense.iter().enumerate() {
        assert!(row[i] > 0.0);
        assert!(row.iter().sum::<f64>() >= -1e-9 * row[i]);
    }
    export_and_compare("examples/garden_office_wall.heat", &[]);
}

#[test]
fn set_and_case_change_the_exported_system_as_they_change_the_solve() {
    export_and_compare("examples/led_lamp.heat", &["--set", "sink_area=0.03 m^2"]);
    export_and_compare(
        "examples/allotment_standpipe_frost.heat",
        &["--case", "windy_night"],
    );
}

#[test]
fn a_nonlinear_model_exports_its_jacobian_at_the_solution_and_says_so() {
    // Two k(T) layers in series with a film: the Jacobian's off-diagonal slopes differ at the
    // two ends of a k(T) link (dk/dT·ΔT/2 added at one, taken at the other), so it is written
    // whole; with b = J·T − F(T) its solution is the solved temperatures again.
    let dir = tempfile::tempdir().expect("temp dir");
    let model = dir.path().join("kiln.heat");
    std::fs::write(
        &model,
        "material firebrick (k = 0.12 W/(m*K), k_slope = 2.5e-4 W/(m*K^2), k_at = 20 °C)\n\
         node kiln (fixed = 900 °C)\nnode yard (fixed = 25 °C)\nnode middle\nnode outer\n\
         link hot_course:  kiln to middle layer(firebrick, thickness = 60 mm, area = 1.8 m^2)\n\
         link cool_course: middle to outer layer(firebrick, thickness = 55 mm, area = 1.8 m^2)\n\
         link film:        outer to yard film(h = 12 W/(m^2*K), area = 1.8 m^2)\n",
    )
    .expect("model written");
    let a = export_and_compare(model.to_str().expect("utf-8 path"), &[]);
    assert!(
        a.comments.iter().any(|c| c.contains("Jacobian")),
        "{:?}",
        a.comments
    );
    assert!(a.banner.ends_with(" general"), "{}", a.banner);
    assert!(a.dense[0][1] != a.dense[1][0], "{:?}", a.dense);
    // The single k(T) slab of the reference case is one row, symmetric by nature.
    let a = export_and_compare("tests/cases/reference/kt_linear_slab.heat", &[]);
    assert!(a.comments.iter().any(|c| c.contains("Jacobian")));
}

#[test]
fn a_model_with_errors_gives_the_diagnostics_and_exit_code_of_check() {
    let bad = "tests/cases/errors/unknown_names.heat";
    let dir = tempfile::tempdir().expect("temp dir");
    let out = dir.path().join("never");
    let (code, stdout, err) = caloris(&["export", bad, "-o", out.to_str().expect("utf-8")]);
    let (check_code, _, check_err) = caloris(&["check", bad]);
    assert_eq!(code, check_code);
    assert_eq!(code, 1);
    assert_eq!(err, check_err);
    assert!(stdout.is_empty());
    assert!(!out.exists(), "nothing is written for a model with errors");
    let (code, _, err) = caloris(&[
        "export",
        "examples/led_lamp.heat",
        "-o",
        "x",
        "--case",
        "no",
    ]);
    assert_eq!(code, 2, "{err}");
    assert!(err.contains("no case `no`"), "{err}");
}
