//! Whether the model explains the surveys, in words: the opening of `diagnose`, its report and
//! `fit` ([`opening`]), the report's "Found" ([`found_prefix`]), the agreement's caveat and the
//! triage cell. A roll the model explains gets no words here (its output is as before).

use super::pos;
use crate::fit::{ModelFit, Verdict};
use crate::units::System;

/// The lanes not explained: "all 18 lanes are" or "3 of 28 lanes are (at 12 mm, ...)", with
/// the worst lane's misfit.
fn lanes_phrase(m: &ModelFit, sys: System) -> String {
    let n = m.lanes_not_explained_m.len();
    let worst = m.worst_lane_misfit_noise_units;
    if n == 0 {
        return format!("no single lane is beyond it (worst {worst:.1} noise units)");
    }
    let at = (m.lanes_not_explained_m.iter())
        .map(|&p| pos(p, sys))
        .collect::<Vec<_>>()
        .join(", ");
    match (n == m.lanes, n) {
        (true, 1) => format!("its one lane is not explained ({worst:.1} noise units)"),
        (true, _) => format!("all {n} lanes are not explained (worst {worst:.1} noise units)"),
        (false, 1) => format!(
            "1 of {} lanes is not explained: at {at} ({worst:.1} noise units)",
            m.lanes
        ),
        (false, _) => format!(
            "{n} of {} lanes are not explained: at {at} (worst {worst:.1} noise units)",
            m.lanes
        ),
    }
}

/// The misfit and its limit, in words.
fn misfit_phrase(m: &ModelFit) -> String {
    format!(
        "the readings miss the fit by {} noise units (rms over every reading; over {:.0} is not explained)",
        misfit(m.roll_misfit_noise_units),
        m.limit_noise_units
    )
}

/// The opening of an output when the model does not explain the surveys, or some lanes; `rests`
/// names what rests on the fit ("The findings below, and the absence of findings,"). `None`
/// when the model explains them.
pub fn opening(m: &ModelFit, sys: System, rests: &str) -> Option<String> {
    match m.verdict {
        Verdict::Explained => None,
        Verdict::NotExplained => Some(format!(
            "Not explained: the model does not explain the surveys. {}; {}. {rests} rest on a model that does not fit the measurements: check the surveys (instrument, scale, positions, ages) and the storage history before trusting them.",
            capital(&misfit_phrase(m)),
            lanes_phrase(m, sys)
        )),
        Verdict::LanesNotExplained => Some(format!(
            "Partly explained: {} (over {:.0} noise units is not explained); the roll as a whole is explained by the model ({} noise units). What rests on those lanes rests on readings the model does not explain.",
            lanes_phrase(m, sys),
            m.limit_noise_units,
            misfit(m.roll_misfit_noise_units)
        )),
    }
}

/// The start of the report's "Found" when the model does not explain the surveys (before what
/// was found on that model); `None` otherwise.
pub fn found_prefix(m: &ModelFit, sys: System) -> Option<String> {
    (m.verdict == Verdict::NotExplained).then(|| {
        format!(
            "the model does not explain the surveys: {}; {}. The findings, and the absence of findings, rest on an unexplained model. On that model: ",
            misfit_phrase(m),
            lanes_phrase(m, sys)
        )
    })
}

/// The caveat after the agreement with the complaint when the model does not explain the
/// surveys (empty otherwise).
pub fn agreement_caveat(m: &ModelFit) -> &'static str {
    match m.verdict {
        Verdict::NotExplained => {
            " This rests on a model that does not explain the surveys (see above)."
        }
        _ => "",
    }
}

/// A misfit in noise units to one decimal, or to two where one would print the limit itself
/// (2.96 and 3.04 fall on either side of it).
pub fn misfit(x: f64) -> String {
    let limit = crate::fit::explained::MISFIT_LIMIT;
    if format!("{x:.1}") == format!("{limit:.1}") && x != limit {
        format!("{x:.2}")
    } else {
        format!("{x:.1}")
    }
}

/// The triage cell: "yes (0.6)", "no (6.0)", or "yes (1.1); 2 lanes no".
pub fn triage_cell(m: &ModelFit) -> String {
    let roll = misfit(m.roll_misfit_noise_units);
    match m.verdict {
        Verdict::Explained => format!("yes ({roll})"),
        Verdict::NotExplained => format!("no ({roll})"),
        Verdict::LanesNotExplained => {
            let n = m.lanes_not_explained_m.len();
            format!("yes ({roll}); {n} lane{} no", if n == 1 { "" } else { "s" })
        }
    }
}

/// The verdict's word in CSV and JSON (`explained`, `lanes_not_explained`, `not_explained`).
pub fn verdict_word(v: Verdict) -> &'static str {
    match v {
        Verdict::Explained => "explained",
        Verdict::LanesNotExplained => "lanes_not_explained",
        Verdict::NotExplained => "not_explained",
    }
}

/// A phrase with its first letter upper-case.
fn capital(s: &str) -> String {
    let mut c = s.chars();
    c.next()
        .map(|f| f.to_uppercase().chain(c).collect())
        .unwrap_or_default()
}

#[cfg(test)]
mod tests {
    use super::*;

    fn fit(verdict: Verdict, roll: f64, not: &[f64], lanes: usize) -> ModelFit {
        ModelFit {
            verdict,
            roll_misfit_noise_units: roll,
            limit_noise_units: 3.0,
            lanes,
            lanes_not_explained_m: not.to_vec(),
            worst_lane_misfit_noise_units: 7.2,
        }
    }

    /// An explained roll has no opening; an unexplained one says by how much and which lanes.
    #[test]
    fn the_opening_says_by_how_much_and_which_lanes() {
        let sys = System::Si;
        assert_eq!(
            opening(&fit(Verdict::Explained, 0.6, &[], 18), sys, "X"),
            None
        );
        let all = opening(&fit(Verdict::NotExplained, 6.0, &[0.1, 0.2], 2), sys, "X").unwrap();
        assert!(all.starts_with("Not explained: the model does not explain the surveys. The readings miss the fit by 6.0 noise units"), "{all}");
        assert!(
            all.contains("all 2 lanes are not explained (worst 7.2 noise units)"),
            "{all}"
        );
        let some = fit(Verdict::LanesNotExplained, 1.1, &[0.45], 26);
        let s = opening(&some, sys, "X").unwrap();
        assert!(
            s.contains("1 of 26 lanes is not explained: at 450 mm (7.2 noise units)"),
            "{s}"
        );
        assert_eq!(triage_cell(&some), "yes (1.1); 1 lane no");
        // next to the limit, the digit that tells the side
        assert_eq!(
            triage_cell(&fit(Verdict::Explained, 2.96, &[], 18)),
            "yes (2.96)"
        );
        assert_eq!(
            triage_cell(&fit(Verdict::NotExplained, 3.04, &[], 18)),
            "no (3.04)"
        );
        assert_eq!(misfit(3.0), "3.0");
    }
}
