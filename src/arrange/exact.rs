//! The exact live-load pattern envelope: for every enveloped section and quantity, the
//! subset of loaded spans that makes it largest and the one that makes it smallest.
//!
//! Live load on span `s` alone gives the effect `cₛ` at a section (its first-order piece,
//! already solved). First-order effects superpose, so a subset `S` of loaded spans gives
//! `base + Σ_{s∈S} cₛ`. The largest value over all `2ⁿ` subsets therefore loads exactly the
//! spans with `cₛ > 0`, and the smallest exactly those with `cₛ < 0` (closed form,
//! [`pattern_extremes`]); nothing is enumerated.
//!
//! [`exact_patterns`] applies this to the moment, shear and axial force at both ends of
//! every member and at [`PATTERN_DIVISIONS`] − 1 interior points, and keeps each distinct
//! subset once. Every subset becomes an arrangement that `check` runs as an ordinary
//! factored case, so amplifiers and the second-order analysis see a real load pattern.

use std::collections::BTreeMap;

use super::pieces::Arranged;
use crate::model::{LocalLoad, Model};
use crate::solve::beam::internal_forces;
use crate::solve::first_order::{FirstOrder, Solution};
use crate::solve::forces::InternalForces;
use crate::solve::system::SystemError;
use crate::spans::{Pattern, loaded_spans};

/// Interior points of a member at which worst subsets are found: every `L / 10` (the ends
/// are always included). Measured on the 5-bay, 10-storey bench frame (`benches/check.rs`).
pub const PATTERN_DIVISIONS: usize = 10;

/// Below this fraction of the largest span effect of the same quantity anywhere in the
/// frame, a span's effect is round-off: it has no sign, and the span is left unloaded.
pub const ROUND_OFF: f64 = 1e-9;

/// The largest and smallest value of a quantity over every subset of loaded spans.
#[derive(Debug, Clone, PartialEq)]
pub struct PatternExtremes {
    /// `base + Σ max(cₛ, 0)`.
    pub max: f64,
    /// `base + Σ min(cₛ, 0)`.
    pub min: f64,
    /// Indices of the contributions loaded for the maximum (`cₛ > 0`).
    pub max_spans: Vec<usize>,
    /// Indices of the contributions loaded for the minimum (`cₛ < 0`).
    pub min_spans: Vec<usize>,
}

/// The extremes of `base + Σ_{s∈S} cₛ` over every subset `S` of the contributions
/// (`contributions[s] = cₛ`, the effect of span `s` loaded alone), by signs: the maximum
/// adds every positive contribution, the minimum every negative one (closed form: each
/// term of the sum is chosen independently). A zero contribution is left out of both.
pub fn pattern_extremes(base: f64, contributions: &[f64]) -> PatternExtremes {
    let mut out = PatternExtremes {
        max: base,
        min: base,
        max_spans: Vec::new(),
        min_spans: Vec::new(),
    };
    for (s, &c) in contributions.iter().enumerate() {
        if c > 0.0 {
            out.max += c;
            out.max_spans.push(s);
        } else if c < 0.0 {
            out.min += c;
            out.min_spans.push(s);
        }
    }
    out
}

/// A quantity enveloped over the patterns.
#[derive(Debug, Clone, Copy, PartialEq, Eq, strum::Display)]
#[strum(serialize_all = "kebab-case")]
pub enum Quantity {
    /// Bending moment M.
    Moment,
    /// Shear V.
    Shear,
    /// Axial force N.
    Axial,
}

impl Quantity {
    pub const ALL: [Quantity; 3] = [Quantity::Moment, Quantity::Shear, Quantity::Axial];

    /// This quantity of `f`.
    pub fn of(self, f: &InternalForces) -> f64 {
        match self {
            Quantity::Moment => f.m,
            Quantity::Shear => f.v,
            Quantity::Axial => f.n,
        }
    }
}

/// The first-order solution of each span's share of the arranged load (every arranged
/// case's piece on that span, at unit factor), solved on one factorization.
#[derive(Debug, Clone)]
pub struct SpanPieces {
    /// Per span: the solution of its load.
    pub solutions: Vec<Solution>,
    /// Per span: its local member loads, by member (members of the span only).
    pub loads: Vec<BTreeMap<usize, Vec<LocalLoad>>>,
}

