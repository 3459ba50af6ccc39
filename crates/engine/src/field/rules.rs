//! The diagnosis rules (brief §8.3) as data: one [`Rule`] per likely cause,
//! each with the readings it needs, a scoring function, the confirming check
//! and the caution that goes with it.
//!
//! A score is 0 (nothing points to this cause) to 1 (the readings point to
//! it clearly). Each signal is a deviation of a reading from what the
//! design expects at the same gauge pressure, mapped through [`ramp`]: zero
//! up to a tolerance that covers stopwatch and gauge error, one at a
//! deviation no sound machine shows. Tolerances are ours (common practice,
//! no source); `docs/field-check.md` lists them.

use serde::Serialize;

use super::backcalc::{point, BackCalc};
use super::readings::{Checked, Phase};
use crate::circuit::Circuit;
use crate::units::Quantity;

/// The causes the rules can name.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum CauseId {
    /// Large pump worn (low volumetric efficiency) or its suction restricted.
    LargePumpWorn,
    /// Small pump worn.
    SmallPumpWorn,
    /// Check valve leaking system oil back through the open unloader.
    CheckLeakingBack,
    /// Unloading valve set too low, or stuck open.
    UnloaderLowOrOpen,
    /// Unloading valve set too high, or stuck shut.
    UnloaderHighOrShut,
    /// Relief valve set too low, or leaking.
    ReliefLow,
    /// Relief valve set too high, or blocked.
    ReliefHigh,
    /// The fast motion needs nearly the unloading pressure: the valve hunts.
    Hunting,
    /// Check valve stuck open: the system drains through the open unloader.
    CheckStuckOpen,
    /// Check valve stuck shut: the large pump is dead-headed.
    CheckStuckShut,
}

/// What one reading says about one cause, with its numbers (SI).
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct Evidence {
    /// Dotted path of the reading (or derived figure) it rests on.
    pub reading: &'static str,
    /// What kind of value it is (decides the display unit).
    pub quantity: Quantity,
    /// The value found at the machine (SI).
    pub measured: f64,
    /// What it is compared with (SI): what the design expects there.
    pub expected: f64,
    /// What `expected` is, in words ("the design expects").
    pub against: &'static str,
    /// What this tells, in words.
    pub note: &'static str,
}

impl Evidence {
    /// `measured/expected − 1`, 0 when nothing is expected.
    pub fn deviation(&self) -> f64 {
        if self.expected.abs() > 0.0 {
            self.measured / self.expected - 1.0
        } else {
            0.0
        }
    }

    /// The line for people, with numbers in `units`.
    pub fn message(&self, units: crate::units::UnitSystem) -> String {
        use crate::units::format;
        let label = super::readings::reading_label(self.reading);
        let m = format(self.quantity, units, self.measured);
        let e = format(self.quantity, units, self.expected);
        let dev = if self.expected.abs() > 0.0 {
            format!(" ({:+.0} %)", 100.0 * self.deviation())
        } else {
            String::new()
        };
        format!("{label}: {m}, {} {e}{dev}; {}", self.against, self.note)
    }
}

/// Result of one rule's scoring function.
#[derive(Clone, Debug, PartialEq, Default)]
pub struct Scored {
    /// 0 ..= 1.
    pub score: f64,
    /// The readings that point to the cause, or clear it.
    pub evidence: Vec<Evidence>,
    /// Readings not taken that would confirm or clear this cause.
    pub confirm_with: Vec<&'static str>,
}

/// What a scoring function sees: the design without faults, the usable
/// readings and the back-calculation.
pub struct Context<'a> {
    pub(crate) c: &'a Circuit,
    pub(crate) r: &'a Checked,
    pub(crate) b: &'a BackCalc,
    pub(crate) s: Signals,
}

/// One diagnosis rule.
#[derive(Clone, Copy)]
pub struct Rule {
    /// The cause it names.
    pub id: CauseId,
    /// Title for people.
    pub cause: &'static str,
    /// Readings it can use (any one is enough to score, more is better).
    pub needs: &'static [&'static str],
    /// Scores the cause; `None` when none of the readings it needs is usable.
    pub score: fn(&Context) -> Option<Scored>,
    /// The check that confirms it, to do next.
    pub next_check: &'static str,
    /// The caution that goes with that check.
    pub caution: &'static str,
}

impl std::fmt::Debug for Rule {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.debug_struct("Rule").field("id", &self.id).finish()
    }
}

/// 0 up to `tol`, 1 from `full`, linear between; 0 for NaN.
pub fn ramp(x: f64, tol: f64, full: f64) -> f64 {
    if x.is_nan() || x <= tol {
        0.0
    } else if x >= full {
        1.0
    } else {
        (x - tol) / (full - tol)
    }
}

