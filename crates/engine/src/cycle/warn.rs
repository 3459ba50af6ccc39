//! Warnings about a duty cycle, each with what to do. Thresholds are rules
//! of thumb (brief §3.4, §5.4, §7.2), not limits from a standard.

use serde::Serialize;

use crate::circuit::Circuit;
use crate::cycle::integrate::RunOutput;
use crate::cycle::results::{CycleTotals, HeatReport, MotorReport};
use crate::heat::OIL_TEMPERATURE_LEVELS_C;
use crate::units::{format, Quantity, UnitSystem};
use crate::warnings::{Line, PRESSURE_LINE_MAX_MS, RETURN_LINE_MAX_MS};

/// Regime II (unloader part-open) lasting longer than this in one segment
/// is more than a short transient: hunting risk (our rule of thumb).
pub const HUNTING_TRANSIENT_S: f64 = 0.2;
/// Stored oil energy above which to suggest controlled decompression (J),
/// brief §5.4 (rule of thumb).
pub const DECOMPRESSION_ENERGY_J: f64 = 1000.0;
/// Released oil volume above which to suggest it (m³): 0.1 L, brief §5.4.
pub const DECOMPRESSION_VOLUME_M3: f64 = 0.1e-3;

/// What a cycle warning is about, with its numbers (SI).
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
#[serde(tag = "kind", rename_all = "snake_case")]
#[non_exhaustive]
pub enum CycleWarningKind {
    /// The relief passes flow while pressing.
    ReliefCracksDuringPressing {
        /// Where it starts (m).
        x_m: f64,
        /// Pressure there (Pa).
        pressure_pa: f64,
        /// Relief cracking (Pa).
        cracking_pa: f64,
    },
    /// The unloader stays part-open for longer than a transient.
    HuntingRisk {
        /// Time in regime II (s).
        unloading_time_s: f64,
    },
    /// Much energy or volume in compressed oil released.
    Decompression {
        /// V·p²/(2β) (J).
        energy_j: f64,
        /// V·p/β (m³).
        volume_m3: f64,
        /// Released at once rather than over a decompression segment.
        sudden: bool,
    },
    /// A blocked rod port at the cycle's highest extend pressure exceeds the rating.
    Intensification {
        /// Area ratio φ.
        area_ratio: f64,
        /// φ·p (Pa).
        intensified_pa: f64,
        /// Component rating (Pa).
        rating_pa: f64,
    },
    /// Line velocity above guidance during the cycle.
    LineVelocity {
        /// Which line.
        line: Line,
        /// Highest velocity (m/s).
        velocity_ms: f64,
        /// Guidance (m/s).
        limit_ms: f64,
    },
    /// The chosen motor's rating is below the peak allowance.
    MotorPeak {
        /// Peak shaft power (W).
        peak_w: f64,
        /// Rating (W).
        rating_w: f64,
        /// Allowance k.
        allowance: f64,
    },
    /// The chosen motor's rating is below RMS plus margin.
    MotorRms {
        /// RMS shaft power (W).
        rms_w: f64,
        /// Rating (W).
        rating_w: f64,
        /// Margin (fraction).
        margin: f64,
    },
    /// No rating in the series is large enough.
    NoRatingLargeEnough {
        /// Smallest acceptable rating (W).
        minimum_w: f64,
    },
    /// Steady oil temperature at a warning level (1: 60 °C, 2: 70 °C, 3: 80 °C).
    OilTemperature {
        /// Level 1 to 3.
        level: u8,
        /// Steady temperature with no cooler (°C).
        steady_c: f64,
        /// The level's threshold (°C).
        threshold_c: f64,
    },
    /// The steady oil temperature exceeds the allowed maximum: a cooler is needed.
    CoolerNeeded {
        /// Cooler rating (W).
        cooler_w: f64,
        /// Allowed maximum (°C).
        max_oil_c: f64,
    },
    /// The profile does not end where it starts (fully retracted).
    ProfileNotClosed {
        /// End position (m).
        x_end_m: f64,
    },
}

/// One cycle warning: its kind, the field to change first, and the segment.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct CycleWarning {
    /// What and how much.
    pub kind: CycleWarningKind,
    /// Dotted path of the design field to change first.
    pub field: &'static str,
    /// Segment it belongs to, if one.
    pub segment: Option<usize>,
}

