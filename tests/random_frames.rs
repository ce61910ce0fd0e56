//! Properties of `check` over seeded random regular frames (issue 7, "Done when"): 1–4
//! unequal bays, 1–6 unequal stories, fixed and pinned bases, beam end releases,
//! gravity-only and lateral cases, every second-order method. The generator is
//! `common::random_frame` (invented frames; no number here is an expected value).
//!
//! Run `cargo test --test random_frames -- --nocapture` to print the spread of B2 against
//! the direct analysis's Δ2nd/Δ1st.

mod common;

use common::random_frame::RandomFrame;
use common::verify;
use plumbline::check::story::StiffnessSource;
use plumbline::check::{CaseCheck, Classification, check};
use plumbline::model::{LoadDirection, MemberLoadKind, SecondOrderMethod};

/// Frames per property run (issue 7 asks for at least 100).
const FRAMES: u64 = 100;

const METHODS: [SecondOrderMethod; 4] = [
    SecondOrderMethod::AiscB1B2,
    SecondOrderMethod::AciMagnifier,
    SecondOrderMethod::Ec3AlphaCr,
    SecondOrderMethod::Direct,
];

/// Issue 7 item 1, common practice, no source: a case whose frame buckles only above
/// 2 × its loads and whose direct analysis converges is not unstable by any method's
/// story or frame figures. Returns whether a member formula alone (B1 or ACI δ unbounded,
/// the member checks' business) marked the case unstable, so the caller can count them.
fn assert_not_falsely_unstable(rf: &RandomFrame, method: SecondOrderMethod, c: &CaseCheck) -> bool {
    // 2 rather than 1.5 since the generator's frames gained braces, leaning columns and
    // soft stories (issue 16): at α_cr ≈ 1.5 B2 ≈ 3 and Pr = Pnt + B2·Plt of a column can
    // honestly reach its Pe1 (AISC 360-16 A-8-3).
    let buckling_ok = c.alpha_cr.is_none_or(|a| a >= 2.0);
    if !(buckling_ok && c.direct.converged) || c.stable {
        return false;
    }
    let members_unstable = c.members.iter().any(|m| !m.stable);
    let stories_unstable = c
        .stories
        .iter()
        .any(|s| s.classification == Classification::Unstable);
    assert!(
        !stories_unstable && members_unstable,
        "seed {} ({} bays, {} stories, fixed {}), {method}, case {}: unstable while α_cr = \
         {:?} and the direct analysis converged; stories {:#?}",
        rf.seed,
        rf.bays,
        rf.stories,
        rf.fixed_bases,
        c.id,
        c.alpha_cr,
        c.stories,
    );
    true
}

/// Issue 7 item 1: every story figure comes from a pattern whose shear and drift have the
/// same sign (AISC 360-16 App. 8: H and ΔH of one lateral load, from memory).
fn assert_same_signed_pattern(rf: &RandomFrame, c: &CaseCheck) {
    for s in &c.stories {
        if s.stiffness_source == StiffnessSource::Support {
            continue;
        }
        assert!(
            s.stiffness_shear * s.stiffness_drift > 0.0 && s.stiffness > 0.0,
            "seed {}, case {}, story {}: H = {}, ΔH = {} ({})",
            rf.seed,
            c.id,
            s.story,
            s.stiffness_shear,
            s.stiffness_drift,
            s.stiffness_source
        );
    }
}

