//! Per-member results of one factored case: moments at both ends and along the span, each
//! as no-sway part, sway part, amplifiers and design value, with axial force and shear.
//!
//! Moments are internal bending moments, positive with the member's local −y face in
//! tension (see [`crate::solve::forces`]).
//!
//! Every method's design moment along a member is one diagram, a [`Diagram`]:
//! `k_ns·Mns(x) + k_s·Ms(x)` (AISC 360-16 App. 8 A-8-1 `Mr = B1·Mnt + B2·Mlt`; ACI 318-19
//! 6.6.4.6.1 `M = Mns + δs·Ms`; EN 1993-1-1 5.2.2(5)B sway effects × 1/(1 − 1/α_cr)). Its
//! span extremes are found exactly on that combined diagram, never on one of its parts.

use serde::Serialize;

use super::story::{StoryFigures, SwayRoute};
use super::{aci, aisc};
use crate::model::{LocalLoad, Model, Role, SecondOrderMethod};
use crate::solve::Solution;
use crate::solve::beam::{
    Side, SpanExtremes, breakpoints, has_transverse_load, internal_forces_at, span_extremes,
};
use crate::solve::forces::EndForces;
use crate::solve::mesh::MemberStiffness;
use crate::stories::Story;

/// A converged direct second-order solution at the case's load level and the extreme
/// moments along each member.
pub type DirectSolution = (Solution, Vec<SpanExtremes>);

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
    /// The moment of the case's direct second-order analysis at this section (same
    /// loads, notional forces and stiffness), N·m; None where that analysis did not
    /// converge or the section is not an end or a governing section of it.
    pub second_order: Option<f64>,
}

/// Results of one member under one factored case (SI units).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct MemberCheck {
    pub member: String,
    pub role: crate::model::Role,
    /// First-order axial force at the most compressed section along the member (the least
    /// N(x)), N, tension positive.
    pub axial: f64,
    /// Largest first-order compression along the member (Pu of ACI, EN 1993-1-1 N_Ed), N;
    /// 0 in tension.
    pub compression: f64,
    /// AISC 360-16 A-8-2 `Pr = Pnt + B2·Plt`, the largest along the member, N, compression
    /// positive (0 in tension); only with the AISC B1/B2 method and a stable story (B2
    /// exists). B1 uses it.
    pub p_r: Option<f64>,
    /// Largest first-order end shear, N.
    pub shear: f64,
    /// Design axial force and shear at end i and end j, N, following the method: AISC
    /// 360-16 App. 8 `Pnt + B2·Plt` (and `Vnt + B2·Vlt`, from memory); EN 1993-1-1
    /// 5.2.2(5)B no-sway + sway × 1/(1 − 1/α_cr); ACI 318-19 first-order (6.6.4.6.1
    /// magnifies moments only); the case's second-order analysis on its route.
    pub end_actions: [EndAction; 2],
    /// The least and the greatest design axial force along the member, N, tension positive
    /// (as `end_actions`).
    pub design_axial: (f64, f64),
    /// Moments at end i and end j.
    pub ends: [MomentCheck; 2],
    /// The design moment within the span: the larger-magnitude extreme of the design
    /// diagram inside the span (else at an end); for an ACI 318 column, Mc = δ·M2 at the
    /// section of M2 (6.6.4.5.1).
    pub span: MomentCheck,
    /// `span` is Mc = δ·M2 of an ACI 318-19 column (6.6.4.5.1), its design moment along
    /// the member, enveloped as the span value even where M2 sits at an end.
    pub span_is_mc: bool,
    /// Largest (most positive, sagging for a beam drawn left to right) moment of the design
    /// diagram over the whole member, ends included, with its x (exact).
    pub span_max: MomentCheck,
    /// Smallest (most negative, hogging) moment of the design diagram over the whole member,
    /// ends included, with its x (exact).
    pub span_min: MomentCheck,
    /// Cm (AISC A-8-4 / ACI 6.6.4.5.3), for members in compression.
    pub c_m: Option<f64>,
    /// Critical load used for the non-sway amplifier: Pe1 (AISC A-8-5) or Pc
    /// (ACI 6.6.4.4.2), N.
    pub p_critical: Option<f64>,
    /// Non-sway amplifier: B1 (AISC) or δ (ACI); 1 where none applies.
    pub non_sway_amplifier: Option<f64>,
    /// Sway amplifier applied to the member's sway moments: B2, δs (1 in a non-sway ACI
    /// story), 1/(1 − 1/α_cr); None on the second-order route (`second_order`) or when
    /// unstable.
    pub sway_amplifier: Option<f64>,
    /// The design moments are those of the case's direct second-order analysis (the direct
    /// method, or a story whose route is [`SwayRoute::SecondOrderAnalysis`]).
    pub second_order: bool,
    pub governs: Part,
    /// False when the member (or its story) is unstable under the case: AISC α·Pr ≥ Pe1
    /// (A-8-3), an unstable story, a direct analysis that did not converge. The case is
    /// then unstable.
    pub stable: bool,
    /// False when a limit of the standard rules out this member's design as sized under
    /// the case, without the frame being unstable: ACI 318-19 Pu ≥ 0.75·Pc (6.6.4.5.2, no
    /// δ exists; Mc is then not given) or a second-order moment above 1.4 × first-order
    /// (6.2.5.3, from memory). The notes say which; the case's other results stand.
    pub within_limits: bool,
    pub notes: Vec<String>,
}

