//! One prismatic Euler–Bernoulli member in its local axes: fixed-end forces, end releases,
//! internal forces by statics, exact moment extremes, deflected shape and load splitting.
//!
//! Everything here is a pure function of the member length `L`, its loads
//! ([`LocalLoad`], positions from end i) and, where needed, its end actions ([`EndForces`])
//! and bending stiffness `EI`. Signs follow [`crate::model::loads`] and
//! [`crate::solve::forces`]: local x from i to j, local y 90° CCW from x, moments CCW positive;
//! end actions are what the nodes exert on the member; the internal moment `M` is positive
//! with the local −y face in tension.
//!
//! # Fixed-end forces
//!
//! With the transverse Hermite cubics (ξ = x/L)
//!
//! ```text
//! N1 = 1 − 3ξ² + 2ξ³      N2 = L(ξ − 2ξ² + ξ³)      (v_i, θ_i)
//! N3 = 3ξ² − 2ξ³          N4 = L(−ξ² + ξ³)          (v_j, θ_j)
//! ```
//!
//! and the axial shape functions `1 − ξ`, `ξ`, the consistent (work-equivalent) nodal loads
//! are `f = ∫ Nᵀ q dx + Nᵀ(a)·P + N'ᵀ(a)·M`. For a prismatic Euler–Bernoulli member these
//! shape functions are the exact homogeneous solutions of `EI v'''' = 0` (and `EA u'' = 0`),
//! so by reciprocity (Betti) the consistent loads equal the exact fixed-end reactions with
//! opposite sign: `f` is what the member hands TO the nodes, while the fixed-end forces are
//! what the supports exert ON the member, `F = −f`. The integrals are evaluated by 3-point
//! Gauss–Legendre quadrature, exact up to degree 5 (cubic shape × linear load is degree 4).
//!
//! # Deflection
//!
//! With y up and `ε = −y·v''` (plane sections), the bending moment positive when the −y face
//! is in tension is `M = −∫σ·y dA = EI·v''`, so the curvature is `v'' = +M/EI`: a sagging
//! moment bends the member concave towards +y. Integrating twice from end i,
//!
//! ```text
//! EI·v(x) = EI·(v_i + θ₀·x) − Mz_i·x²/2 + Fy_i·x³/6 + Σ py·⟨x−a⟩³/6 + ∫ qy(t)·⟨x−t⟩³/6 dt
//!           − Σ m·⟨x−a⟩²/2
//! ```
//!
//! with θ₀ fixed by `v(L) = v_j`. No rotation boundary condition is used, so the same
//! formula serves members with end releases.
//!
//! References: the fixed-end, propped and simple-beam formulas used in the tests are the
//! classical cases tabulated in AISC Steel Construction Manual, 15th ed., Table 3-23, and
//! Roark's Formulas for Stress and Strain, 8th ed., Table 8.1 (see `tests/member_formulas.rs`).

use crate::model::LocalLoad;
use crate::solve::forces::{EndForces, InternalForces};

/// 3-point Gauss–Legendre rule on [−1, 1]: nodes `±√(3/5)`, `0` with weights `5/9`, `8/9`,
/// `5/9`. Exact for polynomials up to degree 5.
const GAUSS3: [(f64, f64); 3] = [
    (-0.774_596_669_241_483_4, 5.0 / 9.0),
    (0.0, 8.0 / 9.0),
    (0.774_596_669_241_483_4, 5.0 / 9.0),
];

/// `∫ f(t) dt` over `[lo, hi]` by the 3-point Gauss–Legendre rule (exact to degree 5).
fn gauss3(lo: f64, hi: f64, f: impl Fn(f64) -> f64) -> f64 {
    let half = 0.5 * (hi - lo);
    let mid = 0.5 * (hi + lo);
    GAUSS3
        .iter()
        .map(|&(s, w)| w * f(mid + half * s))
        .sum::<f64>()
        * half
}

/// A linearly varying load with `lo ≤ hi` (a reversed `a > b` is read as the same load).
#[derive(Debug, Clone, Copy)]
struct Span {
    lo: f64,
    hi: f64,
    qx_lo: f64,
    qy_lo: f64,
    qx_hi: f64,
    qy_hi: f64,
}

impl Span {
    /// The span of a distributed load; `None` for a concentrated one.
    fn of(load: &LocalLoad) -> Option<Span> {
        match *load {
            LocalLoad::Linear {
                a,
                b,
                qx_a,
                qy_a,
                qx_b,
                qy_b,
            } => Some(Span::new(a, b, qx_a, qy_a, qx_b, qy_b)),
            LocalLoad::Point { .. } | LocalLoad::Moment { .. } => None,
        }
    }

    /// A linear load from its fields, ordered so that `lo ≤ hi`.
    fn new(a: f64, b: f64, qx_a: f64, qy_a: f64, qx_b: f64, qy_b: f64) -> Span {
        if a <= b {
            Span {
                lo: a,
                hi: b,
                qx_lo: qx_a,
                qy_lo: qy_a,
                qx_hi: qx_b,
                qy_hi: qy_b,
            }
        } else {
            Span {
                lo: b,
                hi: a,
                qx_lo: qx_b,
                qy_lo: qy_b,
                qx_hi: qx_a,
                qy_hi: qy_a,
            }
        }
    }

