//! ACI 318-19 §6.6.4, moment magnification: stability index Q, sway magnifier δs,
//! non-sway magnifier δ, and the limits around them.
//!
//! References (reference notes §7): 6.6.4.4.1 Q \[C\]; 6.6.4.3(b) Q ≤ 0.05 \[C\];
//! 6.6.4.6.2 δs (a)–(c) and the 1.5 limit \[C\]; 6.6.4.5.2 δ and 6.6.4.5.3 Cm \[C numbering,
//! forms M\]; 6.6.4.4.2 Pc and 6.6.4.4.4(a) (EI)eff \[M\]; 6.2.5.3 the 1.4 limit \[M\].

use std::f64::consts::PI;

/// Stability index, 6.6.4.4.1: `Q = ΣPu·Δo / (Vus·lc)`, written with the story's lateral
/// stiffness `Vus/Δo` (N/m) and height `lc`.
pub fn q_index(sum_pu: f64, story_stiffness: f64, l_c: f64) -> f64 {
    sum_pu.max(0.0) / (story_stiffness * l_c)
}

/// A story is non-sway if Q ≤ 0.05, 6.6.4.3(b).
pub const Q_NONSWAY: f64 = 0.05;

/// The Q method of δs is permitted up to this value, 6.6.4.6.2.
pub const DELTA_S_Q_LIMIT: f64 = 1.5;

/// Sway magnifier by the Q method, 6.6.4.6.2(a): `δs = 1/(1 − Q) ≥ 1`; `None` when
/// δs would exceed 1.5 (then (b) or (c) is required) or Q ≥ 1.
pub fn delta_s_q(q: f64) -> Option<f64> {
    let d = 1.0 - q;
    let ds = (1.0 / d).max(1.0);
    (d > 0.0 && ds <= DELTA_S_Q_LIMIT).then_some(ds)
}

/// Critical buckling load, 6.6.4.4.2: `Pc = π²·(EI)eff / (k·lu)²`.
pub fn p_c(ei_eff: f64, k: f64, l_u: f64) -> f64 {
    PI * PI * ei_eff / (k * l_u).powi(2)
}

/// Effective flexural stiffness, 6.6.4.4.4(a): `(EI)eff = 0.4·Ec·Ig / (1 + βdns)`.
pub fn ei_eff(e_c: f64, i_g: f64, beta_dns: f64) -> f64 {
    0.4 * e_c * i_g / (1.0 + beta_dns)
}

/// Non-sway magnifier, 6.6.4.5.2: `δ = Cm / (1 − Pu/(0.75·Pc)) ≥ 1`; `None` when
/// `Pu ≥ 0.75·Pc`.
pub fn delta_ns(c_m: f64, p_u: f64, p_c: f64) -> Option<f64> {
    let d = 1.0 - p_u.max(0.0) / (0.75 * p_c);
    (d > 0.0).then(|| (c_m / d).max(1.0))
}

/// The constant eccentricity of M2,min in ACI 318M-19 (SI) 6.6.4.5.4: 15 mm (from memory).
pub const E_MIN_SI: f64 = 0.015;

/// The constant eccentricity of M2,min in ACI 318-19 (inch-pound) 6.6.4.5.4: 0.6 in
/// [C numbering, form M].
pub const E_MIN_INCH_POUND: f64 = 0.6 * crate::units::INCH;

/// The edition of 6.6.4.5.4 that fits the model's units: the inch-pound ACI 318 when the
/// model's lengths or sections are in feet or inches, else the SI ACI 318M.
pub fn e_min_for(units: &crate::units::UnitSystem) -> f64 {
    let imperial = |f: f64| f == crate::units::INCH || f == crate::units::FOOT;
    if imperial(units.length.factor) || imperial(units.section.factor) {
        E_MIN_INCH_POUND
    } else {
        E_MIN_SI
    }
}

/// Minimum moment, 6.6.4.5.4: `M2,min = Pu·(e_min + 0.03h)`, written in SI with h in m and
/// `e_min` the constant of the edition in use: ACI 318M writes `Pu·(15 + 0.03h)` with h in
/// mm ([`E_MIN_SI`]), ACI 318 `Pu·(0.6 + 0.03h)` with h in inches ([`E_MIN_INCH_POUND`]).
pub fn m2_min(p_u: f64, h: f64, e_min: f64) -> f64 {
    p_u.max(0.0) * (e_min + 0.03 * h)
}

/// Second-order moments may not exceed 1.4 × first-order moments, 6.2.5.3 \[M\].
pub const SECOND_ORDER_LIMIT: f64 = 1.4;

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    #[test]
    fn q_and_delta_s_by_hand() {
        // Hand calculation (6.6.4.4.1, 6.6.4.6.2(a)): ΣPu = 4000 kN, Δo = 12 mm,
        // Vus = 300 kN, lc = 4 m: Q = 4000·0.012/(300·4) = 0.04 ≤ 0.05, non-sway;
        // δs = 1/(1 − 0.04) = 1.0417.
        let q = q_index(4000.0, 300.0 / 0.012, 4.0);
        assert_relative_eq!(q, 0.04, max_relative = 1e-12);
        assert_relative_eq!(delta_s_q(q).unwrap(), 1.0 / 0.96);
        // Beyond δs = 1.5 (Q > 1/3) the Q method is not permitted.
        assert!(delta_s_q(0.34).is_none());
    }

    #[test]
    fn minimum_moment_in_the_si_form_of_aci_318m() {
        // ACI 318M-19 6.6.4.5.4 (from memory): M2,min = Pu·(15 + 0.03h), h in mm.
        // Pu = 1000 kN, h = 500 mm: 15 + 0.03·500 = 30 mm → 1000 kN × 0.030 m = 30 kN·m
        // (the 15.24 mm of the converted inch form would give 30.24 kN·m).
        let m = m2_min(1000e3, 0.500, E_MIN_SI);
        assert_relative_eq!(m, 30e3, max_relative = 1e-12);
        // In tension there is no minimum moment.
        assert_eq!(m2_min(-10e3, 0.5, E_MIN_SI), 0.0);
        // ACI 318-19 6.6.4.5.4 (inch-pound): Pu = 100 kip, h = 20 in: 100·(0.6 + 0.6) =
        // 120 kip-in.
        let m = m2_min(100.0, 20.0 * 0.0254, E_MIN_INCH_POUND); // kip·m
        assert_relative_eq!(m / 0.0254, 120.0, max_relative = 1e-12);
    }

    #[test]
    fn minimum_moment_edition_follows_the_model_units() {
        use crate::units::UnitSystem;
        let si = UnitSystem::preset("kN-m").unwrap();
        let us = UnitSystem::preset("kip-ft").unwrap();
        assert_eq!(e_min_for(&si), E_MIN_SI);
        assert_eq!(e_min_for(&us), E_MIN_INCH_POUND);
    }
}
