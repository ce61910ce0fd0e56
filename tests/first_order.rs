//! First-order solutions of whole frames against closed forms and handbook formulas.
//! Each check names its source beside it.

mod common;

use common::{Frame, portal, verify};
use plumbline::model::{ActionCategory, LoadDirection, Restraint};
use plumbline::solve::beam::internal_forces;
use plumbline::solve::sway::SwaySplit;
use plumbline::solve::{FirstOrder, SystemError, solve_case};
use plumbline::stories::stories;

/// Relative tolerance for closed forms that neglect axial shortening (A is made large).
const AXIAL_RIGID: f64 = 1e-5;

/// Internal moment at the start (x = 0) and end (x = L) of member `m` (sagging positive).
fn end_moments(f: &plumbline::solve::Solution, m: usize) -> (f64, f64) {
    let e = &f.end_forces[m];
    (-e.i[2], e.j[2])
}

#[test]
fn fixed_base_portal_under_beam_udl() {
    // Closed form, reference notes §10.1 [C + X]: k = (Ib/Ic)(h/L); knee moment
    // wL²/(6(k+2)) hogging, base moment wL²/(12(k+2)) of opposite sense.
    // h = 4, L = 8, Ib = 2Ic → k = 1; w = 1 kN/m → 3.556 / 1.778 kN·m.
    verify::source(
        "closed form, reference notes §10.1 [C + X]: knee wL²/(6(k+2)), base wL²/(12(k+2))",
    );
    let (mut f, [_, _, _, _, c1, b, _]) = portal(8.0, 4.0, 1e-4, 2e-4, true);
    let d = f.case("D", ActionCategory::Dead);
    f.udl(d, b, 1000.0, LoadDirection::Gravity);
    let s = solve_case(&f.model, d).unwrap();
    let k = 1.0;
    let w = 1000.0;
    let knee = w * 64.0 / (6.0 * (k + 2.0));
    let base = w * 64.0 / (12.0 * (k + 2.0));
    let (m0, m1) = end_moments(&s, b);
    verify::close(
        "fixed-base portal, beam UDL: knee moment, left",
        "N·m",
        m0,
        -knee,
        AXIAL_RIGID,
    );
    verify::close(
        "fixed-base portal, beam UDL: knee moment, right",
        "N·m",
        m1,
        -knee,
        AXIAL_RIGID,
    );
    let (c0, _) = end_moments(&s, c1);
    verify::close(
        "fixed-base portal, beam UDL: base moment",
        "N·m",
        c0.abs(),
        base,
        AXIAL_RIGID,
    );
    assert!(s.residual.relative() < 1e-9, "residual {:?}", s.residual);
}

#[test]
fn pinned_base_portal_under_beam_udl() {
    // Closed form, reference notes §10.1 [M + X]: knee moment wL²/(4(2k+3)), k = 1 → 3.2 w.
    verify::source("closed form, reference notes §10.1 [M + X]: knee wL²/(4(2k+3)), thrust Mc/h");
    let (mut f, [_, _, _, _, _, b, _]) = portal(8.0, 4.0, 1e-4, 2e-4, false);
    let d = f.case("D", ActionCategory::Dead);
    f.udl(d, b, 1000.0, LoadDirection::Gravity);
    let s = solve_case(&f.model, d).unwrap();
    let (m0, _) = end_moments(&s, b);
    verify::close(
        "pinned-base portal, beam UDL: knee moment",
        "N·m",
        m0,
        -3200.0,
        AXIAL_RIGID,
    );
    // Thrust H = Mc/h at each base (same source).
    verify::close(
        "pinned-base portal, beam UDL: base thrust",
        "N",
        s.reactions[0][0].abs(),
        3200.0 / 4.0,
        AXIAL_RIGID,
    );
}

#[test]
fn fixed_base_portal_under_lateral_load() {
    // Closed form by slope-deflection, reference notes §10.1 [M + X]:
    // knee 3kPh/(2(6k+1)), base (3k+1)Ph/(2(6k+1)); k = 1, P = 1 kN, h = 4 →
    // 0.857 / 1.143 kN·m.
    verify::source("closed form by slope-deflection, reference notes §10.1 [M + X]");
    let (mut f, [_, n1, _, _, c1, _, c2]) = portal(8.0, 4.0, 1e-4, 2e-4, true);
    let w = f.case("W", ActionCategory::Wind);
    f.nodal(w, n1, 1000.0, 0.0, 0.0);
    let s = solve_case(&f.model, w).unwrap();
    let knee = 3.0 * 1000.0 * 4.0 / (2.0 * 7.0);
    let base = 4.0 * 1000.0 * 4.0 / (2.0 * 7.0);
    for c in [c1, c2] {
        let (m_base, m_top) = end_moments(&s, c);
        verify::close(
            "fixed-base portal, lateral load: base moment (each column)",
            "N·m",
            m_base.abs(),
            base,
            1e-4,
        );
        verify::close(
            "fixed-base portal, lateral load: knee moment (each column)",
            "N·m",
            m_top.abs(),
            knee,
            1e-4,
        );
    }
}

