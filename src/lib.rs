//! rollsleuth: why a wound roll of paper, board or film unwinds with baggy lanes, puckers or
//! ridges, from cross-width profiles and storage history.
//!
//! Modules, in the order data flows (see ARCHITECTURE.md):
//! - [`units`]: quantities with units to SI (the only place that knows pli, psi, mil);
//! - [`case`]: case files, defaults, validation into an all-SI [`case::Case`];
//! - [`lanes`]: cross-width profiles to lanes;
//! - [`winding`]: wound-in stresses per lane (Hakiel accretion, core, nip, speed, lane coupling);
//! - [`storage`]: creep, relaxation and moisture in the stored roll, per lane;
//! - [`limits`]: physical limits checked after each stage (warnings in every output);
//! - [`fit`]: creep fitted per lane to measured hardness and diameter (argmin);
//! - [`rules`]: rule tables, lint and evaluation;
//! - [`diagnose`]: features, findings, root-cause shares, corrections re-run;
//! - [`report`]: tables, JSON, the root-cause report (HTML with SVG plots, Markdown);
//! - [`cli`]: arguments and exit codes;
//! - [`vocab`]: features, corrections, defects, likelihoods and causes as enums;
//! - [`interp`], [`numeric`], [`pack`]: small shared kernels (and the numbers the storage
//!   kernel runs on, one run or several side by side).

pub mod case;
pub mod cli;
pub mod diagnose;
pub mod fit;
pub mod input;
pub mod interp;
pub mod lanes;
pub mod limits;
pub mod note;
pub mod numeric;
pub mod pack;
pub mod report;
pub mod rules;
pub mod stats;
pub mod storage;
pub mod units;
pub mod vocab;
pub mod winding;
