//! Single-member formulas (`plumbline::solve::beam`) against handbook beam formulas.
//!
//! Sources, beside each check:
//! * AISC Steel Construction Manual, 15th ed., Table 3-23 "Shears, Moments and Deflections"
//!   — the formulas were recalled, not read: marked `from memory`.
//! * Roark's Formulas for Stress and Strain, 8th ed., Table 8.1 — likewise `from memory`.
//! * `closed form` — derived in the comment beside the check.
//!
//! Signs (src/model/loads.rs, src/solve/forces.rs): a downward load has `qy = −w`; end
//! actions are the forces the supports exert on the member (CCW moments positive); the
//! internal moment is positive sagging.

mod common;

use common::verify;
use plumbline::model::LocalLoad;
use plumbline::solve::EndForces;
use plumbline::solve::beam::{
    Side, condensed_fixed_end_forces, deflection_at, deflection_extremes, fixed_end_forces,
    has_transverse_load, internal_forces, internal_forces_at, restrict, span_extremes, split_loads,
    stations,
};

/// Relative tolerance for closed-form results evaluated in f64 (a few hundred ulps).
const TOL: f64 = 1e-10;

/// Assert `actual ≈ expected` within `TOL` relative to `scale` (the size of the quantity).
#[track_caller]
fn check(what: &str, actual: f64, expected: f64, scale: f64) {
    verify::note(what, "SI", expected, actual, scale.abs(), TOL);
    let err = (actual - expected).abs();
    verify::observe(err / scale.abs());
    assert!(
        err <= TOL * scale.abs(),
        "{what}: got {actual:.15e}, expected {expected:.15e} (error {err:.3e}, scale {scale:.3e})"
    );
}

/// Assert all six end actions `[Fx_i, Fy_i, Mz_i, Fx_j, Fy_j, Mz_j]`.
#[track_caller]
fn check_end(end: &EndForces, expected: [f64; 6], force_scale: f64, length: f64) {
    let names = ["Fx_i", "Fy_i", "Mz_i", "Fx_j", "Fy_j", "Mz_j"];
    for (k, (a, e)) in end.to_array().iter().zip(expected).enumerate() {
        let scale = if k % 3 == 2 {
            force_scale * length
        } else {
            force_scale
        };
        check(names[k], *a, e, scale);
    }
}

fn udl(a: f64, b: f64, qy: f64) -> LocalLoad {
    LocalLoad::Linear {
        a,
        b,
        qx_a: 0.0,
        qy_a: qy,
        qx_b: 0.0,
        qy_b: qy,
    }
}

fn linear_y(a: f64, b: f64, qy_a: f64, qy_b: f64) -> LocalLoad {
    LocalLoad::Linear {
        a,
        b,
        qx_a: 0.0,
        qy_a,
        qx_b: 0.0,
        qy_b,
    }
}

fn point(a: f64, py: f64) -> LocalLoad {
    LocalLoad::Point { a, px: 0.0, py }
}

const L: f64 = 6.0;
const W: f64 = 12.0e3;
const P: f64 = 50.0e3;
/// EI of a mid-size steel beam, N·m² (E = 200 GPa, I = 1.2e-4 m⁴).
const EI: f64 = 200.0e9 * 1.2e-4;

// ---------------------------------------------------------------------------------------
// Fixed-end forces, both ends fixed
// ---------------------------------------------------------------------------------------

#[test]
fn fixed_fixed_full_uniform_load() {
    // AISC Manual 15th ed., Table 3-23, beam fixed at both ends, uniformly distributed load:
    // R = wL/2, M_end = wL²/12 (from memory). Supports push up, hogging end moments:
    // Mz_i = +wL²/12 (CCW), Mz_j = −wL²/12.
    verify::source("AISC Manual 15th ed., Table 3-23, fixed both ends, uniform load (from memory)");
    let f = fixed_end_forces(L, &[udl(0.0, L, -W)]);
    let (r, m) = (W * L / 2.0, W * L * L / 12.0);
    check_end(&f, [0.0, r, m, 0.0, r, -m], W * L, L);
}

