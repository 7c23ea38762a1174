//! The validated case: every value SI (moisture in percentage points, humidity as a fraction).

use serde::{Deserialize, Serialize};

/// Grade class; picks the defaults for properties the case does not give.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Grade {
    /// Newsprint-like uncoated mechanical grades.
    #[serde(alias = "newsprint-like")]
    Newsprint,
    /// Coated printing grades.
    Coated,
    /// Paperboard.
    Board,
    /// Polymer film.
    Film,
    /// Everything given by the user.
    Custom,
}

/// Radial (stack) compression law.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
#[serde(tag = "law", rename_all = "snake_case")]
pub enum Stack {
    /// Pfeiffer (1966): P = K1 (exp(K2 eps) - 1), so E_r = K2 (P + K1).
    Pfeiffer {
        /// K1, Pa.
        k1_pa: f64,
        /// K2, dimensionless.
        #[serde(rename = "k2_dimensionless")]
        k2: f64,
    },
    /// A constant radial modulus, Pa.
    Constant {
        /// Radial modulus, Pa.
        radial_modulus_pa: f64,
    },
}

impl Stack {
    /// Tangent radial modulus at interlayer pressure `p_pa` (Pa, compression positive), Pa.
    #[inline]
    pub fn modulus(&self, p_pa: f64) -> f64 {
        self.modulus_of(p_pa)
    }

    /// [`Stack::modulus`] of each run of a pack side by side ([`crate::pack::Real`]).
    #[inline]
    pub fn modulus_of<T: crate::pack::Real>(&self, p_pa: T) -> T {
        match *self {
            Stack::Pfeiffer { k1_pa, k2 } => (p_pa.max_f(0.0) + k1_pa) * k2,
            Stack::Constant { radial_modulus_pa } => T::splat(radial_modulus_pa),
        }
    }

    /// Compressive radial strain of the stack at pressure `p_pa` (Pa), dimensionless.
    pub fn strain(&self, p_pa: f64) -> f64 {
        let p = p_pa.max(0.0);
        match *self {
            Stack::Pfeiffer { k1_pa, k2 } => (1.0 + p / k1_pa).ln() / k2,
            Stack::Constant { radial_modulus_pa } => p / radial_modulus_pa,
        }
    }

    /// Interlayer pressure (Pa) at compressive strain `eps` (inverse of [`Stack::strain`]).
    pub fn pressure(&self, eps: f64) -> f64 {
        let e = eps.max(0.0);
        match *self {
            Stack::Pfeiffer { k1_pa, k2 } => k1_pa * ((k2 * e).exp() - 1.0),
            Stack::Constant { radial_modulus_pa } => radial_modulus_pa * e,
        }
    }
}

/// GAB sorption isotherm constants: M = Mm C K a / [(1 - K a)(1 - K a + C K a)].
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Gab {
    /// Monolayer moisture Mm, % (dry basis).
    pub monolayer_pct: f64,
    /// Guggenheim constant C, dimensionless.
    #[serde(rename = "c_dimensionless")]
    pub c: f64,
    /// Multilayer constant K, dimensionless.
    #[serde(rename = "k_dimensionless")]
    pub k: f64,
}

/// Burgers four-element creep parameters in relative form.
///
/// Creep compliance at reference conditions: J(t) = (1/E) [1 + delayed (1 - exp(-t/retardation))
/// + t / viscous_time], where E is the elastic (instantaneous) modulus.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Burgers {
    /// Kelvin (delayed, recoverable) compliance over the elastic compliance.
    #[serde(rename = "delayed_ratio")]
    pub delayed: f64,
    /// Kelvin retardation time, s.
    pub retardation_s: f64,
    /// Maxwell viscous time E * eta_M / E = eta_M / E, s: the time at which the permanent
    /// (viscous) creep equals the elastic strain under constant stress.
    pub viscous_time_s: f64,
}

