//! The assembled and factored stiffness system of one mesh under one set of restraints.
//!
//! Degrees of freedom are numbered node by node in reverse Cuthill–McKee order of the mesh
//! graph, so the skyline profile of `K` stays narrow and the cost of a solution grows with
//! the profile, not with n². The system is factored once and then solves any number of
//! load vectors (every load case of a model shares one factorization).

use nalgebra::{Matrix6, Vector6};
use serde::Serialize;

use super::element::{condense, elastic_stiffness, geometric_stiffness, transformation};
use super::mesh::Mesh;
use super::ordering::rcm;
use super::skyline::{FactorError, SkylineFactor, SkylineMatrix};
use crate::model::{Model, Restraint};

/// Direction of a nodal degree of freedom.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, strum::Display)]
pub enum Direction {
    #[strum(serialize = "X")]
    X,
    #[strum(serialize = "Y")]
    Y,
    #[strum(serialize = "rotation")]
    Rotation,
}

impl Direction {
    pub const ALL: [Direction; 3] = [Direction::X, Direction::Y, Direction::Rotation];
}

/// What a nodal degree of freedom is in the system.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub enum Dof {
    /// An unknown, with its equation number.
    Free(usize),
    /// An unknown with an elastic support spring (N/m or N·m/rad).
    Spring(usize, f64),
    /// Held by a support (or by the no-sway restraint): a reaction, no unknown.
    Held,
    /// A rotation that no element resists (every member is released there) and that no
    /// load acts on: left out, reported as zero.
    Idle,
}

impl Dof {
    /// The equation number, if this DOF is an unknown.
    pub fn equation(self) -> Option<usize> {
        match self {
            Dof::Free(k) | Dof::Spring(k, _) => Some(k),
            Dof::Held | Dof::Idle => None,
        }
    }
}

/// A degree of freedom that the system could not resist.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct FreeDirection {
    pub node: usize,
    pub direction: Direction,
    /// Readable place, e.g. "node N3" or "the point of member B2 at 1.500 m".
    pub place: String,
}

/// Why a system could not be factored.
#[derive(Debug, Clone, PartialEq, thiserror::Error, Serialize)]
pub enum SystemError {
    /// The stiffness matrix is singular: the frame is a mechanism.
    #[error("the frame is a mechanism: {} free to move", list(.0))]
    Mechanism(Vec<FreeDirection>),
    /// The stiffness including geometric stiffness is not positive definite: the load
    /// exceeds a critical load.
    #[error("the frame is unstable under this load: stiffness lost at {}", list(.0))]
    Unstable(Vec<FreeDirection>),
}

fn list(v: &[FreeDirection]) -> String {
    v.iter()
        .map(|f| format!("{} in {}", f.place, f.direction))
        .collect::<Vec<_>>()
        .join(", ")
}

/// Restraints of one analysis: the model's supports, plus nodes held in X (no-sway).
#[derive(Debug, Clone, PartialEq, Default)]
pub struct Restraints {
    /// Per mesh node and direction: the support condition.
    pub nodes: Vec<[Restraint; 3]>,
}

impl Restraints {
    /// The model's supports on a mesh.
    pub fn from_model(model: &Model, mesh: &Mesh) -> Restraints {
        let mut nodes = vec![[Restraint::Free; 3]; mesh.nodes.len()];
        for s in &model.supports {
            nodes[s.node] = s.dofs;
        }
        Restraints { nodes }
    }

    /// Hold the X translation of each of these nodes (where not already held).
    pub fn hold_x(mut self, held: &[usize]) -> Restraints {
        for &n in held {
            self.nodes[n][0] = Restraint::Fixed;
        }
        self
    }
}

/// Number the DOFs of `mesh` under `restraints`, node by node in RCM order.
///
/// A rotation with no rotational stiffness at all (every connected element released there
/// and no rotational support) is [`Dof::Idle`] unless `loaded_rotation[n]` says a moment
/// acts on it, in which case it stays an unknown and the factorization reports it.
pub fn number_dofs(mesh: &Mesh, restraints: &Restraints) -> (Vec<[Dof; 3]>, usize) {
    let nn = mesh.nodes.len();
    let mut adjacency = vec![Vec::new(); nn];
    let mut rot_stiff = vec![false; nn];
    for e in &mesh.elements {
        adjacency[e.i].push(e.j);
        adjacency[e.j].push(e.i);
        rot_stiff[e.i] |= !e.release[0];
        rot_stiff[e.j] |= !e.release[1];
    }
    let order = rcm(&adjacency);
    let mut dofs = vec![[Dof::Held; 3]; nn];
    let mut next = 0;
    for &n in &order {
        for (d, (slot, restraint)) in dofs[n].iter_mut().zip(restraints.nodes[n]).enumerate() {
            *slot = match restraint {
                Restraint::Fixed => Dof::Held,
                Restraint::Free if d == 2 && !rot_stiff[n] => Dof::Idle,
                Restraint::Free => {
                    next += 1;
                    Dof::Free(next - 1)
                }
                Restraint::Spring(k) => {
                    next += 1;
                    Dof::Spring(next - 1, k)
                }
            };
        }
    }
    (dofs, next)
}