#[test]
fn fixed_fixed_partial_uniform_load() {
    // closed form: a load w·dx at x gives M_i = (w dx)·x(L−x)²/L², M_j = (w dx)·x²(L−x)/L²,
    // R_i = (w dx)(L−x)²(L+2x)/L³, R_j = (w dx)x²(3L−2x)/L³ (the point-load case below);
    // integrating over c..d with the antiderivatives
    //   ∫x(L−x)² = L²x²/2 − 2Lx³/3 + x⁴/4,   ∫x²(L−x) = Lx³/3 − x⁴/4,
    //   ∫(L−x)²(L+2x) = L³x − Lx³ + x⁴/2,     ∫x²(3L−2x) = Lx³ − x⁴/2.
    verify::source("closed form: point-load case integrated over the loaded part");
    let (c, d) = (1.5, 4.0);
    let between = |g: &dyn Fn(f64) -> f64| g(d) - g(c);
    let m_i = W / (L * L)
        * between(&|x| L * L * x * x / 2.0 - 2.0 * L * x.powi(3) / 3.0 + x.powi(4) / 4.0);
    let m_j = W / (L * L) * between(&|x| L * x.powi(3) / 3.0 - x.powi(4) / 4.0);
    let r_i = W / L.powi(3) * between(&|x| L.powi(3) * x - L * x.powi(3) + x.powi(4) / 2.0);
    let r_j = W / L.powi(3) * between(&|x| L * x.powi(3) - x.powi(4) / 2.0);
    check("total load", r_i + r_j, W * (d - c), W * L);
    let f = fixed_end_forces(L, &[udl(c, d, -W)]);
    check_end(&f, [0.0, r_i, m_i, 0.0, r_j, -m_j], W * L, L);
}

#[test]
fn fixed_fixed_triangular_load() {
    // AISC Manual 15th ed., Table 3-23, and Roark 8th ed., Table 8.1: beam fixed at both ends,
    // load increasing uniformly from 0 at i to w at j: M_i = wL²/30, M_j = wL²/20,
    // R_i = 3wL/20, R_j = 7wL/20 (from memory).
    verify::source(
        "AISC Manual 15th ed., Table 3-23; Roark 8th ed., Table 8.1: fixed both ends, triangular load (from memory)",
    );
    let f = fixed_end_forces(L, &[linear_y(0.0, L, 0.0, -W)]);
    let expected = [
        0.0,
        3.0 * W * L / 20.0,
        W * L * L / 30.0,
        0.0,
        7.0 * W * L / 20.0,
        -W * L * L / 20.0,
    ];
    check_end(&f, expected, W * L, L);
}

#[test]
fn fixed_fixed_trapezoidal_load() {
    // Superposition of the two handbook cases above (uniform w1 plus triangle 0 → w2 − w1):
    // M_i = w1L²/12 + (w2−w1)L²/30, M_j = w1L²/12 + (w2−w1)L²/20,
    // R_i = w1L/2 + 3(w2−w1)L/20, R_j = w1L/2 + 7(w2−w1)L/20 (AISC Table 3-23, from memory).
    verify::source(
        "AISC Manual 15th ed., Table 3-23, uniform + triangular by superposition (from memory)",
    );
    let (w1, w2) = (4.0e3, 10.0e3);
    let dw = w2 - w1;
    let f = fixed_end_forces(L, &[linear_y(0.0, L, -w1, -w2)]);
    let expected = [
        0.0,
        w1 * L / 2.0 + 3.0 * dw * L / 20.0,
        w1 * L * L / 12.0 + dw * L * L / 30.0,
        0.0,
        w1 * L / 2.0 + 7.0 * dw * L / 20.0,
        -(w1 * L * L / 12.0 + dw * L * L / 20.0),
    ];
    check_end(&f, expected, w2 * L, L);
}

#[test]
fn fixed_fixed_central_point_load() {
    // AISC Manual 15th ed., Table 3-23, beam fixed at both ends, concentrated load at center:
    // R = P/2, M_end = PL/8 (from memory).
    verify::source(
        "AISC Manual 15th ed., Table 3-23, fixed both ends, central point load (from memory)",
    );
    let f = fixed_end_forces(L, &[point(L / 2.0, -P)]);
    check_end(
        &f,
        [0.0, P / 2.0, P * L / 8.0, 0.0, P / 2.0, -P * L / 8.0],
        P,
        L,
    );
}

#[test]
fn fixed_fixed_off_centre_point_load() {
    // AISC Manual 15th ed., Table 3-23, beam fixed at both ends, concentrated load at any
    // point: M1 = Pab²/L², M2 = Pa²b/L², R1 = Pb²(3a+b)/L³, R2 = Pa²(a+3b)/L³ (from memory).
    verify::source(
        "AISC Manual 15th ed., Table 3-23, fixed both ends, point load at any point (from memory)",
    );
    let (a, b) = (1.8, L - 1.8);
    let f = fixed_end_forces(L, &[point(a, -P)]);
    let expected = [
        0.0,
        P * b * b * (3.0 * a + b) / L.powi(3),
        P * a * b * b / (L * L),
        0.0,
        P * a * a * (a + 3.0 * b) / L.powi(3),
        -P * a * a * b / (L * L),
    ];
    check_end(&f, expected, P, L);
}

