//! The approximate check (hand methods beside the stiffness solution): the methods' own
//! closed forms, the portal method against the stiffness solution of a regular frame, and
//! input mistakes flagged. The hand methods themselves are common practice, no source;
//! each check below names how its expected value is obtained.

mod common;

use common::random_frame::{RandomFrame, factored};
use common::{Frame, portal, verify};
use plumbline::approx::{
    Flag, INFLECTION, INFLECTION_PROPPED, Location, Thresholds, approximate, approximate_check,
    beam_gravity, carry_over, portal_shares,
};
use plumbline::combos::{Basis, FactoredCase};
use plumbline::model::{ActionCategory, LoadDirection, Model};
use plumbline::solve::FirstOrder;
use plumbline::stories::stories;

/// A factored case on the strength basis with `factors` on the model's load cases.
fn case(id: &str, factors: &[(usize, f64)]) -> FactoredCase {
    factored(id, Basis::Strength, factors)
}

#[test]
fn beam_gravity_follows_the_inflection_point_closed_form() {
    verify::source(
        "common practice, no source (inflection points at 0.1 L); closed form statics of the parts",
    );
    let (w, l) = (12e3, 7.5);
    let wl2 = w * l * l;
    // Closed form, inflection points at 0.1 L from each end (common practice, no source):
    // the middle 0.8 L is simply supported, M_mid = w(0.8L)²/8 = 0.64/8 wL² = 0.08 wL².
    // Each end 0.1 L is a cantilever carrying its own load and the middle part's reaction
    // w·0.8L/2 = 0.4 wL at its tip: M_end = −(w(0.1L)²/2 + 0.4wL·0.1L)
    // = −(0.005 + 0.04) wL² = −0.045 wL². Check: 0.08 + 0.045 = 0.125 = wL²/8, the
    // simple-span moment, as statics requires.
    let (mi, mid, mj, x) = beam_gravity(w, l, INFLECTION, INFLECTION);
    verify::close(
        "beam end moment i, −0.045 wL²",
        "N·m",
        mi,
        -0.045 * wl2,
        1e-12,
    );
    verify::close(
        "beam end moment j, −0.045 wL²",
        "N·m",
        mj,
        -0.045 * wl2,
        1e-12,
    );
    verify::close(
        "beam mid-span moment, 0.08 wL²",
        "N·m",
        mid,
        0.08 * wl2,
        1e-12,
    );
    verify::close(
        "position of the mid-span moment, L/2",
        "m",
        x,
        0.5 * l,
        1e-12,
    );

    // End i released: the simply supported part runs from end i to 0.1 L from end j,
    // length 0.9 L: M_mid = w(0.9L)²/8 = 0.10125 wL² at x = 0.45 L; end j carries
    // −(w(0.1L)²/2 + 0.45wL·0.1L) = −0.05 wL² (closed form, same statics).
    let (mi, mid, mj, x) = beam_gravity(w, l, 0.0, INFLECTION);
    verify::close("end i released: end moment i", "N·m", mi, 0.0, 0.0);
    verify::close(
        "end i released: span moment 0.10125 wL²",
        "N·m",
        mid,
        0.10125 * wl2,
        1e-12,
    );
    verify::close(
        "end i released: end moment j, −0.05 wL²",
        "N·m",
        mj,
        -0.05 * wl2,
        1e-12,
    );
    verify::close(
        "end i released: position of the span moment, 0.45 L",
        "m",
        x,
        0.45 * l,
        1e-12,
    );
}

#[test]
fn propped_span_inflection_scales_the_rule_by_the_closed_forms() {
    // Closed forms, uniform load (beam tables: fixed–fixed end moment wL²/12 with
    // inflection points at (3 − √3)/6·L; fixed–pinned end moment wL²/8 with the inflection
    // point at L/4 from the fixed end): the inflection-point statics of `beam_gravity` give
    // those end moments back at those positions, and INFLECTION_PROPPED is the rule's 0.1
    // scaled by the ratio of the two positions (common practice, no source).
    verify::source(
        "closed form: fixed-end moments wL²/12 and wL²/8 at their inflection points (beam tables)",
    );
    let (w, l) = (10.0e3, 6.0);
    let wl2 = w * l * l;
    let a_fixed = (3.0 - 3f64.sqrt()) / 6.0;
    let (mi, _, mj, _) = beam_gravity(w, l, a_fixed, a_fixed);
    verify::close("fixed–fixed, end i: −wL²/12", "N·m", mi, -wl2 / 12.0, 1e-12);
    verify::close("fixed–fixed, end j: −wL²/12", "N·m", mj, -wl2 / 12.0, 1e-12);
    let (mi, _, mj, _) = beam_gravity(w, l, 0.0, 0.25);
    assert_eq!(mi, 0.0);
    verify::close(
        "fixed–pinned, fixed end: −wL²/8",
        "N·m",
        mj,
        -wl2 / 8.0,
        1e-12,
    );
    verify::close(
        "propped-span inflection: 0.1 · 0.25 / 0.2113",
        "L",
        INFLECTION_PROPPED,
        INFLECTION * 0.25 / a_fixed,
        1e-12,
    );
}

