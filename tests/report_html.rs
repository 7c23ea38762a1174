//! The root-cause report files of `diagnose --out`: the HTML and every inline SVG parse as XML
//! (roxmltree, an independent parser), every plot is there with its axes, nothing refers outside
//! the file, hostile text in every user field stays text, the numbers agree with the JSON, and
//! `--units us` reaches the report.

use std::path::{Path, PathBuf};
use std::process::Command;

const FIELD_CASES: [&str; 3] = [
    "field_cases/nordvik_pm3_caliper_band.yaml",
    "field_cases/kestrel_coated_cold_to_humid.yaml",
    "field_cases/harrowgate_board_dry_store.yaml",
];

fn out_dir(tag: &str) -> PathBuf {
    let d = std::path::Path::new(env!("CARGO_TARGET_TMPDIR"))
        .join(format!("rollsleuth-{tag}-{}", std::process::id()));
    let _ = std::fs::remove_dir_all(&d);
    d
}

/// Run `diagnose ARGS --out DIR --date 2026-12-02`; returns the exit code, stderr and the files
/// written (name, content).
fn report(args: &[&str], dir: &Path) -> (i32, String, Vec<(String, String)>) {
    let o = Command::new(env!("CARGO_BIN_EXE_rollsleuth"))
        .arg("diagnose")
        .args(args)
        .args(["--date", "2026-12-02", "--out"])
        .arg(dir)
        .output()
        .expect("runs");
    let mut files: Vec<(String, String)> = std::fs::read_dir(dir)
        .map(|rd| {
            rd.map(|e| {
                let p = e.unwrap().path();
                (
                    p.file_name().unwrap().to_string_lossy().into_owned(),
                    std::fs::read_to_string(&p).unwrap(),
                )
            })
            .collect()
        })
        .unwrap_or_default();
    files.sort();
    (
        o.status.code().unwrap_or(-1),
        String::from_utf8_lossy(&o.stderr).into(),
        files,
    )
}

fn file<'a>(files: &'a [(String, String)], ext: &str) -> &'a str {
    files
        .iter()
        .find(|f| f.0.ends_with(ext))
        .map(|f| f.1.as_str())
        .unwrap_or_else(|| {
            panic!(
                "no *{ext} among {:?}",
                files.iter().map(|f| &f.0).collect::<Vec<_>>()
            )
        })
}

/// Whether a shown value (number first, then its unit) is `v` in the JSON's `unit`, to the
/// shown precision (four significant digits, or two decimals): stresses in MPa are shown in kPa
/// in an SI report.
fn close(shown: &str, v: f64, unit: &str) -> bool {
    let number: f64 = shown.split_whitespace().next().unwrap().parse().unwrap();
    let v = if unit == "mpa" { v * 1e3 } else { v };
    (number - v).abs() <= 5e-4 * v.abs() + 5e-3
}

/// Text of the element carrying `data-key="key"`.
fn keyed(doc: &roxmltree::Document, key: &str) -> String {
    doc.descendants()
        .find(|n| n.attribute("data-key") == Some(key))
        .map(|n| n.text().unwrap_or("").to_string())
        .unwrap_or_else(|| panic!("no data-key {key}"))
}