/// Timed-flow tolerance: a stopwatch over a steady stretch is good to a few
/// per cent (common practice, no source).
pub const FLOW_TOL: f64 = 0.05;
/// Flow-meter tolerance, relative to the reading (a turbine meter in the
/// tank line; common practice, no source).
pub const METER_TOL: f64 = 0.03;
/// Pressure tolerance on a gauge reading, relative (class 1.6 gauges read in
/// their upper half; common practice, no source).
pub const GAUGE_TOL: f64 = 0.04;
/// Tolerance on the observed unloading point: the valve's band plus the
/// difficulty of reading a moving gauge (our choice).
pub const UNLOADING_TOL: f64 = 0.10;

/// Signals shared by several rules (fractions; `None` when not measured).
#[derive(Clone, Copy, Debug, Default, PartialEq)]
pub(crate) struct Signals {
    /// Share of the design's large-pump flow that reaches the system in the
    /// fast phase (1 on a sound machine).
    pub(crate) large_share: Option<f64>,
    /// Large-pump flow to the system, found and expected (m³/s).
    pub(crate) large_found: f64,
    pub(crate) large_expected: f64,
    /// Slow flow deficit relative to the expected slow flow (positive: less).
    pub(crate) slow_deficit: Option<f64>,
    /// Slow flow in excess of the expected, relative to the large pump's
    /// theoretical flow.
    pub(crate) slow_excess_of_large: Option<f64>,
    /// Tank-line flow above the expected, relative to the small pump's
    /// theoretical flow, and below the expected relative to the expected.
    pub(crate) tank_excess_of_small: Option<f64>,
    pub(crate) tank_short: Option<f64>,
    /// Expected tank-line flow (m³/s).
    pub(crate) tank_expected: f64,
    /// Observed unloading point over the design's, minus one.
    pub(crate) unloading_dev: Option<f64>,
    /// Stall pressure over the relief's full flow, minus one.
    pub(crate) stall_dev: Option<f64>,
    /// Where the large-pump outlet gauge in the approach sits between the
    /// pressure it needs to deliver through the check (0) and the unloaded
    /// back-pressure (1); `None` when the two are too close to tell apart.
    pub(crate) large_outlet_dumped: Option<f64>,
    /// Pressure the large pump needs to deliver in the approach (Pa).
    pub(crate) large_deliver_pa: f64,
    /// Flow-test deficits of each pump against the design at the test
    /// pressure (positive: less).
    pub(crate) large_test_deficit: Option<f64>,
    pub(crate) small_test_deficit: Option<f64>,
    /// How far the large-pump outlet in pressing has risen from the
    /// unloaded back-pressure towards system pressure (0 .. 1).
    pub(crate) large_outlet_rise: Option<f64>,
    /// Expected large-pump outlet in pressing (Pa).
    pub(crate) large_pressing_expected_pa: f64,
    /// Motor shaft power over the expected, minus one (pressing or stall).
    pub(crate) motor_dev: Option<f64>,
}

