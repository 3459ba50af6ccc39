//! Warnings about a valid design: each says what is at risk and what to do.
//!
//! Thresholds are common practice (brief §3.3, §3.4, §4, §9), not limits
//! from a standard; each message says so where it matters.

use serde::Serialize;

use crate::circuit::Circuit;
use crate::error::SolveError;
use crate::figures::{Corners, SettingsCheck, UNLOADER_RELIEF_GAP_PA};
use crate::lines::FlowRegime;
use crate::motion::{Motion, MotionPoint};
use crate::units::{format, Quantity, UnitSystem};

/// Fast-motion pressure within this fraction of the unloading setting
/// counts as a hunting risk (brief §3.4, rule of thumb).
pub const HUNTING_FRACTION: f64 = 0.90;
/// Pump displacement ratio V_L/V_S expected between these (brief §11).
pub const PUMP_RATIO_RANGE: (f64, f64) = (3.0, 20.0);
/// Upper guidance velocity for pressure lines (m/s), brief §4 [S-15].
pub const PRESSURE_LINE_MAX_MS: f64 = 5.5;
/// Upper guidance velocity for return lines (m/s), brief §4 [S-15].
pub const RETURN_LINE_MAX_MS: f64 = 4.0;

/// Which line.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Line {
    /// Pump to valve to cylinder.
    Pressure,
    /// Cylinder to valve to tank.
    Return,
}

/// What a warning is about, with its numbers (SI).
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
#[serde(tag = "kind", rename_all = "snake_case")]
#[non_exhaustive]
pub enum WarningKind {
    /// A fast motion needs a pressure within 10 % of the unloading setting.
    HuntingRisk {
        /// Which motion.
        motion: Motion,
        /// Its pressure with both pumps (Pa).
        fast_pa: f64,
        /// Unloading setting (Pa).
        unloading_pa: f64,
    },
    /// A fast motion needs more than the unloading setting: it runs slow.
    FastMotionAboveUnloading {
        /// Which motion.
        motion: Motion,
        /// Its pressure with both pumps (Pa).
        fast_pa: f64,
        /// Unloading setting (Pa).
        unloading_pa: f64,
    },
    /// The unloading setting is below the margin rule's minimum.
    UnloadingBelowMinimum {
        /// The minimum (Pa).
        min_pa: f64,
        /// The setting (Pa).
        setting_pa: f64,
    },
    /// The unloading setting is at or above relief cracking.
    UnloaderAtOrAboveRelief {
        /// Unloading setting (Pa).
        unloading_pa: f64,
        /// Relief cracking (Pa).
        cracking_pa: f64,
    },
    /// The unloader is not fully open 20 bar before the relief cracks.
    UnloaderNotOpenBeforeRelief {
        /// Unloader fully open at (Pa).
        open_pa: f64,
        /// Relief cracking (Pa).
        cracking_pa: f64,
    },
    /// Pressing needs more than relief cracking: oil crosses the relief.
    ReliefCracksDuringPressing {
        /// Pressing pressure (Pa).
        pressing_pa: f64,
        /// Relief cracking (Pa).
        cracking_pa: f64,
    },
    /// Relief cracking closer to the pressing pressure than the margin rule.
    ReliefMarginSmall {
        /// The minimum by the margin rule (Pa).
        min_pa: f64,
        /// Relief cracking (Pa).
        cracking_pa: f64,
    },
    /// The pressing force cannot be reached at all.
    PressingForceNotReachable {
        /// Force asked for (N).
        force_n: f64,
        /// Largest force (N).
        max_force_n: f64,
    },
    /// Relief full flow above the component rating.
    ReliefAboveRating {
        /// Relief full flow (Pa).
        full_flow_pa: f64,
        /// Component rating (Pa).
        rating_pa: f64,
    },
    /// Rod-end intensification φ·p_rf above the component rating.
    Intensification {
        /// Area ratio.
        area_ratio: f64,
        /// φ·p_rf (Pa).
        intensified_pa: f64,
        /// Component rating (Pa).
        rating_pa: f64,
    },
    /// Nothing limits the large pump's pressure if the check sticks shut.
    LargePumpUnprotected,
    /// A (simulated) stuck-shut check valve dead-heads the large pump and
    /// nothing limits its outlet pressure.
    LargePumpDeadHeaded {
        /// The outlet pressure the model takes (Pa), where leakage eats the
        /// pump's flow, capped.
        outlet_pa: f64,
    },
    /// V_L/V_S outside 3–20.
    PumpRatio {
        /// The ratio.
        ratio: f64,
    },
    /// Line velocity above guidance.
    LineVelocity {
        /// Which line.
        line: Line,
        /// Highest velocity over the motions (m/s).
        velocity_ms: f64,
        /// Guidance (m/s).
        limit_ms: f64,
    },
    /// Flow in a line is in the laminar-turbulent transition band.
    TransitionFlow {
        /// Which line.
        line: Line,
        /// Reynolds number.
        reynolds: f64,
    },
    /// Delivery rises with pressure somewhere in the unloader band: the
    /// inputs are outside what the linear band model describes (a pump
    /// that leaks most of its flow, or a check valve far too small).
    BandModelInvalid {
        /// Pressure where the rise was found (Pa).
        pressure_pa: f64,
    },
    /// The installed motor is below the peak corner power.
    MotorBelowPeak {
        /// Peak corner power (W).
        peak_w: f64,
        /// Motor rating (W).
        rating_w: f64,
    },
}

