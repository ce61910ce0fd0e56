//! EN 1993-1-1:2005 §5.2–5.3: the story criterion α_cr, the amplified sway method and the
//! equivalent sway imperfection.
//!
//! References (reference notes §8): (5.1) α_cr ≥ 10 [M]; (5.2) α_cr = (H/V)(h/δ) [C];
//! §5.2.2(5)B amplifier 1/(1 − 1/α_cr) for α_cr ≥ 3 [C amplifier, M clause wording];
//! (5.5) φ = φ0·αh·αm [C]; §5.3.2(4)B H ≥ 0.15·V [M].

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
