//! The no-sway / sway split of a first-order solution.
//!
//! * **No-sway**: the frame held against sidesway at every story level. Each level is held
//!   as a floor would hold it: the mean X translation of the level's nodes is zero, and the
//!   holding force `λ` of the level is shared equally among those nodes. With axially rigid
//!   beams this is the same as holding every node of the level; with real beams it leaves
//!   the beams free to shorten, so a symmetric frame under symmetric load has no holding
//!   force and no sway part.
//! * **Sway**: the free frame under the reversed holding forces.
//! * The first-order total is their sum (superposition; `tests/first_order.rs` checks it).
//!
//! With `C` the level weights (column l: 1/n_l at the X translation of each of level l's
//! n_l nodes), the holding forces of a load's free solution `F` solve
//! `Σ_m A_lm·λ_m = −ū_l(F)`, `A = Cᵀ·K⁻¹·C` the mean X translation of level l under a unit
//! force shared by the nodes of level m, `ū_l` the mean X translation of level l. Then
//! no-sway = `F + K⁻¹·C·λ` and sway = `−K⁻¹·C·λ`. `A` is dense (levels × levels), so it is
//! never formed: λ comes from the free frame's stiffness bordered by one Lagrange
//! multiplier per held level,
//!
//! ```text
//! [  K   −C ] [u]   [0]
//! [ −Cᵀ   0 ] [λ] = [ū]
//! ```
//!
//! (the first row gives u = K⁻¹·C·λ, the second −Cᵀ·u = −A·λ = ū), factored once by LDLᵀ
//! on the skyline with each multiplier numbered just after the last X translation of its
//! level ([`HeldLevels`]). Memory and work grow with the frame's profile, linearly in the
//! storeys; `Σ λ_m·C_m` is solved on the free frame as one load vector when needed.

use serde::Serialize;

use super::first_order::{FirstOrder, Solution};
use super::linear::{MeshLoads, recover};
use super::mesh::Mesh;
use super::skyline::{FactorError, SkylineFactor, SkylineMatrix};
use super::system::{Direction, FreeDirection, System, SystemError};
use crate::model::{Model, Restraint};
use crate::stories::Story;

/// The no-sway and sway parts of one load vector.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct SwayParts {
    pub no_sway: Solution,
    pub sway: Solution,
    /// Holding force of each story's top level in the no-sway solution, N (positive in +X,
    /// the force the hold exerts on the frame).
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

/// The factored free frame and its held levels.
///
/// Memory grows linearly with the frame: the free frame's factorization and that of the
/// frame bordered by the level constraints ([`HeldLevels`]), both on its skyline profile.
/// No unit level solutions and no level × level table are kept. A lateral load at the
/// levels is solved on the free frame's factorization when asked for.
#[derive(Debug, Clone)]
pub struct SwaySplit {
    pub free: FirstOrder,
    /// Per story: the nodes of its top level that the split holds (those not held in X by
    /// a support). Empty for a level the supports already hold.
    pub level_nodes: Vec<Vec<usize>>,
    /// The free frame bordered by one multiplier per held level, factored once.
    held: HeldLevels,
}

impl SwaySplit {
    /// Factor the free frame of `model` and the free frame bordered by the level
    /// constraints of `stories`.
    pub fn new(model: &Model, stories: &[Story]) -> Result<SwaySplit, SystemError> {
        let free = FirstOrder::new(model, &[])?;
        let held_by_support = |n: usize| {
            model
                .supports
                .iter()
                .any(|s| s.node == n && s.dofs[0] == Restraint::Fixed)
        };
        let level_nodes: Vec<Vec<usize>> = stories
            .iter()
            .map(|s| {
                let nodes: Vec<usize> = s.top_nodes.clone();
                if nodes.iter().any(|&n| held_by_support(n)) {
                    Vec::new()
                } else {
                    nodes
                }
            })
            .collect();
        let held = HeldLevels::new(&free.system, &level_nodes).map_err(|e| {
            let FactorError::NotPositiveDefinite { index, .. } = e;
            SystemError::Mechanism(locate(model, &free, index).into_iter().collect())
        })?;
        Ok(SwaySplit {
            free,
            level_nodes,
            held,
        })
    }

    /// Empty loads on the first-order mesh.
    pub fn zero_loads(&self) -> MeshLoads {
        MeshLoads::zero(&self.free.mesh)
    }

