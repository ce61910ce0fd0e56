//! `service`: the serviceability check of a frame under service-level combinations.
//!
//! A serviceability table (basis `serviceability`) is analysed as serviceability, never as
//! strength:
//! * stiffness: gross section properties, or the service-level concrete preset of ACI 318-19
//!   §6.6.3.2.2 (1.4 × the cracked values, at most Ig, from memory) — see
//!   [`crate::model::AnalysisOptions::service_stiffness_or_default`];
//! * no notional loads, no imperfections, no strength amplifiers (B1, B2, δs, δ);
//! * P-Δ (and P-δ) at the service load by the direct second-order analysis: its story drift
//!   is the service drift, reported beside the first-order drift;
//! * beam deflection relative to the chord between the beam's end nodes (a cantilever: its
//!   tip relative to its supported end), under the whole case and under its variable
//!   gravity part;
//! * seismic story drift by ASCE/SEI 7-16 §12.8.6, δx = Cd·δxe/Ie, against Table 12.12-1.
//!
//! Limits are data: parameters of the serviceability table (names in [`params`]), which the
//! model's `[combinations] params` and `--set` override like any other parameter.
//!
//! Results assist a licensed engineer; local codes and the adopted edition of each
//! standard govern.

use std::collections::BTreeMap;

use serde::{Deserialize, Serialize};

use crate::caution::CAUTION;
use crate::check::CheckError;
use crate::check::story::{drift_is_significant, drift_of};
use crate::combos::FactoredCase;
use crate::model::{ActionCategory, Model, Role, StiffnessPreset};
use crate::solve::Solution;
use crate::solve::beam::deflection_extremes;
use crate::solve::first_order::{FirstOrder, combined_member_loads};
use crate::solve::linear::MeshLoads;
use crate::solve::mesh::{MemberStiffness, member_stiffness};
use crate::solve::second_order::{SecondOrderModel, SecondOrderOutcome};
use crate::stories::{Story, stories};

/// The names of the serviceability table parameters that plumbline reads as limits (the
/// table format: `docs/combination-tables.md`, "Serviceability limits").
pub mod params {
    /// `drift_h_<category>` (e.g. `drift_h_wind`): N of the story drift limit h/N in a case
    /// with a load of that category.
    pub const DRIFT_PREFIX: &str = "drift_h_";
    /// N of the beam deflection limit L/N under the variable gravity part of a case.
    pub const DEFLECTION_LIVE: &str = "deflection_l_live";
    /// N of the beam deflection limit L/N under the whole case.
    pub const DEFLECTION_TOTAL: &str = "deflection_l_total";
    /// The length a cantilever's limit is taken on, as a multiple of its length.
    pub const CANTILEVER_FACTOR: &str = "deflection_cantilever_factor";
    /// Deflection amplification factor Cd (ASCE/SEI 7-16 Table 12.2-1).
    pub const SEISMIC_CD: &str = "seismic_cd";
    /// Importance factor Ie (ASCE/SEI 7-16 Table 1.5-2).
    pub const SEISMIC_IE: &str = "seismic_ie";
    /// Risk category, 1 to 4 (ASCE/SEI 7-16 Table 1.5-1).
    pub const RISK_CATEGORY: &str = "risk_category";
    /// `seismic_drift_rc<N>`: allowable story drift Δa/hsx for risk category N.
    pub const SEISMIC_DRIFT_PREFIX: &str = "seismic_drift_rc";
}

/// The action categories whose loads make up a case's "live" deflection: the variable
/// gravity loads (IBC Table 1604.3 column L, with roof live, snow and rain for roof
/// members; from memory).
pub const VARIABLE_GRAVITY: [ActionCategory; 4] = [
    ActionCategory::Live,
    ActionCategory::RoofLive,
    ActionCategory::Snow,
    ActionCategory::Rain,
];

