//! The `check` job (no-sway/sway split, story figures, amplifiers, classification,
//! notional loads) against hand calculations and closed forms. Each check names its
//! source beside it.

mod common;

use common::{only_case, strength};

use std::f64::consts::PI;

use common::{Frame, portal, verify};
use plumbline::check::{Classification, check};
use plumbline::combos::Basis;
use plumbline::model::{
    ActionCategory, LoadDirection, NotionalLoads, Restraint, SecondOrderMethod, StiffnessPreset,
};
use plumbline::solve::solve_case;
use plumbline::stories::stories;

const KIP: f64 = 4448.2216152605; // N, exact from 1 lbf = 4.4482216152605 N
const INCH: f64 = 0.0254; // m, exact
const KSI: f64 = KIP / (INCH * INCH);
const E_STEEL: f64 = 200e9; // E used by `common::portal`

/// Tolerance for story figures whose closed forms neglect axial deformation: the member
/// areas are raised to 1000 m², so the column shortening under overturning changes the
/// drift by about 2h³K/(L²EA) ≈ 1e-7 of itself (derived in `stiff_portal`).
const AXIAL_RIGID: f64 = 1e-6;

/// Lateral stiffness H/Δ of a single-bay portal, closed form by slope-deflection (no
/// book at hand; derived here). Kc = EIc/h, Kb = EIb/L, k = Kb/Kc = (Ib/Ic)(h/L),
/// ψ = Δ/h, both knees rotate by θ (antisymmetric sway, beam end moment 6Kb·θ):
/// * fixed bases: column top 2Kc(2θ − 3ψ), base 2Kc(θ − 3ψ); knee equilibrium
///   2Kc(2θ − 3ψ) + 6Kb·θ = 0 → θ = 3ψ/(3k + 2); story shear
///   H = 2·2Kc(6ψ − 3θ)/h = (12EIc/h³)·Δ·(6k + 1)/(3k + 2), i.e.
///   **H/Δ = (24EIc/h³)·(6k + 1)/(6k + 4)** → 2·12EIc/h³ as k → ∞;
/// * pinned bases: column top 3Kc(θ − ψ); 3Kc(θ − ψ) + 6Kb·θ = 0 → θ = ψ/(2k + 1);
///   H = 2·3Kc(ψ − θ)/h, i.e. **H/Δ = (6EIc/h³)·2k/(2k + 1)** → 2·3EIc/h³ as k → ∞.
fn portal_stiffness(e: f64, ic: f64, ib: f64, h: f64, l: f64, fixed: bool) -> f64 {
    let k = (ib / ic) * (h / l);
    if fixed {
        24.0 * e * ic / h.powi(3) * (6.0 * k + 1.0) / (6.0 * k + 4.0)
    } else {
        6.0 * e * ic / h.powi(3) * 2.0 * k / (2.0 * k + 1.0)
    }
}

/// A portal (`common::portal`) with every area raised to 1000 m²: under a lateral load H
/// the columns carry ±H·h/L and shorten by H·h²/(L·EA), tilting the beam and adding
/// about 2H·h³/(L²·EA) to the drift, a fraction 2h³K/(L²EA) ≈ 1e-7 of Δ = H/K for the
/// frames below (closed form).
fn stiff_portal(l: f64, h: f64, ic: f64, ib: f64, fixed: bool) -> (Frame, [usize; 7]) {
    let (mut f, ids) = portal(l, h, ic, ib, fixed);
    for s in &mut f.model.sections {
        s.area = 1000.0;
    }
    f.model.analysis.notional = NotionalLoads::None;
    (f, ids)
}

