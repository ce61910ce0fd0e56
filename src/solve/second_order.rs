//! Direct second-order elastic analysis (P-Δ and P-δ) and the elastic critical load factor.
//!
//! Each member is split into [`crate::model::AnalysisOptions::segments`] elements, and the
//! consistent geometric stiffness of every element is added to its elastic stiffness, so
//! both the chord rotation of the member (P-Δ) and its own curvature (P-δ) soften the frame.
//! The axial forces are updated and the system refactored until the displacements settle.
//!
//! The interior nodes of each member are condensed out statically, member by member
//! (`K* = K_ee − K_ei·K_ii⁻¹·K_ie`; Przemieniecki, *Theory of Matrix Structural Analysis*
//! (1968), §9, from memory), so the system factored at each iteration has the size and
//! profile of the first-order frame. This is an exact rearrangement of the segmented
//! system, not an approximation: the interior displacements are recovered from
//! `u_i = K_ii⁻¹·(f_i − K_ie·u_e)`. Positive definiteness is kept exactly too: the
//! segmented `K` is positive definite if and only if every `K_ii` and the condensed `K*`
//! are (the inertia of a matrix is that of a diagonal block plus its Schur complement,
//! Haynsworth's inertia additivity, from memory).
//!
//! With two or more elements per member this reproduces the exact beam-column solutions of
//! the AISC 360-16 Commentary Chapter C benchmark problems within 0.5 % (reference notes §5,
//! computed [X]); `tests/second_order.rs` checks them against the closed forms.
//!
//! The elastic critical load factor α_cr solves `(K + α_cr·K_G(N))·φ = 0` with the
//! first-order axial forces N of the load: the smallest load factor at which the
//! factorization of `K + α·K_G` fails, estimated by shifted inverse iteration and confirmed
//! by factorization.

use nalgebra::{DMatrix, DVector, Matrix3, Matrix6, Vector6};
use serde::Serialize;

use super::beam::{PDelta, SpanExtremes, fixed_end_forces, moment_extremes};
use super::element::{elastic_stiffness, geometric_stiffness, released_rotations, transformation};
use super::first_order::Solution;
use super::linear::{MeshLoads, Response, equivalent_nodal_loads, recover};
use super::mesh::{MemberStiffness, Mesh};
use super::skyline::{PIVOT_TOL, SkylineFactor};
use super::system::{
    Direction, Dof, FreeDirection, Restraints, SystemError, assemble_with, element_equations,
    element_matrices, factor_or_locate, number_dofs,
};
use crate::model::Model;

/// Largest number of P-Δ iterations before a case is declared not converged.
pub const MAX_ITERATIONS: usize = 50;
/// Convergence: change in displacements relative to the largest displacement.
pub const TOLERANCE: f64 = 1e-9;

/// Fewest elements per member that carry P-δ: with one element the consistent geometric
/// stiffness of a member whose ends do not translate relative to each other does almost
/// nothing for its own curvature (the AISC 360-16 Commentary Case 1 mid-span moment comes
/// out about 37 % low, issue 7 item 6), so fewer are refused.
pub const MIN_SEGMENTS: usize = 2;

/// A segmented model ready for second-order and buckling analyses.
#[derive(Debug, Clone)]
pub struct SecondOrderModel {
    /// The segmented mesh: model nodes first, then the interior nodes of each member.
    pub mesh: Mesh,
    /// How the condensed system is numbered.
    layout: Layout,
    /// The elastic stiffness (no geometric stiffness), condensed and factored.
    elastic: Condensed,
    /// Elastic stiffness of each element in global axes (releases condensed).
    element_k: Vec<Matrix6<f64>>,
}

/// The numbering of the condensed system of a segmented mesh.
#[derive(Debug, Clone)]
struct Layout {
    /// One element per member: the mesh of the condensed system.
    frame: Mesh,
    /// DOFs of the model nodes in the condensed system.
    dofs: Vec<[Dof; 3]>,
    /// Number of equations of the condensed system.
    n: usize,
    /// DOFs of every mesh node as the segmented system would number them (support, spring,
    /// free or idle; the numbers only seed the inverse iterations).
    mesh_dofs: Vec<[Dof; 3]>,
}

