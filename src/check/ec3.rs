//! EN 1993-1-1:2005 §5.2–5.3: the story criterion α_cr, the amplified sway method and the
//! equivalent sway imperfection.
//!
//! References (reference notes §8): (5.1) α_cr ≥ 10 \[M\]; (5.2) α_cr = (H/V)(h/δ) \[C\];
//! §5.2.2(5)B amplifier 1/(1 − 1/α_cr) for α_cr ≥ 3 [C amplifier, M clause wording];
//! (5.5) φ = φ0·αh·αm \[C\]; §5.3.2(4)B H ≥ 0.15·V \[M\].

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

/// The amplified sway method multiplies every sway effect by one factor; that is right
/// only where the first-order sway of the case has the shape of the frame's first sway
/// mode (EN 1993-1-1 §5.2.2(6)B, from memory: storeys with similar distributions of
/// vertical load, horizontal load and stiffness, first sway mode governing). Measured
/// here on the case itself: the cosine between the stories' first-order drift ratios
/// Δ/h and those of the buckled shape must be at least this (common practice, no source:
/// a first-order sway of which more than about 30 % lies outside the first mode is not
/// amplified by 1/(1 − 1/α_cr), and where its sway part relieves the no-sway part the
/// amplified total is then too small).
pub const MODE_SHAPE_MIN_COSINE: f64 = 0.95;

/// Whether the case's first-order sway fits the amplified sway method (§5.2.2(6)B):
/// `Ok(figures)` or `Err(why not)`, each naming the deciding figures.
///
/// `first` are the stories' first-order drifts of the case and `mode` those of the
/// frame's lowest sway mode (m; None without a buckling analysis), `h` the heights and
/// `significant` whether each first-order drift is significant. Conditions: every
/// significant story drift is in the sense of the buckled shape (sway forces of mixed
/// sign or a relieving sway fail it), and the drift-ratio shapes have a cosine of at
/// least [`MODE_SHAPE_MIN_COSINE`].
pub fn amplified_method_conditions(
    first: &[f64],
    mode: Option<&[f64]>,
    h: &[f64],
    significant: &[bool],
) -> Result<String, String> {
    let theta: Vec<f64> = first
        .iter()
        .zip(h)
        .zip(significant)
        .map(|((d, h), &s)| if s { d / h } else { 0.0 })
        .collect();
    let Some(mode) = mode else {
        // No sway mode to compare with: the stories' own senses must agree.
        let pos = theta.iter().any(|&t| t > 0.0);
        let neg = theta.iter().any(|&t| t < 0.0);
        return if pos && neg {
            Err("the stories' first-order drifts change sense up the height".into())
        } else {
            Ok("first-order drifts of one sense".into())
        };
    };
    let psi: Vec<f64> = mode.iter().zip(h).map(|(d, h)| d / h).collect();
    let dot: f64 = theta.iter().zip(&psi).map(|(a, b)| a * b).sum();
    let norm = |v: &[f64]| v.iter().map(|x| x * x).sum::<f64>().sqrt();
    // A mode has no sign of its own: the cosine of the shapes is taken unsigned.
    let cosine = dot.abs() / (norm(&theta) * norm(&psi));
    let sense = dot.signum();
    let against: Vec<usize> = theta
        .iter()
        .zip(&psi)
        .enumerate()
        .filter(|(_, (t, p))| **t != 0.0 && sense * *t * **p < 0.0)
        .map(|(k, _)| k + 1)
        .collect();
    if !cosine.is_finite() {
        return Err("no significant first-order sway to compare with the buckled shape".into());
    }
    if !against.is_empty() {
        let list: Vec<String> = against.iter().map(|k| k.to_string()).collect();
        return Err(format!(
            "the first-order drift of story {} is against the buckled shape (sway forces of \
             mixed sense)",
            list.join(", ")
        ));
    }
    if cosine < MODE_SHAPE_MIN_COSINE {
        return Err(format!(
            "the first-order sway is not the first sway mode's shape (cosine of the drift \
             shapes {cosine:.3} < {MODE_SHAPE_MIN_COSINE})"
        ));
    }
    Ok(format!(
        "first-order sway in the buckled shape (cosine {cosine:.3})"
    ))
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

/// Sway imperfections may be disregarded when `H_Ed ≥ 0.15·V_Ed`, §5.3.2(4)B \[M\].
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
    fn the_amplified_method_needs_the_sway_in_the_buckled_shape() {
        // Our reading of §5.2.2(6)B (common practice, no source): drifts proportional to
        // the mode's pass whatever the mode's sign (a mode has none); a story drifting
        // against the mode, or a shape far from it, fails.
        let h = [4.0, 3.5, 3.5];
        let mode = [1.0, 0.8, 0.5];
        let all = [true; 3];
        assert!(amplified_method_conditions(&[2.0, 1.6, 1.0], Some(&mode), &h, &all).is_ok());
        let flipped = mode.map(|m| -m);
        assert!(amplified_method_conditions(&[2.0, 1.6, 1.0], Some(&flipped), &h, &all).is_ok());
        let mixed = amplified_method_conditions(&[2.0, -0.3, 1.0], Some(&mode), &h, &all);
        assert!(mixed.unwrap_err().contains("story 2"));
        // Same sense but another shape: cosine of (1, 0.1, 0.1)/h against the mode < 0.95.
        let other = amplified_method_conditions(&[4.0, 0.35, 0.35], Some(&mode), &h, &all);
        assert!(other.unwrap_err().contains("cosine"));
        // A negligible story is not held against the mode's sense (its drift counts as 0 in
        // the shape, which here then fails the cosine instead).
        let some = [true, false, true];
        let why = amplified_method_conditions(&[2.0, -0.3, 1.0], Some(&mode), &h, &some);
        assert!(why.unwrap_err().contains("cosine"));
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
