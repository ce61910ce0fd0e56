//! plumbline: factored load combinations, no-sway/sway frame analysis and second-order
//! amplification for planar building frames.
//!
//! Data flow, one module per stage:
//! [`input`] (model file) → [`model`] (validated frame and load cases) → [`combos`]
//! (factored cases from a combination table) → [`solve`] (first-order, no-sway/sway,
//! second-order and buckling solutions) → [`check`] (amplification and story
//! classification) → [`report`] (tables and JSON).
//!
//! Results assist a licensed engineer; local codes and the adopted edition of each
//! standard govern.

pub mod combos;
pub mod diag;
pub mod input;
pub mod model;
pub mod solve;
pub mod stories;
pub mod units;
