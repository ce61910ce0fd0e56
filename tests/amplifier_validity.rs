//! Issue 16: where an amplifier stops being valid, the design moments come from the
//! second-order analysis. Properties over seeded random frames (generator
//! `common::random_frame`: irregular bays and stories, releases, fixed, pinned and spring
//! bases, pin-ended braces, leaning columns, tiny, zero and mixed-sign lateral loads, soft
//! and tall stories), every method. The reference is the program's own direct
//! second-order analysis of the same case (same loads, notional forces and stiffness),
//! which agrees with the closed forms of the AISC 360-16 Commentary Chapter C benchmarks
//! (`tests/second_order.rs`).
//!
//! Run `cargo test --test amplifier_validity -- --nocapture` to print the spread of
//! design / second-order end moment per route.

mod common;

use common::random_frame::RandomFrame;
use common::verify;
use plumbline::check::story::SwayRoute;
use plumbline::check::{CaseCheck, Classification, check};
use plumbline::model::{NotionalLoads, SecondOrderMethod};

/// Frames per property run (issue 16 asks for at least 200).
const FRAMES: u64 = 200;

const METHODS: [SecondOrderMethod; 4] = [
    SecondOrderMethod::AiscB1B2,
    SecondOrderMethod::AciMagnifier,
    SecondOrderMethod::Ec3AlphaCr,
    SecondOrderMethod::Direct,
];

/// Order statistics of `v` (sorted in place): min, 10 %, median, 90 %, max.
fn spread(v: &mut [f64]) -> [f64; 5] {
    if v.is_empty() {
        return [f64::NAN; 5];
    }
    v.sort_by(f64::total_cmp);
    let at = |q: f64| v[((v.len() - 1) as f64 * q).round() as usize];
    [at(0.0), at(0.1), at(0.5), at(0.9), at(1.0)]
}

/// The largest end moment of the case's second-order analysis, the scale against which a
/// moment is significant.
fn case_scale(c: &CaseCheck) -> f64 {
    c.members
        .iter()
        .flat_map(|m| m.ends.iter().filter_map(|e| e.second_order))
        .fold(0.0, |a: f64, b| a.max(b.abs()))
}

/// design / second-order at member ends whose second-order moment is at least 5 % of the
/// member's largest and 1 % of the case's largest (smaller ones are noise for a ratio).
fn end_ratios(c: &CaseCheck) -> Vec<(f64, String)> {
    let scale = case_scale(c);
    let mut out = Vec::new();
    for m in c.members.iter().filter(|m| m.stable) {
        let member_scale = m
            .ends
            .iter()
            .filter_map(|e| e.second_order)
            .fold(0.0, |a: f64, b| a.max(b.abs()));
        for (k, e) in m.ends.iter().enumerate() {
            let Some(so) = e.second_order else { continue };
            if so.abs() < 0.05 * member_scale || so.abs() < 0.01 * scale || !e.design.is_finite() {
                continue;
            }
            out.push((
                e.design / so,
                format!(
                    "{} end {}: design {:.4e}, second-order {so:.4e}",
                    m.member,
                    ["i", "j"][k],
                    e.design
                ),
            ));
        }
    }
    out
}

/// The route of a member in a case: where its design moments came from.
fn route_of(m: &plumbline::check::MemberCheck) -> &'static str {
    if m.second_order {
        "second-order"
    } else if m.sway_amplifier == Some(1.0) {
        "first-order"
    } else {
        "amplified"
    }
}

