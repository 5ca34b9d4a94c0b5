//! Line charts as self-contained SVG: one or more panels stacked over a shared x axis, each with
//! its own y axis and unit, curves, horizontal limit lines and labelled markers. Written by hand
//! (no font or drawing library) so the output is small, deterministic and diff-friendly.

use std::fmt::Write;

/// Okabe–Ito colours, distinguishable with the common colour-vision deficiencies.
const PALETTE: &[&str] = &[
    "#0072B2", "#D55E00", "#009E73", "#CC79A7", "#E69F00", "#56B4E9", "#000000", "#999999",
];

const WIDTH: f64 = 880.0;
const LEFT: f64 = 78.0;
const PLOT_RIGHT: f64 = 640.0;
const PANEL_HEIGHT: f64 = 250.0;
const PANEL_GAP: f64 = 80.0;
const TOP: f64 = 64.0;

pub struct Series {
    pub label: String,
    /// `(x, y)`; a non-finite y breaks the line.
    pub points: Vec<(f64, f64)>,
}

pub struct HLine {
    pub label: String,
    pub y: f64,
}

pub struct Marker {
    pub x: f64,
    pub y: f64,
    pub label: String,
}

pub struct Panel {
    /// A heading above the panel (may be empty).
    pub heading: String,
    /// The y axis label, short: the quantity's unit.
    pub y_label: String,
    pub series: Vec<Series>,
    pub hlines: Vec<HLine>,
    pub markers: Vec<Marker>,
}

pub struct Chart {
    pub title: String,
    pub x_label: String,
    pub panels: Vec<Panel>,
    /// A line of small print under the chart (the caution).
    pub footnote: String,
}

fn esc(s: &str) -> String {
    s.replace('&', "&amp;")
        .replace('<', "&lt;")
        .replace('>', "&gt;")
        .replace('"', "&quot;")
}

/// Tick positions at 1, 2 or 5 × 10ⁿ covering [lo, hi], and the decimals to print them with.
fn ticks(lo: f64, hi: f64) -> (Vec<f64>, usize) {
    let span = (hi - lo).abs().max(1e-12);
    let raw = span / 6.0;
    let p = 10f64.powf(raw.log10().floor());
    let step = [1.0, 2.0, 5.0, 10.0]
        .iter()
        .map(|m| m * p)
        .find(|&s| s >= raw)
        .unwrap_or(10.0 * p);
    let decimals = if step >= 1.0 {
        0
    } else {
        (-step.log10().floor()) as usize
    };
    let mut out = Vec::new();
    let mut v = (lo / step).ceil() * step;
    while v <= hi + step * 1e-9 && out.len() < 50 {
        out.push(if v.abs() < step * 1e-9 { 0.0 } else { v });
        v += step;
    }
    (out, decimals)
}

/// Range with a little room, never empty.
fn range(values: impl Iterator<Item = f64>) -> (f64, f64) {
    let (mut lo, mut hi) = (f64::INFINITY, f64::NEG_INFINITY);
    for v in values.filter(|v| v.is_finite()) {
        lo = lo.min(v);
        hi = hi.max(v);
    }
    if !lo.is_finite() {
        return (0.0, 1.0);
    }
    if hi - lo < 1e-9 * (1.0 + lo.abs()) {
        let pad = if lo.abs() > 0.0 { lo.abs() * 0.05 } else { 1.0 };
        return (lo - pad, hi + pad);
    }
    let pad = (hi - lo) * 0.05;
    (lo - pad, hi + pad)
}

