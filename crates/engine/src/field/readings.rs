//! What a technician reads at the machine, and the check of each reading.
//!
//! Every reading is optional: a check uses what is there. Values are SI and
//! each name carries its unit. [`check`] returns the usable readings and one
//! [`FieldError`] per bad one, so a bad reading never hides the good ones.

use serde::{Deserialize, Serialize};

use crate::circuit::Circuit;
use crate::error::{Checker, ErrorKind, FieldError};
use crate::units::Quantity;

/// A timed stretch of cylinder travel: distance over time.
#[derive(Clone, Copy, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct TimedStroke {
    /// Distance travelled (m), measured on the rod or the platen.
    pub distance_m: f64,
    /// Time taken (s), by stopwatch or from a phone recording.
    pub time_s: f64,
    /// System gauge during the timed stretch (Pa), if read.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub system_pa: Option<f64>,
}

/// A pump flow test: an inline flow meter at one pump's outlet, with a
/// loading valve holding a known pressure (brief §8.1).
#[derive(Clone, Copy, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct FlowTest {
    /// Flow read on the meter (m³/s).
    pub flow_m3s: f64,
    /// Pressure held by the loading valve (Pa).
    pub pressure_pa: f64,
}

/// When a motor reading was taken.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Phase {
    /// During the rapid approach.
    Approach,
    /// During steady pressing.
    Pressing,
    /// With the cylinder stalled at the end of its stroke (relief passing).
    Stall,
}

impl Phase {
    /// Label for people.
    pub fn label(self) -> &'static str {
        match self {
            Phase::Approach => "approach",
            Phase::Pressing => "pressing",
            Phase::Stall => "stall",
        }
    }
}

/// Clamp-meter and nameplate figures of a three-phase motor.
#[derive(Clone, Copy, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct MotorReading {
    /// When the current was read.
    pub during: Phase,
    /// Line current (A).
    pub current_a: f64,
    /// Line-to-line voltage (V).
    pub voltage_v: f64,
    /// Power factor (0, 1] at this load, from the nameplate or a meter.
    pub power_factor: f64,
    /// Motor efficiency (0, 1]; the design's when absent.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub efficiency: Option<f64>,
}

/// Everything a technician may read at the machine (all optional, SI).
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize, Default)]
#[serde(deny_unknown_fields)]
pub struct Readings {
    /// A timed stretch of the fast (approach) phase, both pumps delivering.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub fast_stroke: Option<TimedStroke>,
    /// A timed steady stretch of the slow (pressing) phase.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub slow_stroke: Option<TimedStroke>,
    /// A second slow stretch at another pressure (gives the small pump's
    /// leakage coefficient from two points).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub second_slow_stroke: Option<TimedStroke>,
    /// System gauge during the approach (Pa).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub system_approach_pa: Option<f64>,
    /// System gauge at the moment the cylinder changes from fast to slow:
    /// the observed unloading point (Pa).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub unloading_observed_pa: Option<f64>,
    /// Whether the cylinder visibly changes from fast to slow at all.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub speed_change_seen: Option<bool>,
    /// Whether the approach speed alternates fast and slow, with the valve
    /// buzzing and the gauge swinging.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub approach_speed_alternates: Option<bool>,
    /// Highest system gauge with the cylinder stalled at the end of its
    /// stroke (Pa): the relief's full-flow pressure on a sound circuit.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub stall_pa: Option<f64>,
    /// Large-pump outlet gauge (between pump and check valve) during the
    /// approach (Pa).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub large_outlet_approach_pa: Option<f64>,
    /// Large-pump outlet gauge during pressing (Pa).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub large_outlet_pressing_pa: Option<f64>,
    /// Flow meter in the unloading valve's tank line, during pressing (m³/s).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub unloader_tank_flow_pressing_m3s: Option<f64>,
    /// Flow test of the large pump alone.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub large_flow_test: Option<FlowTest>,
    /// Flow test of the small pump alone.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub small_flow_test: Option<FlowTest>,
    /// Oil temperature in the tank (°C).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub oil_temperature_c: Option<f64>,
    /// Shaft speed by tachometer (rpm); the design's when absent.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub shaft_speed_rpm: Option<f64>,
    /// Motor current, voltage and power factor.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub motor: Option<MotorReading>,
}

impl Readings {
    /// True when nothing has been entered.
    pub fn is_empty(&self) -> bool {
        *self == Readings::default()
    }
}

