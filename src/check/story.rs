//! Story figures of one factored case: ΣP, story shear, drift, the story's lateral
//! stiffness and what each method makes of it (B2, Q and δs, α_cr), and the verdict
//! sway / non-sway.
//!
//! All three approximate methods rest on the same story stiffness `H/Δ` of a first-order
//! sway solution (AISC A-8-7 writes it `H/ΔH`, ACI 6.6.4.4.1 `Vus/Δo`, EN 1993-1-1 (5.2)
//! `H_Ed/δ_H,Ed`), so it is computed once here, by [`story_stiffness`].
//!
//! The stiffness is a property of the frame, not of the case's load pattern: AISC 360-16
//! Appendix 8 lets H and ΔH come from any lateral load (from memory). A case's own net
//! level forces are used only where they push every story the same way; otherwise (a
//! gravity-only case whose holding forces change sign up the height, a story with almost
//! no net shear) the stiffness comes from a same-signed reference pattern: forces
//! proportional to each level's gravity load Yi (as notional loads are distributed), or,
//! failing that, equal forces at every level. Each pattern's story drifts come from one
//! solve on the free frame's factorization of [`SwaySplit`] ([`StoryFlexibility`]): no
//! stories × levels table is kept, so memory stays linear in the stories (issue 21).

use serde::Serialize;

use super::{aci, aisc, ec3};
use crate::model::{Model, Restraint, SecondOrderMethod};
use crate::solve::Solution;
use crate::solve::sway::{SwaySplit, mean_x};
use crate::stories::Story;

/// Verdict for one story.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, strum::Display)]
#[serde(rename_all = "kebab-case")]
#[strum(serialize_all = "kebab-case")]
pub enum Classification {
    /// Second-order sway effects are small by the method's criterion.
    NonSway,
    /// Sway effects must be amplified.
    Sway,
    /// The story exceeds its critical load under this case.
    Unstable,
}

/// Where the design moments of a story's members come from under one case.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, strum::Display)]
#[serde(rename_all = "kebab-case")]
#[strum(serialize_all = "kebab-case")]
pub enum SwayRoute {
    /// First-order moments, sway part × 1 (the method's criterion permits first-order
    /// analysis, or the case has no significant sway).
    FirstOrder,
    /// First-order no-sway part plus the sway part × `sway_amplifier` (B2, δs or
    /// 1/(1 − 1/α_cr)).
    Amplified,
    /// The moments of the case's direct second-order analysis: the method requires a
    /// second-order analysis here, or its amplifier is outside the conditions of its clause.
    SecondOrderAnalysis,
    /// No design moments: the story is unstable under the case.
    None,
}

/// A first-order story drift below this fraction of the story height is negligible: no
/// ratio is formed from it and it decides no verdict. A millionth of the height (0.004 mm
/// on a 4 m story) is far below any erection tolerance (1/500 out-of-plumb is 2 000 times
/// larger) and far above round-off (common practice, no source).
pub const DRIFT_NEGLIGIBLE_RATIO: f64 = 1e-6;

/// A story's first-order drift ratio below this share of the case's largest story drift
/// ratio is negligible too: the story hardly moves, and its own Δ2nd/Δ1st measures the
/// sway of the stories around it rather than its own (common practice, no source).
pub const DRIFT_NEGLIGIBLE_SHARE: f64 = 0.05;

/// Whether a first-order drift `drift` of a story of height `h` is significant, with
/// `largest` the case's largest |drift/h| over its stories ([`DRIFT_NEGLIGIBLE_RATIO`],
/// [`DRIFT_NEGLIGIBLE_SHARE`]).
pub fn drift_is_significant(drift: f64, h: f64, largest: f64) -> bool {
    let ratio = (drift / h).abs();
    ratio.is_finite()
        && ratio >= DRIFT_NEGLIGIBLE_RATIO
        && ratio >= DRIFT_NEGLIGIBLE_SHARE * largest
}

/// The case's largest first-order story drift ratio |Δ/h| (finite values only), the scale
/// of [`drift_is_significant`].
pub fn largest_drift_ratio(figures: &[StoryFigures]) -> f64 {
    figures
        .iter()
        .map(|f| (f.drift_first_order / f.height).abs())
        .filter(|r| r.is_finite())
        .fold(0.0, f64::max)
}

/// The lateral load pattern a story's stiffness H/Δ came from.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, strum::Display)]
#[serde(rename_all = "kebab-case")]
#[strum(serialize_all = "kebab-case")]
pub enum StiffnessSource {
    /// The case's own net level forces (reversed holding forces plus notional loads), which
    /// push every story the same way.
    CaseSway,
    /// Level forces proportional to the case's level gravity loads Yi.
    GravityPattern,
    /// Equal forces at every level.
    UniformPattern,
    /// The story's top level is held by a support: it does not sway.
    Support,
}

impl StiffnessSource {
    /// Plain words for the report.
    pub fn describe(self) -> &'static str {
        match self {
            StiffnessSource::CaseSway => "the case's own lateral forces",
            StiffnessSource::GravityPattern => "level forces ∝ level gravity loads Yi",
            StiffnessSource::UniformPattern => "equal forces at every level",
            StiffnessSource::Support => "top level held by a support",
        }
    }
}

/// Why no story stiffness could be found.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum StoryStiffnessError {
    #[error(
        "story {story}: no same-signed lateral load pattern gives a shear and a drift of the \
         same sign (shear {shear:.6e} N, drift {drift:.6e} m under equal level forces), so its \
         lateral stiffness H/Δ is not defined; check the story's columns and bracing"
    )]
    NoValidPattern {
        story: usize,
        shear: f64,
        drift: f64,
    },
}

