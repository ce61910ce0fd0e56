//! The envelope over factored cases: what governs design, member by member and story by
//! story.
//!
//! For each member: the largest positive and the largest negative design moment at each
//! end and in the span, each with its case and what acts with it (N, Pr, V, the no-sway
//! and sway parts); for columns, the largest compression and tension with their
//! concurrent moments. For each story: the largest drift ratio and amplifiers and the
//! smallest α_cr, each with its case. Then the cases that never govern and the largest
//! equilibrium residual.
//!
//! Unstable cases give no design values and take no part; they are listed by id.
//! Everything here is in SI units (N, m, N·m), signs as in [`MomentCheck`].

use serde::{Deserialize, Serialize};

mod extreme;
mod handoff;
pub use extreme::Location;
use extreme::keep;
pub use handoff::{
    AxialEnvelope, AxialRow, COMPONENTS, ComponentEnvelope, ReactionRow, ShearRow, SupportEnvelope,
    reaction_envelopes,
};

use crate::check::{CaseCheck, CheckReport, MemberCheck, MomentCheck};
use crate::model::Role;

/// The sign of an enveloped moment.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize, strum::Display)]
#[serde(rename_all = "kebab-case")]
#[strum(serialize_all = "kebab-case")]
pub enum Sign {
    /// The largest positive design moment (local −y face in tension).
    Positive,
    /// The largest negative design moment (local +y face in tension).
    Negative,
}

/// One design moment of the envelope and what acts with it in its case.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct DesignMoment {
    /// Design moment with second-order effects, N·m.
    pub moment: f64,
    /// Distance from end i, m.
    pub x: f64,
    /// Id and expression of the factored case that produced it.
    pub case: String,
    pub expression: String,
    /// The parts at the same section, N·m: no-sway and sway (first order), and their sum.
    pub no_sway: f64,
    pub sway: f64,
    pub first_order: f64,
    /// `no-sway` or `sway`: the larger amplified part here.
    pub governs: String,
    /// Concurrent first-order axial force at the most compressed section, N, tension
    /// positive.
    pub axial: f64,
    /// Concurrent required axial compressive strength, N, 0 in tension: Pr = Pnt + B2·Plt
    /// (AISC 360-16 A-8-2) with the AISC method, else the largest first-order compression
    /// (Pu of ACI 318, N_Ed of EN 1993-1-1).
    pub p_r: f64,
    /// Concurrent largest end shear, N.
    pub shear: f64,
    /// Amplifiers applied in that case (B1 or δ; B2, δs, 1/(1 − 1/α_cr) or Δ2nd/Δ1st).
    pub non_sway_amplifier: Option<f64>,
    pub sway_amplifier: Option<f64>,
}

/// The envelope at one section of a member: largest positive and largest negative.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct SectionEnvelope {
    pub location: Location,
    pub positive: Option<DesignMoment>,
    pub negative: Option<DesignMoment>,
}

/// A column's largest compression or tension and the design moments acting with it.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct AxialExtreme {
    /// Axial force, N, tension positive (so a compression is negative).
    pub axial: f64,
    /// Required compressive strength (as [`DesignMoment::p_r`]), N; 0 in tension.
    pub p_r: f64,
    pub case: String,
    pub expression: String,
    /// Concurrent design moments at end i, end j and in the span, N·m.
    pub moment_i: f64,
    pub moment_j: f64,
    pub moment_span: f64,
    /// Concurrent largest end shear, N.
    pub shear: f64,
}

/// Which entry of a member's envelope has the largest magnitude.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Governing {
    pub location: Location,
    pub sign: Sign,
    /// Design moment, N·m.
    pub moment: f64,
    pub case: String,
    /// `no-sway` or `sway`.
    pub governs: String,
}

/// The envelope of one member over the stable cases.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct MemberEnvelope {
    pub member: String,
    /// `column`, `beam` or `brace`.
    pub role: String,
    /// End i, span, end j.
    pub sections: Vec<SectionEnvelope>,
    /// The largest |design moment| of the member.
    pub governing: Option<Governing>,
    /// Columns only: the largest compression and the largest tension.
    pub compression: Option<AxialExtreme>,
    pub tension: Option<AxialExtreme>,
}

/// An extreme story figure and the case behind it.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Peak {
    pub value: f64,
    pub case: String,
}

