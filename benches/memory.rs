//! Memory of the whole `check` job against the number of storeys (issue 21 goal 3).
//!
//! Run with `cargo bench --bench memory`. The frames are those of `benches/check.rs`
//! (invented, illustrative sections): 8 m bays, 4 m storeys, fixed bases, dead, live and
//! wind both ways, the shipped ASCE/SEI 7-16 strength table and the AISC Appendix 8 method.
//! Figures are printed, never asserted.
//!
//! * `cargo bench --bench memory` — the storeys curve: the 1-bay frame at 200, 400, 800
//!   and 1,600 storeys, then the 20-bay × 100-storey frame; each the whole command as
//!   `plumbline check MODEL -o FILE` runs it (reading, checking, the summary written), in
//!   its own process so that its peak memory is its own: peak resident memory (MB, the
//!   process's high-water mark) and CPU time (user + system, s), the median of 3 runs.
//!   Last, the 1 × 1,600 frame with no two storeys alike (every member its own section
//!   and length), for which no stiffness is shared among members.
//! * `cargo bench --bench memory -- heap [BAYS STORIES] [distinct]` — where the memory goes: heap
//!   bytes live after, and at their peak during, each stage of one frame (default 1 ×
//!   1,600), counted by this bench's own allocator.
//!
//! Peak resident memory is `VmHWM` in `/proc/self/status` (Linux); elsewhere it prints as 0.

mod common;

use std::alloc::{GlobalAlloc, Layout, System};
use std::process::Command;
use std::sync::atomic::{AtomicUsize, Ordering};
use std::time::Instant;

use plumbline::app::{CheckArgs, check_and_emit};
use plumbline::report::CheckFormat;

/// The system allocator, counting the bytes live and their peak.
struct Counting;

static LIVE: AtomicUsize = AtomicUsize::new(0);
static PEAK: AtomicUsize = AtomicUsize::new(0);

// SAFETY: every call is passed on to the system allocator unchanged; only counters are
// added.
unsafe impl GlobalAlloc for Counting {
    unsafe fn alloc(&self, layout: Layout) -> *mut u8 {
        // SAFETY: as the caller's contract for `GlobalAlloc::alloc`.
        let p = unsafe { System.alloc(layout) };
        if !p.is_null() {
            grew(layout.size());
        }
        p
    }

    unsafe fn dealloc(&self, ptr: *mut u8, layout: Layout) {
        // SAFETY: as the caller's contract for `GlobalAlloc::dealloc`.
        unsafe { System.dealloc(ptr, layout) };
        LIVE.fetch_sub(layout.size(), Ordering::Relaxed);
    }

    unsafe fn realloc(&self, ptr: *mut u8, layout: Layout, new_size: usize) -> *mut u8 {
        // SAFETY: as the caller's contract for `GlobalAlloc::realloc`.
        let p = unsafe { System.realloc(ptr, layout, new_size) };
        if !p.is_null() {
            LIVE.fetch_sub(layout.size(), Ordering::Relaxed);
            grew(new_size);
        }
        p
    }
}

/// Count `bytes` more live, raising the peak.
fn grew(bytes: usize) {
    let now = LIVE.fetch_add(bytes, Ordering::Relaxed) + bytes;
    PEAK.fetch_max(now, Ordering::Relaxed);
}

#[global_allocator]
static ALLOCATOR: Counting = Counting;

/// Heap bytes live now, MB.
fn live_mb() -> f64 {
    LIVE.load(Ordering::Relaxed) as f64 / 1e6
}

/// Run `f`; print the heap live after it and its peak during it (both MB).
fn stage<T>(name: &str, f: impl FnOnce() -> T) -> T {
    PEAK.store(LIVE.load(Ordering::Relaxed), Ordering::Relaxed);
    let t = Instant::now();
    let out = f();
    let s = t.elapsed().as_secs_f64();
    println!(
        "  {name:<40} {:>9.1} {:>9.1} {:>8.3}",
        live_mb(),
        PEAK.load(Ordering::Relaxed) as f64 / 1e6,
        s
    );
    out
}