/// Simple-span moment M0(x) of the factored member loads on member `m` of a generated
/// frame, sagging positive (closed form of a simply supported beam: `w·x(L − x)/2` for a
/// full uniform load, `P·(L − a)·x/L` or `P·a·(L − x)/L` for a point load at a; any
/// strength-of-materials text), with the positions of its point loads. The generator puts
/// only full-length gravity loads and gravity point loads on its horizontal beams, drawn
/// from end i on the left (local y up), and nothing on its columns.
fn simple_span_moment(
    rf: &RandomFrame,
    factors: &[(usize, f64)],
    m: usize,
) -> (impl Fn(f64) -> f64, Vec<f64>, f64) {
    let l = rf.model.length(m);
    let mut udl = 0.0;
    let mut points: Vec<(f64, f64)> = Vec::new();
    for &(k, f) in factors {
        for load in rf.model.load_cases[k]
            .member
            .iter()
            .filter(|q| q.member == m)
        {
            match load.kind {
                MemberLoadKind::Distributed {
                    a,
                    b,
                    w_a,
                    w_b,
                    direction: LoadDirection::Gravity,
                    ..
                } if a == 0.0 && (b - l).abs() <= 1e-12 * l && w_a == w_b => udl += f * w_a,
                MemberLoadKind::Point {
                    a,
                    p,
                    direction: LoadDirection::Gravity,
                } => points.push((a, f * p)),
                ref other => panic!("the generator's loads changed: {other:?}"),
            }
        }
    }
    let xs = points.iter().map(|p| p.0).collect();
    let curvature = udl.abs();
    let m0 = move |x: f64| {
        udl * x * (l - x) / 2.0
            + points
                .iter()
                .map(|&(a, p)| {
                    if x <= a {
                        p * (l - a) * x / l
                    } else {
                        p * a * (l - x) / l
                    }
                })
                .sum::<f64>()
    };
    (m0, xs, curvature)
}

