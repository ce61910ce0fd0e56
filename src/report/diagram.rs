//! Moment diagrams for drawings: the design moments at a member's ends joined by the
//! statics of its span loads.
//!
//! For a member of length L with end moments M_i and M_j and transverse loads, statics
//! gives M(x) = M_i·(1 − x/L) + M_j·x/L + M0(x), where M0 is the moment of the same loads
//! on a simply supported span (closed form: superposition of the end moments' linear
//! diagram and the simple-span diagram). The drawing uses the design end moments, so the
//! curve passes through the reported end values; its span peak is labelled with the
//! reported span value.

use crate::model::LocalLoad;
use crate::solve::beam::{breakpoints, internal_forces};
use crate::solve::forces::EndForces;

/// `(x, M)` along a member of length `l`: the end moments `m_i`, `m_j` joined by the
/// simple-span moment of `loads`, at `count` equal steps plus every load breakpoint.
pub fn design_diagram(
    l: f64,
    m_i: f64,
    m_j: f64,
    loads: &[LocalLoad],
    count: usize,
) -> Vec<(f64, f64)> {
    let mut xs = stations(l, count);
    xs.extend(breakpoints(l, loads));
    xs.sort_by(f64::total_cmp);
    xs.dedup_by(|a, b| (*a - *b).abs() <= 1e-9 * l);
    diagram_at(l, m_i, m_j, loads, &xs)
}

/// `count` equal steps over `0..=l` (`count + 1` positions).
pub fn stations(l: f64, count: usize) -> Vec<f64> {
    let n = count.max(1);
    (0..=n).map(|k| l * k as f64 / n as f64).collect()
}

/// `(x, M)` at the positions `xs` (see [`design_diagram`]).
pub fn diagram_at(l: f64, m_i: f64, m_j: f64, loads: &[LocalLoad], xs: &[f64]) -> Vec<(f64, f64)> {
    let zero = EndForces::default();
    // Moment of the loads left of x on a free body with no end forces: m_raw(x). The
    // simple span adds the reaction at i, which makes M0(L) = 0.
    let m_raw = |x: f64| internal_forces(x, &zero, loads).m;
    let m_raw_l = m_raw(l);
    xs.iter()
        .map(|&x| {
            let t = if l > 0.0 { x / l } else { 0.0 };
            let m0 = m_raw(x) - m_raw_l * t;
            (x, m_i * (1.0 - t) + m_j * t + m0)
        })
        .collect()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn uniform_load_on_a_simple_span_peaks_at_wl2_over_8() {
        // Closed form: a simply supported span under a uniform load w (acting along −y,
        // so qy = −w) has M(L/2) = wL²/8, sagging (positive).
        let (l, w) = (6.0, 10.0e3);
        let loads = [LocalLoad::Linear {
            a: 0.0,
            b: l,
            qx_a: 0.0,
            qy_a: -w,
            qx_b: 0.0,
            qy_b: -w,
        }];
        let d = design_diagram(l, 0.0, 0.0, &loads, 10);
        let mid = d.iter().find(|(x, _)| (x - l / 2.0).abs() < 1e-9).unwrap();
        assert!(
            (mid.1 - w * l * l / 8.0).abs() < 1e-6 * w * l * l,
            "{mid:?}"
        );
        // End moments of a fixed-ended span, −wL²/12 at each end (closed form), shift the
        // midspan value to wL²/8 − wL²/12 = wL²/24.
        let m = -w * l * l / 12.0;
        let d = design_diagram(l, m, m, &loads, 10);
        let mid = d.iter().find(|(x, _)| (x - l / 2.0).abs() < 1e-9).unwrap();
        assert!((mid.1 - w * l * l / 24.0).abs() < 1e-6 * w * l * l);
        assert!((d[0].1 - m).abs() < 1e-9 && (d.last().unwrap().1 - m).abs() < 1e-9);
    }
}
