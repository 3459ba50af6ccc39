//! Field check: back-calculation against published and worked examples,
//! every diagnosis rule against the fault simulator on every demo design,
//! bad readings, and never a panic.

use kneepoint_engine::faults::Stuck;
use kneepoint_engine::field::*;
use kneepoint_engine::units::{BAR, INCH, LITRE, MINUTE, US_GALLON};
use kneepoint_engine::*;
use proptest::prelude::*;

const LPM: f64 = LITRE / MINUTE;
const GPM: f64 = US_GALLON / MINUTE;

fn rel(a: f64, b: f64) -> f64 {
    (a / b - 1.0).abs()
}

// ---------------------------------------------------------------------------
// Examples 5a and 5b of the domain brief (§10): published and worked values.
// ---------------------------------------------------------------------------

/// Example 5a: 3 in bore, 30 in in 3 s; a 2.5 in³/rev pump at 1800 rpm.
#[test]
fn example_5a_timed_stroke_us() {
    let bore = 3.0 * INCH;
    let area = std::f64::consts::PI * bore * bore / 4.0;
    let q = stroke_flow(area, 30.0 * INCH, 3.0);
    let eta = volumetric_efficiency(q, 2.5 * INCH * INCH * INCH, 1800.0);
    // (value found, expected, tolerance, source)
    let rows: [(f64, f64, f64, &str); 3] = [
        // The published expression evaluated as printed: 0.26·7.065·30/3
        // = 18.369 gpm (it rounds 60/231 to 0.26 and π·1.5² to 7.065).
        (
            q / GPM,
            0.26 * 7.065 * 30.0 / 3.0,
            1e-3,
            "S-2 formula, as printed",
        ),
        // The published result, given to 3 figures: half a unit in the last
        // digit.
        (q / GPM, 18.4, 0.05 / 18.4, "S-2 published 18.4 gpm"),
        // η_v = 18.36/19.48 (brief §10 Example 5a, worked [D]).
        (eta, 0.942, 1e-3, "brief §10 Ex. 5a η_v 0.942"),
    ];
    for (found, want, tol, src) in rows {
        assert!(rel(found, want) <= tol, "{src}: {found} vs {want}");
    }
}

/// Example 5b: hi-lo field check on a 125 mm press, 80 + 5 cm³/rev at
/// 1450 rpm (brief §10 Example 5b, worked [D]).
#[test]
fn example_5b_hi_lo_back_calculation() {
    let mut d = example("baler").unwrap();
    d.cylinder.bore_m = 0.125;
    d.large_pump.displacement_m3 = 80e-6;
    d.small_pump.displacement_m3 = 5e-6;
    d.drive.speed_rpm = 1450.0;
    let c = Circuit::new(&d).unwrap();
    let r = Readings {
        fast_stroke: Some(TimedStroke {
            distance_m: 0.300,
            time_s: 1.95,
            system_pa: None,
        }),
        slow_stroke: Some(TimedStroke {
            distance_m: 0.025,
            time_s: 3.6,
            system_pa: None,
        }),
        ..Readings::default()
    };
    let b = diagnose(&c, &r).unwrap().back_calc;
    let rows: [(f64, f64, &str); 6] = [
        (
            b.fast_flow_m3s.unwrap() / LPM,
            113.3,
            "brief Ex. 5b Q_L+Q_S 113.3 L/min",
        ),
        (
            b.slow_flow_m3s.unwrap() / LPM,
            5.11,
            "brief Ex. 5b Q_S 5.11 L/min",
        ),
        (
            b.large_flow_m3s.unwrap() / LPM,
            108.2,
            "brief Ex. 5b Q_L 108.2 L/min",
        ),
        (
            b.large_theoretical_m3s / LPM,
            116.0,
            "brief Ex. 5b 116.0 L/min theoretical",
        ),
        (
            b.large_volumetric_efficiency.unwrap(),
            0.932,
            "brief Ex. 5b η_v,L 0.932",
        ),
        (
            b.small_volumetric_efficiency.unwrap(),
            0.705,
            "brief Ex. 5b η_v,S 0.705",
        ),
    ];
    for (found, want, src) in rows {
        assert!(rel(found, want) <= 1e-3, "{src}: {found} vs {want}");
    }
    // Brief §1: Q [L/min] = 0.006·A [cm²]·s [mm]/t [s], evaluated by hand.
    let hand = 0.006 * 122.718 * 300.0 / 1.95;
    assert!(rel(b.fast_flow_m3s.unwrap() / LPM, hand) <= 1e-4);
    // η_v,S 0.705 is suspect: the diagnosis points at the slow phase.
    let dg = diagnose(&c, &r).unwrap();
    assert_eq!(dg.verdict, Verdict::Findings);
    let top = dg.findings[0].cause;
    assert!(
        matches!(top, CauseId::SmallPumpWorn | CauseId::CheckLeakingBack),
        "{top:?}"
    );
    assert!(dg.findings[0]
        .confirm_with
        .contains(&"unloader_tank_flow_pressing_m3s"));
}