/// Seismic drift limits of ASCE/SEI 7-16 §12.8.6 and §12.12.1.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct SeismicLimits {
    /// Deflection amplification factor Cd.
    pub cd: f64,
    /// Importance factor Ie.
    pub ie: f64,
    /// Risk category (1 to 4).
    pub risk_category: u8,
    /// Allowable story drift Δa as a fraction of the story height hsx.
    pub allowable_ratio: f64,
}

/// The limits of a serviceability run, read from the table's parameters.
#[derive(Debug, Clone, PartialEq, Default, Serialize, Deserialize)]
pub struct ServiceLimits {
    /// N of the story drift limit h/N, by the category of a load in the case.
    pub drift: BTreeMap<String, f64>,
    /// N of L/N under the variable gravity part of a case.
    pub deflection_live: Option<f64>,
    /// N of L/N under the whole case.
    pub deflection_total: Option<f64>,
    /// A cantilever's limit is on this multiple of its length (2 by IBC Table 1604.3
    /// footnote, from memory); 1 when the table does not say.
    pub cantilever_factor: f64,
    /// Seismic drift limits, when the table gives Cd, Ie and the risk category.
    pub seismic: Option<SeismicLimits>,
}

impl ServiceLimits {
    /// The limits among resolved table parameter `values` (unset ones are absent).
    pub fn from_params(values: &BTreeMap<String, Option<f64>>) -> ServiceLimits {
        let get = |name: &str| values.get(name).copied().flatten();
        let drift = values
            .iter()
            .filter_map(|(k, v)| Some((k.strip_prefix(params::DRIFT_PREFIX)?, (*v)?)))
            .filter(|(_, n)| *n > 0.0)
            .map(|(c, n)| (c.to_string(), n))
            .collect();
        let seismic = match (
            get(params::SEISMIC_CD),
            get(params::SEISMIC_IE),
            get(params::RISK_CATEGORY),
        ) {
            (Some(cd), Some(ie), Some(rc)) if ie > 0.0 => {
                let rc = rc.round().clamp(1.0, 4.0) as u8;
                get(&format!("{}{rc}", params::SEISMIC_DRIFT_PREFIX)).map(|ratio| SeismicLimits {
                    cd,
                    ie,
                    risk_category: rc,
                    allowable_ratio: ratio,
                })
            }
            _ => None,
        };
        ServiceLimits {
            drift,
            deflection_live: get(params::DEFLECTION_LIVE).filter(|n| *n > 0.0),
            deflection_total: get(params::DEFLECTION_TOTAL).filter(|n| *n > 0.0),
            cantilever_factor: get(params::CANTILEVER_FACTOR)
                .filter(|f| *f > 0.0)
                .unwrap_or(1.0),
            seismic,
        }
    }

    /// N of the story drift limit h/N of a case with loads of `categories`: the strictest
    /// (largest N) of theirs; None when none of them has a limit.
    pub fn drift_limit(&self, categories: &[ActionCategory]) -> Option<(f64, ActionCategory)> {
        categories
            .iter()
            .filter_map(|c| self.drift.get(&c.to_string()).map(|n| (*n, *c)))
            .fold(None, |best: Option<(f64, ActionCategory)>, x| match best {
                Some(b) if b.0 >= x.0 => Some(b),
                _ => Some(x),
            })
    }
}

/// One story of one service case.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ServiceStory {
    pub story: usize,
    /// Story height h, m.
    pub height: f64,
    /// First-order story drift (mean X translation of the top level less the bottom's), m.
    pub drift_first_order: f64,
    /// Story drift of the P-Δ analysis at the service load, m (None: it did not converge).
    pub drift_second_order: Option<f64>,
    /// Δ2nd/Δ1st where the first-order drift is significant.
    pub amplification: Option<f64>,
}

impl ServiceStory {
    /// The service drift: second order where the analysis converged, else first order.
    pub fn drift(&self) -> f64 {
        self.drift_second_order.unwrap_or(self.drift_first_order)
    }
}

