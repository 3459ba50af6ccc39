//! Kneepoint in the browser: inputs, charts and results around the engine.
//!
//! Machine check, pure: [`field_form`], [`field_record`], [`diagram_geom`].
//! Pure modules (no web crates, unit-tested natively): [`fmt`], [`ticks`],
//! [`chart`], [`url_codec`], [`base64url`], [`motor`], [`model`],
//! [`summary`], [`presets`], [`timeline_geom`]. Reactive state: [`state`]. Browser glue:
//! [`browser`]. Components and views: [`components`], [`views`], [`app`].
#![forbid(unsafe_code)]

pub mod app;
pub mod base64url;
pub mod browser;
pub mod chart;
pub mod components;
pub mod diagram_geom;
pub mod field_form;
pub mod field_record;
pub mod fmt;
pub mod model;
pub mod motor;
pub mod presets;
pub mod state;
pub mod summary;
pub mod ticks;
pub mod timeline_geom;
pub mod url_codec;
pub mod views;