impl CycleWarning {
    /// The message for people in `units`: what is at risk and what to do.
    pub fn message(&self, units: UnitSystem) -> String {
        use CycleWarningKind::*;
        let p = |v| format(Quantity::Pressure, units, v);
        let w = |v| format(Quantity::Power, units, v);
        match self.kind {
            ReliefCracksDuringPressing { x_m, pressure_pa, cracking_pa } => format!(
                "The relief passes flow while pressing from x = {} ({} against cracking {}): pressing slows and the oil heats. Raise the relief cracking pressure within component ratings, or use a larger bore.",
                format(Quantity::Length, units, x_m), p(pressure_pa), p(cracking_pa)
            ),
            HuntingRisk { unloading_time_s } => format!(
                "The unloader stays part-open for {unloading_time_s:.2} s in one segment (more than a short transient): the valve may hunt between fast and slow. Move the unloading setting away from the pressure this load needs, or narrow its band."
            ),
            Decompression { energy_j, volume_m3, sudden } => format!(
                "{} {} of compressed oil ({} stored, rule of thumb: above 1 kJ or 0.1 L). {}",
                if sudden { "Released at once:" } else { "Decompression releases" },
                format(Quantity::Volume, units, volume_m3),
                format(Quantity::Energy, units, energy_j),
                if sudden {
                    "Add a decompression segment with a decompression valve or orifice before the valve shifts, or shock and noise follow. Stored pressure can also move the load: lock out and bleed before work."
                } else {
                    "Use a decompression valve or orifice sized for this time; bleed the pressure before any work on the circuit."
                }
            ),
            Intensification { area_ratio, intensified_pa, rating_pa } => format!(
                "If the rod port is blocked while pressing, the rod end reaches φ·p = {:.2} × {} = {}, above the component rating {}. Fit a rod-end relief or rate the cylinder and hoses for it.",
                area_ratio, p(intensified_pa / area_ratio), p(intensified_pa), p(rating_pa)
            ),
            LineVelocity { line, velocity_ms, limit_ms } => format!(
                "{} line velocity reaches {} in the cycle, above the {} guidance. Use a larger bore hose to cut losses and heat.",
                match line { Line::Pressure => "Pressure", Line::Return => "Return" },
                format(Quantity::Velocity, units, velocity_ms),
                format(Quantity::Velocity, units, limit_ms)
            ),
            MotorPeak { peak_w, rating_w, allowance } => format!(
                "Peak shaft power {} is {:.0} % of the motor rating {}, above the {:.0} % allowance: the motor may stall or trip at the corner. Choose a larger motor or lower the unloading setting toward the equal-corner value.",
                w(peak_w), 100.0 * peak_w / rating_w, w(rating_w), 100.0 * allowance
            ),
            MotorRms { rms_w, rating_w, margin } => format!(
                "RMS shaft power {} plus {:.0} % margin exceeds the motor rating {}: it will run hot. Choose a larger motor or shorten the dwell at relief.",
                w(rms_w), 100.0 * margin, w(rating_w)
            ),
            NoRatingLargeEnough { minimum_w } => format!(
                "No rating in the series reaches {}; enter a custom rating or split the drive.",
                w(minimum_w)
            ),
            OilTemperature { level, steady_c, threshold_c } => format!(
                "Steady oil temperature about {} without a cooler, at or above {} ({}; rule of thumb). {}",
                format(Quantity::Temperature, units, steady_c),
                format(Quantity::Temperature, units, threshold_c),
                match level { 1 => "warning", 2 => "alarm", _ => "seals and hoses degrade fast" },
                "Cut the heat (shorter dwell at relief, unload during dwell) or add cooling."
            ),
            CoolerNeeded { cooler_w, max_oil_c } => format!(
                "To stay at or below {}, fit a cooler of about {} or enlarge the tank's wetted area.",
                format(Quantity::Temperature, units, max_oil_c), w(cooler_w)
            ),
            ProfileNotClosed { x_end_m } => format!(
                "The profile ends at x = {}, not fully retracted; each cycle is taken to start fully retracted. Make the retract as long as the extend.",
                format(Quantity::Length, units, x_end_m)
            ),
        }
    }
}

