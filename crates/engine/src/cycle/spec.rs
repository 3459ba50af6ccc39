//! Inputs of a duty cycle: the load profile as ordered segments (brief
//! §5.1), dead volume, reservoir, motor choice and requirements. Plain data
//! in SI with unit-suffixed names; [`validate`] checks it with the rest of
//! the design.

use serde::{Deserialize, Serialize};

use crate::design::Design;
use crate::error::{Checker, ErrorKind};
use crate::heat::{OIL_SPECIFIC_HEAT_J_KGK, RESERVOIR_U_W_M2K};
use crate::motor::MotorSeries;
use crate::units::{Quantity, BAR, LITRE};

/// Default dead (line) volume, 0.5 L (brief §11).
pub const DEAD_VOLUME_M3: f64 = 0.5 * LITRE;
/// Default pressure at which the pumps circulate through the directional
/// valve's centre (tandem or open centre): 3 bar (rule of thumb, no source).
pub const CENTRE_PRESSURE_PA: f64 = 3.0 * BAR;

/// The load profile and the thermal and motor data of a duty cycle.
///
/// An empty `segments` list means "derive a profile from the design's
/// loads": see [`derived_profile`].
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct CycleSpec {
    /// The segments in cycle order, starting fully retracted (x = 0).
    #[serde(default)]
    pub segments: Vec<Segment>,
    /// Oil volume in lines and valves on the pressurised side, outside the
    /// cylinder (m³).
    #[serde(default = "default_dead")]
    pub dead_volume_m3: f64,
    /// Pump pressure while the directional valve is centred (idle,
    /// decompression, unloaded dwell) (Pa).
    #[serde(default = "default_centre")]
    pub centre_pressure_pa: f64,
    /// Reservoir and oil temperatures.
    #[serde(default)]
    pub reservoir: Reservoir,
    /// How the motor is chosen.
    #[serde(default)]
    pub motor: MotorSelection,
    /// Speeds and cycle time the machine must reach.
    #[serde(default)]
    pub requirements: Requirements,
}

fn default_dead() -> f64 {
    DEAD_VOLUME_M3
}
fn default_centre() -> f64 {
    CENTRE_PRESSURE_PA
}

impl Default for CycleSpec {
    fn default() -> Self {
        CycleSpec {
            segments: Vec::new(),
            dead_volume_m3: DEAD_VOLUME_M3,
            centre_pressure_pa: CENTRE_PRESSURE_PA,
            reservoir: Reservoir::default(),
            motor: MotorSelection::default(),
            requirements: Requirements::default(),
        }
    }
}

/// One segment of the load profile (brief §5.1).
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(tag = "kind", rename_all = "snake_case", deny_unknown_fields)]
pub enum Segment {
    /// Rapid extend against a small constant force (friction, tool weight).
    Approach {
        /// Travel (m).
        distance_m: f64,
        /// Load force (N).
        force_n: f64,
    },
    /// Slow extend against the working force.
    Pressing {
        /// Travel (m).
        distance_m: f64,
        /// Force along the travel.
        force: PressingForce,
    },
    /// Held still for a time with the valve shifted.
    Dwell {
        /// Duration (s).
        time_s: f64,
        /// What the pumps do meanwhile.
        #[serde(default)]
        hold: Hold,
    },
    /// The compressed oil is let out through a decompression valve or orifice.
    Decompression {
        /// Duration (s).
        time_s: f64,
    },
    /// Rapid retract against a constant force.
    Retract {
        /// Travel (m).
        distance_m: f64,
        /// Load force (N).
        force_n: f64,
    },
    /// Valve centred: the pumps circulate at the centre pressure.
    Idle {
        /// Duration (s).
        time_s: f64,
    },
}

impl Segment {
    /// A short label for people.
    pub fn label(&self) -> &'static str {
        match self {
            Segment::Approach { .. } => "approach",
            Segment::Pressing { .. } => "pressing",
            Segment::Dwell { .. } => "dwell",
            Segment::Decompression { .. } => "decompression",
            Segment::Retract { .. } => "retract",
            Segment::Idle { .. } => "idle",
        }
    }
    /// The segment's kind.
    pub fn kind(&self) -> SegmentKind {
        match self {
            Segment::Approach { .. } => SegmentKind::Approach,
            Segment::Pressing { .. } => SegmentKind::Pressing,
            Segment::Dwell { .. } => SegmentKind::Dwell,
            Segment::Decompression { .. } => SegmentKind::Decompression,
            Segment::Retract { .. } => SegmentKind::Retract,
            Segment::Idle { .. } => SegmentKind::Idle,
        }
    }
}

