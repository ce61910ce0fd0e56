//! Units at the edges: quantity strings such as `"1250 in^4"` or `"12 kN/m"`, and the
//! model's declared unit system for bare numbers. Everything inside the crate is SI
//! (m, N, Pa, N·m).
//!
//! A unit expression is a product of known units raised to integer powers, joined by `*`,
//! `·` or a space (product) and `/` (quotient, left to right: `kN/m/m` is kN/m²), with
//! powers written `^2`, `^-1` or as superscripts `²`, `³`, `⁴`. Its dimension is tracked as
//! exponents of (length, force); the radian is a plain number.
//!
//! References (exact definitions):
//! * International yard and pound agreement (1959): 1 yd = 0.9144 m, hence 1 ft = 0.3048 m
//!   and 1 in = 25.4 mm exactly; 1 lb (mass) = 0.453 592 37 kg exactly.
//! * 1 lbf = 0.453 592 37 kg × 9.806 65 m/s² (standard gravity, 3rd CGPM 1901)
//!   = 4.448 221 615 260 5 N exactly; NIST SP 811 (2008) Appendix B.
//! * 1 kip = 1000 lbf; 1 psi = 1 lbf/in²; 1 ksi = 1000 psi; 1 psf = 1 lbf/ft².

use serde::Serialize;

/// Metres in one inch (exact, 1959 agreement).
pub const INCH: f64 = 0.0254;
/// Metres in one foot (exact, 1959 agreement).
pub const FOOT: f64 = 0.3048;
/// Newtons in one pound-force: 0.45359237 kg × 9.80665 m/s² (exact, NIST SP 811 App. B).
pub const POUND_FORCE: f64 = 4.448_221_615_260_5;
/// Newtons in one kip (1000 lbf).
pub const KIP: f64 = 1000.0 * POUND_FORCE;

/// Physical dimension of a quantity, as powers of length and force.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
pub enum Dimension {
    /// Coordinates, spans, heights, load positions (the system's `length` unit).
    Length,
    Force,
    Moment,
    Stress,
    /// Section area (the system's `section` unit squared).
    Area,
    /// Second moment of area (the system's `section` unit to the fourth).
    SecondMoment,
    LineLoad,
    UnitWeight,
    /// Translational spring, force/length.
    Stiffness,
    /// Rotational spring, moment per radian.
    RotationalStiffness,
    Dimensionless,
    /// A section dimension such as the depth (the system's `section` unit).
    SectionLength,
    /// A nodal displacement or member deflection in reports (the system's `deflection` unit).
    Displacement,
    /// A rotation, radians.
    Rotation,
}

impl Dimension {
    /// Exponents of (length, force).
    pub fn exponents(self) -> (i32, i32) {
        match self {
            Dimension::Length | Dimension::SectionLength | Dimension::Displacement => (1, 0),
            Dimension::Force => (0, 1),
            Dimension::Moment | Dimension::RotationalStiffness => (1, 1),
            Dimension::Stress => (-2, 1),
            Dimension::Area => (2, 0),
            Dimension::SecondMoment => (4, 0),
            Dimension::LineLoad | Dimension::Stiffness => (-1, 1),
            Dimension::UnitWeight => (-3, 1),
            Dimension::Dimensionless | Dimension::Rotation => (0, 0),
        }
    }

