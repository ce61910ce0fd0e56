//! Buckling modes of a frame, sorted into sway and member modes, with critical load factors
//! on the safe side of the mesh error.
//!
//! [`SecondOrderModel::critical_factor`] returns the lowest mode of `K·φ = λ·G·φ`. That mode
//! may be one member's own buckling (a slender leaning post or a pin-ended brace bowing
//! between its ends), while the α_cr that the sway amplifiers and the EN 1993-1-1 §5.2.1
//! criterion need is that of the frame's sway mode. [`SecondOrderModel::buckling`] returns
//! both, found and classified as follows.
//!
//! # Classification (common practice, no source)
//!
//! For a mode vector over the mesh nodes (interior segment nodes included), and for each
//! member m of length L_m with transverse translations v measured normal to its chord:
//!
//! * chord rotation `ρ_m = |v_j − v_i| / L_m` (the relative transverse translation of its
//!   two end nodes: the member's share of a sway);
//! * bow `β_m = max |v(x) − v_chord(x)| / L_m` over its interior nodes and the quarter
//!   points of each of its elements, v(x) being the element's cubic (the deviation from the
//!   straight line through its end nodes: the member's own curvature; the quarter points
//!   catch the bows that a coarse mesh carries by node rotations alone).
//!
//! A mode is a **sway mode** when `max_m ρ_m ≥ SWAY_RATIO · max_m β_m` with
//! [`SWAY_RATIO`] = 1: the levels translate more than any member bows. Otherwise it is a
//! **member mode**, attributed to the member with the largest β. A mode in which the joints
//! only rotate (a braced frame's non-sway mode) has ρ = 0 and is a member mode.
//!
//! Why 1. A column swaying in double curvature bows by about 0.1 of its chord rotation
//! (v = Δ(1 − cos πx/h)/2: β/ρ = 0.105), one swaying in single curvature by about 0.2
//! (v = Δ·sin(πx/2h): β/ρ = 0.21), while in a member mode the chord barely turns. Measured
//! on the modes of `tests/buckling_modes.rs` with 4 elements per member, ρ/β is: sway
//! modes 9.8 (fixed-base portal with a leaning post), 7.0 (pinned-base portal), 4.8
//! (cantilever column), 5.5 (three bays with a brace and a leaning column), 3.9 (braced
//! frame swaying by stretching its brace), 18 (braced frame with rigid joints); member
//! modes 0 to 10⁻³ (a leaning post's and a pin-ended brace's bows), 0.07 to 0.22 (a braced
//! frame's columns buckling between floors, joints rotating), and up to 0.78 for a higher
//! column mode of a braced frame that carries some sway. The threshold sits between the
//! two families with a margin of about 4 on the sway side and 1.3 on the member side; with
//! 2 elements per member a braced frame's sway mode, mixed with its brace's higher bows,
//! measured 1.4.
//!
//! # Finding the lowest sway mode above member modes
//!
//! The common case costs little more than before: when the lowest mode
//! ([`SecondOrderModel::critical_factor`]'s) is a sway mode it is the answer, and only its
//! factor on the nested mesh is added (below). Otherwise the modes are found upwards, in
//! ascending order, until the first sway mode, the ceiling [`ALPHA_CR_CEILING`] or
//! [`MAX_MODES`] modes:
//!
//! * **Exact linear pencil**: a released element end that carries axial force keeps its
//!   own rotation as an unknown (`second_order::Pencil`), so the pencil is linear in λ and
//!   has the eigenvalues of the analysis (whose releases are condensed from `k + λ·k_G` at
//!   each λ); every other element's releases stay condensed.
//! * **Block eigensolver**: the locally optimal block preconditioned conjugate gradient
//!   method (LOBPCG; A. V. Knyazev, SIAM J. Sci. Comput. 23(2), 2001, from memory) on the
//!   pencil `G·φ = μ·K·φ`, μ = 1/λ, whose largest μ are the smallest positive λ. Each step
//!   takes the Rayleigh–Ritz solution on the span of the current vectors X, their
//!   preconditioned residuals W = K⁻¹(G·X − μ·K·X) and the previous directions P. The
//!   preconditioner is the elastic stiffness already factored (the exact K⁻¹), so no new
//!   factorization is needed. The projected pencil is solved densely (nalgebra): `XᵀKX` is
//!   positive definite on independent vectors, so the basis is first made K-orthonormal
//!   through the eigenvectors of that Gram matrix (dropping dependent directions), and then
//!   `XᵀGX` is a symmetric eigenproblem. Converged vectors are locked: later vectors are
//!   kept K-orthogonal to them (buckling modes are K- and G-orthogonal to each other), so
//!   the block moves on to the next modes; the last third of a full block is not locked
//!   (its ranks are not yet trusted). The start block holds the lowest mode, the static
//!   sway shapes K⁻¹·H (H: unit lateral forces at every model node, uniform and growing
//!   with height) and smooth pseudo-random vectors.
//! * **Sturm count**: the inertia of `K − σ·G` (negative pivots of every member's interior
//!   block `K_ii`, of the condensed frame matrix and of the released end rotations, added
//!   by Haynsworth's inertia additivity) is the number of eigenvalues below σ. At σ just
//!   above the reported sway factor it must equal the number of modes found below it; if
//!   it is larger, modes were missed (a block holds only so many copies of a multiple
//!   eigenvalue, as identical leaning posts give) and the search goes on from fresh
//!   vectors, K-orthogonal to the modes found. A frame whose modes up to the ceiling are
//!   all counted and all member modes has no sway mode ([`SwaySearch::Complete`], `sway` =
//!   `None`); when [`MAX_MODES`] member modes are found first, the count proves the sway
//!   mode is above the last of them ([`SwaySearch::LowerBound`]).
//!
//! # Safe side of the mesh error
//!
//! Cubic Hermite elements with the consistent geometric stiffness are a Rayleigh–Ritz
//! method, so on nested meshes the k-th factor decreases towards the exact one:
//! α_k(n) ≥ α_k(2n) ≥ α_k(∞) (min–max characterisation of eigenvalues, from memory). The
//! error falls like h⁴ for these elements (measured: 0.75 %, 0.047 %, 0.003 % for a
//! pin-ended column with 2, 4, 8 elements). Each mode is therefore solved again on the
//! nested mesh with 2n elements per member (built once per model; the start vectors are the
//! n-mesh modes, interpolated exactly and corrected at the new middle nodes, and the axial
//! forces come from the n-mesh first-order solution by statics; one solve usually confirms
//! a mode), and the reported factor is [`safe_side`]: `α(2n) − (α(n) − α(2n))/3`,
//! the Richardson extrapolation for an error falling like h², which lies below α(∞) by about
//! a quarter of `α(n) − α(2n)` when the error falls like h⁴. Where the axial force varies
//! along a member (its own weight, an inclined member under gravity), each element takes
//! its mean, an error from below falling like h²; the extrapolation removes it exactly, and
//! when it dominates (the factors rise with the mesh) the model mesh's factor is kept, being
//! then below α(∞) already. From [`REFINE_BELOW`] elements per member on, the mesh error is
//! small (below 10⁻⁵ for constant axial forces) and the mesh factor is reported as it is.
//!
//! The modes of the two meshes are paired by kind: the first sway mode of each, and for a
//! member mode the mode of the same member and the same order among that member's modes (a
//! post's third bow with its third bow), since the finer mesh may lower a member's higher
//! bows past the sway mode.

use nalgebra::{DMatrix, DVector, SymmetricEigen};
use serde::Serialize;

use super::beam::{Side, internal_forces_at};
use super::element::transformation;
use super::linear::{MeshLoads, Response};
use super::mesh::Mesh;
use super::second_order::{ALPHA_CR_CEILING, Buckling, Pencil, SecondOrderModel, element_axial};
use super::system::SystemError;
use crate::model::Model;

/// A mode is a sway mode when its largest chord rotation is at least this times its largest
/// bow (common practice, no source; see the module documentation for the measurements).
pub const SWAY_RATIO: f64 = 1.0;

/// Most modes found below the sway mode. Past them the search stops and reports the last
/// factor as a lower bound of the sway factor ([`SwaySearch::LowerBound`]).
pub const MAX_MODES: usize = 48;

