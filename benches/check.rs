//! Timing and peak memory of the whole `check` job on invented regular frames.
//!
//! Run with `cargo bench --bench check`. Every frame is generated from a model file written
//! here: `bays` × `stories`, 8 m bays, 4 m stories, fixed bases, dead, live and wind (both
//! ways) load cases, the shipped ASCE/SEI 7-16 strength table and the AISC Appendix 8
//! method with notional loads (each case: the no-sway/sway split, B1/B2 figures, the direct
//! P-Δ/P-δ analysis and the elastic critical load factor α_cr). Timings are printed, never
//! asserted.
//!
//! * `cargo bench --bench check` — the standard frames (10×25, 20×50, 20×100, 1×2000),
//!   each run in its own process (so that its peak memory is its own), 3 runs each, median
//!   time and largest peak printed; then the cases × time curve on the 20×50 frame and the
//!   dense baseline.
//! * `cargo bench --bench check -- quick` — one small frame.
//! * `cargo bench --bench check -- frame BAYS STORIES [CASES]` — one run of one frame
//!   (optionally only the first CASES factored cases), one line of figures.
//! * `cargo bench --bench check -- dense` — the dense baseline only.
//! * `cargo bench --bench check -- stages [BAYS STORIES]` — where the time goes: the time
//!   of each stage of `check` (summed over the threads), then of writing the summary and
//!   the JSON document, on one frame (default 20 × 100).
//! * `cargo bench --bench check -- goal [BAYS STORIES]` — the figures of issue 21 for one
//!   frame (default 20 × 100): the whole command as `plumbline check MODEL -o FILE` runs it
//!   (reading, checking, writing the file) for the summary, JSON and CSV, and JSON and CSV
//!   with `--lean`, 5 runs each in a child process, beside the stored figures of the code
//!   before issue 21.
//! * `cargo bench --bench check -- buckling [BAYS STORIES [lean]]` — the buckling analysis
//!   alone, per factored case: the raw lowest mode (`critical_factor`) against the sorted
//!   modes with factors on the safe side (`buckling`), on the standard frames (their lowest
//!   mode is the sway mode) or on one frame; `lean` adds a line of pin-ended leaning columns
//!   carrying 100 kN per level (illustrative), whose bows lie below the sway mode.
//!
//! Peak memory is the process's resident high-water mark (`VmHWM` in `/proc/self/status`,
//! Linux); elsewhere it prints as 0.

mod common;

use common::peak_mb;

/// CPU time of this process so far, ms ([`common::cpu_s`]).
fn cpu_ms() -> f64 {
    common::cpu_s() * 1e3
}

use std::process::Command;
use std::time::Instant;

use plumbline::app::{CheckArgs, check_and_emit};
use plumbline::check::{StageTimes, check, check_timed};
use plumbline::combos::{FactoredCase, expand, load_table};
use plumbline::input::parse_model;
use plumbline::model::Model;
use plumbline::report::CheckFormat;
use plumbline::solve::first_order::FirstOrder;
use plumbline::solve::linear::MeshLoads;
use plumbline::solve::mesh::member_stiffness;
use plumbline::solve::modes::SwaySearch;
use plumbline::solve::second_order::SecondOrderModel;

/// The model file of the bench frame (`benches/common`).
fn model_text(bays: usize, stories: usize) -> String {
    common::frame_text("bench frame", bays, stories, false)
}

/// The whole check before this bench's work (commit 8387666): frame, members, median
/// wall time (ms), CPU time (ms, one run; "-" not measured) and peak memory (MB).
const BEFORE: [(&str, usize, &str, &str, &str); 4] = [
    ("10 x 25", 525, "1599", "433", "20"),
    ("20 x 50", 2050, "15066", "4497", "106"),
    ("20 x 100", 4100, "42863", "8155", "235"),
    ("1 x 2000", 6000, "133778", "-", "1277"),
];

/// The model and its factored cases under the shipped ASCE/SEI 7-16 strength table.
/// A model over the documented size limits (`plumbline::limits`) is an error, not a panic.
fn frame(bays: usize, stories: usize) -> Result<(Model, Vec<FactoredCase>), String> {
    let text = model_text(bays, stories);
    let model = parse_model(&text, "bench.toml").map_err(|e| e.message.clone())?;
    let table = load_table("asce7-16-strength", None).expect("shipped table");
    let cases = expand(&table, &model.load_cases, &Default::default())
        .expect("expands")
        .cases;
    Ok((model, cases))
}

