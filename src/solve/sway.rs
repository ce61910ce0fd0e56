//! The no-sway / sway split of a first-order solution.
//!
//! * **No-sway**: the frame held against sidesway at every story level. Each level is held
//!   as a floor would hold it: the mean X translation of the level's nodes is zero, and the
//!   holding force `λ` of the level is shared equally among those nodes. With axially rigid
//!   beams this is the same as holding every node of the level; with real beams it leaves
//!   the beams free to shorten, so a symmetric frame under symmetric load has no holding
//!   force and no sway part.
//! * **Sway**: the free frame under the reversed holding forces.
//! * The first-order total is their sum (superposition; `tests/first_order.rs` checks it).
//!
//! Everything rests on one factorization of the free frame: a load's free solution `F`,
//! the unit solutions `U_l` (a unit X force shared equally by the nodes of level l), and
//! the small system `Σ_m A_lm·λ_m = −ū_l(F)` with `A_lm` the mean X translation of level l
//! under `U_m`. Then no-sway = `F + Σ λ_m·U_m` and sway = `−Σ λ_m·U_m`. Only `A` is kept
//! (factored once); `Σ λ_m·U_m` is solved as one load vector when needed.

use nalgebra::{DMatrix, DVector};
use serde::Serialize;

use super::first_order::{FirstOrder, Solution};
use super::linear::{MeshLoads, recover};
use super::mesh::Mesh;
use super::system::SystemError;
use crate::model::{Model, Restraint};
use crate::stories::Story;

/// The no-sway and sway parts of one load vector.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct SwayParts {
    pub no_sway: Solution,
    pub sway: Solution,
    /// Holding force of each story's top level in the no-sway solution, N (positive in +X,
    /// the force the hold exerts on the frame).
    pub holding: Vec<f64>,
}

impl SwayParts {
    /// The first-order total: no-sway + sway.
    pub fn total(&self) -> Solution {
        Solution::combine(&[(1.0, &self.no_sway), (1.0, &self.sway)])
    }

    /// `self += f · other`.
    pub fn add_scaled(&mut self, f: f64, other: &SwayParts) {
        self.no_sway.add_scaled(f, &other.no_sway);
        self.sway.add_scaled(f, &other.sway);
        for (a, b) in self.holding.iter_mut().zip(&other.holding) {
            *a += f * b;
        }
    }

    /// Linear combination `Σ fᵢ·partsᵢ`; `parts` must not be empty.
    pub fn combine(parts: &[(f64, &SwayParts)]) -> SwayParts {
        let first = parts[0].1;
        let mut out = SwayParts {
            no_sway: Solution::zero_like(&first.no_sway),
            sway: Solution::zero_like(&first.sway),
            holding: vec![0.0; first.holding.len()],
        };
        for (f, p) in parts {
            out.add_scaled(*f, p);
        }
        out
    }
}

/// The factored free frame and the level flexibility of the split.
///
/// Memory grows linearly with the frame plus one row of the level flexibility per level:
/// the unit level solutions are not kept, only their mean level translations. A lateral
/// load at the levels is solved on the free frame's factorization when asked for.
#[derive(Debug, Clone)]
pub struct SwaySplit {
    pub free: FirstOrder,
    /// Per story: the nodes of its top level that the split holds (those not held in X by
    /// a support). Empty for a level the supports already hold.
    pub level_nodes: Vec<Vec<usize>>,
    /// `A_lm`: mean X translation of level l under a unit X force (1 N) shared equally by
    /// the nodes of level m, LU-factored once.
    flexibility: nalgebra::LU<f64, nalgebra::Dyn, nalgebra::Dyn>,
}

impl SwaySplit {
    /// Factor the free frame of `model` and find the level flexibility of `stories`: one
    /// solve per level on the free frame's factorization.
    pub fn new(model: &Model, stories: &[Story]) -> Result<SwaySplit, SystemError> {
        let free = FirstOrder::new(model, &[])?;
        let held_by_support = |n: usize| {
            model
                .supports
                .iter()
                .any(|s| s.node == n && s.dofs[0] == Restraint::Fixed)
        };
        let level_nodes: Vec<Vec<usize>> = stories
            .iter()
            .map(|s| {
                let nodes: Vec<usize> = s.top_nodes.clone();
                if nodes.iter().any(|&n| held_by_support(n)) {
                    Vec::new()
                } else {
                    nodes
                }
            })
            .collect();
        let nl = stories.len();
        let mut flexibility = DMatrix::zeros(nl, nl);
        for m in 0..nl {
            let mut h = vec![0.0; nl];
            h[m] = 1.0;
            let u = level_displacements(&free, &level_nodes, &h);
            // (the same solve as `unit_displacements`, before `self` exists)
            for l in 0..nl {
                flexibility[(l, m)] = mean_x(&u, &level_nodes[l]);
            }
        }
        for l in 0..nl {
            if level_nodes[l].is_empty() {
                flexibility[(l, l)] = 1.0;
            }
        }
        Ok(SwaySplit {
            free,
            level_nodes,
            flexibility: flexibility.lu(),
        })
    }

