//! Direct second-order elastic analysis (P-Δ and P-δ) and the elastic critical load factor.
//!
//! Each member is split into [`crate::model::AnalysisOptions::segments`] elements, and the
//! consistent geometric stiffness of every element is added to its elastic stiffness, so
//! both the chord rotation of the member (P-Δ) and its own curvature (P-δ) soften the frame.
//! The axial forces are updated and the system refactored until the displacements settle.
//!
//! With two or more elements per member this reproduces the exact beam-column solutions of
//! the AISC 360-16 Commentary Chapter C benchmark problems within 0.5 % (reference notes §5,
//! computed [X]); `tests/second_order.rs` checks them against the closed forms.
//!
//! The elastic critical load factor α_cr solves `(K + α_cr·K_G(N))·φ = 0` with the
//! first-order axial forces N of the load: the smallest load factor at which the
//! factorization of `K + α·K_G` fails, found by bisection.

use serde::Serialize;

use super::beam::{SpanExtremes, span_extremes};
use super::element::transformation;
use super::first_order::Solution;
use super::linear::{MeshLoads, Response, respond};
use super::mesh::{MemberStiffness, Mesh};
use super::system::{Restraints, System, SystemError, element_equations, element_matrices};
use crate::model::Model;
use nalgebra::{Matrix6, Vector6};

/// Largest number of P-Δ iterations before a case is declared not converged.
pub const MAX_ITERATIONS: usize = 50;
/// Convergence: change in displacements relative to the largest displacement.
pub const TOLERANCE: f64 = 1e-9;

/// A segmented model ready for second-order and buckling analyses.
#[derive(Debug, Clone)]
pub struct SecondOrderModel {
    pub mesh: Mesh,
    pub restraints: Restraints,
    /// The elastic system (no geometric stiffness), factored.
    pub elastic: System,
}

/// Outcome of a direct second-order analysis.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub enum SecondOrderOutcome {
    /// Converged: model-level results, the extreme span moments of each member (from its
    /// segments, so they include P-δ), the mesh-level response and the iterations taken.
    Converged {
        solution: Solution,
        span: Vec<SpanExtremes>,
        response: Box<Response>,
        iterations: usize,
    },
    /// The stiffness lost positive definiteness (load above a critical load) or the
    /// iteration did not settle.
    Unstable { reason: String },
}

/// Axial force of each element (mean of its ends, tension positive), N.
pub fn element_axial(r: &Response) -> Vec<f64> {
    r.element_forces
        .iter()
        .map(|f| 0.5 * (-f.i[0] + f.j[0]))
        .collect()
}

impl SecondOrderModel {
    /// Segment `model` (`segments` elements per member) and factor its elastic stiffness.
    pub fn new(
        model: &Model,
        stiffness: &[MemberStiffness],
        segments: usize,
    ) -> Result<SecondOrderModel, SystemError> {
        let mesh = Mesh::new(model, stiffness, segments.max(1));
        let restraints = Restraints::from_model(model, &mesh);
        let elastic = System::new(model, &mesh, &restraints, None)?;
        Ok(SecondOrderModel {
            mesh,
            restraints,
            elastic,
        })
    }

    /// First-order response to `loads` on the segmented mesh.
    pub fn first_order(&self, model: &Model, loads: &MeshLoads) -> Result<Response, SystemError> {
        respond(model, &self.mesh, &self.elastic, loads)
    }

