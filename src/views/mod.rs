//! The views of the app. Each is a page of its own under the header's view
//! switcher ([`crate::state::ViewId`]); all share [`crate::state::AppState`].

pub mod circuit;
pub mod cycle;
pub mod field;