pub(crate) fn signals(c: &Circuit, r: &Checked, b: &BackCalc) -> Signals {
    let mut s = Signals::default();
    let fast_pp = point(c, b.fast_pressure_pa);
    let slow_pp = point(c, b.slow_pressure_pa);
    s.large_expected = fast_pp.large_to_system_m3s;
    // Small-pump deficit in the slow phase, scaled to the fast-phase
    // pressure (laminar slip, brief §2.1).
    let s_def_fast = match b.slow_flow_m3s {
        Some(q) if b.slow_pressure_pa > 0.0 => {
            (b.slow_expected_m3s - q).max(0.0) * b.fast_pressure_pa / b.slow_pressure_pa
        }
        _ => 0.0,
    };
    if let Some(q) = b.fast_flow_m3s {
        if s.large_expected > 1e-3 * c.large_theoretical_flow() {
            s.large_found = q - (fast_pp.small_flow_m3s - s_def_fast);
            s.large_share = Some(s.large_found / s.large_expected);
        }
    }
    if let Some(q) = b.slow_flow_m3s {
        if b.slow_expected_m3s > 0.0 {
            s.slow_deficit = Some(1.0 - q / b.slow_expected_m3s);
        }
        s.slow_excess_of_large =
            Some((q - b.slow_expected_m3s) / c.large_theoretical_flow());
    }
    s.tank_expected = slow_pp.large_to_tank_m3s;
    if let Some(t) = r.tank_flow_m3s {
        // The meter's own error scales with what it reads (mostly the large
        // pump's flow): only the excess beyond that counts.
        s.tank_excess_of_small =
            Some((t - s.tank_expected * (1.0 + METER_TOL)) / c.small_theoretical_flow());
        if s.tank_expected > 0.0 {
            s.tank_short = Some(1.0 - t / s.tank_expected);
        }
    }
    s.unloading_dev = b.unloading.map(|u| u.deviation);
    s.stall_dev = b.relief.map(|u| u.deviation);
    s.large_deliver_pa = fast_pp.large_outlet_pa;
    let p_bp = c.back_pressure(c.large_theoretical_flow());
    let span = s.large_deliver_pa - p_bp;
    if let Some(p) = r.large_approach_pa {
        if span > (0.5e5_f64).max(0.1 * s.large_deliver_pa) {
            s.large_outlet_dumped = Some((s.large_deliver_pa - p) / span);
        }
    }
    let deficit = |t: Option<super::backcalc::FlowTestResult>| {
        t.filter(|t| t.expected_m3s > 0.0)
            .map(|t| 1.0 - t.flow_m3s / t.expected_m3s)
    };
    s.large_test_deficit = deficit(b.large_flow_test);
    s.small_test_deficit = deficit(b.small_flow_test);
    s.large_pressing_expected_pa = slow_pp.large_outlet_pa;
    if let Some(p) = r.large_pressing_pa {
        let span = b.slow_pressure_pa - s.large_pressing_expected_pa;
        if span > 0.0 {
            s.large_outlet_rise = Some((p - s.large_pressing_expected_pa) / span);
        }
    }
    if let Some(m) = b.motor {
        if matches!(m.during, Phase::Pressing | Phase::Stall) && m.expected_shaft_w > 0.0
        {
            s.motor_dev = Some(m.shaft_w / m.expected_shaft_w - 1.0);
        }
    }
    s
}

fn ev(
    reading: &'static str,
    q: Quantity,
    m: f64,
    e: f64,
    note: &'static str,
) -> Evidence {
    Evidence {
        reading,
        quantity: q,
        measured: m,
        expected: e,
        against: "the design expects",
        note,
    }
}

/// Signals that the unloader dumps the large pump in the approach.
fn unloader_low_signals(x: &Context) -> (f64, f64) {
    let point =
        x.s.unloading_dev
            .map_or(0.0, |d| ramp(-d, UNLOADING_TOL, 0.40));
    let outlet = x.s.large_outlet_dumped.map_or(0.0, |d| ramp(d, 0.3, 0.8));
    (point, outlet)
}

fn large_pump_worn(x: &Context) -> Option<Scored> {
    if x.s.large_share.is_none() && x.s.large_test_deficit.is_none() {
        return None;
    }
    let mut out = Scored::default();
    let (point, outlet) = unloader_low_signals(x);
    let mut approach = 0.0;
    if let Some(share) = x.s.large_share {
        // Nearly nothing from the large pump and no change of speed: it is
        // dumped (or not driven), not worn.
        let dumped = if x.r.speed_change_seen == Some(false) {
            ramp(1.0 - share, 0.6, 0.95)
        } else {
            0.0
        };
        let raw = ramp(1.0 - share, FLOW_TOL, 0.25);
        approach = raw * (1.0 - 0.8 * point.max(outlet).max(dumped));
        out.evidence.push(ev(
            "fast_stroke",
            Quantity::Flow,
            x.b.fast_flow_m3s.unwrap_or(0.0),
            x.b.fast_expected_m3s,
            if raw > 0.0 {
                "the approach is slow"
            } else {
                "the approach flow is as designed"
            },
        ));
        out.evidence.push(ev(
            "large_pump.delivered",
            Quantity::Flow,
            x.s.large_found,
            x.s.large_expected,
            "the large pump's share of it, after the small pump's",
        ));
        match (x.r.large_approach_pa, x.s.large_outlet_dumped) {
            (Some(p), Some(_)) => out.evidence.push(ev(
                "large_outlet_approach_pa",
                Quantity::Pressure,
                p,
                x.s.large_deliver_pa,
                if outlet > 0.0 {
                    "the large pump is not pushing through the check: look at the unloader first"
                } else {
                    "the check is open, so the flow lost is the pump's own"
                },
            )),
            (None, _) => out.confirm_with.push("large_outlet_approach_pa"),
            _ => {}
        }
    }
    let mut test = 0.0;
    match (x.b.large_flow_test, x.s.large_test_deficit) {
        (Some(t), Some(d)) => {
            test = ramp(d, FLOW_TOL, 0.25);
            out.evidence.push(ev(
                "large_flow_test",
                Quantity::Flow,
                t.flow_m3s,
                t.expected_m3s,
                if test > 0.0 {
                    "the pump alone delivers less than the design at the test pressure"
                } else {
                    "the pump alone delivers as designed"
                },
            ));
            if test <= 0.0 {
                // A sound pump on test: the slow approach is elsewhere.
                approach *= 0.3;
            }
        }
        _ => out.confirm_with.push("large_flow_test"),
    }
    out.score = approach.max(test);
    Some(out)
}