    /// Direct second-order analysis under `loads` (already factored, including any notional
    /// loads), iterating the axial forces to convergence.
    pub fn direct(
        &self,
        model: &Model,
        loads: &MeshLoads,
    ) -> Result<SecondOrderOutcome, SystemError> {
        let first = self.first_order(model, loads)?;
        let mut axial = element_axial(&first);
        let mut previous = first.displacements.clone();
        for iteration in 1..=MAX_ITERATIONS {
            let system = match System::new(model, &self.mesh, &self.restraints, Some(&axial)) {
                Ok(s) => s,
                Err(SystemError::Unstable(free)) => {
                    let at = free
                        .first()
                        .map_or(String::new(), |f| format!(" at {}", f.place));
                    return Ok(SecondOrderOutcome::Unstable {
                        reason: format!(
                            "stiffness including P-Delta is not positive definite{at}: the \
                             load exceeds the elastic critical load"
                        ),
                    });
                }
                Err(e) => return Err(e),
            };
            let r = respond(model, &self.mesh, &system, loads)?;
            let scale = max_translation(&r.displacements).max(f64::MIN_POSITIVE);
            let change = r
                .displacements
                .iter()
                .zip(&previous)
                .map(|(a, b)| (a[0] - b[0]).abs().max((a[1] - b[1]).abs()))
                .fold(0.0, f64::max);
            axial = element_axial(&r);
            previous = r.displacements.clone();
            if change <= TOLERANCE * scale {
                return Ok(SecondOrderOutcome::Converged {
                    solution: Solution::from_response(&self.mesh, &r),
                    span: member_span_extremes(&self.mesh, &r, loads),
                    response: Box::new(r),
                    iterations: iteration,
                });
            }
        }
        Ok(SecondOrderOutcome::Unstable {
            reason: format!("P-Delta iteration did not converge in {MAX_ITERATIONS} iterations"),
        })
    }

    /// Elastic critical load factor α_cr of `loads` and the buckled shape (translations and
    /// rotation of each model node, scaled so the largest translation is 1). `None` when no
    /// element is in compression or the frame does not buckle below [`ALPHA_CR_CEILING`]
    /// times the load.
    ///
    /// α_cr is the smallest λ at which `K + λ·K_G(N)` stops being positive definite
    /// (Sylvester's law of inertia: a failed Cholesky pivot marks λ ≥ α_cr). It is first
    /// estimated by shifted inverse iteration ([`Self::estimate_alpha_cr`]) and then
    /// confirmed by factorizing just below and just above the estimate; when that fails
    /// (releases make the condensed problem non-linear in λ) the bracket is searched and
    /// bisected. Releases are condensed from `K + λ·K_G` at each λ tried, so hinged members
    /// are treated exactly rather than by a linearised geometric stiffness.
    pub fn critical_factor(
        &self,
        model: &Model,
        loads: &MeshLoads,
    ) -> Result<Option<Buckling>, SystemError> {
        let first = self.first_order(model, loads)?;
        let axial = element_axial(&first);
        if axial.iter().all(|&n| n >= 0.0) {
            return Ok(None);
        }
        let stable = |lambda: f64| -> Result<Option<System>, SystemError> {
            let scaled: Vec<f64> = axial.iter().map(|n| lambda * n).collect();
            match System::new(model, &self.mesh, &self.restraints, Some(&scaled)) {
                Ok(s) => Ok(Some(s)),
                Err(SystemError::Unstable(_)) => Ok(None),
                Err(e) => Err(e),
            }
        };
        let estimate = self.estimate_alpha_cr(&axial, &stable)?;
        let tol = ALPHA_CR_TOLERANCE;
        if let Some(b) = &estimate {
            let (below, above) = (b.alpha_cr * (1.0 - tol), b.alpha_cr * (1.0 + tol));
            if stable(below)?.is_some() && stable(above)?.is_none() {
                return Ok(estimate);
            }
        }
        // Search for a bracket (lo stable, hi not), from the estimate if there is one.
        let (mut lo, mut hi) = match &estimate {
            Some(b) => (b.alpha_cr / 1.25, b.alpha_cr * 1.25),
            None => (0.0, 1.0),
        };
        while lo > 0.0 && stable(lo)?.is_none() {
            hi = lo;
            lo = if lo < 1e-9 { 0.0 } else { lo / 1.25 };
        }
        while stable(hi)?.is_some() {
            lo = hi;
            hi *= 4.0;
            if hi > ALPHA_CR_CEILING {
                return Ok(None);
            }
        }
        while hi - lo > tol * hi {
            let mid = 0.5 * (lo + hi);
            if stable(mid)?.is_some() {
                lo = mid
            } else {
                hi = mid
            }
        }
        let alpha_cr = 0.5 * (lo + hi);
        let shape = match stable(0.999 * lo)? {
            Some(system) => self.mode_shape(&system),
            None => vec![[0.0; 3]; self.mesh.model_nodes],
        };
        Ok(Some(Buckling { alpha_cr, shape }))
    }