/// One beam's deflections in one service case.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ServiceBeam {
    pub member: String,
    /// Member length L, m.
    pub length: f64,
    /// A cantilever (one end free): its deflection is the tip's relative to its root.
    pub cantilever: bool,
    /// Largest deflection relative to the chord under the whole case, m (local y, signed).
    pub total: f64,
    /// Where, from end i, m.
    pub total_x: f64,
    /// Largest deflection relative to the chord under the case's variable gravity part, m.
    pub live: f64,
}

/// Everything the serviceability run found for one service case.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ServiceCase {
    pub id: String,
    pub expression: String,
    /// The P-Δ analysis at the service load converged.
    pub converged: bool,
    /// Why it did not.
    pub reason: Option<String>,
    /// N of the case's story drift limit h/N and the category it is for.
    pub drift_limit: Option<(f64, String)>,
    pub stories: Vec<ServiceStory>,
    pub beams: Vec<ServiceBeam>,
}

/// The displaced nodes of one service case.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct DeflectedShape {
    pub case: String,
    /// Node displacements `[ux, uy, θ]` (m, rad) of the model's nodes, in model order: the
    /// P-Δ analysis's, or the first-order ones when it did not converge.
    pub displacements: Vec<[f64; 3]>,
}

/// The governing figure of one story or beam against its limit.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Governing {
    /// The figure (a drift or a deflection), m, signed.
    pub value: f64,
    /// The limit, m.
    pub limit: f64,
    /// |value| / limit.
    pub ratio: f64,
    pub case: String,
}

impl Governing {
    /// Within the limit.
    pub fn ok(&self) -> bool {
        self.ratio <= 1.0
    }
}

/// A story's service drift against its limit.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct StoryVerdict {
    pub story: usize,
    pub height: f64,
    /// The largest service drift ratio |Δ|/h over the cases, and its case.
    pub largest_ratio: f64,
    pub largest_case: String,
    /// The governing case against its limit (None: no case has a drift limit).
    pub governing: Option<Governing>,
    /// A case whose P-Δ analysis at service load did not converge.
    pub unstable_case: Option<String>,
}

/// A beam's deflections against their limits.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct BeamVerdict {
    pub member: String,
    pub length: f64,
    pub cantilever: bool,
    /// The length the limits are taken on (2L for a cantilever where the table says so), m.
    pub limit_length: f64,
    /// Variable gravity part against L/N live.
    pub live: Option<Governing>,
    /// Whole case against L/N total.
    pub total: Option<Governing>,
    /// The largest |deflection| under any case and its case, when no limit applies.
    pub largest: f64,
    pub largest_case: String,
}

impl BeamVerdict {
    /// The larger of the live and total ratios.
    pub fn ratio(&self) -> Option<f64> {
        [&self.live, &self.total]
            .iter()
            .filter_map(|g| g.as_ref().map(|g| g.ratio))
            .reduce(f64::max)
    }
}

/// A story's seismic drift by ASCE/SEI 7-16 §12.8.6 against Table 12.12-1.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct SeismicVerdict {
    pub story: usize,
    pub height: f64,
    /// The seismic load case.
    pub case: String,
    /// Elastic story drift δxe under the strength-level seismic load case, m.
    pub delta_xe: f64,
    /// Design story drift Δ = Cd·δxe/Ie, m.
    pub delta: f64,
    /// Allowable story drift Δa, m.
    pub allowable: f64,
    pub ratio: f64,
}

/// The whole serviceability run.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ServiceReport {
    /// The serviceability table (shipped name or file).
    pub table: String,
    /// "title; standard; edition" of the table.
    pub table_line: String,
    /// The stiffness preset of the analysis (`gross`, `aci-service`).
    pub stiffness: String,
    pub limits: ServiceLimits,
    pub cases: Vec<ServiceCase>,
    pub stories: Vec<StoryVerdict>,
    pub beams: Vec<BeamVerdict>,
    pub seismic: Vec<SeismicVerdict>,
    /// The deflected shape of the governing service case ([`ServiceReport::governing_case`]).
    pub shape: Option<DeflectedShape>,
    /// What the figures are, in plain words.
    pub notes: Vec<String>,
    pub caution: String,
}

