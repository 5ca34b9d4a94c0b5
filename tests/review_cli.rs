//! The review commands end to end: `caloris fmt`, `caloris diff` (files and git revisions) and
//! their exit codes.

use assert_cmd::Command;
use std::path::{Path, PathBuf};

fn caloris() -> Command {
    let mut c = Command::cargo_bin("caloris").expect("binary built");
    c.env("NO_COLOR", "1");
    c
}

/// A fresh folder under the target directory for one test.
fn scratch(name: &str) -> PathBuf {
    let dir = Path::new(env!("CARGO_TARGET_TMPDIR")).join(name);
    let _ = std::fs::remove_dir_all(&dir);
    std::fs::create_dir_all(&dir).expect("scratch folder");
    dir
}

const MESSY: &str = "node a(fixed=20 °C)   # warm side\nnode   b (fixed = 0 °C)\n\n\n\nlink l:a to b resistance(2 K/W)\n";
const TIDY: &str = "node a (fixed = 20 °C)  # warm side\nnode b (fixed = 0 °C)\n\nlink l: a to b resistance(2 K/W)\n";

#[test]
fn fmt_check_exit_codes_and_listing() {
    let dir = scratch("fmt_check");
    let messy = dir.join("messy.heat");
    let tidy = dir.join("tidy.heat");
    std::fs::write(&messy, MESSY).expect("write");
    std::fs::write(&tidy, TIDY).expect("write");

    let out = caloris()
        .args(["fmt", "--check"])
        .arg(&tidy)
        .output()
        .expect("runs");
    assert_eq!(out.status.code(), Some(0));

    let out = caloris()
        .args(["fmt", "--check"])
        .arg(&messy)
        .arg(&tidy)
        .output()
        .expect("runs");
    assert_eq!(out.status.code(), Some(1));
    let listed = String::from_utf8_lossy(&out.stdout);
    assert!(
        listed.contains("messy.heat") && !listed.contains("tidy.heat"),
        "{listed}"
    );
    assert_eq!(
        std::fs::read_to_string(&messy).expect("read"),
        MESSY,
        "--check must not write"
    );

    // Without --check the file is rewritten, and then it checks clean.
    let out = caloris().arg("fmt").arg(&dir).output().expect("runs");
    assert_eq!(out.status.code(), Some(0));
    assert_eq!(std::fs::read_to_string(&messy).expect("read"), TIDY);
    let out = caloris()
        .args(["fmt", "--check"])
        .arg(&dir)
        .output()
        .expect("runs");
    assert_eq!(out.status.code(), Some(0));
}

#[test]
fn fmt_reads_stdin_and_refuses_broken_files() {
    let out = caloris()
        .args(["fmt", "-"])
        .write_stdin(MESSY)
        .output()
        .expect("runs");
    assert_eq!(out.status.code(), Some(0));
    assert_eq!(String::from_utf8_lossy(&out.stdout), TIDY);

    let out = caloris()
        .args(["fmt", "--check", "-"])
        .write_stdin(MESSY)
        .output()
        .expect("runs");
    assert_eq!(out.status.code(), Some(1));

    let dir = scratch("fmt_broken");
    let broken = dir.join("broken.heat");
    let text = "node a (fixed = )\n  node   b\n";
    std::fs::write(&broken, text).expect("write");
    let out = caloris().arg("fmt").arg(&broken).output().expect("runs");
    assert_eq!(out.status.code(), Some(1));
    assert!(String::from_utf8_lossy(&out.stderr).contains("E002"));
    assert_eq!(
        std::fs::read_to_string(&broken).expect("read"),
        text,
        "a file with errors is left as written"
    );

    let out = caloris()
        .arg("fmt")
        .arg(dir.join("missing.heat"))
        .output()
        .expect("runs");
    assert_eq!(out.status.code(), Some(2));
}

fn wall(thickness: &str) -> String {
    format!(
        "title \"Test wall\"\nmaterial board (k = 0.04 W/(m*K))\nnode warm (fixed = 20 °C)\nnode cold (fixed = 0 °C)\nlink w: warm to cold layer(board, thickness = {thickness}, area = 10 m^2)\nlimit loss: heat_flow(w) < 70 W\n"
    )
}