    /// Split the response to `loads` into its no-sway and sway parts.
    pub fn split(&self, model: &Model, loads: &MeshLoads) -> Result<SwayParts, SystemError> {
        let free = self.free.solve_loads(model, loads)?;
        let ubar: Vec<f64> = self
            .level_nodes
            .iter()
            .map(|nodes| mean_ux(&free, nodes))
            .collect();
        let holding = self.held.holding(&ubar);
        let sway = self.lateral(&holding.iter().map(|h| -h).collect::<Vec<_>>());
        let no_sway = Solution::combine(&[(1.0, &free), (-1.0, &sway)]);
        Ok(SwayParts {
            no_sway,
            sway,
            holding,
        })
    }

    /// Split load case `case`.
    pub fn split_case(&self, model: &Model, case: usize) -> Result<SwayParts, SystemError> {
        let mut loads = self.zero_loads();
        loads.add_case(model, &self.free.mesh, case, 1.0);
        self.split(model, &loads)
    }

    /// Node displacements of the free frame under a unit X force (1 N) at level `l`, shared
    /// equally by its nodes (one solve; nothing is stored).
    pub fn unit_displacements(&self, l: usize) -> Vec<[f64; 3]> {
        let mut h = vec![0.0; self.level_nodes.len()];
        h[l] = 1.0;
        level_displacements(&self.free, &self.level_nodes, &h)
    }

    /// Node displacements of the free frame under lateral forces `h[l]` (N, +X) at the
    /// story levels, each shared equally by the level's nodes (one solve; nothing stored).
    pub fn level_force_displacements(&self, h: &[f64]) -> Vec<[f64; 3]> {
        level_displacements(&self.free, &self.level_nodes, h)
    }

    /// The free frame under lateral forces `h[l]` (N, +X) at the story levels, each shared
    /// equally among the level's nodes (one solve on the free frame's factorization).
    pub fn lateral(&self, h: &[f64]) -> Solution {
        let mesh = &self.free.mesh;
        let loads = level_loads(mesh, &self.level_nodes, h);
        let system = &self.free.system;
        let u = level_displacements(&self.free, &self.level_nodes, h);
        let r = recover(mesh, &system.dofs, None, &loads, u);
        let mut out = Solution::from_response(mesh, &r);
        out.residual = Default::default();
        out
    }
}

/// The free frame's stiffness `K` bordered by the level constraints: one Lagrange
/// multiplier per held level, numbered just after the last X translation of its level
/// (see the module's documentation).
///
/// Every leading block of the bordered matrix is `[K_ss, −C_s; −C_sᵀ, 0]` with `K_ss` a
/// leading block of `K` (positive definite) and `C_s` the constraints whose translations
/// all lie in it (disjoint, none empty: full column rank), so it is nonsingular and the
/// LDLᵀ factorization without pivoting exists, with one negative pivot per multiplier
/// (the level's flexibility under its own constraint, −c_lᵀ·K_ss⁻¹·c_l). Eliminating a
/// multiplier adds the stiffness of holding that level to the equations after it, so the
/// remaining pivots stay those of a positive definite frame.
#[derive(Debug, Clone)]
pub struct HeldLevels {
    /// Per level: the equation of its multiplier in the bordered system (None where the
    /// split holds nothing at that level).
    multiplier: Vec<Option<usize>>,
    /// LDLᵀ factor of the bordered matrix.
    factor: SkylineFactor,
}

impl HeldLevels {
    /// Border the free frame's `system` with the levels of `level_nodes` (each node's X
    /// translation weighted 1/n_l, n_l the level's node count, as the mean is) and factor.
    pub fn new(system: &System, level_nodes: &[Vec<usize>]) -> Result<HeldLevels, FactorError> {
        let levels: Vec<(Vec<usize>, f64)> = level_nodes
            .iter()
            .map(|nodes| {
                let eqs = nodes
                    .iter()
                    .filter_map(|&n| system.dofs[n][0].equation())
                    .collect();
                (eqs, 1.0 / nodes.len().max(1) as f64)
            })
            .collect();
        HeldLevels::bordered(&system.matrix, &levels)
    }

