//! Text helpers shared by the SVG figures and the HTML page.
//!
//! In: arbitrary strings and `f64` values. Out: text safe to put between tags or inside
//! a double-quoted attribute, and numbers written the same way on every run (fixed
//! decimals, no `-0`), so generated files are reproducible byte for byte.
//!
//! # References
//! 1. W3C, "Extensible Markup Language (XML) 1.0 (Fifth Edition)", 2008, section 2.4:
//!    `<` and `&` must be escaped in character data, and the quote delimiting an
//!    attribute value inside it.
//! 2. WHATWG, "HTML Living Standard", section 13.1.2.3 (attribute values) and 13.1.3
//!    (text): the same five characters cover both element content and attributes.

/// `s` with `& < > " '` replaced by entities, fit for element text and attribute values.
pub(crate) fn escape(s: &str) -> String {
    let mut out = String::with_capacity(s.len());
    for c in s.chars() {
        match c {
            '&' => out.push_str("&amp;"),
            '<' => out.push_str("&lt;"),
            '>' => out.push_str("&gt;"),
            '"' => out.push_str("&quot;"),
            '\'' => out.push_str("&#39;"),
            // Control characters other than tab and newline are not allowed in XML 1.0.
            c if c.is_control() && c != '\t' && c != '\n' => out.push('\u{FFFD}'),
            c => out.push(c),
        }
    }
    out
}

/// `v` with `decimals` digits after the point, `0` in place of `-0` (`-0.00` included).
pub(crate) fn fixed(v: f64, decimals: usize) -> String {
    let text = format!("{v:.decimals$}");
    if text.starts_with('-') && text[1..].chars().all(|c| c == '0' || c == '.') {
        text[1..].to_string()
    } else {
        text
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn escape_replaces_the_five_markup_characters() {
        assert_eq!(
            escape(r#"<a href="x">&'</a>"#),
            "&lt;a href=&quot;x&quot;&gt;&amp;&#39;&lt;/a&gt;"
        );
    }

    #[test]
    fn escape_replaces_control_characters_but_keeps_tab_newline_and_unicode() {
        assert_eq!(escape("a\u{0}b\tc\nd µ"), "a\u{FFFD}b\tc\nd µ");
    }

    #[test]
    fn fixed_never_writes_negative_zero() {
        assert_eq!(fixed(-0.0, 2), "0.00");
        assert_eq!(fixed(-0.001, 2), "0.00");
        assert_eq!(fixed(-0.006, 2), "-0.01");
        assert_eq!(fixed(12.345, 1), "12.3");
    }
}
