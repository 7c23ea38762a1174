//! Physical consistency across sections, checked at load: the web must be able to carry the
//! winding tension, and the nip must not dwarf it. A violation is a problem (exit 2) naming the
//! field and a fix.

use super::super::model::{Material, Tension, Winding};
use super::super::raw::RawCase;
use super::checks::{line_of, Validator};

/// Largest MD strain a web may be wound at (dimensionless, 1 %): paper and board break at about
/// 1-3 % MD strain and films yield near a few percent, so a wound-in strain above 1 % means a
/// unit slip or a wrong modulus (common practice).
pub const MAX_WEB_STRAIN: f64 = 0.01;

/// Largest ratio of friction x nip load to web tension accepted (dimensionless). Nip-induced
/// tension is measured at up to a few times the web tension (Good, Wu and Fikes 1994); a ratio
/// over 20 is taken as a unit slip.
pub(in crate::case) const MAX_NIP_RATIO: f64 = 20.0;

impl Validator {
    /// Web stress T / caliper below the MD modulus x [`MAX_WEB_STRAIN`]; nip against tension.
    pub(super) fn physical(
        &mut self,
        raw: &RawCase,
        material: Option<&Material>,
        winding: Option<&Winding>,
    ) {
        let (Some(m), Some(w)) = (material, winding) else {
            return;
        };
        let t_max = match &w.tension {
            Tension::Constant { tension_n_per_m } => *tension_n_per_m,
            Tension::Taper { points } => points.iter().map(|p| p.1).fold(0.0, f64::max),
        };
        let carry = m.md_modulus_pa * MAX_WEB_STRAIN * m.caliper_m;
        let (field, line) = match (&raw.winding.tension, &raw.winding.taper) {
            (Some(q), _) => ("winding.tension", Some(line_of(q))),
            _ => ("winding.taper", None),
        };
        if !matches!(
            t_max.partial_cmp(&carry),
            Some(std::cmp::Ordering::Less | std::cmp::Ordering::Equal)
        ) {
            self.push_across(
                field,
                &["material.md_modulus", "material.caliper", "material.grade"],
                line,
                format!(
                    "a web tension of {t_max:.0} N/m strains this web by {:.2} % (MD modulus x caliper = {:.0} N/m per unit strain), above the {} % a web can be wound at; check the tension's unit (e.g. \"2 pli\", \"350 N/m\"), material.md_modulus and material.caliper",
                    100.0 * t_max / (m.md_modulus_pa * m.caliper_m),
                    m.md_modulus_pa * m.caliper_m,
                    100.0 * MAX_WEB_STRAIN
                ),
            );
        }
        let t_min = match &w.tension {
            Tension::Constant { tension_n_per_m } => *tension_n_per_m,
            Tension::Taper { points } => points.iter().map(|p| p.1).fold(f64::INFINITY, f64::min),
        };
        let nip_part = m.friction * w.nip_n_per_m;
        if nip_part > MAX_NIP_RATIO * t_min.max(1.0) {
            self.push_across(
                "winding.nip",
                &[
                    "winding.tension",
                    "winding.taper",
                    "material.friction",
                    "material.grade",
                ],
                raw.winding.nip.as_ref().map(line_of),
                format!(
                    "friction x nip load ({nip_part:.0} N/m) is over {MAX_NIP_RATIO} times the lowest web tension ({t_min:.0} N/m); check the nip's unit (a line load, e.g. \"20 kN/m\" or \"100 pli\")"
                ),
            );
        }
    }
}
