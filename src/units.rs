//! Quantities written with their unit ("3.5 mil", "2.2 pli", "25 psi") converted once to SI.
//!
//! This is the only module that knows non-SI units. Conversion factors are exact or taken from
//! NIST Special Publication 811 (2008), Appendix B: 1 in = 0.0254 m (exact),
//! 1 lbf = 4.448 221 615 260 5 N (exact), so 1 psi = 6894.757 Pa and 1 pli = 175.127 N/m.
//!
//! Internal conventions (all SI or dimensionless):
//! - moisture content is kept in percentage points (a dimensionless number such as 7.5);
//! - relative humidity is kept as a fraction 0..1 (water activity);
//! - temperatures are kelvin.

use thiserror::Error;

/// Seconds in a day (s).
pub const DAY_S: f64 = 86_400.0;

/// One pound-force in newtons (NIST SP 811, exact).
pub const LBF_N: f64 = 4.448_221_615_260_5;
/// One inch in metres (exact).
pub const INCH_M: f64 = 0.0254;
/// One foot in metres (exact).
pub const FOOT_M: f64 = 0.3048;
/// One pound (avoirdupois) in kilograms (exact).
pub const LB_KG: f64 = 0.453_592_37;
/// Zero Celsius in kelvin (exact).
pub const ZERO_C_K: f64 = 273.15;

/// What a number measures; decides which units are accepted.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Kind {
    /// Lengths and thicknesses; SI: m.
    Length,
    /// Force per unit width (web tension, nip load); SI: N/m.
    LineForce,
    /// Stress, pressure and moduli; SI: Pa.
    Pressure,
    /// Temperature; SI: K.
    Temperature,
    /// Durations and ages; SI: s.
    Duration,
    /// Web speed; SI: m/s.
    Speed,
    /// Density; SI: kg/m3.
    Density,
    /// Grammage (basis weight); SI: kg/m2.
    Grammage,
    /// Relative humidity; stored as a fraction 0..1.
    Humidity,
    /// Moisture content; stored in percentage points.
    Moisture,
    /// Diffusivity; SI: m2/s.
    Diffusivity,
    /// Surface mass-transfer coefficient (wrap permeance); SI: m/s.
    Permeance,
    /// Strain per percentage point of moisture; stored as 1/%.
    PerMoisture,
    /// Molar energy (activation energy); SI: J/mol.
    MolarEnergy,
    /// A plain number.
    Number,
}

impl Kind {
    /// Human name used in error messages.
    pub fn name(self) -> &'static str {
        match self {
            Kind::Length => "length",
            Kind::LineForce => "force per width (tension, nip load)",
            Kind::Pressure => "pressure, stress or modulus",
            Kind::Temperature => "temperature",
            Kind::Duration => "duration",
            Kind::Speed => "speed",
            Kind::Density => "density",
            Kind::Grammage => "grammage",
            Kind::Humidity => "relative humidity",
            Kind::Moisture => "moisture content",
            Kind::Diffusivity => "diffusivity",
            Kind::Permeance => "mass-transfer coefficient",
            Kind::PerMoisture => "strain per % moisture",
            Kind::MolarEnergy => "molar energy",
            Kind::Number => "number",
        }
    }

    /// An example of a valid value, used in hints.
    pub fn example(self) -> &'static str {
        match self {
            Kind::Length => "\"72 um\", \"3.5 mil\", \"1.2 m\", \"40 in\"",
            Kind::LineForce => "\"2.2 pli\", \"380 N/m\", \"0.4 kN/m\"",
            Kind::Pressure => "\"25 psi\", \"172 kPa\", \"5.5 GPa\"",
            Kind::Temperature => "\"23 C\", \"73 F\", \"296 K\"",
            Kind::Duration => "\"21 d\", \"36 h\", \"3 wk\"",
            Kind::Speed => "\"1500 m/min\", \"25 m/s\", \"5000 fpm\"",
            Kind::Density => "\"650 kg/m3\", \"0.65 g/cm3\"",
            Kind::Grammage => "\"45 g/m2\", \"30 lb/3000ft2\"",
            Kind::Humidity => "\"50 %\"",
            Kind::Moisture => "\"7.5 %\"",
            Kind::Diffusivity => "\"5e-10 m2/s\"",
            Kind::Permeance => "\"1e-7 m/s\"",
            Kind::PerMoisture => "\"0.0005 /%\"",
            Kind::MolarEnergy => "\"100 kJ/mol\"",
            Kind::Number => "\"0.3\"",
        }
    }
}

