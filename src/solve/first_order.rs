//! First-order (linear elastic) solution of a model: one factorization, any number of
//! load cases, results combined linearly by load factors.

use serde::Serialize;

use super::beam::{SpanExtremes, Station, span_extremes, stations};
use super::forces::EndForces;
use super::linear::{MeshLoads, Residual, Response, respond};
use super::mesh::{MemberStiffness, Mesh, member_stiffness};
use super::system::{Restraints, System, SystemError};
use crate::model::{LocalLoad, Model};

/// Results of one load vector at model level (the model's nodes and members).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Solution {
    /// `[ux (m), uy (m), θ (rad)]` per model node, global axes.
    pub displacements: Vec<[f64; 3]>,
    /// `[Rx (N), Ry (N), Mz (N·m)]` per model node; zero where the node is free.
    pub reactions: Vec<[f64; 3]>,
    /// End actions of each member in its local axes (see [`super::forces`]).
    pub end_forces: Vec<EndForces>,
    /// Equilibrium check (for a combination: the sum of |factor| × each part's residual).
    pub residual: Residual,
}

impl Solution {
    /// Model-level view of a mesh response.
    pub fn from_response(mesh: &Mesh, r: &Response) -> Solution {
        let nm = mesh.model_nodes;
        let end_forces = mesh
            .member_elements
            .iter()
            .map(|range| EndForces {
                i: r.element_forces[range.start].i,
                j: r.element_forces[range.end - 1].j,
            })
            .collect();
        Solution {
            displacements: r.displacements[..nm].to_vec(),
            reactions: r.reactions[..nm].to_vec(),
            end_forces,
            residual: Residual {
                nodal: r.residual.nodal[..nm].to_vec(),
                ..r.residual.clone()
            },
        }
    }

    /// A solution with every value zero, shaped like `like`.
    pub fn zero_like(like: &Solution) -> Solution {
        Solution {
            displacements: vec![[0.0; 3]; like.displacements.len()],
            reactions: vec![[0.0; 3]; like.reactions.len()],
            end_forces: vec![EndForces::default(); like.end_forces.len()],
            residual: Residual::default(),
        }
    }

    /// `self += f · other` (first-order results are linear in the loads).
    pub fn add_scaled(&mut self, f: f64, other: &Solution) {
        for (a, b) in self.displacements.iter_mut().zip(&other.displacements) {
            (0..3).for_each(|k| a[k] += f * b[k]);
        }
        for (a, b) in self.reactions.iter_mut().zip(&other.reactions) {
            (0..3).for_each(|k| a[k] += f * b[k]);
        }
        for (a, b) in self.end_forces.iter_mut().zip(&other.end_forces) {
            a.add_scaled(f, b);
        }
        let r = &mut self.residual;
        (0..3).for_each(|k| r.global[k] += f.abs() * other.residual.global[k].abs());
        r.nodal.resize(other.residual.nodal.len(), [0.0; 3]);
        for (a, b) in r.nodal.iter_mut().zip(&other.residual.nodal) {
            (0..3).for_each(|k| a[k] += f.abs() * b[k].abs());
        }
        r.max_nodal += f.abs() * other.residual.max_nodal;
        r.applied += f.abs() * other.residual.applied;
    }

    /// Linear combination `Σ fᵢ·solutionᵢ`; `parts` must not be empty.
    pub fn combine(parts: &[(f64, &Solution)]) -> Solution {
        let mut out = Solution::zero_like(parts[0].1);
        for (f, s) in parts {
            out.add_scaled(*f, s);
        }
        out
    }

    /// Transverse displacement (local y) of the ends of member `m`, m.
    pub fn transverse_end_displacements(&self, model: &Model, m: usize) -> (f64, f64) {
        let (c, s) = model.cosines(m);
        let mem = &model.members[m];
        let v = |n: usize| -s * self.displacements[n][0] + c * self.displacements[n][1];
        (v(mem.i), v(mem.j))
    }
}

/// A model's first-order system: the mesh with one element per member, factored once.
#[derive(Debug, Clone)]
pub struct FirstOrder {
    pub stiffness: Vec<MemberStiffness>,
    pub mesh: Mesh,
    pub system: System,
}

impl FirstOrder {
    /// Assemble and factor the model's stiffness under its supports plus the X translation
    /// of the nodes in `held_x` held (empty for the free frame).
    pub fn new(model: &Model, held_x: &[usize]) -> Result<FirstOrder, SystemError> {
        let stiffness = member_stiffness(model);
        let mesh = Mesh::new(model, &stiffness, 1);
        let restraints = Restraints::from_model(model, &mesh).hold_x(held_x);
        let system = System::new(model, &mesh, &restraints, None)?;
        Ok(FirstOrder {
            stiffness,
            mesh,
            system,
        })
    }

    /// Solve arbitrary mesh loads.
    pub fn solve_loads(&self, model: &Model, loads: &MeshLoads) -> Result<Solution, SystemError> {
        let r = respond(model, &self.mesh, &self.system, loads)?;
        Ok(Solution::from_response(&self.mesh, &r))
    }

    /// Solve load case `case` (index into `model.load_cases`).
    pub fn solve_case(&self, model: &Model, case: usize) -> Result<Solution, SystemError> {
        let mut loads = MeshLoads::zero(&self.mesh);
        loads.add_case(model, &self.mesh, case, 1.0);
        self.solve_loads(model, &loads)
    }
}

/// Solve one load case of `model` on the free frame.
pub fn solve_case(model: &Model, case: usize) -> Result<Solution, SystemError> {
    FirstOrder::new(model, &[])?.solve_case(model, case)
}

/// Member loads (local axes) of a combination `Σ fᵢ·caseᵢ`, per member.
pub fn combined_member_loads(model: &Model, factors: &[(usize, f64)]) -> Vec<Vec<LocalLoad>> {
    let mut out = vec![Vec::new(); model.members.len()];
    for &(case, f) in factors {
        for (m, loads) in model.local_loads(case).into_iter().enumerate() {
            out[m].extend(loads.into_iter().map(|l| l.scaled(f)));
        }
    }
    out
}

/// Internal-force and deflection diagram of member `m` in `solution`, with `count`
/// stations plus every load breakpoint; `loads` are the member's local loads.
pub fn member_diagram(
    model: &Model,
    stiffness: &[MemberStiffness],
    solution: &Solution,
    m: usize,
    loads: &[LocalLoad],
    count: usize,
) -> Vec<Station> {
    let (v_i, v_j) = solution.transverse_end_displacements(model, m);
    stations(
        model.length(m),
        stiffness[m].ei,
        &solution.end_forces[m],
        loads,
        v_i,
        v_j,
        count,
    )
}

/// Exact extreme span moments of member `m` in `solution`.
pub fn member_extremes(
    model: &Model,
    solution: &Solution,
    m: usize,
    loads: &[LocalLoad],
) -> SpanExtremes {
    span_extremes(model.length(m), &solution.end_forces[m], loads)
}
