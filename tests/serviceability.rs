//! Serviceability (issue 18): service drift, P-Δ at service load and beam deflection against
//! closed forms, and their properties over the seeded random frames. Each check names its
//! source beside it.

mod common;

use std::collections::BTreeMap;

use common::random_frame::{RandomFrame, factored};
use common::{Frame, portal, verify};
use plumbline::combos::{Basis, FactoredCase};
use plumbline::model::{ActionCategory, LoadDirection, Model, Restraint, StiffnessPreset};
use plumbline::service::{
    SeismicLimits, ServiceLimits, ServiceReport, beam_deflection, beam_members, service_check,
    service_model,
};
use plumbline::solve::Solution;
use plumbline::solve::first_order::{FirstOrder, combined_member_loads, member_diagram};
use plumbline::solve::mesh::member_stiffness;

const E: f64 = 200e9;

/// A service case with `factors`.
fn service(id: &str, factors: &[(usize, f64)]) -> FactoredCase {
    factored(id, Basis::Serviceability, factors)
}

/// Limits of the shipped ASCE table's defaults (h/400 under wind, L/360 live, L/240
/// total, cantilevers on 2L), seismic by §12.8.6 when `seismic` is given.
fn limits(seismic: Option<SeismicLimits>) -> ServiceLimits {
    ServiceLimits {
        drift: BTreeMap::from([("wind".to_string(), 400.0)]),
        deflection_live: Some(360.0),
        deflection_total: Some(240.0),
        cantilever_factor: 2.0,
        seismic,
    }
}

/// The service check of `model` as a serviceability run sets it up (its strength stiffness
/// set to the reduced AISC one first, to show that the service run does not use it).
fn run(mut model: Model, cases: &[FactoredCase], l: &ServiceLimits) -> ServiceReport {
    model.analysis.stiffness = StiffnessPreset::AiscDirect;
    let m = service_model(&model);
    assert_eq!(m.analysis.stiffness, StiffnessPreset::Gross);
    service_check(&m, cases, l, ("test", "test table")).unwrap()
}

/// A flagpole: one column of height `h`, fixed at the base, free at the top, axially stiff.
/// Returns the frame, its top node and the member.
fn flagpole(h: f64, i: f64) -> (Frame, usize, usize) {
    let mut f = Frame::new();
    let base = f.node(0.0, 0.0);
    let top = f.node(0.0, h);
    let m = f.member(base, top, E, 1.0, i);
    f.fixed(base);
    (f, top, m)
}

#[test]
fn cantilever_column_tip_drift_is_p_h3_over_3ei() {
    // Closed form (cantilever with an end load; e.g. Roark's Formulas for Stress and Strain,
    // Table 8.1 case 1a, from memory): δ = P·h³/(3·E·I). No axial load, so the P-Δ
    // analysis gives the same drift.
    let (h, i, p) = (4.0, 8.0e-5, 10e3);
    let (mut f, top, _) = flagpole(h, i);
    let w = f.case("W", ActionCategory::Wind);
    f.nodal(w, top, p, 0.0, 0.0);
    let r = run(f.model, &[service("W", &[(w, 1.0)])], &limits(None));
    let exact = p * h.powi(3) / (3.0 * E * i);
    let s = &r.cases[0].stories[0];
    let src = "closed form δ = P·h³/(3EI): Roark 8th ed., Table 8.1 case 1a (from memory)";
    let q = "cantilever column tip drift under a tip load, first order";
    verify::check(
        "serviceability/cantilever-drift/first-order",
        q,
        "m",
        src,
        exact,
        s.drift_first_order,
        1e-6,
    );
    let q = "cantilever column tip drift under a tip load, second order without axial load";
    verify::check(
        "serviceability/cantilever-drift/second-order",
        q,
        "m",
        src,
        exact,
        s.drift_second_order.unwrap(),
        1e-6,
    );
    // Verdict against h/400: ratio = δ / (h/400).
    let g = r.stories[0].governing.as_ref().unwrap();
    verify::source("closed form δ = P·h³/(3EI) against the limit h/400 the test sets");
    verify::close(
        "drift ratio δ/(h/400)",
        "-",
        g.ratio,
        exact / (h / 400.0),
        1e-6,
    );
}

