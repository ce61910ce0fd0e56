//! Plausibility of member properties, checked when the model is read: a section property
//! typed in the wrong unit (I in mm⁴ where cm⁴ was meant, or in m⁴ under a mm preset)
//! gives a valid but absurd frame, whose drifts or mechanism message would otherwise be the
//! first sign of the slip (issue 20 item 5).
//!
//! The bounds are wide on purpose: they catch factors of 10⁴ and more, not unusual but
//! real members. Every bound is common practice, no source.

use super::Model;
use crate::units::Dimension;

/// Largest plausible slenderness L/r of a member that takes bending (common practice, no
/// source: building columns and beams lie between about 10 and 300).
pub const MAX_SLENDERNESS: f64 = 1000.0;
/// Smallest plausible slenderness L/r (a member shorter than its radius of gyration is a
/// block, not a member; common practice, no source).
pub const MIN_SLENDERNESS: f64 = 1.0;
/// Largest plausible ratio of a member's EI/L³ to the frame's median, either way (common
/// practice, no source: members of one frame differ by at most a few hundred).
pub const MAX_STIFFNESS_RATIO: f64 = 1e4;
/// A usual slenderness of a building member, used only to say how far off a property
/// looks (common practice, no source).
const USUAL_SLENDERNESS: f64 = 50.0;

/// A member whose properties look like a unit slip.
#[derive(Debug, Clone, PartialEq)]
pub struct Implausible {
    /// Index into [`Model::members`].
    pub member: usize,
    /// One sentence naming the member, its section, the figure and the likely slip.
    pub message: String,
}

/// Bending stiffness index EI/L³ of member `m`, N/m.
fn stiffness_index(model: &Model, m: usize) -> f64 {
    let mem = &model.members[m];
    let l = model.length(m);
    model.materials[mem.material].e * model.sections[mem.section].inertia / (l * l * l)
}

/// Whether member `m` takes bending: not released at both ends (a pin-ended brace or tie
/// works by its area alone, and may be very slender).
fn takes_bending(model: &Model, m: usize) -> bool {
    let mem = &model.members[m];
    !(mem.release_i && mem.release_j)
}

/// The median of `v` (NaN for an empty list).
fn median(mut v: Vec<f64>) -> f64 {
    if v.is_empty() {
        return f64::NAN;
    }
    v.sort_by(f64::total_cmp);
    let n = v.len();
    if n % 2 == 1 {
        v[n / 2]
    } else {
        0.5 * (v[n / 2 - 1] + v[n / 2])
    }
}

/// `v` with three significant figures, in exponent form when very large or small.
fn significant(v: f64) -> String {
    let a = v.abs();
    if a == 0.0 || !a.is_finite() {
        format!("{v}")
    } else if (1e-3..1e6).contains(&a) {
        let decimals = (2 - a.log10().floor() as i64).max(0) as usize;
        format!("{v:.decimals$}")
    } else {
        format!("{v:.2e}")
    }
}

/// `10^n` written for a message, n the nearest whole exponent of `ratio`.
fn power_of_ten(ratio: f64) -> String {
    format!("10^{}", ratio.log10().round() as i64)
}

/// Every member with an absurd slenderness L/r, r = √(I/A), or an EI/L³ more than
/// [`MAX_STIFFNESS_RATIO`] away from the median of the frame's bending members; at most one
/// message per member, slenderness first.
pub fn implausible_members(model: &Model) -> Vec<Implausible> {
    let u = &model.units;
    let bending: Vec<usize> = (0..model.members.len())
        .filter(|&m| takes_bending(model, m))
        .collect();
    let typical = median(bending.iter().map(|&m| stiffness_index(model, m)).collect());
    let mut out = Vec::new();
    for (m, mem) in model.members.iter().enumerate() {
        let sec = &model.sections[mem.section];
        let l = model.length(m);
        let r = (sec.inertia / sec.area).sqrt();
        let slenderness = l / r;
        let named = format!(
            "member {} (section {}, material {})",
            mem.id, sec.id, model.materials[mem.material].id
        );
        let r_text = format!(
            "r = √(I/A) = {} {}",
            significant(u.from_si(r, Dimension::SectionLength)),
            u.label(Dimension::SectionLength)
        );
        let message = if slenderness < MIN_SLENDERNESS {
            // I/A should shrink by (usual L/r)²/(L/r)² to reach a usual slenderness.
            let off = (USUAL_SLENDERNESS / slenderness).powi(2);
            Some(format!(
                "{named}: slenderness L/r = {} with {r_text}, below {MIN_SLENDERNESS}: \
                 I looks about {} too large for A (I in m⁴ or cm⁴ where mm⁴ was meant? \
                 check the units of I and A)",
                significant(slenderness),
                power_of_ten(off)
            ))
        } else if slenderness > MAX_SLENDERNESS && takes_bending(model, m) {
            let off = (slenderness / USUAL_SLENDERNESS).powi(2);
            Some(format!(
                "{named}: slenderness L/r = {} with {r_text}, above {MAX_SLENDERNESS}: \
                 I looks about {} too small for A (I in mm⁴ where cm⁴ or m⁴ was meant, or \
                 a bare number in the preset's section unit? check the units of I and A)",
                significant(slenderness),
                power_of_ten(off)
            ))
        } else if takes_bending(model, m) && typical > 0.0 {
            let ratio = stiffness_index(model, m) / typical;
            (!(1.0 / MAX_STIFFNESS_RATIO..=MAX_STIFFNESS_RATIO).contains(&ratio)).then(|| {
                format!(
                    "{named}: EI/L³ is {} times the median of the frame's members: \
                     check the units of E and I",
                    power_of_ten(ratio)
                )
            })
        } else {
            None
        };
        if let Some(message) = message {
            out.push(Implausible { member: m, message });
        }
    }
    out
}

/// The note for a mechanism message: which implausible members touch the nodes found free
/// to move (`free_nodes`, indices into [`Model::nodes`]; mesh nodes beyond them are
/// ignored), or else which implausible members the frame has at all. Empty when every
/// member is plausible.
pub fn mechanism_note(model: &Model, free_nodes: &[usize]) -> String {
    let bad = implausible_members(model);
    if bad.is_empty() {
        return String::new();
    }
    let touches = |b: &&Implausible| {
        let mem = &model.members[b.member];
        free_nodes.contains(&mem.i) || free_nodes.contains(&mem.j)
    };
    let at: Vec<&Implausible> = bad.iter().filter(touches).collect();
    let (which, list) = if at.is_empty() {
        ("the frame has members", bad.iter().collect::<Vec<_>>())
    } else {
        ("the free nodes sit on members", at)
    };
    let ids: Vec<&str> = list
        .iter()
        .map(|b| model.members[b.member].id.as_str())
        .collect();
    format!(
        "; {which} with implausible properties ({}): the singular pivots may come from a \
         unit slip in their section or material, not from a missing support",
        ids.join(", ")
    )
}
