//! Unit conversions against their exact definitions, and dimension errors.
//!
//! Sources: the international yard and pound agreement (1959): 1 yd = 0.9144 m exactly, so
//! 1 ft = 0.3048 m and 1 in = 25.4 mm exactly; NIST SP 811 (2008 ed.) Appendix B: 1 lbf =
//! 0.45359237 kg × 9.80665 m/s² = 4.4482216152605 N exactly. Rounded factors quoted
//! from NIST SP 811 App. B.9 below are tagged "from memory" (recalled, not re-read); the
//! exact checks do not depend on them.

mod common;

use common::verify;
use plumbline::units::{Dimension, UnitError, UnitSystem, parse_quantity, parse_unit};

const IN: f64 = 0.0254;
const FT: f64 = 0.3048;
const LBF: f64 = 4.448_221_615_260_5;

/// Relative tolerance for values computed by different roundings of the same exact product.
const ROUNDING: f64 = 4.0 * f64::EPSILON;

/// `text` in SI equals `expected` exactly (a conversion by an exact power of ten or an
/// exact definition), recorded.
#[track_caller]
fn exact(text: &str, d: Dimension, unit: &str, expected: f64) {
    verify::close(text, unit, q(text, d), expected, 0.0);
}

/// `text` in SI equals `expected` to the rounding of the same exact product, recorded.
#[track_caller]
fn rounded(text: &str, d: Dimension, unit: &str, expected: f64) {
    verify::close(text, unit, q(text, d), expected, ROUNDING);
}

fn q(text: &str, d: Dimension) -> f64 {
    parse_quantity(text, d).unwrap_or_else(|e| panic!("{text}: {e}"))
}

#[test]
fn lengths_are_exact() {
    // 1959 agreement: 1 in = 25.4 mm, 1 ft = 0.3048 m.
    let src = "international yard and pound agreement (1959): 1 yd = 0.9144 m exactly";
    verify::check(
        "units/exact/in",
        "1 in in SI",
        "m",
        src,
        0.0254,
        q("1 in", Dimension::Length),
        0.0,
    );
    verify::check(
        "units/exact/ft",
        "1 ft in SI",
        "m",
        src,
        0.3048,
        q("1 ft", Dimension::Length),
        0.0,
    );
    verify::source("closed form: SI prefixes; 1959 agreement, 1 ft = 12 in = 0.3048 m exactly");
    exact("25.4 mm", Dimension::Length, "m", 0.0254);
    exact("100 cm", Dimension::Length, "m", 1.0);
    exact("4.5 m", Dimension::Length, "m", 4.5);
    rounded("12 in", Dimension::Length, "m", FT);
}

#[test]
fn forces_are_exact() {
    // NIST SP 811 App. B: 1 lbf = 4.4482216152605 N (exact); 1 kip = 1000 lbf.
    verify::check(
        "units/exact/lbf",
        "1 lbf in SI, 0.45359237 kg × 9.80665 m/s²",
        "N",
        "NIST SP 811 (2008) App. B, exact",
        0.453_592_37 * 9.806_65,
        q("1 lbf", Dimension::Force),
        1e-15,
    );
    verify::source(
        "NIST SP 811 (2008) App. B: 1 lbf = 4.4482216152605 N exactly, 1 kip = 1000 lbf; SI prefixes",
    );
    exact("1 lbf", Dimension::Force, "N", LBF);
    exact("1 lb", Dimension::Force, "N", LBF);
    exact("1 kip", Dimension::Force, "N", 1000.0 * LBF);
    exact("2 kips", Dimension::Force, "N", 2000.0 * LBF);
    exact("25 kN", Dimension::Force, "N", 25_000.0);
    exact("1.5 MN", Dimension::Force, "N", 1.5e6);
    // NIST SP 811 B.9: kip → N 4.448 222 E+03 (from memory), to its 7 digits.
    verify::check(
        "units/nist/kip",
        "1 kip in SI",
        "N",
        "NIST SP 811 (2008) App. B.9, rounded factor (from memory)",
        4.448_222e3,
        q("1 kip", Dimension::Force),
        1e-6,
    );
}

#[test]
fn stresses_follow_their_definitions() {
    // 1 psi = 1 lbf/in², 1 ksi = 1000 psi, 1 psf = 1 lbf/ft² (definitions).
    verify::source(
        "definitions: 1 psi = 1 lbf/in², 1 ksi = 1000 psi, 1 psf = 1 lbf/ft²; NIST SP 811 (2008) App. B exact lbf, in, ft; SI prefixes",
    );
    rounded("1 psi", Dimension::Stress, "Pa", LBF / (IN * IN));
    rounded(
        "1 lbf/in^2",
        Dimension::Stress,
        "Pa",
        q("1 psi", Dimension::Stress),
    );
    rounded("29000 ksi", Dimension::Stress, "Pa", 29e6 * LBF / (IN * IN));
    rounded("1 psf", Dimension::Stress, "Pa", LBF / (FT * FT));
    exact("210 GPa", Dimension::Stress, "Pa", 210e9);
    exact("355 MPa", Dimension::Stress, "Pa", 355e6);
    exact(
        "355 N/mm^2",
        Dimension::Stress,
        "Pa",
        q("355 MPa", Dimension::Stress),
    );
    exact("2 kPa", Dimension::Stress, "Pa", 2000.0);
    exact("2 kN/m^2", Dimension::Stress, "Pa", 2000.0);
    // NIST SP 811 B.9 (from memory): psi → Pa 6.894 757 E+03; psf → Pa 4.788 026 E+01.
    verify::check(
        "units/nist/psi",
        "1 psi in SI",
        "Pa",
        "NIST SP 811 (2008) App. B.9, rounded factor (from memory)",
        6.894_757e3,
        q("1 psi", Dimension::Stress),
        1e-6,
    );
    verify::check(
        "units/nist/psf",
        "1 psf in SI",
        "Pa",
        "NIST SP 811 (2008) App. B.9, rounded factor (from memory)",
        4.788_026e1,
        q("1 psf", Dimension::Stress),
        1e-6,
    );
}