impl ServiceReport {
    /// The governing service case: the largest story drift ratio against its limit, else the
    /// largest drift ratio, else the case of the largest beam deflection ratio.
    pub fn governing_case(&self) -> Option<&ServiceCase> {
        let by_drift = self
            .stories
            .iter()
            .filter_map(|s| s.governing.as_ref().map(|g| (g.ratio, &g.case)))
            .chain(
                self.stories
                    .iter()
                    .filter(|s| s.governing.is_none())
                    .map(|s| (0.0, &s.largest_case)),
            )
            .chain(
                self.beams
                    .iter()
                    .filter_map(|b| b.total.as_ref().map(|g| (0.0, &g.case))),
            )
            .max_by(|a, b| a.0.total_cmp(&b.0));
        let id = by_drift.map(|(_, c)| c.clone())?;
        self.cases.iter().find(|c| c.id == id)
    }

    /// Whether every figure with a limit is within it and every case converged.
    pub fn all_within_limits(&self) -> bool {
        self.stories
            .iter()
            .all(|s| s.unstable_case.is_none() && s.governing.as_ref().is_none_or(|g| g.ok()))
            && self
                .beams
                .iter()
                .all(|b| b.ratio().is_none_or(|r| r <= 1.0))
            && self.seismic.iter().all(|s| s.ratio <= 1.0)
    }
}

/// The stiffness a serviceability run of `model` uses, with the model's analysis options
/// set to it.
pub fn service_model(model: &Model) -> Model {
    let mut m = model.clone();
    m.analysis.stiffness = model.analysis.service_stiffness_or_default();
    m
}

/// Run the serviceability check of `model` (its stiffness already the service one, see
/// [`service_model`]) for the service `cases`.
pub fn service_check(
    model: &Model,
    cases: &[FactoredCase],
    limits: &ServiceLimits,
    table: (&str, &str),
) -> Result<ServiceReport, CheckError> {
    if cases.is_empty() {
        return Err(CheckError::NoCases);
    }
    let stories = stories(model)?;
    let first = FirstOrder::new(model, &[])?;
    let stiffness = member_stiffness(model);
    let second = SecondOrderModel::new(model, &stiffness, model.analysis.segments)?;
    // Each load case used is solved once; cases combine them by factors (linearity).
    let mut used: Vec<usize> = cases
        .iter()
        .flat_map(|c| c.factors.iter().map(|&(k, _)| k))
        .chain(seismic_cases(model, limits))
        .collect();
    used.sort_unstable();
    used.dedup();
    let mut solutions: BTreeMap<usize, Solution> = BTreeMap::new();
    for k in used {
        solutions.insert(k, first.solve_case(model, k)?);
    }
    let ctx = Ctx {
        model,
        stories: &stories,
        second: &second,
        stiffness: &stiffness,
        solutions: &solutions,
        limits,
    };
    let checked = crate::solve::parallel::map_in_order(cases, |fc| ctx.case(fc), &mut |_, _| {});
    let (cases, mut shapes): (Vec<ServiceCase>, Vec<Vec<[f64; 3]>>) = checked
        .into_iter()
        .collect::<Result<Vec<_>, _>>()?
        .into_iter()
        .unzip();
    let story_verdicts = story_verdicts(&stories, &cases);
    let beams = beam_verdicts(&cases, limits);
    let seismic = seismic_verdicts(model, &stories, &solutions, limits);
    let mut report = ServiceReport {
        table: table.0.to_string(),
        table_line: table.1.to_string(),
        stiffness: model.analysis.stiffness.to_string(),
        limits: limits.clone(),
        cases,
        stories: story_verdicts,
        beams,
        seismic,
        shape: None,
        notes: vec![SERVICE_NOTE.to_string()],
        caution: CAUTION.to_string(),
    };
    if let Some(k) = report
        .governing_case()
        .and_then(|g| report.cases.iter().position(|c| c.id == g.id))
    {
        report.shape = Some(DeflectedShape {
            case: report.cases[k].id.clone(),
            displacements: std::mem::take(&mut shapes[k]),
        });
    }
    Ok(report)
}

