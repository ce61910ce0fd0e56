//! The exact live-load pattern envelope (issue 19) against brute-force enumeration of every
//! subset of loaded spans, against the code arrangements over seeded random frames, and the
//! chosen method (worst subsets run as cases) against the other (signs combined with the
//! amplifiers of the full live load). Each check names its source beside it.

mod common;

use common::random_frame::{RandomFrame, factored};
use common::verify;
use plumbline::arrange::exact::{
    PATTERN_DIVISIONS, Quantity, SpanPieces, exact_patterns, pattern_extremes, sections,
};
use plumbline::arrange::{Arranged, arrange, arrange_model, loaded_spans, patterns};
use plumbline::combos::Basis;
use plumbline::model::{LocalLoad, Model};
use plumbline::solve::beam::internal_forces;
use plumbline::solve::first_order::FirstOrder;
use plumbline::solve::linear::MeshLoads;

/// A random frame with its live load arranged, or None when it has no live load on beams.
fn arranged_frame(seed: u64) -> Option<(RandomFrame, Arranged)> {
    let mut rf = RandomFrame::new(seed);
    let live = rf.model.case_index("L")?;
    if rf.model.load_cases[live].member.is_empty() {
        return None;
    }
    rf.model.load_cases[live].arrange = true;
    let a = arrange(&rf.model);
    Some((rf, a))
}

/// The piece load cases of span `s` (every arranged case's piece on it).
fn span_cases(a: &Arranged, s: usize) -> Vec<usize> {
    let name = format!("@{}", a.spans[s].name);
    (a.own_cases..a.model.load_cases.len())
        .filter(|&k| a.model.load_cases[k].id.ends_with(&name))
        .collect()
}

/// The rest pieces (loads off the beams), which act in every subset.
fn rest_cases(a: &Arranged) -> Vec<usize> {
    (a.own_cases..a.model.load_cases.len())
        .filter(|&k| a.model.load_cases[k].id.ends_with("@rest"))
        .collect()
}

/// Per member, section and quantity: the largest and smallest value over every subset of
/// loaded spans, each subset's loads solved directly (no superposition).
fn brute_force(a: &Arranged, divisions: usize) -> Vec<Vec<[(f64, f64); 3]>> {
    let model: &Model = &a.model;
    let fo = FirstOrder::new(model, &[]).expect("stable");
    let loaded: Vec<usize> = loaded_spans(model, &a.spans).into_iter().collect();
    let mut out: Vec<Vec<[(f64, f64); 3]>> = (0..model.members.len())
        .map(|m| {
            vec![
                [(f64::NEG_INFINITY, f64::INFINITY); 3];
                sections(model.length(m), divisions).len()
            ]
        })
        .collect();
    for mask in 0..1u32 << loaded.len() {
        let mut cases = rest_cases(a);
        for (bit, &s) in loaded.iter().enumerate() {
            if mask >> bit & 1 == 1 {
                cases.extend(span_cases(a, s));
            }
        }
        let mut loads = MeshLoads::zero(&fo.mesh);
        let mut local: Vec<Vec<LocalLoad>> = vec![Vec::new(); model.members.len()];
        for &k in &cases {
            loads.add_case(model, &fo.mesh, k, 1.0);
            for (m, l) in model.local_loads(k).into_iter().enumerate() {
                local[m].extend(l);
            }
        }
        let sol = fo.solve_loads(model, &loads).expect("solves");
        for (m, per) in out.iter_mut().enumerate() {
            for (x, slot) in sections(model.length(m), divisions).into_iter().zip(per) {
                let f = internal_forces(x, &sol.end_forces[m], &local[m]);
                for (q, (hi, lo)) in Quantity::ALL.into_iter().zip(slot.iter_mut()) {
                    *hi = hi.max(q.of(&f));
                    *lo = lo.min(q.of(&f));
                }
            }
        }
    }
    out
}