/// Outcome of a direct second-order analysis.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub enum SecondOrderOutcome {
    /// Converged: model-level results, the extreme span moments of each member (including
    /// P-δ, see [`member_span_extremes`]), the mesh-level response, the axial force of each
    /// element's geometric stiffness (N, tension positive) and the iterations taken.
    Converged {
        solution: Solution,
        span: Vec<SpanExtremes>,
        response: Box<Response>,
        axial: Vec<f64>,
        iterations: usize,
    },
    /// The stiffness lost positive definiteness (load above a critical load) or the
    /// iteration did not settle.
    Unstable { reason: String },
}

/// Axial force of each element (mean of its ends, tension positive), N.
pub fn element_axial(r: &Response) -> Vec<f64> {
    r.element_forces
        .iter()
        .map(|f| 0.5 * (-f.i[0] + f.j[0]))
        .collect()
}

/// A small dense LDLᵀ factor (row-major, L below the diagonal, D on it).
#[derive(Debug, Clone)]
struct DenseLdl {
    n: usize,
    a: Vec<f64>,
}

impl DenseLdl {
    /// Factor symmetric `k`; `Err(j)` at the first pivot `d_j ≤ PIVOT_TOL·|k_jj|` (the same
    /// test as [`super::skyline::SkylineMatrix::factor`]).
    fn new(k: &DMatrix<f64>) -> Result<DenseLdl, usize> {
        let n = k.nrows();
        let mut a = vec![0.0; n * n];
        for i in 0..n {
            for j in 0..=i {
                a[i * n + j] = k[(i, j)];
            }
        }
        for j in 0..n {
            let mut d = a[j * n + j];
            for r in 0..j {
                d -= a[j * n + r] * a[j * n + r] * a[r * n + r];
            }
            if d.is_nan() || d <= PIVOT_TOL * k[(j, j)].abs() {
                return Err(j);
            }
            a[j * n + j] = d;
            for i in j + 1..n {
                let mut g = a[i * n + j];
                for r in 0..j {
                    g -= a[i * n + r] * a[j * n + r] * a[r * n + r];
                }
                a[i * n + j] = g / d;
            }
        }
        Ok(DenseLdl { n, a })
    }

    /// Solve `K·x = b` in place.
    fn solve(&self, b: &mut [f64]) {
        let (n, a) = (self.n, &self.a);
        for i in 0..n {
            let s: f64 = (0..i).map(|r| a[i * n + r] * b[r]).sum();
            b[i] -= s;
        }
        for i in 0..n {
            b[i] /= a[i * n + i];
        }
        for i in (0..n).rev() {
            let s: f64 = (i + 1..n).map(|r| a[r * n + i] * b[r]).sum();
            b[i] -= s;
        }
    }
}

/// The interior nodes of one member, condensed out (member-local axes).
#[derive(Debug, Clone)]
struct MemberBlock {
    /// Interior mesh nodes, from end i.
    interior: Vec<usize>,
    /// `K_ii`, factored.
    k_ii: DenseLdl,
    /// `W = K_ii⁻¹·K_ie` (3·interior × 6).
    w: DMatrix<f64>,
}

/// Rotation of a node's `[ux, uy, θ]` from global to member-local axes.
fn rotation(c: f64, s: f64) -> Matrix3<f64> {
    Matrix3::new(c, s, 0.0, -s, c, 0.0, 0.0, 0.0, 1.0)
}

/// The segmented stiffness (elastic, plus geometric for given element axial forces) with
/// every member's interior nodes condensed out, factored.
#[derive(Debug, Clone)]
struct Condensed {
    /// Per member (`None` for a member of one element).
    blocks: Vec<Option<MemberBlock>>,
    factor: SkylineFactor,
    /// Axial force per element of the geometric stiffness, N, tension positive.
    axial: Option<Vec<f64>>,
}

