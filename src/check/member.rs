//! Per-member results of one factored case: moments at both ends and the span extreme,
//! each as no-sway part, sway part, amplifiers and design value, with axial force and
//! shear.
//!
//! Moments are internal bending moments, positive with the member's local −y face in
//! tension (see [`crate::solve::forces`]).

use serde::Serialize;

use super::story::StoryFigures;
use super::{aci, aisc};
use crate::model::{LocalLoad, Model, Role, SecondOrderMethod};
use crate::solve::Solution;
use crate::solve::beam::{SpanExtremes, has_transverse_load, span_extremes};
use crate::solve::mesh::MemberStiffness;
use crate::stories::{Story, member_stories};

/// Which part of the design moment is larger at the governing section.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, strum::Display)]
#[serde(rename_all = "kebab-case")]
#[strum(serialize_all = "kebab-case")]
pub enum Part {
    NoSway,
    Sway,
}

/// One section's moment: parts, first-order total and design value, N·m.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct MomentCheck {
    /// Distance from end i, m.
    pub x: f64,
    pub no_sway: f64,
    pub sway: f64,
    /// no-sway + sway.
    pub first_order: f64,
    /// With second-order effects by the chosen method.
    pub design: f64,
    /// Whether the amplified sway or no-sway part is the larger here.
    pub governs: Part,
}

/// Results of one member under one factored case (SI units).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct MemberCheck {
    pub member: String,
    pub role: crate::model::Role,
    /// Mean first-order axial force, N, tension positive.
    pub axial: f64,
    /// Largest first-order compression along the member (Pr, Pu), N; 0 in tension.
    pub compression: f64,
    /// Largest first-order end shear, N.
    pub shear: f64,
    /// Moments at end i and end j.
    pub ends: [MomentCheck; 2],
    /// The extreme moment within the span.
    pub span: MomentCheck,
    /// Cm (AISC A-8-4 / ACI 6.6.4.5.3), for members in compression.
    pub c_m: Option<f64>,
    /// Critical load used for the non-sway amplifier: Pe1 (AISC A-8-5) or Pc
    /// (ACI 6.6.4.4.2), N.
    pub p_critical: Option<f64>,
    /// Non-sway amplifier: B1 (AISC) or δ (ACI); 1 where none applies.
    pub non_sway_amplifier: Option<f64>,
    /// Sway amplifier of the member's story: B2, δs, 1/(1 − 1/α_cr) or Δ2nd/Δ1st.
    pub sway_amplifier: Option<f64>,
    pub governs: Part,
    pub stable: bool,
    pub notes: Vec<String>,
}

/// What [`members`] needs.
pub struct MemberInput<'a> {
    pub model: &'a Model,
    pub stories: &'a [Story],
    pub stiffness: &'a [MemberStiffness],
    pub no_sway: &'a Solution,
    pub sway: &'a Solution,
    /// Member loads of the case, local axes, per member.
    pub loads: &'a [Vec<LocalLoad>],
    pub figures: &'a [StoryFigures],
    /// The direct second-order solution (scaled back to the case's loads) and its span
    /// extremes, when it converged.
    pub direct: Option<&'a super::DirectSolution>,
    pub alpha: f64,
}

/// Internal moments at the two ends of member `m` in `s`.
fn end_moments(s: &Solution, m: usize) -> [f64; 2] {
    let e = &s.end_forces[m];
    [-e.i[2], e.j[2]]
}

/// The span moment to report `(x, M)`: the larger-magnitude extreme lying inside the span
/// (a beam's sagging moment between hogging ends), else the larger-magnitude extreme at an
/// end (a member without loads along it).
fn span_moment(e: &SpanExtremes, l: f64) -> (f64, f64) {
    let inside = |p: &(f64, f64)| p.0 > 1e-9 * l && p.0 < l * (1.0 - 1e-9);
    let larger = |a: (f64, f64), b: (f64, f64)| if a.1.abs() >= b.1.abs() { a } else { b };
    match (inside(&e.max), inside(&e.min)) {
        (true, true) => larger(e.max, e.min),
        (true, false) => e.max,
        (false, true) => e.min,
        (false, false) => larger(e.max, e.min),
    }
}