/// The envelope of one story over the stable cases.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct StoryEnvelope {
    pub story: usize,
    /// Largest first-order drift ratio Δ/h.
    pub drift_ratio: Option<Peak>,
    /// Largest second-order drift ratio Δ2nd/h of the direct analysis (under factored
    /// loads and the analysis stiffness: not a serviceability drift).
    pub drift_ratio_second_order: Option<Peak>,
    /// Largest B2 (AISC 360-16 A-8-6), Q (ACI 318-19 6.6.4.4.1), δs by the Q method
    /// (ACI 318-19 6.6.4.6.2(a)), Δ2nd/Δ1st of the direct analysis, and sway amplifier of
    /// the chosen method.
    pub b2: Option<Peak>,
    pub q_index: Option<Peak>,
    pub delta_s: Option<Peak>,
    pub drift_amplification: Option<Peak>,
    pub sway_amplifier: Option<Peak>,
    /// Smallest story α_cr (EN 1993-1-1 (5.2)).
    pub alpha_cr: Option<Peak>,
    /// Stable cases in which the story is classified as sway.
    pub sway_cases: Vec<String>,
    /// Stable cases whose design moments in this story are the second-order analysis's
    /// (issue 16).
    #[serde(default)]
    pub second_order_cases: Vec<String>,
    /// Stable cases in which the story's first-order drift is negligible, so that no
    /// Δ2nd/Δ1st was formed.
    #[serde(default)]
    pub negligible_drift_cases: usize,
    /// Number of stable cases considered.
    pub cases: usize,
}

/// The largest equilibrium residual over the cases.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ResidualPeak {
    /// Largest nodal out-of-balance force, N.
    pub residual: f64,
    /// Relative to the largest applied load component.
    pub relative: f64,
    pub case: String,
}

/// Everything the summary of `check` reports, over the cases of one run.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Envelope {
    /// Ids of the cases analysed (stable and unstable).
    pub cases: Vec<String>,
    /// Ids of the unstable cases (no design values; they take no part).
    pub unstable: Vec<String>,
    pub stories: Vec<StoryEnvelope>,
    pub members: Vec<MemberEnvelope>,
    /// Members whose own buckling (a member mode below the frame's lowest sway mode) the
    /// buckling analysis found, each with its smallest factor over the cases (issue 16): it
    /// belongs to the member check, not to the frame's α_cr.
    #[serde(default)]
    pub member_modes: Vec<MemberModePeak>,
    /// Stable cases that give no member envelope value, no column axial extreme and no
    /// story's largest sway amplifier or smallest α_cr.
    pub never_govern: Vec<String>,
    pub residual: Option<ResidualPeak>,
    /// Every member's largest design tension and compression (issue 17).
    #[serde(default)]
    pub axial: Vec<AxialEnvelope>,
    /// The largest |design shear| at each member end.
    #[serde(default)]
    pub shear: Vec<ShearRow>,
    /// Per support and restrained component, the largest and smallest design reaction.
    #[serde(default)]
    pub reactions: Vec<SupportEnvelope>,
}

/// The sections of a member in one case at which moments are enveloped: the two ends;
/// the reported span moment unless it lies at an end with that end's value; and the
/// largest and smallest moments of the design diagram where they lie inside the span. An
/// ACI 318-19 column's span value is Mc = δ·M2 (6.6.4.5.1), its design moment along the
/// member: it alone is enveloped in the span, wherever M2 lies (issue 16 item 5).
pub fn sections(m: &MemberCheck) -> Vec<(Location, &MomentCheck)> {
    let mut out = vec![(Location::EndI, &m.ends[0]), (Location::EndJ, &m.ends[1])];
    if m.span_is_mc {
        out.push((Location::Span, &m.span));
        out.retain(|(_, s)| s.design.is_finite());
        return out;
    }
    let l = m.ends[1].x;
    let at = |s: &MomentCheck, e: &MomentCheck| (s.x - e.x).abs() <= 1e-9 * l.max(1e-9);
    let repeats = |s: &MomentCheck, e: &MomentCheck| {
        at(s, e) && (s.design - e.design).abs() <= 1e-9 * s.design.abs().max(1e-9)
    };
    if !repeats(&m.span, &m.ends[0]) && !repeats(&m.span, &m.ends[1]) {
        out.push((Location::Span, &m.span));
    }
    for s in [&m.span_max, &m.span_min] {
        if !at(s, &m.ends[0]) && !at(s, &m.ends[1]) {
            out.push((Location::Span, s));
        }
    }
    out.retain(|(_, s)| s.design.is_finite());
    out
}

