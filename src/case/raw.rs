//! The case file as written: serde schema with `deny_unknown_fields`, quantities kept as text
//! with their position in the file so validation can point back to the line. Closed word sets
//! (grade, wraps, stance, profile kind, lab-creep direction) are serde enums read through
//! [`Word`], which keeps an unknown word for validation to report with its line and the allowed
//! words, so every problem in a file is listed at once.

use super::model::{Grade, Measure, Stance, Wrap};
use serde::de::{self, DeserializeOwned, Deserializer, IntoDeserializer, Visitor};
use serde::Deserialize;
use serde_saphyr::Spanned;
use std::fmt;

/// A word from the closed set `T` (a serde enum with snake_case words), or the unknown text.
#[derive(Debug, Clone, PartialEq)]
pub enum Word<T> {
    /// One of the allowed words.
    Known(T),
    /// Any other text, with the allowed words.
    Unknown {
        text: String,
        allowed: &'static [&'static str],
    },
}

impl<'de, T: DeserializeOwned> Deserialize<'de> for Word<T> {
    fn deserialize<D: Deserializer<'de>>(d: D) -> Result<Self, D::Error> {
        let text = Scalar::deserialize(d)?.0;
        let de: de::value::StrDeserializer<'_, de::value::Error> =
            text.as_str().into_deserializer();
        Ok(match T::deserialize(de) {
            Ok(v) => Word::Known(v),
            Err(_) => Word::Unknown {
                text,
                allowed: words_of::<T>(),
            },
        })
    }
}

/// The words of a serde enum, read from its derived `Deserialize`.
pub fn words_of<T: DeserializeOwned>() -> &'static [&'static str] {
    let mut words: &'static [&'static str] = &[];
    let _ = T::deserialize(Grab(&mut words));
    words
}

/// A deserializer that only records the variant names an enum asks for.
struct Grab<'a>(&'a mut &'static [&'static str]);

impl<'de> Deserializer<'de> for Grab<'_> {
    type Error = de::value::Error;
    fn deserialize_any<V: Visitor<'de>>(self, _: V) -> Result<V::Value, Self::Error> {
        Err(de::Error::custom("not an enum"))
    }
    fn deserialize_enum<V: Visitor<'de>>(
        self,
        _: &'static str,
        variants: &'static [&'static str],
        _: V,
    ) -> Result<V::Value, Self::Error> {
        *self.0 = variants;
        Err(de::Error::custom("variants recorded"))
    }
    serde::forward_to_deserialize_any! {
        bool i8 i16 i32 i64 i128 u8 u16 u32 u64 u128 f32 f64 char str string bytes byte_buf
        option unit unit_struct newtype_struct seq tuple tuple_struct map struct identifier
        ignored_any
    }
}

/// A closed-set word with its location in the file.
pub type W<T> = Spanned<Word<T>>;

/// Direction of a laboratory creep test.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum RawDirection {
    /// Machine direction.
    Md,
    /// Thickness direction.
    Radial,
}

impl RawDirection {
    /// The word as written.
    pub fn word(self) -> &'static str {
        match self {
            RawDirection::Md => "md",
            RawDirection::Radial => "radial",
        }
    }
}

/// Any YAML scalar kept as text ("2.2 pli", 0.45, 1).
#[derive(Debug, Clone, PartialEq)]
pub struct Scalar(pub String);

impl<'de> Deserialize<'de> for Scalar {
    fn deserialize<D: Deserializer<'de>>(d: D) -> Result<Self, D::Error> {
        struct V;
        impl Visitor<'_> for V {
            type Value = Scalar;
            fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
                f.write_str("a number or a quantity with its unit, such as \"2.2 pli\"")
            }
            fn visit_str<E: de::Error>(self, v: &str) -> Result<Scalar, E> {
                Ok(Scalar(v.to_string()))
            }
            fn visit_string<E: de::Error>(self, v: String) -> Result<Scalar, E> {
                Ok(Scalar(v))
            }
            fn visit_f64<E: de::Error>(self, v: f64) -> Result<Scalar, E> {
                Ok(Scalar(format!("{v}")))
            }
            fn visit_i64<E: de::Error>(self, v: i64) -> Result<Scalar, E> {
                Ok(Scalar(v.to_string()))
            }
            fn visit_u64<E: de::Error>(self, v: u64) -> Result<Scalar, E> {
                Ok(Scalar(v.to_string()))
            }
        }
        d.deserialize_any(V)
    }
}

