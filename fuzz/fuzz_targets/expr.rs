//! Fuzz target: the factor-expression parser (parse, list parameters, evaluate).
//! Run with `cargo fuzz run -s none expr` from the crate root (see DEVELOPERS.md).
#![no_main]

libfuzzer_sys::fuzz_target!(|data: &[u8]| plumbline::fuzzing::expr(data));
