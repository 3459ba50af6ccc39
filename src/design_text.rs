//! The design as text (links and design files), split out of the main wasm
//! module: every (de)serialiser of the design lives behind these split
//! functions ([`crate::split`]) and loads the first time one is called.
//! A first visit without a link draws the circuit view without them; a
//! link, a session to restore, the first edit (the address follows it),
//! an export or an import loads them. Natively they are plain calls.
//!
//! The formats are [`crate::url_codec`] (docs/url-format.md) and
//! [`kneepoint_engine::io`] (docs/design-format.md).

use kneepoint_engine::{io, Design, UnitSystem};
use leptos::wasm_split::wasm_split;

use crate::split::Unloaded;
use crate::url_codec::{self, Shared};

/// What failed: the text itself, or loading the code that reads it.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum TextError {
    /// The text is not what it should be; the message says why.
    Bad(String),
    /// The design-text module could not be loaded.
    Unloaded,
}

impl From<leptos::wasm_split::SplitLoaderError> for TextError {
    fn from(_: leptos::wasm_split::SplitLoaderError) -> Self {
        TextError::Unloaded
    }
}

impl TextError {
    /// The notice to show.
    pub fn message(&self) -> String {
        match self {
            TextError::Bad(m) => m.clone(),
            TextError::Unloaded => {
                Unloaded::message("The code that reads and writes designs")
            }
        }
    }
}

/// Reads a link fragment; a bad link's error is the notice to show.
#[wasm_split(kneepoint_decode_link, wasm_split_path = ::leptos::wasm_split, fallible)]
pub fn decode_link(fragment: String) -> Result<Shared, TextError> {
    url_codec::decode(&fragment).map_err(|e| TextError::Bad(e.message()))
}

/// The link fragment of a design, its units and its open view.
#[wasm_split(kneepoint_encode_link, wasm_split_path = ::leptos::wasm_split, fallible)]
pub fn encode_link(
    design: Design,
    units: UnitSystem,
    view: String,
) -> Result<String, Unloaded> {
    Ok(url_codec::encode(&design, units, Some(&view)))
}

/// The design file text of `design` (the command line's format).
#[wasm_split(kneepoint_design_file, wasm_split_path = ::leptos::wasm_split, fallible)]
pub fn design_file(design: Design) -> Result<String, Unloaded> {
    Ok(io::design_to_json(&design))
}

/// Reads a design file; the error says what is wrong with it.
#[wasm_split(kneepoint_read_design_file, wasm_split_path = ::leptos::wasm_split, fallible)]
pub fn read_design_file(text: String) -> Result<Design, TextError> {
    io::parse_design(&text).map_err(|e| TextError::Bad(e.to_string()))
}