/// What [`members`] needs.
pub struct MemberInput<'a> {
    pub model: &'a Model,
    pub stories: &'a [Story],
    /// The stories of each member, as [`crate::stories::member_stories`] finds them.
    pub member_stories: &'a [Vec<usize>],
    pub stiffness: &'a [MemberStiffness],
    pub no_sway: &'a Solution,
    pub sway: &'a Solution,
    /// Member loads of the case, local axes, per member.
    pub loads: &'a [Vec<LocalLoad>],
    pub figures: &'a [StoryFigures],
    /// The direct second-order solution (scaled back to the case's loads) and its span
    /// extremes, when it converged.
    pub direct: Option<&'a DirectSolution>,
    pub alpha: f64,
    /// The largest first-order end moment of any member in the case, N·m: below
    /// [`ROUND_OFF`] of it a moment is round-off.
    pub moment_scale: f64,
}

/// Moments below this fraction of the case's largest are round-off (a pin-ended member's
/// end moments, for example).
pub const ROUND_OFF: f64 = 1e-9;

/// A design diagram along one member: `k_ns·Mns(x) + k_s·Ms(x)` (and likewise N(x)).
///
/// The no-sway part is the statics of its end actions with the member loads, the sway part
/// that of its end actions alone (the sway solution carries level forces only). Statics is
/// linear, so the combination is the diagram of the end actions `k_ns·F_ns + k_s·F_s` under
/// the member loads × `k_ns`: a piecewise polynomial between the same load discontinuities
/// ([`breakpoints`]), whose extremes [`span_extremes`] finds exactly (zeros of the shear
/// per piece, in closed form), never by sampling.
#[derive(Debug, Clone, Copy)]
pub struct Diagram<'a> {
    pub length: f64,
    pub no_sway: &'a EndForces,
    pub sway: &'a EndForces,
    pub loads: &'a [LocalLoad],
    /// Factor on the no-sway part (B1 of AISC; 1 otherwise).
    pub k_ns: f64,
    /// Factor on the sway part (B2, δs, 1/(1 − 1/α_cr) or Δ2nd/Δ1st).
    pub k_s: f64,
}

