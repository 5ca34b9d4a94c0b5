//! A drawing of the solved network. Nodes stand in columns by temperature, warmest on the
//! left, so heat runs left to right; nodes at one temperature share a column. Links are curves
//! drawn from the warmer end to the colder, as thick as their share of the largest heat flow,
//! and labelled with their name and heat flow. The layout depends only on the model, so the same
//! model always gives the same drawing.

use super::svg::{self, esc, n};
use caloris_compiler::network::Network;
use caloris_compiler::results::Solution;
use caloris_compiler::units::{format_quantity, Dim, Quantity, TempKind, UnitSystem};
use std::fmt::Write;

/// Beyond this many nodes a drawing is no longer readable; the report says so instead.
pub const MAX_NODES: usize = 150;
const MAX_COLUMNS: usize = 12;
const COL_W: f64 = 150.0;
const ROW_H: f64 = 96.0;

/// Column of each node: one per distinct temperature (warmest first); with more than
/// [`MAX_COLUMNS`] distinct temperatures, consecutive ones share a column so that the columns
/// hold about equally many (nodes at one temperature always stay together).
fn columns(t: &[f64]) -> Vec<usize> {
    let (lo, hi) = t
        .iter()
        .fold((f64::MAX, f64::MIN), |(a, b), &v| (a.min(v), b.max(v)));
    let eps = 1e-6f64.max((hi - lo) * 1e-9);
    let mut order: Vec<usize> = (0..t.len()).collect();
    order.sort_by(|&a, &b| t[b].total_cmp(&t[a]).then(a.cmp(&b)));
    let mut distinct: Vec<f64> = Vec::new();
    for &i in &order {
        if distinct.last().is_none_or(|&d| d - t[i] > eps) {
            distinct.push(t[i]);
        }
    }
    let rank = |v: f64| distinct.iter().position(|&d| d - v <= eps).unwrap_or(0);
    let count = distinct.len();
    t.iter()
        .map(|&v| {
            if count <= MAX_COLUMNS {
                rank(v)
            } else {
                rank(v) * MAX_COLUMNS / count
            }
        })
        .collect()
}