/// The effect of the rest pieces on `q` of member `m` at `x` (the base of every subset).
fn rest_effect(a: &Arranged, fo: &FirstOrder, q: Quantity, m: usize, x: f64) -> f64 {
    rest_cases(a)
        .into_iter()
        .map(|k| {
            let sol = fo.solve_case(&a.model, k).expect("solves");
            q.of(&internal_forces(
                x,
                &sol.end_forces[m],
                &a.model.local_loads(k)[m],
            ))
        })
        .sum()
}

/// Done-when of issue 19: on frames of up to 12 loaded spans the signs of the single-span
/// effects give the largest and smallest moment, shear and axial force over every subset,
/// at the member ends and at 40 points per member, to 1e-9 of the quantity's scale
/// (closed form: first-order effects superpose, so each span is chosen independently).
#[test]
fn exact_equals_every_subset_enumerated() {
    let mut frames = 0;
    for seed in 0..400 {
        let Some((_, a)) = arranged_frame(seed) else {
            continue;
        };
        let n = loaded_spans(&a.model, &a.spans).len();
        if !(3..=12).contains(&n) || frames >= 8 {
            continue;
        }
        frames += 1;
        let divisions = 40;
        let brute = brute_force(&a, divisions);
        let pieces = SpanPieces::solve(&a).expect("solves");
        let fo = FirstOrder::new(&a.model, &[]).expect("stable");
        for (qi, q) in Quantity::ALL.into_iter().enumerate() {
            let scale = brute
                .iter()
                .flatten()
                .map(|s| s[qi].0.abs().max(s[qi].1.abs()))
                .fold(1.0, f64::max);
            for (m, per) in brute.iter().enumerate() {
                let xs = sections(a.model.length(m), divisions);
                for (&x, s) in xs.iter().zip(per) {
                    let base = rest_effect(&a, &fo, q, m, x);
                    let e = pattern_extremes(base, &pieces.contributions(q, m, x));
                    let (hi, lo) = s[qi];
                    verify::observe((e.max - hi).abs().max((e.min - lo).abs()) / scale);
                    assert!(
                        (e.max - hi).abs() <= 1e-9 * scale && (e.min - lo).abs() <= 1e-9 * scale,
                        "seed {seed} {q} member {m} x {x}: exact {}..{} against {lo}..{hi}",
                        e.min,
                        e.max
                    );
                }
            }
        }
    }
    assert!(frames >= 5, "only {frames} small frames");
    verify::property(
        "patterns/exact_equals_every_subset_enumerated",
        "the exact live-load mode's extremes of moment, shear and axial force at member ends \
         and 40 points per member equal those of every subset of loaded spans enumerated \
         (3 to 12 loaded spans)",
        frames,
        "largest difference / the quantity's scale",
        verify::observed(),
        "1e-9",
    );
}