#[test]
fn q_b2_and_alpha_cr_of_a_one_story_portal_by_hand() {
    // Hand calculation, one story, h = 4 m, L = 6 m, Ic = 1e-4 m⁴, Ib = 1000·Ic,
    // E = 200 GPa: k = 1000·4/6 = 666.7, so H/Δ is within 0.1 % of the rigid-beam values
    // 2·12EIc/h³ = 7.5e6 N/m (fixed) and 2·3EIc/h³ = 1.875e6 N/m (pinned); the exact
    // slope-deflection value of `portal_stiffness` is compared to 1e-6.
    // Loads: gravity P at each knee, lateral H = 20 kN split between the knees.
    //   ΣP = 2P; Δ = H/(H/Δ);
    //   Q = ΣP·Δ/(H·h)                 (ACI 318-19 6.6.4.4.1)
    //   RM = 1 − 0.15·Pmf/Pstory = 0.85 (AISC 360-16 A-8-8, both columns moment-frame)
    //   Pe,story = RM·H·h/Δ            (AISC 360-16 A-8-7)
    //   B2 = 1/(1 − 1.0·ΣP/Pe,story)   (AISC 360-16 A-8-6, α = 1.0 on strength basis)
    //   α_cr = (H/ΣP)·(h/Δ)            (EN 1993-1-1:2005 (5.2))
    // Fixed, P = 1.5 MN: ΣP = 3 MN, H·h/Δ ≈ 3.0e7 N → Q ≈ 0.100, α_cr ≈ 10.0,
    //   Pe,story ≈ 25.5 MN, B2 ≈ 1.133.
    // Pinned, P = 0.3 MN: ΣP = 0.6 MN, H·h/Δ ≈ 7.5e6 N → Q ≈ 0.080, α_cr ≈ 12.5,
    //   Pe,story ≈ 6.37 MN, B2 ≈ 1.104.
    verify::source(
        "AISC 360-16 App. 8 eqs. A-8-6, A-8-7; ACI 318-19 eq. (6.6.4.4.1); EN 1993-1-1:2005 eq. (5.2) (from memory); closed form of the portal's H/Δ by slope-deflection, by hand",
    );
    let (l, h, ic) = (6.0, 4.0, 1e-4);
    let hl = 20e3;
    for (fixed, p, q_approx) in [(true, 1.5e6, 0.100), (false, 0.3e6, 0.080)] {
        let (mut f, [_, n1, n2, _, _, _, _]) = stiff_portal(l, h, ic, 1000.0 * ic, fixed);
        let d = f.case("D", ActionCategory::Dead);
        f.nodal(d, n1, 0.0, -p, 0.0);
        f.nodal(d, n2, 0.0, -p, 0.0);
        let w = f.case("W", ActionCategory::Wind);
        f.nodal(w, n1, 0.5 * hl, 0.0, 0.0);
        f.nodal(w, n2, 0.5 * hl, 0.0, 0.0);
        let case = only_case(&f.model, &strength("D+W", &[(d, 1.0), (w, 1.0)]));
        let s = &case.stories[0];

        let k_story = portal_stiffness(E_STEEL, ic, 1000.0 * ic, h, l, fixed);
        let sum_p = 2.0 * p;
        let delta = hl / k_story;
        let q = sum_p * delta / (hl * h);
        let pe = 0.85 * hl * h / delta;
        let b2 = 1.0 / (1.0 - sum_p / pe);
        let alpha_cr = (hl / sum_p) * (h / delta);

        verify::close(
            &format!("ΣP, fixed bases = {fixed}"),
            "N",
            s.sum_p,
            sum_p,
            AXIAL_RIGID,
        );
        verify::close(
            &format!("story shear H, fixed bases = {fixed}"),
            "N",
            s.shear,
            hl,
            AXIAL_RIGID,
        );
        verify::close(
            &format!("story drift Δ, fixed bases = {fixed}"),
            "m",
            s.drift,
            delta,
            AXIAL_RIGID,
        );
        verify::close(
            &format!("story stiffness H/Δ, fixed bases = {fixed}"),
            "N/m",
            s.stiffness,
            k_story,
            AXIAL_RIGID,
        );
        verify::close(
            &format!("RM = 0.85, fixed bases = {fixed}"),
            "-",
            s.r_m,
            0.85,
            1e-12,
        );
        verify::close(
            &format!("Pe,story = RM·(H/Δ)·L, fixed bases = {fixed}"),
            "N",
            s.p_e_story,
            pe,
            AXIAL_RIGID,
        );
        verify::close(
            &format!("stability index Q = ΣP·Δ/(V·h), fixed bases = {fixed}"),
            "-",
            s.q_index,
            q,
            AXIAL_RIGID,
        );
        verify::close(
            &format!("Q by hand, fixed bases = {fixed}"),
            "-",
            s.q_index,
            q_approx,
            2e-3,
        );
        verify::close(
            &format!("B2 = 1/(1 − ΣP/Pe,story), fixed bases = {fixed}"),
            "-",
            s.b2.unwrap(),
            b2,
            AXIAL_RIGID,
        );
        verify::close(
            &format!("story α_cr = (H/Δ)·h/ΣP, fixed bases = {fixed}"),
            "-",
            s.alpha_cr_story,
            alpha_cr,
            AXIAL_RIGID,
        );
        // δs = 1/(1 − Q) (ACI 318-19 6.6.4.6.2(a)), below the 1.5 limit.
        verify::close(
            &format!("δs = 1/(1 − Q), fixed bases = {fixed}"),
            "-",
            s.delta_s_q.unwrap(),
            1.0 / (1.0 - q),
            1e-6,
        );
        // With Ib = 1000·Ic the rigid-beam values hold within 0.1 % (closed form limit).
        let rigid = if fixed { 24.0 } else { 6.0 } * E_STEEL * ic / h.powi(3);
        verify::close(
            &format!("H/Δ against the rigid-beam value, fixed bases = {fixed}"),
            "N/m",
            s.stiffness,
            rigid,
            1e-3,
        );
        // The case's own sway gave the stiffness; B2 ≥ 1.1 → sway (fixed: 1.133;
        // pinned: 1.104, both above the 1.10 of AISC 360-16 App. 7.2.3(b), from memory).
        verify::same(
            &format!("classification (B2 above 1.1), fixed bases = {fixed}"),
            Classification::Sway,
            s.classification,
        );
    }
}