/// The design moment at `s` of member `m` in `case`, with what acts with it.
fn design_moment(case: &CaseCheck, m: &MemberCheck, s: &MomentCheck) -> DesignMoment {
    DesignMoment {
        moment: s.design,
        x: s.x,
        case: case.id.clone(),
        expression: case.expression.clone(),
        no_sway: s.no_sway,
        sway: s.sway,
        first_order: s.first_order,
        governs: s.governs.to_string(),
        axial: m.axial,
        p_r: m.p_r.unwrap_or(m.compression),
        shear: m.shear,
        non_sway_amplifier: m.non_sway_amplifier,
        sway_amplifier: m.sway_amplifier,
    }
}

/// The envelopes that read every member's results, folded one case at a time: the
/// design moments and column axial extremes of [`MemberEnvelope`], every member's design
/// axial force ([`AxialEnvelope`]) and end shears ([`ShearRow`]). Cases are added in the
/// run's order (ties keep the first case), so that a run can fold each case as it is
/// checked and drop its member results ([`crate::check::check_streamed`]); [`envelope`]
/// folds a whole report.
#[derive(Debug, Clone, Default)]
pub struct MemberFold {
    /// Per member, once the first case has named them (members in no stable case keep
    /// empty sections).
    members: Vec<MemberEnvelope>,
    axial: Vec<AxialEnvelope>,
    shear: Vec<[Option<ShearRow>; 2]>,
    started: bool,
}

impl MemberFold {
    /// Fold the next case of the run (stable or not: the first one names the members;
    /// only stable cases give values).
    pub fn add(&mut self, case: &CaseCheck) {
        if !self.started {
            self.started = true;
            self.members = case.members.iter().map(empty_member_envelope).collect();
            self.axial = handoff::axial_start(case);
            self.shear = vec![[None, None]; case.members.len()];
        }
        if !case.stable {
            return;
        }
        let tiny = ROUND_OFF * largest_moment(case);
        for (env, m) in self.members.iter_mut().zip(&case.members) {
            member_case(env, case, m, tiny);
        }
        handoff::axial_case(&mut self.axial, case);
        handoff::shear_case(&mut self.shear, case);
    }

    /// The member envelopes (each with its governing entry), the axial envelopes and the
    /// end-shear rows (two per member, end i then end j, where an end has a shear).
    pub fn finish(self) -> (Vec<MemberEnvelope>, Vec<AxialEnvelope>, Vec<ShearRow>) {
        let mut members = self.members;
        for env in &mut members {
            env.governing = governing_entry(env);
        }
        let shear = self.shear.into_iter().flatten().flatten().collect();
        (members, self.axial, shear)
    }
}

/// A member's envelope before any case: three empty sections.
fn empty_member_envelope(m: &MemberCheck) -> MemberEnvelope {
    MemberEnvelope {
        member: m.member.clone(),
        role: m.role.to_string(),
        sections: [Location::EndI, Location::Span, Location::EndJ]
            .into_iter()
            .map(|location| SectionEnvelope {
                location,
                positive: None,
                negative: None,
            })
            .collect(),
        governing: None,
        compression: None,
        tension: None,
    }
}

/// Moments smaller than this fraction of a case's largest are round-off (a hinge, a free
/// end) and have no sign to envelope.
const ROUND_OFF: f64 = 1e-9;

/// The largest |design moment| of any member in `case`.
fn largest_moment(case: &CaseCheck) -> f64 {
    case.members
        .iter()
        .flat_map(|m| [m.ends[0].design, m.ends[1].design, m.span.design])
        .filter(|v| v.is_finite())
        .fold(0.0, |a, v| a.max(v.abs()))
}

/// Fold one stable case into one member's envelope; moments within `tiny` of zero count
/// as zero.
fn member_case(env: &mut MemberEnvelope, case: &CaseCheck, m: &MemberCheck, tiny: f64) {
    for (location, s) in sections(m) {
        let slot = env
            .sections
            .iter_mut()
            .find(|e| e.location == location)
            .expect("three sections");
        let d = design_moment(case, m, s);
        if s.design > tiny {
            keep(&mut slot.positive, d, |a, b| a.moment > b.moment);
        } else if s.design < -tiny {
            keep(&mut slot.negative, d, |a, b| a.moment < b.moment);
        }
    }
    if m.role != Role::Column {
        return;
    }
    let extreme = AxialExtreme {
        axial: m.axial,
        p_r: m.p_r.unwrap_or(m.compression),
        case: case.id.clone(),
        expression: case.expression.clone(),
        moment_i: m.ends[0].design,
        moment_j: m.ends[1].design,
        moment_span: m.span.design,
        shear: m.shear,
    };
    if extreme.p_r > 0.0 {
        keep(&mut env.compression, extreme, |a, b| a.p_r > b.p_r);
    } else if m.axial > 0.0 {
        keep(&mut env.tension, extreme, |a, b| a.axial > b.axial);
    }
}