#[test]
fn pinned_base_portal_under_lateral_load() {
    // Closed form, reference notes §10.1 [C + X]: knee moment Ph/2, base shears P/2,
    // column axial forces ±Ph/L.
    verify::source(
        "closed form, reference notes §10.1 [C + X]: knee Ph/2, base shears P/2, axial ±Ph/L",
    );
    let (mut f, [n0, n1, _, n3, c1, _, _]) = portal(8.0, 4.0, 1e-4, 2e-4, false);
    let w = f.case("W", ActionCategory::Wind);
    f.nodal(w, n1, 1000.0, 0.0, 0.0);
    let s = solve_case(&f.model, w).unwrap();
    let (_, m_top) = end_moments(&s, c1);
    verify::close(
        "pinned-base portal, lateral load: knee moment",
        "N·m",
        m_top.abs(),
        2000.0,
        1e-4,
    );
    verify::close("base shear, left", "N", s.reactions[n0][0], -500.0, 1e-4);
    verify::close("base shear, right", "N", s.reactions[n3][0], -500.0, 1e-4);
    verify::close(
        "column axial force",
        "N",
        s.reactions[n0][1].abs(),
        500.0,
        1e-4,
    );
}

#[test]
fn propped_cantilever_under_udl() {
    // AISC Steel Construction Manual, 15th ed., Table 3-23 case 12, beam fixed at one end
    // and supported at the other (from memory): M_fixed = wL²/8, R_prop = 3wL/8.
    verify::source("AISC Manual 15th ed., Table 3-23 case 12 (from memory): R = 3wL/8, M = wL²/8");
    let mut f = Frame::new();
    let a = f.node(0.0, 0.0);
    let b = f.node(6.0, 0.0);
    let m = f.member(a, b, 200e9, 0.01, 2e-4);
    f.fixed(a);
    f.support(b, [Restraint::Free, Restraint::Fixed, Restraint::Free]);
    let d = f.case("D", ActionCategory::Dead);
    f.udl(d, m, 2000.0, LoadDirection::Gravity);
    let s = solve_case(&f.model, d).unwrap();
    verify::close(
        "propped cantilever: prop reaction",
        "N",
        s.reactions[b][1],
        3.0 * 2000.0 * 6.0 / 8.0,
        1e-10,
    );
    verify::close(
        "propped cantilever: fixed-end moment",
        "N·m",
        s.reactions[a][2],
        2000.0 * 36.0 / 8.0,
        1e-10,
    );
}

#[test]
fn two_span_continuous_beam_under_udl() {
    // AISC Steel Construction Manual, 15th ed., Table 3-23 case 29, continuous beam of two
    // equal spans, uniform load (from memory): interior support moment wL²/8, end
    // reactions 3wL/8, interior reaction 10wL/8.
    verify::source("AISC Manual 15th ed., Table 3-23 case 29 (from memory): 3wL/8, 10wL/8, wL²/8");
    let mut f = Frame::new();
    let n: Vec<usize> = (0..3).map(|k| f.node(5.0 * k as f64, 0.0)).collect();
    let m1 = f.member(n[0], n[1], 200e9, 0.01, 3e-4);
    let m2 = f.member(n[1], n[2], 200e9, 0.01, 3e-4);
    f.pinned(n[0]);
    f.support(n[1], [Restraint::Free, Restraint::Fixed, Restraint::Free]);
    f.support(n[2], [Restraint::Free, Restraint::Fixed, Restraint::Free]);
    let d = f.case("D", ActionCategory::Dead);
    f.udl(d, m1, 4000.0, LoadDirection::Gravity);
    f.udl(d, m2, 4000.0, LoadDirection::Gravity);
    let s = solve_case(&f.model, d).unwrap();
    let (w, l) = (4000.0, 5.0);
    verify::close(
        "two-span beam: end reaction",
        "N",
        s.reactions[n[0]][1],
        3.0 * w * l / 8.0,
        1e-10,
    );
    verify::close(
        "two-span beam: interior reaction",
        "N",
        s.reactions[n[1]][1],
        10.0 * w * l / 8.0,
        1e-10,
    );
    let (_, m_support) = end_moments(&s, m1);
    verify::close(
        "two-span beam: interior support moment",
        "N·m",
        m_support,
        -w * l * l / 8.0,
        1e-10,
    );
}

