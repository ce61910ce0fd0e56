//! Live-load arrangements (ACI 318-19 §6.4.3, EN 1992-1-1:2004 §5.1.3) against the
//! influence-line result of a continuous beam, and their properties over seeded random
//! frames. Each check names its source beside it.

mod common;

use common::random_frame::{RandomFrame, factored};
use common::{Frame, verify};
use plumbline::arrange::{Arranged, MAX_ARRANGEMENTS, arrange};
use plumbline::combos::{Basis, Expansion, FactoredCase};
use plumbline::model::{ActionCategory, LoadDirection, Model, Restraint};
use plumbline::solve::Solution;
use plumbline::solve::first_order::{FirstOrder, combined_member_loads, member_extremes};

/// One factored case `1.0 × case` and nothing else.
fn one(case: usize) -> Expansion {
    Expansion {
        cases: vec![factored("U", Basis::Strength, &[(case, 1.0)])],
        merged: vec![],
        skipped: vec![],
        warnings: vec![],
        notices: vec![],
    }
}

/// Internal moments of every member for each factored case, as (M at i, M at j, span max,
/// span min), from the pieces solved once and combined by the case's factors.
fn moments(arranged: &Arranged, cases: &[FactoredCase]) -> Vec<Vec<[f64; 4]>> {
    let model: &Model = &arranged.model;
    let fo = FirstOrder::new(model, &[]).expect("stable model");
    let solved: Vec<Solution> = (0..model.load_cases.len())
        .map(|k| fo.solve_case(model, k).expect("solves"))
        .collect();
    cases
        .iter()
        .map(|fc| {
            let parts: Vec<(f64, &Solution)> =
                fc.factors.iter().map(|&(k, f)| (f, &solved[k])).collect();
            let s = Solution::combine(&parts);
            let loads = combined_member_loads(model, &fc.factors);
            (0..model.members.len())
                .map(|m| {
                    let e = member_extremes(model, &s, m, &loads[m]);
                    let ef = &s.end_forces[m];
                    // Internal moments at the ends: M(0) = −Mz_i, M(L) = +Mz_j
                    // (DEVELOPERS.md, sign convention).
                    [-ef.i[2], ef.j[2], e.max.1, e.min.1]
                })
                .collect()
        })
        .collect()
}

/// Three equal spans L on four knife-edge supports, uniform live load w on each span.
fn three_spans(l: f64, w: f64) -> (Frame, usize) {
    let mut f = Frame::new();
    let n: Vec<usize> = (0..4).map(|k| f.node(k as f64 * l, 0.0)).collect();
    let spans: Vec<usize> = (0..3)
        .map(|k| f.member(n[k], n[k + 1], 200e9, 0.01, 1e-4))
        .collect();
    f.pinned(n[0]);
    for &k in &n[1..] {
        f.support(k, [Restraint::Free, Restraint::Fixed, Restraint::Free]);
    }
    let case = f.case("L", ActionCategory::Live);
    f.model.load_cases[case].arrange = true;
    for &m in &spans {
        f.udl(case, m, w, LoadDirection::Gravity);
    }
    (f, case)
}

