//! The envelope over factored cases: for each member, the largest design moment, where it
//! acts, the case that produced it, and whether its sway or no-sway part is the larger.
//!
//! Unstable cases give no design values and take no part; they are listed by the report.

use serde::Serialize;

use crate::check::{CheckReport, MomentCheck, Part};

/// Where along a member a governing moment acts.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, strum::Display)]
#[serde(rename_all = "kebab-case")]
#[strum(serialize_all = "kebab-case")]
pub enum Location {
    /// End i.
    EndI,
    /// End j.
    EndJ,
    /// Within the span.
    Span,
}

/// The governing design moment of one member.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct GoverningMoment {
    pub member: String,
    /// Design moment with second-order effects, N·m (sign as in [`MomentCheck`]).
    pub moment: f64,
    pub location: Location,
    /// Distance from end i, m.
    pub x: f64,
    /// Id of the factored case that produced it.
    pub case: String,
    /// The first-order moment at the same section and case, N·m.
    pub first_order: f64,
    /// Whether the (amplified) sway or no-sway part is the larger there.
    pub governs: Part,
    /// Axial force of the member in that case, N, tension positive.
    pub axial: f64,
}

/// The governing design moment of every member over the stable cases of `report`
/// (members in no stable case are left out).
pub fn governing(report: &CheckReport) -> Vec<GoverningMoment> {
    let mut out: Vec<GoverningMoment> = Vec::new();
    for case in report.cases.iter().filter(|c| c.stable) {
        for (k, m) in case.members.iter().enumerate() {
            let sections: [(Location, &MomentCheck); 3] = [
                (Location::EndI, &m.ends[0]),
                (Location::EndJ, &m.ends[1]),
                (Location::Span, &m.span),
            ];
            let l = m.ends[1].x;
            for (location, s) in sections {
                // A span extreme at an end that equals that end's value repeats it.
                let repeats = |e: &MomentCheck| {
                    (s.x - e.x).abs() <= 1e-9 * l
                        && (s.design - e.design).abs() <= 1e-9 * s.design.abs()
                };
                let at_end =
                    location == Location::Span && (repeats(&m.ends[0]) || repeats(&m.ends[1]));
                if !s.design.is_finite() || at_end {
                    continue;
                }
                let candidate = GoverningMoment {
                    member: m.member.clone(),
                    moment: s.design,
                    location,
                    x: s.x,
                    case: case.id.clone(),
                    first_order: s.first_order,
                    governs: s.governs,
                    axial: m.axial,
                };
                match out.get_mut(k) {
                    Some(g) if g.moment.abs() >= s.design.abs() => {}
                    Some(g) => *g = candidate,
                    None => out.push(candidate),
                }
            }
        }
    }
    out
}