#[test]
fn portal_shares_and_carry_over_follow_their_definitions() {
    // Portal method (common practice, no source): n columns, exterior V/(2(n−1)),
    // interior V/(n−1); for four columns and V = 6: 1, 2, 2, 1.
    verify::source(
        "common practice, no source (portal method: exterior V/(2(n−1)), interior V/(n−1))",
    );
    verify::same(
        "portal shares of V = 6 among four columns",
        vec![1.0, 2.0, 2.0, 1.0],
        portal_shares(4, 6.0),
    );
    // Moment distribution, prismatic member with the far end fixed (common practice, no
    // source): carry-over factor 1/2.
    verify::source("common practice, no source (moment distribution: carry-over factor 1/2)");
    verify::close(
        "moment carried over from −8",
        "-",
        carry_over(-8.0),
        -4.0,
        0.0,
    );
}

#[test]
fn single_bay_portal_takes_the_methods_values() {
    // One bay L = 8 m, h = 4 m, fixed bases; gravity w on the beam, H at the left top.
    verify::source(
        "common practice, no source (portal method, inflection points at 0.1 L, carry-over 1/2); closed form statics",
    );
    let (l, h, w, big_h) = (8.0, 4.0, 10e3, 20e3);
    let (mut f, [_, top_l, _, _, col_l, beam, col_r]) = portal(l, h, 1e-4, 2e-4, true);
    let g = f.case("G", ActionCategory::Dead);
    f.udl(g, beam, w, LoadDirection::Gravity);
    let lat = f.case("H", ActionCategory::Wind);
    f.nodal(lat, top_l, big_h, 0.0, 0.0);
    let st = stories(&f.model).expect("one story");
    let wl2 = w * l * l;

    // Gravity: beam ends −0.045 wL², mid-span +0.08 wL² (closed form above). Each top
    // joint has one column, which takes the whole unbalance: internal moment at the
    // column top equal to the beam's end moment, −0.045 wL² (joint equilibrium: the end
    // actions Mz of beam and column at the joint sum to zero; left column drawn up, so
    // M(L) = Mz_j = −Mz_i(beam) = M(0)(beam)); its fixed base gets half of the column
    // top's end action (carry-over 1/2), internal M(0) = −Mz_i = +0.0225 wL².
    let a = approximate(&f.model, &st, &[(g, 1.0)]);
    let value = |m: usize, at: Location| {
        a[m].iter()
            .find(|r| r.0 == at)
            .map(|r| r.2 + r.3)
            .expect("row")
    };
    verify::close(
        "gravity: beam end moment i, −0.045 wL²",
        "N·m",
        value(beam, Location::EndI),
        -0.045 * wl2,
        1e-12,
    );
    verify::close(
        "gravity: beam end moment j, −0.045 wL²",
        "N·m",
        value(beam, Location::EndJ),
        -0.045 * wl2,
        1e-12,
    );
    verify::close(
        "gravity: beam span moment, 0.08 wL²",
        "N·m",
        value(beam, Location::Span),
        0.08 * wl2,
        1e-12,
    );
    verify::close(
        "gravity: left column top moment, −0.045 wL²",
        "N·m",
        value(col_l, Location::EndJ),
        -0.045 * wl2,
        1e-12,
    );
    verify::close(
        "gravity: left column base moment, 0.0225 wL²",
        "N·m",
        value(col_l, Location::EndI),
        0.0225 * wl2,
        1e-12,
    );

    // Lateral, portal method: two exterior columns, V = H/2 each; inflection at
    // mid-height, M(0) = −V·h/2 = −Hh/4, M(h) = +Hh/4 (M(x) = V·(x − h/2)). The beam
    // balances the column top at each joint, inflection at mid-span: end moments ∓Hh/4.
    let a = approximate(&f.model, &st, &[(lat, 1.0)]);
    let value = |m: usize, at: Location| {
        a[m].iter()
            .find(|r| r.0 == at)
            .map(|r| r.2 + r.3)
            .expect("row")
    };
    for c in [col_l, col_r] {
        verify::close(
            "lateral: column base moment, −Hh/4 (each column)",
            "N·m",
            value(c, Location::EndI),
            -big_h * h / 4.0,
            1e-12,
        );
        verify::close(
            "lateral: column top moment, +Hh/4 (each column)",
            "N·m",
            value(c, Location::EndJ),
            big_h * h / 4.0,
            1e-12,
        );
    }
    verify::close(
        "lateral: beam end moment i, Hh/4",
        "N·m",
        value(beam, Location::EndI).abs(),
        big_h * h / 4.0,
        1e-12,
    );
    verify::close(
        "lateral: beam end moment j against end i",
        "N·m",
        value(beam, Location::EndJ),
        -value(beam, Location::EndI),
        1e-12,
    );
    verify::within(
        "lateral: beam span moment (inflection at mid-span), against H·h",
        "N·m",
        value(beam, Location::Span),
        0.0,
        big_h * h,
        1e-9,
    );

    // The correct model raises no flag against its own stiffness solution.
    let r = approximate_check(
        &f.model,
        &[case("G+H", &[(g, 1.0), (lat, 1.0)])],
        &Thresholds::default(),
    )
    .expect("check runs");
    assert!(
        r.cases[0].members.iter().all(|e| e.flags.is_empty()),
        "{:?}",
        r.cases[0]
    );
}

