//! Seeded random frames for property tests (issues 7 and 16). Invented frames, for
//! properties only: their numbers are never expected values.
//!
//! [`RandomFrame::new`] draws 1–4 unequal bays and 1–6 stories of unequal height (now and
//! then one much taller story, or a soft story with a quarter of the column stiffness, or
//! one heavily loaded level), fixed, pinned or rotational-spring bases, beam end releases,
//! pin-ended diagonal braces, a line of leaning (pin-ended) columns tied to the frame by
//! pin-ended links, and lateral loads that are ordinary, tiny (a millionth), zero, or of
//! mixed sign from level to level, with gravity-only and lateral factored cases.
//! [`RandomFrame::symmetric`] draws a frame symmetric about its centre line under
//! symmetric gravity only.
//!
//! Use: `let rf = RandomFrame::new(seed);` then `rf.model` and `rf.cases`.

use plumbline::combos::{Basis, FactoredCase};
use plumbline::model::{ActionCategory, LoadDirection, MemberLoadKind, Model, Restraint, Role};

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

/// How the bases of a generated frame are supported.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Base {
    Fixed,
    Pinned,
    /// Pinned in translation with a rotational spring.
    Spring,
}

/// How the lateral (wind) load case of a generated frame is drawn.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Lateral {
    /// Same direction at every level, unequal.
    Ordinary,
    /// A millionth of an ordinary load.
    Tiny,
    /// No lateral load at all (the W case is empty).
    Zero,
    /// Unequal, with signs drawn per level (at least one of each sign on two or more
    /// levels).
    MixedSign,
}