#[test]
fn three_span_envelope_matches_the_influence_lines() {
    verify::source(
        "closed form: three-moment equation (Clapeyron), equal spans; ACI 318-19 §6.4.3 arrangements",
    );
    let (l, w) = (6.0, 10e3);
    let (f, case) = three_spans(l, w);
    let arranged = arrange(&f.model);
    let tags: Vec<&str> = arranged.patterns.iter().map(|p| p.tag.as_str()).collect();
    verify::same(
        "three spans: arrangements (full, alternate spans, adjacent spans at each interior support)",
        vec!["full", "alt-a", "alt-b", "adj-N2", "adj-N3"],
        tags,
    );
    let exp = arranged.apply(one(case));
    let ids: Vec<&str> = exp.cases.iter().map(|c| c.id.as_str()).collect();
    assert_eq!(
        ids,
        [
            "U/L:full",
            "U/L:alt-a",
            "U/L:alt-b",
            "U/L:adj-N2",
            "U/L:adj-N3"
        ]
    );
    let res = moments(&arranged, &exp.cases);
    let wl2 = w * l * l;

    // Closed form, three-moment equation (Clapeyron) for equal spans and constant EI with
    // M_A = M_D = 0, uniform loads w1, w2, w3 on the spans:
    //   at B: 4·M_B + M_C = −(w1 + w2)·L²/4,   at C: M_B + 4·M_C = −(w2 + w3)·L²/4.
    // The influence line of M_B is negative over spans 1 and 2 and positive over span 3
    // (Müller-Breslau: a unit kink at B lifts spans 1 and 2 and lowers span 3), so the most
    // negative M_B loads spans 1 and 2:  4M_B + M_C = −wL²/2, M_B + 4M_C = −wL²/4
    //   → M_B = (−2 + 1/4)/15 · wL² = −7/60 wL² = −0.1167 wL².
    let (k_min_b, min_b) = argmin(&res, |r| r[0][1]);
    verify::close(
        "three spans, least moment at B (adjacent spans loaded), −7/60 wL²",
        "N·m",
        min_b,
        -7.0 / 60.0 * wl2,
        1e-9,
    );
    verify::same(
        "three spans, arrangement giving the least moment at B (spans 1 and 2)",
        "U/L:adj-N2",
        exp.cases[k_min_b].id.as_str(),
    );

    // The influence line of the moment near mid-span 1 is positive over spans 1 and 3 and
    // negative over span 2: load spans 1 and 3 → M_B = M_C = −wL²/20, reaction at A
    // R_A = wL/2 − wL/20 = 0.45 wL, M_max = R_A²/(2w) = 0.10125 wL² at x = 0.45 L.
    let (k_pos_1, pos_1) = argmax(&res, |r| r[0][2]);
    verify::close(
        "three spans, greatest span moment, span 1 (alternate spans), 0.10125 wL²",
        "N·m",
        pos_1,
        0.10125 * wl2,
        1e-9,
    );
    verify::same(
        "three spans, arrangement giving the greatest span-1 moment (spans 1 and 3)",
        "U/L:alt-a",
        exp.cases[k_pos_1].id.as_str(),
    );

    // Mid-span 2: influence line positive over span 2 only → M_B = M_C = −wL²/20 and
    // M_mid = wL²/8 − wL²/20 = 0.075 wL².
    let (k_pos_2, pos_2) = argmax(&res, |r| r[1][2]);
    verify::close(
        "three spans, greatest span moment, span 2, 0.075 wL²",
        "N·m",
        pos_2,
        0.075 * wl2,
        1e-9,
    );
    verify::same(
        "three spans, arrangement giving the greatest span-2 moment (span 2 alone)",
        "U/L:alt-b",
        exp.cases[k_pos_2].id.as_str(),
    );

    // Full loading (for comparison, and the pattern's own check): 5·M_B = −wL²/2 →
    // M_B = −0.100 wL², smaller in magnitude than the arranged −0.1167 wL².
    verify::close(
        "three spans, moment at B under full load, −0.1 wL²",
        "N·m",
        res[0][0][1],
        -0.1 * wl2,
        1e-9,
    );
}

/// Index and value of the largest `f` over the cases.
fn argmax(res: &[Vec<[f64; 4]>], f: impl Fn(&Vec<[f64; 4]>) -> f64) -> (usize, f64) {
    res.iter().map(&f).enumerate().fold(
        (0, f64::NEG_INFINITY),
        |a, (k, v)| if v > a.1 { (k, v) } else { a },
    )
}

/// Index and value of the smallest `f` over the cases.
fn argmin(res: &[Vec<[f64; 4]>], f: impl Fn(&Vec<[f64; 4]>) -> f64) -> (usize, f64) {
    let (k, v) = argmax(res, |r| -f(r));
    (k, -v)
}