/// A scalar with its location in the file.
pub type Q = Spanned<Scalar>;

/// Top level of a case file.
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawCase {
    pub format: Spanned<u32>,
    pub case: String,
    #[serde(default)]
    pub title: Option<String>,
    #[serde(default)]
    pub complaint: Option<Spanned<String>>,
    #[serde(default)]
    pub notes: Option<String>,
    pub material: RawMaterial,
    pub roll: RawRoll,
    pub winding: RawWinding,
    #[serde(default)]
    pub profiles: Vec<RawProfile>,
    #[serde(default)]
    pub storage: Vec<RawStretch>,
    #[serde(default)]
    pub lanes: Option<RawLanes>,
    #[serde(default)]
    pub hardness: Option<RawHardness>,
    #[serde(default)]
    pub wraps: Option<RawWraps>,
    #[serde(default)]
    pub converting: Option<RawConverting>,
    #[serde(default)]
    pub lab_creep: Vec<RawLabCreep>,
}

/// A laboratory creep test of the same grade.
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawLabCreep {
    pub direction: W<RawDirection>,
    pub stress: Q,
    #[serde(default)]
    pub temperature: Option<Q>,
    #[serde(default)]
    pub rh: Option<Q>,
    pub time_unit: Spanned<String>,
    pub times: Spanned<Vec<f64>>,
    pub strains: Spanned<Vec<f64>>,
}