/// Local stiffness of element `e` (elastic plus geometric for axial force `n`), with its
/// releases condensed, and the matching condensed fixed-end actions.
pub fn element_matrices(
    e: &super::mesh::Element,
    n: Option<f64>,
    fixed_end: &Vector6<f64>,
) -> (Matrix6<f64>, Vector6<f64>) {
    let mut k = elastic_stiffness(e.ea, e.ei, e.length);
    if let Some(n) = n {
        k += geometric_stiffness(n, e.length);
    }
    condense(&k, fixed_end, e.release)
}

/// An assembled, factored stiffness system.
#[derive(Debug, Clone)]
pub struct System {
    pub dofs: Vec<[Dof; 3]>,
    pub n: usize,
    /// Axial force per element used for the geometric stiffness, if any (N, tension +).
    pub axial: Option<Vec<f64>>,
    pub matrix: SkylineMatrix,
    pub factor: SkylineFactor,
}

impl System {
    /// Assemble and factor `K` (plus `K_G` for the element axial forces `axial`, if given).
    pub fn new(
        model: &Model,
        mesh: &Mesh,
        restraints: &Restraints,
        axial: Option<&[f64]>,
    ) -> Result<System, SystemError> {
        let (dofs, n) = number_dofs(mesh, restraints);
        let matrix = assemble(mesh, &dofs, n, axial);
        let factor = factor_or_locate(model, mesh, &dofs, &matrix, axial.is_some())?;
        Ok(System {
            dofs,
            n,
            axial: axial.map(<[f64]>::to_vec),
            matrix,
            factor,
        })
    }

    /// Solve `K·u = f` for one load vector (length `n`).
    pub fn solve(&self, f: &[f64]) -> Vec<f64> {
        let mut u = f.to_vec();
        self.factor.solve(&mut u);
        u
    }
}

/// Global DOF equation numbers of element `e` (None where held or idle).
pub fn element_equations(dofs: &[[Dof; 3]], e: &super::mesh::Element) -> [Option<usize>; 6] {
    let (a, b) = (dofs[e.i], dofs[e.j]);
    [
        a[0].equation(),
        a[1].equation(),
        a[2].equation(),
        b[0].equation(),
        b[1].equation(),
        b[2].equation(),
    ]
}

fn assemble(mesh: &Mesh, dofs: &[[Dof; 3]], n: usize, axial: Option<&[f64]>) -> SkylineMatrix {
    assemble_with(mesh, dofs, n, |ie, e| {
        let (kl, _) = element_matrices(e, axial.map(|a| a[ie]), &Vector6::zeros());
        let t = transformation(e.c, e.s);
        t.transpose() * kl * t
    })
}

/// Assemble `K` on the skyline profile of `mesh` from each element's stiffness in global
/// axes, `global(index, element)`, plus the support springs of `dofs`.
pub fn assemble_with(
    mesh: &Mesh,
    dofs: &[[Dof; 3]],
    n: usize,
    global: impl Fn(usize, &super::mesh::Element) -> Matrix6<f64>,
) -> SkylineMatrix {
    // Profile: first equation coupled to each equation.
    let mut first_row: Vec<usize> = (0..n).collect();
    for e in &mesh.elements {
        let eqs = element_equations(dofs, e);
        let lo = eqs.iter().flatten().min().copied();
        if let Some(lo) = lo {
            for &q in eqs.iter().flatten() {
                first_row[q] = first_row[q].min(lo);
            }
        }
    }
    let mut k = SkylineMatrix::new(first_row);
    for (ie, e) in mesh.elements.iter().enumerate() {
        let kg = global(ie, e);
        let eqs = element_equations(dofs, e);
        for (r, er) in eqs.iter().enumerate() {
            let Some(er) = *er else { continue };
            for (c, ec) in eqs.iter().enumerate() {
                let Some(ec) = *ec else { continue };
                if ec <= er {
                    k.add(ec, er, kg[(r, c)]);
                }
            }
        }
    }
    for d in dofs.iter().flatten() {
        if let Dof::Spring(q, ks) = *d {
            k.add(q, q, ks);
        }
    }
    k
}

