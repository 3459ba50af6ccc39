//! The machine-check form: what each reading field is, how typed text
//! becomes the engine's [`Readings`], and back. Pure, no web crates.
//!
//! **Invariant:** what a person typed is kept as typed, with the unit
//! system it was typed in; it is only re-formatted when shown in the other
//! unit system, and never lost because another field is wrong.

use std::collections::BTreeMap;

use kneepoint_engine::faults::{Faults, Stuck};
use kneepoint_engine::field::{FlowTest, MotorReading, Phase, Readings, TimedStroke};
use kneepoint_engine::units::{from_display, to_display, unit};
use kneepoint_engine::{Quantity, UnitSystem};
use serde::{Deserialize, Serialize};

use crate::fmt::{field_text, parse_number};

/// Which block of the form a reading belongs to.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Section {
    /// A timed stretch of the fast (approach) phase.
    Fast,
    /// A timed steady stretch of the slow (pressing) phase.
    Slow,
    /// A second slow stretch at another load.
    SecondSlow,
    /// Gauge readings at G1 and G2.
    Gauges,
    /// The flow meter at G3 and pump flow tests.
    Meters,
    /// Oil, shaft and motor.
    Machine,
}

/// One numeric reading field.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct InputSpec {
    /// Dotted path in [`Readings`] (the same path the engine's errors name).
    pub path: &'static str,
    /// Label for people.
    pub label: &'static str,
    /// What kind of value (decides the unit).
    pub quantity: Quantity,
    /// Block of the form.
    pub section: Section,
    /// Gauge point on the circuit diagram, if it is read there.
    pub gauge: Option<&'static str>,
}

const fn spec(
    path: &'static str,
    label: &'static str,
    quantity: Quantity,
    section: Section,
    gauge: Option<&'static str>,
) -> InputSpec {
    InputSpec {
        path,
        label,
        quantity,
        section,
        gauge,
    }
}

use Quantity as Q;
use Section as S;

/// Every numeric reading field, in form order.
pub const INPUTS: &[InputSpec] = &[
    spec(
        "fast_stroke.distance_m",
        "Distance timed",
        Q::Length,
        S::Fast,
        None,
    ),
    spec("fast_stroke.time_s", "Time", Q::Time, S::Fast, None),
    spec(
        "fast_stroke.system_pa",
        "System gauge meanwhile",
        Q::Pressure,
        S::Fast,
        Some("G1"),
    ),
    spec(
        "slow_stroke.distance_m",
        "Distance timed",
        Q::Length,
        S::Slow,
        None,
    ),
    spec("slow_stroke.time_s", "Time", Q::Time, S::Slow, None),
    spec(
        "slow_stroke.system_pa",
        "System gauge meanwhile",
        Q::Pressure,
        S::Slow,
        Some("G1"),
    ),
    spec(
        "second_slow_stroke.distance_m",
        "Distance timed",
        Q::Length,
        S::SecondSlow,
        None,
    ),
    spec(
        "second_slow_stroke.time_s",
        "Time",
        Q::Time,
        S::SecondSlow,
        None,
    ),
    spec(
        "second_slow_stroke.system_pa",
        "System gauge meanwhile",
        Q::Pressure,
        S::SecondSlow,
        Some("G1"),
    ),
    spec(
        "system_approach_pa",
        "System, fast phase",
        Q::Pressure,
        S::Gauges,
        Some("G1"),
    ),
    spec(
        "unloading_observed_pa",
        "System, where the speed drops",
        Q::Pressure,
        S::Gauges,
        Some("G1"),
    ),
    spec(
        "stall_pa",
        "System, cylinder stalled",
        Q::Pressure,
        S::Gauges,
        Some("G1"),
    ),
    spec(
        "large_outlet_approach_pa",
        "Large-pump outlet, fast phase",
        Q::Pressure,
        S::Gauges,
        Some("G2"),
    ),
    spec(
        "large_outlet_pressing_pa",
        "Large-pump outlet, slow phase",
        Q::Pressure,
        S::Gauges,
        Some("G2"),
    ),
    spec(
        "unloader_tank_flow_pressing_m3s",
        "Unloader tank line, slow phase",
        Q::Flow,
        S::Meters,
        Some("G3"),
    ),
    spec(
        "large_flow_test.flow_m3s",
        "Large pump alone: flow",
        Q::Flow,
        S::Meters,
        None,
    ),
    spec(
        "large_flow_test.pressure_pa",
        "Large pump alone: pressure held",
        Q::Pressure,
        S::Meters,
        None,
    ),
    spec(
        "small_flow_test.flow_m3s",
        "Small pump alone: flow",
        Q::Flow,
        S::Meters,
        None,
    ),
    spec(
        "small_flow_test.pressure_pa",
        "Small pump alone: pressure held",
        Q::Pressure,
        S::Meters,
        None,
    ),
    spec(
        "oil_temperature_c",
        "Oil in the tank",
        Q::Temperature,
        S::Machine,
        None,
    ),
    spec(
        "shaft_speed_rpm",
        "Shaft speed",
        Q::ShaftSpeed,
        S::Machine,
        None,
    ),
    spec(
        "motor.current_a",
        "Motor current",
        Q::Current,
        S::Machine,
        None,
    ),
    spec(
        "motor.voltage_v",
        "Supply voltage",
        Q::Voltage,
        S::Machine,
        None,
    ),
    spec(
        "motor.power_factor",
        "Power factor",
        Q::Ratio,
        S::Machine,
        None,
    ),
    spec(
        "motor.efficiency",
        "Motor efficiency (blank: the design's)",
        Q::Percent,
        S::Machine,
        None,
    ),
];