#[test]
fn spread_of_design_over_second_order_end_moments() {
    // Printed for the record (issue 16 asks for the distribution per route); the
    // assertions are in `amplified_routes_stay_within_their_conditions_on_random_frames`.
    for method in METHODS {
        let mut by_route: std::collections::BTreeMap<&str, Vec<f64>> = Default::default();
        let mut worst = (f64::INFINITY, String::new());
        for seed in 0..FRAMES {
            let mut rf = RandomFrame::new(seed);
            rf.model.analysis.method = method;
            let Ok(report) = check(&rf.model, &rf.cases) else {
                continue;
            };
            for c in report.cases.iter().filter(|c| c.stable) {
                let routes: std::collections::HashMap<&str, &str> = c
                    .members
                    .iter()
                    .map(|m| (m.member.as_str(), route_of(m)))
                    .collect();
                for (r, what) in end_ratios(c) {
                    let member = what.split(' ').next().unwrap_or("");
                    by_route.entry(routes[member]).or_default().push(r);
                    by_route.entry("all").or_default().push(r);
                    if r < worst.0 {
                        worst = (r, format!("seed {seed}, case {}, {what}", c.id));
                    }
                }
            }
        }
        for (route, mut ratios) in by_route {
            let n = ratios.len();
            let short = ratios.iter().filter(|&&r| r < 0.95).count();
            let s = spread(&mut ratios);
            println!(
                "{method:>14} {route:>12}: n = {n:>6}, min {:.3}, 10 % {:.3}, median {:.3}, 90 % {:.3}, max {:.3}; below 0.95: {short}",
                s[0], s[1], s[2], s[3], s[4]
            );
        }
        println!("{method:>14} lowest at {}", worst.1);
    }
}

/// On the first-order route the method permits first-order moments: EN 1993-1-1 (5.1)
/// α_cr ≥ 10 means sway effects grow by at most 1/(1 − 1/10) = 1.11; ACI 318-19
/// 6.6.4.3(b) Q ≤ 0.05 means about 1/(1 − 0.05) = 1.053 (from memory). The allowance on
/// such a section is that growth of its first-order effects |Mns| + |Ms| (the clause
/// compares the effects of the deformed geometry with the first-order effects as a
/// whole, from memory).
const FIRST_ORDER_ALLOWANCE: f64 = 1.0 / (1.0 - 1.0 / 10.0) - 1.0;

/// Issue 16, "Done when": every EC3 and ACI design end moment is at least 0.95 × the
/// second-order analysis moment of the same case, or the route says why not (first-order
/// permitted, with the allowance [`FIRST_ORDER_ALLOWANCE`] on the sway part). Moments
/// below 1 % of the case's largest second-order end moment are noise and not compared
/// (a ratio of small numbers); where the no-sway and sway parts cancel, the 5 % is of
/// their sum |Mns| + |Ms| (common practice, no source).
///
/// The reference analysis also carries member P-δ (each member in `segments` elements),
/// which EN 1993-1-1 5.2.2(3)c leaves to the member checks of §6.3 and ACI 318-19 6.6.4.5
/// carries in a column's Mc, not in its end moments: a section may fall short by the P-δ
/// growth of the member's moments, at most 1/(1 − N/N_cr) − 1 of them with
/// N_cr = π²EI/L² of the member pinned at both ends (the amplification of a member's
/// moment by its own axial load, AISC 360-16 Commentary Case 1 / Timoshenko & Gere,
/// Theory of Elastic Stability §1.11, closed form).
fn assert_not_short(
    model: &plumbline::model::Model,
    seed: u64,
    method: SecondOrderMethod,
    c: &CaseCheck,
) -> usize {
    let scale = case_scale(c);
    let mut compared = 0;
    for (k, m) in c.members.iter().enumerate().filter(|(_, m)| m.stable) {
        let mem = &model.members[k];
        let ei = model.materials[mem.material].e * model.sections[mem.section].inertia;
        let n_cr = std::f64::consts::PI.powi(2) * ei / model.length(k).powi(2);
        let p_delta = if m.compression < n_cr {
            1.0 / (1.0 - m.compression / n_cr) - 1.0
        } else {
            f64::INFINITY
        };
        for e in &m.ends {
            let Some(so) = e.second_order else { continue };
            if so.abs() < 0.01 * scale {
                continue;
            }
            // An ACI 318-19 column is designed for Mc = δ·M2 ≥ its end moments (6.6.4.5.1,
            // 6.6.4.6.4): second-order effects of the no-sway part along the column are
            // carried there, not in the end values.
            let design = match (method, m.p_critical) {
                (SecondOrderMethod::AciMagnifier, Some(_)) if m.span.design.is_finite() => {
                    (e.design * so.signum()).max(m.span.design.abs().min(so.abs()))
                }
                _ => e.design * so.signum(),
            };
            let shortfall = (so.abs() - design).max(0.0);
            let first_order_route = m.sway_amplifier == Some(1.0) && !m.second_order;
            // 5 % of the section's scale: its second-order moment, or the sum of the parts
            // that make it up where they cancel (then the section's value is a small
            // difference of large numbers, and any amplifier's approximation shows there).
            let allowed = 0.05 * so.abs().max(e.no_sway.abs() + e.sway.abs())
                + p_delta * (e.no_sway.abs() + e.sway.abs()).max(so.abs())
                + if first_order_route {
                    FIRST_ORDER_ALLOWANCE * (e.no_sway.abs() + e.sway.abs())
                } else {
                    0.0
                }
                + 1e-9 * scale;
            assert!(
                shortfall <= allowed,
                "seed {seed}, {method}, case {}, member {}: design {:.5e} against second-order \
                 {so:.5e} (no-sway {:.4e}, sway {:.4e}, amplifier {:?}); stories: {:?}",
                c.id,
                m.member,
                e.design,
                e.no_sway,
                e.sway,
                m.sway_amplifier,
                c.stories.iter().map(|s| &s.criterion).collect::<Vec<_>>()
            );
            compared += 1;
        }
    }
    compared
}