impl Diagram<'_> {
    /// The factors, or 1 and 1 where an amplifier does not exist (an unstable member or
    /// story): positions are then those of the first-order diagram.
    fn factors(&self) -> (f64, f64) {
        if self.k_ns.is_finite() && self.k_s.is_finite() {
            (self.k_ns, self.k_s)
        } else {
            (1.0, 1.0)
        }
    }

    /// End actions and member loads whose statics is the combined diagram.
    fn combined(&self) -> (EndForces, Vec<LocalLoad>) {
        let (k_ns, k_s) = self.factors();
        let (a, b) = (self.no_sway.to_array(), self.sway.to_array());
        let end = EndForces::from_array(std::array::from_fn(|k| k_ns * a[k] + k_s * b[k]));
        let loads = self.loads.iter().map(|q| q.scaled(k_ns)).collect();
        (end, loads)
    }

    /// `(Mns, Ms)` at `x` on `side` of a concentrated load there.
    fn parts(&self, x: f64, side: Side) -> (f64, f64) {
        (
            internal_forces_at(x, side, self.no_sway, self.loads).m,
            internal_forces_at(x, side, self.sway, &[]).m,
        )
    }

    /// The design value of the parts `(Mns, Ms)` (NaN where an amplifier does not exist).
    pub fn design(&self, parts: (f64, f64)) -> f64 {
        self.k_ns * parts.0 + self.k_s * parts.1
    }

    /// Exact largest and smallest moment of the combined diagram over `0..=L`.
    pub fn extremes(&self) -> SpanExtremes {
        let (end, loads) = self.combined();
        span_extremes(self.length, &end, &loads)
    }

    /// `(Mns, Ms)` at a point `(x, M)` of the combined diagram, on the side of a
    /// concentrated moment at `x` where the combined diagram takes the value `M` (at the
    /// ends, the value just inside the member).
    fn parts_at(&self, point: (f64, f64)) -> (f64, f64) {
        let (k_ns, k_s) = self.factors();
        let value = |p: (f64, f64)| k_ns * p.0 + k_s * p.1;
        let left = self.parts(point.0, Side::Left);
        if point.0 >= self.length {
            return left;
        }
        let right = self.parts(point.0, Side::Right);
        if (value(right) - point.1).abs() < (value(left) - point.1).abs() {
            right
        } else {
            left
        }
    }

    /// The least axial force N(x) of the combined diagram along the member (the most
    /// compressive), N, tension positive. N is piecewise linear (linearly varying axial
    /// loads give a quadratic, monotonic within a piece where qx keeps its sign; both
    /// one-sided values at every breakpoint and each piece's midpoint are examined, which
    /// is exact for loads of one sign per piece).
    pub fn least_axial(&self) -> f64 {
        self.axial_range().0
    }

    /// The least and the greatest N(x) along the member, N (see [`Self::least_axial`]).
    pub fn axial_range(&self) -> (f64, f64) {
        let (end, loads) = self.combined();
        let n = |x: f64, side: Side| internal_forces_at(x, side, &end, &loads).n;
        let bps = breakpoints(self.length, &loads);
        let mut values = vec![n(0.0, Side::Right), n(self.length, Side::Left)];
        for w in bps.windows(2) {
            values.extend([
                n(w[0], Side::Right),
                n(0.5 * (w[0] + w[1]), Side::Left),
                n(w[1], Side::Left),
            ]);
        }
        values
            .into_iter()
            .fold((f64::INFINITY, f64::NEG_INFINITY), |(lo, hi), v| {
                (lo.min(v), hi.max(v))
            })
    }

    /// Axial force and shear at end i and end j of the diagram (signs of
    /// [`crate::solve::forces`]: N tension positive, V = dM/dx).
    pub fn end_actions(&self) -> [EndAction; 2] {
        let (end, _) = self.combined();
        // N(0) = −Fx_i, V(0) = Fy_i; at j the member's equilibrium gives N(L) = Fx_j and
        // V(L) = −Fy_j (statics of the free body 0..L).
        [
            EndAction {
                axial: -end.i[0],
                shear: end.i[1],
            },
            EndAction {
                axial: end.j[0],
                shear: -end.j[1],
            },
        ]
    }
}

/// The design axial force and shear at one member end, N (N tension positive, V = dM/dx).
#[derive(Debug, Clone, Copy, PartialEq, Default, Serialize)]
pub struct EndAction {
    pub axial: f64,
    pub shear: f64,
}

/// Internal moments at the two ends of member `m` in `s`.
fn end_moments(s: &Solution, m: usize) -> [f64; 2] {
    let e = &s.end_forces[m];
    [-e.i[2], e.j[2]]
}

/// Whether `x` lies strictly inside a member of length `l` (relative tolerance 1e-9).
fn inside(x: f64, l: f64) -> bool {
    x > 1e-9 * l && x < l * (1.0 - 1e-9)
}

/// The larger-magnitude of two `(x, M)` points (the first on a tie).
fn larger(a: (f64, f64), b: (f64, f64)) -> (f64, f64) {
    if a.1.abs() >= b.1.abs() { a } else { b }
}