/// A story's lateral stiffness and the pattern it came from.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct StoryStiffness {
    /// H/Δ, N/m (infinite for a story held by a support).
    pub stiffness: f64,
    pub source: StiffnessSource,
    /// Story shear H of that pattern, N (same sign as `drift`).
    pub shear: f64,
    /// First-order interstory drift ΔH of that pattern, m.
    pub drift: f64,
}

/// A pattern is used for a story only where the story carries at least this fraction of
/// the share an evenly spread pattern would give it (story k of n, counted from the
/// bottom from 0, carries (n − k)/n of an even pattern), so that the drift is the story's
/// own response and not the rotation left by loads below (common practice, no source).
/// Scaling by the even share keeps the top stories of tall frames valid under the
/// gravity and uniform patterns, where each carries only 1/n of the total.
pub const PATTERN_MIN_SHEAR_SHARE: f64 = 0.01;

/// Story drifts of the free first-order frame under lateral forces at the levels: one
/// solve on the split's factorization per pattern (a case asks for a few patterns), so
/// nothing of size stories × levels is kept.
#[derive(Debug, Clone)]
pub struct StoryFlexibility<'a> {
    stories: &'a [Story],
    split: &'a SwaySplit,
    /// Stories whose top level a support holds in X.
    held: Vec<bool>,
}

impl<'a> StoryFlexibility<'a> {
    /// For the stories of `split`'s frame.
    pub fn new(stories: &'a [Story], split: &'a SwaySplit) -> StoryFlexibility<'a> {
        let held = split.level_nodes.iter().map(Vec::is_empty).collect();
        StoryFlexibility {
            stories,
            split,
            held,
        }
    }

    /// Story shears `Σ_{l≥k} F_l` and drifts under level forces `f` (N): `(shear, drift)`.
    pub fn response(&self, f: &[f64]) -> Vec<(f64, f64)> {
        let u = self.split.level_force_displacements(f);
        self.stories
            .iter()
            .enumerate()
            .map(|(k, st)| (f[k..].iter().sum(), drift_of(st, &u)))
            .collect()
    }
}

/// `Some(sign)` of a pattern whose level forces all push the same way (zeros allowed,
/// round-off of 1e-9 of the total tolerated); `None` for mixed signs or no force.
pub fn same_signed(f: &[f64]) -> Option<f64> {
    let total: f64 = f.iter().map(|x| x.abs()).sum();
    let net: f64 = f.iter().sum();
    if total <= 0.0 || !total.is_finite() {
        return None;
    }
    let s = net.signum();
    f.iter().all(|&x| s * x >= -1e-9 * total).then_some(s)
}

/// The stiffness of story `k` under a same-signed pattern `f` of sign `s`, if the story's
/// shear is a real share of the pattern and its drift has the shear's sign.
fn under_pattern(
    response: &[(f64, f64)],
    f: &[f64],
    s: f64,
    k: usize,
    h: f64,
    source: StiffnessSource,
) -> Option<StoryStiffness> {
    let total: f64 = f.iter().map(|x| x.abs()).sum();
    let even_share = (response.len() - k) as f64 / response.len() as f64;
    let (shear, drift) = response[k];
    let valid = s * shear >= PATTERN_MIN_SHEAR_SHARE * even_share * total && s * drift > 1e-12 * h;
    let stiffness = shear / drift;
    (valid && stiffness.is_finite()).then_some(StoryStiffness {
        stiffness,
        source,
        shear,
        drift,
    })
}

/// The sign of a same-signed pattern and its story `(shear, drift)`s.
type PatternResponse = (f64, Vec<(f64, f64)>);

/// The lateral stiffness H/Δ of every story.
///
/// `level_forces` are the case's own net lateral forces at the levels, N (reversed holding
/// forces plus notional loads); `y` the level gravity loads Yi. Each story takes the first
/// valid figure of: the case's own forces (only if they push every story the same way),
/// forces ∝ Yi, equal forces. A figure is valid when the story's shear is at least
/// [`PATTERN_MIN_SHEAR_SHARE`] of its even share of the pattern and its drift has the same sign — never a
/// near-zero shear or a shear against the drift.
pub fn story_stiffness(
    stories: &[Story],
    flex: &StoryFlexibility<'_>,
    level_forces: &[f64],
    y: &[f64],
) -> Result<Vec<StoryStiffness>, StoryStiffnessError> {
    let nl = stories.len();
    let uniform = vec![1.0; nl];
    let patterns: Vec<(&[f64], StiffnessSource)> = vec![
        (level_forces, StiffnessSource::CaseSway),
        (y, StiffnessSource::GravityPattern),
        (&uniform, StiffnessSource::UniformPattern),
    ];
    let responses: Vec<Option<PatternResponse>> = patterns
        .iter()
        .map(|(f, _)| same_signed(f).map(|s| (s, flex.response(f))))
        .collect();
    stories
        .iter()
        .enumerate()
        .map(|(k, st)| {
            if flex.held[k] {
                return Ok(StoryStiffness {
                    stiffness: f64::INFINITY,
                    source: StiffnessSource::Support,
                    shear: 0.0,
                    drift: 0.0,
                });
            }
            patterns
                .iter()
                .zip(&responses)
                .find_map(|((f, source), r)| {
                    let (s, response) = r.as_ref()?;
                    under_pattern(response, f, *s, k, st.height(), *source)
                })
                .ok_or_else(|| {
                    let (shear, drift) = flex.response(&uniform)[k];
                    StoryStiffnessError::NoValidPattern {
                        story: st.number,
                        shear,
                        drift,
                    }
                })
        })
        .collect()
}

