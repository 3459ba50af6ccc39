//! Kneepoint in the browser: inputs, charts and results around the engine.
//!
//! Pure modules (no web crates, tested natively): [`fmt`], [`ticks`],
//! [`chart`], [`url_codec`], [`base64url`], [`motor`], [`state`].
#![forbid(unsafe_code)]

pub mod base64url;
pub mod chart;
pub mod fmt;
pub mod model;
pub mod motor;
pub mod summary;
pub mod ticks;
pub mod url_codec;
