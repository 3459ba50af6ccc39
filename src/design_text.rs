//! The design as text (links and design files), split out of the main wasm
//! module: every (de)serialiser of the design lives behind these `#[lazy]`
//! functions and loads the first time one is called (scripts/build-wasm.sh).
//! A first visit without a link draws the circuit view without them; a
//! link, a session to restore, the first edit (the address follows it),
//! an export or an import loads them. Natively they are plain calls.
//!
//! The formats are [`crate::url_codec`] (docs/url-format.md) and
//! [`kneepoint_engine::io`] (docs/design-format.md).

use kneepoint_engine::{io, Design, UnitSystem};
use leptos::prelude::lazy;

use crate::url_codec::{self, Shared};

/// Reads a link fragment; the error is the notice to show.
#[lazy]
pub fn decode_link(fragment: String) -> Result<Shared, String> {
    url_codec::decode(&fragment).map_err(|e| e.message())
}

/// The link fragment of a design, its units and its open view.
#[lazy]
pub fn encode_link(design: Design, units: UnitSystem, view: String) -> String {
    url_codec::encode(&design, units, Some(&view))
}

/// The design file text of `design` (the command line's format).
#[lazy]
pub fn design_file(design: Design) -> String {
    io::design_to_json(&design)
}

/// Reads a design file; the error says what is wrong with it.
#[lazy]
pub fn read_design_file(text: String) -> Result<Design, String> {
    io::parse_design(&text).map_err(|e| e.to_string())
}