/// Done-when of issue 19: over 120 seeded random frames the exact extremes are never
/// inside out of any code arrangement (full, checkerboards, adjacent spans, column
/// patterns): no code arrangement gives a larger or smaller moment, shear or axial force
/// at any enveloped section (tolerance 1e-9 of the quantity's scale). And the worst subsets
/// that `check` runs reach the exact extremes at every enveloped section.
#[test]
fn exact_is_never_below_any_code_arrangement() {
    let mut frames = 0;
    let mut worst_column = (1.0_f64, 0u64);
    for seed in 0..200 {
        let Some((_, a)) = arranged_frame(seed) else {
            continue;
        };
        frames += 1;
        let pieces = SpanPieces::solve(&a).expect("solves");
        let loaded = loaded_spans(&a.model, &a.spans);
        let code = patterns(&a.model, &a.spans, &loaded);
        let run = exact_patterns(&a, &pieces, PATTERN_DIVISIONS, 100_000).expect("patterns");
        let sum = |c: &[f64], spans: &[usize]| spans.iter().map(|&s| c[s]).sum::<f64>();
        for q in Quantity::ALL {
            let mut scale: f64 = 0.0;
            let mut rows = Vec::new();
            for m in 0..a.model.members.len() {
                for x in sections(a.model.length(m), PATTERN_DIVISIONS) {
                    let c = pieces.contributions(q, m, x);
                    scale = scale.max(c.iter().map(|v| v.abs()).sum());
                    rows.push((m, c, x));
                }
            }
            let tol = 1e-9 * scale.max(1e-30);
            let bent = plumbline::arrange::exact::bent_members(&a.model);
            for (m, c, x) in &rows {
                let e = pattern_extremes(0.0, c);
                for p in &code {
                    let v = sum(c, &p.spans);
                    // How far a code arrangement lies outside the exact range (≤ 0 inside).
                    verify::observe(((v - e.max).max(e.min - v)) / tol * 1e-9);
                    assert!(
                        v <= e.max + tol && v >= e.min - tol,
                        "seed {seed} {q} member {m}: {} gives {v} outside {}..{}",
                        p.tag,
                        e.min,
                        e.max
                    );
                }
                // The run subsets reach the extremes wherever they are sought: member ends,
                // and the moment inside members with transverse load (elsewhere the
                // extreme over the member lies at an end).
                let end = *x == 0.0 || *x == a.model.length(*m);
                let sought = end || (q == Quantity::Moment && bent[*m]);
                if !sought {
                    continue;
                }
                let reach_max = run
                    .iter()
                    .map(|p| sum(c, &p.spans))
                    .fold(f64::MIN, f64::max);
                let reach_min = run
                    .iter()
                    .map(|p| sum(c, &p.spans))
                    .fold(f64::MAX, f64::min);
                assert!(
                    (reach_max - e.max).abs() <= tol,
                    "seed {seed} {q} member {m}"
                );
                assert!(
                    (reach_min - e.min).abs() <= tol,
                    "seed {seed} {q} member {m}"
                );
                // How much the code arrangements miss at a column end moment (printed).
                let column = a.model.members[*m].role == plumbline::model::Role::Column;
                if q == Quantity::Moment && column && e.max - e.min > 0.01 * scale {
                    let code_max = code.iter().map(|p| sum(c, &p.spans)).fold(0.0, f64::max);
                    let code_min = code.iter().map(|p| sum(c, &p.spans)).fold(0.0, f64::min);
                    for (got, exact) in [(code_max, e.max), (code_min, e.min)] {
                        if exact.abs() > 0.01 * scale && got / exact < worst_column.0 {
                            worst_column = (got / exact, seed);
                        }
                    }
                }
            }
        }
    }
    println!(
        "{frames} frames; smallest code / exact column end moment: {:.3} (seed {})",
        worst_column.0, worst_column.1
    );
    assert!(
        frames >= 100,
        "only {frames} frames with arranged live load"
    );
    verify::property(
        "patterns/exact_is_never_below_any_code_arrangement",
        "no code arrangement (full, checkerboards, adjacent spans, column patterns) gives a \
         moment, shear or axial force outside the exact extremes at any enveloped section, and \
         the subsets run reach them",
        frames,
        "largest excess of a code arrangement over the exact range / the quantity's scale",
        verify::observed(),
        "1e-9",
    );
}

/// The issue's minimal model (issue 19): bays 9.8 and 9.7 m, stories 3.9 and 4.3 m, fixed
/// bases, E = 200 GPa, columns A = 0.018 m², I = 4e-4 m⁴, beams A = 0.012 m², I = 6e-4 m⁴,
/// L = 8 kN/m on every beam, arranged.
fn issue_frame() -> Model {
    plumbline::input::parse_model(issue_frame_text(), "issue.toml").expect("valid model")
}

/// The model file of [`issue_frame`].
fn issue_frame_text() -> &'static str {
    r#"title = "two-bay two-storey frame (issue 19)"
units = "kN-m"
[[material]]
id = "S"
E = "200 GPa"
[[section]]
id = "COL"
A = "0.018 m^2"
I = "4e-4 m^4"
role = "column"
[[section]]
id = "BM"
A = "0.012 m^2"
I = "6e-4 m^4"
role = "beam"
[frame]
bays = [9.8, 9.7]
stories = [3.9, 4.3]
base = "fixed"
material = "S"
columns = ["COL"]
beams = ["BM"]
[[case]]
id = "L"
category = "live"
arrange = true
[[case.member_load]]
members = "B*"
kind = "uniform"
direction = "down"
w = 8
"#
}