/// Label and quantity of every reading, by its dotted path.
pub const READING_LABELS: &[(&str, &str, Quantity)] = &[
    ("fast_stroke", "fast-phase timing", Quantity::Flow),
    (
        "fast_stroke.distance_m",
        "fast-phase distance",
        Quantity::Length,
    ),
    ("fast_stroke.time_s", "fast-phase time", Quantity::Time),
    (
        "fast_stroke.system_pa",
        "system gauge, fast phase",
        Quantity::Pressure,
    ),
    ("slow_stroke", "slow-phase timing", Quantity::Flow),
    (
        "slow_stroke.distance_m",
        "slow-phase distance",
        Quantity::Length,
    ),
    ("slow_stroke.time_s", "slow-phase time", Quantity::Time),
    (
        "slow_stroke.system_pa",
        "system gauge, slow phase",
        Quantity::Pressure,
    ),
    (
        "second_slow_stroke",
        "second slow-phase timing",
        Quantity::Flow,
    ),
    (
        "second_slow_stroke.distance_m",
        "second slow-phase distance",
        Quantity::Length,
    ),
    (
        "second_slow_stroke.time_s",
        "second slow-phase time",
        Quantity::Time,
    ),
    (
        "second_slow_stroke.system_pa",
        "system gauge, second slow phase",
        Quantity::Pressure,
    ),
    (
        "system_approach_pa",
        "system gauge, approach",
        Quantity::Pressure,
    ),
    (
        "unloading_observed_pa",
        "system gauge where the speed changes",
        Quantity::Pressure,
    ),
    (
        "speed_change_seen",
        "fast-to-slow change seen",
        Quantity::Ratio,
    ),
    (
        "approach_speed_alternates",
        "approach speed alternates",
        Quantity::Ratio,
    ),
    ("stall_pa", "system gauge at stall", Quantity::Pressure),
    (
        "large_outlet_approach_pa",
        "large-pump outlet gauge, approach",
        Quantity::Pressure,
    ),
    (
        "large_outlet_pressing_pa",
        "large-pump outlet gauge, pressing",
        Quantity::Pressure,
    ),
    (
        "unloader_tank_flow_pressing_m3s",
        "unloader tank-line flow, pressing",
        Quantity::Flow,
    ),
    ("large_flow_test", "large-pump flow test", Quantity::Flow),
    (
        "large_flow_test.flow_m3s",
        "large-pump flow test, flow",
        Quantity::Flow,
    ),
    (
        "large_flow_test.pressure_pa",
        "large-pump flow test, pressure",
        Quantity::Pressure,
    ),
    ("small_flow_test", "small-pump flow test", Quantity::Flow),
    (
        "small_flow_test.flow_m3s",
        "small-pump flow test, flow",
        Quantity::Flow,
    ),
    (
        "small_flow_test.pressure_pa",
        "small-pump flow test, pressure",
        Quantity::Pressure,
    ),
    (
        "oil_temperature_c",
        "oil temperature",
        Quantity::Temperature,
    ),
    ("shaft_speed_rpm", "shaft speed", Quantity::ShaftSpeed),
    ("motor", "motor input", Quantity::Power),
    ("motor.current_a", "motor current", Quantity::Current),
    ("motor.voltage_v", "motor voltage", Quantity::Voltage),
    ("motor.power_factor", "motor power factor", Quantity::Ratio),
    ("motor.efficiency", "motor efficiency", Quantity::Percent),
    (
        "large_pump.delivered",
        "large pump's delivery to the system",
        Quantity::Flow,
    ),
    (
        "small_pump.volumetric_efficiency",
        "small pump volumetric efficiency",
        Quantity::Percent,
    ),
    ("small_pump.leakage", "small pump leakage", Quantity::Ratio),
];

/// Label for people of the reading at `path` (the path itself if unknown).
pub fn reading_label(path: &str) -> &str {
    READING_LABELS
        .iter()
        .find(|(p, _, _)| *p == path)
        .map_or(path, |(_, l, _)| l)
}

/// Gauges read this much above the relief's full-flow pressure are taken
/// as misread (gauge accuracy and overshoot; common practice, no source).
pub const GAUGE_MARGIN: f64 = 0.05;
/// A stall reading above this multiple of the component rating is taken as
/// misread (e.g. psi typed as bar).
pub const STALL_LIMIT_OF_RATING: f64 = 2.0;
/// Timed flows above this multiple of both pumps' theoretical flow are taken
/// as mistimed.
pub const FLOW_LIMIT_OF_THEORETICAL: f64 = 1.5;

/// A timed stroke that passed the check: its flow on the cap area.
#[derive(Clone, Copy, Debug, PartialEq)]
pub(crate) struct Stroke {
    pub(crate) flow_m3s: f64,
    pub(crate) system_pa: Option<f64>,
}