/// Figures of one story under one factored case (SI units).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct StoryFigures {
    pub story: usize,
    /// Story height h, m.
    pub height: f64,
    /// ΣP: total vertical load carried by the story's columns, N.
    pub sum_p: f64,
    /// Pmf: the part of ΣP in moment-frame columns, N. Leaning columns (no moment at
    /// either end, by a release or a pinned support) are left out ([`takes_moment`]).
    pub p_mf: f64,
    /// Story shear of the first-order sway solution, N.
    pub shear: f64,
    /// First-order interstory drift, m (sway solution; the no-sway part has none).
    pub drift: f64,
    /// Drift / h.
    pub drift_ratio: f64,
    /// Lateral stiffness H/Δ, N/m, from the pattern named by `stiffness_source`.
    pub stiffness: f64,
    pub stiffness_source: StiffnessSource,
    /// Story shear H of that pattern, N.
    pub stiffness_shear: f64,
    /// First-order drift ΔH of that pattern, m (same sign as `stiffness_shear`).
    pub stiffness_drift: f64,
    /// RM, AISC A-8-8.
    pub r_m: f64,
    /// Pe,story, AISC A-8-7, N.
    pub p_e_story: f64,
    /// B2, AISC A-8-6 (None: α·Pstory ≥ Pe,story).
    pub b2: Option<f64>,
    /// Stability index Q, ACI 6.6.4.4.1.
    pub q_index: f64,
    /// δs by the Q method, ACI 6.6.4.6.2(a) (None beyond 1.5).
    pub delta_s_q: Option<f64>,
    /// α_cr of the story, EN 1993-1-1 (5.2).
    pub alpha_cr_story: f64,
    /// First-order interstory drift of the case (no-sway + sway), m: the same as `drift`
    /// (the no-sway part holds every level), kept beside the second-order one.
    pub drift_first_order: f64,
    /// Second-order interstory drift of the direct analysis, m (None if it did not
    /// converge). Under factored loads and the analysis stiffness: not a serviceability
    /// drift.
    pub drift_second_order: Option<f64>,
    /// Δ2nd/Δ1st from the direct second-order analysis; None where the first-order drift
    /// is negligible ([`drift_is_significant`]) or the analysis did not converge.
    pub drift_amplification: Option<f64>,
    /// The first-order drift is negligible: no ratio is formed from it
    /// ([`drift_is_significant`]).
    pub drift_negligible: bool,
    /// Where the design moments of the story's members come from.
    pub route: SwayRoute,
    /// The amplifier applied to this story's sway moments (1 on the first-order route);
    /// None on the second-order route (the analysis's own moments) and when unstable.
    pub sway_amplifier: Option<f64>,
    pub classification: Classification,
    /// The criterion and figure that decided the classification.
    pub criterion: String,
}

/// Gravity figures of one case: ΣP and Pmf per story, and the gravity load entering at
/// each story's top level (Yi of AISC C2-1), N.
#[derive(Debug, Clone, PartialEq)]
pub struct Gravity {
    pub sum_p: Vec<f64>,
    pub p_mf: Vec<f64>,
    pub y: Vec<f64>,
}

/// Vertical compression carried by column `m` in `s` (mean of its ends), N.
fn column_load(model: &Model, s: &Solution, m: usize) -> f64 {
    let (_, sin) = model.cosines(m);
    let e = &s.end_forces[m];
    let n_mean = 0.5 * (-e.i[0] + e.j[0]);
    -n_mean * sin.abs()
}

/// Whether member `m` can take bending moment at its end at `node` (`released`: the
/// member's own release there). It cannot when the end is released, or when nothing else
/// at the node resists rotation: no rotational restraint (fixed or spring) of a support and
/// no other member framing in without a release there. Equilibrium of the node then forces
/// the end moment to zero (closed form: ΣM = 0 at a node with one moment-resisting end).
pub fn takes_moment(model: &Model, m: usize, node: usize, released: bool) -> bool {
    if released {
        return false;
    }
    let support = model
        .supports
        .iter()
        .any(|s| s.node == node && s.dofs[2] != Restraint::Free);
    let other =
        model.members.iter().enumerate().any(|(k, o)| {
            k != m && ((o.i == node && !o.release_i) || (o.j == node && !o.release_j))
        });
    support || other
}

/// A column of the moment frame: it takes moment at one end at least. A leaning column
/// (no moment at either end, whether by releases, pinned supports or beams released onto
/// it) carries gravity load only and is left out of Pmf (AISC 360-16 App. 8 A-8-8 and its
/// commentary, from memory).
pub fn is_moment_frame_column(model: &Model, m: usize) -> bool {
    let mem = &model.members[m];
    takes_moment(model, m, mem.i, mem.release_i) || takes_moment(model, m, mem.j, mem.release_j)
}

/// [`is_moment_frame_column`] of every member at once, in one pass over the members and
/// supports (rather than one per member): a member end takes moment where it is not
/// released and a support restrains the node's rotation or another member end framing in
/// there is not released either.
pub fn moment_frame_members(model: &Model) -> Vec<bool> {
    let mut restrained = vec![false; model.nodes.len()];
    for s in &model.supports {
        if s.dofs[2] != Restraint::Free {
            restrained[s.node] = true;
        }
    }
    // Member ends at each node that are not released.
    let mut fixed_ends = vec![0usize; model.nodes.len()];
    for o in &model.members {
        fixed_ends[o.i] += usize::from(!o.release_i);
        fixed_ends[o.j] += usize::from(!o.release_j);
    }
    // A member's own unreleased end is one of those at its node: another takes more than one.
    let takes =
        |node: usize, released: bool| !released && (restrained[node] || fixed_ends[node] > 1);
    model
        .members
        .iter()
        .map(|mem| takes(mem.i, mem.release_i) || takes(mem.j, mem.release_j))
        .collect()
}

