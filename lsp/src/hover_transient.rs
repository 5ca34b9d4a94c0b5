//! The transient run's figures in hover: a node's final, peak and lowest temperatures, and a
//! table of them on the `transient` declaration; a capacity node's capacity, Biot number and
//! time constants from the steady solve. The run happens in the worker after the solve;
//! hover only reads what is there and says "running…" until then.

use crate::display::{both, one, point, q, time};
use crate::snapshot::{Snapshot, TransientState};
use caloris_compiler::network::NodeId;
use caloris_compiler::transient::{NodeSummary, RunSummary};
use caloris_compiler::units::{format_number, Dim, UnitSystem};
use std::fmt::Write;

/// Rows in the declaration's table before the rest are counted instead of listed.
const TABLE_ROWS: usize = 12;

/// The paragraph a node's hover ends with; `None` when the model declares no transient run.
pub fn node_paragraph(snap: &Snapshot, id: NodeId, sys: UnitSystem) -> Option<String> {
    let run = &snap.analysis.studies.runs.first()?.name;
    Some(match snap.transient_state() {
        TransientState::NotDeclared => return None,
        TransientState::Running => format!("Transient `{run}`: _running…_"),
        TransientState::Failed(e) => format!("Transient `{run}` stopped: {e}"),
        TransientState::Done(s) => {
            let n = s.nodes.get(id)?;
            let mut out = format!(
                "Transient `{run}`: final **{}**, peak {} at t = {}, lowest {} at t = {}",
                both(point(n.final_k), sys),
                both(point(n.max_k), sys),
                time(n.max_time_s),
                both(point(n.min_k), sys),
                time(n.min_time_s),
            );
            out.push_str(&reached(s));
            out
        }
    })
}

/// " (stopped at …)" when the run ended before its duration.
fn reached(s: &RunSummary) -> String {
    if s.reached_s < s.duration_s {
        format!(
            " (stopped at t = {} of {})",
            time(s.reached_s),
            time(s.duration_s)
        )
    } else {
        String::new()
    }
}

/// The paragraph under a `transient` declaration's text.
pub fn declaration_paragraph(snap: &Snapshot, name: &str, sys: UnitSystem) -> String {
    let runs = &snap.analysis.studies.runs;
    let first = runs.first().map(|r| r.name.as_str());
    if first.is_some_and(|f| f != name) {
        return format!(
            "_The editor runs only the first transient (`{}`); `caloris run` runs this one._",
            first.unwrap_or_default()
        );
    }
    match snap.transient_state() {
        TransientState::NotDeclared => {
            "_Not run: the model has errors (see the problems list)._".to_string()
        }
        TransientState::Running => "_Running…_".to_string(),
        TransientState::Failed(e) => format!("The run stopped: {e}"),
        TransientState::Done(s) => table(snap, s, sys),
    }
}

/// Free nodes the user declared first, then the generated ones (faces, cells, copies).
fn rows<'a>(snap: &Snapshot, s: &'a RunSummary) -> Vec<&'a NodeSummary> {
    let nodes = &snap.analysis.network.nodes;
    let free = |n: &&NodeSummary| nodes.get(n.node).is_some_and(|d| d.fixed.is_none());
    let mut rows: Vec<&NodeSummary> = s
        .nodes
        .iter()
        .filter(free)
        .filter(|n| !nodes[n.node].generated)
        .collect();
    rows.extend(
        s.nodes
            .iter()
            .filter(free)
            .filter(|n| nodes[n.node].generated),
    );
    rows
}

fn table(snap: &Snapshot, s: &RunSummary, sys: UnitSystem) -> String {
    let mut out = format!("Over {}{}:\n\n", time(s.duration_s), reached(s));
    out.push_str("| node | final | peak (t) | lowest (t) |\n|---|---|---|---|\n");
    let rows = rows(snap, s);
    for n in rows.iter().take(TABLE_ROWS) {
        let _ = writeln!(
            out,
            "| `{}` | {} | {} ({}) | {} ({}) |",
            n.name,
            one(point(n.final_k), sys),
            one(point(n.max_k), sys),
            time(n.max_time_s),
            one(point(n.min_k), sys),
            time(n.min_time_s),
        );
    }
    if rows.len() > TABLE_ROWS {
        let _ = write!(
            out,
            "\n…and {} more free nodes (hover a node, or `caloris run`).\n",
            rows.len() - TABLE_ROWS
        );
    }
    out.push_str("\nTimes from the run's start.");
    out
}

/// A capacity node's capacity (both unit systems), Biot number and R·C, with the network's
/// slowest and fastest time constants; nothing for a node without capacity.
pub fn capacity_lines(a: &caloris_compiler::Analysis, id: usize, sys: UnitSystem) -> String {
    let Some(sol) = a.solution.as_ref() else {
        return String::new();
    };
    let Some(d) = sol.capacity_nodes.iter().find(|d| d.node == id) else {
        return String::new();
    };
    let mut out = format!("\n\nCapacity {}", both(q(d.capacity, Dim::CAPACITY), sys));
    if let Some(bi) = d.biot {
        let _ = write!(out, " · Biot number {}", format_number(bi));
    }
    if let Some((tau, l)) = d.rc {
        let _ = write!(
            out,
            " · R·C {} through `{}`",
            both(q(tau, Dim::TIME), sys),
            a.network.links[l].name
        );
    }
    if let Some(tc) = &sol.time_constants {
        let _ = write!(
            out,
            "\n\nNetwork time constants: slowest {}, fastest {}",
            both(q(tc.slowest, Dim::TIME), sys),
            both(q(tc.fastest, Dim::TIME), sys)
        );
    }
    out
}
