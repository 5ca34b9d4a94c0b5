//! Two-dimensional rectangular regions (a plate, a wall section) meshed into the network.
//!
//! The rectangle is cut into nx × ny equal cells, one node per cell centre (`NAME.i.j`, i from
//! the left edge, j from the bottom edge). Neighbouring cells are joined by conduction through
//! their shared face, G = k·(t·Δy)/Δx across x and k·(t·Δx)/Δy across y (the standard
//! finite-volume form of Fourier's law, second-order accurate). An edge attaches every edge
//! cell to a node, either held at the node's temperature across half a cell
//! (G = k·t·Δy/(Δx/2)) or through an element such as a film, via a surface node per edge cell
//! (`NAME.left.j`). The faces (`front`, `back`) attach every cell through an element over its
//! area Δx·Δy. A linear temperature field is reproduced exactly; the results include the field
//! and the heat flux vector of every cell.
//!
//! This module holds the region as meshed and its field; `mesh` checks a region's arguments
//! and builds its cells, edges and faces into the network.

mod mesh;

pub use mesh::{Plan, RegionArgs, MAX_CELLS, REGION};

use crate::network::{LinkId, NodeId};
use crate::span::Span;
use serde::Serialize;

/// A region as meshed, kept in the network for results.
#[derive(Clone, Debug, Serialize)]
pub struct Region {
    pub name: String,
    pub span: Span,
    pub nx: usize,
    pub ny: usize,
    pub width: f64,
    pub height: f64,
    pub thickness: f64,
    /// Node id of cell (1, 1); cell (i, j) is `first_node + (j−1)·nx + (i−1)`.
    pub first_node: NodeId,
    /// Per cell, the links through its west, east, south and north faces, each with the sign
    /// that turns the link's heat flow into a flow in +x (west, east) or +y (south, north).
    pub faces: Vec<[Option<(LinkId, f64)>; 4]>,
}

/// One cell of a solved region.
#[derive(Clone, Debug, Serialize)]
pub struct CellResult {
    pub i: usize,
    pub j: usize,
    pub x_m: f64,
    pub y_m: f64,
    pub temperature_k: f64,
    /// Heat flux vector at the cell centre, W/m²: the mean of the flows through its two x faces
    /// (two y faces) over the face area.
    pub heat_flux_w_per_m2: [f64; 2],
}

impl Region {
    pub fn cell(&self, i: usize, j: usize) -> NodeId {
        self.first_node + (j - 1) * self.nx + (i - 1)
    }
    pub(crate) fn dx(&self) -> f64 {
        self.width / self.nx as f64
    }
    pub(crate) fn dy(&self) -> f64 {
        self.height / self.ny as f64
    }

    /// The temperature field and flux vectors for solved temperatures and link heat flows.
    pub fn field(&self, temperatures: &[f64], heat_flows: &[f64]) -> Vec<CellResult> {
        let (dx, dy) = (self.dx(), self.dy());
        let flow = |f: Option<(LinkId, f64)>| f.map(|(l, s)| s * heat_flows[l]).unwrap_or(0.0);
        let mut out = Vec::with_capacity(self.nx * self.ny);
        for j in 1..=self.ny {
            for i in 1..=self.nx {
                let f = self.faces[(j - 1) * self.nx + (i - 1)];
                let qx = 0.5 * (flow(f[0]) + flow(f[1])) / (self.thickness * dy);
                let qy = 0.5 * (flow(f[2]) + flow(f[3])) / (self.thickness * dx);
                out.push(CellResult {
                    i,
                    j,
                    x_m: (i as f64 - 0.5) * dx,
                    y_m: (j as f64 - 0.5) * dy,
                    temperature_k: temperatures[self.cell(i, j)],
                    heat_flux_w_per_m2: [qx, qy],
                });
            }
        }
        out
    }
}