/// A unit: spellings, kind, factor to SI and offset (for temperatures: SI = v*factor + offset).
struct Unit {
    names: &'static [&'static str],
    kind: Kind,
    factor: f64,
    offset: f64,
}

const fn u(names: &'static [&'static str], kind: Kind, factor: f64) -> Unit {
    Unit {
        names,
        kind,
        factor,
        offset: 0.0,
    }
}

const PSI_PA: f64 = LBF_N / (INCH_M * INCH_M);
const PLI_NM: f64 = LBF_N / INCH_M;

static UNITS: &[Unit] = &[
    // lengths
    u(&["m"], Kind::Length, 1.0),
    u(&["mm"], Kind::Length, 1e-3),
    u(&["cm"], Kind::Length, 1e-2),
    u(&["um", "µm", "μm", "micron", "microns"], Kind::Length, 1e-6),
    u(&["in", "inch", "inches", "\""], Kind::Length, INCH_M),
    u(&["ft", "foot", "feet"], Kind::Length, FOOT_M),
    u(&["mil", "mils", "thou"], Kind::Length, INCH_M * 1e-3),
    // force per width
    u(&["N/m"], Kind::LineForce, 1.0),
    u(&["kN/m"], Kind::LineForce, 1e3),
    u(&["N/mm"], Kind::LineForce, 1e3),
    u(&["N/cm"], Kind::LineForce, 1e2),
    u(&["pli", "lbf/in", "lb/in"], Kind::LineForce, PLI_NM),
    // pressure
    u(&["Pa", "N/m2"], Kind::Pressure, 1.0),
    u(&["kPa"], Kind::Pressure, 1e3),
    u(&["MPa", "N/mm2"], Kind::Pressure, 1e6),
    u(&["GPa"], Kind::Pressure, 1e9),
    u(&["bar"], Kind::Pressure, 1e5),
    u(&["psi"], Kind::Pressure, PSI_PA),
    u(&["kpsi", "ksi"], Kind::Pressure, PSI_PA * 1e3),
    u(&["Mpsi", "msi"], Kind::Pressure, PSI_PA * 1e6),
    // temperature
    Unit {
        names: &["C", "°C", "degC"],
        kind: Kind::Temperature,
        factor: 1.0,
        offset: ZERO_C_K,
    },
    u(&["K"], Kind::Temperature, 1.0),
    Unit {
        names: &["F", "°F", "degF"],
        kind: Kind::Temperature,
        factor: 5.0 / 9.0,
        offset: ZERO_C_K - 32.0 * 5.0 / 9.0,
    },
    // durations
    u(&["s", "sec"], Kind::Duration, 1.0),
    u(&["min"], Kind::Duration, 60.0),
    u(&["h", "hr", "hrs", "hour", "hours"], Kind::Duration, 3600.0),
    u(&["d", "day", "days"], Kind::Duration, DAY_S),
    u(&["wk", "week", "weeks"], Kind::Duration, 7.0 * DAY_S),
    // a month is a twelfth of the Julian year of 365.25 d (IAU)
    u(
        &["mo", "month", "months"],
        Kind::Duration,
        365.25 / 12.0 * DAY_S,
    ),
    u(
        &["y", "yr", "year", "years"],
        Kind::Duration,
        365.25 * DAY_S,
    ),
    // speed
    u(&["m/s"], Kind::Speed, 1.0),
    u(&["m/min", "mpm"], Kind::Speed, 1.0 / 60.0),
    u(&["ft/min", "fpm"], Kind::Speed, FOOT_M / 60.0),
    // density
    u(&["kg/m3"], Kind::Density, 1.0),
    u(&["g/cm3"], Kind::Density, 1000.0),
    u(
        &["lb/ft3"],
        Kind::Density,
        LB_KG / (FOOT_M * FOOT_M * FOOT_M),
    ),
    // grammage
    u(&["g/m2", "gsm"], Kind::Grammage, 1e-3),
    u(&["kg/m2"], Kind::Grammage, 1.0),
    // basis weights of the trade: pounds per ream of 3000 ft2 (paper) or per 1000 ft2 (board)
    u(
        &["lb/3000ft2", "lb/3000 ft2", "lb/ream"],
        Kind::Grammage,
        LB_KG / (3000.0 * FOOT_M * FOOT_M),
    ),
    u(
        &["lb/1000ft2", "lb/1000 ft2", "lb/msf"],
        Kind::Grammage,
        LB_KG / (1000.0 * FOOT_M * FOOT_M),
    ),
    // humidity and moisture
    u(&["%", "%RH", "% RH"], Kind::Humidity, 0.01),
    u(&["%", "%MC", "% MC"], Kind::Moisture, 1.0),
    // diffusivity
    u(&["m2/s"], Kind::Diffusivity, 1.0),
    u(&["mm2/s"], Kind::Diffusivity, 1e-6),
    u(&["cm2/s"], Kind::Diffusivity, 1e-4),
    // permeance
    u(&["m/s"], Kind::Permeance, 1.0),
    u(&["mm/s"], Kind::Permeance, 1e-3),
    // hygroexpansion
    u(&["/%", "1/%", "per %"], Kind::PerMoisture, 1.0),
    u(&["%/%"], Kind::PerMoisture, 0.01),
    // energy
    u(&["J/mol"], Kind::MolarEnergy, 1.0),
    u(&["kJ/mol"], Kind::MolarEnergy, 1e3),
];