impl Condensed {
    /// Condense and factor; an error when the stiffness is not positive definite (a
    /// mechanism, or with axial forces a load above a critical load).
    fn new(
        mesh: &Mesh,
        so: &Layout,
        model: &Model,
        axial: Option<&[f64]>,
    ) -> Result<Condensed, SystemError> {
        let mut blocks = Vec::with_capacity(mesh.member_elements.len());
        let mut condensed = Vec::with_capacity(mesh.member_elements.len());
        for range in &mesh.member_elements {
            let first = &mesh.elements[range.start];
            let segments = range.len();
            let local = |ie: usize| {
                let zero = Vector6::zeros();
                element_matrices(&mesh.elements[ie], axial.map(|a| a[ie]), &zero).0
            };
            let t = transformation(first.c, first.s);
            if segments == 1 {
                blocks.push(None);
                condensed.push(t.transpose() * local(range.start) * t);
                continue;
            }
            // Member DOFs: 3 per node from end i; the ends are 0..3 and 3s..3s+3.
            let dim = 3 * (segments + 1);
            let mut k = DMatrix::zeros(dim, dim);
            for (seg, ie) in range.clone().enumerate() {
                let kl = local(ie);
                for r in 0..6 {
                    for c in 0..6 {
                        k[(3 * seg + r, 3 * seg + c)] += kl[(r, c)];
                    }
                }
            }
            let ext = [0, 1, 2, dim - 3, dim - 2, dim - 1];
            let ni = dim - 6;
            let k_ii = k.view((3, 3), (ni, ni)).into_owned();
            let k_ie = DMatrix::from_fn(ni, 6, |r, c| k[(3 + r, ext[c])]);
            let k_ii = match DenseLdl::new(&k_ii) {
                Ok(f) => f,
                Err(j) => {
                    let node = mesh.elements[range.start + j / 3].j;
                    return Err(SystemError::Unstable(vec![FreeDirection {
                        node,
                        direction: Direction::ALL[j % 3],
                        place: mesh.describe_node(model, node),
                    }]));
                }
            };
            let mut w = k_ie.clone();
            for mut col in w.column_iter_mut() {
                k_ii.solve(col.as_mut_slice());
            }
            let k_ee = Matrix6::from_fn(|r, c| k[(ext[r], ext[c])]);
            let k_star = k_ee - Matrix6::from_fn(|r, c| k_ie.column(r).dot(&w.column(c)));
            condensed.push(t.transpose() * k_star * t);
            blocks.push(Some(MemberBlock {
                interior: range
                    .clone()
                    .skip(1)
                    .map(|ie| mesh.elements[ie].i)
                    .collect(),
                k_ii,
                w,
            }));
        }
        let matrix = assemble_with(&so.frame, &so.dofs, so.n, |m, _| condensed[m]);
        let factor = factor_or_locate(model, &so.frame, &so.dofs, &matrix, axial.is_some())?;
        Ok(Condensed {
            blocks,
            factor,
            axial: axial.map(<[f64]>::to_vec),
        })
    }

