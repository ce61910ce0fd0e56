//! The commands of the `plumbline` program as library functions: each takes the parsed
//! arguments, reads the files it names, and returns the text to print or a typed error.
//! `main.rs` only parses arguments, calls one of these and prints.

mod cases;
mod check;
mod compare;
mod error;
mod new;
mod output;
mod setup;
mod solve;

pub use crate::report::check::DETAIL_HEADING;
pub use crate::report::solve::stiffness_words;
pub use crate::report::starter::NewArgs;
pub use cases::{cases, combos};
pub use check::{
    CheckArgs, CheckRun, ServiceRun, apply_settings, check, check_and_emit, check_output,
    check_output_status, emit_check, needs_case_detail, render_check, report, run_check,
    run_check_for, run_check_keeping, sha256_hex,
};
pub use compare::{CompareRun, VariantSpec, parse_variant, run_compare};
pub use error::{AppError, exit, model_warnings};
pub use new::new_model;
pub use output::{
    Destination, Rendered, check_output_path, emit, stdout_with, write_output, write_output_with,
    write_stdout,
};
pub use setup::{own_table, parse_sets, resolve_table};
pub use solve::{solve, solve_with};
