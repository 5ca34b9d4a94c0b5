//! The interface between a network and the integrator: for the current temperatures, assemble
//! the conductance matrix G and the right-hand side, so that the net heat into each free node is
//! f(x) = rhs − G·x. A linear network gives the same G at every time and temperature, so the
//! integrator factors C/(d·h) + G once per step size; a nonlinear one (radiation, k(T)) gives G
//! and rhs linearised about `x`, and the integrator iterates (Newton's method).

use super::model::Driven;
use super::schedule::Schedule;
use crate::network::{Network, NodeId};
use faer::sparse::Triplet;

pub type Entry = Triplet<usize, usize, f64>;

/// A system of heat balances C·dx/dt = f(t, x) over the free nodes.
pub trait HeatSystem {
    /// Number of unknowns.
    fn len(&self) -> usize;
    fn is_empty(&self) -> bool {
        self.len() == 0
    }
    /// Heat capacity of each unknown, J/K; zero for an unknown that stores no heat.
    fn capacity(&self) -> &[f64];
    /// True when G does not depend on time or temperature.
    fn is_linear(&self) -> bool;
    /// True when G is symmetric and [`HeatSystem::assemble`] gives its lower triangle; false
    /// when it gives every entry of a general G (the Jacobian of a network with radiation or
    /// k(T) links, whose slopes differ at a link's two ends).
    fn symmetric(&self) -> bool {
        true
    }
    /// For temperatures `x` (K) at time `t` (s from the run's start): the entries of G (W/K;
    /// the lower triangle when [`HeatSystem::symmetric`], else all; duplicates are summed; every
    /// diagonal entry present, possibly zero) into `g` when asked, always in the same order and
    /// count; and `rhs` (W), with f(x') ≈ rhs − G·x' near `x` (exact for a linear system).
    fn assemble(&self, t: f64, x: &[f64], g: Option<&mut Vec<Entry>>, rhs: &mut [f64]);
    /// Times in `(t0, t1]` where an input has a corner; the automatic step lands on them.
    fn corners(&self, t0: f64, t1: f64, out: &mut Vec<f64>);
}

/// A network's free nodes as a [`HeatSystem`], with schedules on its fixed nodes and loads.
pub struct NetworkSystem<'a> {
    pub net: &'a Network,
    /// Unknown of each node (`usize::MAX` for fixed nodes).
    pub index: Vec<usize>,
    /// Node of each unknown.
    pub free: Vec<NodeId>,
    capacity: Vec<f64>,
    /// The schedules' clock time at the run's start, s.
    start: f64,
    fixed_schedules: Vec<Option<&'a Schedule>>,
    load_schedules: Vec<Option<&'a Schedule>>,
    /// `(unknown, fixed node, G)` for every link between a free and a fixed node (used when
    /// every link is linear).
    boundary_links: Vec<(usize, NodeId, f64)>,
    /// True when every link is linear (constant conductance).
    linear: bool,
}

