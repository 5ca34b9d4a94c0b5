//! The diff shown in README.md and the example report under docs/example-report are real
//! output of the current build; these tests fail when they go stale and say how to refresh.

use assert_cmd::Command;
use std::path::Path;

fn root() -> &'static Path {
    Path::new(env!("CARGO_MANIFEST_DIR"))
}

fn caloris() -> Command {
    let mut c = Command::cargo_bin("caloris").expect("binary built");
    c.env("NO_COLOR", "1").current_dir(root());
    c
}

#[test]
fn readme_shows_the_real_diff() {
    let readme = std::fs::read_to_string(root().join("README.md")).expect("README");
    let start = readme
        .find("```markdown\n### Caloris diff:")
        .expect("README has the diff block")
        + "```markdown\n".len();
    let len = readme[start..].find("```\n").expect("block closed");
    let shown = &readme[start..start + len];
    let out = caloris()
        .args([
            "diff",
            "examples/garden_office_wall.heat",
            "docs/example-diff/thinner_insulation.heat",
            "--format",
            "markdown",
        ])
        .output()
        .expect("runs");
    assert_eq!(
        out.status.code(),
        Some(3),
        "README says the limit flip gives exit code 3"
    );
    assert_eq!(
        shown,
        String::from_utf8_lossy(&out.stdout),
        "README's diff is stale: paste the output of the command above it"
    );
}

/// The energy-balance residual is round-off and may differ from machine to machine.
fn without_round_off(report: &str) -> String {
    report
        .lines()
        .filter(|l| !l.contains("worst residual"))
        .collect::<Vec<_>>()
        .join("\n")
}

#[test]
fn example_report_is_the_real_output() {
    let dir = Path::new(env!("CARGO_TARGET_TMPDIR")).join("example_report_fresh");
    let _ = std::fs::remove_dir_all(&dir);
    caloris()
        .args(["report", "examples/garden_office_wall.heat", "-o"])
        .arg(&dir)
        .assert()
        .code(0);
    let refresh = "docs/example-report is stale: run `cargo run -- report examples/garden_office_wall.heat -o docs/example-report`";
    for f in ["report.md", "profile.svg", "network.svg"] {
        let committed = std::fs::read_to_string(root().join("docs/example-report").join(f))
            .expect("committed file");
        let fresh = std::fs::read_to_string(dir.join(f)).expect("fresh file");
        assert_eq!(
            without_round_off(&committed),
            without_round_off(&fresh),
            "{f}: {refresh}"
        );
    }
}