    /// Estimate α_cr and its mode by inverse iteration on the pencil `K·φ = λ·G·φ`
    /// (G = −K_G, the geometric stiffness of the element axial forces at λ = 1).
    ///
    /// A few steps with the factored elastic `K` give a rough λ; then the iteration is
    /// shifted to σ = 0.95·λ (`K − σ·G` factorized once, positive definite below α_cr), so
    /// it converges at the rate (α_cr − σ)/(λ₂ − σ); the Rayleigh quotient
    /// `λ = xᵀKx / xᵀGx` gives the estimate (Bathe, *Finite Element Procedures*, 1996,
    /// §11.2, from memory). Released element ends enter through their condensed matrices
    /// at λ = 1, so the caller confirms the estimate by factorization. `None` when the
    /// iteration finds no positive λ.
    fn estimate_alpha_cr(
        &self,
        axial: &[f64],
        stable: &dyn Fn(f64) -> Result<Option<System>, SystemError>,
    ) -> Result<Option<Buckling>, SystemError> {
        let sys = &self.elastic;
        let n = sys.n;
        // Element geometric matrices in global axes, with their equations.
        let parts: Vec<([Option<usize>; 6], Matrix6<f64>)> = self
            .mesh
            .elements
            .iter()
            .zip(axial)
            .map(|(e, &na)| {
                let zero = Vector6::zeros();
                let (with_g, _) = element_matrices(e, Some(na), &zero);
                let (without, _) = element_matrices(e, None, &zero);
                let t = transformation(e.c, e.s);
                (
                    element_equations(&sys.dofs, e),
                    t.transpose() * (with_g - without) * t,
                )
            })
            .collect();
        // y = G·x = −K_G·x
        let g = |x: &[f64]| -> Vec<f64> {
            let mut y = vec![0.0; n];
            for (eqs, kg) in &parts {
                for (r, er) in eqs.iter().enumerate() {
                    let Some(er) = *er else { continue };
                    let mut acc = 0.0;
                    for (c, ec) in eqs.iter().enumerate() {
                        if let Some(ec) = *ec {
                            acc += kg[(r, c)] * x[ec];
                        }
                    }
                    y[er] -= acc;
                }
            }
            y
        };
        let dot = |a: &[f64], b: &[f64]| a.iter().zip(b).map(|(p, q)| p * q).sum::<f64>();
        let rayleigh = |x: &[f64]| dot(x, &sys.matrix.mul_vec(x)) / dot(x, &g(x));
        let normalise = |x: &mut Vec<f64>| -> bool {
            let norm = x.iter().fold(0.0f64, |m, v| m.max(v.abs()));
            if norm == 0.0 || !norm.is_finite() {
                return false;
            }
            x.iter_mut().for_each(|v| *v /= norm);
            true
        };
        // Rough estimate with K alone.
        let mut x: Vec<f64> = (0..n).map(|k| 1.0 + (k % 5) as f64 * 0.1).collect();
        for _ in 0..8 {
            x = sys.solve(&g(&x));
            if !normalise(&mut x) {
                return Ok(None);
            }
        }
        let rough = rayleigh(&x);
        if !(rough > 0.0 && rough.is_finite()) {
            return Ok(None);
        }
        // Shift below it, lowering the shift until K − σ·G is positive definite.
        let mut sigma = 0.95 * rough;
        let shifted = loop {
            if let Some(s) = stable(sigma)? {
                break s;
            }
            sigma /= 1.25;
            if sigma < 1e-6 * rough {
                return Ok(None);
            }
        };
        let mut last = f64::NAN;
        for _ in 0..50 {
            x = shifted.solve(&g(&x));
            if !normalise(&mut x) {
                return Ok(None);
            }
            let lambda = rayleigh(&x);
            if (lambda - last).abs() <= 1e-12 * lambda.abs() {
                break;
            }
            last = lambda;
        }
        let lambda = rayleigh(&x);
        if !(lambda > 0.0 && lambda.is_finite()) {
            return Ok(None);
        }
        Ok(Some(Buckling {
            alpha_cr: lambda,
            shape: self.node_shape(&shifted, &x),
        }))
    }

