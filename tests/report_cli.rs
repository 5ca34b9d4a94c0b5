//! `caloris report`: the files it writes, SVG that XML parsers accept, and numbers that agree
//! with `caloris solve --format json` for the same model.

use assert_cmd::Command;
use serde_json::Value;
use std::path::{Path, PathBuf};

fn caloris() -> Command {
    let mut c = Command::cargo_bin("caloris").expect("binary built");
    c.env("NO_COLOR", "1");
    c
}

fn scratch(name: &str) -> PathBuf {
    let dir = Path::new(env!("CARGO_TARGET_TMPDIR")).join(name);
    let _ = std::fs::remove_dir_all(&dir);
    std::fs::create_dir_all(&dir).expect("scratch folder");
    dir
}

fn root() -> &'static Path {
    Path::new(env!("CARGO_MANIFEST_DIR"))
}

fn solve_json(model: &Path) -> Value {
    let out = caloris()
        .args(["solve", "--format", "json"])
        .arg(model)
        .output()
        .expect("runs");
    serde_json::from_slice(&out.stdout).expect("solve prints JSON")
}

/// The rows of the Markdown table that follows `heading`, split into trimmed cells.
fn table_after(md: &str, heading: &str) -> Vec<Vec<String>> {
    let start = md
        .find(heading)
        .unwrap_or_else(|| panic!("no `{heading}` in report"));
    md[start..]
        .lines()
        .skip_while(|l| !l.starts_with('|'))
        .take_while(|l| l.starts_with('|'))
        .skip(2)
        .map(|l| {
            l.trim_matches('|')
                .split(" | ")
                .map(|c| c.trim().trim_matches('`').to_string())
                .collect()
        })
        .collect()
}

/// The number at the start of a cell such as `19.08 °C` or `-6.683 °C`.
fn number(cell: &str) -> f64 {
    cell.split_whitespace()
        .next()
        .and_then(|n| n.parse().ok())
        .unwrap_or_else(|| panic!("no number in `{cell}`"))
}

/// Four significant digits, as reports show numbers.
fn agrees(shown: f64, exact: f64) -> bool {
    (shown - exact).abs() <= 1e-3 * exact.abs().max(1e-9)
}

fn parse_svg(path: &Path) -> String {
    let text = std::fs::read_to_string(path).expect("svg written");
    let doc = roxmltree::Document::parse(&text)
        .unwrap_or_else(|e| panic!("{} is not well-formed XML: {e}", path.display()));
    assert_eq!(doc.root_element().tag_name().name(), "svg");
    assert_eq!(
        doc.root_element().tag_name().namespace(),
        Some("http://www.w3.org/2000/svg")
    );
    text
}

