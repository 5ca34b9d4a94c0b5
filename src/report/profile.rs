//! The temperature profile along a path of nodes: which path, where each node sits on it, and
//! the SVG chart.
//!
//! A node's position is the thermal resistance passed from the first node (per area, m²·K/W,
//! when every step crosses the same area, as in a build-up). Along a series chain the heat flow
//! is the same in every step, so the temperature falls linearly with that position (Fourier's
//! law integrated over each layer): a straight line means one heat flow, a kink a branch.

use super::svg::{self, esc, n};
use caloris_compiler::network::Network;
use caloris_compiler::results::Solution;
use caloris_compiler::units::{display_unit, Dim, TempKind, UnitSystem};
use std::fmt::Write;

/// A path of nodes with positions along it.
pub struct Profile {
    pub nodes: Vec<usize>,
    /// Cumulative resistance at each node, SI (K/W, or m²·K/W when `per_area`).
    pub position: Vec<f64>,
    pub per_area: bool,
    /// How the path was chosen, for the report.
    pub origin: String,
}

/// Links joining `a` and `b` directly, in either direction.
fn joining(net: &Network, a: usize, b: usize) -> Vec<usize> {
    (0..net.links.len())
        .filter(|&l| {
            (net.links[l].from == a && net.links[l].to == b)
                || (net.links[l].from == b && net.links[l].to == a)
        })
        .collect()
}

/// The path the analyst named with `--path`, checked step by step.
pub fn named_path(net: &Network, names: &[String]) -> Result<Vec<usize>, String> {
    let mut ids = Vec::new();
    for name in names {
        let id = net.node_id(name.trim()).ok_or_else(|| {
            let known = net.nodes.iter().map(|n| n.name.as_str());
            match caloris_compiler::diagnostic::did_you_mean(name.trim(), known) {
                Some(s) => format!("--path: no node `{}`; did you mean `{s}`?", name.trim()),
                None => format!("--path: no node `{}`", name.trim()),
            }
        })?;
        ids.push(id);
    }
    if ids.len() < 2 {
        return Err(
            "--path needs at least two nodes, e.g. `--path room,north.inside,outdoor`".into(),
        );
    }
    for w in ids.windows(2) {
        if joining(net, w[0], w[1]).is_empty() {
            return Err(format!(
                "--path: no link joins `{}` and `{}` directly; list every node along the way",
                net.nodes[w[0]].name, net.nodes[w[1]].name
            ));
        }
    }
    Ok(ids)
}

/// A sensible default: through the first build-up use from its first node to its last,
/// interface nodes included; without build-ups, the shortest chain of links from the warmest
/// node to the coldest.
pub fn default_path(net: &Network, sol: &Solution) -> Option<(Vec<usize>, String)> {
    if let Some(g) = net.groups.first() {
        let mut path = vec![g.from];
        path.extend(g.links.iter().map(|&l| net.links[l].to));
        return Some((
            path,
            format!(
                "through the build-up use `{}` (the first in the model), interface nodes included",
                g.name
            ),
        ));
    }
    let t = &sol.temperatures;
    let by_temp = |better: fn(f64, f64) -> bool| {
        (0..t.len()).fold(None, |best: Option<usize>, i| {
            if best.is_none_or(|b| better(t[i], t[b])) {
                Some(i)
            } else {
                best
            }
        })
    };
    let (hot, cold) = (by_temp(|a, b| a > b)?, by_temp(|a, b| a < b)?);
    if hot == cold {
        return None;
    }
    // Breadth-first search: fewest links, ties to the lower node index (deterministic).
    let mut neighbours = vec![Vec::new(); net.nodes.len()];
    for l in &net.links {
        neighbours[l.from].push(l.to);
        neighbours[l.to].push(l.from);
    }
    let mut prev = vec![usize::MAX; net.nodes.len()];
    let mut queue = std::collections::VecDeque::from([hot]);
    prev[hot] = hot;
    while let Some(a) = queue.pop_front() {
        let mut next = std::mem::take(&mut neighbours[a]);
        next.sort_unstable();
        for b in next {
            if prev[b] == usize::MAX {
                prev[b] = a;
                queue.push_back(b);
            }
        }
    }
    if prev[cold] == usize::MAX {
        return None;
    }
    let mut path = vec![cold];
    while *path.last()? != hot {
        path.push(prev[*path.last()?]);
    }
    path.reverse();
    Some((
        path,
        format!(
            "from the warmest node `{}` to the coldest `{}` over the fewest links",
            net.nodes[hot].name, net.nodes[cold].name
        ),
    ))
}

