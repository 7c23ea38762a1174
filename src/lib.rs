//! rollsleuth: why a wound roll of paper, board or film unwinds with baggy lanes, puckers or
//! ridges, from cross-width profiles and storage history.
//!
//! Modules, in the order data flows:
//! - [`units`]: quantities with units to SI (the only place that knows pli, psi, mil);
//! - [`case`]: case files, defaults, validation into an all-SI [`case::Case`];
//! - [`lanes`]: cross-width profiles to lanes;
//! - [`defects`]: the defect vocabulary.

pub mod case;
pub mod cli;
pub mod defects;
pub mod diagnose;
pub mod fit;
pub mod interp;
pub mod lanes;
pub mod numeric;
pub mod report;
pub mod rules;
pub mod storage;
pub mod units;
pub mod winding;