/// Creep and ageing parameters.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Creep {
    /// Machine direction (tangential in the roll).
    pub md: Burgers,
    /// Thickness direction (radial in the roll).
    pub radial: Burgers,
    /// Arrhenius activation energy of the time-temperature shift, J/mol.
    pub activation_energy_j_mol: f64,
    /// Time-moisture shift: decades of time per percentage point of moisture.
    pub moisture_shift_dec_per_pct: f64,
    /// Mechano-sorptive creep coefficient: extra strain, as a multiple of the elastic strain,
    /// per percentage point of moisture change (either sign).
    pub mechanosorptive_per_pct: f64,
}

/// Web material.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Material {
    pub grade: Grade,
    /// Caliper (thickness), m.
    pub caliper_m: f64,
    /// Apparent density, kg/m3.
    pub density_kg_m3: f64,
    /// MD (tangential) modulus, Pa.
    pub md_modulus_pa: f64,
    /// CD modulus, Pa.
    pub cd_modulus_pa: f64,
    /// Poisson ratio in the winding model's core condition, dimensionless.
    #[serde(rename = "poisson_ratio")]
    pub poisson: f64,
    /// Stack compression law.
    pub stack: Stack,
    /// Web-on-web friction coefficient (friction force over normal force).
    #[serde(rename = "friction_ratio")]
    pub friction: f64,
    /// MD hygroexpansion, strain per % moisture.
    pub hygro_md_per_pct: f64,
    /// CD hygroexpansion, strain per % moisture.
    pub hygro_cd_per_pct: f64,
    /// Thickness hygroexpansion, strain per % moisture.
    pub hygro_zd_per_pct: f64,
    /// Moisture content at winding, %.
    pub moisture_pct: f64,
    /// Effective in-plane (along the width) diffusivity of the wound stack, m2/s.
    pub diffusivity_inplane_m2_s: f64,
    /// Effective through-thickness (radial, across layers) diffusivity, m2/s.
    pub diffusivity_radial_m2_s: f64,
    /// Sorption isotherm.
    pub sorption: Gab,
    /// Creep parameters (grade values; `fit` refines them per lane).
    pub creep: Creep,
    /// Strength limits the wound state is checked against.
    pub strength: Strength,
    /// Surface roughness of one face of the web (Parker Print-Surf-like gap roughness), m:
    /// entrained air escapes through the valleys of two such faces in contact.
    pub roughness_m: f64,
}

/// Strength limits of the web, Pa (positive numbers).
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Strength {
    /// MD tensile strength, Pa (stress = breaking force per width over caliper).
    pub md_tensile_pa: f64,
    /// MD compressive strength (short-span compression), Pa: beyond it layers buckle (starring).
    pub md_compressive_pa: f64,
    /// ZD compressive limit: the interlayer pressure at which the stack is crushed
    /// (permanent caliper loss, blocking of coated or embossed layers), Pa.
    pub zd_crush_pa: f64,
}

/// Core stiffness.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
#[serde(tag = "kind", rename_all = "snake_case")]
pub enum Core {
    /// A rigid core.
    Rigid,
    /// An isotropic tube.
    Tube {
        /// Young's modulus, Pa.
        modulus_pa: f64,
        /// Wall thickness, m.
        wall_m: f64,
        /// Poisson ratio.
        #[serde(rename = "poisson_ratio")]
        poisson: f64,
    },
}

/// Roll geometry.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Roll {
    /// Width (face length), m.
    pub width_m: f64,
    /// Nominal outer diameter, m.
    pub diameter_m: f64,
    /// Core outer diameter, m.
    pub core_diameter_m: f64,
    pub core: Core,
    /// The core maker's rated collapse (crush) pressure, Pa, when the case gives one
    /// (`roll.core.rating`); else the collapse pressure is computed from the tube.
    pub core_rating_pa: Option<f64>,
}

/// Web tension: constant or a taper table against roll diameter.
#[derive(Debug, Clone, PartialEq, Serialize)]
#[serde(tag = "kind", rename_all = "snake_case")]
pub enum Tension {
    /// Constant web tension, N/m.
    Constant { tension_n_per_m: f64 },
    /// (diameter m, tension N/m) points sorted by diameter; linear between, flat outside.
    Taper {
        #[serde(serialize_with = "taper_points")]
        points: Vec<(f64, f64)>,
    },
}