/// Issue 7 item 2 ("Done when", third bullet): for every member, case and amplified
/// method, the reported span extremes (`span_max`, `span_min`) and end design moments
/// equal a dense sampling of the design diagram
/// `D(x) = k_ns·[Mns,i + (Mns,j − Mns,i)·x/L + M0(x)] + k_s·[Ms,i + (Ms,j − Ms,i)·x/L]`,
/// rebuilt here from the reported end parts, the amplifiers (AISC: k_ns = B1; ACI and
/// EN 1993-1-1: k_ns = 1; k_s the applied sway amplifier) and the closed-form simple-span
/// moment M0 of the factored loads (statics of a member: the moment is the line through
/// its end moments plus M0). Sampling: 400 intervals plus every point-load position; a
/// smooth maximum between samples exceeds them by at most k_ns·w·(L/400)²/8.
#[test]
fn span_extremes_equal_a_dense_sampling_of_the_design_diagram() {
    const N: usize = 400;
    let mut checked = 0usize;
    for seed in 0..FRAMES {
        let mut rf = RandomFrame::new(seed);
        for method in [
            SecondOrderMethod::AiscB1B2,
            SecondOrderMethod::AciMagnifier,
            SecondOrderMethod::Ec3AlphaCr,
        ] {
            rf.model.analysis.method = method;
            let report = check(&rf.model, &rf.cases).unwrap();
            for c in report.cases.iter().filter(|c| c.stable) {
                let fc = rf
                    .cases
                    .iter()
                    .find(|f| c.id.split('/').next() == Some(f.id.as_str()))
                    .expect("case id");
                for (m, mc) in c.members.iter().enumerate() {
                    // On the second-order route the diagram is the direct analysis's
                    // (checked with the direct method below).
                    if mc.second_order {
                        continue;
                    }
                    let k_ns = match method {
                        SecondOrderMethod::AiscB1B2 => mc.non_sway_amplifier.unwrap(),
                        _ => 1.0,
                    };
                    let k_s = mc.sway_amplifier.unwrap();
                    let l = rf.model.length(m);
                    let (m0, point_xs, w) = simple_span_moment(&rf, &fc.factors, m);
                    let [ei, ej] = mc.ends;
                    let d = |x: f64| {
                        k_ns * (ei.no_sway + (ej.no_sway - ei.no_sway) * x / l + m0(x))
                            + k_s * (ei.sway + (ej.sway - ei.sway) * x / l)
                    };
                    let xs = (0..=N).map(|k| l * k as f64 / N as f64).chain(point_xs);
                    let (mut max, mut min) = (f64::NEG_INFINITY, f64::INFINITY);
                    for x in xs {
                        max = max.max(d(x));
                        min = min.min(d(x));
                    }
                    let scale = max.abs().max(min.abs()).max(1.0);
                    let round = 1e-9 * scale;
                    let between = k_ns * w * (l / N as f64).powi(2) / 8.0 + round;
                    let what =
                        format!("seed {seed}, {method}, case {}, member {}", c.id, mc.member);
                    verify::observe((mc.ends[0].design - d(0.0)).abs() / scale);
                    verify::observe((mc.ends[1].design - d(l)).abs() / scale);
                    verify::observe((d(mc.span_max.x) - mc.span_max.design).abs() / scale);
                    assert!((mc.ends[0].design - d(0.0)).abs() <= round, "{what}: end i");
                    assert!((mc.ends[1].design - d(l)).abs() <= round, "{what}: end j");
                    let (hi, lo) = (mc.span_max, mc.span_min);
                    assert!(
                        hi.design >= max - round && hi.design <= max + between,
                        "{what}: span_max {} vs sampled {max}",
                        hi.design
                    );
                    assert!(
                        lo.design <= min + round && lo.design >= min - between,
                        "{what}: span_min {} vs sampled {min}",
                        lo.design
                    );
                    // The reported positions carry the reported values.
                    assert!(
                        (d(hi.x) - hi.design).abs() <= round,
                        "{what}: x of span_max"
                    );
                    assert!(
                        (d(lo.x) - lo.design).abs() <= round,
                        "{what}: x of span_min"
                    );
                    checked += 1;
                }
            }
        }
    }
    // The direct method's diagram is the second-order one (P-δ inside each element,
    // `solve::second_order`); its extremes include the member ends, so they bracket the end
    // design moments (the diagram is continuous there: M(0), M(L) are the end moments).
    let mut direct = 0usize;
    for seed in 0..FRAMES {
        let mut rf = RandomFrame::new(seed);
        rf.model.analysis.method = SecondOrderMethod::Direct;
        let report = check(&rf.model, &rf.cases).unwrap();
        for c in report.cases.iter().filter(|c| c.stable) {
            for mc in &c.members {
                let [ei, ej] = mc.ends;
                let scale = ei.design.abs().max(ej.design.abs()).max(1.0);
                let what = format!("seed {seed}, direct, case {}, member {}", c.id, mc.member);
                assert!(
                    mc.span_max.design >= ei.design.max(ej.design) - 1e-9 * scale,
                    "{what}: span_max {:?} below an end {ei:?} {ej:?}",
                    mc.span_max
                );
                assert!(
                    mc.span_min.design <= ei.design.min(ej.design) + 1e-9 * scale,
                    "{what}: span_min {:?} above an end {ei:?} {ej:?}",
                    mc.span_min
                );
                direct += 1;
            }
        }
    }
    println!(
        "span extremes checked against dense sampling on {checked} member results; direct \
         method extremes bracket the end moments on {direct}"
    );
    // Since issue 16 a case whose amplifier is outside its clause takes the second-order
    // analysis's moments (checked with the direct method's above), so fewer results are
    // amplified ones.
    assert!(checked > 5_000, "{checked}");
    verify::property(
        "random_frames/span_extremes_equal_a_dense_sampling_of_the_design_diagram",
        &format!(
            "design end moments and span extremes of the amplified diagram (AISC, ACI, EN 1993) \
             equal the diagram rebuilt from its parts at the ends and bound a 400-station \
             sample; {checked} member results, and the direct method's extremes bracket its \
             end moments on {direct}"
        ),
        FRAMES as usize,
        "largest end or extreme mismatch / the diagram's largest moment",
        verify::observed(),
        "1e-9 (span extremes: + w·(L/400)²/8)",
    );
}