#[test]
fn seismic_drift_is_cd_times_elastic_drift_over_ie() {
    // ASCE/SEI 7-16 §12.8.6 (12.8-15), from memory: δx = Cd·δxe/Ie, against Δa = 0.015·hsx
    // for risk category III (Table 12.12-1, from memory). δxe of the flagpole is
    // P·h³/(3·E·I) (closed form, as above).
    let (h, i, p) = (3.5, 6.0e-5, 40e3);
    let (mut f, top, _) = flagpole(h, i);
    let e = f.case("E", ActionCategory::Seismic);
    f.nodal(e, top, p, 0.0, 0.0);
    let d = f.case("D", ActionCategory::Dead);
    f.nodal(d, top, 0.0, -1e3, 0.0);
    let seismic = SeismicLimits {
        cd: 5.5,
        ie: 1.25,
        risk_category: 3,
        allowable_ratio: 0.015,
    };
    let r = run(
        f.model,
        &[service("D", &[(d, 1.0)])],
        &limits(Some(seismic)),
    );
    let delta_xe = p * h.powi(3) / (3.0 * E * i);
    let s = &r.seismic[0];
    let src = "ASCE/SEI 7-16 §12.8.6 eq. (12.8-15), Table 12.12-1 (from memory); δxe = P·h³/(3EI)";
    verify::check(
        "serviceability/seismic-drift/delta-xe",
        "elastic seismic drift δxe of a flagpole",
        "m",
        src,
        delta_xe,
        s.delta_xe,
        1e-6,
    );
    verify::check(
        "serviceability/seismic-drift/delta-x",
        "design story drift δx = Cd·δxe/Ie, Cd = 5.5, Ie = 1.25",
        "m",
        src,
        5.5 * delta_xe / 1.25,
        s.delta,
        1e-6,
    );
    verify::check(
        "serviceability/seismic-drift/allowable",
        "allowable drift Δa = 0.015·hsx, risk category III",
        "m",
        src,
        0.015 * h,
        s.allowable,
        // Relative to Δa, the former absolute 1e-12 m rounded down to a power of ten.
        1e-11,
    );
    verify::source(src);
    verify::close(
        "drift ratio δx/Δa",
        "-",
        s.ratio,
        s.delta / s.allowable,
        1e-12,
    );
}

#[test]
fn fixed_base_portal_drift_by_slope_deflection() {
    // Closed form by slope-deflection (derived here; reference notes §10.1 give the
    // moments of the same frame): with k = (Ib/Ic)(h/L), joint rotation θ and sway Δ,
    //   joint:  (2EIc/h)(2θ − 3Δ/h) + 6EIb·θ/L = 0          ⇒ θ = 3Δ / (h(2 + 3k)),
    //   shear:  H = −2(M_AB + M_BA)/h = 12·E·Ic·Δ·(1 + 6k) / (h³(2 + 3k)),
    // so Δ = H·h³·(2 + 3k) / (12·E·Ic·(1 + 6k)). Limits: k → ∞ gives H·h³/(24EIc) (two
    // fixed-fixed columns), k → 0 gives H·h³/(6EIc) (two cantilevers).
    for (ib_over_ic, l) in [(2.0, 8.0), (0.5, 6.0), (10.0, 12.0)] {
        let (h, ic, hforce) = (4.0, 1.0e-4, 25e3);
        let (mut f, [_, n1, ..]) = portal(l, h, ic, ib_over_ic * ic, true);
        let w = f.case("W", ActionCategory::Wind);
        f.nodal(w, n1, hforce, 0.0, 0.0);
        let r = run(f.model, &[service("W", &[(w, 1.0)])], &limits(None));
        let k = ib_over_ic * h / l;
        let exact = hforce * h.powi(3) * (2.0 + 3.0 * k) / (12.0 * E * ic * (1.0 + 6.0 * k));
        let d = r.cases[0].stories[0].drift_first_order;
        // Axial shortening (A = 10 m²) is outside the closed form: a few parts in 10⁶.
        verify::check(
            &format!("serviceability/portal-drift/k={k}"),
            &format!("fixed-base portal sway under H, k = (Ib/Ic)(h/L) = {k}"),
            "m",
            "closed form by slope-deflection: Δ = H·h³(2 + 3k)/(12EIc(1 + 6k))",
            exact,
            d,
            1e-4,
        );
    }
}