#[test]
fn diff_exit_code_says_whether_a_limit_fails_now() {
    let dir = scratch("diff_exit");
    let (thick, thin) = (dir.join("thick.heat"), dir.join("thin.heat"));
    // R = L/(k·A) (Fourier's law): 140 mm → 0.35 K/W, Q = 57.14 W; 100 mm → 0.25 K/W, Q = 80 W.
    std::fs::write(&thick, wall("140 mm")).expect("write");
    std::fs::write(&thin, wall("100 mm")).expect("write");

    let out = caloris()
        .arg("diff")
        .arg(&thick)
        .arg(&thin)
        .output()
        .expect("runs");
    assert_eq!(out.status.code(), Some(3), "limit flips to fail");
    let text = String::from_utf8_lossy(&out.stdout);
    assert!(text.contains("Now failing (was passing): loss"), "{text}");
    assert!(
        text.contains("140 mm") && text.contains("100 mm") && text.contains("+22.86 W"),
        "{text}"
    );

    let out = caloris()
        .arg("diff")
        .arg(&thin)
        .arg(&thick)
        .output()
        .expect("runs");
    assert_eq!(out.status.code(), Some(0), "limit flips to pass");

    let out = caloris()
        .args(["diff", "--format", "markdown"])
        .arg(&thin)
        .arg(&thick)
        .output()
        .expect("runs");
    let md = String::from_utf8_lossy(&out.stdout);
    assert!(
        md.starts_with("### Caloris diff:") && md.contains("| input | was | now | change |"),
        "{md}"
    );
    assert!(
        md.contains("| link `w` thickness | `100 mm` | `140 mm` | +40.0 % |"),
        "{md}"
    );

    let out = caloris()
        .args(["diff", "--format", "json"])
        .arg(&thin)
        .arg(&thick)
        .output()
        .expect("runs");
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).expect("json");
    let dq = v["comparison"]["links"][0]["delta_heat_flow"]
        .as_f64()
        .expect("number");
    assert!(
        (dq - (20.0 / 0.35 - 80.0)).abs() < 1e-9,
        "ΔQ = 20 K / 0.35 K/W − 80 W, got {dq}"
    );

    let broken = dir.join("broken.heat");
    std::fs::write(
        &broken,
        "node a (fixed = 20 °C)\nlink x: a to nowhere resistance(1 K/W)\n",
    )
    .expect("write");
    let out = caloris()
        .arg("diff")
        .arg(&thin)
        .arg(&broken)
        .output()
        .expect("runs");
    assert_eq!(out.status.code(), Some(1));
    let out = caloris().arg("diff").arg(&thin).output().expect("runs");
    assert_eq!(
        out.status.code(),
        Some(2),
        "one file without --rev is a usage error"
    );
}

fn git(dir: &Path, args: &[&str]) {
    let ok = std::process::Command::new("git")
        .arg("-C")
        .arg(dir)
        .args([
            "-c",
            "user.name=Test",
            "-c",
            "user.email=test@example.invalid",
            "-c",
            "commit.gpgsign=false",
        ])
        .args(args)
        .output()
        .expect("git runs")
        .status
        .success();
    assert!(ok, "git {args:?}");
}

#[test]
fn diff_rev_reads_the_old_model_and_its_imports_from_git() {
    let dir = scratch("diff_rev");
    git(&dir, &["init", "-q"]);
    std::fs::create_dir_all(dir.join("lib")).expect("mkdir");
    std::fs::create_dir_all(dir.join("models")).expect("mkdir");
    std::fs::write(
        dir.join("lib/materials.heat"),
        "material board (k = 0.04 W/(m*K))\n",
    )
    .expect("write");
    let model = "import \"../lib/materials.heat\"\nnode warm (fixed = 20 °C)\nnode cold (fixed = 0 °C)\nlink w: warm to cold layer(board, thickness = 100 mm, area = 10 m^2)\n";
    std::fs::write(dir.join("models/wall.heat"), model).expect("write");
    git(&dir, &["add", "."]);
    git(&dir, &["commit", "-q", "-m", "first"]);
    // Working copy: a better board in the library; the model file itself is unchanged.
    std::fs::write(
        dir.join("lib/materials.heat"),
        "material board (k = 0.032 W/(m*K))\n",
    )
    .expect("write");

    let out = caloris()
        .args(["diff", "--rev", "HEAD"])
        .arg(dir.join("models/wall.heat"))
        .output()
        .expect("runs");
    let text = String::from_utf8_lossy(&out.stdout);
    assert_eq!(
        out.status.code(),
        Some(0),
        "{text}\n{}",
        String::from_utf8_lossy(&out.stderr)
    );
    assert!(text.contains("HEAD:models/wall.heat"), "{text}");
    // k 0.04 → 0.032: R = L/(k·A) 0.25 → 0.3125 K/W, Q = 80 W → 64 W.
    assert!(
        text.contains("material board k") && text.contains("-20.0 %"),
        "{text}"
    );
    assert!(
        text.contains("80 W") && text.contains("64 W") && text.contains("-16 W"),
        "{text}"
    );

    let out = caloris()
        .args(["diff", "--rev", "no-such-rev"])
        .arg(dir.join("models/wall.heat"))
        .output()
        .expect("runs");
    assert_eq!(out.status.code(), Some(2));
}