fn small_pump_worn(x: &Context) -> Option<Scored> {
    if x.s.slow_deficit.is_none() && x.s.small_test_deficit.is_none() {
        return None;
    }
    let deficit = x.s.slow_deficit.unwrap_or(0.0);
    let mut out = Scored::default();
    let expected = x.b.slow_expected_m3s;
    let mut explained = 0.0;
    if let Some(e) = x.s.tank_excess_of_small {
        explained += (e * x.c.small_theoretical_flow() / expected).max(0.0);
    } else {
        out.confirm_with.push("unloader_tank_flow_pressing_m3s");
    }
    let relief_low = x.s.stall_dev.map_or(0.0, |d| ramp(-d, GAUGE_TOL, 0.20));
    if x.s.stall_dev.is_none() {
        out.confirm_with.push("stall_pa");
    }
    let mut raw = ramp(deficit - explained, FLOW_TOL, 0.30);
    match (x.b.small_flow_test, x.s.small_test_deficit) {
        (Some(t), Some(d)) => {
            let test = ramp(d, FLOW_TOL, 0.25);
            if test <= 0.0 {
                // A sound pump on test: slow pressing is the check or relief.
                raw *= 0.3;
            }
            raw = raw.max(test);
            out.evidence.push(ev(
                "small_flow_test",
                Quantity::Flow,
                t.flow_m3s,
                t.expected_m3s,
                if test > 0.0 {
                    "the pump alone delivers less than the design at the test pressure"
                } else {
                    "the pump alone delivers as designed"
                },
            ));
        }
        _ => out.confirm_with.push("small_flow_test"),
    }
    out.score = raw * (1.0 - 0.7 * relief_low);
    if let Some(q) = x.b.slow_flow_m3s {
        out.evidence.push(ev(
            "slow_stroke",
            Quantity::Flow,
            q,
            expected,
            if deficit > FLOW_TOL {
                "pressing is slow"
            } else {
                "the pressing flow is as designed"
            },
        ));
    }
    if let Some(eta) = x.b.small_volumetric_efficiency {
        out.evidence.push(ev(
            "small_pump.volumetric_efficiency",
            Quantity::Percent,
            eta,
            x.b.small_expected_efficiency,
            "delivered over V_g·n; a check leak or relief leak also lowers it",
        ));
    }
    if let Some(k) = x.b.small_leakage {
        out.evidence.push(ev(
            "small_pump.leakage",
            Quantity::Ratio,
            k.coefficient_m3s_per_pa / k.design_m3s_per_pa.max(f64::MIN_POSITIVE),
            1.0,
            "leakage coefficient as a multiple of the design's",
        ));
    }
    if let Some(t) = x.r.tank_flow_m3s {
        out.evidence.push(ev(
            "unloader_tank_flow_pressing_m3s",
            Quantity::Flow,
            t,
            x.s.tank_expected,
            "what the unloader's tank line carries beyond the large pump's flow is check leakage, not pump wear",
        ));
    }
    Some(out)
}

fn check_leaking_back(x: &Context) -> Option<Scored> {
    let mut out = Scored::default();
    match x.s.tank_excess_of_small {
        Some(e) => {
            out.score = ramp(e, 0.0, 0.25);
            out.evidence.push(ev(
                "unloader_tank_flow_pressing_m3s",
                Quantity::Flow,
                x.r.tank_flow_m3s.unwrap_or(0.0),
                x.s.tank_expected,
                if out.score > 0.0 {
                    "more than the large pump delivers: system oil is returning through the check"
                } else {
                    "no more than the large pump's own flow: the check holds"
                },
            ));
        }
        None => {
            let d = x.s.slow_deficit?;
            // Slow pressing alone cannot tell a leaking check from a worn
            // small pump: half weight, and ask for the tank-line meter; a
            // sound small pump on test makes the check more likely.
            let pump_ok = x.s.small_test_deficit.is_some_and(|t| t <= FLOW_TOL);
            out.score = if pump_ok { 0.7 } else { 0.5 } * ramp(d, FLOW_TOL, 0.30);
            out.confirm_with.push("unloader_tank_flow_pressing_m3s");
            out.evidence.push(ev(
                "slow_stroke",
                Quantity::Flow,
                x.b.slow_flow_m3s.unwrap_or(0.0),
                x.b.slow_expected_m3s,
                "pressing is slow; a tank-line flow meter tells a leaking check from a worn small pump",
            ));
        }
    }
    Some(out)
}

