//! Units at the edges: quantity strings such as `"1250 in^4"` or `"12 kN/m"`, and the
//! model's declared unit system for bare numbers. Everything inside the crate is SI.
//!
//! (Skeleton: implemented in the input work.)

use serde::Serialize;

/// Physical dimension of a quantity, as powers of length and force.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
pub enum Dimension {
    Length,
    Force,
    Moment,
    Stress,
    Area,
    SecondMoment,
    LineLoad,
    UnitWeight,
    /// Translational spring, force/length.
    Stiffness,
    /// Rotational spring, moment per radian.
    RotationalStiffness,
    Dimensionless,
}

/// A named unit: SI value of one unit and its dimension exponents (length, force).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Unit {
    pub name: String,
    pub factor: f64,
    pub dim: (i32, i32),
}

/// The model's units for bare numbers and for reports.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct UnitSystem {
    /// Coordinates, spans, heights, load positions.
    pub length: Unit,
    pub force: Unit,
    /// Section dimensions: A in section², I in section⁴, depth in section.
    pub section: Unit,
    /// Stress and modulus.
    pub stress: Unit,
    /// Displacements in reports.
    pub deflection: Unit,
}