    /// Displacements of every mesh node (global axes) under nodal forces `p` (global, per
    /// mesh node); forces on held or idle directions are ignored.
    fn solve_nodal(&self, mesh: &Mesh, so: &Layout, p: &[[f64; 3]]) -> Vec<[f64; 3]> {
        let mut f = vec![0.0; so.n];
        for (node, d) in so.dofs.iter().enumerate() {
            for k in 0..3 {
                if let Some(q) = d[k].equation() {
                    f[q] += p[node][k];
                }
            }
        }
        // Interior loads: z = K_ii⁻¹·f_i, and −Wᵀ·f_i on the member ends.
        let mut z_all: Vec<Option<DVector<f64>>> = Vec::with_capacity(self.blocks.len());
        for (m, block) in self.blocks.iter().enumerate() {
            let Some(b) = block else {
                z_all.push(None);
                continue;
            };
            let e = &mesh.elements[mesh.member_elements[m].start];
            let rot = rotation(e.c, e.s);
            let mut z = DVector::zeros(3 * b.interior.len());
            for (k, &node) in b.interior.iter().enumerate() {
                let pl = rot * nalgebra::Vector3::from(p[node]);
                z.rows_mut(3 * k, 3).copy_from(&pl);
            }
            if z.iter().any(|&v| v != 0.0) {
                let on_ends = -(b.w.transpose() * &z);
                let t = transformation(e.c, e.s);
                let g = t.transpose() * Vector6::from_iterator(on_ends.iter().copied());
                for (r, q) in element_equations(&so.dofs, &so.frame.elements[m])
                    .iter()
                    .enumerate()
                {
                    if let Some(q) = q {
                        f[*q] += g[r];
                    }
                }
                b.k_ii.solve(z.as_mut_slice());
                z_all.push(Some(z));
            } else {
                z_all.push(None);
            }
        }
        self.factor.solve(&mut f);
        let mut u = vec![[0.0; 3]; mesh.nodes.len()];
        for (node, d) in so.dofs.iter().enumerate() {
            for k in 0..3 {
                u[node][k] = d[k].equation().map_or(0.0, |q| f[q]);
            }
        }
        // Interior displacements: u_i = z − W·u_e.
        for ((m, block), z) in self.blocks.iter().enumerate().zip(z_all) {
            let Some(b) = block else { continue };
            let e = &mesh.elements[mesh.member_elements[m].start];
            let fe = &so.frame.elements[m];
            let (a, c) = (u[fe.i], u[fe.j]);
            let ue = transformation(e.c, e.s) * Vector6::new(a[0], a[1], a[2], c[0], c[1], c[2]);
            let mut ui = -(&b.w * DVector::from_iterator(6, ue.iter().copied()));
            if let Some(z) = z {
                ui += z;
            }
            let back = rotation(e.c, e.s).transpose();
            for (k, &node) in b.interior.iter().enumerate() {
                let g = back * ui.fixed_rows::<3>(3 * k);
                u[node] = [g[0], g[1], g[2]];
            }
        }
        u
    }

    /// Response of the segmented mesh to `loads`.
    fn respond(
        &self,
        mesh: &Mesh,
        so: &Layout,
        model: &Model,
        loads: &MeshLoads,
    ) -> Result<Response, SystemError> {
        let axial = self.axial.as_deref();
        let p = equivalent_nodal_loads(model, mesh, &so.mesh_dofs, axial, loads)?;
        let u = self.solve_nodal(mesh, so, &p);
        Ok(recover(mesh, &so.mesh_dofs, axial, loads, u))
    }
}

impl SecondOrderModel {
    /// Segment `model` (`segments` elements per member) and factor its elastic stiffness.
    pub fn new(
        model: &Model,
        stiffness: &[MemberStiffness],
        segments: usize,
    ) -> Result<SecondOrderModel, SystemError> {
        let mesh = Mesh::new(model, stiffness, segments.max(1));
        let frame = Mesh::new(model, stiffness, 1);
        let (dofs, n) = number_dofs(&frame, &Restraints::from_model(model, &frame));
        let (mesh_dofs, _) = number_dofs(&mesh, &Restraints::from_model(model, &mesh));
        let layout = Layout {
            frame,
            dofs,
            n,
            mesh_dofs,
        };
        let elastic = Condensed::new(&mesh, &layout, model, None)?;
        let element_k = mesh
            .elements
            .iter()
            .map(|e| {
                let (kl, _) = element_matrices(e, None, &Vector6::zeros());
                let t = transformation(e.c, e.s);
                t.transpose() * kl * t
            })
            .collect();
        Ok(SecondOrderModel {
            mesh,
            layout,
            elastic,
            element_k,
        })
    }

    /// First-order response to `loads` on the segmented mesh.
    pub fn first_order(&self, model: &Model, loads: &MeshLoads) -> Result<Response, SystemError> {
        self.elastic.respond(&self.mesh, &self.layout, model, loads)
    }

    /// The stiffness with the geometric stiffness of element axial forces `axial`,
    /// condensed and factored; `None` when it is not positive definite.
    fn with_axial(&self, model: &Model, axial: &[f64]) -> Result<Option<Condensed>, SystemError> {
        match Condensed::new(&self.mesh, &self.layout, model, Some(axial)) {
            Ok(c) => Ok(Some(c)),
            Err(SystemError::Unstable(_)) => Ok(None),
            Err(e) => Err(e),
        }
    }