/// The lines added to a bench frame by `lean`: a leaning column line 8 m right of the last
/// grid line, one pin-ended column per story (illustrative section), tied to the frame at
/// every level by a link pinned at both ends, carrying 100 kN at every level.
fn leaning_text(bays: usize, stories: usize) -> String {
    let x = 8.0 * (bays + 1) as f64;
    let mut t = String::from(
        "[[section]]\nid = \"LEAN\"\nA = \"5000 mm^2\"\nI = \"4.0e7 mm^4\"\nrole = \"column\"\n",
    );
    for k in 0..=stories {
        t += &format!("[[node]]\nid = \"L{k}\"\nx = {x}\ny = {}\n", 4.0 * k as f64);
    }
    for k in 1..=stories {
        t += &format!(
            "[[member]]\nid = \"LC{k}\"\ni = \"L{}\"\nj = \"L{k}\"\nsection = \"LEAN\"\n\
             material = \"S\"\n[[member]]\nid = \"LK{k}\"\ni = \"N{}.{k}\"\nj = \"L{k}\"\n\
             section = \"BM\"\nmaterial = \"S\"\nhinge = \"both\"\n",
            k - 1,
            bays + 1
        );
    }
    t += "[[support]]\nnode = \"L0\"\ntype = \"pinned\"\n";
    t += "[[case]]\nid = \"DL\"\ncategory = \"dead\"\n";
    for k in 1..=stories {
        t += &format!("[[case.node_load]]\nnodes = \"L{k}\"\nfy = -100\n");
    }
    t
}

/// The buckling analysis alone on one frame: per factored case, `critical_factor` against
/// `buckling` (after one warm-up call that builds the nested mesh, timed apart). Prints one
/// line of figures.
fn run_buckling(bays: usize, stories: usize, lean: bool) {
    let mut text = model_text(bays, stories);
    if lean {
        text += &leaning_text(bays, stories);
    }
    let model = match parse_model(&text, "bench.toml") {
        Ok(m) => m,
        Err(e) => {
            println!("{bays:>3} x {stories:<6} model refused: {}", e.message);
            return;
        }
    };
    let table = load_table("asce7-16-strength", None).expect("shipped table");
    let cases = expand(&table, &model.load_cases, &Default::default())
        .expect("expands")
        .cases;
    let stiffness = member_stiffness(&model);
    let so = SecondOrderModel::new(&model, &stiffness, model.analysis.segments).expect("factors");
    let loads: Vec<MeshLoads> = cases
        .iter()
        .map(|fc| {
            let mut l = MeshLoads::zero(&so.mesh);
            for &(k, f) in &fc.factors {
                l.add_case(&model, &so.mesh, k, f);
            }
            l
        })
        .collect();
    let t = Instant::now();
    let _ = so.buckling(&model, &loads[0]).expect("solves");
    let warm = t.elapsed().as_secs_f64() * 1e3;
    // Best of three passes (the machine is shared), alternating the two analyses.
    let (mut raw, mut sorted) = (f64::INFINITY, f64::INFINITY);
    let (mut member_first, mut bound, mut modes) = (0, 0, 0);
    for _ in 0..3 {
        let t = Instant::now();
        for l in &loads {
            std::hint::black_box(so.critical_factor(&model, l).expect("solves"));
        }
        raw = raw.min(t.elapsed().as_secs_f64() * 1e3);
        let t = Instant::now();
        (member_first, bound, modes) = (0, 0, 0);
        for l in &loads {
            if let Some(b) = so.buckling(&model, l).expect("solves") {
                member_first += usize::from(b.member.is_some());
                bound += usize::from(b.search != SwaySearch::Complete);
                modes += b.modes.len();
            }
        }
        sorted = sorted.min(t.elapsed().as_secs_f64() * 1e3);
    }
    let n = loads.len() as f64;
    println!(
        "{:>3} x {:<6}{:>5} {:>8} {:>6} {:>14.2} {:>14.2} {:>7.2} {:>13.1} {:>8} {:>6} {:>7.1}",
        bays,
        stories,
        if lean { "lean" } else { "" },
        model.members.len(),
        cases.len(),
        raw / n,
        sorted / n,
        sorted / raw,
        warm,
        member_first,
        bound,
        modes as f64 / n
    );
}

