//! What the root-cause report shows, gathered in SI from the case, the fitted roll and the
//! diagnosis: surveys measured against predicted, stress curves of the lanes that matter,
//! moisture across the width at a few dates.
//!
//! **Invariant:** numbers only (SI); words and units are added by `html`, `markdown` and `plots`.

use crate::case::{Case, Measure};
use crate::diagnose::{Diagnosis, Fitted};
use crate::units::System;
use crate::vocab::{Defect, Feature};

/// The rule table a diagnosis used.
#[derive(Debug, Clone, PartialEq)]
pub struct RulesInfo {
    /// File name, or the default table's name.
    pub source: String,
    /// FNV-1a 64-bit fingerprint of the table's text ([`super::files::fingerprint`]).
    pub fingerprint: String,
    /// Number of rules.
    pub rules: usize,
}

/// Everything the report is made from.
pub struct ReportData<'a> {
    pub case: &'a Case,
    pub fitted: &'a Fitted,
    pub diagnosis: &'a Diagnosis,
    pub rules: RulesInfo,
    /// Analysis date, `YYYY-MM-DD`, if given.
    pub date: Option<String>,
    pub sys: System,
}

/// One survey (a hardness or diameter profile at one age) against the model.
#[derive(Debug, Clone, PartialEq)]
pub struct Survey {
    pub what: Measure,
    /// Roll age at the survey, s.
    pub age_s: f64,
    /// Lane centre (m), measured value interpolated to it, the model's value. Hardness in scale
    /// units; diameter as the change since the winding-time survey, m.
    pub points: Vec<(f64, f64, f64)>,
    /// The model's 5 % and 95 % over the posterior draws at each point (same units).
    pub band: Vec<(f64, f64)>,
    /// One-sigma repeatability, same units as the values.
    pub sigma: f64,
}

/// Stress through the radius of one lane (or the mean lane).
#[derive(Debug, Clone, PartialEq)]
pub struct StressLane {
    /// Lane index, `None` for the width-weighted mean lane.
    pub lane: Option<usize>,
    /// Lane centre, m (mean lane: the roll's centre).
    pub position_m: f64,
    /// Wound-in: radius (m), interlayer pressure (Pa, compression positive), MD stress (Pa).
    pub wound: Vec<(f64, f64, f64)>,
    /// The same at the end of storage (at unwind).
    pub aged: Vec<(f64, f64, f64)>,
}

/// Lane-mean moisture across the width at one time.
#[derive(Debug, Clone, PartialEq)]
pub struct MoistureLine {
    /// Roll age, s.
    pub age_s: f64,
    /// Index of the storage stretch that ends here (`None` for the start).
    pub stretch_end: Option<usize>,
    /// Lane centre (m) and moisture (%).
    pub points: Vec<(f64, f64)>,
}

