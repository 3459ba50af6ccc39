//! At the machine: readings, back-calculation and diagnosis (brief §8).
//!
//! * [`Readings`]: what a technician reads (timed strokes, gauges, a
//!   tank-line flow meter, oil temperature, motor current), all optional, SI.
//! * [`BackCalc`]: delivered flows, volumetric efficiencies, leakage
//!   coefficients, observed settings and motor load (brief §8.2).
//! * [`diagnose`]: a ranked list of likely causes from the rule table
//!   [`RULES`] (brief §8.3), each with its evidence, the check to do next and
//!   its caution; or "consistent with the design"; or "cannot tell yet".
//! * [`synthesize_readings`]: the readings a faulted design would give, for
//!   teaching and for the tests of every rule.
//! * [`component_states`]: what each valve and pump does at one pressure,
//!   for the circuit diagram.
//!
//! `docs/field-check.md` describes the method, the rule table and sources.

mod backcalc;
mod readings;
mod rules;
mod synth;

use serde::Serialize;

pub use backcalc::{
    leakage_one_point, leakage_two_point, three_phase_power, volumetric_efficiency,
    BackCalc, FlowTestResult, Leakage, LeakageMethod, MotorLoad, SettingCompare,
};
pub use readings::{
    reading_label, stroke_flow, FlowTest, MotorReading, Phase, Readings, TimedStroke,
    FLOW_LIMIT_OF_THEORETICAL, GAUGE_MARGIN, READING_LABELS, STALL_LIMIT_OF_RATING,
};
pub use rules::{
    ramp, CauseId, Context, Evidence, Rule, Scored, FLOW_TOL, GAUGE_TOL, METER_TOL,
    RULES, UNLOADING_TOL,
};
pub use synth::{
    stall_pressure, synthesize_readings, SYNTH_FAST_FRACTION, SYNTH_POWER_FACTOR,
    SYNTH_SECOND_FORCE_FRACTION, SYNTH_SLOW_DISTANCE_M, SYNTH_VOLTAGE_V,
};

use crate::circuit::{Circuit, Regime};
use crate::error::{FieldError, SolveError, ValidationErrors};
use crate::units::{format, Quantity, UnitSystem};

/// A score at or above this makes a finding (below it the cause is cleared).
pub const FINDING_MIN_SCORE: f64 = 0.15;

/// One likely cause, with what points to it.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct Finding {
    /// Which cause.
    pub cause: CauseId,
    /// Title for people.
    pub title: &'static str,
    /// How strongly the readings point to it, 0 ..= 1.
    pub score: f64,
    /// Readings that point to it (or clear rivals), with numbers in SI.
    pub evidence: Vec<Evidence>,
    /// The check that confirms it, to do next.
    pub next_check: &'static str,
    /// The caution that goes with that check.
    pub caution: &'static str,
    /// Readings not taken that would confirm it or tell it from a rival.
    pub confirm_with: Vec<&'static str>,
}

impl Finding {
    /// The finding in words, with numbers in `units`: title, score, one line
    /// per evidence, what to check next and the caution.
    pub fn message(&self, units: UnitSystem) -> String {
        let mut s = format!("{} (score {:.2}).", self.title, self.score);
        for e in &self.evidence {
            s.push_str("\n  • ");
            s.push_str(&e.message(units));
            s.push('.');
        }
        if !self.confirm_with.is_empty() {
            s.push_str("\n  To confirm, also measure: ");
            s.push_str(&labels(&self.confirm_with));
            s.push('.');
        }
        s.push_str("\n  Next: ");
        s.push_str(self.next_check);
        s.push_str("\n  Caution: ");
        s.push_str(self.caution);
        s
    }
}

fn labels(paths: &[&'static str]) -> String {
    paths
        .iter()
        .map(|p| reading_label(p))
        .collect::<Vec<_>>()
        .join(", ")
}

/// A cause that could not be checked for want of readings.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct NotChecked {
    /// Which cause.
    pub cause: CauseId,
    /// Title for people.
    pub title: &'static str,
    /// Readings, any of which would let it be checked.
    pub measure: &'static [&'static str],
}

/// The overall answer.
#[derive(Clone, Debug, PartialEq, Serialize)]
#[serde(tag = "kind", rename_all = "snake_case")]
pub enum Verdict {
    /// Every rule was checked and none points to a fault.
    ConsistentWithDesign,
    /// At least one likely cause; see [`Diagnosis::findings`], most likely
    /// first.
    Findings,
    /// Nothing points to a fault yet, but some causes could not be checked.
    CannotTellYet {
        /// Readings to take next.
        measure: Vec<&'static str>,
    },
}

/// A note that is not a cause: oil temperature, motor over its rating.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
#[serde(tag = "kind", rename_all = "snake_case")]
pub enum Note {
    /// Oil hotter than about 60 °C: burn hazard, thin oil raises leakage.
    OilHot {
        /// Temperature (°C).
        temperature_c: f64,
    },
    /// Oil hotter than about 82 °C: hoses and seals degrade.
    OilTooHot {
        /// Temperature (°C).
        temperature_c: f64,
    },
    /// Oil colder than about 15 °C: flows read better than when warm.
    OilCold {
        /// Temperature (°C).
        temperature_c: f64,
    },
    /// The motor runs above its installed rating.
    MotorAboveRating {
        /// Shaft power over rating.
        fraction: f64,
    },
}

