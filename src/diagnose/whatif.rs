//! What-if: the roll as measured against the same roll changed, both run forward with the creep
//! fitted on the measured case, carried to the variant's lanes by lane centre.

use super::actions::{self, spread_mm_per_m};
use super::{base_scenario, features, fitted, DiagnoseError, DiagnoseOptions, Fitted};
use crate::case::Case;
use crate::lanes::{self, Lanes};
use crate::rules::{self, Table};
use crate::storage::LaneCreep;
use crate::vocab::Defect;
use crate::winding::{Cache, Options};
use features::Features;
use serde::Serialize;

/// A what-if comparison: the case as measured and with changes applied, both run forward with the
/// creep fitted on the measured case (creep is a property of the paper, not of the change).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct WhatIf {
    pub case: String,
    pub changes: Vec<String>,
    pub spread_before_mm_per_m: f64,
    pub spread_after_mm_per_m: f64,
    /// Lane centres, m.
    pub position_m: Vec<f64>,
    /// Lane length at unwind over the mean lane, before and after, mm/m.
    pub excess_before_mm_per_m: Vec<f64>,
    pub excess_after_mm_per_m: Vec<f64>,
    /// Defects before: the measured roll's findings as `diagnose` gives them (screened against
    /// measurement noise and over the plausible states); after: the changed roll's findings
    /// under the same screen, run on the changed roll.
    pub defects_before: Vec<Defect>,
    pub defects_after: Vec<Defect>,
    /// Defects the rules give on the measured roll that its screen drops (within measurement
    /// noise, or holding in fewer than half of the plausible states; `diagnose` says which):
    /// not among `defects_before`.
    pub screened_out: Vec<Defect>,
    /// The same for the changed roll, under its own screen: not among `defects_after`.
    pub screened_out_after: Vec<Defect>,
    /// The changed roll's own case warnings, and the physical limits its winding or storage
    /// passed (in words in the views' `warnings`). Its wound diameters are not held against the
    /// measured roll's diameter profile: the change is what moves them.
    #[serde(skip)]
    pub case_warnings: Vec<String>,
    #[serde(skip)]
    pub notes: Vec<crate::note::Note>,
    /// The same for the roll as measured: its warnings as `diagnose` gives them (limits, and
    /// readings the model does not explain).
    #[serde(skip)]
    pub case_warnings_before: Vec<String>,
    #[serde(skip)]
    pub notes_before: Vec<crate::note::Note>,
    /// Whether the model explains the measured roll's surveys: the changed roll is run with the
    /// creep fitted to them.
    pub model_fit: crate::fit::ModelFit,
}

/// Compare a case with a variant of it. The variant's lanes are rebuilt from its own profiles
/// and layout; each of its lanes gets the measured case's fitted creep at its centre
/// ([`creep_at`]). A variant whose lanes lie elsewhere (another count or other centres) is
/// refused before the fit ([`DiagnoseError::LanesMoved`]): the comparison is lane by lane.
pub fn what_if(
    base: &Case,
    variant: &Case,
    changes: &[String],
    table: &Table,
    opt: &DiagnoseOptions,
) -> Result<WhatIf, DiagnoseError> {
    let (lb, la) = (lanes::build(base), lanes::build(variant));
    if lb.positions() != la.positions() {
        return Err(DiagnoseError::LanesMoved {
            before: lb.lanes.len(),
            after: la.lanes.len(),
        });
    }
    let f = fitted(base, opt)?;
    let fitted_at: Vec<(f64, LaneCreep)> = f
        .lanes
        .lanes
        .iter()
        .map(|l| l.position_m)
        .zip(f.creep.iter().copied())
        .collect();
    let mut winds = Cache::default();
    let carried =
        |c: &Case, l: &Lanes| creep_at(&fitted_at, &l.positions(), &LaneCreep::grade(&c.material));
    let mut run = |c: &Case, l: &Lanes| -> Result<actions::Outcome, DiagnoseError> {
        let s = base_scenario(c, l, carried(c, l), Options::default().levelling);
        if std::ptr::eq(c, base) {
            winds.insert(&s.wind_input(), l, s.wind_options(opt.nodes), &f.wound);
        }
        Ok(s.run_cached(opt.nodes, &mut winds)?)
    };
    let ob = run(base, &lb)?;
    let oa = run(variant, &la)?;
    let fb = features::compute(base, &lb, &ob);
    let fa = features::compute(variant, &la, &oa);
    let defects = |f: &Features| rule_defects(table, f);
    // the measured roll screened as `diagnose` screens it; a defect its screen drops is no
    // finding there, and the change is not judged on it
    let screen = DiagnoseOptions {
        what_if: false,
        ..*opt
    };
    let measured = super::diagnose_fitted(base, table, &screen, &f)?;
    let found: Vec<Defect> = measured.findings.iter().map(|x| x.defect).collect();
    let screened_out: Vec<Defect> = (defects(&fb).into_iter())
        .filter(|d| !found.contains(d))
        .collect();
    let creep = carried(variant, &la);
    let Screened {
        fitted: changed,
        found: after_found,
        dropped: screened_out_after,
        notes: own,
    } = screen_changed(
        (variant, table, &screen),
        (&f, la, &oa, creep),
        defects(&fa),
    )?;
    Ok(WhatIf {
        case: base.id.clone(),
        changes: changes.to_vec(),
        spread_before_mm_per_m: spread_mm_per_m(&ob.aged, &[]),
        spread_after_mm_per_m: spread_mm_per_m(&oa.aged, &[]),
        position_m: changed.lanes.positions(),
        excess_before_mm_per_m: fb.excess_mm_per_m.clone(),
        excess_after_mm_per_m: fa.excess_mm_per_m.clone(),
        defects_before: found,
        defects_after: after_found,
        screened_out,
        screened_out_after,
        case_warnings: variant.warnings.clone(),
        notes: changed_notes(&measured.notes, &own, &changed.fit.notes),
        case_warnings_before: base.warnings.clone(),
        notes_before: (measured.notes.into_iter())
            .filter(crate::note::Note::is_warning)
            .collect(),
        model_fit: measured.confidence.model_fit(),
    })
}

