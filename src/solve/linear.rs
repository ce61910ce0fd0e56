//! Loads on a mesh, one solution of a factored system, and its recovery: displacements,
//! member-end forces, reactions and the equilibrium residual.

use nalgebra::Vector6;
use serde::Serialize;

use super::beam::{Side, fixed_end_forces, internal_forces_at, split_loads};
use super::element::transformation;
use super::forces::EndForces;
use super::mesh::Mesh;
use super::system::{Direction, Dof, FreeDirection, System, SystemError, element_matrices};
use crate::model::{LocalLoad, Model};

/// Loads applied to a mesh: nodal forces (global axes) and element loads (local axes).
#[derive(Debug, Clone, PartialEq, Default, Serialize)]
pub struct MeshLoads {
    /// `[Fx, Fy, Mz]` per mesh node, N and N·m.
    pub nodal: Vec<[f64; 3]>,
    /// Loads on each element, positions from the element's end i.
    pub element: Vec<Vec<LocalLoad>>,
}

impl MeshLoads {
    /// No load on `mesh`.
    pub fn zero(mesh: &Mesh) -> MeshLoads {
        MeshLoads {
            nodal: vec![[0.0; 3]; mesh.nodes.len()],
            element: vec![Vec::new(); mesh.elements.len()],
        }
    }

    /// Add load case `case` of `model` times `factor`.
    pub fn add_case(&mut self, model: &Model, mesh: &Mesh, case: usize, factor: f64) {
        if factor == 0.0 {
            return;
        }
        for nl in &model.load_cases[case].nodal {
            self.add_nodal(nl.node, [factor * nl.fx, factor * nl.fy, factor * nl.mz]);
        }
        for (m, loads) in model.local_loads(case).into_iter().enumerate() {
            for load in loads {
                self.add_member_load(mesh, m, load.scaled(factor));
            }
        }
    }

    /// Add a load in member-local axes to member `m`, split over its elements.
    pub fn add_member_load(&mut self, mesh: &Mesh, m: usize, load: LocalLoad) {
        let range = mesh.member_elements[m].clone();
        let mut cuts: Vec<f64> = range.clone().map(|ie| mesh.elements[ie].x0).collect();
        let last = &mesh.elements[range.end - 1];
        cuts.push(last.x0 + last.length);
        for (ie, parts) in range.zip(split_loads(&[load], &cuts)) {
            // Most elements carry one or two loads: the first load sizes the list exactly
            // (rather than for four), later ones grow it as usual.
            let list = &mut self.element[ie];
            if list.is_empty() {
                list.reserve_exact(parts.len());
            }
            list.extend(parts);
        }
    }

    /// Add a nodal force `[Fx, Fy, Mz]`.
    pub fn add_nodal(&mut self, node: usize, f: [f64; 3]) {
        for (a, b) in self.nodal[node].iter_mut().zip(f) {
            *a += b;
        }
    }

    /// Total applied force and moment about the origin `[ΣFx, ΣFy, ΣMz]`, from the load
    /// definitions themselves (not from the solver's equivalent loads).
    pub fn resultant(&self, mesh: &Mesh) -> [f64; 3] {
        let mut r = [0.0; 3];
        for (n, f) in self.nodal.iter().enumerate() {
            let (x, y) = mesh.nodes[n];
            add_force(&mut r, x, y, f[0], f[1], f[2]);
        }
        for (ie, loads) in self.element.iter().enumerate() {
            let e = &mesh.elements[ie];
            let (xi, yi) = mesh.nodes[e.i];
            let (px, py, m) = element_resultant(e.length, loads);
            let (gx, gy) = (e.c * px - e.s * py, e.s * px + e.c * py);
            add_force(&mut r, xi, yi, gx, gy, m);
        }
        r
    }
}

fn add_force(r: &mut [f64; 3], x: f64, y: f64, fx: f64, fy: f64, m: f64) {
    r[0] += fx;
    r[1] += fy;
    r[2] += m + x * fy - y * fx;
}

/// Resultant of an element's loads in its local axes: `(Σpx, Σpy, moment about end i)`,
/// by the statics of [`internal_forces_at`] on the unsupported element, taken just past
/// end j so that every load counts: `N(L⁺) = −Σpx`, `V(L⁺) = Σpy` and
/// `M(L⁺) = Σpy·(L − a) − Σm`, so the moment about i is `V·L − M`.
pub fn element_resultant(length: f64, loads: &[LocalLoad]) -> (f64, f64, f64) {
    if loads.is_empty() {
        return (0.0, 0.0, 0.0);
    }
    let f = internal_forces_at(length, Side::Right, &EndForces::default(), loads);
    (-f.n, f.v, f.v * length - f.m)
}