/// A regular frame: `bays` bays of 6 m, `stories` stories of 3.5 m, fixed bases, columns
/// I = 2e-4 m⁴, beams I = 4e-4 m⁴, E = 200 GPa, 50 kN at every level on the left.
fn regular(bays: usize, n_stories: usize) -> (Frame, usize, Vec<Vec<usize>>) {
    let mut f = Frame::new();
    let nodes: Vec<Vec<usize>> = (0..=bays)
        .map(|g| {
            (0..=n_stories)
                .map(|k| f.node(6.0 * g as f64, 3.5 * k as f64))
                .collect()
        })
        .collect();
    let mut columns = vec![vec![0; bays + 1]; n_stories];
    for (g, line) in nodes.iter().enumerate() {
        f.fixed(line[0]);
        for s in 0..n_stories {
            columns[s][g] = f.member(line[s], line[s + 1], 200e9, 0.02, 2e-4);
        }
    }
    for pair in nodes.windows(2) {
        for (&a, &b) in pair[0].iter().zip(&pair[1]).skip(1) {
            f.member(a, b, 200e9, 0.02, 4e-4);
        }
    }
    let h = f.case("H", ActionCategory::Wind);
    for &n in nodes[0].iter().skip(1) {
        f.nodal(h, n, 50e3, 0.0, 0.0);
    }
    (f, h, columns)
}

#[test]
fn portal_column_shears_lie_in_a_band_around_the_stiffness_solution() {
    verify::source("closed form: statics, the column shears of a story sum to the story shear");
    let (f, h, columns) = regular(3, 4);
    let model: &Model = &f.model;
    let st = stories(model).expect("regular stories");
    let approx = approximate(model, &st, &[(h, 1.0)]);
    let solution = FirstOrder::new(model, &[])
        .and_then(|fo| fo.solve_case(model, h))
        .expect("solves");
    for (s, row) in columns.iter().enumerate() {
        // Story shear: the loads at and above the story top, 50 kN per level.
        let v_story = 50e3 * (columns.len() - s) as f64;
        let mut sum_portal = 0.0;
        let mut sum_stiff = 0.0;
        for &c in row {
            // Portal shear from the end moments: V = (M(L) − M(0))/h.
            let portal_v = (approx[c][1].3 - approx[c][0].3) / 3.5;
            // Stiffness shear: Fy_i, the local-y force of the base node on the column, is
            // the shear the column carries in +X (DEVELOPERS.md sign convention, local y of
            // an upward column is −X, and the node below pushes back in −X).
            let stiff_v = solution.end_forces[c].i[1];
            sum_portal += portal_v;
            sum_stiff += stiff_v;
            // Band (common practice, no source): on a regular frame with beams stiffer
            // than the columns, the portal shear of each column lies within ±30 % of the
            // stiffness solution's (its exterior/interior 1:2 split against the actual
            // split, which depends on the joint stiffness; the ground story, whose fixed
            // bases make the exterior columns relatively stiffer, is the widest).
            verify::source(
                "common practice, no source: portal shear within ±30 % of the stiffness solution's on a regular frame",
            );
            verify::between(
                &format!(
                    "story {}, column {c}: portal shear / stiffness shear",
                    s + 1
                ),
                "-",
                portal_v / stiff_v,
                1.0,
                -0.3,
                0.3,
            );
            verify::source(
                "closed form: statics, the column shears of a story sum to the story shear",
            );
        }
        // Statics (closed form): both share the whole story shear.
        verify::close(
            &format!(
                "story {}: portal-method column shears sum to the story shear",
                s + 1
            ),
            "N",
            sum_portal,
            v_story,
            1e-12,
        );
        verify::close(
            &format!(
                "story {}: stiffness-solution column shears sum to the story shear",
                s + 1
            ),
            "N",
            sum_stiff,
            v_story,
            1e-6,
        );
    }
}

