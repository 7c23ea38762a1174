//! The map from surface-zone pressure to a hardness reading. Storage applies a given map; how the
//! map is set from measurements is the fitting side's business ([`crate::fit`]).

use crate::case::Calibration;
use serde::Serialize;

/// Hardness as a function of the surface-zone pressure: H = a + b ln(P / pressure_ref).
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct HardnessMap {
    /// Scale units.
    #[serde(rename = "a_hardness_units")]
    pub a: f64,
    /// Scale units per e-fold of pressure.
    #[serde(rename = "b_hardness_units")]
    pub b: f64,
    /// Pa.
    pub pressure_ref_pa: f64,
    /// Where a and b came from.
    #[serde(skip)]
    pub source: &'static str,
}

/// Default slope of hardness against ln(pressure) when the case gives no calibration, scale
/// units per e-fold of pressure (assumption: rebound readings rise about 10-15 points from a soft
/// to a hard newsprint roll, whose pressures differ about threefold; common practice).
pub const DEFAULT_HARDNESS_SLOPE: f64 = 12.0;

/// Reference pressure of the default map, Pa.
pub const DEFAULT_PRESSURE_REF_PA: f64 = 1e3;

impl HardnessMap {
    /// Hardness (scale units) at surface-zone pressure `p` (Pa).
    pub fn hardness(&self, p: f64) -> f64 {
        self.a + self.b * (p.max(1.0) / self.pressure_ref_pa).ln()
    }

    /// A case's own calibration.
    pub fn calibrated(c: &Calibration) -> HardnessMap {
        HardnessMap {
            a: c.a,
            b: c.b,
            pressure_ref_pa: c.pressure_ref_pa,
            source: "case calibration",
        }
    }

    /// The default map: 60 units at 250 kPa with the default slope (assumption).
    pub fn default_map() -> HardnessMap {
        let b = DEFAULT_HARDNESS_SLOPE;
        let p_ref = DEFAULT_PRESSURE_REF_PA;
        HardnessMap {
            a: 60.0 - b * (250e3f64 / p_ref).ln(),
            b,
            pressure_ref_pa: p_ref,
            source: "default map: 60 units at 250 kPa (assumption)",
        }
    }

    /// The calibration when there is one, else the default map (no measurements consulted).
    pub fn given(c: Option<&Calibration>) -> HardnessMap {
        c.map_or_else(HardnessMap::default_map, HardnessMap::calibrated)
    }

    /// The default slope with the offset set so that mean log pressure `mean_ln_p` (ln Pa) gives
    /// hardness `mean_h`; `source` says where the match was made.
    pub fn matched(mean_h: f64, mean_ln_p: f64, source: &'static str) -> HardnessMap {
        let b = DEFAULT_HARDNESS_SLOPE;
        let p_ref = DEFAULT_PRESSURE_REF_PA;
        HardnessMap {
            a: mean_h - b * (mean_ln_p - p_ref.ln()),
            b,
            pressure_ref_pa: p_ref,
            source,
        }
    }
}