/// Issue 16: a sway verdict and a reported amplifier come from significant quantities.
/// Δ2nd/Δ1st exists only where the first-order drift is significant; a story judged sway
/// has a significant drift ratio or is judged by a story or frame figure (B2, Q, α_cr)
/// from a same-signed pattern or the buckling analysis; every applied amplifier is at
/// least 1 and finite.
fn assert_significant(seed: u64, method: SecondOrderMethod, c: &CaseCheck) {
    for s in &c.stories {
        let what = format!(
            "seed {seed}, {method}, case {}, story {}: {}",
            c.id, s.story, s.criterion
        );
        if s.drift_negligible {
            assert!(s.drift_amplification.is_none(), "{what}");
        }
        if let Some(a) = s.sway_amplifier {
            assert!(a >= 1.0 && a.is_finite(), "{what}: amplifier {a}");
            assert!(s.route != SwayRoute::SecondOrderAnalysis, "{what}");
        }
        if s.classification == Classification::Sway {
            let by_figure = ["B2 =", "Q =", "α_cr =", "story formula"]
                .iter()
                .any(|f| s.criterion.contains(f));
            assert!(
                by_figure || (!s.drift_negligible && s.drift_amplification.is_some()),
                "{what}"
            );
        }
    }
}

/// Issue 16: an applied amplifier does not exceed the second-order analysis's own ratio
/// by more than a stated margin. The analysis's ratio of a story is Δ2nd/Δ1st where its
/// drift is significant; EN 1993-1-1 applies one amplifier to the structure, so it is
/// compared with the case's largest story ratio. Margin: (amplifier − 1) at most 2 ×
/// (ratio − 1) + 0.05 (common practice, no source: B2 with RM = 0.85 and a story
/// stiffness from a reference pattern, and δs of the Q method, are deliberately
/// conservative estimates of the same growth).
fn amplifier_excess(c: &CaseCheck, method: SecondOrderMethod) -> Vec<f64> {
    let largest = c
        .stories
        .iter()
        .filter_map(|s| s.drift_amplification)
        .fold(f64::NAN, f64::max);
    c.stories
        .iter()
        .filter(|s| s.route == SwayRoute::Amplified)
        .filter_map(|s| {
            let r = if method == SecondOrderMethod::Ec3AlphaCr {
                Some(largest).filter(|r| r.is_finite())
            } else {
                s.drift_amplification
            }?;
            let a = s.sway_amplifier?;
            Some((a - 1.0) - 2.0 * (r.max(1.0) - 1.0))
        })
        .collect()
}

