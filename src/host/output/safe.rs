//! User text in generated code: only inside comments, and only after this module has made it
//! inert there. Identifiers never come from here: they are derived from a safe alphabet by
//! [`crate::host::ident`].
//!
//! What is removed or broken up, and why:
//! - control characters (line breaks above all): a newline ends a Rust `//` comment and lets
//!   the rest of the name become code; a bare carriage return is an error in a Rust doc
//!   comment;
//! - Unicode format characters (bidirectional overrides and isolates, zero-width characters,
//!   the line and paragraph separators): text that reads differently from what compiles;
//! - `*/` and `/*`: the end (or a nested start) of a C block comment;
//! - `??`: the start of a C trigraph (`??/` is a backslash under `-std=c99`);
//! - a trailing backslash: a line splice.
//!
//! Every other character is kept, so paths and names still read as written.

use std::string::String;

/// True for a character that never reaches generated text.
fn hidden(c: char) -> bool {
    c.is_control()
        || matches!(c,
            '\u{00AD}' | '\u{061C}' | '\u{180E}'
            | '\u{200B}'..='\u{200F}'
            | '\u{2028}'..='\u{202E}'
            | '\u{2060}'..='\u{206F}'
            | '\u{FEFF}' | '\u{FFF9}'..='\u{FFFB}')
}

/// `text` made inert inside a Rust line comment or a C block comment (one line).
pub fn comment(text: &str) -> String {
    let mut s: String = text
        .chars()
        .map(|c| if hidden(c) { ' ' } else { c })
        .collect();
    for (from, to) in [("*/", "* /"), ("/*", "/ *"), ("??", "? ?")] {
        while s.contains(from) {
            s = s.replace(from, to);
        }
    }
    while s.ends_with('\\') {
        s.pop();
    }
    s
}

#[cfg(test)]
mod tests {
    use super::comment;

    #[test]
    fn no_comment_can_be_closed_or_left() {
        for t in [
            "valve */ int injected; /*",
            "a\npub fn x() {}",
            "x\r\u{2028}y\u{202E}z",
            "??/",
            "*/*/*//**/",
            "ends with \\",
        ] {
            let c = comment(t);
            assert!(!c.contains("*/") && !c.contains("/*"), "{c}");
            assert!(!c.contains("??") && !c.ends_with('\\'), "{c}");
            assert!(c.chars().all(|ch| !ch.is_control()), "{c:?}");
            assert!(!c.contains('\u{2028}') && !c.contains('\u{202E}'), "{c:?}");
        }
        assert_eq!(comment("pump relay (12 V)"), "pump relay (12 V)");
    }
}