/// The spec of the reading at `path`.
pub fn input(path: &str) -> Option<&'static InputSpec> {
    INPUTS.iter().find(|s| s.path == path)
}

/// Text as typed, with the unit system it was typed in.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct Typed {
    /// The text.
    pub text: String,
    /// Units in force when it was typed.
    pub units: UnitSystem,
}

/// Everything entered on the form.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(default)]
pub struct Form {
    /// Typed text by reading path (blank entries are removed).
    pub texts: BTreeMap<String, Typed>,
    /// When the motor current was read.
    pub motor_during: Phase,
    /// Whether the cylinder visibly changes from fast to slow.
    pub speed_change_seen: Option<bool>,
    /// Whether the approach speed alternates with the valve buzzing.
    pub approach_speed_alternates: Option<bool>,
}

impl Default for Form {
    fn default() -> Form {
        Form {
            texts: BTreeMap::new(),
            motor_during: Phase::Pressing,
            speed_change_seen: None,
            approach_speed_alternates: None,
        }
    }
}

/// The readings a form holds, and a message for each field that cannot be
/// used as typed.
#[derive(Clone, Debug, Default, PartialEq)]
pub struct Parsed {
    /// The readings (SI) for the engine.
    pub readings: Readings,
    /// `(path, message)` for text that is not a number, or a reading that
    /// needs a partner field.
    pub errors: Vec<(&'static str, String)>,
}

impl Parsed {
    /// The message for `path`, if any.
    pub fn error(&self, path: &str) -> Option<&str> {
        self.errors
            .iter()
            .find(|(p, _)| *p == path)
            .map(|(_, m)| m.as_str())
    }
}

/// The display text of an SI value in a reading field.
pub fn value_text(q: Quantity, units: UnitSystem, si: f64) -> String {
    field_text(to_display(q, units, si), unit(q, units).decimals)
}

impl Form {
    /// True when nothing is entered.
    pub fn is_empty(&self) -> bool {
        self.texts.is_empty()
            && self.speed_change_seen.is_none()
            && self.approach_speed_alternates.is_none()
    }

    /// Sets the text of `path` as typed in `units` (blank clears it).
    pub fn set(&mut self, path: &str, text: &str, units: UnitSystem) {
        if text.trim().is_empty() {
            self.texts.remove(path);
        } else {
            self.texts.insert(
                path.to_string(),
                Typed {
                    text: text.to_string(),
                    units,
                },
            );
        }
    }

    /// Sets `path` to an SI value, shown in `units`.
    pub fn set_si(&mut self, path: &str, si: f64, units: UnitSystem) {
        if let Some(s) = input(path) {
            self.set(path, &value_text(s.quantity, units, si), units);
        }
    }