/// The checks every report passes: XML, plots with axes, no outside reference.
fn check_structure(html: &str) -> roxmltree::Document<'_> {
    let opt = roxmltree::ParsingOptions {
        allow_dtd: true,
        ..Default::default()
    };
    let doc = roxmltree::Document::parse_with_options(html, opt)
        .unwrap_or_else(|e| panic!("HTML is not well-formed XML: {e}"));
    let figures: Vec<_> = doc
        .descendants()
        .filter(|n| n.has_tag_name("figure"))
        .collect();
    let ids: Vec<&str> = figures.iter().filter_map(|f| f.attribute("id")).collect();
    for want in [
        "plot-lane-length",
        "plot-causes",
        "plot-hardness",
        "plot-pressure",
        "plot-md-stress",
        "plot-moisture",
    ] {
        assert!(ids.contains(&want), "plot {want} missing: {ids:?}");
    }
    for f in &figures {
        let svg = f
            .children()
            .find(|n| n.tag_name().name() == "svg")
            .unwrap_or_else(|| panic!("figure {:?} has no svg", f.attribute("id")));
        assert_eq!(
            svg.tag_name().namespace(),
            Some("http://www.w3.org/2000/svg")
        );
        // re-parse the SVG on its own, as a viewer given just the plot would
        let text = &html[svg.range()];
        roxmltree::Document::parse(text).unwrap_or_else(|e| panic!("SVG not well-formed: {e}"));
        let texts: Vec<String> = svg
            .descendants()
            .filter(|n| n.has_tag_name("text"))
            .map(|n| n.text().unwrap_or("").trim().to_string())
            .collect();
        assert!(
            texts.iter().filter(|t| !t.is_empty()).count() >= 6,
            "{:?}: a title, axis titles and ticks expected: {texts:?}",
            f.attribute("id")
        );
        assert!(
            svg.descendants()
                .filter(|n| n.has_tag_name("text"))
                .all(|n| n
                    .attribute("font-family")
                    .is_some_and(|ff| ff.contains("sans-serif"))),
            "every plot text has a font family"
        );
    }
    for forbidden in [
        "<script", "<link", "<img", "<iframe", "<object", "@import", "url(", "src=", "href=",
    ] {
        assert!(!html.contains(forbidden), "external reference {forbidden}");
    }
    for n in doc.descendants() {
        for a in n.attributes() {
            let v = a.value();
            if v.contains("http:") || v.contains("https:") {
                assert!(
                    a.name() == "xmlns" || a.namespace() == Some("http://www.w3.org/2000/xmlns/"),
                    "only namespace names may be URLs: {}={v}",
                    a.name()
                );
            }
        }
        if n.is_text() {
            let t = n.text().unwrap_or("");
            assert!(!t.contains("http:") && !t.contains("https:"), "{t}");
        }
    }
    doc
}

#[test]
fn every_field_case_report_is_well_formed_self_contained_and_agrees_with_the_json() {
    for case in FIELD_CASES {
        let dir = out_dir("html");
        let (code, err, files) = report(&[case], &dir);
        assert!(code == 0 || code == 1, "{case}: {err}");
        assert_eq!(
            files.len(),
            3,
            "html, md, json: {:?}",
            files.iter().map(|f| &f.0).collect::<Vec<_>>()
        );
        let html = file(&files, ".html");
        let doc = check_structure(html);
        let json: serde_json::Value = serde_json::from_str(file(&files, ".json")).unwrap();
        // headline spread
        let spread = json["spread_mm_per_m"].as_f64().unwrap();
        assert_eq!(keyed(&doc, "spread"), format!("{spread:.2} mm/m"), "{case}");
        // each finding's evidence, as the JSON has it
        for (i, f) in json["findings"].as_array().unwrap().iter().enumerate() {
            for e in f["evidence"].as_array().unwrap() {
                let name = e["feature"].as_str().unwrap();
                let v = e["value"].as_f64().unwrap();
                let shown = keyed(&doc, &format!("finding{}.{name}", i + 1));
                let number: f64 = shown.split_whitespace().next().unwrap().parse().unwrap();
                // SI report: mm/m, mm, kPa and % features show the JSON's number itself
                assert!(
                    (number - v).abs() <= 0.0005 + 1e-9,
                    "{case} {name}: {shown} vs {v}"
                );
            }
            // its root cause: the shares and the quantity as the JSON has them
            if let Some(a) = f["attribution"].as_object() {
                let unit = a["unit"].as_str().unwrap();
                let value = a["value"].as_f64().unwrap();
                let shown = keyed(&doc, &format!("value.{}", i + 1));
                assert!(
                    close(&shown, value, unit),
                    "{case} value: {shown} vs {value}"
                );
                for s in a["shares"].as_array().unwrap() {
                    let key = format!("share.{}.{}", i + 1, s["cause"].as_str().unwrap());
                    let shown = keyed(&doc, &key);
                    match s["share_fraction"].as_f64() {
                        Some(x) => {
                            let number: f64 = shown.trim_end_matches(" %").parse().unwrap();
                            assert!((number - x * 100.0).abs() <= 0.5, "{case} {key}: {shown}");
                        }
                        None => assert_eq!(shown, "-", "{case} {key}"),
                    }
                }
            }
            // its corrections, re-run and judged on the same quantity
            for c in f["corrections"].as_array().unwrap() {
                let action = c["action"].as_str().unwrap();
                if let Some(after) = c["after"].as_f64() {
                    let shown = keyed(&doc, &format!("after.{}.{action}", i + 1));
                    let unit = c["unit"].as_str().unwrap();
                    assert!(
                        close(&shown, after, unit),
                        "{case} {action}: {shown} vs {after}"
                    );
                    let improves = keyed(&doc, &format!("improves.{}.{action}", i + 1));
                    assert_eq!(
                        improves.starts_with("yes"),
                        c["improves"].as_bool().unwrap(),
                        "{case} {action}"
                    );
                }
            }
        }
        for (i, l) in json["lanes"].as_array().unwrap().iter().enumerate() {
            let x = l["excess_mm_per_m"].as_f64().unwrap();
            assert_eq!(keyed(&doc, &format!("lane{i}.excess")), format!("{x:+.2}"));
        }
        assert_eq!(keyed(&doc, "date"), "2026-12-02");
        assert_eq!(
            keyed(&doc, "tool-version"),
            format!("rollsleuth {}", env!("CARGO_PKG_VERSION"))
        );
        // the rule table's fingerprint is FNV-1a 64 of the shipped table, computed here anew
        let table = std::fs::read("rules/default.yaml").unwrap();
        let mut h: u64 = 0xcbf29ce484222325;
        for b in table {
            h = (h ^ u64::from(b)).wrapping_mul(0x100000001b3);
        }
        assert_eq!(keyed(&doc, "rules-fingerprint"), format!("{h:016x}"));
        assert!(html.contains("Safety."));
        // the Markdown refers to nothing outside itself and names the HTML for the plots
        let md = file(&files, ".md");
        for forbidden in ["](", "<img", "http:", "https:", "<svg"] {
            assert!(
                !md.contains(forbidden),
                "{case}: Markdown holds {forbidden}"
            );
        }
        assert!(md.contains(&files.iter().find(|f| f.0.ends_with(".html")).unwrap().0));
        assert!(md.contains(&format!("{spread:.2} mm/m")));
        let _ = std::fs::remove_dir_all(&dir);
    }
}

