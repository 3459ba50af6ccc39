//! Design figures: corner powers, the equal-corner settings, and the
//! settings check (brief §3.3).

use serde::Serialize;

use crate::circuit::Circuit;
use crate::motion::{increasing_root, Direction};

/// Which corner of the power curve sizes the motor.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Governing {
    /// The low corner: both pumps just before unloading.
    Low,
    /// The high corner: small pump at relief full flow.
    High,
}

/// Corner powers and the settings that balance them (SI).
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct Corners {
    /// Shaft power just before the unloader starts to open (W).
    pub low_w: f64,
    /// Shaft power at relief full flow, large pump unloaded (W).
    pub high_w: f64,
    /// Which one is larger.
    pub governing: Governing,
    /// Unloading setting at which both corners are equal (Pa): the highest
    /// setting that needs no more motor than pressing does.
    pub equal_corner_unloading_pa: f64,
    /// Small-pump displacement that would make both corners equal at the
    /// present unloading setting (m³/rev); infinite only when no small pump
    /// can (an injected fault holding the unloader at or above the relief).
    pub equal_corner_small_displacement_m3: f64,
    /// Small-pump theoretical flow at that displacement (m³/s).
    pub equal_corner_small_flow_m3s: f64,
    /// Shaft power a single fixed pump of the combined displacement would
    /// need at relief full flow (W).
    pub single_pump_w: f64,
}

/// Shaft power of a single fixed pump of the combined displacement at `p`:
/// P = (V_L + V_S)·n·p/η_hm,S + T₀·ω (brief §7.4 comparison; the small
/// pump's efficiency stands for the single pump's).
pub fn single_pump_power(c: &Circuit, p: f64) -> f64 {
    let d = c.design();
    let q = c.large_theoretical_flow() + c.small_theoretical_flow();
    let t0 = d.large_pump.no_load_torque_nm + d.small_pump.no_load_torque_nm;
    q * p.max(0.0) / d.small_pump.hydromechanical_efficiency + t0 * c.omega()
}

fn with_small_displacement(c: &Circuit, v: f64) -> Circuit {
    let mut k = c.clone();
    let scale = v / c.design().small_pump.displacement_m3;
    k.qth_s *= scale;
    k.k_s *= scale;
    k
}

/// Low corner: the power unit just before the unloader starts to open.
///
/// # Formula
/// ```text
/// P_low = [p_u·Q_S,th/η_hm,S + (p_u + Δp_cv)·Q_L,th/η_hm,L] + T₀·ω
/// ```
/// (brief §3.3 step 3, from the pump model of §2.2).
pub fn low_corner(c: &Circuit) -> f64 {
    low_corner_at(c, c.p_u)
}

/// The low corner if the unloader were set to `p_u`: the power unit at
/// p_u (at most p_rf) with the unloader still shut, unless a fault holds it.
fn low_corner_at(c: &Circuit, p_u: f64) -> f64 {
    let shut = c.unloader_stuck.map_or(1.0, |open| 1.0 - open);
    c.pump_point_at(p_u.min(c.p_rf), shut).shaft_power_w
}

/// High corner: small pump at relief full flow, large pump at p_bp.
///
/// # Formula
/// ```text
/// P_high = p_rf·Q_S,th/η_hm,S + p_bp·Q_L,th/η_hm,L + T₀·ω
/// ```
pub fn high_corner(c: &Circuit) -> f64 {
    c.pump_point_unchecked(c.p_rf).shaft_power_w
}