impl ReportData<'_> {
    /// Times of the storage model's steps, s.
    pub fn times_s(&self) -> Vec<f64> {
        self.fitted.fit.aged.times_s.clone()
    }

    /// The web's running strain at the converter's tension, mm/m, if computed.
    pub fn running_strain_mm_per_m(&self) -> Option<f64> {
        Some(self.diagnosis.features.get(Feature::RunningStrainMmPerM)).filter(|v| v.is_finite())
    }

    /// Whether each lane's profile values were extrapolated.
    pub fn extrapolated(&self) -> Vec<bool> {
        self.fitted
            .lanes
            .lanes
            .iter()
            .map(|l| l.extrapolated)
            .collect()
    }

    /// Lane edges (left, right), m.
    pub fn lane_edges(&self) -> Vec<(f64, f64)> {
        self.fitted
            .lanes
            .lanes
            .iter()
            .map(|l| (l.left_m, l.right_m))
            .collect()
    }

    /// Where the complaint is on the width: the lanes of the finding that matches it, else the
    /// region its defect names (edges: outer 15 % each side; centre: middle half), as
    /// (left, right) in m.
    pub fn complaint_region(&self) -> Vec<(f64, f64)> {
        let d = self.diagnosis;
        let w = self.case.roll.width_m;
        let Some(a) = &d.agreement else {
            return Vec::new();
        };
        let edges = self.lane_edges();
        if let Some(f) = a.rank.and_then(|r| d.findings.get(r - 1)) {
            let v: Vec<(f64, f64)> = f
                .lanes
                .iter()
                .filter_map(|l| edges.get(l.index).copied())
                .collect();
            if !v.is_empty() {
                return v;
            }
        }
        match a.complaint {
            Defect::BaggyEdges => vec![(0.0, 0.15 * w), (0.85 * w, w)],
            Defect::BaggyCenter => vec![(0.25 * w, 0.75 * w)],
            _ => Vec::new(),
        }
    }

    /// Every hardness and diameter survey, measured (at lane centres) against predicted, in the
    /// order of the case's profiles' ages.
    pub fn surveys(&self) -> Vec<Survey> {
        let fit = &self.fitted.fit;
        let mut out: Vec<Survey> = Vec::new();
        for (lf, lane) in fit.lanes.iter().zip(&self.fitted.lanes.lanes) {
            for r in &lf.residuals {
                let age_s = r.age_s;
                let sigma = match r.what {
                    Measure::Diameter => fit.noise.diameter_m,
                    _ => fit.noise.hardness,
                };
                let k = match out
                    .iter()
                    .position(|s| s.what == r.what && (s.age_s - age_s).abs() < 1.0)
                {
                    Some(k) => k,
                    None => {
                        out.push(Survey {
                            what: r.what,
                            age_s,
                            points: Vec::new(),
                            band: Vec::new(),
                            sigma,
                        });
                        out.len() - 1
                    }
                };
                out[k]
                    .points
                    .push((lane.position_m, r.measured, r.predicted));
                out[k].band.push((r.predicted_p05, r.predicted_p95));
            }
        }
        out.sort_by(|a, b| {
            (a.what == Measure::Diameter)
                .cmp(&(b.what == Measure::Diameter))
                .then(a.age_s.total_cmp(&b.age_s))
        });
        out
    }

    /// Lanes whose stress curves the report draws: the mean lane, then up to two finding lanes
    /// with the largest length difference.
    pub fn stress_lanes(&self) -> Vec<StressLane> {
        let wound = &self.fitted.wound;
        let aged = &self.fitted.fit.aged;
        let lanes = &self.fitted.lanes.lanes;
        let mut picked: Vec<usize> = Vec::new();
        let mut refs: Vec<(usize, f64)> = self
            .diagnosis
            .findings
            .iter()
            .flat_map(|f| f.lanes.iter().map(|l| (l.index, l.excess_mm_per_m.abs())))
            .collect();
        refs.sort_by(|a, b| b.1.total_cmp(&a.1).then(a.0.cmp(&b.0)));
        for (i, _) in refs {
            if !picked.contains(&i) && picked.len() < 2 && i < wound.lanes.len() {
                picked.push(i);
            }
        }
        let total_w: f64 = lanes.iter().map(|l| l.width_m).sum::<f64>().max(1e-12);
        let weights: Vec<f64> = lanes.iter().map(|l| l.width_m / total_w).collect();
        let curve = |r: &[f64], p: &dyn Fn(usize) -> f64, t: &dyn Fn(usize) -> f64| {
            (0..r.len()).map(|k| (r[k], p(k), t(k))).collect::<Vec<_>>()
        };
        let mean = StressLane {
            lane: None,
            position_m: 0.5 * self.case.roll.width_m,
            wound: curve(
                &wound.radius_m,
                &|k| {
                    -wound
                        .lanes
                        .iter()
                        .zip(&weights)
                        .map(|(l, w)| w * l.radial_stress_pa[k])
                        .sum::<f64>()
                },
                &|k| {
                    wound
                        .lanes
                        .iter()
                        .zip(&weights)
                        .map(|(l, w)| w * l.tangential_stress_pa[k])
                        .sum::<f64>()
                },
            ),
            aged: curve(
                &aged.radius_m,
                &|k| {
                    -aged
                        .lanes
                        .iter()
                        .zip(&weights)
                        .map(|(l, w)| w * l.final_radial_stress_pa[k])
                        .sum::<f64>()
                },
                &|k| {
                    aged.lanes
                        .iter()
                        .zip(&weights)
                        .map(|(l, w)| w * l.final_tangential_stress_pa[k])
                        .sum::<f64>()
                },
            ),
        };
        let mut out = vec![mean];
        for i in picked {
            let (wl, al) = (&wound.lanes[i], &aged.lanes[i]);
            out.push(StressLane {
                lane: Some(i),
                position_m: wl.position_m,
                wound: curve(&wound.radius_m, &|k| -wl.radial_stress_pa[k], &|k| {
                    wl.tangential_stress_pa[k]
                }),
                aged: curve(&aged.radius_m, &|k| -al.final_radial_stress_pa[k], &|k| {
                    al.final_tangential_stress_pa[k]
                }),
            });
        }
        out
    }

    /// Moisture across the width at the start and at the end of each storage stretch (at most
    /// six dates).
    pub fn moisture_lines(&self) -> Vec<MoistureLine> {
        let aged = &self.fitted.fit.aged;
        let times = self.times_s();
        if times.is_empty() {
            return Vec::new();
        }
        let nearest = |t: f64| crate::numeric::closest_index(&times, t);
        let mut picks: Vec<(usize, Option<usize>)> = vec![(0, None)];
        let mut end = 0.0;
        for (k, s) in self.case.storage.iter().enumerate() {
            end += s.duration_s;
            let i = nearest(end);
            if picks.iter().all(|p| p.0 != i) {
                picks.push((i, Some(k)));
            }
        }
        if picks.len() > 6 {
            let n = picks.len();
            picks = (0..6).map(|j| picks[j * (n - 1) / 5]).collect();
        }
        picks
            .into_iter()
            .map(|(i, stretch_end)| MoistureLine {
                age_s: times[i],
                stretch_end,
                points: aged
                    .lanes
                    .iter()
                    .map(|l| (l.position_m, l.moisture_pct[i]))
                    .collect(),
            })
            .collect()
    }
}