/// Positions along the path: the resistance of the links joining each pair (in parallel when
/// several do), summed from the start.
pub fn profile(net: &Network, temps: &[f64], nodes: Vec<usize>, origin: String) -> Profile {
    let mut by_pair: std::collections::HashMap<(usize, usize), Vec<usize>> = Default::default();
    for (i, l) in net.links.iter().enumerate() {
        by_pair
            .entry((l.from.min(l.to), l.from.max(l.to)))
            .or_default()
            .push(i);
    }
    let steps: Vec<(f64, Option<f64>)> = nodes
        .windows(2)
        .map(|w| {
            let links = by_pair
                .get(&(w[0].min(w[1]), w[0].max(w[1])))
                .cloned()
                .unwrap_or_default();
            let g: f64 = links
                .iter()
                .map(|&l| net.links[l].conductance_at(temps))
                .sum();
            let areas: Vec<Option<f64>> = links.iter().map(|&l| net.links[l].area).collect();
            let area = if areas.len() == 1 { areas[0] } else { None };
            (1.0 / g, area)
        })
        .collect();
    let common_area = steps.first().and_then(|s| s.1).filter(|a| {
        steps
            .iter()
            .all(|s| s.1.is_some_and(|b| (b - a).abs() <= 1e-12 * a))
    });
    let mut position = vec![0.0];
    for (r, _) in &steps {
        let step = common_area.map_or(*r, |a| r * a);
        position.push(position.last().copied().unwrap_or(0.0) + step);
    }
    Profile {
        nodes,
        position,
        per_area: common_area.is_some(),
        origin,
    }
}

/// Positions at least `gap` apart, each as close to its wish as that allows, none beyond `max`.
fn spread(wish: &[f64], gap: f64, max: f64) -> Vec<f64> {
    let mut a = wish.to_vec();
    for i in 1..a.len() {
        a[i] = a[i].max(a[i - 1] + gap);
    }
    if let Some(last) = a.last_mut() {
        *last = last.min(max);
    }
    for i in (0..a.len().saturating_sub(1)).rev() {
        a[i] = a[i].min(a[i + 1] - gap);
    }
    a
}