    /// Intensities `(qx, qy)` at position `t` (linear interpolation between the ends).
    fn at(&self, t: f64) -> (f64, f64) {
        let len = self.hi - self.lo;
        if len <= 0.0 {
            return (self.qx_lo, self.qy_lo);
        }
        let r = (t - self.lo) / len;
        (
            self.qx_lo + (self.qx_hi - self.qx_lo) * r,
            self.qy_lo + (self.qy_hi - self.qy_lo) * r,
        )
    }
}

/// Hermite cubic shape functions `[N1, N2, N3, N4]` at `x` for `(v_i, θ_i, v_j, θ_j)`.
fn hermite(x: f64, length: f64) -> [f64; 4] {
    let xi = x / length;
    let (xi2, xi3) = (xi * xi, xi * xi * xi);
    [
        1.0 - 3.0 * xi2 + 2.0 * xi3,
        length * (xi - 2.0 * xi2 + xi3),
        3.0 * xi2 - 2.0 * xi3,
        length * (-xi2 + xi3),
    ]
}

/// Derivatives `dN/dx` of the Hermite cubics (the rotation field per unit nodal value).
fn hermite_slope(x: f64, length: f64) -> [f64; 4] {
    let xi = x / length;
    let xi2 = xi * xi;
    [
        (-6.0 * xi + 6.0 * xi2) / length,
        1.0 - 4.0 * xi + 3.0 * xi2,
        (6.0 * xi - 6.0 * xi2) / length,
        -2.0 * xi + 3.0 * xi2,
    ]
}

/// Linear axial shape functions `[1 − ξ, ξ]` at `x`.
fn axial_shape(x: f64, length: f64) -> [f64; 2] {
    let xi = x / length;
    [1.0 - xi, xi]
}

/// Consistent nodal loads `[fx_i, fy_i, m_i, fx_j, fy_j, m_j]` of one load: the loads the
/// member transfers TO its nodes when both ends are fixed.
fn consistent_nodal_loads(length: f64, load: &LocalLoad) -> [f64; 6] {
    let mut f = [0.0; 6];
    match *load {
        LocalLoad::Linear { .. } => {
            let Some(s) = Span::of(load) else { return f };
            if s.hi <= s.lo {
                return f;
            }
            // f_k = ∫ N_k(x)·q(x) dx: degree ≤ 4, exact with 3 Gauss points.
            for (k, dof) in [1, 2, 4, 5].into_iter().enumerate() {
                f[dof] = gauss3(s.lo, s.hi, |t| hermite(t, length)[k] * s.at(t).1);
            }
            for (k, dof) in [0, 3].into_iter().enumerate() {
                f[dof] = gauss3(s.lo, s.hi, |t| axial_shape(t, length)[k] * s.at(t).0);
            }
        }
        LocalLoad::Point { a, px, py } => {
            let n = hermite(a, length);
            let na = axial_shape(a, length);
            f = [
                na[0] * px,
                n[0] * py,
                n[1] * py,
                na[1] * px,
                n[2] * py,
                n[3] * py,
            ];
        }
        LocalLoad::Moment { a, m } => {
            // Work of a couple is m·v'(a): the load vector is N'(a)ᵀ·m.
            let d = hermite_slope(a, length);
            f = [0.0, d[0] * m, d[1] * m, 0.0, d[2] * m, d[3] * m];
        }
    }
    f
}

/// Fixed-end forces: the member-end actions `[Fx, Fy, Mz]` at i and j (forces the supports
/// exert on the member) when both ends are fully fixed, in local axes.
///
/// They are the negatives of the consistent nodal loads `∫ Nᵀ q dx + Nᵀ(a)·P + N'ᵀ(a)·M`
/// (Hermite cubics transversely, linear functions axially), which for a prismatic
/// Euler–Bernoulli member are the exact fixed-end reactions (see the module doc). Example:
/// a uniform downward load `qy = −w` on the full length gives `Fy_i = Fy_j = +wL/2` and
/// `Mz_i = +wL²/12`, `Mz_j = −wL²/12`.
pub fn fixed_end_forces(length: f64, loads: &[LocalLoad]) -> EndForces {
    let mut total = [0.0; 6];
    for load in loads {
        let f = consistent_nodal_loads(length, load);
        for k in 0..6 {
            total[k] -= f[k];
        }
    }
    EndForces::from_array(total)
}

