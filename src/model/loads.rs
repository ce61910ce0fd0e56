//! Load cases: service-level actions as the engineer writes them, before any factoring.
//!
//! Sign convention (defined once, here, for the whole crate):
//! * Global axes: X to the right, Y up; rotations and moments counter-clockwise (CCW) positive.
//! * Member-local axes: x from end i to end j, y rotated 90° CCW from x.
//! * Loads in global directions carry the sign of the axis (a downward force has a negative
//!   Y component); [`LoadDirection::Gravity`] takes a positive magnitude as acting downward.

use serde::{Deserialize, Serialize};
use strum::{Display, EnumIter, EnumString, IntoStaticStr};

/// The kind of action a load case belongs to. Combination tables (see [`crate::combos`]) draw
/// load cases from these categories through their action symbols.
#[derive(
    Debug,
    Clone,
    Copy,
    PartialEq,
    Eq,
    Hash,
    PartialOrd,
    Ord,
    Serialize,
    Deserialize,
    Display,
    EnumString,
    EnumIter,
    IntoStaticStr,
)]
#[serde(rename_all = "kebab-case")]
#[strum(serialize_all = "kebab-case")]
pub enum ActionCategory {
    /// Permanent load: self-weight, finishes, fixed equipment.
    Dead,
    /// Floor live (imposed) load from occupancy.
    Live,
    /// Roof live load (maintenance, workers, materials).
    RoofLive,
    /// Snow load.
    Snow,
    /// Rain load (ponding).
    Rain,
    /// Wind load.
    Wind,
    /// Seismic (earthquake) horizontal effect.
    Seismic,
    /// Temperature (thermal) action.
    Temperature,
}

/// The level at which the magnitudes of a load case were computed, where the trade
/// distinguishes levels (wind, snow, seismic). The names are plumbline's; each stands for the
/// definition of the standards listed. A combination table states the level it expects for
/// each category; a load case of another level is refused unless the model states a
/// conversion (see `docs/combination-tables.md`, "Load levels").
#[derive(
    Debug,
    Clone,
    Copy,
    PartialEq,
    Eq,
    Hash,
    PartialOrd,
    Ord,
    Serialize,
    Deserialize,
    Display,
    EnumString,
    EnumIter,
    IntoStaticStr,
)]
#[serde(rename_all = "kebab-case")]
#[strum(serialize_all = "kebab-case")]
pub enum LoadLevel {
    /// Strength level, used with a load factor of 1.0 in strength design: wind by ASCE/SEI
    /// 7-10, 7-16 and 7-22, snow by ASCE/SEI 7-22, seismic E by ASCE/SEI 7.
    Strength,
    /// Nominal (about 50-year) level, factored 1.6 in strength design: snow by ASCE/SEI 7-16,
    /// wind by ASCE 7-05 and earlier.
    Nominal,
    /// Characteristic value of EN 1990 §4.1.2 (wind by EN 1991-1-4, snow by EN 1991-1-3).
    Characteristic,
    /// Specified load of the NBCC (Division B, Part 4).
    Specified,
    /// Ultimate action of AS/NZS 1170 (Wu, Su, Eu).
    Ultimate,
}

impl ActionCategory {
    /// Categories whose load cases may state a [`LoadLevel`]: the trade distinguishes levels
    /// only for wind, snow and seismic loads.
    pub fn has_levels(self) -> bool {
        matches!(
            self,
            ActionCategory::Wind | ActionCategory::Snow | ActionCategory::Seismic
        )
    }

    /// Lateral categories: a planar frame must be checked with them acting from either side.
    pub fn is_lateral(self) -> bool {
        matches!(self, ActionCategory::Wind | ActionCategory::Seismic)
    }
}

/// Direction of a member load.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize, Display, EnumString)]
#[serde(rename_all = "kebab-case")]
#[strum(serialize_all = "kebab-case")]
pub enum LoadDirection {
    /// Along the member axis, positive from end i towards end j.
    LocalX,
    /// Perpendicular to the member, positive along local y (90° CCW from i→j).
    LocalY,
    /// Global X (positive to the right).
    GlobalX,
    /// Global Y (positive upward).
    GlobalY,
    /// Global −Y with a positive magnitude acting downward (`direction = "down"` in the
    /// model file).
    #[strum(serialize = "down")]
    #[serde(rename = "down")]
    Gravity,
}