    /// Border `k` with one constraint per entry of `levels` (the equations it weighs and
    /// their weight; a level with no equation gets no multiplier) and factor. A failure
    /// names the equation of `k` where elimination broke down.
    pub fn bordered(
        k: &SkylineMatrix,
        levels: &[(Vec<usize>, f64)],
    ) -> Result<HeldLevels, FactorError> {
        let n = k.n();
        // Numbering: each multiplier right after the last equation of its level.
        let mut after: Vec<Vec<usize>> = vec![Vec::new(); n];
        for (l, (eqs, _)) in levels.iter().enumerate() {
            if let Some(&last) = eqs.iter().max() {
                after[last].push(l);
            }
        }
        let mut position = vec![0; n];
        let mut multiplier = vec![None; levels.len()];
        let mut next = 0;
        for (q, follow) in after.iter().enumerate() {
            position[q] = next;
            next += 1;
            for &l in follow {
                multiplier[l] = Some(next);
                next += 1;
            }
        }
        let mut first_row = vec![0; next];
        for (q, &f) in k.first_rows().iter().enumerate() {
            first_row[position[q]] = position[f];
        }
        for ((eqs, _), m) in levels.iter().zip(&multiplier) {
            if let (Some(m), Some(lowest)) = (m, eqs.iter().map(|&q| position[q]).min()) {
                first_row[*m] = lowest;
            }
        }
        let mut bordered = SkylineMatrix::new(first_row);
        for j in 0..n {
            for i in k.first_rows()[j]..=j {
                let v = k.get(i, j);
                if v != 0.0 {
                    bordered.add(position[i], position[j], v);
                }
            }
        }
        for ((eqs, w), m) in levels.iter().zip(&multiplier) {
            if let Some(m) = *m {
                for &q in eqs {
                    bordered.add(position[q], m, -w);
                }
            }
        }
        // A failure names the free-frame equation (a multiplier: its level's last one).
        let (factor, _negative) = bordered.factor_inertia().map_err(|e| {
            let FactorError::NotPositiveDefinite { index, pivot } = e;
            let level = multiplier.iter().position(|&m| m == Some(index));
            let q = match level.and_then(|l| levels[l].0.iter().max()) {
                Some(&last) => last,
                None => position.iter().position(|&p| p == index).unwrap_or(0),
            };
            FactorError::NotPositiveDefinite { index: q, pivot }
        })?;
        Ok(HeldLevels { multiplier, factor })
    }

    /// The holding forces λ (N, +X) that bring the mean X translations `ubar` (m, one per
    /// level) of a free solution to zero: `A·λ = −ū`, by one solve of the bordered system
    /// with `ū` in the multipliers' rows. Zero where the split holds nothing.
    pub fn holding(&self, ubar: &[f64]) -> Vec<f64> {
        let mut b = vec![0.0; self.factor.n()];
        for (m, &u) in self.multiplier.iter().zip(ubar) {
            if let Some(m) = *m {
                b[m] = u;
            }
        }
        self.factor.solve(&mut b);
        self.multiplier
            .iter()
            .map(|m| m.map_or(0.0, |m| b[m]))
            .collect()
    }
}

/// The node and direction of free-frame equation `q`, for an error message (a multiplier's
/// equation names nothing).
fn locate(model: &Model, free: &FirstOrder, q: usize) -> Option<FreeDirection> {
    let system = &free.system;
    system.dofs.iter().enumerate().find_map(|(node, d)| {
        let k = d.iter().position(|x| x.equation() == Some(q))?;
        Some(FreeDirection {
            node,
            direction: Direction::ALL[k],
            place: free.mesh.describe_node(model, node),
        })
    })
}

/// Nodal loads of lateral forces `h[l]` at the levels, each shared equally among the
/// level's nodes.
fn level_loads(mesh: &Mesh, level_nodes: &[Vec<usize>], h: &[f64]) -> MeshLoads {
    let mut loads = MeshLoads::zero(mesh);
    for (nodes, &f) in level_nodes.iter().zip(h) {
        for &n in nodes {
            loads.add_nodal(n, [f / nodes.len() as f64, 0.0, 0.0]);
        }
    }
    loads
}

/// Displacements of every node of the free frame under lateral forces `h[l]` at the levels.
fn level_displacements(free: &FirstOrder, level_nodes: &[Vec<usize>], h: &[f64]) -> Vec<[f64; 3]> {
    let system = &free.system;
    let mut f = vec![0.0; system.n];
    for (nodes, &hl) in level_nodes.iter().zip(h) {
        for &n in nodes {
            if let Some(q) = system.dofs[n][0].equation() {
                f[q] += hl / nodes.len() as f64;
            }
        }
    }
    let u = system.solve(&f);
    system
        .dofs
        .iter()
        .map(|d| {
            let g = |k: usize| d[k].equation().map_or(0.0, |q| u[q]);
            [g(0), g(1), g(2)]
        })
        .collect()
}