#[test]
fn simply_supported_beam_deflection_is_5wl4_over_384ei() {
    // Closed form (e.g. Roark, Table 8.1 case 2e, from memory): a simply supported beam
    // under a uniform load deflects 5·w·L⁴/(384·E·I) at mid-span. Here the beam of a portal
    // is pinned at both ends (released), so it spans simply between the column tops; the
    // deflection is measured from its chord, so the columns' shortening drops out.
    let (l, h, ib, w) = (9.0, 4.0, 2.0e-4, 12e3);
    let (mut f, [.., b, _]) = portal(l, h, 1.0e-4, ib, true);
    f.release(b, true, true);
    let live = f.case("L", ActionCategory::Live);
    f.udl(live, b, w, LoadDirection::Gravity);
    let r = run(f.model, &[service("L", &[(live, 1.0)])], &limits(None));
    let exact = 5.0 * w * l.powi(4) / (384.0 * E * ib);
    let beam = &r.cases[0].beams[0];
    verify::check(
        "serviceability/beam-deflection/simple-span",
        "simply supported beam mid-span deflection 5wL⁴/(384EI)",
        "m",
        "closed form: Roark 8th ed., Table 8.1 case 2e (from memory)",
        exact,
        beam.total.abs(),
        1e-9,
    );
    verify::source("closed form: Roark 8th ed., Table 8.1 case 2e (from memory)");
    verify::within(
        "position of the largest deflection, L/2",
        "m",
        beam.total_x,
        l / 2.0,
        l,
        1e-6,
    );
    // All of it is live load: the live part is the same figure.
    verify::within(
        "live part of the deflection = the whole",
        "m",
        beam.live,
        beam.total,
        exact,
        1e-12,
    );
    // Verdict: live against L/360 governs (IBC Table 1604.3, from memory).
    verify::source("closed form 5wL⁴/(384EI) against L/360: IBC Table 1604.3 (from memory)");
    let v = &r.beams[0];
    // Absolute 1e-9 on the ratio, as before (its natural scale is 1, the limit).
    verify::within(
        "live-load deflection ratio δ/(L/360)",
        "-",
        v.live.as_ref().unwrap().ratio,
        exact / (l / 360.0),
        1.0,
        1e-9,
    );
    verify::within(
        "governing deflection ratio",
        "-",
        v.ratio().unwrap(),
        exact / (l / 360.0),
        1.0,
        1e-9,
    );
}