    /// Direct second-order analysis under `loads` (already factored, including any notional
    /// loads), iterating the axial forces to convergence.
    pub fn direct(
        &self,
        model: &Model,
        loads: &MeshLoads,
    ) -> Result<SecondOrderOutcome, SystemError> {
        let first = self.first_order(model, loads)?;
        let mut axial = element_axial(&first);
        let mut previous = first.displacements.clone();
        for iteration in 1..=MAX_ITERATIONS {
            let system = match Condensed::new(&self.mesh, &self.layout, model, Some(&axial)) {
                Ok(s) => s,
                Err(SystemError::Unstable(free)) => {
                    let at = free
                        .first()
                        .map_or(String::new(), |f| format!(" at {}", f.place));
                    return Ok(SecondOrderOutcome::Unstable {
                        reason: format!(
                            "stiffness including P-Delta is not positive definite{at}: the \
                             load exceeds the elastic critical load"
                        ),
                    });
                }
                Err(e) => return Err(e),
            };
            let r = system.respond(&self.mesh, &self.layout, model, loads)?;
            let scale = max_translation(&r.displacements).max(f64::MIN_POSITIVE);
            let change = r
                .displacements
                .iter()
                .zip(&previous)
                .map(|(a, b)| (a[0] - b[0]).abs().max((a[1] - b[1]).abs()))
                .fold(0.0, f64::max);
            let used = std::mem::replace(&mut axial, element_axial(&r));
            previous = r.displacements.clone();
            if change <= TOLERANCE * scale {
                return Ok(SecondOrderOutcome::Converged {
                    solution: Solution::from_response(&self.mesh, &r),
                    span: member_span_extremes(&self.mesh, &r, loads, &used),
                    response: Box::new(r),
                    axial: used,
                    iterations: iteration,
                });
            }
        }
        Ok(SecondOrderOutcome::Unstable {
            reason: format!("P-Delta iteration did not converge in {MAX_ITERATIONS} iterations"),
        })
    }

    /// Elastic critical load factor α_cr of `loads` and the buckled shape (translations and
    /// rotation of each model node, scaled so the largest translation is 1). `None` when no
    /// element is in compression or the frame does not buckle below [`ALPHA_CR_CEILING`]
    /// times the load.
    ///
    /// α_cr is the smallest λ at which `K + λ·K_G(N)` stops being positive definite
    /// (Sylvester's law of inertia: a failed Cholesky pivot marks λ ≥ α_cr). It is first
    /// estimated by shifted inverse iteration ([`Self::estimate_alpha_cr`]) and then
    /// confirmed by factorizing just below and just above the estimate; when that fails
    /// (releases make the condensed problem non-linear in λ) the bracket is searched and
    /// bisected. Releases are condensed from `K + λ·K_G` at each λ tried, so hinged members
    /// are treated exactly rather than by a linearised geometric stiffness.
    pub fn critical_factor(
        &self,
        model: &Model,
        loads: &MeshLoads,
    ) -> Result<Option<Buckling>, SystemError> {
        let first = self.first_order(model, loads)?;
        let axial = element_axial(&first);
        if axial.iter().all(|&n| n >= 0.0) {
            return Ok(None);
        }
        let stable = |lambda: f64| -> Result<Option<Condensed>, SystemError> {
            let scaled: Vec<f64> = axial.iter().map(|n| lambda * n).collect();
            self.with_axial(model, &scaled)
        };
        let estimate = self.estimate_alpha_cr(&axial, &stable)?;
        let tol = ALPHA_CR_TOLERANCE;
        if let Some(b) = &estimate {
            let (below, above) = (b.alpha_cr * (1.0 - tol), b.alpha_cr * (1.0 + tol));
            if stable(below)?.is_some() && stable(above)?.is_none() {
                return Ok(estimate);
            }
        }
        // Search for a bracket (lo stable, hi not), from the estimate if there is one.
        let (mut lo, mut hi) = match &estimate {
            Some(b) => (b.alpha_cr / 1.25, b.alpha_cr * 1.25),
            None => (0.0, 1.0),
        };
        while lo > 0.0 && stable(lo)?.is_none() {
            hi = lo;
            lo = if lo < 1e-9 { 0.0 } else { lo / 1.25 };
        }
        while stable(hi)?.is_some() {
            lo = hi;
            hi *= 4.0;
            if hi > ALPHA_CR_CEILING {
                return Ok(None);
            }
        }
        while hi - lo > tol * hi {
            let mid = 0.5 * (lo + hi);
            if stable(mid)?.is_some() {
                lo = mid
            } else {
                hi = mid
            }
        }
        let alpha_cr = 0.5 * (lo + hi);
        let shape = match stable(0.999 * lo)? {
            Some(system) => self.mode_shape(&system),
            None => vec![[0.0; 3]; self.mesh.model_nodes],
        };
        Ok(Some(Buckling { alpha_cr, shape }))
    }