/// The readings that passed the check (SI); bad ones are `None`.
#[derive(Clone, Debug, Default, PartialEq)]
pub(crate) struct Checked {
    pub(crate) fast: Option<Stroke>,
    pub(crate) slow: Option<Stroke>,
    pub(crate) slow2: Option<Stroke>,
    pub(crate) system_approach_pa: Option<f64>,
    pub(crate) unloading_pa: Option<f64>,
    pub(crate) speed_change_seen: Option<bool>,
    pub(crate) alternates: Option<bool>,
    pub(crate) stall_pa: Option<f64>,
    pub(crate) large_approach_pa: Option<f64>,
    pub(crate) large_pressing_pa: Option<f64>,
    pub(crate) tank_flow_m3s: Option<f64>,
    pub(crate) large_test: Option<FlowTest>,
    pub(crate) small_test: Option<FlowTest>,
    pub(crate) oil_c: Option<f64>,
    pub(crate) speed_rpm: Option<f64>,
    pub(crate) motor: Option<(MotorReading, f64)>,
    /// How many readings were entered (a stroke or motor counts once).
    pub(crate) entered: usize,
    /// How many of them are usable.
    pub(crate) usable: usize,
}

const STROKE_PATHS: [[&str; 3]; 3] = [
    [
        "fast_stroke.distance_m",
        "fast_stroke.time_s",
        "fast_stroke.system_pa",
    ],
    [
        "slow_stroke.distance_m",
        "slow_stroke.time_s",
        "slow_stroke.system_pa",
    ],
    [
        "second_slow_stroke.distance_m",
        "second_slow_stroke.time_s",
        "second_slow_stroke.system_pa",
    ],
];