    /// What the field at `path` shows in `units`: the text as typed, or
    /// the same value in the other units when it was typed in those.
    pub fn text(&self, path: &str, units: UnitSystem) -> String {
        let Some(t) = self.texts.get(path) else {
            return String::new();
        };
        if t.units == units {
            return t.text.clone();
        }
        match (input(path), parse_number(&t.text)) {
            (Some(s), Some(v)) => {
                value_text(s.quantity, units, from_display(s.quantity, t.units, v))
            }
            _ => t.text.clone(),
        }
    }

    /// The SI value at `path`: `None` when blank, `Err` when not a number.
    fn si(&self, path: &'static str) -> Option<Result<f64, String>> {
        let t = self.texts.get(path)?;
        let s = input(path)?;
        Some(match parse_number(&t.text) {
            Some(v) => Ok(from_display(s.quantity, t.units, v)),
            None => Err(match unit(s.quantity, t.units).symbol {
                "" => "Enter a number, in plain figures.".to_string(),
                sym => format!("Enter a number in {sym}."),
            }),
        })
    }

    /// The readings for the engine, with a message for each field that
    /// cannot be used as typed. A bad field leaves out only its reading.
    pub fn parse(&self) -> Parsed {
        let mut out = Parsed::default();
        let mut get = |path: &'static str| -> Option<f64> {
            match self.si(path)? {
                Ok(v) => Some(v),
                Err(m) => {
                    out.errors.push((path, m));
                    None
                }
            }
        };
        let mut r = Readings::default();
        let mut needs: Vec<(&'static str, &'static str)> = Vec::new();

        let strokes = [
            ("fast_stroke", &mut r.fast_stroke),
            ("slow_stroke", &mut r.slow_stroke),
            ("second_slow_stroke", &mut r.second_slow_stroke),
        ];
        for (name, slot) in strokes {
            let (pd, pt, pp) = stroke_paths(name);
            let d = get(pd);
            let t = get(pt);
            let p = get(pp);
            match (d, t) {
                (Some(d), Some(t)) => {
                    *slot = Some(TimedStroke {
                        distance_m: d,
                        time_s: t,
                        system_pa: p,
                    });
                }
                _ => {
                    let typed = |p: &str| self.texts.contains_key(p);
                    if typed(pd) && !typed(pt) {
                        needs
                            .push((pt, "Also time this stretch, or clear the distance."));
                    }
                    if typed(pt) && !typed(pd) {
                        needs.push((
                            pd,
                            "Also enter the distance timed, or clear the time.",
                        ));
                    }
                    if typed(pp) && !typed(pd) && !typed(pt) {
                        needs.push((pd, "Enter the distance and time of this stretch to use its gauge."));
                    }
                }
            }
        }
        r.system_approach_pa = get("system_approach_pa");
        r.unloading_observed_pa = get("unloading_observed_pa");
        r.stall_pa = get("stall_pa");
        r.large_outlet_approach_pa = get("large_outlet_approach_pa");
        r.large_outlet_pressing_pa = get("large_outlet_pressing_pa");
        r.unloader_tank_flow_pressing_m3s = get("unloader_tank_flow_pressing_m3s");
        for (pf, pp, slot) in [
            (
                "large_flow_test.flow_m3s",
                "large_flow_test.pressure_pa",
                &mut r.large_flow_test,
            ),
            (
                "small_flow_test.flow_m3s",
                "small_flow_test.pressure_pa",
                &mut r.small_flow_test,
            ),
        ] {
            match (get(pf), get(pp)) {
                (Some(flow_m3s), Some(pressure_pa)) => {
                    *slot = Some(FlowTest {
                        flow_m3s,
                        pressure_pa,
                    });
                }
                _ => {
                    let typed = |p: &str| self.texts.contains_key(p);
                    if typed(pf) && !typed(pp) {
                        needs.push((pp, "Enter the pressure the loading valve held."));
                    }
                    if typed(pp) && !typed(pf) {
                        needs.push((pf, "Enter the flow read at that pressure."));
                    }
                }
            }
        }
        r.oil_temperature_c = get("oil_temperature_c");
        r.shaft_speed_rpm = get("shaft_speed_rpm");
        let motor = ["motor.current_a", "motor.voltage_v", "motor.power_factor"];
        let m: Vec<Option<f64>> = motor.iter().map(|p| get(p)).collect();
        let eff = get("motor.efficiency");
        if let [Some(current_a), Some(voltage_v), Some(power_factor)] = m[..] {
            r.motor = Some(MotorReading {
                during: self.motor_during,
                current_a,
                voltage_v,
                power_factor,
                efficiency: eff,
            });
        } else if motor.iter().any(|p| self.texts.contains_key(*p)) {
            for p in motor {
                if !self.texts.contains_key(p) {
                    needs.push((
                        p,
                        "Needed with the other motor figures (current, voltage, power factor).",
                    ));
                }
            }
        }
        r.speed_change_seen = self.speed_change_seen;
        r.approach_speed_alternates = self.approach_speed_alternates;
        for (p, m) in needs {
            if out.error(p).is_none() {
                out.errors.push((p, m.to_string()));
            }
        }
        out.readings = r;
        out
    }