/// What the converter runs the web at.
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawConverting {
    #[serde(default)]
    pub tension: Option<Q>,
    #[serde(default)]
    pub speed: Option<Q>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawMaterial {
    pub grade: W<Grade>,
    #[serde(default)]
    pub caliper: Option<Q>,
    #[serde(default)]
    pub density: Option<Q>,
    #[serde(default)]
    pub basis_weight: Option<Q>,
    #[serde(default)]
    pub md_modulus: Option<Q>,
    #[serde(default)]
    pub cd_modulus: Option<Q>,
    #[serde(default)]
    pub poisson: Option<Q>,
    #[serde(default)]
    pub stack: Option<RawStack>,
    #[serde(default)]
    pub radial_modulus: Option<Q>,
    #[serde(default)]
    pub friction: Option<Q>,
    #[serde(default)]
    pub hygro_md: Option<Q>,
    #[serde(default)]
    pub hygro_cd: Option<Q>,
    #[serde(default)]
    pub hygro_zd: Option<Q>,
    #[serde(default)]
    pub moisture: Option<Q>,
    #[serde(default)]
    pub diffusivity_inplane: Option<Q>,
    #[serde(default)]
    pub diffusivity_radial: Option<Q>,
    #[serde(default)]
    pub sorption: Option<RawGab>,
    #[serde(default)]
    pub creep: Option<RawCreep>,
    #[serde(default)]
    pub strength: Option<RawStrength>,
    #[serde(default)]
    pub roughness: Option<Q>,
}

/// `strength: { md_tensile, md_compressive, zd_crush }`, each optional (grade defaults).
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawStrength {
    #[serde(default)]
    pub md_tensile: Option<Q>,
    #[serde(default)]
    pub md_compressive: Option<Q>,
    #[serde(default)]
    pub zd_crush: Option<Q>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawStack {
    pub k1: Q,
    pub k2: Q,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawGab {
    pub monolayer: Q,
    pub c: Q,
    pub k: Q,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawCreep {
    #[serde(default)]
    pub md: Option<RawBurgers>,
    #[serde(default)]
    pub radial: Option<RawBurgers>,
    #[serde(default)]
    pub activation_energy: Option<Q>,
    #[serde(default)]
    pub moisture_shift: Option<Q>,
    #[serde(default)]
    pub mechanosorptive: Option<Q>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawBurgers {
    pub delayed: Q,
    pub retardation: Q,
    pub viscous_time: Q,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawRoll {
    pub width: Q,
    pub diameter: Q,
    pub core_diameter: Q,
    #[serde(default)]
    pub core: Option<RawCore>,
}

/// `core: { rigid: true }` or `core: { modulus, wall, poisson }`, each with an optional maker's
/// collapse `rating` (a pressure).
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawCore {
    #[serde(default)]
    pub rigid: Option<Spanned<bool>>,
    #[serde(default)]
    pub modulus: Option<Q>,
    #[serde(default)]
    pub wall: Option<Q>,
    #[serde(default)]
    pub poisson: Option<Q>,
    #[serde(default)]
    pub rating: Option<Q>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawWinding {
    /// Constant web tension.
    #[serde(default)]
    pub tension: Option<Q>,
    /// Or a taper table against diameter.
    #[serde(default)]
    pub taper: Option<Vec<RawTaperPoint>>,
    #[serde(default)]
    pub nip: Option<Q>,
    #[serde(default)]
    pub speed: Option<Q>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawTaperPoint {
    pub diameter: Q,
    pub tension: Q,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawProfile {
    pub what: W<Measure>,
    pub age: Q,
    #[serde(default)]
    pub unit: Option<String>,
    #[serde(default)]
    pub position_unit: Option<String>,
    #[serde(default)]
    pub positions: Option<Spanned<Vec<f64>>>,
    #[serde(default)]
    pub values: Option<Spanned<Vec<f64>>>,
    #[serde(default)]
    pub csv: Option<Spanned<String>>,
    /// Names of the CSV's position and value columns, when not `position` and `value`.
    #[serde(default)]
    pub columns: Option<RawColumns>,
    /// One-sigma repeatability of a caliper reading (caliper profiles only).
    #[serde(default)]
    pub repeatability: Option<Q>,
}

/// CSV column names of a profile.
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawColumns {
    pub position: String,
    pub value: String,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawStretch {
    pub duration: Q,
    pub temperature: Q,
    pub rh: Q,
    #[serde(default)]
    pub barrel_wrap: Option<W<Wrap>>,
    #[serde(default)]
    pub end_wrap: Option<W<Wrap>>,
    #[serde(default)]
    pub stance: Option<W<Stance>>,
    #[serde(default)]
    pub place: Option<String>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawLanes {
    #[serde(default)]
    pub edges: Option<Vec<Q>>,
    #[serde(default)]
    pub count: Option<Spanned<u32>>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawHardness {
    #[serde(default)]
    pub scale: Option<String>,
    #[serde(default)]
    pub repeatability: Option<Q>,
    #[serde(default)]
    pub calibration: Option<RawCalibration>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawCalibration {
    pub a: Q,
    pub b: Q,
    pub pressure_ref: Q,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawWraps {
    #[serde(default)]
    pub none: Option<Q>,
    #[serde(default)]
    pub paper: Option<Q>,
    #[serde(default)]
    pub film: Option<Q>,
}

#[cfg(test)]
mod tests {
    use super::*;

    #[derive(Debug, Deserialize)]
    struct One {
        wrap: W<Wrap>,
    }

    #[derive(Debug, Deserialize)]
    #[allow(dead_code)]
    struct Plain {
        wrap: Wrap,
    }

    #[test]
    fn known_word_is_the_enum_and_unknown_keeps_text_line_and_words() {
        let ok: One = serde_saphyr::from_str("\n\nwrap: film\n").unwrap();
        assert_eq!(ok.wrap.value, Word::Known(Wrap::Film));
        assert_eq!(ok.wrap.referenced.line(), 3);
        let bad: One = serde_saphyr::from_str("\nwrap: foil\n").unwrap();
        assert_eq!(bad.wrap.referenced.line(), 2);
        assert_eq!(
            bad.wrap.value,
            Word::Unknown {
                text: "foil".into(),
                allowed: &["none", "paper", "film"],
            }
        );
    }

    #[test]
    fn words_of_lists_every_variant() {
        assert_eq!(words_of::<Stance>(), &["on_end", "on_side"]);
        assert_eq!(
            words_of::<Measure>(),
            &["hardness", "diameter", "caliper", "tension", "moisture"]
        );
        assert_eq!(words_of::<RawDirection>(), &["md", "radial"]);
    }

    /// A plain serde enum also fails with the line, but stops at the first bad word and names
    /// no field path; `Word` is used so validation can list every problem.
    #[test]
    fn plain_enum_error_keeps_the_line() {
        let e = serde_saphyr::from_str::<Plain>("\n\nwrap: foil\n").unwrap_err();
        let m = e.to_string();
        assert!(m.contains("line 3"), "{m}");
        assert!(m.contains("foil"), "{m}");
    }
}