#[test]
fn fixed_fixed_concentrated_moment() {
    // closed form: a CCW couple M0 at a (b = L − a). With M(x) = −Mz_i + Fy_i·x − M0·H(x−a)
    // and both ends fixed, the M/EI diagram has zero area (θ_j − θ_i = 0) and zero first
    // moment about i (v_j − v_i − θ_i L = 0):
    //   −Mz_i·L + Fy_i·L²/2 − M0·b = 0,   −Mz_i·L²/2 + Fy_i·L³/3 − M0(L² − a²)/2 = 0,
    // so Fy_i = 6·M0·a·b/L³, Mz_i = M0·b(2a − b)/L², and from equilibrium Fy_j = −Fy_i,
    // Mz_j = M0·a(2b − a)/L².
    verify::source("closed form: moment-area conditions of a couple on a fixed-fixed beam");
    let m0 = 30.0e3;
    let (a, b) = (2.0, L - 2.0);
    let f = fixed_end_forces(L, &[LocalLoad::Moment { a, m: m0 }]);
    let r = 6.0 * m0 * a * b / L.powi(3);
    let expected = [
        0.0,
        r,
        m0 * b * (2.0 * a - b) / (L * L),
        0.0,
        -r,
        m0 * a * (2.0 * b - a) / (L * L),
    ];
    check_end(&f, expected, m0 / L, L);
}

#[test]
fn fixed_fixed_axial_loads() {
    // closed form: a bar fixed at both ends. For a point force px at a the two parts carry
    // forces with equal and opposite elongations, R_i·a = R_j·b, R_i + R_j = px, so the
    // supports exert −px·b/L at i and −px·a/L at j. A uniform axial load qx splits equally,
    // −qx·L/2 at each end.
    verify::source("closed form: compatibility of a bar fixed at both ends");
    let (px, qx, a) = (20.0e3, 3.0e3, 1.5);
    let b = L - a;
    let f = fixed_end_forces(L, &[LocalLoad::Point { a, px, py: 0.0 }]);
    check_end(&f, [-px * b / L, 0.0, 0.0, -px * a / L, 0.0, 0.0], px, L);
    let uniform = LocalLoad::Linear {
        a: 0.0,
        b: L,
        qx_a: qx,
        qy_a: 0.0,
        qx_b: qx,
        qy_b: 0.0,
    };
    let f = fixed_end_forces(L, &[uniform]);
    check_end(
        &f,
        [-qx * L / 2.0, 0.0, 0.0, -qx * L / 2.0, 0.0, 0.0],
        qx * L,
        L,
    );
}

#[test]
fn consistent_loads_are_the_exact_fixed_end_forces() {
    // closed form: with the fixed-end forces as end actions and no end displacement, the
    // deflected shape obtained by integrating v'' = M/EI from statics alone must also satisfy
    // the two remaining fixed-end conditions θ(0) = θ(L) = 0. This checks the Hermite
    // consistent loads against the exact solution for every load kind at once.
    verify::source("closed form: θ = v = 0 at fixed ends by integrating M/EI");
    let loads = [
        linear_y(0.7, 4.9, -3.0e3, -11.0e3),
        point(2.3, -P),
        LocalLoad::Moment { a: 5.1, m: 17.0e3 },
        udl(0.0, L, -W),
    ];
    let f = fixed_end_forces(L, &loads);
    let theta_scale = W * L.powi(3) / EI;
    for x in [0.0, L] {
        let (v, theta) = deflection_at(x, L, EI, &f, &loads, 0.0, 0.0);
        check("v at end", v, 0.0, theta_scale * L);
        check("θ at end", theta, 0.0, theta_scale);
    }
}

// ---------------------------------------------------------------------------------------
// End releases
// ---------------------------------------------------------------------------------------

#[test]
fn propped_cantilever_uniform_load() {
    // AISC Manual 15th ed., Table 3-23, beam fixed at one end, supported at other, uniformly
    // distributed load: R_fixed = 5wL/8, R_pinned = 3wL/8, M_fixed = wL²/8 (from memory).
    verify::source(
        "AISC Manual 15th ed., Table 3-23, fixed one end, supported other, uniform load (from memory)",
    );
    let loads = [udl(0.0, L, -W)];
    let (r5, r3, m) = (5.0 * W * L / 8.0, 3.0 * W * L / 8.0, W * L * L / 8.0);
    let fixed_i = condensed_fixed_end_forces(L, &loads, false, true);
    check_end(&fixed_i, [0.0, r5, m, 0.0, r3, 0.0], W * L, L);
    let fixed_j = condensed_fixed_end_forces(L, &loads, true, false);
    check_end(&fixed_j, [0.0, r3, 0.0, 0.0, r5, -m], W * L, L);
    // Same table, same case: maximum positive moment 9wL²/128 at 3L/8 from the pinned end
    // (from memory).
    let ext = span_extremes(L, &fixed_i, &loads);
    check("x of max M", ext.max.0, L - 3.0 * L / 8.0, L);
    check("max M", ext.max.1, 9.0 * W * L * L / 128.0, W * L * L);
    check("min M", ext.min.1, -m, W * L * L);
    verify::close("x of min M (the fixed end)", "m", ext.min.0, 0.0, 0.0);
}