    /// Empty loads on the first-order mesh.
    pub fn zero_loads(&self) -> MeshLoads {
        MeshLoads::zero(&self.free.mesh)
    }

    /// Split the response to `loads` into its no-sway and sway parts.
    pub fn split(&self, model: &Model, loads: &MeshLoads) -> Result<SwayParts, SystemError> {
        let free = self.free.solve_loads(model, loads)?;
        let ubar = DVector::from_iterator(
            self.level_nodes.len(),
            self.level_nodes.iter().map(|nodes| -mean_ux(&free, nodes)),
        );
        let holding: Vec<f64> = self
            .flexibility
            .solve(&ubar)
            .map(|v| v.iter().copied().collect())
            .unwrap_or_else(|| vec![0.0; self.level_nodes.len()]);
        let sway = self.lateral(&holding.iter().map(|h| -h).collect::<Vec<_>>());
        let no_sway = Solution::combine(&[(1.0, &free), (-1.0, &sway)]);
        Ok(SwayParts {
            no_sway,
            sway,
            holding,
        })
    }

    /// Split load case `case`.
    pub fn split_case(&self, model: &Model, case: usize) -> Result<SwayParts, SystemError> {
        let mut loads = self.zero_loads();
        loads.add_case(model, &self.free.mesh, case, 1.0);
        self.split(model, &loads)
    }

    /// Node displacements of the free frame under a unit X force (1 N) at level `l`, shared
    /// equally by its nodes (one solve; nothing is stored).
    pub fn unit_displacements(&self, l: usize) -> Vec<[f64; 3]> {
        let mut h = vec![0.0; self.level_nodes.len()];
        h[l] = 1.0;
        level_displacements(&self.free, &self.level_nodes, &h)
    }

    /// Node displacements of the free frame under lateral forces `h[l]` (N, +X) at the
    /// story levels, each shared equally by the level's nodes (one solve; nothing stored).
    pub fn level_force_displacements(&self, h: &[f64]) -> Vec<[f64; 3]> {
        level_displacements(&self.free, &self.level_nodes, h)
    }

    /// The free frame under lateral forces `h[l]` (N, +X) at the story levels, each shared
    /// equally among the level's nodes (one solve on the free frame's factorization).
    pub fn lateral(&self, h: &[f64]) -> Solution {
        let mesh = &self.free.mesh;
        let loads = level_loads(mesh, &self.level_nodes, h);
        let system = &self.free.system;
        let u = level_displacements(&self.free, &self.level_nodes, h);
        let r = recover(mesh, &system.dofs, None, &loads, u);
        let mut out = Solution::from_response(mesh, &r);
        out.residual = Default::default();
        out
    }
}

/// Nodal loads of lateral forces `h[l]` at the levels, each shared equally among the
/// level's nodes.
fn level_loads(mesh: &Mesh, level_nodes: &[Vec<usize>], h: &[f64]) -> MeshLoads {
    let mut loads = MeshLoads::zero(mesh);
    for (nodes, &f) in level_nodes.iter().zip(h) {
        for &n in nodes {
            loads.add_nodal(n, [f / nodes.len() as f64, 0.0, 0.0]);
        }
    }
    loads
}

/// Displacements of every node of the free frame under lateral forces `h[l]` at the levels.
fn level_displacements(free: &FirstOrder, level_nodes: &[Vec<usize>], h: &[f64]) -> Vec<[f64; 3]> {
    let system = &free.system;
    let mut f = vec![0.0; system.n];
    for (nodes, &hl) in level_nodes.iter().zip(h) {
        for &n in nodes {
            if let Some(q) = system.dofs[n][0].equation() {
                f[q] += hl / nodes.len() as f64;
            }
        }
    }
    let u = system.solve(&f);
    system
        .dofs
        .iter()
        .map(|d| {
            let g = |k: usize| d[k].equation().map_or(0.0, |q| u[q]);
            [g(0), g(1), g(2)]
        })
        .collect()
}

/// Mean X translation of `nodes` in the node displacements `u` (0 for no nodes), m.
pub fn mean_x(u: &[[f64; 3]], nodes: &[usize]) -> f64 {
    if nodes.is_empty() {
        return 0.0;
    }
    nodes.iter().map(|&n| u[n][0]).sum::<f64>() / nodes.len() as f64
}

/// Mean X translation of `nodes` in `s` (0 for no nodes), m.
pub fn mean_ux(s: &Solution, nodes: &[usize]) -> f64 {
    if nodes.is_empty() {
        return 0.0;
    }
    mean_x(&s.displacements, nodes)
}
