//! Approximate check: every member's first-order moments estimated by the classical hand
//! methods, beside the stiffness solution, to catch input mistakes (a wrong unit, a wrong
//! sign, a missing load, a wrong release or support).
//!
//! Methods (all common practice, no source; written as the textbooks of approximate
//! analysis write them):
//! * **Beams under gravity**: inflection points at [`INFLECTION`]·L from each continuous
//!   end (none at a released end; [`INFLECTION_PROPPED`]·L from the continuous end of a
//!   span released at its other end). The part between them is simply supported, the end parts
//!   are cantilevers carrying it: with both ends continuous the end moments are
//!   −0.045 wL² and the mid-span moment +0.08 wL² ([`beam_gravity`]). A beam's loads are
//!   taken as their total transverse load spread uniformly over the span.
//! * **Columns under gravity, no sway**: the beam-end moments at a joint that do not
//!   balance (with any applied nodal moment) go into the columns at the joint in proportion
//!   to their stiffness EI/L, and each column carries half of its share to its other end
//!   (carry-over factor 1/2: a fixed base, or the joint above or below, one cycle of
//!   moment distribution); a pinned base or released end takes none.
//! * **Columns under gravity, sway**: in an unsymmetric frame the column shears of that
//!   no-sway estimate do not add up to zero in a story; the sum is the force that held the
//!   story. In a story without a brace, the frame carries it back (the story sways under
//!   gravity alone): its reverse is shared by the portal method below and added to the
//!   gravity part ([`gravity_sway_shears`]). A braced story's brace holds it.
//! * **Lateral load, portal method**: each story's shear is shared by its columns, an
//!   interior column taking twice the share of an exterior one ([`portal_shares`]);
//!   inflection points at mid-height of the columns give end moments V·h/2 (at a pinned
//!   base or released end the inflection point is there, and the other end takes V·h); the beams
//!   balance the column moments joint by joint from the left with inflection points at
//!   mid-span.
//!
//! Both parts are superposed for each factored case and compared with the first-order
//! solution of the same loads (the case's own loads: no notional loads and no
//! amplification on either side). Flags and thresholds are in [`Thresholds`].
//!
//! Results assist a licensed engineer; local codes and the adopted edition of each
//! standard govern.

use serde::Serialize;

use crate::check::story::moment_frame_members;
use crate::combos::FactoredCase;
use crate::model::{LocalLoad, Model, Restraint, Role};
use crate::solve::beam::internal_forces;
use crate::solve::first_order::combined_member_loads;
use crate::solve::linear::element_resultant;
use crate::solve::{FirstOrder, Solution, SystemError};
use crate::stories::{LEVEL_TOLERANCE, Story, StoryError, stories};

/// Inflection points of a beam under gravity, as a fraction of the span from each
/// continuous end (common practice, no source: between 0 for pinned ends and 0.211 for
/// fixed ends under uniform load).
pub const INFLECTION: f64 = 0.1;

/// Inflection point of a propped span (one end released) from its continuous end, as a
/// fraction of the span: the same fraction of the closed-form position as [`INFLECTION`]
/// is of a fixed-ended beam's. Closed forms under uniform load: fixed at both ends,
/// `(3 − √3)/6 = 0.2113·L` from each end; fixed at one end and pinned at the other,
/// `L/4` from the fixed end. So `0.1 · 0.25 / 0.2113 = 0.118` (common practice, no source:
/// the hand rule scaled to the propped span; with 0.1 a propped span's end moment,
/// −0.050 wL², is under half the −0.125 wL² of its fixed end, while a continuous span's
/// −0.045 wL² is over half the −0.083 wL² of its fixed ends).
pub const INFLECTION_PROPPED: f64 = INFLECTION * 0.25 / ((3.0 - 1.732_050_807_568_877_2) / 6.0);

/// When a member is flagged.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Thresholds {
    /// A location is compared only where the approximate moment reaches this fraction of
    /// the largest computed moment of the case's members of the same role (where the hand
    /// method says "small", as for interior columns under gravity, it is not judged).
    pub significant: f64,
    /// Ratio computed/approximate flagged above this or below its inverse.
    pub ratio: f64,
    /// A location is judged only where the estimate's gravity and lateral parts do not
    /// cancel: `|gravity + lateral| ≥ parts · (|gravity| + |lateral|)`.
    pub parts: f64,
    /// A beam's downward load per length flagged when it is more than this many times the
    /// median of the case's loaded beams, less than the median over it, or of the opposite
    /// sense.
    pub load: f64,
}

