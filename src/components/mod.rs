//! Building blocks of the views.

pub mod charts;
pub mod cycle_input;
pub mod cycle_results;
pub mod diagram;
pub mod faults;
pub mod field;
pub mod heat_card;
pub mod motor_card;
pub mod presets;
pub mod readings;
pub mod results;
pub mod safety;
pub mod segments;
pub mod stopwatch;
pub mod timeline;