fn unloader_low_or_open(x: &Context) -> Option<Scored> {
    if x.s.unloading_dev.is_none()
        && x.r.large_approach_pa.is_none()
        && x.s.large_share.is_none()
    {
        return None;
    }
    let mut out = Scored::default();
    let (point, outlet) = unloader_low_signals(x);
    let mut share = x.s.large_share.map_or(0.0, |s| ramp(1.0 - s, 0.5, 0.9));
    if x.r.speed_change_seen != Some(false) {
        share *= 0.7;
    }
    if x.s.large_outlet_dumped.is_some_and(|d| d <= 0.3) {
        // The large pump pushes through the check: the flow lost is wear.
        share *= 0.3;
    }
    out.score = point.max(outlet).max(share);
    if let Some(u) = x.b.unloading {
        out.evidence.push(ev(
            "unloading_observed_pa",
            Quantity::Pressure,
            u.observed_pa,
            u.design_pa,
            if point > 0.0 {
                "the speed changes well below the design's unloading point"
            } else {
                "the speed changes where the design expects"
            },
        ));
    } else {
        out.confirm_with.push("unloading_observed_pa");
    }
    match (x.r.large_approach_pa, x.s.large_outlet_dumped) {
        (Some(p), Some(_)) => out.evidence.push(ev(
            "large_outlet_approach_pa",
            Quantity::Pressure,
            p,
            x.s.large_deliver_pa,
            if outlet > 0.0 {
                "near the unloaded back-pressure: the large pump is dumped during the approach"
            } else {
                "high enough to push through the check"
            },
        )),
        (None, _) => out.confirm_with.push("large_outlet_approach_pa"),
        _ => {}
    }
    if x.s.large_share.is_some() {
        out.evidence.push(ev(
            "large_pump.delivered",
            Quantity::Flow,
            x.s.large_found,
            x.s.large_expected,
            "the large pump's share of the approach flow",
        ));
    }
    if x.r.speed_change_seen == Some(false) {
        out.evidence.push(ev(
            "speed_change_seen",
            Quantity::Ratio,
            0.0,
            1.0,
            "no change from fast to slow was seen",
        ));
    }
    Some(out)
}

fn unloader_high_or_shut(x: &Context) -> Option<Scored> {
    let s = &x.s;
    if s.unloading_dev.is_none()
        && s.large_outlet_rise.is_none()
        && s.tank_short.is_none()
        && s.slow_excess_of_large.is_none()
        && s.motor_dev.is_none()
    {
        return None;
    }
    let mut out = Scored::default();
    let point = s
        .unloading_dev
        .map_or(0.0, |d| ramp(d, UNLOADING_TOL, 0.40));
    // The outlet at system pressure is also what a stuck-open check shows.
    let outlet = s.large_outlet_rise.map_or(0.0, |d| ramp(d, 0.2, 0.7))
        * (1.0 - check_open_strength(x));
    let tank = s.tank_short.map_or(0.0, |d| ramp(d, 0.2, 0.7));
    let slow = s.slow_excess_of_large.map_or(0.0, |d| ramp(d, 0.15, 0.6));
    let motor = 0.7 * s.motor_dev.map_or(0.0, |d| ramp(d, 0.25, 1.0));
    out.score = point.max(outlet).max(tank).max(slow).max(motor);
    if let Some(u) = x.b.unloading {
        out.evidence.push(ev(
            "unloading_observed_pa",
            Quantity::Pressure,
            u.observed_pa,
            u.design_pa,
            if point > 0.0 {
                "the speed changes well above the design's unloading point"
            } else {
                "the speed changes where the design expects"
            },
        ));
    }
    if let Some(p) = x.r.large_pressing_pa {
        out.evidence.push(ev(
            "large_outlet_pressing_pa",
            Quantity::Pressure,
            p,
            s.large_pressing_expected_pa,
            if outlet > 0.0 {
                "the large pump is still loaded while pressing"
            } else {
                "the large pump is unloaded while pressing"
            },
        ));
    } else {
        out.confirm_with.push("large_outlet_pressing_pa");
    }
    if let Some(t) = x.r.tank_flow_m3s {
        out.evidence.push(ev(
            "unloader_tank_flow_pressing_m3s",
            Quantity::Flow,
            t,
            s.tank_expected,
            if tank > 0.0 {
                "less than the large pump's flow: it is not being dumped"
            } else {
                "the large pump's flow is being dumped"
            },
        ));
    }
    if let (Some(q), true) = (x.b.slow_flow_m3s, slow > 0.0) {
        out.evidence.push(ev(
            "slow_stroke",
            Quantity::Flow,
            q,
            x.b.slow_expected_m3s,
            "pressing is faster than the small pump alone can make it",
        ));
    }
    if let (Some(m), Some(_)) = (x.b.motor, s.motor_dev) {
        out.evidence.push(ev(
            "motor",
            Quantity::Power,
            m.shaft_w,
            m.expected_shaft_w,
            "estimated shaft power from current, voltage and power factor",
        ));
    } else if x.b.motor.is_none() {
        out.confirm_with.push("motor");
    }
    Some(out)
}