    /// A form showing `r` in `units` (the fault simulator's readings).
    pub fn from_readings(r: &Readings, units: UnitSystem) -> Form {
        let mut f = Form::default();
        let mut put = |path: &str, v: Option<f64>| {
            if let Some(v) = v.filter(|v| v.is_finite()) {
                f.set_si(path, v, units);
            }
        };
        for (name, s) in [
            ("fast_stroke", &r.fast_stroke),
            ("slow_stroke", &r.slow_stroke),
            ("second_slow_stroke", &r.second_slow_stroke),
        ] {
            if let Some(s) = s {
                let (pd, pt, pp) = stroke_paths(name);
                put(pd, Some(s.distance_m));
                put(pt, Some(s.time_s));
                put(pp, s.system_pa);
            }
        }
        put("system_approach_pa", r.system_approach_pa);
        put("unloading_observed_pa", r.unloading_observed_pa);
        put("stall_pa", r.stall_pa);
        put("large_outlet_approach_pa", r.large_outlet_approach_pa);
        put("large_outlet_pressing_pa", r.large_outlet_pressing_pa);
        put(
            "unloader_tank_flow_pressing_m3s",
            r.unloader_tank_flow_pressing_m3s,
        );
        if let Some(t) = r.large_flow_test {
            put("large_flow_test.flow_m3s", Some(t.flow_m3s));
            put("large_flow_test.pressure_pa", Some(t.pressure_pa));
        }
        if let Some(t) = r.small_flow_test {
            put("small_flow_test.flow_m3s", Some(t.flow_m3s));
            put("small_flow_test.pressure_pa", Some(t.pressure_pa));
        }
        put("oil_temperature_c", r.oil_temperature_c);
        put("shaft_speed_rpm", r.shaft_speed_rpm);
        if let Some(m) = r.motor {
            put("motor.current_a", Some(m.current_a));
            put("motor.voltage_v", Some(m.voltage_v));
            put("motor.power_factor", Some(m.power_factor));
            put("motor.efficiency", m.efficiency);
            f.motor_during = m.during;
        }
        f.speed_change_seen = r.speed_change_seen;
        f.approach_speed_alternates = r.approach_speed_alternates;
        f
    }
}

/// Distance, time and gauge paths of the stroke `name`.
fn stroke_paths(name: &str) -> (&'static str, &'static str, &'static str) {
    match name {
        "fast_stroke" => (
            "fast_stroke.distance_m",
            "fast_stroke.time_s",
            "fast_stroke.system_pa",
        ),
        "slow_stroke" => (
            "slow_stroke.distance_m",
            "slow_stroke.time_s",
            "slow_stroke.system_pa",
        ),
        _ => (
            "second_slow_stroke.distance_m",
            "second_slow_stroke.time_s",
            "second_slow_stroke.system_pa",
        ),
    }
}

/// The time field a stopwatch phase fills.
pub fn time_path(section: Section) -> Option<&'static str> {
    match section {
        Section::Fast => Some("fast_stroke.time_s"),
        Section::Slow => Some("slow_stroke.time_s"),
        Section::SecondSlow => Some("second_slow_stroke.time_s"),
        _ => None,
    }
}

