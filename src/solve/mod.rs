//! Solvers: the first-order direct stiffness solution, and (from the check work) the
//! no-sway/sway split, the second-order and buckling analyses.

pub mod forces;
pub mod ordering;
pub mod skyline;

pub use forces::{EndForces, InternalForces};