/// One warning: its kind and the field it points at.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct Warning {
    /// What and how much.
    pub kind: WarningKind,
    /// Dotted path of the design field to change first.
    pub field: &'static str,
}

fn p(units: UnitSystem, v: f64) -> String {
    format(Quantity::Pressure, units, v)
}

impl Warning {
    /// The message for people in `units`: what is at risk and what to do.
    pub fn message(&self, units: UnitSystem) -> String {
        use WarningKind::*;
        match self.kind {
            HuntingRisk { motion, fast_pa, unloading_pa } => format!(
                "Hunting risk: the {} needs {} with both pumps, within 10 % of the unloading setting {}. The valve may chatter between fast and slow. Raise the unloading setting or reduce valve and line losses.",
                motion.label(), p(units, fast_pa), p(units, unloading_pa)
            ),
            FastMotionAboveUnloading { motion, fast_pa, unloading_pa } => format!(
                "The {} needs {} with both pumps, above the unloading setting {}: it will run on the small pump only, slowly. Raise the unloading setting above it with margin.",
                motion.label(), p(units, fast_pa), p(units, unloading_pa)
            ),
            UnloadingBelowMinimum { min_pa, setting_pa } => format!(
                "Unloading setting {} is below the {} the margin rule asks for (fast-motion pressure × factor, and a minimum gap). Raise it, if the motor allows.",
                p(units, setting_pa), p(units, min_pa)
            ),
            UnloaderAtOrAboveRelief { unloading_pa, cracking_pa } => format!(
                "The unloading setting {} is at or above relief cracking {}: the large pump never unloads and its flow crosses the relief as heat. Lower the unloading setting well below the relief.",
                p(units, unloading_pa), p(units, cracking_pa)
            ),
            UnloaderNotOpenBeforeRelief { open_pa, cracking_pa } => format!(
                "The unloader is fully open only at {}, less than {} below relief cracking {}. Part of the large pump's flow may cross the relief. Lower the unloading setting or raise the relief (within ratings).",
                p(units, open_pa), p(units, UNLOADER_RELIEF_GAP_PA), p(units, cracking_pa)
            ),
            ReliefCracksDuringPressing { pressing_pa, cracking_pa } => format!(
                "Pressing needs {}, above relief cracking {}: pressing slows and oil heats across the relief. Raise the relief cracking pressure (within ratings) or use a larger bore.",
                p(units, pressing_pa), p(units, cracking_pa)
            ),
            ReliefMarginSmall { min_pa, cracking_pa } => format!(
                "Relief cracking {} is below the {} the margin rule asks for above the pressing pressure; the relief may leak while pressing. Raise it, within component ratings.",
                p(units, cracking_pa), p(units, min_pa)
            ),
            PressingForceNotReachable { force_n, max_force_n } => format!(
                "The pressing force {} is not reachable: at most {} at relief full flow. Use a larger bore or a higher relief setting within ratings.",
                format(Quantity::Force, units, force_n), format(Quantity::Force, units, max_force_n)
            ),
            ReliefAboveRating { full_flow_pa, rating_pa } => format!(
                "Relief full-flow pressure {} is above the component rating {}. Lower the relief or use components rated for it.",
                p(units, full_flow_pa), p(units, rating_pa)
            ),
            Intensification { area_ratio, intensified_pa, rating_pa } => format!(
                "If the rod port is blocked while extending, the rod end reaches φ × relief full flow = {:.2} × {} = {}, above the component rating {}. Fit a rod-end relief or rate the cylinder and hoses for it.",
                area_ratio, p(units, intensified_pa / area_ratio), p(units, intensified_pa), p(units, rating_pa)
            ),
            LargePumpUnprotected => "Nothing limits the large pump's outlet pressure if the check valve sticks shut. Fit a small relief on the large-pump side, or an unloader with a relief function.".into(),
            LargePumpDeadHeaded { outlet_pa } => format!(
                "Simulated fault: the check valve is stuck shut and nothing limits the large pump's outlet, so it is dead-headed while the unloader is shut; the model puts its outlet at {} (where its leakage eats its flow, or {}× the relief full flow). On a machine this bursts hoses or seals: stop at once and relieve pressure safely, per the machine's procedure and ISO 4413.",
                p(units, outlet_pa), crate::circuit::DEAD_HEAD_CAP_FACTOR
            ),
            PumpRatio { ratio } => format!(
                "Pump ratio V_L/V_S = {ratio:.1} is outside the usual 3 to 20 (rule of thumb). Check that the pressing speed and the motor size still suit the machine."
            ),
            LineVelocity { line, velocity_ms, limit_ms } => format!(
                "{} line velocity reaches {}, above the {} guidance. Use a larger bore hose to cut losses and heat.",
                match line { Line::Pressure => "Pressure", Line::Return => "Return" },
                format(Quantity::Velocity, units, velocity_ms),
                format(Quantity::Velocity, units, limit_ms)
            ),
            TransitionFlow { line, reynolds } => format!(
                "{} line flow is in the laminar-turbulent transition (Re = {reynolds:.0}); its loss is uncertain. Treat the line drop as an estimate.",
                match line { Line::Pressure => "Pressure", Line::Return => "Return" }
            ),
            BandModelInvalid { pressure_pa } => format!(
                "Flow to the cylinder rises with pressure near {} in the unloader band, which a real circuit does not do: these inputs are outside the model (a large pump that leaks most of its flow at this pressure, or a check valve rated far below the pump flow). Check the large pump's efficiency and rated pressure and the check valve's rated point; treat results near the unloading setting as unreliable.",
                p(units, pressure_pa)
            ),
            MotorBelowPeak { peak_w, rating_w } => format!(
                "The motor rating {} is below the peak corner power {}. Choose a larger motor or lower the unloading setting toward the equal-corner value.",
                format(Quantity::Power, units, rating_w), format(Quantity::Power, units, peak_w)
            ),
        }
    }
}