/// ΣP, Pmf and the level gravity loads Yi of each story for the first-order total `s`.
pub fn story_gravity(model: &Model, stories: &[Story], s: &Solution) -> Gravity {
    let mut sum_p = Vec::with_capacity(stories.len());
    let mut p_mf = Vec::with_capacity(stories.len());
    let frame = moment_frame_members(model);
    for st in stories {
        let mut p = 0.0;
        let mut mf = 0.0;
        for &m in &st.columns {
            let load = column_load(model, s, m);
            p += load;
            if frame[m] {
                mf += load;
            }
        }
        sum_p.push(p);
        p_mf.push(mf);
    }
    let y = (0..stories.len())
        .map(|k| (sum_p[k] - sum_p.get(k + 1).copied().unwrap_or(0.0)).max(0.0))
        .collect();
    Gravity { sum_p, p_mf, y }
}

/// Columns of `story` carrying at least half the story's mean column load (m of
/// EN 1993-1-1 (5.5)); at least 1.
pub fn loaded_columns(model: &Model, story: &Story, s: &Solution) -> usize {
    let loads: Vec<f64> = story
        .columns
        .iter()
        .map(|&m| column_load(model, s, m))
        .collect();
    let mean = loads.iter().sum::<f64>() / loads.len().max(1) as f64;
    loads
        .iter()
        .filter(|&&p| p >= 0.5 * mean && p > 0.0)
        .count()
        .max(1)
}

/// Interstory drift of story `st` in `s`: mean X translation of its top nodes less that of
/// its bottom nodes, m.
pub fn story_drift(st: &Story, s: &Solution) -> f64 {
    drift_of(st, &s.displacements)
}

/// Interstory drift of `st` from node displacements `u` (mean X translation of its top
/// level less that of its bottom level), m.
pub fn drift_of(st: &Story, u: &[[f64; 3]]) -> f64 {
    mean_x(u, &st.top_nodes) - mean_x(u, &st.bottom_nodes)
}

/// Drift of the top level: mean X translation of the top story's top nodes less that of
/// the first story's bottom nodes, m.
pub fn top_drift(stories: &[Story], s: &Solution) -> f64 {
    match (stories.first(), stories.last()) {
        (Some(bottom), Some(top)) => {
            mean_x(&s.displacements, &top.top_nodes)
                - mean_x(&s.displacements, &bottom.bottom_nodes)
        }
        _ => 0.0,
    }
}

/// What every drift of `check` is, in plain words (issue 7 item 7).
pub const DRIFT_NOTE: &str = "Drifts here are under factored loads, with the analysis \
stiffness (reduced where the method calls for it) and notional loads: they are strength \
figures, not serviceability drifts. Check serviceability drift under service loads and \
gross stiffness.";

/// Story figures before classification. `level_forces` are the case's net lateral forces
/// at the levels (reversed holding forces plus notional loads), `sway` the sway solution
/// under them, `stiffness` each story's H/Δ from [`story_stiffness`].
pub fn figures(
    stories: &[Story],
    stiffness: &[StoryStiffness],
    gravity: &Gravity,
    level_forces: &[f64],
    sway: &Solution,
    alpha: f64,
) -> Vec<StoryFigures> {
    stories
        .iter()
        .zip(stiffness)
        .enumerate()
        .map(|(k, (st, k_h))| {
            let h = st.height();
            let shear: f64 = level_forces[k..].iter().sum();
            let drift = story_drift(st, sway);
            let p = gravity.sum_p[k];
            let r_m = aisc::r_m(gravity.p_mf[k], p);
            let p_e_story = aisc::p_e_story(r_m, k_h.stiffness, h);
            let q_index = aci::q_index(p, k_h.stiffness, h);
            StoryFigures {
                story: st.number,
                height: h,
                sum_p: p,
                p_mf: gravity.p_mf[k],
                shear,
                drift,
                drift_ratio: drift / h,
                stiffness: k_h.stiffness,
                stiffness_source: k_h.source,
                stiffness_shear: k_h.shear,
                stiffness_drift: k_h.drift,
                r_m,
                p_e_story,
                b2: aisc::b2(alpha, p, p_e_story),
                q_index,
                delta_s_q: aci::delta_s_q(q_index),
                alpha_cr_story: ec3::alpha_cr(k_h.stiffness, h, p),
                drift_first_order: drift,
                drift_second_order: None,
                drift_amplification: None,
                drift_negligible: true,
                route: SwayRoute::FirstOrder,
                sway_amplifier: None,
                classification: Classification::NonSway,
                criterion: String::new(),
            }
        })
        .collect()
}

/// A story verdict: route, amplifier, classification, criterion.
#[derive(Debug, Clone, PartialEq)]
pub struct Verdict {
    pub route: SwayRoute,
    pub amplifier: Option<f64>,
    pub class: Classification,
    pub criterion: String,
}

impl Verdict {
    /// Sway part × `amplifier`.
    pub fn amplified(amplifier: f64, class: Classification, criterion: String) -> Verdict {
        Verdict {
            route: SwayRoute::Amplified,
            amplifier: Some(amplifier),
            class,
            criterion,
        }
    }

    /// First-order moments suffice: non-sway, amplifier 1.
    pub fn first_order(criterion: String) -> Verdict {
        Verdict {
            route: SwayRoute::FirstOrder,
            amplifier: Some(1.0),
            class: Classification::NonSway,
            criterion,
        }
    }

    /// The moments of the direct second-order analysis.
    pub fn second_order(class: Classification, criterion: String) -> Verdict {
        Verdict {
            route: SwayRoute::SecondOrderAnalysis,
            amplifier: None,
            class,
            criterion,
        }
    }

    /// Unstable under the case.
    pub fn unstable(criterion: String) -> Verdict {
        Verdict {
            route: SwayRoute::None,
            amplifier: None,
            class: Classification::Unstable,
            criterion,
        }
    }

    /// Write the verdict into a story's figures.
    pub fn apply(self, f: &mut StoryFigures) {
        f.route = self.route;
        f.sway_amplifier = self.amplifier;
        f.classification = self.class;
        f.criterion = self.criterion;
    }
}

