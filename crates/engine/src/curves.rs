//! Curves for the charts: flow, speed and shaft power against system
//! pressure from zero to relief full flow, with every knee included exactly.

use serde::Serialize;

use crate::circuit::{Circuit, Regime};
use crate::figures::single_pump_power;

/// Number of evenly spaced pressures in a curve (knees are added to these).
pub const CURVE_STEPS: usize = 48;

/// One sample of the curves (SI).
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct CurvePoint {
    /// System pressure (Pa).
    pub pressure_pa: f64,
    /// Flow to the cylinder (m³/s).
    pub flow_m3s: f64,
    /// Extend speed at that flow (m/s).
    pub extend_speed_ms: f64,
    /// Shaft power (W).
    pub shaft_power_w: f64,
    /// Shaft power a single fixed pump of the combined displacement would need (W).
    pub single_pump_w: f64,
    /// Regime at this pressure.
    pub regime: Regime,
}

/// A named knee of the staircase.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum KneeKind {
    /// The unloading valve starts to open.
    UnloaderStarts,
    /// The unloading valve is fully open.
    UnloaderOpen,
    /// The relief valve cracks.
    ReliefCracks,
    /// The relief valve passes all flow.
    ReliefFullFlow,
}

impl KneeKind {
    /// Label for people.
    pub fn label(self) -> &'static str {
        match self {
            KneeKind::UnloaderStarts => "unloader starts",
            KneeKind::UnloaderOpen => "unloader fully open",
            KneeKind::ReliefCracks => "relief cracks",
            KneeKind::ReliefFullFlow => "relief full flow",
        }
    }
}

/// A knee with its coordinates.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct Knee {
    /// Which knee.
    pub kind: KneeKind,
    /// Pressure (Pa).
    pub pressure_pa: f64,
    /// Flow to the cylinder there (m³/s).
    pub flow_m3s: f64,
    /// Shaft power there (W).
    pub shaft_power_w: f64,
}

/// The curves of one circuit.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct Curves {
    /// Samples in increasing pressure.
    pub points: Vec<CurvePoint>,
    /// The knees that lie within 0 ..= relief full flow.
    pub knees: Vec<Knee>,
}

fn sample(c: &Circuit, p: f64) -> CurvePoint {
    let pp = c.pump_point_unchecked(p);
    CurvePoint {
        pressure_pa: p,
        flow_m3s: pp.out_flow_m3s,
        extend_speed_ms: pp.out_flow_m3s / c.cap_area(),
        shaft_power_w: pp.shaft_power_w,
        single_pump_w: single_pump_power(c, p),
        regime: pp.regime,
    }
}

/// Samples flow, speed and power from 0 to relief full flow.
pub fn curves(c: &Circuit) -> Curves {
    let p_max = c.relief_full_pa();
    let mut knees = Vec::with_capacity(4);
    for (kind, p) in [
        (KneeKind::UnloaderStarts, c.unloading_pa()),
        (KneeKind::UnloaderOpen, c.unloading_full_pa()),
        (KneeKind::ReliefCracks, c.relief_cracking_pa()),
        (KneeKind::ReliefFullFlow, p_max),
    ] {
        if p <= p_max {
            let s = sample(c, p);
            knees.push(Knee {
                kind,
                pressure_pa: p,
                flow_m3s: s.flow_m3s,
                shaft_power_w: s.shaft_power_w,
            });
        }
    }
    let mut ps: Vec<f64> = (0..=CURVE_STEPS)
        .map(|i| p_max * i as f64 / CURVE_STEPS as f64)
        .collect();
    ps.extend(knees.iter().map(|k| k.pressure_pa));
    ps.sort_by(f64::total_cmp);
    ps.dedup_by(|a, b| (*a - *b).abs() <= 1e-9 * p_max);
    let points = ps.into_iter().map(|p| sample(c, p)).collect();
    Curves { points, knees }
}