/// Collects every warning for a valid circuit.
pub fn warnings(
    c: &Circuit,
    motions: &[(Motion, Result<MotionPoint, SolveError>)],
    corners: &Corners,
    s: &SettingsCheck,
) -> Vec<Warning> {
    use WarningKind::*;
    let d = c.design();
    let mut w = Vec::new();
    let mut add = |kind, field| w.push(Warning { kind, field });
    let p_u = c.unloading_pa();
    for (motion, fast) in [
        (Motion::Approach, s.approach_fast_pa),
        (Motion::Retract, s.retract_fast_pa),
    ] {
        if let Some(fp) = fast {
            if fp >= p_u {
                add(
                    FastMotionAboveUnloading {
                        motion,
                        fast_pa: fp,
                        unloading_pa: p_u,
                    },
                    "unloading_valve.setting_pa",
                );
            } else if fp >= HUNTING_FRACTION * p_u {
                add(
                    HuntingRisk {
                        motion,
                        fast_pa: fp,
                        unloading_pa: p_u,
                    },
                    "unloading_valve.setting_pa",
                );
            }
        }
    }
    if !s.unloading_ok {
        add(
            UnloadingBelowMinimum {
                min_pa: s.min_unloading_pa,
                setting_pa: d.unloading_valve.setting_pa,
            },
            "unloading_valve.setting_pa",
        );
    }
    if p_u >= c.relief_cracking_pa() {
        add(
            UnloaderAtOrAboveRelief {
                unloading_pa: p_u,
                cracking_pa: c.relief_cracking_pa(),
            },
            "unloading_valve.setting_pa",
        );
    } else if c.unloading_full_pa() + UNLOADER_RELIEF_GAP_PA > c.relief_cracking_pa() {
        add(
            UnloaderNotOpenBeforeRelief {
                open_pa: c.unloading_full_pa(),
                cracking_pa: c.relief_cracking_pa(),
            },
            "relief_valve.cracking_pa",
        );
    }
    if let Some((_, res)) = motions.iter().find(|(m, _)| *m == Motion::Pressing) {
        match res {
            Ok(mp) if mp.pump.pressure_pa > c.relief_cracking_pa() => add(
                ReliefCracksDuringPressing {
                    pressing_pa: mp.pump.pressure_pa,
                    cracking_pa: c.relief_cracking_pa(),
                },
                "relief_valve.cracking_pa",
            ),
            Ok(_) if !s.relief_ok => add(
                ReliefMarginSmall {
                    min_pa: s.min_relief_cracking_pa,
                    cracking_pa: d.relief_valve.cracking_pa,
                },
                "relief_valve.cracking_pa",
            ),
            Err(SolveError::ForceNotReachable {
                force_n,
                max_force_n,
            }) => add(
                PressingForceNotReachable {
                    force_n: *force_n,
                    max_force_n: *max_force_n,
                },
                "loads.pressing_force_n",
            ),
            _ => {}
        }
    }
    let rating = d.ratings.component_pa;
    if c.relief_full_pa() > rating {
        add(
            ReliefAboveRating {
                full_flow_pa: c.relief_full_pa(),
                rating_pa: rating,
            },
            "relief_valve.full_flow_pa",
        );
    }
    let phi = c.area_ratio();
    if phi * c.relief_full_pa() > rating {
        add(
            Intensification {
                area_ratio: phi,
                intensified_pa: phi * c.relief_full_pa(),
                rating_pa: rating,
            },
            "ratings.component_pa",
        );
    }
    if d.ratings.large_pump_relief_pa.is_none() {
        add(LargePumpUnprotected, "ratings.large_pump_relief_pa");
        if c.check_stuck() == Some(crate::faults::Stuck::Closed) {
            add(
                LargePumpDeadHeaded {
                    outlet_pa: c.large_dead_head_pa(),
                },
                "faults.check_stuck",
            );
        }
    }
    let ratio = d.large_pump.displacement_m3 / d.small_pump.displacement_m3;
    if ratio < PUMP_RATIO_RANGE.0 || ratio > PUMP_RATIO_RANGE.1 {
        add(PumpRatio { ratio }, "small_pump.displacement_m3");
    }
    // Line checks at the largest flows of the motions: supply flow, and the
    // return flow (φ·Q on retract).
    let (mut q_sup, mut q_ret) = (0.0_f64, 0.0_f64);
    for (_, r) in motions {
        if let Ok(mp) = r {
            q_sup = q_sup.max(mp.cylinder_flow_m3s);
            q_ret = q_ret.max(mp.return_flow_m3s);
        }
    }
    for (line, q, limit, field) in [
        (
            Line::Pressure,
            q_sup,
            PRESSURE_LINE_MAX_MS,
            "lines.pressure_hose.bore_m",
        ),
        (
            Line::Return,
            q_ret,
            RETURN_LINE_MAX_MS,
            "lines.return_hose.bore_m",
        ),
    ] {
        if let Some(h) = c.hose(line == Line::Pressure, q) {
            if h.velocity_ms > limit {
                add(
                    LineVelocity {
                        line,
                        velocity_ms: h.velocity_ms,
                        limit_ms: limit,
                    },
                    field,
                );
            }
            if h.regime == FlowRegime::Transition {
                add(
                    TransitionFlow {
                        line,
                        reynolds: h.reynolds,
                    },
                    field,
                );
            }
        }
    }
    if let Some(pressure_pa) = band_rise(c) {
        add(
            BandModelInvalid { pressure_pa },
            "large_pump.volumetric_efficiency",
        );
    }
    if let Some(rating_w) = d.drive.motor_rating_w {
        let peak = corners.low_w.max(corners.high_w);
        if peak > rating_w {
            add(
                MotorBelowPeak {
                    peak_w: peak,
                    rating_w,
                },
                "drive.motor_rating_w",
            );
        }
    }
    w
}

/// Samples the unloader band (and a little either side) and returns the
/// first pressure where the flow out of the power unit rises with pressure
/// by more than a millionth of the pump flow; `None` when it never does.
/// Brief §3.2 requires Q_sys(p) non-increasing; the solvers rely on it.
fn band_rise(c: &Circuit) -> Option<f64> {
    const STEPS: usize = 32;
    let lo = (c.unloading_pa() * 0.98).min(c.relief_full_pa());
    let hi = (c.unloading_full_pa() * 1.02).min(c.relief_full_pa());
    if hi <= lo {
        return None;
    }
    let tol = 1e-6 * (c.large_theoretical_flow() + c.small_theoretical_flow());
    let mut prev = c.pump_point_unchecked(lo).out_flow_m3s;
    for i in 1..=STEPS {
        let p = lo + (hi - lo) * i as f64 / STEPS as f64;
        let q = c.pump_point_unchecked(p).out_flow_m3s;
        if q > prev + tol {
            return Some(p);
        }
        prev = q;
    }
    None
}