#[test]
fn amplified_routes_stay_within_their_conditions_on_random_frames() {
    let mut compared = 0;
    let mut excess = Vec::new();
    for seed in 0..FRAMES {
        for method in METHODS {
            let mut rf = RandomFrame::new(seed);
            rf.model.analysis.method = method;
            let report = check(&rf.model, &rf.cases)
                .unwrap_or_else(|e| panic!("seed {seed}, {method}: {e}"));
            for c in report.cases.iter().filter(|c| c.stable) {
                if matches!(
                    method,
                    SecondOrderMethod::Ec3AlphaCr | SecondOrderMethod::AciMagnifier
                ) {
                    compared += assert_not_short(&rf.model, seed, method, c);
                }
                assert_significant(seed, method, c);
                for x in amplifier_excess(c, method) {
                    excess.push((x, seed, method, c.id.clone()));
                }
            }
        }
    }
    excess.sort_by(|a, b| b.0.total_cmp(&a.0));
    println!(
        "end moments compared: {compared}; largest amplifier excess over 2·(ratio − 1): {:?}",
        excess.iter().take(5).collect::<Vec<_>>()
    );
    assert!(compared > 10_000, "{compared}");
    assert!(
        excess.first().is_none_or(|x| x.0 <= 0.05),
        "{:?}",
        excess.first()
    );
    verify::property(
        "amplifier_validity/amplified_routes_stay_within_their_conditions_on_random_frames",
        &format!(
            "no EC3 or ACI design end moment falls more than 5 % (plus the member's own P-δ \
             growth) short of the second-order analysis of the same case ({compared} end \
             moments compared), verdicts rest on significant figures, and (amplifier − 1) is \
             at most 2·(Δ2nd/Δ1st − 1) + 0.05 (common practice, no source)"
        ),
        FRAMES as usize,
        "largest (amplifier − 1) − 2·(Δ2nd/Δ1st − 1)",
        excess.first().map_or(0.0, |x| x.0),
        "0.05",
    );
}

/// Issue 16: a frame symmetric about its centre line under symmetric gravity has no sway
/// (closed form: a symmetric response), so every method finds every story non-sway with
/// amplifier 1 (the direct method: its own moments, non-sway). Notional loads are left
/// out: they are deliberately asymmetric.
#[test]
fn symmetric_frames_under_symmetric_gravity_are_non_sway() {
    for seed in 0..FRAMES {
        for method in METHODS {
            let mut rf = RandomFrame::symmetric(seed);
            rf.model.analysis.method = method;
            rf.model.analysis.notional = NotionalLoads::None;
            let report = check(&rf.model, &rf.cases).unwrap();
            for c in report.cases.iter().filter(|c| c.direct.converged) {
                for s in &c.stories {
                    let what = format!(
                        "seed {seed}, {method}, case {}, story {}: {}",
                        c.id, s.story, s.criterion
                    );
                    assert_eq!(s.classification, Classification::NonSway, "{what}");
                    assert!(s.drift_negligible, "{what}");
                    if method == SecondOrderMethod::Direct {
                        assert_eq!(s.route, SwayRoute::SecondOrderAnalysis, "{what}");
                    } else {
                        assert_eq!(s.sway_amplifier, Some(1.0), "{what}");
                    }
                }
            }
        }
    }
    verify::property(
        "amplifier_validity/symmetric_frames_under_symmetric_gravity_are_non_sway",
        "a frame symmetric about its centre line under symmetric gravity is non-sway in every \
         story by every method, with negligible drift and amplifier 1",
        FRAMES as usize,
        "stories classified sway",
        0.0,
        "none",
    );
}

/// The braced two-bay, two-story frame of issue 16 (kip-ft; an invented frame): fixed
/// bases, a pin-ended brace from N2.1 to N3.2, 1.5 kip/ft on the beams, the direct method.
const BRACED_FRAME: &str = r#"
title = "braced two-bay frame"
units = "kip-ft"

[analysis]
method = "direct"

[[material]]
id = "steel"
E = 29000

[[section]]
id = "col"
A = 20
I = 800
role = "column"

[[section]]
id = "beam"
A = 14
I = 1100
role = "beam"

[[section]]
id = "brace"
A = 5.2
I = 18
role = "brace"

[frame]
bays = [26, 30]
stories = [15, 13]
base = "fixed"
material = "steel"
columns = ["col", "col"]
beams = ["beam", "beam"]

[[member]]
id = "BR"
i = "N2.1"
j = "N3.2"
section = "brace"
material = "steel"
hinge = "both"

[[case]]
id = "D"
category = "dead"

[[case.member_load]]
members = "B*.*"
kind = "uniform"
direction = "down"
w = 1.5
"#;

