//! Plane frame element matrices in member-local axes, and static condensation of end
//! releases.
//!
//! Degrees of freedom of an element, local axes, in this order:
//! `[u_i, v_i, θ_i, u_j, v_j, θ_j]` (axial, transverse, rotation CCW at i, then at j).
//!
//! References:
//! * W. McGuire, R. H. Gallagher, R. D. Ziemian, *Matrix Structural Analysis*, 2nd ed.
//!   (2000): §4.3 elastic stiffness of the plane frame element, §9.3 the consistent
//!   geometric stiffness (from memory).
//! * The condensation of a released end rotation is the static condensation of
//!   Przemieniecki, *Theory of Matrix Structural Analysis* (1968), §9 (from memory):
//!   `k* = k_cc − k_cr·k_rr⁻¹·k_rc`, `f* = f_c − k_cr·k_rr⁻¹·f_r`.

use nalgebra::{Matrix6, Vector6};

/// Elastic stiffness of a prismatic Euler–Bernoulli plane frame element in local axes.
///
/// `ea` = E·A (N), `ei` = E·I (N·m²), `l` = length (m).
pub fn elastic_stiffness(ea: f64, ei: f64, l: f64) -> Matrix6<f64> {
    let a = ea / l;
    let b = 12.0 * ei / l.powi(3);
    let c = 6.0 * ei / l.powi(2);
    let d = 4.0 * ei / l;
    let e = 2.0 * ei / l;
    #[rustfmt::skip]
    let k = Matrix6::new(
         a,  0.0, 0.0, -a,  0.0, 0.0,
        0.0,  b,   c,  0.0, -b,   c,
        0.0,  c,   d,  0.0, -c,   e,
        -a,  0.0, 0.0,  a,  0.0, 0.0,
        0.0, -b,  -c,  0.0,  b,  -c,
        0.0,  c,   e,  0.0, -c,   d,
    );
    k
}

/// Consistent geometric stiffness of a plane frame element under axial force `n`
/// (N, tension positive), length `l` (McGuire, Gallagher & Ziemian §9.3, from memory):
/// `k_G = (N/L)·[6/5, L/10, −6/5, L/10; 2L²/15, −L/10, −L²/30; 6/5, −L/10; 2L²/15]`
/// on the transverse and rotational DOFs. Compression softens the element.
pub fn geometric_stiffness(n: f64, l: f64) -> Matrix6<f64> {
    let f = n / l;
    let p = 6.0 / 5.0;
    let q = l / 10.0;
    let r = 2.0 * l * l / 15.0;
    let t = -l * l / 30.0;
    #[rustfmt::skip]
    let k = Matrix6::new(
        0.0, 0.0, 0.0, 0.0, 0.0, 0.0,
        0.0,  p,   q,  0.0, -p,   q,
        0.0,  q,   r,  0.0, -q,   t,
        0.0, 0.0, 0.0, 0.0, 0.0, 0.0,
        0.0, -p,  -q,  0.0,  p,  -q,
        0.0,  q,   t,  0.0, -q,   r,
    );
    k * f
}

/// Transformation from global to local element DOFs for direction cosines `(c, s)`:
/// `u_local = T·u_global`.
pub fn transformation(c: f64, s: f64) -> Matrix6<f64> {
    #[rustfmt::skip]
    let t = Matrix6::new(
          c,   s, 0.0, 0.0, 0.0, 0.0,
         -s,   c, 0.0, 0.0, 0.0, 0.0,
        0.0, 0.0, 1.0, 0.0, 0.0, 0.0,
        0.0, 0.0, 0.0,   c,   s, 0.0,
        0.0, 0.0, 0.0,  -s,   c, 0.0,
        0.0, 0.0, 0.0, 0.0, 0.0, 1.0,
    );
    t
}

/// Local DOF index of the rotation at end i and at end j.
const ROT: [usize; 2] = [2, 5];