fn relief_low(x: &Context) -> Option<Scored> {
    let d = x.s.stall_dev?;
    let u = x.b.relief?;
    // A stall near the unloading setting with the large-pump outlet at
    // system pressure is the check valve, not the relief.
    let score = ramp(-d, GAUGE_TOL, 0.20) * (1.0 - 0.7 * check_open_strength(x));
    Some(Scored {
        score,
        evidence: vec![ev(
            "stall_pa",
            Quantity::Pressure,
            u.observed_pa,
            u.design_pa,
            if score > 0.0 {
                "the system does not reach the relief's full-flow pressure"
            } else {
                "the relief holds its setting"
            },
        )],
        confirm_with: Vec::new(),
    })
}

fn relief_high(x: &Context) -> Option<Scored> {
    let d = x.s.stall_dev?;
    let u = x.b.relief?;
    let score = ramp(d, GAUGE_TOL, 0.15);
    Some(Scored {
        score,
        evidence: vec![ev(
            "stall_pa",
            Quantity::Pressure,
            u.observed_pa,
            u.design_pa,
            if score > 0.0 {
                "above the relief's full-flow pressure: components are pressed beyond the design"
            } else {
                "not above the design"
            },
        )],
        confirm_with: Vec::new(),
    })
}

fn hunting(x: &Context) -> Option<Scored> {
    let p_app =
        x.r.system_approach_pa
            .or(x.r.fast.and_then(|s| s.system_pa));
    if p_app.is_none() && x.r.alternates.is_none() {
        return None;
    }
    let mut out = Scored::default();
    let u = x.b.unloading.map_or_else(
        || x.c.unloading_pa() + 0.5 * (x.c.unloading_full_pa() - x.c.unloading_pa()),
        |u| u.observed_pa,
    );
    let mut score = 0.0;
    if let Some(p) = p_app {
        let ratio = if u > 0.0 { p / u } else { 1.0 };
        score = ramp(ratio, 0.85, 0.98);
        out.evidence.push(Evidence {
            against: "against an unloading point of",
            ..ev(
                "system_approach_pa",
                Quantity::Pressure,
                p,
                u,
                if score > 0.0 {
                    "the approach needs nearly the unloading pressure"
                } else {
                    "well below the unloading point"
                },
            )
        });
    }
    if x.r.alternates == Some(true) {
        score = f64::max(score, 0.6);
        out.evidence.push(ev(
            "approach_speed_alternates",
            Quantity::Ratio,
            1.0,
            0.0,
            "the approach speed alternates",
        ));
    }
    // A valve set low makes the same symptom: that rule names the cause.
    let (point, _) = unloader_low_signals(x);
    out.score = score * (1.0 - 0.5 * point);
    Some(out)
}

/// How clearly the readings show a stuck-open check valve: the system
/// stalls near the unloading setting although the relief is set far higher,
/// and the large-pump outlet follows system pressure while pressing.
/// Returns (near, follow, stall, system pressure in pressing); `None`
/// without a stall reading or with the relief close to the unloader.
fn check_open_signals(x: &Context) -> Option<(f64, Option<f64>, f64, f64)> {
    let stall = x.r.stall_pa?;
    let p_u = x.c.unloading_pa();
    let p_rf = x.c.relief_full_pa();
    if x.c.relief_cracking_pa() < 1.2 * x.c.unloading_full_pa() || p_u <= 0.0 {
        return None;
    }
    // Where the stall sits from the unloading setting (0) to the relief (1).
    let t = (stall - p_u) / (p_rf - p_u);
    let near = (1.0 - ramp(t, 0.15, 0.5)) * (1.0 - ramp((p_u - stall) / p_u, 0.1, 0.3));
    let p_press = x.r.slow.and_then(|s| s.system_pa).unwrap_or(stall);
    let follow =
        x.r.large_pressing_pa
            .filter(|_| p_press > 0.0)
            .map(|pl| 1.0 - ramp((pl - p_press).abs() / p_press, 2.0 * GAUGE_TOL, 0.25));
    Some((near, follow, stall, p_press))
}