/// The span moment to report `(x, M)`: the larger-magnitude extreme lying inside the span
/// (a beam's sagging moment between hogging ends), else the larger-magnitude extreme at an
/// end (a member without loads along it).
fn span_moment(e: &SpanExtremes, l: f64) -> (f64, f64) {
    match (inside(e.max.0, l), inside(e.min.0, l)) {
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

/// [`c_m`] with end moments below [`ROUND_OFF`] of the case's moment scale `scale` taken as
/// zero, so that no ratio of round-off decides Cm: where both ends are round-off the member
/// has no end moments to form M1/M2 from and Cm = 1.0, the upper bound of A-8-4 (common
/// practice, no source); where only M1 is, M1/M2 = 0 and Cm = 0.6.
pub fn c_m_significant(ends: [f64; 2], scale: f64) -> f64 {
    let tiny = ROUND_OFF * scale;
    c_m(ends.map(|m| if m.abs() <= tiny { 0.0 } else { m }))
}

/// A moment exceeds the 1.4 limit only by more than this share of the member's moment
/// scale (its largest design or first-order moment in the case): an end moment that is a
/// small fraction of what the member carries elsewhere, or round-off on a member with no
/// moment, decides nothing (common practice, no source).
pub const ACI_LIMIT_TOLERANCE: f64 = 0.01;

/// Ratio of a second-order moment to its first-order moment when it exceeds the 1.4 limit
/// of ACI 318-19 6.2.5.3 (from memory) by more than [`ACI_LIMIT_TOLERANCE`] × `scale`,
/// else `None`.
fn above_aci_limit(design: f64, first_order: f64, scale: f64) -> Option<f64> {
    let excess = design.abs() - aci::SECOND_ORDER_LIMIT * first_order.abs();
    (excess > ACI_LIMIT_TOLERANCE * scale && excess.is_finite())
        .then(|| design.abs() / first_order.abs())
}

/// Check every member.
pub fn members(input: &MemberInput) -> Vec<MemberCheck> {
    (0..input.model.members.len())
        .map(|m| member(input, m))
        .collect()
}

/// Mc of an ACI 318-19 column: δ·M2 at the section of M2.
struct AciColumn {
    /// Section of M2 and M2 itself (on the diagram Mns + δs·Ms, or the first-order total in
    /// a non-sway story), raised to M2,min where needed.
    x: f64,
    /// `(Mns, Ms)` at that section.
    parts: (f64, f64),
    m2: f64,
    c_m: f64,
    raised_to_min: bool,
}

/// M2 and Cm of an ACI 318-19 column on the design diagram `d` (6.6.4.5.3, 6.6.4.6.4):
/// * no transverse load between the ends: M2 the larger end moment, M1 the smaller,
///   `Cm = 0.6 − 0.4·M1/M2` (6.6.4.5.3(a));
/// * transverse load between the ends: `Cm = 1.0` (6.6.4.5.3(b)) and M2 the largest moment
///   anywhere along the member (commentary R6.6.4.5.3, from memory), at its own section;
/// * M2 at least `M2,min = Pu·(15 + 0.03h)` mm (6.6.4.5.4 of ACI 318M; 0.6 in for a model
///   in inch-pound units, [`aci::e_min_for`]) where the depth h is known, keeping the sign
///   of M2.
fn aci_column(d: &Diagram, p_u: f64, depth: Option<f64>, e_min: f64) -> AciColumn {
    let end_parts = [d.parts(0.0, Side::Right), d.parts(d.length, Side::Left)];
    let ends = end_parts.map(|p| d.design(p));
    let (x, parts, c_m) = if has_transverse_load(d.loads) {
        let e = d.extremes();
        let point = larger(e.max, e.min);
        (point.0, d.parts_at(point), 1.0)
    } else if ends[0].abs() >= ends[1].abs() {
        (0.0, end_parts[0], c_m(ends))
    } else {
        (d.length, end_parts[1], c_m(ends))
    };
    let m2 = d.design(parts);
    let min = depth.map_or(0.0, |h| aci::m2_min(p_u, h, e_min));
    let raised_to_min = m2.abs() < min;
    AciColumn {
        x,
        parts,
        m2: if raised_to_min {
            min.copysign(if m2 == 0.0 { 1.0 } else { m2 })
        } else {
            m2
        },
        // 6.6.4.5.4: where M2,min exceeds M2, Cm = 1.0 (or from the end moments; 1.0 is
        // taken, the end moments being then small or zero).
        c_m: if raised_to_min { 1.0 } else { c_m },
        raised_to_min,
    }
}

fn member(input: &MemberInput, m: usize) -> MemberCheck {
    let model = input.model;
    let mem = &model.members[m];
    let l = model.length(m);
    let loads = input.loads[m].as_slice();
    let ns = end_moments(input.no_sway, m);
    let sw = end_moments(input.sway, m);
    let ns_end = &input.no_sway.end_forces[m];
    let sw_end = &input.sway.end_forces[m];
    let diagram = |k_ns: f64, k_s: f64| Diagram {
        length: l,
        no_sway: ns_end,
        sway: sw_end,
        loads,
        k_ns,
        k_s,
    };
    let first_order = diagram(1.0, 1.0);
    let axial = first_order.least_axial();
    let compression = (-axial).max(0.0);
    let shear = (ns_end.i[1] + sw_end.i[1])
        .abs()
        .max((ns_end.j[1] + sw_end.j[1]).abs());
    let method = model.analysis.method;
    let is_column = mem.role == Role::Column;

    let mut notes = Vec::new();
    let mut stable = true;
    let mut within_limits = true;
    // The route of the member's stories: the second-order analysis's moments if any of
    // them takes that route (always with the direct method), else the largest sway
    // amplifier among them (1 for a member in no story).
    let in_stories = &input.member_stories[m];
    let figures: Vec<&StoryFigures> = in_stories.iter().map(|&k| &input.figures[k]).collect();
    let story_unstable = figures.iter().any(|f| f.route == SwayRoute::None);
    // A member in no story (a grade beam, a link at the base) follows the case: every
    // story of a case takes the same route (`story::one_route_per_case`).
    let second_order = method == SecondOrderMethod::Direct
        || figures
            .iter()
            .any(|f| f.route == SwayRoute::SecondOrderAnalysis)
        || (figures.is_empty()
            && input
                .figures
                .iter()
                .any(|f| f.route == SwayRoute::SecondOrderAnalysis));
    if story_unstable {
        stable = false;
        notes.push("its story is unstable under this case".into());
    }
    let direct = input.direct.filter(|_| second_order);
    if second_order && direct.is_none() {
        stable = false;
        notes.push("direct second-order analysis did not converge".into());
    }
    let sway_amp = if story_unstable || second_order {
        None
    } else {
        Some(
            figures
                .iter()
                .filter_map(|f| f.sway_amplifier)
                .fold(1.0, f64::max),
        )
    };
    let amp_s = sway_amp.unwrap_or(f64::NAN);
    let transverse = has_transverse_load(loads);
    // The design diagram's end actions on the second-order route: the direct analysis's
    // end actions, joined by the statics of the member loads (P-δ between the ends is in
    // the analysis's own span extremes, used for the span values below).
    let zero = EndForces::default();
    let direct_diagram = direct.map(|(d, _)| Diagram {
        length: l,
        no_sway: &d.end_forces[m],
        sway: &zero,
        loads,
        k_ns: 1.0,
        k_s: 1.0,
    });
    // The diagram the member formulas read: the amplified one, or the second-order one.
    let basis = match (&direct_diagram, second_order) {
        (Some(d), true) => *d,
        _ => diagram(1.0, amp_s),
    };

    // The design axial forces and shears (issue 17): AISC 360-16 A-8-2 Pr = Pnt + B2·Plt,
    // and B2 on the lateral-translation part of the shear like the moments (from memory);
    // EN 1993-1-1 5.2.2(5)B amplifies every sway effect by 1/(1 − 1/α_cr); ACI 318-19
    // 6.6.4.6.1 magnifies moments only, so Pu and Vu stay first-order (from memory). The
    // second-order route takes the analysis's own forces.
    let forces = match (&direct_diagram, second_order) {
        (Some(d), true) => *d,
        _ => match method {
            SecondOrderMethod::AiscB1B2 | SecondOrderMethod::Ec3AlphaCr => diagram(1.0, amp_s),
            SecondOrderMethod::AciMagnifier | SecondOrderMethod::Direct => first_order,
        },
    };
    let end_actions = forces.end_actions();
    let design_axial = forces.axial_range();

    // AISC A-8-2: Pr = Pnt + B2·Plt, the largest compression along the member (on the
    // second-order route the analysis's own axial force).
    let p_r = (method == SecondOrderMethod::AiscB1B2 && basis.k_s.is_finite())
        .then(|| (-basis.least_axial()).max(0.0));
    // A pin-ended member with no load along it carries no moment: no B1 or δ applies, its
    // buckling is its own member check (AISC 360-16 Ch. E, ACI 318-19 6.6.4.5 magnifies
    // moments; common practice, no source).
    let pin_ended = mem.release_i && mem.release_j && !transverse;
    // M2 and Cm of an ACI column on the diagram Mns + δs·Ms (6.6.4.6.1, 6.6.4.6.4), on the
    // first-order total in a non-sway story, or on the second-order analysis's end moments
    // (6.6.4.6.2(c)).
    let aci_col = (method == SecondOrderMethod::AciMagnifier
        && is_column
        && !pin_ended
        && compression > 0.0
        && basis.k_s.is_finite())
    .then(|| {
        aci_column(
            &basis,
            compression,
            model.sections[mem.section].depth,
            aci::e_min_for(&model.units),
        )
    });

    // Cm and the non-sway amplifier by method. On the second-order route of AISC the
    // analysis includes P-δ (segmented members), so B1 does not apply.
    let (c_m, p_critical, amp_ns) = match (method, p_r, &aci_col) {
        (SecondOrderMethod::AiscB1B2, Some(p_r), _) if p_r > 0.0 && !second_order && !pin_ended => {
            // A-8-4 from the no-sway end moments Mnt; 1.0 with transverse load (the
            // conservative value A-8-4 permits, from memory). A-8-5 with K1 = 1.0 and EI*
            // the stiffness used in the analysis.
            let cm = if transverse {
                1.0
            } else {
                c_m_significant(ns, input.moment_scale)
            };
            let pe1 = aisc::p_e1(input.stiffness[m].ei, l);
            let b1 = aisc::b1(cm, input.alpha, p_r, pe1);
            if b1.is_none() {
                stable = false;
                notes.push(
                    "α·Pr ≥ Pe1: the member buckles in the plane of bending (AISC 360-16 A-8-3)"
                        .into(),
                );
            }
            (Some(cm), Some(pe1), b1)
        }
        (SecondOrderMethod::AciMagnifier, _, Some(col)) => {
            // 6.6.4.4.4(a) with the gross section and k = 1.0 (6.6.4.4.3 permits 1.0 for
            // non-sway members, from memory).
            let section = &model.sections[mem.section];
            let e = model.materials[mem.material].e;
            let pc = aci::p_c(
                aci::ei_eff(e, section.inertia, model.analysis.beta_dns),
                1.0,
                l,
            );
            let delta = aci::delta_ns(col.c_m, compression, pc);
            if delta.is_none() {
                within_limits = false;
                notes.push(
                    "Pu ≥ 0.75·Pc: ACI 318-19 6.6.4.5.2 gives no δ and does not permit this column as sized; Mc is not given (the frame's stability is judged by the story and buckling figures)"
                        .into(),
                );
            }
            (Some(col.c_m), Some(pc), delta)
        }
        _ => (None, None, Some(1.0)),
    };
    if compression > 0.0 && pin_ended {
        notes.push(
            "pin-ended, no moment: no B1 (AISC 360-16 App. 8) or δ (ACI 318-19 6.6.4.5); its \
             buckling is its own member check (AISC 360-16 Ch. E, EN 1993-1-1 6.3; common \
             practice, no source)"
                .into(),
        );
    } else if method == SecondOrderMethod::AciMagnifier
        && compression > 0.0
        && mem.role == Role::Brace
    {
        notes.push(
            "no non-sway magnifier δ: ACI 318-19 6.6.4.5 magnifies columns; a brace is left \
             to its own member checks (common practice, no source)"
                .into(),
        );
    }
    let b1 = amp_ns.unwrap_or(f64::NAN);
    // The factor on the no-sway part of the diagram: B1 (AISC); 1 for ACI (δ acts on the
    // column's Mc instead), EN 1993-1-1 and the second-order route.
    let amp_n = match method {
        SecondOrderMethod::AiscB1B2 if !second_order => b1,
        _ => 1.0,
    };
    let design = diagram(amp_n, amp_s);
    // A section: first-order parts, design value; the sway part governs where the amplified
    // sway part is the larger (on the second-order route: the design value less the
    // no-sway part).
    let section = |x: f64, parts: (f64, f64), value: f64| {
        let (no_sway, sway) = if second_order {
            (parts.0, value - parts.0)
        } else {
            (amp_n * parts.0, amp_s * parts.1)
        };
        MomentCheck {
            x,
            no_sway: parts.0,
            sway: parts.1,
            first_order: parts.0 + parts.1,
            design: value,
            governs: if sway.abs() > no_sway.abs() {
                Part::Sway
            } else {
                Part::NoSway
            },
            second_order: None,
        }
    };
    let end_parts = [(ns[0], sw[0]), (ns[1], sw[1])];
    let (mut ends, span, span_max, span_min) = if second_order {
        let dm = direct.map_or([f64::NAN; 2], |(d, _)| end_moments(d, m));
        let e = direct.map_or_else(|| first_order.extremes(), |(_, spans)| spans[m]);
        let nan_or = |v: f64| if direct.is_some() { v } else { f64::NAN };
        let point = |p: (f64, f64)| {
            let mut s = section(p.0, first_order.parts(p.0, Side::Left), nan_or(p.1));
            s.second_order = direct.map(|_| p.1);
            s
        };
        (
            [
                section(0.0, end_parts[0], dm[0]),
                section(l, end_parts[1], dm[1]),
            ],
            point(span_moment(&e, l)),
            point(e.max),
            point(e.min),
        )
    } else {
        let e = design.extremes();
        let point = |p: (f64, f64)| {
            let parts = design.parts_at(p);
            section(p.0, parts, design.design(parts))
        };
        (
            [
                section(0.0, end_parts[0], design.design(end_parts[0])),
                section(l, end_parts[1], design.design(end_parts[1])),
            ],
            point(span_moment(&e, l)),
            point(e.max),
            point(e.min),
        )
    };
    if let Some((d, _)) = input.direct {
        let dm = end_moments(d, m);
        ends[0].second_order = Some(dm[0]);
        ends[1].second_order = Some(dm[1]);
    }
    // The member's moment scale, for the 1.4 limit's tolerance (issue 16 item 5).
    let scale = [ends[0], ends[1], span_max, span_min]
        .iter()
        .flat_map(|s| [s.design.abs(), s.first_order.abs()])
        .filter(|v| v.is_finite())
        .fold(ROUND_OFF * input.moment_scale, f64::max);
    // ACI columns: Mc = δ·M2 (6.6.4.5.1) at the section of M2, in place of the span value.
    let span = match &aci_col {
        Some(col) => {
            let mc = b1 * col.m2;
            if col.raised_to_min {
                notes.push("M2 raised to M2,min (ACI 318-19 6.6.4.5.4)".into());
            }
            let parts = if second_order {
                first_order.parts(col.x, Side::Left)
            } else {
                col.parts
            };
            let s = section(col.x, parts, mc);
            // 6.2.5.3 (from memory): against the first-order moment at that section, or
            // M2,min where M2 was raised to it.
            let reference = if col.raised_to_min {
                col.m2.abs()
            } else {
                s.first_order.abs()
            };
            if let Some(r) = above_aci_limit(mc, reference, scale.max(col.m2.abs())) {
                within_limits = false;
                notes.push(format!(
                    "Mc = δ·M2 is {r:.2} × the first-order moment, above the 1.4 limit of \
                     ACI 318-19 6.2.5.3 (from memory): that clause does not permit this design"
                ));
            }
            s
        }
        None => span,
    };
    if method == SecondOrderMethod::AciMagnifier
        && let Some(r) = ends
            .iter()
            .find_map(|e| above_aci_limit(e.design, e.first_order, scale))
    {
        within_limits = false;
        notes.push(format!(
            "second-order end moment is {r:.2} × first-order, above the 1.4 limit \
             (ACI 318-19 6.2.5.3, from memory)"
        ));
    }
    if method == SecondOrderMethod::Ec3AlphaCr && compression > 0.0 {
        notes.push("member imperfections and P-δ are left to the member buckling checks (EN 1993-1-1 5.2.2(3)c, 6.3)".into());
    }
    if second_order && method != SecondOrderMethod::Direct && direct.is_some() {
        notes.push(
            "design moments from the case's second-order analysis (see the story criterion)".into(),
        );
    }
    // The part that governs at the section with the largest design moment.
    let governs = [ends[0], ends[1], span, span_max, span_min]
        .into_iter()
        .filter(|s| s.design.is_finite())
        .max_by(|a, b| a.design.abs().total_cmp(&b.design.abs()))
        .map_or(Part::NoSway, |g| g.governs);
    MemberCheck {
        member: mem.id.clone(),
        role: mem.role,
        axial,
        compression,
        p_r,
        shear,
        end_actions,
        design_axial,
        ends,
        span,
        span_max,
        span_min,
        span_is_mc: aci_col.is_some() && b1.is_finite(),
        c_m,
        p_critical,
        non_sway_amplifier: amp_ns,
        sway_amplifier: sway_amp,
        second_order,
        governs,
        stable,
        within_limits,
        notes,
    }
}
#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    #[test]
    fn extremes_at_a_concentrated_moment_take_the_parts_of_their_own_side() {
        // Closed form (simply supported beam with a couple C at mid-span, any
        // strength-of-materials text): the moment is linear from 0 to ∓C/2 left of the
        // couple and jumps by C to ±C/2 right of it, so both extremes sit at x = L/2, one
        // on each side. A sway part with end moments (−S, +S) adds the line S·(2x/L − 1),
        // zero at mid-span: the combined extremes are ±C/2 there, each with the parts of
        // its own side.
        let (l, c, s) = (6.0, 10e3, 3e3);
        let loads = [LocalLoad::Moment { a: l / 2.0, m: c }];
        let ns = crate::solve::beam::condensed_fixed_end_forces(l, &loads, true, true);
        let sw = EndForces {
            i: [0.0, 2.0 * s / l, s],
            j: [0.0, -2.0 * s / l, s],
        };
        let d = Diagram {
            length: l,
            no_sway: &ns,
            sway: &sw,
            loads: &loads,
            k_ns: 1.3,
            k_s: 1.7,
        };
        // The sway diagram alone: M(0) = −Mz_i = −S, M(L) = Mz_j = +S.
        assert_relative_eq!(d.parts(0.0, Side::Right).1, -s, max_relative = 1e-12);
        assert_relative_eq!(d.parts(l, Side::Left).1, s, max_relative = 1e-12);
        let e = d.extremes();
        for p in [e.max, e.min] {
            assert_relative_eq!(p.0, l / 2.0, max_relative = 1e-12);
            assert_relative_eq!(p.1.abs(), 1.3 * c / 2.0, max_relative = 1e-9);
            let parts = d.parts_at(p);
            assert_relative_eq!(d.design(parts), p.1, max_relative = 1e-9);
            assert_relative_eq!(parts.0.abs(), c / 2.0, max_relative = 1e-9);
        }
    }

    #[test]
    fn least_axial_of_a_column_with_a_linear_axial_load() {
        // Statics (closed form): a member with end action Fx_i = +F (the node pushes end i
        // towards j) and an axial load qx from q0 at i to 0 at j has N(x) = −F − Σ px,
        // i.e. N(0) = −F and N(L) = −F − q0·L/2 (loads along +x): the least is at j.
        let (l, f, q0) = (4.0, 100e3, 20e3);
        let loads = [LocalLoad::Linear {
            a: 0.0,
            b: l,
            qx_a: q0,
            qy_a: 0.0,
            qx_b: 0.0,
            qy_b: 0.0,
        }];
        let ns = EndForces {
            i: [f, 0.0, 0.0],
            j: [-f - q0 * l / 2.0, 0.0, 0.0],
        };
        let zero = EndForces::default();
        let d = Diagram {
            length: l,
            no_sway: &ns,
            sway: &zero,
            loads: &loads,
            k_ns: 1.0,
            k_s: 1.0,
        };
        assert_relative_eq!(d.least_axial(), -f - q0 * l / 2.0, max_relative = 1e-12);
    }

    #[test]
    fn cm_follows_curvature() {
        // AISC 360-16 A-8-4 [M]: equal end moments in single curvature → 1.0;
        // equal and opposite (reverse curvature) → 0.2; one end zero → 0.6.
        assert_relative_eq!(c_m([100.0, 100.0]), 1.0);
        assert_relative_eq!(c_m([100.0, -100.0]), 0.2);
        assert_relative_eq!(c_m([0.0, 50.0]), 0.6);
        // Round-off end moments (1e-11 against a case scale of 1e3) decide nothing: no end
        // moments give 1.0, a round-off M1 gives M1/M2 = 0 (A-8-4 with M1 = 0).
        assert_relative_eq!(c_m_significant([3e-11, -1e-11], 1e3), 1.0);
        assert_relative_eq!(c_m_significant([1e-12, 50.0], 1e3), 0.6);
        assert_relative_eq!(c_m_significant([100.0, -100.0], 1e3), 0.2);
    }
}