    /// What a quantity of this dimension is, for messages: "a line load (force/length)".
    pub fn describe(self) -> &'static str {
        match self {
            Dimension::Length => "a length",
            Dimension::SectionLength => "a section dimension (length)",
            Dimension::Displacement => "a displacement (length)",
            Dimension::Force => "a force",
            Dimension::Moment => "a moment (force*length)",
            Dimension::Stress => "a stress or modulus (force/length^2)",
            Dimension::Area => "an area (length^2)",
            Dimension::SecondMoment => "a second moment of area (length^4)",
            Dimension::LineLoad => "a line load (force/length)",
            Dimension::UnitWeight => "a unit weight (force/length^3)",
            Dimension::Stiffness => "a spring stiffness (force/length)",
            Dimension::RotationalStiffness => "a rotational spring stiffness (force*length/rad)",
            Dimension::Dimensionless => "a plain number",
            Dimension::Rotation => "a rotation (rad)",
        }
    }

    /// A quantity string of this dimension, for help texts.
    pub fn example(self) -> &'static str {
        match self {
            Dimension::Length | Dimension::Displacement => "\"4.5 m\" or \"15 ft\"",
            Dimension::SectionLength => "\"300 mm\" or \"12 in\"",
            Dimension::Force => "\"25 kN\" or \"5.6 kip\"",
            Dimension::Moment => "\"40 kN*m\" or \"30 kip*ft\"",
            Dimension::Stress => "\"210 GPa\" or \"29000 ksi\"",
            Dimension::Area => "\"14900 mm^2\" or \"23.2 in^2\"",
            Dimension::SecondMoment => "\"8000 cm^4\" or \"1250 in^4\"",
            Dimension::LineLoad => "\"12 kN/m\" or \"2.2 kip/ft\"",
            Dimension::UnitWeight => "\"78.5 kN/m^3\" or \"490 lbf/ft^3\"",
            Dimension::Stiffness => "\"5000 kN/m\" or \"300 kip/in\"",
            Dimension::RotationalStiffness => "\"20000 kN*m/rad\" or \"15000 kip*ft/rad\"",
            Dimension::Dimensionless => "\"0.5\"",
            Dimension::Rotation => "\"0.01 rad\"",
        }
    }
}

/// A plain-language name for dimension exponents (length, force), for messages.
pub fn describe_exponents(dim: (i32, i32)) -> String {
    let named = [
        Dimension::Length,
        Dimension::Force,
        Dimension::Moment,
        Dimension::Stress,
        Dimension::Area,
        Dimension::SecondMoment,
        Dimension::LineLoad,
        Dimension::UnitWeight,
        Dimension::Dimensionless,
    ];
    if let Some(d) = named.iter().find(|d| d.exponents() == dim) {
        return d.describe().to_string();
    }
    let part = |name: &str, p: i32| match p {
        0 => None,
        1 => Some(name.to_string()),
        _ => Some(format!("{name}^{p}")),
    };
    let parts: Vec<String> = [part("length", dim.0), part("force", dim.1)]
        .into_iter()
        .flatten()
        .collect();
    parts.join("*")
}

/// A named unit: SI value of one unit and its dimension exponents (length, force).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Unit {
    pub name: String,
    pub factor: f64,
    pub dim: (i32, i32),
}

/// Errors in quantity strings and unit names.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum UnitError {
    #[error("expected a number followed by a unit, e.g. {example}, got \"{text}\"")]
    NoNumber { text: String, example: &'static str },
    #[error("missing unit: expected {}, e.g. {}", expected.describe(), expected.example())]
    MissingUnit { expected: Dimension },
    #[error(
        "unknown unit \"{name}\": expected one of mm, cm, m, in, ft, N, kN, MN, lbf, lb, kip, \
         kips, Pa, kPa, MPa, GPa, psi, ksi, psf, rad"
    )]
    UnknownUnit { name: String },
    #[error("malformed unit \"{text}\": {problem}")]
    Syntax { text: String, problem: String },
    #[error("expected {}, got {got} ({})", expected.describe(), describe_exponents(*got_dim))]
    WrongDimension {
        expected: Dimension,
        got: String,
        got_dim: (i32, i32),
    },
    #[error("expected a finite number, got \"{text}\"")]
    NotFinite { text: String },
    #[error("unknown unit system \"{name}\": expected one of {}", PRESET_NAMES.join(", "))]
    UnknownPreset { name: String },
    #[error(
        "unknown unit slot \"{name}\": expected one of length, force, section, stress, \
         deflection"
    )]
    UnknownSlot { name: String },
}

/// The base units a unit expression may use: name, SI factor, (length, force) exponents.
const BASE_UNITS: &[(&str, f64, (i32, i32))] = &[
    ("mm", 1e-3, (1, 0)),
    ("cm", 1e-2, (1, 0)),
    ("m", 1.0, (1, 0)),
    ("in", INCH, (1, 0)),
    ("ft", FOOT, (1, 0)),
    ("N", 1.0, (0, 1)),
    ("kN", 1e3, (0, 1)),
    ("MN", 1e6, (0, 1)),
    ("lbf", POUND_FORCE, (0, 1)),
    // In a structural model "lb" is the pound-force (as in "lb/ft").
    ("lb", POUND_FORCE, (0, 1)),
    ("kip", KIP, (0, 1)),
    ("kips", KIP, (0, 1)),
    ("Pa", 1.0, (-2, 1)),
    ("kPa", 1e3, (-2, 1)),
    ("MPa", 1e6, (-2, 1)),
    ("GPa", 1e9, (-2, 1)),
    // 1 psi = 1 lbf/in².
    ("psi", POUND_FORCE / (INCH * INCH), (-2, 1)),
    ("ksi", 1000.0 * POUND_FORCE / (INCH * INCH), (-2, 1)),
    // 1 psf = 1 lbf/ft².
    ("psf", POUND_FORCE / (FOOT * FOOT), (-2, 1)),
    ("rad", 1.0, (0, 0)),
];

