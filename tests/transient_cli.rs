//! `caloris run` and `caloris explore` from the outside: reports, formats, exit codes, charts and
//! Ctrl-C.

use assert_cmd::Command;
use std::path::{Path, PathBuf};

fn caloris() -> Command {
    let mut c = Command::cargo_bin("caloris").expect("binary");
    c.current_dir(env!("CARGO_MANIFEST_DIR"))
        .env("NO_COLOR", "1");
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
    let dir = std::env::temp_dir().join(format!("caloris-cli-{}", std::process::id()));
    std::fs::create_dir_all(&dir).expect("temp dir");
    dir.join(name)
}

const STANDPIPE: &str = "examples/allotment_standpipe_frost.heat";
const TANK: &str = "examples/hot_water_tank_jacket.heat";

#[test]
fn run_reports_the_frost_night() {
    let (code, stdout, stderr) = out(&["run", STANDPIPE, "--cross", "pipe=0°C"]);
    assert_eq!(
        code, 3,
        "the water falls below 0 °C, so the limit fails: {stderr}"
    );
    assert!(stderr.contains("W701"), "{stderr}");
    // The residual is round-off (checked to be tiny in run_json_and_csv_carry_the_whole_series);
    // its digits depend on the CPU's SIMD kernels, so the snapshot leaves them out.
    let stable: String = stdout
        .lines()
        .map(|l| {
            if l.contains("balance residual") {
                let cut = l.trim_end().rfind("  ").map_or(l.len(), |i| i + 2);
                format!("{}[round-off] J", &l[..cut])
            } else {
                l.to_string()
            }
        })
        .collect::<Vec<_>>()
        .join("\n");
    insta::assert_snapshot!(stable);
}

#[test]
fn run_json_and_csv_carry_the_whole_series() {
    let (code, stdout, _) = out(&["run", STANDPIPE, "--format", "json"]);
    assert_eq!(code, 3);
    let v: serde_json::Value = serde_json::from_str(&stdout).expect("json");
    let times = v["times_s"].as_array().expect("times");
    assert_eq!(times.len(), 61, "15 h every 15 min, both ends included");
    let first = v["limits"][0]["first_failure_s"].as_f64().expect("fails");
    assert!((first / 3600.0 - 5.0).abs() < 0.05, "{first}");
    let e = &v["energy"];
    assert!(
        e["residual_J"].as_f64().expect("residual").abs()
            < 1e-6 * e["stored_J"].as_f64().expect("stored").abs()
    );
    let water = v["nodes"]
        .as_array()
        .expect("nodes")
        .iter()
        .find(|n| n["name"] == "water")
        .expect("water");
    assert_eq!(
        water["temperatures_K"].as_array().expect("series").len(),
        61
    );
    assert!((water["initial_K"].as_f64().expect("initial") - 282.15).abs() < 1e-9);

    let (code, stdout, _) = out(&["run", STANDPIPE, "--format", "csv", "--units", "us"]);
    assert_eq!(code, 3);
    let mut lines = stdout.lines();
    assert_eq!(lines.next(), Some("time [h],outdoor [°F],water [°F],pipe [°F],lagging_surface [°F],heat from outdoor [Btu/h]"));
    let first_row: Vec<f64> = lines
        .next()
        .expect("row")
        .split(',')
        .map(|x| x.parse().expect("number"))
        .collect();
    assert_eq!(first_row[0], 0.0);
    assert!(
        (first_row[2] - 48.2).abs() < 1e-9,
        "9 °C = 48.2 °F: {first_row:?}"
    );
    assert_eq!(stdout.lines().count(), 62);
}

#[test]
fn run_settings_from_the_command_line() {
    let (code, stdout, _) = out(&[
        "run",
        STANDPIPE,
        "--duration",
        "3h",
        "--step",
        "1min",
        "--at",
        "1h,2h",
        "--case",
        "windy_night",
    ]);
    assert_eq!(
        code, 0,
        "in 3 h the water stays above 0 °C even on a windy night"
    );
    assert!(
        stdout.contains("fixed step 60 s: 180 steps (0 rejected), 1 factorisation;"),
        "{stdout}"
    );
    let rows: Vec<&str> = stdout
        .lines()
        .skip_while(|l| !l.starts_with("Temperatures"))
        .skip(3)
        .take_while(|l| !l.trim().is_empty())
        .collect();
    let times: Vec<&str> = rows
        .iter()
        .filter_map(|r| r.split_whitespace().next())
        .collect();
    assert_eq!(times, ["0", "1", "2", "3"], "{stdout}");
}

