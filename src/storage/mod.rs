//! Storage: creep, stress relaxation and moisture change in the stored roll, per lane.
//!
//! **Invariant:** pure functions of the material, roll, storage history, lanes and wound-in
//! state; no I/O, no printing, nothing of rules. Storage never reads measurements.

mod across;
mod ageing;
mod cells;
pub mod condensation;
mod creep;
mod drive;
mod hardness;
pub mod moisture;
pub mod out_of_round;
mod record;
mod shift;
mod sorption;
mod timeline;

pub use across::{age_prepared_across, RollStore};
pub use ageing::{
    age, age_lane_pack, age_lane_with, age_prepared, prepare, track_lane_pack, AgeError,
    AgeOptions, Aged, FinalStress, LaneAged, LaneCreep, LaneRun, Prepared,
};
pub use ageing::{initial_stress as initial_stress_of, zone_pressure};
pub use creep::{creep_compliance, relaxation_modulus, step_coefficients, step_update, CreepState};
pub use drive::{drive, LaneDrive};
pub use hardness::{HardnessMap, DEFAULT_HARDNESS_SLOPE, DEFAULT_PRESSURE_REF_PA};
pub use record::{FullRecord, FullRecords, Recorder, Snapshot, Track};
pub use shift::{arrhenius_shift, moisture_shift, GAS_R, T_REF_K};
pub use sorption::gab_moisture;
pub use timeline::{
    moisture as moisture_history, storage_extended, timeline, MoistureHistory, Step, StoreInput,
    Timeline, FLOOR_CONTACT, STANDARD_TEMPERATURE_K,
};
