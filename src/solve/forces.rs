//! Force quantities of a solved member.
//!
//! Sign convention (see also [`crate::model::loads`]):
//! * [`EndForces`] are member-end actions in member-local axes: the forces and moments
//!   that the nodes exert on the member ends, `[Fx, Fy, Mz]` at i and at j, with local x
//!   from i to j, local y 90° CCW from x, moments CCW positive.
//! * [`InternalForces`] at a station x from end i act on the cut face of the part 0..x:
//!   axial force N positive in tension, shear V = dM/dx, bending moment M positive when it
//!   puts the local −y face in tension (sagging for a member drawn left to right).
//!   Hence `N(x) = −Fx_i − Σ px`, `V(x) = Fy_i + Σ py`, `M(x) = −Mz_i + Fy_i·x + Σ py·(x−a) − Σ m`
//!   over the loads between 0 and x.

use serde::Serialize;

/// Member-end actions in local axes, N and N·m.
#[derive(Debug, Clone, Copy, PartialEq, Default, Serialize)]
pub struct EndForces {
    /// `[Fx, Fy, Mz]` at end i.
    pub i: [f64; 3],
    /// `[Fx, Fy, Mz]` at end j.
    pub j: [f64; 3],
}

impl EndForces {
    /// As one 6-vector `[Fx_i, Fy_i, Mz_i, Fx_j, Fy_j, Mz_j]`.
    pub fn to_array(&self) -> [f64; 6] {
        [
            self.i[0], self.i[1], self.i[2], self.j[0], self.j[1], self.j[2],
        ]
    }

    /// From a 6-vector `[Fx_i, Fy_i, Mz_i, Fx_j, Fy_j, Mz_j]`.
    pub fn from_array(a: [f64; 6]) -> Self {
        EndForces {
            i: [a[0], a[1], a[2]],
            j: [a[3], a[4], a[5]],
        }
    }

    /// `self + f·other`, for combining load cases by their factors.
    pub fn add_scaled(&mut self, f: f64, other: &EndForces) {
        for k in 0..3 {
            self.i[k] += f * other.i[k];
            self.j[k] += f * other.j[k];
        }
    }
}

/// Internal forces at one station of a member (see the module doc for signs).
#[derive(Debug, Clone, Copy, PartialEq, Default, Serialize)]
pub struct InternalForces {
    /// Axial force, N, tension positive.
    pub n: f64,
    /// Shear, N (V = dM/dx).
    pub v: f64,
    /// Bending moment, N·m, positive with the local −y face in tension.
    pub m: f64,
}