#[test]
fn braced_frame_under_dead_load_is_non_sway_by_the_direct_method() {
    // Issue 16 "Done when": before, story 2 read "sway" from Δ2nd/Δ1st = 13.48 of a
    // 0.001 in first-order drift while α_cr = 187 and B2 = 1.006. A frame whose lowest sway
    // mode is far above its loads (α_cr ≥ 10: EN 1993-1-1 (5.1), from memory; B2 ≤ 1.1:
    // AISC 360-16 App. 7.2.3(b), from memory) is non-sway, and a drift ratio is formed
    // only from a significant drift.
    let model = plumbline::input::parse_model(BRACED_FRAME, "braced.toml").unwrap();
    let d = model.case_index("D").unwrap();
    let verdicts = "EN 1993-1-1 (5.1) α_cr ≥ 10, AISC 360-16 App. 7.2.3(b) B2 ≤ 1.1 (from memory)";
    let report = check(&model, &[common::strength("1.4D", &[(d, 1.4)])]).unwrap();
    for c in &report.cases {
        println!("{}: α_cr {:?}", c.id, c.alpha_cr);
        verify::source(verdicts);
        verify::same(&format!("{}: case stable", c.id), true, c.stable);
        for s in &c.stories {
            println!(
                "  story {}: Δ1 {:.3e} m, Δ2 {:?}, ratio {:?}, B2 {:?}: {}",
                s.story,
                s.drift_first_order,
                s.drift_second_order,
                s.drift_amplification,
                s.b2,
                s.criterion
            );
            verify::source(verdicts);
            verify::same(
                &format!("{}, story {}: classification", c.id, s.story),
                Classification::NonSway,
                s.classification,
            );
            if let Some(r) = s.drift_amplification {
                verify::source(
                    "common practice, no source: the drift ratio of a non-sway frame lies within 0.1 of 1",
                );
                verify::close(
                    &format!("{}, story {}: Δ2nd/Δ1st", c.id, s.story),
                    "-",
                    r,
                    1.0,
                    0.1,
                );
            }
        }
    }
}

/// A fixed-base portal 8 m × 4 m with a pin-ended leaning post 4 m long (I = 400 cm⁴,
/// carrying 97 kN) tied to it by a pin-ended link (issue 16; the portal's sections are
/// invented, E = 210 GPa). Returns the model, the factored case and the post's index.
fn portal_with_leaning_post() -> (
    plumbline::model::Model,
    plumbline::combos::FactoredCase,
    usize,
) {
    use plumbline::model::{ActionCategory, LoadDirection, Role};
    let e = 210e9;
    let mut f = common::Frame::new();
    let n0 = f.node(0.0, 0.0);
    let n1 = f.node(0.0, 4.0);
    let n2 = f.node(8.0, 4.0);
    let n3 = f.node(8.0, 0.0);
    let p0 = f.node(12.0, 0.0);
    let p1 = f.node(12.0, 4.0);
    f.member(n0, n1, e, 78e-4, 8_000e-8);
    let beam = f.member(n1, n2, e, 60e-4, 12_000e-8);
    f.member(n3, n2, e, 78e-4, 8_000e-8);
    let post = f.member(p0, p1, e, 20e-4, 400e-8);
    f.release(post, true, true);
    let link = f.member(n2, p1, e, 20e-4, 400e-8);
    f.release(link, true, true);
    f.model.members[link].role = Role::Beam;
    f.fixed(n0);
    f.fixed(n3);
    f.pinned(p0);
    let g = f.case("G", ActionCategory::Dead);
    f.udl(g, beam, 20e3, LoadDirection::Gravity);
    f.nodal(g, p1, 0.0, -97e3, 0.0);
    f.model.analysis.method = SecondOrderMethod::Ec3AlphaCr;
    (f.model, common::strength("1.0G", &[(g, 1.0)]), post)
}

