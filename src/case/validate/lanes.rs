//! `lanes`: explicit edges or a lane count.

use super::super::raw::RawLanes;
use super::super::raw::Q;
use super::checks::{line_of, Range, Validator};
use crate::units::Kind;

impl Validator {
    pub(super) fn lanes(
        &mut self,
        l: Option<&RawLanes>,
        width: Option<f64>,
    ) -> (Option<Vec<f64>>, Option<usize>) {
        let Some(l) = l else { return (None, None) };
        let count = l.count.as_ref().and_then(|c| {
            if (1..=400).contains(&c.value) {
                Some(c.value as usize)
            } else {
                self.push(
                    "lanes.count",
                    Some(line_of(c)),
                    "must be between 1 and 400".into(),
                );
                None
            }
        });
        let edges = l.edges.as_ref().and_then(|es| self.edges(es, width));
        (edges, count)
    }

    /// Lane edges, m: at least two, increasing, within the roll width.
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
        if v.len() < 2 || v.windows(2).any(|w| w[1] <= w[0]) {
            self.push(
                "lanes.edges",
                es.first().map(line_of),
                "need at least two increasing edges".into(),
            );
            return None;
        }
        if let Some(w) = width {
            if v[v.len() - 1] > w + 1e-9 {
                self.push(
                    "lanes.edges",
                    es.first().map(line_of),
                    "the last edge is beyond the roll width".into(),
                );
                return None;
            }
        }
        Some(v)
    }
}
