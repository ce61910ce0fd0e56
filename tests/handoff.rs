//! Issue 17: the hand-off beside the moments — design axial forces, shears and support
//! reactions. Closed forms on small frames, then properties over the seeded random frames
//! of `common::random_frame` (irregular bays and stories, releases, fixed, pinned and
//! spring bases, pin-ended braces, leaning columns, tiny, zero and mixed-sign lateral
//! loads), every method.

mod common;

use common::random_frame::RandomFrame;
use common::{Frame, only_case, portal, strength, verify};
use plumbline::check::{CaseCheck, CheckReport, check};
use plumbline::combos::FactoredCase;
use plumbline::envelope::envelope;
use plumbline::model::{
    ActionCategory, LoadDirection, Model, NotionalLoads, Restraint, Role, SecondOrderMethod,
};
use plumbline::solve::linear::MeshLoads;
use plumbline::solve::mesh::{Mesh, member_stiffness};
use plumbline::solve::second_order::SecondOrderModel;

const METHODS: [SecondOrderMethod; 4] = [
    SecondOrderMethod::AiscB1B2,
    SecondOrderMethod::AciMagnifier,
    SecondOrderMethod::Ec3AlphaCr,
    SecondOrderMethod::Direct,
];

/// Frames per property run.
const FRAMES: u64 = 60;

fn no_notional(f: &mut Frame) {
    f.model.analysis.notional = NotionalLoads::None;
}

#[test]
fn portal_base_shears_sum_to_the_lateral_load() {
    // Statics (closed form): the horizontal reactions of any frame balance the applied
    // horizontal loads, ΣRx = −ΣH, in a second-order analysis as in a first-order one
    // (the P-Δ forces of the columns are internal). Fixed-base portal, lateral H with
    // gravity on the beam; each method's design reactions.
    verify::source("closed form: statics, ΣRx = −ΣH, ΣRy = ΣP");
    for method in METHODS {
        let (mut f, [_, n1, _, _, _, b, _]) = portal(6.0, 4.0, 8e-5, 2e-4, true);
        no_notional(&mut f);
        f.model.analysis.method = method;
        let g = f.case("D", ActionCategory::Dead);
        f.udl(g, b, 20e3, LoadDirection::Gravity);
        let w = f.case("W", ActionCategory::Wind);
        let h = 35e3;
        f.nodal(w, n1, h, 0.0, 0.0);
        let c = only_case(&f.model, &strength("1", &[(g, 1.2), (w, 1.0)]));
        assert!(c.stable, "{method}");
        let r = c.reactions.as_ref().expect("second-order reactions");
        let sum_x: f64 = r.iter().map(|r| r[0]).sum();
        let sum_y: f64 = r.iter().map(|r| r[1]).sum();
        verify::close(&format!("ΣRx, {method}"), "N", sum_x, -h, 1e-9);
        verify::close(
            &format!("ΣRy, {method}"),
            "N",
            sum_y,
            1.2 * 20e3 * 6.0,
            1e-9,
        );
        let sum_x1: f64 = c.reactions_first_order.iter().map(|r| r[0]).sum();
        verify::close(&format!("ΣRx first order, {method}"), "N", sum_x1, -h, 1e-9);
    }
}