    /// Per model node `[ux, uy, θ]` of an equation vector, scaled so that the largest
    /// translation is 1 (positive).
    fn node_shape(&self, system: &System, x: &[f64]) -> Vec<[f64; 3]> {
        let mut shape: Vec<[f64; 3]> = system.dofs[..self.mesh.model_nodes]
            .iter()
            .map(|d| {
                let v = |k: usize| d[k].equation().map_or(0.0, |q| x[q]);
                [v(0), v(1), v(2)]
            })
            .collect();
        let peak = shape
            .iter()
            .flat_map(|s| [s[0], s[1]])
            .fold(0.0f64, |m, v| if v.abs() > m.abs() { v } else { m });
        if peak != 0.0 {
            for s in &mut shape {
                s.iter_mut().for_each(|v| *v /= peak);
            }
        }
        shape
    }

    /// Inverse iteration on a nearly singular system: its near-null vector, per model node.
    fn mode_shape(&self, system: &System) -> Vec<[f64; 3]> {
        let n = system.n;
        let mut x: Vec<f64> = (0..n).map(|k| 1.0 + (k % 7) as f64 * 0.01).collect();
        for _ in 0..8 {
            x = system.solve(&x);
            let norm = x.iter().map(|v| v * v).sum::<f64>().sqrt();
            if norm == 0.0 || !norm.is_finite() {
                break;
            }
            x.iter_mut().for_each(|v| *v /= norm);
        }
        self.node_shape(system, &x)
    }
}

/// Above this load factor a frame is reported as not buckling under the load.
pub const ALPHA_CR_CEILING: f64 = 1.0e6;

/// Relative precision of α_cr: the frame is stable at α_cr·(1 − tol) and not at
/// α_cr·(1 + tol).
pub const ALPHA_CR_TOLERANCE: f64 = 1e-6;

/// Elastic buckling of one load: the critical load factor and the mode shape.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Buckling {
    pub alpha_cr: f64,
    /// `[ux, uy, θ]` per model node, largest translation 1.
    pub shape: Vec<[f64; 3]>,
}

fn max_translation(u: &[[f64; 3]]) -> f64 {
    u.iter()
        .map(|d| d[0].abs().max(d[1].abs()))
        .fold(0.0, f64::max)
}

/// Extreme moments along each member, from the end forces and loads of its segments
/// (positions measured from the member's end i).
pub fn member_span_extremes(mesh: &Mesh, r: &Response, loads: &MeshLoads) -> Vec<SpanExtremes> {
    mesh.member_elements
        .iter()
        .map(|range| {
            let mut out: Option<SpanExtremes> = None;
            for ie in range.clone() {
                let e = &mesh.elements[ie];
                let s = span_extremes(e.length, &r.element_forces[ie], &loads.element[ie]);
                let shifted = SpanExtremes {
                    max: (s.max.0 + e.x0, s.max.1),
                    min: (s.min.0 + e.x0, s.min.1),
                };
                out = Some(match out {
                    None => shifted,
                    Some(o) => SpanExtremes {
                        max: if shifted.max.1 > o.max.1 {
                            shifted.max
                        } else {
                            o.max
                        },
                        min: if shifted.min.1 < o.min.1 {
                            shifted.min
                        } else {
                            o.min
                        },
                    },
                });
            }
            out.unwrap_or(SpanExtremes {
                max: (0.0, 0.0),
                min: (0.0, 0.0),
            })
        })
        .collect()
}
