//! Replay of the fuzzers' saved corpus (`fuzz/corpus/<target>/`) and of the inputs that once
//! crashed a target (`fuzz/regressions/<target>/`): every file goes through the same entry
//! point as its fuzz target, `plumbline::fuzzing`, and none may panic. The fuzzers
//! themselves run by hand (DEVELOPERS.md, "Fuzzing"); this keeps what they found in
//! `cargo test`. Expected behaviour: the project's requirement that bad input never panics
//! (issue 13), no external source.

use std::panic::{AssertUnwindSafe, catch_unwind};
use std::path::Path;

/// Stack of the replay threads. The fuzzers ran on the 8 MiB main thread of a release
/// build; a test thread has 2 MiB and opt-level 1 frames are larger, so an expression
/// nested a few thousand levels deep (the fuzzers' -max_len=4096) needs more here. Deeper
/// nesting is bounded by the table reader's nesting limit (issue 9, item 4).
const STACK: usize = 256 << 20;

/// Feed every file of `fuzz/<folder>/<target>/` to `run` on a thread with [`STACK`];
/// returns how many ran.
fn replay(folder: &'static str, target: &'static str, run: fn(&[u8])) -> usize {
    std::thread::Builder::new()
        .stack_size(STACK)
        .spawn(move || replay_here(folder, target, run))
        .unwrap()
        .join()
        .unwrap()
}

fn replay_here(folder: &str, target: &str, run: fn(&[u8])) -> usize {
    let dir = Path::new(env!("CARGO_MANIFEST_DIR"))
        .join("fuzz")
        .join(folder)
        .join(target);
    let Ok(entries) = std::fs::read_dir(&dir) else {
        return 0;
    };
    let mut paths: Vec<_> = entries.map(|e| e.unwrap().path()).collect();
    paths.sort();
    let mut failed = Vec::new();
    for p in &paths {
        // A fuzzer running beside the tests may remove a file it has just reduced.
        let Ok(bytes) = std::fs::read(p) else {
            continue;
        };
        if catch_unwind(AssertUnwindSafe(|| run(&bytes))).is_err() {
            failed.push(p.display().to_string());
        }
    }
    assert!(failed.is_empty(), "panicked on:\n{}", failed.join("\n"));
    paths.len()
}

#[test]
fn model_corpus_never_panics() {
    let n = replay("corpus", "model", plumbline::fuzzing::model);
    replay("regressions", "model", plumbline::fuzzing::model);
    assert!(n >= 4, "the model corpus holds at least the examples");
}

#[test]
fn table_corpus_never_panics() {
    let n = replay("corpus", "table", plumbline::fuzzing::table);
    replay("regressions", "table", plumbline::fuzzing::table);
    assert!(n >= 9, "the table corpus holds at least the shipped tables");
}

#[test]
fn expr_corpus_never_panics() {
    let n = replay("corpus", "expr", plumbline::fuzzing::expr);
    replay("regressions", "expr", plumbline::fuzzing::expr);
    assert!(n >= 10);
}
