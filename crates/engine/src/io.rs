//! Reading and writing design files (JSON, `docs/design-format.md`).

use std::fmt;

use crate::design::Design;

/// A design file that could not be read.
#[derive(Clone, Debug, PartialEq)]
pub struct ParseError {
    /// Line (1-based) where reading stopped, 0 when unknown.
    pub line: usize,
    /// Column (1-based), 0 when unknown.
    pub column: usize,
    /// What is wrong.
    pub message: String,
}

impl fmt::Display for ParseError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(
            f,
            "line {}, column {}: {}",
            self.line, self.column, self.message
        )
    }
}

impl std::error::Error for ParseError {}

/// Largest design file read (bytes); a bigger one is refused unread.
pub const MAX_FILE_BYTES: usize = 1 << 20;

/// Parses a design file. Does not validate values: see [`crate::Circuit::new`].
///
/// # Errors
/// [`ParseError`] with line and column for malformed JSON, unknown fields,
/// missing fields or wrong types.
pub fn parse_design(text: &str) -> Result<Design, ParseError> {
    if text.len() > MAX_FILE_BYTES {
        return Err(ParseError {
            line: 0,
            column: 0,
            message: format!("file is larger than {} bytes", MAX_FILE_BYTES),
        });
    }
    serde_json::from_str(text).map_err(|e| ParseError {
        line: e.line(),
        column: e.column(),
        message: strip_position(&e.to_string()),
    })
}

fn strip_position(s: &str) -> String {
    match s.rfind(" at line ") {
        Some(i) => s[..i].to_string(),
        None => s.to_string(),
    }
}

/// Writes a design file (pretty JSON, stable field order).
pub fn design_to_json(d: &Design) -> String {
    // Serialising plain data with string keys cannot fail.
    serde_json::to_string_pretty(d).unwrap_or_default()
}