/// Where a story formula declares the story unstable while the buckling analysis of the
/// whole frame finds its lowest sway mode above the loads (α_cr > α, `alpha_cr`; None when
/// nothing buckles in sway) and the direct analysis converged (`converged`): the formula
/// is outside its range (its stiffness comes from one lateral pattern, while the buckling
/// analysis sees the whole frame), so the design moments are the direct analysis's own and
/// the criterion names both figures; see [`classify`].
fn overrule_story_formula(
    verdict: Verdict,
    alpha_cr: Option<f64>,
    alpha: f64,
    converged: bool,
) -> Verdict {
    let frame_stable = alpha_cr.is_none_or(|a| a > alpha);
    if verdict.class == Classification::Unstable && frame_stable && converged {
        let buckling = alpha_cr.map_or("no sway mode".to_string(), |a| {
            format!("α_cr = {a:.2} > {alpha:.2}")
        });
        Verdict::second_order(
            Classification::Sway,
            format!(
                "story formula: {}; but the buckling analysis of the frame gives {buckling} and \
                 the direct analysis converged: design moments from the second-order analysis",
                verdict.criterion
            ),
        )
    } else {
        verdict
    }
}

/// Non-sway when the criterion holds, with the comparison sign for the message.
fn against(holds: bool) -> (Classification, &'static str) {
    if holds {
        (Classification::NonSway, "≤")
    } else {
        (Classification::Sway, ">")
    }
}

/// The sentence for a drift ratio that was not formed.
fn negligible(f: &StoryFigures) -> String {
    format!(
        "first-order drift negligible ({:.1e}·h)",
        (f.drift_first_order / f.height).abs()
    )
}

/// Fill in the drift amplification from the direct analysis and each story's route,
/// amplifier, classification and criterion by the model's method.
///
/// * A drift ratio Δ2nd/Δ1st is formed only where the first-order drift is significant
///   ([`drift_is_significant`]); a case with no significant drift in any story has no
///   sway effects to amplify: every story is non-sway, first-order, amplifier 1.
/// * AISC 360-16 App. 8: sway part × B2 (A-8-6), non-sway when B2 ≤ 1.1. Where B2 does not
///   exist (α·ΣP ≥ Pe,story) the story figures are unusable: the design moments are the
///   second-order analysis's if the frame is stable, else the story is unstable.
/// * ACI 318-19 6.6.4: non-sway (first-order moments) when Q ≤ 0.05 (6.6.4.3(b)); δs by the
///   Q method within its range δs ≤ 1.5 (6.6.4.6.2(a)); beyond it the moments of the
///   second-order analysis (6.6.4.6.2(c)).
/// * EN 1993-1-1: by one structure α_cr, in [`judge_structure`].
/// * Direct analysis (AISC 360-16 Ch. C): always the analysis's own moments; the verdict
///   is Δ2nd/Δ1st ≤ 1.1 where the drift is significant, else B2 (A-8-6, which estimates
///   Δ2nd/Δ1st; from memory).
///
/// A story formula alone never declares a story unstable while the buckling analysis
/// finds the frame's lowest sway mode above α and the direct analysis converged
/// (`overrule_story_formula`).
#[allow(clippy::too_many_arguments)]
pub fn classify(
    model: &Model,
    stories: &[Story],
    mut figures: Vec<StoryFigures>,
    direct: Option<&Solution>,
    no_sway: &Solution,
    sway: &Solution,
    alpha: f64,
    alpha_cr: Option<f64>,
) -> Vec<StoryFigures> {
    for (f, st) in figures.iter_mut().zip(stories) {
        f.drift_first_order = story_drift(st, no_sway) + story_drift(st, sway);
        f.drift_second_order = direct.map(|d| story_drift(st, d));
    }
    let largest = largest_drift_ratio(&figures);
    for f in figures.iter_mut() {
        let significant = drift_is_significant(f.drift_first_order, f.height, largest);
        f.drift_negligible = !significant;
        f.drift_amplification = f
            .drift_second_order
            .filter(|_| significant)
            .map(|second| second / f.drift_first_order);
    }
    let converged = direct.is_some();
    let no_sway_at_all = largest < DRIFT_NEGLIGIBLE_RATIO;
    for f in figures.iter_mut() {
        let verdict = if no_sway_at_all && converged {
            let why = format!(
                "no significant first-order sway under this case (largest drift {largest:.1e}·h \
                 < {DRIFT_NEGLIGIBLE_RATIO:.0e}·h): no sway effects to amplify"
            );
            if model.analysis.method == SecondOrderMethod::Direct {
                Verdict::second_order(
                    Classification::NonSway,
                    format!("{why}; design moments from the direct analysis (AISC 360-16 C1)"),
                )
            } else {
                Verdict::first_order(why)
            }
        } else {
            method_verdict(model.analysis.method, f, alpha, converged)
        };
        overrule_story_formula(verdict, alpha_cr, alpha, converged).apply(f);
    }
    figures
}