#[test]
fn arrangements_on_random_frames_superpose_count_and_alternate() {
    let mut frames = 0;
    for seed in 0..60 {
        let mut rf = RandomFrame::new(seed);
        let live = rf.model.case_index("L").expect("random frames have L");
        if rf.model.load_cases[live].member.is_empty() {
            continue;
        }
        frames += 1;
        rf.model.load_cases[live].arrange = true;
        // A line of leaning columns adds a span (its links) at every level.
        let (bays, stories) = (rf.bays + usize::from(!rf.leaning.is_empty()), rf.stories);
        let arranged = arrange(&rf.model);
        let exp = arranged.apply(one(live));
        // Count, module documentation of `arrange`: at most 3 + Σ(spans per line − 1)
        // + 2 × columns, and within the documented maximum.
        let columns = rf
            .model
            .members
            .iter()
            .filter(|m| m.role == plumbline::model::Role::Column)
            .count();
        assert!(arranged.patterns.len() <= 3 + stories * (bays - 1) + 2 * columns);
        assert!(arranged.patterns.len() <= MAX_ARRANGEMENTS);
        assert_eq!(exp.cases.len() + merged(&exp), arranged.patterns.len());

        // Superposition (closed form: first-order results are linear in the loads): the
        // full arrangement, summed from single-span pieces, equals the live case solved
        // whole.
        let full = &exp.cases[0];
        assert!(full.id.ends_with(":full"));
        let whole = FactoredCase {
            factors: vec![(live, 1.0)],
            ..full.clone()
        };
        let res = moments(&arranged, &[full.clone(), whole]);
        let scale = res[1]
            .iter()
            .flatten()
            .fold(0.0_f64, |a, v| a.max(v.abs()))
            .max(1.0);
        for (a, b) in res[0].iter().flatten().zip(res[1].iter().flatten()) {
            verify::observe((a - b).abs() / scale);
            assert!((a - b).abs() <= 1e-9 * scale, "seed {seed}: {a} vs {b}");
        }

        // Checkerboard (ACI 318-19 §6.4.3.2(a), EN 1992-1-1 §5.1.3(1)P(a)): in alt-a and
        // alt-b no two loaded spans are neighbours in a floor or stacked in one bay (the
        // random frames are regular: a span's index is its bay).
        for p in arranged
            .patterns
            .iter()
            .filter(|p| p.tag.starts_with("alt-"))
        {
            for &a in &p.spans {
                for &b in &p.spans {
                    let (sa, sb) = (&arranged.spans[a], &arranged.spans[b]);
                    let beside = sa.floor == sb.floor && sa.index.abs_diff(sb.index) == 1;
                    let stacked = sa.index == sb.index && sa.floor.abs_diff(sb.floor) == 1;
                    assert!(!beside && !stacked, "seed {seed}: {}", p.tag);
                }
            }
        }
        // Adjacent spans (ACI 318-19 §6.4.3.2(b)): two beams of one floor that share the
        // named joint (one when the other carries no live load).
        for p in arranged
            .patterns
            .iter()
            .filter(|p| p.tag.starts_with("adj-"))
        {
            if p.spans.len() == 1 {
                continue;
            }
            assert_eq!(p.spans.len(), 2);
            let (s1, s2) = (&arranged.spans[p.spans[0]], &arranged.spans[p.spans[1]]);
            assert_eq!(s1.floor, s2.floor);
            let node = &p.tag["adj-".len()..];
            let shared = [s1.ends.0, s1.ends.1]
                .into_iter()
                .find(|v| *v == s2.ends.0 || *v == s2.ends.1)
                .expect("adjacent spans share a joint");
            assert_eq!(rf.model.nodes[shared].id, node);
        }
    }
    verify::property(
        "arrange/arrangements_on_random_frames_superpose_count_and_alternate",
        "the full arrangement's span pieces superpose to the whole live load case; the count \
         of code arrangements is bounded; checkerboards never load neighbouring or stacked \
         spans (ACI 318-19 §6.4.3.2(a), EN 1992-1-1 §5.1.3(1)P(a)); adjacent-span patterns \
         load two spans of one floor that share their joint",
        frames,
        "largest moment difference, full arrangement against the whole case / largest moment",
        verify::observed(),
        "1e-9",
    );
}