/// Stopwatch text: seconds with two decimals (`12.34 s`), or minutes and
/// seconds past a minute (`1:02.50`).
pub fn stopwatch_text(seconds: f64) -> String {
    if !seconds.is_finite() || seconds < 0.0 {
        return "0.00 s".into();
    }
    // Truncate to hundredths, as a stopwatch does.
    let cs = (seconds * 100.0).floor() as u64;
    let (m, rest) = (cs / 6000, cs % 6000);
    if m == 0 {
        format!("{}.{:02} s", rest / 100, rest % 100)
    } else {
        format!("{m}:{:02}.{:02}", rest / 100, rest % 100)
    }
}

/// The measured time as it goes into the time field: seconds to the
/// millisecond (performance.now() resolves finer; a hand on a button does
/// not).
pub fn measured_seconds(start_ms: f64, stop_ms: f64) -> Option<f64> {
    let dt = (stop_ms - start_ms) / 1000.0;
    (dt.is_finite() && dt >= 0.0).then(|| (dt * 1000.0).round() / 1000.0)
}

/// The injected faults in words, one per fault, in `units` (empty when
/// none). `relief_full_pa` turns the check's leak conductance into the flow
/// it passes at the relief setting.
pub fn fault_words(f: &Faults, relief_full_pa: f64, units: UnitSystem) -> Vec<String> {
    use kneepoint_engine::units::format;
    let mut w = Vec::new();
    if let Some(e) = f.large_volumetric_efficiency {
        w.push(format!("large pump worn ({:.0} % volumetric)", 100.0 * e));
    }
    if let Some(e) = f.small_volumetric_efficiency {
        w.push(format!("small pump worn ({:.0} % volumetric)", 100.0 * e));
    }
    if let Some(k) = f.check_leak_m3s_per_pa {
        w.push(format!(
            "check valve leaking back ({} at the relief setting)",
            format(Quantity::Flow, units, k * relief_full_pa)
        ));
    }
    if let Some(p) = f.unloading_setting_pa {
        w.push(format!(
            "unloading valve actually set at {}",
            format(Quantity::Pressure, units, p)
        ));
    }
    match f.unloader_stuck {
        Some(Stuck::Open) => w.push("unloading valve stuck open".into()),
        Some(Stuck::Closed) => w.push("unloading valve stuck shut".into()),
        None => {}
    }
    match f.check_stuck {
        Some(Stuck::Open) => w.push("check valve stuck open".into()),
        Some(Stuck::Closed) => w.push("check valve stuck shut".into()),
        None => {}
    }
    if let Some(r) = f.relief_scale {
        w.push(format!("relief valve at {:.0} % of its setting", 100.0 * r));
    }
    w
}

#[cfg(test)]
mod tests {
    use super::*;
    use kneepoint_engine::field::{diagnose, synthesize_readings};
    use kneepoint_engine::units::{BAR, PSI};
    use kneepoint_engine::{Circuit, Design};

    #[test]
    fn every_input_is_a_reading_the_engine_labels() {
        for s in INPUTS {
            assert_ne!(
                kneepoint_engine::field::reading_label(s.path),
                s.path,
                "{} has no engine label",
                s.path
            );
        }
    }

    #[test]
    fn typed_text_becomes_si_readings() {
        let mut f = Form::default();
        f.set("fast_stroke.distance_m", "200", UnitSystem::Metric);
        f.set("fast_stroke.time_s", "2,5", UnitSystem::Metric);
        f.set("stall_pa", "2400", UnitSystem::Us);
        let p = f.parse();
        assert!(p.errors.is_empty(), "{:?}", p.errors);
        let s = p.readings.fast_stroke.expect("a fast stroke");
        assert_eq!((s.distance_m, s.time_s, s.system_pa), (0.2, 2.5, None));
        assert_eq!(p.readings.stall_pa, Some(2400.0 * PSI));
    }