/// A three-bay, two-story frame in the N-mm preset (bare loads are N/mm, i.e. kN/m), dead
/// load 20 on every beam and live load `live_b2` on beam B2.1, 10 on the others.
fn n_mm_frame(live_b2: &str, dead_b3: &str) -> String {
    format!(
        r#"
units = "N-mm"
[[material]]
id = "S"
E = 200000
[[section]]
id = "col"
A = 12000
I = 2e8
[[section]]
id = "beam"
A = 10000
I = 4e8
[frame]
bays = [6000, 6000, 6000]
stories = [4000, 3500]
base = "fixed"
material = "S"
columns = ["col"]
beams = ["beam"]
[[case]]
id = "D"
category = "dead"
[[case.member_load]]
members = ["B1.*", "B2.*", "B3.2"]
kind = "uniform"
direction = "down"
w = 20
[[case.member_load]]
members = "B3.1"
kind = "uniform"
direction = "down"
w = {dead_b3}
[[case]]
id = "L"
category = "live"
[[case.member_load]]
members = ["B1.*", "B3.*", "B2.2"]
kind = "uniform"
direction = "down"
w = 10
[[case.member_load]]
members = "B2.1"
kind = "uniform"
direction = "down"
w = {live_b2}
"#
    )
}

/// Flags of every member in the cases 1.4D and 1.2D + 1.6L of a model text.
fn flags_of(text: &str) -> Vec<Vec<(String, Vec<Flag>)>> {
    let model = plumbline::input::parse_model(text, "frame.toml").expect("valid model");
    let (d, l) = (
        model.case_index("D").expect("D"),
        model.case_index("L").expect("L"),
    );
    let cases = [
        case("1.4D", &[(d, 1.4)]),
        case("1.2D+1.6L", &[(d, 1.2), (l, 1.6)]),
    ];
    let r = approximate_check(&model, &cases, &Thresholds::default()).expect("check runs");
    r.cases
        .iter()
        .map(|c| {
            c.members
                .iter()
                .filter(|e| !e.flags.is_empty())
                .map(|e| (e.member.clone(), e.flags.clone()))
                .collect()
        })
        .collect()
}

#[test]
fn a_wrong_unit_on_one_load_is_flagged() {
    // The correct model: nothing flagged.
    assert_eq!(flags_of(&n_mm_frame("10", "20")), vec![vec![], vec![]]);

    // Live load on B2.1 written as 10000, meant as 10000 N/m: in the N-mm preset a bare
    // number is N/mm, so the load is 1000 times too large (units preset table, docs/model-guide.md).
    // 1.2D + 1.6L on B2.1: 1.2·20 + 1.6·10000 = 16024 N/mm against the median beam
    // 1.2·20 + 1.6·10 = 40 N/mm: 400.6 times, beyond the threshold of 10.
    let flags = flags_of(&n_mm_frame("10000", "20"));
    assert!(flags[0].is_empty(), "1.4D has no live load: {:?}", flags[0]);
    assert_eq!(flags[1].len(), 1, "{:?}", flags[1]);
    let (member, f) = &flags[1][0];
    verify::source(
        "closed form: (1.2·20 + 1.6·10000) / (1.2·20 + 1.6·10) N/mm against the median beam",
    );
    verify::same("1.2D + 1.6L: the member flagged", "B2.1", member.as_str());
    match f[..] {
        [Flag::Load { factor }] => verify::close(
            "1.2D + 1.6L: load factor flagged on B2.1, 16024/40",
            "-",
            factor,
            16024.0 / 40.0,
            1e-9,
        ),
        _ => panic!("expected one load flag, got {f:?}"),
    }
}