/// Why a quantity could not be read.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum UnitError {
    /// No number at the start.
    #[error("'{0}' does not start with a number")]
    NoNumber(String),
    /// A number that is NaN or infinite.
    #[error("'{0}' is not a finite number")]
    NotFinite(String),
    /// The unit is missing.
    #[error("a {} needs a unit, e.g. {}", .kind.name(), .kind.example())]
    MissingUnit { kind: Kind },
    /// The unit exists but measures something else.
    #[error(
        "'{unit}' is a unit of {}, but a {} is wanted, e.g. {}",
        .found.name(),
        .wanted.name(),
        .wanted.example()
    )]
    WrongKind {
        unit: String,
        found: Kind,
        wanted: Kind,
    },
    /// The unit is not known at all.
    #[error("unknown unit '{unit}' for a {}, write e.g. {}", .wanted.name(), .wanted.example())]
    UnknownUnit { unit: String, wanted: Kind },
}

/// Split "12.5 pli" into (12.5, "pli"). Accepts exponents ("5e-10 m2/s").
fn split_number(text: &str) -> Result<(f64, &str), UnitError> {
    let t = text.trim();
    let bytes = t.as_bytes();
    let mut end = 0;
    let mut seen_digit = false;
    let mut i = 0;
    while i < bytes.len() {
        let c = bytes[i] as char;
        let ok = c.is_ascii_digit()
            || c == '.'
            || ((c == '+' || c == '-') && (i == 0 || matches!(bytes[i - 1], b'e' | b'E')))
            || ((c == 'e' || c == 'E')
                && seen_digit
                && i + 1 < bytes.len()
                && (bytes[i + 1].is_ascii_digit() || matches!(bytes[i + 1], b'+' | b'-')));
        if !ok {
            break;
        }
        if c.is_ascii_digit() {
            seen_digit = true;
        }
        i += 1;
        end = i;
    }
    let lower = t.to_ascii_lowercase();
    if lower == "nan" || lower.starts_with("nan ") || lower.starts_with("inf") {
        return Err(UnitError::NotFinite(t.to_string()));
    }
    if !seen_digit {
        return Err(UnitError::NoNumber(t.to_string()));
    }
    let v: f64 = t[..end]
        .parse()
        .map_err(|_| UnitError::NoNumber(t.to_string()))?;
    if !v.is_finite() {
        return Err(UnitError::NotFinite(t.to_string()));
    }
    Ok((v, t[end..].trim()))
}

/// A unit spelling without spaces ("lb/1000 ft2" and "lb/1000ft2" are one unit).
fn squeeze(s: &str) -> String {
    s.chars().filter(|c| !c.is_whitespace()).collect()
}

/// Read a quantity of the given kind and return its SI value.
///
/// # Units
/// The result is in the SI unit of `kind` (see [`Kind`]); humidity as a fraction, moisture in
/// percentage points.
///
/// ```
/// use rollsleuth::units::{parse, Kind};
/// let t = parse("1 pli", Kind::LineForce).unwrap();
/// assert!((t - 175.127).abs() < 1e-3);
/// ```
pub fn parse(text: &str, kind: Kind) -> Result<f64, UnitError> {
    let (v, unit) = split_number(text)?;
    if kind == Kind::Number {
        if unit.is_empty() {
            return Ok(v);
        }
        return Err(UnitError::UnknownUnit {
            unit: unit.to_string(),
            wanted: kind,
        });
    }
    if unit.is_empty() {
        return Err(UnitError::MissingUnit { kind });
    }
    let norm = squeeze(&unit.replace('²', "2").replace('³', "3"));
    let mut other: Option<Kind> = None;
    // The spelling as written first, then ignoring case ("2.0 PLI", "350 n/m"): no two units
    // of one kind differ only in case.
    for same in [
        (|a: &str, b: &str| a == b) as fn(&str, &str) -> bool,
        |a: &str, b: &str| a.to_lowercase() == b.to_lowercase(),
    ] {
        for un in UNITS {
            if un.names.iter().any(|n| same(&squeeze(n), &norm)) {
                if un.kind == kind {
                    return Ok(v * un.factor + un.offset);
                }
                other.get_or_insert(un.kind);
            }
        }
    }
    match other {
        Some(found) => Err(UnitError::WrongKind {
            unit: unit.to_string(),
            found,
            wanted: kind,
        }),
        None => Err(UnitError::UnknownUnit {
            unit: unit.to_string(),
            wanted: kind,
        }),
    }
}