#[test]
fn braced_column_with_fixed_base_has_inflection_at_one_third() {
    // Common practice, no source (carry-over factor 1/2 to a fixed far end): a column held
    // against sway with a fixed base, loaded only by its top moment, has zero moment at
    // h/3 above the base.
    let (mut f, [_, _, _, _, c1, b, _]) = portal(8.0, 4.0, 1e-4, 2e-4, true);
    let d = f.case("D", ActionCategory::Dead);
    f.udl(d, b, 1000.0, LoadDirection::Gravity);
    let st = stories(&f.model).unwrap();
    let split = SwaySplit::new(&f.model, &st).unwrap();
    let parts = split.split_case(&f.model, d).unwrap();
    let m = internal_forces(4.0 / 3.0, &parts.no_sway.end_forces[c1], &[]).m;
    let (_, m_top) = end_moments(&parts.no_sway, c1);
    verify::source("common practice, no source (carry-over factor 1/2 to a fixed far end)");
    verify::within(
        "no-sway moment at h/3 above the fixed base, against the top moment",
        "N·m",
        m,
        0.0,
        m_top.abs(),
        AXIAL_RIGID,
    );
}

#[test]
fn symmetric_frame_under_symmetric_gravity_does_not_sway() {
    // Common practice, no source: symmetry. The sway part vanishes and the free frame's
    // beam-level nodes do not translate sideways.
    let (mut f, [_, n1, n2, _, _, b, _]) = portal(8.0, 4.0, 1e-4, 2e-4, true);
    let d = f.case("D", ActionCategory::Dead);
    f.udl(d, b, 1000.0, LoadDirection::Gravity);
    let st = stories(&f.model).unwrap();
    let split = SwaySplit::new(&f.model, &st).unwrap();
    let parts = split.split_case(&f.model, d).unwrap();
    let peak = parts
        .no_sway
        .end_forces
        .iter()
        .map(|e| e.i[2].abs())
        .fold(0.0, f64::max);
    verify::source("common practice, no source: symmetry");
    let worst = parts
        .sway
        .end_forces
        .iter()
        .flat_map(|e| [e.i[2].abs(), e.j[2].abs()])
        .fold(0.0, f64::max);
    verify::within(
        "largest sway-part end moment, against the largest no-sway end moment",
        "N·m",
        worst,
        0.0,
        peak,
        1e-9,
    );
    let s = solve_case(&f.model, d).unwrap();
    // Both knees move by the beam's axial shortening only, equal and opposite (absolute
    // 1e-15 m, as before).
    verify::within(
        "X displacement of the right knee, against minus the left knee's",
        "m",
        s.displacements[n2][0],
        -s.displacements[n1][0],
        1.0,
        1e-15,
    );
}

