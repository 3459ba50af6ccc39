//! Back-calculation: delivered flows, volumetric efficiencies, leakage
//! coefficients, observed settings and motor load from the readings
//! (brief §8.2), and what the design expects at the same gauge pressures.

use std::f64::consts::PI;

use serde::Serialize;

use super::readings::{Checked, Phase};
use crate::circuit::{Circuit, PumpPoint};
use crate::motion::Motion;

/// Volumetric efficiency against the nameplate: η_v = Q/(V_g·n)
/// (brief §8.2; V_g·n is the theoretical flow, brief §2.1 [S-5]).
pub fn volumetric_efficiency(flow_m3s: f64, displacement_m3: f64, speed_rpm: f64) -> f64 {
    flow_m3s / (displacement_m3 * speed_rpm / 60.0)
}

/// Leakage coefficient from two delivered flows at two pressures:
/// K = (Q₁ − Q₂)/(p₂ − p₁) (brief §8.2, laminar slip of §2.1).
pub fn leakage_two_point(q1_m3s: f64, p1_pa: f64, q2_m3s: f64, p2_pa: f64) -> f64 {
    (q1_m3s - q2_m3s) / (p2_pa - p1_pa)
}

/// Leakage coefficient from one delivered flow and the nameplate:
/// K = (V_g·n − Q)/p, the two-point formula with Q = V_g·n at p = 0.
pub fn leakage_one_point(theoretical_m3s: f64, q_m3s: f64, p_pa: f64) -> f64 {
    (theoretical_m3s - q_m3s) / p_pa
}

/// Electrical input of a three-phase motor: P = √3·V·I·cos φ.
pub fn three_phase_power(voltage_v: f64, current_a: f64, power_factor: f64) -> f64 {
    3.0_f64.sqrt() * voltage_v * current_a * power_factor
}

/// An observed setting beside the design's.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct SettingCompare {
    /// What the gauge showed (Pa).
    pub observed_pa: f64,
    /// What the design expects the gauge to show there (Pa).
    pub design_pa: f64,
    /// observed/design − 1.
    pub deviation: f64,
}

/// How a leakage coefficient was found.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum LeakageMethod {
    /// From two slow-phase timings at two pressures.
    TwoPoints,
    /// From one timing against the nameplate flow at zero pressure.
    Nameplate,
}

/// A leakage coefficient found at the machine.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct Leakage {
    /// K (m³/s per Pa).
    pub coefficient_m3s_per_pa: f64,
    /// The design's K for this pump.
    pub design_m3s_per_pa: f64,
    /// How it was found.
    pub method: LeakageMethod,
}

/// A pump flow test beside what the design expects of that pump.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct FlowTestResult {
    /// Flow read (m³/s).
    pub flow_m3s: f64,
    /// Test pressure (Pa).
    pub pressure_pa: f64,
    /// The design's flow of that pump at that pressure: V_g·n − K·p (m³/s).
    pub expected_m3s: f64,
    /// Flow over V_g·n.
    pub volumetric_efficiency: f64,
    /// The design's η_v at that pressure.
    pub expected_efficiency: f64,
}

/// Motor load from current, voltage and power factor.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct MotorLoad {
    /// When it was read.
    pub during: Phase,
    /// Electrical input √3·V·I·pf (W).
    pub electrical_w: f64,
    /// Shaft output, electrical × η_motor (W).
    pub shaft_w: f64,
    /// Shaft power the design expects in that phase (W).
    pub expected_shaft_w: f64,
    /// Shaft output over the installed motor rating, if the design has one.
    pub rating_fraction: Option<f64>,
}