/// Remove the end moment at a released end (hinge) from fixed-end forces by static
/// condensation of the released rotation(s), the same condensation the element stiffness
/// undergoes ([`super::element::condense`]), so the end forces and the stiffness of a
/// released member stay consistent.
///
/// With `r` the released rotations and `c` the others, the free rotations are
/// `θ_r = −K_rr⁻¹·F_r` and the condensed forces `F* = F + K_·r·θ_r`, which makes `F*_r = 0`
/// exactly. `EI` cancels: `K_·r·K_rr⁻¹` is a ratio of stiffnesses that all carry the same
/// factor `EI`, so the unit stiffness (`EI = 1`) gives the same result for any prismatic
/// member. Axial forces are untouched (the rotation columns have no axial terms).
pub fn condense_end_forces(
    length: f64,
    fixed: &EndForces,
    release_i: bool,
    release_j: bool,
) -> EndForces {
    let k = super::element::elastic_stiffness(1.0, 1.0, length);
    let f = nalgebra::Vector6::from(fixed.to_array());
    let (_, condensed) = super::element::condense(&k, &f, [release_i, release_j]);
    EndForces::from_array(condensed.into())
}

/// End actions of a member with both ends restrained against translation and a moment
/// release (hinge) at end i and/or end j: the fixed-end forces of [`fixed_end_forces`]
/// condensed by [`condense_end_forces`]. A released end carries no moment: fixed–pinned
/// under a full uniform load `w` gives `wL²/8` at the fixed end and reactions `5wL/8`,
/// `3wL/8`; pinned–pinned gives the simple-beam reactions.
pub fn condensed_fixed_end_forces(
    length: f64,
    loads: &[LocalLoad],
    release_i: bool,
    release_j: bool,
) -> EndForces {
    condense_end_forces(
        length,
        &fixed_end_forces(length, loads),
        release_i,
        release_j,
    )
}

/// Which side of a concentrated load at the station to report.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Side {
    /// Just left of `x`: a concentrated load at exactly `x` is not yet included.
    Left,
    /// Just right of `x`: a concentrated load at exactly `x` is included.
    Right,
}

/// Whether a concentrated load at `a` acts on the part `0..x` seen from `side`.
/// Loads at `a ≤ 0` act on the member itself (there is no member left of end i), so the
/// value at `x = 0` is always the one just inside the member.
fn acts_left_of(a: f64, x: f64, side: Side) -> bool {
    a < x || a <= 0.0 || (side == Side::Right && a == x)
}

/// `(x − t)ⁿ / n!` for `x ≥ t` (the Macaulay bracket divided by n!), `n ≤ 3`.
fn bracket(x: f64, t: f64, n: u32) -> f64 {
    let d = x - t;
    match n {
        0 => 1.0,
        1 => d,
        2 => d * d / 2.0,
        _ => d * d * d / 6.0,
    }
}

/// Σ over the transverse loads on `0..x` of their n-th moment about `x`:
/// `Σ py·(x−a)ⁿ/n! + ∫ qy(t)·(x−t)ⁿ/n! dt − Σ m·(x−a)ⁿ⁻¹/(n−1)!` (the last for `n ≥ 1`).
/// `n = 0` gives the shear from the loads, `n = 1` their bending moment, `n = 2` and `n = 3`
/// the single and double integrals of that moment. Exact (Gauss degree ≤ 4 ≤ 5).
fn transverse_moment(x: f64, side: Side, loads: &[LocalLoad], n: u32) -> f64 {
    loads
        .iter()
        .map(|load| match *load {
            LocalLoad::Linear { .. } => integrate_left(load, x, |q, t| q.1 * bracket(x, t, n)),
            LocalLoad::Point { a, py, .. } if acts_left_of(a, x, side) => py * bracket(x, a, n),
            LocalLoad::Moment { a, m } if n >= 1 && acts_left_of(a, x, side) => {
                -m * bracket(x, a, n - 1)
            }
            _ => 0.0,
        })
        .sum()
}

/// `∫ g((qx, qy)(t), t) dt` over the part of a distributed load left of `x` (exact for
/// polynomial integrands up to degree 5); 0 for concentrated loads.
fn integrate_left(load: &LocalLoad, x: f64, g: impl Fn((f64, f64), f64) -> f64) -> f64 {
    let Some(s) = Span::of(load) else {
        return 0.0;
    };
    let hi = s.hi.min(x);
    if hi <= s.lo {
        0.0
    } else {
        gauss3(s.lo, hi, |t| g(s.at(t), t))
    }
}

/// Σ of the axial loads on `0..x` (`Σ px + ∫ qx dt`).
fn axial_resultant(x: f64, side: Side, loads: &[LocalLoad]) -> f64 {
    loads
        .iter()
        .map(|load| match *load {
            LocalLoad::Linear { .. } => integrate_left(load, x, |q, _| q.0),
            LocalLoad::Point { a, px, .. } if acts_left_of(a, x, side) => px,
            _ => 0.0,
        })
        .sum()
}