/// What length a distributed load in a global direction is spread over on a sloped member
/// (`spread_over = "member" | "projection"` in the model file).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, Serialize, Deserialize)]
pub enum Measure {
    /// Intensity per unit length along the member (`spread_over = "member"`).
    #[default]
    #[serde(rename = "member")]
    AlongMember,
    /// Intensity per unit length of the member's projection perpendicular to the load
    /// (horizontal projection for a downward load, vertical projection for a global-X load;
    /// `spread_over = "projection"`).
    #[serde(rename = "projection")]
    Projected,
}

/// One load on a member, as written by the engineer, in SI units (N, N/m, N·m, m).
/// Positions `a`, `b` are distances from end i measured along the member.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub enum MemberLoadKind {
    /// Linearly varying distributed load from `a` to `b` (intensity `w_a` at `a`, `w_b` at `b`).
    /// A uniform load has `w_a == w_b`; a full-length load has `a == 0`, `b == L`.
    Distributed {
        a: f64,
        b: f64,
        w_a: f64,
        w_b: f64,
        direction: LoadDirection,
        measure: Measure,
    },
    /// Concentrated force `p` at distance `a` from end i.
    Point {
        a: f64,
        p: f64,
        direction: LoadDirection,
    },
    /// Concentrated moment `m` (CCW positive) at distance `a` from end i.
    Moment { a: f64, m: f64 },
}

/// A member load with the member it acts on (index into [`crate::model::Model::members`]).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct MemberLoad {
    pub member: usize,
    pub kind: MemberLoadKind,
}

/// Forces and a moment applied at a node, global axes, SI units.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct NodalLoad {
    pub node: usize,
    pub fx: f64,
    pub fy: f64,
    pub mz: f64,
}

/// A service-level load case.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct LoadCase {
    pub id: String,
    pub description: String,
    pub category: ActionCategory,
    /// Load cases of one category that share this group name are mutually exclusive
    /// alternatives (wind from the left or from the right); each factored case is generated
    /// once per alternative. Cases without a group add up with every alternative.
    pub alternative_group: Option<String>,
    /// The level the magnitudes were computed at (wind, snow and seismic only); `None` when
    /// the model does not say.
    pub level: Option<LoadLevel>,
    /// Also act with every load reversed (a lateral load from the other side): the case
    /// and its negative are alternatives.
    pub reverse: bool,
    /// Live load on beams placed in the arrangements of [`crate::arrange`] (ACI 318-19
    /// §6.4.3, EN 1992-1-1 §5.1.3) instead of on every span at once.
    pub arrange: bool,
    pub nodal: Vec<NodalLoad>,
    /// Member loads, including self-weight already expanded into gravity loads.
    pub member: Vec<MemberLoad>,
}

impl LoadCase {
    /// An empty load case of `category`: no description, no alternative group, no stated
    /// level, not reversed, no loads. Builders and tests fill in the rest.
    pub fn new(id: &str, category: ActionCategory) -> LoadCase {
        LoadCase {
            id: id.to_string(),
            description: String::new(),
            category,
            alternative_group: None,
            level: None,
            reverse: false,
            arrange: false,
            nodal: Vec::new(),
            member: Vec::new(),
        }
    }
}

/// A member load in member-local axes, ready for the solver: the canonical form every
/// [`MemberLoadKind`] is reduced to. Positions from end i (m), forces N, N/m, N·m.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub enum LocalLoad {
    /// Linearly varying load on `a..b`: axial `qx` and transverse `qy` intensities (N/m)
    /// at `a` and at `b`.
    Linear {
        a: f64,
        b: f64,
        qx_a: f64,
        qy_a: f64,
        qx_b: f64,
        qy_b: f64,
    },
    /// Concentrated force with axial `px` and transverse `py` components at `a`.
    Point { a: f64, px: f64, py: f64 },
    /// Concentrated moment (CCW positive) at `a`.
    Moment { a: f64, m: f64 },
}

