//! plumbline: factored load combinations, no-sway/sway frame analysis and second-order
//! amplification for planar building frames.
//!
//! Data flow, one module per stage:
//! [`input`] (model file) → [`model`] (validated frame and load cases) → [`arrange`] (live-load arrangements) → [`combos`]
//! (factored cases from a combination table) → [`solve`] (first-order, no-sway/sway,
//! second-order and buckling solutions) → [`check`] (amplification and story
//! classification) → [`approx`] (approximate hand-method check, on request) → [`envelope`] (governing moments over the cases) → [`report`]
//! (tables, CSV and JSON) → [`app`] (the commands).
//!
//! Results assist a licensed engineer; local codes and the adopted edition of each
//! standard govern.

// Input errors carry their file, span and source text for rendering; they are returned
// once per run, so their size does not matter.
#![allow(clippy::result_large_err)]

/// The caution every summary, report and listing of this crate carries.
pub const CAUTION: &str = "Results assist a licensed engineer and do not replace one: final \
design belongs to a licensed engineer under the local building code, and the adopted edition \
of each standard governs.";

pub mod app;
pub mod approx;
pub mod arrange;
pub mod check;
pub mod combos;
pub mod compare;
pub mod diag;
pub mod envelope;
#[doc(hidden)]
pub mod fuzzing;
pub mod input;
pub mod limits;
pub mod model;
pub mod report;
pub mod service;
pub mod solve;
pub mod stories;
pub mod units;