/// From this many elements per member on, the mesh factors are reported without the nested
/// mesh: the mesh error is then below 10⁻⁵ where axial forces are constant along members
/// (h⁴ convergence, measured from 0.75 % at two elements), and where they vary it is from
/// below (0.16 % for a column under its own weight), on the safe side.
pub const REFINE_BELOW: usize = 16;

/// Vectors iterated together by the block eigensolver.
const BLOCK: usize = 6;

/// Convergence of a mode on the nested mesh, which is only paired and extrapolated,
/// relative to its own μ: the bound of [`lowest_modes`] is this times the ratio of the
/// lowest to the highest factor sought (from the model's mesh), so that the highest gets
/// it. The error of its factor is of the order of its square (measured: within 7.4·10⁻⁹
/// of a search to 10⁻⁹ on every mode of `tests/buckling_modes.rs`).
const NESTED_TOLERANCE: f64 = 1e-4;

/// Convergence of a mode: the preconditioned residual `‖K⁻¹(G·x − μ·K·x)‖_K` for a
/// K-normalised x, relative to the largest μ met (the lowest mode's: every mode gets the
/// same bound, since the locked modes' residuals bound what the later ones reach). With the
/// exact K⁻¹ it bounds the error of μ; for a mode r times higher than the lowest, r times
/// this relative to its own μ. The error of μ is in fact of the order of the square.
const RESIDUAL_TOLERANCE: f64 = 1e-8;

/// Most block iterations of one search.
const MAX_ITERATIONS: usize = 600;

/// The Sturm count is taken at `λ·(1 + COUNT_MARGIN)` just above a mode found.
const COUNT_MARGIN: f64 = 1e-7;

/// What a mode is.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
pub enum ModeKind {
    /// The levels translate: the frame's sway mode.
    Sway,
    /// One member bows between its ends (index of the model member with the largest bow).
    Member { member: usize },
}

/// The two measures that classify a mode (see the module documentation).
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct ModeMeasures {
    /// Largest chord rotation ρ over the members (relative transverse translation of the
    /// end nodes over the length).
    pub chord_rotation: f64,
    /// Member with the largest chord rotation.
    pub chord_member: usize,
    /// Largest bow β over the members (deviation of an interior node from the chord, over
    /// the length).
    pub bow: f64,
    /// Member with the largest bow.
    pub bow_member: usize,
}

impl ModeMeasures {
    /// The kind of the mode: sway when `ρ ≥ SWAY_RATIO·β` (and ρ > 0), else member.
    pub fn kind(&self) -> ModeKind {
        if self.chord_rotation > 0.0 && self.chord_rotation >= SWAY_RATIO * self.bow {
            ModeKind::Sway
        } else {
            ModeKind::Member {
                member: self.bow_member,
            }
        }
    }
}

/// One mode found, for the report and the tests.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct ModeSummary {
    /// Critical load factor on the safe side of the mesh error (what is reported).
    pub alpha_cr: f64,
    /// Factor on the model's mesh (`segments` elements per member), unrounded.
    pub alpha_mesh: f64,
    /// Factor of the mode of the same rank on the nested mesh (2·`segments` elements per
    /// member); `None` from [`REFINE_BELOW`] elements on.
    pub alpha_refined: Option<f64>,
    /// Sway or member mode (on the model's mesh).
    pub kind: ModeKind,
    /// Largest chord rotation ρ over the members, scaled so that the larger of ρ and β is 1
    /// (a mode has no scale of its own; their ratio classifies it).
    pub chord_rotation: f64,
    /// Largest bow β over the members, same scale.
    pub bow: f64,
}

/// The lowest member mode of a load.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct MemberMode {
    /// Critical load factor on the safe side of the mesh error.
    pub alpha_cr: f64,
    /// The model member that bows most (index into `model.members`).
    pub member: usize,
    /// `[ux, uy, θ]` per model node, in the scale of `profile`.
    pub shape: Vec<[f64; 3]>,
    /// The member's bow along it, `[x from end i (m), v]` at its mesh nodes and element
    /// middles, v the transverse translation less the chord's, scaled so that the largest
    /// |v| is 1.
    pub profile: Vec<[f64; 2]>,
}

/// How far the search for the sway mode went.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
pub enum SwaySearch {
    /// Every mode below the sway mode (or below the ceiling, when there is no sway mode)
    /// was found: the Sturm count agrees.
    Complete,
    /// At least [`MAX_MODES`] member modes lie below the sway mode. The count proves that
    /// none of the modes below the last of them was missed, so the lowest sway factor is at
    /// least that mode's: `sway.alpha_cr` is that lower bound (on the safe side of the mesh
    /// error) and `sway.shape` the static sway shape.
    LowerBound,
    /// The count did not confirm the search (modes remained missing after the retries):
    /// `sway.alpha_cr` is the lowest mode's factor, on the safe side.
    Unconfirmed,
}

/// Elastic buckling of one load, sorted into sway and member modes.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct FrameBuckling {
    /// Lowest SWAY mode: critical load factor on the safe side of the mesh error and its
    /// shape per model node (`[ux, uy, θ]`, largest translation 1). `None` when no sway
    /// mode exists below [`ALPHA_CR_CEILING`].
    pub sway: Option<Buckling>,
    /// Lowest MEMBER mode when one lies below the sway mode (or exists without one).
    pub member: Option<MemberMode>,
    /// The modes found, ascending, up to and including the sway mode.
    pub modes: Vec<ModeSummary>,
    /// Whether the search for the sway mode is complete.
    pub search: SwaySearch,
    /// Elements per member of the model's mesh and of the nested mesh (equal when no
    /// nested mesh was used).
    pub segments: [usize; 2],
}

/// A mode on one mesh.
#[derive(Debug, Clone)]
struct Mode {
    alpha: f64,
    /// The flat vector of the pencil ([`Pencil`]).
    flat: Vec<f64>,
    /// Over the mesh nodes, global `[ux, uy, θ]`.
    x: Vec<[f64; 3]>,
    /// End rotations of every element ([`element_rotations`]).
    ends: Vec<[f64; 2]>,
    measures: ModeMeasures,
}

impl Mode {
    fn new(mesh: &Mesh, pencil: &Pencil, alpha: f64, flat: Vec<f64>) -> Mode {
        let x = to_nodes(&flat, mesh.nodes.len());
        let ends = element_rotations(mesh, pencil, &flat);
        let measures = mode_measures(mesh, &x, &ends);
        Mode {
            alpha,
            flat,
            x,
            ends,
            measures,
        }
    }

    fn is_sway(&self) -> bool {
        self.measures.kind() == ModeKind::Sway
    }
}

/// Transverse translation of mesh node `n` normal to a chord with direction cosines (c, s).
fn transverse(x: &[[f64; 3]], n: usize, c: f64, s: f64) -> f64 {
    -s * x[n][0] + c * x[n][1]
}

/// The points at which member `m`'s bow is measured in mode vector `x`: `[x from end i,
/// deviation of the transverse translation from the chord]` at its interior nodes and at the
/// quarter points of each element, on the element's cubic (Hermite shape functions, with
/// the element's end rotations `ends[element]`; a NaN end rotation, a released end condensed
/// out, gives no inner points). The quarter points catch both a bow within the element
/// (largest at the middle) and the S-shape of equal end rotations (zero at the middle,
/// 0.094·hθ at the quarter points against 0.096·hθ at its peaks). The end nodes (deviation
/// 0) are included.
fn bow_points(mesh: &Mesh, m: usize, x: &[[f64; 3]], ends: &[[f64; 2]]) -> Vec<[f64; 2]> {
    let range = mesh.member_elements[m].clone();
    let (first, last) = (&mesh.elements[range.start], &mesh.elements[range.end - 1]);
    let (c, s) = (first.c, first.s);
    let length = last.x0 + last.length;
    let (vi, vj) = (transverse(x, first.i, c, s), transverse(x, last.j, c, s));
    let chord = |at: f64| vi + (vj - vi) * at / length;
    let mut out = vec![[0.0, 0.0]];
    for (k, ie) in range.enumerate() {
        let e = &mesh.elements[ie];
        if k > 0 {
            out.push([e.x0, transverse(x, e.i, c, s) - chord(e.x0)]);
        }
        let [ti, tj] = ends[ie];
        if ti.is_finite() && tj.is_finite() {
            let (a, b, h) = (transverse(x, e.i, c, s), transverse(x, e.j, c, s), e.length);
            for xi in [0.25, 0.5, 0.75] {
                let (x2, x3) = (xi * xi, xi * xi * xi);
                let v = (1.0 - 3.0 * x2 + 2.0 * x3) * a
                    + h * (xi - 2.0 * x2 + x3) * ti
                    + (3.0 * x2 - 2.0 * x3) * b
                    + h * (x3 - x2) * tj;
                let at = e.x0 + xi * h;
                out.push([at, v - chord(at)]);
            }
        }
    }
    out.push([length, 0.0]);
    out
}