#[test]
fn fixed_fixed_beam_deflection_relative_to_its_chord_is_wl4_over_384ei() {
    // Closed form (e.g. Roark, Table 8.1 case 2e with both ends fixed, from memory): a
    // fixed-ended beam under a uniform load deflects w·L⁴/(384·E·I) at mid-span relative to
    // its ends. Both ends sit on equal vertical springs with their rotation held, so the
    // beam translates as a whole by w·L/(2k) and the chord moves with it: relative to the
    // chord the deflection is still w·L⁴/(384·E·I).
    let (l, ib, w, k) = (7.5, 1.5e-4, 9e3, 2e6);
    let mut f = Frame::new();
    let a = f.node(0.0, 0.0);
    let b = f.node(l, 0.0);
    let m = f.member(a, b, E, 1.0, ib);
    f.support(
        a,
        [Restraint::Fixed, Restraint::Spring(k), Restraint::Fixed],
    );
    f.support(
        b,
        [Restraint::Fixed, Restraint::Spring(k), Restraint::Fixed],
    );
    let live = f.case("L", ActionCategory::Live);
    f.udl(live, m, w, LoadDirection::Gravity);
    let model = f.model;
    let s = FirstOrder::new(&model, &[])
        .unwrap()
        .solve_case(&model, live)
        .unwrap();
    // The ends did translate (the chord is not the undeformed axis).
    let settle = w * l / (2.0 * k);
    verify::source("closed form: each spring carries wL/2, Hooke's law");
    verify::close(
        "end settlement w·L/(2k)",
        "m",
        s.displacements[a][1],
        -settle,
        1e-9,
    );
    let stiffness = member_stiffness(&model);
    let (v, x) = beam_deflection(&model, &stiffness, &s, &[(live, 1.0)], m, None);
    let exact = w * l.powi(4) / (384.0 * E * ib);
    verify::check(
        "serviceability/beam-deflection/fixed-fixed",
        "fixed-ended beam mid-span deflection relative to its chord wL⁴/(384EI)",
        "m",
        "closed form: Roark 8th ed., Table 8.1 case 2e, both ends fixed (from memory)",
        exact,
        v.abs(),
        1e-9,
    );
    verify::source("closed form: symmetry");
    verify::within(
        "position of the largest deflection, L/2",
        "m",
        x,
        l / 2.0,
        l,
        1e-6,
    );
}

#[test]
fn cantilever_beam_tip_deflection_and_its_2l_limit() {
    // Closed form (Roark, Table 8.1 case 2a, from memory): a cantilever under a uniform load
    // deflects w·L⁴/(8·E·I) at its tip. IBC Table 1604.3 footnote (from memory): the limit
    // of a cantilever is taken on twice its length, so L/240 becomes 2L/240.
    let (l, h, i, w) = (2.0, 3.0, 5.0e-5, 6e3);
    let mut f = Frame::new();
    let base = f.node(0.0, 0.0);
    let top = f.node(0.0, h);
    let tip = f.node(l, h);
    f.member(base, top, E, 10.0, 1.0); // a very stiff column: the root does not rotate
    let beam = f.member(top, tip, E, 10.0, i);
    f.fixed(base);
    let d = f.case("D", ActionCategory::Dead);
    f.udl(d, beam, w, LoadDirection::Gravity);
    let model = f.model;
    assert_eq!(beam_members(&model), vec![(beam, Some(1))]);
    let r = run(model, &[service("D", &[(d, 1.0)])], &limits(None));
    // The tip is measured from its supported end, so the rotation of the root joint counts:
    // the column (a cantilever under the end moment M = w·L²/2) turns its top by
    // θ = M·h/(E·Ic) (closed form), which moves the tip by θ·L more.
    let theta = w * l * l / 2.0 * h / (E * 1.0);
    let exact = w * l.powi(4) / (8.0 * E * i) + theta * l;
    let b = &r.cases[0].beams[0];
    verify::source(
        "IBC Table 1604.3 footnote (from memory): a cantilever's limit on twice its length",
    );
    verify::same("beam taken as a cantilever", true, b.cantilever);
    // Axial shortening of the column (A = 10 m²) moves root and tip alike.
    verify::check(
        "serviceability/beam-deflection/cantilever",
        "cantilever beam tip deflection wL⁴/(8EI) + root rotation θ·L",
        "m",
        "closed form: Roark 8th ed., Table 8.1 case 2a (from memory)",
        exact,
        b.total.abs(),
        1e-9,
    );
    let v = &r.beams[0];
    // Relative to each value, the former absolute 1e-12 rounded down to a power of ten.
    verify::close(
        "length the limit is taken on, 2L",
        "m",
        v.limit_length,
        2.0 * l,
        1e-13,
    );
    verify::close(
        "total-load limit 2L/240",
        "m",
        v.total.as_ref().unwrap().limit,
        2.0 * l / 240.0,
        1e-11,
    );
}