/// Internal forces at `x` from end i, on the chosen side of any concentrated load at `x`.
///
/// By statics of the part `0..x` (see [`crate::solve::forces`]):
/// `N = −Fx_i − Σpx`, `V = Fy_i + Σpy`, `M = −Mz_i + Fy_i·x + Σpy·(x−a) − Σm`, distributed
/// loads integrated exactly over their part left of `x`. Loads at `a ≤ 0` always count, so
/// at `x = 0` the value just inside the member is returned for either side. At `x = L`,
/// [`Side::Left`] gives the value just inside the member (`N = Fx_j`, `V = −Fy_j`, `M = Mz_j`).
/// [`Side::Right`] at `x = L` would include loads at `L` and so describe the far side of
/// end j: ask for [`Side::Left`] there.
pub fn internal_forces_at(
    x: f64,
    side: Side,
    end: &EndForces,
    loads: &[LocalLoad],
) -> InternalForces {
    let [fx_i, fy_i, mz_i] = end.i;
    InternalForces {
        n: -fx_i - axial_resultant(x, side, loads),
        v: fy_i + transverse_moment(x, side, loads, 0),
        m: -mz_i + fy_i * x + transverse_moment(x, side, loads, 1),
    }
}

/// Internal forces at `x` from end i by statics (see [`internal_forces_at`]).
///
/// The part `0..x` includes concentrated loads at `a < x`: at a point load or concentrated
/// moment exactly at `x = a` the value just LEFT of it is returned (use
/// [`internal_forces_at`] with [`Side::Right`] for the other side). Loads at `a = 0` count
/// from `x = 0` on, so `x = 0` and `x = L` both give values just inside the member.
pub fn internal_forces(x: f64, end: &EndForces, loads: &[LocalLoad]) -> InternalForces {
    internal_forces_at(x, Side::Left, end, loads)
}

/// `(x, value)` of the largest and of the smallest value of a quantity along a member.
/// From [`span_extremes`] the value is the bending moment M; from [`deflection_extremes`]
/// it is the transverse deflection. Ties keep the smallest x.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct SpanExtremes {
    /// `(x, value)` of the maximum.
    pub max: (f64, f64),
    /// `(x, value)` of the minimum.
    pub min: (f64, f64),
}

impl SpanExtremes {
    /// The extremes of a list of `(x, value)` candidates (first one wins ties);
    /// `(0, 0)` for an empty list.
    fn of(candidates: &[(f64, f64)]) -> SpanExtremes {
        let first = candidates.first().copied().unwrap_or((0.0, 0.0));
        let mut out = SpanExtremes {
            max: first,
            min: first,
        };
        for &c in candidates {
            if c.1 > out.max.1 {
                out.max = c;
            }
            if c.1 < out.min.1 {
                out.min = c;
            }
        }
        out
    }
}

/// The positions where internal forces change their polynomial form: the member ends, the
/// start and end of each distributed load and each concentrated load, clipped to `[0, L]`,
/// sorted and without repeats.
pub fn breakpoints(length: f64, loads: &[LocalLoad]) -> Vec<f64> {
    let mut xs = vec![0.0, length];
    for load in loads {
        match *load {
            LocalLoad::Linear { a, b, .. } => xs.extend([a, b]),
            LocalLoad::Point { a, .. } | LocalLoad::Moment { a, .. } => xs.push(a),
        }
    }
    let mut xs: Vec<f64> = xs
        .into_iter()
        .map(|x| x.clamp(0.0, length.max(0.0)))
        .collect();
    xs.sort_by(f64::total_cmp);
    xs.dedup();
    xs
}

/// Real roots in the open interval `(0, h)` of `c0 + c1·t + c2·t²`, by the cancellation-free
/// form of the quadratic formula (which also degrades gracefully to the linear case).
fn quadratic_roots_in(c0: f64, c1: f64, c2: f64, h: f64) -> Vec<f64> {
    let disc = c1 * c1 - 4.0 * c2 * c0;
    if disc < 0.0 {
        return Vec::new();
    }
    let q = -0.5 * (c1 + c1.signum() * disc.sqrt());
    let mut roots = Vec::new();
    if q != 0.0 {
        roots.push(c0 / q);
    }
    if c2 != 0.0 {
        roots.push(q / c2);
    }
    roots.retain(|t| t.is_finite() && *t > 0.0 && *t < h);
    roots
}

/// Exact maximum and minimum bending moment along the member, with their positions.
///
/// Between consecutive [`breakpoints`] M(x) is a polynomial of degree ≤ 3 whose derivative
/// is the shear V(x), a polynomial of degree ≤ 2 (linearly varying loads). On each piece V is
/// determined exactly by its values at the piece ends (one-sided) and midpoint, its zeros
/// are found in closed form and M is evaluated there. Candidates are the member ends (values
/// inside the member), both sides of every breakpoint (a concentrated moment makes M jump)
/// and the zeros of V.
pub fn span_extremes(length: f64, end: &EndForces, loads: &[LocalLoad]) -> SpanExtremes {
    moment_extremes(length, end, loads, None)
}