/// Factor an assembled `matrix` of `mesh`; on failure, name the directions free to move:
/// a mechanism of the elastic frame, or (`geometric`, the matrix includes `K_G`) the place
/// where stability is lost.
pub fn factor_or_locate(
    model: &Model,
    mesh: &Mesh,
    dofs: &[[Dof; 3]],
    matrix: &SkylineMatrix,
    geometric: bool,
) -> Result<SkylineFactor, SystemError> {
    matrix
        .factor()
        .map_err(|err| located(model, mesh, dofs, matrix.n(), geometric, err))
}

/// [`factor_or_locate`] in the matrix's own storage (no copy of it is made).
pub fn factor_owned_or_locate(
    model: &Model,
    mesh: &Mesh,
    dofs: &[[Dof; 3]],
    matrix: SkylineMatrix,
    geometric: bool,
) -> Result<SkylineFactor, SystemError> {
    let n = matrix.n();
    matrix
        .into_factor()
        .map_err(|err| located(model, mesh, dofs, n, geometric, err))
}

/// The error of a failed factorization of `n` equations, with the directions free to move.
fn located(
    model: &Model,
    mesh: &Mesh,
    dofs: &[[Dof; 3]],
    n: usize,
    geometric: bool,
    err: FactorError,
) -> SystemError {
    let free = locate_free(mesh, model, dofs, n, geometric, err);
    if geometric {
        SystemError::Unstable(free)
    } else {
        SystemError::Mechanism(free)
    }
}

/// After a failed factorization, find the directions free to move: the near-null vector of
/// `K` (by inverse iteration on `K` with a tiny multiple of its diagonal added) names the
/// nodes and directions that move in the mechanism, largest first.
fn locate_free(
    mesh: &Mesh,
    model: &Model,
    dofs: &[[Dof; 3]],
    n: usize,
    geometric: bool,
    first: FactorError,
) -> Vec<FreeDirection> {
    let FactorError::NotPositiveDefinite { index, .. } = first;
    let fallback = || {
        find_equation(dofs, index)
            .map(|(node, d)| FreeDirection {
                node,
                direction: Direction::ALL[d],
                place: mesh.describe_node(model, node),
            })
            .into_iter()
            .collect::<Vec<_>>()
    };
    if geometric {
        // Loss of stability under K + K_G: the failing pivot's place is enough (the
        // buckling analysis gives the mode), and bisection on α_cr meets this often.
        return fallback();
    }
    let mut k = assemble(mesh, dofs, n, None);
    // Shift by a small multiple of the largest diagonal so that the null space becomes
    // barely stiff.
    let shift = 1e-9 * (0..n).map(|q| k.diagonal(q).abs()).fold(0.0, f64::max);
    for q in 0..n {
        k.add(q, q, shift);
    }
    let Ok(factor) = k.factor() else {
        return fallback();
    };
    let mut x: Vec<f64> = (0..n)
        .map(|q| 1.0 + 0.1 * ((q * 7919) % 13) as f64)
        .collect();
    for _ in 0..6 {
        factor.solve(&mut x);
        let norm = x.iter().fold(0.0f64, |m, v| m.max(v.abs()));
        if norm == 0.0 || !norm.is_finite() {
            return fallback();
        }
        x.iter_mut().for_each(|v| *v /= norm);
    }
    // Translations dominate a mechanism; rotations count where no translation moves.
    let mut moving: Vec<(f64, usize, usize)> = Vec::new();
    for (node, d) in dofs.iter().enumerate() {
        for (k, dof) in d.iter().enumerate() {
            if let Some(q) = dof.equation() {
                moving.push((x[q].abs(), node, k));
            }
        }
    }
    let peak_t = moving
        .iter()
        .filter(|m| m.2 < 2)
        .map(|m| m.0)
        .fold(0.0, f64::max);
    let keep: Vec<(f64, usize, usize)> = if peak_t > 0.1 {
        moving
            .into_iter()
            .filter(|m| m.2 < 2 && m.0 >= 0.5 * peak_t)
            .collect()
    } else {
        moving.into_iter().filter(|m| m.0 >= 0.5).collect()
    };
    let mut keep = keep;
    keep.sort_by(|a, b| b.0.total_cmp(&a.0));
    keep.truncate(8);
    if keep.is_empty() {
        return fallback();
    }
    keep.into_iter()
        .map(|(_, node, k)| FreeDirection {
            node,
            direction: Direction::ALL[k],
            place: mesh.describe_node(model, node),
        })
        .collect()
}

fn find_equation(dofs: &[[Dof; 3]], eq: usize) -> Option<(usize, usize)> {
    dofs.iter().enumerate().find_map(|(node, d)| {
        d.iter()
            .position(|x| x.equation() == Some(eq))
            .map(|k| (node, k))
    })
}
