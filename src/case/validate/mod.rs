//! Validation of the raw schema into the all-SI [`Case`](super::Case), one file per section.
//!
//! Validation collects every problem it finds instead of stopping at the first, and each problem
//! names the file, the line (where known), the field path and the fix. Every default used is
//! recorded with its source.

mod case;
mod checks;
mod hardness;
mod lab_creep;
mod lanes;
mod material;
mod physical;
mod profiles;
mod roll;
mod storage;
mod winding;

pub(super) use checks::{LineSource, Validator};
pub use lanes::MAX_LANE_COUNT;
pub use physical::MAX_WEB_STRAIN;