/// The P-δ part of an element's bending moment in a second-order analysis.
///
/// Moment equilibrium of the deformed part `0..x` of an element adds the moment of the
/// axial force about the displaced section: `M(x) = M₁(x) + N·(v(x) − v_i)`, with M₁ the
/// statics of [`internal_forces_at`] on the element's end actions, N the axial force of its
/// geometric stiffness (tension positive) and v(x) its transverse displacement (local y).
/// v(x) is the element's own cubic (Hermite) shape, the one its consistent geometric
/// stiffness is built from (McGuire, Gallagher & Ziemian, *Matrix Structural Analysis*,
/// 2nd ed. (2000), §9.3, from memory). With those end actions the consistent geometric
/// stiffness satisfies `Mz_i + Mz_j + Fy_j·L = N·(v_j − v_i)` (closed form, summing its
/// rows), so `M(L)` equals the end moment `Mz_j` and the diagram is continuous from
/// element to element.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct PDelta {
    /// Axial force of the geometric stiffness, N, tension positive.
    pub n: f64,
    /// Element length, m.
    pub length: f64,
    /// Local `[v_i, θ_i, v_j, θ_j]` (m, rad) of the element's ends.
    pub ends: [f64; 4],
}

impl PDelta {
    /// `(v(x) − v_i, v'(x))` of the Hermite cubic.
    fn shape(&self, x: f64) -> (f64, f64) {
        let l = self.length;
        let [v_i, t_i, v_j, t_j] = self.ends;
        let xi = x / l;
        let (xi2, xi3) = (xi * xi, xi * xi * xi);
        let v = (-3.0 * xi2 + 2.0 * xi3) * v_i
            + l * (xi - 2.0 * xi2 + xi3) * t_i
            + (3.0 * xi2 - 2.0 * xi3) * v_j
            + l * (-xi2 + xi3) * t_j;
        let dv = (-6.0 * xi + 6.0 * xi2) / l * v_i
            + (1.0 - 4.0 * xi + 3.0 * xi2) * t_i
            + (6.0 * xi - 6.0 * xi2) / l * v_j
            + (-2.0 * xi + 3.0 * xi2) * t_j;
        (v, dv)
    }

    /// The moment `N·(v(x) − v_i)` and its derivative.
    pub fn moment(&self, x: f64) -> (f64, f64) {
        let (v, dv) = self.shape(x);
        (self.n * v, self.n * dv)
    }
}

/// Bending moment at `x` ([`internal_forces_at`]) plus the P-δ part `p_delta`, if any.
pub fn moment_at(
    x: f64,
    side: Side,
    end: &EndForces,
    loads: &[LocalLoad],
    p_delta: Option<&PDelta>,
) -> f64 {
    internal_forces_at(x, side, end, loads).m + p_delta.map_or(0.0, |p| p.moment(x).0)
}

/// Exact maximum and minimum of [`moment_at`] along an element, with their positions.
///
/// As [`span_extremes`]: dM/dx is the shear plus `N·v'(x)`, both polynomials of degree ≤ 2
/// between breakpoints, so the quadratic through three values of dM/dx on each piece is
/// exact and its zeros are found in closed form.
pub fn moment_extremes(
    length: f64,
    end: &EndForces,
    loads: &[LocalLoad],
    p_delta: Option<&PDelta>,
) -> SpanExtremes {
    let m_at = |x: f64, side: Side| moment_at(x, side, end, loads, p_delta);
    let v_at = |x: f64, side: Side| {
        internal_forces_at(x, side, end, loads).v + p_delta.map_or(0.0, |p| p.moment(x).1)
    };
    let bps = breakpoints(length, loads);
    let mut cands: Vec<(f64, f64)> = vec![(0.0, m_at(0.0, Side::Right))];
    for w in bps.windows(2) {
        let (x0, x1) = (w[0], w[1]);
        let h = x1 - x0;
        if h <= 0.0 {
            continue;
        }
        cands.push((x0, m_at(x0, Side::Right)));
        // dM/dx(x0 + t) = c0 + c1·t + c2·t² through (0, v0), (h/2, vm), (h, v1).
        let (v0, vm, v1) = (
            v_at(x0, Side::Right),
            v_at(x0 + 0.5 * h, Side::Left),
            v_at(x1, Side::Left),
        );
        let c1 = (-3.0 * v0 + 4.0 * vm - v1) / h;
        let c2 = 2.0 * (v0 - 2.0 * vm + v1) / (h * h);
        for t in quadratic_roots_in(v0, c1, c2, h) {
            cands.push((x0 + t, m_at(x0 + t, Side::Left)));
        }
        cands.push((x1, m_at(x1, Side::Left)));
    }
    SpanExtremes::of(&cands)
}