/// Equilibrium check of one solution.
#[derive(Debug, Clone, PartialEq, Default, Serialize)]
pub struct Residual {
    /// Applied loads plus reactions, `[ΣFx (N), ΣFy (N), ΣMz about the origin (N·m)]`.
    pub global: [f64; 3],
    /// Out-of-balance `[Fx (N), Fy (N), Mz (N·m)]` at each node: applied load plus
    /// reaction less the member end actions on it.
    pub nodal: Vec<[f64; 3]>,
    /// Largest out-of-balance force at any free node, N (moments divided by a unit length).
    pub max_nodal: f64,
    /// Largest applied load component, N, for relative comparison.
    pub applied: f64,
}

impl Residual {
    /// The largest residual relative to the applied load (0 when nothing is applied).
    pub fn relative(&self) -> f64 {
        let worst = self
            .global
            .iter()
            .map(|v| v.abs())
            .fold(self.max_nodal, f64::max);
        if self.applied > 0.0 {
            worst / self.applied
        } else {
            worst
        }
    }
}

/// Everything one load vector produces on a mesh.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Response {
    /// `[ux (m), uy (m), θ (rad)]` per mesh node, global axes.
    pub displacements: Vec<[f64; 3]>,
    /// End actions of each element.
    pub element_forces: Vec<EndForces>,
    /// Reactions per mesh node `[Rx, Ry, Mz]`, nonzero only at supports and held DOFs.
    pub reactions: Vec<[f64; 3]>,
    pub residual: Residual,
}

/// Solve the factored `system` for `loads` and recover element forces and reactions.
pub fn respond(
    model: &Model,
    mesh: &Mesh,
    system: &System,
    loads: &MeshLoads,
) -> Result<Response, SystemError> {
    let axial = system.axial.as_deref();
    let p = equivalent_nodal_loads(model, mesh, &system.dofs, axial, loads)?;
    let mut f = vec![0.0; system.n];
    for (node, d) in system.dofs.iter().enumerate() {
        for k in 0..3 {
            if let Some(q) = d[k].equation() {
                f[q] += p[node][k];
            }
        }
    }
    let u = system.solve(&f);
    let displacements: Vec<[f64; 3]> = system
        .dofs
        .iter()
        .map(|d| {
            let g = |k: usize| d[k].equation().map_or(0.0, |q| u[q]);
            [g(0), g(1), g(2)]
        })
        .collect();
    Ok(recover(mesh, &system.dofs, axial, loads, displacements))
}

/// The nodal loads (global axes, per mesh node) equivalent to `loads`: the applied nodal
/// forces less every element's condensed fixed-end actions, for element stiffness with
/// the axial forces `axial` (geometric stiffness) if given.
///
/// A load on a rotation that nothing resists ([`Dof::Idle`]) makes the frame a mechanism
/// for this load: an error naming the node.
pub fn equivalent_nodal_loads(
    model: &Model,
    mesh: &Mesh,
    dofs: &[[Dof; 3]],
    axial: Option<&[f64]>,
    loads: &MeshLoads,
) -> Result<Vec<[f64; 3]>, SystemError> {
    let terms = LoadTerms::new(mesh, loads);
    equivalent_nodal_loads_with(model, mesh, dofs, axial, loads, &terms)
}

/// What `loads` gives every solution on `mesh`, whatever the stiffness: each element's
/// fixed-end actions (every DOF held, local axes), the applied resultant and the largest
/// applied component. Worked out once, it serves every iteration of a second-order
/// analysis.
#[derive(Debug, Clone)]
pub struct LoadTerms {
    /// Fixed-end actions of each element ([`fixed_end_forces`]).
    fixed_end: Vec<Vector6<f64>>,
    /// [`MeshLoads::resultant`].
    resultant: [f64; 3],
    /// Largest applied load component, N (see [`Residual::applied`]).
    applied: f64,
}

impl LoadTerms {
    /// The terms of `loads` on `mesh`.
    pub fn new(mesh: &Mesh, loads: &MeshLoads) -> LoadTerms {
        let fixed_end = mesh
            .elements
            .iter()
            .zip(&loads.element)
            .map(|(e, l)| Vector6::from(fixed_end_forces(e.length, l).to_array()))
            .collect();
        let resultant = loads.resultant(mesh);
        let applied = loads
            .nodal
            .iter()
            .flat_map(|p| p.iter())
            .chain(resultant.iter().take(2))
            .map(|v| v.abs())
            .chain(mesh.elements.iter().zip(&loads.element).map(|(e, l)| {
                let (px, py, _) = element_resultant(e.length, l);
                px.hypot(py)
            }))
            .fold(0.0, f64::max);
        LoadTerms {
            fixed_end,
            resultant,
            applied,
        }
    }
}