#[test]
fn a_wrong_sign_on_one_load_is_flagged() {
    // Dead load on B3.1 written −20 with direction "down": it acts upward. Its 1.4D load
    // is −28 N/mm against the median +28: factor −1, the opposite sense.
    let flags = flags_of(&n_mm_frame("10", "-20"));
    let b31: Vec<&Flag> = flags[0]
        .iter()
        .filter(|(m, _)| m == "B3.1")
        .flat_map(|(_, f)| f)
        .collect();
    let factor = b31
        .iter()
        .find_map(|f| match f {
            Flag::Load { factor } => Some(*factor),
            _ => None,
        })
        .unwrap_or_else(|| panic!("no load flag on B3.1: {:?}", flags[0]));
    verify::source("closed form: 1.4·(−20) / (1.4·20) N/mm against the median beam");
    verify::close(
        "1.4D: load factor flagged on B3.1, −1",
        "-",
        factor,
        -1.0,
        1e-9,
    );
}

#[test]
fn random_frames_keep_statics_and_raise_few_flags() {
    let (mut judged, mut flagged) = (0usize, 0usize);
    let mut worst_gravity_shear = 0.0_f64;
    const FRAMES: u64 = 100;
    for seed in 0..FRAMES {
        let rf = RandomFrame::new(seed);
        let st = stories(&rf.model).expect("regular stories");
        let r =
            approximate_check(&rf.model, &rf.cases, &Thresholds::default()).expect("check runs");
        for (fc, c) in rf.cases.iter().zip(&r.cases) {
            // Statics (closed form): the portal shears of a story add up to the story shear,
            // the lateral loads applied at and above its top (the random frames load the
            // left node of each level).
            for s in &st {
                let v_story: f64 = fc
                    .factors
                    .iter()
                    .flat_map(|&(k, f)| {
                        rf.model.load_cases[k]
                            .nodal
                            .iter()
                            .filter(|nl| rf.model.nodes[nl.node].y >= s.top - 1e-3)
                            .map(move |nl| f * nl.fx)
                    })
                    .sum();
                let sum: f64 = s
                    .columns
                    .iter()
                    .map(|&m| c.members[m].portal_shear.expect("column"))
                    .sum();
                // A braced story (a diagonal spanning its height) sends its shear to the
                // brace: the columns' portal shears are nil (issue 20 item 7).
                let braced = (0..rf.model.members.len()).any(|m| {
                    let mem = &rf.model.members[m];
                    let (a, b) = (&rf.model.nodes[mem.i], &rf.model.nodes[mem.j]);
                    let (dx, dy) = (b.x - a.x, b.y - a.y);
                    dy.abs() > 0.0
                        && dx.abs() > 0.1 * dy.abs()
                        && dy.abs() > dx.abs() * 5f64.to_radians().tan()
                        && a.y.min(b.y) <= s.bottom + 1e-3
                        && a.y.max(b.y) >= s.top - 1e-3
                });
                let expected = if braced { 0.0 } else { v_story };
                let scale = v_story.abs().max(1.0);
                verify::observe((sum - expected).abs() / scale);
                assert!((sum - expected).abs() <= 1e-9 * scale);
                // Statics (closed form): gravity puts no net shear on a story. The no-sway
                // estimate's column shears plus the gravity sway that the portal method
                // shares out sum to nil in a story without a brace (one with a brace holds
                // the no-sway estimate's sum).
                let moment_columns = s
                    .columns
                    .iter()
                    .any(|&m| plumbline::check::story::is_moment_frame_column(&rf.model, m));
                if !braced && moment_columns {
                    let shears: Vec<f64> = s
                        .columns
                        .iter()
                        .map(|&m| {
                            let rows = &c.members[m].rows;
                            (rows[1].gravity - rows[0].gravity) / rf.model.length(m)
                        })
                        .collect();
                    let scale: f64 = shears.iter().map(|v| v.abs()).sum();
                    let net: f64 = shears.iter().sum();
                    if scale > 0.0 {
                        worst_gravity_shear = worst_gravity_shear.max(net.abs() / scale);
                    }
                    assert!(
                        net.abs() <= 1e-9 * scale,
                        "seed {seed}, {}, story {}: net gravity shear {net} of {scale}",
                        c.id,
                        s.number
                    );
                }
            }
            for e in c.members.iter().filter(|e| e.estimated) {
                judged += 1;
                flagged += usize::from(!e.flags.is_empty());
                if !e.flags.is_empty() && std::env::var("APPROX_DEBUG").is_ok() {
                    println!("{seed} {} {} {:?} {:?}", c.id, e.member, e.role, e.flags);
                }
            }
        }
    }
    // Correct frames: the hand methods agree with the stiffness solution within the
    // thresholds for nearly every judged member result. Measured: 131 of 11580 (1.1 %) with
    // the default thresholds since the gravity sway and the propped-span inflection point
    // joined the estimate (162 before; 80 of 7125 before issue 20 judged beams with one
    // released end and the joints of pin-ended braces); the bound of 3 % is the tool's own acceptance figure
    // (common practice, no source). The flags left come from short spans between long ones
    // and point loads near a support, where the hand methods are known to be poor.
    verify::property(
        "approx/gravity-sway-statics",
        "the approximate check's gravity part (no-sway joint balance plus the gravity sway \
         shared by the portal method) puts no net shear on a story without a brace (closed \
         form: statics)",
        FRAMES as usize,
        "largest |net story shear| / Σ|column shear|",
        worst_gravity_shear,
        "1e-9",
    );
    let rate = flagged as f64 / judged as f64;
    println!(
        "approximate check on 100 random frames: {flagged} of {judged} member results flagged ({:.2} %)",
        100.0 * rate
    );
    assert!(rate < 0.03, "{flagged} of {judged}");
    verify::property(
        "approx/random_frames_keep_statics",
        "the portal-method column shears of every story sum to the story shear, the lateral \
         loads at and above its top (nil in a braced story, whose brace takes it) (closed \
         form: statics)",
        FRAMES as usize,
        "largest |Σ portal shears − story shear| / max(story shear, 1 N)",
        verify::observed(),
        "1e-9",
    );
    verify::property(
        "approx/random_frames_raise_few_flags",
        &format!(
            "on correct frames the hand methods agree with the stiffness solution within the \
             default thresholds for nearly every judged member result ({flagged} of {judged} \
             flagged; the tool's own acceptance bound, common practice, no source)"
        ),
        FRAMES as usize,
        "share of judged member results flagged",
        rate,
        "0.03",
    );
}