/// Cases merged away as identical.
fn merged(exp: &Expansion) -> usize {
    exp.merged.iter().map(|m| m.dropped.len()).sum()
}

#[test]
fn a_model_without_arranged_cases_is_left_alone() {
    let (mut f, case) = three_spans(5.0, 1e3);
    f.model.load_cases[case].arrange = false;
    let arranged = arrange(&f.model);
    assert!(arranged.patterns.is_empty());
    assert_eq!(arranged.model, f.model);
    assert_eq!(arranged.apply(one(case)), one(case));
}

/// A two-bay, two-story generated frame with a live case marked `arrange`, in kN-m.
fn generated(category: &str, loads: &str) -> String {
    format!(
        r#"
units = "kN-m"
[[material]]
id = "S"
E = "200 GPa"
[[section]]
id = "s"
A = 10000
I = 1e8
[frame]
bays = [6.0, 6.0]
stories = [4.0, 4.0]
base = "fixed"
material = "S"
columns = ["s"]
beams = ["s"]
[[case]]
id = "L"
category = "{category}"
arrange = true
{loads}
"#
    )
}

const BEAM_LOAD: &str =
    "[[case.member_load]]\nmembers = \"B*\"\nkind = \"uniform\"\ndirection = \"down\"\nw = 10\n";

#[test]
fn checkerboard_across_floors_on_a_generated_frame() {
    let model = plumbline::input::parse_model(&generated("live", BEAM_LOAD), "m.toml")
        .expect("valid model");
    let arranged = arrange(&model);
    let text: Vec<(String, String)> = arranged
        .patterns
        .iter()
        .map(|p| (p.tag.clone(), arranged.spans_text(p)))
        .collect();
    // ACI 318-19 §6.4.3.2: alternate spans, checkerboard from floor to floor, and the two
    // spans at each interior joint, per floor; 3 + 2 floors × (2 spans − 1) = 5. Then the
    // spans on one side of each column on the floors at both its ends (from memory): the
    // left side of C2.1 repeats the right side of C1.1, and so on, so 4 remain.
    verify::source(
        "ACI 318-19 §6.4.3.2 (alternate and adjacent spans); the column patterns from memory",
    );
    let expected = [
        ("full", "every span"),
        ("alt-a", "B1.1, B2.2"),
        ("alt-b", "B2.1, B1.2"),
        ("adj-N2.1", "B1.1, B2.1"),
        ("adj-N2.2", "B1.2, B2.2"),
        ("right-C1.1", "B1.1"),
        ("right-C2.1", "B2.1"),
        ("right-C1.2", "B1.1, B1.2"),
        ("right-C2.2", "B2.1, B2.2"),
    ];
    for (k, (tag, spans)) in expected.iter().enumerate() {
        verify::same(
            &format!(
                "two-bay, two-story frame: arrangement {} and its loaded spans",
                k + 1
            ),
            (tag.to_string(), spans.to_string()),
            text.get(k).cloned().unwrap_or_default(),
        );
    }
    verify::same(
        "two-bay, two-story frame: number of arrangements",
        expected.len(),
        text.len(),
    );
}

#[test]
fn arranging_other_than_live_load_on_beams_is_an_input_error() {
    let err = plumbline::input::parse_model(&generated("dead", BEAM_LOAD), "m.toml")
        .expect_err("dead load is not arranged");
    assert_eq!(err.field, "case \"L\".arrange");
    assert!(
        err.message.contains("category = \"live\""),
        "{}",
        err.message
    );

    let on_columns = BEAM_LOAD.replace("\"B*\"", "\"C*\"");
    let err = plumbline::input::parse_model(&generated("live", &on_columns), "m.toml")
        .expect_err("nothing on beams");
    assert_eq!(err.field, "case \"L\".arrange");
    assert!(
        err.message.contains("nothing to arrange"),
        "{}",
        err.message
    );
}