#[test]
fn propped_cantilever_point_load() {
    // AISC Manual 15th ed., Table 3-23, beam fixed at one end, supported at other,
    // concentrated load at any point, a measured from the supported end, b = L − a:
    // R1 (supported) = Pb²(a + 2L)/(2L³), R2 (fixed) = Pa(3L² − a²)/(2L³),
    // M2 (fixed end) = Pab(a + L)/(2L²) (from memory). Here end i is fixed, end j pinned.
    verify::source(
        "AISC Manual 15th ed., Table 3-23, fixed one end, supported other, point load (from memory)",
    );
    let x_p = 2.2;
    let (a, b) = (L - x_p, x_p);
    let f = condensed_fixed_end_forces(L, &[point(x_p, -P)], false, true);
    let expected = [
        0.0,
        P * a * (3.0 * L * L - a * a) / (2.0 * L.powi(3)),
        P * a * b * (a + L) / (2.0 * L * L),
        0.0,
        P * b * b * (a + 2.0 * L) / (2.0 * L.powi(3)),
        0.0,
    ];
    check_end(&f, expected, P, L);
    // The released end is a true hinge of the propped beam: the deflected shape from statics
    // has zero rotation at the fixed end (closed form: compatibility of the propped beam).
    let (_, theta_i) = deflection_at(0.0, L, EI, &f, &[point(x_p, -P)], 0.0, 0.0);
    check("θ at fixed end", theta_i, 0.0, P * L * L / EI);
}

#[test]
fn simply_supported_uniform_load_moment_and_deflection() {
    // AISC Manual 15th ed., Table 3-23, simple beam, uniformly distributed load:
    // R = wL/2, M_max = wL²/8 at center, Δ_max = 5wL⁴/(384EI) at center (from memory).
    verify::source("AISC Manual 15th ed., Table 3-23, simple beam, uniform load (from memory)");
    let loads = [udl(0.0, L, -W)];
    let f = condensed_fixed_end_forces(L, &loads, true, true);
    check_end(&f, [0.0, W * L / 2.0, 0.0, 0.0, W * L / 2.0, 0.0], W * L, L);
    let st = stations(L, EI, &f, &loads, 0.0, 0.0, 11);
    assert_eq!(st.len(), 11);
    let mid = st[5];
    check("x", mid.x, L / 2.0, L);
    check("M mid", mid.m, W * L * L / 8.0, W * L * L);
    check("V mid", mid.v, 0.0, W * L);
    check(
        "Δ mid",
        mid.deflection,
        -5.0 * W * L.powi(4) / (384.0 * EI),
        W * L.powi(4) / EI,
    );
    let ext = deflection_extremes(L, EI, &f, &loads, 0.0, 0.0);
    check("x of max Δ", ext.min.0, L / 2.0, 1e-2 * L);
    check(
        "max Δ",
        ext.min.1,
        -5.0 * W * L.powi(4) / (384.0 * EI),
        W * L.powi(4) / EI,
    );
}

#[test]
fn fixed_fixed_uniform_load_deflection() {
    // AISC Manual 15th ed., Table 3-23, beam fixed at both ends, uniformly distributed load:
    // Δ_max = wL⁴/(384EI) at center (from memory).
    verify::source(
        "AISC Manual 15th ed., Table 3-23, fixed both ends, uniform load, deflection (from memory)",
    );
    let loads = [udl(0.0, L, -W)];
    let f = fixed_end_forces(L, &loads);
    let st = stations(L, EI, &f, &loads, 0.0, 0.0, 9);
    let mid = st[4];
    check(
        "Δ mid",
        mid.deflection,
        -W * L.powi(4) / (384.0 * EI),
        W * L.powi(4) / EI,
    );
    // Same table and case: moment at center wL²/24 (from memory).
    check("M mid", mid.m, W * L * L / 24.0, W * L * L);
}

#[test]
fn end_displacements_add_a_rigid_body_motion() {
    // closed form: v(x) is linear in the end displacements, so moving the supports by v_i,
    // v_j adds v_i + (v_j − v_i)·x/L to the deflected shape and nothing to the forces.
    verify::source("closed form: rigid-body motion of the supports");
    let loads = [udl(0.0, L, -W)];
    let f = condensed_fixed_end_forces(L, &loads, true, true);
    let (vi, vj) = (-0.004, 0.011);
    let moved = stations(L, EI, &f, &loads, vi, vj, 7);
    let still = stations(L, EI, &f, &loads, 0.0, 0.0, 7);
    for (m, s) in moved.iter().zip(&still) {
        check(
            "Δ",
            m.deflection,
            s.deflection + vi + (vj - vi) * m.x / L,
            0.01,
        );
        verify::close("M unchanged by the support movement", "N·m", m.m, s.m, 0.0);
    }
}

// ---------------------------------------------------------------------------------------
// Cantilever checks through given end forces
// ---------------------------------------------------------------------------------------