/// A symmetric two-bay, two-story frame with fixed bases (bays 6 m, stories 4 m and
/// 3.5 m) and a gravity case of uniform load on every beam. Returns the frame and the
/// gravity case.
fn symmetric_frame() -> (Frame, usize) {
    let mut f = Frame::new();
    let (e, a) = (E_STEEL, 1e-2);
    let xs = [0.0, 6.0, 12.0];
    let ys = [0.0, 4.0, 7.5];
    let grid: Vec<Vec<usize>> = ys
        .iter()
        .map(|&y| xs.iter().map(|&x| f.node(x, y)).collect())
        .collect();
    for &base in &grid[0] {
        f.fixed(base);
    }
    let mut beams = Vec::new();
    for pair in grid.windows(2) {
        let (below, above) = (&pair[0], &pair[1]);
        for (c, (&bottom, &top)) in below.iter().zip(above).enumerate() {
            // Interior columns stiffer than exterior ones, symmetric about the middle.
            let ic = if c == 1 { 3e-4 } else { 2e-4 };
            f.member(bottom, top, e, a, ic);
        }
        for span in above.windows(2) {
            beams.push(f.member(span[0], span[1], e, a, 4e-4));
        }
    }
    let g = f.case("D", ActionCategory::Dead);
    for &b in &beams {
        f.udl(g, b, 30e3, LoadDirection::Gravity);
    }
    f.model.analysis.notional = NotionalLoads::None;
    (f, g)
}

#[test]
fn no_sway_plus_sway_is_the_first_order_total() {
    // Superposition (closed form: the first-order response is linear in the loads): for
    // every member of a factored case of the demo office frame, no-sway + sway at both
    // ends equals the moment of the free frame solved load case by load case and
    // combined by the factors.
    let path = concat!(env!("CARGO_MANIFEST_DIR"), "/examples/office-3story.toml");
    let mut model = plumbline::input::load_model(std::path::Path::new(path)).unwrap();
    model.analysis.notional = NotionalLoads::None;
    let idx = |id: &str| model.case_index(id).unwrap();
    let factors = [(idx("D"), 1.2), (idx("L"), 1.0), (idx("WL"), 1.0)];
    let case = only_case(&model, &strength("1.2D+1.0L+1.0WL", &factors));
    let solved: Vec<_> = factors
        .iter()
        .map(|&(k, f)| (f, solve_case(&model, k).unwrap()))
        .collect();
    let mut largest = 0.0f64;
    // The largest differences seen, each over the scale its assertion uses.
    let (mut worst_sum, mut worst_axial) = (0.0f64, 0.0f64);
    for (m, mc) in case.members.iter().enumerate() {
        assert_eq!(mc.member, model.members[m].id);
        let mi: f64 = solved.iter().map(|(f, s)| -f * s.end_forces[m].i[2]).sum();
        let mj: f64 = solved.iter().map(|(f, s)| f * s.end_forces[m].j[2]).sum();
        largest = largest.max(mi.abs()).max(mj.abs());
        for (end, want) in mc.ends.iter().zip([mi, mj]) {
            worst_sum = worst_sum.max((end.no_sway + end.sway - want).abs() / largest.max(1.0));
            assert!(
                (end.no_sway + end.sway - want).abs() <= 1e-9 * largest.max(1.0),
                "{}: {} + {} vs {want}",
                mc.member,
                end.no_sway,
                end.sway
            );
            assert_eq!(end.first_order, end.no_sway + end.sway);
        }
        // The wind case makes both parts non-trivial somewhere.
        let ni: f64 = solved.iter().map(|(f, s)| -f * s.end_forces[m].i[0]).sum();
        let nj: f64 = solved.iter().map(|(f, s)| f * s.end_forces[m].j[0]).sum();
        // `axial` is N at the most compressed section: N(x) = −Fx_i − Σpx is monotonic
        // along a member whose axial loads have one sign, so it is the lesser end value
        // (closed form).
        worst_axial = worst_axial.max((mc.axial - ni.min(nj)).abs() / ni.abs().max(1e3));
        assert!((mc.axial - ni.min(nj)).abs() <= 1e-9 * ni.abs().max(1e3));
    }
    verify::source("closed form: superposition, the first-order response is linear in the loads");
    verify::close(
        &format!(
            "largest |no-sway + sway − free-frame moment| / largest end moment, {} member ends",
            2 * case.members.len()
        ),
        "-",
        worst_sum,
        0.0,
        1e-9,
    );
    verify::source("closed form: N(x) is monotonic along a member whose axial loads have one sign");
    verify::close(
        &format!(
            "largest |axial − lesser end value| / max(|N_i|, 1 kN), {} members",
            case.members.len()
        ),
        "-",
        worst_axial,
        0.0,
        1e-9,
    );
    assert!(
        case.members
            .iter()
            .any(|m| m.ends[0].sway.abs() > 1e-3 * largest)
    );
    assert!(
        case.members
            .iter()
            .any(|m| m.ends[0].no_sway.abs() > 1e-3 * largest)
    );
}