/// A generated frame and its factored cases.
pub struct RandomFrame {
    pub seed: u64,
    pub model: Model,
    pub cases: Vec<FactoredCase>,
    pub bays: usize,
    pub stories: usize,
    pub base: Base,
    pub fixed_bases: bool,
    /// (member index, release at i, release at j) of every released beam.
    pub releases: Vec<(usize, bool, bool)>,
    /// Pin-ended diagonal braces.
    pub braces: Vec<usize>,
    /// Leaning (pin-ended) columns.
    pub leaning: Vec<usize>,
    pub lateral: Lateral,
    /// Whether the frame and its loads are symmetric about the centre line
    /// ([`RandomFrame::symmetric`]).
    pub symmetric: bool,
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

/// One drawn beam of a symmetric frame: A, I, dead and live load, and an optional point
/// load (place as a fraction of the span, force).
type BeamDraw = (f64, f64, f64, f64, Option<(f64, f64)>);

/// Cumulative coordinates `0, d1, d1 + d2, …` of `n` steps drawn by `step`.
fn grid(n: usize, mut step: impl FnMut() -> f64) -> Vec<f64> {
    let mut out = vec![0.0];
    for _ in 0..n {
        let last = *out.last().unwrap();
        out.push(last + step());
    }
    out
}

impl RandomFrame {
    /// The frame of `seed`. Bay 1 keeps moment connections at every level so that a frame
    /// on pinned bases still resists sway; other beams are released at one or both ends
    /// with probability 0.25.
    pub fn new(seed: u64) -> RandomFrame {
        let mut r = Rng(seed ^ 0x5EED_F4A3_0000_0000);
        let bays = r.int(1, 4);
        let stories = r.int(1, 6);
        let base = match r.int(0, 4) {
            0 | 1 => Base::Fixed,
            2 | 3 => Base::Pinned,
            _ => Base::Spring,
        };
        let e = 200e9;
        let x = grid(bays, || r.range(4.0, 9.0));
        // Dissimilar stories: heights 2.8–5.5 m, and with probability 0.2 one story 1.6×
        // taller.
        let tall = r.chance(0.2).then(|| r.int(0, stories - 1));
        let mut k = 0;
        let y = grid(stories, || {
            let h = r.range(2.8, 5.5) * if tall == Some(k) { 1.6 } else { 1.0 };
            k += 1;
            h
        });
        let soft = r.chance(0.2).then(|| r.int(0, stories - 1));
        let heavy_level = r.chance(0.2).then(|| r.int(0, stories - 1));
        let mut f = Frame::new();
        f.model.title = format!("random frame {seed}");
        // nodes[level][line]
        let nodes: Vec<Vec<usize>> = y
            .iter()
            .map(|&yy| x.iter().map(|&xx| f.node(xx, yy)).collect())
            .collect();
        // Columns: stiffer at the bottom; sizes in a plausible steel range (A 60–200 cm²,
        // I 8 000–60 000 cm⁴).
        let mut beams_at: Vec<Vec<usize>> = Vec::new();
        let mut first_column_ei = 0.0;
        for s in 0..stories {
            let scale = 1.0 + (stories - s) as f64 / stories as f64;
            let soften = if soft == Some(s) { 0.25 } else { 1.0 };
            for (&lo, &hi) in nodes[s].iter().zip(&nodes[s + 1]) {
                let a = r.range(60e-4, 100e-4) * scale;
                let i = r.range(8_000e-8, 30_000e-8) * scale * soften;
                if s == 0 && first_column_ei == 0.0 {
                    first_column_ei = e * i;
                }
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
        for &n in &nodes[0] {
            match base {
                Base::Fixed => f.fixed(n),
                Base::Pinned => f.pinned(n),
                Base::Spring => {
                    // A rotational spring of 0.3 to 5 times 4EI/h of a first-story column.
                    let k = r.range(0.3, 5.0) * 4.0 * first_column_ei / y[1];
                    f.support(
                        n,
                        [Restraint::Fixed, Restraint::Fixed, Restraint::Spring(k)],
                    );
                }
            }
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
        // Pin-ended diagonal braces (A 10–40 cm², I 100–2 000 cm⁴: slender), in a random
        // bay and story, with probability 0.3 (one or two).
        let mut braces = Vec::new();
        if r.chance(0.3) {
            for _ in 0..r.int(1, 2) {
                let (bay, s) = (r.int(0, bays - 1), r.int(0, stories - 1));
                let (from, to) = if r.chance(0.5) {
                    (nodes[s][bay], nodes[s + 1][bay + 1])
                } else {
                    (nodes[s][bay + 1], nodes[s + 1][bay])
                };
                let m = f.member(
                    from,
                    to,
                    e,
                    r.range(10e-4, 40e-4),
                    r.range(100e-8, 2_000e-8),
                );
                f.release(m, true, true);
                f.model.members[m].role = Role::Brace;
                braces.push(m);
            }
        }
        // A line of leaning columns beyond the last bay, pinned at the base and at every
        // level, tied to the frame by pin-ended links, with probability 0.3.
        let mut leaning = Vec::new();
        let mut leaning_nodes = Vec::new();
        if r.chance(0.3) {
            let xl = x[bays] + r.range(3.0, 8.0);
            let line: Vec<usize> = y.iter().map(|&yy| f.node(xl, yy)).collect();
            f.pinned(line[0]);
            for s in 0..stories {
                let c = f.member(
                    line[s],
                    line[s + 1],
                    e,
                    r.range(30e-4, 80e-4),
                    r.range(1_000e-8, 8_000e-8),
                );
                f.release(c, true, true);
                leaning.push(c);
                let link = f.member(nodes[s + 1][bays], line[s + 1], e, 40e-4, 1_000e-8);
                f.release(link, true, true);
            }
            leaning_nodes = line[1..].to_vec();
        }
        // Loads: dead and live on the beams (uniform, unequal from beam to beam, plus a point
        // load at a random place on some), gravity on the leaning columns, wind at the
        // levels. Gravity intensity varies from frame to frame so that the frames' α_cr
        // spread from about 1 to a few hundred.
        let heavy = r.range(1.0, 2.0_f64).powi(4);
        let d = f.case("D", ActionCategory::Dead);
        let l = f.case("L", ActionCategory::Live);
        let w = f.case("W", ActionCategory::Wind);
        for (s, level) in beams_at.iter().enumerate() {
            let more = if heavy_level == Some(s) { 3.0 } else { 1.0 };
            for &b in level {
                f.udl(
                    d,
                    b,
                    more * heavy * r.range(8e3, 30e3),
                    LoadDirection::Gravity,
                );
                if r.chance(0.7) {
                    f.udl(
                        l,
                        b,
                        more * heavy * r.range(3e3, 20e3),
                        LoadDirection::Gravity,
                    );
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
        for &n in &leaning_nodes {
            f.nodal(d, n, 0.0, -heavy * r.range(30e3, 150e3), 0.0);
            f.nodal(l, n, 0.0, -heavy * r.range(10e3, 80e3), 0.0);
        }
        let lateral = match r.int(0, 19) {
            0..=11 => Lateral::Ordinary,
            12..=14 => Lateral::Tiny,
            15..=16 => Lateral::Zero,
            _ => Lateral::MixedSign,
        };
        let mut signs: Vec<f64> = (0..stories)
            .map(|_| if r.chance(0.5) { 1.0 } else { -1.0 })
            .collect();
        if stories >= 2 && signs.iter().all(|&s| s == signs[0]) {
            signs[0] = -signs[0];
        }
        for (s, level) in nodes.iter().enumerate().skip(1) {
            let share = y[s] / y[stories];
            let fx = r.range(5e3, 25e3) * share;
            let fx = match lateral {
                Lateral::Ordinary => fx,
                Lateral::Tiny => 1e-6 * fx,
                Lateral::Zero => continue,
                Lateral::MixedSign => signs[s - 1] * fx,
            };
            f.nodal(w, level[0], fx, 0.0, 0.0);
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
            base,
            fixed_bases: base == Base::Fixed,
            releases,
            braces,
            leaning,
            lateral,
            symmetric: false,
        }
    }

    /// A frame of `seed` symmetric about its centre line: mirrored bay widths, sections
    /// and beam loads (uniform, plus mirrored pairs of point loads), fixed or pinned bases,
    /// no releases, under gravity cases only. Its first-order sway is zero up to round-off
    /// (closed form: a structure symmetric in geometry, stiffness and load has a symmetric
    /// response, so the mean translation of every level is zero).
    pub fn symmetric(seed: u64) -> RandomFrame {
        let mut r = Rng(seed ^ 0x5111_3E7A_0000_0000);
        let bays = r.int(1, 4);
        let stories = r.int(1, 6);
        let base = if r.chance(0.5) {
            Base::Fixed
        } else {
            Base::Pinned
        };
        let e = 200e9;
        let half: Vec<f64> = (0..bays.div_ceil(2)).map(|_| r.range(4.0, 9.0)).collect();
        let widths: Vec<f64> = (0..bays).map(|b| half[b.min(bays - 1 - b)]).collect();
        let x = grid(bays, {
            let mut it = widths.iter();
            move || *it.next().unwrap()
        });
        let y = grid(stories, || r.range(2.8, 5.5));
        let mut f = Frame::new();
        f.model.title = format!("symmetric random frame {seed}");
        let nodes: Vec<Vec<usize>> = y
            .iter()
            .map(|&yy| x.iter().map(|&xx| f.node(xx, yy)).collect())
            .collect();
        for &n in &nodes[0] {
            if base == Base::Fixed {
                f.fixed(n)
            } else {
                f.pinned(n)
            }
        }
        let d = f.case("D", ActionCategory::Dead);
        let l = f.case("L", ActionCategory::Live);
        let heavy = r.range(1.0, 2.0_f64).powi(4);
        for s in 0..stories {
            let scale = 1.0 + (stories - s) as f64 / stories as f64;
            let lines = bays + 1;
            let cols: Vec<(f64, f64)> = (0..lines.div_ceil(2))
                .map(|_| {
                    (
                        r.range(60e-4, 100e-4) * scale,
                        r.range(8_000e-8, 30_000e-8) * scale,
                    )
                })
                .collect();
            for line in 0..lines {
                let (a, i) = cols[line.min(lines - 1 - line)];
                f.member(nodes[s][line], nodes[s + 1][line], e, a, i);
            }
            let beams: Vec<BeamDraw> = (0..bays.div_ceil(2))
                .map(|_| {
                    (
                        r.range(50e-4, 90e-4),
                        r.range(15_000e-8, 60_000e-8),
                        heavy * r.range(8e3, 30e3),
                        heavy * r.range(3e3, 20e3),
                        r.chance(0.3)
                            .then(|| (r.range(0.1, 0.9), heavy * r.range(10e3, 80e3))),
                    )
                })
                .collect();
            for bay in 0..bays {
                let mirrored = bay >= bays.div_ceil(2) || (bays % 2 == 1 && bay == bays / 2);
                let (a, i, wd, wl, point) = beams[bay.min(bays - 1 - bay)];
                let b = f.member(nodes[s + 1][bay], nodes[s + 1][bay + 1], e, a, i);
                f.udl(d, b, wd, LoadDirection::Gravity);
                f.udl(l, b, wl, LoadDirection::Gravity);
                if let Some((at, p)) = point {
                    let len = f.model.length(b);
                    // The mirror image of a point at `at` from the left is at `1 − at`; the
                    // middle bay of an odd count carries both so that it is symmetric itself.
                    let places: Vec<f64> = if bays % 2 == 1 && bay == bays / 2 {
                        vec![at, 1.0 - at]
                    } else if mirrored {
                        vec![1.0 - at]
                    } else {
                        vec![at]
                    };
                    for a in places {
                        f.member_load(
                            d,
                            b,
                            MemberLoadKind::Point {
                                a: a * len,
                                p,
                                direction: LoadDirection::Gravity,
                            },
                        );
                    }
                }
            }
        }
        let st = Basis::Strength;
        let cases = vec![
            factored("1.4D", st, &[(d, 1.4)]),
            factored("1.2D+1.6L", st, &[(d, 1.2), (l, 1.6)]),
        ];
        RandomFrame {
            seed,
            model: f.model,
            cases,
            bays,
            stories,
            base,
            fixed_bases: base == Base::Fixed,
            releases: Vec::new(),
            braces: Vec::new(),
            leaning: Vec::new(),
            lateral: Lateral::Zero,
            symmetric: true,
        }
    }
}