#[test]
fn cantilever_uniform_load_from_end_forces() {
    // A cantilever fixed at i, free at j: the wall exerts Fy_i = wL and a CCW Mz_i = wL²/2.
    // AISC Manual 15th ed., Table 3-23, cantilever beam, uniformly distributed load
    // (from memory): M_x = −w(L−x)²/2 (hogging), Δ_x = w x²(6L² − 4Lx + x²)/(24EI) measured
    // from the support, Δ_max = wL⁴/(8EI) at the free end, tip slope wL³/(6EI).
    verify::source("AISC Manual 15th ed., Table 3-23, cantilever, uniform load (from memory)");
    let loads = [udl(0.0, L, -W)];
    let end = EndForces {
        i: [0.0, W * L, W * L * L / 2.0],
        j: [0.0; 3],
    };
    let tip = -W * L.powi(4) / (8.0 * EI);
    for x in [0.0, 1.3, 3.0, 4.4, L] {
        let f = internal_forces(x, &end, &loads);
        check("M", f.m, -W * (L - x).powi(2) / 2.0, W * L * L);
        check("V", f.v, W * (L - x), W * L);
        let (v, theta) = deflection_at(x, L, EI, &end, &loads, 0.0, tip);
        let expected = -W * x * x * (6.0 * L * L - 4.0 * L * x + x * x) / (24.0 * EI);
        check("Δ", v, expected, W * L.powi(4) / EI);
        if x == 0.0 {
            check("θ at wall", theta, 0.0, W * L.powi(3) / EI);
        }
        if x == L {
            check(
                "θ at tip",
                theta,
                -W * L.powi(3) / (6.0 * EI),
                W * L.powi(3) / EI,
            );
        }
    }
}

#[test]
fn cantilever_tip_load_from_end_forces() {
    // AISC Manual 15th ed., Table 3-23, cantilever beam, concentrated load at free end
    // (from memory): M_max = PL at the support, Δ_max = PL³/(3EI), tip slope PL²/(2EI).
    verify::source("AISC Manual 15th ed., Table 3-23, cantilever, load at free end (from memory)");
    let loads = [point(L, -P)];
    let end = EndForces {
        i: [0.0, P, P * L],
        j: [0.0; 3],
    };
    let tip = -P * L.powi(3) / (3.0 * EI);
    check(
        "M at wall",
        internal_forces(0.0, &end, &loads).m,
        -P * L,
        P * L,
    );
    check("M at tip", internal_forces(L, &end, &loads).m, 0.0, P * L);
    let (_, theta0) = deflection_at(0.0, L, EI, &end, &loads, 0.0, tip);
    let (_, theta_l) = deflection_at(L, L, EI, &end, &loads, 0.0, tip);
    check("θ at wall", theta0, 0.0, P * L * L / EI);
    check("θ at tip", theta_l, -P * L * L / (2.0 * EI), P * L * L / EI);
}

// ---------------------------------------------------------------------------------------
// Span extremes and stations
// ---------------------------------------------------------------------------------------

#[test]
fn simple_beam_off_centre_point_load_extremes() {
    // AISC Manual 15th ed., Table 3-23, simple beam, concentrated load at any point:
    // M_max = Pab/L at the load (from memory).
    verify::source(
        "AISC Manual 15th ed., Table 3-23, simple beam, point load at any point (from memory)",
    );
    let (a, b) = (2.5, L - 2.5);
    let loads = [point(a, -P)];
    let f = condensed_fixed_end_forces(L, &loads, true, true);
    let ext = span_extremes(L, &f, &loads);
    verify::close("x of max M (at the load)", "m", ext.max.0, a, 0.0);
    check("M max", ext.max.1, P * a * b / L, P * L);
    check("M min", ext.min.1, 0.0, P * L);
    // Stations: two stations at the load, shear R1 = Pb/L just left, −Pa/L just right.
    let st = stations(L, EI, &f, &loads, 0.0, 0.0, 4);
    let at_load: Vec<_> = st.iter().filter(|s| s.x == a).collect();
    assert_eq!(at_load.len(), 2);
    check("V left", at_load[0].v, P * b / L, P);
    check("V right", at_load[1].v, -P * a / L, P);
    assert!(st.windows(2).all(|w| w[0].x <= w[1].x));
}

#[test]
fn simple_beam_triangular_load_extremes() {
    // AISC Manual 15th ed., Table 3-23, simple beam, load increasing uniformly to one end,
    // total load W = wL/2: M_max = 2WL/(9√3) = wL²/(9√3) at x = L/√3 from the unloaded end
    // (from memory).
    verify::source(
        "AISC Manual 15th ed., Table 3-23, simple beam, load increasing to one end (from memory)",
    );
    let loads = [linear_y(0.0, L, 0.0, -W)];
    let f = condensed_fixed_end_forces(L, &loads, true, true);
    let ext = span_extremes(L, &f, &loads);
    check("x of max M", ext.max.0, L / 3f64.sqrt(), L);
    check(
        "max M",
        ext.max.1,
        W * L * L / (9.0 * 3f64.sqrt()),
        W * L * L,
    );
}