#[test]
fn flagpole_p_delta_drift_against_the_amplifier_1_over_1_minus_p_over_pcr() {
    // Exact (reference notes §5, Case 2 [X]; Timoshenko and Gere, Theory of Elastic
    // Stability §1.11, from memory): a cantilever of height h under axial P and tip load H
    // drifts Δ = H·(tan kh − kh)/(P·k), k = √(P/EI), so Δ2nd/Δ1st = 3(tan u − u)/u³ with
    // u = kh. The sway amplifier 1/(1 − P/Pcr), Pcr = π²EI/(4h²), approximates it within
    // 1 % up to P/Pcr = 0.5 (computed: 3(tan u − u)/u³ = 1.1096, 1.4228, 1.9863 against
    // 1/(1 − P/Pcr) = 1.1111, 1.4286, 2.0000 at P/Pcr = 0.1, 0.3, 0.5).
    let (h, i, hforce) = (5.0, 4.0e-5, 2e3);
    let pcr = std::f64::consts::PI.powi(2) * E * i / (4.0 * h * h);
    for ratio in [0.1, 0.3, 0.5] {
        let p = ratio * pcr;
        let (mut f, top, _) = flagpole(h, i);
        f.model.analysis.segments = 8;
        let d = f.case("D", ActionCategory::Dead);
        f.nodal(d, top, 0.0, -p, 0.0);
        let w = f.case("W", ActionCategory::Wind);
        f.nodal(w, top, hforce, 0.0, 0.0);
        let r = run(
            f.model,
            &[service("DW", &[(d, 1.0), (w, 1.0)])],
            &limits(None),
        );
        let s = &r.cases[0].stories[0];
        let amp = s.amplification.unwrap();
        let u = (p / (E * i)).sqrt() * h;
        let exact = 3.0 * (u.tan() - u) / u.powi(3);
        // The P-Δ/P-δ analysis (8 elements, consistent geometric stiffness) to 0.1 %.
        verify::check(
            &format!("serviceability/flagpole-amplifier/P-over-Pcr={ratio}/exact"),
            &format!("drift amplification Δ2nd/Δ1st of a flagpole, P/Pcr = {ratio}"),
            "-",
            "closed form 3(tan u − u)/u³: reference notes §5 Case 2 [X]; Timoshenko & Gere §1.11 (from memory)",
            exact,
            amp,
            1e-3,
        );
        let approx = 1.0 / (1.0 - ratio);
        verify::check(
            &format!("serviceability/flagpole-amplifier/P-over-Pcr={ratio}/approx"),
            &format!("drift amplification against 1/(1 − P/Pcr), P/Pcr = {ratio}"),
            "-",
            "AISC 360-16 Commentary App. 8, amplifier 1/(1 − P/Pcr) (from memory)",
            approx,
            amp,
            0.01,
        );
        // The service drift is the second-order one.
        assert!((s.drift() - s.drift_first_order * amp).abs() <= 1e-9 * s.drift().abs());
    }
}

/// First-order solution `Σ f·case` of `model` with gross section properties, built apart
/// from the service run.
fn gross_solution(model: &Model, factors: &[(usize, f64)]) -> Solution {
    let mut m = model.clone();
    m.analysis.stiffness = StiffnessPreset::Gross;
    let fo = FirstOrder::new(&m, &[]).unwrap();
    let parts: Vec<Solution> = factors
        .iter()
        .map(|&(k, _)| fo.solve_case(&m, k).unwrap())
        .collect();
    let refs: Vec<(f64, &Solution)> = factors.iter().map(|&(_, f)| f).zip(&parts).collect();
    Solution::combine(&refs)
}