    #[test]
    fn a_bad_field_loses_only_itself() {
        let mut f = Form::default();
        f.set("slow_stroke.distance_m", "25", UnitSystem::Metric);
        f.set("slow_stroke.time_s", "abc", UnitSystem::Metric);
        f.set("stall_pa", "168", UnitSystem::Metric);
        f.set("oil_temperature_c", "45", UnitSystem::Metric);
        let p = f.parse();
        assert_eq!(p.error("slow_stroke.time_s"), Some("Enter a number in s."));
        assert_eq!(p.readings.slow_stroke, None);
        assert_eq!(p.readings.stall_pa, Some(168.0 * BAR));
        assert_eq!(p.readings.oil_temperature_c, Some(45.0));
        // The text stays as typed.
        assert_eq!(f.text("slow_stroke.time_s", UnitSystem::Metric), "abc");
    }

    #[test]
    fn partners_are_asked_for() {
        let mut f = Form::default();
        f.set("fast_stroke.distance_m", "200", UnitSystem::Metric);
        f.set("large_flow_test.flow_m3s", "20", UnitSystem::Metric);
        f.set("motor.current_a", "12", UnitSystem::Metric);
        let p = f.parse();
        assert!(p.error("fast_stroke.time_s").is_some());
        assert!(p.error("large_flow_test.pressure_pa").is_some());
        assert!(p.error("motor.voltage_v").is_some());
        assert!(p.error("motor.power_factor").is_some());
        assert!(p.error("motor.current_a").is_none());
        assert!(p.readings.is_empty());
    }

    #[test]
    fn other_units_show_the_same_value() {
        let mut f = Form::default();
        f.set("stall_pa", "1000", UnitSystem::Us);
        assert_eq!(f.text("stall_pa", UnitSystem::Us), "1000");
        assert_eq!(f.text("stall_pa", UnitSystem::Metric), "68.95");
        f.set("oil_temperature_c", "50", UnitSystem::Metric);
        assert_eq!(f.text("oil_temperature_c", UnitSystem::Us), "122");
        f.set("oil_temperature_c", "", UnitSystem::Metric);
        assert_eq!(f.text("oil_temperature_c", UnitSystem::Metric), "");
        assert!(!f.texts.contains_key("oil_temperature_c"));
    }

    #[test]
    fn simulated_readings_survive_the_form() {
        // Readings shown on the form (four significant digits) and read
        // back diagnose as the originals do.
        let d = Design::default();
        let c = Circuit::new(&d).unwrap();
        let r = synthesize_readings(&c);
        for units in [UnitSystem::Metric, UnitSystem::Us] {
            let f = Form::from_readings(&r, units);
            let p = f.parse();
            assert!(p.errors.is_empty(), "{:?}", p.errors);
            let a = diagnose(&c, &r).unwrap();
            let b = diagnose(&c, &p.readings).unwrap();
            assert_eq!(a.verdict, b.verdict);
            let (x, y) = (
                r.fast_stroke.unwrap().time_s,
                p.readings.fast_stroke.unwrap().time_s,
            );
            assert!((x - y).abs() / x < 5e-4, "{x} {y}");
            assert_eq!(p.readings.motor.unwrap().during, r.motor.unwrap().during);
        }
    }

    #[test]
    fn stopwatch_text_table() {
        for (s, t) in [
            (0.0, "0.00 s"),
            (2.499, "2.49 s"),
            (12.345, "12.34 s"),
            (61.5, "1:01.50"),
            (-1.0, "0.00 s"),
            (f64::NAN, "0.00 s"),
        ] {
            assert_eq!(stopwatch_text(s), t, "{s}");
        }
        assert_eq!(measured_seconds(1000.0, 3500.4), Some(2.5));
        assert_eq!(measured_seconds(10.0, 5.0), None);
    }

    #[test]
    fn faults_in_words() {
        let mut f = Faults::default();
        assert!(fault_words(&f, 168e5, UnitSystem::Metric).is_empty());
        f.large_volumetric_efficiency = Some(0.6);
        f.check_leak_m3s_per_pa = Some(1.0e-3 / 60.0 / 100e5);
        f.unloader_stuck = Some(Stuck::Closed);
        f.relief_scale = Some(0.5);
        let w = fault_words(&f, 100e5, UnitSystem::Metric);
        assert_eq!(
            w,
            vec![
                "large pump worn (60 % volumetric)".to_string(),
                "check valve leaking back (1.0 L/min at the relief setting)".into(),
                "unloading valve stuck shut".into(),
                "relief valve at 50 % of its setting".into(),
            ]
        );
    }
}