/// The entry of largest magnitude in a member's envelope (the first one on a tie).
fn governing_entry(env: &MemberEnvelope) -> Option<Governing> {
    let mut best: Option<Governing> = None;
    for s in &env.sections {
        for (sign, d) in [(Sign::Positive, &s.positive), (Sign::Negative, &s.negative)] {
            if let Some(d) = d {
                let g = Governing {
                    location: s.location,
                    sign,
                    moment: d.moment,
                    case: d.case.clone(),
                    governs: d.governs.clone(),
                };
                keep(&mut best, g, |a, b| a.moment.abs() > b.moment.abs());
            }
        }
    }
    best
}

/// The envelope of every story over the stable cases.
pub fn story_envelopes(report: &CheckReport) -> Vec<StoryEnvelope> {
    let mut out: Vec<StoryEnvelope> = report
        .stories
        .iter()
        .map(|s| StoryEnvelope {
            story: s.number,
            drift_ratio: None,
            drift_ratio_second_order: None,
            b2: None,
            q_index: None,
            delta_s: None,
            drift_amplification: None,
            sway_amplifier: None,
            alpha_cr: None,
            sway_cases: Vec::new(),
            second_order_cases: Vec::new(),
            negligible_drift_cases: 0,
            cases: 0,
        })
        .collect();
    let larger = |a: &Peak, b: &Peak| a.value > b.value;
    for case in report.cases.iter().filter(|c| c.stable) {
        for (env, f) in out.iter_mut().zip(&case.stories) {
            let peak = |v: f64| Peak {
                value: v,
                case: case.id.clone(),
            };
            env.cases += 1;
            if f.drift_ratio.is_finite() {
                keep(&mut env.drift_ratio, peak(f.drift_ratio.abs()), larger);
            }
            if let Some(d) = f.drift_second_order
                && d.is_finite()
                && f.height > 0.0
            {
                let ratio = (d / f.height).abs();
                keep(&mut env.drift_ratio_second_order, peak(ratio), larger);
            }
            for (slot, v) in [
                (&mut env.b2, f.b2),
                (&mut env.q_index, Some(f.q_index)),
                (&mut env.delta_s, f.delta_s_q),
                (&mut env.drift_amplification, f.drift_amplification),
                (&mut env.sway_amplifier, f.sway_amplifier),
            ] {
                if let Some(v) = v.filter(|v| v.is_finite()) {
                    keep(slot, peak(v), larger);
                }
            }
            if f.alpha_cr_story.is_finite() {
                keep(&mut env.alpha_cr, peak(f.alpha_cr_story), |a, b| {
                    a.value < b.value
                });
            }
            if f.classification == crate::check::Classification::Sway {
                env.sway_cases.push(case.id.clone());
            }
            if f.route == crate::check::story::SwayRoute::SecondOrderAnalysis {
                env.second_order_cases.push(case.id.clone());
            }
            if f.drift_negligible {
                env.negligible_drift_cases += 1;
            }
        }
    }
    out
}

/// The case with the largest equilibrium residual.
pub fn largest_residual(report: &CheckReport) -> Option<ResidualPeak> {
    let mut best = None;
    for c in &report.cases {
        let r = ResidualPeak {
            residual: c.residual,
            relative: c.residual_relative,
            case: c.id.clone(),
        };
        keep(&mut best, r, |a, b| a.relative > b.relative);
    }
    best
}