/// What the serviceability figures are, in plain words.
pub const SERVICE_NOTE: &str = "Service drifts and deflections are under the serviceability \
combinations at service load, with the service stiffness, no notional loads and no \
amplifiers; the story drift is that of a P-Δ analysis at the service load. Beam deflection \
is first order, relative to the chord between the beam's ends (a cantilever: its tip \
relative to its supported end).";

/// The model's seismic load cases, when the seismic limits apply.
fn seismic_cases<'a>(model: &'a Model, limits: &ServiceLimits) -> impl Iterator<Item = usize> + 'a {
    let on = limits.seismic.is_some();
    model
        .load_cases
        .iter()
        .enumerate()
        .filter(move |(_, c)| on && c.category == ActionCategory::Seismic)
        .map(|(k, _)| k)
}

/// What every service case shares.
struct Ctx<'a> {
    model: &'a Model,
    stories: &'a [Story],
    second: &'a SecondOrderModel,
    stiffness: &'a [MemberStiffness],
    solutions: &'a BTreeMap<usize, Solution>,
    limits: &'a ServiceLimits,
}

impl Ctx<'_> {
    /// The first-order solution `Σ f·case` of `factors`.
    fn combined(&self, factors: &[(usize, f64)]) -> Option<Solution> {
        let refs: Vec<(f64, &Solution)> = factors
            .iter()
            .filter_map(|&(k, f)| self.solutions.get(&k).map(|s| (f, s)))
            .collect();
        (!refs.is_empty()).then(|| Solution::combine(&refs))
    }

    /// Check one service case; also its node displacements.
    fn case(&self, fc: &FactoredCase) -> Result<(ServiceCase, Vec<[f64; 3]>), CheckError> {
        let model = self.model;
        let first = self.combined(&fc.factors).ok_or(CheckError::NoCases)?;
        let mut loads = MeshLoads::zero(&self.second.mesh);
        for &(k, f) in &fc.factors {
            loads.add_case(model, &self.second.mesh, k, f);
        }
        let (second, reason) = match self.second.direct(model, &loads)? {
            SecondOrderOutcome::Converged { solution, .. } => (Some(solution), None),
            SecondOrderOutcome::Unstable { reason } => (None, Some(reason)),
        };
        let first_drifts: Vec<f64> = self
            .stories
            .iter()
            .map(|st| drift_of(st, &first.displacements))
            .collect();
        let largest = self
            .stories
            .iter()
            .zip(&first_drifts)
            .map(|(st, d)| (d / st.height()).abs())
            .filter(|r| r.is_finite())
            .fold(0.0, f64::max);
        let stories = self
            .stories
            .iter()
            .zip(&first_drifts)
            .map(|(st, &d1)| {
                let d2 = second.as_ref().map(|s| drift_of(st, &s.displacements));
                ServiceStory {
                    story: st.number,
                    height: st.height(),
                    drift_first_order: d1,
                    drift_second_order: d2,
                    amplification: d2
                        .filter(|_| drift_is_significant(d1, st.height(), largest))
                        .map(|d2| d2 / d1),
                }
            })
            .collect();
        let categories: Vec<ActionCategory> = fc
            .factors
            .iter()
            .filter(|(_, f)| *f != 0.0)
            .map(|&(k, _)| model.load_cases[k].category)
            .collect();
        let live: Vec<(usize, f64)> = fc
            .factors
            .iter()
            .copied()
            .filter(|&(k, _)| VARIABLE_GRAVITY.contains(&model.load_cases[k].category))
            .collect();
        let live_solution = self.combined(&live);
        let beams = beam_members(model)
            .into_iter()
            .map(|(m, cantilever)| {
                let (total, total_x) =
                    beam_deflection(model, self.stiffness, &first, &fc.factors, m, cantilever);
                let live = live_solution.as_ref().map_or(0.0, |s| {
                    beam_deflection(model, self.stiffness, s, &live, m, cantilever).0
                });
                ServiceBeam {
                    member: model.members[m].id.clone(),
                    length: model.length(m),
                    cantilever: cantilever.is_some(),
                    total,
                    total_x,
                    live,
                }
            })
            .collect();
        let converged = second.is_some();
        let displacements = second.unwrap_or(first).displacements;
        let case = ServiceCase {
            id: fc.id.clone(),
            expression: fc.expression.clone(),
            converged,
            reason,
            drift_limit: self
                .limits
                .drift_limit(&categories)
                .map(|(n, c)| (n, c.to_string())),
            stories,
            beams,
        };
        Ok((case, displacements))
    }
}