#[test]
fn symmetric_frame_under_symmetric_gravity_has_no_sway_part() {
    // Common practice, no source (a fact of the trade): a symmetric frame under
    // symmetric gravity load does not sway, so its sway part vanishes and the story is
    // non-sway under both AISC 360-16 App. 8 (B2 ≤ 1.1, from the gravity-pattern
    // stiffness) and ACI 318-19 6.6.4.3(b) (Q ≤ 0.05).
    let (f, g) = symmetric_frame();
    verify::source(
        "common practice, no source: a symmetric frame under symmetric gravity does not sway; AISC 360-16 App. 8 B2 ≤ 1.1, ACI 318-19 6.6.4.3(b) Q ≤ 0.05 (from memory)",
    );
    for method in [SecondOrderMethod::AiscB1B2, SecondOrderMethod::AciMagnifier] {
        let mut model = f.model.clone();
        model.analysis.method = method;
        let case = only_case(&model, &strength("1.4D", &[(g, 1.4)]));
        let largest = case
            .members
            .iter()
            .flat_map(|m| m.ends.iter().map(|e| e.no_sway.abs()))
            .fold(0.0, f64::max);
        assert!(largest > 1e4, "gravity moments expected");
        let mut worst = 0.0f64;
        for m in &case.members {
            for e in &m.ends {
                worst = worst.max(e.sway.abs() / largest);
                assert!(
                    e.sway.abs() <= 1e-9 * largest,
                    "{method}: {} sway {}",
                    m.member,
                    e.sway
                );
            }
        }
        verify::close(
            &format!("{method}: largest |sway part| / largest no-sway end moment"),
            "-",
            worst,
            0.0,
            1e-9,
        );
        for s in &case.stories {
            verify::within(
                &format!("{method}, story {}: story shear, against ΣP", s.story),
                "N",
                s.shear,
                0.0,
                s.sum_p,
                1e-9,
            );
            verify::same(
                &format!("{method}, story {}: classification", s.story),
                Classification::NonSway,
                s.classification,
            );
            verify::between(
                &format!("{method}, story {}: Q, at most 0.05", s.story),
                "-",
                s.q_index,
                0.05,
                f64::NEG_INFINITY,
                0.0,
            );
            verify::between(
                &format!("{method}, story {}: B2, at most 1.1", s.story),
                "-",
                s.b2.unwrap(),
                1.1,
                f64::NEG_INFINITY,
                0.0,
            );
        }
        assert!(case.notional.iter().all(|&n| n == 0.0));
        assert!(case.stable);
    }
}

/// W14x48 about its strong axis (AISC 360-16 Commentary Chapter C benchmarks,
/// reference notes §5 [C]): E = 29 000 ksi, A = 14.1 in², I = 484 in⁴, L = 28 ft.
fn w14x48() -> (f64, f64, f64, f64) {
    (
        29_000.0 * KSI,
        14.1 * INCH * INCH,
        484.0 * INCH.powi(4),
        28.0 * 12.0 * INCH,
    )
}

