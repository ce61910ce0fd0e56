//! Timing of the skyline solver on plane-frame-like stiffness matrices.
//!
//! Run with `cargo bench --bench solver`. Each case is an invented rectangular building
//! frame (`bays` × `stories`, fixed bases, 3 DOF per free node), numbered at random and then
//! reordered by reverse Cuthill–McKee; the program prints the size, profile, and the times of
//! ordering, assembly, factorisation and one solve, plus the relative residual. Timings are
//! printed, never asserted.

use plumbline::solve::ordering::{bandwidth, expand_to_dofs, inverse, rcm};
use plumbline::solve::skyline::{SkylineFactor, SkylineMatrix, first_rows};
use std::time::Instant;

/// Invented member properties (SI): bay width, story height, E, column and beam A and I.
const BAY: f64 = 6.0;
const STORY: f64 = 3.6;
const E: f64 = 200e9;
const COLUMN: (f64, f64) = (1.5e-2, 2.5e-4);
const BEAM: (f64, f64) = (1.0e-2, 3.0e-4);

/// Seeded 64-bit LCG (Knuth's MMIX constants, from memory) for the random initial numbering.
struct Lcg(u64);

impl Lcg {
    fn below(&mut self, m: usize) -> usize {
        self.0 = self
            .0
            .wrapping_mul(6364136223846793005)
            .wrapping_add(1442695040888963407);
        ((self.0 >> 11) % m as u64) as usize
    }
}

/// A member between two grid nodes; `None` stands for a fixed base node.
struct Member {
    ends: [Option<usize>; 2],
    /// Direction cosines (c, s) from end i to end j, length, area, second moment.
    c: f64,
    s: f64,
    length: f64,
    area: f64,
    inertia: f64,
}

/// Plane frame element stiffness in global axes, DOFs [u_i, v_i, θ_i, u_j, v_j, θ_j].
/// Closed form: axial bar EA/L plus Euler–Bernoulli flexure 12EI/L³, 6EI/L², 4EI/L, 2EI/L in
/// local axes, rotated by T with (c, s) (W. McGuire, R. H. Gallagher, R. D. Ziemian, *Matrix
/// Structural Analysis*, 2nd ed. (2000), ch. 4 — from memory).
fn member_stiffness(m: &Member) -> [[f64; 6]; 6] {
    let (l, a, i) = (m.length, m.area, m.inertia);
    let (ea, k1, k2, k3, k4) = (
        E * a / l,
        12.0 * E * i / l.powi(3),
        6.0 * E * i / l.powi(2),
        4.0 * E * i / l,
        2.0 * E * i / l,
    );
    let local: [[f64; 6]; 6] = [
        [ea, 0.0, 0.0, -ea, 0.0, 0.0],
        [0.0, k1, k2, 0.0, -k1, k2],
        [0.0, k2, k3, 0.0, -k2, k4],
        [-ea, 0.0, 0.0, ea, 0.0, 0.0],
        [0.0, -k1, -k2, 0.0, k1, -k2],
        [0.0, k2, k4, 0.0, -k2, k3],
    ];
    let mut t: [[f64; 6]; 6] = [[0.0; 6]; 6];
    for b in [0, 3] {
        t[b][b] = m.c;
        t[b][b + 1] = m.s;
        t[b + 1][b] = -m.s;
        t[b + 1][b + 1] = m.c;
        t[b + 2][b + 2] = 1.0;
    }
    let mut global: [[f64; 6]; 6] = [[0.0; 6]; 6];
    for (p, row) in global.iter_mut().enumerate() {
        for (q, entry) in row.iter_mut().enumerate() {
            let mut sum: f64 = 0.0;
            for r in 0..6 {
                for s in 0..6 {
                    sum += t[r][p] * local[r][s] * t[s][q];
                }
            }
            *entry = sum;
        }
    }
    global
}

/// Members of a `bays` × `stories` frame; free node (x, level ≥ 1) gets the random label
/// `label[(level − 1)·(bays + 1) + x]`.
fn frame(bays: usize, stories: usize, label: &[usize]) -> Vec<Member> {
    let node = |x: usize, level: usize| (level > 0).then(|| label[(level - 1) * (bays + 1) + x]);
    let mut members: Vec<Member> = Vec::new();
    for level in 1..=stories {
        for x in 0..=bays {
            members.push(Member {
                ends: [node(x, level - 1), node(x, level)],
                c: 0.0,
                s: 1.0,
                length: STORY,
                area: COLUMN.0,
                inertia: COLUMN.1,
            });
            if x < bays {
                members.push(Member {
                    ends: [node(x, level), node(x + 1, level)],
                    c: 1.0,
                    s: 0.0,
                    length: BAY,
                    area: BEAM.0,
                    inertia: BEAM.1,
                });
            }
        }
    }
    members
}

/// Milliseconds since `start`.
fn ms(start: Instant) -> f64 {
    start.elapsed().as_secs_f64() * 1e3
}