/// Which unit system human output uses.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Default)]
pub enum System {
    /// SI (mm, kPa, N/m, C).
    #[default]
    Si,
    /// US customary (in, psi, pli, F).
    Us,
}

static MESSAGE_SYSTEM: std::sync::atomic::AtomicBool = std::sync::atomic::AtomicBool::new(false);

/// Set the unit system that input messages (range errors) use; the CLI sets it from `--units`.
pub fn set_message_system(sys: System) {
    MESSAGE_SYSTEM.store(sys == System::Us, std::sync::atomic::Ordering::Relaxed);
}

/// The unit system input messages use (SI unless set).
pub fn message_system() -> System {
    if MESSAGE_SYSTEM.load(std::sync::atomic::Ordering::Relaxed) {
        System::Us
    } else {
        System::Si
    }
}

/// A display unit: label and the factor from SI (display = si / factor - offset handled for T).
pub struct Display {
    /// Unit label.
    pub label: &'static str,
    factor: f64,
    offset: f64,
}

impl Display {
    /// Convert an SI value to this display unit.
    pub fn from_si(&self, si: f64) -> f64 {
        (si - self.offset) / self.factor
    }
}

/// Display unit for a kind of quantity in a unit system; `fine` picks the small length unit
/// (um or mil) used for calipers.
pub fn display(kind: Kind, sys: System, fine: bool) -> Display {
    let d = |label, factor| Display {
        label,
        factor,
        offset: 0.0,
    };
    match (kind, sys) {
        (Kind::Length, System::Si) if fine => d("um", 1e-6),
        (Kind::Length, System::Si) => d("mm", 1e-3),
        (Kind::Length, System::Us) if fine => d("mil", INCH_M * 1e-3),
        (Kind::Length, System::Us) => d("in", INCH_M),
        (Kind::LineForce, System::Si) => d("N/m", 1.0),
        (Kind::LineForce, System::Us) => d("pli", PLI_NM),
        (Kind::Pressure, System::Si) => d("kPa", 1e3),
        (Kind::Pressure, System::Us) => d("psi", PSI_PA),
        (Kind::Temperature, System::Si) => Display {
            label: "C",
            factor: 1.0,
            offset: ZERO_C_K,
        },
        (Kind::Temperature, System::Us) => Display {
            label: "F",
            factor: 5.0 / 9.0,
            offset: ZERO_C_K - 32.0 * 5.0 / 9.0,
        },
        (Kind::Speed, System::Si) => d("m/min", 1.0 / 60.0),
        (Kind::Speed, System::Us) => d("fpm", FOOT_M / 60.0),
        (Kind::Duration, _) => d("d", DAY_S),
        (Kind::Density, System::Si) => d("kg/m3", 1.0),
        (Kind::Density, System::Us) => d("lb/ft3", LB_KG / (FOOT_M * FOOT_M * FOOT_M)),
        (Kind::Grammage, System::Si) => d("g/m2", 1e-3),
        (Kind::Grammage, System::Us) => d("lb/3000ft2", LB_KG / (3000.0 * FOOT_M * FOOT_M)),
        (Kind::Humidity, _) => d("%", 0.01),
        (Kind::Moisture, _) => d("%", 1.0),
        (Kind::Diffusivity, _) => d("m2/s", 1.0),
        (Kind::Permeance, _) => d("m/s", 1.0),
        (Kind::PerMoisture, _) => d("/%", 1.0),
        (Kind::MolarEnergy, _) => d("kJ/mol", 1e3),
        (Kind::Number, _) => d("", 1.0),
    }
}

/// Label of a length difference per length of web (a strain of 1e-3 per unit): "mm/m" in SI,
/// "mil/in" in US units; the number is the same in both.
pub fn strain_label(sys: System) -> &'static str {
    match sys {
        System::Si => "mm/m",
        System::Us => "mil/in",
    }
}