const FRAMES: u64 = 24;

#[test]
fn random_frames_service_drift_is_gross_first_order_drift_times_the_second_order_ratio() {
    for seed in 0..FRAMES {
        let rf = RandomFrame::new(seed);
        let stories = plumbline::stories::stories(&rf.model).unwrap();
        let r = run(rf.model.clone(), &rf.cases, &limits(None));
        for (c, fc) in r.cases.iter().zip(&rf.cases) {
            let g = gross_solution(&rf.model, &fc.factors);
            let drifts: Vec<f64> = stories
                .iter()
                .map(|st| plumbline::check::story::drift_of(st, &g.displacements))
                .collect();
            // Tolerance relative to the problem's scale: the case's largest drift ratio.
            let scale = stories
                .iter()
                .zip(&drifts)
                .map(|(st, d)| (d / st.height()).abs())
                .fold(0.0, f64::max)
                .max(1e-300);
            for ((s, st), d) in c.stories.iter().zip(&stories).zip(&drifts) {
                let tol = 1e-7 * scale * st.height();
                verify::observe((s.drift_first_order - d).abs() / (scale * st.height()));
                assert!(
                    (s.drift_first_order - d).abs() <= tol,
                    "seed {seed} case {} story {}: {} vs gross {d}",
                    c.id,
                    s.story,
                    s.drift_first_order
                );
                if let (Some(d2), Some(amp)) = (s.drift_second_order, s.amplification) {
                    assert!(
                        (s.drift() - d * amp).abs() <= 1e-7 * d2.abs().max(tol),
                        "seed {seed} case {}: service drift {} vs {d} × {amp}",
                        c.id,
                        s.drift()
                    );
                    assert_eq!(s.drift(), d2);
                }
            }
        }
    }
    verify::property(
        "serviceability/random_frames_service_drift_is_gross_first_order_drift_times_the_second_order_ratio",
        "each story's service drift is the gross-section first-order drift of the case (and, \
         where P-Δ is run, times the case's Δ2nd/Δ1st)",
        FRAMES as usize,
        "largest first-order drift difference / (largest drift ratio × story height)",
        verify::observed(),
        "1e-7",
    );
}

#[test]
fn random_frames_chord_relative_deflection_equals_dense_sampling() {
    // The exact extreme (zeros of the slope) bounds every sample and dense sampling
    // (4001 stations, spacing L/4000) comes within (L/4000)²·|v''|/2 of it (Taylor).
    for seed in 0..FRAMES {
        let rf = RandomFrame::new(seed);
        let r = run(rf.model.clone(), &rf.cases, &limits(None));
        let model = service_model(&rf.model);
        let stiffness = member_stiffness(&model);
        let longest = (0..model.members.len())
            .map(|m| model.length(m))
            .fold(0.0, f64::max);
        for (c, fc) in r.cases.iter().zip(&rf.cases) {
            let s = gross_solution(&rf.model, &fc.factors);
            let loads = combined_member_loads(&model, &fc.factors);
            // The case's scale: its largest beam deflection (round-off below 1e-15 of the
            // frame's size is no figure).
            let scale = c.beams.iter().map(|b| b.total.abs()).fold(0.0, f64::max) + 1e-15 * longest;
            for (b, (m, cant)) in c.beams.iter().zip(beam_members(&model)) {
                if cant.is_some() {
                    continue;
                }
                let l = model.length(m);
                let st = member_diagram(&model, &stiffness, &s, m, &loads[m], 4001);
                let (vi, vj) = s.transverse_end_displacements(&model, m);
                let sampled = st
                    .iter()
                    .map(|p| (p.deflection - (vi + (vj - vi) * p.x / l)).abs())
                    .fold(0.0, f64::max);
                verify::observe((sampled - b.total.abs()).abs() / scale);
                assert!(
                    sampled <= b.total.abs() + 1e-9 * scale,
                    "seed {seed} {} {}: sample {sampled} above the extreme {}",
                    c.id,
                    b.member,
                    b.total
                );
                assert!(
                    sampled >= b.total.abs() - 1e-4 * scale,
                    "seed {seed} {} {}: sample {sampled} vs {}",
                    c.id,
                    b.member,
                    b.total
                );
            }
        }
    }
    verify::property(
        "serviceability/random_frames_chord_relative_deflection_equals_dense_sampling",
        "each beam's exact deflection relative to its chord bounds a 4001-station sample and \
         the sample comes within (L/4000)²·|v''|/2 of it",
        FRAMES as usize,
        "largest |sampled − exact| / the case's largest beam deflection",
        verify::observed(),
        "above: 1e-9; below: 1e-4",
    );
}