/// The kind of a segment, without its data.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum SegmentKind {
    /// See [`Segment::Approach`].
    Approach,
    /// See [`Segment::Pressing`].
    Pressing,
    /// See [`Segment::Dwell`].
    Dwell,
    /// See [`Segment::Decompression`].
    Decompression,
    /// See [`Segment::Retract`].
    Retract,
    /// See [`Segment::Idle`].
    Idle,
}

/// Pressing force along the pressing travel.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(tag = "shape", rename_all = "snake_case", deny_unknown_fields)]
pub enum PressingForce {
    /// The same force all along (N).
    Constant {
        /// Force (N).
        force_n: f64,
    },
    /// Rising (or falling) linearly, like a spring (N).
    Linear {
        /// Force at the start of pressing (N).
        from_n: f64,
        /// Force at the end of pressing (N).
        to_n: f64,
    },
    /// Linear between points; constant before the first and after the last.
    Table {
        /// Points in order of position; two points at one position make a
        /// step (e.g. a breakthrough).
        points: Vec<ForcePoint>,
    },
}

/// One point of a force table.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct ForcePoint {
    /// Position from the start of the pressing segment (m).
    pub position_m: f64,
    /// Force there (N).
    pub force_n: f64,
}

/// What the pumps do while the cylinder dwells.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, Serialize, Deserialize, Default)]
#[serde(rename_all = "snake_case")]
pub enum Hold {
    /// The valve stays shifted: pressure rises to the relief and all of the
    /// small pump's flow crosses it (brief §5.1).
    #[default]
    AtRelief,
    /// The cylinder is held (blocked ports or pilot check) while the pumps
    /// circulate at the centre pressure.
    Unloaded,
}

/// Reservoir and oil temperatures (brief §7.2).
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Reservoir {
    /// Oil in the tank (m³); `None`: 3 × pump flow per minute (S-17).
    #[serde(default)]
    pub oil_volume_m3: Option<f64>,
    /// Oil-wetted wall area (m²); `None`: estimated from the oil volume.
    #[serde(default)]
    pub wetted_area_m2: Option<f64>,
    /// Wall heat-transfer coefficient U (W/(m²·K)).
    #[serde(default = "default_u")]
    pub heat_transfer_w_m2k: f64,
    /// Ambient air temperature (°C).
    #[serde(default = "default_ambient")]
    pub ambient_c: f64,
    /// Highest bulk oil temperature allowed (°C).
    #[serde(default = "default_max_oil")]
    pub max_oil_c: f64,
    /// Specific heat of the oil (J/(kg·K)).
    #[serde(default = "default_cp")]
    pub specific_heat_j_kgk: f64,
}

fn default_u() -> f64 {
    RESERVOIR_U_W_M2K
}
fn default_ambient() -> f64 {
    25.0
}
fn default_max_oil() -> f64 {
    60.0
}
fn default_cp() -> f64 {
    OIL_SPECIFIC_HEAT_J_KGK
}

impl Default for Reservoir {
    fn default() -> Self {
        Reservoir {
            oil_volume_m3: None,
            wetted_area_m2: None,
            heat_transfer_w_m2k: RESERVOIR_U_W_M2K,
            ambient_c: default_ambient(),
            max_oil_c: default_max_oil(),
            specific_heat_j_kgk: OIL_SPECIFIC_HEAT_J_KGK,
        }
    }
}

/// How the motor is chosen (brief §6).
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct MotorSelection {
    /// Rating series.
    #[serde(default)]
    pub series: MotorSeries,
    /// Margin over the RMS power (fraction, 0.10 = 10 %).
    #[serde(default = "default_margin")]
    pub margin_fraction: f64,
    /// Peak power allowed as a multiple of the rating.
    #[serde(default = "default_k")]
    pub peak_allowance: f64,
    /// A rating chosen by the user (W); `None` falls back to
    /// `drive.motor_rating_w`, and if that is empty only the recommendation
    /// is given.
    #[serde(default)]
    pub chosen_rating_w: Option<f64>,
}

fn default_margin() -> f64 {
    0.10
}
fn default_k() -> f64 {
    1.5
}

impl Default for MotorSelection {
    fn default() -> Self {
        MotorSelection {
            series: MotorSeries::Iec,
            margin_fraction: default_margin(),
            peak_allowance: default_k(),
            chosen_rating_w: None,
        }
    }
}

