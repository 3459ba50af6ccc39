//! What a duty-cycle evaluation returns (SI), shaped for tables and charts.

use std::fmt;

use serde::Serialize;

use crate::circuit::Regime;
use crate::cycle::spec::SegmentKind;
use crate::motor::{MotorSeries, Rating};
use crate::units::{format, Quantity, UnitSystem};

/// Heat by where it is made (J).
#[derive(Clone, Copy, Debug, PartialEq, Serialize, Default)]
pub struct HeatBySource {
    /// Flow over the relief valve.
    pub relief_j: f64,
    /// The unloaded large pump's flow against its back-pressure.
    pub unloaded_j: f64,
    /// Directional valve, lines, check valve, valve centre, and released
    /// compressed oil.
    pub valves_lines_j: f64,
    /// Pump friction and internal leakage.
    pub pumps_j: f64,
}

impl HeatBySource {
    /// Sum (J).
    pub fn total(&self) -> f64 {
        self.relief_j + self.unloaded_j + self.valves_lines_j + self.pumps_j
    }
}

/// The outcome of one segment.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct SegmentResult {
    /// Position in the profile.
    pub index: usize,
    /// What kind of segment.
    pub kind: SegmentKind,
    /// Label for people ("pressing").
    pub label: &'static str,
    /// Cycle time at its start (s).
    pub start_s: f64,
    /// Its duration (s).
    pub time_s: f64,
    /// Travel (m).
    pub distance_m: f64,
    /// Piston position at start and end, from fully retracted (m).
    pub x_start_m: f64,
    /// See `x_start_m`.
    pub x_end_m: f64,
    /// Lowest and highest system pressure (Pa).
    pub pressure_min_pa: f64,
    /// See `pressure_min_pa`.
    pub pressure_max_pa: f64,
    /// Lowest and highest piston speed while moving at steady pressure,
    /// zero when the segment does not travel (m/s).
    pub speed_min_ms: f64,
    /// See `speed_min_ms`.
    pub speed_max_ms: f64,
    /// Mean speed, distance/time (m/s).
    pub mean_speed_ms: f64,
    /// Shaft energy in (J).
    pub energy_in_j: f64,
    /// Work done on the load, ∫F·dx (J).
    pub work_out_j: f64,
    /// Heat by source (J).
    pub heat: HeatBySource,
    /// Change of the energy held in compressed oil (J); it is released as
    /// heat later (decompression).
    pub stored_change_j: f64,
    /// Peak shaft power (W).
    pub peak_power_w: f64,
    /// RMS shaft power over the segment (W); 0 for a zero-time segment.
    pub rms_power_w: f64,
    /// Peak shaft torque (N·m).
    pub peak_torque_nm: f64,
    /// Time spent with the unloader part-open (regime II) (s).
    pub unloading_time_s: f64,
    /// Time with the relief passing flow (s).
    pub relief_time_s: f64,
    /// Integration panels used (the user-visible step count).
    pub panels: u32,
}

/// Whole-cycle figures.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct CycleTotals {
    /// Cycle time (s).
    pub cycle_time_s: f64,
    /// Cycles per hour, 3600/T.
    pub cycles_per_hour: f64,
    /// Shaft energy per cycle (J).
    pub energy_in_j: f64,
    /// Electrical energy per cycle, shaft energy / motor efficiency (J).
    pub electrical_energy_j: f64,
    /// Work done on the load per cycle (J).
    pub work_out_j: f64,
    /// Heat by source per cycle (J).
    pub heat: HeatBySource,
    /// Energy still held in compressed oil at the end of the cycle (J).
    pub stored_end_j: f64,
    /// Mean shaft power (W).
    pub mean_power_w: f64,
    /// Peak shaft power (W).
    pub peak_power_w: f64,
    /// RMS shaft power (W).
    pub rms_power_w: f64,
    /// Peak shaft torque (N·m).
    pub peak_torque_nm: f64,
    /// Highest system pressure (Pa).
    pub pressure_max_pa: f64,
}