/// Header of [`run_buckling`]'s lines.
fn buckling_header() {
    println!("buckling analysis per factored case: critical_factor (lowest mode) against");
    println!("buckling (sway/member modes, nested 2n mesh); ms per case, best of 3 passes;");
    println!("first = first buckling call, including building the nested mesh");
    println!(
        "frame            members  cases   lowest (ms)   sorted (ms)   ratio   first (ms)  \
         member  bound   modes"
    );
}

/// One run of one frame: prints `members cases checked time_ms peak_mb cpu_ms`.
fn run_frame(bays: usize, stories: usize, limit: Option<usize>) {
    let (model, mut cases) = match frame(bays, stories) {
        Ok(x) => x,
        Err(e) => {
            println!("ERR {e}");
            return;
        }
    };
    if let Some(k) = limit {
        cases.truncate(k);
    }
    let (t, cpu0) = (Instant::now(), cpu_ms());
    let report = match check(&model, &cases) {
        Ok(r) => r,
        Err(e) => {
            println!("ERR {e}");
            return;
        }
    };
    let ms = t.elapsed().as_secs_f64() * 1e3;
    let cpu = cpu_ms() - cpu0;
    println!(
        "{} {} {} {:.1} {:.1} {:.0}",
        model.members.len(),
        cases.len(),
        report.cases.len(),
        ms,
        peak_mb(),
        cpu
    );
}

/// Figures of one child run.
struct Run {
    members: usize,
    cases: usize,
    checked: usize,
    ms: f64,
    mb: f64,
    cpu: f64,
}

/// Run one frame in a child process (its own peak memory); the check's error if it fails.
fn child(bays: usize, stories: usize, limit: Option<usize>) -> Result<Run, String> {
    let exe = std::env::current_exe().expect("own path");
    let mut cmd = Command::new(exe);
    cmd.args(["frame", &bays.to_string(), &stories.to_string()]);
    if let Some(k) = limit {
        cmd.arg(k.to_string());
    }
    let out = cmd.output().expect("child runs");
    assert!(
        out.status.success(),
        "child failed: {}",
        String::from_utf8_lossy(&out.stderr)
    );
    let text = String::from_utf8_lossy(&out.stdout);
    if let Some(err) = text.strip_prefix("ERR ") {
        return Err(err.trim().to_string());
    }
    let v: Vec<f64> = text
        .split_whitespace()
        .map(|w| w.parse().expect("number"))
        .collect();
    Ok(Run {
        members: v[0] as usize,
        cases: v[1] as usize,
        checked: v[2] as usize,
        ms: v[3],
        mb: v[4],
        cpu: v[5],
    })
}

/// Median of `runs` children of one frame (and every run's time), or the check's error.
fn measured(
    bays: usize,
    stories: usize,
    limit: Option<usize>,
    runs: usize,
) -> Result<(Run, Vec<f64>), String> {
    let all: Vec<Run> = (0..runs)
        .map(|_| child(bays, stories, limit))
        .collect::<Result<_, _>>()?;
    let mut times: Vec<f64> = all.iter().map(|r| r.ms).collect();
    times.sort_by(f64::total_cmp);
    let mb = all.iter().map(|r| r.mb).fold(0.0, f64::max);
    let mut cpu: Vec<f64> = all.iter().map(|r| r.cpu).collect();
    cpu.sort_by(f64::total_cmp);
    let first = &all[0];
    Ok((
        Run {
            ms: times[times.len() / 2],
            mb,
            cpu: cpu[cpu.len() / 2],
            ..*first
        },
        times,
    ))
}

