//! A region's arguments, checked like an element's, and its meshing: cell nodes, the links
//! between neighbouring cells, and the attachment of edges and faces to their nodes, all added
//! through the [`Assembler`].
// Diagnostics are returned by value throughout the compiler; boxing them here alone would
// split the element API.
#![allow(clippy::result_large_err)]

use super::Region;
use crate::assemble::{Assembler, Origin};
use crate::diagnostic::Diagnostic;
use crate::elements::shell::{conduction_law, conductivity};
use crate::elements::{material, q, ArgSpec, Args, Built, ElementKind, Formula};
use crate::network::{Link, LinkLaw, NodeId};
use crate::span::Span;
use crate::symbols::SymbolTable;
use crate::units::Dim;

/// Most cells a region may have (a typing slip must not exhaust memory).
pub const MAX_CELLS: usize = 250_000;

/// The region's own arguments, checked like an element's.
pub struct RegionArgs;

/// The arguments of a region (the schema's entry for `region`).
pub const REGION: &[ArgSpec] = &[
    material("the region's material (gives k)").either("k"),
    q(
        "k",
        Dim::CONDUCTIVITY,
        "conductivity, instead of a material",
    )
    .either("material"),
    q(
        "thickness",
        Dim::LENGTH,
        "thickness t of the plate (out of the plane)",
    )
    .required(),
    q("width", Dim::LENGTH, "size along x (left to right)").required(),
    q("height", Dim::LENGTH, "size along y (bottom to top)").required(),
    q("cells_x", Dim::NONE, "number of cells along x")
        .required()
        .count(MAX_CELLS as u32),
    q("cells_y", Dim::NONE, "number of cells along y")
        .required()
        .count(MAX_CELLS as u32),
    q(
        "load",
        Dim::POWER,
        "heat generated in the region, spread evenly over its cells",
    )
    .default("none"),
];

impl ElementKind for RegionArgs {
    fn name(&self) -> &'static str {
        "region"
    }
    fn summary(&self) -> &'static str {
        "a rectangular plate or wall section meshed into cells"
    }
    fn params(&self) -> &'static [ArgSpec] {
        REGION
    }
    fn build(&self, _: &Args) -> Result<Built, Diagnostic> {
        Ok(Built {
            conductance: 0.0,
            area: None,
            formula: Formula::default(),
        })
    }
}

/// A region being built: its checked size and material, before edges are attached.
pub struct Plan {
    pub region: Region,
    args: Args,
    load: f64,
}

/// A number of cells: a whole number from 1 to [`MAX_CELLS`], checked with the arguments
/// (`Range::Count`).
fn count(a: &Args, name: &str) -> Result<usize, Diagnostic> {
    Ok(a.require(name, "cells_x = 20")? as usize)
}

impl Plan {
    pub fn new(name: &str, span: Span, args: Args) -> Result<Plan, Diagnostic> {
        let example = "region plate (aluminium, thickness = 2 mm, width = 100 mm, height = 60 mm, cells_x = 20, cells_y = 12) { ... }";
        conductivity(&args, example)?;
        let thickness = args.require("thickness", "thickness = 2 mm")?;
        let width = args.require("width", "width = 100 mm")?;
        let height = args.require("height", "height = 60 mm")?;
        let (nx, ny) = (count(&args, "cells_x")?, count(&args, "cells_y")?);
        if nx * ny > MAX_CELLS {
            return Err(Diagnostic::error(
                "E216",
                format!("{nx} × {ny} cells is more than the {MAX_CELLS} a region may have"),
                args.span("cells_x"),
            )
            .with_label("too many cells")
            .with_help("use fewer cells; check the numbers for a slip"));
        }
        let load = args.get("load").unwrap_or(0.0);
        let region = Region {
            name: name.to_string(),
            span,
            nx,
            ny,
            width,
            height,
            thickness,
            first_node: 0,
            faces: vec![[None; 4]; nx * ny],
        };
        Ok(Plan { region, args, load })
    }

    /// Add the cell nodes (so links and limits can name `NAME.i.j`), each in the symbol table
    /// as a child of the region.
    pub fn add_nodes(&mut self, asm: &mut Assembler, symbols: &mut SymbolTable, decl: Span) {
        let r = &mut self.region;
        r.first_node = asm.net().nodes.len();
        let per_cell = self.load / (r.nx * r.ny) as f64;
        let origin = Origin {
            parent: &r.name,
            def: r.span,
            decl,
        };
        for j in 1..=r.ny {
            for i in 1..=r.nx {
                let name = format!("{}.{i}.{j}", r.name);
                asm.generated_node(name, r.span, per_cell, symbols, origin);
            }
        }
    }

    /// The law of conduction through a cell of shape `shape`. Only the law is kept: the link's
    /// formula is the one `push` gives it.
    fn conduction(&self, shape: f64) -> LinkLaw {
        let k = conductivity(&self.args, "").unwrap_or(f64::NAN);
        conduction_law(
            &self.args,
            shape,
            Built {
                conductance: k * shape,
                area: None,
                formula: Formula::default(),
            },
        )
        .0
    }