#[test]
fn b1_of_the_simply_supported_benchmark_member_by_hand() {
    // AISC 360-16 Commentary Chapter C, benchmark Case 1 (notes §5), drawn vertical so
    // that it is a one-story column: pinned base, top held in X, axial P at the top and
    // w = 0.200 kip/ft across it.
    // Hand calculation, AISC 360-16 Appendix 8:
    //   Pe1 = π²EI/L² = π²·29000·484/336² = 1227.0 kips (A-8-5, K1 = 1);
    //   Cm = 1.0 (transverse load between supports, A-8-4 [M]);
    //   B1 = 1/(1 − P/Pe1) (A-8-3, α = 1.0): 1.1393, 1.3236, 1.5792 for P = 150, 300,
    //   450 kips; first-order Mmid = wL²/8 = 0.2/12·336²/8 = 235.2 kip-in;
    //   B1·Mmid = 268.0, 311.3, 371.4 kip-in against the exact (wEI/P)(sec u − 1) =
    //   268.9, 313.5, 375.4 (notes §5, [X]): −0.35 %, −0.71 %, −1.07 %.
    verify::source(
        "AISC 360-16 Commentary Ch. C benchmark Case 1 [C]; App. 8 eqs. A-8-3, A-8-5 (from memory), by hand",
    );
    let (e, a, i, l) = w14x48();
    let w = 0.200 * KIP / (12.0 * INCH);
    let ei = e * i;
    for (p_kips, b1_hand, exact_kip_in) in [
        (150.0, 1.1393, 268.9),
        (300.0, 1.3236, 313.5),
        (450.0, 1.5792, 375.4),
    ] {
        let p = p_kips * KIP;
        let mut f = Frame::new();
        let n0 = f.node(0.0, 0.0);
        let n1 = f.node(0.0, l);
        let m = f.member(n0, n1, e, a, i);
        f.pinned(n0);
        f.support(n1, [Restraint::Fixed, Restraint::Free, Restraint::Free]);
        f.model.analysis.notional = NotionalLoads::None;
        let c = f.case("P+w", ActionCategory::Dead);
        f.udl(c, m, w, LoadDirection::GlobalX);
        f.nodal(c, n1, 0.0, -p, 0.0);
        let case = only_case(&f.model, &strength("P+w", &[(c, 1.0)]));
        let mc = &case.members[m];

        let pe1 = PI * PI * ei / (l * l);
        verify::close(
            &format!("Pe1 = π²EI/L² = 1227.0 kips, P = {p_kips} kips"),
            "kips",
            pe1 / KIP,
            1227.0,
            1e-3,
        );
        let b1 = 1.0 / (1.0 - p / pe1);
        verify::close(
            &format!("B1 by hand, P = {p_kips} kips"),
            "-",
            b1,
            b1_hand,
            1e-4,
        );
        verify::close(
            &format!("compression P, P = {p_kips} kips"),
            "N",
            mc.compression,
            p,
            1e-9,
        );
        verify::close(
            &format!("Cm = 1.0 (transverse load between supports, A-8-4), P = {p_kips} kips"),
            "-",
            mc.c_m.unwrap(),
            1.0,
            f64::EPSILON,
        );
        verify::close(
            &format!("Pe1, P = {p_kips} kips"),
            "N",
            mc.p_critical.unwrap(),
            pe1,
            1e-9,
        );
        verify::close(
            &format!("B1 = Cm/(1 − αPr/Pe1), P = {p_kips} kips"),
            "-",
            mc.non_sway_amplifier.unwrap(),
            b1,
            1e-9,
        );
        // First-order span moment wL²/8 at midspan, all of it no-sway (the top is held).
        let m1 = w * l * l / 8.0;
        verify::close(
            &format!("Mnt = wL²/8 = 235.2 kip-in, P = {p_kips} kips"),
            "kip-in",
            m1 / (KIP * INCH),
            235.2,
            1e-3,
        );
        verify::close(
            &format!("position of Mr, L/2, P = {p_kips} kips"),
            "m",
            mc.span.x,
            0.5 * l,
            1e-6,
        );
        verify::close(
            &format!("Mnt at mid-span, P = {p_kips} kips"),
            "N·m",
            mc.span.no_sway.abs(),
            m1,
            1e-9,
        );
        verify::within(
            &format!("Mlt at mid-span (the top is held), against Mnt, P = {p_kips} kips"),
            "N·m",
            mc.span.sway,
            0.0,
            m1,
            1e-9,
        );
        verify::close(
            &format!("Mr = B1·Mnt, P = {p_kips} kips"),
            "N·m",
            mc.span.design,
            b1 * mc.span.first_order,
            1e-9,
        );
        // Against the exact flexure-only closed form (notes §5): the amplifier with
        // Cm = 1.0 is approximate and slightly low; within 2 %.
        let u = 0.5 * l * (p / ei).sqrt();
        let exact = w * ei / p * (1.0 / u.cos() - 1.0);
        verify::close(
            &format!("Case 1 exact Mmid against the table, P = {p_kips} kips"),
            "kip-in",
            exact / (KIP * INCH),
            exact_kip_in,
            1e-3,
        );
        let diff = mc.span.design.abs() / exact - 1.0;
        eprintln!("Case 1, P = {p_kips} kips: B1·M1 / exact − 1 = {diff:+.4}");
        verify::between(
            &format!(
                "Mr = B1·Mnt against the exact (wEI/P)(sec u − 1), within 2 %, P = {p_kips} kips"
            ),
            "N·m",
            mc.span.design.abs(),
            exact,
            -0.02,
            0.02,
        );
    }
}

