//! Story stiffness H/Δ as a property of the frame (issue 7 item 1), leaning columns left out
//! of Pmf (item 5). Each check names its source beside it.

mod common;

use common::{strength, verify};

use common::Frame;
use plumbline::check::story::StiffnessSource;
use plumbline::check::{CheckReport, Classification, check};
use plumbline::combos::FactoredCase;
use plumbline::model::{
    ActionCategory, LoadDirection, MemberLoadKind, Model, NotionalLoads, SecondOrderMethod,
    StiffnessPreset,
};

/// The two-story, one-bay frame of issue 7 item 1: stories of 4.0 m and 3.5 m, a 6.0 m bay,
/// fixed bases, columns A = 91 cm², I = 10 450 cm⁴, girders A = 72.7 cm², I = 23 130 cm⁴,
/// E = 210 GPa; dead load only: 30 kN at 0.25 L on the first-floor girder and 200 kN at
/// 0.25 L on the roof girder. Returns the model and the dead load case.
fn issue_frame() -> (Model, usize) {
    let e = 210e9;
    let (ac, ic) = (91e-4, 10_450e-8);
    let (ag, ig) = (72.7e-4, 23_130e-8);
    let mut f = Frame::new();
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
    f.member(n[0], n[2], e, ac, ic);
    f.member(n[1], n[3], e, ac, ic);
    f.member(n[2], n[4], e, ac, ic);
    f.member(n[3], n[5], e, ac, ic);
    let g1 = f.member(n[2], n[3], e, ag, ig);
    let g2 = f.member(n[4], n[5], e, ag, ig);
    f.fixed(n[0]);
    f.fixed(n[1]);
    let d = f.case("D", ActionCategory::Dead);
    for (g, p) in [(g1, 30e3), (g2, 200e3)] {
        f.member_load(
            d,
            g,
            MemberLoadKind::Point {
                a: 1.5,
                p,
                direction: LoadDirection::Gravity,
            },
        );
    }
    (f.model, d)
}

fn run(model: &Model, fc: &FactoredCase) -> CheckReport {
    check(model, std::slice::from_ref(fc)).unwrap()
}

#[test]
fn issue_frame_under_1_4d_is_not_unstable() {
    // Issue 7 item 1: the case's own holding forces change sign up the height (the 200 kN
    // roof load pushes the roof one way, the floor the other), so story 1's own net shear
    // is almost zero while it drifts. The stiffness must come from a same-signed pattern,
    // and the case is not unstable: the buckling analysis gives α_cr far above 1.
    verify::source("AISC 360-16 App. 8 eq. A-8-7 (from memory): H/ΔH of the pattern");
    let (mut model, d) = issue_frame();
    for method in [
        SecondOrderMethod::AiscB1B2,
        SecondOrderMethod::AciMagnifier,
        SecondOrderMethod::Ec3AlphaCr,
        SecondOrderMethod::Direct,
    ] {
        model.analysis.method = method;
        let report = run(&model, &strength("1.4D", &[(d, 1.4)]));
        for c in &report.cases {
            verify::source(
                "common practice, no source: a frame whose buckling analysis gives α_cr far above 1 (here above 10) is not unstable",
            );
            verify::same(&format!("{method}, {}: case stable", c.id), true, c.stable);
            verify::between(
                &format!("{method}, {}: α_cr, above 10", c.id),
                "-",
                c.alpha_cr.unwrap(),
                10.0,
                0.0,
                f64::INFINITY,
            );
            verify::source("AISC 360-16 App. 8 eq. A-8-7 (from memory): H/ΔH of the pattern");
            for s in &c.stories {
                assert_ne!(s.classification, Classification::Unstable);
                // The figure's pattern: shear and drift of the same sign, shear not ~0.
                verify::same(
                    &format!(
                        "{method}, {}, story {}: pattern's shear and drift of one sign",
                        c.id, s.story
                    ),
                    true,
                    s.stiffness_shear * s.stiffness_drift > 0.0,
                );
                assert!(s.stiffness.is_finite() && s.stiffness > 0.0);
                // H/Δ is exactly the pattern's shear over its drift (AISC 360-16 A-8-7
                // writes Pe,story with H/ΔH, from memory).
                verify::close(
                    "story stiffness H/Δ against the pattern's shear over its drift",
                    "N/m",
                    s.stiffness,
                    s.stiffness_shear / s.stiffness_drift,
                    1e-12,
                );
            }
        }
    }
}