/// `check` of a shipped example with `args` (format and options), as one text.
fn check_example(name: &str, args: plumbline::app::CheckArgs) -> String {
    let path = std::path::Path::new(env!("CARGO_MANIFEST_DIR"))
        .join("examples")
        .join(name);
    plumbline::app::check(&path, &args).unwrap()
}

#[test]
fn office_demo_gives_strength_and_service_halves_on_one_page() {
    // The demo names asce7-16-service beside its strength table: one command, both halves.
    let text = check_example("office-3story.toml", Default::default());
    assert!(text.contains("Member envelope"), "strength half");
    assert!(text.contains("\nServiceability\n"), "service half");
    assert!(text.contains("Story drift under service loads"));
    assert!(text.contains("Beam deflection relative to the chord"));
    for line in text.lines().skip_while(|l| *l != "Serviceability") {
        if line.starts_with("Results assist") || line.starts_with("Moments are") {
            break;
        }
        assert!(line.chars().count() <= 120, "over 120 columns: {line}");
    }
    // JSON: the serviceability key round-trips through the document type.
    let json = check_example(
        "office-3story.toml",
        plumbline::app::CheckArgs {
            format: plumbline::report::CheckFormat::Json,
            ..Default::default()
        },
    );
    let doc: plumbline::report::summary::CheckDoc = serde_json::from_str(&json).unwrap();
    let r = doc.serviceability.as_ref().unwrap();
    assert_eq!(r.stiffness, "gross");
    assert_eq!(r.stories.len(), 3);
    assert_eq!(r.beams.len(), 6);
    let value: serde_json::Value = serde_json::from_str(&json).unwrap();
    assert_eq!(serde_json::to_value(&doc).unwrap(), value);
    // The governing service case's deflected shape, one displacement per node.
    let shape = r.shape.as_ref().unwrap();
    assert_eq!(shape.displacements.len(), 12);
}

#[test]
fn a_service_table_alone_runs_as_serviceability() {
    // Issue 18: a table of basis serviceability is analysed as serviceability: no design
    // moments, no notional loads or imperfections, no strength drift note.
    let text = check_example(
        "workshop-portal.toml",
        plumbline::app::CheckArgs {
            combos: Some("en1990-sls-characteristic".into()),
            ..Default::default()
        },
    );
    assert!(text.contains("\nServiceability\n"));
    for absent in [
        "M design",
        "Member envelope",
        "notional loads  ",
        "factored loads",
    ] {
        assert!(!text.contains(absent), "{absent}");
    }
    assert!(
        text.contains("Cases included: all 9 factored cases of the table\n"),
        "{text}"
    );
}

