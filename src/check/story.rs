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
//! failing that, equal forces at every level. Every reference pattern is a combination of
//! the unit level solutions of [`SwaySplit`], so one factorization of the free frame serves
//! all of them ([`StoryFlexibility`], computed once per model).

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

/// Story drifts of the free first-order frame under a unit force at each level, computed
/// once per model: every lateral pattern's story drifts are a combination of these.
#[derive(Debug, Clone, PartialEq)]
pub struct StoryFlexibility {
    /// `drift[k][l]`: drift of story k under 1 N at level l (shared by its nodes), m/N.
    drift: Vec<Vec<f64>>,
    /// Stories whose top level a support holds in X.
    held: Vec<bool>,
}

impl StoryFlexibility {
    /// From the unit level solutions of `split`.
    pub fn new(stories: &[Story], split: &SwaySplit) -> StoryFlexibility {
        // One unit solve per level (displacements only, not kept).
        let nl = split.level_nodes.len();
        let mut drift = vec![vec![0.0; nl]; stories.len()];
        for l in 0..nl {
            let u = split.unit_displacements(l);
            for (row, st) in drift.iter_mut().zip(stories) {
                row[l] = drift_of(st, &u);
            }
        }
        let held = split.level_nodes.iter().map(Vec::is_empty).collect();
        StoryFlexibility { drift, held }
    }