fn run_case(bays: usize, stories: usize) {
    let nodes: usize = (bays + 1) * stories;
    let mut rng: Lcg = Lcg(0x5eed ^ nodes as u64);
    let mut label: Vec<usize> = (0..nodes).collect();
    for i in (1..nodes).rev() {
        let j: usize = rng.below(i + 1);
        label.swap(i, j);
    }
    let members: Vec<Member> = frame(bays, stories, &label);

    // Node graph and RCM ordering.
    let t0: Instant = Instant::now();
    let mut adjacency: Vec<Vec<usize>> = vec![Vec::new(); nodes];
    for m in &members {
        if let [Some(a), Some(b)] = m.ends {
            adjacency[a].push(b);
            adjacency[b].push(a);
        }
    }
    let order: Vec<usize> = rcm(&adjacency);
    let position: Vec<usize> = inverse(&expand_to_dofs(&order, 3));
    let t_order: f64 = ms(t0);
    let band_before: usize = bandwidth(&adjacency, &(0..nodes).collect::<Vec<usize>>());
    let band_after: usize = bandwidth(&adjacency, &order);

    // Element DOF lists in the new numbering (None for fixed base DOFs), profile, assembly.
    let t1: Instant = Instant::now();
    let n: usize = 3 * nodes;
    let dofs: Vec<[Option<usize>; 6]> = members
        .iter()
        .map(|m| {
            let mut d: [Option<usize>; 6] = [None; 6];
            for (e, end) in m.ends.iter().enumerate() {
                if let Some(v) = end {
                    for c in 0..3 {
                        d[3 * e + c] = Some(position[3 * v + c]);
                    }
                }
            }
            d
        })
        .collect();
    let groups: Vec<Vec<usize>> = dofs
        .iter()
        .map(|d| d.iter().flatten().copied().collect())
        .collect();
    let mut k: SkylineMatrix = SkylineMatrix::new(first_rows(n, groups.iter().map(|g| &g[..])));
    for (m, d) in members.iter().zip(&dofs) {
        let ke: [[f64; 6]; 6] = member_stiffness(m);
        for p in 0..6 {
            for q in p..6 {
                // p ≤ q covers each symmetric pair once; `add` fills one stored slot.
                if let (Some(i), Some(j)) = (d[p], d[q]) {
                    k.add(i, j, ke[p][q]);
                }
            }
        }
    }
    let t_assemble: f64 = ms(t1);

    // Lateral load of 10 kN at every node, gravity 50 kN (invented).
    let mut b: Vec<f64> = vec![0.0; n];
    for v in 0..nodes {
        b[position[3 * v]] = 10e3;
        b[position[3 * v + 1]] = -50e3;
    }

    // Best of a few repetitions of factor and solve.
    let reps: usize = 3;
    let (mut t_factor, mut t_solve) = (f64::INFINITY, f64::INFINITY);
    let mut x: Vec<f64> = Vec::new();
    for _ in 0..reps {
        let t2: Instant = Instant::now();
        let factor: SkylineFactor = k.factor().expect("frame with fixed bases is stable");
        t_factor = t_factor.min(ms(t2));
        x = b.clone();
        let t3: Instant = Instant::now();
        factor.solve(&mut x);
        t_solve = t_solve.min(ms(t3));
    }
    let kx: Vec<f64> = k.mul_vec(&x);
    let r: f64 = kx
        .iter()
        .zip(&b)
        .fold(0.0, |m, (a, c)| m.max((a - c).abs()));
    let b_max: f64 = b.iter().fold(0.0, |m, v| m.max(v.abs()));
    let x_max: f64 = x.iter().fold(0.0, |m, v| m.max(v.abs()));
    let k_diag_max: f64 = (0..n).fold(0.0, |m, i| m.max(k.diagonal(i).abs()));

    println!(
        "{bays:>3} bays x {stories:>4} stories: n = {n:>6}, node bandwidth {band_before:>5} -> {band_after:>3}, \
         stored {:>9} ({:.2}% of n²/2) | order {t_order:7.2} ms, assemble {t_assemble:7.2} ms, \
         factor {t_factor:8.2} ms, solve {t_solve:6.2} ms, factor+solve {:8.2} ms | \
         ‖Kx−b‖∞/‖b‖∞ = {:.1e}, ‖Kx−b‖∞/(max k_ii·‖x‖∞) = {:.1e}",
        k.stored_len(),
        100.0 * k.stored_len() as f64 / (n as f64 * n as f64 / 2.0),
        t_factor + t_solve,
        r / b_max,
        r / (k_diag_max * x_max),
    );
}

/// All cases, or only the smallest with the argument `quick` (`cargo bench --bench solver --
/// quick`).
fn main() {
    let quick: bool = std::env::args().any(|a| a == "quick");
    let cases: &[(usize, usize)] = if quick {
        &[(10, 100)]
    } else {
        &[(10, 100), (10, 1000), (30, 333), (99, 100)]
    };
    println!("skyline LDLᵀ after reverse Cuthill–McKee (best of 3, wall clock)");
    for &(bays, stories) in cases {
        run_case(bays, stories);
    }
}