/// A second-order amplifier of sway effects is never below 1: B2 (AISC 360-16 A-8-6 is
/// 1/(1 − αPstory/Pe,story) ≥ 1), δs (ACI 318-19 6.6.4.6.2 ≥ 1), 1/(1 − 1/α_cr) (EN
/// 1993-1-1 5.2.2(5)B ≥ 1), and an amplifier read off the direct analysis, where a story
/// whose first-order drift is small or mixed in sign can give a per-story Δ2nd/Δ1st below
/// 1 or negative (the applied amplifier then falls back on the frame's top-drift ratio;
/// common practice, no source).
fn assert_amplifiers_at_least_one(rf: &RandomFrame, c: &CaseCheck) {
    for s in &c.stories {
        if let Some(a) = s.sway_amplifier {
            assert!(
                a >= 1.0 && a.is_finite(),
                "seed {}, case {}, story {}: sway amplifier {a} ({})",
                rf.seed,
                c.id,
                s.story,
                s.criterion
            );
        }
    }
}

#[test]
fn no_false_instability_and_same_signed_story_patterns() {
    let mut by_member_formula: Vec<(u64, SecondOrderMethod, String)> = Vec::new();
    for seed in 0..FRAMES {
        let mut rf = RandomFrame::new(seed);
        for method in METHODS {
            rf.model.analysis.method = method;
            let report = check(&rf.model, &rf.cases).unwrap_or_else(|e| {
                panic!("seed {seed}, {method}: check failed: {e}");
            });
            for c in &report.cases {
                if assert_not_falsely_unstable(&rf, method, c) {
                    by_member_formula.push((seed, method, c.id.clone()));
                }
                assert_same_signed_pattern(&rf, c);
                assert_amplifiers_at_least_one(&rf, c);
            }
        }
    }
    // Cases whose only instability is a member formula (B1 of AISC A-8-3) while α_cr ≥ 2
    // and the direct analysis converged. ACI's Pu ≥ 0.75·Pc is a limit on the column's
    // design (`within_limits`), not an instability of the case (issue 8 item 4), so the
    // list must be empty.
    for method in METHODS {
        let list: Vec<_> = by_member_formula
            .iter()
            .filter(|(_, m, _)| *m == method)
            .map(|(seed, _, id)| format!("{seed}:{id}"))
            .collect();
        println!(
            "{method}: cases unstable by a member formula only, α_cr ≥ 1.5 and direct \
             converged: {} {:?}",
            list.len(),
            list.iter().take(6).collect::<Vec<_>>()
        );
    }
    assert!(by_member_formula.is_empty(), "{by_member_formula:?}");
    verify::property(
        "random_frames/no_false_instability_and_same_signed_story_patterns",
        "no case is declared unstable by a story or member formula while α_cr ≥ 2 and the \
         direct analysis converged; every story stiffness comes from a same-signed pattern; \
         every sway amplifier is at least 1 (AISC, ACI, EN 1993, direct)",
        FRAMES as usize,
        "cases unstable by a member formula only",
        by_member_formula.len() as f64,
        "none",
    );
}

/// Order statistics of `v` (sorted in place): min, 10 %, median, 90 %, max.
fn spread(v: &mut [f64]) -> [f64; 5] {
    v.sort_by(f64::total_cmp);
    let at = |q: f64| v[((v.len() - 1) as f64 * q).round() as usize];
    [at(0.0), at(0.1), at(0.5), at(0.9), at(1.0)]
}

