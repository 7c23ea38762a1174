//! Notes: what a stage noticed that the reader should know (an extrapolated lane, an assumption
//! the data forced). Stages return these as data; `report::words` turns them into sentences.
//!
//! **Invariant:** no prose here; times in s, positions in m, moduli in Pa.

use crate::case::Measure;
use serde::Serialize;

/// Something a stage noticed, with the numbers behind it.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
#[serde(tag = "note", rename_all = "snake_case")]
pub enum Note {
    /// A profile does not reach every lane: lanes outside `from_m..to_m` were extrapolated.
    Extrapolated {
        what: Measure,
        /// Age of the profile, s.
        age_s: f64,
        /// Positions covered by the profile, m from the front edge.
        from_m: f64,
        to_m: f64,
    },
    /// A dense profile and no `lanes:` given: neighbouring positions were merged into fewer lanes.
    LanesMerged {
        what: Measure,
        /// Positions in the profile.
        positions: usize,
        /// Lanes made.
        lanes: usize,
    },
    /// No caliper profile: lane calipers were inferred from the earliest diameter profile.
    CaliperFromDiameter,
    /// Lab creep curves set a direction's Burgers parameters.
    LabCreep {
        /// `md` or `radial`.
        direction: &'static str,
        curves: usize,
        delayed: f64,
        /// Retardation time, s.
        retardation_s: f64,
        /// Viscous time, s.
        viscous_time_s: f64,
        /// Elastic modulus, Pa.
        modulus_pa: f64,
        converged: bool,
    },
    /// Every measurement is at one age: creep cannot be identified and stays at the prior.
    OneAge,
    /// A diameter profile has no winding-time diameter to compare with and is not fitted.
    DiameterWithoutReference {
        /// Age of the profile, s.
        age_s: f64,
    },
    /// Measurements reach beyond the storage history, which was extended.
    StorageExtended {
        /// Age of the last measurement, s.
        last_age_s: f64,
        /// Duration the history covers, s.
        covered_s: f64,
        /// Duration added, s.
        added_s: f64,
        /// No history was given: the added time is at the standard atmosphere, unwrapped.
        standard: bool,
    },
}