#[test]
fn every_example_gives_a_report_whose_numbers_match_the_solve() {
    let mut examples: Vec<PathBuf> = std::fs::read_dir(root().join("examples"))
        .expect("examples")
        .flatten()
        .map(|e| e.path())
        .filter(|p| p.extension().is_some_and(|x| x == "heat"))
        .collect();
    examples.sort();
    assert!(!examples.is_empty());
    for model in examples {
        let stem = model
            .file_stem()
            .map(|s| s.to_string_lossy().into_owned())
            .unwrap_or_default();
        let dir = scratch(&format!("report_{stem}"));
        let out = caloris()
            .arg("report")
            .arg(&model)
            .arg("-o")
            .arg(&dir)
            .output()
            .expect("runs");
        let solved = solve_json(&model);
        let any_fail = solved["limits"]
            .as_array()
            .is_some_and(|l| l.iter().any(|l| l["passed"] == false));
        assert_eq!(
            out.status.code(),
            Some(if any_fail { 3 } else { 0 }),
            "{}",
            String::from_utf8_lossy(&out.stderr)
        );

        let md = std::fs::read_to_string(dir.join("report.md")).expect("report.md");
        assert!(
            md.contains("confirm against local codes and licensed practice"),
            "caution missing"
        );
        assert!(
            md.contains("![Temperature profile along the path](profile.svg)")
                && md.contains("![Drawing of the solved network](network.svg)")
        );

        // Temperatures: every node, value as solve computes it.
        let rows = table_after(&md, "### Temperatures");
        let nodes = solved["nodes"].as_array().expect("nodes");
        assert_eq!(rows.len(), nodes.len());
        for n in nodes {
            let name = n["name"].as_str().expect("name");
            let row = rows
                .iter()
                .find(|r| r[0] == name)
                .unwrap_or_else(|| panic!("{stem}: no row for {name}"));
            let exact = n["temperature_K"].as_f64().expect("T") - 273.15;
            assert!(
                agrees(number(&row[1]), exact),
                "{stem}: {name} shown {} vs {exact}",
                row[1]
            );
        }
        // Heat flows of every link.
        let rows = table_after(&md, "### Heat flows");
        for l in solved["links"].as_array().expect("links") {
            let name = l["name"].as_str().expect("name");
            let row = rows
                .iter()
                .find(|r| r[0] == name)
                .unwrap_or_else(|| panic!("{stem}: no row for {name}"));
            assert!(
                agrees(number(&row[4]), l["heat_flow_W"].as_f64().expect("Q")),
                "{stem}: {name} {}",
                row[4]
            );
            assert!(
                agrees(
                    number(&row[3]),
                    l["resistance_K_per_W"].as_f64().expect("R")
                ),
                "{stem}: {name} {}",
                row[3]
            );
        }
        // U-values of build-up uses.
        if let Some(groups) = solved["buildups"].as_array().filter(|g| !g.is_empty()) {
            let rows = table_after(&md, "### Build-up U- and R-values");
            for g in groups {
                let row = rows
                    .iter()
                    .find(|r| r[0] == g["name"].as_str().unwrap_or(""))
                    .expect("build-up row");
                // Radial build-ups (pipe lagging) have no area, so no U-value per area.
                match g["u_value_W_per_m2K"].as_f64() {
                    Some(u) => {
                        assert!(agrees(number(&row[5]), u), "{stem}: U {}", row[5]);
                        // Rounded to two significant figures, as ISO 6946 states a U-value.
                        let rounded = g["u_value_rounded_W_per_m2K"].as_f64().expect("rounded U");
                        assert_eq!(number(&row[6]), rounded, "{stem}: rounded U {}", row[6]);
                        assert!((rounded - u).abs() <= 0.05 * u, "{stem}: {rounded} vs {u}");
                    }
                    None => assert!(row[5].is_empty(), "{stem}: U shown without one: {}", row[5]),
                }
            }
        }
        // Limit verdicts and values.
        let rows = table_after(&md, "## Design limits");
        for l in solved["limits"].as_array().expect("limits") {
            let row = rows
                .iter()
                .find(|r| r[0] == l["name"].as_str().unwrap_or(""))
                .expect("limit row");
            let verdict = if l["passed"] == true {
                "pass"
            } else {
                "**FAIL**"
            };
            assert_eq!(row[5], verdict);
            // The margin in percent of the limit, as the JSON gives it.
            match l["margin_percent"].as_f64() {
                Some(p) => assert!(
                    agrees(number(row[4].trim_end_matches(" %")), p),
                    "{stem}: margin % {}",
                    row[4]
                ),
                None => assert_eq!(row[4], "—"),
            }
        }

        let net = parse_svg(&dir.join("network.svg"));
        for n in nodes {
            assert!(
                net.contains(&format!(
                    "<title>{}</title>",
                    n["name"].as_str().unwrap_or("")
                )),
                "{stem}: node missing from drawing"
            );
        }
        let doc_text = std::fs::read_to_string(dir.join("network.svg")).expect("svg");
        let doc = roxmltree::Document::parse(&doc_text).expect("xml");
        let markers = doc
            .descendants()
            .filter(|d| {
                matches!(d.tag_name().name(), "circle" | "rect")
                    && d.children().any(|c| c.tag_name().name() == "title")
            })
            .count();
        assert_eq!(markers, nodes.len(), "{stem}: one symbol per node");
        let links = doc
            .descendants()
            .filter(|d| d.tag_name().name() == "path" && d.attribute("marker-end").is_some())
            .count();
        assert_eq!(
            links,
            solved["links"].as_array().map_or(0, Vec::len),
            "{stem}: one curve per link"
        );
        parse_svg(&dir.join("profile.svg"));
    }
}