/// The column of the issue: at the bottom of C2.2 no code arrangement of the old set
/// exceeded 4.7 kN·m, while live load on bay 1 of both floors gives −36.3 kN·m (issue 19,
/// computed by its author independently). The column pattern `left-C2.2` is that load, and
/// the exact mode reaches it too.
#[test]
fn the_issue_column_is_reached_by_the_column_pattern_and_the_exact_mode() {
    let model = issue_frame();
    let a = arrange(&model);
    let c = model
        .members
        .iter()
        .position(|m| m.id == "C2.2")
        .expect("C2.2");
    let pieces = SpanPieces::solve(&a).expect("solves");
    let moment = pieces.contributions(Quantity::Moment, c, 0.0);
    // Bay 1 on both floors: `left-C2.2`, listed as `right-C1.2`, which loads the same spans
    // and comes first.
    let bay1: Vec<usize> = ["B1.1", "B1.2"]
        .map(|n| a.spans.iter().position(|s| s.name == n).expect("span"))
        .to_vec();
    let left = a
        .patterns
        .iter()
        .find(|p| p.spans == bay1)
        .expect("column pattern");
    assert!(
        left.tag == "right-C1.2" || left.tag == "left-C2.2",
        "{}",
        left.tag
    );
    let v: f64 = left.spans.iter().map(|&s| moment[s]).sum();
    // The benchmark is quoted to 0.1 kN·m: within half of that, absolute, as before.
    verify::source("issue 19: −36.3 kN·m computed by the issue's author independently");
    verify::within(
        "moment at the bottom of C2.2, live load on bay 1 of both floors",
        "kN·m",
        v / 1e3,
        -36.3,
        1.0,
        0.05,
    );
    let e = pattern_extremes(0.0, &moment);
    verify::source("definition: the exact extremes cover every subset of loaded spans");
    verify::between(
        "exact mode's least moment at the bottom of C2.2, at most the bay-1 pattern's",
        "N·m",
        e.min,
        v,
        f64::NEG_INFINITY,
        1e-9,
    );
}

/// `arrange_model` follows `analysis.live_patterns`: exact gives `full` first and every
/// worst subset; code gives the code arrangements.
#[test]
fn the_mode_chooses_the_arrangements() {
    let mut model = issue_frame();
    let exact = arrange_model(&model).expect("arranges");
    assert_eq!(exact.patterns[0].tag, "full");
    assert!(
        exact
            .patterns
            .iter()
            .skip(1)
            .all(|p| p.tag == "none" || p.tag.starts_with('p'))
    );
    model.analysis.live_patterns = plumbline::model::LivePatterns::Code;
    let code = arrange_model(&model).expect("arranges");
    assert_eq!(code.patterns, arrange(&model).patterns);
    assert!(code.patterns.iter().any(|p| p.tag == "right-C2.1"));
}

