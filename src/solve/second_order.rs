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
//! computed \[X\]); `tests/second_order.rs` checks them against the closed forms.
//!
//! The elastic critical load factor α_cr solves `(K + α_cr·K_G(N))·φ = 0` with the
//! first-order axial forces N of the load: the smallest load factor at which the
//! factorization of `K + α·K_G` fails, estimated by shifted inverse iteration and confirmed
//! by factorization.

use std::collections::HashMap;
use std::sync::{Arc, OnceLock};

use nalgebra::{DMatrix, DVector, Matrix3, Matrix6, Vector6};
use serde::Serialize;

use super::beam::{PDelta, SpanExtremes, fixed_end_forces, moment_extremes};
use super::element::{elastic_stiffness, geometric_stiffness, released_rotations, transformation};
use super::first_order::Solution;
use super::linear::{LoadTerms, MeshLoads, Response, equivalent_nodal_loads_with, recover_with};
use super::mesh::{MemberStiffness, Mesh};
use super::skyline::{PIVOT_TOL, SkylineFactor, SkylineMatrix};
use super::system::{
    Direction, Dof, FreeDirection, Restraints, SystemError, assemble_with, element_equations,
    element_matrices, factor_owned_or_locate, number_dofs,
};
use crate::model::Model;

/// Largest number of P-Δ iterations before a case is declared not converged.
pub const MAX_ITERATIONS: usize = 50;
/// Convergence: change in displacements relative to the largest displacement.
pub const TOLERANCE: f64 = 1e-9;

/// Fewest elements per member that carry P-δ (defined with the model's analysis options).
pub use crate::model::MIN_SEGMENTS;

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
    element_k: ElementStiffness,
    /// Elements per member.
    segments: usize,
    /// The nested mesh with `2·segments` elements per member, for the mesh error of the
    /// buckling factors ([`Self::buckling`]); built on first use.
    refined: OnceLock<Result<Box<SecondOrderModel>, SystemError>>,
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

/// The elastic stiffness of every element of a mesh in global axes (releases condensed),
/// each distinct matrix stored once. The elements of a member are alike but for a released
/// end, so a member holds one to three matrices rather than one per element: the same
/// numbers, from the same arithmetic, in a fraction of the memory.
#[derive(Debug, Clone)]
struct ElementStiffness {
    /// The distinct matrices.
    unique: Vec<Matrix6<f64>>,
    /// Per element, its matrix in `unique`.
    of: Vec<u32>,
}

impl ElementStiffness {
    fn new(mesh: &Mesh) -> ElementStiffness {
        // What an element's matrix depends on: section, length, direction and releases.
        let key = |e: &super::mesh::Element| {
            (
                [e.ea, e.ei, e.length, e.c, e.s].map(f64::to_bits),
                e.release,
            )
        };
        let mut unique: Vec<Matrix6<f64>> = Vec::new();
        let mut of = Vec::with_capacity(mesh.elements.len());
        let mut last = None;
        for e in &mesh.elements {
            let k = key(e);
            if last.as_ref() != Some(&k) {
                let (kl, _) = element_matrices(e, None, &Vector6::zeros());
                let t = transformation(e.c, e.s);
                unique.push(t.transpose() * kl * t);
                last = Some(k);
            }
            of.push((unique.len() - 1) as u32);
        }
        ElementStiffness { unique, of }
    }

    /// The matrix of element `ie`.
    fn get(&self, ie: usize) -> &Matrix6<f64> {
        &self.unique[self.of[ie] as usize]
    }

    /// The matrix of every element, in order.
    fn iter(&self) -> impl Iterator<Item = &Matrix6<f64>> + '_ {
        self.of.iter().map(|&k| &self.unique[k as usize])
    }
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

/// A small banded LDLᵀ factor of one member's interior block `K_ii`. The interior nodes of
/// a member couple only to their neighbours, so `K_ii` is block tridiagonal with 3×3
/// blocks: every entry lies within [`BAND`] of the diagonal, and elimination without
/// pivoting fills nothing outside that band (George and Liu 1981, §4.1, envelope storage,
/// from memory), so the factor and its solves cost `O(n·BAND²)` and `O(n·BAND)` rather
/// than `O(n³)` and `O(n²)`.
#[derive(Debug, Clone)]
struct DenseLdl {
    /// Row i: `L[i][i − BAND + k]` for k in 0..BAND (zero before the first column).
    l: Vec<[f64; BAND]>,
    /// The pivots.
    d: Vec<f64>,
}

/// Half-bandwidth of a member's interior block: 3 unknowns per node, each node coupled to
/// the next.
const BAND: usize = 5;

impl DenseLdl {
    /// Order of the factored matrix.
    fn n(&self) -> usize {
        self.d.len()
    }

    /// Factor the symmetric `n × n` row-major `k` (entries beyond [`BAND`] of the
    /// diagonal are zero); `Err(j)` at the first pivot `d_j ≤ PIVOT_TOL·|k_jj|` (the same
    /// test as [`super::skyline::SkylineMatrix::factor`]), or with `indefinite` at the
    /// first `|d_j| ≤ PIVOT_TOL·|k_jj|`, negative pivots being kept and counted (as
    /// [`SkylineMatrix::factor_inertia`] does). Returns the factor and its number of
    /// negative pivots.
    fn factor(k: &[f64], n: usize, indefinite: bool) -> Result<(DenseLdl, usize), usize> {
        let mut negative = 0;
        let mut l = vec![[0.0; BAND]; n];
        let mut d = vec![0.0; n];
        // Row i of the band, column c (c within BAND below i): slot c + BAND − i.
        for j in 0..n {
            // L[j][r] for r < j first (row j of L, from the rows above), then d_j.
            let kjj = k[j * n + j];
            let mut dj = kjj;
            // The sums run in the order of a dense factor (ascending r): the terms outside
            // the band are zero and leave every sum as it is.
            for c in j.saturating_sub(BAND)..j {
                let mut g = k[j * n + c];
                for r in j.saturating_sub(BAND)..c {
                    g -= l[j][r + BAND - j] * l[c][r + BAND - c] * d[r];
                }
                l[j][c + BAND - j] = g / d[c];
            }
            for c in j.saturating_sub(BAND)..j {
                let v = l[j][c + BAND - j];
                dj -= v * v * d[c];
            }
            let floor = PIVOT_TOL * kjj.abs();
            if dj.is_nan()
                || (if indefinite {
                    dj.abs() <= floor
                } else {
                    dj <= floor
                })
            {
                return Err(j);
            }
            negative += usize::from(dj < 0.0);
            d[j] = dj;
        }
        Ok((DenseLdl { l, d }, negative))
    }