/// The drawing, or `None` when the network has more than [`MAX_NODES`] nodes.
pub fn svg(net: &Network, sol: &Solution, system: UnitSystem, title: &str) -> Option<String> {
    let count = net.nodes.len();
    if count == 0 || count > MAX_NODES {
        return None;
    }
    let t = &sol.temperatures;
    let col = columns(t);
    let ncols = col.iter().max().map_or(1, |m| m + 1);
    let mut row = vec![0usize; count];
    let mut filled = vec![0usize; ncols];
    for i in 0..count {
        row[i] = filled[col[i]];
        filled[col[i]] += 1;
    }
    let nrows = filled.iter().copied().max().unwrap_or(1);

    // Curves: links that skip columns on one row arc above the nodes in between; parallel
    // links between one pair spread out; links within a column bow to the right.
    let mut seen: std::collections::HashMap<(usize, usize), usize> = Default::default();
    let bends: Vec<f64> = net
        .links
        .iter()
        .map(|l| {
            let key = (l.from.min(l.to), l.from.max(l.to));
            let k = *seen.entry(key).and_modify(|k| *k += 1).or_insert(0);
            let span = col[l.from].abs_diff(col[l.to]);
            let base = if span == 0 {
                46.0
            } else if span > 1 && row[l.from] == row[l.to] {
                30.0 + 14.0 * (span - 1) as f64
            } else {
                0.0
            };
            let spread = if k == 0 {
                0.0
            } else {
                30.0 * k.div_ceil(2) as f64 * if k % 2 == 1 { 1.0 } else { -1.0 }
            };
            base + spread
        })
        .collect();
    let arc_room = bends.iter().fold(0.0f64, |m, b| m.max(b.abs())) + 20.0;
    let (left, top) = (90.0, 60.0 + arc_room);
    let width = left * 2.0 + COL_W * (ncols.saturating_sub(1)) as f64;
    let height = top + ROW_H * (nrows.saturating_sub(1)) as f64 + 110.0;
    let pos = |i: usize| (left + COL_W * col[i] as f64, top + ROW_H * row[i] as f64);
    let (tlo, thi) = t
        .iter()
        .fold((f64::MAX, f64::MIN), |(a, b), &v| (a.min(v), b.max(v)));
    let shade = |v: f64| {
        svg::heat_colour(if thi > tlo {
            (v - tlo) / (thi - tlo)
        } else {
            0.5
        })
    };
    let qmax = sol.heat_flows.iter().fold(0.0f64, |m, q| m.max(q.abs()));

    let mut out = String::new();
    svg::open(&mut out, width.max(420.0), height, title);
    out.push_str("<defs><marker id=\"arrow\" viewBox=\"0 0 10 10\" refX=\"9\" refY=\"5\" markerUnits=\"userSpaceOnUse\" markerWidth=\"11\" markerHeight=\"11\" orient=\"auto\"><path d=\"M0,0 L10,5 L0,10 z\" fill=\"#666666\"/></marker></defs>\n");
    svg::text(
        &mut out,
        16.0,
        26.0,
        "start",
        "font-size=\"15\" font-weight=\"bold\"",
        title,
    );
    for (l, link) in net.links.iter().enumerate() {
        let q = sol.heat_flows[l];
        // Draw from the warmer end to the colder, so the arrow shows where the heat goes.
        let (a, b) = if q >= 0.0 {
            (link.from, link.to)
        } else {
            (link.to, link.from)
        };
        let (p1, p2) = (pos(a), pos(b));
        let (dx, dy) = (p2.0 - p1.0, p2.1 - p1.1);
        let len = (dx * dx + dy * dy).sqrt();
        let (ux, uy) = if len > 0.0 {
            (dx / len, dy / len)
        } else {
            (0.0, 1.0)
        };
        // Upward normal for a left-to-right link, so arcs rise above the row.
        let (mut nx, mut ny) = if len > 0.0 { (uy, -ux) } else { (1.0, 0.0) };
        if dx < -1e-9 || (dx.abs() <= 1e-9 && nx < 0.0) {
            (nx, ny) = (-nx, -ny);
        }
        let bend = bends[l];
        let mid = ((p1.0 + p2.0) / 2.0, (p1.1 + p2.1) / 2.0);
        let ctrl = (mid.0 + nx * bend * 2.0, mid.1 + ny * bend * 2.0);
        // Stop short of the node symbols.
        let trim = |p: (f64, f64), toward: (f64, f64)| {
            let (ex, ey) = (toward.0 - p.0, toward.1 - p.1);
            let el = (ex * ex + ey * ey).sqrt().max(1e-9);
            (p.0 + ex / el * 11.0, p.1 + ey / el * 11.0)
        };
        let (s, e) = (trim(p1, ctrl), trim(p2, ctrl));
        let stroke = 1.0
            + if qmax > 0.0 {
                3.0 * q.abs() / qmax
            } else {
                0.0
            };
        let _ = writeln!(
            out,
            "<path d=\"M{} {} Q{} {} {} {}\" fill=\"none\" stroke=\"#777777\" stroke-width=\"{}\" marker-end=\"url(#arrow)\"><title>{}</title></path>",
            n(s.0),
            n(s.1),
            n(ctrl.0),
            n(ctrl.1),
            n(e.0),
            n(e.1),
            n(stroke),
            esc(&link.formula.to_string())
        );
        let apex = (mid.0 + nx * bend, mid.1 + ny * bend);
        // A flow at round-off level (a link between two nodes at one temperature) reads as 0.
        let shown = if q.abs() <= 1e-9 * qmax { 0.0 } else { q.abs() };
        let flow = format_quantity(Quantity::new(shown, Dim::POWER), system);
        let halo = "font-size=\"10\" paint-order=\"stroke\" stroke=\"white\" stroke-width=\"3\"";
        svg::text(&mut out, apex.0, apex.1 - 8.0, "middle", halo, &link.name);
        svg::text(
            &mut out,
            apex.0,
            apex.1 + 4.0,
            "middle",
            &format!("{halo} font-weight=\"bold\""),
            &flow,
        );
    }
    for (i, node) in net.nodes.iter().enumerate() {
        let (x, y) = pos(i);
        let fill = shade(t[i]);
        let tip = esc(&node.name);
        if node.fixed.is_some() {
            let _ = writeln!(out, "<rect x=\"{}\" y=\"{}\" width=\"16\" height=\"16\" fill=\"{fill}\" stroke=\"#222222\"><title>{tip}</title></rect>", n(x - 8.0), n(y - 8.0));
        } else {
            let _ = writeln!(out, "<circle cx=\"{}\" cy=\"{}\" r=\"8\" fill=\"{fill}\" stroke=\"#222222\"><title>{tip}</title></circle>", n(x), n(y));
        }
        let temp = format_quantity(
            Quantity {
                value: t[i],
                dim: Dim::TEMPERATURE,
                kind: TempKind::Point,
            },
            system,
        );
        svg::text(
            &mut out,
            x,
            y + 24.0,
            "middle",
            "font-size=\"11\"",
            &node.name,
        );
        svg::text(
            &mut out,
            x,
            y + 37.0,
            "middle",
            "font-size=\"11\" fill=\"#444444\"",
            &temp,
        );
    }
    let legend = "Squares: fixed temperatures; circles: solved nodes. Warmest on the left. Arrows point the way heat flows; thicker lines carry more heat.";
    svg::text(
        &mut out,
        16.0,
        height - 14.0,
        "start",
        "font-size=\"11\" fill=\"#444444\"",
        legend,
    );
    svg::close(&mut out);
    Some(out)
}

#[cfg(test)]
mod tests {
    use super::columns;

    #[test]
    fn columns_follow_temperature_warmest_first() {
        assert_eq!(columns(&[293.15, 265.15, 280.0, 293.15]), vec![0, 2, 1, 0]);
        let many: Vec<f64> = (0..30).map(|i| 300.0 - i as f64).collect();
        let c = columns(&many);
        assert_eq!((c[0], c[29]), (0, 11));
        assert!(c.windows(2).all(|w| w[0] <= w[1]));
    }
}