/// A signed change for humans with its unit label and `decimals` decimals, e.g. "+0.12 mm" or
/// "-4.7 mil"; `fine` picks the small length unit as in [`display`].
pub fn signed(si: f64, kind: Kind, sys: System, fine: bool, decimals: usize) -> String {
    let d = display(kind, sys, fine);
    format!("{:+.*} {}", decimals, d.from_si(si), d.label)
}

/// Format an SI value for humans with a sensible number of significant digits.
pub fn show(si: f64, kind: Kind, sys: System, fine: bool) -> String {
    let d = if kind == Kind::Pressure && si.abs() >= 1e8 {
        // moduli: GPa or Mpsi
        match sys {
            System::Si => Display {
                label: "GPa",
                factor: 1e9,
                offset: 0.0,
            },
            System::Us => Display {
                label: "kpsi",
                factor: PSI_PA * 1e3,
                offset: 0.0,
            },
        }
    } else {
        display(kind, sys, fine)
    };
    let s = digits(d.from_si(si), kind);
    if d.label.is_empty() {
        s
    } else {
        format!("{s} {}", d.label)
    }
}

/// A value in a display unit as `show` writes its number: four significant digits, but a
/// temperature to a tenth of a degree (C or F are interval scales: digits counted from their
/// arbitrary zero mean nothing, and 6 C read back from 279.15 K is not "6.000 C"); never "-0.0".
pub fn digits(v: f64, kind: Kind) -> String {
    if kind == Kind::Temperature {
        format!("{:.1}", (v * 10.0).round() / 10.0 + 0.0)
    } else {
        sig(v, 4)
    }
}

/// A number with `n` significant digits, plain notation where reasonable.
pub fn sig(v: f64, n: usize) -> String {
    if !v.is_finite() {
        return format!("{v}");
    }
    if v == 0.0 {
        return "0".to_string();
    }
    let mag = v.abs().log10().floor() as i32;
    if !(-4..=7).contains(&mag) {
        return format!("{:.*e}", n.saturating_sub(1), v);
    }
    let decimals = (n as i32 - 1 - mag).max(0) as usize;
    format!("{v:.decimals$}")
}

/// Label of a length difference per unit length (a ratio of 1e-3): mm/m in SI, mil/in in US
/// customary. Both are the same number, so values need no conversion.
pub fn per_mille_label(sys: System) -> &'static str {
    match sys {
        System::Si => "mm/m",
        System::Us => "mil/in",
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    #[test]
    fn splits_exponents_and_signs() {
        assert_relative_eq!(parse("5e-10 m2/s", Kind::Diffusivity).unwrap(), 5e-10);
        assert_relative_eq!(parse("-3 C", Kind::Temperature).unwrap(), 270.15);
        assert_relative_eq!(
            parse("3.5mil", Kind::Length).unwrap(),
            88.9e-6,
            epsilon = 1e-12
        );
    }

    #[test]
    fn rejects_nan_and_wrong_kinds() {
        assert!(matches!(
            parse("NaN pli", Kind::LineForce),
            Err(UnitError::NotFinite(_))
        ));
        assert!(matches!(
            parse("25 kg", Kind::LineForce),
            Err(UnitError::UnknownUnit { .. })
        ));
        assert!(matches!(
            parse("25 psi", Kind::LineForce),
            Err(UnitError::WrongKind { .. })
        ));
        assert!(matches!(
            parse("25", Kind::LineForce),
            Err(UnitError::MissingUnit { .. })
        ));
    }

    /// Unit words are read whatever their case, and the same word never names two units of one
    /// kind when case is ignored (else the case-blind match would be ambiguous).
    #[test]
    fn unit_words_ignore_case() {
        assert_relative_eq!(
            parse("2.0 PLI", Kind::LineForce).unwrap(),
            2.0 * LBF_N / INCH_M
        );
        assert_relative_eq!(parse("350 n/m", Kind::LineForce).unwrap(), 350.0);
        assert_relative_eq!(parse("3.5 MIL", Kind::Length).unwrap(), 3.5 * INCH_M * 1e-3);
        assert_relative_eq!(
            parse("25 PSI", Kind::Pressure).unwrap(),
            25.0 * LBF_N / (INCH_M * INCH_M)
        );
        for (i, a) in UNITS.iter().enumerate() {
            for b in &UNITS[i + 1..] {
                if a.kind != b.kind {
                    continue;
                }
                for x in a.names {
                    for y in b.names {
                        assert_ne!(
                            squeeze(x).to_lowercase(),
                            squeeze(y).to_lowercase(),
                            "{x} / {y}"
                        );
                    }
                }
            }
        }
    }

    #[test]
    fn sig_digits() {
        assert_eq!(sig(1234.567, 4), "1235");
        assert_eq!(sig(0.012345, 3), "0.0123");
    }
}