#[test]
fn a_leaning_posts_own_buckling_is_a_member_mode_not_the_frames_alpha_cr() {
    // Issue 16 "Done when". The post's own buckling factor is its Euler load over its
    // load, π²EI/(L²·N) = π²·210e9·400e-8/(4²·97e3) = 5.34 (closed form, Euler column
    // pinned at both ends): a member mode, which belongs to the member check (EN 1993-1-1
    // §6.3), not the frame's sway α_cr. The frame's lowest sway mode is far higher, so
    // EN 1993-1-1 (5.1) (α_cr ≥ 10, from memory) finds every story non-sway with
    // amplifier 1.
    let (model, case, post) = portal_with_leaning_post();
    let report = check(&model, &[case]).unwrap();
    let euler = std::f64::consts::PI.powi(2) * 210e9 * 400e-8 / (16.0 * 97e3);
    verify::source("EN 1993-1-1 (5.1): α_cr ≥ 10 permits first-order analysis (from memory)");
    for c in &report.cases {
        let a = c.alpha_cr.expect("a sway mode");
        verify::between(
            &format!("{}: the frame's α_cr, at least 10", c.id),
            "-",
            a,
            10.0,
            0.0,
            f64::INFINITY,
        );
        for s in &c.stories {
            verify::same(
                &format!("{}, story {}: classification", c.id, s.story),
                Classification::NonSway,
                s.classification,
            );
            verify::same(
                &format!("{}, story {}: sway amplifier", c.id, s.story),
                Some(1.0),
                s.sway_amplifier,
            );
        }
        let mode = c.member_mode.as_ref().expect("the post's member mode");
        verify::same(
            &format!("{}: member of the lowest member mode", c.id),
            model.members[post].id.as_str(),
            mode.member.as_str(),
        );
        // Within the safe-side mesh estimate: at most 0.1 % above the closed form.
        verify::check(
            &format!("amplifier_validity/leaning-post/{}", c.id),
            &format!(
                "member-mode factor of a pin-ended leaning post, π²EI/(L²·N), case {}",
                c.id
            ),
            "-",
            "closed form: Euler column pinned at both ends (Timoshenko & Gere §2.1, from memory)",
            euler,
            mode.alpha,
            1e-2,
        );
        assert!(
            mode.alpha <= euler * 1.001 && mode.alpha >= euler * 0.99,
            "{} vs {euler}",
            mode.alpha
        );
    }
}

#[test]
fn the_span_envelope_of_an_aci_column_is_the_envelope_of_mc() {
    // Issue 16 item 5: an ACI 318-19 column's design moment along its length is
    // Mc = δ·M2 (6.6.4.5.1); the member envelope's span entries are its envelope, also
    // where M2 lies at an end and δ = 1 (Mc then equals the end value: before, it was
    // dropped as a repeat and a real "span +" entry could be missing).
    let mut checked = 0;
    const SEEDS: u64 = 40;
    for seed in 0..SEEDS {
        let mut rf = RandomFrame::new(seed);
        rf.model.analysis.method = SecondOrderMethod::AciMagnifier;
        let report = check(&rf.model, &rf.cases).unwrap();
        let env = plumbline::envelope::envelope(&report);
        let scale = report
            .cases
            .iter()
            .filter(|c| c.stable)
            .map(case_scale)
            .fold(0.0, f64::max);
        for c in report.cases.iter().filter(|c| c.stable) {
            for (m, e) in c.members.iter().zip(&env.members) {
                if !m.span_is_mc || m.span.design.abs() <= 1e-9 * scale {
                    continue;
                }
                let span = &e.sections[1];
                let slot = if m.span.design > 0.0 {
                    &span.positive
                } else {
                    &span.negative
                };
                let got = slot.as_ref().map_or(0.0, |d| d.moment.abs());
                verify::observe((m.span.design.abs() - got) / m.span.design.abs());
                assert!(
                    got >= m.span.design.abs() * (1.0 - 1e-12),
                    "seed {seed}, case {}, member {}: Mc {} against the span envelope {got}",
                    c.id,
                    m.member,
                    m.span.design
                );
                checked += 1;
            }
        }
    }
    assert!(checked > 100, "{checked}");
    verify::property(
        "amplifier_validity/the_span_envelope_of_an_aci_column_is_the_envelope_of_mc",
        &format!(
            "an ACI 318-19 column's span entries of the member envelope reach its Mc = δ·M2 \
             (6.6.4.5.1, from memory) in every case, also where M2 lies at an end and δ = 1 \
             ({checked} columns and cases compared)"
        ),
        SEEDS as usize,
        "largest (|Mc| − span envelope) / |Mc|",
        verify::observed(),
        "1e-12",
    );
}