#[test]
fn spread_of_b2_against_the_direct_drift_ratio() {
    // Not an assertion on the amplifiers' agreement (B2 is an approximation, AISC 360-16
    // App. 8; the direct analysis includes P-δ and the notional loads of the case): the
    // spread is printed for the record. Asserted only: B2 ≥ 1 (A-8-6) and Δ2/Δ1 finite.
    let mut ratio = Vec::new();
    let mut lateral_ratio = Vec::new();
    let mut alpha_cr = Vec::new();
    let mut worst = (1.0, 0, String::new(), 0);
    let mut least_b2 = f64::INFINITY;
    for seed in 0..FRAMES {
        let mut rf = RandomFrame::new(seed);
        rf.model.analysis.method = SecondOrderMethod::AiscB1B2;
        let report = check(&rf.model, &rf.cases).unwrap();
        alpha_cr.extend(report.cases.iter().filter_map(|c| c.alpha_cr));
        for c in report.cases.iter().filter(|c| c.stable) {
            let lateral = !c.id.starts_with("1.4D") && !c.id.starts_with("1.2D+1.6L");
            for s in &c.stories {
                let (Some(b2), Some(r)) = (s.b2, s.drift_amplification) else {
                    continue;
                };
                least_b2 = least_b2.min(b2);
                assert!(b2 >= 1.0 && r.is_finite());
                // Only drifts that are more than round-off (1/100 000 of the height).
                if s.drift_ratio.abs() < 1e-5 {
                    continue;
                }
                ratio.push(b2 / r);
                if (b2 / r - 1.0).abs() > (worst.0 - 1.0_f64).abs() {
                    worst = (b2 / r, seed, c.id.clone(), s.story);
                }
                if lateral {
                    lateral_ratio.push(b2 / r);
                }
            }
        }
    }
    let all = spread(&mut ratio);
    let lat = spread(&mut lateral_ratio);
    println!(
        "B2 / (Δ2nd/Δ1st), AISC method, {FRAMES} frames: all story figures n = {}: min {:.3}, \
         10 % {:.3}, median {:.3}, 90 % {:.3}, max {:.3}",
        ratio.len(),
        all[0],
        all[1],
        all[2],
        all[3],
        all[4]
    );
    println!(
        "  cases with wind only, n = {}: min {:.3}, 10 % {:.3}, median {:.3}, 90 % {:.3}, max {:.3}",
        lateral_ratio.len(),
        lat[0],
        lat[1],
        lat[2],
        lat[3],
        lat[4]
    );
    let a = spread(&mut alpha_cr);
    println!(
        "  frame α_cr over {} cases: min {:.2}, 10 % {:.2}, median {:.2}, 90 % {:.2}, max {:.1}; \
         farthest B2/(Δ2/Δ1) = {:.3} at seed {}, case {}, story {}",
        alpha_cr.len(),
        a[0],
        a[1],
        a[2],
        a[3],
        a[4],
        worst.0,
        worst.1,
        worst.2,
        worst.3
    );
    assert!(!ratio.is_empty());
    verify::property(
        "random_frames/spread_of_b2_against_the_direct_drift_ratio",
        &format!(
            "B2 ≥ 1 (AISC 360-16 App. 8 eq. A-8-6) and Δ2nd/Δ1st finite in every story of \
             every stable case, AISC B1/B2 method; the spread of B2/(Δ2nd/Δ1st) is printed, \
             not asserted (median {:.3}, {} story figures)",
            all[2],
            ratio.len()
        ),
        FRAMES as usize,
        "least B2 seen",
        least_b2,
        "≥ 1",
    );
}

#[test]
fn moment_frame_table_agrees_with_the_member_by_member_rule() {
    // Property (no engineering number, common practice, no source): the one-pass table of
    // moment-frame members (`moment_frame_members`, used for Pmf of AISC 360-16 App. 8
    // A-8-8 and the portal columns) equals the member-by-member rule
    // (`is_moment_frame_column`) on every member of the seeded random frames: releases,
    // pinned and fixed bases, leaning columns and pin-ended braces included.
    use plumbline::check::story::{is_moment_frame_column, moment_frame_members};
    let mut differ = 0;
    let mut members = 0;
    for seed in 0..FRAMES {
        for rf in [RandomFrame::new(seed), RandomFrame::symmetric(seed)] {
            let table = moment_frame_members(&rf.model);
            assert_eq!(table.len(), rf.model.members.len());
            for (m, &t) in table.iter().enumerate() {
                members += 1;
                if t != is_moment_frame_column(&rf.model, m) {
                    differ += 1;
                }
            }
        }
    }
    assert_eq!(differ, 0);
    verify::property(
        "random_frames/moment_frame_table_agrees_with_the_member_by_member_rule",
        &format!(
            "the one-pass table of moment-frame columns equals the member-by-member rule \
             on all {members} members (common practice, no source)"
        ),
        2 * FRAMES as usize,
        "members where the two differ",
        differ as f64,
        "none",
    );
}