/// The beams of `model`, each with its free end (0 = end i, 1 = end j) when it is a
/// cantilever: an end node with no support that no other member meets.
pub fn beam_members(model: &Model) -> Vec<(usize, Option<usize>)> {
    let mut meets = vec![0usize; model.nodes.len()];
    for mem in &model.members {
        meets[mem.i] += 1;
        meets[mem.j] += 1;
    }
    let supported = |n: usize| model.supports.iter().any(|s| s.node == n);
    let free = |n: usize| meets[n] == 1 && !supported(n);
    model
        .members
        .iter()
        .enumerate()
        .filter(|(_, mem)| mem.role == Role::Beam)
        .map(|(m, mem)| {
            let end = match (free(mem.i), free(mem.j)) {
                (true, false) => Some(0),
                (false, true) => Some(1),
                _ => None,
            };
            (m, end)
        })
        .collect()
}

/// Largest deflection of beam `m` in `solution` (first order, under the member loads of
/// `factors`) and where, from end i: relative to the chord between its end nodes, or for a
/// cantilever with its free end `cantilever` the tip's transverse displacement relative to
/// its supported end. m, local y.
pub fn beam_deflection(
    model: &Model,
    stiffness: &[MemberStiffness],
    solution: &Solution,
    factors: &[(usize, f64)],
    m: usize,
    cantilever: Option<usize>,
) -> (f64, f64) {
    let length = model.length(m);
    if let Some(tip) = cantilever {
        let (v_i, v_j) = solution.transverse_end_displacements(model, m);
        return if tip == 1 {
            (v_j - v_i, length)
        } else {
            (v_i - v_j, 0.0)
        };
    }
    let loads = &combined_member_loads(model, factors)[m];
    // v(0) = v(L) = 0: the deflection measured from the chord (closed form of the beam's
    // deflected shape, `solve::beam::deflection_at`).
    let e = deflection_extremes(
        length,
        stiffness[m].ei,
        &solution.end_forces[m],
        loads,
        0.0,
        0.0,
    );
    let (x_max, v_max) = e.max;
    let (x_min, v_min) = e.min;
    if v_max.abs() >= v_min.abs() {
        (v_max, x_max)
    } else {
        (v_min, x_min)
    }
}

/// Each story's largest service drift over the cases and its governing case against the
/// case's limit.
fn story_verdicts(stories: &[Story], cases: &[ServiceCase]) -> Vec<StoryVerdict> {
    stories
        .iter()
        .enumerate()
        .map(|(s, st)| {
            let h = st.height();
            let mut largest = (0.0_f64, String::new());
            let mut governing: Option<Governing> = None;
            let mut unstable = None;
            for c in cases {
                if !c.converged && unstable.is_none() {
                    unstable = Some(c.id.clone());
                }
                let d = c.stories[s].drift();
                let r = (d / h).abs();
                if r > largest.0 || largest.1.is_empty() {
                    largest = (r, c.id.clone());
                }
                if let Some((n, _)) = &c.drift_limit {
                    let limit = h / n;
                    let g = Governing {
                        value: d,
                        limit,
                        ratio: d.abs() / limit,
                        case: c.id.clone(),
                    };
                    if governing.as_ref().is_none_or(|b| g.ratio > b.ratio) {
                        governing = Some(g);
                    }
                }
            }
            StoryVerdict {
                story: st.number,
                height: h,
                largest_ratio: largest.0,
                largest_case: largest.1,
                governing,
                unstable_case: unstable,
            }
        })
        .collect()
}