#[test]
fn run_usage_errors_say_what_to_write() {
    let (code, _, stderr) = out(&["run", TANK]);
    assert_eq!(code, 2);
    insta::assert_snapshot!("run_without_a_transient", stderr);
    let (code, _, stderr) = out(&["run", STANDPIPE, "--set", "lagg=20mm"]);
    assert_eq!(code, 2);
    assert!(
        stderr.contains("no parameter `lagg`; did you mean `lagging`?"),
        "{stderr}"
    );
    let (code, _, stderr) = out(&["run", STANDPIPE, "--cross", "water=3W"]);
    assert_eq!(code, 2);
    assert!(
        stderr.contains("the level must be a temperature"),
        "{stderr}"
    );
    let (code, _, stderr) = out(&["run", STANDPIPE, "--case", "stormy"]);
    assert_eq!(code, 2);
    assert!(
        stderr.contains("the model's cases are calm_night, windy_night"),
        "{stderr}"
    );
}

#[test]
fn exploring_the_jacket_thickness() {
    let (code, stdout, stderr) = out(&[
        "explore",
        TANK,
        "--over",
        "jacket=10mm..120mm:12",
        "--case",
        "all",
        "--track",
        "temperature(wall.foam)",
    ]);
    assert_eq!(code, 3, "{stderr}");
    insta::assert_snapshot!(stdout);
}

#[test]
fn explore_json_agrees_with_series_resistances() {
    let (code, stdout, _) = out(&[
        "explore",
        TANK,
        "--over",
        "jacket=50mm",
        "--case",
        "cold_cupboard",
        "--format",
        "json",
    ]);
    assert_eq!(code, 0);
    let v: serde_json::Value = serde_json::from_str(&stdout).expect("json");
    let q = v["points"][0]["outcome"]["limits"][0]["value"]
        .as_f64()
        .expect("heat flow");
    // Series resistances per area (Fourier's law for the layers, Newton's law of cooling for the
    // films) over the cylinder's area π·0.45·1.0 + 2·π·0.225² m², with 60 − 12 = 48 K across.
    // The films are computed: their h (and the outer film's radiation, as an equivalent h over
    // its temperature difference) are read from the steady solve of the same point.
    let (code, solved, err) = out(&[
        "solve",
        TANK,
        "--case",
        "cold_cupboard",
        "--set",
        "jacket=50mm",
        "--format",
        "json",
    ]);
    assert_eq!(code, 0, "{err}");
    let s: serde_json::Value = serde_json::from_str(&solved).expect("json");
    let find = |list: &str, name: &str| -> serde_json::Value {
        s[list]
            .as_array()
            .expect("list")
            .iter()
            .find(|x| x["name"] == name)
            .expect("named")
            .clone()
    };
    let num = |v: &serde_json::Value| v.as_f64().expect("number");
    let area = std::f64::consts::PI * 0.45 + 2.0 * std::f64::consts::PI * 0.225 * 0.225;
    let h_in = num(&find("links", "wall.inner_film")["film"]["h_W_per_m2K"]);
    let outer = find("links", "wall.outer_film")["film"].clone();
    let skin = num(&find("nodes", "wall.foam")["temperature_K"]) - (12.0 + 273.15);
    let h_out = num(&outer["h_W_per_m2K"]) + num(&outer["radiation_W"]) / (area * skin);
    let r = 1.0 / h_in + 0.002 / 50.0 + 0.050 / 0.028 + 1.0 / h_out;
    let expected = 48.0 * area / r;
    assert!((q - expected).abs() < 1e-9 * expected, "{q} vs {expected}");
    assert_eq!(v["points"][0]["all_limits_pass"], true);
}