pub(crate) fn collect(
    c: &Circuit,
    out: &RunOutput,
    t: &CycleTotals,
    m: &MotorReport,
    h: &HeatReport,
) -> Vec<CycleWarning> {
    use CycleWarningKind::*;
    let d = c.design();
    let mut v = Vec::new();
    let mut add = |kind, field, segment| {
        v.push(CycleWarning {
            kind,
            field,
            segment,
        })
    };
    if let Some((seg, x, p)) = out.relief_in_pressing {
        add(
            ReliefCracksDuringPressing {
                x_m: x,
                pressure_pa: p,
                cracking_pa: c.relief_cracking_pa(),
            },
            "relief_valve.cracking_pa",
            Some(seg),
        );
    }
    for s in &out.segments {
        if s.unloading_time_s > HUNTING_TRANSIENT_S {
            add(
                HuntingRisk {
                    unloading_time_s: s.unloading_time_s,
                },
                "unloading_valve.setting_pa",
                Some(s.index),
            );
        }
    }
    for r in &out.releases {
        if r.energy_j > DECOMPRESSION_ENERGY_J || r.volume_m3 > DECOMPRESSION_VOLUME_M3 {
            add(
                Decompression {
                    energy_j: r.energy_j,
                    volume_m3: r.volume_m3,
                    sudden: r.sudden,
                },
                "cycle.segments",
                Some(r.segment),
            );
        }
    }
    let phi = c.area_ratio();
    let rating = d.ratings.component_pa;
    if phi * out.extend_pressure_max_pa > rating {
        add(
            Intensification {
                area_ratio: phi,
                intensified_pa: phi * out.extend_pressure_max_pa,
                rating_pa: rating,
            },
            "ratings.component_pa",
            None,
        );
    }
    for (line, q, limit, field) in [
        (
            Line::Pressure,
            out.supply_flow_max_m3s,
            PRESSURE_LINE_MAX_MS,
            "lines.pressure_hose.bore_m",
        ),
        (
            Line::Return,
            out.return_flow_max_m3s,
            RETURN_LINE_MAX_MS,
            "lines.return_hose.bore_m",
        ),
    ] {
        if let Some(hl) = c.hose(line == Line::Pressure, q) {
            if hl.velocity_ms > limit {
                add(
                    LineVelocity {
                        line,
                        velocity_ms: hl.velocity_ms,
                        limit_ms: limit,
                    },
                    field,
                    None,
                );
            }
        }
    }
    match (m.checked_rating_w, m.checked_is_chosen) {
        (Some(r), true) => {
            if t.peak_power_w > m.peak_allowance * r {
                add(
                    MotorPeak {
                        peak_w: t.peak_power_w,
                        rating_w: r,
                        allowance: m.peak_allowance,
                    },
                    "cycle.motor.chosen_rating_w",
                    None,
                );
            }
            if t.rms_power_w * (1.0 + m.margin_fraction) > r {
                add(
                    MotorRms {
                        rms_w: t.rms_power_w,
                        rating_w: r,
                        margin: m.margin_fraction,
                    },
                    "cycle.motor.chosen_rating_w",
                    None,
                );
            }
        }
        (None, _) => add(
            NoRatingLargeEnough {
                minimum_w: m.minimum_w,
            },
            "cycle.motor.chosen_rating_w",
            None,
        ),
        _ => {}
    }
    if let Some(level) = (0..3)
        .rev()
        .find(|&i| h.steady_oil_c >= OIL_TEMPERATURE_LEVELS_C[i])
    {
        add(
            OilTemperature {
                level: level as u8 + 1,
                steady_c: h.steady_oil_c,
                threshold_c: OIL_TEMPERATURE_LEVELS_C[level],
            },
            "cycle.reservoir.wetted_area_m2",
            None,
        );
    }
    if h.cooler_w > 0.0 {
        add(
            CoolerNeeded {
                cooler_w: h.cooler_w,
                max_oil_c: h.max_oil_c,
            },
            "cycle.reservoir.wetted_area_m2",
            None,
        );
    }
    if let Some(last) = out.segments.last() {
        if last.x_end_m > 1e-9 * d.cylinder.stroke_m.max(1e-3) {
            add(
                ProfileNotClosed {
                    x_end_m: last.x_end_m,
                },
                "cycle.segments",
                Some(last.index),
            );
        }
    }
    v
}
