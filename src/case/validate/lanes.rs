//! `lanes`: explicit edges or a lane count.

use super::super::raw::RawLanes;
use super::super::raw::Q;
use super::checks::{line_of, Range, Validator};
use crate::units::Kind;

/// How far the first and last lane edge may lie from the roll's ends, m: edges written to the
/// millimetre (or converted from inches) round by less.
const EDGE_TOL_M: f64 = 0.5e-3;

/// Narrowest lane that explicit edges may make, m: a hardness reading's footprint and a caliper
/// scanner's sample are wider (common practice), and `lanes.count` at its largest (400) makes
/// lanes of a few mm on a roll of a metre or more.
const MIN_LANE_M: f64 = 1e-3;

/// Most lanes `lanes.count` (and `--lanes`) may ask for.
pub const MAX_LANE_COUNT: u32 = 400;

/// A length as messages show it.
fn show(x: f64) -> String {
    crate::units::show(x, Kind::Length, crate::units::message_system(), false)
}

impl Validator {
    pub(super) fn lanes(
        &mut self,
        l: Option<&RawLanes>,
        width: Option<f64>,
    ) -> (Option<Vec<f64>>, Option<usize>) {
        let Some(l) = l else { return (None, None) };
        let count = l.count.as_ref().and_then(|c| {
            if (1..=MAX_LANE_COUNT).contains(&c.value) {
                Some(c.value as usize)
            } else {
                self.push(
                    "lanes.count",
                    Some(line_of(c)),
                    format!("must be between 1 and {MAX_LANE_COUNT}"),
                );
                None
            }
        });
        if let (Some(c), Some(_)) = (&l.count, &l.edges) {
            self.push(
                "lanes.count",
                Some(line_of(c)),
                "give count or edges, not both: count cuts the roll into equal lanes, edges place them where you say. Fix: remove one of them".into(),
            );
            return (None, None);
        }
        let edges = l.edges.as_ref().and_then(|es| self.edges(es, width));
        (edges, count)
    }

    /// Lane edges, m: at least two, increasing, from 0 to the roll width (within [`EDGE_TOL_M`]).
    fn edges(&mut self, es: &[Q], width: Option<f64>) -> Option<Vec<f64>> {
        let mut v = Vec::new();
        for (i, e) in es.iter().enumerate() {
            v.push(self.q(
                e,
                &format!("lanes.edges[{i}]"),
                Kind::Length,
                Range::NonNegative,
            )?);
        }
        let line = es.first().map(line_of);
        if v.len() < 2 {
            self.push(
                "lanes.edges",
                line,
                "need at least two edges, from 0 to the roll width".into(),
            );
            return None;
        }
        if !self.increasing(&v, line) {
            return None;
        }
        if let Some(w) = width {
            let (first, last) = (v[0], v[v.len() - 1]);
            if first > EDGE_TOL_M || (last - w).abs() > EDGE_TOL_M {
                let message = format!(
                    "the edges run from {} to {}, but the lanes must cover the whole roll, from 0 to its width {}: moisture enters through the roll's end faces, so the end lanes matter. Fix: start the edges at 0 and end them at the roll width",
                    show(first),
                    show(last),
                    show(w)
                );
                self.push("lanes.edges", line, message);
                return None;
            }
            // within the tolerance the ends are the roll's own
            v[0] = 0.0;
            let n = v.len();
            v[n - 1] = w;
        }
        // an end lane narrower than the tolerance vanishes with the snap: refused here too
        if !self.increasing(&v, line) {
            return None;
        }
        self.wide_enough(&v, line).then_some(v)
    }

    /// Whether every lane between edges `v` (m) is at least [`MIN_LANE_M`] wide; when not, the
    /// first that is not is named.
    fn wide_enough(&mut self, v: &[f64], line: Option<u64>) -> bool {
        let Some(k) = v.windows(2).position(|w| w[1] - w[0] < MIN_LANE_M) else {
            return true;
        };
        let message = format!(
            "the lane from edges[{k}] = {} to edges[{}] = {} is narrower than {}: no cross-width reading resolves a strip that narrow. Fix: merge it with its neighbour (remove one of the two edges)",
            show(v[k]),
            k + 1,
            show(v[k + 1]),
            show(MIN_LANE_M)
        );
        self.push("lanes.edges", line, message);
        false
    }

    /// Whether the edges increase; when not, the first pair that does not is named.
    fn increasing(&mut self, v: &[f64], line: Option<u64>) -> bool {
        let Some(k) = v.windows(2).position(|w| w[1] <= w[0]) else {
            return true;
        };
        let message = format!(
            "edges[{}] = {} does not lie beyond edges[{k}] = {}; edges must increase from the front edge to the back edge",
            k + 1,
            show(v[k + 1]),
            show(v[k])
        );
        self.push("lanes.edges", line, message);
        false
    }
}