/// The end rotations of every element in a mode: the node's rotation, or for a released
/// end its own rotation from the pencil's vector (NaN when it was condensed out, an
/// element without axial force).
fn element_rotations(mesh: &Mesh, pencil: &Pencil, flat: &[f64]) -> Vec<[f64; 2]> {
    let mut out: Vec<[f64; 2]> = mesh
        .elements
        .iter()
        .map(|e| {
            let r = |n: usize, released: bool| if released { f64::NAN } else { flat[3 * n + 2] };
            [r(e.i, e.release[0]), r(e.j, e.release[1])]
        })
        .collect();
    for (ie, end, slot) in pencil.released_ends() {
        out[ie][end] = flat[slot];
    }
    out
}

/// The chord rotation and bow of every member in mode vector `x` (over the mesh nodes, with
/// the element end rotations `ends`), as defined in the module documentation, and their
/// largest values, in the scale of `x`. A chord rotation below 10⁻⁶ of the mode's largest
/// rotation is round-off (of the eigensolver's tolerance) and counts as none.
fn mode_measures(mesh: &Mesh, x: &[[f64; 3]], ends: &[[f64; 2]]) -> ModeMeasures {
    let mut out = ModeMeasures {
        chord_rotation: 0.0,
        chord_member: 0,
        bow: 0.0,
        bow_member: 0,
    };
    let mut size = ends
        .iter()
        .flatten()
        .filter(|t| t.is_finite())
        .fold(0.0f64, |a, t| a.max(t.abs()));
    for (m, range) in mesh.member_elements.iter().enumerate() {
        let (first, last) = (&mesh.elements[range.start], &mesh.elements[range.end - 1]);
        let (c, s) = (first.c, first.s);
        let length = last.x0 + last.length;
        let (vi, vj) = (transverse(x, first.i, c, s), transverse(x, last.j, c, s));
        let rho = (vj - vi).abs() / length;
        if rho > out.chord_rotation {
            out.chord_rotation = rho;
            out.chord_member = m;
        }
        let beta = bow_points(mesh, m, x, ends)
            .iter()
            .fold(0.0f64, |b, p| b.max(p[1].abs()))
            / length;
        if beta > out.bow {
            out.bow = beta;
            out.bow_member = m;
        }
        size = size.max(rho).max(beta);
    }
    if out.chord_rotation <= 1e-6 * size {
        out.chord_rotation = 0.0;
    }
    out
}

/// The factor on the safe side of the mesh error from the factor of the model's mesh
/// (`coarse`) and of the nested mesh with twice the elements (`fine`).
///
/// Two errors add up on a mesh of element length h: the Rayleigh–Ritz error of the cubic
/// elements, `+A·h⁴` (from above), and, where the axial force varies along a member, the
/// error of taking it constant (its mean) over each element, `−B·h²` (from below; a
/// cantilever under its own weight is 10 %, 2.6 %, 0.6 % low with 2, 4, 8 elements).
///
/// * `fine ≤ coarse`: the Richardson extrapolation for an h² error,
///   `fine − (coarse − fine)/3`, which removes the h² term exactly and leaves `−A·h⁴/4`:
///   below the exact factor (closed form: with `c = α(1 + a + b)`, `f = α(1 + a/16 + b/4)`
///   for the two terms, the estimate is `α(1 − a/4)`).
/// * `fine > coarse`: the factors rise with the mesh, so the h² error dominates and the
///   coarse factor is already below the exact one (`B·h²·3/4 > A·h⁴·15/16` makes
///   `A·h⁴ − B·h²` negative): `coarse`.
pub fn safe_side(coarse: f64, fine: f64) -> f64 {
    if fine <= coarse {
        fine - (coarse - fine) / 3.0
    } else {
        coarse
    }
}

// ---------------------------------------------------------------------------------------
// The block eigensolver.

/// The buckling pencil and its preconditioner, on flat vectors.
pub(super) trait Operators {
    /// `K·x`.
    fn k(&self, x: &[f64]) -> Vec<f64>;
    /// `G·x`.
    fn g(&self, x: &[f64]) -> Vec<f64>;
    /// An approximation of `K⁻¹·r` (positive definite).
    fn precondition(&self, r: &[f64]) -> Vec<f64>;
}

/// A converged mode: λ = 1/μ and its vector, K-normalised (`xᵀ·K·x = 1`), with `K·x` and
/// `G·x`.
#[derive(Debug, Clone)]
pub(super) struct Pair {
    pub lambda: f64,
    mu: f64,
    pub x: Vec<f64>,
    kx: Vec<f64>,
    gx: Vec<f64>,
}

/// Why the block eigensolver stopped.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub(super) enum Stop {
    /// The caller's test on the locked modes was met.
    Done,
    /// No positive eigenvalue of the pencil is left below the ceiling.
    Exhausted,
    /// The most modes allowed were locked.
    Limit,
    /// The iteration limit was reached.
    Iterations,
}

fn dot(a: &[f64], b: &[f64]) -> f64 {
    a.iter().zip(b).map(|(x, y)| x * y).sum()
}

/// Vectors with their K- and G-products.
#[derive(Debug, Clone, Default)]
struct Block {
    v: Vec<Vec<f64>>,
    kv: Vec<Vec<f64>>,
    gv: Vec<Vec<f64>>,
}

impl Block {
    fn push(&mut self, ops: &dyn Operators, v: Vec<f64>) {
        self.kv.push(ops.k(&v));
        self.gv.push(ops.g(&v));
        self.v.push(v);
    }

    fn len(&self) -> usize {
        self.v.len()
    }

    fn extend(&mut self, other: Block) {
        self.v.extend(other.v);
        self.kv.extend(other.kv);
        self.gv.extend(other.gv);
    }

    /// Keep the vectors `from..`.
    fn drop_first(&mut self, count: usize) {
        self.v.drain(..count);
        self.kv.drain(..count);
        self.gv.drain(..count);
    }

    /// The combinations `Σ_i z[(i, j)]·v_i` for the columns `0..take` of `z`, and with `rest`
    /// those of `rest` too (the products follow by linearity). The block is consumed list by
    /// list (vectors, K-products, G-products), each freed as soon as both results have it:
    /// at most one list's worth of new vectors is held beside the old block.
    fn into_combined(
        self,
        z: &DMatrix<f64>,
        rest: Option<&DMatrix<f64>>,
        take: usize,
    ) -> (Block, Block) {
        let n = self.v.first().map_or(0, Vec::len);
        let mix = |src: &[Vec<f64>], z: &DMatrix<f64>, j: usize| {
            let mut out = vec![0.0; n];
            for (i, s) in src.iter().enumerate() {
                let c = z[(i, j)];
                if c != 0.0 {
                    out.iter_mut().zip(s).for_each(|(o, v)| *o += c * v);
                }
            }
            out
        };
        let (mut x, mut p) = (Block::default(), Block::default());
        let Block { v, kv, gv } = self;
        for (src, xs, ps) in [
            (v, &mut x.v, &mut p.v),
            (kv, &mut x.kv, &mut p.kv),
            (gv, &mut x.gv, &mut p.gv),
        ] {
            xs.extend((0..take).map(|j| mix(&src, z, j)));
            if let Some(r) = rest {
                ps.extend((0..take).map(|j| mix(&src, r, j)));
            }
        }
        (x, p)
    }