/// Skyline LDLᵀ against nalgebra's dense Cholesky on the free frame's first-order stiffness.
fn dense_baseline(sizes: &[(usize, usize)]) {
    println!("\ndense baseline: one factorization of the free frame's stiffness");
    println!("(dense O(n³) grows 8x per doubling of n: larger frames are not practical)");
    println!("frame        equations   skyline (ms)   dense Cholesky (ms)   ratio");
    for &(bays, stories) in sizes {
        let (model, _) = frame(bays, stories).expect("within the limits");
        let first = FirstOrder::new(&model, &[]).expect("frame factors");
        let matrix = &first.system.matrix;
        let t = Instant::now();
        let reps = 20;
        for _ in 0..reps {
            std::hint::black_box(matrix.factor().expect("factors"));
        }
        let sky = t.elapsed().as_secs_f64() * 1e3 / reps as f64;
        let dense = matrix.to_dense();
        let t = Instant::now();
        let chol = dense.cholesky().expect("positive definite");
        let dense_ms = t.elapsed().as_secs_f64() * 1e3;
        std::hint::black_box(chol);
        println!(
            "{:>3} x {:<6} {:>10} {:>14.2} {:>21.1} {:>7.0}",
            bays,
            stories,
            matrix.n(),
            sky,
            dense_ms,
            dense_ms / sky
        );
    }
}

/// The whole `check` command of the 20 × 100 frame before issue 21 (commit 8ff568c, its
/// release binary run with `/usr/bin/time` on the same shared 2-core machine, load average
/// about 7): output, median wall time of 3 (s), CPU time (user + system, s), peak resident
/// memory (MB) and the size of what was written (MB).
const GOAL_BEFORE: [(&str, &str, &str, &str, &str); 3] = [
    ("summary", "3.0", "2.1", "159", "2.6"),
    ("json", "5.3", "3.5", "566", "110"),
    ("csv", "4.1", "2.5", "194", "7.0"),
];

/// Write a bench frame's model file into the temporary directory; its path.
fn model_file(bays: usize, stories: usize) -> std::path::PathBuf {
    let dir = std::env::temp_dir().join(format!("plumbline-bench-{}", std::process::id()));
    std::fs::create_dir_all(&dir).expect("temporary directory");
    let path = dir.join(format!("frame-{bays}x{stories}.toml"));
    let text = model_text(bays, stories) + "[analysis]\nmethod = \"aisc-b1b2\"\n";
    std::fs::write(&path, text).expect("model file written");
    path
}

/// The `check` arguments of the bench: the model's own table and method, `format`.
fn check_args(format: CheckFormat) -> CheckArgs {
    lean_args(format, false)
}

/// [`check_args`], with `--lean` when `lean`.
fn lean_args(format: CheckFormat, lean: bool) -> CheckArgs {
    CheckArgs {
        lean,
        combos: Some("asce7-16-strength".into()),
        sets: Vec::new(),
        method: None,
        stiffness: None,
        notional: None,
        case: None,
        format,
        ..Default::default()
    }
}

/// Size of a file, or of the files of a directory, MB.
fn output_mb(path: &std::path::Path) -> f64 {
    let size = |p: &std::path::Path| std::fs::metadata(p).map_or(0, |m| m.len());
    let bytes = if path.is_dir() {
        std::fs::read_dir(path)
            .map(|d| d.flatten().map(|e| size(&e.path())).sum())
            .unwrap_or(0)
    } else {
        size(path)
    };
    bytes as f64 / 1e6
}

/// One child run of the whole command: prints `wall_ms cpu_ms peak_mb output_mb`.
fn run_command(bays: usize, stories: usize, format: CheckFormat, lean: bool) {
    let model = model_file(bays, stories);
    let out = model.with_extension(format!("out.{format}"));
    let (t, cpu0) = (Instant::now(), cpu_ms());
    let result = check_and_emit(&model, &lean_args(format, lean), Some(&out), &mut |_, _| {});
    let ms = t.elapsed().as_secs_f64() * 1e3;
    let cpu = cpu_ms() - cpu0;
    if let Err(e) = result {
        println!("ERR {e}");
        return;
    }
    println!("{ms:.1} {cpu:.0} {:.1} {:.2}", peak_mb(), output_mb(&out));
    let _ = std::fs::remove_dir_all(model.parent().expect("in a directory"));
}

