//! Cost of the exact live-load patterns against the code arrangements (issue 19).
//!
//! Run with `cargo bench --bench patterns` (the 5-bay, 10-storey frame) or
//! `cargo bench --bench patterns -- BAYS STORIES`. The frame is invented: 8 m bays, 4 m
//! stories, fixed bases, illustrative sections, dead, arranged live and wind (both ways)
//! load cases, the shipped ASCE/SEI 7-16 strength table and the AISC Appendix 8 method
//! with notional loads. For each mode it prints the arrangements, the factored cases, the
//! time to find the arrangements (the exact mode solves every span's piece), the whole
//! check's time, and how far the code mode's envelope falls short of the exact one.
//! Timings are printed, never asserted.

mod common;

use std::time::Instant;

use plumbline::arrange::{arrange, arrange_model, exact};
use plumbline::check::check;
use plumbline::combos::{expand, load_table};
use plumbline::envelope::{Envelope, envelope};
use plumbline::input::parse_model;
use plumbline::model::{LivePatterns, Model};

/// The model file of the bench frame (`benches/common`) with arranged live load.
fn model_text(bays: usize, stories: usize) -> String {
    common::frame_text("pattern bench frame", bays, stories, true)
}

/// Figures of one mode.
struct Run {
    arrangements: usize,
    cases: usize,
    arrange_ms: f64,
    check_ms: f64,
    envelope: Envelope,
}

/// Arrange, expand and check `model` in `mode`.
fn run(model: &Model, mode: LivePatterns, cap: Option<usize>) -> Run {
    let mut model = model.clone();
    model.analysis.live_patterns = mode;
    let table = load_table("asce7-16-strength", None).expect("shipped table");
    let t = Instant::now();
    let arranged = match (mode, cap) {
        (LivePatterns::Exact, Some(cap)) => {
            let mut a = arrange(&model);
            let pieces = exact::SpanPieces::solve(&a).expect("solves");
            a.patterns = exact::exact_patterns(&a, &pieces, exact::PATTERN_DIVISIONS, cap)
                .expect("within the cap");
            a
        }
        _ => arrange_model(&model).expect("arranges"),
    };
    let arrange_ms = t.elapsed().as_secs_f64() * 1e3;
    let expansion = expand(&table, &model.load_cases, &Default::default()).expect("expands");
    let cases = arranged.apply(expansion).cases;
    let t = Instant::now();
    let report = check(&arranged.model, &cases).expect("checks");
    let check_ms = t.elapsed().as_secs_f64() * 1e3;
    Run {
        arrangements: arranged.patterns.len(),
        cases: cases.len(),
        arrange_ms,
        check_ms,
        envelope: envelope(&report),
    }
}

/// Over every member section and sign the exact envelope has a significant value
/// (above 1 % of the frame's largest), the smallest ratio code / exact, its median and
/// how many fall below 0.9; columns and beams apart.
fn shortfall(code: &Envelope, exact: &Envelope, role: &str) -> (f64, f64, usize, usize) {
    let big = exact
        .members
        .iter()
        .flat_map(|m| &m.sections)
        .flat_map(|s| [&s.positive, &s.negative])
        .flatten()
        .fold(0.0f64, |a, d| a.max(d.moment.abs()));
    let mut ratios = Vec::new();
    for (c, e) in code.members.iter().zip(&exact.members) {
        if c.role != role {
            continue;
        }
        for (cs, es) in c.sections.iter().zip(&e.sections) {
            for (cd, ed) in [(&cs.positive, &es.positive), (&cs.negative, &es.negative)] {
                let Some(ed) = ed else { continue };
                if ed.moment.abs() < 0.01 * big {
                    continue;
                }
                let cv = cd.as_ref().map_or(0.0, |d| d.moment);
                ratios.push(cv / ed.moment);
            }
        }
    }
    ratios.sort_by(f64::total_cmp);
    let low = ratios.iter().filter(|&&r| r < 0.9).count();
    (
        ratios.first().copied().unwrap_or(f64::NAN),
        ratios.get(ratios.len() / 2).copied().unwrap_or(f64::NAN),
        low,
        ratios.len(),
    )
}

fn main() {
    let args: Vec<usize> = std::env::args()
        .skip(1)
        .filter_map(|a| a.parse().ok())
        .collect();
    let (bays, stories) = match args[..] {
        [b, s, ..] => (b, s),
        _ => (5, 10),
    };
    let model = parse_model(&model_text(bays, stories), "bench.toml").expect("valid model");
    println!(
        "live-load patterns, {bays} x {stories} frame ({} members), ASCE/SEI 7-16 strength, AISC App. 8",
        model.members.len()
    );
    println!("mode    arrangements   cases   arrange (ms)   check (ms)");
    let code = run(&model, LivePatterns::Code, None);
    let exact = run(&model, LivePatterns::Exact, Some(100_000));
    for (name, r) in [("code", &code), ("exact", &exact)] {
        println!(
            "{name:<7} {:>12} {:>7} {:>14.1} {:>12.0}",
            r.arrangements, r.cases, r.arrange_ms, r.check_ms
        );
    }
    println!(
        "exact / code: {:.2} x the check time",
        exact.check_ms / code.check_ms
    );
    println!("design moments, code envelope / exact envelope (entries above 1 % of the largest):");
    println!("role      smallest   median   below 0.9   entries");
    for role in ["beam", "column"] {
        let (min, median, low, n) = shortfall(&code.envelope, &exact.envelope, role);
        println!("{role:<8} {min:>9.3} {median:>8.3} {low:>11} {n:>9}");
    }
}