impl SpanPieces {
    /// Solve every span piece of `arranged` (spans without arranged load give zero).
    pub fn solve(arranged: &Arranged) -> Result<SpanPieces, ExactError> {
        let model = &arranged.model;
        let (spans, members) = (arranged.spans.len(), model.members.len());
        if spans.saturating_mul(members) > MAX_SPAN_MEMBERS {
            return Err(ExactError::TooLarge { spans, members });
        }
        let fo = FirstOrder::new(model, &[])?;
        let mut out = SpanPieces {
            solutions: Vec::with_capacity(arranged.spans.len()),
            loads: Vec::with_capacity(arranged.spans.len()),
        };
        for s in 0..arranged.spans.len() {
            let cases: Vec<usize> = arranged
                .pieces
                .values()
                .filter_map(|(_, by_span)| by_span.get(&s).copied())
                .collect();
            let mut loads = crate::solve::linear::MeshLoads::zero(&fo.mesh);
            let mut by_member: BTreeMap<usize, Vec<LocalLoad>> = BTreeMap::new();
            for &k in &cases {
                loads.add_case(model, &fo.mesh, k, 1.0);
                for (m, l) in model.local_loads(k).into_iter().enumerate() {
                    if !l.is_empty() {
                        by_member.entry(m).or_default().extend(l);
                    }
                }
            }
            out.solutions.push(fo.solve_loads(model, &loads)?);
            out.loads.push(by_member);
        }
        Ok(out)
    }

    /// Internal forces of span `s`'s load in member `m` at `x` from end i.
    pub fn forces(&self, s: usize, m: usize, x: f64) -> InternalForces {
        let loads = self.loads[s].get(&m).map_or(&[][..], |l| l.as_slice());
        internal_forces(x, &self.solutions[s].end_forces[m], loads)
    }

    /// The effect `cₛ` of every span on `q` of member `m` at `x`.
    pub fn contributions(&self, q: Quantity, m: usize, x: f64) -> Vec<f64> {
        (0..self.solutions.len())
            .map(|s| q.of(&self.forces(s, m, x)))
            .collect()
    }
}

/// The sections at which patterns are found: both ends and `divisions − 1` interior points
/// at equal spacing, as distances from end i.
pub fn sections(length: f64, divisions: usize) -> Vec<f64> {
    let d = divisions.max(1);
    (0..=d).map(|k| length * k as f64 / d as f64).collect()
}

/// The largest |effect| of `q` of any single span anywhere in the frame (the scale below
/// which an effect is round-off).
fn scale(model: &Model, pieces: &SpanPieces, q: Quantity, divisions: usize) -> f64 {
    let mut big: f64 = 0.0;
    for m in 0..model.members.len() {
        for x in sections(model.length(m), divisions) {
            for c in pieces.contributions(q, m, x) {
                big = big.max(c.abs());
            }
        }
    }
    big
}

/// Whether each member carries a transverse load in some load case. Elsewhere the moment
/// of every span's load, and of any subset, is linear along the member: its extremes over
/// the member lie at the ends.
pub fn bent_members(model: &Model) -> Vec<bool> {
    let mut out = vec![false; model.members.len()];
    for k in 0..model.load_cases.len() {
        for (m, loads) in model.local_loads(k).iter().enumerate() {
            out[m] |= crate::solve::beam::has_transverse_load(loads);
        }
    }
    out
}

/// Error of the exact mode.
#[derive(Debug, thiserror::Error)]
pub enum ExactError {
    #[error(transparent)]
    System(#[from] SystemError),
    #[error(
        "analysis.live_patterns = \"exact\": the frame's worst live-load subsets number more \
         than {cap} distinct arrangements (each one is analysed as its own case); use \
         live_patterns = \"code\", or arrange the live load of fewer floors"
    )]
    TooMany { cap: usize },
    #[error(
        "the live-load arrangements give {count} factored cases: expected at most {cap}; use \
         live_patterns = \"code\", arrange the live load of fewer floors, or a table with \
         fewer combinations"
    )]
    TooManyCases { count: usize, cap: usize },
    #[error(
        "analysis.live_patterns = \"exact\": {spans} spans × {members} members is more than \
         {MAX_SPAN_MEMBERS} single-span results to keep; use live_patterns = \"code\""
    )]
    TooLarge { spans: usize, members: usize },
}