/// Look up one base unit by its exact (case-sensitive) name.
fn base_unit(name: &str) -> Option<(f64, (i32, i32))> {
    BASE_UNITS
        .iter()
        .find(|(n, _, _)| *n == name)
        .map(|&(_, f, d)| (f, d))
}

/// Value of a superscript digit or minus sign, if `c` is one.
fn superscript(c: char) -> Option<char> {
    match c {
        '⁻' => Some('-'),
        '⁰' => Some('0'),
        '¹' => Some('1'),
        '²' => Some('2'),
        '³' => Some('3'),
        '⁴' => Some('4'),
        '⁵' => Some('5'),
        '⁶' => Some('6'),
        _ => None,
    }
}

/// Parse a unit expression such as `kN/m^3`, `kip*ft`, `kN·m` or `in⁴`.
///
/// The result carries the SI value of one unit and the dimension exponents; its `name` is
/// the expression as written (trimmed).
pub fn parse_unit(text: &str) -> Result<Unit, UnitError> {
    let text = text.trim();
    let syntax = |problem: &str| UnitError::Syntax {
        text: text.to_string(),
        problem: problem.to_string(),
    };
    if text.is_empty() {
        return Err(syntax("empty unit"));
    }
    let chars: Vec<char> = text.chars().collect();
    let (mut factor, mut dim) = (1.0_f64, (0_i32, 0_i32));
    let mut sign = 1_i32; // +1 multiplies the next term, −1 divides by it
    let mut want_term = true; // an operator was just read (or nothing yet)
    let mut k = 0;
    while k < chars.len() {
        let c = chars[k];
        if c.is_whitespace() {
            k += 1;
        } else if matches!(c, '*' | '·' | '⋅' | '/') {
            if want_term {
                return Err(syntax("expected a unit name before the operator"));
            }
            sign = if c == '/' { -1 } else { 1 };
            want_term = true;
            k += 1;
        } else if c.is_alphabetic() && superscript(c).is_none() {
            let start = k;
            while k < chars.len() && chars[k].is_alphabetic() && superscript(chars[k]).is_none() {
                k += 1;
            }
            let name: String = chars[start..k].iter().collect();
            let (f, d) = base_unit(&name).ok_or(UnitError::UnknownUnit { name })?;
            let (power, next) = read_power(&chars, k).map_err(|p| syntax(&p))?;
            k = next;
            let p = sign * power;
            factor *= f.powi(p);
            dim = (dim.0 + d.0 * p, dim.1 + d.1 * p);
            sign = 1;
            want_term = false;
        } else {
            return Err(syntax(&format!("unexpected character '{c}'")));
        }
    }
    if want_term {
        return Err(syntax("expected a unit name after the operator"));
    }
    Ok(Unit {
        name: text.to_string(),
        factor,
        dim,
    })
}

/// Read an optional power (`^2`, `^-1`, `²`) at `chars[k..]`: returns the power (1 when
/// absent) and the index after it.
fn read_power(chars: &[char], mut k: usize) -> Result<(i32, usize), String> {
    let mut digits = String::new();
    if k < chars.len() && chars[k] == '^' {
        k += 1;
        if k < chars.len() && chars[k] == '-' {
            digits.push('-');
            k += 1;
        }
        while k < chars.len() && chars[k].is_ascii_digit() {
            digits.push(chars[k]);
            k += 1;
        }
    } else {
        while k < chars.len() {
            match superscript(chars[k]) {
                Some(d) => digits.push(d),
                None => break,
            }
            k += 1;
        }
        if digits.is_empty() {
            return Ok((1, k));
        }
    }
    match digits.parse::<i32>() {
        Ok(p) if p != 0 && p.abs() <= 6 => Ok((p, k)),
        _ => Err("expected a power between -6 and 6 (not 0) after '^'".to_string()),
    }
}

