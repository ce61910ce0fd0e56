//! Fuzz target: the combination-table reader (decode, parse; valid tables printed and expanded).
//! Run with `cargo fuzz run -s none table` from the crate root (see DEVELOPERS.md).
#![no_main]

libfuzzer_sys::fuzz_target!(|data: &[u8]| plumbline::fuzzing::table(data));
