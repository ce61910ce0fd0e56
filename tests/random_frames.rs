//! Properties of `check` over seeded random regular frames (issue 7, "Done when"): 1–4
//! unequal bays, 1–6 unequal stories, fixed and pinned bases, beam end releases,
//! gravity-only and lateral cases, every second-order method. The generator is
//! `common::random_frame` (invented frames; no number here is an expected value).
//!
//! Run `cargo test --test random_frames -- --nocapture` to print the spread of B2 against
//! the direct analysis's Δ2nd/Δ1st.

mod common;

use common::random_frame::RandomFrame;
use plumbline::check::story::StiffnessSource;
use plumbline::check::{CaseCheck, Classification, check};
use plumbline::model::SecondOrderMethod;

/// Frames per property run (issue 7 asks for at least 100).
const FRAMES: u64 = 100;

const METHODS: [SecondOrderMethod; 4] = [
    SecondOrderMethod::AiscB1B2,
    SecondOrderMethod::AciMagnifier,
    SecondOrderMethod::Ec3AlphaCr,
    SecondOrderMethod::Direct,
];

/// Issue 7 item 1, common practice, no source: a case whose frame buckles only above
/// 1.5 × its loads and whose direct analysis converges is not unstable by any method's
/// story or frame figures. Returns whether a member formula alone (B1 or ACI δ unbounded,
/// the member checks' business) marked the case unstable, so the caller can count them.
fn assert_not_falsely_unstable(rf: &RandomFrame, method: SecondOrderMethod, c: &CaseCheck) -> bool {
    let buckling_ok = c.alpha_cr.is_none_or(|a| a >= 1.5);
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

// TODO(member, issue 7 "Done when" third bullet): assert here that the span extremes of
// the design diagram equal a dense sampling of that diagram, for every member, case and
// method of these frames (`RandomFrame::new(seed)` for seed in 0..FRAMES).

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
            }
        }
    }
    // TODO(member): these are cases whose only instability is a member formula (B1 or ACI
    // δ with Pu ≥ 0.75·Pc) while α_cr ≥ 1.5 and the direct analysis converged; once the
    // member checks settle this (issue 8 item 4), assert the list is empty.
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
}
