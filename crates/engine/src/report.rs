//! One call that evaluates a whole design: [`evaluate`].

use serde::Serialize;

use crate::circuit::Circuit;
use crate::curves::{curves, Curves};
use crate::error::{SolveError, ValidationErrors};
use crate::figures::{corners, settings_check, Corners, SettingsCheck};
use crate::motion::{max_force, Direction, Motion, MotionPoint};
use crate::warnings::{warnings, Warning};
use crate::Design;

/// Fixed figures of the circuit (SI).
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct Summary {
    /// Cap-end area (m²).
    pub cap_area_m2: f64,
    /// Annulus area (m²).
    pub annulus_area_m2: f64,
    /// Area ratio φ.
    pub area_ratio: f64,
    /// Large pump theoretical flow (m³/s).
    pub large_theoretical_flow_m3s: f64,
    /// Small pump theoretical flow (m³/s).
    pub small_theoretical_flow_m3s: f64,
    /// Displacement ratio V_L/V_S.
    pub pump_ratio: f64,
    /// Extend force at relief full flow, zero speed (N).
    pub max_extend_force_n: f64,
    /// Retract force at relief full flow, zero speed (N).
    pub max_retract_force_n: f64,
}

/// The outcome of one motion.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct MotionResult {
    /// Which motion.
    pub motion: Motion,
    /// Its operating point, or why there is none.
    pub result: Result<MotionPoint, SolveError>,
}

/// Everything the steady-state engine says about one design.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct Report {
    /// Fixed figures.
    pub summary: Summary,
    /// Approach, pressing and retract.
    pub motions: Vec<MotionResult>,
    /// Corner powers and equal-corner settings.
    pub corners: Corners,
    /// The settings check.
    pub settings: SettingsCheck,
    /// Curves for the charts.
    pub curves: Curves,
    /// Warnings, each with what to do.
    pub warnings: Vec<Warning>,
}

impl Report {
    /// The operating point of `m`, if it was reached.
    pub fn motion(&self, m: Motion) -> Option<&MotionPoint> {
        self.motions
            .iter()
            .find(|r| r.motion == m)
            .and_then(|r| r.result.as_ref().ok())
    }
}

/// Validates and evaluates a design at steady state.
///
/// # Errors
/// The design's field errors, all at once.
pub fn evaluate(design: &Design) -> Result<Report, ValidationErrors> {
    let c = Circuit::new(design)?;
    Ok(evaluate_circuit(&c))
}

/// Evaluates an already validated circuit.
pub fn evaluate_circuit(c: &Circuit) -> Report {
    let d = c.design();
    let motions: Vec<(Motion, Result<MotionPoint, SolveError>)> =
        Motion::ALL.iter().map(|&m| (m, c.motion(m))).collect();
    let corners = corners(c);
    let settings = settings_check(c);
    let warnings = warnings(c, &motions, &corners, &settings);
    Report {
        summary: Summary {
            cap_area_m2: c.cap_area(),
            annulus_area_m2: c.annulus_area(),
            area_ratio: c.area_ratio(),
            large_theoretical_flow_m3s: c.large_theoretical_flow(),
            small_theoretical_flow_m3s: c.small_theoretical_flow(),
            pump_ratio: d.large_pump.displacement_m3 / d.small_pump.displacement_m3,
            max_extend_force_n: max_force(c, Direction::Extend),
            max_retract_force_n: max_force(c, Direction::Retract),
        },
        motions: motions
            .into_iter()
            .map(|(motion, result)| MotionResult { motion, result })
            .collect(),
        corners,
        settings,
        curves: curves(c),
        warnings,
    }
}