/// The model file of the frame of `benches/check.rs` (`benches/common`), with its table
/// and method; with `distinct`, no two storeys alike (`common::frame_text_with`).
fn model_text(bays: usize, stories: usize, distinct: bool) -> String {
    common::frame_text_with("bench frame", bays, stories, false, distinct)
        + "[combinations]\ntable = \"asce7-16-strength\"\n[analysis]\nmethod = \"aisc-b1b2\"\n"
}

/// Write a frame's model file into a temporary directory of its own; its path.
fn model_file(bays: usize, stories: usize, distinct: bool) -> std::path::PathBuf {
    let dir = std::env::temp_dir().join(format!("plumbline-memory-{}", std::process::id()));
    std::fs::create_dir_all(&dir).expect("temporary directory");
    let path = dir.join(format!("frame-{bays}x{stories}.toml"));
    std::fs::write(&path, model_text(bays, stories, distinct)).expect("model file written");
    path
}

/// One child run of the whole default command: prints `peak_mb cpu_s wall_s`.
fn run_command(bays: usize, stories: usize, distinct: bool) {
    let model = model_file(bays, stories, distinct);
    let out = model.with_extension("out.txt");
    let args = CheckArgs {
        format: CheckFormat::Table,
        ..Default::default()
    };
    let t = Instant::now();
    let result = check_and_emit(&model, &args, Some(&out), &mut |_, _| {});
    let wall = t.elapsed().as_secs_f64();
    let _ = std::fs::remove_dir_all(model.parent().expect("in a directory"));
    match result {
        Ok(_) => println!("{:.1} {:.2} {wall:.2}", common::peak_mb(), common::cpu_s()),
        Err(e) => println!("ERR {e}"),
    }
}

/// Median peak memory (MB), CPU (s) and wall time (s) of `runs` child runs of one frame.
fn measured(bays: usize, stories: usize, distinct: bool, runs: usize) -> Result<[f64; 3], String> {
    let exe = std::env::current_exe().expect("own path");
    let mut all: Vec<[f64; 3]> = Vec::new();
    for _ in 0..runs {
        let out = Command::new(&exe)
            .args(["command", &bays.to_string(), &stories.to_string()])
            .args(distinct.then_some("distinct"))
            .output()
            .expect("child runs");
        let text = String::from_utf8_lossy(&out.stdout);
        if let Some(e) = text.strip_prefix("ERR ") {
            return Err(e.trim().to_string());
        }
        let v: Vec<f64> = text
            .split_whitespace()
            .map(|w| w.parse().expect("number"))
            .collect();
        all.push([v[0], v[1], v[2]]);
    }
    let median = |k: usize| {
        let mut v: Vec<f64> = all.iter().map(|r| r[k]).collect();
        v.sort_by(f64::total_cmp);
        v[v.len() / 2]
    };
    Ok([median(0), median(1), median(2)])
}

/// The storeys curve (and the 20 × 100 frame).
fn curve() {
    println!("the default `check` (summary written to a file), ASCE/SEI 7-16 strength table,");
    println!("AISC App. 8; median of 3 runs, each in its own process");
    println!("frame         members   peak (MB)   cpu (s)   wall (s)   MB per storey");
    let frames = [(1, 200), (1, 400), (1, 800), (1, 1600), (20, 100)]
        .map(|(b, s)| (b, s, false))
        .into_iter()
        .chain([(1, 1600, true)]);
    for (bays, stories, distinct) in frames {
        let members = bays * stories + (bays + 1) * stories;
        let mark = if distinct { "*" } else { " " };
        match measured(bays, stories, distinct, 3) {
            Ok([mb, cpu, wall]) => println!(
                "{bays:>3} x {stories:<5}{mark} {members:>9} {mb:>11.1} {cpu:>9.2} {wall:>10.2} {:>15.3}",
                mb / stories as f64
            ),
            Err(e) => println!("{bays:>3} x {stories:<5}{mark} {members:>9}   refused: {e}"),
        }
    }
    println!("* no two storeys alike: every member its own section and length (nothing shared)");
}