impl Default for Thresholds {
    /// 0.25, 4, 0.6 and 10 (common practice, no source): the hand methods are within a factor
    /// of about 2 of the stiffness solution on regular frames (on seeded random frames with
    /// unequal bays 4–9 m, point loads and releases, about 1 % of the judged member results
    /// are flagged: `tests/approx.rs`), and roof beams carry down to
    /// about a sixth of a floor beam's load, while the usual unit mistakes change a load by
    /// 1000 (N for kN, kN/mm for kN/m) or 12 (per inch for per foot). Mistakes by 9.81,
    /// 4.45 (kip for kN) or 3.28 (ft for m) are within the spread of real loads and are
    /// not caught by the load test. With each part within a factor of 2, a sum of parts of
    /// opposite signs keeps its sign only where the larger part is over 4 times the smaller
    /// one, i.e. where `|g + l| ≥ (4 − 1)/(4 + 1) · (|g| + |l|) = 0.6 · (|g| + |l|)`
    /// (closed form of that bound).
    fn default() -> Self {
        Thresholds {
            significant: 0.25,
            ratio: 4.0,
            parts: 0.6,
            load: 10.0,
        }
    }
}

/// Where along a member a value is compared.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum Location {
    EndI,
    EndJ,
    /// Between the gravity inflection points of a beam (mid-span for two continuous ends).
    Span,
}

/// What is wrong with a member, by the thresholds.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
#[serde(rename_all = "kebab-case", tag = "kind")]
pub enum Flag {
    /// Computed and approximate moments of opposite sign at a location.
    Sign { at: Location },
    /// Computed/approximate beyond the ratio threshold at a location.
    Ratio { at: Location, ratio: f64 },
    /// The beam's load is far from the median beam load of the case, or of the opposite
    /// sense (factor = load/median, negative for the opposite sense).
    Load { factor: f64 },
}

/// One compared location: internal moments, N·m, positive sagging (local −y in tension).
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Row {
    pub at: Location,
    /// Distance from end i, m.
    pub x: f64,
    /// First-order stiffness solution.
    pub computed: f64,
    /// Approximate method: gravity part plus lateral part.
    pub approximate: f64,
    pub gravity: f64,
    pub lateral: f64,
    /// Whether the location is large enough to be judged.
    pub significant: bool,
}

/// A member's comparison in one factored case.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct MemberEstimate {
    pub member: String,
    pub role: Role,
    pub rows: Vec<Row>,
    /// Column shear of the lateral part by the portal method (columns only; N, the force
    /// the column carries from the level above in +X).
    pub portal_shear: Option<f64>,
    /// False where the hand methods do not apply (see [`estimable`]). Such members are not
    /// judged.
    pub estimated: bool,
    pub flags: Vec<Flag>,
}

/// The steepest beam the hand methods are applied to, rad (5°): they assume the horizontal
/// beams of a rectangular frame, not the rafters of a gable frame.
pub const MAX_SLOPE: f64 = 5.0 * std::f64::consts::PI / 180.0;

/// Members the hand methods apply to: not a sloped beam (over [`MAX_SLOPE`]) that takes
/// moment, or a beam that is one of several members of a span (see
/// [`crate::arrange::spans`]), nor any other member meeting the end of one (the portal
/// method and the joint balance assume horizontal beams, one member a span).
pub fn estimable(model: &Model) -> Vec<bool> {
    let outside = |m: usize| {
        let mem = &model.members[m];
        let (c, s) = model.cosines(m);
        // A pin-ended brace or link puts no moment on its joints; a beam with one released
        // end is a propped span (inflection at the hinge) and its joints stay estimable.
        mem.role == Role::Beam
            && s.abs() > MAX_SLOPE.sin() * c.hypot(s)
            && !(mem.release_i && mem.release_j)
    };
    let mut bad_node = vec![false; model.nodes.len()];
    let split: Vec<usize> = crate::arrange::spans(model)
        .into_iter()
        .filter(|s| s.members.len() > 1)
        .flat_map(|s| s.members)
        .collect();
    for m in (0..model.members.len()).filter(|&m| outside(m) || split.contains(&m)) {
        bad_node[model.members[m].i] = true;
        bad_node[model.members[m].j] = true;
    }
    (0..model.members.len())
        .map(|m| {
            let mem = &model.members[m];
            !bad_node[mem.i] && !bad_node[mem.j]
        })
        .collect()
}