#[test]
fn round_off_moments_of_a_leaning_post_break_no_aci_limit() {
    // Issue 16 item 5: the pin-ended post carries no moment (closed form: a member released
    // at both ends with no load along it has M = 0 everywhere); its round-off end moments
    // must not read as "n × the first-order moment, above the 1.4 limit" of ACI 318-19
    // 6.2.5.3 (from memory), and it gets no δ (6.6.4.5 magnifies columns' moments).
    let (mut model, case, post) = portal_with_leaning_post();
    model.analysis.method = SecondOrderMethod::AciMagnifier;
    let report = check(&model, &[case]).unwrap();
    verify::source(
        "closed form: a pin-ended member with no load along it carries no moment; ACI 318-19 6.2.5.3 and 6.6.4.5 (from memory)",
    );
    for c in &report.cases {
        let m = &c.members[post];
        verify::same(
            &format!("{}: the post within the 1.4 limit of 6.2.5.3", c.id),
            true,
            m.within_limits && !m.notes.iter().any(|n| n.contains("1.4")),
        );
        verify::same(
            &format!("{}: the post's non-sway magnifier δ", c.id),
            Some(1.0),
            m.non_sway_amplifier,
        );
    }
}

#[test]
fn alpha_cr_at_the_default_mesh_is_never_above_the_converged_value() {
    // Issue 16 "Done when": the frame's α_cr (lowest sway mode) at the default `segments`
    // is never more than 0.1 % above the converged value. Converged: 8 elements per member
    // with the nested 16 (cubic elements with the consistent geometric stiffness converge
    // like h⁴ from above, a Rayleigh–Ritz bound; 0.75 % at 2 elements for an Euler column
    // gives about 3e-5 at 8 and 2e-6 at 16: closed form π²EI/L² against the mesh,
    // `tests/buckling_modes.rs`).
    const REFERENCE: usize = 8;
    use plumbline::solve::linear::MeshLoads;
    use plumbline::solve::mesh::member_stiffness;
    use plumbline::solve::second_order::SecondOrderModel;
    // The sway factor, and whether the search for it was confirmed by the Sturm count.
    let sway =
        |rf: &RandomFrame, factors: &[(usize, f64)], segments: usize| -> Option<(f64, bool)> {
            let st = member_stiffness(&rf.model);
            let so = SecondOrderModel::new(&rf.model, &st, segments).unwrap();
            let mut loads = MeshLoads::zero(&so.mesh);
            for &(k, f) in factors {
                loads.add_case(&rf.model, &so.mesh, k, f);
            }
            let b = so.buckling(&rf.model, &loads).unwrap()?;
            let complete = b.search == plumbline::solve::modes::SwaySearch::Complete;
            b.sway.map(|s| (s.alpha_cr, complete))
        };
    let default = plumbline::model::AnalysisOptions::default().segments;
    let (mut worst, mut compared) = (f64::NEG_INFINITY, 0);
    for seed in 0..FRAMES {
        let rf = RandomFrame::new(seed);
        // The gravity cases: lateral loads do not change the axial forces much.
        for fc in rf.cases.iter().take(2) {
            // The reference must be a confirmed sway mode (an unconfirmed search reports
            // the lowest mode's factor, lower still).
            let (Some((a, _)), Some((converged, true))) = (
                sway(&rf, &fc.factors, default),
                sway(&rf, &fc.factors, REFERENCE),
            ) else {
                continue;
            };
            let excess = a / converged - 1.0;
            worst = worst.max(excess);
            compared += 1;
            assert!(
                excess <= 1e-3,
                "seed {seed}, case {}: α_cr {a} at {default} elements against {converged} converged",
                fc.id
            );
        }
    }
    println!(
        "α_cr at {default} elements against {REFERENCE}, {compared} cases: largest excess {worst:.2e}"
    );
    assert!(compared > 200, "{compared}");
    verify::property(
        "amplifier_validity/alpha_cr_at_the_default_mesh_is_never_above_the_converged_value",
        "the frame's α_cr (lowest sway mode) at the default mesh is never more than 0.1 % above \
         the converged value (8 elements per member, nested 16), gravity cases",
        FRAMES as usize,
        "largest α_cr(default) / α_cr(converged) − 1",
        worst,
        "1e-3",
    );
}