#[test]
fn hostile_text_in_every_user_field_stays_text() {
    let hostile = "Tom & Jerry's <b>\"roll\"</b> ]]> <!-- é 漢字 🎞 \\ | * _ # [x](y)";
    let long_title = format!("{hostile} {}", "<&>\"' ".repeat(10_240 / 6));
    assert!(long_title.len() > 10_000);
    let q = |s: &str| serde_json::to_string(s).unwrap();
    let sets = [
        format!("case={}", q(&format!("../{hostile}"))),
        format!("title={}", q(&long_title)),
        format!("notes={}", q(&format!("{hostile}\nsecond line {hostile}"))),
        format!("storage[0].place={}", q(hostile)),
        format!("hardness.scale={}", q(hostile)),
    ];
    let mut args = vec!["field_cases/kestrel_coated_cold_to_humid.yaml"];
    for s in &sets {
        args.push("--set");
        args.push(s);
    }
    let dir = out_dir("hostile");
    let (code, err, files) = report(&args, &dir);
    assert!(code == 0 || code == 1, "{err}");
    let names: Vec<&String> = files.iter().map(|f| &f.0).collect();
    assert_eq!(names.len(), 3, "{names:?}");
    for n in &names {
        assert!(
            n.len() <= 85
                && n.chars()
                    .all(|c| c.is_ascii_alphanumeric() || "._-".contains(c)),
            "file name {n}"
        );
        assert!(!n.starts_with('.'), "{n}");
    }
    let html = file(&files, ".html");
    let doc = check_structure(html);
    // the hostile text comes back verbatim as text, never as markup
    let all_text: String = doc
        .descendants()
        .filter(|n| n.is_text())
        .map(|n| n.text().unwrap())
        .collect();
    assert!(all_text.contains(hostile), "hostile text kept as text");
    assert!(all_text.contains(&long_title), "the 10 kB title kept whole");
    assert!(
        !doc.descendants().any(|n| n.has_tag_name("b")),
        "no injected element"
    );
    let title = doc.descendants().find(|n| n.has_tag_name("title")).unwrap();
    assert!(title.text().unwrap().contains(&format!("../{hostile}")));
    // in the Markdown: no raw HTML and no link from user text
    let md = file(&files, ".md");
    assert!(!md.contains("<b>") && !md.contains("<!--"));
    assert!(
        !md.replace("\\]", "").contains("]("),
        "a link survived: brackets must be escaped"
    );
    assert!(md.contains("\\[x\\](y)"));
    assert!(md.contains("Tom &amp; Jerry"));
    let _ = std::fs::remove_dir_all(&dir);
}