    /// A vector over the mesh's unknowns, `value(equation number)` in each, zero on held
    /// and idle directions (a start vector for the inverse iterations).
    fn start_vector(&self, value: impl Fn(usize) -> f64) -> Vec<[f64; 3]> {
        self.layout
            .mesh_dofs
            .iter()
            .map(|d| {
                let v = |k: usize| d[k].equation().map_or(0.0, &value);
                [v(0), v(1), v(2)]
            })
            .collect()
    }

    /// `K·x` for the elastic segmented stiffness (releases condensed, springs included).
    fn elastic_times(&self, x: &[[f64; 3]]) -> Vec<[f64; 3]> {
        let mut y = vec![[0.0; 3]; x.len()];
        for (e, k) in self.mesh.elements.iter().zip(&self.element_k) {
            let (a, b) = (x[e.i], x[e.j]);
            let f = k * Vector6::new(a[0], a[1], a[2], b[0], b[1], b[2]);
            for k in 0..3 {
                y[e.i][k] += f[k];
                y[e.j][k] += f[3 + k];
            }
        }
        for (node, d) in self.layout.mesh_dofs.iter().enumerate() {
            for k in 0..3 {
                if let Dof::Spring(_, ks) = d[k] {
                    y[node][k] += ks * x[node][k];
                }
            }
        }
        y
    }

