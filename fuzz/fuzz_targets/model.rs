//! Fuzz target: the model reader (decode, parse, validate; small models solved and checked).
//! Run with `cargo fuzz run -s none model` from the crate root (see DEVELOPERS.md).
#![no_main]

libfuzzer_sys::fuzz_target!(|data: &[u8]| plumbline::fuzzing::model(data));
