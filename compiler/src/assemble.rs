//! The one place where nodes, links, build-up groups, figures and regions enter the network.
//!
//! Every pass of elaboration that makes them — declared nodes, the faces and internal nodes that
//! declarations generate, a region's cells, edges and surface nodes, element links and the parts
//! an element expands into, build-up uses — goes through an [`Assembler`], so that every node
//! can be found by name as soon as it exists, and every generated node is in the symbol table as
//! a child of the declaration that made it (hover, go-to-definition and references rely on it).
//! The network itself (`crate::network`) stays plain data.

use crate::elements::Figure;
use crate::network::{
    FigureRule, Group, Link, LinkFigure, LinkId, Network, Node, NodeId, RadiusCheck, SolvedFigure,
};
use crate::region::Region;
use crate::span::Span;
use crate::symbols::{Symbol, SymbolKind, SymbolTable};
use crate::units::TempKind;
use rustc_hash::FxHashMap;

/// The network being built, with an index of its nodes by name.
#[derive(Default)]
pub struct Assembler {
    net: Network,
    index: FxHashMap<String, NodeId>,
}

/// What made a generated node: the declaration's name (the symbol's parent), where that name is
/// written and the whole declaration.
#[derive(Clone, Copy)]
pub struct Origin<'a> {
    pub parent: &'a str,
    pub def: Span,
    pub decl: Span,
}

impl Assembler {
    /// The network so far.
    pub fn net(&self) -> &Network {
        &self.net
    }

    /// The node called `name`. A name given to two nodes (a duplicate declaration, already
    /// reported) finds the later one.
    pub fn node_id(&self, name: &str) -> Option<NodeId> {
        self.index.get(name).copied()
    }

    /// A declared node; its symbol was made when names were collected.
    pub fn declared_node(&mut self, node: Node) -> NodeId {
        let id = self.net.nodes.len();
        self.index.insert(node.name.clone(), id);
        self.net.nodes.push(node);
        id
    }

    /// A node made by a declaration: in the network, and in the symbol table as a child of
    /// `origin.parent`.
    pub fn generated_node(
        &mut self,
        name: String,
        span: Span,
        load: f64,
        symbols: &mut SymbolTable,
        origin: Origin,
    ) -> NodeId {
        symbols.push(Symbol {
            name: name.clone(),
            kind: SymbolKind::GeneratedNode,
            def: origin.def,
            decl: origin.decl,
            refs: Vec::new(),
            parent: Some(origin.parent.to_string()),
        });
        self.declared_node(Node {
            name,
            span,
            fixed: None,
            load,
            generated: true,
        })
    }

    /// Heat put into a node by an element that generates it.
    pub fn add_load(&mut self, node: NodeId, load: f64) {
        self.net.nodes[node].load += load;
    }

    pub fn link(&mut self, link: Link) -> LinkId {
        self.net.links.push(link);
        self.net.links.len() - 1
    }

    /// A named figure of a link known before the solve, such as a fin's efficiency or a
    /// shape factor (SI units, `dim` its dimension).
    pub fn figure(&mut self, link: LinkId, f: Figure) {
        self.net.figures.push(LinkFigure {
            link,
            name: f.name,
            value: f.value,
            dim: f.dim,
            kind: TempKind::NotTemperature,
        });
    }

    /// A figure of a link that the solution works out from its temperatures (a fin's tip).
    pub fn solved_figure(&mut self, link: LinkId, name: &'static str, rule: FigureRule) {
        self.net
            .solved_figures
            .push(SolvedFigure { link, name, rule });
    }

    /// A complete build-up use; its element links learn which group they belong to here, so no
    /// link ever names a group that was not added.
    pub fn group(&mut self, group: Group) -> usize {
        let id = self.net.groups.len();
        for &l in &group.links {
            self.net.links[l].group = Some(id);
        }
        self.net.groups.push(group);
        id
    }

    /// A critical-radius check (W110) to make once the computed film `check.film` is solved.
    pub fn radius_check(&mut self, check: RadiusCheck) {
        self.net.radius_checks.push(check);
    }

    /// A meshed region, for its temperature and flux fields.
    pub fn region(&mut self, region: Region) {
        self.net.regions.push(region);
    }

    /// The finished network, with the capacities and schedules of transient runs.
    pub fn finish(self, dynamics: crate::transient::model::Dynamics) -> Network {
        let mut net = self.net;
        net.dynamics = dynamics;
        net
    }
}
