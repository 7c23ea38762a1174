//! Defaults per grade class for properties a case does not give, each with its source.
//!
//! Values are typical figures recalled from the literature and the trade; each carries a source
//! line that is printed wherever the default is used, so a report never hides an assumption.

use super::model::Grade;

/// A default: the value as it would be written in a case file, and where it comes from.
#[derive(Debug, Clone, Copy)]
pub struct Def {
    pub text: &'static str,
    pub source: &'static str,
}

const fn d(text: &'static str, source: &'static str) -> Def {
    Def { text, source }
}

const RANGE: &str = "typical range for the grade class (handbook ranges, from memory)";
const PFEIFFER: &str =
    "Pfeiffer stack law, typical paper K1 0.1-10 kPa, K2 20-100 (Pfeiffer 1966/1981, from memory)";
const HYGRO: &str = "paper hygroexpansion MD 0.0003-0.0008 /%, CD 2-4x MD (from memory)";
const ZD: &str = "thickness hygroexpansion about 10x MD (order of magnitude, from memory)";
const GAB: &str = "paper-like GAB constants Mm 4.5-6.5 %, C 5-20, K 0.70-0.80 (from memory)";
const DIFF_IP: &str =
    "effective in-plane stack diffusivity of order 1e-10 to 1e-9 m2/s (from memory; fit to data)";
const DIFF_R: &str =
    "exchange across many contacting layers is far slower than along them (order of magnitude, from memory)";
const FRICTION: &str = "web-on-web friction 0.3-0.6 for paper (from memory)";
const NU: &str = "small Poisson coupling as used in wound-roll models (from memory)";
const CREEP: &str =
    "paper compliance grows ~5-15 % per decade of time at 50 % RH (Coffin 2005 review, from memory); Burgers fit, assumption";
const CREEP_R: &str =
    "radial creep relative to the stack's tangent compliance; set so a roll loses of order a third of its interlayer pressure in a month (assumption; fit to data)";
const ARRH: &str = "activation energy of paper creep of order 100 kJ/mol (from memory)";
const MSHIFT: &str =
    "time-moisture shift log a_M = -c (MC - MC_ref) (common practice; value assumed)";
const MSORP: &str =
    "mechano-sorptive creep exceeds creep at the highest RH of a cycle (Byrd 1972; from memory); value assumed";

const TENSILE: &str = "MD tensile strength (tension per width over caliper): newsprint 30-50 MPa, board 40-70 MPa (from memory); the middle of the range";
const SCT: &str = "MD short-span compressive strength about a third to a half of the MD tensile strength for paper (SCT, from memory)";
const CRUSH: &str = "interlayer pressure at which the stack takes permanent caliper loss: an order of magnitude only (calendering compacts paper at tens of MPa in a nip lasting milliseconds; wound rolls stay below a few MPa; bulky board crushes first; from memory); give material.strength.zd_crush when known";

const ROUGH: &str = "Parker Print-Surf roughness (ISO 8791-4) of one face: newsprint 3-5 um, coated 0.8-1.5 um, board 3-6 um, polyolefin film well under 0.5 um (typical values, from memory)";

/// Grade defaults.
#[derive(Debug, Clone, Copy)]
pub struct GradeDefaults {
    pub caliper: Def,
    pub density: Def,
    pub md_modulus: Def,
    pub cd_modulus: Def,
    pub poisson: Def,
    pub k1: Def,
    pub k2: Def,
    pub friction: Def,
    pub hygro_md: Def,
    pub hygro_cd: Def,
    pub hygro_zd: Def,
    pub moisture: Def,
    pub diffusivity_inplane: Def,
    pub diffusivity_radial: Def,
    pub gab_m: Def,
    pub gab_c: Def,
    pub gab_k: Def,
    pub md_delayed: Def,
    pub md_retardation: Def,
    pub md_viscous: Def,
    pub r_delayed: Def,
    pub r_retardation: Def,
    pub r_viscous: Def,
    pub activation: Def,
    pub moisture_shift: Def,
    pub mechanosorptive: Def,
    /// MD tensile strength, MD compressive strength, ZD crush pressure.
    pub md_tensile: Def,
    pub md_compressive: Def,
    pub zd_crush: Def,
    /// Surface roughness of one face (air escapes through it at winding).
    pub roughness: Def,
}

const PAPER_CREEP: (Def, Def, Def, Def, Def, Def) = (
    d("0.3", CREEP),
    d("2 d", CREEP),
    d("400 d", CREEP),
    d("0.05", CREEP_R),
    d("3 d", CREEP_R),
    d("2000 d", CREEP_R),
);

