//! Seeded random regular frames for property tests (issue 7): 1–4 unequal bays, 1–6
//! unequal stories, fixed or pinned bases, beam end releases, gravity-only and lateral
//! factored cases. Invented frames, for properties only: their numbers are never expected
//! values.
//!
//! Use: `let rf = RandomFrame::new(seed);` then `rf.model` and `rf.cases`.

use plumbline::combos::{Basis, FactoredCase};
use plumbline::model::{ActionCategory, LoadDirection, MemberLoadKind, Model};

use super::Frame;

/// SplitMix64 (Steele, Lea and Flood 2014, from memory): small, seedable, no crate.
pub struct Rng(pub u64);

impl Rng {
    pub fn next_u64(&mut self) -> u64 {
        self.0 = self.0.wrapping_add(0x9E37_79B9_7F4A_7C15);
        let mut z = self.0;
        z = (z ^ (z >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
        z = (z ^ (z >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
        z ^ (z >> 31)
    }

    /// Uniform in [0, 1).
    pub fn unit(&mut self) -> f64 {
        (self.next_u64() >> 11) as f64 / (1u64 << 53) as f64
    }

    /// Uniform in [lo, hi).
    pub fn range(&mut self, lo: f64, hi: f64) -> f64 {
        lo + (hi - lo) * self.unit()
    }

    /// Uniform integer in lo..=hi.
    pub fn int(&mut self, lo: usize, hi: usize) -> usize {
        lo + (self.next_u64() % (hi - lo + 1) as u64) as usize
    }

    /// True with probability `p`.
    pub fn chance(&mut self, p: f64) -> bool {
        self.unit() < p
    }
}

/// A generated frame and its factored cases.
pub struct RandomFrame {
    pub seed: u64,
    pub model: Model,
    pub cases: Vec<FactoredCase>,
    pub bays: usize,
    pub stories: usize,
    pub fixed_bases: bool,
    /// (member index, release at i, release at j) of every released beam.
    pub releases: Vec<(usize, bool, bool)>,
}

/// A factored case.
pub fn factored(id: &str, basis: Basis, factors: &[(usize, f64)]) -> FactoredCase {
    FactoredCase {
        id: id.into(),
        expression: id.into(),
        basis,
        combination: id.into(),
        factors: factors.to_vec(),
        note: None,
    }
}

impl RandomFrame {
    /// The frame of `seed`. Bay 1 keeps moment connections at every level so that a frame
    /// on pinned bases still resists sway; other beams are released at one or both ends
    /// with probability 0.25.
    pub fn new(seed: u64) -> RandomFrame {
        let mut r = Rng(seed ^ 0x5EED_F4A3_0000_0000);
        let bays = r.int(1, 4);
        let stories = r.int(1, 6);
        let fixed_bases = r.chance(0.5);
        let e = 200e9;
        let x: Vec<f64> = std::iter::once(0.0)
            .chain((0..bays).scan(0.0, |acc, _| {
                *acc += r.range(4.0, 9.0);
                Some(*acc)
            }))
            .collect();
        let y: Vec<f64> = std::iter::once(0.0)
            .chain((0..stories).scan(0.0, |acc, _| {
                *acc += r.range(3.0, 5.0);
                Some(*acc)
            }))
            .collect();
        let mut f = Frame::new();
        f.model.title = format!("random frame {seed}");
        // nodes[level][line]
        let nodes: Vec<Vec<usize>> = y
            .iter()
            .map(|&yy| x.iter().map(|&xx| f.node(xx, yy)).collect())
            .collect();
        for &n in &nodes[0] {
            if fixed_bases {
                f.fixed(n);
            } else {
                f.pinned(n);
            }
        }
        // Columns: stiffer at the bottom; sizes in a plausible steel range (A 60–200 cm²,
        // I 8 000–60 000 cm⁴).
        let mut beams_at: Vec<Vec<usize>> = Vec::new();
        for s in 0..stories {
            let scale = 1.0 + (stories - s) as f64 / stories as f64;
            for (&lo, &hi) in nodes[s].iter().zip(&nodes[s + 1]) {
                let a = r.range(60e-4, 100e-4) * scale;
                let i = r.range(8_000e-8, 30_000e-8) * scale;
                f.member(lo, hi, e, a, i);
            }
            let mut level = Vec::new();
            for bay in 0..bays {
                let a = r.range(50e-4, 90e-4);
                let i = r.range(15_000e-8, 60_000e-8);
                level.push(f.member(nodes[s + 1][bay], nodes[s + 1][bay + 1], e, a, i));
            }
            beams_at.push(level);
        }
        let mut releases = Vec::new();
        for level in &beams_at {
            for (bay, &b) in level.iter().enumerate() {
                if bay > 0 && r.chance(0.25) {
                    let (ri, rj) = match r.int(0, 2) {
                        0 => (true, false),
                        1 => (false, true),
                        _ => (true, true),
                    };
                    f.release(b, ri, rj);
                    releases.push((b, ri, rj));
                }
            }
        }
        // Loads: dead and live on the beams (uniform, unequal from beam to beam, plus a point
        // load at a random place on some), wind at the levels (same direction, unequal).
        // Gravity intensity varies from frame to frame so that the frames' α_cr spread from
        // about 1 to a few hundred.
        let heavy = r.range(1.0, 2.0_f64).powi(4);
        let d = f.case("D", ActionCategory::Dead);
        let l = f.case("L", ActionCategory::Live);
        let w = f.case("W", ActionCategory::Wind);
        for level in &beams_at {
            for &b in level {
                f.udl(d, b, heavy * r.range(8e3, 30e3), LoadDirection::Gravity);
                if r.chance(0.7) {
                    f.udl(l, b, heavy * r.range(3e3, 20e3), LoadDirection::Gravity);
                }
                if r.chance(0.3) {
                    let len = f.model.length(b);
                    f.member_load(
                        d,
                        b,
                        MemberLoadKind::Point {
                            a: r.range(0.1, 0.9) * len,
                            p: heavy * r.range(10e3, 80e3),
                            direction: LoadDirection::Gravity,
                        },
                    );
                }
            }
        }
        for (s, level) in nodes.iter().enumerate().skip(1) {
            let share = y[s] / y[stories];
            f.nodal(w, level[0], r.range(5e3, 25e3) * share, 0.0, 0.0);
        }
        let st = Basis::Strength;
        let cases = vec![
            factored("1.4D", st, &[(d, 1.4)]),
            factored("1.2D+1.6L", st, &[(d, 1.2), (l, 1.6)]),
            factored("1.2D+1.0W+L", st, &[(d, 1.2), (w, 1.0), (l, 1.0)]),
            factored("0.9D-1.0W", st, &[(d, 0.9), (w, -1.0)]),
            factored(
                "D+0.6W (ASD)",
                Basis::AllowableStress,
                &[(d, 1.0), (w, 0.6)],
            ),
        ];
        RandomFrame {
            seed,
            model: f.model,
            cases,
            bays,
            stories,
            fixed_bases,
            releases,
        }
    }
}