/// The defects the rules give on features `f`, in the table's order, each once.
fn rule_defects(table: &Table, f: &Features) -> Vec<Defect> {
    let mut d: Vec<Defect> = (rules::evaluate(table, &f.values).iter())
        .map(|x| x.rule.defect)
        .collect();
    d.dedup();
    d
}

/// The changed roll as its screen leaves it ([`screen_changed`]).
struct Screened {
    fitted: Fitted,
    found: Vec<Defect>,
    dropped: Vec<Defect>,
    notes: Vec<crate::note::Note>,
}

/// The changed roll screened as the measured roll is, as `diagnose --set` would screen it with
/// the measured roll's creep: its own noise rolls and its own plausible states (the fit's runs of
/// its draws belong to the measured roll, so they are dropped and the states run here). `raw`:
/// the defects the rules give on it. `measured`: the measured roll's fit, run on the changed
/// roll's `lanes`, outcome `o` and carried `creep`. Returns the changed roll so fitted, its
/// findings' defects, the defects its screen drops and its screen's notes.
fn screen_changed(
    (variant, table, screen): (&Case, &Table, &DiagnoseOptions),
    (measured, lanes, o, creep): (&Fitted, Lanes, &actions::Outcome, Vec<LaneCreep>),
    raw: Vec<Defect>,
) -> Result<Screened, DiagnoseError> {
    let mut fit = crate::fit::RollFit {
        aged: o.aged.clone(),
        ..measured.fit.clone()
    };
    for l in fit.lanes.iter_mut() {
        l.draw_runs = None;
    }
    // the changed roll's own limits (its warnings, [`changed_notes`]), so its screen qualifies
    // those it passes on noise
    fit.notes = own_limits(variant, &lanes, o);
    let changed = Fitted {
        lanes,
        wound: o.wound.clone(),
        fit,
        creep,
    };
    let after = super::diagnose_fitted(variant, table, screen, &changed)?;
    let found: Vec<Defect> = after.findings.iter().map(|x| x.defect).collect();
    let dropped = (raw.into_iter()).filter(|d| !found.contains(d)).collect();
    Ok(Screened {
        fitted: changed,
        found,
        dropped,
        notes: after.notes,
    })
}

/// The changed roll's warnings: its own `limits` (those its winding and storage passed, as
/// [`own_limits`] gives them), each that the measured roll passes only on caliper noise said to
/// rest on the same readings, and each that the changed roll's own screen (`own`) finds within
/// noise said so, as `diagnose` says it.
fn changed_notes(
    measured: &[crate::note::Note],
    own: &[crate::note::Note],
    limits: &[crate::note::Note],
) -> Vec<crate::note::Note> {
    let mut n = limits.to_vec();
    super::limit_noise::carry(measured, own, &mut n);
    n
}