/// Transverse deflection (local y) and rotation at `x`: `(v, θ)`.
///
/// Integrates `v'' = M/EI` exactly (see the module doc) with `v(0) = v_i` and `v(L) = v_j`,
/// the local-y displacements of the ends; `end` must be the member's total end actions
/// (fixed-end forces plus the part from the end displacements). No rotation boundary
/// condition is used, so released ends need no special treatment. `length` and `ei` must be
/// positive (a validated model guarantees it).
pub fn deflection_at(
    x: f64,
    length: f64,
    ei: f64,
    end: &EndForces,
    loads: &[LocalLoad],
    v_i: f64,
    v_j: f64,
) -> (f64, f64) {
    let [_, fy_i, mz_i] = end.i;
    // EI·(v − v_i − θ₀·x) and its derivative, exact.
    let bend = |x: f64| {
        -mz_i * x * x / 2.0 + fy_i * x * x * x / 6.0 + transverse_moment(x, Side::Left, loads, 3)
    };
    let bend_slope =
        |x: f64| -mz_i * x + fy_i * x * x / 2.0 + transverse_moment(x, Side::Left, loads, 2);
    let theta0 = (v_j - v_i - bend(length) / ei) / length;
    (v_i + theta0 * x + bend(x) / ei, theta0 + bend_slope(x) / ei)
}

/// One output station along a member.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct Station {
    /// Distance from end i, m.
    pub x: f64,
    /// Axial force, N, tension positive.
    pub n: f64,
    /// Shear, N.
    pub v: f64,
    /// Bending moment, N·m, positive with the local −y face in tension.
    pub m: f64,
    /// Transverse (local y) displacement, m, including the end displacements.
    pub deflection: f64,
}

/// Internal forces and deflection at `count` equally spaced stations (both ends included;
/// `count < 2` is read as 2) plus every [`breakpoints`] position, sorted by x.
///
/// At an interior concentrated load or moment two stations with the same x are returned,
/// the first just left and the second just right of it, so shear and moment diagrams show
/// the jump. A grid station within `1e-9·L` of a breakpoint is merged into it. The
/// deflection is [`deflection_at`] (exact, with `v(0) = v_i`, `v(L) = v_j`).
pub fn stations(
    length: f64,
    ei: f64,
    end: &EndForces,
    loads: &[LocalLoad],
    v_i: f64,
    v_j: f64,
    count: usize,
) -> Vec<Station> {
    let is_concentrated_at = |x: f64| {
        x > 0.0
            && x < length
            && loads.iter().any(|l| match *l {
                LocalLoad::Point { a, .. } | LocalLoad::Moment { a, .. } => a == x,
                LocalLoad::Linear { .. } => false,
            })
    };
    let mut xs: Vec<(f64, Side)> = Vec::new();
    for x in breakpoints(length, loads) {
        xs.push((x, Side::Left));
        if is_concentrated_at(x) {
            xs.push((x, Side::Right));
        }
    }
    let n = count.max(2);
    let tol = 1e-9 * length.abs();
    for k in 0..n {
        let x = length * k as f64 / (n - 1) as f64;
        if !xs.iter().any(|(b, _)| (b - x).abs() <= tol) {
            xs.push((x, Side::Left));
        }
    }
    xs.sort_by(|p, q| {
        p.0.total_cmp(&q.0)
            .then((p.1 == Side::Right).cmp(&(q.1 == Side::Right)))
    });
    xs.into_iter()
        .map(|(x, side)| {
            let f = internal_forces_at(x, side, end, loads);
            let (deflection, _) = deflection_at(x, length, ei, end, loads, v_i, v_j);
            Station {
                x,
                n: f.n,
                v: f.v,
                m: f.m,
                deflection,
            }
        })
        .collect()
}

/// Largest and smallest transverse deflection along the member, with their positions.
///
/// Candidates are the ends, the [`breakpoints`] and the zeros of the rotation θ(x), a
/// polynomial of degree ≤ 4 between breakpoints: each piece is scanned in 16 parts for sign
/// changes of θ, refined by bisection to `1e-12·L`. Two zeros of θ closer than `L/16`
/// within one piece could be missed; the deflection difference between them is then small.
pub fn deflection_extremes(
    length: f64,
    ei: f64,
    end: &EndForces,
    loads: &[LocalLoad],
    v_i: f64,
    v_j: f64,
) -> SpanExtremes {
    let at = |x: f64| deflection_at(x, length, ei, end, loads, v_i, v_j);
    let bps = breakpoints(length, loads);
    let mut cands: Vec<(f64, f64)> = Vec::new();
    const PARTS: usize = 16;
    for w in bps.windows(2) {
        let (x0, x1) = (w[0], w[1]);
        cands.push((x0, at(x0).0));
        let h = (x1 - x0) / PARTS as f64;
        for k in 0..PARTS {
            let (mut lo, mut hi) = (x0 + h * k as f64, x0 + h * (k + 1) as f64);
            let (mut s_lo, s_hi) = (at(lo).1, at(hi).1);
            if s_lo == 0.0 || s_lo.signum() == s_hi.signum() {
                continue;
            }
            while hi - lo > 1e-12 * length {
                let mid = 0.5 * (lo + hi);
                let s_mid = at(mid).1;
                if s_mid.signum() == s_lo.signum() {
                    lo = mid;
                    s_lo = s_mid;
                } else {
                    hi = mid;
                }
            }
            let x = 0.5 * (lo + hi);
            cands.push((x, at(x).0));
        }
    }
    cands.push((length, at(length).0));
    SpanExtremes::of(&cands)
}

