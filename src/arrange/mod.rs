//! Live-load arrangement: the spans of a live load case loaded in patterns, as mutually
//! exclusive alternatives of that load case.
//!
//! A load case of category `live` marked `arrange = true` is split into *pieces*: one load
//! case per beam span that carries some of its load (`L@B1.1`), plus one piece for the rest
//! of it (nodal loads and loads on columns, `L@rest`), which every arrangement carries.
//! Each piece is an ordinary service load case, solved once; an arrangement is a set of
//! pieces, so its results are the sum of the pieces' solutions (first-order results combine
//! linearly). The model's `analysis.live_patterns` chooses the arrangements
//! ([`arrange_model`]):
//!
//! * `exact` (the default, [`exact`]): for every enveloped quantity (moment, shear, axial
//!   force) at every enveloped section (member ends and points along each member), the
//!   subset of spans, on every floor, that makes it largest and the one that makes it
//!   smallest, found from the signs of each span's first-order effect
//!   ([`exact::pattern_extremes`]). Each distinct subset is one arrangement (`full`,
//!   `none`, `p1`, `p2`, …), so amplifiers and second-order analyses see a real load pattern.
//! * `code`: the arrangements below ([`patterns`]).
//!
//! The code arrangements are:
//!
//! * `full`: every span loaded (ACI 318-19 §6.4.3.1 and §6.4.3.2 cover this case too);
//! * `alt-a`, `alt-b`: alternate spans loaded, checkerboard across floors, for the largest
//!   positive span moments (ACI 318-19 §6.4.3.2(a), EN 1992-1-1 §5.1.3(1)P(a); the
//!   checkerboard from floor to floor is common practice, no source): span `s` (counted
//!   from the left of its beam line, from 0) of the floor of rank `f` (counted from the
//!   lowest beam line, from 0) is loaded in `alt-a` when `s + f` is even and in `alt-b`
//!   when it is odd. A checkerboard never loads one bay on both floors at a column's ends,
//!   so it does not give the largest column moments;
//! * `adj-{node}`: the two spans meeting at that interior joint of a beam line loaded, and
//!   no other, for the largest negative moment there (ACI 318-19 §6.4.3.2(b),
//!   EN 1992-1-1 §5.1.3(1)P(b));
//! * `left-{column}`, `right-{column}`: the spans on one side of a column that meet it, on
//!   the floors at both of its ends, for the largest column end moments (from memory: the
//!   pattern of a column designed for unbalanced floor load).
//!
//! Arrangements that load nothing, or exactly the same spans as an earlier one, are left
//! out. The count per model is therefore at most
//! `3 + Σ (spans of each beam line − 1) + 2 × columns`, and a model is refused beyond
//! [`MAX_ARRANGEMENTS`] (the exact mode: beyond [`MAX_EXACT_PATTERNS`]). Several arranged load cases of one model share
//! the same arrangements (they are geometric); a factored case in which two of them act
//! takes the same arrangement for both, so arranged cases never multiply each other.
//!
//! A *span* is a chain of beam members between joints, where a joint is a node with a
//! column, brace or support, or where other than two beams meet. A *beam line* is a set of
//! spans connected end to end; its spans are ordered by the X of their mid-points and
//! lines are ranked into floors by their mean elevation.

pub mod exact;
mod pieces;

pub use crate::spans::*;
pub use pieces::{Arranged, arrange};

use crate::combos::Expansion;
use crate::model::{LivePatterns, Model};

/// Split the arranged load cases of `model` into pieces and list the arrangements of the
/// model's `analysis.live_patterns`: the code arrangements ([`patterns`]), or the exact
/// worst subsets ([`exact::exact_patterns`], which solves each span's piece first).
pub fn arrange_model(model: &Model) -> Result<Arranged, exact::ExactError> {
    let mut out = arrange(model);
    if out.pieces.is_empty() || model.analysis.live_patterns == LivePatterns::Code {
        return Ok(out);
    }
    let pieces = exact::SpanPieces::solve(&out)?;
    out.patterns =
        exact::exact_patterns(&out, &pieces, exact::PATTERN_DIVISIONS, MAX_EXACT_PATTERNS)?;
    Ok(out)
}

/// The factored cases after [`Arranged::apply`] stay within
/// [`crate::combos::MAX_FACTORED_CASES`] (each arrangement multiplies the cases that draw on
/// the arranged load).
pub fn within_case_limit(expansion: &Expansion) -> Result<(), exact::ExactError> {
    let (count, cap) = (expansion.cases.len(), crate::combos::MAX_FACTORED_CASES);
    if count > cap {
        return Err(exact::ExactError::TooManyCases { count, cap });
    }
    Ok(())
}