#[test]
fn limits_follow_set_and_an_unknown_parameter_is_refused() {
    // --set drift_h_wind=1000 makes the office's drift limit h/1000: every governing drift
    // ratio grows by 1000/400 (the drifts themselves do not change).
    let json = |sets: Vec<String>| {
        let t = check_example(
            "office-3story.toml",
            plumbline::app::CheckArgs {
                format: plumbline::report::CheckFormat::Json,
                sets,
                ..Default::default()
            },
        );
        let d: plumbline::report::summary::CheckDoc = serde_json::from_str(&t).unwrap();
        d.serviceability.unwrap()
    };
    let base = json(vec![]);
    let strict = json(vec!["drift_h_wind=1000".into()]);
    verify::source("closed form: a limit h/1000 instead of h/400 raises every ratio by 1000/400");
    for (k, (a, b)) in base.stories.iter().zip(&strict.stories).enumerate() {
        let (a, b) = (a.governing.as_ref().unwrap(), b.governing.as_ref().unwrap());
        verify::close(
            &format!(
                "story {}: governing drift ratio at h/1000, 2.5 × at h/400",
                k + 1
            ),
            "-",
            b.ratio,
            a.ratio * 2.5,
            1e-9,
        );
        verify::close(
            &format!("story {}: governing drift unchanged", k + 1),
            "m",
            b.value,
            a.value,
            0.0,
        );
    }
    let path = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("examples/office-3story.toml");
    let err = plumbline::app::check(
        &path,
        &plumbline::app::CheckArgs {
            sets: vec!["drift_h_nothing=3".into()],
            ..Default::default()
        },
    )
    .unwrap_err();
    assert!(
        err.to_string().contains("drift_h_nothing")
            || format!("{err:?}").contains("drift_h_nothing")
    );
}

#[test]
fn solve_states_its_stiffness_and_uses_gross_by_default() {
    // Issue 18 item 4. The office demo's strength analysis uses aisc-direct (0.8·EI, 0.8·EA):
    // its service load case under that preset moves exactly 1/0.8 as far (linearity).
    let path = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("examples/office-3story.toml");
    let fmt = plumbline::report::OutputFormat::Json;
    let doc = |s: &str| -> serde_json::Value {
        serde_json::from_str(
            &plumbline::app::solve_with(&path, "WL", s, fmt)
                .unwrap()
                .joined(),
        )
        .unwrap()
    };
    let (g, r) = (doc("gross"), doc("aisc-direct"));
    assert_eq!(g["stiffness"], "gross");
    assert_eq!(r["stiffness"], "aisc-direct");
    let ux = |d: &serde_json::Value| d["displacements"][1]["ux"].as_f64().unwrap();
    verify::source("AISC 360-16 §C2.3 0.8·EI and 0.8·EA (from memory); linearity");
    verify::within(
        "WL: X displacement of node 2 with aisc-direct stiffness, gross / 0.8",
        "m",
        ux(&r),
        ux(&g) / 0.8,
        ux(&g).abs(),
        1e-9,
    );
    let text = plumbline::app::solve(&path, "WL", plumbline::report::OutputFormat::Table)
        .unwrap()
        .joined();
    assert!(text.lines().nth(1).unwrap().contains("stiffness gross"));
}

#[test]
fn the_html_report_draws_the_drift_profile_and_the_deflected_shape() {
    // Issue 18 item 5: one stepped drift line per governing case with the limit drawn, and
    // the governing service case's deflected shape (lines of their own class, so that the
    // frame's members are still drawn once each).
    let path = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("examples/office-3story.toml");
    let html = plumbline::app::report(&path, &Default::default(), &mut |_, _| {}).unwrap();
    assert_eq!(html.matches("class=\"drawing drift-profile\"").count(), 1);
    assert!(html.contains("<polyline class=\"drift\" data-case=\"C-2/WR\""));
    assert_eq!(
        html.matches("<line class=\"limit\"").count(),
        3,
        "one limit per story"
    );
    assert_eq!(
        html.matches("<line class=\"shape\"").count(),
        15,
        "every member once"
    );
    assert!(html.contains("Deflected shape of the governing service case C-2/WR"));
    assert!(html.contains(plumbline::CAUTION));
}