/// The motor figures (brief §6).
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct MotorReport {
    /// Series chosen from.
    pub series: MotorSeries,
    /// Margin over RMS (fraction).
    pub margin_fraction: f64,
    /// Peak allowance k.
    pub peak_allowance: f64,
    /// Smallest rating the checks allow before rounding: max(P_rms·(1+m), P_peak/k) (W).
    pub minimum_w: f64,
    /// The smallest standard rating that passes, if the series has one.
    pub recommended: Option<Rating>,
    /// The rating checked: the chosen one, else the recommendation (W).
    pub checked_rating_w: Option<f64>,
    /// True when `checked_rating_w` is the user's choice.
    pub checked_is_chosen: bool,
    /// Peak power as a fraction of the checked rating.
    pub peak_loading: Option<f64>,
    /// RMS power as a fraction of the checked rating.
    pub rms_loading: Option<f64>,
    /// Mean electrical input (W).
    pub electrical_mean_w: f64,
    /// Peak electrical input (W).
    pub electrical_peak_w: f64,
    /// Motor efficiency used.
    pub motor_efficiency: f64,
}

/// Reservoir and heat figures (brief §7).
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct HeatReport {
    /// Mean heat into the oil, (E_in − W − stored at end)/T (W).
    pub mean_heat_w: f64,
    /// Oil temperature rise across the relief at full flow, Δp/(ρ c_p) (K).
    pub relief_rise_k: f64,
    /// Rise across the unloader at the unloaded back-pressure (K).
    pub unloader_rise_k: f64,
    /// Oil in the tank (m³), entered or by the 3-minute rule.
    pub oil_volume_m3: f64,
    /// True when `oil_volume_m3` came from the rule.
    pub oil_volume_estimated: bool,
    /// Oil-wetted area (m²), entered or estimated.
    pub wetted_area_m2: f64,
    /// True when `wetted_area_m2` was estimated.
    pub wetted_area_estimated: bool,
    /// Heat-transfer coefficient used (W/(m²·K)).
    pub heat_transfer_w_m2k: f64,
    /// Steady rise with no cooler, P/(U·A) (K).
    pub steady_rise_k: f64,
    /// Steady oil temperature with no cooler (°C).
    pub steady_oil_c: f64,
    /// Time constant m·c_p/(U·A) (s).
    pub time_constant_s: f64,
    /// Ambient (°C).
    pub ambient_c: f64,
    /// Highest oil temperature allowed (°C).
    pub max_oil_c: f64,
    /// Wetted area for the allowed rise without a cooler (m²).
    pub area_needed_m2: f64,
    /// Cooler rating needed for the allowed rise (W); 0 when none.
    pub cooler_w: f64,
}

/// Which requirement.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum RequirementKind {
    /// Mean approach speed.
    ApproachSpeed,
    /// Mean pressing speed.
    PressingSpeed,
    /// Cycle time.
    CycleTime,
}

/// A single design change that would meet a missed requirement.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
#[serde(tag = "kind", rename_all = "snake_case")]
#[non_exhaustive]
pub enum Change {
    /// Small-pump displacement (m³/rev).
    SmallPumpDisplacement {
        /// Now.
        from_m3: f64,
        /// Needed.
        to_m3: f64,
    },
    /// Large-pump displacement (m³/rev).
    LargePumpDisplacement {
        /// Now.
        from_m3: f64,
        /// Needed.
        to_m3: f64,
    },
}

impl Change {
    /// Dotted path of the design field to change.
    pub fn field(&self) -> &'static str {
        match self {
            Change::SmallPumpDisplacement { .. } => "small_pump.displacement_m3",
            Change::LargePumpDisplacement { .. } => "large_pump.displacement_m3",
        }
    }
    /// Relative size of the change.
    pub fn relative(&self) -> f64 {
        match *self {
            Change::SmallPumpDisplacement { from_m3, to_m3 }
            | Change::LargePumpDisplacement { from_m3, to_m3 } => to_m3 / from_m3 - 1.0,
        }
    }
    /// The change in words, in `units`.
    pub fn message(&self, units: UnitSystem) -> String {
        let (what, from, to) = match *self {
            Change::SmallPumpDisplacement { from_m3, to_m3 } => {
                ("small pump", from_m3, to_m3)
            }
            Change::LargePumpDisplacement { from_m3, to_m3 } => {
                ("large pump", from_m3, to_m3)
            }
        };
        format!(
            "A {} of at least {} (now {}) meets it, all else unchanged.",
            what,
            format(Quantity::Displacement, units, to),
            format(Quantity::Displacement, units, from)
        )
    }
}