/// The goal table of issue 21 for one frame: before (stored) and now (measured).
fn goal_table(bays: usize, stories: usize) {
    let exe = std::env::current_exe().expect("own path");
    println!("issue 21 goal table: {bays} x {stories} frame, the whole command (read, check,");
    println!("write the file), ASCE/SEI 7-16 strength table, AISC App. 8; 5 runs each in its");
    println!("own process: median wall and CPU (user + system), largest peak resident memory");
    println!("output      code     wall (s)   cpu (s)   peak (MB)   file (MB)   runs (s)");
    for (format, lean, name) in [
        (CheckFormat::Table, false, "summary"),
        (CheckFormat::Json, false, "json"),
        (CheckFormat::Csv, false, "csv"),
        (CheckFormat::Json, true, "json lean"),
        (CheckFormat::Csv, true, "csv lean"),
    ] {
        if let Some(b) = GOAL_BEFORE.iter().find(|b| b.0 == name)
            && bays == 20
            && stories == 100
        {
            println!(
                "{name:<10}  before {:>10} {:>9} {:>11} {:>11}   (stored, commit 8ff568c)",
                b.1, b.2, b.3, b.4
            );
        }
        let mut runs: Vec<[f64; 4]> = Vec::new();
        for _ in 0..5 {
            let out = Command::new(&exe)
                .args(["command", &bays.to_string(), &stories.to_string()])
                .arg(format.to_string())
                .args(lean.then_some("lean"))
                .output()
                .expect("child runs");
            let text = String::from_utf8_lossy(&out.stdout);
            let v: Vec<f64> = text
                .split_whitespace()
                .filter_map(|w| w.parse().ok())
                .collect();
            if v.len() == 4 {
                runs.push([v[0], v[1], v[2], v[3]]);
            } else {
                println!("{name:<10}  failed: {text}");
                break;
            }
        }
        if runs.is_empty() {
            continue;
        }
        let median = |k: usize| {
            let mut v: Vec<f64> = runs.iter().map(|r| r[k]).collect();
            v.sort_by(f64::total_cmp);
            v[v.len() / 2]
        };
        let peak = runs.iter().map(|r| r[2]).fold(0.0, f64::max);
        println!(
            "{name:<10}  now    {:>10.2} {:>9.2} {:>11.0} {:>11.1}   {:?}",
            median(0) / 1e3,
            median(1) / 1e3,
            peak,
            median(3),
            runs.iter()
                .map(|r| (r[0] / 10.0).round() / 100.0)
                .collect::<Vec<_>>()
        );
    }
}

/// Where the time of one frame's check goes: each stage of `check` (summed over the
/// threads), then the summary text and the JSON document written to memory.
fn stages(bays: usize, stories: usize) {
    let model_path = model_file(bays, stories);
    let (model, cases) = frame(bays, stories).expect("within the limits");
    let times = StageTimes::default();
    let (t, cpu0) = (Instant::now(), cpu_ms());
    let report = check_timed(&model, &cases, &mut |_, _| {}, &times).expect("checks");
    let wall = t.elapsed().as_secs_f64();
    let cpu = (cpu_ms() - cpu0) / 1e3;
    println!(
        "where the time goes: {bays} x {stories} frame, {} members, {} factored cases ({} \
         checked)",
        model.members.len(),
        cases.len(),
        report.cases.len()
    );
    println!("check: wall {wall:.3} s, cpu {cpu:.3} s; per stage, summed over the threads:");
    for (stage, s) in times.seconds() {
        println!("  {:<32} {:>8.3} s", stage.name(), s);
    }
    drop(report);
    let run =
        plumbline::app::run_check(&model_path, &check_args(CheckFormat::Json), &mut |_, _| {})
            .expect("checks");
    let t = Instant::now();
    let text = plumbline::app::render_check(&run, CheckFormat::Table, false);
    println!(
        "  {:<32} {:>8.3} s ({:.1} MB)",
        "summary text",
        t.elapsed().as_secs_f64(),
        text.joined().len() as f64 / 1e6
    );
    let t = Instant::now();
    let mut sink = std::io::sink();
    plumbline::report::summary::write_json(&run.summary(), None, &mut sink).expect("writes");
    println!(
        "  {:<32} {:>8.3} s (streamed to a sink)",
        "JSON document",
        t.elapsed().as_secs_f64()
    );
    let _ = std::fs::remove_dir_all(model_path.parent().expect("in a directory"));
}