#[test]
fn leakage_and_motor_formulas() {
    // K = (Q₁ − Q₂)/(p₂ − p₁) (brief §8.2): 10 and 9 L/min at 50 and 150 bar.
    let k = leakage_two_point(10.0 * LPM, 50.0 * BAR, 9.0 * LPM, 150.0 * BAR);
    assert!(rel(k, (1.0 * LPM) / (100.0 * BAR)) < 1e-12);
    // P = √3·V·I·pf: 400 V, 10 A, 0.85 → 5889 W (arithmetic, common formula).
    let p = three_phase_power(400.0, 10.0, 0.85);
    assert!(rel(p, 5888.97) < 1e-5, "{p}");
}

// ---------------------------------------------------------------------------
// Every rule against the fault simulator, on every demo design.
// ---------------------------------------------------------------------------

type Inject = fn(&Design, &Circuit) -> Design;

fn with(d: &Design, f: impl FnOnce(&mut Design)) -> Design {
    let mut d = d.clone();
    f(&mut d);
    d
}

fn pressing_pa(c: &Circuit) -> f64 {
    c.motion(Motion::Pressing).unwrap().pump.pressure_pa
}

fn approach_fast_pa(c: &Circuit) -> f64 {
    c.fast_motion_pressure(Direction::Extend, c.design().loads.approach_force_n)
        .unwrap()
}