/// The approximate check of one factored case.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct CaseEstimate {
    pub id: String,
    pub expression: String,
    pub members: Vec<MemberEstimate>,
}

/// The whole approximate check.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct ApproxReport {
    pub inflection: f64,
    /// [`INFLECTION_PROPPED`].
    pub inflection_propped: f64,
    pub thresholds: Thresholds,
    pub cases: Vec<CaseEstimate>,
    /// One line on what usually causes a flag.
    pub hint: &'static str,
}

/// The hint printed with flags.
pub const HINT: &str = "usual causes: a wrong unit on a load or section, a load in the wrong \
direction or on the wrong member, a missing load, a wrong release or support";

/// Why the approximate check could not run.
#[derive(Debug, thiserror::Error)]
pub enum ApproxError {
    #[error(transparent)]
    Stories(#[from] StoryError),
    #[error(transparent)]
    System(#[from] SystemError),
}

/// Beam moments under a uniform load `w` (positive toward local −y) on span `l` with
/// inflection points at `a_i`·l and `a_j`·l from the ends (0 at a released end): internal
/// moments (end i, between the inflection points, end j) and the x of the middle value.
///
/// Closed form: the part between the inflection points, of length `lc = l − a_i·l − a_j·l`,
/// is simply supported, `M = w·lc²/8` at its middle; an end part of length `p` is a
/// cantilever under `w` carrying the reaction `w·lc/2` at its tip,
/// `M = −(w·p²/2 + w·lc/2·p)`.
pub fn beam_gravity(w: f64, l: f64, a_i: f64, a_j: f64) -> (f64, f64, f64, f64) {
    let (p_i, p_j) = (a_i * l, a_j * l);
    let lc = l - p_i - p_j;
    let end = |p: f64| -(w * p * p / 2.0 + w * lc / 2.0 * p);
    (end(p_i), w * lc * lc / 8.0, end(p_j), p_i + lc / 2.0)
}

/// Portal method: the shears of `n` columns in a row carrying story shear `v`, an interior
/// column taking twice an exterior one (exterior `v/(2(n−1))`, interior `v/(n−1)`).
pub fn portal_shares(n: usize, v: f64) -> Vec<f64> {
    if n <= 1 {
        return vec![v; n];
    }
    let exterior = v / (2.0 * (n - 1) as f64);
    (0..n)
        .map(|k| {
            if k == 0 || k == n - 1 {
                exterior
            } else {
                2.0 * exterior
            }
        })
        .collect()
}

/// Carry-over to a far end that is fixed against rotation: half the near-end moment, same
/// sense (moment distribution, prismatic member).
pub fn carry_over(m_near: f64) -> f64 {
    0.5 * m_near
}

/// Total local (x, y) components of a member's local loads, N.
fn local_total(model: &Model, m: usize, loads: &[LocalLoad]) -> (f64, f64) {
    let (px, py, _) = element_resultant(model.length(m), loads);
    (px, py)
}

/// Whether end `end` (0 = i, 1 = j) of member `m` cannot take moment: released, or at a
/// support that leaves rotation free with no other member there (a pinned base).
fn hinged_end(model: &Model, m: usize, end: usize) -> bool {
    let mem = &model.members[m];
    let (node, released) = if end == 0 {
        (mem.i, mem.release_i)
    } else {
        (mem.j, mem.release_j)
    };
    released
        || model.supports.iter().any(|s| {
            s.node == node
                && matches!(s.dofs[2], Restraint::Free)
                && model
                    .members
                    .iter()
                    .filter(|o| o.i == node || o.j == node)
                    .count()
                    == 1
        })
}

/// Approximate internal moments of every member for loads `factors`: per member, the rows
/// (end i, end j, and for beams the span) as (location, x, gravity, lateral).
pub fn approximate(
    model: &Model,
    stories: &[Story],
    factors: &[(usize, f64)],
) -> Vec<Vec<(Location, f64, f64, f64)>> {
    let nm = model.members.len();
    let loads = combined_member_loads(model, factors);
    // End actions Mz (node on member, CCW) of the gravity part, per member [i, j].
    let mut mz = vec![[0.0_f64; 2]; nm];
    let mut span: Vec<Option<(f64, f64)>> = vec![None; nm];
    for m in (0..nm).filter(|&m| model.members[m].role == Role::Beam) {
        let l = model.length(m);
        let w = -local_total(model, m, &loads[m]).1 / l;
        let mem = &model.members[m];
        let a = |released: bool, other_released: bool| match (released, other_released) {
            (true, _) => 0.0,
            (false, true) => INFLECTION_PROPPED,
            (false, false) => INFLECTION,
        };
        let (mi, mid, mj, x) = beam_gravity(
            w,
            l,
            a(mem.release_i, mem.release_j),
            a(mem.release_j, mem.release_i),
        );
        // Internal M(0) = −Mz_i, M(L) = +Mz_j (DEVELOPERS.md, sign convention).
        mz[m] = [-mi, mj];
        span[m] = Some((x, mid));
    }
    // Joint unbalance into the columns, by stiffness EI/L; carry-over to fixed bases.
    let mut applied = vec![0.0; model.nodes.len()];
    for &(k, f) in factors {
        for nl in &model.load_cases[k].nodal {
            applied[nl.node] += f * nl.mz;
        }
    }
    // The member ends at each node, in member order: (member, end).
    let mut ends_at: Vec<Vec<(usize, usize)>> = vec![Vec::new(); model.nodes.len()];
    for (m, mem) in model.members.iter().enumerate() {
        ends_at[mem.i].push((m, 0));
        ends_at[mem.j].push((m, 1));
    }
    let is_beam = |m: usize| model.members[m].role == Role::Beam;
    for (v, &applied_v) in applied.iter().enumerate() {
        let beams: f64 = ends_at[v]
            .iter()
            .filter(|&&(m, _)| is_beam(m))
            .map(|&(m, e)| mz[m][e])
            .fold(0.0, |a, b| a + b);
        let share: Vec<(usize, usize, f64)> = ends_at[v]
            .iter()
            .filter(|&&(c, _)| !is_beam(c))
            .filter_map(|&(c, e)| {
                let mem = &model.members[c];
                let released = if e == 0 { mem.release_i } else { mem.release_j };
                (!released).then(|| (c, e, model.gross_stiffness(c).1 / model.length(c)))
            })
            .collect();
        let total: f64 = share.iter().map(|s| s.2).sum();
        if total <= 0.0 {
            continue;
        }
        for (c, e, k) in share {
            let near = k / total * (applied_v - beams);
            mz[c][e] += near;
            let far = 1 - e;
            if !hinged_end(model, c, far) {
                mz[c][far] += carry_over(near);
            }
        }
    }
    let sway = portal(model, stories, &gravity_sway_shears(model, stories, &mz));
    let fx = lateral_at_nodes(model, factors, &loads);
    let lateral = portal(model, stories, &applied_story_shears(model, stories, &fx));
    // Portal moments are linear along a member (zero at a beam's mid-span).
    let at = |ends: (f64, f64), x: f64, l: f64| ends.0 + (ends.1 - ends.0) * x / l;
    (0..nm)
        .map(|m| {
            let l = model.length(m);
            let mut rows = vec![
                (Location::EndI, 0.0, -mz[m][0] + sway[m].0, lateral[m].0),
                (Location::EndJ, l, mz[m][1] + sway[m].1, lateral[m].1),
            ];
            if let Some((x, mid)) = span[m] {
                rows.push((
                    Location::Span,
                    x,
                    mid + at(sway[m], x, l),
                    at(lateral[m], x, l),
                ));
            }
            rows
        })
        .collect()
}

/// Story shears (N, +X) of the gravity sway of every story: the reverse of the sum of the
/// no-sway column shears `(Mz_i + Mz_j)/L` (end actions `mz`, so internal `M(0) = −Mz_i`,
/// `M(L) = Mz_j` and `V = (M(L) − M(0))/L` is the force the level above applies in +X, as in
/// the portal method); nil in a braced story, whose brace holds it. Statics: the no-sway state plus
/// this sway carries no net story shear under gravity alone.
pub fn gravity_sway_shears(model: &Model, stories: &[Story], mz: &[[f64; 2]]) -> Vec<f64> {
    let braced = braced_stories(model, stories);
    stories
        .iter()
        .zip(braced)
        .map(|(st, braced)| {
            if braced {
                return 0.0;
            }
            -st.columns
                .iter()
                .filter(|&&c| !is_brace(model, c))
                .map(|&c| (mz[c][0] + mz[c][1]) / model.length(c))
                .sum::<f64>()
        })
        .collect()
}

/// Story shears (N, +X) of the lateral loads lumped at the nodes `fx`: everything applied at
/// or above each story's top.
fn applied_story_shears(model: &Model, stories: &[Story], fx: &[f64]) -> Vec<f64> {
    stories
        .iter()
        .map(|st| {
            (0..model.nodes.len())
                .filter(|&n| model.nodes[n].y >= st.top - LEVEL_TOLERANCE)
                .map(|n| fx[n])
                .sum()
        })
        .collect()
}

/// Lateral loads of the case lumped at the nodes: global X, N. Nodal loads as they are; a
/// member's loads by their resultant, the transverse part shared between the end nodes by
/// the lever rule and the axial part half and half.
fn lateral_at_nodes(model: &Model, factors: &[(usize, f64)], loads: &[Vec<LocalLoad>]) -> Vec<f64> {
    let mut fx = vec![0.0; model.nodes.len()];
    for &(k, f) in factors {
        for nl in &model.load_cases[k].nodal {
            fx[nl.node] += f * nl.fx;
        }
    }
    for (m, ls) in loads.iter().enumerate().filter(|(_, ls)| !ls.is_empty()) {
        let (c, s) = model.cosines(m);
        let l = model.length(m);
        let (px, py, m_i) = element_resultant(l, ls);
        // Share of the transverse resultant at end j: its lever arm from i over L.
        let t = if py != 0.0 { m_i / (py * l) } else { 0.5 };
        let mem = &model.members[m];
        fx[mem.i] += 0.5 * px * c - (1.0 - t) * py * s;
        fx[mem.j] += 0.5 * px * c - t * py * s;
    }
    fx
}

/// Portal method: internal moments (end i, end j) of every member under the story shears
/// `shears` (N, +X, one per story).
fn portal(model: &Model, stories: &[Story], shears: &[f64]) -> Vec<(f64, f64)> {
    let mut out = vec![(0.0, 0.0); model.members.len()];
    let mut column_mz_at = vec![0.0; model.nodes.len()];
    let frame = moment_frame_members(model);
    let braced = braced_stories(model, stories);
    for ((st, &v), braced) in stories.iter().zip(shears).zip(braced) {
        let mut cols = portal_columns(model, &frame, &st.columns);
        cols.sort_by(|&a, &b| column_x(model, a).total_cmp(&column_x(model, b)));
        // A braced story's shear goes to its braces first (their axial stiffness dwarfs the
        // columns' bending stiffness): the moment columns take none of it.
        let v = if braced { 0.0 } else { v };
        for (&c, vc) in cols.iter().zip(portal_shares(cols.len(), v)) {
            let l = model.length(c);
            let x0 = inflection_height(model, c);
            // Inflection at x0: M(x) = V·(x − x0), since Fy_i = V for either orientation
            // of the column (the node above pushes it with V in +X) and M(x0) = 0.
            out[c] = (-vc * x0, vc * (l - x0));
            let mem = &model.members[c];
            // End actions: Mz_i = −M(0), Mz_j = M(L).
            column_mz_at[mem.i] += vc * x0;
            column_mz_at[mem.j] += vc * (l - x0);
        }
    }
    // Beams: balance the column moments joint by joint from the left of each beam line,
    // inflection at mid-span (Mz_i = Mz_j).
    let spans = crate::arrange::spans(model);
    let mut carried: Vec<f64> = vec![0.0; model.nodes.len()];
    for s in spans.iter().filter(|s| s.members.len() == 1) {
        let m = s.members[0];
        let mem = &model.members[m];
        let (c, sn) = model.cosines(m);
        if (mem.release_i && mem.release_j) || sn.abs() > MAX_SLOPE.sin() * c.hypot(sn) {
            continue; // a link or brace: no lateral moment
        }
        let left = if model.nodes[mem.i].x <= model.nodes[mem.j].x {
            mem.i
        } else {
            mem.j
        };
        let right = if left == mem.i { mem.j } else { mem.i };
        let mz = -column_mz_at[left] - carried[left];
        // A hinged end takes no moment: the beam turns about it and passes nothing on;
        // otherwise the inflection is at mid-span (equal end actions).
        let (released_left, released_right) = if left == mem.i {
            (mem.release_i, mem.release_j)
        } else {
            (mem.release_j, mem.release_i)
        };
        let (m_left, m_right) = match (released_left, released_right) {
            (false, false) => (mz, mz),
            (false, true) => (mz, 0.0),
            _ => (0.0, 0.0),
        };
        carried[right] += m_right;
        // Internal moments: M(0) = −Mz_i, M(L) = +Mz_j.
        out[m] = if left == mem.i {
            (-m_left, m_right)
        } else {
            (-m_right, m_left)
        };
    }
    out
}

/// Whether story member `m` is a brace: inclined more than a tenth of its height off the
/// vertical (a column stands vertical or nearly so; common practice, no source).
fn is_brace(model: &Model, m: usize) -> bool {
    let (dx, dy) = model.delta(m);
    dy.abs() > 0.0 && dx.abs() > 0.1 * dy.abs() && {
        let (c, s) = model.cosines(m);
        s.abs() > MAX_SLOPE.sin() * c.hypot(s)
    }
}

/// Whether each story is braced: a brace (see [`is_brace`]) spans its height, from at or
/// below its bottom to at or above its top. The braces are found once, not per story.
fn braced_stories(model: &Model, stories: &[Story]) -> Vec<bool> {
    let braces: Vec<(f64, f64)> = (0..model.members.len())
        .filter(|&m| is_brace(model, m))
        .map(|m| {
            let mem = &model.members[m];
            let (a, b) = (model.nodes[mem.i].y, model.nodes[mem.j].y);
            (a.min(b), a.max(b))
        })
        .collect();
    stories
        .iter()
        .map(|st| {
            braces.iter().any(|&(low, high)| {
                low <= st.bottom + LEVEL_TOLERANCE && high >= st.top - LEVEL_TOLERANCE
            })
        })
        .collect()
}

/// The story members that take a portal share of the story shear: the columns of the
/// moment frame, not braces and not leaning columns (hinged at both ends, or onto beams
/// released at them), which carry gravity load only.
/// `frame`: [`moment_frame_members`] of the model.
fn portal_columns(model: &Model, frame: &[bool], story_members: &[usize]) -> Vec<usize> {
    story_members
        .iter()
        .copied()
        .filter(|&m| !is_brace(model, m) && frame[m])
        .collect()
}

/// Where a column's lateral inflection point lies, from end i: at a released end or a
/// pinned base (rotation free, no other member there), else at mid-height (portal method).
fn inflection_height(model: &Model, c: usize) -> f64 {
    let l = model.length(c);
    match (hinged_end(model, c, 0), hinged_end(model, c, 1)) {
        (true, false) => 0.0,
        (false, true) => l,
        _ => l / 2.0,
    }
}

/// Mean X of a column.
fn column_x(model: &Model, m: usize) -> f64 {
    let mem = &model.members[m];
    0.5 * (model.nodes[mem.i].x + model.nodes[mem.j].x)
}

/// First-order internal moments at the rows' locations, from the solution of the case.
fn computed_at(solution: &Solution, loads: &[Vec<LocalLoad>], m: usize, x: f64) -> f64 {
    internal_forces(x, &solution.end_forces[m], &loads[m]).m
}

/// Compare the approximate and computed moments of one factored case.
pub fn compare_case(
    model: &Model,
    stories: &[Story],
    solved: &[Solution],
    fc: &FactoredCase,
    th: &Thresholds,
) -> CaseEstimate {
    let parts: Vec<(f64, &Solution)> = fc.factors.iter().map(|&(k, f)| (f, &solved[k])).collect();
    let solution = Solution::combine(&parts);
    let loads = combined_member_loads(model, &fc.factors);
    let approx = approximate(model, stories, &fc.factors);
    let fits = estimable(model);
    let mut members: Vec<MemberEstimate> = approx
        .iter()
        .enumerate()
        .map(|(m, rows)| MemberEstimate {
            member: model.members[m].id.clone(),
            role: model.members[m].role,
            rows: rows
                .iter()
                .map(|&(at, x, g, lat)| Row {
                    at,
                    x,
                    computed: computed_at(&solution, &loads, m, x),
                    approximate: g + lat,
                    gravity: g,
                    lateral: lat,
                    significant: false,
                })
                .collect(),
            portal_shear: (model.members[m].role != Role::Beam)
                .then(|| (rows[1].3 - rows[0].3) / model.length(m)),
            estimated: fits[m],
            flags: Vec::new(),
        })
        .collect();
    // Reference moment per role: the largest computed moment of the case.
    let reference = |role: Role, members: &[MemberEstimate]| -> f64 {
        members
            .iter()
            .filter(|e| e.role == role)
            .flat_map(|e| e.rows.iter().map(|r| r.computed.abs()))
            .fold(0.0, f64::max)
    };
    let roles = [Role::Beam, Role::Column, Role::Brace].map(|r| (r, reference(r, &members)));
    let refs: Vec<f64> = members
        .iter()
        .map(|e| {
            roles
                .iter()
                .find(|(r, _)| *r == e.role)
                .map_or(0.0, |&(_, v)| v)
        })
        .collect();
    for (e, r) in members.iter_mut().zip(refs) {
        for row in &mut e.rows {
            // Judged where large enough, and where the estimate's gravity and lateral parts
            // do not cancel (see `Thresholds::parts`).
            row.significant = e.estimated
                && r > 0.0
                && row.approximate.abs() >= th.significant * r
                && row.approximate.abs() >= th.parts * (row.gravity.abs() + row.lateral.abs());
            if !row.significant {
                continue;
            }
            if row.computed * row.approximate < 0.0 {
                e.flags.push(Flag::Sign { at: row.at });
            } else {
                let ratio = if row.approximate == 0.0 {
                    f64::INFINITY
                } else {
                    row.computed / row.approximate
                };
                if ratio > th.ratio || ratio < 1.0 / th.ratio {
                    e.flags.push(Flag::Ratio { at: row.at, ratio });
                }
            }
        }
    }
    for (m, factor) in load_outliers(model, &loads, th.load)
        .into_iter()
        .filter(|&(m, _)| fits[m])
    {
        members[m].flags.push(Flag::Load { factor });
    }
    CaseEstimate {
        id: fc.id.clone(),
        expression: fc.expression.clone(),
        members,
    }
}

/// Beams whose downward load per length (total global −Y load over the length) is more
/// than `limit` times the median of the case's loaded beams, less than the median over
/// `limit`, or of the opposite sense: (member, load/median).
pub fn load_outliers(model: &Model, loads: &[Vec<LocalLoad>], limit: f64) -> Vec<(usize, f64)> {
    // Braces and pin-ended links (to a leaning column) are not beams that carry floor load.
    let w: Vec<(usize, f64)> = (0..model.members.len())
        .filter(|&m| {
            let mem = &model.members[m];
            mem.role == Role::Beam && !is_brace(model, m) && !(mem.release_i && mem.release_j)
        })
        .map(|m| {
            let (c, s) = model.cosines(m);
            let (px, py) = local_total(model, m, &loads[m]);
            (m, -(px * s + py * c) / model.length(m))
        })
        .collect();
    let mut loaded: Vec<f64> = w.iter().map(|p| p.1).filter(|&x| x != 0.0).collect();
    if loaded.len() < 3 {
        return Vec::new();
    }
    loaded.sort_by(f64::total_cmp);
    let median = loaded[loaded.len() / 2];
    w.into_iter()
        .map(|(m, x)| (m, x / median))
        .filter(|&(_, f)| f > limit || f < 1.0 / limit)
        .collect()
}

/// The approximate check of `cases` on `model` (each service load case solved once on one
/// factorization of the free frame).
pub fn approximate_check(
    model: &Model,
    cases: &[FactoredCase],
    th: &Thresholds,
) -> Result<ApproxReport, ApproxError> {
    let stories = stories(model)?;
    let fo = FirstOrder::new(model, &[])?;
    let solved: Vec<Solution> = (0..model.load_cases.len())
        .map(|k| fo.solve_case(model, k))
        .collect::<Result<_, _>>()?;
    Ok(ApproxReport {
        inflection: INFLECTION,
        inflection_propped: INFLECTION_PROPPED,
        thresholds: *th,
        cases: cases
            .iter()
            .map(|fc| compare_case(model, &stories, &solved, fc, th))
            .collect(),
        hint: HINT,
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn portal_shares_add_up_to_the_story_shear() {
        // Portal method (common practice, no source): exterior v/(2(n−1)), interior v/(n−1).
        assert_eq!(portal_shares(3, 4.0), vec![1.0, 2.0, 1.0]);
        assert_eq!(portal_shares(1, 4.0), vec![4.0]);
        let s: f64 = portal_shares(5, 8.0).iter().sum();
        assert!((s - 8.0).abs() < 1e-12);
    }
}