/// Paper-like defaults from the grade-specific values: caliper, density, MD and CD moduli,
/// Pfeiffer K1 and K2, MD and CD hygroexpansion, moisture and GAB monolayer, as written.
/// The strength values (MD tensile, MD compressive, ZD crush) are set per grade afterwards.
fn paper(v: [&'static str; 10]) -> GradeDefaults {
    let [caliper, density, emd, ecd, k1, k2, hmd, hcd, mc, gm] = v;
    let (md_d, md_r, md_v, r_d, r_r, r_v) = PAPER_CREEP;
    GradeDefaults {
        caliper: d(caliper, RANGE),
        density: d(density, RANGE),
        md_modulus: d(emd, RANGE),
        cd_modulus: d(ecd, RANGE),
        poisson: d("0.01", NU),
        k1: d(k1, PFEIFFER),
        k2: d(k2, PFEIFFER),
        friction: d("0.45", FRICTION),
        hygro_md: d(hmd, HYGRO),
        hygro_cd: d(hcd, HYGRO),
        hygro_zd: d("0.005 /%", ZD),
        moisture: d(mc, RANGE),
        diffusivity_inplane: d("5e-10 m2/s", DIFF_IP),
        diffusivity_radial: d("2e-11 m2/s", DIFF_R),
        gab_m: d(gm, GAB),
        gab_c: d("10", GAB),
        gab_k: d("0.75", GAB),
        md_delayed: md_d,
        md_retardation: md_r,
        md_viscous: md_v,
        r_delayed: r_d,
        r_retardation: r_r,
        r_viscous: r_v,
        activation: d("100 kJ/mol", ARRH),
        moisture_shift: d("0.15", MSHIFT),
        mechanosorptive: d("0.5", MSORP),
        md_tensile: d("40 MPa", TENSILE),
        md_compressive: d("12 MPa", SCT),
        zd_crush: d("10 MPa", CRUSH),
        roughness: d("4 um", ROUGH),
    }
}

/// A grade's strength defaults: MD tensile, MD compressive and ZD crush, as written.
fn with_strength(mut g: GradeDefaults, v: [&'static str; 3]) -> GradeDefaults {
    g.md_tensile = d(v[0], TENSILE);
    g.md_compressive = d(v[1], SCT);
    g.zd_crush = d(v[2], CRUSH);
    g
}

/// Polymer film: the paper form with film values and sources.
fn film() -> GradeDefaults {
    let mut f = paper([
        "25 um",
        "910 kg/m3",
        "2.5 GPa",
        "2.5 GPa",
        "2 kPa",
        "150",
        "0 /%",
        "0 /%",
        "0.1 %",
        "0.05 %",
    ]);
    let polymer = "polyolefin-like film, typical handbook values (from memory)";
    for x in [
        &mut f.caliper,
        &mut f.density,
        &mut f.md_modulus,
        &mut f.cd_modulus,
        &mut f.hygro_md,
        &mut f.hygro_cd,
        &mut f.moisture,
        &mut f.gab_m,
    ] {
        x.source = polymer;
    }
    f.hygro_zd = d("0 /%", polymer);
    f.friction = d("0.3", "film-on-film friction 0.2-0.5 (from memory)");
    // a polyolefin film creeps more than paper at room temperature and does not respond to
    // moisture: no moisture shift, no mechano-sorptive creep
    let fc = "polyolefin film at room temperature: compliance rises about 10-20 % per decade of time (Findley, Lai and Onaran 1976 give polymer creep of this order; from memory); Burgers fit, assumption";
    f.md_delayed = d("0.5", fc);
    f.md_retardation = d("1 d", fc);
    f.md_viscous = d("200 d", fc);
    let fr = "film stack: entrained air and surface roughness carry the radial load; creep relative to the stack compliance (assumption)";
    f.r_delayed = d("0.05", fr);
    f.r_retardation = d("1 d", fr);
    f.r_viscous = d("2000 d", fr);
    f.activation = d(
        "80 kJ/mol",
        "polypropylene creep activation energy of order 80 kJ/mol (from memory)",
    );
    f.moisture_shift = d(
        "0",
        "a polyolefin does not take up water: no moisture shift",
    );
    f.mechanosorptive = d(
        "0",
        "no sorption, so no mechano-sorptive creep (polyolefin film)",
    );
    f.md_tensile = d(
        "120 MPa",
        "oriented polypropylene film MD tensile strength 100-200 MPa (handbook range, from memory)",
    );
    f.md_compressive = d(
        "30 MPa",
        "polypropylene compressive yield of order 30-40 MPa (from memory)",
    );
    f.zd_crush = d(
        "20 MPa",
        "a polyolefin film stack deforms permanently near the polymer's yield stress, 20-40 MPa (from memory)",
    );
    f.roughness = d("0.2 um", ROUGH);
    f
}

impl GradeDefaults {
    /// The same defaults with another surface roughness, as written.
    fn with_roughness(mut self, text: &'static str) -> Self {
        self.roughness = d(text, ROUGH);
        self
    }
}

/// Defaults for a grade class. `Custom` returns `None`: every field must be given.
pub fn for_grade(g: Grade) -> Option<GradeDefaults> {
    Some(match g {
        Grade::Newsprint => with_strength(
            paper([
                "72 um",
                "620 kg/m3",
                "5.5 GPa",
                "2.0 GPa",
                "1 kPa",
                "50",
                "0.0005 /%",
                "0.0015 /%",
                "8 %",
                "5.5 %",
            ]),
            ["40 MPa", "12 MPa", "10 MPa"],
        ),
        Grade::Coated => with_strength(
            paper([
                "95 um",
                "780 kg/m3",
                "6.5 GPa",
                "3.0 GPa",
                "2 kPa",
                "70",
                "0.0004 /%",
                "0.0012 /%",
                "5.5 %",
                "4.8 %",
            ]),
            ["40 MPa", "15 MPa", "12 MPa"],
        )
        .with_roughness("1.2 um"),
        Grade::Board => with_strength(
            paper([
                "350 um",
                "700 kg/m3",
                "7.5 GPa",
                "3.2 GPa",
                "5 kPa",
                "35",
                "0.0004 /%",
                "0.0012 /%",
                "7 %",
                "5.5 %",
            ]),
            ["55 MPa", "18 MPa", "3 MPa"],
        )
        .with_roughness("4.5 um"),
        Grade::Film => film(),
        Grade::Custom => return None,
    })
}

/// Default surface mass-transfer coefficients of the wraps (order of magnitude, assumption):
/// bare surface close to an open face, paper wrap a moderate resistance, film close to sealed.
pub const WRAP_NONE: Def = d(
    "1e-6 m/s",
    "bare face: exchange limited by the stack itself (assumption, order of magnitude)",
);
/// Paper wrap default.
pub const WRAP_PAPER: Def = d(
    "2e-8 m/s",
    "paper wrap slows exchange markedly (assumption, order of magnitude)",
);
/// Film wrap default.
pub const WRAP_FILM: Def = d(
    "2e-11 m/s",
    "a barrier wrap is close to no-flux (common practice)",
);
/// Hardness repeatability default.
pub const HARDNESS_REPEAT: Def = d(
    "1.5",
    "rebound-type roll hardness readings repeat within 1-2 scale units (common practice)",
);
/// Caliper repeatability default (one sigma of a profile reading).
pub const CALIPER_REPEAT: Def = d(
    "0.5 um",
    "a caliper profile value is an average of several readings of a paper caliper gauge (dead-weight micrometer to ISO 534, read to 1 um; or a scanner averaged over a slice) and repeats to about 0.5 um, 0.5-1 % of a 50-100 um sheet (common practice)",
);
/// Default core when the case gives none.
pub const CORE: (Def, Def, Def) = (
    d(
        "3 GPa",
        "spiral paper core, effective modulus of order GPa (from memory)",
    ),
    d("13 mm", "common paper core wall (common practice)"),
    d("0.3", "isotropic tube (assumption)"),
);
/// Default core Poisson ratio when a tube core gives modulus and wall but no `poisson`.
pub const CORE_POISSON: Def = CORE.2;
/// Largest default core wall, as a fraction of the core radius: a thick default wall on a small
/// core is limited to this (assumption).
pub const CORE_WALL_MAX_FRACTION: f64 = 0.4;
/// Source line of a default core wall limited by [`CORE_WALL_MAX_FRACTION`].
pub const CORE_WALL_CLIPPED: &str =
    "common paper core wall 13 mm (common practice), limited to 40 % of the core radius (assumption)";
/// Lab creep test temperature when a test gives none: the paper-testing standard atmosphere.
pub const LAB_TEMPERATURE: Def = d(
    "23 C",
    "standard atmosphere for paper testing, 23 C (TAPPI T 402 / ISO 187)",
);
/// Lab creep test humidity when a test gives none: the paper-testing standard atmosphere.
pub const LAB_RH: Def = d(
    "50 %",
    "standard atmosphere for paper testing, 50 % RH (TAPPI T 402 / ISO 187)",
);
/// Name of the hardness scale when the case gives none.
pub const HARDNESS_SCALE: Def = d(
    "hardness units",
    "no scale named: readings are taken in the gauge's own units",
);
/// Slope of hardness against ln(pressure) when the case gives no calibration, scale units per
/// e-fold of pressure: rebound readings rise about 10-15 points from a soft to a hard newsprint
/// roll whose pressures differ about threefold (common practice). The ageing model applies it as
/// `storage::DEFAULT_HARDNESS_SLOPE`; a test keeps the two equal.
pub const HARDNESS_SLOPE: Def = d(
    "12",
    "no calibration: slope per e-fold of pressure, offset matched to the readings (common practice)",
);
/// Wrap of a storage stretch that names none.
pub const WRAP: Def = d("none", "no wrap named: bare surface assumed");
/// Stance of a storage stretch that names none.
pub const STANCE: Def = d("on_end", "no stance named: stored on end assumed");

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    #[test]
    fn hardness_slope_default_is_the_one_the_ageing_model_uses() {
        let v: f64 = HARDNESS_SLOPE.text.parse().unwrap();
        assert_relative_eq!(v, crate::storage::DEFAULT_HARDNESS_SLOPE);
    }
}
