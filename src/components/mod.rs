//! Building blocks of the views.

pub mod charts;
pub mod field;
pub mod presets;
pub mod results;
pub mod safety;