    /// Solve `K·x = b` in place. Each sum runs over the band in ascending order, as a dense
    /// solve would (its other terms are zero), on a copy of `b` with [`BAND`] zeros on
    /// either side so that every row has a full band.
    fn solve(&self, b: &mut [f64]) {
        let n = self.d.len();
        let mut stack = [0.0; 48];
        let mut heap = Vec::new();
        let y: &mut [f64] = if n + 2 * BAND <= stack.len() {
            &mut stack[..n + 2 * BAND]
        } else {
            heap.resize(n + 2 * BAND, 0.0);
            &mut heap
        };
        y[BAND..BAND + n].copy_from_slice(b);
        // Row i of L holds columns i − BAND .. i − 1, at y[i .. i + BAND].
        for (i, row) in self.l.iter().enumerate() {
            let mut s = 0.0;
            for (l, x) in row.iter().zip(&y[i..i + BAND]) {
                s += l * x;
            }
            y[BAND + i] -= s;
        }
        for (x, d) in y[BAND..BAND + n].iter_mut().zip(&self.d) {
            *x /= d;
        }
        // Column i of L below the diagonal: L[i + k][i] = l[i + k][BAND − k], k = 1..=BAND.
        for i in (0..n).rev() {
            let below = &self.l[i + 1..n.min(i + 1 + BAND)];
            let mut s = 0.0;
            for (k, (row, x)) in below.iter().zip(&y[BAND + i + 1..]).enumerate() {
                s += row[BAND - 1 - k] * x;
            }
            y[BAND + i] -= s;
        }
        b.copy_from_slice(&y[BAND..BAND + n]);
    }

    /// Solve `K·X = B` in place for the six columns of `b` (row-major, `n` × 6): for each
    /// column the same sums in the same order as [`Self::solve`], in one pass over the band.
    /// `pad` is scratch space.
    fn solve_columns(&self, b: &mut [f64], pad: &mut Vec<f64>) {
        let n = self.d.len();
        pad.clear();
        pad.resize((n + 2 * BAND) * 6, 0.0);
        let y = &mut pad[..];
        y[BAND * 6..(BAND + n) * 6].copy_from_slice(b);
        for (i, row) in self.l.iter().enumerate() {
            let mut s = [0.0; 6];
            for (k, l) in row.iter().enumerate() {
                let x = &y[(i + k) * 6..(i + k) * 6 + 6];
                for c in 0..6 {
                    s[c] += l * x[c];
                }
            }
            let t = &mut y[(BAND + i) * 6..(BAND + i) * 6 + 6];
            for c in 0..6 {
                t[c] -= s[c];
            }
        }
        for (i, d) in self.d.iter().enumerate() {
            for x in &mut y[(BAND + i) * 6..(BAND + i) * 6 + 6] {
                *x /= d;
            }
        }
        for i in (0..n).rev() {
            let below = &self.l[i + 1..n.min(i + 1 + BAND)];
            let mut s = [0.0; 6];
            for (k, row) in below.iter().enumerate() {
                let l = row[BAND - 1 - k];
                let x = &y[(BAND + i + 1 + k) * 6..(BAND + i + 2 + k) * 6];
                for c in 0..6 {
                    s[c] += l * x[c];
                }
            }
            let t = &mut y[(BAND + i) * 6..(BAND + i) * 6 + 6];
            for c in 0..6 {
                t[c] -= s[c];
            }
        }
        b.copy_from_slice(&y[BAND * 6..(BAND + n) * 6]);
    }
}

/// The interior nodes of one member, condensed out (member-local axes).
#[derive(Debug, Clone)]
struct MemberBlock {
    /// `K_ii`, factored.
    k_ii: DenseLdl,
    /// `W = K_ii⁻¹·K_ie` (3·interior × 6), row-major.
    w: Vec<f64>,
}

/// `−Wᵀ·z` for `W` (row-major, `z.len()` × 6), each sum in the order of nalgebra's dot
/// product (eight running sums over blocks of eight rows, combined pairwise, then the
/// remaining rows), so that the condensed loads round as they always have.
fn minus_w_transpose_times(w: &[f64], z: &[f64]) -> [f64; 6] {
    let n = z.len();
    let whole = n - n % 8;
    let mut acc = [[0.0f64; 8]; 6];
    for i in (0..whole).step_by(8) {
        for k in 0..8 {
            let (zr, row) = (z[i + k], &w[(i + k) * 6..(i + k) * 6 + 6]);
            for c in 0..6 {
                acc[c][k] += row[c] * zr;
            }
        }
    }
    std::array::from_fn(|c| {
        let a = &acc[c];
        let mut res = 0.0;
        res += a[0] + a[4];
        res += a[1] + a[5];
        res += a[2] + a[6];
        res += a[3] + a[7];
        for r in whole..n {
            res += w[r * 6 + c] * z[r];
        }
        -res
    })
}

/// Global `[x, y]` to member-local `[axial, transverse]` for direction cosines (c, s).
fn to_local(c: f64, s: f64, g: [f64; 3]) -> [f64; 3] {
    [c * g[0] + s * g[1], -s * g[0] + c * g[1], g[2]]
}

/// Member-local `[axial, transverse]` to global `[x, y]` for direction cosines (c, s).
fn to_global(c: f64, s: f64, l: [f64; 3]) -> [f64; 3] {
    [c * l[0] - s * l[1], s * l[0] + c * l[1], l[2]]
}

/// The interior mesh nodes of member `m`, from end i.
fn interior_nodes(mesh: &Mesh, m: usize) -> impl Iterator<Item = usize> + '_ {
    let range = mesh.member_elements[m].clone();
    range.skip(1).map(|ie| mesh.elements[ie].i)
}

/// The segmented stiffness (elastic, plus geometric for given element axial forces) with
/// every member's interior nodes condensed out, factored.
#[derive(Debug, Clone)]
struct Condensed {
    /// Per member (`None` for a member of one element); members alike share one.
    blocks: Vec<Option<Block>>,
    factor: SkylineFactor,
    /// Axial force per element of the geometric stiffness, N, tension positive.
    axial: Option<Vec<f64>>,
}

/// The members of a segmented mesh with their interior nodes condensed out.
struct MemberParts {
    /// Per member (`None` for a member of one element).
    blocks: Vec<Option<Block>>,
    /// Per member, its condensed 6×6 stiffness in global axes.
    condensed: Vec<Matrix6<f64>>,
    /// Negative pivots of the `K_ii` blocks (counted only when indefinite).
    negative: usize,
}

/// One member with its interior nodes condensed out, in member-local axes: the factored
/// interior block (`None` for a member of one element), the condensed 6×6 stiffness and the
/// negative pivots of `K_ii`.
type LocalParts = (Option<MemberBlock>, Matrix6<f64>, usize);

