//! Final and extreme values of a model's transient run, for the language server's hover. The
//! server calls [`summarize`] on a blocking thread, off the request path, and sets `cancel` when a
//! newer edit supersedes the run; a cancelled run returns what it reached, marked as stopped.

use super::run::{run_transient, Hooks, Record, RunOptions};
use super::RunError;
use crate::analysis::Analysis;
use crate::network::NodeId;
use serde::Serialize;
use std::sync::atomic::AtomicBool;

/// One node's temperatures over the run, K and s from the run's start.
#[derive(Clone, Debug, Serialize)]
pub struct NodeSummary {
    pub node: NodeId,
    pub name: String,
    pub final_k: f64,
    pub max_k: f64,
    pub max_time_s: f64,
    pub min_k: f64,
    pub min_time_s: f64,
}

#[derive(Clone, Debug, Serialize)]
pub struct RunSummary {
    /// The `transient` declaration that was run.
    pub run: String,
    pub duration_s: f64,
    /// Time reached: the duration, or less when stopped early.
    pub reached_s: f64,
    pub stopped_early: bool,
    /// Every node, indexed like the network.
    pub nodes: Vec<NodeSummary>,
}

/// Run the first `transient` declared in the model (in file order) and summarise every node.
/// `None` when the model has errors or declares no transient run.
pub fn summarize(analysis: &Analysis, cancel: &AtomicBool) -> Option<Result<RunSummary, RunError>> {
    if analysis.has_errors() {
        return None;
    }
    let spec = analysis.studies.runs.first()?;
    let options = RunOptions {
        record: Record::Nothing,
        ..RunOptions::default()
    };
    let hooks = Hooks {
        cancel: Some(cancel),
        progress: None,
    };
    Some(
        run_transient(&analysis.network, &analysis.limits, spec, &options, hooks).map(|r| {
            RunSummary {
                run: r.name.clone(),
                duration_s: r.duration,
                reached_s: r.stats.end_time,
                stopped_early: r.interrupted,
                nodes: r
                    .nodes
                    .iter()
                    .enumerate()
                    .map(|(i, tr)| NodeSummary {
                        node: i,
                        name: analysis.network.nodes[i].name.clone(),
                        final_k: tr.last,
                        max_k: tr.max,
                        max_time_s: tr.max_time,
                        min_k: tr.min,
                        min_time_s: tr.min_time,
                    })
                    .collect(),
            }
        }),
    )
}