/// Heap live after, and peak during, each stage of one frame's check.
fn heap(bays: usize, stories: usize, distinct: bool) {
    use plumbline::check::check;
    use plumbline::combos::{expand, load_table};
    use plumbline::input::parse_model;
    use plumbline::solve::linear::MeshLoads;
    use plumbline::solve::second_order::SecondOrderModel;
    use plumbline::solve::sway::SwaySplit;

    println!("heap by stage: {bays} x {stories} frame (MB; time s)");
    println!(
        "  {:<40} {:>9} {:>9} {:>8}",
        "stage", "live", "peak", "time"
    );
    let text = model_text(bays, stories, distinct);
    let model = stage("model read", || {
        parse_model(&text, "bench.toml").expect("the bench frame reads")
    });
    let cases = stage("factored cases", || {
        let table = load_table("asce7-16-strength", None).expect("shipped table");
        expand(&table, &model.load_cases, &Default::default())
            .expect("expands")
            .cases
    });
    let st = stage("stories", || {
        plumbline::stories::stories(&model).expect("stories")
    });
    let split = stage("sway split (free frame factored)", || {
        SwaySplit::new(&model, &st).expect("factors")
    });
    let parts = stage("split of every load case", || {
        (0..model.load_cases.len())
            .map(|k| split.split_case(&model, k).expect("solves"))
            .collect::<Vec<_>>()
    });
    drop(parts);
    drop(split);
    let stiffness = plumbline::solve::mesh::member_stiffness(&model);
    let second = stage("second-order model", || {
        SecondOrderModel::new(&model, &stiffness, model.analysis.segments).expect("factors")
    });
    let loads = {
        let mut l = MeshLoads::zero(&second.mesh);
        for &(k, f) in &cases[0].factors {
            l.add_case(&model, &second.mesh, k, f);
        }
        l
    };
    let b = stage("one case: buckling (nested mesh built)", || {
        second.buckling(&model, &loads).expect("solves")
    });
    drop(b);
    let b = stage("one case: buckling again", || {
        second.buckling(&model, &loads).expect("solves")
    });
    drop(b);
    let d = stage("one case: direct P-Delta", || {
        second.direct(&model, &loads).expect("solves")
    });
    drop(d);
    drop(second);
    let report = stage("check (all cases)", || {
        check(&model, &cases).expect("checks")
    });
    println!("  ({} checked cases)", report.cases.len());
    let envelope = stage("envelope", || plumbline::envelope::envelope(&report));
    drop(envelope);
    drop(report);
    let path = model_file(bays, stories, distinct);
    let args = CheckArgs {
        format: CheckFormat::Table,
        ..Default::default()
    };
    let run = stage("whole run, summary only", || {
        plumbline::app::run_check_keeping(&path, &args, &mut |_, _| {}, false).expect("checks")
    });
    stage("summary text", || {
        plumbline::app::render_check(&run, CheckFormat::Table, false)
    });
    let _ = std::fs::remove_dir_all(path.parent().expect("in a directory"));
}

fn main() {
    let args: Vec<String> = std::env::args().skip(1).collect();
    let num = |k: usize| args.get(k).and_then(|s| s.parse::<usize>().ok());
    if let Some(at) = args.iter().position(|a| a == "command") {
        let distinct = args.iter().any(|a| a == "distinct");
        run_command(
            num(at + 1).expect("BAYS"),
            num(at + 2).expect("STORIES"),
            distinct,
        );
        return;
    }
    if let Some(at) = args.iter().position(|a| a == "heap") {
        let distinct = args.iter().any(|a| a == "distinct");
        heap(
            num(at + 1).unwrap_or(1),
            num(at + 2).unwrap_or(1600),
            distinct,
        );
        return;
    }
    curve();
}