/// [`LocalParts`] with the interior block shared among members alike.
type SharedParts = (Option<Arc<MemberBlock>>, Matrix6<f64>, usize);

/// A member's condensed interior: its own, or shared with the members alike (elastic).
#[derive(Debug, Clone)]
enum Block {
    Own(MemberBlock),
    Shared(Arc<MemberBlock>),
}

impl std::ops::Deref for Block {
    type Target = MemberBlock;
    fn deref(&self) -> &MemberBlock {
        match self {
            Block::Own(b) => b,
            Block::Shared(b) => b,
        }
    }
}

/// What a member's elastic condensation depends on: per element, E·A, E·I and length (as
/// bits) and its releases. Members alike in these share one condensation.
type ElasticKey = Vec<([u64; 3], [bool; 2])>;

/// Condense every member's interior nodes out of the segmented stiffness (elastic, plus the
/// geometric stiffness of `axial`). With `indefinite`, a `K_ii` with negative pivots is
/// kept and its negative pivots counted; otherwise it fails. `Err` names the mesh node and
/// direction (0, 1, 2) of the failing pivot.
///
/// Without axial forces, members with the same section, length, segments and releases
/// have the same interior block in their own axes: it is condensed once and shared (the
/// same numbers from the same arithmetic), so a frame of repeated members keeps one block
/// per kind of member.
fn condense_members(
    mesh: &Mesh,
    axial: Option<&[f64]>,
    indefinite: bool,
) -> Result<MemberParts, (usize, usize)> {
    let members = mesh.member_elements.len();
    let mut blocks = Vec::with_capacity(members);
    let mut condensed = Vec::with_capacity(members);
    let mut negative = 0;
    let mut scratch = Scratch::default();
    let mut shared: HashMap<ElasticKey, SharedParts> = HashMap::new();
    for range in &mesh.member_elements {
        let first = &mesh.elements[range.start];
        let t = transformation(first.c, first.s);
        let (block, k_star) = if axial.is_none() {
            let key: ElasticKey = mesh.elements[range.clone()]
                .iter()
                .map(|e| ([e.ea, e.ei, e.length].map(f64::to_bits), e.release))
                .collect();
            let (block, k_star, below) = match shared.get(&key) {
                Some(alike) => alike.clone(),
                None => {
                    let (block, k_star, below) =
                        condense_member(mesh, range.clone(), None, indefinite, &mut scratch)?;
                    let parts = (block.map(Arc::new), k_star, below);
                    shared.insert(key, parts.clone());
                    parts
                }
            };
            negative += below;
            (block.map(Block::Shared), k_star)
        } else {
            let (block, k_star, below) =
                condense_member(mesh, range.clone(), axial, indefinite, &mut scratch)?;
            negative += below;
            (block.map(Block::Own), k_star)
        };
        blocks.push(block);
        condensed.push(t.transpose() * k_star * t);
    }
    Ok(MemberParts {
        blocks,
        condensed,
        negative,
    })
}

/// Scratch space of [`condense_member`], reused member after member.
#[derive(Default)]
struct Scratch {
    k_ii: Vec<f64>,
    k_ie: Vec<f64>,
    pad: Vec<f64>,
}

/// Condense the interior nodes of the member whose elements are `range` (see
/// [`condense_members`]), in member-local axes.
fn condense_member(
    mesh: &Mesh,
    range: std::ops::Range<usize>,
    axial: Option<&[f64]>,
    indefinite: bool,
    scratch: &mut Scratch,
) -> Result<LocalParts, (usize, usize)> {
    let Scratch { k_ii, k_ie, pad } = scratch;
    let segments = range.len();
    let local = |ie: usize| {
        let zero = Vector6::zeros();
        element_matrices(&mesh.elements[ie], axial.map(|a| a[ie]), &zero).0
    };
    if segments == 1 {
        return Ok((None, local(range.start), 0));
    }
    // Member DOFs: 3 per node from end i; the ends are 0..3 and 3s..3s+3, the interior
    // unknowns 3..3s (numbered from 0 in K_ii). The first element couples end i to the
    // first interior node, the last the last interior node to end j.
    let ni = 3 * (segments - 1);
    k_ii.clear();
    k_ii.resize(ni * ni, 0.0);
    let mut k_ee = Matrix6::<f64>::zeros();
    // K_ie: rows 0..3 couple to end i (columns 0..3), rows ni-3..ni to end j (3..6).
    k_ie.clear();
    k_ie.resize(ni * 6, 0.0);
    for (seg, ie) in range.clone().enumerate() {
        let kl = local(ie);
        // Member DOF of each element DOF, as index into [end i | interior | end j].
        let place = |r: usize| -> (bool, usize) {
            let node = seg + r / 3;
            if node == 0 {
                (false, r % 3)
            } else if node == segments {
                (false, 3 + r % 3)
            } else {
                (true, 3 * (node - 1) + r % 3)
            }
        };
        for r in 0..6 {
            let (ri, pr) = place(r);
            for c in 0..6 {
                let (ci, pc) = place(c);
                let v = kl[(r, c)];
                match (ri, ci) {
                    (true, true) => k_ii[pr * ni + pc] += v,
                    (true, false) => k_ie[pr * 6 + pc] += v,
                    (false, false) => k_ee[(pr, pc)] += v,
                    (false, true) => {}
                }
            }
        }
    }
    let (factor, below) = DenseLdl::factor(k_ii, ni, indefinite)
        .map_err(|j| (mesh.elements[range.start + j / 3].j, j % 3))?;
    // W = K_ii⁻¹·K_ie.
    let mut w = k_ie.clone();
    factor.solve_columns(&mut w, pad);
    // K* = K_ee − K_ieᵀ·W: column c of K_ie (c < 3: end i, else end j) is zero but on
    // the first (c < 3) or the last interior node, so three terms, summed in the order
    // of the dense product (whose other terms are zero).
    let mut k_star = k_ee;
    for r in 0..6 {
        let q0 = if r < 3 { 0 } else { ni - 3 };
        for c in 0..6 {
            let mut sum = 0.0;
            for q in q0..q0 + 3 {
                sum += k_ie[q * 6 + r] * w[q * 6 + c];
            }
            k_star[(r, c)] -= sum;
        }
    }
    Ok((Some(MemberBlock { k_ii: factor, w }), k_star, below))
}