#[test]
fn brace_of_a_pin_jointed_braced_bay_carries_the_story_shear_over_cos_theta() {
    // Statics of a pin-jointed truss (closed form, any statics text): a bay of span L and
    // height h with pinned joints and one diagonal takes the story shear H through the
    // diagonal alone, N = H / cos θ with cos θ = L / √(L² + h²). The diagonal runs from the
    // right base up to the left top, so H to the right at the top compresses it. No gravity
    // load and axially stiff members: the P-Δ of the columns' equal and opposite axial
    // forces and of the brace is below 1e-6 of the force, so every method's design force
    // is the statics value.
    verify::source("closed form: statics of a pin-jointed truss, N = H / cos θ");
    let (l, h) = (6.0, 4.0);
    let load = 50e3;
    for method in METHODS {
        let mut f = Frame::new();
        no_notional(&mut f);
        f.model.analysis.method = method;
        let (e, a, i) = (200e9, 1.0, 1e-4);
        let n0 = f.node(0.0, 0.0);
        let n1 = f.node(0.0, h);
        let n2 = f.node(l, h);
        let n3 = f.node(l, 0.0);
        let c1 = f.member(n0, n1, e, a, i);
        let b = f.member(n1, n2, e, a, i);
        let c2 = f.member(n3, n2, e, a, i);
        let d = f.member(n3, n1, e, a, i);
        for m in [c1, b, c2, d] {
            f.release(m, true, true);
        }
        f.model.members[d].role = Role::Brace;
        f.pinned(n0);
        f.pinned(n3);
        let w = f.case("W", ActionCategory::Wind);
        f.nodal(w, n1, load, 0.0, 0.0);
        let report = check(&f.model, &[strength("1", &[(w, 1.0)])]).unwrap();
        let c = &report.cases[0];
        assert!(c.stable, "{method}");
        let cos = l / (l * l + h * h).sqrt();
        let brace = &c.members[d];
        for end in brace.end_actions {
            verify::close(
                &format!("brace axial force at an end, {method}"),
                "N",
                end.axial,
                -load / cos,
                1e-6,
            );
        }
        let env = envelope(&report);
        let row = env.axial[d]
            .compression
            .as_ref()
            .expect("brace compression");
        verify::close(
            &format!("brace axial force, envelope, {method}"),
            "N",
            row.axial,
            -load / cos,
            1e-6,
        );
        verify::same(
            &format!("brace tension in the envelope (it is compressed), {method}"),
            false,
            env.axial[d].tension.is_some(),
        );
    }
}

#[test]
fn two_hinged_portal_thrust_under_a_uniform_beam_load() {
    // Two-hinged rectangular portal, span L, height h, uniform load w on the beam: the
    // horizontal thrust is H = w·L² / (4·h·(2k + 3)) with k = (I_b/I_c)·(h/L), axial and
    // shear deformation neglected (unit-load method with the thrust as redundant; the
    // frame formulas of Kleinlogel give the same, from memory). The unfactored reaction
    // table of the service case D gives it; A is large so axial shortening is negligible.
    verify::source("closed form: unit-load method, H = wL²/(4h(2k+3))");
    let (l, h, ic, ib, w) = (8.0, 5.0, 6e-5, 1.5e-4, 25e3);
    let (mut f, [n0, _, _, n3, _, b, _]) = portal(l, h, ic, ib, false);
    let g = f.case("D", ActionCategory::Dead);
    f.udl(g, b, w, LoadDirection::Gravity);
    let report = check(&f.model, &[strength("1", &[(g, 1.4)])]).unwrap();
    let k = ib / ic * h / l;
    let thrust = w * l * l / (4.0 * h * (2.0 * k + 3.0));
    let d = &report.service_reactions[g];
    assert_eq!(d.case, "D");
    let at = |node: usize| {
        let s = report
            .supports
            .iter()
            .position(|s| s.node == f.model.nodes[node].id)
            .unwrap();
        d.reactions[s]
    };
    // The left support pushes the frame to the right (+X), the right one to the left.
    verify::close(
        "two-hinged portal thrust, left base",
        "N",
        at(n0)[0],
        thrust,
        1e-6,
    );
    verify::close(
        "two-hinged portal thrust, right base",
        "N",
        at(n3)[0],
        -thrust,
        1e-6,
    );
    verify::close(
        "two-hinged portal vertical reaction wL/2",
        "N",
        at(n0)[1],
        w * l / 2.0,
        1e-9,
    );
}

