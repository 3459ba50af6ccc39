//! Saved designs: names and stored text. Each design is stored under its
//! own key (`kneepoint.preset.<name>`) as a design file (the JSON the
//! command line reads), so one damaged entry never hides the others.
//! Pure, no web crates.

use kneepoint_engine::io;
use kneepoint_engine::Design;

/// Longest name (characters).
pub const MAX_NAME: usize = 60;

/// One stored entry, read.
#[derive(Clone, Debug, PartialEq)]
pub enum Entry {
    /// A readable design.
    Design {
        /// Its name.
        name: String,
        /// The design.
        design: Box<Design>,
    },
    /// An entry that could not be read: reported, skipped, left in place.
    Broken {
        /// Its name.
        name: String,
        /// Why it could not be read.
        reason: String,
    },
}

impl Entry {
    /// The name of the entry.
    pub fn name(&self) -> &str {
        match self {
            Entry::Design { name, .. } | Entry::Broken { name, .. } => name,
        }
    }
}

/// Reads one stored entry. `text` is `None` when the key vanished.
pub fn read_entry(name: &str, text: Option<&str>) -> Entry {
    match text.map(io::parse_design) {
        Some(Ok(design)) => Entry::Design {
            name: name.to_string(),
            design: Box::new(design),
        },
        Some(Err(e)) => Entry::Broken {
            name: name.to_string(),
            reason: e.to_string(),
        },
        None => Entry::Broken {
            name: name.to_string(),
            reason: "the entry is empty".into(),
        },
    }
}

/// A name as it will be stored: trimmed, not empty, no control characters,
/// at most [`MAX_NAME`] characters.
///
/// # Errors
/// What is wrong with the name, for people.
pub fn clean_name(raw: &str) -> Result<String, String> {
    let n = raw.trim();
    if n.is_empty() {
        return Err("Give the design a name.".into());
    }
    if n.chars().any(char::is_control) {
        return Err("A name cannot hold line breaks or tabs.".into());
    }
    if n.chars().count() > MAX_NAME {
        return Err(format!("A name can have at most {MAX_NAME} characters."));
    }
    Ok(n.to_string())
}

/// The text stored for `design` saved as `name`.
pub fn stored_text(name: &str, design: &Design) -> String {
    let mut d = design.clone();
    d.name = name.to_string();
    io::design_to_json(&d)
}

/// A file name for exporting `name`: letters, digits and dashes.
pub fn file_name(name: &str) -> String {
    let mut s: String = name
        .chars()
        .map(|c| {
            if c.is_alphanumeric() {
                c.to_ascii_lowercase()
            } else {
                '-'
            }
        })
        .collect();
    while s.contains("--") {
        s = s.replace("--", "-");
    }
    let s = s.trim_matches('-');
    format!("{}.kneepoint.json", if s.is_empty() { "design" } else { s })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn stored_designs_read_back_and_broken_ones_are_reported() {
        let d = Design::default();
        let text = stored_text("Line 3 press", &d);
        match read_entry("Line 3 press", Some(&text)) {
            Entry::Design { name, design } => {
                assert_eq!(name, "Line 3 press");
                assert_eq!(design.name, "Line 3 press");
                assert_eq!(design.cylinder, d.cylinder);
            }
            other => panic!("expected a design, got {other:?}"),
        }
        for bad in ["{not json", "[]", "{\"format\":1}", ""] {
            let e = read_entry("x", Some(bad));
            assert!(matches!(e, Entry::Broken { .. }), "{bad:?}");
            assert_eq!(e.name(), "x");
        }
        assert!(matches!(read_entry("gone", None), Entry::Broken { .. }));
    }

    #[test]
    fn names_are_cleaned() {
        assert_eq!(clean_name("  Baler 2 "), Ok("Baler 2".into()));
        assert!(clean_name("   ").is_err());
        assert!(clean_name("a\nb").is_err());
        assert!(clean_name(&"x".repeat(61)).is_err());
        assert!(clean_name(&"é".repeat(60)).is_ok());
    }

    #[test]
    fn file_names_are_plain() {
        assert_eq!(file_name("Line 3 / press"), "line-3-press.kneepoint.json");
        assert_eq!(file_name("***"), "design.kneepoint.json");
    }
}
