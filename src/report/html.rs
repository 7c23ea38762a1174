//! The root-cause report as one self-contained HTML file: inline CSS and inline SVG plots, no
//! scripts, no links to other files or the network, printable on A4 or Letter.
//!
//! Written as polyglot markup (XHTML-compatible HTML5): every element closed, attributes quoted,
//! so an XML parser can check it. Every text passes through [`super::escape::html`].

use super::chart::Plot;
use super::document::{build, Block, Span};
use super::escape::html as esc;
use super::plots;
use super::report_data::ReportData;
use std::fmt::Write;

/// The report's style sheet: screen and print (A4 or Letter, whichever the printer uses).
const CSS: &str = r#"
body { font-family: DejaVu Sans, Helvetica, Arial, sans-serif; font-size: 10.5pt; line-height: 1.4;
  color: #111; background: #fff; max-width: 190mm; margin: 8mm auto; padding: 0 6mm; }
h1 { font-size: 17pt; margin: 0 0 4pt 0; }
h2 { font-size: 13pt; margin: 16pt 0 6pt 0; border-bottom: 1px solid #888; }
h3 { font-size: 11pt; margin: 12pt 0 4pt 0; }
p { margin: 4pt 0; overflow-wrap: anywhere; }
.box { border: 1.5px solid #333; padding: 6pt 9pt; margin: 8pt 0; background: #f6f6f6; }
.box p { margin: 2pt 0; }
table { border-collapse: collapse; margin: 4pt 0 8pt 0; width: 100%; font-size: 9pt; }
th, td { border: 1px solid #999; padding: 2pt 4pt; text-align: left; vertical-align: top;
  overflow-wrap: break-word; hyphens: manual; }
td.n { white-space: nowrap; overflow-wrap: normal; }
th { background: #e8e8e8; }
thead { display: table-header-group; }
tr { page-break-inside: avoid; break-inside: avoid; }
figure { margin: 8pt 0 12pt 0; page-break-inside: avoid; break-inside: avoid; }
figure svg { width: 100%; height: auto; display: block; }
figcaption { font-size: 9pt; color: #333; }
ul { margin: 4pt 0; padding-left: 16pt; }
@page { margin: 14mm 12mm; }
@media print {
  body { max-width: none; margin: 0; padding: 0; font-size: 9.5pt; }
  h2 { page-break-after: avoid; break-after: avoid; }
  .box { background: none; }
}
"#;

/// Whether a text is one of our identifiers (a feature or field name such as `spread_mm_per_m`).
fn identifier(s: &str) -> bool {
    s.contains('_')
        && s.chars()
            .all(|c| c.is_ascii_lowercase() || c.is_ascii_digit() || c == '_' || c == '.')
}

fn spans(out: &mut String, v: &[Span]) {
    for s in v {
        let mut text = esc(&s.text);
        if identifier(&s.text) {
            // let long identifiers wrap after an underscore, not inside a word
            text = text.replace('_', "_<wbr />");
        }
        match (&s.key, s.strong) {
            (Some(k), true) => {
                let _ = write!(out, "<strong data-key=\"{}\">{text}</strong>", esc(k));
            }
            (Some(k), false) => {
                let _ = write!(out, "<span data-key=\"{}\">{text}</span>", esc(k));
            }
            (None, true) => {
                let _ = write!(out, "<strong>{text}</strong>");
            }
            (None, false) => out.push_str(&text),
        }
    }
}

/// Whether a cell holds a short number with its unit (kept on one line).
fn numeric(s: &str) -> bool {
    s.len() <= 24
        && s.chars()
            .next()
            .is_some_and(|c| c.is_ascii_digit() || c == '-' || c == '+')
}

/// The SVG of a plot without anything before its `<svg` element.
fn inline_svg(p: &Plot) -> &str {
    let s = p.svg.as_str();
    s.find("<svg").map(|i| &s[i..]).unwrap_or(s).trim_end()
}

/// The report as HTML.
pub fn render(r: &ReportData) -> String {
    render_with(r, &plots::all(r))
}

/// The report as HTML with the given plots.
pub fn render_with(r: &ReportData, plots: &[Plot]) -> String {
    let mut o = String::new();
    let _ = write!(
        o,
        "<!DOCTYPE html>\n<html xmlns=\"http://www.w3.org/1999/xhtml\" lang=\"en\" xml:lang=\"en\">\n<head>\n<meta charset=\"utf-8\" />\n<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\" />\n<title>Root-cause report: {}</title>\n<style>{CSS}</style>\n</head>\n<body>\n",
        esc(&r.case.id)
    );
    for block in build(r) {
        match block {
            Block::Heading(level, text, id) => {
                let level = level.clamp(1, 3);
                if id.is_empty() {
                    let _ = writeln!(o, "<h{level}>{}</h{level}>", esc(&text));
                } else {
                    let _ = writeln!(o, "<h{level} id=\"{id}\">{}</h{level}>", esc(&text));
                }
            }
            Block::Para(v) => {
                o.push_str("<p>");
                spans(&mut o, &v);
                o.push_str("</p>\n");
            }
            Block::List(items) => {
                o.push_str("<ul>\n");
                for it in items {
                    o.push_str("<li>");
                    spans(&mut o, &it);
                    o.push_str("</li>\n");
                }
                o.push_str("</ul>\n");
            }
            Block::Boxed(lines) => {
                o.push_str("<div class=\"box\">\n");
                for l in lines {
                    o.push_str("<p>");
                    spans(&mut o, &l);
                    o.push_str("</p>\n");
                }
                o.push_str("</div>\n");
            }
            Block::Table { head, rows } => {
                o.push_str("<table>\n<thead><tr>");
                for h in head {
                    let _ = write!(o, "<th>{}</th>", esc(&h));
                }
                o.push_str("</tr></thead>\n<tbody>\n");
                for row in rows {
                    o.push_str("<tr>");
                    for cell in row {
                        o.push_str(if numeric(&cell.text) {
                            "<td class=\"n\">"
                        } else {
                            "<td>"
                        });
                        spans(&mut o, std::slice::from_ref(&cell));
                        o.push_str("</td>");
                    }
                    o.push_str("</tr>\n");
                }
                o.push_str("</tbody>\n</table>\n");
            }
            Block::Plots => {
                for p in plots {
                    let _ = writeln!(
                        o,
                        "<figure id=\"{}\">\n{}\n<figcaption>{}</figcaption>\n</figure>",
                        p.id,
                        inline_svg(p),
                        esc(&p.caption)
                    );
                }
            }
        }
    }
    o.push_str("</body>\n</html>\n");
    o
}