/// The limits the changed roll's winding and storage pass: not its wound diameters against the
/// measured roll's profile (the change is what moves them).
fn own_limits(variant: &Case, lanes: &Lanes, o: &actions::Outcome) -> Vec<crate::note::Note> {
    (crate::fit::limit_notes(variant, lanes, &o.wound, &o.aged).into_iter())
        .filter(|n| !matches!(n, crate::note::Note::WindingDiameter(_)))
        .collect()
}

/// Fitted creep carried onto lanes at `positions` (m): each lane gets the fitted lanes' creep
/// interpolated by lane centre, flat beyond the outermost fitted lanes. The fitted scales
/// multiply the delayed compliance and the viscous rate (see [`crate::fit::scaled`]), so those
/// (and the retardation time) are interpolated in log. A lane at a fitted lane's centre keeps
/// that lane's creep exactly; with no fitted lanes every lane gets `grade`.
pub fn creep_at(
    fitted: &[(f64, LaneCreep)],
    positions: &[f64],
    grade: &LaneCreep,
) -> Vec<LaneCreep> {
    if fitted.is_empty() {
        return vec![*grade; positions.len()];
    }
    let log_interp = |x: f64, g: &dyn Fn(&LaneCreep) -> f64| {
        let pts: Vec<(f64, f64)> = fitted.iter().map(|(p, c)| (*p, g(c).ln())).collect();
        crate::interp::linear_flat(&pts, x).exp()
    };
    let burgers = |x: f64, b: &dyn Fn(&LaneCreep) -> crate::case::Burgers| crate::case::Burgers {
        delayed: log_interp(x, &|c| b(c).delayed),
        retardation_s: log_interp(x, &|c| b(c).retardation_s),
        viscous_time_s: log_interp(x, &|c| b(c).viscous_time_s.recip()).recip(),
    };
    positions
        .iter()
        .map(|&x| match fitted.iter().find(|(p, _)| *p == x) {
            Some((_, c)) => *c,
            None => LaneCreep {
                md: burgers(x, &|c| c.md),
                radial: burgers(x, &|c| c.radial),
            },
        })
        .collect()
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::case::Burgers;

    fn grade() -> LaneCreep {
        let b = Burgers {
            delayed: 0.3,
            retardation_s: 2.0 * crate::units::DAY_S,
            viscous_time_s: 200.0 * crate::units::DAY_S,
        };
        LaneCreep { md: b, radial: b }
    }

    fn at_scale(s: f64) -> LaneCreep {
        let g = grade();
        LaneCreep {
            md: crate::fit::scaled(&g.md, s),
            radial: crate::fit::scaled(&g.radial, 2.0 * s),
        }
    }

    /// A changed lane layout keeps each fitted creep where it was fitted: the high-creep lane at
    /// 0.5 m stays at 0.5 m when a lane is added in front of it (matching by index would move it
    /// to the lane at 0.3 m), beyond the outermost fitted lanes creep stays flat, and between two
    /// fitted lanes the scale is interpolated in log (halfway between 1 and 8 is sqrt 8).
    #[test]
    fn fitted_creep_follows_lane_positions_not_indices() {
        let g = grade();
        let fitted: Vec<(f64, LaneCreep)> = [(0.1, 1.0), (0.3, 1.0), (0.5, 8.0), (0.7, 1.0)]
            .iter()
            .map(|&(x, s)| (x, at_scale(s)))
            .collect();
        let same: Vec<f64> = fitted.iter().map(|f| f.0).collect();
        let kept = creep_at(&fitted, &same, &g);
        for (k, f) in kept.iter().zip(&fitted) {
            assert_eq!(*k, f.1);
        }
        let moved = creep_at(&fitted, &[0.02, 0.1, 0.3, 0.5, 0.7], &g);
        assert_eq!(moved[3], fitted[2].1, "the high-creep lane stays at 0.5 m");
        assert_eq!(moved[2], fitted[1].1);
        let scale = |c: &LaneCreep| c.md.delayed / g.md.delayed;
        assert!(
            (scale(&moved[0]) - 1.0).abs() < 1e-12,
            "flat beyond the front lane"
        );
        let mid = creep_at(&fitted, &[0.4], &g)[0];
        assert!((scale(&mid) - 8f64.sqrt()).abs() < 1e-9, "{}", scale(&mid));
        let viscous = g.md.viscous_time_s / mid.md.viscous_time_s;
        assert!((viscous - 8f64.sqrt()).abs() < 1e-9, "{viscous}");
        let radial = mid.radial.delayed / g.radial.delayed;
        assert!((radial - 2.0 * 8f64.sqrt()).abs() < 1e-9, "{radial}");
        assert_eq!(creep_at(&[], &[0.1, 0.2], &g), vec![g, g]);
    }
}