/// Checks every reading against physics and the design; returns the usable
/// ones and an error for each bad one.
pub(crate) fn check(c: &Circuit, r: &Readings) -> (Checked, Vec<FieldError>) {
    let d = c.design();
    let mut k = Checker::default();
    let mut out = Checked::default();
    let mut entered = 0;
    let mut usable = 0;
    let mut count = |ok: bool| {
        entered += 1;
        if ok {
            usable += 1;
        }
    };

    // Shaft speed first: it scales every theoretical flow.
    out.speed_rpm = opt(r.shaft_speed_rpm, &mut count, |v| {
        k.range("shaft_speed_rpm", Quantity::ShaftSpeed, v, 1.0, 10_000.0)
    });
    let rpm = out.speed_rpm.unwrap_or(d.drive.speed_rpm);
    let q_max = FLOW_LIMIT_OF_THEORETICAL
        * (c.large_theoretical_flow() + c.small_theoretical_flow())
        * rpm
        / d.drive.speed_rpm;

    // The stall gauge sets the limit for the others: a relief set high is a
    // finding, not a misreading.
    let rating = d.ratings.component_pa;
    out.stall_pa = opt(r.stall_pa, &mut count, |v| {
        k.range(
            "stall_pa",
            Quantity::Pressure,
            v,
            0.0,
            STALL_LIMIT_OF_RATING * rating.max(c.relief_full_pa()),
        )
    });
    let gauge_max =
        c.relief_full_pa().max(out.stall_pa.unwrap_or(0.0)) * (1.0 + GAUGE_MARGIN);
    // The large-pump outlet is not protected by the system relief: behind a
    // stuck-shut check it can read up to where that side gives (its own
    // relief, or the model's cap when it has none or that relief fails).
    let large_max = gauge_max.max(
        c.large_dead_head_pa()
            .max(crate::circuit::DEAD_HEAD_CAP_FACTOR * c.relief_full_pa())
            * (1.0 + GAUGE_MARGIN),
    );
    let gauge_to = |k: &mut Checker, path: &'static str, v: f64, max: f64| -> bool {
        if !k.non_negative(path, Quantity::Pressure, v) {
            return false;
        }
        if v > max {
            k.push(
                path,
                v,
                ErrorKind::Inconsistent {
                    why: "Above the relief's full-flow pressure and any stall reading: check the gauge, its unit and its port.".into(),
                },
            );
            return false;
        }
        true
    };
    let gauge =
        |k: &mut Checker, path: &'static str, v: f64| gauge_to(k, path, v, gauge_max);

    let stroke = d.cylinder.stroke_m;
    let area = c.cap_area();
    let strokes = [&r.fast_stroke, &r.slow_stroke, &r.second_slow_stroke];
    let mut checked = [None, None, None];
    for (i, s) in strokes.iter().enumerate() {
        let Some(s) = s else { continue };
        let [pd, pt, pp] = STROKE_PATHS[i];
        let mut ok = k.range(pd, Quantity::Length, s.distance_m, 0.0, stroke);
        if ok && s.distance_m <= 0.0 {
            k.push(
                pd,
                s.distance_m,
                ErrorKind::NotPositive {
                    quantity: Quantity::Length,
                },
            );
            ok = false;
        }
        ok &= k.range(pt, Quantity::Time, s.time_s, 0.0, 3600.0);
        if s.time_s.is_finite() && s.time_s == 0.0 {
            k.push(
                pt,
                s.time_s,
                ErrorKind::NotPositive {
                    quantity: Quantity::Time,
                },
            );
            ok = false;
        }
        let system = match s.system_pa {
            Some(p) if gauge(&mut k, pp, p) => Some(p),
            _ => None,
        };
        if ok {
            let q = stroke_flow(area, s.distance_m, s.time_s);
            if q > q_max {
                k.push(
                    pt,
                    s.time_s,
                    ErrorKind::Inconsistent {
                        why: "Faster than both pumps together could move the cylinder: check the distance and the time.".into(),
                    },
                );
                ok = false;
            } else {
                checked[i] = Some(Stroke {
                    flow_m3s: q,
                    system_pa: system,
                });
            }
        }
        count(ok);
    }
    [out.fast, out.slow, out.slow2] = checked;

    out.system_approach_pa = opt(r.system_approach_pa, &mut count, |v| {
        gauge(&mut k, "system_approach_pa", v)
    });
    out.unloading_pa = opt(r.unloading_observed_pa, &mut count, |v| {
        gauge(&mut k, "unloading_observed_pa", v)
    });
    out.large_approach_pa = opt(r.large_outlet_approach_pa, &mut count, |v| {
        gauge_to(&mut k, "large_outlet_approach_pa", v, large_max)
    });
    out.large_pressing_pa = opt(r.large_outlet_pressing_pa, &mut count, |v| {
        gauge_to(&mut k, "large_outlet_pressing_pa", v, large_max)
    });
    out.tank_flow_m3s = opt(r.unloader_tank_flow_pressing_m3s, &mut count, |v| {
        k.range(
            "unloader_tank_flow_pressing_m3s",
            Quantity::Flow,
            v,
            0.0,
            q_max,
        )
    });
    let scale = rpm / d.drive.speed_rpm;
    for (test, qth, paths, slot) in [
        (
            &r.large_flow_test,
            c.large_theoretical_flow() * scale,
            ["large_flow_test.flow_m3s", "large_flow_test.pressure_pa"],
            &mut out.large_test,
        ),
        (
            &r.small_flow_test,
            c.small_theoretical_flow() * scale,
            ["small_flow_test.flow_m3s", "small_flow_test.pressure_pa"],
            &mut out.small_test,
        ),
    ] {
        let Some(t) = test else { continue };
        let mut ok = k.range(
            paths[0],
            Quantity::Flow,
            t.flow_m3s,
            0.0,
            FLOW_LIMIT_OF_THEORETICAL * qth,
        );
        ok &= gauge(&mut k, paths[1], t.pressure_pa);
        if ok {
            *slot = Some(*t);
        }
        count(ok);
    }
    out.oil_c = opt(r.oil_temperature_c, &mut count, |v| {
        k.range("oil_temperature_c", Quantity::Temperature, v, -40.0, 150.0)
    });
    for (flag, slot) in [
        (r.speed_change_seen, &mut out.speed_change_seen),
        (r.approach_speed_alternates, &mut out.alternates),
    ] {
        if flag.is_some() {
            count(true);
            *slot = flag;
        }
    }
    if let Some(m) = r.motor {
        let mut ok = k.range(
            "motor.current_a",
            Quantity::Current,
            m.current_a,
            0.0,
            1.0e4,
        );
        if ok && m.current_a <= 0.0 {
            k.push(
                "motor.current_a",
                m.current_a,
                ErrorKind::NotPositive {
                    quantity: Quantity::Current,
                },
            );
            ok = false;
        }
        ok &= k.range(
            "motor.voltage_v",
            Quantity::Voltage,
            m.voltage_v,
            24.0,
            15_000.0,
        );
        ok &= k.efficiency("motor.power_factor", m.power_factor);
        let eta = match m.efficiency {
            Some(e) => {
                ok &= k.efficiency("motor.efficiency", e);
                e
            }
            None => d.drive.motor_efficiency,
        };
        if ok {
            out.motor = Some((m, eta));
        }
        count(ok);
    }
    out.entered = entered;
    out.usable = usable;
    (out, k.errors)
}

fn opt(
    v: Option<f64>,
    count: &mut impl FnMut(bool),
    mut ok: impl FnMut(f64) -> bool,
) -> Option<f64> {
    let v = v?;
    let good = ok(v);
    count(good);
    good.then_some(v)
}

/// Flow that moves a piston of `area` over `distance` in `time`:
/// Q = A·s/t (brief §8.2 [S-2]; in trade units Q [L/min] = 0.006·A [cm²]·s
/// [mm]/t [s], Q [gpm] = 0.2597·A [in²]·s [in]/t [s]).
pub fn stroke_flow(area_m2: f64, distance_m: f64, time_s: f64) -> f64 {
    area_m2 * distance_m / time_s
}
