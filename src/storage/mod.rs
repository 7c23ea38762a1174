//! Storage: creep, stress relaxation and moisture change in the stored roll, per lane.
//!
//! **Invariant:** pure functions of the case, lanes and wound-in state; no I/O, no printing,
//! nothing of rules.

mod ageing;
mod creep;
pub mod moisture;
mod shift;
mod sorption;

pub use ageing::{
    age, age_lane, age_lane_with, drive, moisture as moisture_history, prepare, timeline, AgeError,
    AgeOptions, Aged, HardnessMap, LaneAged, LaneCreep, LaneDrive, MoistureHistory, Prepared,
    Timeline, DEFAULT_HARDNESS_SLOPE, FLOOR_CONTACT,
};
pub use ageing::{initial_stress as initial_stress_of, zone_pressure};
pub use creep::{creep_compliance, relaxation_modulus, step_coefficients, step_update, CreepState};
pub use shift::{arrhenius_shift, moisture_shift, GAS_R, T_REF_K};
pub use sorption::gab_moisture;