#[test]
fn issue_frame_story_one_uses_a_reference_pattern_and_b2_follows_a_8_6() {
    verify::source(
        "AISC 360-16 App. 8 eqs. A-8-6, A-8-7 (from memory), by hand from the reported figures",
    );
    let (mut model, d) = issue_frame();
    model.analysis.notional = NotionalLoads::None;
    model.analysis.method = SecondOrderMethod::AiscB1B2;
    let report = run(&model, &strength("1.4D", &[(d, 1.4)]));
    let c = &report.cases[0];
    let s1 = &c.stories[0];
    // The case's own level forces have opposite signs at the two levels, so neither story
    // may use them.
    assert_eq!(s1.stiffness_source, StiffnessSource::GravityPattern);
    // Level gravity loads are both downward (Yi > 0), so the gravity pattern is
    // same-signed; its story shear is the sum of the level forces above.
    verify::same(
        "story 1: gravity pattern's shear and drift both positive (statics)",
        true,
        s1.stiffness_shear > 0.0 && s1.stiffness_drift > 0.0,
    );
    // A-8-7 and A-8-6 by hand from the reported figures (AISC 360-16 App. 8, from memory):
    // Pe,story = RM·(H/ΔH)·L, B2 = 1/(1 − α·Pstory/Pe,story) with α = 1.0 (LRFD).
    for s in &c.stories {
        let p_e = s.r_m * s.stiffness * s.height;
        verify::close("Pe,story = RM·(H/ΔH)·L", "N", s.p_e_story, p_e, 1e-12);
        let b2 = 1.0 / (1.0 - s.sum_p / p_e);
        verify::close(
            "B2 = 1/(1 − α·Pstory/Pe,story)",
            "-",
            s.b2.unwrap(),
            b2.max(1.0),
            1e-12,
        );
        // The frame's buckling load factor is far above 1, and B2 must be consistent with
        // it: B2 ≈ 1/(1 − 1/α_cr) within the RM factor (AISC 360-16 Commentary App. 8,
        // from memory; 1/α_cr ≤ ΣP/Pe,story·(1/0.85) for this sway mode).
        let alpha_cr = c.alpha_cr.unwrap();
        let b2_frame = 1.0 / (1.0 - 1.0 / alpha_cr);
        verify::source(
            "AISC 360-16 Commentary App. 8 (from memory): B2 ≈ 1/(1 − 1/α_cr) within the RM factor",
        );
        // Absolute 0.05 on the amplifier, as before.
        verify::within(
            &format!("story {}: B2 against 1/(1 − 1/α_cr)", s.story),
            "-",
            s.b2.unwrap(),
            b2_frame,
            1.0,
            0.05,
        );
        verify::source(
            "AISC 360-16 App. 8 eqs. A-8-6, A-8-7 (from memory), by hand from the reported figures",
        );
    }
}

#[test]
fn own_lateral_forces_are_used_where_they_push_every_story_the_same_way() {
    // A wind-like case with the same sign at both levels: the case's own forces are a valid
    // pattern for both stories (issue 7 item 1: "the case's own lateral loads where they push
    // every story the same way").
    verify::source("closed form: statics, story shear of same-signed level forces");
    let (mut f, d) = {
        let (m, d) = issue_frame();
        (Frame { model: m }, d)
    };
    let w = f.case("W", ActionCategory::Wind);
    f.nodal(w, 2, 20e3, 0.0, 0.0);
    f.nodal(w, 4, 10e3, 0.0, 0.0);
    f.model.analysis.notional = NotionalLoads::None;
    let report = run(&f.model, &strength("1.2D+1.0W", &[(d, 1.2), (w, 1.0)]));
    for s in &report.cases[0].stories {
        assert_eq!(s.stiffness_source, StiffnessSource::CaseSway, "{s:?}");
        // The story's own shear is the pattern's: 30 kN and 10 kN plus the holding forces of
        // the gravity part (closed form: story shear = sum of level forces above).
        verify::close(
            "story shear of the case against the stiffness pattern's shear",
            "N",
            s.shear,
            s.stiffness_shear,
            1e-12,
        );
    }
}

