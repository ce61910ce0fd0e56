//! The rest of a frame's hand-off beside the design moments (issue 17): the design axial
//! force of every member with its concurrent moments, the largest shear at each member end
//! with its concurrent moment and axial force, and the support reactions.
//!
//! Design axial forces and shears follow the method as [`MemberCheck::end_actions`] says;
//! reactions are those of each case's second-order analysis ([`CaseCheck::reactions`]).
//! Values within round-off of zero (1e-9 of the case's largest) have no sign and are not
//! enveloped. Everything is in SI units (N, m, N·m).

use serde::{Deserialize, Serialize};

use super::extreme::{Location, keep};
use crate::check::{CaseCheck, CheckReport, MemberCheck};

/// Values smaller than this fraction of the case's largest of their kind are round-off.
const ROUND_OFF: f64 = 1e-9;

/// A member's largest design tension or compression and what acts with it.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct AxialRow {
    /// Design axial force, N, tension positive (a compression is negative).
    pub axial: f64,
    pub case: String,
    pub expression: String,
    /// Concurrent design moments at end i, end j and in the span, N·m.
    pub moment_i: f64,
    pub moment_j: f64,
    pub moment_span: f64,
    /// Concurrent largest design end shear |V|, N.
    pub shear: f64,
}

/// The axial envelope of one member: its largest tension and its largest compression.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct AxialEnvelope {
    pub member: String,
    /// `column`, `beam` or `brace`.
    pub role: String,
    pub tension: Option<AxialRow>,
    pub compression: Option<AxialRow>,
}

/// The largest |design shear| at one member end and what acts with it.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ShearRow {
    pub member: String,
    pub role: String,
    /// `end-i` or `end-j`.
    pub location: Location,
    /// Design shear, N (V = dM/dx, signs of [`crate::solve::forces`]).
    pub shear: f64,
    pub case: String,
    pub expression: String,
    /// Concurrent design moment at that end, N·m.
    pub moment: f64,
    /// Concurrent design axial force at that end, N, tension positive.
    pub axial: f64,
}

/// One extreme of one reaction component and the other components acting with it.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ReactionRow {
    /// The extreme value, N or N·m.
    pub value: f64,
    pub case: String,
    pub expression: String,
    /// The whole reaction in that case, `[Rx (N), Ry (N), Mz (N·m)]` (free components 0).
    pub reaction: [f64; 3],
}

/// The largest and smallest value of one reaction component of one support.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ComponentEnvelope {
    /// `Rx`, `Ry` or `Mz` (global axes: X right, Y up, Mz counter-clockwise; the force the
    /// support exerts on the frame).
    pub component: String,
    /// The support holds it by a spring: the reaction is the spring force.
    pub spring: bool,
    pub max: Option<ReactionRow>,
    pub min: Option<ReactionRow>,
}

/// The reaction envelope of one support: one entry per restrained component.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct SupportEnvelope {
    pub node: String,
    pub components: Vec<ComponentEnvelope>,
}

/// Reaction component names, in the order of `[Rx, Ry, Mz]`.
pub const COMPONENTS: [&str; 3] = ["Rx", "Ry", "Mz"];

/// The largest |value| of `values` in one case, or 0.
fn largest(values: impl Iterator<Item = f64>) -> f64 {
    values
        .filter(|v| v.is_finite())
        .fold(0.0, |a, v| a.max(v.abs()))
}

/// The largest |design end shear| of a member in one case, N.
fn largest_shear(m: &MemberCheck) -> f64 {
    largest(m.end_actions.iter().map(|e| e.shear))
}

/// Every member's axial envelope before any case, in member order (named by `case`).
pub(super) fn axial_start(case: &CaseCheck) -> Vec<AxialEnvelope> {
    case.members
        .iter()
        .map(|m| AxialEnvelope {
            member: m.member.clone(),
            role: m.role.to_string(),
            tension: None,
            compression: None,
        })
        .collect()
}

/// Fold one stable case into every member's axial envelope.
pub(super) fn axial_case(out: &mut [AxialEnvelope], case: &CaseCheck) {
    let tiny = ROUND_OFF
        * largest(
            case.members
                .iter()
                .flat_map(|m| [m.design_axial.0, m.design_axial.1]),
        );
    for (env, m) in out.iter_mut().zip(&case.members) {
        let row = |axial: f64| AxialRow {
            axial,
            case: case.id.clone(),
            expression: case.expression.clone(),
            moment_i: m.ends[0].design,
            moment_j: m.ends[1].design,
            moment_span: m.span.design,
            shear: largest_shear(m),
        };
        let (least, greatest) = m.design_axial;
        if least < -tiny {
            keep(&mut env.compression, row(least), |a, b| a.axial < b.axial);
        }
        if greatest > tiny {
            keep(&mut env.tension, row(greatest), |a, b| a.axial > b.axial);
        }
    }
}

/// Fold one stable case into the largest |design shear| at each end of every member
/// (`slots`: end i and end j per member; an end with no shear in any case has none).
pub(super) fn shear_case(slots: &mut [[Option<ShearRow>; 2]], case: &CaseCheck) {
    let tiny = ROUND_OFF * largest(case.members.iter().map(largest_shear));
    for (slot, m) in slots.iter_mut().zip(&case.members) {
        for (end, location) in [Location::EndI, Location::EndJ].into_iter().enumerate() {
            let a = m.end_actions[end];
            if a.shear.abs() <= tiny || a.shear.is_nan() {
                continue;
            }
            let row = ShearRow {
                member: m.member.clone(),
                role: m.role.to_string(),
                location,
                shear: a.shear,
                case: case.id.clone(),
                expression: case.expression.clone(),
                moment: m.ends[end].design,
                axial: a.axial,
            };
            keep(&mut slot[end], row, |a, b| a.shear.abs() > b.shear.abs());
        }
    }
}

/// The reaction envelope of every support over the stable cases whose second-order
/// analysis converged (a stable case always has one).
pub fn reaction_envelopes(report: &CheckReport) -> Vec<SupportEnvelope> {
    let mut out: Vec<SupportEnvelope> = report
        .supports
        .iter()
        .map(|s| SupportEnvelope {
            node: s.node.clone(),
            components: (0..3)
                .filter(|&k| s.restrained[k])
                .map(|k| ComponentEnvelope {
                    component: COMPONENTS[k].to_string(),
                    spring: s.spring[k],
                    max: None,
                    min: None,
                })
                .collect(),
        })
        .collect();
    for case in report.cases.iter().filter(|c| c.stable) {
        let Some(reactions) = &case.reactions else {
            continue;
        };
        for (env, r) in out.iter_mut().zip(reactions) {
            for c in &mut env.components {
                let k = component_index(&c.component);
                let row = || ReactionRow {
                    value: r[k],
                    case: case.id.clone(),
                    expression: case.expression.clone(),
                    reaction: *r,
                };
                keep(&mut c.max, row(), |a, b| a.value > b.value);
                keep(&mut c.min, row(), |a, b| a.value < b.value);
            }
        }
    }
    out
}

/// The index of a reaction component name in `[Rx, Ry, Mz]`.
fn component_index(name: &str) -> usize {
    COMPONENTS.iter().position(|c| *c == name).unwrap_or(0)
}