#[test]
fn section_properties() {
    // in² and in⁴ from 1 in = 0.0254 m; cm⁴ = 1e-8 m⁴.
    verify::source("1959 agreement: 1 in = 0.0254 m exactly; SI prefixes");
    rounded("23.2 in^2", Dimension::Area, "m²", 23.2 * IN * IN);
    rounded(
        "1250 in^4",
        Dimension::SecondMoment,
        "m⁴",
        1250.0 * IN.powi(4),
    );
    rounded(
        "1250 in⁴",
        Dimension::SecondMoment,
        "m⁴",
        1250.0 * IN.powi(4),
    );
    rounded("8000 cm^4", Dimension::SecondMoment, "m⁴", 8000e-8);
    rounded("14900 mm²", Dimension::Area, "m²", 14900e-6);
    // NIST SP 811 B.9 (from memory): in⁴ → m⁴ 4.162 314 E−07.
    verify::check(
        "units/nist/in4",
        "1 in⁴ in SI",
        "m⁴",
        "NIST SP 811 (2008) App. B.9, rounded factor (from memory)",
        4.162_314e-7,
        q("1 in^4", Dimension::SecondMoment),
        1e-6,
    );
}

#[test]
fn line_loads_moments_unit_weights_springs() {
    verify::source(
        "NIST SP 811 (2008) App. B exact lbf; 1959 agreement exact in and ft; SI prefixes",
    );
    rounded("2.2 kip/ft", Dimension::LineLoad, "N/m", 2200.0 * LBF / FT);
    exact("12 kN/m", Dimension::LineLoad, "N/m", 12_000.0);
    // NIST SP 811 B.9 (from memory): lbf/ft → N/m 1.459 390 E+01.
    verify::check(
        "units/nist/lbf-per-ft",
        "1 lbf/ft in SI",
        "N/m",
        "NIST SP 811 (2008) App. B.9, rounded factor (from memory)",
        1.459_390e1,
        q("1 lbf/ft", Dimension::LineLoad),
        1e-6,
    );
    rounded("30 kip*ft", Dimension::Moment, "N·m", 30_000.0 * LBF * FT);
    rounded(
        "30 kip·ft",
        Dimension::Moment,
        "N·m",
        q("360 kip*in", Dimension::Moment),
    );
    exact("40 kN*m", Dimension::Moment, "N·m", 40_000.0);
    // NIST SP 811 B.9 (from memory): lbf·ft → N·m 1.355 818 E+00.
    verify::check(
        "units/nist/lbf-ft",
        "1 lbf·ft in SI",
        "N·m",
        "NIST SP 811 (2008) App. B.9, rounded factor (from memory)",
        1.355_818,
        q("1 lbf*ft", Dimension::Moment),
        1e-6,
    );
    rounded(
        "490 lbf/ft^3",
        Dimension::UnitWeight,
        "N/m³",
        490.0 * LBF / FT.powi(3),
    );
    exact("78.5 kN/m^3", Dimension::UnitWeight, "N/m³", 78_500.0);
    rounded(
        "300 kip/in",
        Dimension::Stiffness,
        "N/m",
        300_000.0 * LBF / IN,
    );
    exact(
        "20000 kN*m/rad",
        Dimension::RotationalStiffness,
        "N·m/rad",
        2e7,
    );
    exact("0.5", Dimension::Dimensionless, "-", 0.5);
    exact("-1.5e3 N", Dimension::Force, "N", -1500.0);
}

#[test]
fn wrong_dimension_says_expected_and_given() {
    let e = parse_quantity("12 kN*m", Dimension::LineLoad).unwrap_err();
    assert_eq!(
        e,
        UnitError::WrongDimension {
            expected: Dimension::LineLoad,
            got: "kN*m".into(),
            got_dim: (1, 1)
        }
    );
    assert!(
        e.to_string()
            .starts_with("expected a line load (force/length), got kN*m"),
        "{e}"
    );
    let e = parse_quantity("1250 in^3", Dimension::SecondMoment).unwrap_err();
    assert!(e.to_string().contains("got in^3 (length^3)"), "{e}");
    assert!(parse_quantity("29000 ksi", Dimension::Force).is_err());
    assert!(parse_quantity("4.5 m", Dimension::Area).is_err());
}

