//! Case files: schema, grade defaults, loading and validation into an all-SI [`Case`].
//!
//! **Invariant:** after this module every value is SI (moisture in percentage points, humidity as
//! a fraction); only [`crate::units`] knows pli, psi or mil.

pub mod defaults;
mod load;
pub mod model;
pub mod raw;

pub use load::{
    apply_set, load_demo, load_file, load_str, CaseError, Problem, DEMO_NAME, DEMO_YAML,
};
pub use model::*;
