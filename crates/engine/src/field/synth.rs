//! The fault simulator's other half: the readings a technician would take
//! on a (possibly faulted) machine, from the steady-state model.

use super::readings::{FlowTest, MotorReading, Phase, Readings, TimedStroke};
use crate::circuit::{Circuit, Regime};
use crate::motion::{Direction, Motion};

/// Supply voltage assumed for the synthesised motor reading (V): a common
/// 400 V three-phase supply (our choice).
pub const SYNTH_VOLTAGE_V: f64 = 400.0;
/// Power factor assumed for the synthesised motor reading.
pub const SYNTH_POWER_FACTOR: f64 = 0.85;
/// Fraction of the stroke timed in the fast phase (the middle of it).
pub const SYNTH_FAST_FRACTION: f64 = 0.5;
/// Slow-phase stretch timed: 25 mm, or a tenth of a shorter stroke.
pub const SYNTH_SLOW_DISTANCE_M: f64 = 0.025;
/// Force of the second slow stretch, as a fraction of the pressing force.
pub const SYNTH_SECOND_FORCE_FRACTION: f64 = 0.6;

/// Highest pressure the power unit can hold against a stalled cylinder:
/// where the flow it sends out falls to zero (relief full flow on a sound
/// circuit; lower if leakage eats the small pump's flow first).
pub fn stall_pressure(c: &Circuit) -> f64 {
    let p_rf = c.relief_full_pa();
    let q = |p: f64| c.pump_point_unchecked(p).out_flow_m3s;
    let floor = 1e-9 * (c.large_theoretical_flow() + c.small_theoretical_flow());
    if q(0.0) <= floor {
        return 0.0;
    }
    let (mut lo, mut hi) = (0.0_f64, p_rf);
    if q(hi) > floor {
        return p_rf;
    }
    for _ in 0..200 {
        let mid = 0.5 * (lo + hi);
        if mid <= lo || mid >= hi {
            break;
        }
        if q(mid) > floor {
            lo = mid;
        } else {
            hi = mid;
        }
    }
    hi
}

/// The readings a technician would take on the machine `c` describes,
/// faults and all, from the steady model:
///
/// * fast stroke: the middle half of the stroke at the approach speed, with
///   the system gauge of the approach;
/// * slow stroke: 25 mm (a tenth of a shorter stroke) at the pressing speed,
///   and a second one at 60 % of the pressing force if that runs on the
///   small pump alone;
/// * the unloading point where the speed visibly changes (middle of the
///   valve's band, within the approach and pressing pressures);
/// * the large-pump outlet gauge in both phases, the unloader's tank-line
///   flow during pressing;
/// * the stall pressure ([`stall_pressure`]);
/// * a flow test of each pump alone at its rated pressure (or 90 % of the
///   relief's full flow if lower);
/// * the motor current during pressing, at 400 V and a power factor 0.85.
///
/// Oil temperature and shaft speed are left out: the steady model does not
/// predict them.
pub fn synthesize_readings(c: &Circuit) -> Readings {
    let d = c.design();
    let stroke = d.cylinder.stroke_m;
    let mut r = Readings::default();
    let approach = c.motion(Motion::Approach).ok().filter(|m| m.speed_ms > 0.0);
    let pressing = c.motion(Motion::Pressing).ok().filter(|m| m.speed_ms > 0.0);
    let stall = stall_pressure(c);
    let stall_pp = c.pump_point_unchecked(stall);

    if let Some(a) = approach {
        let s = SYNTH_FAST_FRACTION * stroke;
        r.fast_stroke = Some(TimedStroke {
            distance_m: s,
            time_s: s / a.speed_ms,
            system_pa: Some(a.pump.pressure_pa),
        });
        r.system_approach_pa = Some(a.pump.pressure_pa);
        r.large_outlet_approach_pa = Some(a.pump.large_outlet_pa);
        r.approach_speed_alternates = Some(a.pump.regime == Regime::Unloading);
    }
    let slow_s = SYNTH_SLOW_DISTANCE_M.min(0.1 * stroke);
    let press_pp = match pressing {
        Some(m) => {
            r.slow_stroke = Some(TimedStroke {
                distance_m: slow_s,
                time_s: slow_s / m.speed_ms,
                system_pa: Some(m.pump.pressure_pa),
            });
            m.pump
        }
        None => stall_pp,
    };
    r.large_outlet_pressing_pa = Some(press_pp.large_outlet_pa);
    r.unloader_tank_flow_pressing_m3s = Some(press_pp.large_to_tank_m3s);
    if let Ok(m) = c.motion_point(
        Direction::Extend,
        SYNTH_SECOND_FORCE_FRACTION * d.loads.pressing_force_n,
    ) {
        let p = m.pump.pressure_pa;
        let main = press_pp.pressure_pa;
        if m.speed_ms > 0.0
            && matches!(m.pump.regime, Regime::SmallPump | Regime::Relieving)
            && (main - p).abs() > 0.05 * main
        {
            r.second_slow_stroke = Some(TimedStroke {
                distance_m: slow_s,
                time_s: slow_s / m.speed_ms,
                system_pa: Some(p),
            });
        }
    }
    r.stall_pa = Some(stall);
    // Flow tests of each pump alone through a loading valve, at its rated
    // pressure or 90 % of the relief, whichever is lower: Q = V_g·n − K·p.
    let test = |qth: f64, k: f64, rated: f64| {
        let p = rated.min(0.9 * c.relief_full_pa());
        FlowTest {
            flow_m3s: (qth - k * p).max(0.0),
            pressure_pa: p,
        }
    };
    r.large_flow_test = Some(test(
        c.large_theoretical_flow(),
        c.k_l,
        d.large_pump.rated_pressure_pa,
    ));
    r.small_flow_test = Some(test(
        c.small_theoretical_flow(),
        c.k_s,
        d.small_pump.rated_pressure_pa,
    ));

    // The speed visibly changes when the approach sends out much more than
    // pressing does.
    let q_fast = approach.map_or(0.0, |a| a.pump.out_flow_m3s);
    let seen = q_fast > 1.5 * press_pp.out_flow_m3s.max(0.0) && q_fast > 0.0;
    r.speed_change_seen = Some(seen);
    if seen {
        let mid = 0.5 * (c.unloading_pa() + c.unloading_full_pa());
        let lo = approach.map_or(0.0, |a| a.pump.pressure_pa);
        let hi = press_pp.pressure_pa.max(lo);
        r.unloading_observed_pa = Some(mid.clamp(lo, hi));
    }

    let (phase, shaft) = match pressing {
        Some(m) => (Phase::Pressing, m.pump.shaft_power_w),
        None => (Phase::Stall, stall_pp.shaft_power_w),
    };
    let eta = d.drive.motor_efficiency;
    r.motor = Some(MotorReading {
        during: phase,
        current_a: shaft / (eta * 3.0_f64.sqrt() * SYNTH_VOLTAGE_V * SYNTH_POWER_FACTOR),
        voltage_v: SYNTH_VOLTAGE_V,
        power_factor: SYNTH_POWER_FACTOR,
        efficiency: None,
    });
    r
}