impl<'a> NetworkSystem<'a> {
    pub fn new(net: &'a Network, start: f64) -> NetworkSystem<'a> {
        let n_all = net.nodes.len();
        let mut index = vec![usize::MAX; n_all];
        let mut free = Vec::new();
        for (i, node) in net.nodes.iter().enumerate() {
            if node.fixed.is_none() {
                index[i] = free.len();
                free.push(i);
            }
        }
        let all_c = net.dynamics.capacity_vector(n_all);
        let capacity = free.iter().map(|&i| all_c[i]).collect();
        let fixed_schedules = (0..n_all)
            .map(|i| net.dynamics.schedule_of(i, Driven::Fixed))
            .collect();
        let load_schedules = (0..n_all)
            .map(|i| net.dynamics.schedule_of(i, Driven::Load))
            .collect();
        let linear = net.links.iter().all(|l| l.law.is_linear());
        let mut boundary_links = Vec::new();
        for l in net.links.iter().filter(|_| linear) {
            match (index[l.from], index[l.to]) {
                (usize::MAX, usize::MAX) => {}
                (a, usize::MAX) => boundary_links.push((a, l.to, l.conductance())),
                (usize::MAX, b) => boundary_links.push((b, l.from, l.conductance())),
                _ => {}
            }
        }
        NetworkSystem {
            net,
            index,
            free,
            capacity,
            start,
            fixed_schedules,
            load_schedules,
            boundary_links,
            linear,
        }
    }

    /// Temperature of node `i` given the unknowns `x` at time `t`, K.
    fn temperature(&self, i: NodeId, t: f64, x: &[f64]) -> f64 {
        match self.index[i] {
            usize::MAX => self.fixed_temperature(i, t),
            k => x[k],
        }
    }

    /// G and rhs of a network with nonlinear links, linearised about `x`: every link's flow
    /// Q(T_from, T_to) and its two slopes (`LinkLaw::flow`) give the Jacobian of the heat
    /// balances, G = −∂f/∂x, stored whole, and rhs = f(x) + G·x.
    fn assemble_nonlinear(
        &self,
        t: f64,
        x: &[f64],
        mut g: Option<&mut Vec<Entry>>,
        rhs: &mut [f64],
    ) {
        for (k, &i) in self.free.iter().enumerate() {
            rhs[k] = self.load(i, t);
        }
        if let Some(out) = g.as_deref_mut() {
            out.clear();
            for k in 0..self.free.len() {
                out.push(Triplet::new(k, k, 0.0));
            }
        }
        for l in &self.net.links {
            let (a, b) = (self.index[l.from], self.index[l.to]);
            if a == usize::MAX && b == usize::MAX {
                continue;
            }
            let (ta, tb) = (self.temperature(l.from, t, x), self.temperature(l.to, t, x));
            let (q, d_from, d_to) = l.law.flow(ta, tb);
            // Heat leaves `from` (balance −Q) and enters `to` (balance +Q).
            if a != usize::MAX {
                rhs[a] += -q + d_from * ta + if b != usize::MAX { d_to * tb } else { 0.0 };
            }
            if b != usize::MAX {
                rhs[b] += q - d_to * tb - if a != usize::MAX { d_from * ta } else { 0.0 };
            }
            if let Some(out) = g.as_deref_mut() {
                if a != usize::MAX {
                    out.push(Triplet::new(a, a, d_from));
                }
                if b != usize::MAX {
                    out.push(Triplet::new(b, b, -d_to));
                }
                if a != usize::MAX && b != usize::MAX {
                    out.push(Triplet::new(a, b, d_to));
                    out.push(Triplet::new(b, a, -d_from));
                }
            }
        }
    }

    /// Temperature of a fixed node at time `t` of the run, K.
    pub fn fixed_temperature(&self, node: NodeId, t: f64) -> f64 {
        match self.fixed_schedules[node] {
            Some(s) => s.value(self.start + t),
            None => self.net.nodes[node].fixed.unwrap_or(f64::NAN),
        }
    }

    /// Heat load of a node at time `t` of the run, W.
    pub fn load(&self, node: NodeId, t: f64) -> f64 {
        match self.load_schedules[node] {
            Some(s) => s.value(self.start + t),
            None => self.net.nodes[node].load,
        }
    }

    /// Every node's temperature at time `t`, given the unknowns `x`.
    pub fn full_state(&self, t: f64, x: &[f64], out: &mut [f64]) {
        for (i, slot) in out.iter_mut().enumerate() {
            *slot = match self.index[i] {
                usize::MAX => self.fixed_temperature(i, t),
                k => x[k],
            };
        }
    }
}

impl HeatSystem for NetworkSystem<'_> {
    fn len(&self) -> usize {
        self.free.len()
    }
    fn capacity(&self) -> &[f64] {
        &self.capacity
    }
    fn is_linear(&self) -> bool {
        self.linear
    }
    fn symmetric(&self) -> bool {
        self.linear
    }
    fn assemble(&self, t: f64, x: &[f64], g: Option<&mut Vec<Entry>>, rhs: &mut [f64]) {
        if !self.linear {
            return self.assemble_nonlinear(t, x, g, rhs);
        }
        for (k, &i) in self.free.iter().enumerate() {
            rhs[k] = self.load(i, t);
        }
        for &(k, b, g) in &self.boundary_links {
            rhs[k] += g * self.fixed_temperature(b, t);
        }
        if let Some(out) = g {
            out.clear();
            for k in 0..self.free.len() {
                out.push(Triplet::new(k, k, 0.0));
            }
            for l in &self.net.links {
                let g = l.conductance();
                match (self.index[l.from], self.index[l.to]) {
                    (usize::MAX, usize::MAX) => {}
                    (a, usize::MAX) | (usize::MAX, a) => out.push(Triplet::new(a, a, g)),
                    (a, b) => {
                        out.push(Triplet::new(a, a, g));
                        out.push(Triplet::new(b, b, g));
                        out.push(Triplet::new(a.max(b), a.min(b), -g));
                    }
                }
            }
        }
    }
    fn corners(&self, t0: f64, t1: f64, out: &mut Vec<f64>) {
        let before = out.len();
        for s in self
            .fixed_schedules
            .iter()
            .chain(&self.load_schedules)
            .flatten()
        {
            s.corners(self.start + t0, self.start + t1, out);
        }
        for t in &mut out[before..] {
            *t -= self.start;
        }
    }
}
