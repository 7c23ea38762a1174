//! Fuzz the case loader: any bytes as a case file, and any bytes as one `--set` argument on the
//! demo case. Property: a case or an error, never a panic, never a hang.
#![no_main]

use libfuzzer_sys::fuzz_target;

fuzz_target!(|data: &[u8]| {
    let text = String::from_utf8_lossy(data);
    let _ = rollsleuth::case::load_str(&text, "fuzz.yaml", None, &[]);
    if let Some((set, _)) = text.split_once('\n') {
        let _ = rollsleuth::case::load_demo(&[set.to_string()]);
    }
});
