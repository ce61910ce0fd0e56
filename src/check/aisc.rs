//! AISC 360-16 Appendix 8, approximate second-order analysis (amplified first-order), and
//! the notional load of §C2.2b.
//!
//! References (reference notes §6 and §9): equations A-8-3 to A-8-8 [M, A-8-3 and the
//! α values confirmed in a secondary source]; C2-1 [C1, equation form M].

use crate::combos::Basis;

/// α of Appendix 8.2 (and §C2.2b): 1.00 on a strength (LRFD) basis, 1.60 on an
/// allowable-stress (ASD) basis \[C\].
pub fn alpha(basis: Basis) -> f64 {
    match basis {
        Basis::AllowableStress => 1.6,
        Basis::Strength | Basis::Serviceability => 1.0,
    }
}

/// Elastic critical buckling strength of the member in the plane of bending, A-8-5:
/// `Pe1 = π²·EI* / (Lc1)²`, with `Lc1 = K1·L` (K1 = 1.0 unless analysis justifies less).
pub fn p_e1(ei_star: f64, l_c1: f64) -> f64 {
    std::f64::consts::PI.powi(2) * ei_star / (l_c1 * l_c1)
}

/// B1 multiplier for P-δ effects, A-8-3: `B1 = Cm / (1 − α·Pr/Pe1) ≥ 1`.
/// `None` when `α·Pr ≥ Pe1` (the member buckles in the plane of bending).
pub fn b1(c_m: f64, alpha: f64, p_r: f64, p_e1: f64) -> Option<f64> {
    let d = 1.0 - alpha * p_r.max(0.0) / p_e1;
    (d > 0.0).then(|| (c_m / d).max(1.0))
}

/// RM, A-8-8: `RM = 1 − 0.15·(Pmf/Pstory)`; 0.85 for a story of moment-frame columns only,
/// 1.0 for braced systems (no moment-frame columns).
pub fn r_m(p_mf: f64, p_story: f64) -> f64 {
    if p_story > 0.0 {
        1.0 - 0.15 * (p_mf / p_story).clamp(0.0, 1.0)
    } else {
        1.0
    }
}

/// Elastic critical buckling strength of the story, A-8-7: `Pe,story = RM·H·L/ΔH`, written
/// with the story's lateral stiffness `H/ΔH` (N/m) and height `L`.
pub fn p_e_story(r_m: f64, story_stiffness: f64, l: f64) -> f64 {
    r_m * story_stiffness * l
}

/// B2 multiplier for P-Δ effects, A-8-6: `B2 = 1 / (1 − α·Pstory/Pe,story) ≥ 1`.
/// `None` when `α·Pstory ≥ Pe,story` (the story is unstable).
pub fn b2(alpha: f64, p_story: f64, p_e_story: f64) -> Option<f64> {
    let d = 1.0 - alpha * p_story.max(0.0) / p_e_story;
    (d > 0.0).then(|| (1.0 / d).max(1.0))
}

/// Coefficient of the notional load at the level of the case's own loads.
///
/// C2-1 gives `Ni = 0.002·α·Yi` for an analysis run at α × the combination's loads (1.6 ×
/// an ASD combination, §C2.1); per unit of the case's own loads that is `0.002·Yi`
/// (`base`), and the analysis then scales loads and notional loads together by α. With
/// τb = 1.0 taken for all members, §C2.3(c) adds `0.001·α·Yi` likewise
/// [C: reference notes §9].
pub fn notional_coefficient(base: f64, tau_b_one: bool) -> f64 {
    base + if tau_b_one {
        NOTIONAL_TAU_B_ADDITION
    } else {
        0.0
    }
}

/// The default notional-load coefficient of §C2.2b, C2-1: `Ni = 0.002·α·Yi` \[C1\].
pub const NOTIONAL_COEFFICIENT: f64 = 0.002;

/// The additional notional load of §C2.3(c) when τb = 1.0 is taken for all members:
/// `0.001·α·Yi` [C: reference notes §9].
pub const NOTIONAL_TAU_B_ADDITION: f64 = 0.001;

/// Classification threshold on B2 (or Δ2nd/Δ1st): at or below 1.1 the sway effects are
/// small enough that K = 1.0 may be used for moment-frame columns — AISC 360-16
/// Appendix 7.2.3(b) (from memory).
pub const B2_NONSWAY: f64 = 1.1;

/// Above this Δ2nd/Δ1st, notional loads are added to combinations with lateral loads too;
/// at or below it only to gravity-only combinations — §C2.2b(d) \[C1\].
pub const NOTIONAL_GRAVITY_ONLY_LIMIT: f64 = 1.7;

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    #[test]
    fn b1_of_a_braced_column_by_hand() {
        // Hand calculation (A-8-3, A-8-5): EI = 29000 ksi × 484 in⁴, L = 28 ft = 336 in,
        // Pe1 = π²·14 036 000 / 336² = 1227.0 kips; Cm = 1.0; Pr = 150 kips, α = 1.0:
        // B1 = 1/(1 − 150/1227.0) = 1.1393.
        let pe1 = p_e1(29_000.0 * 484.0, 336.0);
        assert_relative_eq!(pe1, 1227.0, max_relative = 1e-3);
        assert_relative_eq!(
            b1(1.0, 1.0, 150.0, pe1).unwrap(),
            1.1393,
            max_relative = 1e-3
        );
        assert!(b1(1.0, 1.6, 800.0, pe1).is_none());
    }

    #[test]
    fn rm_and_b2_limits() {
        // RM = 0.85 for moment-frame columns only, 1.0 for none (A-8-8 [M]).
        assert_relative_eq!(r_m(100.0, 100.0), 0.85);
        assert_relative_eq!(r_m(0.0, 100.0), 1.0);
        // B2 = 1/(1 − 1.0·100/1000) = 1.1111 (A-8-6, hand calculation).
        assert_relative_eq!(b2(1.0, 100.0, 1000.0).unwrap(), 1.0 / 0.9);
        assert!(b2(1.6, 700.0, 1000.0).is_none());
    }
}