/// Stable cases behind no member envelope value, no column axial extreme, no story's
/// largest sway amplifier or smallest α_cr, and no axial, shear or reaction extreme.
fn never_governing(
    report: &CheckReport,
    members: &[MemberEnvelope],
    stories: &[StoryEnvelope],
    axial: &[AxialEnvelope],
    shear: &[ShearRow],
    reactions: &[SupportEnvelope],
) -> Vec<String> {
    let mut used: std::collections::BTreeSet<&str> = std::collections::BTreeSet::new();
    for m in members {
        for s in &m.sections {
            for d in [&s.positive, &s.negative].into_iter().flatten() {
                used.insert(&d.case);
            }
        }
        for a in [&m.compression, &m.tension].into_iter().flatten() {
            used.insert(&a.case);
        }
    }
    for s in stories {
        for p in [&s.sway_amplifier, &s.alpha_cr].into_iter().flatten() {
            used.insert(&p.case);
        }
    }
    // The hand-off envelopes (issue 17): axial extremes, end shears, reactions.
    for r in axial
        .iter()
        .flat_map(|a| [&a.tension, &a.compression])
        .flatten()
    {
        used.insert(&r.case);
    }
    used.extend(shear.iter().map(|r| r.case.as_str()));
    let reaction_rows = reactions
        .iter()
        .flat_map(|s| &s.components)
        .flat_map(|c| [&c.max, &c.min])
        .flatten();
    used.extend(reaction_rows.map(|r| r.case.as_str()));
    report
        .cases
        .iter()
        .filter(|c| c.stable && !used.contains(c.id.as_str()))
        .map(|c| c.id.clone())
        .collect()
}

/// The whole envelope of `report` (which holds every case's member results).
pub fn envelope(report: &CheckReport) -> Envelope {
    debug_assert!(
        report.cases.iter().all(|c| !c.members.is_empty()),
        "a report whose member results were dropped is enveloped by its run's MemberFold"
    );
    let mut fold = MemberFold::default();
    for case in &report.cases {
        fold.add(case);
    }
    envelope_with(report, fold)
}

/// The whole envelope of `report`, with the member envelopes of `fold`, into which every
/// case of `report` was added in order (its cases may have dropped their member results
/// since: nothing else here reads them).
pub fn envelope_with(report: &CheckReport, fold: MemberFold) -> Envelope {
    let (members, axial, shear) = fold.finish();
    let stories = story_envelopes(report);
    let reactions = reaction_envelopes(report);
    let never_govern = never_governing(report, &members, &stories, &axial, &shear, &reactions);
    Envelope {
        cases: report.cases.iter().map(|c| c.id.clone()).collect(),
        unstable: report
            .cases
            .iter()
            .filter(|c| !c.stable)
            .map(|c| c.id.clone())
            .collect(),
        never_govern,
        residual: largest_residual(report),
        member_modes: member_modes(report),
        stories,
        members,
        axial,
        shear,
        reactions,
    }
}

/// The smallest member-mode factor of one member over the cases.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct MemberModePeak {
    pub member: String,
    /// Critical load factor of the member's own buckling mode.
    pub alpha: f64,
    pub case: String,
}

/// Every member with a member mode in some case, with its smallest factor, lowest first.
fn member_modes(report: &CheckReport) -> Vec<MemberModePeak> {
    let mut out: Vec<MemberModePeak> = Vec::new();
    for c in &report.cases {
        let Some(m) = &c.member_mode else { continue };
        match out.iter_mut().find(|p| p.member == m.member) {
            Some(p) if m.alpha < p.alpha => {
                p.alpha = m.alpha;
                p.case = c.id.clone();
            }
            Some(_) => {}
            None => out.push(MemberModePeak {
                member: m.member.clone(),
                alpha: m.alpha,
                case: c.id.clone(),
            }),
        }
    }
    out.sort_by(|a, b| a.alpha.total_cmp(&b.alpha));
    out
}

/// The governing design moment of one member (the `governing[]` list of the JSON report).
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
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
    /// `no-sway` or `sway`: whether the amplified sway or no-sway part is the larger there.
    pub governs: String,
    /// Axial force of the member in that case, N, tension positive.
    pub axial: f64,
}

/// The largest design moment of every member over the stable cases, from its envelope
/// (members in no stable case are left out).
pub fn governing(members: &[MemberEnvelope]) -> Vec<GoverningMoment> {
    members
        .iter()
        .filter_map(|m| {
            let g = m.governing.as_ref()?;
            let s = m.sections.iter().find(|s| s.location == g.location)?;
            let d = match g.sign {
                Sign::Positive => s.positive.as_ref(),
                Sign::Negative => s.negative.as_ref(),
            }?;
            Some(GoverningMoment {
                member: m.member.clone(),
                moment: d.moment,
                location: g.location,
                x: d.x,
                case: d.case.clone(),
                first_order: d.first_order,
                governs: d.governs.clone(),
                axial: d.axial,
            })
        })
        .collect()
}
