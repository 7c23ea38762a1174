//! A browser renders each field case's report: headless Chromium (Debian package `chromium`,
//! installed by `.ci/run`) screenshots the HTML to PNG at A4 proportions (1240 x 1754 px), and
//! the image must have that size and not be blank (pixel variance well above zero), and the page
//! must log nothing to the browser console.
//!
//! Without chromium the test fails when `CI` is set (CI must install it) and otherwise prints
//! why it did not run.

use std::path::Path;
use std::process::Command;

const FIELD_CASES: [&str; 3] = [
    "field_cases/nordvik_pm3_caliper_band.yaml",
    "field_cases/kestrel_coated_cold_to_humid.yaml",
    "field_cases/harrowgate_board_dry_store.yaml",
];
const SIZE: (u32, u32) = (1240, 1754);

fn chromium() -> Option<String> {
    ["chromium", "chromium-browser"]
        .into_iter()
        .find(|c| {
            Command::new(c)
                .arg("--version")
                .output()
                .is_ok_and(|o| o.status.success())
        })
        .map(String::from)
}

/// Width, height and the variance of the grey level over all pixels.
fn png_stats(path: &Path) -> (u32, u32, f64) {
    let decoder = png::Decoder::new(std::fs::File::open(path).expect("png written"));
    let mut reader = decoder.read_info().expect("a PNG");
    let mut buf = vec![0; reader.output_buffer_size()];
    let info = reader.next_frame(&mut buf).expect("a frame");
    let px = &buf[..info.buffer_size()];
    let ch = match info.color_type {
        png::ColorType::Rgba => 4,
        png::ColorType::Rgb => 3,
        png::ColorType::GrayscaleAlpha => 2,
        _ => 1,
    };
    assert_eq!(info.bit_depth, png::BitDepth::Eight, "8-bit screenshot");
    let greys: Vec<f64> = px
        .chunks(ch)
        .map(|p| {
            if ch >= 3 {
                (f64::from(p[0]) + f64::from(p[1]) + f64::from(p[2])) / 3.0
            } else {
                f64::from(p[0])
            }
        })
        .collect();
    let n = greys.len() as f64;
    let mean = greys.iter().sum::<f64>() / n;
    let var = greys.iter().map(|g| (g - mean) * (g - mean)).sum::<f64>() / n;
    (info.width, info.height, var)
}

#[test]
fn chromium_renders_every_field_case_report() {
    let Some(browser) = chromium() else {
        if std::env::var_os("CI").is_some() {
            panic!(
                "chromium is not installed: .ci/run must install it (apt-get install -y chromium)"
            );
        }
        eprintln!("NOT RUN: chromium is not installed here (apt-get install -y chromium); CI runs this check");
        return;
    };
    let root = std::path::Path::new(env!("CARGO_TARGET_TMPDIR"))
        .join(format!("rollsleuth-browser-{}", std::process::id()));
    let _ = std::fs::remove_dir_all(&root);
    for case in FIELD_CASES {
        let dir = root.join(Path::new(case).file_stem().unwrap());
        let o = Command::new(env!("CARGO_BIN_EXE_rollsleuth"))
            .args(["diagnose", case, "--date", "2026-12-02", "--out"])
            .arg(&dir)
            .output()
            .unwrap();
        assert!(
            matches!(o.status.code(), Some(0 | 1)),
            "{case}: {}",
            String::from_utf8_lossy(&o.stderr)
        );
        let html = std::fs::read_dir(&dir)
            .unwrap()
            .map(|e| e.unwrap().path())
            .find(|p| p.extension().is_some_and(|e| e == "html"))
            .expect("an HTML report");
        let html = std::fs::canonicalize(html).unwrap();
        let shot = dir.join("page.png");
        let profile = dir.join("profile");
        let out = Command::new(&browser)
            .args([
                "--headless",
                "--no-sandbox",
                "--disable-gpu",
                "--disable-background-networking",
                "--disable-component-update",
                "--disable-sync",
                "--no-first-run",
                // console messages go to stderr as `INFO:CONSOLE(...)` lines
                "--enable-logging=stderr",
                "--v=0",
            ])
            .arg(format!("--user-data-dir={}", profile.display()))
            .arg(format!("--screenshot={}", shot.display()))
            .arg(format!("--window-size={},{}", SIZE.0, SIZE.1))
            .arg(format!("file://{}", html.display()))
            .output()
            .expect("chromium runs");
        assert!(
            shot.exists(),
            "{case}: no screenshot; chromium said: {}",
            String::from_utf8_lossy(&out.stderr)
        );
        let log = String::from_utf8_lossy(&out.stderr);
        let console: Vec<&str> = log.lines().filter(|l| l.contains(":CONSOLE")).collect();
        assert!(console.is_empty(), "{case}: console messages: {console:?}");
        let (w, h, var) = png_stats(&shot);
        assert_eq!((w, h), SIZE, "{case}: screenshot size");
        // a blank page has variance 0; text, tables and a plot on white give thousands
        assert!(
            var > 100.0,
            "{case}: the page looks blank (grey variance {var:.1})"
        );
    }
    let _ = std::fs::remove_dir_all(&root);
}