#[test]
fn no_sway_plus_sway_equals_free_frame() {
    // Superposition (closed form): held solution + reversed holding forces on the free
    // frame = free solution, to round-off. Unsymmetric two-story frame, mixed loads.
    let mut f = Frame::new();
    let e = 200e9;
    let base = [f.node(0.0, 0.0), f.node(6.0, 0.0), f.node(13.0, 0.0)];
    let l1 = [f.node(0.0, 4.0), f.node(6.0, 4.0), f.node(13.0, 4.0)];
    let l2 = [f.node(0.0, 7.5), f.node(6.0, 7.5)];
    let mut cols = vec![];
    for k in 0..3 {
        cols.push(f.member(base[k], l1[k], e, 0.012, 2.0e-4 + 1e-5 * k as f64));
    }
    for k in 0..2 {
        cols.push(f.member(l1[k], l2[k], e, 0.010, 1.5e-4));
    }
    let b1 = f.member(l1[0], l1[1], e, 0.008, 3e-4);
    let b2 = f.member(l1[1], l1[2], e, 0.008, 4e-4);
    let b3 = f.member(l2[0], l2[1], e, 0.007, 2e-4);
    f.fixed(base[0]);
    f.pinned(base[1]);
    f.fixed(base[2]);
    let c = f.case("mixed", ActionCategory::Wind);
    f.udl(c, b1, 9000.0, LoadDirection::Gravity);
    f.udl(c, b2, 5000.0, LoadDirection::Gravity);
    f.udl(c, b3, 3000.0, LoadDirection::Gravity);
    f.udl(c, cols[0], 1500.0, LoadDirection::GlobalX);
    f.nodal(c, l2[0], 4000.0, 0.0, 0.0);
    let st = stories(&f.model).unwrap();
    let split = SwaySplit::new(&f.model, &st).unwrap();
    let parts = split.split_case(&f.model, c).unwrap();
    // The no-sway solution holds every level: its mean X translation is zero.
    verify::source(
        "definition of the split: the no-sway part holds every level's mean X translation",
    );
    for (k, nodes) in split.level_nodes.iter().enumerate() {
        verify::within(
            &format!("no-sway part: mean X translation of level {}", k + 1),
            "m",
            plumbline::solve::sway::mean_ux(&parts.no_sway, nodes),
            0.0,
            1.0,
            1e-15,
        );
    }
    let total = parts.total();
    let free = FirstOrder::new(&f.model, &[])
        .unwrap()
        .solve_case(&f.model, c)
        .unwrap();
    let scale = free
        .end_forces
        .iter()
        .flat_map(|e| e.to_array())
        .map(f64::abs)
        .fold(0.0, f64::max);
    let mut worst = (0.0f64, 0.0f64);
    for (a, b) in total.end_forces.iter().zip(&free.end_forces) {
        for (x, y) in a.to_array().iter().zip(b.to_array()) {
            worst.0 = worst.0.max((x - y).abs());
            assert!((x - y).abs() <= 1e-9 * scale, "{x} vs {y}");
        }
    }
    for (a, b) in total.reactions.iter().zip(&free.reactions) {
        for k in 0..3 {
            worst.1 = worst.1.max((a[k] - b[k]).abs());
            assert!((a[k] - b[k]).abs() <= 1e-9 * scale);
        }
    }
    verify::source(
        "closed form: superposition, held solution + reversed holding forces = free frame",
    );
    verify::within(
        "largest |no-sway + sway − free| end force, against the largest end force",
        "N, N·m",
        worst.0,
        0.0,
        scale,
        1e-9,
    );
    verify::within(
        "largest |no-sway + sway − free| reaction, against the largest end force",
        "N, N·m",
        worst.1,
        0.0,
        scale,
        1e-9,
    );
}

#[test]
fn maxwell_betti_reciprocity_on_a_random_frame() {
    // Maxwell–Betti reciprocal theorem (closed form): the X displacement at A due to a
    // unit Y force at B equals the Y displacement at B due to a unit X force at A.
    verify::source("closed form: Maxwell–Betti reciprocal theorem");
    let mut seed: u64 = 12345;
    let mut rnd = move || {
        seed = seed
            .wrapping_mul(6364136223846793005)
            .wrapping_add(1442695040888963407);
        (seed >> 11) as f64 / (1u64 << 53) as f64
    };
    let mut f = Frame::new();
    let mut grid = vec![];
    for lv in 0..3 {
        for col in 0..3 {
            grid.push(f.node(5.0 * col as f64 + rnd() * 0.5, 3.5 * lv as f64));
        }
    }
    for lv in 0..2 {
        for col in 0..3 {
            f.member(
                grid[lv * 3 + col],
                grid[(lv + 1) * 3 + col],
                200e9,
                0.01,
                1e-4 * (1.0 + rnd()),
            );
        }
        for col in 0..2 {
            let (i, j) = (grid[(lv + 1) * 3 + col], grid[(lv + 1) * 3 + col + 1]);
            f.member(i, j, 200e9, 0.01, 2e-4 * (1.0 + rnd()));
        }
    }
    for &n in &grid[..3] {
        f.fixed(n);
    }
    let (a, b) = (grid[4], grid[8]);
    let ca = f.case("A", ActionCategory::Live);
    f.nodal(ca, a, 1.0, 0.0, 0.0);
    let cb = f.case("B", ActionCategory::Live);
    f.nodal(cb, b, 0.0, 1.0, 0.0);
    let sys = FirstOrder::new(&f.model, &[]).unwrap();
    let sa = sys.solve_case(&f.model, ca).unwrap();
    let sb = sys.solve_case(&f.model, cb).unwrap();
    verify::close(
        "reciprocal displacements u_B,y(X at A) = u_A,x(Y at B)",
        "m/N",
        sa.displacements[b][1],
        sb.displacements[a][0],
        1e-9,
    );
}

#[test]
fn a_mechanism_is_an_error_naming_the_free_direction() {
    // A pinned-base portal whose beam is pinned at both ends sways freely.
    let (mut f, [_, _, _, _, _, b, _]) = portal(8.0, 4.0, 1e-4, 2e-4, false);
    f.release(b, true, true);
    let err = FirstOrder::new(&f.model, &[]).unwrap_err();
    match &err {
        SystemError::Mechanism(free) => {
            assert!(!free.is_empty());
            assert!(err.to_string().contains("in X"), "{err}");
        }
        other => panic!("expected a mechanism, got {other:?}"),
    }
}