#[test]
fn simple_beam_central_couple_extremes_on_both_sides() {
    // closed form: a simple beam with a CCW couple M0 at midspan. Moments about i:
    // Fy_j·L + M0 = 0, so Fy_j = −M0/L and Fy_i = +M0/L. Then M(x) = Fy_i·x = M0·x/L left of
    // the couple and M0·x/L − M0 = −M0(L−x)/L right of it (M = … − Σm): extremes +M0/2 just
    // left and −M0/2 just right of the couple.
    verify::source("closed form: statics of a simple beam with a central couple");
    let m0 = 40.0e3;
    let loads = [LocalLoad::Moment { a: L / 2.0, m: m0 }];
    let f = condensed_fixed_end_forces(L, &loads, true, true);
    let ext = span_extremes(L, &f, &loads);
    check("max M", ext.max.1, m0 / 2.0, m0);
    check("min M", ext.min.1, -m0 / 2.0, m0);
    verify::close("x of max M (at the couple)", "m", ext.max.0, L / 2.0, 0.0);
    verify::close("x of min M (at the couple)", "m", ext.min.0, L / 2.0, 0.0);
    let right = internal_forces_at(L / 2.0, Side::Right, &f, &loads).m;
    check("M just right", right, -m0 / 2.0, m0);
    check(
        "M just left",
        internal_forces(L / 2.0, &f, &loads).m,
        m0 / 2.0,
        m0,
    );
}

#[test]
fn fixed_fixed_uniform_load_inflection_points() {
    // common practice, no source: the inflection points of a fixed-fixed beam under uniform
    // load lie at about 0.211L from each end. closed form: M(x) = −wL²/12 + wLx/2 − wx²/2 = 0
    // gives x² − Lx + L²/6 = 0, x = L(1/2 ∓ 1/(2√3)) ≈ 0.2113L and 0.7887L.
    verify::source("common practice, no source (0.21 L); closed form x = L(1/2 ∓ 1/(2√3))");
    let loads = [udl(0.0, L, -W)];
    let f = fixed_end_forces(L, &loads);
    for x in [L * (0.5 - 0.5 / 3f64.sqrt()), L * (0.5 + 0.5 / 3f64.sqrt())] {
        check(
            "M at inflection",
            internal_forces(x, &f, &loads).m,
            0.0,
            W * L * L,
        );
    }
    check("0.2113L", 0.5 - 0.5 / 3f64.sqrt(), 0.2113, 1e6);
    let ext = span_extremes(L, &f, &loads);
    check("max M", ext.max.1, W * L * L / 24.0, W * L * L);
    check("min M", ext.min.1, -W * L * L / 12.0, W * L * L);
}

// ---------------------------------------------------------------------------------------
// Properties over random loads
// ---------------------------------------------------------------------------------------

/// SplitMix64: a small seeded generator, enough for property tests.
struct Rng(u64);