/// Corner powers and the equal-corner figures.
///
/// # Formula
/// The equal-corner unloading pressure p_u* solves P_low(p_u*) = P_high; for
/// equal η_hm and an ideal pump this is brief §3.3 step 4:
/// ```text
/// p_u* = [p_rf·Q_S + (p_bp − Δp_cv)·Q_L]/(Q_S + Q_L)
/// Q_S* = Q_L·(p_u + Δp_cv − p_bp)/(p_rf − p_u)
/// ```
/// Both are solved here on the full model (leakage, per-pump η_hm, drag).
pub fn corners(c: &Circuit) -> Corners {
    let low = low_corner(c);
    let high = high_corner(c);
    let p_rf = c.p_rf;
    // P_low rises with p_u; clamp the answer to 0 ..= p_rf.
    let excess = |pu: f64| low_corner_at(c, pu) - high;
    let (at_zero, at_rf) = (excess(0.0), excess(p_rf));
    let p_star = if at_zero >= 0.0 {
        0.0
    } else if at_rf <= 0.0 {
        p_rf
    } else {
        increasing_root((0.0, at_zero), (p_rf, at_rf), excess, |_| 1e-13 * high)
    };
    // P_high − P_low rises with the small displacement: each unit adds
    // (p_rf − p_u)·n/η_hm,S, so it is affine in it and the search below ends
    // in a step or two. Widen the bracket until it holds the root; with the
    // unloader at or above the relief (a fault) there is none: infinite.
    let v0 = c.design().small_pump.displacement_m3;
    let diff = |v: f64| {
        let k = with_small_displacement(c, v);
        high_corner(&k) - low_corner(&k)
    };
    let d_zero = diff(0.0);
    let v_star = if d_zero >= 0.0 {
        0.0
    } else {
        let mut hi = (v0, diff(v0));
        for _ in 0..64 {
            if hi.1 >= 0.0 {
                break;
            }
            let v = hi.0 * 16.0;
            hi = (v, diff(v));
        }
        if hi.1 >= 0.0 {
            increasing_root((0.0, d_zero), hi, diff, |_| 1e-13 * high)
        } else {
            f64::INFINITY
        }
    };
    let n_rps = c.design().drive.speed_rpm / 60.0;
    Corners {
        low_w: low,
        high_w: high,
        governing: if low >= high {
            Governing::Low
        } else {
            Governing::High
        },
        equal_corner_unloading_pa: p_star,
        equal_corner_small_displacement_m3: v_star,
        equal_corner_small_flow_m3s: v_star * n_rps,
        single_pump_w: single_pump_power(c, p_rf),
    }
}

/// The settings check of brief §3.3 steps 1, 2 and 5 (SI).
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct SettingsCheck {
    /// Approach pressure with both pumps delivering (Pa), if reachable.
    pub approach_fast_pa: Option<f64>,
    /// Retract pressure with both pumps delivering (Pa), if reachable.
    pub retract_fast_pa: Option<f64>,
    /// The larger of the two (Pa).
    pub fast_max_pa: f64,
    /// Lowest unloading setting by the margin rule (Pa).
    pub min_unloading_pa: f64,
    /// The margin factor and minimum used.
    pub unload_margin_factor: f64,
    /// ... (Pa).
    pub unload_margin_min_pa: f64,
    /// Does the design's unloading setting meet it?
    pub unloading_ok: bool,
    /// Pressure at the end of pressing (Pa): force over area plus the
    /// circuit's drops at the pressing speed.
    pub pressing_pa: Option<f64>,
    /// Lowest relief cracking pressure by the margin rule (Pa): above the
    /// pressing pressure, and 20 bar above the unloader fully open.
    pub min_relief_cracking_pa: f64,
    /// Does the design's relief cracking pressure meet it?
    pub relief_ok: bool,
}

/// The gap between unloader fully open and relief cracking that common
/// practice asks for (brief §3.3 step 5, 20 bar).
pub const UNLOADER_RELIEF_GAP_PA: f64 = 20.0e5;

/// Runs the settings check.
pub fn settings_check(c: &Circuit) -> SettingsCheck {
    let d = c.design();
    let r = &d.rules;
    let approach = c
        .fast_motion_pressure(Direction::Extend, d.loads.approach_force_n)
        .ok();
    let retract = c
        .fast_motion_pressure(Direction::Retract, d.loads.retract_force_n)
        .ok();
    let fast = approach.unwrap_or(0.0).max(retract.unwrap_or(0.0));
    let min_u = (fast * r.unload_margin_factor).max(fast + r.unload_margin_min_pa);
    let pressing = c
        .motion(crate::motion::Motion::Pressing)
        .ok()
        .map(|m| m.pump.pressure_pa);
    let press_p = pressing.unwrap_or(d.loads.pressing_force_n / c.cap_area());
    let min_rc = (press_p * r.relief_margin_factor)
        .max(press_p + r.relief_margin_min_pa)
        .max(
            d.unloading_valve.setting_pa * (1.0 + d.unloading_valve.band_fraction)
                + UNLOADER_RELIEF_GAP_PA,
        );
    SettingsCheck {
        approach_fast_pa: approach,
        retract_fast_pa: retract,
        fast_max_pa: fast,
        min_unloading_pa: min_u,
        unload_margin_factor: r.unload_margin_factor,
        unload_margin_min_pa: r.unload_margin_min_pa,
        unloading_ok: d.unloading_valve.setting_pa >= min_u,
        pressing_pa: pressing,
        min_relief_cracking_pa: min_rc,
        relief_ok: d.relief_valve.cracking_pa >= min_rc,
    }
}