/// 0 ..= 1: how strongly the readings point to a stuck-open check valve.
fn check_open_strength(x: &Context) -> f64 {
    check_open_signals(x).map_or(0.0, |(near, follow, _, _)| near * follow.unwrap_or(0.6))
}

fn check_stuck_open(x: &Context) -> Option<Scored> {
    let (near, follow, stall, p_press) = check_open_signals(x)?;
    let mut out = Scored {
        score: near * follow.unwrap_or(0.6),
        ..Scored::default()
    };
    out.evidence.push(Evidence {
        against: "against an unloading setting of",
        ..ev(
            "stall_pa",
            Quantity::Pressure,
            stall,
            x.c.unloading_pa(),
            if near > 0.0 {
                "the system stalls near the unloading setting although the relief is set far higher"
            } else {
                "the system rises well past the unloading setting"
            },
        )
    });
    match (x.r.large_pressing_pa, follow) {
        (Some(pl), Some(f)) => out.evidence.push(Evidence {
            against: "against the system gauge of",
            ..ev(
                "large_outlet_pressing_pa",
                Quantity::Pressure,
                pl,
                p_press,
                if f > 0.0 {
                    "the large-pump outlet follows system pressure while pressing: the check is not holding"
                } else {
                    "the large-pump outlet is apart from system pressure: the check holds"
                },
            )
        }),
        _ => out.confirm_with.push("large_outlet_pressing_pa"),
    }
    Some(out)
}

fn check_stuck_shut(x: &Context) -> Option<Scored> {
    let pl = x.r.large_approach_pa?;
    let p_sys =
        x.r.system_approach_pa
            .or(x.r.fast.and_then(|s| s.system_pa))
            .unwrap_or(x.b.fast_pressure_pa);
    // What a sound check needs: system pressure plus its drop at the large
    // pump's full flow (independent of any fault in the design).
    let expected = p_sys + x.c.check_drop(x.c.large_theoretical_flow());
    let p_u = x.c.unloading_pa().max(f64::MIN_POSITIVE);
    let outlet = ramp((pl - expected) / p_u, 0.15, 0.5);
    let mut out = Scored::default();
    out.evidence.push(ev(
        "large_outlet_approach_pa",
        Quantity::Pressure,
        pl,
        expected,
        if outlet > 0.0 {
            "far above system pressure: the large pump is pushing against a shut check"
        } else {
            "no higher than the check needs"
        },
    ));
    let slow = match x.s.large_share {
        Some(share) => {
            let slow = ramp(1.0 - share, 0.5, 0.9);
            out.evidence.push(ev(
                "large_pump.delivered",
                Quantity::Flow,
                x.s.large_found,
                x.s.large_expected,
                if slow > 0.0 {
                    "the approach runs at about the small pump's speed"
                } else {
                    "the large pump reaches the system"
                },
            ));
            Some(slow)
        }
        None => {
            out.confirm_with.push("fast_stroke");
            None
        }
    };
    out.score = outlet * slow.map_or(0.8, |s| 0.6 + 0.4 * s);
    Some(out)
}

const STOP_DEAD_HEAD: &str = "Stop the machine at once: a dead-headed pump can burst a hose, fitting or seal, and an oil jet injures. Relieve the pressure on both sides of the check valve safely, lock out and verify zero on a gauge before investigating, following the machine's own procedure and ISO 4413. Do not run it again until the large-pump side has a relief.";

const ADJUST: &str = "Adjust a valve only with a gauge fitted, starting from the backed-off position, in small steps, with guards in place and hands clear of the tooling.";