#[test]
fn b2_of_the_cantilever_benchmark_member_by_hand() {
    // AISC 360-16 Commentary Chapter C, benchmark Case 2 (notes §5): fixed-base
    // cantilever column, H = 1.0 kip and P at the tip. It is one story of one column.
    // Hand calculation, AISC 360-16 Appendix 8:
    //   Δ = HL³/(3EI) (cantilever, closed form) → H·L/Δ = 3EI/L² = 373.0 kips;
    //   RM = 0.85: the column is fixed at its base, so it is a moment-frame column and
    //   Pmf = Pstory (A-8-8 [M]); Pe,story = 0.85·373.0 = 317.0 kips (A-8-7);
    //   B2 = 1/(1 − P/Pe,story) (A-8-6): 1.4608, 1.8980, 2.7089 for P = 100, 150, 200;
    //   first-order base moment H·L = 336 kip-in, all of it in the sway part;
    //   B2·H·L = 490.8, 637.7, 910.2 kip-in against the exact H·tan(kL)/k = 469.1,
    //   598.7, 849.0 (notes §5 [X]): +4.6 %, +6.5 %, +7.2 %, conservative.
    //   With RM = 1.0 it would be 459.1, 562.4, 724.5: −2.1 %, −6.1 %, −14.7 %
    //   (the rigid-chord P-Δ values of notes §5): RM = 0.85 is what covers the P-δ
    //   of the column and makes B2 conservative here.
    verify::source(
        "AISC 360-16 Commentary Ch. C benchmark Case 2 [C]; App. 8 eqs. A-8-6, A-8-7 (from memory), by hand",
    );
    let (e, a, i, l) = w14x48();
    let ei = e * i;
    let hl = 1.0 * KIP;
    for (p_kips, b2_hand, exact_kip_in) in [
        (100.0, 1.4608, 469.1),
        (150.0, 1.8980, 598.7),
        (200.0, 2.7089, 849.0),
    ] {
        let p = p_kips * KIP;
        let mut f = Frame::new();
        let n0 = f.node(0.0, 0.0);
        let n1 = f.node(0.0, l);
        let m = f.member(n0, n1, e, a, i);
        f.fixed(n0);
        f.model.analysis.notional = NotionalLoads::None;
        let c = f.case("H+P", ActionCategory::Wind);
        f.nodal(c, n1, hl, -p, 0.0);
        let case = only_case(&f.model, &strength("H+P", &[(c, 1.0)]));
        let s = &case.stories[0];
        let mc = &case.members[m];

        let delta = hl * l.powi(3) / (3.0 * ei);
        let pe_story = 0.85 * hl * l / delta;
        verify::close(
            &format!("H·L/Δ = 3EI/L² = 373.0 kips, P = {p_kips} kips"),
            "kips",
            hl * l / delta / KIP,
            373.0,
            1e-3,
        );
        let b2 = 1.0 / (1.0 - p / pe_story);
        verify::close(
            &format!("B2 by hand, P = {p_kips} kips"),
            "-",
            b2,
            b2_hand,
            2e-4,
        );
        verify::close(
            &format!("drift Δ = HL³/(3EI), P = {p_kips} kips"),
            "m",
            s.drift,
            delta,
            1e-9,
        );
        verify::close(
            &format!("RM = 0.85, P = {p_kips} kips"),
            "-",
            s.r_m,
            0.85,
            1e-12,
        );
        verify::close(
            &format!("Pe,story, P = {p_kips} kips"),
            "N",
            s.p_e_story,
            pe_story,
            1e-9,
        );
        verify::close(
            &format!("B2 = 1/(1 − ΣP/Pe,story), P = {p_kips} kips"),
            "-",
            s.b2.unwrap(),
            b2,
            1e-9,
        );
        verify::close(
            &format!("member sway amplifier = B2, P = {p_kips} kips"),
            "-",
            mc.sway_amplifier.unwrap(),
            b2,
            1e-9,
        );
        // Base moment: no-sway part 0, sway part H·L, design B2·H·L.
        let base = &mc.ends[0];
        verify::within(
            &format!("base moment Mnt, against H·L, P = {p_kips} kips"),
            "N·m",
            base.no_sway,
            0.0,
            hl * l,
            1e-9,
        );
        verify::close(
            &format!("base moment Mlt = H·L, P = {p_kips} kips"),
            "N·m",
            base.sway.abs(),
            hl * l,
            1e-9,
        );
        verify::close(
            &format!("base moment Mr = B2·Mlt, P = {p_kips} kips"),
            "N·m",
            base.design.abs(),
            b2 * hl * l,
            1e-9,
        );
        let k = (p / ei).sqrt();
        let exact = hl * (k * l).tan() / k;
        verify::close(
            &format!("Case 2 exact Mbase against the table, P = {p_kips} kips"),
            "kip-in",
            exact / (KIP * INCH),
            exact_kip_in,
            1e-3,
        );
        let diff = base.design.abs() / exact - 1.0;
        let diff_rm1 = hl * l / (1.0 - p / (pe_story / 0.85)) / exact - 1.0;
        eprintln!(
            "Case 2, P = {p_kips} kips: B2·H·L / exact − 1 = {diff:+.4} (RM = 1: {diff_rm1:+.4})"
        );
        verify::between(
            &format!(
                "base moment B2·H·L against the exact H·tan(kL)/k, conservative by < 8 %, P = {p_kips} kips"
            ),
            "N·m",
            base.design.abs(),
            exact,
            0.0,
            0.08,
        );
    }
}

