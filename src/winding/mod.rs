//! Wound-in stresses per lane: Hakiel's nonlinear accretion model with a compliant core,
//! nip-induced wound-in tension (Good, Wu and Fikes 1994), centrifugal stresses of the spinning
//! roll (Timoshenko and Goodier) and lanes coupled through the shared web.
//!
//! **Invariant:** pure functions of the material, roll, winder settings and lanes; no I/O, no
//! printing, nothing of rules.

pub mod air;
mod cache;
mod centrifugal;
mod core;
pub mod coupling;
mod element;
mod grid;
pub mod hakiel;
mod roll;
mod secant;
mod strain;
mod substeps;
mod summary;
mod uniform;
mod wound;

pub use self::core::{
    collapse_pressure, core_load_width, core_stiffness, of as core_of, ring_collapse_pressure,
    ring_load_length,
};
pub use cache::Cache;
pub use centrifugal::{disk_stress, lift_off_speed};
pub use grid::{graded_grid, grid, Spacing};
pub use roll::{
    lane_model, wind, wind_caliper, wind_from, Caliper, LaneStress, LaneSummary, Options, Secant,
    WindError, WindInput, Wound, DEFAULT_LEVELLING, DEFAULT_NODES, SURFACE_ZONE_M,
};