#[test]
fn check_option_prints_the_side_by_side_table_in_every_format() {
    // Command-line contract (project requirement, no external source): the table, the
    // JSON key and the CSV file, each with the caution.
    let run = |format: &str| {
        let o = std::process::Command::new(env!("CARGO_BIN_EXE_plumbline"))
            .args([
                "check",
                "examples/office-3story.toml",
                "--approximate",
                "--format",
                format,
            ])
            .current_dir(env!("CARGO_MANIFEST_DIR"))
            .output()
            .expect("runs");
        assert!(o.status.success(), "{}", String::from_utf8_lossy(&o.stderr));
        String::from_utf8_lossy(&o.stdout).into_owned()
    };
    let text = run("table");
    assert!(text.contains("Approximate check"));
    assert!(text.contains("M computed") && text.contains("M approx"));
    // The text is wrapped to the terminal: compare its words.
    let words = text.split_whitespace().collect::<Vec<_>>().join(" ");
    assert!(words.ends_with(plumbline::CAUTION));
    let json: serde_json::Value = serde_json::from_str(&run("json")).expect("JSON");
    assert!(
        json["approximate"]["cases"]
            .as_array()
            .is_some_and(|c| !c.is_empty())
    );
    let csv = run("csv");
    assert!(csv.contains("# approximate.csv"));
}

/// The three-bay, two-story test frame of issue 20 (a leaning column on grid line 4, a
/// pin-ended brace in story 1), with `edit` applied to its text.
fn leaning_braced(edit: impl Fn(String) -> String) -> Model {
    let path =
        std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/frames/leaning-braced.toml");
    let text = edit(std::fs::read_to_string(path).unwrap());
    plumbline::input::parse_model(&text, "leaning-braced.toml").expect("valid model")
}