/// One or more single-fault scenarios per cause.
const SCENARIOS: &[(CauseId, &str, Inject)] = &[
    (CauseId::LargePumpWorn, "large pump η_v 0.5", |d, _| {
        with(d, |d| d.faults.large_volumetric_efficiency = Some(0.5))
    }),
    (CauseId::SmallPumpWorn, "small pump η_v 0.7", |d, _| {
        with(d, |d| d.faults.small_volumetric_efficiency = Some(0.7))
    }),
    (
        CauseId::CheckLeakingBack,
        "check leak 50 % of Q_S at pressing",
        |d, c| {
            let g = 0.5 * c.small_theoretical_flow() / pressing_pa(c);
            with(d, |d| d.faults.check_leak_m3s_per_pa = Some(g))
        },
    ),
    (CauseId::UnloaderLowOrOpen, "unloader stuck open", |d, _| {
        with(d, |d| d.faults.unloader_stuck = Some(Stuck::Open))
    }),
    (
        CauseId::UnloaderLowOrOpen,
        "unloader at half the approach",
        |d, c| {
            let p = 0.5 * approach_fast_pa(c);
            with(d, |d| d.faults.unloading_setting_pa = Some(p))
        },
    ),
    (
        CauseId::UnloaderLowOrOpen,
        "unloader at 60 % of setting",
        |d, _| {
            with(d, |d| {
                d.faults.unloading_setting_pa = Some(0.6 * d.unloading_valve.setting_pa)
            })
        },
    ),
    (
        CauseId::UnloaderHighOrShut,
        "unloader stuck shut",
        |d, _| with(d, |d| d.faults.unloader_stuck = Some(Stuck::Closed)),
    ),
    (
        CauseId::UnloaderHighOrShut,
        "unloader at 160 % of setting",
        |d, _| {
            with(d, |d| {
                d.faults.unloading_setting_pa = Some(1.6 * d.unloading_valve.setting_pa)
            })
        },
    ),
    (CauseId::CheckStuckOpen, "check valve stuck open", |d, _| {
        with(d, |d| d.faults.check_stuck = Some(Stuck::Open))
    }),
    (CauseId::CheckStuckShut, "check valve stuck shut", |d, _| {
        with(d, |d| d.faults.check_stuck = Some(Stuck::Closed))
    }),
    (
        CauseId::CheckStuckShut,
        "check valve stuck shut, no large-side relief",
        |d, _| {
            with(d, |d| {
                d.faults.check_stuck = Some(Stuck::Closed);
                d.ratings.large_pump_relief_pa = None;
            })
        },
    ),
    (CauseId::ReliefLow, "relief at 85 %", |d, _| {
        with(d, |d| d.faults.relief_scale = Some(0.85))
    }),
    (CauseId::ReliefHigh, "relief at 115 %", |d, _| {
        with(d, |d| d.faults.relief_scale = Some(1.15))
    }),
    (
        CauseId::Hunting,
        "approach needs 95 % of the unloading point",
        |d, c| {
            // Heavier approach (binding guide, heavier tooling): find the force
            // at which the approach with both pumps needs 0.95·p_u.
            let target = 0.95 * c.unloading_pa();
            let (mut lo, mut hi) = (0.0, 1e6);
            for _ in 0..100 {
                let m = 0.5 * (lo + hi);
                match c.fast_motion_pressure(Direction::Extend, m) {
                    Ok(p) if p < target => lo = m,
                    _ => hi = m,
                }
            }
            with(d, |d| d.loads.approach_force_n = lo)
        },
    ),
];

#[test]
fn every_rule_has_a_scenario() {
    for rule in RULES {
        assert!(
            SCENARIOS.iter().any(|(id, _, _)| *id == rule.id),
            "no fault scenario for {:?}",
            rule.id
        );
    }
}

/// Readings synthesised from each demo design with one fault of `cause`
/// injected rank `cause` first.
fn check_rule(cause: CauseId) {
    let mut n = 0;
    for ex in EXAMPLES {
        let d = (ex.build)();
        let healthy = Circuit::new(&d).unwrap();
        for (_, what, inject) in SCENARIOS.iter().filter(|s| s.0 == cause) {
            n += 1;
            let faulty = Circuit::new(&inject(&d, &healthy)).unwrap();
            let r = synthesize_readings(&faulty);
            let dg = diagnose(&healthy, &r).unwrap();
            assert!(dg.errors.is_empty(), "{} {what}: {:?}", ex.name, dg.errors);
            assert_eq!(dg.verdict, Verdict::Findings, "{} {what}", ex.name);
            let top = &dg.findings[0];
            assert_eq!(
                top.cause,
                cause,
                "{} {what}: ranked {:?}",
                ex.name,
                dg.findings
                    .iter()
                    .map(|f| (f.cause, f.score))
                    .collect::<Vec<_>>()
            );
            assert!(top.score >= 0.3, "{} {what}: weak {}", ex.name, top.score);
            assert!(!top.evidence.is_empty());
            // The faulted design passed in as "the design" is read as its
            // intent: the same answer.
            let again = diagnose(&faulty, &r).unwrap();
            assert_eq!(again.findings[0].cause, cause);
        }
    }
    assert!(n >= EXAMPLES.len());
}