/// A portal with a third, leaning column carrying load at the right, modelled `how`.
fn leaning_portal(how: u8) -> (Model, usize) {
    let e = 200e9;
    let (a, ic, ib) = (1e-2, 1e-4, 2e-4);
    let mut f = Frame::new();
    let n0 = f.node(0.0, 0.0);
    let n1 = f.node(0.0, 4.0);
    let n2 = f.node(6.0, 4.0);
    let n3 = f.node(6.0, 0.0);
    let n4 = f.node(12.0, 4.0);
    let n5 = f.node(12.0, 0.0);
    f.member(n0, n1, e, a, ic);
    f.member(n1, n2, e, a, ib);
    f.member(n3, n2, e, a, ic);
    let link = f.member(n2, n4, e, a, ib);
    let lean = f.member(n5, n4, e, a, ic);
    f.fixed(n0);
    f.fixed(n3);
    match how {
        // Released at both ends, on a fixed support.
        0 => {
            f.fixed(n5);
            f.release(lean, true, true);
            f.release(link, false, true);
        }
        // Pinned support at the base, released at the top.
        1 => {
            f.pinned(n5);
            f.release(lean, false, true);
            f.release(link, false, true);
        }
        // Pinned support at the base, the beam released onto an unreleased column top.
        _ => {
            f.pinned(n5);
            f.release(link, false, true);
        }
    }
    let d = f.case("D", ActionCategory::Dead);
    f.nodal(d, n1, 0.0, -100e3, 0.0);
    f.nodal(d, n2, 0.0, -100e3, 0.0);
    f.nodal(d, n4, 0.0, -300e3, 0.0);
    f.model.analysis.notional = NotionalLoads::None;
    f.model.analysis.stiffness = StiffnessPreset::Gross;
    (f.model, d)
}

#[test]
fn leaning_column_is_left_out_of_pmf_however_it_is_modelled() {
    // AISC 360-16 App. 8 A-8-8 (from memory): RM = 1 − 0.15·Pmf/Pstory, Pmf the load on
    // the moment-frame columns only. A column that takes no moment at either end (leaning)
    // carries 300 kN here by statics (its load is applied on its top node and the link is
    // pinned onto it and unloaded, so it carries no shear; closed form), the frame columns 200 kN
    // together: Pmf = 200 kN, Pstory = 500 kN, RM = 1 − 0.15·0.4 = 0.94.
    verify::source("AISC 360-16 App. 8 eq. A-8-8 (from memory): RM = 1 − 0.15·Pmf/Pstory; statics");
    for how in 0..3 {
        let (model, d) = leaning_portal(how);
        let report = run(&model, &strength("1.0D", &[(d, 1.0)]));
        let s = &report.cases[0].stories[0];
        verify::close(
            &format!("ΣP of the story, leaning column modelled way {how}"),
            "N",
            s.sum_p,
            500e3,
            1e-6,
        );
        // The columns shorten unequally (300 kN against 100 kN on equal sections), so the
        // beam between the frame columns shifts a little load: 1e-3 covers it (the 200 kN
        // vs 300 kN split is exact only with axially rigid columns, closed form).
        verify::close(
            &format!("Pmf, leaning column left out, modelled way {how}"),
            "N",
            s.p_mf,
            200e3,
            1e-3,
        );
        verify::close(&format!("RM, modelled way {how}"), "-", s.r_m, 0.94, 1e-4);
    }
}

#[test]
fn second_order_drifts_sit_beside_the_first_order_ones() {
    // Issue 7 item 7. Closed form: the story bottoms are the tops of the stories below, so
    // the top drift (top level less base) is the sum of the interstory drifts; P-Δ under
    // compression amplifies the sway, so the second-order drift is larger than the
    // first-order one and of the same sign (AISC 360-16 Commentary App. 8, from memory), and
    // Δ2nd/Δ1st is their ratio by definition.
    verify::source("closed form: the top drift is the sum of the interstory drifts");
    let (m, d) = issue_frame();
    let mut f = Frame { model: m };
    let w = f.case("W", ActionCategory::Wind);
    f.nodal(w, 2, 20e3, 0.0, 0.0);
    f.nodal(w, 4, 10e3, 0.0, 0.0);
    let report = run(&f.model, &strength("1.2D+1.0W", &[(d, 1.2), (w, 1.0)]));
    let c = &report.cases[0];
    let sum1: f64 = c.stories.iter().map(|s| s.drift_first_order).sum();
    verify::close(
        "top drift, first order, against Σ story drifts",
        "m",
        c.top_drift_first_order,
        sum1,
        1e-9,
    );
    let sum2: f64 = c
        .stories
        .iter()
        .map(|s| s.drift_second_order.unwrap())
        .sum();
    verify::close(
        "top drift, second order, against Σ story drifts",
        "m",
        c.top_drift_second_order.unwrap(),
        sum2,
        1e-9,
    );
    verify::source("AISC 360-16 Commentary App. 8 (from memory): P-Δ amplifies the sway");
    verify::between(
        "top drift, second order, above the first-order one",
        "m",
        c.top_drift_second_order.unwrap(),
        c.top_drift_first_order,
        0.0,
        f64::INFINITY,
    );
    verify::between(
        "top drift, first order, positive (loads towards +X)",
        "m",
        c.top_drift_first_order,
        0.0,
        0.0,
        f64::INFINITY,
    );
    verify::source("closed form: the top drift is the sum of the interstory drifts");
    for s in &c.stories {
        let (d1, d2) = (s.drift_first_order, s.drift_second_order.unwrap());
        verify::close(
            "story drift (governing) = first-order drift",
            "m",
            s.drift,
            d1,
            1e-9,
        );
        verify::close(
            "Δ2nd/Δ1st by definition",
            "-",
            s.drift_amplification.unwrap(),
            d2 / d1,
            1e-12,
        );
    }
}