/// Mean X translation of `nodes` in the node displacements `u` (0 for no nodes), m.
pub fn mean_x(u: &[[f64; 3]], nodes: &[usize]) -> f64 {
    if nodes.is_empty() {
        return 0.0;
    }
    nodes.iter().map(|&n| u[n][0]).sum::<f64>() / nodes.len() as f64
}

/// Mean X translation of `nodes` in `s` (0 for no nodes), m.
pub fn mean_ux(s: &Solution, nodes: &[usize]) -> f64 {
    if nodes.is_empty() {
        return 0.0;
    }
    mean_x(&s.displacements, nodes)
}

#[cfg(test)]
mod tests {
    use nalgebra::{DMatrix, DVector};

    use super::*;
    use crate::solve::test_rng::Lcg;

    /// A banded symmetric positive definite matrix of order `n` (strictly diagonally
    /// dominant, so positive definite by Gershgorin's theorem; closed form), entries of a
    /// frame's range of magnitudes.
    fn banded(rng: &mut Lcg, n: usize, band: usize) -> DMatrix<f64> {
        let mut k = DMatrix::zeros(n, n);
        for j in 0..n {
            for i in j.saturating_sub(band)..j {
                let v = 1e7 * rng.symmetric();
                k[(i, j)] = v;
                k[(j, i)] = v;
            }
        }
        for i in 0..n {
            let off: f64 = (0..n).filter(|&j| j != i).map(|j| k[(i, j)].abs()).sum();
            k[(i, i)] = off + 1e6 * (1.0 + rng.symmetric().abs());
        }
        k
    }

    /// The Lagrange multipliers of the bordered system against the level flexibility
    /// formed densely: `A = Cᵀ·K⁻¹·C`, `A·λ = −ū` (the stationarity conditions of the
    /// constrained quadratic, closed form), on random banded matrices with levels of
    /// scattered equations, one level left empty.
    #[test]
    fn bordered_multipliers_equal_the_dense_level_flexibility_solution() {
        let mut rng = Lcg(21);
        for trial in 0..20 {
            let n = 30 + rng.below(40);
            let band = 2 + rng.below(8);
            let k = banded(&mut rng, n, band);
            let order = rng.permutation(n);
            let nl = 2 + rng.below(5);
            let mut levels: Vec<(Vec<usize>, f64)> = Vec::new();
            let mut at = 0;
            for l in 0..nl {
                let size = if l == 1 { 0 } else { 1 + rng.below(4) };
                let eqs: Vec<usize> = order[at..at + size].to_vec();
                at += size;
                // A level's weight is 1 / its node count, which may exceed its equations.
                levels.push((eqs, 1.0 / (size + rng.below(2)).max(1) as f64));
            }
            let held = HeldLevels::bordered(&SkylineMatrix::from_dense(&k), &levels)
                .expect("the bordered matrix factors");
            let ubar: Vec<f64> = (0..nl).map(|_| 1e-3 * rng.symmetric()).collect();
            let got = held.holding(&ubar);

            let mut c = DMatrix::zeros(n, nl);
            for (l, (eqs, w)) in levels.iter().enumerate() {
                for &q in eqs {
                    c[(q, l)] = *w;
                }
            }
            let k_inv_c = k.clone().cholesky().expect("positive definite").solve(&c);
            let mut a = c.transpose() * k_inv_c;
            let mut rhs = -DVector::from_column_slice(&ubar);
            // The empty level holds nothing: λ = 0 there.
            for j in 0..nl {
                a[(1, j)] = 0.0;
                a[(j, 1)] = 0.0;
            }
            a[(1, 1)] = 1.0;
            rhs[1] = 0.0;
            let expected = a.lu().solve(&rhs).expect("nonsingular");
            let scale = expected.iter().fold(0.0_f64, |m, v| m.max(v.abs()));
            for l in 0..nl {
                assert!(
                    (got[l] - expected[l]).abs() <= 1e-10 * scale,
                    "trial {trial}, level {l}: {} against {}",
                    got[l],
                    expected[l]
                );
            }
        }
    }
}
