//! Case files: schema, grade defaults, loading and validation into an all-SI [`Case`].
//!
//! **Invariant:** after this module every value is SI (moisture in percentage points, humidity as
//! a fraction); only [`crate::units`] knows pli, psi or mil.

mod csv;
pub mod defaults;
mod errors;
mod lines;
pub mod model;
mod overrides;
pub mod raw;
mod read;
mod validate;

pub use csv::profile_rows;
pub use errors::{CaseError, Problem};
pub use model::*;
pub use overrides::apply_set;
pub use read::{load_demo, load_file, load_str, DEMO_NAME, DEMO_YAML};
pub use validate::{MAX_LANE_COUNT, MAX_WEB_STRAIN};