impl Tension {
    /// Web tension at roll diameter `d_m` (m), N/m.
    pub fn at(&self, d_m: f64) -> f64 {
        match self {
            Tension::Constant { tension_n_per_m } => *tension_n_per_m,
            Tension::Taper { points } => crate::interp::linear_flat(points, d_m),
        }
    }
}

/// Taper points in JSON: each with its diameter and tension named with their units.
fn taper_points<S: serde::Serializer>(points: &[(f64, f64)], s: S) -> Result<S::Ok, S::Error> {
    #[derive(Serialize)]
    struct Point {
        diameter_m: f64,
        tension_n_per_m: f64,
    }
    s.collect_seq(points.iter().map(|&(d, t)| Point {
        diameter_m: d,
        tension_n_per_m: t,
    }))
}

/// Winder settings.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Winding {
    pub tension: Tension,
    /// Nip load, N/m.
    pub nip_n_per_m: f64,
    /// Web speed, m/s.
    pub speed_m_s: f64,
}

/// What a profile measures.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Measure {
    /// Roll hardness, in the case's scale units.
    Hardness,
    /// Roll diameter, m.
    Diameter,
    /// Web caliper, m.
    Caliper,
    /// Web tension across the width as the web came to the winder (a tension-profile
    /// measurement), N/m; at winding only (age 0).
    Tension,
    /// Web moisture across the width at winding, % (the basis of `material.moisture`); at
    /// winding only (age 0).
    Moisture,
}

impl Measure {
    /// The unit of a value of this kind as JSON field names end in it: `m`, `n_per_m`, `pct`,
    /// or `hardness_units` (the case's hardness scale).
    pub fn json_unit(self) -> &'static str {
        match self {
            Measure::Hardness => "hardness_units",
            Measure::Diameter | Measure::Caliper => "m",
            Measure::Tension => "n_per_m",
            Measure::Moisture => "pct",
        }
    }
}

/// A cross-width profile. In JSON its values are named by their unit ([`Measure::json_unit`]):
/// `values_m`, `values_n_per_m`, `values_pct` or `values_hardness_units`.
#[derive(Debug, Clone, PartialEq)]
pub struct Profile {
    pub what: Measure,
    /// Roll age at measurement, s.
    pub age_s: f64,
    /// Positions from the front edge, m.
    pub positions_m: Vec<f64>,
    /// Values in SI (m, N/m), moisture in %, or hardness scale units.
    pub values: Vec<f64>,
    /// Where it came from (case file or CSV path).
    pub origin: String,
}

impl Serialize for Profile {
    fn serialize<S: serde::Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        use serde::ser::SerializeMap;
        let mut m = s.serialize_map(Some(5))?;
        m.serialize_entry("what", &self.what)?;
        m.serialize_entry("age_s", &self.age_s)?;
        m.serialize_entry("positions_m", &self.positions_m)?;
        m.serialize_entry(&format!("values_{}", self.what.json_unit()), &self.values)?;
        m.serialize_entry("origin", &self.origin)?;
        m.end()
    }
}

/// Wrap of a roll surface.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Wrap {
    None,
    Paper,
    Film,
}

/// How the roll stands.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Stance {
    OnEnd,
    OnSide,
}

/// One stretch of storage history.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Stretch {
    /// Duration, s.
    pub duration_s: f64,
    /// Temperature, K.
    pub temperature_k: f64,
    /// Relative humidity, fraction 0..1.
    #[serde(rename = "rh_fraction")]
    pub rh: f64,
    pub barrel_wrap: Wrap,
    pub end_wrap: Wrap,
    pub stance: Stance,
    pub place: Option<String>,
    /// Share of the stretch one contact line of a roll stored on its side bears the weight, 0..1
    /// (1: never turned; 0.25: a quarter turn at regular intervals, four lines share the load).
    /// Not read from a case file: the `turn_rolls` correction sets it.
    #[serde(rename = "contact_fraction")]
    pub contact_share: f64,
}

