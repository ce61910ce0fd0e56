//! EN 1993-1-1:2005 §5.2–5.3: the story criterion α_cr, the amplified sway method and the
//! equivalent sway imperfection.
//!
//! References (reference notes §8): (5.1) α_cr ≥ 10 [M]; (5.2) α_cr = (H/V)(h/δ) [C];
//! §5.2.2(5)B amplifier 1/(1 − 1/α_cr) for α_cr ≥ 3 [C amplifier, M clause wording];
//! (5.5) φ = φ0·αh·αm [C]; §5.3.2(4)B H ≥ 0.15·V [M].

use super::story::{Classification, StoryFigures};

/// First-order analysis is enough when α_cr ≥ 10 (elastic analysis), (5.1).
pub const ALPHA_CR_FIRST_ORDER: f64 = 10.0;

/// Below this α_cr the amplified sway method is not permitted, §5.2.2(5)B.
pub const ALPHA_CR_AMPLIFIED_MIN: f64 = 3.0;

/// Story criterion (5.2): `α_cr = (H_Ed/V_Ed)·(h/δ_H,Ed)`, written with the story's
/// lateral stiffness `H_Ed/δ_H,Ed` (N/m).
pub fn alpha_cr(story_stiffness: f64, h: f64, v_ed: f64) -> f64 {
    if v_ed > 0.0 {
        story_stiffness * h / v_ed
    } else {
        f64::INFINITY
    }
}

/// Amplifier of sway effects, §5.2.2(5)B: `1/(1 − 1/α_cr)`; `None` below α_cr = 3.
pub fn sway_amplifier(alpha_cr: f64) -> Option<f64> {
    (alpha_cr >= ALPHA_CR_AMPLIFIED_MIN).then(|| 1.0 / (1.0 - 1.0 / alpha_cr))
}

/// α_cr of the structure, §5.2.1(3) and (4)B (from memory): the structure is judged by one
/// value, the lowest story value of (5.2), or the frame's buckling analysis when that is
/// lower. `None` when neither exists (nothing can buckle).
pub fn structure_alpha_cr(
    story: impl IntoIterator<Item = f64>,
    buckling: Option<f64>,
) -> Option<f64> {
    story
        .into_iter()
        .chain(buckling)
        .filter(|a| !a.is_nan())
        .min_by(f64::total_cmp)
}

/// Judge the whole structure by one α_cr ([`structure_alpha_cr`]) and give every story the
/// same verdict (EN 1993-1-1 §5.2.1(3)/(4)B, §5.2.2(5)B/(6)B, from memory):
/// * α_cr ≥ 10: first-order analysis suffices, sway effects × 1.0 (5.1);
/// * 3 ≤ α_cr < 10: all sway effects × 1/(1 − 1/α_cr) (amplified sway method);
/// * α_cr < 3: a second-order analysis is required; each story's sway effects are then
///   amplified by its Δ2nd/Δ1st from the direct analysis, or the story is unstable when that
///   analysis did not converge.
pub fn judge_structure(
    figures: &mut [StoryFigures],
    buckling: Option<f64>,
    direct_converged: bool,
) {
    let lowest_story = figures
        .iter()
        .map(|f| f.alpha_cr_story)
        .min_by(f64::total_cmp);
    let Some(a) = structure_alpha_cr(lowest_story, buckling) else {
        return;
    };
    let source = match (lowest_story, buckling) {
        (Some(s), Some(b)) if b < s => {
            format!("buckling analysis {b:.2} < lowest story value {s:.2}")
        }
        (Some(s), Some(b)) => format!("lowest story value {s:.2}; buckling analysis {b:.2}"),
        (Some(s), None) => format!("lowest story value {s:.2}"),
        (None, _) => "buckling analysis".to_string(),
    };
    for f in figures.iter_mut() {
        let (amp, class, criterion) = if a >= ALPHA_CR_FIRST_ORDER {
            (
                Some(1.0),
                Classification::NonSway,
                format!(
                    "structure α_cr = {a:.2} ≥ 10 ({source}): first-order analysis suffices (EN 1993-1-1 (5.1), 5.2.1(3))"
                ),
            )
        } else if let Some(amp) = sway_amplifier(a) {
            (
                Some(amp),
                Classification::Sway,
                format!(
                    "structure α_cr = {a:.2} < 10 ({source}): all sway effects × 1/(1 − 1/α_cr) = {amp:.3} (EN 1993-1-1 5.2.2(5)B)"
                ),
            )
        } else if direct_converged {
            let r = f.direct_sway_amplifier.unwrap_or(1.0);
            (
                Some(r),
                Classification::Sway,
                format!(
                    "structure α_cr = {a:.2} < 3 ({source}): second-order analysis required (EN 1993-1-1 5.2.2(5)B); sway effects × {r:.3} from the direct analysis (Δ2nd/Δ1st of the story or of the top, the larger, at least 1)"
                ),
            )
        } else {
            (
                None,
                Classification::Unstable,
                format!(
                    "structure α_cr = {a:.2} < 3 ({source}) and the direct second-order analysis did not converge"
                ),
            )
        };
        f.sway_amplifier = amp;
        f.classification = class;
        f.criterion = criterion;
    }
}

/// Equivalent sway imperfection (5.5): `φ = φ0·αh·αm` with φ0 = 1/200,
/// `αh = 2/√h` within 2/3 ≤ αh ≤ 1.0 (h the structure height in m) and
/// `αm = √(0.5·(1 + 1/m))` (m the columns in a row carrying at least 50 % of the average
/// column load).
pub fn sway_imperfection(height: f64, m: usize) -> f64 {
    let phi_0 = 1.0 / 200.0;
    let alpha_h = (2.0 / height.sqrt()).clamp(2.0 / 3.0, 1.0);
    let alpha_m = (0.5 * (1.0 + 1.0 / m.max(1) as f64)).sqrt();
    phi_0 * alpha_h * alpha_m
}

/// Sway imperfections may be disregarded when `H_Ed ≥ 0.15·V_Ed`, §5.3.2(4)B [M].
pub fn imperfection_negligible(h_ed: f64, v_ed: f64) -> bool {
    h_ed.abs() >= 0.15 * v_ed.abs()
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    #[test]
    fn imperfection_of_a_two_column_frame_by_hand() {
        // (5.5) by hand: h = 9 m → αh = 2/3; m = 2 → αm = √0.75 = 0.8660;
        // φ = (1/200)·(2/3)·0.8660 = 2.887e-3.
        assert_relative_eq!(sway_imperfection(9.0, 2), 2.8868e-3, max_relative = 1e-4);
        // h = 4 m → αh = 1.0 (upper bound).
        assert_relative_eq!(sway_imperfection(4.0, 1), 1.0 / 200.0, max_relative = 1e-12);
    }

    #[test]
    fn amplifier_and_limits() {
        // §5.2.2(5)B: α_cr = 5 → 1/(1 − 0.2) = 1.25; below 3 not permitted.
        assert_relative_eq!(sway_amplifier(5.0).unwrap(), 1.25);
        assert!(sway_amplifier(2.9).is_none());
        // (5.2) by hand: H/δ = 5000 kN/m, h = 4 m, V = 1000 kN → α_cr = 20.
        assert_relative_eq!(alpha_cr(5000.0, 4.0, 1000.0), 20.0);
    }
}