    /// Story shears `Σ_{l≥k} F_l` and drifts under level forces `f` (N): `(shear, drift)`.
    pub fn response(&self, f: &[f64]) -> Vec<(f64, f64)> {
        (0..self.drift.len())
            .map(|k| {
                let shear: f64 = f[k..].iter().sum();
                let drift: f64 = self.drift[k].iter().zip(f).map(|(d, x)| d * x).sum();
                (shear, drift)
            })
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
    flex: &StoryFlexibility,
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
    /// Δ2nd/Δ1st from the direct second-order analysis (None without first-order drift).
    pub drift_amplification: Option<f64>,
    /// The sway amplifier read off the direct analysis where a route takes one from it:
    /// the larger of this story's Δ2nd/Δ1st, the frame's top-drift ratio and 1 (a
    /// per-story ratio of a story with small or mixed first-order drift means little);
    /// None if the direct analysis did not converge.
    pub direct_sway_amplifier: Option<f64>,
    /// The amplifier applied to this story's sway moments by the chosen method.
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

/// ΣP, Pmf and the level gravity loads Yi of each story for the first-order total `s`.
pub fn story_gravity(model: &Model, stories: &[Story], s: &Solution) -> Gravity {
    let mut sum_p = Vec::with_capacity(stories.len());
    let mut p_mf = Vec::with_capacity(stories.len());
    for st in stories {
        let mut p = 0.0;
        let mut mf = 0.0;
        for &m in &st.columns {
            let load = column_load(model, s, m);
            p += load;
            if is_moment_frame_column(model, m) {
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
                direct_sway_amplifier: None,
                sway_amplifier: None,
                classification: Classification::NonSway,
                criterion: String::new(),
            }
        })
        .collect()
}

/// A story verdict: amplifier, classification, criterion.
type Verdict = (Option<f64>, Classification, String);

/// Replace a story formula's "unstable" by the direct analysis's Δ2nd/Δ1st when the
/// buckling analysis finds the frame stable at the case's loads (α_cr > α) and the direct
/// analysis converged (`from_direct`); see [`classify`].
fn overrule_story_formula(
    verdict: Verdict,
    alpha_cr: Option<f64>,
    alpha: f64,
    from_direct: Option<f64>,
) -> Verdict {
    let frame_stable = alpha_cr.is_none_or(|a| a > alpha);
    match (verdict.1, frame_stable, from_direct) {
        (Classification::Unstable, true, Some(r)) => {
            let buckling = alpha_cr.map_or("no member in compression".to_string(), |a| {
                format!("α_cr = {a:.2} > {alpha:.2}")
            });
            (
                Some(r),
                Classification::Sway,
                format!(
                    "story formula: {}; but the buckling analysis of the frame gives {buckling} \
                     and the direct analysis converged, so the verdict uses the direct \
                     analysis: sway effects × Δ2nd/Δ1st = {r:.3}",
                    verdict.2
                ),
            )
        }
        _ => verdict,
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

/// Fill in the drift amplification from the direct analysis, the sway amplifier of the
/// model's method and the classification with its criterion.
///
/// Where a method's approximate sway amplifier is not permitted (ACI δs > 1.5,
/// EN 1993-1-1 α_cr < 3), the amplifier is Δ2nd/Δ1st of the direct second-order analysis
/// (ACI 318-19 6.6.4.6.2(c); EN 1993-1-1 5.2.2(3)); where that did not converge, the
/// story is unstable.
///
/// A story formula alone never declares a story unstable while the buckling analysis of
/// the whole frame finds α_cr above α (`alpha_cr`, None when nothing is in compression)
/// and the direct analysis converged: the story formula is then outside its range (its
/// stiffness comes from one lateral pattern, while the buckling analysis sees the whole
/// frame), so the verdict uses Δ2nd/Δ1st of the direct analysis and the criterion names
/// both figures.
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
    let top_amplification = direct.and_then(|d| top_drift_amplification(stories, no_sway, sway, d));
    for (f, st) in figures.iter_mut().zip(stories) {
        let first = story_drift(st, no_sway) + story_drift(st, sway);
        f.drift_first_order = first;
        f.drift_second_order = direct.map(|d| story_drift(st, d));
        f.drift_amplification = direct.and_then(|d| {
            let second = story_drift(st, d);
            (first.abs() > 1e-12 * f.height).then(|| second / first)
        });
        // The amplifier taken from the direct analysis: never below 1, and never below the
        // frame's own top-drift ratio, since a story whose first-order drift is small or
        // mixed in sign has a per-story Δ2nd/Δ1st that means little (it can be below 1 or
        // negative); taking the larger is the conservative reading (common practice, no
        // source). None if the direct analysis failed.
        f.direct_sway_amplifier = direct.map(|_| {
            f.drift_amplification
                .unwrap_or(1.0)
                .max(top_amplification.unwrap_or(1.0))
                .max(1.0)
        });
        let from_direct = f.direct_sway_amplifier;
        let unstable = |why: String| (None, Classification::Unstable, why);
        let (amp, class, criterion) = match model.analysis.method {
            SecondOrderMethod::AiscB1B2 => match f.b2 {
                None => unstable(format!(
                    "α·ΣP/Pe,story = {:.3} ≥ 1 (AISC 360-16 A-8-6)",
                    alpha * f.sum_p / f.p_e_story
                )),
                Some(b2) => {
                    let (class, cmp) = against(b2 <= aisc::B2_NONSWAY);
                    let why = format!(
                        "B2 = {b2:.3} {cmp} {:.2} (AISC 360-16 App. 7.2.3(b), from memory)",
                        aisc::B2_NONSWAY
                    );
                    (Some(b2), class, why)
                }
            },
            SecondOrderMethod::AciMagnifier => {
                let ds = match f.delta_s_q {
                    Some(d) => Some((d, "Q method, 6.6.4.6.2(a)")),
                    None => from_direct.map(|d| (d, "second-order analysis, 6.6.4.6.2(c)")),
                };
                match ds {
                    Some((d, how)) if f.q_index < 1.0 => {
                        let (class, cmp) = against(f.q_index <= aci::Q_NONSWAY);
                        let why = format!(
                            "Q = {:.3} {cmp} {:.2} (ACI 318-19 6.6.4.3(b)); δs = {d:.3} by the {how}",
                            f.q_index,
                            aci::Q_NONSWAY
                        );
                        (Some(d), class, why)
                    }
                    _ => unstable(format!(
                        "Q = {:.3}: the story is unstable (ACI 318-19 6.6.4.4.1, 6.6.4.6.2)",
                        f.q_index
                    )),
                }
            }
            SecondOrderMethod::Ec3AlphaCr => {
                let a = f.alpha_cr_story;
                match (ec3::sway_amplifier(a), from_direct) {
                    _ if a <= 1.0 => unstable(format!(
                        "α_cr = {a:.2} ≤ 1: the story is unstable (EN 1993-1-1 (5.2))"
                    )),
                    _ if a >= ec3::ALPHA_CR_FIRST_ORDER => (
                        Some(1.0),
                        Classification::NonSway,
                        format!(
                            "α_cr = {a:.2} ≥ 10: first-order analysis suffices (EN 1993-1-1 (5.1))"
                        ),
                    ),
                    (Some(amp), _) => (
                        Some(amp),
                        Classification::Sway,
                        format!(
                            "α_cr = {a:.2} < 10: sway effects × 1/(1 − 1/α_cr) = {amp:.3} \
                             (EN 1993-1-1 5.2.2(5)B)"
                        ),
                    ),
                    (None, Some(r)) => (
                        Some(r),
                        Classification::Sway,
                        format!(
                            "α_cr = {a:.2} < 3: second-order analysis required (EN 1993-1-1 \
                             5.2.2(5)B); sway effects × Δ2nd/Δ1st = {r:.3} from the direct analysis"
                        ),
                    ),
                    (None, None) => unstable(format!(
                        "α_cr = {a:.2} < 3 and the direct analysis did not converge"
                    )),
                }
            }
            SecondOrderMethod::Direct => match (from_direct, f.drift_amplification) {
                (None, _) => unstable("direct second-order analysis did not converge".into()),
                (Some(r), Some(_)) => {
                    let (class, cmp) = against(r <= aisc::B2_NONSWAY);
                    let why = format!(
                        "Δ2nd/Δ1st = {r:.3} {cmp} {:.2} (AISC 360-16 App. 7.2.3(b), from memory)",
                        aisc::B2_NONSWAY
                    );
                    (Some(r), class, why)
                }
                (Some(r), None) => {
                    let a = f.alpha_cr_story;
                    let (class, cmp) = against(a >= ec3::ALPHA_CR_FIRST_ORDER);
                    let cmp = if cmp == "≤" { "≥" } else { "<" };
                    let why = format!(
                        "no first-order drift; story α_cr = {a:.2} {cmp} 10 (EN 1993-1-1 (5.1))"
                    );
                    (Some(r), class, why)
                }
            },
        };
        let (amp, class, criterion) =
            overrule_story_formula((amp, class, criterion), alpha_cr, alpha, from_direct);
        f.sway_amplifier = amp;
        f.classification = class;
        f.criterion = criterion;
    }
    figures
}

/// Δ2nd/Δ1st of the top level's drift ([`top_drift`]), or None where the first-order top
/// drift is round-off.
fn top_drift_amplification(
    stories: &[Story],
    no_sway: &Solution,
    sway: &Solution,
    direct: &Solution,
) -> Option<f64> {
    let first = top_drift(stories, no_sway) + top_drift(stories, sway);
    let height: f64 = stories.iter().map(|st| st.height()).sum();
    (first.abs() > 1e-12 * height).then(|| top_drift(stories, direct) / first)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn story_formula_does_not_overrule_a_stable_buckling_analysis() {
        // Issue 7 item 1: with α_cr = 3.2 > α = 1.0 and a converged direct analysis, an
        // unbounded B2 is not a verdict: Δ2nd/Δ1st = 1.45 is used and both are named.
        let v: Verdict = (None, Classification::Unstable, "B2 unbounded".into());
        let (amp, class, why) = overrule_story_formula(v.clone(), Some(3.2), 1.0, Some(1.45));
        assert_eq!((amp, class), (Some(1.45), Classification::Sway));
        assert!(why.contains("B2 unbounded") && why.contains("α_cr = 3.20"));
        // The frame buckles below the loads (α_cr ≤ α), or the direct analysis failed:
        // unstable stays.
        assert_eq!(
            overrule_story_formula(v.clone(), Some(0.9), 1.0, Some(1.45)).1,
            Classification::Unstable
        );
        assert_eq!(
            overrule_story_formula(v.clone(), Some(1.5), 1.6, Some(1.45)).1,
            Classification::Unstable
        );
        assert_eq!(
            overrule_story_formula(v, Some(3.2), 1.0, None).1,
            Classification::Unstable
        );
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