/// ACI 318-19 6.6.4.6.2(a): δs by the Q method multiplies the story's first-order sway
/// moments, which presumes that the case's first-order sway has the shape in which the
/// frame sways (common practice, no source; the same condition as EN 1993-1-1
/// §5.2.2(6)B, [`ec3::amplified_method_conditions`]). Where it does not (sway forces of
/// mixed sense, a sway part that relieves), stories amplified by the Q method take the
/// moments of the second-order analysis instead (6.6.4.6.2(c)) and the criterion says why.
/// `mode` are the story drifts of the frame's lowest sway mode.
///
/// The range of the Q method, δs ≤ 1.5 (6.6.4.6.2), is also read off the buckling
/// analysis: Q leaves out the columns' own P-δ softening, which the frame's lowest sway
/// mode includes, so where that mode's amplifier 1/(1 − 1/α_cr) exceeds 1.5 the Q method
/// is outside its range too (`alpha_cr`: the lowest sway mode's factor).
pub fn aci_q_method_conditions(
    figures: &mut [StoryFigures],
    mode: Option<&[f64]>,
    alpha_cr: Option<f64>,
    converged: bool,
) {
    if !converged || figures.iter().all(|f| f.route != SwayRoute::Amplified) {
        return;
    }
    let range = match alpha_cr {
        Some(a) if a > 1.0 && 1.0 / (1.0 - 1.0 / a) > aci::DELTA_S_Q_LIMIT => Err(format!(
            "the frame's lowest sway mode α_cr = {a:.2} gives 1/(1 − 1/α_cr) = {:.3} > {:.1}, \
             beyond the Q method's range",
            1.0 / (1.0 - 1.0 / a),
            aci::DELTA_S_Q_LIMIT
        )),
        _ => Ok(()),
    };
    let conditions = range.and_then(|()| sway_in_mode_shape(figures, mode).map(|_| ()));
    if let Err(why) = conditions {
        to_second_order(figures, &why, "6.6.4.6.2(c)");
    }
}

/// AISC 360-16 App. 8: B2 multiplies the moments of the lateral translation of the story
/// (Mlt, A-8-1), which presumes, as the Q method does, that the case's first-order sway has
/// the frame's sway shape ([`ec3::amplified_method_conditions`]; common practice, no
/// source). Where it does not, the amplified stories take the moments of the second-order
/// analysis (AISC 360-16 C1 permits any second-order analysis; from memory).
pub fn aisc_b2_conditions(figures: &mut [StoryFigures], mode: Option<&[f64]>, converged: bool) {
    if !converged || figures.iter().all(|f| f.route != SwayRoute::Amplified) {
        return;
    }
    if let Err(why) = sway_in_mode_shape(figures, mode) {
        to_second_order(figures, &why, "AISC 360-16 C1");
    }
}

/// [`ec3::amplified_method_conditions`] on the stories' first-order drifts of the case and
/// the story drifts `mode` of the frame's lowest sway mode.
pub fn sway_in_mode_shape(
    figures: &[StoryFigures],
    mode: Option<&[f64]>,
) -> Result<String, String> {
    let first: Vec<f64> = figures.iter().map(|f| f.drift_first_order).collect();
    let h: Vec<f64> = figures.iter().map(|f| f.height).collect();
    let significant: Vec<bool> = figures.iter().map(|f| !f.drift_negligible).collect();
    ec3::amplified_method_conditions(&first, mode, &h, &significant)
}

/// EN 1993-1-1: judge the whole structure by one α_cr ([`ec3::structure_alpha_cr`]) and give every story the
/// same verdict (EN 1993-1-1 §5.2.1(3)/(4)B, §5.2.2(5)B/(6)B, from memory):
/// * α_cr ≥ 10: first-order analysis suffices, sway effects × 1.0 (5.1);
/// * 3 ≤ α_cr < 10: all sway effects × 1/(1 − 1/α_cr) (amplified sway method) where the
///   case's first-order sway fits the method ([`ec3::amplified_method_conditions`]); where it
///   does not, the moments of the second-order analysis, and the criterion says why;
/// * α_cr < 3: a second-order analysis is required (§5.2.2(5)B): its moments, or the
///   structure is unstable when that analysis did not converge.
///
/// `buckling` is the lowest sway mode's α_cr and `mode` its story drifts. A case with no
/// significant first-order sway keeps its first-order verdict ([`classify`]).
pub fn judge_structure(
    figures: &mut [StoryFigures],
    buckling: Option<f64>,
    mode: Option<&[f64]>,
    direct_converged: bool,
) {
    let lowest_story = figures
        .iter()
        .map(|f| f.alpha_cr_story)
        .min_by(f64::total_cmp);
    let Some(a) = ec3::structure_alpha_cr(lowest_story, buckling) else {
        return;
    };
    let largest = largest_drift_ratio(figures);
    if largest < DRIFT_NEGLIGIBLE_RATIO
        && direct_converged
        && figures
            .iter()
            .all(|f| f.classification != Classification::Unstable)
    {
        for f in figures.iter_mut() {
            Verdict::first_order(format!(
                "structure α_cr = {a:.2}; no significant first-order sway under this case \
                 (largest drift {largest:.1e}·h): no sway effects to amplify"
            ))
            .apply(f);
        }
        return;
    }
    let source = match (lowest_story, buckling) {
        (Some(s), Some(b)) if b < s => {
            format!("lowest sway mode {b:.2} < lowest story value {s:.2}")
        }
        (Some(s), Some(b)) => format!("lowest story value {s:.2}; lowest sway mode {b:.2}"),
        (Some(s), None) => format!("lowest story value {s:.2}"),
        (None, _) => "lowest sway mode".to_string(),
    };
    // The first sway mode governs the case's sway only if the growth the second-order
    // analysis measures in every story (significant Δ2nd/Δ1st) agrees with the amplifier.
    let conditions = sway_in_mode_shape(figures, mode).and_then(|why| {
        let amp = ec3::sway_amplifier(a);
        let off = figures.iter().find_map(|f| {
            let (amp, r) = (amp?, f.drift_amplification?);
            (!amplifiers_agree(amp, r)).then_some((f.story, amp, r))
        });
        match off {
            Some((story, amp, r)) => Err(format!(
                "1/(1 − 1/α_cr) = {amp:.3} against Δ2nd/Δ1st = {r:.3} of story {story} in the \
                 second-order analysis: the first sway mode does not govern this case's sway"
            )),
            None => Ok(why),
        }
    });
    let verdict = if a >= ec3::ALPHA_CR_FIRST_ORDER {
        Verdict::first_order(format!(
            "structure α_cr = {a:.2} ≥ 10 ({source}): first-order analysis suffices (EN 1993-1-1 (5.1), 5.2.1(3))"
        ))
    } else if !direct_converged {
        Verdict::unstable(format!(
            "structure α_cr = {a:.2} < 10 ({source}) and the direct second-order analysis did not converge"
        ))
    } else if let Some(amp) = ec3::sway_amplifier(a) {
        match conditions {
            Ok(why) => Verdict::amplified(
                amp,
                Classification::Sway,
                format!(
                    "structure α_cr = {a:.2} < 10 ({source}); {why}: all sway effects × 1/(1 − 1/α_cr) = {amp:.3} (EN 1993-1-1 5.2.2(5)B, (6)B)"
                ),
            ),
            Err(why) => Verdict::second_order(
                Classification::Sway,
                format!(
                    "structure α_cr = {a:.2} < 10 ({source}); amplified sway method outside EN 1993-1-1 5.2.2(6)B: {why}; design moments from the second-order analysis"
                ),
            ),
        }
    } else {
        Verdict::second_order(
            Classification::Sway,
            format!(
                "structure α_cr = {a:.2} < 3 ({source}): second-order analysis required (EN 1993-1-1 5.2.2(5)B); design moments from it"
            ),
        )
    };
    for f in figures.iter_mut() {
        verdict.clone().apply(f);
    }
}