#[test]
fn round_off_drift_reads_negligible() {
    // Issue 7 item 9: a drift of 1e-19 of the height is round-off, never "1/1e19"; below
    // 1/10 000 000 it reads "negligible" (common practice, no source).
    use plumbline::report::drift_ratio_text;
    assert_eq!(drift_ratio_text(1.44e-19), "negligible");
    assert_eq!(drift_ratio_text(0.0), "negligible");
    assert_eq!(drift_ratio_text(f64::NAN), "-");
    assert_eq!(drift_ratio_text(-1.0 / 400.0), "1/400");
}

#[test]
fn every_story_of_a_tall_frame_finds_a_same_signed_pattern() {
    // A one-bay, 150-story frame (3.5 m stories, 8 m bay, W-shape-like steel members)
    // under gravity only. Under the gravity-proportional and the uniform patterns every
    // level force pushes the same way, so story k carries the forces of levels k..n: the
    // top story carries 1/150 of the total, less than the 1 % that a total-share rule
    // would ask. Statics (closed form): shear_k = Σ_{l≥k} F_l > 0 for every story, so each
    // story must find a figure, with its shear and drift of one sign.
    let stories = 150;
    let (e, ac, ic, ab, ib) = (200e9, 250e-4, 1.2e-3, 120e-4, 0.8e-3);
    let mut f = Frame::new();
    let mut left = f.node(0.0, 0.0);
    let mut right = f.node(8.0, 0.0);
    f.fixed(left);
    f.fixed(right);
    let d = f.case("D", ActionCategory::Dead);
    for s in 1..=stories {
        let y = 3.5 * s as f64;
        let (l, r) = (f.node(0.0, y), f.node(8.0, y));
        f.member(left, l, e, ac, ic);
        f.member(right, r, e, ac, ic);
        let b = f.member(l, r, e, ab, ib);
        f.udl(d, b, 10e3, LoadDirection::Gravity);
        (left, right) = (l, r);
    }
    let report = run(&f.model, &strength("1.4D", &[(d, 1.4)]));
    verify::source("closed form: statics, shear_k = Σ_{l≥k} F_l > 0 under a same-signed pattern");
    for case in &report.cases {
        verify::same(
            &format!("{}: stories", case.id),
            stories,
            case.stories.len(),
        );
        for st in &case.stories {
            assert!(
                st.stiffness.is_finite() && st.stiffness > 0.0,
                "story {}",
                st.story
            );
            assert!(
                st.stiffness_shear * st.stiffness_drift > 0.0,
                "story {}",
                st.story
            );
        }
        let one_sign = case
            .stories
            .iter()
            .filter(|st| st.stiffness_shear * st.stiffness_drift > 0.0)
            .count();
        verify::same(
            &format!(
                "{}: stories whose pattern has shear and drift of one sign",
                case.id
            ),
            stories,
            one_sign,
        );
        let least = case
            .stories
            .iter()
            .map(|st| st.stiffness)
            .fold(f64::INFINITY, f64::min);
        verify::between(
            &format!("{}: least story stiffness H/Δ, positive", case.id),
            "N/m",
            least,
            0.0,
            0.0,
            f64::INFINITY,
        );
    }
}
