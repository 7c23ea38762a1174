//! Root-cause and correction words: sources' shares, the method that gives them, why no source
//! explains a finding, and whether a correction improves its finding and the defect stays.

use super::words::{amplifier, quantity, quantity_change, quantity_value};
use crate::diagnose::attribution::{worse_sign, SourceShare, NEGLIGIBLE_FRACTION};
use crate::diagnose::Attribution;
use crate::units::System;
use crate::vocab::Quantity;

/// A source's share as a percentage ("93 %"; "-" when there is no change to share; a share that
/// rounds to zero without a sign).
pub fn share(x: Option<f64>) -> String {
    match x {
        Some(x) if (x * 100.0).abs() < 0.5 => "0 %".into(),
        Some(x) => format!("{:.0} %", x * 100.0),
        None => "-".into(),
    }
}

/// Whether a correction improves its finding's quantity, in words, and whether the defect
/// stays after it (its deciding condition still holds on the corrected roll): over the plausible
/// states where the screen gave their share, else at the fitted creep.
pub fn improves(c: &crate::diagnose::CheckedCorrection) -> String {
    if !c.applies {
        return "does not apply: it changes nothing on this roll".into();
    }
    // the share of the states in which the defect stays, else the fitted creep's verdict
    let stays = (c.remains_fraction).or(c.defect_remains.map(|r| if r { 1.0 } else { 0.0 }));
    match (c.improves, stays) {
        (Some(true), Some(p)) if p >= 1.0 => "yes, but the defect stays there".into(),
        (Some(true), Some(p)) if p > 0.0 => format!(
            "yes, but the defect may stay there (in {:.0} % of the plausible states in which it holds)",
            100.0 * p
        ),
        (Some(true), Some(_)) => "yes, the defect goes from there".into(),
        (Some(true), None) => "yes".into(),
        (Some(false), _) => "no: not recommended".into(),
        (None, _) => "not run".into(),
    }
}

/// How root causes are attributed, said whenever they were.
pub const SHARES_METHOD: &str = "each source's share is its Shapley value (Shapley 1953) over every subset of source removals, on the finding's own quantity: independent of the order of removal, interactions shared evenly, and the shares add up to the change with every source removed (a source that works against the finding has a negative share, and then the others' add up to more than 100 %); web tension, nip, speed and storage time amplify a non-uniformity without making one, so they are shown as the quantity at a feasible alternative";

/// A source's contribution to its finding's quantity in words: the signed change, and, when it
/// works against the defect while its share reads as positive (the sources' total works against
/// it too), that it does; a negative share already says so ([`SHARES_METHOD`]).
pub fn contribution(q: Quantity, s: &SourceShare, sys: System) -> String {
    let change = quantity_change(q, s.contribution, sys);
    if s.against_defect && s.share.is_none_or(|x| x >= 0.0) {
        format!("{change}, against the defect")
    } else {
        change
    }
}

/// Why no source of non-uniformity is the finding's cause, None when the sources explain it
/// ([`Attribution::sources_explain`]): what they do together, and where the defect comes from
/// (the words after "no source of non-uniformity explains ...: ").
pub fn no_source_cause(a: &Attribution, sys: System) -> Option<String> {
    if a.sources_explain {
        return None;
    }
    let q = a.quantity;
    let toward = worse_sign(q) * (a.value - a.value_without_sources);
    let tiny = 1e-9 * a.value.abs().max(a.value_without_sources.abs()).max(1e-9);
    let together = if a.holds_without_sources {
        format!(
            "the defect holds with every source of non-uniformity removed (the sources move the {} from {} to {})",
            quantity(q),
            quantity_value(q, a.value_without_sources, sys),
            quantity_value(q, a.value, sys)
        )
    } else if toward.abs() <= tiny {
        format!("together the sources leave the {} unchanged", quantity(q))
    } else {
        format!(
            "together the sources move the {} from {} (every source removed) to {}, {}",
            quantity(q),
            quantity_value(q, a.value_without_sources, sys),
            quantity_value(q, a.value, sys),
            if toward < 0.0 {
                "which works against the defect".to_string()
            } else {
                format!(
                    "under {:.0} % of the defect's size",
                    NEGLIGIBLE_FRACTION * 100.0
                )
            }
        )
    };
    let names: Vec<&str> = (a.sensitivities.iter())
        .map(|s| amplifier(s.amplifier).0)
        .collect();
    let amplifiers = match names.as_slice() {
        [] => "no amplifier here has a feasible alternative to show".to_string(),
        [one] => format!("the amplifier table shows what the {one} does"),
        [rest @ .., last] => format!(
            "the amplifier table shows what the {} and the {last} do",
            rest.join(", the ")
        ),
    };
    Some(format!(
        "{together}; it comes from the winding and storage conditions themselves ({amplifiers})"
    ))
}

/// Why a correction helps (the rule's words), with a caution where it makes the paper at a
/// moisture mills do not commonly make ([`crate::diagnose::corrections::MACHINE_MOISTURE_PCT`]).
pub fn why(c: &crate::diagnose::CheckedCorrection) -> String {
    match c.made_at_moisture_pct {
        Some(m) if c.made_beyond_practice() => {
            let (lo, hi) = crate::diagnose::corrections::MACHINE_MOISTURE_PCT;
            format!(
                "{} Caution: that is {:.1} % moisture (wet basis; {m:.1} % dry basis), outside the {lo:.0}-{hi:.0} % paper machines commonly make (from memory); the re-run shows what it would do, not that a mill can.",
                c.why,
                crate::diagnose::corrections::wet_basis_pct(m)
            )
        }
        _ => c.why.clone(),
    }
}