/// Send every amplified story to the second-order route, saying why.
fn to_second_order(figures: &mut [StoryFigures], why: &str, clause: &str) {
    for f in figures
        .iter_mut()
        .filter(|f| f.route == SwayRoute::Amplified)
    {
        let criterion = format!(
            "{}; but {why}: design moments from the second-order analysis, {clause}",
            f.criterion
        );
        Verdict::second_order(f.classification, criterion).apply(f);
    }
}

/// Where one story of a case takes the moments of the second-order analysis, every story
/// of the case does: that analysis is of the whole frame, and a story amplified on its own
/// beside it would miss what the other story's sway does to the members they share (a
/// column at the level between them). The criterion names the story that needed it.
pub fn one_route_per_case(figures: &mut [StoryFigures]) {
    let Some(first) = figures
        .iter()
        .find(|f| f.route == SwayRoute::SecondOrderAnalysis)
        .map(|f| f.story)
    else {
        return;
    };
    for f in figures
        .iter_mut()
        .filter(|f| matches!(f.route, SwayRoute::FirstOrder | SwayRoute::Amplified))
    {
        let criterion = format!(
            "{}; design moments from the second-order analysis, which story {first} needs (the \
             frame is analysed as a whole)",
            f.criterion
        );
        Verdict::second_order(f.classification, criterion).apply(f);
    }
}

/// A story amplifier agrees with the growth the second-order analysis measures, Δ2nd/Δ1st
/// of the same story (significant drift only), when the two growths (amplifier − 1 and
/// ratio − 1) differ by at most [`AGREEMENT_SHARE`] of the larger plus
/// [`AGREEMENT_SLACK`] (common practice, no source: B2 with RM = 0.85, δs of the Q method
/// and 1/(1 − 1/α_cr) are estimates of that same growth, the first two deliberately
/// conservative; beyond this they describe another sway than the case's, and the sway
/// parts they multiply, where they relieve the no-sway part, are then over- or
/// under-amplified).
pub fn amplifiers_agree(amplifier: f64, ratio: f64) -> bool {
    let (a, r) = (amplifier - 1.0, ratio.max(1.0) - 1.0);
    (a - r).abs() <= AGREEMENT_SHARE * a.max(r) + AGREEMENT_SLACK
}

/// Share of the larger growth by which two growths may differ ([`amplifiers_agree`]).
pub const AGREEMENT_SHARE: f64 = 0.25;

/// Slack on the growths for amplifiers near 1 ([`amplifiers_agree`]).
pub const AGREEMENT_SLACK: f64 = 0.02;