/// One requirement: met or missed, its margin, and a fix for a miss.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct RequirementResult {
    /// Which.
    pub kind: RequirementKind,
    /// Asked for (m/s or s).
    pub required: f64,
    /// Reached (m/s or s); `None` when the profile has no such segment.
    pub achieved: Option<f64>,
    /// Met?
    pub met: bool,
    /// Margin as a fraction of the requirement, positive when met.
    pub margin: Option<f64>,
    /// The smallest single change found that meets it (for a miss).
    pub fix: Option<Change>,
}

/// One point of the time series for the charts.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct Sample {
    /// Cycle time (s).
    pub t_s: f64,
    /// Piston position from fully retracted (m).
    pub x_m: f64,
    /// Piston speed, positive extending (m/s).
    pub v_ms: f64,
    /// System (pump) pressure (Pa).
    pub p_pa: f64,
    /// Pressure on the pressurised side of the cylinder (Pa): the system
    /// pressure while the valve is shifted, the trapped pressure in an
    /// unloaded dwell and during decompression.
    pub chamber_pa: f64,
    /// Flow from the power unit (m³/s).
    pub q_m3s: f64,
    /// Shaft power (W).
    pub power_w: f64,
    /// Staircase regime of the power unit.
    pub regime: Regime,
    /// Index of the segment.
    pub segment: usize,
}

/// How the integration went.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct SolverInfo {
    /// Relative tolerance on each piece's time and energy between halvings.
    pub tolerance: f64,
    /// Panels over the whole cycle.
    pub panels: u32,
    /// Operating-point evaluations.
    pub evaluations: u32,
}

/// Everything a duty-cycle evaluation says.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct CycleReport {
    /// True when the design had no profile and one was derived from its loads.
    pub profile_derived: bool,
    /// Per segment, in order.
    pub segments: Vec<SegmentResult>,
    /// Whole cycle.
    pub totals: CycleTotals,
    /// Motor.
    pub motor: MotorReport,
    /// Heat and reservoir.
    pub heat: HeatReport,
    /// Requirements, in the order approach, pressing, cycle time.
    pub requirements: Vec<RequirementResult>,
    /// Warnings, each with what to do.
    pub warnings: Vec<crate::cycle::warn::CycleWarning>,
    /// Time series, at most [`crate::cycle::MAX_SAMPLES`] points, every
    /// segment's first and last point included.
    pub samples: Vec<Sample>,
    /// Integration figures.
    pub solver: SolverInfo,
}

/// Why a duty cycle could not be evaluated.
#[derive(Clone, Debug, PartialEq, Serialize)]
#[serde(tag = "kind", rename_all = "snake_case")]
#[non_exhaustive]
pub enum CycleError {
    /// The cylinder stalls: the force needs the relief's full-flow pressure.
    ForceNotReachable {
        /// Segment index.
        segment: usize,
        /// Position where it stalls, from fully retracted (m).
        x_m: f64,
        /// Force asked for there (N).
        force_n: f64,
        /// Largest force the circuit moves (N).
        max_force_n: f64,
    },
    /// The step halving did not reach the tolerance.
    NotConverged {
        /// Segment index.
        segment: usize,
    },
}

impl CycleError {
    /// The segment the error belongs to.
    pub fn segment(&self) -> usize {
        match self {
            CycleError::ForceNotReachable { segment, .. }
            | CycleError::NotConverged { segment } => *segment,
        }
    }
    /// The message for people in `units`.
    pub fn message(&self, units: UnitSystem) -> String {
        match self {
            CycleError::ForceNotReachable {
                segment,
                x_m,
                force_n,
                max_force_n,
            } => format!(
                "Force not reachable at x = {} (segment {}): {} asked for, the circuit moves at most about {} before the relief passes all flow. Raise the relief (within component ratings), use a larger bore or lower the force.",
                format(Quantity::Length, units, *x_m),
                segment + 1,
                format(Quantity::Force, units, *force_n),
                format(Quantity::Force, units, *max_force_n)
            ),
            CycleError::NotConverged { segment } => format!(
                "The integration of segment {} did not converge; check for extreme inputs.",
                segment + 1
            ),
        }
    }
}

impl fmt::Display for CycleError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(&self.message(UnitSystem::Metric))
    }
}

impl std::error::Error for CycleError {}
