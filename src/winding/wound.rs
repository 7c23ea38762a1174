//! The wound-in state a winding gives out: per lane the stresses at the output nodes and their
//! summary, and for the roll the build, the compressed caliper and the levelling.

use super::secant::Secant;
use serde::Serialize;

/// Summary of one lane's wound-in state.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct LaneSummary {
    /// Peak interlayer pressure, Pa.
    pub peak_pressure_pa: f64,
    /// Radius of the peak, m.
    pub peak_pressure_radius_m: f64,
    /// Interlayer pressure on the core, Pa.
    pub core_pressure_pa: f64,
    /// Mean interlayer pressure over the outer 25 mm (the zone a hardness reading senses), Pa.
    pub surface_zone_pressure_pa: f64,
    /// Smallest and largest tangential stress, Pa.
    pub tangential_min_pa: f64,
    pub tangential_max_pa: f64,
    /// Radii between which the tangential stress is compressive (starring / crepe risk), m.
    pub compressive_from_m: Option<f64>,
    pub compressive_to_m: Option<f64>,
    /// Mean wound-in tension over the build, N/m.
    pub wound_in_tension_mean_n_per_m: f64,
    /// Compressed outer radius at the end of winding, m.
    pub outer_radius_m: f64,
    /// Mean interlayer pressure over the outer 25 mm while still spinning at the final speed
    /// (wound-in minus rotating-disk radial stress), Pa; negative: the outer wraps lift off.
    pub running_surface_zone_pressure_pa: f64,
}

/// One lane's wound-in stresses.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct LaneStress {
    /// Lane centre, m from the front edge.
    pub position_m: f64,
    /// Lane caliper, m.
    pub caliper_m: f64,
    /// Radial stress at each output radius ([`Wound::radius_m`]), Pa (compression negative).
    pub radial_stress_pa: Vec<f64>,
    /// Tangential stress, Pa (compression negative).
    pub tangential_stress_pa: Vec<f64>,
    /// Wound-in tension each node was wound with, N/m.
    pub wound_in_tension_n_per_m: Vec<f64>,
    /// The lane's share of the nip line load at the end of the build, N/m (the width-weighted
    /// mean over lanes is the nip load).
    pub nip_load_n_per_m: f64,
    /// The lane's outer radius at that last contact update, m.
    pub nip_contact_radius_m: f64,
    pub summary: LaneSummary,
}

/// Wound-in state of the roll.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Wound {
    /// Shared nominal radii of the output nodes, m: the grid's nodes ([`Self::grid_nodes`]), and
    /// in the outer grid steps, the sub-nodes of the accretion's refined zone
    /// ([`super::hakiel::LaneState::finish`]), so the outer wraps are resolved on any grid.
    pub radius_m: Vec<f64>,
    pub lanes: Vec<LaneStress>,
    /// Number of layers wound (mean lane).
    pub layers: f64,
    /// Mean layers per grid step (the output nodes are denser in the outer grid steps).
    pub layers_per_node: f64,
    /// Nodes of the grid the roll was wound on (`Options::nodes` on a geometric grid, at least
    /// that on a graded one); [`Self::radius_m`] has these and the refined zone's sub-nodes.
    pub grid_nodes: usize,
    /// Compressed mean layer thickness, m: tangential stresses are wound-in tension over this.
    pub layer_thickness_m: f64,
    /// Mean compressive strain of the wound stack: the stated diameter holds this many more
    /// layers than the uncompressed caliper would suggest.
    pub stack_compression: f64,
    /// Surface speed at which a layer wound at the winder's least stress over the build (web
    /// tension and nip
    /// part over the caliper, before spin and entrained air take theirs) would stop pressing on
    /// the roll, m/s.
    pub lift_off_speed_m_s: f64,
    /// Uniform CD levelling fraction used on top of the shear lag.
    pub levelling: f64,
    /// Shear-lag length of CD levelling at the end of the build, m (infinite: fully levelled;
    /// written as null in JSON).
    pub shear_lag_m: f64,
    /// Core stiffness used, Pa (`None`: rigid).
    pub core_stiffness_pa: Option<f64>,
    /// Where the secant for the compressed caliper ended (or the caliper given,
    /// [`super::Caliper::Given`]): a start for a like roll ([`super::wind_from`]). Not an output.
    #[serde(skip)]
    pub secant: Secant,
}

impl Wound {
    /// Interlayer pressure in the outer wraps' zone, the mean over the width, Pa: each lane's
    /// [`LaneSummary::surface_zone_pressure_pa`] weighted by its width (`widths_m`, m, one per
    /// lane, as the lanes the roll was wound on give them), so a 25 mm edge strip counts for
    /// its 25 mm whatever the lane count. 0 without lanes.
    pub fn mean_surface_pressure_pa(&self, widths_m: &[f64]) -> f64 {
        let p: Vec<f64> = self
            .lanes
            .iter()
            .map(|l| l.summary.surface_zone_pressure_pa)
            .collect();
        crate::numeric::weighted_mean(&p, widths_m)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn lane(p: f64) -> LaneStress {
        let summary = LaneSummary {
            peak_pressure_pa: p,
            peak_pressure_radius_m: 0.1,
            core_pressure_pa: p,
            surface_zone_pressure_pa: p,
            tangential_min_pa: 0.0,
            tangential_max_pa: 0.0,
            compressive_from_m: None,
            compressive_to_m: None,
            wound_in_tension_mean_n_per_m: 0.0,
            outer_radius_m: 0.5,
            running_surface_zone_pressure_pa: p,
        };
        LaneStress {
            position_m: 0.0,
            caliper_m: 1e-4,
            radial_stress_pa: Vec::new(),
            tangential_stress_pa: Vec::new(),
            wound_in_tension_n_per_m: Vec::new(),
            nip_load_n_per_m: 0.0,
            nip_contact_radius_m: 0.5,
            summary,
        }
    }

    /// Hand computation: a 25 mm edge strip at 10 kPa beside a 200 mm lane at 28 kPa: over the
    /// width (0.25 + 5.6) / 0.225 kN/m = 26 kPa; the plain mean of the two lanes would be 19 kPa.
    #[test]
    fn mean_surface_pressure_is_the_mean_over_the_width() {
        let w = Wound {
            radius_m: vec![0.1, 0.5],
            lanes: vec![lane(10e3), lane(28e3)],
            layers: 1.0,
            layers_per_node: 1.0,
            grid_nodes: 2,
            layer_thickness_m: 1e-4,
            stack_compression: 0.0,
            lift_off_speed_m_s: 0.0,
            levelling: 0.5,
            shear_lag_m: 1.0,
            core_stiffness_pa: None,
            secant: Secant::default(),
        };
        let p = w.mean_surface_pressure_pa(&[0.025, 0.2]);
        assert!((p - 26e3).abs() < 1e-6, "{p}");
    }
}