/// The chosen method against the other (issue 19 item 2). With every case on the
/// first-order route (gravity only: no significant drift, so no amplification), running
/// the worst subsets as cases gives the same envelope as the signs combined directly:
/// at every member end, the largest and smallest design moment over the cases equal
/// `base + Σ max(cₛ, 0)` and `base + Σ min(cₛ, 0)` of the factored combination (closed
/// form: superposition).
#[test]
fn run_subsets_equal_signs_combined_on_the_first_order_route() {
    let mut model = issue_frame();
    // EN 1993-1-1 method without the sway imperfection: a gravity-only case is then one
    // case (no notional directions), on the first-order route.
    model.analysis.method = plumbline::model::SecondOrderMethod::Ec3AlphaCr;
    model.analysis.notional = plumbline::model::NotionalLoads::None;
    model.analysis.origin.notional = plumbline::model::SettingOrigin::Model;
    let a = arrange_model(&model).expect("arranges");
    let live = model.case_index("L").expect("L");
    let one = plumbline::combos::Expansion {
        cases: vec![factored("U", Basis::Strength, &[(live, 1.6)])],
        merged: vec![],
        skipped: vec![],
        warnings: vec![],
        notices: vec![],
    };
    let cases = a.apply(one).cases;
    let report = plumbline::check::check(&a.model, &cases).expect("checks");
    let env = plumbline::envelope::envelope(&report);
    let pieces = SpanPieces::solve(&a).expect("solves");
    let big = env
        .members
        .iter()
        .flat_map(|m| &m.sections)
        .flat_map(|s| [&s.positive, &s.negative])
        .flatten()
        .fold(0.0_f64, |x, d| x.max(d.moment.abs()));
    let mut worst = 0.0f64;
    for (m, me) in env.members.iter().enumerate() {
        for (end, x) in [(0, 0.0), (2, a.model.length(m))] {
            let c: Vec<f64> = pieces
                .contributions(Quantity::Moment, m, x)
                .into_iter()
                .map(|v| 1.6 * v)
                .collect();
            let e = pattern_extremes(0.0, &c);
            let s = &me.sections[end];
            let pos = s.positive.as_ref().map_or(0.0, |d| d.moment);
            let neg = s.negative.as_ref().map_or(0.0, |d| d.moment);
            worst = worst.max((pos - e.max).abs()).max((neg - e.min).abs());
            assert!(
                (pos - e.max).abs() <= 1e-9 * big,
                "{} {end}: {pos} {}",
                me.member,
                e.max
            );
            assert!(
                (neg - e.min).abs() <= 1e-9 * big,
                "{} {end}: {neg} {}",
                me.member,
                e.min
            );
        }
    }
    verify::source("closed form: superposition, base + Σ max(cₛ, 0) and base + Σ min(cₛ, 0)");
    verify::within(
        "largest |envelope of the run subsets − signs combined| at member ends, against the largest moment",
        "N·m",
        worst,
        0.0,
        big,
        1e-9,
    );
}

/// The chosen method against the other (issue 19 item 2) where amplification matters: the
/// issue's frame with a lateral load under the AISC B1/B2 method. The other method combines
/// each span's no-sway and sway parts by the signs of `B1·Mns,s + B2·Ms,s`, with B1 and B2
/// of the full live load. The two agree within the amplifiers' change between the full
/// load and the worst subset (measured, printed).
#[test]
fn run_subsets_against_signs_with_the_full_loads_amplifiers() {
    let mut model = issue_frame();
    model.analysis.notional = plumbline::model::NotionalLoads::None;
    model.analysis.origin.notional = plumbline::model::SettingOrigin::Model;
    let w = model.load_cases.len();
    let mut wind = model.load_cases[0].clone();
    wind.id = "W".into();
    wind.category = plumbline::model::ActionCategory::Wind;
    wind.arrange = false;
    wind.member.clear();
    // Illustrative lateral load: 150 kN at each floor's left node (large enough that B2
    // departs from 1).
    for (k, n) in model.nodes.iter().enumerate() {
        if n.x == 0.0 && n.y > 0.0 {
            wind.nodal.push(plumbline::model::NodalLoad {
                node: k,
                fx: 150e3,
                fy: 0.0,
                mz: 0.0,
            });
        }
    }
    model.load_cases.push(wind);
    let live = model.case_index("L").expect("L");
    let a = arrange_model(&model).expect("arranges");
    let one = |factors: &[(usize, f64)]| plumbline::combos::Expansion {
        cases: vec![factored("U", Basis::Strength, factors)],
        merged: vec![],
        skipped: vec![],
        warnings: vec![],
        notices: vec![],
    };
    let cases = a.apply(one(&[(w, 1.0), (live, 1.6)])).cases;
    let report = plumbline::check::check(&a.model, &cases).expect("checks");
    assert!(report.cases.iter().all(|c| c.stable));
    let env = plumbline::envelope::envelope(&report);
    let full = &report.cases[0];
    assert!(full.id.ends_with(":full"));
    // First-order no-sway and sway parts, linear in the loads: of the base (W alone: the
    // arranged case has no rest piece here) and of each span's piece × 1.6.
    let parts = |factors: Vec<(usize, f64)>| {
        let fc = factored("part", Basis::Strength, &factors);
        plumbline::check::check(&a.model, &[fc])
            .expect("checks")
            .cases
            .remove(0)
    };
    let base = parts(vec![(w, 1.0)]);
    let spans: Vec<_> = (0..a.spans.len())
        .map(|s| parts(span_cases(&a, s).into_iter().map(|k| (k, 1.6)).collect()))
        .collect();
    let (mut low, mut high) = (f64::MAX, f64::MIN);
    for (m, me) in env.members.iter().enumerate() {
        let fm = &full.members[m];
        let (b1, b2) = (
            fm.non_sway_amplifier.unwrap_or(1.0),
            fm.sway_amplifier.unwrap_or(1.0),
        );
        for (end, slot) in [(0, 0), (1, 2)] {
            let amp = |c: &plumbline::check::CaseCheck| {
                let e = &c.members[m].ends[end];
                b1 * e.no_sway + b2 * e.sway
            };
            let d: Vec<f64> = spans.iter().map(amp).collect();
            let other = pattern_extremes(amp(&base), &d);
            let s = &me.sections[slot];
            for (run, est) in [
                (s.positive.as_ref().map(|x| x.moment), other.max),
                (s.negative.as_ref().map(|x| x.moment), other.min),
            ] {
                let Some(run) = run else { continue };
                if est.abs() < 0.05 * run.abs().max(1.0) {
                    continue;
                }
                low = low.min(run / est);
                high = high.max(run / est);
            }
        }
    }
    println!("run subsets / signs with the full load's amplifiers: {low:.4} to {high:.4}");
    // Measured: 0.9928 to 1.0001. The subsets carry less gravity, so their amplifiers are
    // mostly below the full load's (ratio below 1); where the no-sway and sway parts have
    // opposite signs a smaller amplifier can raise the sum a little (ratio above 1).
    verify::source(
        "common practice, no source: the two methods differ by the amplifiers' change between the full load and the worst subset (measured 0.9928 to 1.0001)",
    );
    verify::between(
        "least ratio run subsets / signs",
        "-",
        low,
        0.95,
        0.0,
        f64::INFINITY,
    );
    verify::between(
        "largest ratio run subsets / signs",
        "-",
        high,
        1.001,
        f64::NEG_INFINITY,
        0.0,
    );
}