#[test]
fn exploring_a_transient_run_and_its_chart() {
    let svg = scratch("lagging.svg");
    let (code, stdout, stderr) = out(&[
        "explore",
        STANDPIPE,
        "--transient",
        "--over",
        "lagging=0mm..40mm:5",
        "--format",
        "csv",
        "--plot",
        svg.to_str().expect("path"),
    ]);
    assert_eq!(code, 3, "{stderr}");
    let rows: Vec<Vec<String>> = stdout
        .lines()
        .skip(1)
        .map(|l| l.split(',').map(String::from).collect())
        .collect();
    assert_eq!(rows.len(), 5);
    // More lagging, later freezing.
    let times: Vec<f64> = rows
        .iter()
        .map(|r| r[5].parse().expect("first failure time"))
        .collect();
    assert!(times.windows(2).all(|w| w[1] > w[0]), "{times:?}");
    let chart = std::fs::read_to_string(&svg).expect("chart written");
    assert!(
        chart.starts_with("<svg") && chart.contains("first fails"),
        "{chart}"
    );
    assert_eq!(chart.matches("<polyline").count(), 2);
}

#[test]
fn explore_usage_errors() {
    // The words of the command are the tool's own; the old ones are not aliases.
    let (code, _, stderr) = out(&["study", TANK]);
    assert_eq!(code, 2, "`study` is not a command: {stderr}");
    let (code, _, stderr) = out(&["explore", TANK, "--sweep", "jacket=10mm..20mm:3"]);
    assert_eq!(code, 2, "`--sweep` is not an option: {stderr}");
    let (code, _, stderr) = out(&["explore", TANK, "--measure", "temperature(wall.foam)"]);
    assert_eq!(code, 2, "`--measure` is not an option: {stderr}");
    let (code, stdout, stderr) = out(&["explore", TANK]);
    assert_eq!(code, 3, "without --over every case is solved: {stderr}");
    assert!(
        stdout.contains("cases cold_cupboard, warm_cupboard"),
        "{stdout}"
    );
    let (code, _, stderr) = out(&["explore", TANK, "--over", "jacket=10W..20W:3"]);
    assert_eq!(code, 2);
    assert!(
        stderr.contains("parameter `jacket` is a length (m); the value given is a power (W)"),
        "{stderr}"
    );
    let (code, _, stderr) = out(&["explore", TANK, "--over", "jacket=1mm..2mm:1"]);
    assert_eq!(code, 2);
    assert!(stderr.contains("from 2 to 10000 points"), "{stderr}");
    let (code, _, stderr) = out(&["explore", TANK, "--case", "all", "--plot", "x.svg"]);
    assert_eq!(code, 2);
    assert!(
        stderr.contains("--plot draws the chart over a parameter"),
        "{stderr}"
    );
    assert!(!Path::new("x.svg").exists());
}

/// A chain of 3000 storing nodes stepped at 1 s for 10⁶ s: far longer than the test waits.
fn long_model() -> PathBuf {
    let mut s = String::from("node ambient (fixed = 10 °C)\n");
    for i in 0..3000 {
        s += &format!("node n{i} (capacity = 500 J/K, initial = 60 °C)\n");
    }
    s += "link l0: n0 to ambient conductance(2 W/K)\n";
    for i in 1..3000 {
        s += &format!("link l{i}: n{i} to n{} conductance(2 W/K)\n", i - 1);
    }
    s += "transient long (duration = 1000000 s, step = 1 s, output = 1 h)\n";
    let p = scratch("long.heat");
    std::fs::write(&p, s).expect("model written");
    p
}

#[cfg(unix)]
#[test]
fn ctrl_c_stops_a_run_and_keeps_what_was_computed() {
    let model = long_model();
    let bin = assert_cmd::cargo::cargo_bin("caloris");
    let child = std::process::Command::new(bin)
        .args(["run", model.to_str().expect("path"), "--nodes", "n0,n2999"])
        .stdout(std::process::Stdio::piped())
        .stderr(std::process::Stdio::piped())
        .spawn()
        .expect("spawn");
    std::thread::sleep(std::time::Duration::from_millis(2500));
    let status = std::process::Command::new("kill")
        .args(["-INT", &child.id().to_string()])
        .status()
        .expect("kill");
    assert!(status.success());
    let o = child.wait_with_output().expect("exit");
    let stdout = String::from_utf8_lossy(&o.stdout);
    let stderr = String::from_utf8_lossy(&o.stderr);
    assert_eq!(o.status.code(), Some(130), "{stderr}");
    assert!(stdout.contains("INTERRUPTED at"), "{stdout}");
    assert!(stdout.contains("Energy over the run"), "{stdout}");
    assert!(stderr.contains("interrupted: results up to"), "{stderr}");
}

