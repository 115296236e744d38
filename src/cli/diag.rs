//! Messages to the user on stderr, all through one place: spelled in ASCII under `--ascii`,
//! with control characters from the input escaped so no text a user pasted can drive the
//! terminal, and never a reason to abort when stderr is closed or full (the exit status
//! still says what happened).

use std::io::Write;
use std::sync::atomic::{AtomicBool, Ordering};

use crate::chem::formula::ParseError;

static ASCII: AtomicBool = AtomicBool::new(false);

/// Spell every message in ASCII from now on.
pub fn set_ascii(on: bool) {
    ASCII.store(on, Ordering::Relaxed);
}

pub fn ascii() -> bool {
    ASCII.load(Ordering::Relaxed)
}

/// Text as it may be shown: control characters (other than the line breaks of the message
/// itself) written as `\x1b`, `\u{9b}`; ASCII spelling when asked.
pub fn show(text: &str) -> String {
    let out = escape_controls(text);
    if ascii() {
        crate::plain::ascii_text(&out)
    } else {
        out.into_owned()
    }
}

/// Write text to stdout-bound `out` with control characters escaped.
pub fn write_clean(out: &mut impl std::io::Write, bytes: &[u8]) -> std::io::Result<()> {
    let text = String::from_utf8_lossy(bytes);
    out.write_all(escape_controls(&text).as_bytes())
}

/// Text bound for stdout with its control characters escaped (line breaks kept); borrowed
/// when there are none, the usual case.
pub fn escape_controls(text: &str) -> std::borrow::Cow<'_, str> {
    if text.chars().all(|c| !c.is_control() || c == '\n') {
        return std::borrow::Cow::Borrowed(text);
    }
    let mut out = String::with_capacity(text.len() + 8);
    for c in text.chars() {
        if c.is_control() && c != '\n' {
            if (c as u32) < 0x100 {
                out.push_str(&format!("\\x{:02x}", c as u32));
            } else {
                out.push_str(&format!("\\u{{{:x}}}", c as u32));
            }
        } else {
            out.push(c);
        }
    }
    std::borrow::Cow::Owned(out)
}

/// A single line of input shown in a message: also its line breaks escaped.
pub fn quote(text: &str) -> String {
    show(&text.replace('\n', "\\n"))
}

/// A formula error with its caret under the shown text.
pub fn parse_error(e: &ParseError) -> String {
    e.render_with(quote)
}

/// Write a line to stderr; a failed write is ignored (there is nowhere else to say it).
pub fn line(text: &str) {
    let mut err = std::io::stderr().lock();
    let _ = writeln!(err, "{}", show(text));
}

/// Several errors in one write (a batch's refused lines): one system call, not one each.
pub fn errors(texts: &[String]) {
    let mut all = String::new();
    for t in texts {
        all.push_str("error: ");
        all.push_str(&show(t));
        all.push('\n');
    }
    let mut err = std::io::stderr().lock();
    let _ = err.write_all(all.as_bytes());
}

pub fn error(text: &str) {
    line(&format!("error: {text}"));
}

pub fn warning(text: &str) {
    line(&format!("warning: {text}"));
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn control_characters_are_escaped() {
        assert_eq!(show("a\u{1b}[31mb\u{7}"), "a\\x1b[31mb\\x07");
        assert_eq!(show("x\u{9b}y"), "x\\x9by");
        assert_eq!(quote("a\nb"), "a\\nb");
    }
}