#[test]
fn cantilever_column_base_moment_is_h_times_height() {
    // Statics (closed form): a column fixed at its base with a lateral force H at its top
    // has the base moment H·h and base shear −H; with no axial load its second-order
    // analysis is its first-order one. Mz of the support is the moment it exerts on the
    // column, counter-clockwise positive: +H·h for H to the right.
    verify::source("closed form: statics of a cantilever, Rx = −H, M = H·h");
    let (h, load) = (4.5, 12e3);
    for method in METHODS {
        let mut f = Frame::new();
        no_notional(&mut f);
        f.model.analysis.method = method;
        let n0 = f.node(0.0, 0.0);
        let n1 = f.node(0.0, h);
        f.member(n0, n1, 200e9, 1e-2, 2e-4);
        f.fixed(n0);
        let w = f.case("W", ActionCategory::Wind);
        f.nodal(w, n1, load, 0.0, 0.0);
        let c = only_case(&f.model, &strength("1", &[(w, 1.0)]));
        let r = c.reactions.as_ref().expect("reactions")[0];
        verify::close("cantilever column base shear", "N", r[0], -load, 1e-9);
        verify::close("cantilever column base moment", "N·m", r[2], load * h, 1e-9);
    }
}

#[test]
fn a_spring_support_reports_its_spring_force() {
    // A spring's reaction is its force −k·u (Hooke's law): a cantilever on a rotational
    // base spring k under H at the top has the base moment H·h, which the spring carries,
    // and the base rotation H·h/k.
    verify::source("closed form: Hooke's law and statics, M = H·h");
    let (h, load, k) = (4.0, 10e3, 5e6);
    let mut f = Frame::new();
    no_notional(&mut f);
    let n0 = f.node(0.0, 0.0);
    let n1 = f.node(0.0, h);
    f.member(n0, n1, 200e9, 1e-2, 2e-4);
    f.support(
        n0,
        [Restraint::Fixed, Restraint::Fixed, Restraint::Spring(k)],
    );
    let w = f.case("W", ActionCategory::Wind);
    f.nodal(w, n1, load, 0.0, 0.0);
    let report = check(&f.model, &[strength("1", &[(w, 1.0)])]).unwrap();
    assert_eq!(report.supports[0].spring, [false, false, true]);
    let r = report.service_reactions[w].reactions[0];
    verify::close("rotational spring base moment", "N·m", r[2], load * h, 1e-9);
}

/// The applied loads of factored loads `factors`, `[ΣFx, ΣFy, ΣMz about the origin]`, from
/// the load definitions (not from the solver's equivalent nodal loads).
fn applied(model: &Model, mesh: &Mesh, factors: &[(usize, f64)]) -> [f64; 3] {
    let mut loads = MeshLoads::zero(mesh);
    for &(k, f) in factors {
        loads.add_case(model, mesh, k, f);
    }
    loads.resultant(mesh)
}

/// The factors of checked case `c`: those of the factored case it came from (its id less
/// a notional suffix `/N+`, `/N-`).
fn factors_of<'a>(cases: &'a [FactoredCase], c: &CaseCheck) -> &'a [(usize, f64)] {
    &cases
        .iter()
        .find(|f| c.id == f.id || c.id.starts_with(&format!("{}/N", f.id)))
        .unwrap_or_else(|| panic!("factors of {}", c.id))
        .factors
}

/// Relative difference of `a` against the scale `scale`.
fn off(a: f64, b: f64, scale: f64) -> f64 {
    (a - b).abs() / scale.max(f64::MIN_POSITIVE)
}

