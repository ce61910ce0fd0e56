//! Solvers: the first-order direct stiffness solution, and (from the check work) the
//! no-sway/sway split, the second-order and buckling analyses.
//!
//! Layers, bottom up: [`element`] matrices → [`mesh`] → [`system`] (DOF numbering,
//! assembly, factorization on [`skyline`] storage in [`ordering`]'s order) → [`linear`]
//! (one load vector: forces, reactions, residual) → [`first_order`] (model-level results).

pub mod beam;
pub mod element;
pub mod first_order;
pub mod forces;
pub mod linear;
pub mod mesh;
pub mod modes;
pub mod ordering;
pub mod parallel;
pub mod second_order;
pub mod skyline;
pub mod sway;
pub mod system;
#[cfg(test)]
mod test_rng;

pub use first_order::{FirstOrder, Solution, solve_case};
pub use forces::{EndForces, InternalForces};
pub use system::SystemError;