/// One story's verdict by `method` (see [`classify`]).
fn method_verdict(
    method: SecondOrderMethod,
    f: &StoryFigures,
    alpha: f64,
    converged: bool,
) -> Verdict {
    match method {
        SecondOrderMethod::AiscB1B2 => match f.b2 {
            None => Verdict::unstable(format!(
                "α·ΣP/Pe,story = {:.3} ≥ 1 (AISC 360-16 A-8-6)",
                alpha * f.sum_p / f.p_e_story
            )),
            Some(b2) => {
                let (class, cmp) = against(b2 <= aisc::B2_NONSWAY);
                let why = format!(
                    "B2 = {b2:.3} {cmp} {:.2} (AISC 360-16 App. 7.2.3(b), from memory)",
                    aisc::B2_NONSWAY
                );
                match f.drift_amplification {
                    Some(r) if converged && !amplifiers_agree(b2, r) => Verdict::second_order(
                        class,
                        format!(
                            "{why}; but the second-order analysis gives Δ2nd/Δ1st = {r:.3} for \
                             this story: the story figures do not represent it (A-8-7 takes ΔH \
                             of a representative lateral load, from memory), so the design \
                             moments are the second-order analysis's"
                        ),
                    ),
                    _ => Verdict::amplified(b2, class, why),
                }
            }
        },
        SecondOrderMethod::AciMagnifier => {
            let q = f.q_index;
            if q >= 1.0 {
                Verdict::unstable(format!(
                    "Q = {q:.3}: the story is unstable (ACI 318-19 6.6.4.4.1, 6.6.4.6.2)"
                ))
            } else if q <= aci::Q_NONSWAY {
                Verdict::first_order(format!(
                    "Q = {q:.3} ≤ {:.2}: non-sway, first-order end moments (ACI 318-19 \
                     6.6.4.3(b), which accepts sway effects up to about 5 %)",
                    aci::Q_NONSWAY
                ))
            } else if let Some((ds, r)) = f
                .delta_s_q
                .zip(f.drift_amplification)
                .filter(|&(ds, r)| converged && !amplifiers_agree(ds, r))
            {
                Verdict::second_order(
                    Classification::Sway,
                    format!(
                        "Q = {q:.3} > {:.2} (ACI 318-19 6.6.4.3(b)); δs = {ds:.3} by the Q \
                         method against Δ2nd/Δ1st = {r:.3} of the second-order analysis: the \
                         story figures do not represent this story, so the design moments \
                         are the second-order analysis's, 6.6.4.6.2(c)",
                        aci::Q_NONSWAY
                    ),
                )
            } else if let Some(ds) = f.delta_s_q {
                Verdict::amplified(
                    ds,
                    Classification::Sway,
                    format!(
                        "Q = {q:.3} > {:.2} (ACI 318-19 6.6.4.3(b)); δs = {ds:.3} by the Q \
                         method, 6.6.4.6.2(a)",
                        aci::Q_NONSWAY
                    ),
                )
            } else if converged {
                Verdict::second_order(
                    Classification::Sway,
                    format!(
                        "Q = {q:.3}: δs by the Q method = {:.3} > {:.1}, outside its range \
                         (ACI 318-19 6.6.4.6.2): design moments from the second-order \
                         analysis, 6.6.4.6.2(c)",
                        1.0 / (1.0 - q),
                        aci::DELTA_S_Q_LIMIT
                    ),
                )
            } else {
                Verdict::unstable(format!(
                    "Q = {q:.3}: δs by the Q method > {:.1} and the second-order analysis \
                     did not converge (ACI 318-19 6.6.4.6.2)",
                    aci::DELTA_S_Q_LIMIT
                ))
            }
        }
        // Judged for the whole structure afterwards (judge_structure); the story value
        // alone here.
        SecondOrderMethod::Ec3AlphaCr => {
            let a = f.alpha_cr_story;
            if a <= 1.0 {
                Verdict::unstable(format!(
                    "α_cr = {a:.2} ≤ 1: the story is unstable (EN 1993-1-1 (5.2))"
                ))
            } else {
                Verdict::first_order(format!("story α_cr = {a:.2} (EN 1993-1-1 (5.2))"))
            }
        }
        SecondOrderMethod::Direct => {
            if !converged {
                return Verdict::unstable("direct second-order analysis did not converge".into());
            }
            let (figure, value) = match (f.drift_amplification, f.b2) {
                (Some(r), _) => (format!("Δ2nd/Δ1st = {r:.3}"), r),
                (None, Some(b2)) => (
                    format!(
                        "{}; B2 = {b2:.3} (AISC 360-16 A-8-6 estimates Δ2nd/Δ1st, from memory)",
                        negligible(f)
                    ),
                    b2,
                ),
                (None, None) => (
                    format!("{}; α·ΣP ≥ Pe,story (A-8-6)", negligible(f)),
                    f64::INFINITY,
                ),
            };
            let (class, cmp) = against(value <= aisc::B2_NONSWAY);
            Verdict::second_order(
                class,
                format!(
                    "{figure} {cmp} {:.2} (AISC 360-16 App. 7.2.3(b), from memory); design \
                     moments from the direct analysis (AISC 360-16 C1)",
                    aisc::B2_NONSWAY
                ),
            )
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn story_formula_does_not_overrule_a_stable_buckling_analysis() {
        // Issue 7 item 1, issue 16: with α_cr = 3.2 > α = 1.0 and a converged direct
        // analysis, an unbounded B2 is not a verdict: the design moments are the direct
        // analysis's own and both figures are named.
        let v = Verdict::unstable("B2 unbounded".into());
        let o = overrule_story_formula(v.clone(), Some(3.2), 1.0, true);
        assert_eq!(
            (o.route, o.amplifier, o.class),
            (SwayRoute::SecondOrderAnalysis, None, Classification::Sway)
        );
        assert!(o.criterion.contains("B2 unbounded") && o.criterion.contains("α_cr = 3.20"));
        // The frame buckles below the loads (α_cr ≤ α), or the direct analysis failed:
        // unstable stays.
        assert_eq!(
            overrule_story_formula(v.clone(), Some(0.9), 1.0, true).class,
            Classification::Unstable
        );
        assert_eq!(
            overrule_story_formula(v.clone(), Some(1.5), 1.6, true).class,
            Classification::Unstable
        );
        assert_eq!(
            overrule_story_formula(v, Some(3.2), 1.0, false).class,
            Classification::Unstable
        );
    }

    #[test]
    fn significant_drifts_and_agreeing_amplifiers() {
        // The project's own thresholds (common practice, no source): a drift under 10⁻⁶·h,
        // or under 5 % of the case's largest drift ratio, forms no ratio.
        assert!(!drift_is_significant(1e-7 * 4.0, 4.0, 1e-7));
        assert!(drift_is_significant(1e-5 * 4.0, 4.0, 1e-4));
        assert!(!drift_is_significant(1e-5 * 4.0, 4.0, 1e-3));
        assert!(!drift_is_significant(f64::NAN, 4.0, 1e-3));
        // Growths 0.25 and 0.24 agree; 0.5 and 0.1 do not; near 1 the slack of 0.02 rules.
        assert!(amplifiers_agree(1.25, 1.24));
        assert!(!amplifiers_agree(1.5, 1.1));
        assert!(amplifiers_agree(1.0, 1.015));
        assert!(!amplifiers_agree(1.0, 1.03));
    }

    #[test]
    fn same_signed_patterns() {
        // Zeros allowed, round-off tolerated, mixed signs refused (issue 7 item 1).
        assert_eq!(same_signed(&[1.0, 0.0, 2.0]), Some(1.0));
        assert_eq!(same_signed(&[-1.0, -1e-12, -2.0]), Some(-1.0));
        assert_eq!(same_signed(&[1.0, -0.5]), None);
        assert_eq!(same_signed(&[0.0, 0.0]), None);
    }
}
