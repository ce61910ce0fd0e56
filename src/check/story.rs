//! Story figures of one factored case: ΣP, story shear, drift, the story's lateral
//! stiffness and what each method makes of it (B2, Q and δs, α_cr), and the verdict
//! sway / non-sway.
//!
//! All three approximate methods rest on the same story stiffness `H/Δ` of the first-order
//! sway solution (AISC A-8-7 writes it `H/ΔH`, ACI 6.6.4.4.1 `Vus/Δo`, EN 1993-1-1 (5.2)
//! `H_Ed/δ_H,Ed`), so it is computed once here. When the case has no sway of its own (a
//! symmetric frame under symmetric gravity load), the stiffness comes from a lateral load
//! pattern proportional to the story gravity loads instead.

use serde::Serialize;

use super::{aci, aisc, ec3};
use crate::model::{Model, SecondOrderMethod};
use crate::solve::Solution;
use crate::solve::sway::{SwaySplit, mean_ux};
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

/// Where a story's lateral stiffness came from.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, strum::Display)]
#[serde(rename_all = "kebab-case")]
#[strum(serialize_all = "kebab-case")]
pub enum StiffnessSource {
    /// The case's own sway solution.
    CaseSway,
    /// Lateral loads proportional to the story gravity loads (the case has no sway).
    GravityPattern,
}

/// Figures of one story under one factored case (SI units).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct StoryFigures {
    pub story: usize,
    /// Story height h, m.
    pub height: f64,
    /// ΣP: total vertical load carried by the story's columns, N.
    pub sum_p: f64,
    /// Pmf: the part of ΣP in moment-frame columns (not pinned at both ends), N.
    pub p_mf: f64,
    /// Story shear of the first-order sway solution, N.
    pub shear: f64,
    /// First-order interstory drift, m (sway solution; the no-sway part has none).
    pub drift: f64,
    /// Drift / h.
    pub drift_ratio: f64,
    /// Lateral stiffness H/Δ, N/m.
    pub stiffness: f64,
    pub stiffness_source: StiffnessSource,
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
    /// Δ2nd/Δ1st from the direct second-order analysis (None without first-order drift).
    pub drift_amplification: Option<f64>,
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
            let mem = &model.members[m];
            if !(mem.release_i && mem.release_j) {
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
    mean_ux(s, &st.top_nodes) - mean_ux(s, &st.bottom_nodes)
}

/// Story figures before classification. `holding` are the no-sway holding forces of the
/// levels, `notional` the notional forces added at the levels (may be empty), `sway` the
/// sway solution including them.
#[allow(clippy::too_many_arguments)]
pub fn figures(
    model: &Model,
    stories: &[Story],
    split: &SwaySplit,
    gravity: &Gravity,
    holding: &[f64],
    notional: &[f64],
    sway: &Solution,
    alpha: f64,
) -> Vec<StoryFigures> {
    let nl = stories.len();
    // Lateral forces on the sway solution at each level: reversed holds plus notional.
    let lateral: Vec<f64> = (0..nl)
        .map(|l| -holding[l] + notional.get(l).copied().unwrap_or(0.0))
        .collect();
    let pattern: Vec<f64> = if gravity.y.iter().any(|&y| y > 0.0) {
        gravity.y.clone()
    } else {
        vec![1.0; nl]
    };
    let pattern_sway = split.lateral(&pattern);
    let _ = model;
    stories
        .iter()
        .enumerate()
        .map(|(k, st)| {
            let h = st.height();
            let shear: f64 = lateral[k..].iter().sum();
            let drift = story_drift(st, sway);
            let p = gravity.sum_p[k];
            let own = shear.abs() > 1e-9 * p.abs().max(1.0) && drift.abs() > 1e-12 * h;
            let (stiffness, source) = if own {
                ((shear / drift).abs(), StiffnessSource::CaseSway)
            } else {
                let hp: f64 = pattern[k..].iter().sum();
                let dp = story_drift(st, &pattern_sway);
                ((hp / dp).abs(), StiffnessSource::GravityPattern)
            };
            let r_m = aisc::r_m(gravity.p_mf[k], p);
            let p_e_story = aisc::p_e_story(r_m, stiffness, h);
            let q_index = aci::q_index(p, stiffness, h);
            StoryFigures {
                story: st.number,
                height: h,
                sum_p: p,
                p_mf: gravity.p_mf[k],
                shear,
                drift,
                drift_ratio: drift / h,
                stiffness,
                stiffness_source: source,
                r_m,
                p_e_story,
                b2: aisc::b2(alpha, p, p_e_story),
                q_index,
                delta_s_q: aci::delta_s_q(q_index),
                alpha_cr_story: ec3::alpha_cr(stiffness, h, p),
                drift_amplification: None,
                sway_amplifier: None,
                classification: Classification::NonSway,
                criterion: String::new(),
            }
        })
        .collect()
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
pub fn classify(
    model: &Model,
    stories: &[Story],
    mut figures: Vec<StoryFigures>,
    direct: Option<&Solution>,
    no_sway: &Solution,
    sway: &Solution,
    alpha: f64,
) -> Vec<StoryFigures> {
    for (f, st) in figures.iter_mut().zip(stories) {
        let first = story_drift(st, no_sway) + story_drift(st, sway);
        f.drift_amplification = direct.and_then(|d| {
            let second = story_drift(st, d);
            (first.abs() > 1e-12 * f.height).then(|| second / first)
        });
        // 1.0 where the case has no first-order drift at all; None if the direct analysis
        // failed.
        let from_direct = direct.map(|_| f.drift_amplification.unwrap_or(1.0));
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
        f.sway_amplifier = amp;
        f.classification = class;
        f.criterion = criterion;
    }
    figures
}