/// Check every reaction property of one report; returns the worst relative misfit seen.
fn reaction_properties(
    model: &Model,
    cases: &[FactoredCase],
    report: &CheckReport,
    seed: u64,
) -> f64 {
    let stiffness = member_stiffness(model);
    let second = SecondOrderModel::new(model, &stiffness, 2).unwrap();
    let mesh = &second.mesh;
    let mut worst: f64 = 0.0;
    for c in &report.cases {
        let fc = factors_of(cases, c);
        let load = applied(model, mesh, fc);
        // Scale: the largest applied force, and for moments that force times the frame's
        // extent.
        let extent = model
            .nodes
            .iter()
            .map(|n| n.x.abs().max(n.y.abs()))
            .fold(1.0, f64::max);
        let force_scale = load[0].abs().max(load[1].abs()).max(1.0);
        // First-order factored reactions balance the factored loads (statics).
        let r1 = &c.reactions_first_order;
        let sum = |r: &[[f64; 3]], k: usize| r.iter().map(|r| r[k]).sum::<f64>();
        let moment = |r: &[[f64; 3]]| {
            report
                .supports
                .iter()
                .zip(r)
                .map(|(s, r)| {
                    let n = model.nodes.iter().find(|n| n.id == s.node).unwrap();
                    r[2] + n.x * r[1] - n.y * r[0]
                })
                .sum::<f64>()
        };
        for (k, what) in [(0, "ΣFx"), (1, "ΣFy")] {
            let e = off(sum(r1, k), -load[k], force_scale);
            assert!(
                e <= 1e-9,
                "seed {seed} {}: first-order {what} off by {e:.1e}",
                c.id
            );
            worst = worst.max(e);
        }
        let e = off(moment(r1), -load[2], force_scale * extent);
        assert!(
            e <= 1e-9,
            "seed {seed} {}: first-order ΣM off by {e:.1e}",
            c.id
        );
        worst = worst.max(e);
        // The service table summed with the case's factors is the factored first-order set.
        for (s, r) in r1.iter().enumerate() {
            for (k, &rk) in r.iter().enumerate() {
                let v: f64 = fc
                    .iter()
                    .map(|&(lc, f)| f * report.service_reactions[lc].reactions[s][k])
                    .sum();
                let scale = if k == 2 {
                    force_scale * extent
                } else {
                    force_scale
                };
                let e = off(v, rk, scale);
                assert!(e <= 1e-9, "seed {seed} {}: Σ f·service ≠ factored", c.id);
                worst = worst.max(e);
            }
        }
        // The design reactions of the second-order analysis balance its loads (notional
        // forces included) in X and Y exactly.
        if let Some(r2) = &c.reactions {
            let notional: f64 = c.notional.iter().sum();
            let e = off(sum(r2, 0), -(load[0] + notional), force_scale);
            assert!(
                e <= 1e-9,
                "seed {seed} {}: second-order ΣFx off by {e:.1e}",
                c.id
            );
            let e2 = off(sum(r2, 1), -load[1], force_scale);
            assert!(
                e2 <= 1e-9,
                "seed {seed} {}: second-order ΣFy off by {e2:.1e}",
                c.id
            );
            worst = worst.max(e).max(e2);
        }
    }
    worst
}

/// Every envelope value against a dense max / min over the stable cases.
fn envelope_properties(report: &CheckReport, seed: u64) {
    let env = envelope(report);
    let stable: Vec<&CaseCheck> = report.cases.iter().filter(|c| c.stable).collect();
    // Axial: the largest tension and compression over the cases, read from the design axial
    // force at both ends and dense stations of every member (N(x) is piecewise linear in
    // the random frames' loads, so the ends and the range bound it).
    for (m, a) in env.axial.iter().enumerate() {
        let greatest = stable
            .iter()
            .map(|c| c.members[m].design_axial.1)
            .fold(f64::NEG_INFINITY, f64::max);
        let least = stable
            .iter()
            .map(|c| c.members[m].design_axial.0)
            .fold(f64::INFINITY, f64::min);
        let ends_greatest = stable
            .iter()
            .flat_map(|c| c.members[m].end_actions.map(|e| e.axial))
            .fold(f64::NEG_INFINITY, f64::max);
        if let Some(t) = &a.tension {
            assert_eq!(t.axial, greatest, "seed {seed} {} tension", a.member);
            assert!(t.axial >= ends_greatest - 1e-9 * t.axial.abs());
        }
        if let Some(c) = &a.compression {
            assert_eq!(c.axial, least, "seed {seed} {} compression", a.member);
        }
    }
    // Shear: the largest |V| per end.
    for r in &env.shear {
        let m = report.cases[0]
            .members
            .iter()
            .position(|x| x.member == r.member)
            .unwrap();
        let end = usize::from(r.location == plumbline::envelope::Location::EndJ);
        let largest = stable
            .iter()
            .map(|c| c.members[m].end_actions[end].shear.abs())
            .fold(0.0, f64::max);
        assert_eq!(r.shear.abs(), largest, "seed {seed} {} shear", r.member);
    }
    // Reactions: largest and smallest of every restrained component.
    for (s, sup) in env.reactions.iter().enumerate() {
        for c in &sup.components {
            let k = plumbline::envelope::COMPONENTS
                .iter()
                .position(|n| *n == c.component)
                .unwrap();
            let values: Vec<f64> = stable
                .iter()
                .filter_map(|x| x.reactions.as_ref().map(|r| r[s][k]))
                .collect();
            if values.is_empty() {
                continue;
            }
            let max = values.iter().copied().fold(f64::NEG_INFINITY, f64::max);
            let min = values.iter().copied().fold(f64::INFINITY, f64::min);
            assert_eq!(c.max.as_ref().unwrap().value, max, "seed {seed}");
            assert_eq!(c.min.as_ref().unwrap().value, min, "seed {seed}");
        }
    }
}