/// The most `spans × members` the exact mode keeps single-span solutions for (about 100 bytes
/// each, so some 200 MB), checked before anything is solved.
pub const MAX_SPAN_MEMBERS: usize = 2_000_000;

/// The distinct worst subsets of the arranged spans of `arranged`: `full` first, then, member
/// by member and section by section, the subsets that make the moment, shear and axial
/// force largest and smallest, each kept once. Spans whose effect is round-off
/// ([`ROUND_OFF`]) are left unloaded. More than `cap` subsets is an error.
pub fn exact_patterns(
    arranged: &Arranged,
    pieces: &SpanPieces,
    divisions: usize,
    cap: usize,
) -> Result<Vec<Pattern>, ExactError> {
    let model = &arranged.model;
    let loaded = loaded_spans(model, &arranged.spans);
    let all: Vec<usize> = loaded.iter().copied().collect();
    let mut out = vec![Pattern {
        tag: "full".into(),
        spans: all.clone(),
    }];
    let mut add = |spans: Vec<usize>| -> Result<(), ExactError> {
        if out.iter().any(|p| p.spans == spans) {
            return Ok(());
        }
        if out.len() == cap {
            return Err(ExactError::TooMany { cap });
        }
        let tag = if spans.is_empty() {
            "none".to_string()
        } else {
            format!(
                "p{}",
                out.iter().filter(|p| p.tag.starts_with('p')).count() + 1
            )
        };
        out.push(Pattern { tag, spans });
        Ok(())
    };
    let bent = bent_members(model);
    for q in Quantity::ALL {
        let tiny = ROUND_OFF * scale(model, pieces, q, divisions);
        for (m, &bent) in bent.iter().enumerate() {
            // Interior points only where the quantity can peak inside the member.
            let d = if q == Quantity::Moment && bent {
                divisions
            } else {
                1
            };
            for x in sections(model.length(m), d) {
                let c: Vec<f64> = pieces
                    .contributions(q, m, x)
                    .into_iter()
                    .map(|c| if c.abs() <= tiny { 0.0 } else { c })
                    .collect();
                let e = pattern_extremes(0.0, &c);
                for set in [e.max_spans, e.min_spans] {
                    add(set.into_iter().filter(|s| loaded.contains(s)).collect())?;
                }
            }
        }
    }
    Ok(out)
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Closed form against enumeration of every subset (`2ⁿ` sums) on seeded contributions of
    /// both signs, zeros included.
    #[test]
    fn signs_give_the_extremes_of_every_subset() {
        let mut state = 0x9e37_79b9_7f4a_7c15_u64;
        let mut next = || {
            state ^= state << 13;
            state ^= state >> 7;
            state ^= state << 17;
            (state % 2001) as f64 / 1000.0 - 1.0
        };
        for n in 0..=10 {
            let base = next();
            let c: Vec<f64> = (0..n)
                .map(|k| if k % 4 == 3 { 0.0 } else { next() })
                .collect();
            let (mut max, mut min) = (f64::NEG_INFINITY, f64::INFINITY);
            for mask in 0..1u32 << n {
                let v = base
                    + (0..n)
                        .filter(|s| mask >> s & 1 == 1)
                        .map(|s| c[s])
                        .sum::<f64>();
                max = max.max(v);
                min = min.min(v);
            }
            let e = pattern_extremes(base, &c);
            assert!((e.max - max).abs() <= 1e-12 && (e.min - min).abs() <= 1e-12);
            // The subsets reproduce the values they claim.
            let sum = |set: &[usize]| base + set.iter().map(|&s| c[s]).sum::<f64>();
            assert!((sum(&e.max_spans) - e.max).abs() <= 1e-12);
            assert!((sum(&e.min_spans) - e.min).abs() <= 1e-12);
            assert!(e.max_spans.iter().all(|&s| c[s] > 0.0));
            assert!(e.min_spans.iter().all(|&s| c[s] < 0.0));
        }
    }

    #[test]
    fn no_contribution_leaves_the_base() {
        let e = pattern_extremes(2.5, &[]);
        assert_eq!((e.max, e.min), (2.5, 2.5));
        assert!(e.max_spans.is_empty() && e.min_spans.is_empty());
    }
}
