//! Fuzz the profile CSV reader: any bytes as a CSV file. Property: rows that are finite and
//! strictly increasing in position, or an error, never a panic.
#![no_main]

use libfuzzer_sys::fuzz_target;

fuzz_target!(|data: &[u8]| {
    let text = String::from_utf8_lossy(data);
    if let Ok(rows) = rollsleuth::case::profile_rows(&text, "fuzz.csv") {
        for w in rows.windows(2) {
            assert!(w[0].0 < w[1].0, "positions must increase: {rows:?}");
        }
        for r in &rows {
            assert!(r.0.is_finite() && r.1.is_finite());
        }
    }
});