#[test]
fn reactions_balance_and_superpose_and_envelopes_are_dense_extremes_over_random_frames() {
    let mut worst: f64 = 0.0;
    let mut cases = 0;
    for seed in 0..FRAMES {
        for method in METHODS {
            let mut rf = RandomFrame::new(seed);
            rf.model.analysis.method = method;
            let report = check(&rf.model, &rf.cases)
                .unwrap_or_else(|e| panic!("seed {seed}, {method}: {e}"));
            worst = worst.max(reaction_properties(&rf.model, &rf.cases, &report, seed));
            envelope_properties(&report, seed);
            cases += report.cases.len();
        }
    }
    println!("{cases} cases; worst relative misfit of the reaction properties {worst:.1e}");
    verify::property(
        "handoff/reactions_balance_and_superpose_and_envelopes_are_dense_extremes_over_random_frames",
        &format!(
            "first-order factored reactions balance the factored loads in X, Y and moment, and \
             the second-order design reactions in X (notional forces included) and Y (closed \
             form: statics); the unfactored reaction tables summed with the case's factors \
             give the factored set (superposition); the axial, shear and reaction envelopes \
             are the extremes over the stable cases; every method ({cases} cases)"
        ),
        FRAMES as usize,
        "largest misfit / the largest applied force (× the frame's extent for moments)",
        worst,
        "1e-9",
    );
}

#[test]
fn second_order_base_moment_balances_the_loads_in_the_deformed_geometry() {
    // Statics of the deflected cantilever (closed form): a column fixed at its base with a
    // lateral force H and a vertical load P at its top, which sways by Δ, has the base
    // moment H·h + P·Δ. The design reaction of the second-order analysis must balance the
    // loads there, with Δ that analysis's own top drift.
    verify::source("closed form: statics of the deflected cantilever, M = H·h + P·Δ");
    let (h, load, p) = (5.0, 8e3, 600e3);
    let mut f = Frame::new();
    no_notional(&mut f);
    f.model.analysis.method = SecondOrderMethod::Direct;
    let n0 = f.node(0.0, 0.0);
    let n1 = f.node(0.0, h);
    f.member(n0, n1, 200e9, 1e-2, 8e-5);
    f.fixed(n0);
    let w = f.case("W", ActionCategory::Wind);
    f.nodal(w, n1, load, -p, 0.0);
    let c = only_case(&f.model, &strength("1", &[(w, 1.0)]));
    let delta = c.top_drift_second_order.expect("converged");
    let r = c.reactions.as_ref().expect("reactions")[0];
    assert!(delta > 1e-3, "the column sways visibly: Δ = {delta}");
    verify::close(
        "second-order base moment H·h + P·Δ",
        "N·m",
        r[2],
        load * h + p * delta,
        1e-6,
    );
    verify::close("vertical reaction P", "N", r[1], p, 1e-9);
}