/// Split a quantity string into its leading number and the unit text after it.
fn split_number(text: &str) -> Option<(f64, &str)> {
    let b = text.as_bytes();
    let mut k = 0;
    if k < b.len() && (b[k] == b'+' || b[k] == b'-') {
        k += 1;
    }
    let digits_start = k;
    while k < b.len() && (b[k].is_ascii_digit() || b[k] == b'.') {
        k += 1;
    }
    if k == digits_start {
        return None;
    }
    // Exponent only when digits follow: "2e3 m" but not "2 em".
    if k < b.len() && (b[k] == b'e' || b[k] == b'E') {
        let mut e = k + 1;
        if e < b.len() && (b[e] == b'+' || b[e] == b'-') {
            e += 1;
        }
        if e < b.len() && b[e].is_ascii_digit() {
            while e < b.len() && b[e].is_ascii_digit() {
                e += 1;
            }
            k = e;
        }
    }
    let value: f64 = text[..k].parse().ok()?;
    Some((value, &text[k..]))
}

/// Parse a quantity string (`"12 kN/m"`, `"1250 in^4"`, `"210 GPa"`) of dimension
/// `expected` and return its value in SI base units (m, N, Pa and their products).
///
/// A plain number without a unit is accepted only for [`Dimension::Dimensionless`] and
/// [`Dimension::Rotation`]; bare numbers in a model file are converted by its
/// [`UnitSystem`] instead.
pub fn parse_quantity(text: &str, expected: Dimension) -> Result<f64, UnitError> {
    let trimmed = text.trim();
    let (value, rest) = split_number(trimmed).ok_or_else(|| UnitError::NoNumber {
        text: trimmed.to_string(),
        example: expected.example(),
    })?;
    let rest = rest.trim();
    let unit = if rest.is_empty() {
        if expected.exponents() != (0, 0) {
            return Err(UnitError::MissingUnit { expected });
        }
        Unit {
            name: String::new(),
            factor: 1.0,
            dim: (0, 0),
        }
    } else {
        parse_unit(rest)?
    };
    if unit.dim != expected.exponents() {
        return Err(UnitError::WrongDimension {
            expected,
            got: unit.name,
            got_dim: unit.dim,
        });
    }
    let si = value * unit.factor;
    if !si.is_finite() {
        return Err(UnitError::NotFinite {
            text: trimmed.to_string(),
        });
    }
    Ok(si)
}

/// Names of the unit system presets, see [`UnitSystem::preset`].
pub const PRESET_NAMES: [&str; 4] = ["kN-m", "kip-ft", "kip-in", "N-mm"];

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

impl UnitSystem {
    /// A named preset (lengths, forces, section dimensions, stresses, deflections):
    /// * `kN-m`: m, kN, mm, MPa, mm
    /// * `kip-ft`: ft, kip, in, ksi, in
    /// * `kip-in`: in, kip, in, ksi, in
    /// * `N-mm`: mm, N, mm, MPa, mm
    pub fn preset(name: &str) -> Result<UnitSystem, UnitError> {
        let names: [&str; 5] = match name {
            "kN-m" => ["m", "kN", "mm", "MPa", "mm"],
            "kip-ft" => ["ft", "kip", "in", "ksi", "in"],
            "kip-in" => ["in", "kip", "in", "ksi", "in"],
            "N-mm" => ["mm", "N", "mm", "MPa", "mm"],
            _ => {
                return Err(UnitError::UnknownPreset {
                    name: name.to_string(),
                });
            }
        };
        let unit = |n: &str| parse_unit(n).expect("preset units are known");
        Ok(UnitSystem {
            length: unit(names[0]),
            force: unit(names[1]),
            section: unit(names[2]),
            stress: unit(names[3]),
            deflection: unit(names[4]),
        })
    }