/// More worst subsets than the cap is a typed error that names the key and the way out
/// (project rule: bad input never panics).
#[test]
fn too_many_subsets_is_an_error_with_a_way_out() {
    let a = arrange(&issue_frame());
    let pieces = SpanPieces::solve(&a).expect("solves");
    let err = exact_patterns(&a, &pieces, PATTERN_DIVISIONS, 3).expect_err("over the cap");
    let text = err.to_string();
    assert!(text.contains("live_patterns = \"code\""), "{text}");
}

/// An unknown mode names the key and the choices (project rule: file, line and field).
#[test]
fn an_unknown_mode_is_an_input_error() {
    let text = issue_frame_text().to_string() + "[analysis]\nlive_patterns = \"all\"\n";
    let err = plumbline::input::parse_model(&text, "issue.toml").expect_err("unknown mode");
    assert_eq!(err.field, "analysis.live_patterns");
    assert!(err.message.contains("exact, code"), "{}", err.message);
    assert!(err.line > 0);
}

/// Arrangements multiply the factored cases; beyond the table's case limit that is an
/// error that suggests the code mode (project rule: bad input never exhausts memory).
#[test]
fn too_many_arranged_cases_is_an_error() {
    let limit = plumbline::combos::MAX_FACTORED_CASES;
    let case = factored("U", Basis::Strength, &[(0, 1.0)]);
    let expansion = plumbline::combos::Expansion {
        cases: vec![case; limit + 1],
        merged: vec![],
        skipped: vec![],
        warnings: vec![],
        notices: vec![],
    };
    let err = plumbline::arrange::within_case_limit(&expansion).expect_err("over the limit");
    assert!(
        err.to_string().contains("live_patterns = \"code\""),
        "{err}"
    );
    let mut fewer = expansion;
    fewer.cases.truncate(limit);
    assert!(plumbline::arrange::within_case_limit(&fewer).is_ok());
}