/// Everything back-calculated from the readings (SI); `None` where the
/// readings needed are missing or bad.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct BackCalc {
    /// Shaft speed used (rpm): the tachometer's, else the design's.
    pub shaft_speed_rpm: f64,
    /// Large and small pump theoretical flow V_g·n at that speed (m³/s).
    pub large_theoretical_m3s: f64,
    /// ...
    pub small_theoretical_m3s: f64,
    /// Fast phase: Q_L + Q_S = A_cap·s/t (m³/s).
    pub fast_flow_m3s: Option<f64>,
    /// System pressure of the fast phase used for the design's figures (Pa).
    pub fast_pressure_pa: f64,
    /// Design's fast-phase flow at that pressure (m³/s).
    pub fast_expected_m3s: f64,
    /// Slow phase: Q_S = A_cap·s/t (m³/s).
    pub slow_flow_m3s: Option<f64>,
    /// System pressure of the slow phase used (Pa).
    pub slow_pressure_pa: f64,
    /// Design's slow-phase flow at that pressure (m³/s).
    pub slow_expected_m3s: f64,
    /// Second slow phase flow (m³/s) and its pressure (Pa).
    pub second_slow_flow_m3s: Option<f64>,
    /// ...
    pub second_slow_pressure_pa: Option<f64>,
    /// Q_L = (Q_L + Q_S) − Q_S (m³/s), brief §8.2.
    pub large_flow_m3s: Option<f64>,
    /// η_v of the large pump against its nameplate, Q_L/(V_g,L·n).
    pub large_volumetric_efficiency: Option<f64>,
    /// η_v of the small pump against its nameplate, Q_S/(V_g,S·n).
    pub small_volumetric_efficiency: Option<f64>,
    /// η_v the design expects of each at the pressures read.
    pub large_expected_efficiency: f64,
    /// ...
    pub small_expected_efficiency: f64,
    /// Large-pump flow test, if taken.
    pub large_flow_test: Option<FlowTestResult>,
    /// Small-pump flow test, if taken.
    pub small_flow_test: Option<FlowTestResult>,
    /// Leakage coefficient of the small pump.
    pub small_leakage: Option<Leakage>,
    /// Leakage coefficient of the large pump (needs its outlet pressure).
    pub large_leakage: Option<Leakage>,
    /// Observed unloading point against the design's.
    pub unloading: Option<SettingCompare>,
    /// Observed stall pressure against the relief's full-flow pressure.
    pub relief: Option<SettingCompare>,
    /// Motor load.
    pub motor: Option<MotorLoad>,
}

/// The design's circuit without faults, at the shaft speed read (leakage
/// coefficients kept: laminar slip does not depend on speed, brief §2.1).
pub(crate) fn reference(c: &Circuit, rpm: Option<f64>) -> Circuit {
    let mut r = if c.design().faults.is_empty() {
        c.clone()
    } else {
        let mut d = c.design().clone();
        d.faults = Default::default();
        // The design was valid with its faults; without them it still is.
        Circuit::new(&d).unwrap_or_else(|_| c.clone())
    };
    if let Some(rpm) = rpm {
        let s = rpm / r.design().drive.speed_rpm;
        r.qth_l *= s;
        r.qth_s *= s;
        r.omega = 2.0 * PI * rpm / 60.0;
    }
    r
}

/// Pump point at `p` clamped into 0 ..= p_rf.
pub(crate) fn point(c: &Circuit, p: f64) -> PumpPoint {
    c.pump_point_unchecked(p.clamp(0.0, c.relief_full_pa()))
}

/// Pressure of a design motion, or `fallback` if it cannot be reached.
pub(crate) fn motion_pa(c: &Circuit, m: Motion, fallback: f64) -> f64 {
    c.motion(m).map_or(fallback, |mp| mp.pump.pressure_pa)
}

/// Shaft power the design expects in `phase`.
pub(crate) fn phase_shaft_w(c: &Circuit, phase: Phase) -> f64 {
    let m = match phase {
        Phase::Approach => Motion::Approach,
        Phase::Pressing => Motion::Pressing,
        Phase::Stall => return point(c, c.relief_full_pa()).shaft_power_w,
    };
    c.motion(m).map_or_else(
        |_| point(c, c.relief_full_pa()).shaft_power_w,
        |mp| mp.pump.shaft_power_w,
    )
}