#[test]
fn cases_and_check_name_the_arrangement() {
    // Command-line contract (project requirement, no external source): every arrangement
    // is listed by `cases` with its loaded spans, and the governing case named by `check`
    // carries the arrangement in its id.
    let text = generated("live", BEAM_LOAD)
        + "[[case]]\nid = \"D\"\ncategory = \"dead\"\n"
        + &BEAM_LOAD.replace("w = 10", "w = 20")
        + "[combinations]\ntable = \"asce7-16-strength\"\n";
    let code = text.clone() + "[analysis]\nlive_patterns = \"code\"\n";
    let path = std::env::temp_dir().join(format!("plumbline-arrange-{}.toml", std::process::id()));
    std::fs::write(&path, code).expect("temp file");
    let run = |args: &[&str]| {
        let o = std::process::Command::new(env!("CARGO_BIN_EXE_plumbline"))
            .args(args)
            .arg(&path)
            .output()
            .expect("runs");
        assert!(o.status.success(), "{}", String::from_utf8_lossy(&o.stderr));
        String::from_utf8_lossy(&o.stdout).into_owned()
    };
    let cases = run(&["cases"]);
    for tag in [
        "/L:full",
        "/L:alt-a",
        "/L:alt-b",
        "/L:adj-N2.1",
        "/L:adj-N2.2",
    ] {
        assert!(
            cases.contains(&format!("2.3.1-2a{tag}")),
            "{tag} missing:\n{cases}"
        );
    }
    assert!(cases.contains("L on B1.1, B2.2"));
    let check = run(&["check"]);
    assert!(check.contains("/L:adj-N2.1"), "{check}");
    // The exact mode (the default) names its worst subsets and their loaded spans.
    std::fs::write(&path, text).expect("temp file");
    let cases = run(&["cases"]);
    for tag in ["/L:full", "/L:p1", "/L:none"] {
        assert!(
            cases.contains(&format!("2.3.1-2a{tag}")),
            "{tag} missing:\n{cases}"
        );
    }
    let check = run(&["check"]);
    assert!(check.contains("exact: the worst subset"), "{check}");
    let _ = std::fs::remove_file(&path);
}

#[test]
fn a_beam_split_between_supports_is_one_span() {
    // Definition of a span (module documentation of `arrange`): a chain of beams between
    // joints. Three spans on four supports, the middle span modelled as two members
    // meeting at a node with no support: still three spans, the middle one named by its
    // first and last member, and the adjacent-span arrangements at the two interior
    // supports only.
    let mut f = Frame::new();
    let xs = [0.0, 5.0, 7.5, 10.0, 15.0];
    let n: Vec<usize> = xs.iter().map(|&x| f.node(x, 0.0)).collect();
    let members: Vec<usize> = (0..4)
        .map(|k| f.member(n[k], n[k + 1], 200e9, 0.01, 1e-4))
        .collect();
    f.pinned(n[0]);
    for k in [1, 3, 4] {
        f.support(n[k], [Restraint::Free, Restraint::Fixed, Restraint::Free]);
    }
    let case = f.case("L", ActionCategory::Live);
    f.model.load_cases[case].arrange = true;
    for &m in &members {
        f.udl(case, m, 1e3, LoadDirection::Gravity);
    }
    let arranged = arrange(&f.model);
    let names: Vec<&str> = arranged.spans.iter().map(|s| s.name.as_str()).collect();
    assert_eq!(names, ["M1", "M2–M3", "M4"]);
    let tags: Vec<&str> = arranged.patterns.iter().map(|p| p.tag.as_str()).collect();
    assert_eq!(tags, ["full", "alt-a", "alt-b", "adj-N2", "adj-N4"]);
    // The middle span's piece carries both members' loads.
    let piece = arranged
        .model
        .case_index("L@M2–M3")
        .expect("piece of the middle span");
    assert_eq!(arranged.model.load_cases[piece].member.len(), 2);
}