/// [`equivalent_nodal_loads`] with the load's [`LoadTerms`] worked out already.
pub fn equivalent_nodal_loads_with(
    model: &Model,
    mesh: &Mesh,
    dofs: &[[Dof; 3]],
    axial: Option<&[f64]>,
    loads: &MeshLoads,
    terms: &LoadTerms,
) -> Result<Vec<[f64; 3]>, SystemError> {
    let mut p = loads.nodal.clone();
    // Unresisted loads on idle rotations make the frame a mechanism for this load.
    let mut idle_loaded = Vec::new();
    for (node, load) in loads.nodal.iter().enumerate() {
        for (d, (&dof, &pd)) in dofs[node].iter().zip(load).enumerate() {
            if dof == Dof::Idle && pd != 0.0 {
                idle_loaded.push(FreeDirection {
                    node,
                    direction: Direction::ALL[d],
                    place: mesh.describe_node(model, node),
                });
            }
        }
    }
    if !idle_loaded.is_empty() {
        return Err(SystemError::Mechanism(idle_loaded));
    }
    // Condensed fixed-end actions of every element; their negatives load the nodes.
    for (ie, e) in mesh.elements.iter().enumerate() {
        if loads.element[ie].is_empty() {
            continue;
        }
        let (_, fl) = element_matrices(e, axial.map(|a| a[ie]), &terms.fixed_end[ie]);
        let fg = transformation(e.c, e.s).transpose() * fl;
        for k in 0..3 {
            p[e.i][k] -= fg[k];
            p[e.j][k] -= fg[3 + k];
        }
    }
    Ok(p)
}

/// Element end actions, reactions and the equilibrium residual from the displacements of
/// every mesh node (global axes), for element stiffness with the axial forces `axial`
/// (geometric stiffness) if given. `dofs` tells supports, springs and free directions.
pub fn recover(
    mesh: &Mesh,
    dofs: &[[Dof; 3]],
    axial: Option<&[f64]>,
    loads: &MeshLoads,
    displacements: Vec<[f64; 3]>,
) -> Response {
    let terms = LoadTerms::new(mesh, loads);
    recover_with(mesh, dofs, axial, loads, &terms, displacements)
}

/// [`recover`] with the load's [`LoadTerms`] worked out already.
pub fn recover_with(
    mesh: &Mesh,
    dofs: &[[Dof; 3]],
    axial: Option<&[f64]>,
    loads: &MeshLoads,
    terms: &LoadTerms,
    displacements: Vec<[f64; 3]>,
) -> Response {
    // Element end actions and the forces they put on the nodes.
    let mut on_nodes = vec![[0.0; 3]; mesh.nodes.len()];
    let mut element_forces = Vec::with_capacity(mesh.elements.len());
    for (ie, e) in mesh.elements.iter().enumerate() {
        let (kl, fl) = element_matrices(e, axial.map(|a| a[ie]), &terms.fixed_end[ie]);
        let t = transformation(e.c, e.s);
        let (a, b) = (displacements[e.i], displacements[e.j]);
        let ug = Vector6::new(a[0], a[1], a[2], b[0], b[1], b[2]);
        let end = kl * (t * ug) + fl;
        let eg = t.transpose() * end;
        for k in 0..3 {
            on_nodes[e.i][k] += eg[k];
            on_nodes[e.j][k] += eg[3 + k];
        }
        element_forces.push(EndForces::from_array(end.into()));
    }
    // Node balance: applied + reaction = Σ element end actions (global).
    let mut reactions = vec![[0.0; 3]; mesh.nodes.len()];
    let mut nodal = vec![[0.0; 3]; mesh.nodes.len()];
    for (node, d) in dofs.iter().enumerate() {
        for k in 0..3 {
            let out_of_balance = on_nodes[node][k] - loads.nodal[node][k];
            match d[k] {
                Dof::Held => reactions[node][k] = out_of_balance,
                Dof::Spring(_, ks) => {
                    reactions[node][k] = -ks * displacements[node][k];
                    nodal[node][k] = reactions[node][k] - out_of_balance;
                }
                Dof::Free(_) | Dof::Idle => nodal[node][k] = -out_of_balance,
            }
        }
    }
    let mut global = terms.resultant;
    for (node, r) in reactions.iter().enumerate() {
        let (x, y) = mesh.nodes[node];
        add_force(&mut global, x, y, r[0], r[1], r[2]);
    }
    let applied = terms.applied;
    Response {
        displacements,
        element_forces,
        reactions,
        residual: Residual {
            global,
            max_nodal: nodal.iter().flatten().fold(0.0, |m, v| m.max(v.abs())),
            nodal,
            applied,
        },
    }
}