/// Each beam's governing live and total deflection against L/N (2L for a cantilever when
/// the table says so).
fn beam_verdicts(cases: &[ServiceCase], limits: &ServiceLimits) -> Vec<BeamVerdict> {
    let Some(first) = cases.first() else {
        return Vec::new();
    };
    (0..first.beams.len())
        .map(|b| {
            let beam = &first.beams[b];
            let limit_length = if beam.cantilever {
                limits.cantilever_factor * beam.length
            } else {
                beam.length
            };
            let worst = |n: Option<f64>, pick: &dyn Fn(&ServiceBeam) -> f64| {
                let n = n?;
                let limit = limit_length / n;
                cases
                    .iter()
                    .map(|c| {
                        let v = pick(&c.beams[b]);
                        Governing {
                            value: v,
                            limit,
                            ratio: v.abs() / limit,
                            case: c.id.clone(),
                        }
                    })
                    .reduce(|a, g| if g.ratio > a.ratio { g } else { a })
            };
            let (largest, largest_case) = cases
                .iter()
                .map(|c| (c.beams[b].total.abs(), &c.id))
                .fold((0.0, first.id.clone()), |a, (v, id)| {
                    if v > a.0 { (v, id.clone()) } else { a }
                });
            BeamVerdict {
                member: beam.member.clone(),
                length: beam.length,
                cantilever: beam.cantilever,
                limit_length,
                live: worst(limits.deflection_live, &|x| x.live),
                total: worst(limits.deflection_total, &|x| x.total),
                largest,
                largest_case,
            }
        })
        .collect()
}

/// Seismic story drift by ASCE/SEI 7-16 §12.8.6: δx = Cd·δxe/Ie with δxe the elastic drift
/// of each seismic load case (strength level, first order), against Δa of Table 12.12-1
/// (§12.12.1) for the risk category; the governing seismic case per story.
fn seismic_verdicts(
    model: &Model,
    stories: &[Story],
    solutions: &BTreeMap<usize, Solution>,
    limits: &ServiceLimits,
) -> Vec<SeismicVerdict> {
    let Some(s) = limits.seismic else {
        return Vec::new();
    };
    let cases: Vec<usize> = seismic_cases(model, limits).collect();
    stories
        .iter()
        .filter_map(|st| {
            cases
                .iter()
                .filter_map(|k| Some((*k, solutions.get(k)?)))
                .map(|(k, sol)| {
                    let delta_xe = drift_of(st, &sol.displacements);
                    // ASCE/SEI 7-16 (12.8-15): δx = Cd·δxe/Ie (from memory).
                    let delta = s.cd * delta_xe / s.ie;
                    let allowable = s.allowable_ratio * st.height();
                    SeismicVerdict {
                        story: st.number,
                        height: st.height(),
                        case: model.load_cases[k].id.clone(),
                        delta_xe,
                        delta,
                        allowable,
                        ratio: delta.abs() / allowable,
                    }
                })
                .reduce(|a, b| if b.ratio > a.ratio { b } else { a })
        })
        .collect()
}

/// Words for a service stiffness preset, with its clause.
pub fn stiffness_words(p: StiffnessPreset) -> &'static str {
    match p {
        StiffnessPreset::AciService => {
            "aci-service: ACI 318-19 §6.6.3.2.2, 1.4 × Table 6.6.3.1.1(a) not above Ig \
             (0.98 Ig columns, 0.49 Ig beams, 1.0 Ag; from memory)"
        }
        StiffnessPreset::Gross => "gross: gross section properties",
        StiffnessPreset::AciCracked => "aci-cracked: ACI 318-19 Table 6.6.3.1.1(a)",
        StiffnessPreset::AiscDirect => "aisc-direct: AISC 360-16 §C2.3, 0.8·EI, 0.8·EA",
    }
}
