//! Solvers: the first-order direct stiffness solution, and (from the check work) the
//! no-sway/sway split, the second-order and buckling analyses.

pub mod beam;
pub mod forces;

pub use forces::{EndForces, InternalForces};