#[test]
fn malformed_quantities_are_errors() {
    assert_eq!(
        parse_quantity("12", Dimension::LineLoad),
        Err(UnitError::MissingUnit {
            expected: Dimension::LineLoad
        })
    );
    assert!(matches!(
        parse_quantity("kN", Dimension::Force),
        Err(UnitError::NoNumber { .. })
    ));
    assert!(matches!(
        parse_quantity("12 furlong", Dimension::Length),
        Err(UnitError::UnknownUnit { .. })
    ));
    assert!(matches!(
        parse_quantity("12 KN", Dimension::Force),
        Err(UnitError::UnknownUnit { .. })
    ));
    assert!(matches!(
        parse_quantity("12 kN//m", Dimension::LineLoad),
        Err(UnitError::Syntax { .. })
    ));
    assert!(matches!(
        parse_quantity("12 m^0", Dimension::Length),
        Err(UnitError::Syntax { .. })
    ));
    assert!(matches!(
        parse_quantity("12 m^", Dimension::Length),
        Err(UnitError::Syntax { .. })
    ));
    assert!(matches!(
        parse_quantity("1e400 m", Dimension::Length),
        Err(UnitError::NotFinite { .. })
    ));
    assert!(parse_unit("kN/m^-2").is_ok_and(|u| u.dim == (2, 1)));
}

#[test]
fn presets_and_overrides() {
    verify::source(
        "NIST SP 811 (2008) App. B exact lbf; 1959 agreement exact in and ft; SI prefixes",
    );
    let s = UnitSystem::preset("kip-ft").unwrap();
    // Bare numbers: 20 ft, 29000 ksi, 1250 in⁴ (section unit in), 2 kip/ft.
    let si = |q: &str, unit: &str, computed: f64, expected: f64, tol: f64| {
        verify::close(q, unit, computed, expected, tol);
    };
    si(
        "kip-ft: bare length 20 (ft)",
        "m",
        s.to_si(20.0, Dimension::Length),
        20.0 * FT,
        0.0,
    );
    si(
        "kip-ft: bare stress 29000 (ksi)",
        "Pa",
        s.to_si(29000.0, Dimension::Stress),
        q("29000 ksi", Dimension::Stress),
        ROUNDING,
    );
    si(
        "kip-ft: bare second moment 1250 (in⁴)",
        "m⁴",
        s.to_si(1250.0, Dimension::SecondMoment),
        1250.0 * IN.powi(4),
        ROUNDING,
    );
    si(
        "kip-ft: bare line load 2 (kip/ft)",
        "N/m",
        s.to_si(2.0, Dimension::LineLoad),
        2000.0 * LBF / FT,
        ROUNDING,
    );
    // Reports: displacements in the deflection unit (in), moments in kip·ft.
    si(
        "kip-ft: 0.0254 m reported in in",
        "in",
        s.from_si(0.0254, Dimension::Displacement),
        1.0,
        ROUNDING,
    );
    assert_eq!(s.label(Dimension::Displacement), "in");
    assert_eq!(s.label(Dimension::Moment), "kip·ft");
    assert_eq!(s.label(Dimension::LineLoad), "kip/ft");
    assert_eq!(s.label(Dimension::SecondMoment), "in⁴");
    let m = UnitSystem::preset("kN-m").unwrap();
    assert_eq!(m.label(Dimension::Stress), "MPa");
    assert_eq!(m.label(Dimension::Displacement), "mm");
    si(
        "kN-m: bare second moment 1e8 (mm⁴)",
        "m⁴",
        m.to_si(1.0e8, Dimension::SecondMoment),
        1.0e8 * 1e-12,
        0.0,
    );
    si(
        "kN-m: 2.5e-3 m reported in mm",
        "mm",
        m.from_si(2.5e-3, Dimension::Displacement),
        2.5,
        0.0,
    );
    for name in ["kN-m", "kip-ft", "kip-in", "N-mm"] {
        let sys = UnitSystem::preset(name).unwrap();
        for d in [
            Dimension::Length,
            Dimension::Moment,
            Dimension::UnitWeight,
            Dimension::RotationalStiffness,
        ] {
            assert!(
                (sys.from_si(sys.to_si(3.7, d), d) - 3.7).abs() <= ROUNDING * 3.7,
                "{name} {d:?}"
            );
        }
    }
    let mut o = UnitSystem::preset("kip-ft").unwrap();
    o.set_unit("deflection", "mm").unwrap();
    si(
        "kip-ft with deflection in mm: 0.01 m reported",
        "mm",
        o.from_si(0.01, Dimension::Displacement),
        10.0,
        0.0,
    );
    assert!(matches!(
        o.set_unit("stress", "kip"),
        Err(UnitError::WrongDimension { .. })
    ));
    assert!(matches!(
        o.set_unit("mass", "kg"),
        Err(UnitError::UnknownSlot { .. })
    ));
    assert!(matches!(
        UnitSystem::preset("SI"),
        Err(UnitError::UnknownPreset { .. })
    ));
}