fn main() {
    let args: Vec<String> = std::env::args().skip(1).collect();
    let num = |k: usize| args.get(k).and_then(|s| s.parse::<usize>().ok());
    if let Some(at) = args.iter().position(|a| a == "command") {
        let (b, s) = (num(at + 1).expect("BAYS"), num(at + 2).expect("STORIES"));
        let format = args
            .get(at + 3)
            .and_then(|f| f.parse().ok())
            .unwrap_or(CheckFormat::Table);
        run_command(b, s, format, args.iter().any(|a| a == "lean"));
        return;
    }
    if let Some(at) = args.iter().position(|a| a == "goal") {
        goal_table(num(at + 1).unwrap_or(20), num(at + 2).unwrap_or(100));
        return;
    }
    if let Some(at) = args.iter().position(|a| a == "stages") {
        stages(num(at + 1).unwrap_or(20), num(at + 2).unwrap_or(100));
        return;
    }
    if let Some(at) = args.iter().position(|a| a == "frame") {
        let (b, s) = (num(at + 1).expect("BAYS"), num(at + 2).expect("STORIES"));
        run_frame(b, s, num(at + 3));
        return;
    }
    if let Some(at) = args.iter().position(|a| a == "buckling") {
        buckling_header();
        match (num(at + 1), num(at + 2)) {
            (Some(b), Some(s)) => run_buckling(b, s, args.iter().any(|a| a == "lean")),
            _ => {
                for (b, s) in [(3, 8), (10, 25), (20, 50)] {
                    run_buckling(b, s, false);
                }
                for (b, s) in [(3, 8), (10, 25)] {
                    run_buckling(b, s, true);
                }
            }
        }
        return;
    }
    if args.iter().any(|a| a == "dense") {
        dense_baseline(&[(10, 25), (20, 25), (20, 50)]);
        return;
    }
    let quick = args.iter().any(|a| a == "quick");
    let sizes: &[(usize, usize)] = if quick {
        &[(3, 8)]
    } else {
        // 1 x 2000 (6,000 members) is over the member limit of 5,000: it is run to show the
        // refusal, and 1 x 1600 (4,800 members) is the tallest frame within the limits.
        &[(3, 8), (10, 25), (20, 50), (20, 100), (1, 1600), (1, 2000)]
    };
    let runs = if quick { 1 } else { 3 };
    println!("whole check, ASCE/SEI 7-16 strength table, AISC App. 8 with notional loads");
    println!("median of {runs} runs (wall clock), peak = largest resident high-water mark");
    println!("time: wall clock; cpu: user + system time of all threads (both medians)");
    println!(
        "frame        members   cases   checked   time (ms)    cpu (ms)   peak (MB)   runs (ms)"
    );
    for &(bays, stories) in sizes {
        let (r, times) = match measured(bays, stories, None, runs) {
            Ok(x) => x,
            Err(e) => {
                println!("{bays:>3} x {stories:<6} check failed: {e}");
                continue;
            }
        };
        println!(
            "{:>3} x {:<6} {:>9} {:>7} {:>9} {:>11.0} {:>11.0} {:>11.0}   {:?}",
            bays,
            stories,
            r.members,
            r.cases,
            r.checked,
            r.ms,
            r.cpu,
            r.mb,
            times.iter().map(|t| t.round()).collect::<Vec<_>>()
        );
    }
    if quick {
        return;
    }
    println!("\nbefore (stored figures, not re-run: the code of commit 8387666, one direct");
    println!("analysis system of 4 elements per member factored at every iteration, one");
    println!("stored solution per level, cases on one core; measured with this bench on the");
    println!("same shared machine; CPU time from one run)");
    println!("frame        members   time (ms)    cpu (ms)   peak (MB)");
    for (frame, members, ms, cpu, mb) in BEFORE {
        println!("{frame:<12} {members:>7} {ms:>11} {cpu:>11} {mb:>11}");
    }
    println!("\ncases x time on the 20 x 50 frame (first k factored cases)");
    println!("cases   checked   time (ms)    cpu (ms)");
    for k in 1..=8 {
        let Ok((r, _)) = measured(20, 50, Some(k), runs) else {
            continue;
        };
        println!(
            "{:>5} {:>9} {:>11.0} {:>11.0}",
            r.cases, r.checked, r.ms, r.cpu
        );
    }
    println!("\nmembers x time, 20 bays (all factored cases)");
    println!("stories   members   time (ms)    cpu (ms)   peak (MB)");
    for s in [10, 25, 50, 75, 100] {
        let Ok((r, _)) = measured(20, s, None, runs) else {
            continue;
        };
        println!(
            "{:>7} {:>9} {:>11.0} {:>11.0} {:>11.0}",
            s, r.members, r.ms, r.cpu, r.mb
        );
    }
    dense_baseline(&[(10, 25), (20, 25), (20, 50)]);
}