/// The back-calculation (brief §8.2) on the checked readings.
pub(crate) fn back_calc(reference: &Circuit, r: &Checked) -> BackCalc {
    let c = reference;
    let d = c.design();
    let rpm = r.speed_rpm.unwrap_or(d.drive.speed_rpm);
    let qth_l = c.large_theoretical_flow();
    let qth_s = c.small_theoretical_flow();
    let p_fast = r
        .system_approach_pa
        .or(r.fast.and_then(|s| s.system_pa))
        .unwrap_or_else(|| motion_pa(c, Motion::Approach, 0.0));
    let p_slow = r
        .slow
        .and_then(|s| s.system_pa)
        .unwrap_or_else(|| motion_pa(c, Motion::Pressing, c.relief_cracking_pa()));
    let fast_pp = point(c, p_fast);
    let slow_pp = point(c, p_slow);
    let q_fast = r.fast.map(|s| s.flow_m3s);
    let q_slow = r.slow.map(|s| s.flow_m3s);
    let q_l = match (q_fast, q_slow) {
        (Some(f), Some(s)) => Some(f - s),
        _ => None,
    };
    let p_large_fast = r.large_approach_pa.unwrap_or(fast_pp.large_outlet_pa);
    let small_leakage = match (r.slow, r.slow2) {
        (Some(a), Some(b)) => {
            let pa = a.system_pa.unwrap_or(p_slow);
            match b.system_pa {
                Some(pb) if (pb - pa).abs() > 0.05 * pa.max(pb) => Some(Leakage {
                    coefficient_m3s_per_pa: leakage_two_point(
                        a.flow_m3s, pa, b.flow_m3s, pb,
                    ),
                    design_m3s_per_pa: c.k_s,
                    method: LeakageMethod::TwoPoints,
                }),
                _ => None,
            }
        }
        _ => None,
    }
    .or_else(|| {
        q_slow.filter(|_| p_slow > 0.0).map(|q| Leakage {
            coefficient_m3s_per_pa: leakage_one_point(qth_s, q, p_slow),
            design_m3s_per_pa: c.k_s,
            method: LeakageMethod::Nameplate,
        })
    });
    let test = |t: Option<super::readings::FlowTest>, qth: f64, k: f64| {
        t.map(|t| {
            let e = (qth - k * t.pressure_pa).max(0.0);
            FlowTestResult {
                flow_m3s: t.flow_m3s,
                pressure_pa: t.pressure_pa,
                expected_m3s: e,
                volumetric_efficiency: t.flow_m3s / qth,
                expected_efficiency: e / qth,
            }
        })
    };
    let large_test = test(r.large_test, qth_l, c.k_l);
    let small_test = test(r.small_test, qth_s, c.k_s);
    let from_test = |t: Option<FlowTestResult>, qth: f64, k: f64| {
        t.filter(|t| t.pressure_pa > 0.0).map(|t| Leakage {
            coefficient_m3s_per_pa: leakage_one_point(qth, t.flow_m3s, t.pressure_pa),
            design_m3s_per_pa: k,
            method: LeakageMethod::Nameplate,
        })
    };
    let small_leakage = match small_leakage {
        Some(k) if k.method == LeakageMethod::TwoPoints => Some(k),
        other => from_test(small_test, qth_s, c.k_s).or(other),
    };
    let large_leakage = from_test(large_test, qth_l, c.k_l).or_else(|| {
        q_l.filter(|_| p_large_fast > 0.0).map(|q| Leakage {
            coefficient_m3s_per_pa: leakage_one_point(qth_l, q, p_large_fast),
            design_m3s_per_pa: c.k_l,
            method: LeakageMethod::Nameplate,
        })
    });
    let u_mid = c.unloading_pa() + 0.5 * (c.unloading_full_pa() - c.unloading_pa());
    let cmp = |o: f64, e: f64| SettingCompare {
        observed_pa: o,
        design_pa: e,
        deviation: if e > 0.0 { o / e - 1.0 } else { 0.0 },
    };
    let motor = r.motor.map(|(m, eta)| {
        let el = three_phase_power(m.voltage_v, m.current_a, m.power_factor);
        let shaft = el * eta;
        MotorLoad {
            during: m.during,
            electrical_w: el,
            shaft_w: shaft,
            expected_shaft_w: phase_shaft_w(c, m.during),
            rating_fraction: d.drive.motor_rating_w.map(|w| shaft / w),
        }
    });
    BackCalc {
        shaft_speed_rpm: rpm,
        large_theoretical_m3s: qth_l,
        small_theoretical_m3s: qth_s,
        fast_flow_m3s: q_fast,
        fast_pressure_pa: p_fast,
        fast_expected_m3s: fast_pp.out_flow_m3s,
        slow_flow_m3s: q_slow,
        slow_pressure_pa: p_slow,
        slow_expected_m3s: slow_pp.out_flow_m3s,
        second_slow_flow_m3s: r.slow2.map(|s| s.flow_m3s),
        second_slow_pressure_pa: r.slow2.and_then(|s| s.system_pa),
        large_flow_m3s: q_l,
        large_volumetric_efficiency: q_l.map(|q| q / qth_l),
        small_volumetric_efficiency: q_slow.map(|q| q / qth_s),
        large_expected_efficiency: fast_pp.large_flow_m3s / qth_l,
        small_expected_efficiency: slow_pp.small_flow_m3s / qth_s,
        large_flow_test: large_test,
        small_flow_test: small_test,
        small_leakage,
        large_leakage,
        unloading: r.unloading_pa.map(|o| cmp(o, u_mid)),
        relief: r.stall_pa.map(|o| cmp(o, c.relief_full_pa())),
        motor,
    }
}
