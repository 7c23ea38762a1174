//! Escaping user text (case id, title, notes, place names) for HTML, SVG and Markdown.
//!
//! Every string that comes from a case file passes through here before it reaches a report.
//! Characters XML 1.0 does not allow (C0 controls other than tab, line feed and carriage return;
//! U+FFFE, U+FFFF) are dropped, so the HTML stays parseable as XML.

/// Whether XML 1.0 allows the character (production `Char`, W3C XML 1.0, section 2.2).
fn xml_char(c: char) -> bool {
    matches!(c, '\t' | '\n' | '\r')
        || (c >= ' ' && !('\u{7f}'..='\u{9f}').contains(&c) && c != '\u{fffe}' && c != '\u{ffff}')
}

/// Text for an HTML or SVG element or a quoted attribute: `&`, `<`, `>`, `"` and `'` become
/// entities; characters XML does not allow are dropped.
pub fn html(s: &str) -> String {
    let mut out = String::with_capacity(s.len() + 8);
    for c in s.chars().filter(|&c| xml_char(c)) {
        match c {
            '&' => out.push_str("&amp;"),
            '<' => out.push_str("&lt;"),
            '>' => out.push_str("&gt;"),
            '"' => out.push_str("&quot;"),
            '\'' => out.push_str("&#39;"),
            c => out.push(c),
        }
    }
    out
}

/// Text handed to the plotting library, which escapes the five XML characters itself: only the
/// characters XML does not allow are dropped, and the text is bounded to `max` characters.
pub fn plot_text(s: &str, max: usize) -> String {
    let t: String = s.chars().filter(|&c| xml_char(c) && c >= ' ').collect();
    if t.chars().count() > max {
        let mut cut: String = t.chars().take(max.saturating_sub(1)).collect();
        cut.push('…');
        cut
    } else {
        t
    }
}

/// Text for a Markdown table cell or line: `&`, `<` and `>` as entities (Markdown renderers pass
/// raw HTML through), `|` escaped, line breaks turned into spaces and Markdown's emphasis, link and
/// heading characters backslash-escaped.
pub fn markdown(s: &str) -> String {
    let mut out = String::with_capacity(s.len() + 8);
    for c in s.chars().filter(|&c| xml_char(c)) {
        match c {
            '\n' | '\r' | '\t' => out.push(' '),
            '|' | '*' | '_' | '`' | '[' | ']' | '#' | '\\' | '!' => {
                out.push('\\');
                out.push(c);
            }
            '&' | '<' | '>' => out.push_str(&html(&c.to_string())),
            c => out.push(c),
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn html_escapes_the_five_xml_characters_and_drops_controls() {
        assert_eq!(
            html("a&b<c>d\"e'f\u{1}g\u{7f}ü"),
            "a&amp;b&lt;c&gt;d&quot;e&#39;fgü"
        );
    }

    #[test]
    fn plot_text_is_bounded() {
        assert_eq!(plot_text("abcdef", 4), "abc…");
        assert_eq!(plot_text("a\nb", 4), "ab");
    }

    #[test]
    fn markdown_escapes_table_and_emphasis_characters() {
        assert_eq!(markdown("a|b*c\nd<'"), "a\\|b\\*c d&lt;'");
    }
}