/// What the machine must achieve; each is optional.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize, Default)]
#[serde(deny_unknown_fields)]
pub struct Requirements {
    /// Lowest mean approach speed (m/s).
    #[serde(default)]
    pub approach_speed_ms: Option<f64>,
    /// Lowest mean pressing speed (m/s).
    #[serde(default)]
    pub pressing_speed_ms: Option<f64>,
    /// Longest cycle time (s).
    #[serde(default)]
    pub cycle_time_s: Option<f64>,
}

/// The profile used when the design gives none: approach to 30 mm before
/// the end of stroke (a quarter of the stroke when shorter) at the approach
/// force, press the rest at the pressing force, dwell 1 s at relief,
/// decompress 0.5 s, retract the full stroke, idle 5 s. Our own choice.
pub fn derived_profile(d: &Design) -> Vec<Segment> {
    let stroke = d.cylinder.stroke_m;
    let press = (0.030_f64).min(stroke / 4.0);
    vec![
        Segment::Approach {
            distance_m: stroke - press,
            force_n: d.loads.approach_force_n,
        },
        Segment::Pressing {
            distance_m: press,
            force: PressingForce::Constant {
                force_n: d.loads.pressing_force_n,
            },
        },
        Segment::Dwell {
            time_s: 1.0,
            hold: Hold::AtRelief,
        },
        Segment::Decompression { time_s: 0.5 },
        Segment::Retract {
            distance_m: stroke,
            force_n: d.loads.retract_force_n,
        },
        Segment::Idle { time_s: 5.0 },
    ]
}

/// Longest time a segment may last (s): one day.
pub const MAX_SEGMENT_TIME_S: f64 = 86_400.0;
/// Most segments in one profile.
pub const MAX_SEGMENTS: usize = 64;
/// Most points in one force table.
pub const MAX_TABLE_POINTS: usize = 256;

/// Checks the cycle data of `d`, pushing every problem into `k`.
pub(crate) fn validate(d: &Design, k: &mut Checker) {
    use Quantity::*;
    let c = &d.cycle;
    k.non_negative("cycle.dead_volume_m3", Volume, c.dead_volume_m3);
    if k.non_negative("cycle.centre_pressure_pa", Pressure, c.centre_pressure_pa)
        && d.relief_valve.full_flow_pa.is_finite()
        && c.centre_pressure_pa >= d.relief_valve.full_flow_pa
    {
        k.push(
            "cycle.centre_pressure_pa",
            c.centre_pressure_pa,
            ErrorKind::OutOfRange {
                quantity: Pressure,
                min: 0.0,
                max: d.relief_valve.full_flow_pa,
            },
        );
    }
    if c.segments.len() > MAX_SEGMENTS {
        k.push(
            "cycle.segments",
            c.segments.len() as f64,
            ErrorKind::Inconsistent {
                why: format!("At most {MAX_SEGMENTS} segments; remove some."),
            },
        );
    }
    let stroke = d.cylinder.stroke_m;
    let stroke_ok = stroke.is_finite() && stroke > 0.0;
    let mut x = 0.0_f64;
    for (i, s) in c.segments.iter().enumerate() {
        k.index = Some(i);
        match s {
            Segment::Approach {
                distance_m,
                force_n,
            }
            | Segment::Retract {
                distance_m,
                force_n,
            } => {
                let retract = matches!(s, Segment::Retract { .. });
                travel(k, stroke_ok, stroke, &mut x, *distance_m, retract);
                k.non_negative("cycle.segments[].force_n", Force, *force_n);
            }
            Segment::Pressing { distance_m, force } => {
                let ok = travel(k, stroke_ok, stroke, &mut x, *distance_m, false);
                pressing_force(k, force, ok.then_some(*distance_m));
            }
            Segment::Dwell { time_s, .. }
            | Segment::Decompression { time_s }
            | Segment::Idle { time_s } => {
                k.range(
                    "cycle.segments[].time_s",
                    Time,
                    *time_s,
                    0.0,
                    MAX_SEGMENT_TIME_S,
                );
            }
        }
    }
    k.index = None;
    let r = &c.reservoir;
    if let Some(v) = r.oil_volume_m3 {
        k.positive("cycle.reservoir.oil_volume_m3", Volume, v);
    }
    if let Some(a) = r.wetted_area_m2 {
        k.positive("cycle.reservoir.wetted_area_m2", Area, a);
    }
    k.positive(
        "cycle.reservoir.heat_transfer_w_m2k",
        HeatTransfer,
        r.heat_transfer_w_m2k,
    );
    let amb_ok = k.range(
        "cycle.reservoir.ambient_c",
        Temperature,
        r.ambient_c,
        -60.0,
        100.0,
    );
    if k.range(
        "cycle.reservoir.max_oil_c",
        Temperature,
        r.max_oil_c,
        -40.0,
        150.0,
    ) && amb_ok
        && r.max_oil_c <= r.ambient_c
    {
        k.push(
            "cycle.reservoir.max_oil_c",
            r.max_oil_c,
            ErrorKind::OutOfRange {
                quantity: Temperature,
                min: r.ambient_c,
                max: 150.0,
            },
        );
    }
    k.positive(
        "cycle.reservoir.specific_heat_j_kgk",
        Ratio,
        r.specific_heat_j_kgk,
    );
    let m = &c.motor;
    k.range(
        "cycle.motor.margin_fraction",
        Percent,
        m.margin_fraction,
        0.0,
        1.0,
    );
    k.range(
        "cycle.motor.peak_allowance",
        Ratio,
        m.peak_allowance,
        1.0,
        3.0,
    );
    if let Some(r) = m.chosen_rating_w {
        k.positive("cycle.motor.chosen_rating_w", Power, r);
    }
    let q = &c.requirements;
    if let Some(v) = q.approach_speed_ms {
        k.positive("cycle.requirements.approach_speed_ms", Velocity, v);
    }
    if let Some(v) = q.pressing_speed_ms {
        k.positive("cycle.requirements.pressing_speed_ms", Velocity, v);
    }
    if let Some(v) = q.cycle_time_s {
        k.positive("cycle.requirements.cycle_time_s", Time, v);
    }
}