/// Commit in `dir` with the shipped pre-commit hook installed; true when git accepted it.
fn commit_with_hook(dir: &Path, message: &str) -> (bool, String) {
    let out = std::process::Command::new("git")
        .arg("-C")
        .arg(dir)
        .args([
            "-c",
            "user.name=Test",
            "-c",
            "user.email=test@example.invalid",
            "-c",
            "commit.gpgsign=false",
        ])
        .args(["commit", "-q", "-m", message])
        .env("CALORIS", assert_cmd::cargo::cargo_bin("caloris"))
        .env("NO_COLOR", "1")
        .output()
        .expect("git runs");
    (
        out.status.success(),
        String::from_utf8_lossy(&out.stderr).into_owned(),
    )
}

#[test]
fn pre_commit_hook_stops_unformatted_broken_and_failing_models() {
    let dir = scratch("hook");
    git(&dir, &["init", "-q"]);
    let hook = dir.join(".git/hooks/pre-commit");
    std::fs::copy(
        Path::new(env!("CARGO_MANIFEST_DIR")).join("tools/pre-commit"),
        &hook,
    )
    .expect("install hook");
    let model = dir.join("wall.heat");

    std::fs::write(&model, MESSY).expect("write");
    git(&dir, &["add", "wall.heat"]);
    let (ok, err) = commit_with_hook(&dir, "messy");
    assert!(!ok && err.contains("wall.heat is not formatted"), "{err}");

    std::fs::write(&model, TIDY).expect("write");
    git(&dir, &["add", "wall.heat"]);
    let (ok, err) = commit_with_hook(&dir, "tidy");
    assert!(ok, "{err}");

    // Only the staged text counts: a broken working copy does not matter once staged text is good.
    std::fs::write(&model, format!("{TIDY}limit hot: temperature(a) < 10 °C\n")).expect("write");
    git(&dir, &["add", "wall.heat"]);
    std::fs::write(&model, "this is not a model\n").expect("write");
    let (ok, err) = commit_with_hook(&dir, "limit");
    assert!(!ok && err.contains("a design limit fails"), "{err}");

    std::fs::write(
        &model,
        format!("{TIDY}link m: a to nowhere resistance(1 K/W)\n"),
    )
    .expect("write");
    git(&dir, &["add", "wall.heat"]);
    let (ok, err) = commit_with_hook(&dir, "broken");
    assert!(
        !ok && err.contains("has errors") && err.contains("E102"),
        "{err}"
    );
    assert!(
        !std::fs::read_dir(&dir).expect("dir").flatten().any(|e| e
            .file_name()
            .to_string_lossy()
            .starts_with(".caloris-staged")),
        "temporary files left behind"
    );
}

#[test]
fn diff_table_and_markdown_snapshots() {
    let dir = scratch("diff_snapshots");
    std::fs::write(dir.join("thick.heat"), wall("140 mm")).expect("write");
    let thin = wall("100 mm").replace(
        "node cold (fixed = 0 °C)",
        "node cold (fixed = -4 °C)\nnode frame_core",
    );
    let thin = format!("{thin}link frame_a: warm to frame_core resistance(4 K/W)\nlink frame_b: frame_core to cold resistance(1 K/W)\n");
    std::fs::write(dir.join("thin.heat"), thin).expect("write");
    let run = |format: &str| {
        let out = caloris()
            .current_dir(&dir)
            .args(["diff", "thick.heat", "thin.heat", "--format", format])
            .output()
            .expect("runs");
        assert_eq!(out.status.code(), Some(3));
        String::from_utf8_lossy(&out.stdout).into_owned()
    };
    insta::assert_snapshot!("diff_table", run("table"));
    insta::assert_snapshot!("diff_markdown", run("markdown"));
}

#[test]
fn fmt_refusal_message_snapshot() {
    let dir = scratch("fmt_refusal");
    std::fs::write(
        dir.join("broken.heat"),
        "node a (fixed = 20 °C)\nlink b: a to  layer(k = 1 W/(m*K))\n",
    )
    .expect("write");
    let out = caloris()
        .current_dir(&dir)
        .args(["fmt", "broken.heat"])
        .output()
        .expect("runs");
    assert_eq!(out.status.code(), Some(1));
    insta::assert_snapshot!("fmt_refusal", String::from_utf8_lossy(&out.stderr));
}