macro_rules! rule_tests {
    ($($name:ident => $cause:expr,)*) => {
        $(#[test] fn $name() { check_rule($cause); })*
    };
}

rule_tests! {
    rule_large_pump_worn => CauseId::LargePumpWorn,
    rule_small_pump_worn => CauseId::SmallPumpWorn,
    rule_check_leaking_back => CauseId::CheckLeakingBack,
    rule_unloader_low_or_open => CauseId::UnloaderLowOrOpen,
    rule_unloader_high_or_shut => CauseId::UnloaderHighOrShut,
    rule_relief_low => CauseId::ReliefLow,
    rule_relief_high => CauseId::ReliefHigh,
    rule_hunting => CauseId::Hunting,
    rule_check_stuck_open => CauseId::CheckStuckOpen,
    rule_check_stuck_shut => CauseId::CheckStuckShut,
}

#[test]
fn healthy_machine_is_consistent_with_the_design() {
    for ex in EXAMPLES {
        let c = Circuit::new(&(ex.build)()).unwrap();
        let r = synthesize_readings(&c);
        let dg = diagnose(&c, &r).unwrap();
        assert_eq!(dg.verdict, Verdict::ConsistentWithDesign, "{}", ex.name);
        assert!(dg.findings.is_empty());
        assert!(dg.summary(UnitSystem::Metric).starts_with("Consistent"));
    }
}

/// Stopwatch and gauge error of 3 % either way does not make a finding.
#[test]
fn healthy_machine_with_reading_error_is_still_consistent() {
    for ex in EXAMPLES {
        let c = Circuit::new(&(ex.build)()).unwrap();
        for sign in [-1.0, 1.0] {
            let e = 1.0 + sign * 0.03;
            let mut r = synthesize_readings(&c);
            for s in [
                &mut r.fast_stroke,
                &mut r.slow_stroke,
                &mut r.second_slow_stroke,
            ]
            .into_iter()
            .flatten()
            {
                s.time_s *= e;
            }
            for p in [
                &mut r.system_approach_pa,
                &mut r.unloading_observed_pa,
                &mut r.large_outlet_approach_pa,
                &mut r.large_outlet_pressing_pa,
                &mut r.unloader_tank_flow_pressing_m3s,
            ]
            .into_iter()
            .flatten()
            {
                *p /= e;
            }
            r.stall_pa = r.stall_pa.map(|p| p * (1.0 - sign * 0.03));
            for t in [&mut r.large_flow_test, &mut r.small_flow_test]
                .into_iter()
                .flatten()
            {
                t.flow_m3s *= e;
            }
            let dg = diagnose(&c, &r).unwrap();
            assert_eq!(
                dg.verdict,
                Verdict::ConsistentWithDesign,
                "{} ×{e}: {:?}",
                ex.name,
                dg.findings
                    .iter()
                    .map(|f| (f.cause, f.score))
                    .collect::<Vec<_>>()
            );
        }
    }
}

#[test]
fn without_readings_it_says_what_to_measure() {
    let c = Circuit::new(&Design::default()).unwrap();
    let dg = diagnose(&c, &Readings::default()).unwrap();
    match &dg.verdict {
        Verdict::CannotTellYet { measure } => {
            assert!(measure.contains(&"fast_stroke"));
            assert!(measure.contains(&"stall_pa"));
        }
        v => panic!("{v:?}"),
    }
    assert_eq!(dg.not_checked.len(), RULES.len());
    assert!(dg.summary(UnitSystem::Metric).contains("fast-phase timing"));
}

#[test]
fn only_a_fast_timing_cannot_clear_the_rest() {
    let c = Circuit::new(&Design::default()).unwrap();
    let full = synthesize_readings(&c);
    let r = Readings {
        fast_stroke: full.fast_stroke,
        ..Readings::default()
    };
    let dg = diagnose(&c, &r).unwrap();
    assert!(matches!(dg.verdict, Verdict::CannotTellYet { .. }));
    assert!(dg.not_checked.iter().any(|n| n.cause == CauseId::ReliefLow));
}

// ---------------------------------------------------------------------------
// Bad readings: a message on that field, and nothing else lost.
// ---------------------------------------------------------------------------

#[test]
fn bad_readings_are_named_and_the_rest_still_used() {
    let d = Design::default();
    let c = Circuit::new(&d).unwrap();
    let faulty = Circuit::new(&with(&d, |d| d.faults.relief_scale = Some(0.8))).unwrap();
    let mut r = synthesize_readings(&faulty);
    r.fast_stroke.as_mut().unwrap().time_s = 0.0;
    r.slow_stroke.as_mut().unwrap().distance_m = 2.0 * d.cylinder.stroke_m;
    r.large_outlet_approach_pa = Some(10.0 * d.relief_valve.full_flow_pa);
    r.unloading_observed_pa = Some(f64::NAN);
    r.oil_temperature_c = Some(f64::INFINITY);
    let dg = diagnose(&c, &r).unwrap();
    let fields: Vec<_> = dg.errors.iter().map(|e| e.field).collect();
    for f in [
        "fast_stroke.time_s",
        "slow_stroke.distance_m",
        "large_outlet_approach_pa",
        "unloading_observed_pa",
        "oil_temperature_c",
    ] {
        assert!(fields.contains(&f), "{f} not flagged: {fields:?}");
    }
    for e in &dg.errors {
        assert!(!e.message(UnitSystem::Metric).is_empty());
    }
    let msg = dg
        .errors
        .iter()
        .find(|e| e.field == "slow_stroke.distance_m")
        .unwrap()
        .message(UnitSystem::Metric);
    assert!(msg.contains("400 mm"), "{msg}");
    // The stall reading still gives its finding.
    assert_eq!(dg.findings[0].cause, CauseId::ReliefLow);
    assert!(dg.back_calc.fast_flow_m3s.is_none());
    assert!(dg.back_calc.relief.is_some());
    // The input is untouched.
    assert_eq!(r.fast_stroke.unwrap().time_s, 0.0);
}

#[test]
fn only_bad_readings_is_an_error_naming_each() {
    let c = Circuit::new(&Design::default()).unwrap();
    let r = Readings {
        stall_pa: Some(-1.0),
        slow_stroke: Some(TimedStroke {
            distance_m: f64::NAN,
            time_s: 2.0,
            system_pa: None,
        }),
        ..Readings::default()
    };
    let e = diagnose(&c, &r).unwrap_err();
    assert!(e.for_field("stall_pa").is_some());
    assert!(e.for_field("slow_stroke.distance_m").is_some());
}

#[test]
fn a_timing_faster_than_both_pumps_is_flagged() {
    let c = Circuit::new(&Design::default()).unwrap();
    let r = Readings {
        fast_stroke: Some(TimedStroke {
            distance_m: 0.3,
            time_s: 0.01,
            system_pa: None,
        }),
        stall_pa: Some(168.0 * BAR),
        ..Readings::default()
    };
    let dg = diagnose(&c, &r).unwrap();
    assert_eq!(dg.errors[0].field, "fast_stroke.time_s");
}

fn reading() -> impl Strategy<Value = Option<f64>> {
    prop_oneof![
        Just(None),
        any::<f64>().prop_map(Some),
        (-1e3f64..1e8).prop_map(Some),
    ]
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(256))]
    #[test]
    fn diagnose_never_panics(
        v in proptest::collection::vec(reading(), 20),
        flags in proptest::collection::vec(proptest::option::of(any::<bool>()), 2),
        ex in 0usize..3,
    ) {
        let c = Circuit::new(&(EXAMPLES[ex].build)()).unwrap();
        let stroke = |i: usize| match (v[i], v[i + 1]) {
            (Some(distance_m), Some(time_s)) => Some(TimedStroke { distance_m, time_s, system_pa: v[i + 2] }),
            _ => None,
        };
        let r = Readings {
            fast_stroke: stroke(0),
            slow_stroke: stroke(3),
            second_slow_stroke: stroke(6),
            system_approach_pa: v[9],
            unloading_observed_pa: v[10],
            speed_change_seen: flags[0],
            approach_speed_alternates: flags[1],
            stall_pa: v[11],
            large_outlet_approach_pa: v[12],
            large_outlet_pressing_pa: v[13],
            unloader_tank_flow_pressing_m3s: v[14],
            large_flow_test: v[15].zip(v[16]).map(|(flow_m3s, pressure_pa)| FlowTest { flow_m3s, pressure_pa }),
            small_flow_test: None,
            oil_temperature_c: v[17],
            shaft_speed_rpm: v[18],
            motor: v[19].map(|i| MotorReading { during: Phase::Pressing, current_a: i, voltage_v: 400.0, power_factor: 0.85, efficiency: v[0] }),
        };
        if let Ok(dg) = diagnose(&c, &r) {
            for f in &dg.findings {
                prop_assert!((0.0..=1.0).contains(&f.score));
                let _ = f.message(UnitSystem::Us);
            }
            prop_assert!(serde_json::to_string(&dg).is_ok());
        }
    }
}

