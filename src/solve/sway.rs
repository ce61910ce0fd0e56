//! The no-sway / sway split of a first-order solution.
//!
//! * **No-sway**: the frame with the X translation of every story-level node held
//!   ([`crate::stories::held_nodes`]); the forces at those holds are recorded.
//! * **Sway**: the free frame under the reversed holding forces.
//! * The first-order total is their sum (superposition), which `tests/` checks against the
//!   free frame solved directly.
//!
//! Both systems are factored once per model; every load case is solved once in each, and
//! factored cases are formed by combining those solutions with their load factors.

use serde::Serialize;

use super::first_order::{FirstOrder, Solution};
use super::linear::MeshLoads;
use super::system::SystemError;
use crate::model::Model;

/// The no-sway and sway parts of one load vector.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct SwayParts {
    pub no_sway: Solution,
    pub sway: Solution,
    /// X force at each held node in the no-sway solution, N (index-aligned with
    /// [`SwaySplit::held`]).
    pub holding: Vec<f64>,
}

impl SwayParts {
    /// The first-order total: no-sway + sway.
    pub fn total(&self) -> Solution {
        Solution::combine(&[(1.0, &self.no_sway), (1.0, &self.sway)])
    }

    /// `self += f · other`.
    pub fn add_scaled(&mut self, f: f64, other: &SwayParts) {
        self.no_sway.add_scaled(f, &other.no_sway);
        self.sway.add_scaled(f, &other.sway);
        for (a, b) in self.holding.iter_mut().zip(&other.holding) {
            *a += f * b;
        }
    }

    /// Linear combination `Σ fᵢ·partsᵢ`; `parts` must not be empty.
    pub fn combine(parts: &[(f64, &SwayParts)]) -> SwayParts {
        let first = parts[0].1;
        let mut out = SwayParts {
            no_sway: Solution::zero_like(&first.no_sway),
            sway: Solution::zero_like(&first.sway),
            holding: vec![0.0; first.holding.len()],
        };
        for (f, p) in parts {
            out.add_scaled(*f, p);
        }
        out
    }
}

/// The two factored systems of the split.
#[derive(Debug, Clone)]
pub struct SwaySplit {
    /// The nodes held in X in the no-sway system.
    pub held: Vec<usize>,
    pub held_system: FirstOrder,
    pub free_system: FirstOrder,
}

impl SwaySplit {
    /// Factor the held and the free system of `model`.
    pub fn new(model: &Model, held: Vec<usize>) -> Result<SwaySplit, SystemError> {
        let free_system = FirstOrder::new(model, &[])?;
        let held_system = FirstOrder::new(model, &held)?;
        Ok(SwaySplit {
            held,
            held_system,
            free_system,
        })
    }

    /// Empty loads on the (shared) first-order mesh.
    pub fn zero_loads(&self) -> MeshLoads {
        MeshLoads::zero(&self.free_system.mesh)
    }

    /// Split the response to `loads` into its no-sway and sway parts.
    pub fn split(&self, model: &Model, loads: &MeshLoads) -> Result<SwayParts, SystemError> {
        let no_sway = self.held_system.solve_loads(model, loads)?;
        let holding: Vec<f64> = self.held.iter().map(|&n| no_sway.reactions[n][0]).collect();
        let mut reversed = self.zero_loads();
        for (&n, &h) in self.held.iter().zip(&holding) {
            reversed.add_nodal(n, [-h, 0.0, 0.0]);
        }
        let sway = self.free_system.solve_loads(model, &reversed)?;
        Ok(SwayParts {
            no_sway: strip_holds(no_sway, &self.held),
            sway,
            holding,
        })
    }

    /// Split load case `case`.
    pub fn split_case(&self, model: &Model, case: usize) -> Result<SwayParts, SystemError> {
        let mut loads = self.zero_loads();
        loads.add_case(model, &self.free_system.mesh, case, 1.0);
        self.split(model, &loads)
    }
}

/// The no-sway solution without the artificial holds among its reactions (they are
/// reported as holding forces instead).
fn strip_holds(mut s: Solution, held: &[usize]) -> Solution {
    for &n in held {
        s.reactions[n][0] = 0.0;
    }
    s
}