/// Checks one travel and moves `x`; a travel beyond either end of the
/// stroke is an error on its distance. Returns whether the distance is usable.
fn travel(
    k: &mut Checker,
    stroke_ok: bool,
    stroke: f64,
    x: &mut f64,
    distance: f64,
    retract: bool,
) -> bool {
    const F: &str = "cycle.segments[].distance_m";
    if !k.positive(F, Quantity::Length, distance) {
        return false;
    }
    if !stroke_ok {
        return true;
    }
    let room = if retract { *x } else { stroke - *x };
    // A relative slack of 1e-9 lets "the full stroke" typed as a sum pass.
    if distance > room + 1e-9 * stroke {
        k.push(
            F,
            distance,
            ErrorKind::OutOfRange {
                quantity: Quantity::Length,
                min: 0.0,
                max: room.max(0.0),
            },
        );
        return false;
    }
    *x = if retract {
        (*x - distance).max(0.0)
    } else {
        (*x + distance).min(stroke)
    };
    true
}

fn pressing_force(k: &mut Checker, f: &PressingForce, distance: Option<f64>) {
    use Quantity::Force;
    match f {
        PressingForce::Constant { force_n } => {
            k.non_negative("cycle.segments[].force.force_n", Force, *force_n);
        }
        PressingForce::Linear { from_n, to_n } => {
            k.non_negative("cycle.segments[].force.from_n", Force, *from_n);
            k.non_negative("cycle.segments[].force.to_n", Force, *to_n);
        }
        PressingForce::Table { points } => {
            const P: &str = "cycle.segments[].force.points";
            let bad = |why: String| ErrorKind::Inconsistent { why };
            if points.is_empty() || points.len() > MAX_TABLE_POINTS {
                k.push(
                    P,
                    points.len() as f64,
                    bad(format!(
                        "A force table needs 1 to {MAX_TABLE_POINTS} points (position, force)."
                    )),
                );
                return;
            }
            let mut last = 0.0_f64;
            for (j, pt) in points.iter().enumerate() {
                let n = j + 1;
                if !pt.position_m.is_finite() || !pt.force_n.is_finite() {
                    k.push(P, f64::NAN, bad(format!("Point {n}: enter numbers.")));
                } else if pt.force_n < 0.0 {
                    k.push(
                        P,
                        pt.force_n,
                        bad(format!("Point {n}: the force must be zero or more.")),
                    );
                } else if pt.position_m < last {
                    k.push(
                        P,
                        pt.position_m,
                        bad(format!(
                            "Point {n}: positions must not decrease (from the start of pressing, 0 or more)."
                        )),
                    );
                } else if distance.is_some_and(|d| pt.position_m > d * (1.0 + 1e-9)) {
                    k.push(
                        P,
                        pt.position_m,
                        bad(format!(
                            "Point {n}: the position is beyond the end of this pressing segment."
                        )),
                    );
                } else {
                    last = pt.position_m;
                }
            }
        }
    }
}
