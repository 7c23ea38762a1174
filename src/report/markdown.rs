//! The root-cause report as Markdown for pasting into tickets: the same content as the HTML
//! report without the plots (it names the HTML file that has them), and no link to anything.
//! Every text passes through [`super::escape::markdown`].

use super::document::{build, Block, Span};
use super::escape::markdown as esc;
use super::report_data::ReportData;
use std::fmt::Write;

fn spans(v: &[Span]) -> String {
    v.iter()
        .map(|s| {
            // our own identifiers (feature names) as code, unescaped
            let ident = s.text.contains('_')
                && s.text
                    .chars()
                    .all(|c| c.is_ascii_lowercase() || c.is_ascii_digit() || c == '_' || c == '.');
            if ident {
                return format!("`{}`", s.text);
            }
            let t = esc(&s.text);
            if s.strong && !t.trim().is_empty() {
                let inner = t.trim_end();
                let tail = &t[inner.len()..];
                format!("**{inner}**{tail}")
            } else {
                t
            }
        })
        .collect()
}

/// The report as Markdown; `html_file` is the name of the HTML report that holds the plots.
pub fn render(r: &ReportData, html_file: &str) -> String {
    let mut o = String::new();
    for block in build(r) {
        match block {
            Block::Heading(level, text, _) => {
                let _ = writeln!(
                    o,
                    "{} {}\n",
                    "#".repeat(level.clamp(1, 3) as usize),
                    esc(&text)
                );
            }
            Block::Para(v) => {
                let _ = writeln!(o, "{}\n", spans(&v));
            }
            Block::List(items) => {
                for it in items {
                    let _ = writeln!(o, "- {}", spans(&it));
                }
                o.push('\n');
            }
            Block::Boxed(lines) => {
                for l in lines {
                    let _ = writeln!(o, "> {}", spans(&l));
                    o.push_str(">\n");
                }
                o.truncate(o.len() - 2);
                o.push('\n');
            }
            Block::Table { head, rows } => {
                let _ = writeln!(
                    o,
                    "| {} |",
                    head.iter().map(|h| esc(h)).collect::<Vec<_>>().join(" | ")
                );
                let _ = writeln!(o, "|{}", "---|".repeat(head.len()));
                for row in rows {
                    let _ = writeln!(
                        o,
                        "| {} |",
                        row.iter()
                            .map(|c| spans(std::slice::from_ref(c)))
                            .collect::<Vec<_>>()
                            .join(" | ")
                    );
                }
                o.push('\n');
            }
            Block::Plots => {
                let _ = writeln!(
                    o,
                    "The plots (lane length at unwind, root-cause shares and corrections, measured against predicted hardness and diameter, pressure and MD stress against radius, moisture through storage) are in the HTML report, {}.\n",
                    esc(html_file)
                );
            }
        }
    }
    o
}