/// Negative pivots met when element `e`'s released end rotations are condensed out of its
/// stiffness under axial force `n` (as [`super::element::condense`] does, end i first).
/// With the released rotations counted as unknowns of their own, the pencil stays linear
/// in the load factor, and these pivots belong to its inertia.
fn released_negatives(e: &super::mesh::Element, n: f64) -> usize {
    if !e.release.iter().any(|&r| r) {
        return 0;
    }
    let k = elastic_stiffness(e.ea, e.ei, e.length) + geometric_stiffness(n, e.length);
    match e.release {
        [true, true] => {
            let d0 = k[(2, 2)];
            let d1 = k[(5, 5)] - k[(5, 2)] * k[(2, 5)] / d0;
            usize::from(d0 < 0.0) + usize::from(d1 < 0.0)
        }
        [true, false] => usize::from(k[(2, 2)] < 0.0),
        _ => usize::from(k[(5, 5)] < 0.0),
    }
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
        let parts = condense_members(mesh, axial, false).map_err(|(node, d)| {
            SystemError::Unstable(vec![FreeDirection {
                node,
                direction: Direction::ALL[d],
                place: mesh.describe_node(model, node),
            }])
        })?;
        let matrix = assemble_with(&so.frame, &so.dofs, so.n, |m, _| parts.condensed[m]);
        let factor = factor_owned_or_locate(model, &so.frame, &so.dofs, matrix, axial.is_some())?;
        Ok(Condensed {
            blocks: parts.blocks,
            factor,
            axial: axial.map(<[f64]>::to_vec),
        })
    }

    /// The number of negative eigenvalues of the segmented stiffness with the geometric
    /// stiffness of `axial` (released end rotations counted as unknowns): the sum of the
    /// negative pivots of every member's `K_ii`, of the condensed frame matrix and of the
    /// released end rotations (inertia additivity over Schur complements, Haynsworth, from
    /// memory). `None` when a pivot is zero to round-off (the factor sits on an eigenvalue).
    fn inertia(mesh: &Mesh, so: &Layout, axial: &[f64]) -> Option<usize> {
        let parts = condense_members(mesh, Some(axial), true).ok()?;
        let matrix: SkylineMatrix =
            assemble_with(&so.frame, &so.dofs, so.n, |m, _| parts.condensed[m]);
        let (_, frame) = matrix.into_factor_inertia().ok()?;
        let released: usize = mesh
            .elements
            .iter()
            .zip(axial)
            .map(|(e, &n)| released_negatives(e, n))
            .sum();
        Some(parts.negative + frame + released)
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
        // Interior loads f_i (member-local): z = K_ii⁻¹·f_i, and −Wᵀ·f_i on the member
        // ends. `z` holds every member's interior unknowns one after the other.
        let mut start = Vec::with_capacity(self.blocks.len() + 1);
        start.push(0);
        for b in &self.blocks {
            let ni = b.as_ref().map_or(0, |b| b.k_ii.n());
            start.push(start.last().copied().unwrap_or(0) + ni);
        }
        let mut z = vec![0.0; start.last().copied().unwrap_or(0)];
        let mut loaded = vec![false; self.blocks.len()];
        for (m, block) in self.blocks.iter().enumerate() {
            let Some(b) = block else { continue };
            let e = &mesh.elements[mesh.member_elements[m].start];
            let zm = &mut z[start[m]..start[m + 1]];
            for (k, node) in interior_nodes(mesh, m).enumerate() {
                zm[3 * k..3 * k + 3].copy_from_slice(&to_local(e.c, e.s, p[node]));
            }
            if zm.iter().all(|&v| v == 0.0) {
                continue;
            }
            loaded[m] = true;
            let on_ends = minus_w_transpose_times(&b.w, zm);
            let gi = to_global(e.c, e.s, [on_ends[0], on_ends[1], on_ends[2]]);
            let gj = to_global(e.c, e.s, [on_ends[3], on_ends[4], on_ends[5]]);
            let g = [gi[0], gi[1], gi[2], gj[0], gj[1], gj[2]];
            for (r, q) in element_equations(&so.dofs, &so.frame.elements[m])
                .iter()
                .enumerate()
            {
                if let Some(q) = q {
                    f[*q] += g[r];
                }
            }
            b.k_ii.solve(zm);
        }
        self.factor.solve(&mut f);
        let mut u = vec![[0.0; 3]; mesh.nodes.len()];
        for (node, d) in so.dofs.iter().enumerate() {
            for k in 0..3 {
                u[node][k] = d[k].equation().map_or(0.0, |q| f[q]);
            }
        }
        // Interior displacements: u_i = z − W·u_e.
        for (m, block) in self.blocks.iter().enumerate() {
            let Some(b) = block else { continue };
            let e = &mesh.elements[mesh.member_elements[m].start];
            let fe = &so.frame.elements[m];
            let (a, c) = (to_local(e.c, e.s, u[fe.i]), to_local(e.c, e.s, u[fe.j]));
            let ue = [a[0], a[1], a[2], c[0], c[1], c[2]];
            let zm = &z[start[m]..start[m + 1]];
            for (k, node) in interior_nodes(mesh, m).enumerate() {
                let mut ui = [0.0; 3];
                for (d, v) in ui.iter_mut().enumerate() {
                    let r = 3 * k + d;
                    let wr = &b.w[r * 6..r * 6 + 6];
                    let s: f64 = wr.iter().zip(&ue).map(|(w, x)| w * x).sum();
                    *v = if loaded[m] { zm[r] - s } else { -s };
                }
                u[node] = to_global(e.c, e.s, ui);
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
        terms: &LoadTerms,
    ) -> Result<Response, SystemError> {
        let axial = self.axial.as_deref();
        let p = equivalent_nodal_loads_with(model, mesh, &so.mesh_dofs, axial, loads, terms)?;
        let u = self.solve_nodal(mesh, so, &p);
        Ok(recover_with(mesh, &so.mesh_dofs, axial, loads, terms, u))
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
        let element_k = ElementStiffness::new(&mesh);
        Ok(SecondOrderModel {
            mesh,
            layout,
            elastic,
            element_k,
            segments: segments.max(1),
            refined: OnceLock::new(),
        })
    }

    /// First-order response to `loads` on the segmented mesh.
    pub fn first_order(&self, model: &Model, loads: &MeshLoads) -> Result<Response, SystemError> {
        let terms = LoadTerms::new(&self.mesh, loads);
        self.elastic
            .respond(&self.mesh, &self.layout, model, loads, &terms)
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
        let terms = LoadTerms::new(&self.mesh, loads);
        let first = self
            .elastic
            .respond(&self.mesh, &self.layout, model, loads, &terms)?;
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
            let r = system.respond(&self.mesh, &self.layout, model, loads, &terms)?;
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
    /// This is the LOWEST mode on the model's mesh, whatever its kind: it may be one
    /// member's own buckling rather than the frame's sway mode. [`Self::buckling`] sorts the
    /// modes into sway and member modes and puts the factors on the safe side of the mesh
    /// error.
    ///
    /// α_cr is the smallest λ at which `K + λ·K_G(N)` stops being positive definite
    /// (Sylvester's law of inertia: a failed Cholesky pivot marks λ ≥ α_cr). It is first
    /// estimated by shifted inverse iteration (`Self::estimate_alpha_cr`) and then
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
        Ok(self
            .lowest_mode(model, &axial)?
            .map(|(alpha_cr, x)| Buckling {
                alpha_cr,
                shape: self.node_shape(&x),
            }))
    }

    /// The lowest mode of the element axial forces `axial` (see [`Self::critical_factor`]):
    /// its factor and its vector over the mesh nodes (global `[ux, uy, θ]`, any scale).
    /// `None` when nothing is in compression or nothing buckles below the ceiling.
    pub(super) fn lowest_mode(
        &self,
        model: &Model,
        axial: &[f64],
    ) -> Result<Option<ModeVector>, SystemError> {
        if axial.iter().all(|&n| n >= 0.0) {
            return Ok(None);
        }
        let stable = |lambda: f64| -> Result<Option<Condensed>, SystemError> {
            let scaled: Vec<f64> = axial.iter().map(|n| lambda * n).collect();
            self.with_axial(model, &scaled)
        };
        let estimate = self.estimate_alpha_cr(axial, &stable)?;
        let tol = ALPHA_CR_TOLERANCE;
        // Without released elements in compression the estimate is a Rayleigh quotient of
        // the exact pencil, so α_cr ≤ estimate (min–max, from memory) and the factorization
        // above it would fail anyway: only the one below is needed.
        let exact = !self
            .mesh
            .elements
            .iter()
            .zip(axial)
            .any(|(e, &n)| e.release.iter().any(|&r| r) && n != 0.0);
        if let Some((alpha, _)) = &estimate {
            let (below, above) = (alpha * (1.0 - tol), alpha * (1.0 + tol));
            if stable(below)?.is_some() && (exact || stable(above)?.is_none()) {
                return Ok(estimate);
            }
        }
        // Search for a bracket (lo stable, hi not), from the estimate if there is one.
        let (mut lo, mut hi) = match &estimate {
            Some((alpha, _)) => (alpha / 1.25, alpha * 1.25),
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
        let x = match stable(0.999 * lo)? {
            Some(system) => self.mode_vector(&system),
            None => vec![[0.0; 3]; self.mesh.nodes.len()],
        };
        Ok(Some((alpha_cr, x)))
    }

    /// A vector over the mesh's unknowns, `value(equation number)` in each, zero on held
    /// and idle directions (a start vector for the inverse iterations).
    pub(super) fn start_vector(&self, value: impl Fn(usize) -> f64) -> Vec<[f64; 3]> {
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
        for (e, k) in self.mesh.elements.iter().zip(self.element_k.iter()) {
            add_element_product(&mut y, e, k, x);
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

    /// `G = −K_G` of every element in global axes for the axial forces `axial` at λ = 1,
    /// a released element's as the secant of its condensed matrix between λ = 0 and 1 (the
    /// estimate of [`Self::estimate_alpha_cr`], confirmed by factorization).
    fn secant_geometric(&self, axial: &[f64]) -> Vec<CompactMatrix> {
        let zero = Vector6::zeros();
        self.mesh
            .elements
            .iter()
            .zip(axial)
            .map(|(e, &n)| {
                let (with_g, _) = element_matrices(e, Some(n), &zero);
                let (without, _) = element_matrices(e, None, &zero);
                let t = transformation(e.c, e.s);
                CompactMatrix::new(-(t.transpose() * (with_g - without) * t))
            })
            .collect()
    }

    /// The buckling pencil `K·φ = λ·G·φ` of the element axial forces `axial` (see
    /// [`Pencil`]): exact and linear in λ.
    pub(super) fn pencil(&self, axial: &[f64]) -> Pencil {
        let mut plain = axial.to_vec();
        let mut released = Vec::new();
        let mut slot = 3 * self.mesh.nodes.len();
        for (ie, (e, &n)) in self.mesh.elements.iter().zip(axial).enumerate() {
            let t = transformation(e.c, e.s);
            if e.release.iter().any(|&r| r) && n != 0.0 {
                plain[ie] = 0.0;
                let extra = e.release.iter().filter(|&&r| r).count();
                released.push(Released {
                    element: ie,
                    ends: e.release,
                    slot,
                    k: elastic_stiffness(e.ea, e.ei, e.length),
                    g: -geometric_stiffness(n, e.length),
                    t,
                });
                slot += extra;
            }
        }
        Pencil {
            axial: plain,
            released,
            dim: slot,
        }
    }

    /// The number of eigenvalues of the buckling problem of `axial` below `lambda`
    /// (`Condensed::inertia` of the stiffness at `lambda`, the Sturm sequence count);
    /// `None` when `lambda` is an eigenvalue to round-off.
    pub(super) fn count_below(&self, axial: &[f64], lambda: f64) -> Option<usize> {
        let scaled: Vec<f64> = axial.iter().map(|n| lambda * n).collect();
        Condensed::inertia(&self.mesh, &self.layout, &scaled)
    }

    /// `K⁻¹·r` with the factored elastic stiffness (zero on held and idle directions).
    pub(super) fn elastic_solve(&self, r: &[[f64; 3]]) -> Vec<[f64; 3]> {
        self.elastic.solve_nodal(&self.mesh, &self.layout, r)
    }

    /// Zero the held and idle directions of a mesh vector.
    pub(super) fn clear_held(&self, y: &mut [[f64; 3]]) {
        for (yn, d) in y.iter_mut().zip(&self.layout.mesh_dofs) {
            for k in 0..3 {
                if d[k].equation().is_none() {
                    yn[k] = 0.0;
                }
            }
        }
    }

    /// Elements per member of this mesh.
    pub fn segments(&self) -> usize {
        self.segments
    }

    /// The nested mesh with twice the elements per member (built once, on first use): its
    /// nodes include every node of this mesh, so its buckling factors are bounded by this
    /// mesh's (Rayleigh–Ritz on a larger trial space).
    pub(super) fn refined(&self, model: &Model) -> Result<&SecondOrderModel, SystemError> {
        let built = self.refined.get_or_init(|| {
            let stiffness: Vec<MemberStiffness> = self
                .mesh
                .member_elements
                .iter()
                .map(|r| {
                    let e = &self.mesh.elements[r.start];
                    MemberStiffness { ea: e.ea, ei: e.ei }
                })
                .collect();
            SecondOrderModel::new(model, &stiffness, 2 * self.segments).map(Box::new)
        });
        match built {
            Ok(fine) => Ok(fine),
            Err(e) => Err(e.clone()),
        }
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
    ) -> Result<Option<ModeVector>, SystemError> {
        let parts = self.secant_geometric(axial);
        // y = G·x on the unknowns.
        let g = |x: &[[f64; 3]]| -> Vec<[f64; 3]> {
            let mut y = vec![[0.0; 3]; x.len()];
            for (e, kg) in self.mesh.elements.iter().zip(&parts) {
                add_element_product(&mut y, e, &kg.matrix(), x);
            }
            self.clear_held(&mut y);
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
                // One factored system at a time: the old one goes first, and is built again
                // (the same numbers) in the rare case that the closer shift is past α_cr.
                drop(shifted);
                shifted = match stable(closer)? {
                    Some(s) => {
                        sigma = closer;
                        s
                    }
                    None => match stable(sigma)? {
                        Some(s) => s,
                        None => return Ok(None),
                    },
                };
            }
            last = lambda;
        }
        let lambda = rayleigh(&x);
        if !(lambda > 0.0 && lambda.is_finite()) {
            return Ok(None);
        }
        Ok(Some((lambda, x)))
    }

    /// Per model node `[ux, uy, θ]` of a mesh vector, scaled so that the largest
    /// translation is 1 (positive).
    pub(super) fn node_shape(&self, x: &[[f64; 3]]) -> Vec<[f64; 3]> {
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

    /// Inverse iteration on a nearly singular system: its near-null vector over the mesh.
    fn mode_vector(&self, system: &Condensed) -> Vec<[f64; 3]> {
        let mut x = self.start_vector(|k| 1.0 + (k % 7) as f64 * 0.01);
        for _ in 0..8 {
            x = system.solve_nodal(&self.mesh, &self.layout, &x);
            let norm = x.iter().flatten().map(|v| v * v).sum::<f64>().sqrt();
            if norm == 0.0 || !norm.is_finite() {
                break;
            }
            x.iter_mut().flatten().for_each(|v| *v /= norm);
        }
        x
    }
}

/// One element matrix, kept as its upper triangle where it is symmetric to the last bit
/// (as every element's is in axes along the grid, where the transformation only swaps and
/// negates entries), else whole. [`CompactMatrix::matrix`] gives back the same matrix bit
/// for bit, so products with it are unchanged; the triangle takes 21 numbers, not 36.
#[derive(Debug, Clone)]
enum CompactMatrix {
    Triangle([f64; 21]),
    Whole(Box<Matrix6<f64>>),
}

impl CompactMatrix {
    fn new(k: Matrix6<f64>) -> CompactMatrix {
        let symmetric =
            (0..6).all(|r| (r + 1..6).all(|c| k[(r, c)].to_bits() == k[(c, r)].to_bits()));
        if !symmetric {
            return CompactMatrix::Whole(Box::new(k));
        }
        let mut upper = [0.0; 21];
        let mut at = 0;
        for r in 0..6 {
            for c in r..6 {
                upper[at] = k[(r, c)];
                at += 1;
            }
        }
        CompactMatrix::Triangle(upper)
    }

    fn matrix(&self) -> Matrix6<f64> {
        match self {
            CompactMatrix::Whole(k) => **k,
            CompactMatrix::Triangle(upper) => {
                let mut k = Matrix6::zeros();
                let mut at = 0;
                for r in 0..6 {
                    for c in r..6 {
                        k[(r, c)] = upper[at];
                        k[(c, r)] = upper[at];
                        at += 1;
                    }
                }
                k
            }
        }
    }
}

/// `y += k·x` over the two end nodes of element `e` (`k` in global axes).
fn add_element_product(
    y: &mut [[f64; 3]],
    e: &super::mesh::Element,
    k: &Matrix6<f64>,
    x: &[[f64; 3]],
) {
    let (a, b) = (x[e.i], x[e.j]);
    let f = k * Vector6::new(a[0], a[1], a[2], b[0], b[1], b[2]);
    for r in 0..3 {
        y[e.i][r] += f[r];
        y[e.j][r] += f[3 + r];
    }
}

/// The buckling pencil `K·φ = λ·G·φ` of one load over a segmented mesh, on flat vectors:
/// `[ux, uy, θ]` of every mesh node (zero on held and idle directions), then the rotation of
/// every released element end that carries axial force.
///
/// A released end's rotation is condensed out of `k + λ·k_G` elsewhere, which makes the
/// condensed matrix non-linear in λ. Kept as an unknown of its own it leaves the pencil
/// linear and exact, with the same eigenvalues; its pivot belongs to the Sturm count
/// (`released_negatives`). Elements without axial force keep their releases condensed (no
/// geometric stiffness: nothing is lost).
#[derive(Debug, Clone)]
pub(super) struct Pencil {
    /// Axial force of every element whose `G = −K_G(N)` acts on the node DOFs (zero for the
    /// [`Released`] ones), N, tension positive.
    axial: Vec<f64>,
    /// The released elements with axial force.
    released: Vec<Released>,
    /// Length of the flat vectors.
    dim: usize,
}

/// An element with released ends and axial force, in the buckling pencil.
#[derive(Debug, Clone)]
struct Released {
    element: usize,
    /// Which of its ends are released.
    ends: [bool; 2],
    /// Position of its first released rotation in the flat vectors (end i before end j).
    slot: usize,
    /// Elastic stiffness and `G = −K_G`, local axes, not condensed.
    k: Matrix6<f64>,
    g: Matrix6<f64>,
    /// Global to local.
    t: Matrix6<f64>,
}

impl Released {
    /// Local DOFs of its released rotations (2 at end i, 5 at end j) and their slots.
    fn extras(&self, e: &super::mesh::Element) -> Vec<(usize, usize)> {
        let mut out = Vec::with_capacity(2);
        let mut slot = self.slot;
        for (end, &r) in e.release.iter().enumerate() {
            if r {
                out.push((2 + 3 * end, slot));
                slot += 1;
            }
        }
        out
    }

    /// Local displacements from a flat vector, the released rotations from their slots.
    fn local(&self, e: &super::mesh::Element, x: &[f64]) -> Vector6<f64> {
        let (i, j) = (3 * e.i, 3 * e.j);
        let global = Vector6::new(x[i], x[i + 1], x[i + 2], x[j], x[j + 1], x[j + 2]);
        let mut u = self.t * global;
        for (dof, slot) in self.extras(e) {
            u[dof] = x[slot];
        }
        u
    }

    /// Add local end forces `f` to a flat vector: released rotations to their slots, the
    /// rest to the nodes.
    fn scatter(&self, e: &super::mesh::Element, mut f: Vector6<f64>, y: &mut [f64]) {
        for (dof, slot) in self.extras(e) {
            y[slot] += f[dof];
            f[dof] = 0.0;
        }
        let g = self.t.transpose() * f;
        for r in 0..3 {
            y[3 * e.i + r] += g[r];
            y[3 * e.j + r] += g[3 + r];
        }
    }
}

/// `y −= K_G(n)·x` on flat vectors over the two end nodes of element `e`: the consistent
/// geometric stiffness of [`geometric_stiffness`] acts on the transverse translations
/// `v = −s·ux + c·uy` and the rotations only, so it is applied in that form (the same
/// product as the 6×6 matrix in global axes, without forming it).
fn add_geometric_product(y: &mut [f64], e: &super::mesh::Element, n: f64, x: &[f64]) {
    let (i, j, l, c, s) = (3 * e.i, 3 * e.j, e.length, e.c, e.s);
    let (vi, ti) = (-s * x[i] + c * x[i + 1], x[i + 2]);
    let (vj, tj) = (-s * x[j] + c * x[j + 1], x[j + 2]);
    let f = n / l;
    let (p, q, r, t) = (6.0 / 5.0, l / 10.0, 2.0 * l * l / 15.0, -l * l / 30.0);
    let fvi = f * (p * vi + q * ti - p * vj + q * tj);
    let mi = f * (q * vi + r * ti - q * vj + t * tj);
    let fvj = -fvi;
    let mj = f * (q * vi + t * ti - q * vj + r * tj);
    y[i] += s * fvi;
    y[i + 1] -= c * fvi;
    y[i + 2] -= mi;
    y[j] += s * fvj;
    y[j + 1] -= c * fvj;
    y[j + 2] -= mj;
}

/// `y += k·x` on flat vectors over the two end nodes of element `e` (`k` in global axes).
fn add_flat_product(y: &mut [f64], e: &super::mesh::Element, k: &Matrix6<f64>, x: &[f64]) {
    let (i, j) = (3 * e.i, 3 * e.j);
    let f = k * Vector6::new(x[i], x[i + 1], x[i + 2], x[j], x[j + 1], x[j + 2]);
    for r in 0..3 {
        y[i + r] += f[r];
        y[j + r] += f[3 + r];
    }
}

impl Pencil {
    /// Length of the flat vectors.
    pub(super) fn dim(&self) -> usize {
        self.dim
    }

    /// The released ends of element `ie` carrying axial force, as `(end, slot)` (end 0 for
    /// i, 1 for j); none for any other element.
    pub(super) fn released_slots(&self, ie: usize) -> Vec<(usize, usize)> {
        self.released
            .iter()
            .find(|r| r.element == ie)
            .map(|r| {
                let mut slot = r.slot;
                r.ends
                    .iter()
                    .enumerate()
                    .filter(|(_, e)| **e)
                    .map(|(end, _)| {
                        slot += 1;
                        (end, slot - 1)
                    })
                    .collect()
            })
            .unwrap_or_default()
    }

    /// Every released end carrying axial force: `(element, end, slot)`.
    pub(super) fn released_ends(&self) -> Vec<(usize, usize, usize)> {
        self.released
            .iter()
            .flat_map(|r| {
                self.released_slots(r.element)
                    .into_iter()
                    .map(move |(end, slot)| (r.element, end, slot))
            })
            .collect()
    }

    /// Which directions of every mesh node are unknowns.
    pub(super) fn free(&self, so: &SecondOrderModel) -> Vec<[bool; 3]> {
        so.layout
            .mesh_dofs
            .iter()
            .map(|d| [0, 1, 2].map(|k| d[k].equation().is_some()))
            .collect()
    }

    /// Zero the held and idle node directions of a flat vector.
    pub(super) fn clear_held(&self, so: &SecondOrderModel, y: &mut [f64]) {
        for (n, d) in so.layout.mesh_dofs.iter().enumerate() {
            for k in 0..3 {
                if d[k].equation().is_none() {
                    y[3 * n + k] = 0.0;
                }
            }
        }
    }

    /// `K·x` (elastic, springs included).
    pub(super) fn k_times(&self, so: &SecondOrderModel, x: &[f64]) -> Vec<f64> {
        let mut y = vec![0.0; self.dim];
        let mut skip = vec![false; so.mesh.elements.len()];
        for r in &self.released {
            let e = &so.mesh.elements[r.element];
            r.scatter(e, r.k * r.local(e, x), &mut y);
            skip[r.element] = true;
        }
        for ((e, k), _) in so
            .mesh
            .elements
            .iter()
            .zip(so.element_k.iter())
            .zip(&skip)
            .filter(|(_, s)| !**s)
        {
            add_flat_product(&mut y, e, k, x);
        }
        for (n, d) in so.layout.mesh_dofs.iter().enumerate() {
            for k in 0..3 {
                if let Dof::Spring(_, ks) = d[k] {
                    y[3 * n + k] += ks * x[3 * n + k];
                }
            }
        }
        self.clear_held(so, &mut y);
        y
    }

    /// `G·x`.
    pub(super) fn g_times(&self, so: &SecondOrderModel, x: &[f64]) -> Vec<f64> {
        let mut y = vec![0.0; self.dim];
        for (e, &n) in so.mesh.elements.iter().zip(&self.axial) {
            if n != 0.0 {
                add_geometric_product(&mut y, e, n, x);
            }
        }
        for r in &self.released {
            let e = &so.mesh.elements[r.element];
            r.scatter(e, r.g * r.local(e, x), &mut y);
        }
        self.clear_held(so, &mut y);
        y
    }

    /// The 3×3 block of `K − λ·G` at each mesh node of `wanted` (global axes; what the
    /// node's own translations and rotation cost, the other unknowns held), springs
    /// included; zero at the other nodes.
    pub(super) fn node_blocks(
        &self,
        so: &SecondOrderModel,
        lambda: f64,
        wanted: &[bool],
    ) -> Vec<Matrix3<f64>> {
        let mut blocks = vec![Matrix3::zeros(); so.mesh.nodes.len()];
        let mut special = vec![false; so.mesh.elements.len()];
        for r in &self.released {
            special[r.element] = true;
            let e = &so.mesh.elements[r.element];
            if !wanted[e.i] && !wanted[e.j] {
                continue;
            }
            let mut m = r.k - r.g * lambda;
            for (dof, _) in r.extras(e) {
                for k in 0..6 {
                    m[(dof, k)] = 0.0;
                    m[(k, dof)] = 0.0;
                }
            }
            let g = r.t.transpose() * m * r.t;
            blocks[e.i] += g.fixed_view::<3, 3>(0, 0);
            blocks[e.j] += g.fixed_view::<3, 3>(3, 3);
        }
        for (ie, e) in so.mesh.elements.iter().enumerate() {
            if special[ie] {
                continue;
            }
            let k = so.element_k.get(ie);
            // λ·K_G(N) at one end, from the local [v, θ] block (N/L)·[6/5, ±L/10; ±L/10,
            // 2L²/15] of `geometric_stiffness` with v = −s·ux + c·uy.
            let f = lambda * self.axial[ie] / e.length;
            let (p, q, r) = (6.0 / 5.0, e.length / 10.0, 2.0 * e.length * e.length / 15.0);
            let (c, s) = (e.c, e.s);
            for (end, node, sign) in [(0, e.i, 1.0), (3, e.j, -1.0)] {
                if !wanted[node] {
                    continue;
                }
                let qs = sign * q;
                let kg = Matrix3::new(
                    s * s * p,
                    -s * c * p,
                    -s * qs,
                    -s * c * p,
                    c * c * p,
                    c * qs,
                    -s * qs,
                    c * qs,
                    r,
                ) * f;
                blocks[node] += k.fixed_view::<3, 3>(end, end) + kg;
            }
        }
        for (n, d) in so.layout.mesh_dofs.iter().enumerate() {
            for k in 0..3 {
                if let Dof::Spring(_, ks) = d[k] {
                    blocks[n][(k, k)] += ks;
                }
            }
        }
        blocks
    }

    /// `K⁻¹·r` exactly, by static condensation: each released rotation's load is moved onto
    /// its element's other DOFs (`r_c − k_cr·k_rr⁻¹·r_r`), the condensed frame is solved with
    /// the factored elastic stiffness, and the released rotations are recovered
    /// (`k_rr⁻¹·(r_r − k_rc·u_c)`).
    pub(super) fn solve(&self, so: &SecondOrderModel, r: &[f64]) -> Vec<f64> {
        let nodes = 3 * so.mesh.nodes.len();
        let mut f: Vec<[f64; 3]> = r[..nodes]
            .chunks_exact(3)
            .map(|c| [c[0], c[1], c[2]])
            .collect();
        // Per released element: (retained local DOFs, released local DOFs, k_rr⁻¹).
        let split = |rel: &Released, e: &super::mesh::Element| {
            let extras = rel.extras(e);
            let dofs: Vec<usize> = extras.iter().map(|x| x.0).collect();
            let n = dofs.len();
            let k_rr = DMatrix::from_fn(n, n, |a, b| rel.k[(dofs[a], dofs[b])]);
            (extras, k_rr.try_inverse())
        };
        for rel in &self.released {
            let e = &so.mesh.elements[rel.element];
            let (extras, Some(inv)) = split(rel, e) else {
                continue;
            };
            let rr = DVector::from_iterator(extras.len(), extras.iter().map(|x| r[x.1]));
            let z = &inv * rr;
            // Local loads −k_cr·z on the element's DOFs (the released rows excluded).
            let mut fl = Vector6::zeros();
            for c in 0..6 {
                if extras.iter().all(|x| x.0 != c) {
                    fl[c] = -(0..extras.len())
                        .map(|a| rel.k[(c, extras[a].0)] * z[a])
                        .sum::<f64>();
                }
            }
            let g = rel.t.transpose() * fl;
            for k in 0..3 {
                f[e.i][k] += g[k];
                f[e.j][k] += g[3 + k];
            }
        }
        let u = so.elastic_solve(&f);
        let mut out = vec![0.0; self.dim];
        for (n, v) in u.iter().enumerate() {
            out[3 * n..3 * n + 3].copy_from_slice(v);
        }
        for rel in &self.released {
            let e = &so.mesh.elements[rel.element];
            let (extras, Some(inv)) = split(rel, e) else {
                continue;
            };
            let (a, b) = (u[e.i], u[e.j]);
            let ul = rel.t * Vector6::new(a[0], a[1], a[2], b[0], b[1], b[2]);
            let rhs = DVector::from_iterator(
                extras.len(),
                extras.iter().map(|&(dof, slot)| {
                    r[slot]
                        - (0..6)
                            .filter(|c| extras.iter().all(|x| x.0 != *c))
                            .map(|c| rel.k[(dof, c)] * ul[c])
                            .sum::<f64>()
                }),
            );
            let theta = &inv * rhs;
            for (a, &(_, slot)) in extras.iter().enumerate() {
                out[slot] = theta[a];
            }
        }
        out
    }
}

/// A buckling mode found by [`SecondOrderModel::lowest_mode`]: its factor and its vector
/// over the mesh nodes.
pub(super) type ModeVector = (f64, Vec<[f64; 3]>);

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

#[cfg(test)]
mod tests {
    use super::*;
    use crate::solve::element::{elastic_stiffness, geometric_stiffness, transformation};
    use crate::solve::test_rng::Lcg;

    /// Bit patterns of a matrix, so that −0 and +0 count as different.
    fn bits(k: &Matrix6<f64>) -> Vec<u64> {
        k.iter().map(|v| v.to_bits()).collect()
    }

    #[test]
    fn stored_element_matrices_come_back_bit_for_bit() {
        // Property (no engineering number, common practice, no source): the triangle kept
        // for a symmetric matrix gives back the same 36 bit patterns, signed zeros
        // included; a matrix that is not symmetric to the bit is kept whole. The secant
        // geometric stiffness of members along the grid (c, s in {0, ±1}) is symmetric to
        // the bit, so it takes the triangle; an inclined member's may not be.
        let mut rng = Lcg(7);
        for trial in 0..400 {
            let (c, s) = match trial % 4 {
                0 => (1.0, 0.0),
                1 => (0.0, 1.0),
                2 => (0.0, -1.0),
                _ => {
                    let a = rng.symmetric() * 3.0;
                    (a.cos(), a.sin())
                }
            };
            let l = 1.0 + rng.symmetric().abs() * 5.0;
            let n = rng.symmetric() * 1e6;
            let ke = elastic_stiffness(2e9 * (1.5 + rng.symmetric()), 4e7, l);
            let with_g = ke + geometric_stiffness(n, l);
            let t = transformation(c, s);
            let g = -(t.transpose() * (with_g - ke) * t);
            let stored = CompactMatrix::new(g);
            assert_eq!(bits(&stored.matrix()), bits(&g), "trial {trial}");
            if trial % 4 != 3 {
                assert!(
                    matches!(stored, CompactMatrix::Triangle(_)),
                    "trial {trial}"
                );
            }
        }
        // Signed zeros that differ across the diagonal: kept whole.
        let mut k = Matrix6::identity();
        k[(0, 1)] = 0.0;
        k[(1, 0)] = -0.0;
        let stored = CompactMatrix::new(k);
        assert!(matches!(stored, CompactMatrix::Whole(_)));
        assert_eq!(bits(&stored.matrix()), bits(&k));
    }
}