    /// Estimate α_cr and its mode by inverse iteration on the pencil `K·φ = λ·G·φ`
    /// (G = −K_G, the geometric stiffness of the element axial forces at λ = 1).
    ///
    /// A few steps with the factored elastic `K` give a rough λ; then the iteration is
    /// shifted to σ = 0.95·λ (`K − σ·G` factorized once, positive definite below α_cr), so
    /// it converges at the rate (α_cr − σ)/(λ₂ − σ); the Rayleigh quotient
    /// `λ = xᵀKx / xᵀGx` gives the estimate (Bathe, *Finite Element Procedures*, 1996,
    /// §11.2, from memory). Released element ends enter through their condensed matrices
    /// at λ = 1, so the caller confirms the estimate by factorization. `None` when the
    /// iteration finds no positive λ.
    fn estimate_alpha_cr(
        &self,
        axial: &[f64],
        stable: &dyn Fn(f64) -> Result<Option<Condensed>, SystemError>,
    ) -> Result<Option<Buckling>, SystemError> {
        // Element geometric matrices in global axes.
        let parts: Vec<Matrix6<f64>> = self
            .mesh
            .elements
            .iter()
            .zip(axial)
            .map(|(e, &na)| {
                let zero = Vector6::zeros();
                let (with_g, _) = element_matrices(e, Some(na), &zero);
                let (without, _) = element_matrices(e, None, &zero);
                let t = transformation(e.c, e.s);
                t.transpose() * (with_g - without) * t
            })
            .collect();
        // y = G·x = −K_G·x on the unknowns.
        let g = |x: &[[f64; 3]]| -> Vec<[f64; 3]> {
            let mut y = vec![[0.0; 3]; x.len()];
            for (e, kg) in self.mesh.elements.iter().zip(&parts) {
                let (a, b) = (x[e.i], x[e.j]);
                let f = kg * Vector6::new(a[0], a[1], a[2], b[0], b[1], b[2]);
                for k in 0..3 {
                    y[e.i][k] -= f[k];
                    y[e.j][k] -= f[3 + k];
                }
            }
            for (yn, d) in y.iter_mut().zip(&self.layout.mesh_dofs) {
                for k in 0..3 {
                    if d[k].equation().is_none() {
                        yn[k] = 0.0;
                    }
                }
            }
            y
        };
        let dot = |a: &[[f64; 3]], b: &[[f64; 3]]| {
            a.iter()
                .zip(b)
                .map(|(p, q)| p[0] * q[0] + p[1] * q[1] + p[2] * q[2])
                .sum::<f64>()
        };
        let rayleigh = |x: &[[f64; 3]]| dot(x, &self.elastic_times(x)) / dot(x, &g(x));
        let normalise = |x: &mut Vec<[f64; 3]>| -> bool {
            let norm = x.iter().flatten().fold(0.0f64, |m, v| m.max(v.abs()));
            if norm == 0.0 || !norm.is_finite() {
                return false;
            }
            x.iter_mut().flatten().for_each(|v| *v /= norm);
            true
        };
        // Rough estimate with K alone.
        let mut x = self.start_vector(|k| 1.0 + (k % 5) as f64 * 0.1);
        for _ in 0..8 {
            x = self.elastic.solve_nodal(&self.mesh, &self.layout, &g(&x));
            if !normalise(&mut x) {
                return Ok(None);
            }
        }
        let rough = rayleigh(&x);
        if !(rough > 0.0 && rough.is_finite()) {
            return Ok(None);
        }
        // Shift below it, lowering the shift until K − σ·G is positive definite.
        let mut sigma = 0.95 * rough;
        let shifted = loop {
            if let Some(s) = stable(sigma)? {
                break s;
            }
            sigma /= 1.25;
            if sigma < 1e-6 * rough {
                return Ok(None);
            }
        };
        // Once the estimate has settled to 1e-3, the shift moves up to 0.999·λ (refactored,
        // and only while K − σ·G stays positive definite): the convergence rate
        // (α_cr − σ)/(λ₂ − σ) then stays small even when the next mode is close.
        let mut last = f64::NAN;
        let mut shifted = shifted;
        for _ in 0..50 {
            x = shifted.solve_nodal(&self.mesh, &self.layout, &g(&x));
            if !normalise(&mut x) {
                return Ok(None);
            }
            let lambda = rayleigh(&x);
            if (lambda - last).abs() <= 1e-12 * lambda.abs() {
                break;
            }
            if (lambda - last).abs() <= 1e-3 * lambda.abs() && sigma < 0.99 * lambda {
                let closer = 0.999 * lambda;
                if let Some(s) = stable(closer)? {
                    shifted = s;
                    sigma = closer;
                }
            }
            last = lambda;
        }
        let lambda = rayleigh(&x);
        if !(lambda > 0.0 && lambda.is_finite()) {
            return Ok(None);
        }
        Ok(Some(Buckling {
            alpha_cr: lambda,
            shape: self.node_shape(&x),
        }))
    }

    /// Per model node `[ux, uy, θ]` of a mesh vector, scaled so that the largest
    /// translation is 1 (positive).
    fn node_shape(&self, x: &[[f64; 3]]) -> Vec<[f64; 3]> {
        let mut shape: Vec<[f64; 3]> = x[..self.mesh.model_nodes].to_vec();
        let peak = shape
            .iter()
            .flat_map(|s| [s[0], s[1]])
            .fold(0.0f64, |m, v| if v.abs() > m.abs() { v } else { m });
        if peak != 0.0 {
            for s in &mut shape {
                s.iter_mut().for_each(|v| *v /= peak);
            }
        }
        shape
    }

    /// Inverse iteration on a nearly singular system: its near-null vector, per model node.
    fn mode_shape(&self, system: &Condensed) -> Vec<[f64; 3]> {
        let mut x = self.start_vector(|k| 1.0 + (k % 7) as f64 * 0.01);
        for _ in 0..8 {
            x = system.solve_nodal(&self.mesh, &self.layout, &x);
            let norm = x.iter().flatten().map(|v| v * v).sum::<f64>().sqrt();
            if norm == 0.0 || !norm.is_finite() {
                break;
            }
            x.iter_mut().flatten().for_each(|v| *v /= norm);
        }
        self.node_shape(&x)
    }
}

/// Above this load factor a frame is reported as not buckling under the load.
pub const ALPHA_CR_CEILING: f64 = 1.0e6;