#[test]
fn us_units_reach_the_headline_tables_and_axes() {
    let dir = out_dir("us");
    let o = Command::new(env!("CARGO_BIN_EXE_rollsleuth"))
        .args([
            "--units",
            "us",
            "diagnose",
            "field_cases/kestrel_coated_cold_to_humid.yaml",
        ])
        .args(["--date", "2026-12-02", "--out"])
        .arg(&dir)
        .output()
        .unwrap();
    assert!(o.status.code() == Some(0) || o.status.code() == Some(1));
    let html = std::fs::read_to_string(dir.join("KCP-CM2-8841-R03.html")).unwrap();
    let doc = check_structure(&html);
    let json: serde_json::Value =
        serde_json::from_str(&std::fs::read_to_string(dir.join("KCP-CM2-8841-R03.json")).unwrap())
            .unwrap();
    // a length difference per length is the same number in mil/in as in mm/m
    let spread = json["spread_mm_per_m"].as_f64().unwrap();
    assert_eq!(keyed(&doc, "spread"), format!("{spread:.2} mil/in"));
    let boxed: String = doc
        .descendants()
        .find(|n| n.attribute("class") == Some("box"))
        .unwrap()
        .descendants()
        .filter(|n| n.is_text())
        .map(|n| n.text().unwrap())
        .collect();
    // the case states 52 in wide and 40 in diameter
    assert!(
        boxed.contains("52 in wide") || boxed.contains("52.00 in wide"),
        "{boxed}"
    );
    assert!(!boxed.contains(" mm"), "{boxed}");
    for id in ["plot-lane-length", "plot-pressure", "plot-moisture"] {
        let fig = doc
            .descendants()
            .find(|n| n.attribute("id") == Some(id))
            .unwrap();
        let texts: String = fig
            .descendants()
            .filter(|n| n.is_text())
            .map(|n| n.text().unwrap())
            .collect();
        assert!(texts.contains("(in)"), "{id} axis in inches: {texts}");
        assert!(!texts.contains("(mm)"), "{id}: {texts}");
    }
    let fig = doc
        .descendants()
        .find(|n| n.attribute("id") == Some("plot-pressure"))
        .unwrap();
    let texts: String = fig
        .descendants()
        .filter(|n| n.is_text())
        .map(|n| n.text().unwrap())
        .collect();
    assert!(texts.contains("(psi)"), "{texts}");
    let md = std::fs::read_to_string(dir.join("KCP-CM2-8841-R03.md")).unwrap();
    // the case's first storage stretch is at 40 F
    assert!(
        md.contains("| 40.0 F |"),
        "storage temperatures in F, to 0.1 F"
    );
    let _ = std::fs::remove_dir_all(&dir);
}

#[test]
fn a_bad_date_is_a_usage_error_and_writes_nothing() {
    let dir = out_dir("baddate");
    let o = Command::new(env!("CARGO_BIN_EXE_rollsleuth"))
        .args(["diagnose", "--date", "2026-02-30", "--out"])
        .arg(&dir)
        .output()
        .unwrap();
    assert_eq!(o.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&o.stderr).contains("YYYY-MM-DD"));
    assert!(!dir.exists() || std::fs::read_dir(&dir).unwrap().next().is_none());
}

#[test]
fn the_same_case_gives_the_same_report_bytes_and_today_reads_the_clock() {
    let (a, b) = (out_dir("same-a"), out_dir("same-b"));
    let (ca, _, fa) = report(&[], &a);
    let (cb, _, fb) = report(&[], &b);
    assert_eq!(ca, cb);
    assert_eq!(fa.len(), 3);
    assert_eq!(fa, fb, "same input, same bytes");
    let c = out_dir("today");
    let o = Command::new(env!("CARGO_BIN_EXE_rollsleuth"))
        .args(["diagnose", "--date", "today", "--out"])
        .arg(&c)
        .output()
        .unwrap();
    assert!(matches!(o.status.code(), Some(0 | 1)));
    let html = std::fs::read_to_string(c.join("NVP-PM3-24117-R06.html")).unwrap();
    let doc = check_structure(&html);
    let date = keyed(&doc, "date");
    let bytes = date.as_bytes();
    assert!(
        bytes.len() == 10
            && bytes[4] == b'-'
            && bytes[7] == b'-'
            && date.chars().filter(|c| c.is_ascii_digit()).count() == 8
            && date.as_str() >= "2026-01-01",
        "{date}"
    );
    for d in [a, b, c] {
        let _ = std::fs::remove_dir_all(d);
    }
}