#[test]
fn aci_cracked_section_stiffness_through_the_story_stiffness() {
    // ACI 318-19 Table 6.6.3.1.1(a) (notes §7.1 [C]): columns 0.70·Ig, beams 0.35·Ig.
    // Fixed-base portal h = 4 m, L = 8 m, Ib = Ic = 2e-4 m⁴: with gross sections
    // k = (Ib/Ic)(h/L) = 0.5; cracked, k' = (0.35/0.70)·0.5 = 0.25 and
    // H/Δ = (24·E·0.70·Ic/h³)·(6k' + 1)/(6k' + 4) (closed form of `portal_stiffness`)
    // = 24·200e9·1.4e-4/64 · 2.5/5.5 = 4.773e6 N/m, against 1.5e7·4/7 = 8.571e6 N/m gross.
    // Q = ΣPu/(H/Δ·h) (ACI 318-19 6.6.4.4.1).
    verify::source(
        "ACI 318-19 Table 6.6.3.1.1(a) (notes §7.1 [C]): 0.70·Ig columns, 0.35·Ig beams; closed form of the portal's H/Δ",
    );
    let (l, h, ic) = (8.0, 4.0, 2e-4);
    let p = 0.4e6;
    for (preset, fc, fb) in [
        (StiffnessPreset::Gross, 1.0, 1.0),
        (StiffnessPreset::AciCracked, 0.70, 0.35),
    ] {
        let (mut f, [_, n1, n2, _, c1, _, _]) = stiff_portal(l, h, ic, ic, true);
        f.model.analysis.stiffness = preset;
        f.model.analysis.method = SecondOrderMethod::AciMagnifier;
        let d = f.case("D", ActionCategory::Dead);
        f.nodal(d, n1, 0.0, -p, 0.0);
        f.nodal(d, n2, 0.0, -p, 0.0);
        let w = f.case("W", ActionCategory::Wind);
        f.nodal(w, n1, 10e3, 0.0, 0.0);
        let case = only_case(&f.model, &strength("D+W", &[(d, 1.0), (w, 1.0)]));
        let s = &case.stories[0];
        let k_story = portal_stiffness(E_STEEL, fc * ic, fb * ic, h, l, true);
        verify::close(
            &format!("story stiffness H/Δ, column EI factor {fc}"),
            "N/m",
            s.stiffness,
            k_story,
            AXIAL_RIGID,
        );
        let q = 2.0 * p / (k_story * h);
        verify::close(
            &format!("stability index Q, column EI factor {fc}"),
            "-",
            s.q_index,
            q,
            AXIAL_RIGID,
        );
        if preset == StiffnessPreset::AciCracked {
            verify::close(
                &format!("H/Δ by hand, 4.7727e6 N/m, column EI factor {fc}"),
                "N/m",
                k_story,
                4.7727e6,
                1e-4,
            );
        } else {
            verify::close(
                &format!("H/Δ = 1.5e7·4/7, column EI factor {fc}"),
                "N/m",
                k_story,
                1.5e7 * 4.0 / 7.0,
                1e-12,
            );
        }
        // Pc = π²(EI)eff/(k·lu)², (EI)eff = 0.4·Ec·Ig/(1 + βdns), k = 1.0, βdns = 0.6
        // (ACI 318-19 6.6.4.4.2, 6.6.4.4.4(a) [M]): the gross Ig whatever the preset.
        let pc = PI * PI * 0.4 * E_STEEL * ic / 1.6 / (h * h);
        verify::close(
            &format!("Pc = π²(EI)eff/(kl)², column EI factor {fc}"),
            "N",
            case.members[c1].p_critical.unwrap(),
            pc,
            1e-9,
        );
    }
}

#[test]
fn direct_method_reports_an_overloaded_frame_unstable() {
    // Closed form: the pinned-base portal with h = L, Ib = Ic buckles in sway at
    // Pcr = 1.821·EIc/h² per column (alignment chart, notes §10.2 [X]). Loaded to
    // 1.2·Pcr it has α_cr ≈ 1/1.2 < 1: the case is unstable, never numbers.
    verify::source(
        "closed form: alignment chart 1.821·EIc/h² (notes §10.2 [X]), loaded to 1.2·Pcr",
    );
    let (h, ic) = (4.0, 1e-4);
    let (mut f, [_, n1, n2, _, _, _, _]) = portal(h, h, ic, ic, false);
    f.model.analysis.method = SecondOrderMethod::Direct;
    f.model.analysis.notional = NotionalLoads::None;
    let p = 1.2 * 1.821 * E_STEEL * ic / (h * h);
    let d = f.case("D", ActionCategory::Dead);
    f.nodal(d, n1, 0.0, -p, 0.0);
    f.nodal(d, n2, 0.0, -p, 0.0);
    let w = f.case("W", ActionCategory::Wind);
    f.nodal(w, n1, 1e3, 0.0, 0.0);
    let case = only_case(&f.model, &strength("D+W", &[(d, 1.0), (w, 1.0)]));
    verify::same("case stable (α_cr < 1)", false, case.stable);
    verify::same(
        "direct analysis converged (α_cr < 1)",
        false,
        case.direct.converged,
    );
    let a = case.alpha_cr.unwrap();
    assert!(a < 1.0, "alpha_cr = {a}");
    verify::close("α_cr = 1/1.2", "-", a, 1.0 / 1.2, 0.01);
    verify::same(
        "story classification (α_cr < 1)",
        Classification::Unstable,
        case.stories[0].classification,
    );
    assert!(case.members.iter().all(|m| !m.stable));
}