/// Relative precision of α_cr: the frame is stable at α_cr·(1 − tol) and not at
/// α_cr·(1 + tol).
pub const ALPHA_CR_TOLERANCE: f64 = 1e-6;

/// Elastic buckling of one load: the critical load factor and the mode shape.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Buckling {
    pub alpha_cr: f64,
    /// `[ux, uy, θ]` per model node, largest translation 1.
    pub shape: Vec<[f64; 3]>,
}

fn max_translation(u: &[[f64; 3]]) -> f64 {
    u.iter()
        .map(|d| d[0].abs().max(d[1].abs()))
        .fold(0.0, f64::max)
}

/// Extreme moments along each member of a second-order response, with their positions
/// measured from the member's end i.
///
/// Each element's moment includes the P-δ part `N·(v(x) − v_i)` of [`PDelta`] with the
/// axial force `axial` of its geometric stiffness, so the value at a member's ends is its
/// end moment and the diagram is continuous across the interior nodes.
pub fn member_span_extremes(
    mesh: &Mesh,
    r: &Response,
    loads: &MeshLoads,
    axial: &[f64],
) -> Vec<SpanExtremes> {
    mesh.member_elements
        .iter()
        .map(|range| {
            let mut out: Option<SpanExtremes> = None;
            for ie in range.clone() {
                let e = &mesh.elements[ie];
                let p = element_p_delta(mesh, r, loads, axial, ie);
                let s = moment_extremes(
                    e.length,
                    &r.element_forces[ie],
                    &loads.element[ie],
                    Some(&p),
                );
                let shifted = SpanExtremes {
                    max: (s.max.0 + e.x0, s.max.1),
                    min: (s.min.0 + e.x0, s.min.1),
                };
                out = Some(match out {
                    None => shifted,
                    Some(o) => SpanExtremes {
                        max: if shifted.max.1 > o.max.1 {
                            shifted.max
                        } else {
                            o.max
                        },
                        min: if shifted.min.1 < o.min.1 {
                            shifted.min
                        } else {
                            o.min
                        },
                    },
                });
            }
            out.unwrap_or(SpanExtremes {
                max: (0.0, 0.0),
                min: (0.0, 0.0),
            })
        })
        .collect()
}

/// The P-δ part of element `ie`'s moment in response `r` (local end displacements, with
/// the rotation of a released end recovered from its zero end moment).
pub fn element_p_delta(
    mesh: &Mesh,
    r: &Response,
    loads: &MeshLoads,
    axial: &[f64],
    ie: usize,
) -> PDelta {
    let e = &mesh.elements[ie];
    let (a, b) = (r.displacements[e.i], r.displacements[e.j]);
    let t = transformation(e.c, e.s);
    let mut u = t * Vector6::new(a[0], a[1], a[2], b[0], b[1], b[2]);
    if e.release.iter().any(|&x| x) {
        let k = elastic_stiffness(e.ea, e.ei, e.length) + geometric_stiffness(axial[ie], e.length);
        let f0 = Vector6::from(fixed_end_forces(e.length, &loads.element[ie]).to_array());
        u = released_rotations(&k, &f0, &u, e.release);
    }
    PDelta {
        n: axial[ie],
        length: e.length,
        ends: [u[1], u[2], u[4], u[5]],
    }
}

/// The moment of member `m` at `x` from its end i in a converged second-order response,
/// P-δ included ([`PDelta`]); at an interior node the value of the element on its left.
pub fn member_moment_at(
    mesh: &Mesh,
    r: &Response,
    loads: &MeshLoads,
    axial: &[f64],
    m: usize,
    x: f64,
) -> f64 {
    let range = mesh.member_elements[m].clone();
    let ie = range
        .clone()
        .find(|&ie| x <= mesh.elements[ie].x0 + mesh.elements[ie].length)
        .unwrap_or(range.end - 1);
    let e = &mesh.elements[ie];
    let p = element_p_delta(mesh, r, loads, axial, ie);
    super::beam::moment_at(
        (x - e.x0).clamp(0.0, e.length),
        super::beam::Side::Left,
        &r.element_forces[ie],
        &loads.element[ie],
        Some(&p),
    )
}