/// The oven door warming up as the oven is lit: radiation links in a transient run. Its final
/// state must be the steady Newton solve of the same door with the oven at 250 °C
/// (examples/bakery_oven_door.heat), and the run must close its energy account.
#[test]
fn run_with_radiation_links_ends_at_the_steady_door() {
    let (code, stdout, stderr) = out(&[
        "run",
        "examples/bakery_oven_warmup.heat",
        "--format",
        "json",
    ]);
    assert_eq!(code, 0, "{stderr}");
    let run: serde_json::Value = serde_json::from_str(&stdout).expect("json");
    let (code, stdout, stderr) = out(&[
        "solve",
        "examples/bakery_oven_door.heat",
        "--format",
        "json",
    ]);
    assert_eq!(code, 0, "{stderr}");
    let steady: serde_json::Value = serde_json::from_str(&stdout).expect("json");
    let find = |v: &serde_json::Value, name: &str, key: &str| {
        v["nodes"]
            .as_array()
            .expect("nodes")
            .iter()
            .find(|n| n["name"] == name)
            .and_then(|n| n[key].as_f64())
            .unwrap_or_else(|| panic!("{name} {key}"))
    };
    for node in [
        "inner_pane_in",
        "inner_pane_out",
        "outer_pane_in",
        "outer_pane_out",
    ] {
        let (end, settled) = (
            find(&run, node, "final_K"),
            find(&steady, node, "temperature_K"),
        );
        assert!(
            (end - settled).abs() < 1e-3,
            "{node}: {end} K vs {settled} K"
        );
    }
    let e = &run["energy"];
    assert!(
        e["residual_J"].as_f64().expect("residual").abs()
            < 1e-9 * e["stored_J"].as_f64().expect("stored").abs()
    );
    assert!(run["stats"]["newton_iterations"].as_u64().expect("newton") > 0);
    // The table report names the first law and the run's limit verdict.
    let (code, stdout, _) = out(&["run", "examples/bakery_oven_warmup.heat"]);
    assert_eq!(code, 0);
    assert!(stdout.contains("outer_pane_touch"), "{stdout}");
    assert!(stdout.contains("balance residual"), "{stdout}");
}

/// A k(T) that falls to zero as the kiln heats up, and the same model starting hot: an error
/// with a code, never temperatures from a conductivity that has no meaning.
#[test]
fn run_stops_with_e707_when_k_of_t_leaves_its_range() {
    let model = "material odd (k = 0.08 W/(m*K), k_slope = -1e-4 W/(m*K^2), k_at = 20 °C)\n\
schedule firing {\n  0 h: 20 °C\n  2 h: 900 °C\n}\n\
node kiln (fixed = firing)\n\
node room (fixed = 20 °C)\n\
node face (capacity = 0.4 kJ/K)\n\
link plug: kiln to face layer(odd, thickness = 40 mm, area = 0.01 m^2)\n\
link cap: face to room film(h = 10 W/(m^2*K), area = 0.01 m^2)\n";
    for (run, what) in [
        (
            "transient heat_up (duration = 3 h)\n",
            "between its end temperatures at t =",
        ),
        (
            "transient late (start = 2 h, duration = 1 h)\n",
            "in the steady state the run starts from",
        ),
    ] {
        let path = scratch("k_falls.heat");
        std::fs::write(&path, format!("{model}{run}")).expect("write");
        let (code, stdout, stderr) = out(&["run", path.to_str().expect("utf-8")]);
        assert_eq!(code, 1, "{stdout}{stderr}");
        assert!(stdout.is_empty(), "{stdout}");
        assert!(stderr.contains("E707"), "{stderr}");
        assert!(stderr.contains(what), "{stderr}");
        assert!(stderr.contains("k_slope"), "{stderr}");
    }
}

/// An output interval that would report a run more than 100 000 times is refused before any
/// memory is taken, from the model (E708 at the value) and from `--every` (a usage error).
#[test]
fn output_intervals_that_would_flood_memory_are_refused() {
    let (code, stdout, stderr) = out(&[
        "run",
        "tests/cases/reliability/resource_transient_output_1e-9s.heat",
    ]);
    assert_eq!(code, 1, "{stdout}{stderr}");
    let all = format!("{stdout}{stderr}");
    assert!(
        all.contains("[E708]") && all.contains("more than 100000 times"),
        "{all}"
    );
    let (code, _, stderr) = out(&["run", STANDPIPE, "--every", "1e-9s"]);
    assert_eq!(code, 2);
    assert!(stderr.contains("give a longer --every"), "{stderr}");
}