/// The approximate check of 1.2D + 1.0W + 1.0L with wind `w` ("WL" or "WR") and 1.4D.
fn leaning_braced_report(model: &Model, w: &str) -> plumbline::approx::ApproxReport {
    let k = |id: &str| model.case_index(id).expect(id);
    let cases = [
        case("1.4D", &[(k("D"), 1.4)]),
        case("1.2D+W+L", &[(k("D"), 1.2), (k(w), 1.0), (k("L"), 1.0)]),
    ];
    approximate_check(model, &cases, &Thresholds::default()).expect("check runs")
}

#[test]
fn leaning_columns_and_braced_stories_take_no_portal_shear() {
    // Portal method (common practice, no source): the story shear is shared by the columns
    // that resist it in bending. A leaning column (hinged at both ends) resists none, and a
    // braced story's shear goes to its brace first (axial stiffness EA/L·cos²θ of the
    // HSS brace, ≈ 29000·4.30/33.1 ft·0.82 ≈ 260 kip/in, against 12EI/h³ ≈ 4.6 kip/in of
    // a W12x53 over 14 ft: closed form, the brace is some fifty times stiffer).
    verify::source(
        "common practice, no source (portal method: shares 1:2:1, leaning and braced columns take none); statics",
    );
    let model = leaning_braced(|t| t);
    let r = leaning_braced_report(&model, "WL");
    let shear = |id: &str| {
        r.cases[1]
            .members
            .iter()
            .find(|e| e.member == id)
            .and_then(|e| e.portal_shear)
            .unwrap_or(0.0)
    };
    for id in ["C4.1", "C4.2", "C1.1", "C2.1", "C3.1"] {
        verify::close(
            &format!("portal shear of {id} (leaning, or in the braced story 1)"),
            "N",
            shear(id),
            0.0,
            0.0,
        );
    }
    // Story 2 (unbraced): the 16 kip of WL above level 1 less the 8 kip at level 1, i.e.
    // 8 kip = 35.586 kN, shared by the three moment columns in the portal ratio 1:2:1.
    let v = 8.0 * 4448.2216152605;
    verify::close(
        "story 2: shears of the three moment columns sum to 8 kip",
        "N",
        shear("C1.2") + shear("C2.2") + shear("C3.2"),
        v,
        1e-9,
    );
    verify::close(
        "story 2: interior column takes half, 4 kip",
        "N",
        shear("C2.2"),
        v / 2.0,
        1e-9,
    );
}

#[test]
fn the_leaning_braced_frame_raises_no_flag_until_a_mistake_is_seeded() {
    // Issue 20 item 7. With both wind directions, the correct frame raises no flag, in the
    // gravity case nor under gravity with wind (its story 2 sways under gravity alone: the
    // frame is unsymmetric); a live load typed 1000 times too large on one beam is flagged.
    let model = leaning_braced(|t| t);
    for w in ["WL", "WR"] {
        let r = leaning_braced_report(&model, w);
        let flagged: Vec<&str> = r.cases[0]
            .members
            .iter()
            .filter(|e| !e.flags.is_empty())
            .map(|e| e.member.as_str())
            .collect();
        assert!(flagged.is_empty(), "{w}: {flagged:?}");
    }
    for w in ["WL", "WR"] {
        let r = leaning_braced_report(&model, w);
        let flagged: Vec<&str> = r.cases[1]
            .members
            .iter()
            .filter(|e| !e.flags.is_empty())
            .map(|e| e.member.as_str())
            .collect();
        assert!(flagged.is_empty(), "1.2D+W+L, {w}: {flagged:?}");
    }

    // Seeded: L on B2.2 alone at 1200 kip/ft (×1000), as its own load.
    let seeded = leaning_braced(|t| {
        t.replace(
            "[[case]]\nid = \"WL\"",
            "[[case.member_load]]\nmembers = \"B2.2\"\nkind = \"uniform\"\ndirection = \"down\"\nw = 1200\n\n[[case]]\nid = \"WL\"",
        )
    });
    let r = leaning_braced_report(&seeded, "WL");
    assert!(
        r.cases[1]
            .members
            .iter()
            .any(|e| e.member == "B2.2" && e.flags.iter().any(|f| matches!(f, Flag::Load { .. }))),
        "the ×1000 load is flagged"
    );
}