/// The part of a load on `[x0, x1)` (or `[x0, x1]` when `closed` is set), positions re-based
/// to `x0`.
fn restrict_to(load: &LocalLoad, x0: f64, x1: f64, closed: bool) -> Option<LocalLoad> {
    let inside = |a: f64| x0 <= a && (a < x1 || (closed && a == x1));
    match *load {
        LocalLoad::Linear { .. } => {
            let s = Span::of(load)?;
            let (lo, hi) = (s.lo.max(x0), s.hi.min(x1));
            if hi <= lo {
                return None;
            }
            let ((qx_a, qy_a), (qx_b, qy_b)) = (s.at(lo), s.at(hi));
            Some(LocalLoad::Linear {
                a: lo - x0,
                b: hi - x0,
                qx_a,
                qy_a,
                qx_b,
                qy_b,
            })
        }
        LocalLoad::Point { a, px, py } => {
            inside(a).then_some(LocalLoad::Point { a: a - x0, px, py })
        }
        LocalLoad::Moment { a, m } => inside(a).then_some(LocalLoad::Moment { a: a - x0, m }),
    }
}

/// The part of `load` lying on `[x0, x1)`, with positions measured from `x0` (for dividing a
/// member into segments).
///
/// A distributed load is clipped to the overlap (intensities interpolated at the cut); an
/// overlap of zero length gives `None`. A concentrated load at `a` belongs to the segment
/// with `x0 ≤ a < x1`, so one exactly at an internal cut goes to the segment on its right,
/// where it sits at that segment's end i. Because the interval is half-open, a concentrated
/// load at the far end of the last segment is not returned: use [`split_loads`], which closes
/// the last segment.
pub fn restrict(load: &LocalLoad, x0: f64, x1: f64) -> Option<LocalLoad> {
    restrict_to(load, x0, x1, false)
}

/// Divide a member's loads among the segments between consecutive `cuts` (ascending, from 0
/// to L): segment k gets [`restrict`]`(load, cuts[k], cuts[k+1])`, except that the last
/// segment is closed at its far end so that no load is lost. Returns one list per segment.
pub fn split_loads(loads: &[LocalLoad], cuts: &[f64]) -> Vec<Vec<LocalLoad>> {
    let segments = cuts.len().saturating_sub(1);
    (0..segments)
        .map(|k| {
            let closed = k + 1 == segments;
            loads
                .iter()
                .filter_map(|l| restrict_to(l, cuts[k], cuts[k + 1], closed))
                .collect()
        })
        .collect()
}