/// Surface mass-transfer coefficients (m/s) of the wraps.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct WrapPermeance {
    pub none_m_s: f64,
    pub paper_m_s: f64,
    pub film_m_s: f64,
}

impl WrapPermeance {
    /// Coefficient for a wrap, m/s.
    pub fn of(&self, w: Wrap) -> f64 {
        match w {
            Wrap::None => self.none_m_s,
            Wrap::Paper => self.paper_m_s,
            Wrap::Film => self.film_m_s,
        }
    }
}

/// Hardness scale and its link to interlayer pressure: H = a + b ln(P / pressure_ref).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Hardness {
    pub scale: String,
    /// One-sigma repeatability of a reading, scale units.
    #[serde(rename = "repeatability_hardness_units")]
    pub repeatability: f64,
    /// Calibration, if the case gives one.
    pub calibration: Option<Calibration>,
}

/// H = a + b ln(P / pressure_ref).
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Calibration {
    /// Scale units.
    #[serde(rename = "a_hardness_units")]
    pub a: f64,
    /// Scale units per e-fold of pressure.
    #[serde(rename = "b_hardness_units")]
    pub b: f64,
    /// Reference pressure, Pa.
    pub pressure_ref_pa: f64,
}

/// A laboratory creep test: constant stress, strain against time.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct LabCreep {
    /// `md` or `radial`.
    pub direction: String,
    /// Stress, Pa.
    pub stress_pa: f64,
    /// Test temperature, K.
    pub temperature_k: f64,
    /// Test relative humidity, fraction.
    #[serde(rename = "rh_fraction")]
    pub rh: f64,
    /// Times since loading, s.
    pub times_s: Vec<f64>,
    /// Total strains (elastic + creep), dimensionless.
    #[serde(rename = "strains_m_per_m")]
    pub strains: Vec<f64>,
}

/// A value the case did not give, and where the default comes from.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct DefaultUsed {
    pub field: String,
    pub value: String,
    pub source: String,
}

/// A validated case.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Case {
    /// File it came from, or `<demo>`.
    pub source: String,
    pub id: String,
    pub title: String,
    pub complaint: Option<String>,
    pub notes: String,
    pub material: Material,
    pub roll: Roll,
    pub winding: Winding,
    pub profiles: Vec<Profile>,
    pub storage: Vec<Stretch>,
    /// Explicit lane edges, m, if given.
    pub lane_edges_m: Option<Vec<f64>>,
    /// Lane count, if given.
    pub lane_count: Option<usize>,
    pub hardness: Hardness,
    pub wraps: WrapPermeance,
    /// Laboratory creep tests of the grade.
    pub lab_creep: Vec<LabCreep>,
    /// Web tension at the converter, N/m (the tension against which a long lane runs slack).
    pub converting_tension_n_per_m: f64,
    /// One-sigma repeatability of a caliper reading, m, when a caliper profile gives one (else
    /// [`super::defaults::CALIPER_REPEAT`] applies).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub caliper_repeatability_m: Option<f64>,
    /// Web speed at the converter's unwind, m/s (the once-per-turn swing of an out-of-round roll
    /// is taken at this speed).
    pub converting_speed_m_s: f64,
    pub defaults: Vec<DefaultUsed>,
    pub warnings: Vec<String>,
}

impl Case {
    /// Total storage time, s.
    pub fn storage_s(&self) -> f64 {
        self.storage.iter().map(|s| s.duration_s).sum()
    }

    /// The profile of kind `what` with the most readings (the first of equals).
    pub fn densest(&self, what: Measure) -> Option<&Profile> {
        (self.profiles.iter())
            .filter(|p| p.what == what)
            .fold(None::<&Profile>, |best, p| match best {
                Some(b) if b.values.len() >= p.values.len() => Some(b),
                _ => Some(p),
            })
    }
}