/// A single-bay two-story frame (L = 6 m, stories 4 m and 3.5 m, fixed bases) with
/// gravity point loads p1 at each level-1 knee and p2 at each level-2 knee: the gravity
/// load entering level i is Y1 = 2·p1, Y2 = 2·p2.
fn two_story(p1: f64, p2: f64) -> (Frame, usize) {
    let mut f = Frame::new();
    let (e, a) = (E_STEEL, 1e-2);
    let n: Vec<usize> = [
        (0.0, 0.0),
        (6.0, 0.0),
        (0.0, 4.0),
        (6.0, 4.0),
        (0.0, 7.5),
        (6.0, 7.5),
    ]
    .iter()
    .map(|&(x, y)| f.node(x, y))
    .collect();
    f.fixed(n[0]);
    f.fixed(n[1]);
    f.member(n[0], n[2], e, a, 2e-4);
    f.member(n[1], n[3], e, a, 2e-4);
    f.member(n[2], n[3], e, a, 4e-4);
    f.member(n[2], n[4], e, a, 2e-4);
    f.member(n[3], n[5], e, a, 2e-4);
    f.member(n[4], n[5], e, a, 4e-4);
    let g = f.case("D", ActionCategory::Dead);
    for (node, p) in [(n[2], p1), (n[3], p1), (n[4], p2), (n[5], p2)] {
        f.nodal(g, node, 0.0, -p, 0.0);
    }
    (f, g)
}

#[test]
fn notional_loads_of_a_gravity_only_case() {
    // AISC 360-16 C2-1 (notes §9 [C1]): Ni = 0.002·α·Yi, α = 1.0 on a strength basis,
    // applied in both directions in a gravity-only combination; with τb = 1.0 for all
    // members the coefficient becomes 0.003 (C2.3(c), 0.001·α·Yi added, notes §9 [C]).
    // Y1 = 2·200 kN = 400 kN, Y2 = 2·100 kN = 200 kN → N = 0.8, 0.4 kN (0.002) and
    // 1.2, 0.6 kN (0.003). Story shears of the sway solution: N1 + N2 and N2.
    verify::source(
        "AISC 360-16 eq. C2-1 and §C2.3(c) (notes §9 [C]): Ni = 0.002·α·Yi, 0.003 with τb = 1.0",
    );
    let (p1, p2) = (200e3, 100e3);
    let y = [2.0 * p1, 2.0 * p2];
    for (preset, coefficient) in [
        (StiffnessPreset::Gross, 0.002),
        (StiffnessPreset::AiscDirect, 0.003),
    ] {
        let (mut f, g) = two_story(p1, p2);
        f.model.analysis.method = SecondOrderMethod::AiscB1B2;
        f.model.analysis.notional = NotionalLoads::Auto;
        f.model.analysis.stiffness = preset;
        assert_eq!(stories(&f.model).unwrap().len(), 2);
        let report = check(&f.model, &[strength("1.0D", &[(g, 1.0)])]).unwrap();
        let ids: Vec<&str> = report.cases.iter().map(|c| c.id.as_str()).collect();
        verify::same(
            &format!("cases of 1.0D with notional loads in both directions, {coefficient}"),
            vec!["1.0D/N+", "1.0D/N-"],
            ids,
        );
        for (case, sign) in report.cases.iter().zip([1.0, -1.0]) {
            assert_eq!(case.notional.len(), 2);
            for (n, yi) in case.notional.iter().zip(y) {
                verify::close(
                    &format!("notional load Ni = {coefficient}·Yi"),
                    "N",
                    *n,
                    sign * coefficient * yi,
                    1e-9,
                );
            }
            let s = &case.stories;
            let n = &case.notional;
            verify::close(
                "story 1 shear = N1 + N2",
                "N",
                s[0].shear,
                n[0] + n[1],
                1e-9,
            );
            verify::close("story 2 shear = N2", "N", s[1].shear, n[1], 1e-9);
            verify::close("story 1 ΣP = Y1 + Y2", "N", s[0].sum_p, y[0] + y[1], 1e-6);
        }
    }
}

#[test]
fn notional_loads_on_an_allowable_stress_basis() {
    // AISC 360-16 C2-1 and §C2.1 (notes §6, §9): on an ASD basis the analysis runs at
    // α = 1.6 × the ASD loads, and the notional load at that level is Ni = 0.002·α·Yi
    // with Yi the gravity load of the ASD combination. At the level of the ASD loads
    // (results divided by 1.6, which is the level `CaseCheck.notional` and the story
    // shears are reported at) the lateral force is therefore 0.002·Yi, not 0.002·α·Yi.
    // Y1 = 400 kN, Y2 = 200 kN → 0.8 and 0.4 kN; the story-1 shear of the sway solution
    // is 1.2 kN, its drift that of 1.2 kN.
    verify::source("AISC 360-16 eq. C2-1 and §C2.1 (notes §6, §9): α = 1.6 on an ASD basis");
    let (p1, p2) = (200e3, 100e3);
    let (mut f, g) = two_story(p1, p2);
    f.model.analysis.notional = NotionalLoads::Auto;
    let mut fc = strength("D", &[(g, 1.0)]);
    fc.basis = Basis::AllowableStress;
    let report = check(&f.model, &[fc]).unwrap();
    let case = &report.cases[0];
    verify::close(
        "notional load at level 1, 0.002·α·Y1 (ASD level)",
        "N",
        case.notional[0],
        0.002 * 2.0 * p1,
        1e-9,
    );
    verify::close(
        "notional load at level 2, 0.002·α·Y2 (ASD level)",
        "N",
        case.notional[1],
        0.002 * 2.0 * p2,
        1e-9,
    );
}
