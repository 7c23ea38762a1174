//! Escaping user text (case ids, titles, rule text) before it goes into SVG, HTML or Markdown.

/// Text for an XML/SVG/HTML text node or attribute: `& < > " '` become entities; control
/// characters other than tab and newline are dropped.
pub fn xml(s: &str) -> String {
    let mut out = String::with_capacity(s.len());
    for ch in s.chars() {
        match ch {
            '&' => out.push_str("&amp;"),
            '<' => out.push_str("&lt;"),
            '>' => out.push_str("&gt;"),
            '"' => out.push_str("&quot;"),
            '\'' => out.push_str("&#39;"),
            c if c.is_control() && c != '\t' && c != '\n' => {}
            c => out.push(c),
        }
    }
    out
}

/// Text for one line of Markdown: characters with Markdown or HTML meaning are backslash-escaped,
/// line breaks become spaces (so user text cannot start a heading, list or raw HTML block).
pub fn markdown(s: &str) -> String {
    let mut out = String::with_capacity(s.len());
    for ch in s.chars() {
        match ch {
            '\\' | '`' | '*' | '_' | '[' | ']' | '<' | '>' | '#' | '|' | '&' => {
                out.push('\\');
                out.push(ch);
            }
            '\n' | '\r' => out.push(' '),
            c if c.is_control() && c != '\t' => {}
            c => out.push(c),
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    // Entities from the XML 1.0 specification (W3C, 2008), section 4.6.
    #[test]
    fn xml_special_characters_become_predefined_entities() {
        assert_eq!(
            xml("<script>a & \"b\" 'c'</script>"),
            "&lt;script&gt;a &amp; &quot;b&quot; &#39;c&#39;&lt;/script&gt;"
        );
    }

    // Backslash escapes from the CommonMark specification 0.31, section 2.4.
    #[test]
    fn markdown_text_cannot_open_html_or_a_heading() {
        assert_eq!(markdown("# <b>x</b>\n# y"), "\\# \\<b\\>x\\</b\\> \\# y");
    }
}
