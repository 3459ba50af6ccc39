//! # kneepoint-engine
//!
//! The physics of a two-pump high-low (hi-lo) hydraulic circuit: a large and
//! a small fixed pump on one shaft, a check valve, an unloading valve piloted
//! from system pressure, a relief valve, a directional valve and a cylinder.
//!
//! Pure functions over plain data: SI inside, no I/O, no clocks, no
//! randomness, no panics on any input. Units belong to [`units`], at the
//! boundary. Every equation names its source in its docs; `docs/method.md`
//! collects them.
//!
//! ```
//! use kneepoint_engine::{evaluate, Design, Motion};
//! let report = evaluate(&Design::default()).expect("the demo design is valid");
//! let approach = report.motion(Motion::Approach).expect("reachable");
//! assert!(approach.speed_ms > 0.0);
//! ```
#![forbid(unsafe_code)]
#![deny(missing_docs)]

pub mod circuit;
pub mod curves;
pub mod cycle;
pub mod design;
pub mod error;
pub mod faults;
pub mod field;
pub mod fields;
pub mod figures;
pub mod heat;
pub mod io;
pub mod lines;
pub mod motion;
pub mod motor;
pub mod report;
pub mod units;
pub mod warnings;

pub use circuit::{Circuit, PumpLosses, PumpPoint, Regime, ValvePath};
pub use design::{example, Design, DESIGN_FORMAT, EXAMPLES};
pub use error::{ErrorKind, FieldError, SolveError, ValidationErrors};
pub use motion::{Direction, Motion, MotionPoint};
pub use report::{evaluate, evaluate_circuit, Report};
pub use units::{Quantity, UnitSystem};