    /// Replace one unit (`slot` is `length`, `force`, `section`, `stress` or `deflection`)
    /// by the unit expression `unit`, checking its dimension.
    pub fn set_unit(&mut self, slot: &str, unit: &str) -> Result<(), UnitError> {
        let (target, expected) = match slot {
            "length" => (&mut self.length, Dimension::Length),
            "force" => (&mut self.force, Dimension::Force),
            "section" => (&mut self.section, Dimension::SectionLength),
            "stress" => (&mut self.stress, Dimension::Stress),
            "deflection" => (&mut self.deflection, Dimension::Displacement),
            _ => {
                return Err(UnitError::UnknownSlot {
                    name: slot.to_string(),
                });
            }
        };
        let parsed = parse_unit(unit)?;
        if parsed.dim != expected.exponents() {
            return Err(UnitError::WrongDimension {
                expected,
                got: parsed.name,
                got_dim: parsed.dim,
            });
        }
        *target = parsed;
        Ok(())
    }

    /// The unit this system uses for bare numbers (and reports) of dimension `dim`.
    pub fn unit_for(&self, dim: Dimension) -> Unit {
        let (l, f, s) = (&self.length, &self.force, &self.section);
        let (name, factor) = match dim {
            Dimension::Length => (l.name.clone(), l.factor),
            Dimension::SectionLength => (s.name.clone(), s.factor),
            Dimension::Displacement => (self.deflection.name.clone(), self.deflection.factor),
            Dimension::Force => (f.name.clone(), f.factor),
            Dimension::Moment => (format!("{}·{}", f.name, l.name), f.factor * l.factor),
            Dimension::RotationalStiffness => {
                (format!("{}·{}/rad", f.name, l.name), f.factor * l.factor)
            }
            Dimension::Stress => (self.stress.name.clone(), self.stress.factor),
            Dimension::Area => (format!("{}²", s.name), s.factor.powi(2)),
            Dimension::SecondMoment => (format!("{}⁴", s.name), s.factor.powi(4)),
            Dimension::LineLoad | Dimension::Stiffness => {
                (format!("{}/{}", f.name, l.name), f.factor / l.factor)
            }
            Dimension::UnitWeight => (
                format!("{}/{}³", f.name, l.name),
                f.factor / l.factor.powi(3),
            ),
            Dimension::Dimensionless => (String::new(), 1.0),
            Dimension::Rotation => ("rad".to_string(), 1.0),
        };
        Unit {
            name,
            factor,
            dim: dim.exponents(),
        }
    }

    /// A bare number in this system's unit for `dim`, converted to SI.
    pub fn to_si(&self, value: f64, dim: Dimension) -> f64 {
        value * self.unit_for(dim).factor
    }

    /// An SI value expressed in this system's unit for `dim` (for reports).
    pub fn from_si(&self, value: f64, dim: Dimension) -> f64 {
        value / self.unit_for(dim).factor
    }

    /// The label of this system's unit for `dim`, e.g. `kN·m`, `mm⁴`, `kip/ft`.
    pub fn label(&self, dim: Dimension) -> String {
        self.unit_for(dim).name
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn kilonewton_metre_is_a_moment() {
        // closed form: 1 kN·m = 1000 N × 1 m.
        assert_eq!(parse_quantity("3 kN*m", Dimension::Moment), Ok(3000.0));
        assert_eq!(parse_quantity("3 kN·m", Dimension::Moment), Ok(3000.0));
        assert_eq!(parse_quantity("3 kN m", Dimension::Moment), Ok(3000.0));
    }

    #[test]
    fn quotient_is_left_to_right() {
        let u = parse_unit("kN/m/m").unwrap();
        assert_eq!(u.dim, (-2, 1));
    }

    #[test]
    fn labels_parse_back_to_the_same_unit() {
        let s = UnitSystem::preset("kip-ft").unwrap();
        for d in [
            Dimension::Moment,
            Dimension::Area,
            Dimension::SecondMoment,
            Dimension::UnitWeight,
        ] {
            let u = parse_unit(&s.label(d)).unwrap();
            assert_eq!(u.dim, d.exponents());
            assert!((u.factor / s.unit_for(d).factor - 1.0).abs() < 1e-15);
        }
    }

    #[test]
    fn exponent_needs_digits() {
        assert_eq!(split_number("2em"), Some((2.0, "em")));
        assert_eq!(split_number("2e3 m"), Some((2000.0, " m")));
        assert!(parse_unit("m^").is_err());
        assert!(parse_unit("kN/").is_err());
        assert!(parse_unit("/m").is_err());
    }
}