impl LocalLoad {
    /// The same load multiplied by `f` (a load factor).
    pub fn scaled(self, f: f64) -> LocalLoad {
        match self {
            LocalLoad::Linear {
                a,
                b,
                qx_a,
                qy_a,
                qx_b,
                qy_b,
            } => LocalLoad::Linear {
                a,
                b,
                qx_a: f * qx_a,
                qy_a: f * qy_a,
                qx_b: f * qx_b,
                qy_b: f * qy_b,
            },
            LocalLoad::Point { a, px, py } => LocalLoad::Point {
                a,
                px: f * px,
                py: f * py,
            },
            LocalLoad::Moment { a, m } => LocalLoad::Moment { a, m: f * m },
        }
    }
}

impl MemberLoadKind {
    /// Reduce to member-local components for a member whose i→j direction has cosines
    /// `(c, s)` = (ΔX/L, ΔY/L).
    ///
    /// A global load `w` per length along the member has local components
    /// `qx = w·(gx·c + gy·s)`, `qy = w·(−gx·s + gy·c)` with `(gx, gy)` its unit direction.
    /// A projected intensity acts over the projection of the member perpendicular to the
    /// load, so per length along the member it is multiplied by `|s|` for a global-X load
    /// and by `|c|` for a global-Y (gravity) load.
    pub fn to_local(&self, c: f64, s: f64) -> LocalLoad {
        // Unit direction in global axes, or None for a local direction.
        let rotate = |w: f64, dir: LoadDirection| -> (f64, f64) {
            let (gx, gy) = match dir {
                LoadDirection::LocalX => return (w, 0.0),
                LoadDirection::LocalY => return (0.0, w),
                LoadDirection::GlobalX => (1.0, 0.0),
                LoadDirection::GlobalY => (0.0, 1.0),
                LoadDirection::Gravity => (0.0, -1.0),
            };
            (w * (gx * c + gy * s), w * (-gx * s + gy * c))
        };
        match *self {
            MemberLoadKind::Distributed {
                a,
                b,
                w_a,
                w_b,
                direction,
                measure,
            } => {
                let proj = match (measure, direction) {
                    (Measure::Projected, LoadDirection::GlobalX) => s.abs(),
                    (Measure::Projected, LoadDirection::GlobalY | LoadDirection::Gravity) => {
                        c.abs()
                    }
                    _ => 1.0,
                };
                let (qx_a, qy_a) = rotate(w_a * proj, direction);
                let (qx_b, qy_b) = rotate(w_b * proj, direction);
                LocalLoad::Linear {
                    a,
                    b,
                    qx_a,
                    qy_a,
                    qx_b,
                    qy_b,
                }
            }
            MemberLoadKind::Point { a, p, direction } => {
                let (px, py) = rotate(p, direction);
                LocalLoad::Point { a, px, py }
            }
            MemberLoadKind::Moment { a, m } => LocalLoad::Moment { a, m },
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn gravity_on_horizontal_member_is_negative_local_y() {
        let l = MemberLoadKind::Distributed {
            a: 0.0,
            b: 5.0,
            w_a: 10.0,
            w_b: 10.0,
            direction: LoadDirection::Gravity,
            measure: Measure::AlongMember,
        }
        .to_local(1.0, 0.0);
        assert_eq!(
            l,
            LocalLoad::Linear {
                a: 0.0,
                b: 5.0,
                qx_a: 0.0,
                qy_a: -10.0,
                qx_b: 0.0,
                qy_b: -10.0
            }
        );
    }

    #[test]
    fn projected_gravity_on_slope_keeps_total_vertical_load() {
        // A rafter rising 3 in 4 (L = 5): 10 N/m on plan over 4 m is 40 N in all.
        let (c, s) = (0.8, 0.6);
        let LocalLoad::Linear { qx_a, qy_a, .. } = (MemberLoadKind::Distributed {
            a: 0.0,
            b: 5.0,
            w_a: 10.0,
            w_b: 10.0,
            direction: LoadDirection::Gravity,
            measure: Measure::Projected,
        })
        .to_local(c, s) else {
            unreachable!()
        };
        // Back to global Y: qY = qx·s + qy·c, times 5 m along the member.
        let total_y = (qx_a * s + qy_a * c) * 5.0;
        assert!((total_y + 40.0).abs() < 1e-12);
    }
}