impl Note {
    /// The note for people.
    pub fn message(&self, units: UnitSystem) -> String {
        let t = |c: f64| format(Quantity::Temperature, units, c);
        match *self {
            Note::OilHot { temperature_c } => format!(
                "Oil at {}: hot oil burns, and thin oil leaks more, so pumps read worse than at normal temperature. Re-time at normal working temperature and check the cooler.",
                t(temperature_c)
            ),
            Note::OilTooHot { temperature_c } => format!(
                "Oil at {}: above about 82 °C hoses and seals degrade quickly. Find the heat source (relief or unloader passing, a leaking check) and the cooler's state before running on.",
                t(temperature_c)
            ),
            Note::OilCold { temperature_c } => format!(
                "Oil at {}: cold, thick oil leaks less, so pumps read better than they will when warm. Re-time at working temperature.",
                t(temperature_c)
            ),
            Note::MotorAboveRating { fraction } => format!(
                "The motor delivers about {:.0} % of its rating. Find why before it trips or overheats.",
                100.0 * fraction
            ),
        }
    }
}

/// Safety cautions shown with every field check (brief §9).
pub const FIELD_CAUTIONS: &[&str] = &[
    "The check valve and a closed-centre directional valve can trap full pressure after the motor stops: lock out and tag out, lower or block the load, bleed, and verify zero on a gauge before loosening any fitting.",
    "An oil jet from a pinhole leak can pierce the skin at about 7 bar: never feel for leaks with the hand; use card or wood. An injection wound is a surgical emergency.",
    "Oil above about 60 °C burns.",
    "These are estimates for setting-up and teaching. Settings on a real machine are made by competent persons following the machine's instructions and local codes (ISO 4413), with guarded access.",
];

/// The whole field check.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct Diagnosis {
    /// The overall answer.
    pub verdict: Verdict,
    /// Likely causes, most likely first (score at or above
    /// [`FINDING_MIN_SCORE`]).
    pub findings: Vec<Finding>,
    /// Causes checked and cleared, with their (low) scores.
    pub cleared: Vec<(CauseId, f64)>,
    /// Causes that could not be checked.
    pub not_checked: Vec<NotChecked>,
    /// The back-calculation.
    pub back_calc: BackCalc,
    /// Temperature and motor notes.
    pub notes: Vec<Note>,
    /// Readings that could not be used, each with its field and message.
    pub errors: Vec<FieldError>,
    /// Cautions to show with the result.
    pub cautions: &'static [&'static str],
}

impl Diagnosis {
    /// The overall answer in words.
    pub fn summary(&self, units: UnitSystem) -> String {
        let _ = units;
        match &self.verdict {
            Verdict::ConsistentWithDesign => {
                "Consistent with the design: every reading is within tolerance of what the design expects.".into()
            }
            Verdict::Findings => {
                let top = &self.findings[0];
                format!("Most likely: {}.", top.title)
            }
            Verdict::CannotTellYet { measure } => format!(
                "Nothing points to a fault so far, but I cannot tell yet: measure {}.",
                labels(measure)
            ),
        }
    }

    /// The finding for `cause`, if it is one.
    pub fn finding(&self, cause: CauseId) -> Option<&Finding> {
        self.findings.iter().find(|f| f.cause == cause)
    }
}