impl Rng {
    fn next_u64(&mut self) -> u64 {
        self.0 = self.0.wrapping_add(0x9E37_79B9_7F4A_7C15);
        let mut z = self.0;
        z = (z ^ (z >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
        z = (z ^ (z >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
        z ^ (z >> 31)
    }
    /// Uniform in [lo, hi).
    fn uniform(&mut self, lo: f64, hi: f64) -> f64 {
        lo + (hi - lo) * (self.next_u64() >> 11) as f64 / (1u64 << 53) as f64
    }
}

/// A random mix of 1–6 loads of every kind on a member of length `l`.
fn random_loads(rng: &mut Rng, l: f64) -> Vec<LocalLoad> {
    let count = 1 + (rng.next_u64() % 6) as usize;
    (0..count)
        .map(|_| match rng.next_u64() % 3 {
            0 => {
                let (p, q) = (rng.uniform(0.0, l), rng.uniform(0.0, l));
                LocalLoad::Linear {
                    a: p.min(q),
                    b: p.max(q),
                    qx_a: rng.uniform(-5e3, 5e3),
                    qy_a: rng.uniform(-20e3, 20e3),
                    qx_b: rng.uniform(-5e3, 5e3),
                    qy_b: rng.uniform(-20e3, 20e3),
                }
            }
            1 => LocalLoad::Point {
                a: rng.uniform(0.0, l),
                px: rng.uniform(-50e3, 50e3),
                py: rng.uniform(-50e3, 50e3),
            },
            _ => LocalLoad::Moment {
                a: rng.uniform(0.0, l),
                m: rng.uniform(-80e3, 80e3),
            },
        })
        .collect()
}

/// Resultants of the loads: `(ΣFx, ΣFy, ΣM about end i)`, by closed form per load
/// (a trapezoid's resultant (qa+qb)/2·len acts at its centroid).
fn load_resultants(loads: &[LocalLoad]) -> (f64, f64, f64) {
    loads
        .iter()
        .fold((0.0, 0.0, 0.0), |(fx, fy, m), load| match *load {
            LocalLoad::Linear {
                a,
                b,
                qx_a,
                qy_a,
                qx_b,
                qy_b,
            } => {
                let len = b - a;
                let ry = (qy_a + qy_b) / 2.0 * len;
                // ∫ q(x)·x dx = len·(qa(2a+b) + qb(a+2b))/6.
                let my = len * (qy_a * (2.0 * a + b) + qy_b * (a + 2.0 * b)) / 6.0;
                (fx + (qx_a + qx_b) / 2.0 * len, fy + ry, m + my)
            }
            LocalLoad::Point { a, px, py } => (fx + px, fy + py, m + py * a),
            LocalLoad::Moment { m: c, .. } => (fx, fy, m + c),
        })
}

#[test]
fn end_forces_balance_random_loads() {
    // closed form (statics): the end actions plus the loads are in equilibrium,
    // ΣFx = 0, ΣFy = 0, ΣM_i = Mz_i + Mz_j + Fy_j·L + Σ(load moments about i) = 0,
    // for the fixed-fixed and every released case; a released end carries no moment; and the
    // internal forces by statics from end i close on the actions at end j
    // (N(L) = Fx_j, V(L) = −Fy_j, M(L) = Mz_j).
    let mut rng = Rng(0x5EED_0001);
    const MEMBERS: usize = 200;
    for _ in 0..MEMBERS {
        let l = rng.uniform(1.0, 12.0);
        let loads = random_loads(&mut rng, l);
        let (rx, ry, rm) = load_resultants(&loads);
        let scale = 1e5 * l * l;
        for (ri, rj) in [(false, false), (true, false), (false, true), (true, true)] {
            let f = condensed_fixed_end_forces(l, &loads, ri, rj);
            let [fx_i, fy_i, mz_i] = f.i;
            let [fx_j, fy_j, mz_j] = f.j;
            check("ΣFx", fx_i + fx_j + rx, 0.0, scale);
            check("ΣFy", fy_i + fy_j + ry, 0.0, scale);
            check("ΣM", mz_i + mz_j + fy_j * l + rm, 0.0, scale * l);
            if ri {
                assert_eq!(mz_i, 0.0);
            }
            if rj {
                assert_eq!(mz_j, 0.0);
            }
            let end_j = internal_forces(l, &f, &loads);
            check("N(L)", end_j.n, fx_j, scale);
            check("V(L)", end_j.v, -fy_j, scale);
            check("M(L)", end_j.m, mz_j, scale * l);
            // A fixed (unreleased) end of a member on unyielding supports does not rotate.
            for (released, x) in [(ri, 0.0), (rj, l)] {
                if !released {
                    let (_, theta) = deflection_at(x, l, 1.0e7, &f, &loads, 0.0, 0.0);
                    check("θ at fixed end", theta, 0.0, scale * l / 1.0e7);
                }
            }
        }
    }
    verify::property(
        "member_formulas/end_forces_balance_random_loads",
        "end actions of a member under random loads (uniform, linear, point, moment, axial; \
         member_formulas' own seeded generator, 1 to 12 m) are in equilibrium with its loads, \
         fixed-fixed and with either or both ends released; a released end carries no \
         moment; the internal forces by statics close on end j; a fixed end does not rotate \
         (closed form: statics); the count is of members",
        MEMBERS,
        "largest misfit / 1e5·L² (× L for moments)",
        verify::observed(),
        "1e-10 (TOL)",
    );
}

#[test]
fn span_extremes_bound_a_dense_sample() {
    // closed form (definition of an extreme): no station of a dense sample lies outside the
    // exact extremes, and the best sample comes within the change of M over one step.
    let mut rng = Rng(0x5EED_0002);
    const MEMBERS: usize = 100;
    for _ in 0..MEMBERS {
        let l = rng.uniform(1.0, 12.0);
        let loads = random_loads(&mut rng, l);
        let f = condensed_fixed_end_forces(l, &loads, false, rng.next_u64().is_multiple_of(2));
        let ext = span_extremes(l, &f, &loads);
        check(
            "M at max",
            internal_forces_at(ext.max.0, Side::Left, &f, &loads)
                .m
                .max(internal_forces_at(ext.max.0, Side::Right, &f, &loads).m),
            ext.max.1,
            1e5 * l * l,
        );
        let n = 4000;
        let (mut hi, mut lo) = (f64::NEG_INFINITY, f64::INFINITY);
        let mut max_step = 0.0f64;
        let mut prev: Option<f64> = None;
        for k in 0..=n {
            let x = l * k as f64 / n as f64;
            let m = internal_forces(x, &f, &loads).m;
            verify::observe((m - ext.max.1).max(ext.min.1 - m) / (1e5 * l * l));
            assert!(m <= ext.max.1 + 1e-9 * 1e5 * l * l, "sample above max");
            assert!(m >= ext.min.1 - 1e-9 * 1e5 * l * l, "sample below min");
            hi = hi.max(m);
            lo = lo.min(m);
            if let Some(p) = prev {
                max_step = max_step.max((m - p).abs());
            }
            prev = Some(m);
        }
        let tol = 1e-9 * 1e5 * l * l;
        assert!(
            ext.max.1 - hi <= max_step + tol,
            "max not approached by the sample"
        );
        assert!(
            lo - ext.min.1 <= max_step + tol,
            "min not approached by the sample"
        );
    }
    verify::property(
        "member_formulas/span_extremes_bound_a_dense_sample",
        "no station of a 4000-point sample of M(x) lies outside a member's exact span extremes, \
         and the best sample comes within the change of M over one step (closed form: \
         definition of an extreme); random loads from member_formulas' own seeded generator; \
         the count is of members",
        MEMBERS,
        "largest excess of a sample over the extremes / 1e5·L² (also the misfit of M at the maximum)",
        verify::observed(),
        "1e-9 (samples), 1e-10 (M at the maximum)",
    );
}

#[test]
fn splitting_into_segments_keeps_loads_and_internal_forces() {
    // closed form: cutting a member into n segments with restrict() keeps the total force
    // and the total moment about end i (segment moments shifted by the segment start), and a
    // segment loaded with its share and given the internal forces at its start as end-i
    // actions (Fx = −N, Fy = V, Mz = −M, just right of the cut) reproduces the internal
    // forces of the whole member.
    let mut rng = Rng(0x5EED_0003);
    const MEMBERS: usize = 100;
    for _ in 0..MEMBERS {
        let l = rng.uniform(1.0, 12.0);
        let loads = random_loads(&mut rng, l);
        let f = fixed_end_forces(l, &loads);
        let n = 1 + (rng.next_u64() % 5) as usize;
        let cuts: Vec<f64> = (0..=n).map(|k| l * k as f64 / n as f64).collect();
        let parts = split_loads(&loads, &cuts);
        let (rx, ry, rm) = load_resultants(&loads);
        let (mut sx, mut sy, mut sm) = (0.0, 0.0, 0.0);
        let scale = 1e5 * l * l;
        for (k, part) in parts.iter().enumerate() {
            let x0 = cuts[k];
            let (px, py, pm) = load_resultants(part);
            sx += px;
            sy += py;
            sm += pm + py * x0;
            // Apart from the closed last segment, split_loads agrees with restrict().
            if k + 1 < n {
                let direct: Vec<_> = loads
                    .iter()
                    .filter_map(|ld| restrict(ld, x0, cuts[k + 1]))
                    .collect();
                assert_eq!(&direct, part);
            }
            let start = internal_forces_at(x0, Side::Right, &f, &loads);
            let seg_end = EndForces {
                i: [-start.n, start.v, -start.m],
                j: [0.0; 3],
            };
            for t in [0.25, 0.5, 0.9] {
                let x = (cuts[k + 1] - x0) * t;
                let whole = internal_forces(x0 + x, &f, &loads);
                let seg = internal_forces(x, &seg_end, part);
                check("N", seg.n, whole.n, scale);
                check("V", seg.v, whole.v, scale);
                check("M", seg.m, whole.m, scale * l);
            }
        }
        check("ΣFx", sx, rx, scale);
        check("ΣFy", sy, ry, scale);
        check("ΣM", sm, rm, scale * l);
    }
    verify::property(
        "member_formulas/splitting_into_segments_keeps_loads_and_internal_forces",
        "cutting a member under random loads into 1 to 5 segments keeps the total force and \
         the total moment about end i, and each segment with its share of the loads and the \
         internal forces at its start reproduces the whole member's internal forces (closed \
         form: statics); member_formulas' own seeded generator; the count is of members",
        MEMBERS,
        "largest misfit / 1e5·L² (× L for moments)",
        verify::observed(),
        "1e-10 (TOL)",
    );
}

#[test]
fn transverse_load_detection_for_cm() {
    // common practice, no source: Cm = 1.0 is taken for members with transverse loading
    // between supports; axial loads alone do not count.
    verify::source("common practice, no source: Cm = 1.0 for transverse loading between supports");
    verify::same(
        "a uniform transverse load counts as transverse loading",
        true,
        has_transverse_load(&[udl(0.0, L, -W)]),
    );
    verify::same(
        "an axial point load counts as transverse loading",
        false,
        has_transverse_load(&[LocalLoad::Point {
            a: 2.0,
            px: -P,
            py: 0.0,
        }]),
    );
}