/// Cm = 0.6 − 0.4·(M1/M2) for a member without transverse load between its ends, with
/// M1/M2 positive in reverse curvature (AISC 360-16 A-8-4; the same form as ACI 318-19
/// 6.6.4.5.3(a), whose ratio is negative in single curvature). With internal moments of
/// one sign convention, single curvature means equal signs at the two ends, so
/// `M1/M2 = −(small/large)` here.
pub fn c_m(ends: [f64; 2]) -> f64 {
    let (a, b) = if ends[0].abs() <= ends[1].abs() {
        (ends[0], ends[1])
    } else {
        (ends[1], ends[0])
    };
    if b == 0.0 {
        return 1.0;
    }
    0.6 - 0.4 * (-a / b)
}

/// Check every member.
pub fn members(input: &MemberInput) -> Vec<MemberCheck> {
    (0..input.model.members.len())
        .map(|m| member(input, m))
        .collect()
}

fn member(input: &MemberInput, m: usize) -> MemberCheck {
    let model = input.model;
    let mem = &model.members[m];
    let l = model.length(m);
    let loads = &input.loads[m];
    let ns = end_moments(input.no_sway, m);
    let sw = end_moments(input.sway, m);
    let ns_end = &input.no_sway.end_forces[m];
    let sw_end = &input.sway.end_forces[m];
    let n_i = -(ns_end.i[0] + sw_end.i[0]);
    let n_j = ns_end.j[0] + sw_end.j[0];
    let compression = (-n_i).max(-n_j).max(0.0);
    let shear = (ns_end.i[1] + sw_end.i[1])
        .abs()
        .max((ns_end.j[1] + sw_end.j[1]).abs());
    let (xs, ms_ns) = span_moment(&span_extremes(l, ns_end, loads), l);
    let ms_sw = sw[0] + (sw[1] - sw[0]) * xs / l;

    let mut notes = Vec::new();
    let mut stable = true;
    // Sway amplifier: the largest of the stories the member belongs to.
    let in_stories = member_stories(model, input.stories, m);
    let sway_amp = if in_stories.is_empty() {
        Some(1.0)
    } else {
        in_stories
            .iter()
            .map(|&k| input.figures[k].sway_amplifier)
            .try_fold(1.0f64, |acc, a| a.map(|a| acc.max(a)))
    };
    if sway_amp.is_none() {
        stable = false;
        notes.push("its story is unstable under this case".into());
    }
    let amp_s = sway_amp.unwrap_or(f64::NAN);
    let cm = if has_transverse_load(loads) {
        1.0
    } else {
        c_m(ns)
    };
    let method = model.analysis.method;

    // Non-sway amplifier by method.
    let (p_critical, amp_ns) = match method {
        SecondOrderMethod::AiscB1B2 if compression > 0.0 => {
            // A-8-5 with K1 = 1.0 and EI* the stiffness used in the analysis.
            let pe1 = aisc::p_e1(input.stiffness[m].ei, l);
            let b1 = aisc::b1(cm, input.alpha, compression, pe1);
            if b1.is_none() {
                stable = false;
                notes.push(
                    "α·Pr ≥ Pe1: the member buckles in the plane of bending (AISC 360-16 A-8-3)"
                        .into(),
                );
            }
            (Some(pe1), b1)
        }
        // ACI 318-19 §6.6.4 magnifies the moments of columns (compression members), not of
        // beams that carry some axial force from frame action.
        SecondOrderMethod::AciMagnifier if compression > 0.0 && mem.role != Role::Beam => {
            // 6.6.4.4.4(a) with the gross section and k = 1.0 (6.6.4.4.3 permits 1.0 for
            // non-sway members, from memory).
            let section = &model.sections[mem.section];
            let e = model.materials[mem.material].e;
            let pc = aci::p_c(
                aci::ei_eff(e, section.inertia, model.analysis.beta_dns),
                1.0,
                l,
            );
            let delta = aci::delta_ns(cm, compression, pc);
            if delta.is_none() {
                stable = false;
                notes.push("Pu ≥ 0.75·Pc: the member is unstable (ACI 318-19 6.6.4.5.2)".into());
            }
            (Some(pc), delta)
        }
        _ => (None, Some(1.0)),
    };
    let b1 = amp_ns.unwrap_or(f64::NAN);
    // The factor on the no-sway part at a section: B1 (AISC) or 1 (ACI ends, where δ acts
    // on the column's Mc instead; EN 1993-1-1; the direct analysis).
    let amp_n = match method {
        SecondOrderMethod::AiscB1B2 | SecondOrderMethod::Ec3AlphaCr => b1,
        SecondOrderMethod::AciMagnifier | SecondOrderMethod::Direct => 1.0,
    };
    let section = |x: f64, n: f64, s: f64, design: f64| MomentCheck {
        x,
        no_sway: n,
        sway: s,
        first_order: n + s,
        design,
        governs: if (amp_s * s).abs() > (amp_n * n).abs() {
            Part::Sway
        } else {
            Part::NoSway
        },
    };
    let (ends, span) = match (method, input.direct) {
        (SecondOrderMethod::Direct, Some((d, spans))) => {
            let dm = end_moments(d, m);
            let (xd, md) = span_moment(&spans[m], l);
            let ns_x = crate::solve::beam::internal_forces(xd, ns_end, loads).m;
            let sw_x = sw[0] + (sw[1] - sw[0]) * xd / l;
            (
                [
                    section(0.0, ns[0], sw[0], dm[0]),
                    section(l, ns[1], sw[1], dm[1]),
                ],
                section(xd, ns_x, sw_x, md),
            )
        }
        (SecondOrderMethod::Direct, None) => {
            stable = false;
            notes.push("direct second-order analysis did not converge".into());
            (
                [
                    section(0.0, ns[0], sw[0], f64::NAN),
                    section(l, ns[1], sw[1], f64::NAN),
                ],
                section(xs, ms_ns, ms_sw, f64::NAN),
            )
        }
        (SecondOrderMethod::AciMagnifier, _) => {
            let ends = [
                section(0.0, ns[0], sw[0], ns[0] + amp_s * sw[0]),
                section(l, ns[1], sw[1], ns[1] + amp_s * sw[1]),
            ];
            let span = if compression > 0.0 && mem.role != Role::Beam {
                // Mc = δ·M2 (6.6.4.5.1), M2 the larger magnified end moment and at least
                // M2,min (6.6.4.5.4) where the section depth is known.
                let k = if ends[0].design.abs() >= ends[1].design.abs() {
                    0
                } else {
                    1
                };
                let mut m2 = ends[k].design;
                if let Some(h) = model.sections[mem.section].depth {
                    let min = aci::m2_min(compression, h);
                    if m2.abs() < min {
                        notes.push("M2 raised to M2,min (ACI 318-19 6.6.4.5.4)".into());
                        m2 = min.copysign(if m2 == 0.0 { 1.0 } else { m2 });
                    }
                }
                section(ends[k].x, ends[k].no_sway, ends[k].sway, b1 * m2)
            } else {
                section(xs, ms_ns, ms_sw, ms_ns + amp_s * ms_sw)
            };
            for e in &ends {
                if e.design.abs()
                    > aci::SECOND_ORDER_LIMIT * e.first_order.abs() + 1e-9 * e.design.abs().max(1.0)
                {
                    notes.push(format!(
                        "second-order end moment is {:.2} × first-order, above the 1.4 limit \
                         (ACI 318-19 6.2.5.3)",
                        e.design.abs() / e.first_order.abs()
                    ));
                    break;
                }
            }
            (ends, span)
        }
        _ => (
            [
                section(0.0, ns[0], sw[0], b1 * ns[0] + amp_s * sw[0]),
                section(l, ns[1], sw[1], b1 * ns[1] + amp_s * sw[1]),
            ],
            section(xs, ms_ns, ms_sw, b1 * ms_ns + amp_s * ms_sw),
        ),
    };
    if method == SecondOrderMethod::Ec3AlphaCr && compression > 0.0 {
        notes.push("member imperfections and P-δ are left to the member buckling checks (EN 1993-1-1 5.2.2(3)c, 6.3)".into());
    }
    // The part that governs at the section with the largest design moment.
    let governs = [ends[0], ends[1], span]
        .into_iter()
        .max_by(|a, b| a.design.abs().total_cmp(&b.design.abs()))
        .map_or(Part::NoSway, |g| g.governs);
    MemberCheck {
        member: mem.id.clone(),
        role: mem.role,
        axial: 0.5 * (n_i + n_j),
        compression,
        shear,
        ends,
        span,
        c_m: (compression > 0.0).then_some(cm),
        p_critical,
        non_sway_amplifier: amp_ns,
        sway_amplifier: sway_amp,
        governs,
        stable,
        notes,
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    #[test]
    fn cm_follows_curvature() {
        // AISC 360-16 A-8-4 [M]: equal end moments in single curvature → 1.0;
        // equal and opposite (reverse curvature) → 0.2; one end zero → 0.6.
        assert_relative_eq!(c_m([100.0, 100.0]), 1.0);
        assert_relative_eq!(c_m([100.0, -100.0]), 0.2);
        assert_relative_eq!(c_m([0.0, 50.0]), 0.6);
    }
}