    /// Join neighbouring cells.
    pub fn add_internal_links(&mut self, asm: &mut Assembler) {
        let (nx, ny, t) = (self.region.nx, self.region.ny, self.region.thickness);
        let (dx, dy) = (self.region.dx(), self.region.dy());
        let sx = t * dy / dx;
        let sy = t * dx / dy;
        for j in 1..=ny {
            for i in 1..=nx {
                let here = (j - 1) * nx + (i - 1);
                if i < nx {
                    let law = self.conduction(sx);
                    let id = self.push(
                        asm,
                        format!("{}.x.{i}.{j}", self.region.name),
                        self.region.cell(i, j),
                        self.region.cell(i + 1, j),
                        law,
                        "region",
                    );
                    self.region.faces[here][1] = Some((id, 1.0));
                    self.region.faces[here + 1][0] = Some((id, 1.0));
                }
                if j < ny {
                    let law = self.conduction(sy);
                    let id = self.push(
                        asm,
                        format!("{}.y.{i}.{j}", self.region.name),
                        self.region.cell(i, j),
                        self.region.cell(i, j + 1),
                        law,
                        "region",
                    );
                    self.region.faces[here][3] = Some((id, 1.0));
                    self.region.faces[here + nx][2] = Some((id, 1.0));
                }
            }
        }
    }

    /// Add one link of the mesh, with the formula of its law.
    fn push(
        &self,
        asm: &mut Assembler,
        name: String,
        from: NodeId,
        to: NodeId,
        law: LinkLaw,
        kind: &str,
    ) -> crate::network::LinkId {
        let formula = match &law {
            LinkLaw::Linear { conductance } => {
                Formula::new("R = {}", &[(1.0 / conductance, Dim::RESISTANCE)])
            }
            _ => Formula::Text("k(T) conduction between cells".to_string()),
        };
        asm.link(Link {
            name,
            span: self.region.span,
            from,
            to,
            law,
            area: None,
            kind: kind.to_string(),
            formula,
            group: None,
        })
    }

    /// The area an element on this side covers per cell (edge cell face, or cell face).
    pub fn cell_area(&self, side: &str) -> f64 {
        let r = &self.region;
        match side {
            "left" | "right" => r.thickness * r.dy(),
            "bottom" | "top" => r.thickness * r.dx(),
            _ => r.dx() * r.dy(),
        }
    }

    /// Attach a side to `node`: held across half a cell (no element), or through `element`
    /// (its law per cell, built over `cell_area(side)`) via a surface node per cell.
    pub fn attach(
        &mut self,
        asm: &mut Assembler,
        symbols: &mut SymbolTable,
        decl: Span,
        side: &str,
        node: NodeId,
        element: Option<(&str, LinkLaw)>,
    ) {
        let (nx, ny, t) = (self.region.nx, self.region.ny, self.region.thickness);
        let (dx, dy) = (self.region.dx(), self.region.dy());
        let name = self.region.name.clone();
        // (cell index, face slot, sign of "out of the cell" in the face's axis, half-cell shape)
        let cells: Vec<(usize, usize, Option<usize>, f64)> = match side {
            "left" => (1..=ny)
                .map(|j| (1, j, Some(0), t * dy / (dx / 2.0)))
                .collect(),
            "right" => (1..=ny)
                .map(|j| (nx, j, Some(1), t * dy / (dx / 2.0)))
                .collect(),
            "bottom" => (1..=nx)
                .map(|i| (i, 1, Some(2), t * dx / (dy / 2.0)))
                .collect(),
            "top" => (1..=nx)
                .map(|i| (i, ny, Some(3), t * dx / (dy / 2.0)))
                .collect(),
            _ => (1..=ny)
                .flat_map(|j| (1..=nx).map(move |i| (i, j, None, dx * dy / (t / 2.0))))
                .collect(),
        };
        for (i, j, slot, half) in cells {
            let cell = self.region.cell(i, j);
            let label = match side {
                "left" | "right" => format!("{j}"),
                "bottom" | "top" => format!("{i}"),
                _ => format!("{i}.{j}"),
            };
            // Heat leaving the cell through the west or south face flows in −x or −y.
            let sign = match slot {
                Some(0) | Some(2) => -1.0,
                _ => 1.0,
            };
            let first_link = asm.net().links.len();
            match &element {
                None => {
                    let law = self.conduction(half);
                    self.push(
                        asm,
                        format!("{name}.{side}.{label}"),
                        cell,
                        node,
                        law,
                        "region edge",
                    );
                }
                Some((kind, law)) => {
                    let origin = Origin {
                        parent: &name,
                        def: self.region.span,
                        decl,
                    };
                    let surface = asm.generated_node(
                        format!("{name}.{side}.{label}"),
                        self.region.span,
                        0.0,
                        symbols,
                        origin,
                    );
                    let half_law = self.conduction(half);
                    self.push(
                        asm,
                        format!("{name}.{side}.{label}.in"),
                        cell,
                        surface,
                        half_law,
                        "region edge",
                    );
                    self.push(
                        asm,
                        format!("{name}.{side}.{label}.out"),
                        surface,
                        node,
                        law.clone(),
                        kind,
                    );
                }
            }
            if let Some(s) = slot {
                self.region.faces[(j - 1) * nx + (i - 1)][s] = Some((first_link, sign));
            }
        }
    }
}
