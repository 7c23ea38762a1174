//! The trade's defect vocabulary, shared by case files (what the complainant saw) and rules.

/// Defect words accepted in case files and rule tables.
pub const WORDS: &[&str] = &[
    "baggy_lane",
    "baggy_center",
    "baggy_edges",
    "puckers",
    "ridges",
    "corrugations",
    "gauge_bands",
    "starring",
    "crepe_wrinkles",
    "telescoping",
    "bursts",
    "none",
];

/// Plain words for a defect identifier ("baggy_center" -> "baggy centre").
pub fn plain(word: &str) -> String {
    match word {
        "baggy_center" => "baggy centre".to_string(),
        w => w.replace('_', " "),
    }
}