#[test]
fn profile_follows_the_build_up_and_a_named_path() {
    let model = root().join("examples/garden_office_wall.heat");
    let dir = scratch("report_path_default");
    caloris()
        .arg("report")
        .arg(&model)
        .arg("-o")
        .arg(&dir)
        .assert()
        .code(0);
    let md = std::fs::read_to_string(dir.join("report.md")).expect("report");
    let rows = table_after(&md, "### Temperature profile");
    let names: Vec<&str> = rows.iter().map(|r| r[0].as_str()).collect();
    assert_eq!(
        names,
        [
            "room",
            "north.inside",
            "north.lining",
            "north.insulation",
            "north.sheathing",
            "north.cladding",
            "outdoor"
        ]
    );
    // Positions are resistance per area summed along the build-up: Rsi = 0.13 m²K/W (ISO 6946),
    // then + 12.5 mm / 0.25 W/(m·K) = 0.05 (Fourier's law), ...; the last is the wall's R-value.
    assert!(agrees(number(&rows[1][1]), 0.13) && agrees(number(&rows[2][1]), 0.18));
    let r_total = 0.13 + 0.0125 / 0.25 + 0.140 / 0.040 + 0.012 / 0.13 + 0.019 / 0.13 + 0.04;
    assert!(
        agrees(number(&rows[6][1]), r_total),
        "{} vs {r_total}",
        rows[6][1]
    );
    let svg = parse_svg(&dir.join("profile.svg"));
    assert_eq!(svg.matches("<circle").count(), 7);

    let dir = scratch("report_path_named");
    caloris()
        .arg("report")
        .arg(&model)
        .args(["-o"])
        .arg(&dir)
        .args(["--path", "room,outdoor"])
        .assert()
        .code(0);
    let md = std::fs::read_to_string(dir.join("report.md")).expect("report");
    let rows = table_after(&md, "### Temperature profile");
    assert_eq!(rows.len(), 2);
    // room → outdoor directly: only the window film joins them, R = 1/(h·A) = 1/(1.4 × 1.08) K/W
    // (Newton's law of cooling); its area is the one area, so positions are per area: 1/1.4.
    assert!(agrees(number(&rows[1][1]), 1.0 / 1.4), "{}", rows[1][1]);

    let out = caloris()
        .arg("report")
        .arg(&model)
        .arg("-o")
        .arg(&dir)
        .args(["--path", "room,north.insulation"])
        .output()
        .expect("runs");
    assert_eq!(out.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&out.stderr)
        .contains("no link joins `room` and `north.insulation`"));
    let out = caloris()
        .arg("report")
        .arg(&model)
        .arg("-o")
        .arg(&dir)
        .args(["--path", "room,outdor"])
        .output()
        .expect("runs");
    assert_eq!(out.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&out.stderr).contains("did you mean `outdoor`"));
}

#[test]
fn failing_limits_give_exit_3_and_awkward_titles_stay_valid_xml() {
    let dir = scratch("report_awkward");
    let model = dir.join("m.heat");
    std::fs::write(
        &model,
        "title \"Pump <skid> & \\\"hot\\\" pipe | *test*\"\nnode hot (fixed = 90 °C)\nnode air (fixed = 20 °C)\nnode skin\nlink pipe: hot to skin resistance(1 K/W)\nlink film: skin to air resistance(1 K/W)\nlimit touch: temperature(skin) < 50 °C\n",
    )
    .expect("write");
    let out = caloris()
        .arg("report")
        .arg(&model)
        .arg("-o")
        .arg(dir.join("out"))
        .output()
        .expect("runs");
    // Two equal resistances in series split 70 K evenly: the skin sits at 55 °C > 50 °C.
    assert_eq!(out.status.code(), Some(3));
    let net = parse_svg(&dir.join("out/network.svg"));
    assert!(net.contains("Pump &lt;skid&gt; &amp; &quot;hot&quot; pipe"));
    let md = std::fs::read_to_string(dir.join("out/report.md")).expect("report");
    assert!(
        md.starts_with("# Pump \\<skid\\> & \"hot\" pipe \\| \\*test\\*\n"),
        "{}",
        md.lines().next().unwrap_or("")
    );
    let rows = table_after(&md, "### Temperatures");
    let skin = rows.iter().find(|r| r[0] == "skin").expect("skin row");
    assert_eq!(skin[1], "55 °C");
    // No build-up: the profile runs from the warmest node to the coldest over the fewest links.
    let rows = table_after(&md, "### Temperature profile");
    assert_eq!(
        rows.iter().map(|r| r[0].as_str()).collect::<Vec<_>>(),
        ["hot", "skin", "air"]
    );

    let out = caloris()
        .arg("report")
        .arg(dir.join("missing.heat"))
        .arg("-o")
        .arg(dir.join("x"))
        .output()
        .expect("runs");
    assert_eq!(out.status.code(), Some(2));
}