/// Condense the released end rotations out of a local stiffness `k` and the fixed-end
/// actions `f` (member-end actions with every DOF held).
///
/// Returns `(k*, f*)`: rows and columns of released rotations are zero in `k*`, and the
/// released end moments are zero in `f*`. The released rotations are recovered by
/// [`released_rotations`].
pub fn condense(
    k: &Matrix6<f64>,
    f: &Vector6<f64>,
    release: [bool; 2],
) -> (Matrix6<f64>, Vector6<f64>) {
    let mut k = *k;
    let mut f = *f;
    for (end, &released) in release.iter().enumerate() {
        if !released {
            continue;
        }
        let r = ROT[end];
        let krr = k[(r, r)];
        if krr.abs() <= f64::MIN_POSITIVE {
            continue;
        }
        let col = k.column(r).into_owned();
        let fr = f[r];
        // k* = k − k_·r k_r· / k_rr ;  f* = f − k_·r f_r / k_rr
        k -= col * col.transpose() / krr;
        f -= col * (fr / krr);
        // Clean exact zeros on the released row and column.
        for m in 0..6 {
            k[(r, m)] = 0.0;
            k[(m, r)] = 0.0;
        }
        f[r] = 0.0;
    }
    (k, f)
}

/// Rotations at released ends, given the local displacements of the retained DOFs
/// (`u`, whose released entries are ignored) and the un-condensed `k` and `f`.
///
/// From the zero-moment condition `k_r·u + f_r = 0` at each released end, solved for both
/// released rotations together when both ends are released.
pub fn released_rotations(
    k: &Matrix6<f64>,
    f: &Vector6<f64>,
    u: &Vector6<f64>,
    release: [bool; 2],
) -> Vector6<f64> {
    let mut u = *u;
    let rel: Vec<usize> = (0..2).filter(|&e| release[e]).map(|e| ROT[e]).collect();
    for &r in &rel {
        u[r] = 0.0;
    }
    match rel.as_slice() {
        [r] => {
            let r = *r;
            let rhs = -(k.row(r).dot(&u.transpose()) + f[r]);
            if k[(r, r)].abs() > f64::MIN_POSITIVE {
                u[r] = rhs / k[(r, r)];
            }
        }
        [r, s] => {
            let (r, s) = (*r, *s);
            let b0 = -(k.row(r).dot(&u.transpose()) + f[r]);
            let b1 = -(k.row(s).dot(&u.transpose()) + f[s]);
            let (a, b, c, d) = (k[(r, r)], k[(r, s)], k[(s, r)], k[(s, s)]);
            let det = a * d - b * c;
            if det.abs() > f64::MIN_POSITIVE {
                u[r] = (d * b0 - b * b1) / det;
                u[s] = (a * b1 - c * b0) / det;
            }
        }
        _ => {}
    }
    u
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    #[test]
    fn stiffness_is_symmetric_with_rigid_body_null_space() {
        let k = elastic_stiffness(2.0e9, 3.0e7, 4.0);
        assert_relative_eq!(k, k.transpose(), epsilon = 1e-6);
        // Rigid translation and rotation produce no end forces (closed form).
        let rigid_x = Vector6::new(1.0, 0.0, 0.0, 1.0, 0.0, 0.0);
        let rigid_rot = Vector6::new(0.0, 0.0, 1.0, 0.0, 4.0, 1.0);
        assert!((k * rigid_x).norm() < 1e-3);
        assert!((k * rigid_rot).norm() < 1e-3);
    }

    #[test]
    fn released_end_gives_propped_stiffness() {
        // Far end pinned: rotational stiffness 3EI/L at the near end (closed form,
        // slope-deflection: M = 3EI/L·θ for a member pinned at the far end).
        let (ei, l) = (5.0e6, 3.0);
        let k = elastic_stiffness(1.0e9, ei, l);
        let (kc, _) = condense(&k, &Vector6::zeros(), [false, true]);
        assert_relative_eq!(kc[(2, 2)], 3.0 * ei / l, max_relative = 1e-12);
        assert_eq!(kc[(5, 5)], 0.0);
    }

    #[test]
    fn geometric_stiffness_lowers_sway_stiffness_by_6p_over_5l() {
        // Consistent geometric stiffness term 6/5·P/L (McGuire et al. §9.3, from memory).
        let kg = geometric_stiffness(-1000.0, 2.0);
        assert_relative_eq!(kg[(1, 1)], -600.0, max_relative = 1e-12);
    }
}
