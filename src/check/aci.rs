//! ACI 318-19 §6.6.4, moment magnification: stability index Q, sway magnifier δs,
//! non-sway magnifier δ, and the limits around them.
//!
//! References (reference notes §7): 6.6.4.4.1 Q [C]; 6.6.4.3(b) Q ≤ 0.05 [C];
//! 6.6.4.6.2 δs (a)–(c) and the 1.5 limit [C]; 6.6.4.5.2 δ and 6.6.4.5.3 Cm [C numbering,
//! forms M]; 6.6.4.4.2 Pc and 6.6.4.4.4(a) (EI)eff [M]; 6.2.5.3 the 1.4 limit [M].

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

/// Minimum moment, 6.6.4.5.4: `M2,min = Pu·(0.6 + 0.03h)` with h in inches; in SI
/// `Pu·(0.01524 m + 0.03·h)`.
pub fn m2_min(p_u: f64, h: f64) -> f64 {
    p_u.max(0.0) * (0.6 * 0.0254 + 0.03 * h)
}

/// Second-order moments may not exceed 1.4 × first-order moments, 6.2.5.3 [M].
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
    fn minimum_moment_in_si_matches_inch_form() {
        // 6.6.4.5.4: Pu = 100 kip, h = 20 in: 100·(0.6 + 0.6) = 120 kip-in.
        let m = m2_min(100.0, 20.0 * 0.0254); // kip·m
        assert_relative_eq!(m / 0.0254, 120.0, max_relative = 1e-12);
    }
}