    /// Remove the K-components along the locked modes (K-normalised) from every vector,
    /// twice (classical Gram–Schmidt twice, from memory: one pass leaves round-off along the
    /// locked modes); the products follow by linearity. A vector that lies in the span of
    /// the locked modes to round-off (its K-norm falls below 10⁻⁸ of what it was) is
    /// dropped: scaled up, its round-off would bring the locked modes back.
    fn deflate(&mut self, locked: &[Pair]) {
        if locked.is_empty() {
            return;
        }
        let mut keep = Vec::with_capacity(self.v.len());
        for ((v, kv), gv) in self.v.iter_mut().zip(&mut self.kv).zip(&mut self.gv) {
            let before = dot(v, kv);
            for _ in 0..2 {
                for l in locked {
                    let c = dot(&l.kx, v);
                    if c != 0.0 {
                        v.iter_mut().zip(&l.x).for_each(|(a, b)| *a -= c * b);
                        kv.iter_mut().zip(&l.kx).for_each(|(a, b)| *a -= c * b);
                        gv.iter_mut().zip(&l.gx).for_each(|(a, b)| *a -= c * b);
                    }
                }
            }
            keep.push(dot(v, kv) > 1e-16 * before);
        }
        let mut k = keep.iter();
        self.v.retain(|_| *k.next().unwrap_or(&false));
        let mut k = keep.iter();
        self.kv.retain(|_| *k.next().unwrap_or(&false));
        let mut k = keep.iter();
        self.gv.retain(|_| *k.next().unwrap_or(&false));
    }
}

/// Rayleigh–Ritz on the span of `b`: the Ritz values μ, descending, and the coefficients
/// of the K-orthonormal Ritz vectors (one column each). Directions of the span that are
/// dependent to round-off are dropped.
fn rayleigh_ritz(b: &Block) -> Option<(Vec<f64>, DMatrix<f64>)> {
    let m = b.len();
    if m == 0 {
        return None;
    }
    let gram = |p: &[Vec<f64>]| {
        let mut a = DMatrix::zeros(m, m);
        for i in 0..m {
            for j in i..m {
                // K and G are symmetric: one product per pair.
                let v = dot(&b.v[i], &p[j]);
                a[(i, j)] = v;
                a[(j, i)] = v;
            }
        }
        a
    };
    let (mk, mg) = (gram(&b.kv), gram(&b.gv));
    // Scale every vector to unit K-norm, then a K-orthonormal basis from the eigenvectors
    // of the Gram matrix (dropping eigenvalues at round-off).
    let d: Vec<f64> = (0..m)
        .map(|i| {
            let kii = mk[(i, i)];
            if kii > 0.0 && kii.is_finite() {
                1.0 / kii.sqrt()
            } else {
                0.0
            }
        })
        .collect();
    let scaled = DMatrix::from_fn(m, m, |i, j| d[i] * mk[(i, j)] * d[j]);
    let eig = SymmetricEigen::new(scaled);
    let top = eig.eigenvalues.iter().cloned().fold(0.0, f64::max);
    let keep: Vec<usize> = (0..m)
        .filter(|&i| top > 0.0 && eig.eigenvalues[i] > 1e-11 * top)
        .collect();
    if keep.is_empty() {
        return None;
    }
    let c = DMatrix::from_fn(m, keep.len(), |i, j| {
        let k = keep[j];
        d[i] * eig.eigenvectors[(i, k)] / eig.eigenvalues[k].sqrt()
    });
    let h = c.transpose() * &mg * &c;
    let h = (&h + h.transpose()) * 0.5;
    let eh = SymmetricEigen::new(h);
    let mut order: Vec<usize> = (0..keep.len()).collect();
    order.sort_by(|&a, &b| eh.eigenvalues[b].total_cmp(&eh.eigenvalues[a]));
    let mu: Vec<f64> = order.iter().map(|&k| eh.eigenvalues[k]).collect();
    let y = DMatrix::from_fn(keep.len(), order.len(), |i, j| {
        eh.eigenvectors[(i, order[j])]
    });
    Some((mu, c * y))
}

/// The lowest positive eigenvalues of `K·x = λ·G·x` (the largest μ = 1/λ of
/// `G·x = μ·K·x`) by LOBPCG with locking, from the vectors `start` and the modes already
/// `locked`, `block` vectors at a time, to the residual `tolerance` (the preconditioned
/// residual `‖K⁻¹(G·x − μ·K·x)‖_K` of a K-normalised x over the largest μ met, the lowest
/// mode's; with the exact K⁻¹ it bounds the error of μ). `fill(k)` gives the k-th extra
/// start vector when the block runs short. After each lock, `done(locked)` decides whether
/// to stop; the search also stops when no positive eigenvalue is left above the ceiling's
/// μ (as far as the block sees: the caller's Sturm count decides), at `max_modes` locked
/// modes or at the iteration limit. The modes come back in the order they were locked
/// (ascending but for modes found late).
#[allow(clippy::too_many_arguments)]
pub(super) fn lowest_modes(
    ops: &dyn Operators,
    start: Vec<Vec<f64>>,
    mut locked: Vec<Pair>,
    block: usize,
    max_modes: usize,
    tolerance: f64,
    fill: &mut dyn FnMut(usize) -> Vec<f64>,
    done: &mut dyn FnMut(&[Pair]) -> bool,
) -> (Vec<Pair>, Stop) {
    let mu_floor = 1.0 / ALPHA_CR_CEILING;
    let mut fills = 0;
    let mut basis = Block::default();
    for v in start {
        basis.push(ops, v);
    }
    basis.deflate(&locked);
    let mut x = Block::default();
    let mut scale: f64 = 0.0;
    let mut refilled = false;
    for _ in 0..MAX_ITERATIONS {
        // Keep the block full: fresh vectors replace the locked ones (a Krylov space from a
        // few vectors holds only as many copies of a multiple eigenvalue).
        let have = if x.len() == 0 { basis.len() } else { x.len() };
        let mut extra = Block::default();
        while have + extra.len() < block {
            extra.push(ops, fill(fills));
            fills += 1;
        }
        // Rayleigh–Ritz on [X, W, P, fills], all K-orthogonal to the locked modes (X and P
        // are combinations of vectors that already are; W and fresh vectors are made so).
        extra.deflate(&locked);
        basis.extend(extra);
        let mut all = std::mem::take(&mut x);
        let xn = all.len();
        all.extend(std::mem::take(&mut basis));
        let Some((values, z)) = rayleigh_ritz(&all) else {
            return (locked, Stop::Exhausted);
        };
        let take = block.min(values.len());
        // New directions P: the part of the new vectors outside the old X.
        let mut z_rest = z.clone();
        for i in 0..xn {
            for j in 0..take {
                z_rest[(i, j)] = 0.0;
            }
        }
        let (new_x, mut p) = all.into_combined(&z, (xn > 0).then_some(&z_rest), take);
        x = new_x;
        let mu = &values[..take];
        // The scale of the problem: the largest μ seen (the lowest mode's).
        scale = mu
            .iter()
            .chain(locked.iter().map(|l| &l.mu))
            .fold(scale, |a, &b| a.max(b));
        // Preconditioned residuals W; lock the leading converged vectors.
        let mut w = Block::default();
        let mut norms = Vec::with_capacity(take);
        for (j, &m) in mu.iter().enumerate() {
            let r: Vec<f64> = x.gv[j]
                .iter()
                .zip(&x.kv[j])
                .map(|(g, k)| g - m * k)
                .collect();
            let wj = ops.precondition(&r);
            let kw = ops.k(&wj);
            norms.push(dot(&wj, &kw).max(0.0).sqrt());
            w.kv.push(kw);
            w.gv.push(ops.g(&wj));
            w.v.push(wj);
        }
        // A mode has converged when its residual is within `tolerance` of the largest μ: one
        // bound for every mode, since the locked modes' own residuals bound what the later
        // ones can reach.
        let allowed = |_: f64| tolerance * scale;
        // The last vectors of a full block are guards: their rank is not yet trusted (a
        // converged higher mode may stand where a lower one has not yet entered the span),
        // so they are not locked. Nor is anything locked in the step that brought in fresh
        // vectors for locked ones: they get one step to show a larger μ.
        let guard = if take < block || block <= 2 {
            0
        } else {
            (block / 3).max(1)
        };
        let lock = if refilled {
            0
        } else {
            (0..take - guard)
                .take_while(|&j| mu[j] > mu_floor && norms[j] <= allowed(mu[j]))
                .count()
        };
        refilled = false;
        if lock == 0 && take > 0 && mu[0] <= mu_floor && norms[0] <= allowed(mu_floor) {
            return (locked, Stop::Exhausted);
        }
        if lock > 0 {
            for (j, &m) in mu.iter().enumerate().take(lock) {
                locked.push(Pair {
                    lambda: 1.0 / m,
                    mu: m,
                    x: x.v[j].clone(),
                    kx: x.kv[j].clone(),
                    gx: x.gv[j].clone(),
                });
            }
            x.drop_first(lock);
            w.drop_first(lock);
            refilled = true;
            // The old directions are not orthogonal to the new locked modes: restart them.
            p = Block::default();
            if done(&locked) {
                return (locked, Stop::Done);
            }
            if locked.len() >= max_modes {
                return (locked, Stop::Limit);
            }
        }
        // A converged vector's residual is round-off: it adds nothing but noise. A converged
        // vector of no buckling mode (μ at or below the floor: G·x = 0, or λ above the
        // ceiling) only takes a place in the block: it is dropped and a fresh vector takes
        // its place.
        let converged: Vec<bool> = (lock..take).map(|j| norms[j] <= allowed(mu[j])).collect();
        let idle: Vec<bool> = (lock..take)
            .zip(&converged)
            .map(|(j, &c)| c && mu[j] <= mu_floor)
            .collect();
        let mut kept = Block::default();
        for (k, ((v, kv), gv)) in w.v.into_iter().zip(w.kv).zip(w.gv).enumerate() {
            if !converged[k] {
                kept.v.push(v);
                kept.kv.push(kv);
                kept.gv.push(gv);
            }
        }
        if idle.iter().any(|&i| i) && idle.iter().any(|&i| !i) {
            let mut k = idle.iter();
            x.v.retain(|_| !*k.next().unwrap_or(&false));
            let mut k = idle.iter();
            x.kv.retain(|_| !*k.next().unwrap_or(&false));
            let mut k = idle.iter();
            x.gv.retain(|_| !*k.next().unwrap_or(&false));
        }
        kept.deflate(&locked);
        basis = kept;
        basis.extend(p);
    }
    (locked, Stop::Iterations)
}