/// Whether any load acts transversely to the member (for the Cm factor of a beam-column):
/// a non-zero `py`, a distributed load of non-zero length with a non-zero `qy`, or a
/// non-zero concentrated moment (which also makes the moment diagram non-linear between the
/// ends). Zero loads are ignored. Loads sitting exactly at an end still count, since the
/// member length is not known here.
pub fn has_transverse_load(loads: &[LocalLoad]) -> bool {
    loads.iter().any(|load| match *load {
        LocalLoad::Linear {
            a, b, qy_a, qy_b, ..
        } => a != b && (qy_a != 0.0 || qy_b != 0.0),
        LocalLoad::Point { py, .. } => py != 0.0,
        LocalLoad::Moment { m, .. } => m != 0.0,
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Named tolerance for exact formulas evaluated in f64.
    const TIGHT: f64 = 1e-12;

    fn close(a: f64, b: f64, scale: f64) -> bool {
        (a - b).abs() <= TIGHT * scale.abs().max(1.0)
    }

    #[test]
    fn gauss3_is_exact_for_quintics() {
        // closed form: ∫₀² t⁵ dt = 2⁶/6.
        assert!(close(gauss3(0.0, 2.0, |t| t.powi(5)), 64.0 / 6.0, 64.0));
    }

    #[test]
    fn hermite_functions_reproduce_rigid_body_motion() {
        // closed form: a rigid translation (v = 1) and rotation (v = x − L/2, θ = 1) must be
        // interpolated exactly by the cubic shape functions.
        let l = 3.7;
        for &x in &[0.0, 0.4, 1.9, 3.7] {
            let n = hermite(x, l);
            assert!(close(n[0] + n[2], 1.0, 1.0));
            assert!(close(
                -l / 2.0 * n[0] + n[1] + l / 2.0 * n[2] + n[3],
                x - l / 2.0,
                l
            ));
            let d = hermite_slope(x, l);
            assert!(close(
                -l / 2.0 * d[0] + d[1] + l / 2.0 * d[2] + d[3],
                1.0,
                1.0
            ));
        }
    }

    #[test]
    fn point_load_at_cut_goes_to_the_right_segment_only() {
        let p = LocalLoad::Point {
            a: 2.0,
            px: 0.0,
            py: -5.0,
        };
        assert_eq!(restrict(&p, 0.0, 2.0), None);
        assert_eq!(
            restrict(&p, 2.0, 4.0),
            Some(LocalLoad::Point {
                a: 0.0,
                px: 0.0,
                py: -5.0
            })
        );
    }

    #[test]
    fn split_keeps_a_load_at_the_far_end() {
        let p = LocalLoad::Moment { a: 4.0, m: 3.0 };
        let parts = split_loads(&[p], &[0.0, 2.0, 4.0]);
        assert!(parts[0].is_empty());
        assert_eq!(parts[1], vec![LocalLoad::Moment { a: 2.0, m: 3.0 }]);
    }

    #[test]
    fn restrict_interpolates_distributed_intensities() {
        let q = LocalLoad::Linear {
            a: 1.0,
            b: 5.0,
            qx_a: 0.0,
            qy_a: -2.0,
            qx_b: 4.0,
            qy_b: -6.0,
        };
        let r = restrict(&q, 2.0, 3.0).unwrap();
        assert_eq!(
            r,
            LocalLoad::Linear {
                a: 0.0,
                b: 1.0,
                qx_a: 1.0,
                qy_a: -3.0,
                qx_b: 2.0,
                qy_b: -4.0
            }
        );
        assert_eq!(restrict(&q, 5.0, 6.0), None);
    }

    #[test]
    fn reversed_distributed_load_reads_as_the_same_load() {
        let fwd = LocalLoad::Linear {
            a: 1.0,
            b: 4.0,
            qx_a: 0.0,
            qy_a: -1.0,
            qx_b: 0.0,
            qy_b: -3.0,
        };
        let rev = LocalLoad::Linear {
            a: 4.0,
            b: 1.0,
            qx_a: 0.0,
            qy_a: -3.0,
            qx_b: 0.0,
            qy_b: -1.0,
        };
        let (f, r) = (fixed_end_forces(6.0, &[fwd]), fixed_end_forces(6.0, &[rev]));
        for (x, y) in f.to_array().iter().zip(r.to_array()) {
            assert!(close(*x, y, 10.0));
        }
    }

    #[test]
    fn sides_of_a_concentrated_moment() {
        // closed form: just left of a moment m the internal moment is unchanged, just right
        // it has dropped by m (M = … − Σm).
        let loads = [LocalLoad::Moment { a: 1.0, m: 10.0 }];
        let end = EndForces::default();
        assert_eq!(internal_forces(1.0, &end, &loads).m, 0.0);
        assert_eq!(internal_forces_at(1.0, Side::Right, &end, &loads).m, -10.0);
        // At x = 0 a load at a = 0 already acts, whichever side is asked.
        let at_zero = [LocalLoad::Point {
            a: 0.0,
            px: 2.0,
            py: 3.0,
        }];
        assert_eq!(internal_forces(0.0, &end, &at_zero).v, 3.0);
        assert_eq!(internal_forces(0.0, &end, &at_zero).n, -2.0);
    }

    #[test]
    fn stations_merge_the_grid_with_breakpoints() {
        // A point load on a grid station gives one left and one right station there, no
        // third copy from the grid.
        let loads = [LocalLoad::Point {
            a: 2.0,
            px: 0.0,
            py: -1.0,
        }];
        let end = condensed_fixed_end_forces(4.0, &loads, true, true);
        let st = stations(4.0, 1.0, &end, &loads, 0.0, 0.0, 3);
        let xs: Vec<f64> = st.iter().map(|s| s.x).collect();
        assert_eq!(xs, vec![0.0, 2.0, 2.0, 4.0]);
        // closed form: simple beam reactions P/2, so V = +0.5 left and −0.5 right.
        assert!(close(st[1].v, 0.5, 1.0) && close(st[2].v, -0.5, 1.0));
    }

    #[test]
    fn zero_loads_are_not_transverse() {
        assert!(!has_transverse_load(&[]));
        assert!(!has_transverse_load(&[
            LocalLoad::Point {
                a: 1.0,
                px: 5.0,
                py: 0.0
            },
            LocalLoad::Linear {
                a: 0.0,
                b: 2.0,
                qx_a: 1.0,
                qy_a: 0.0,
                qx_b: 1.0,
                qy_b: 0.0
            },
            LocalLoad::Linear {
                a: 1.0,
                b: 1.0,
                qx_a: 0.0,
                qy_a: 3.0,
                qx_b: 0.0,
                qy_b: 3.0
            },
            LocalLoad::Moment { a: 1.0, m: 0.0 },
        ]));
        assert!(has_transverse_load(&[LocalLoad::Point {
            a: 1.0,
            px: 0.0,
            py: -1.0
        }]));
        assert!(has_transverse_load(&[LocalLoad::Moment { a: 1.0, m: 2.0 }]));
    }

    #[test]
    fn quadratic_roots_handle_the_linear_limit() {
        // closed form: 2 − 4t has its root at t = 0.5; t² − 3t + 2 at 1 and 2.
        assert_eq!(quadratic_roots_in(2.0, -4.0, 0.0, 1.0), vec![0.5]);
        let mut r = quadratic_roots_in(2.0, -3.0, 1.0, 3.0);
        r.sort_by(f64::total_cmp);
        assert!(close(r[0], 1.0, 1.0) && close(r[1], 2.0, 1.0));
    }
}