/// Diagnoses a machine from `readings` against the design of `design`
/// (its injected faults, if any, are ignored: the design is the intent).
///
/// Bad readings are listed in [`Diagnosis::errors`] with their field and
/// left out; every other reading is still used.
///
/// # Errors
/// When readings were entered and none of them is usable: every bad one,
/// with its field.
pub fn diagnose(
    design: &Circuit,
    readings: &Readings,
) -> Result<Diagnosis, ValidationErrors> {
    let (checked, errors) = readings::check(design, readings);
    if checked.entered > 0 && checked.usable == 0 && !errors.is_empty() {
        return Err(ValidationErrors(errors));
    }
    let c = backcalc::reference(design, checked.speed_rpm);
    let b = backcalc::back_calc(&c, &checked);
    let s = rules::signals(&c, &checked, &b);
    let ctx = Context {
        c: &c,
        r: &checked,
        b: &b,
        s,
    };
    let mut findings = Vec::new();
    let mut cleared = Vec::new();
    let mut not_checked = Vec::new();
    for rule in RULES {
        match (rule.score)(&ctx) {
            Some(sc) => {
                let score = if sc.score.is_finite() {
                    sc.score.clamp(0.0, 1.0)
                } else {
                    0.0
                };
                if score >= FINDING_MIN_SCORE {
                    findings.push(Finding {
                        cause: rule.id,
                        title: rule.cause,
                        score,
                        evidence: sc.evidence,
                        next_check: rule.next_check,
                        caution: rule.caution,
                        confirm_with: sc.confirm_with,
                    });
                } else {
                    cleared.push((rule.id, score));
                }
            }
            None => not_checked.push(NotChecked {
                cause: rule.id,
                title: rule.cause,
                measure: rule.needs,
            }),
        }
    }
    // Stable sort: ties keep the table's order.
    findings.sort_by(|a, b| b.score.total_cmp(&a.score));
    let verdict = if !findings.is_empty() {
        Verdict::Findings
    } else if not_checked.is_empty() {
        Verdict::ConsistentWithDesign
    } else {
        let mut measure: Vec<&'static str> = Vec::new();
        for n in &not_checked {
            if let Some(first) = n.measure.first() {
                if !measure.contains(first) {
                    measure.push(first);
                }
            }
        }
        Verdict::CannotTellYet { measure }
    };
    let mut notes = Vec::new();
    if let Some(t) = checked.oil_c {
        if t > 82.0 {
            notes.push(Note::OilTooHot { temperature_c: t });
        } else if t > 60.0 {
            notes.push(Note::OilHot { temperature_c: t });
        } else if t < 15.0 {
            notes.push(Note::OilCold { temperature_c: t });
        }
    }
    if let Some(f) = b.motor.and_then(|m| m.rating_fraction) {
        if f > 1.0 {
            notes.push(Note::MotorAboveRating { fraction: f });
        }
    }
    Ok(Diagnosis {
        verdict,
        findings,
        cleared,
        not_checked,
        back_calc: b,
        notes,
        errors,
        cautions: FIELD_CAUTIONS,
    })
}

/// What each component does at one system pressure, for the circuit
/// diagram (SI).
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct ComponentStates {
    /// System pressure (Pa).
    pub pressure_pa: f64,
    /// Staircase regime.
    pub regime: Regime,
    /// Large-pump outlet pressure (Pa).
    pub large_outlet_pa: f64,
    /// Where the large pump's delivery goes.
    pub large_pump: LargeDelivery,
    /// Large pump flow to the system through the check (m³/s).
    pub large_to_system_m3s: f64,
    /// Large pump flow to tank through the unloader (m³/s).
    pub large_to_tank_m3s: f64,
    /// Small pump delivery to the system (m³/s).
    pub small_to_system_m3s: f64,
    /// The check valve passes flow from the large pump to the system
    /// (always when it is stuck open, never when stuck shut).
    pub check_open: bool,
    /// How the check valve is stuck, an injected fault.
    pub check_stuck: Option<crate::faults::Stuck>,
    /// Flow leaking back through a faulty check (m³/s).
    pub check_back_leak_m3s: f64,
    /// How far the unloader is open, 0 shut to 1 fully open.
    pub unloader_open_fraction: f64,
    /// The relief passes flow.
    pub relief_passing: bool,
    /// Share of the pump delivery the relief passes, 0 ..= 1.
    pub relief_fraction: f64,
    /// Flow over the relief (m³/s).
    pub relief_flow_m3s: f64,
    /// Flow to the directional valve (m³/s).
    pub out_flow_m3s: f64,
}

/// Where the large pump's delivery goes.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum LargeDelivery {
    /// All of it to the system, through the check.
    ToSystem,
    /// Part to the system, part to tank (unloader opening).
    Split,
    /// All of it to tank through the unloader.
    ToTank,
}

/// The state of each component at system pressure `p`.
///
/// # Errors
/// [`SolveError::PressureOutOfRange`] when `p` is not in 0 ..= p_rf.
pub fn component_states(c: &Circuit, p: f64) -> Result<ComponentStates, SolveError> {
    let pp = c.pump_point(p)?;
    let tiny = 1e-9 * (c.large_theoretical_flow() + c.small_theoretical_flow());
    let to_sys = pp.large_to_system_m3s + pp.check_back_leak_m3s;
    let large_pump = if pp.unloader_open_fraction <= 0.0 {
        LargeDelivery::ToSystem
    } else if pp.unloader_open_fraction >= 1.0 {
        LargeDelivery::ToTank
    } else {
        LargeDelivery::Split
    };
    Ok(ComponentStates {
        pressure_pa: pp.pressure_pa,
        regime: pp.regime,
        large_outlet_pa: pp.large_outlet_pa,
        large_pump,
        large_to_system_m3s: to_sys,
        large_to_tank_m3s: pp.large_flow_m3s - to_sys,
        small_to_system_m3s: pp.small_flow_m3s,
        check_open: match c.check_stuck() {
            Some(crate::faults::Stuck::Open) => true,
            Some(crate::faults::Stuck::Closed) => false,
            None => to_sys > tiny,
        },
        check_stuck: c.check_stuck(),
        check_back_leak_m3s: pp.check_back_leak_m3s,
        unloader_open_fraction: pp.unloader_open_fraction,
        relief_passing: pp.relief_flow_m3s > tiny,
        relief_fraction: c.relief_fraction(p),
        relief_flow_m3s: pp.relief_flow_m3s,
        out_flow_m3s: pp.out_flow_m3s,
    })
}