// ---------------------------------------------------------------------------------------
// The modes of a frame.

/// The exact buckling pencil of one mesh and its elastic solution, on flat vectors
/// ([`Pencil`]).
struct MeshOperators<'a> {
    so: &'a SecondOrderModel,
    pencil: Pencil,
}

impl Operators for MeshOperators<'_> {
    fn k(&self, x: &[f64]) -> Vec<f64> {
        self.pencil.k_times(self.so, x)
    }
    fn g(&self, x: &[f64]) -> Vec<f64> {
        self.pencil.g_times(self.so, x)
    }
    fn precondition(&self, r: &[f64]) -> Vec<f64> {
        self.pencil.solve(self.so, r)
    }
}

/// The mesh-node part of a flat vector.
fn to_nodes(x: &[f64], nodes: usize) -> Vec<[f64; 3]> {
    x[..3 * nodes]
        .chunks_exact(3)
        .map(|c| [c[0], c[1], c[2]])
        .collect()
}

impl MeshOperators<'_> {
    /// Static sway shapes: K⁻¹ times unit X forces at every model node, uniform and growing
    /// with height.
    fn sway_shapes(&self) -> Vec<Vec<f64>> {
        let mesh = &self.so.mesh;
        let heights = mesh.nodes[..mesh.model_nodes].iter().map(|p| p.1);
        let low = heights.clone().fold(f64::INFINITY, f64::min);
        let high = heights.fold(f64::NEG_INFINITY, f64::max);
        let span = (high - low).max(f64::MIN_POSITIVE);
        let pattern = |f: &dyn Fn(f64) -> f64| {
            let mut p = vec![0.0; self.pencil.dim()];
            for n in 0..mesh.model_nodes {
                p[3 * n] = f(mesh.nodes[n].1);
            }
            self.precondition(&p)
        };
        vec![pattern(&|_| 1.0), pattern(&|y| (y - low) / span)]
    }

    /// The k-th smooth pseudo-random start vector: K⁻¹ times a deterministic pseudo-random
    /// load on every unknown (splitmix64 of the index and k).
    fn fill(&self, k: usize) -> Vec<f64> {
        let seed = (k as u64).wrapping_mul(0xBF58_476D_1CE4_E5B9);
        let load: Vec<f64> = (0..self.pencil.dim())
            .map(|q| {
                let mut z = seed
                    ^ (q as u64)
                        .wrapping_add(1)
                        .wrapping_mul(0x9E37_79B9_7F4A_7C15);
                z = (z ^ (z >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
                z = (z ^ (z >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
                z ^= z >> 31;
                (z >> 11) as f64 / (1u64 << 53) as f64 - 0.5
            })
            .collect();
        self.precondition(&load)
    }
}

/// The modes found on one mesh, ascending, and how complete the search is.
struct Found {
    modes: Vec<Mode>,
    search: SwaySearch,
}

/// How one mesh is searched.
struct Plan<'a> {
    ops: MeshOperators<'a>,
    axial: &'a [f64],
    /// At least this many modes (below the ceiling) are wanted.
    min_modes: usize,
    /// The search goes on to the first sway mode (on the nested mesh: only when the model's
    /// mesh has one).
    need_sway: bool,
    /// Vectors iterated together.
    block: usize,
    /// Confirm by the Sturm count (on the model's mesh; the nested mesh follows its modes).
    certify: bool,
    /// Residual tolerance of the modes (see [`lowest_modes`]).
    tolerance: f64,
    /// Whether each locked mode, in the order locked, is a sway mode (classified once).
    sway_locked: std::cell::RefCell<Vec<bool>>,
}

impl Plan<'_> {
    /// Modes of `locked` as [`Mode`]s, ascending, below the ceiling.
    fn modes(&self, locked: &[Pair]) -> Vec<Mode> {
        let so = self.ops.so;
        let mut modes: Vec<Mode> = locked
            .iter()
            .filter(|p| p.lambda > 0.0 && p.lambda <= ALPHA_CR_CEILING)
            .map(|p| Mode::new(&so.mesh, &self.ops.pencil, p.lambda, p.x.clone()))
            .collect();
        modes.sort_by(|a, b| a.alpha.total_cmp(&b.alpha));
        modes
    }

    /// Whether `locked` holds what is wanted: a sway mode and `min_modes` modes, or a mode
    /// above the ceiling.
    fn enough(&self, locked: &[Pair]) -> bool {
        if locked.iter().any(|p| p.lambda > ALPHA_CR_CEILING) {
            return true;
        }
        let so = self.ops.so;
        let mut sway = self.sway_locked.borrow_mut();
        sway.truncate(locked.len());
        for p in &locked[sway.len()..] {
            sway.push(Mode::new(&so.mesh, &self.ops.pencil, p.lambda, p.x.clone()).is_sway());
        }
        let counted = locked
            .iter()
            .filter(|p| p.lambda > 0.0 && p.lambda <= ALPHA_CR_CEILING)
            .count();
        counted >= self.min_modes && (!self.need_sway || sway.iter().any(|&s| s))
    }

    /// The Sturm count just above `lambda` (nudged off an eigenvalue if it sits on one).
    fn count(&self, lambda: f64) -> Option<usize> {
        (0..4).find_map(|k| {
            let at = lambda * (1.0 + COUNT_MARGIN * (1.0 + k as f64));
            self.ops.so.count_below(self.axial, at)
        })
    }

    /// Run the search from `start` vectors; with `certify`, check it by the Sturm count and
    /// search again while modes are missing.
    fn run(&self, start: Vec<Vec<f64>>) -> Found {
        let ops = &self.ops;
        let mut fill = |k: usize| ops.fill(k);
        let (mut locked, mut stop) = lowest_modes(
            ops,
            start,
            Vec::new(),
            self.block,
            MAX_MODES + 1,
            self.tolerance,
            &mut fill,
            &mut |l| self.enough(l),
        );
        if !self.certify {
            return Found {
                modes: self.modes(&locked),
                search: SwaySearch::Complete,
            };
        }
        let mut retries = 0;
        loop {
            let mut modes = self.modes(&locked);
            let sway = modes.iter().position(Mode::is_sway);
            let target = match sway {
                Some(s) => modes[s].alpha,
                None if stop == Stop::Limit => modes.last().map_or(0.0, |m| m.alpha),
                None => ALPHA_CR_CEILING,
            };
            let limit = target * (1.0 + COUNT_MARGIN);
            let found = modes.iter().filter(|m| m.alpha <= limit).count();
            let search = match self.count(target) {
                Some(c) if c == found => {
                    if stop == Stop::Limit && sway.is_none() {
                        SwaySearch::LowerBound
                    } else {
                        SwaySearch::Complete
                    }
                }
                Some(c) if c > found && retries < 2 && stop != Stop::Iterations => {
                    // Modes were missed below the target: search on, from fresh vectors,
                    // K-orthogonal to the modes found.
                    retries += 1;
                    let starts: Vec<Vec<f64>> = (0..self.block)
                        .map(|k| ops.fill(1000 * retries + k))
                        .collect();
                    let (more, s) = lowest_modes(
                        ops,
                        starts,
                        locked,
                        self.block,
                        MAX_MODES + 1,
                        self.tolerance,
                        &mut fill,
                        &mut |l| {
                            l.iter().filter(|p| p.lambda <= limit).count() >= c
                                || l.last().is_some_and(|p| p.lambda > limit)
                        },
                    );
                    locked = more;
                    stop = s;
                    continue;
                }
                _ => SwaySearch::Unconfirmed,
            };
            // Modes locked together with the target but above it are not reported.
            modes.retain(|m| m.alpha <= limit);
            return Found { modes, search };
        }
    }
}

/// Element axial forces of the nested mesh (two elements per element of `coarse`) from the
/// first-order response `r` of `coarse`, per element of `coarse`: the mean of N at each
/// half's ends, with N at the middle of the element from its end forces and loads (statics;
/// the first-order solution is the same on any mesh). Worked out before the buckling search
/// so that the response need not be kept through it.
fn refine_axial(coarse: &Mesh, r: &Response, loads: &MeshLoads) -> Vec<[f64; 2]> {
    (0..coarse.elements.len())
        .map(|ie| {
            let (f, l) = (&r.element_forces[ie], &loads.element[ie]);
            let half = 0.5 * coarse.elements[ie].length;
            let n_i = -f.i[0];
            let n_j = f.j[0];
            let left = internal_forces_at(half, Side::Left, f, l).n;
            let right = internal_forces_at(half, Side::Right, f, l).n;
            [0.5 * (n_i + left), 0.5 * (right + n_j)]
        })
        .collect()
}

/// The axial force of every element of the nested mesh `fine` from the halves of each
/// element of `coarse` ([`refine_axial`]).
fn nested_axial(coarse: &Mesh, fine: &Mesh, halves: &[[f64; 2]]) -> Vec<f64> {
    let mut axial = vec![0.0; fine.elements.len()];
    for (rc, rf) in coarse.member_elements.iter().zip(&fine.member_elements) {
        for (k, ie) in rc.clone().enumerate() {
            axial[rf.start + 2 * k] = halves[ie][0];
            axial[rf.start + 2 * k + 1] = halves[ie][1];
        }
    }
    axial
}

/// A mode vector of `coarse` on the nested mesh `fine` (flat vectors of their pencils): the
/// nodes they share are copied and each new middle node takes the element's cubic
/// (transverse) and linear (axial) shape functions at mid-length, so the vector is the same
/// displaced shape. A released end's own rotation goes to the same end of the nested mesh.
fn interpolate(
    coarse: &SecondOrderModel,
    coarse_pencil: &Pencil,
    fine: &SecondOrderModel,
    fine_pencil: &Pencil,
    flat: &[f64],
) -> Vec<f64> {
    let (cm, fm) = (&coarse.mesh, &fine.mesh);
    let x = to_nodes(flat, cm.nodes.len());
    let mut y = vec![0.0; fine_pencil.dim()];
    for (rc, rf) in cm.member_elements.iter().zip(&fm.member_elements) {
        let last = rc.len() - 1;
        for (k, ie) in rc.clone().enumerate() {
            let e = &cm.elements[ie];
            let (f0, f1) = (
                &fm.elements[rf.start + 2 * k],
                &fm.elements[rf.start + 2 * k + 1],
            );
            y[3 * f0.i..3 * f0.i + 3].copy_from_slice(&x[e.i]);
            y[3 * f1.j..3 * f1.j + 3].copy_from_slice(&x[e.j]);
            let (a, b) = (x[e.i], x[e.j]);
            let mut u = transformation(e.c, e.s)
                * nalgebra::Vector6::new(a[0], a[1], a[2], b[0], b[1], b[2]);
            for (end, slot) in coarse_pencil.released_slots(ie) {
                u[2 + 3 * end] = flat[slot];
            }
            let h = e.length;
            // Hermite shape functions at ξ = 1/2: v = (v_i + v_j)/2 + h(θ_i − θ_j)/8,
            // θ = 1.5(v_j − v_i)/h − (θ_i + θ_j)/4.
            let axial = 0.5 * (u[0] + u[3]);
            let v = 0.5 * (u[1] + u[4]) + h * (u[2] - u[5]) / 8.0;
            let theta = 1.5 * (u[4] - u[1]) / h - 0.25 * (u[2] + u[5]);
            let mid = [e.c * axial - e.s * v, e.s * axial + e.c * v, theta];
            y[3 * f0.j..3 * f0.j + 3].copy_from_slice(&mid);
            // A released member end: its own rotation, on the nested mesh's end element.
            for (end, fe) in [(0, rf.start + 2 * k), (1, rf.start + 2 * k + 1)] {
                if (end == 0 && k == 0) || (end == 1 && k == last) {
                    for (fend, slot) in fine_pencil.released_slots(fe) {
                        if fend == end {
                            y[slot] = u[2 + 3 * end];
                        }
                    }
                }
            }
        }
    }
    fine_pencil.clear_held(fine, &mut y);
    y
}

impl SecondOrderModel {
    /// Elastic buckling of `loads` sorted into the frame's lowest SWAY mode and the lowest
    /// MEMBER mode below it, with critical load factors on the safe side of the mesh error
    /// (see [`crate::solve::modes`] for the classification, the search above member modes and
    /// the nested mesh). `None` when no element is in compression.
    pub fn buckling(
        &self,
        model: &Model,
        loads: &MeshLoads,
    ) -> Result<Option<FrameBuckling>, SystemError> {
        frame_buckling(self, model, loads)
    }
}

/// See [`SecondOrderModel::buckling`].
pub(super) fn frame_buckling(
    so: &SecondOrderModel,
    model: &Model,
    loads: &MeshLoads,
) -> Result<Option<FrameBuckling>, SystemError> {
    let first = so.first_order(model, loads)?;
    let axial = element_axial(&first);
    if axial.iter().all(|&n| n >= 0.0) {
        return Ok(None);
    }
    let n = so.segments();
    let halves = (n < REFINE_BELOW).then(|| refine_axial(&so.mesh, &first, loads));
    drop(first);
    let Some((alpha0, x0)) = so.lowest_mode(model, &axial)? else {
        return Ok(Some(FrameBuckling {
            sway: None,
            member: None,
            modes: Vec::new(),
            search: SwaySearch::Complete,
            segments: [n, n],
        }));
    };
    let plan = Plan {
        ops: MeshOperators {
            so,
            pencil: so.pencil(&axial),
        },
        axial: &axial,
        min_modes: 1,
        need_sway: true,
        block: BLOCK,
        certify: true,
        tolerance: RESIDUAL_TOLERANCE,
        sway_locked: Default::default(),
    };
    // The lowest mode's vector, with its released rotations when there are any (one solve:
    // K⁻¹·G·x is the same mode), and its factor, exact (confirmed by factorization).
    let mut flat0 = vec![0.0; plan.ops.pencil.dim()];
    for (k, v) in x0.iter().enumerate() {
        flat0[3 * k..3 * k + 3].copy_from_slice(v);
    }
    if flat0.len() > 3 * x0.len() {
        flat0 = plan.ops.precondition(&plan.ops.g(&flat0));
    }
    let lowest = Mode::new(&so.mesh, &plan.ops.pencil, alpha0, flat0);
    let coarse = if lowest.is_sway() {
        Found {
            modes: vec![lowest],
            search: SwaySearch::Complete,
        }
    } else {
        let mut start = vec![lowest.flat.clone()];
        start.extend(plan.ops.sway_shapes());
        let mut found = plan.run(start);
        if let Some(m) = found.modes.first_mut()
            && (m.alpha - alpha0).abs() <= 1e-6 * alpha0
        {
            m.alpha = alpha0;
        }
        found
    };
    // The nested mesh, started from the coarse modes.
    let fine_found = if let Some(halves) = halves.filter(|_| !coarse.modes.is_empty()) {
        let fine = so.refined(model)?;
        let fine_axial = nested_axial(&so.mesh, &fine.mesh, &halves);
        let fine_plan = Plan {
            ops: MeshOperators {
                so: fine,
                pencil: fine.pencil(&fine_axial),
            },
            axial: &fine_axial,
            min_modes: coarse.modes.len(),
            need_sway: coarse.modes.iter().any(Mode::is_sway),
            block: coarse.modes.len().clamp(1, MAX_MODES + 1),
            certify: false,
            tolerance: {
                let low = coarse.modes.first().map_or(1.0, |m| m.alpha);
                let high = coarse.modes.last().map_or(1.0, |m| m.alpha);
                (NESTED_TOLERANCE * low / high).clamp(RESIDUAL_TOLERANCE, NESTED_TOLERANCE)
            },
            sway_locked: Default::default(),
        };
        let middle = middle_nodes(&so.mesh, &fine.mesh);
        let start: Vec<Vec<f64>> = coarse
            .modes
            .iter()
            .map(|m| {
                let y = interpolate(so, &plan.ops.pencil, fine, &fine_plan.ops.pencil, &m.flat);
                correct_middle(&fine_plan.ops, y, m.alpha, &middle)
            })
            .collect();
        let found = fine_plan.run(start);
        Some((fine, found))
    } else {
        None
    };
    Ok(Some(assemble(
        so,
        &coarse,
        fine_found.as_ref().map(|(f, m)| (*f, m)),
    )))
}

/// The new middle nodes of the nested mesh `fine` (one per element of `coarse`).
fn middle_nodes(coarse: &Mesh, fine: &Mesh) -> Vec<usize> {
    coarse
        .member_elements
        .iter()
        .zip(&fine.member_elements)
        .flat_map(|(rc, rf)| (0..rc.len()).map(move |k| fine.elements[rf.start + 2 * k].j))
        .collect()
}

/// Improve a mode vector `y` of the model's mesh interpolated on the nested mesh, for the
/// factor `c`: each new middle node couples only to the nodes both meshes share, so with
/// those held its displacements solve `(K − c·G)` on its own 3×3 block exactly (the
/// displaced shape within each element for its ends). Two products, no solve; the result is
/// close to the nested mesh's mode, whose factor the block eigensolver then confirms in one
/// or two solves.
fn correct_middle(ops: &MeshOperators, mut y: Vec<f64>, c: f64, middle: &[usize]) -> Vec<f64> {
    let so = ops.so;
    let mut wanted = vec![false; so.mesh.nodes.len()];
    middle.iter().for_each(|&m| wanted[m] = true);
    let blocks = ops.pencil.node_blocks(so, c, &wanted);
    let free = ops.pencil.free(so);
    let (ky, gy) = (ops.k(&y), ops.g(&y));
    for &m in middle {
        let dofs: Vec<usize> = (0..3).filter(|&k| free[m][k]).collect();
        let n = dofs.len();
        if n == 0 {
            continue;
        }
        let a = DMatrix::from_fn(n, n, |r, q| blocks[m][(dofs[r], dofs[q])]);
        let r = DVector::from_fn(n, |r, _| -(ky[3 * m + dofs[r]] - c * gy[3 * m + dofs[r]]));
        if let Some(delta) = a.lu().solve(&r)
            && delta.iter().all(|d| d.is_finite())
        {
            for (k, &d) in dofs.iter().enumerate() {
                y[3 * m + d] += delta[k];
            }
        }
    }
    y
}

/// Unit X forces at every model node (the static sway shape's load).
fn lateral_load(so: &SecondOrderModel) -> Vec<[f64; 3]> {
    let mut p = vec![[0.0; 3]; so.mesh.nodes.len()];
    p.iter_mut()
        .take(so.mesh.model_nodes)
        .for_each(|q| q[0] = 1.0);
    p
}

/// For each mode of `modes`, its pairing key: the sway mode (the first) is `None`, a
/// member mode is `(member, j)` for the j-th member mode of that member, from below.
fn pairing_keys(modes: &[Mode]) -> Vec<Option<(usize, usize)>> {
    let mut seen: Vec<usize> = Vec::new();
    modes
        .iter()
        .map(|m| match m.measures.kind() {
            ModeKind::Sway => None,
            ModeKind::Member { member } => {
                let j = seen.iter().filter(|&&s| s == member).count();
                seen.push(member);
                Some((member, j))
            }
        })
        .collect()
}

/// Pair the modes of the two meshes and report them. The first sway mode of each mesh
/// are a pair; a member mode pairs with the mode of the same member and the same order
/// among that member's modes (the post's second bow with the post's second bow), so that a
/// member mode that the finer mesh lowers past the sway mode changes no pairing.
fn assemble(
    so: &SecondOrderModel,
    coarse: &Found,
    fine: Option<(&SecondOrderModel, &Found)>,
) -> FrameBuckling {
    let n = so.segments();
    let coarse_keys = pairing_keys(&coarse.modes);
    let fine_keys = fine.map(|(_, f)| pairing_keys(&f.modes));
    // The factor of the nested mesh paired with coarse mode k.
    let refined = |k: usize| -> Option<f64> {
        let (_, found) = fine?;
        let keys = fine_keys.as_ref()?;
        let is_sway = coarse.modes[k].is_sway();
        let at = if is_sway {
            found.modes.iter().position(Mode::is_sway)
        } else {
            keys.iter()
                .position(|key| key.is_some() && *key == coarse_keys[k])
        };
        // No mode of the same kind (a classification that changed with the mesh): the
        // mode of the same rank, the pairing of the min–max bounds.
        found.modes.get(at.unwrap_or(k)).map(|m| m.alpha)
    };
    let safe = |k: usize| {
        let c = coarse.modes[k].alpha;
        refined(k).map_or(c, |f| safe_side(c, f))
    };
    let modes: Vec<ModeSummary> = coarse
        .modes
        .iter()
        .enumerate()
        .map(|(k, m)| {
            let (rho, beta) = (m.measures.chord_rotation, m.measures.bow);
            let scale = rho.max(beta);
            let scale = if scale > 0.0 { scale } else { 1.0 };
            ModeSummary {
                alpha_cr: safe(k),
                alpha_mesh: m.alpha,
                alpha_refined: refined(k),
                kind: m.measures.kind(),
                chord_rotation: rho / scale,
                bow: beta / scale,
            }
        })
        .collect();
    let sway_rank = coarse.modes.iter().position(Mode::is_sway);
    let last = coarse.modes.len().checked_sub(1);
    let sway = match (coarse.search, sway_rank, last) {
        // Not confirmed by the count: the lowest mode, on the safe side.
        (SwaySearch::Unconfirmed, s, Some(_)) => Some(Buckling {
            alpha_cr: safe(0),
            shape: so.node_shape(&coarse.modes[s.unwrap_or(0)].x),
        }),
        (SwaySearch::LowerBound, _, Some(l)) => Some(Buckling {
            alpha_cr: safe(l),
            shape: so.node_shape(&so.elastic_solve(&lateral_load(so))),
        }),
        (_, Some(s), _) => Some(Buckling {
            alpha_cr: safe(s),
            shape: so.node_shape(&coarse.modes[s].x),
        }),
        _ => None,
    };
    let below = sway_rank.unwrap_or(coarse.modes.len());
    let member = (0..below).find(|&k| !coarse.modes[k].is_sway()).map(|k| {
        let m = &coarse.modes[k];
        let member = m.measures.bow_member;
        let mut profile = bow_points(&so.mesh, member, &m.x, &m.ends);
        let peak = profile
            .iter()
            .map(|p| p[1])
            .fold(0.0f64, |a, v| if v.abs() > a.abs() { v } else { a });
        let peak = if peak != 0.0 { peak } else { 1.0 };
        profile.iter_mut().for_each(|p| p[1] /= peak);
        MemberMode {
            alpha_cr: safe(k),
            member,
            shape: m.x[..so.mesh.model_nodes]
                .iter()
                .map(|v| [v[0] / peak, v[1] / peak, v[2] / peak])
                .collect(),
            profile,
        }
    });
    let fine_segments = fine.map_or(n, |(f, _)| f.segments());
    FrameBuckling {
        sway,
        member,
        modes,
        search: coarse.search,
        segments: [n, fine_segments],
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Deterministic pseudo-random vector (a linear congruential generator).
    fn pseudo_random(n: usize, seed: usize) -> Vec<f64> {
        let mut state = 12345u64 + 7919 * seed as u64;
        (0..n)
            .map(|_| {
                state = state
                    .wrapping_mul(6364136223846793005)
                    .wrapping_add(1442695040888963407);
                (state >> 11) as f64 / (1u64 << 53) as f64 - 0.5
            })
            .collect()
    }

    /// A dense pencil for the solver's unit tests.
    struct Dense {
        k: DMatrix<f64>,
        g: DMatrix<f64>,
        k_inv: DMatrix<f64>,
    }

    impl Operators for Dense {
        fn k(&self, x: &[f64]) -> Vec<f64> {
            (&self.k * nalgebra::DVector::from_column_slice(x))
                .iter()
                .copied()
                .collect()
        }
        fn g(&self, x: &[f64]) -> Vec<f64> {
            (&self.g * nalgebra::DVector::from_column_slice(x))
                .iter()
                .copied()
                .collect()
        }
        fn precondition(&self, r: &[f64]) -> Vec<f64> {
            (&self.k_inv * nalgebra::DVector::from_column_slice(r))
                .iter()
                .copied()
                .collect()
        }
    }

    /// Closed form: with K = tridiag(−1, 2, −1) (order n) and G = I, the eigenvalues of
    /// K·x = λ·G·x are 2 − 2·cos(kπ/(n+1)) (second-difference matrix). With G = −I on
    /// the last quarter of the unknowns (members in tension) the pencil is indefinite; its
    /// positive eigenvalues are checked against nalgebra's dense solution of the reduced
    /// symmetric problem L⁻¹·G·L⁻ᵀ (K = L·Lᵀ).
    #[test]
    fn block_solver_finds_the_lowest_eigenvalues_in_order() {
        let n = 40;
        let k = DMatrix::from_fn(n, n, |i, j| match i.abs_diff(j) {
            0 => 2.0,
            1 => -1.0,
            _ => 0.0,
        });
        let g = DMatrix::identity(n, n);
        let k_inv = k.clone().try_inverse().expect("positive definite");
        let ops = Dense {
            k: k.clone(),
            g,
            k_inv,
        };
        let start = vec![(0..n).map(|i| 1.0 + (i % 3) as f64).collect::<Vec<f64>>()];
        let mut fill = |s: usize| pseudo_random(n, s);
        let (locked, stop) = lowest_modes(
            &ops,
            start,
            Vec::new(),
            4,
            100,
            RESIDUAL_TOLERANCE,
            &mut fill,
            &mut |l| l.len() >= 10,
        );
        assert_eq!(stop, Stop::Done);
        let mut got: Vec<f64> = locked.iter().map(|p| p.lambda).collect();
        got.sort_by(f64::total_cmp);
        for (k, value) in got.iter().enumerate() {
            let exact = 2.0 - 2.0 * ((k + 1) as f64 * std::f64::consts::PI / (n + 1) as f64).cos();
            assert!(
                (value - exact).abs() <= 1e-10 * exact,
                "{k}: {value} vs {exact}"
            );
        }

        // Indefinite G: tension on the last quarter.
        let g = DMatrix::from_fn(n, n, |i, j| {
            if i != j {
                0.0
            } else if i >= 3 * n / 4 {
                -1.0
            } else {
                1.0
            }
        });
        let l = k.clone().cholesky().expect("positive definite").l();
        let l_inv = l.try_inverse().expect("invertible");
        let h = &l_inv * &g * l_inv.transpose();
        let mut exact: Vec<f64> = SymmetricEigen::new(h)
            .eigenvalues
            .iter()
            .filter(|&&mu| mu > 0.0)
            .map(|mu| 1.0 / mu)
            .collect();
        exact.sort_by(f64::total_cmp);
        let ops = Dense {
            k: k.clone(),
            g,
            k_inv: k.try_inverse().expect("positive definite"),
        };
        let start = vec![(0..n).map(|i| 1.0 + (i % 3) as f64).collect::<Vec<f64>>()];
        let (locked, _) = lowest_modes(
            &ops,
            start,
            Vec::new(),
            4,
            100,
            RESIDUAL_TOLERANCE,
            &mut fill,
            &mut |l| l.len() >= 8,
        );
        let mut got: Vec<f64> = locked.iter().map(|p| p.lambda).collect();
        got.sort_by(f64::total_cmp);
        for (value, want) in got.iter().zip(&exact) {
            assert!((value - want).abs() <= 1e-9 * want, "{value} vs {want}");
        }
    }

    /// A pencil with a tenfold eigenvalue (identical, uncoupled blocks) below a simple one.
    /// A block of three may lock the simple mode before every copy is in its span (a block
    /// Krylov space holds only so many copies); the Sturm count (here the closed form: ten
    /// eigenvalues below 2.5) shows the missing copies, and a search from fresh vectors,
    /// K-orthogonal to the modes found, finds them, as `Plan::run` does.
    #[test]
    fn block_solver_and_count_separate_a_multiple_eigenvalue() {
        // Ten uncoupled 1×1 blocks k = 2, g = 1 (λ = 2), then one k = 3, g = 1 (λ = 3) and
        // the rest with g = 0 (λ = ∞). Closed form.
        let n = 16;
        let k = DMatrix::from_fn(n, n, |i, j| {
            if i != j {
                0.0
            } else if i < 10 {
                2.0
            } else {
                3.0
            }
        });
        let g = DMatrix::from_fn(n, n, |i, j| if i == j && i <= 10 { 1.0 } else { 0.0 });
        let k_inv = k.clone().try_inverse().expect("diagonal");
        let ops = Dense { k, g, k_inv };
        let mut fill = |s: usize| pseudo_random(n, s);
        let (mut locked, stop) = lowest_modes(
            &ops,
            Vec::new(),
            Vec::new(),
            3,
            100,
            RESIDUAL_TOLERANCE,
            &mut fill,
            &mut |l| l.iter().any(|p| p.lambda > 2.5),
        );
        assert_eq!(stop, Stop::Done);
        let below = |l: &[Pair]| l.iter().filter(|p| p.lambda < 2.5).count();
        for retry in 0..3 {
            if below(&locked) == 10 {
                break;
            }
            let starts = (0..3)
                .map(|k| pseudo_random(n, 100 * (retry + 1) + k))
                .collect();
            let (more, _) = lowest_modes(
                &ops,
                starts,
                locked,
                3,
                100,
                RESIDUAL_TOLERANCE,
                &mut fill,
                &mut |l| below(l) >= 10,
            );
            locked = more;
        }
        let mut got: Vec<f64> = locked.iter().map(|p| p.lambda).collect();
        got.sort_by(f64::total_cmp);
        assert_eq!(got.len(), 11, "{got:?}");
        for v in &got[..10] {
            assert!((v - 2.0).abs() <= 1e-10, "{got:?}");
        }
        assert!((got[10] - 3.0).abs() <= 1e-10, "{got:?}");
    }

    /// Closed form: with an error falling like h⁴, α(n) = α∞(1 + c), α(2n) = α∞(1 + c/16),
    /// the estimate α(2n) − (α(n) − α(2n))/3 = α∞(1 + c/16 − 5c/16) = α∞(1 − c/4) lies
    /// below α∞; with an error falling like h² it is α∞ exactly; with both, an h⁴ error
    /// from above and a larger h² error from below (rising factors), the coarse factor is
    /// below α∞ and is kept.
    #[test]
    fn safe_side_lies_below_the_limit() {
        let (exact, c) = (7.0, 0.02);
        let h4 = safe_side(exact * (1.0 + c), exact * (1.0 + c / 16.0));
        assert!((h4 - exact * (1.0 - c / 4.0)).abs() <= 1e-12 * exact);
        let h2 = safe_side(exact * (1.0 + c), exact * (1.0 + c / 4.0));
        assert!((h2 - exact).abs() <= 1e-12 * exact);
        let (a, b) = (0.01, 0.05);
        let (coarse, fine) = (exact * (1.0 + a - b), exact * (1.0 + a / 16.0 - b / 4.0));
        assert!(fine > coarse);
        let rising = safe_side(coarse, fine);
        assert_eq!(rising, coarse);
        assert!(rising < exact);
    }
}
