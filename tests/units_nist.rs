//! Unit conversion against NIST Special Publication 811 (2008 edition), Appendix B factors:
//! 1 lbf/in = 175.1268 N/m, 1 psi = 6894.757 Pa, 1 mil = 2.54e-5 m, 1 in = 0.0254 m (exact),
//! 1 ft/min = 5.08e-3 m/s (exact), 1 lb/ft3 = 16.01846 kg/m3, t/C = T/K - 273.15,
//! t/F = 1.8 t/C + 32.

use approx::assert_relative_eq;
use rollsleuth::units::{parse, Kind};

#[test]
fn pli_converts_to_newton_per_metre_per_nist_sp811() {
    assert_relative_eq!(
        parse("1 pli", Kind::LineForce).unwrap(),
        175.1268,
        max_relative = 1e-6
    );
    assert_relative_eq!(
        parse("2.2 pli", Kind::LineForce).unwrap(),
        385.279,
        max_relative = 1e-5
    );
    assert_relative_eq!(parse("120 kN/m", Kind::LineForce).unwrap(), 120e3);
    assert_relative_eq!(parse("380 N/m", Kind::LineForce).unwrap(), 380.0);
}

#[test]
fn psi_converts_to_pascal_per_nist_sp811() {
    assert_relative_eq!(
        parse("1 psi", Kind::Pressure).unwrap(),
        6894.757,
        max_relative = 1e-6
    );
    assert_relative_eq!(
        parse("25 psi", Kind::Pressure).unwrap(),
        172_368.9,
        max_relative = 1e-6
    );
    assert_relative_eq!(parse("172 kPa", Kind::Pressure).unwrap(), 172e3);
    assert_relative_eq!(
        parse("750 kpsi", Kind::Pressure).unwrap(),
        5.171068e9,
        max_relative = 1e-6
    );
}

#[test]
fn mil_and_inch_convert_exactly() {
    assert_relative_eq!(
        parse("1 mil", Kind::Length).unwrap(),
        25.4e-6,
        max_relative = 1e-12
    );
    assert_relative_eq!(
        parse("3.5 mil", Kind::Length).unwrap(),
        88.9e-6,
        max_relative = 1e-12
    );
    assert_relative_eq!(
        parse("40 in", Kind::Length).unwrap(),
        1.016,
        max_relative = 1e-12
    );
    assert_relative_eq!(
        parse("65 um", Kind::Length).unwrap(),
        65e-6,
        max_relative = 1e-12
    );
}

#[test]
fn temperatures_convert_to_kelvin() {
    assert_relative_eq!(
        parse("23 C", Kind::Temperature).unwrap(),
        296.15,
        max_relative = 1e-12
    );
    assert_relative_eq!(
        parse("73 F", Kind::Temperature).unwrap(),
        295.9278,
        max_relative = 1e-6
    );
    assert_relative_eq!(
        parse("32 F", Kind::Temperature).unwrap(),
        273.15,
        max_relative = 1e-12
    );
}

#[test]
fn speeds_densities_and_humidity_convert() {
    assert_relative_eq!(
        parse("1 fpm", Kind::Speed).unwrap(),
        5.08e-3,
        max_relative = 1e-12
    );
    assert_relative_eq!(
        parse("1800 m/min", Kind::Speed).unwrap(),
        30.0,
        max_relative = 1e-12
    );
    assert_relative_eq!(
        parse("1 lb/ft3", Kind::Density).unwrap(),
        16.01846,
        max_relative = 1e-6
    );
    assert_relative_eq!(parse("50 %", Kind::Humidity).unwrap(), 0.5);
    assert_relative_eq!(parse("7.5 %", Kind::Moisture).unwrap(), 7.5);
    assert_relative_eq!(parse("21 d", Kind::Duration).unwrap(), 21.0 * 86400.0);
}

#[test]
fn wrong_units_are_named_in_the_error() {
    let e = parse("25 kg", Kind::LineForce).unwrap_err().to_string();
    assert!(e.contains("unknown unit 'kg'") && e.contains("pli"), "{e}");
    let e = parse("25 psi", Kind::LineForce).unwrap_err().to_string();
    assert!(e.contains("'psi' is a unit of pressure"), "{e}");
    let e = parse("2.2", Kind::LineForce).unwrap_err().to_string();
    assert!(e.contains("needs a unit"), "{e}");
}

/// Basis weights of the trade, NIST SP 811 (2008) Appendix B: 1 lb/1000 ft2 = 4.882428 g/m2 and
/// 1 lb/3000 ft2 = 1.627476 g/m2; checked also from the exact pound (0.45359237 kg) and square
/// foot (0.09290304 m2). Unit words are read whatever their case and spacing.
#[test]
fn basis_weights_convert_per_nist_sp811() {
    let per_msf = 0.453_592_37 / (1000.0 * 0.092_903_04);
    let per_ream = 0.453_592_37 / (3000.0 * 0.092_903_04);
    assert_relative_eq!(per_msf * 1e3, 4.882428, max_relative = 1e-6);
    assert_relative_eq!(per_ream * 1e3, 1.627476, max_relative = 1e-6);
    for text in [
        "1 lb/1000 ft2",
        "1 lb/1000ft2",
        "1 LB/1000 FT2",
        "1 lb/1000 ft²",
    ] {
        assert_relative_eq!(
            parse(text, Kind::Grammage).unwrap(),
            per_msf,
            max_relative = 1e-12
        );
    }
    for text in ["1 lb/3000 ft2", "1 lb/3000ft2"] {
        assert_relative_eq!(
            parse(text, Kind::Grammage).unwrap(),
            per_ream,
            max_relative = 1e-12
        );
    }
    assert_relative_eq!(
        parse("2.0 PLI", Kind::LineForce).unwrap(),
        2.0 * 175.1268,
        max_relative = 1e-6
    );
    assert_relative_eq!(parse("350 n/m", Kind::LineForce).unwrap(), 350.0);
}