pub fn svg(chart: &Chart) -> String {
    let n = chart.panels.len().max(1) as f64;
    let height = TOP + n * PANEL_HEIGHT + (n - 1.0) * PANEL_GAP + 70.0;
    let mut s = String::new();
    let _ = writeln!(
        s,
        r#"<svg xmlns="http://www.w3.org/2000/svg" width="{WIDTH}" height="{height}" viewBox="0 0 {WIDTH} {height}" font-family="sans-serif" font-size="12">"#
    );
    let _ = writeln!(s, r##"<rect width="100%" height="100%" fill="#ffffff"/>"##);
    let _ = writeln!(
        s,
        r#"<text x="{LEFT}" y="24" font-size="15" font-weight="bold">{}</text>"#,
        esc(&chart.title)
    );
    let (x_lo, x_hi) = {
        let xs = chart
            .panels
            .iter()
            .flat_map(|p| p.series.iter().flat_map(|s| s.points.iter().map(|p| p.0)));
        let (lo, hi) = range(xs);
        // The x axis is not padded: curves start and end at the edges.
        let pad = (hi - lo) / 1.1 * 0.05;
        (lo + pad, hi - pad)
    };
    let (xt, xdec) = ticks(x_lo, x_hi);
    let sx = |x: f64| LEFT + (x - x_lo) / (x_hi - x_lo) * (PLOT_RIGHT - LEFT);
    for (pi, panel) in chart.panels.iter().enumerate() {
        let top = TOP + pi as f64 * (PANEL_HEIGHT + PANEL_GAP);
        let bottom = top + PANEL_HEIGHT;
        let ys = panel
            .series
            .iter()
            .flat_map(|s| s.points.iter().map(|p| p.1))
            .chain(panel.hlines.iter().map(|h| h.y));
        let (y_lo, y_hi) = range(ys);
        let sy = |y: f64| bottom - (y - y_lo) / (y_hi - y_lo) * PANEL_HEIGHT;
        let (yt, ydec) = ticks(y_lo, y_hi);
        // Grid and axes.
        for &y in &yt {
            let py = sy(y);
            let _ = writeln!(
                s,
                r##"<line x1="{LEFT}" y1="{py:.1}" x2="{PLOT_RIGHT}" y2="{py:.1}" stroke="#e4e4e4"/>"##
            );
            let _ = writeln!(
                s,
                r#"<text x="{:.1}" y="{:.1}" text-anchor="end">{y:.ydec$}</text>"#,
                LEFT - 6.0,
                py + 4.0
            );
        }
        for &x in &xt {
            let px = sx(x);
            let _ = writeln!(
                s,
                r##"<line x1="{px:.1}" y1="{top:.1}" x2="{px:.1}" y2="{bottom:.1}" stroke="#f0f0f0"/>"##
            );
            let _ = writeln!(
                s,
                r#"<text x="{px:.1}" y="{:.1}" text-anchor="middle">{x:.xdec$}</text>"#,
                bottom + 16.0
            );
        }
        let _ = writeln!(
            s,
            r##"<rect x="{LEFT}" y="{top:.1}" width="{:.1}" height="{PANEL_HEIGHT}" fill="none" stroke="#444444"/>"##,
            PLOT_RIGHT - LEFT
        );
        let _ = writeln!(
            s,
            r#"<text transform="translate({:.1},{:.1}) rotate(-90)" text-anchor="middle">{}</text>"#,
            LEFT - 52.0,
            top + PANEL_HEIGHT / 2.0,
            esc(&panel.y_label)
        );
        let _ = writeln!(
            s,
            r#"<text x="{:.1}" y="{:.1}" text-anchor="middle">{}</text>"#,
            (LEFT + PLOT_RIGHT) / 2.0,
            bottom + 36.0,
            esc(&chart.x_label)
        );
        if !panel.heading.is_empty() {
            let _ = writeln!(
                s,
                r#"<text x="{LEFT}" y="{:.1}" font-weight="bold">{}</text>"#,
                top - 9.0,
                esc(&panel.heading)
            );
        }
        let mut legend_y = top + 14.0;
        let legend_x = PLOT_RIGHT + 16.0;
        for h in &panel.hlines {
            let py = sy(h.y);
            let _ = writeln!(
                s,
                r##"<line x1="{LEFT}" y1="{py:.1}" x2="{PLOT_RIGHT}" y2="{py:.1}" stroke="#C00000" stroke-width="1.5" stroke-dasharray="6 4"/>"##
            );
            let _ = writeln!(
                s,
                r##"<line x1="{legend_x:.1}" y1="{:.1}" x2="{:.1}" y2="{:.1}" stroke="#C00000" stroke-width="1.5" stroke-dasharray="6 4"/>"##,
                legend_y - 4.0,
                legend_x + 22.0,
                legend_y - 4.0
            );
            let _ = writeln!(
                s,
                r#"<text x="{:.1}" y="{legend_y:.1}">{}</text>"#,
                legend_x + 28.0,
                esc(&h.label)
            );
            legend_y += 18.0;
        }
        for (k, series) in panel.series.iter().enumerate() {
            let colour = PALETTE[k % PALETTE.len()];
            let mut runs: Vec<Vec<(f64, f64)>> = vec![Vec::new()];
            for &(x, y) in &series.points {
                if x.is_finite() && y.is_finite() {
                    if let Some(last) = runs.last_mut() {
                        last.push((sx(x), sy(y)));
                    }
                } else if runs.last().is_some_and(|r| !r.is_empty()) {
                    runs.push(Vec::new());
                }
            }
            for run in runs.iter().filter(|r| !r.is_empty()) {
                let pts: Vec<String> = run.iter().map(|(x, y)| format!("{x:.1},{y:.1}")).collect();
                let _ = writeln!(
                    s,
                    r#"<polyline fill="none" stroke="{colour}" stroke-width="2" points="{}"/>"#,
                    pts.join(" ")
                );
                if run.len() <= 40 {
                    for (x, y) in run {
                        let _ = writeln!(
                            s,
                            r#"<circle cx="{x:.1}" cy="{y:.1}" r="2.6" fill="{colour}"/>"#
                        );
                    }
                }
            }
            let _ = writeln!(
                s,
                r#"<line x1="{legend_x:.1}" y1="{:.1}" x2="{:.1}" y2="{:.1}" stroke="{colour}" stroke-width="2"/>"#,
                legend_y - 4.0,
                legend_x + 22.0,
                legend_y - 4.0
            );
            let _ = writeln!(
                s,
                r#"<text x="{:.1}" y="{legend_y:.1}">{}</text>"#,
                legend_x + 28.0,
                esc(&series.label)
            );
            legend_y += 18.0;
        }
        for m in &panel.markers {
            let (px, py) = (sx(m.x), sy(m.y));
            let _ = writeln!(
                s,
                r##"<circle cx="{px:.1}" cy="{py:.1}" r="5" fill="none" stroke="#C00000" stroke-width="2"/>"##
            );
            let _ = writeln!(
                s,
                r#"<text x="{:.1}" y="{:.1}">{}</text>"#,
                px + 8.0,
                py - 8.0,
                esc(&m.label)
            );
        }
    }
    let _ = writeln!(
        s,
        r##"<text x="{LEFT}" y="{:.1}" font-size="10" fill="#555555">{}</text>"##,
        height - 14.0,
        esc(&chart.footnote)
    );
    s.push_str("</svg>\n");
    s
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn ticks_are_round_numbers() {
        let (t, d) = ticks(-3.2, 11.7);
        assert_eq!(t, vec![0.0, 5.0, 10.0]);
        assert_eq!(d, 0);
        let (t, d) = ticks(0.013, 0.061);
        assert_eq!(d, 2);
        assert_eq!(t.len(), 5);
    }

    #[test]
    fn a_gap_breaks_the_line_and_text_is_escaped() {
        let chart = Chart {
            title: "a < b & c".into(),
            x_label: "x".into(),
            panels: vec![Panel {
                heading: String::new(),
                y_label: "y".into(),
                series: vec![Series {
                    label: "s".into(),
                    points: vec![
                        (0.0, 1.0),
                        (1.0, 2.0),
                        (2.0, f64::NAN),
                        (3.0, 1.0),
                        (4.0, 0.0),
                    ],
                }],
                hlines: vec![],
                markers: vec![],
            }],
            footnote: String::new(),
        };
        let out = svg(&chart);
        assert_eq!(out.matches("<polyline").count(), 2);
        assert!(out.contains("a &lt; b &amp; c"));
    }
}