// ---------------------------------------------------------------------------
// Wording, serialisation and the diagram states.
// ---------------------------------------------------------------------------

#[test]
fn no_rule_advises_turning_the_relief_up() {
    for rule in RULES {
        for text in [rule.next_check, rule.caution] {
            let t = text.to_lowercase();
            for bad in [
                "turn the relief up",
                "raise the relief",
                "increase the relief",
            ] {
                if let Some(i) = t.find(bad) {
                    assert!(t[..i].ends_with("never "), "{:?}: {text}", rule.id);
                }
            }
        }
        assert!(rule.caution.len() > 20 && rule.next_check.len() > 20);
    }
    // The rules that touch pumps or the relief carry the warning.
    for id in [
        CauseId::LargePumpWorn,
        CauseId::SmallPumpWorn,
        CauseId::ReliefLow,
    ] {
        let r = RULES.iter().find(|r| r.id == id).unwrap();
        assert!(r.caution.contains("Never turn the relief up"), "{id:?}");
    }
}

#[test]
fn finding_message_carries_units_and_json_round_trips_readings() {
    let d = Design::default();
    let healthy = Circuit::new(&d).unwrap();
    let faulty = Circuit::new(&with(&d, |d| {
        d.faults.small_volumetric_efficiency = Some(0.7)
    }))
    .unwrap();
    let r = synthesize_readings(&faulty);
    let dg = diagnose(&healthy, &r).unwrap();
    let m = dg.findings[0].message(UnitSystem::Metric);
    assert!(
        m.contains("L/min") && m.contains("Next:") && m.contains("Caution:"),
        "{m}"
    );
    let us = dg.findings[0].message(UnitSystem::Us);
    assert!(us.contains("gpm"), "{us}");
    let json = serde_json::to_string(&r).unwrap();
    let back: Readings = serde_json::from_str(&json).unwrap();
    assert_eq!(back, r);
    let v: serde_json::Value = serde_json::to_value(&dg).unwrap();
    assert_eq!(v["findings"][0]["cause"], "small_pump_worn");
    assert!(serde_json::from_str::<Readings>(r#"{"stall_bar": 1}"#).is_err());
}

#[test]
fn component_states_follow_the_staircase() {
    let c = Circuit::new(&Design::default()).unwrap();
    let low = component_states(&c, 5.0 * BAR).unwrap();
    assert_eq!(low.large_pump, LargeDelivery::ToSystem);
    assert!(low.check_open && !low.relief_passing);
    assert_eq!(low.unloader_open_fraction, 0.0);
    let band = component_states(
        &c,
        c.unloading_pa() + 0.5 * (c.unloading_full_pa() - c.unloading_pa()),
    )
    .unwrap();
    assert_eq!(band.large_pump, LargeDelivery::Split);
    assert!((band.unloader_open_fraction - 0.5).abs() < 1e-9);
    let press = component_states(&c, 100.0 * BAR).unwrap();
    assert_eq!(press.large_pump, LargeDelivery::ToTank);
    assert!(!press.check_open && !press.relief_passing);
    assert!(press.large_to_tank_m3s > 0.9 * c.large_theoretical_flow());
    let stall = component_states(&c, c.relief_full_pa()).unwrap();
    assert!(stall.relief_passing && stall.out_flow_m3s.abs() < 1e-12);
    assert!((stall.relief_fraction - 1.0).abs() < 1e-12);
    assert!(component_states(&c, -1.0).is_err());
    assert!(component_states(&c, f64::NAN).is_err());
    // A leaking check shows its back-leak in pressing.
    let leaky = Circuit::new(&with(c.design(), |d| {
        d.faults.check_leak_m3s_per_pa = Some(1e-11)
    }))
    .unwrap();
    let s = component_states(&leaky, 100.0 * BAR).unwrap();
    assert!(s.check_back_leak_m3s > 0.0 && !s.check_open);
}

#[test]
fn synthesised_readings_of_a_healthy_press_match_the_model() {
    let c = Circuit::new(&Design::default()).unwrap();
    let r = synthesize_readings(&c);
    let a = c.motion(Motion::Approach).unwrap();
    let f = r.fast_stroke.unwrap();
    assert!(
        rel(
            stroke_flow(c.cap_area(), f.distance_m, f.time_s),
            a.cylinder_flow_m3s
        ) < 1e-12
    );
    assert!(rel(r.stall_pa.unwrap(), c.relief_full_pa()) < 1e-6);
    assert_eq!(r.speed_change_seen, Some(true));
    let u = r.unloading_observed_pa.unwrap();
    assert!(u >= c.unloading_pa() && u <= c.unloading_full_pa());
    assert!(
        r.unloader_tank_flow_pressing_m3s.unwrap() > 0.9 * c.large_theoretical_flow()
    );
    // Motor: √3·V·I·pf·η back to the model's shaft power in pressing.
    let m = r.motor.unwrap();
    let shaft = three_phase_power(m.voltage_v, m.current_a, m.power_factor)
        * c.design().drive.motor_efficiency;
    let press = c.motion(Motion::Pressing).unwrap();
    assert!(rel(shaft, press.pump.shaft_power_w) < 1e-9);
    let _ = LPM;
}

// ---------------------------------------------------------------------------
// Stuck check valve: the derived model (modelling choice, see
// `Circuit::pump_point`) shows what the trade's symptom table describes
// (common practice, no source): stuck open, the system stalls near the
// unloading setting; stuck shut, the large-pump outlet rises far above the
// system while the unloader is shut.
// ---------------------------------------------------------------------------

#[test]
fn stuck_open_check_stalls_near_the_unloading_setting() {
    for ex in EXAMPLES {
        let d = (ex.build)();
        let c = Circuit::new(&with(&d, |d| d.faults.check_stuck = Some(Stuck::Open)))
            .unwrap();
        let stall = stall_pressure(&c);
        // Within the unloader's band, far below the relief.
        assert!(
            stall >= c.unloading_pa() && stall <= c.unloading_full_pa(),
            "{}: stall {stall} Pa, band {}..{} Pa",
            ex.name,
            c.unloading_pa(),
            c.unloading_full_pa()
        );
        assert!(stall < 0.9 * c.relief_cracking_pa(), "{}", ex.name);
        // Below the unloader the outlet is the system node, and nothing escapes.
        let pp = c.pump_point(0.5 * c.unloading_pa()).unwrap();
        assert_eq!(pp.large_outlet_pa, pp.pressure_pa);
        assert_eq!(pp.large_to_tank_m3s, 0.0);
        // Past the stall point all delivery escapes through the unloader.
        let pp = c.pump_point(c.unloading_full_pa()).unwrap();
        assert_eq!(pp.out_flow_m3s, 0.0, "{}", ex.name);
        assert!(
            pp.check_back_leak_m3s > 0.0,
            "{}: small pump's oil escapes",
            ex.name
        );
    }
}

#[test]
fn stuck_shut_check_dead_heads_the_large_pump() {
    for ex in EXAMPLES {
        let d = (ex.build)();
        for relief in [Some(1.2 * d.unloading_valve.setting_pa), None] {
            let faulty = with(&d, |d| {
                d.faults.check_stuck = Some(Stuck::Closed);
                d.ratings.large_pump_relief_pa = relief;
            });
            let c = Circuit::new(&faulty).unwrap();
            let healthy =
                Circuit::new(&with(&faulty, |d| d.faults.check_stuck = None)).unwrap();
            let p = 0.5 * c.unloading_pa();
            let pp = c.pump_point(p).unwrap();
            assert_eq!(pp.large_to_system_m3s, 0.0);
            // The system gets the small pump's flow alone.
            let sound = healthy.pump_point(p).unwrap();
            assert!(pp.out_flow_m3s < sound.out_flow_m3s - 0.5 * sound.large_flow_m3s);
            match relief {
                Some(r) => assert_eq!(pp.large_outlet_pa, r, "{}", ex.name),
                None => {
                    // Leakage eats the flow at Q_th/K, capped at 3·p_rf.
                    assert!(pp.large_outlet_pa > 1.5 * c.relief_full_pa(), "{}", ex.name);
                    assert!(
                        pp.large_outlet_pa <= 3.0 * c.relief_full_pa() * (1.0 + 1e-12)
                    );
                    let w = evaluate(&faulty).unwrap().warnings;
                    assert!(
                        w.iter().any(|w| matches!(
                            w.kind,
                            warnings::WarningKind::LargePumpDeadHeaded { .. }
                        )),
                        "{}: {w:?}",
                        ex.name
                    );
                }
            }
            assert!(pp.losses.large_relief > 0.0 || pp.large_flow_m3s == 0.0);
            // Once the unloader is open the large pump is unloaded as usual.
            let pp = c.pump_point(c.unloading_full_pa()).unwrap();
            let back = healthy.pump_point(c.unloading_full_pa()).unwrap();
            assert!(
                (pp.large_outlet_pa - back.large_outlet_pa).abs() < 1.0,
                "{}",
                ex.name
            );
        }
    }
}

#[test]
fn check_stuck_rules_stay_quiet_on_healthy_and_other_faults() {
    for ex in EXAMPLES {
        let d = (ex.build)();
        let healthy = Circuit::new(&d).unwrap();
        let r = synthesize_readings(&healthy);
        let dg = diagnose(&healthy, &r).unwrap();
        for id in [CauseId::CheckStuckOpen, CauseId::CheckStuckShut] {
            assert!(dg.finding(id).is_none(), "{} healthy: {id:?}", ex.name);
        }
        for (cause, what, inject) in SCENARIOS {
            if matches!(cause, CauseId::CheckStuckOpen | CauseId::CheckStuckShut) {
                continue;
            }
            let faulty = Circuit::new(&inject(&d, &healthy)).unwrap();
            let dg = diagnose(&healthy, &synthesize_readings(&faulty)).unwrap();
            let top = dg.findings.first().map(|f| f.cause);
            assert!(
                !matches!(top, Some(CauseId::CheckStuckOpen | CauseId::CheckStuckShut)),
                "{} {what}: ranked {top:?}",
                ex.name
            );
        }
    }
}

#[test]
fn stuck_shut_caution_says_stop_and_defers_to_iso_4413() {
    let r = RULES
        .iter()
        .find(|r| r.id == CauseId::CheckStuckShut)
        .unwrap();
    assert!(r.caution.starts_with("Stop the machine at once"));
    assert!(r.caution.contains("Relieve the pressure"));
    assert!(r.caution.contains("ISO 4413"));
}