/// The chart as SVG text.
pub fn svg(p: &Profile, net: &Network, sol: &Solution, system: UnitSystem, title: &str) -> String {
    let tu = display_unit(Dim::TEMPERATURE, TempKind::Point, system);
    let temps: Vec<f64> = p
        .nodes
        .iter()
        .map(|&i| tu.from_si(sol.temperatures[i]))
        .collect();
    let (rdim, per) = if p.per_area {
        (Dim::AREA_RESISTANCE, "per area")
    } else {
        (Dim::RESISTANCE, "")
    };
    let ru = display_unit(rdim, TempKind::NotTemperature, system);
    let xs: Vec<f64> = p.position.iter().map(|&x| ru.from_si(x)).collect();

    let (w, h) = (760.0, 520.0);
    let (left, right, top, bottom) = (78.0, 30.0, 48.0, 220.0);
    let (pw, ph) = (w - left - right, h - top - bottom);
    let xmax = xs.last().copied().unwrap_or(1.0).max(f64::MIN_POSITIVE);
    let (tmin, tmax) = temps
        .iter()
        .fold((f64::MAX, f64::MIN), |(a, b), &t| (a.min(t), b.max(t)));
    let pad = ((tmax - tmin) * 0.08).max(0.5);
    let (ylo, yhi) = (tmin - pad, tmax + pad);
    let sx = |x: f64| left + x / xmax * pw;
    let sy = |t: f64| top + (yhi - t) / (yhi - ylo) * ph;

    let mut out = String::new();
    svg::open(&mut out, w, h, title);
    svg::text(
        &mut out,
        w / 2.0,
        26.0,
        "middle",
        "font-size=\"15\" font-weight=\"bold\"",
        title,
    );
    for t in svg::ticks(ylo, yhi, 6) {
        let y = sy(t);
        let _ = writeln!(
            out,
            "<line x1=\"{}\" y1=\"{}\" x2=\"{}\" y2=\"{}\" stroke=\"#dddddd\"/>",
            n(left),
            n(y),
            n(left + pw),
            n(y)
        );
        svg::text(
            &mut out,
            left - 6.0,
            y + 4.0,
            "end",
            "",
            &caloris_compiler::units::format_number(t),
        );
    }
    for x in svg::ticks(0.0, xmax, 6) {
        let px = sx(x);
        let _ = writeln!(
            out,
            "<line x1=\"{}\" y1=\"{}\" x2=\"{}\" y2=\"{}\" stroke=\"#eeeeee\"/>",
            n(px),
            n(top),
            n(px),
            n(top + ph)
        );
        svg::text(
            &mut out,
            px,
            top + ph + 16.0,
            "middle",
            "fill=\"#555555\"",
            &caloris_compiler::units::format_number(x),
        );
    }
    let _ = writeln!(
        out,
        "<rect x=\"{}\" y=\"{}\" width=\"{}\" height=\"{}\" fill=\"none\" stroke=\"#333333\"/>",
        n(left),
        n(top),
        n(pw),
        n(ph)
    );
    let axis_y = format!("temperature, {}", tu.text);
    let _ = writeln!(
        out,
        "<text x=\"18\" y=\"{}\" text-anchor=\"middle\" transform=\"rotate(-90 18 {})\">{}</text>",
        n(top + ph / 2.0),
        n(top + ph / 2.0),
        esc(&axis_y)
    );
    let start = &net.nodes[p.nodes[0]].name;
    let axis_x = format!("thermal resistance {per} from {start}, {}", ru.text).replace("  ", " ");
    svg::text(&mut out, left + pw / 2.0, h - 10.0, "middle", "", &axis_x);

    let points: Vec<String> = xs
        .iter()
        .zip(&temps)
        .map(|(&x, &t)| format!("{},{}", n(sx(x)), n(sy(t))))
        .collect();
    let _ = writeln!(
        out,
        "<polyline points=\"{}\" fill=\"none\" stroke=\"#c8372d\" stroke-width=\"2\"/>",
        points.join(" ")
    );
    // A long path (a rod in many segments) labels about thirty of its nodes, first and last
    // always; every node keeps its point.
    let every = p.nodes.len().div_ceil(30).max(1);
    let labelled: Vec<usize> = (0..p.nodes.len())
        .filter(|&k| k % every == 0 || k + 1 == p.nodes.len())
        .collect();
    let wish: Vec<f64> = labelled.iter().map(|&k| sx(xs[k])).collect();
    let anchors = spread(&wish, 18.0, left + pw + right - 4.0);
    let radius = if p.nodes.len() > 60 { "1.5" } else { "4" };
    for ((&x, &t), &i) in xs.iter().zip(&temps).zip(&p.nodes) {
        let _ = writeln!(
            out,
            "<circle cx=\"{}\" cy=\"{}\" r=\"{radius}\" fill=\"#c8372d\"><title>{}</title></circle>",
            n(sx(x)),
            n(sy(t)),
            esc(&net.nodes[i].name)
        );
    }
    for (&k, &ax) in labelled.iter().zip(&anchors) {
        let (px, t, i) = (sx(xs[k]), temps[k], p.nodes[k]);
        // Labels of close nodes are pushed apart and joined to their point by a leader line.
        let (l1, l2) = (top + ph + 22.0, top + ph + 34.0);
        let _ = writeln!(
            out,
            "<line x1=\"{}\" y1=\"{}\" x2=\"{}\" y2=\"{}\" stroke=\"#999999\"/>",
            n(px),
            n(l1),
            n(ax),
            n(l2)
        );
        let label = format!(
            "{} {} {}",
            net.nodes[i].name,
            caloris_compiler::units::format_number(t),
            tu.text
        );
        let ly = l2 + 8.0;
        let _ = writeln!(out, "<text x=\"{x}\" y=\"{y}\" text-anchor=\"end\" font-size=\"11\" transform=\"rotate(-55 {x} {y})\">{}</text>", esc(&label), x = n(ax + 3.0), y = n(ly));
    }
    svg::close(&mut out);
    out
}