/// The rule table, in the order ties are broken (most likely first, brief
/// §8.3).
pub const RULES: &[Rule] = &[
    Rule {
        id: CauseId::CheckStuckShut,
        cause: "Check valve stuck shut: the large pump is dead-headed and its flow never reaches the system",
        needs: &["large_outlet_approach_pa", "fast_stroke"],
        score: check_stuck_shut,
        next_check: "Do not run the machine to check this. With it stopped and safe, compare the large-pump outlet gauge reading with the system gauge: far above system pressure during the approach confirms it. Inspect the check valve for a jammed poppet or a wrong-way fitting, and fit a relief on the large-pump side.",
        caution: STOP_DEAD_HEAD,
    },
    Rule {
        id: CauseId::CheckStuckOpen,
        cause: "Check valve stuck open: system oil escapes to tank through the open unloader",
        needs: &["stall_pa", "large_outlet_pressing_pa"],
        score: check_stuck_open,
        next_check: "Read the large-pump outlet gauge and the system gauge together while pressing: if the two read the same, the check is not holding. Then inspect the check valve's poppet, seat and spring.",
        caution: "The system can still hold pressure when the check is opened: lock out, relieve the pressure and verify zero on a gauge before opening the valve. Do not raise the unloading or relief setting to get more force; it does not cure a check that stays open.",
    },
    Rule {
        id: CauseId::UnloaderLowOrOpen,
        cause: "Unloading valve set too low or stuck open: the large pump is dumped during the approach",
        needs: &["unloading_observed_pa", "large_outlet_approach_pa", "fast_stroke"],
        score: unloader_low_or_open,
        next_check: "Watch the large-pump outlet gauge during the approach: near the back-pressure means the large pump is dumped. Check that the pilot line comes from the system side of the check valve, then raise the unloading setting slowly until the approach runs fast, keeping it below the design setting.",
        caution: ADJUST,
    },
    Rule {
        id: CauseId::LargePumpWorn,
        cause: "Large pump worn, or its suction restricted",
        needs: &["fast_stroke", "large_flow_test"],
        score: large_pump_worn,
        next_check: "Time the approach again at working temperature and listen at the pump for cavitation noise; check the suction strainer and line. Then flow-test the large pump with a flow meter and a loading valve at its outlet.",
        caution: "Fit test equipment only with the motor locked out and the pressure bled to zero, verified on a gauge. Never turn the relief up to make up for a worn pump.",
    },
    Rule {
        id: CauseId::CheckLeakingBack,
        cause: "Check valve leaking back: system oil returns to tank through the open unloader",
        needs: &["unloader_tank_flow_pressing_m3s", "slow_stroke"],
        score: check_leaking_back,
        next_check: "Fit a flow meter in the unloading valve's tank line and read it during pressing: more than the large pump's flow confirms the leak. Then inspect the check valve's seat and spring.",
        caution: "The check valve can trap full system pressure after the motor stops: lock out, bleed and verify zero on a gauge before opening it.",
    },
    Rule {
        id: CauseId::SmallPumpWorn,
        cause: "Small pump worn",
        needs: &["slow_stroke", "small_flow_test"],
        score: small_pump_worn,
        next_check: "Rule out the check valve first (tank-line flow during pressing no more than the large pump's flow) and the relief (stall pressure as designed); then flow-test the small pump at pressure.",
        caution: "Flow-test at pressure only with a loading valve and a gauge fitted and the relief in place. Never turn the relief up to make up for a worn pump.",
    },
    Rule {
        id: CauseId::UnloaderHighOrShut,
        cause: "Unloading valve set too high or stuck shut: the large pump stays loaded into pressing",
        needs: &[
            "unloading_observed_pa",
            "large_outlet_pressing_pa",
            "unloader_tank_flow_pressing_m3s",
            "slow_stroke",
            "motor",
        ],
        score: unloader_high_or_shut,
        next_check: "Read the system gauge at the moment the large-pump outlet gauge drops and compare it with the design setting; clamp the motor current at the end of the approach, where the peak is. Then lower the setting, or free the spool.",
        caution: "An overloaded motor trips or overheats: stop if it trips repeatedly. Nothing limits the large pump's pressure if its check sticks as well. Adjust only with a gauge fitted, in small steps.",
    },
    Rule {
        id: CauseId::ReliefLow,
        cause: "Relief valve set too low, or its seat leaking",
        needs: &["stall_pa"],
        score: relief_low,
        next_check: "Stall the cylinder at the end of its stroke and read the system gauge. If it is low, isolate the relief from the pump (block its line as a test) to tell the relief from the pump, then reset or repair the relief.",
        caution: "Reset a relief only to the design's setting, never above the rating of the weakest component, starting from the backed-off position with a gauge fitted. Never turn the relief up to make up for a worn pump.",
    },
    Rule {
        id: CauseId::ReliefHigh,
        cause: "Relief valve set too high, or blocked",
        needs: &["stall_pa"],
        score: relief_high,
        next_check: "Stop pressing to full force. Compare the stall pressure with the design setting and with the ratings of the small pump, cylinder, valves and hoses, including rod-end intensification (area ratio times pressure).",
        caution: "Pressure above design can burst a hose or fitting: a whipping hose and an oil jet injure. Lock out, bleed to zero on a gauge, then reset from the backed-off position with a gauge fitted.",
    },
    Rule {
        id: CauseId::Hunting,
        cause: "The approach needs nearly the unloading pressure, so the valve hunts between fast and slow",
        needs: &["system_approach_pa", "approach_speed_alternates"],
        score: hunting,
        next_check: "Compare the approach gauge with the unloading point; keep the unloading setting well above the approach pressure (25 % or more). Look for what raised the approach pressure: a binding guide, heavier tooling, a throttled valve or line.",
        caution: ADJUST,
    },
];
