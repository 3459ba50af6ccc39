//! Duty cycle against closed forms and the brief's worked examples.
//! Each check names its source beside it.

use kneepoint_engine::cycle::{
    evaluate_cycle, evaluate_cycle_with, Change, CycleError, CycleOptions, CycleReport,
    CycleWarningKind, Hold, PressingForce, RequirementKind, Segment, SegmentKind,
    MAX_SAMPLES,
};
use kneepoint_engine::design::{workshop_press, Design};
use kneepoint_engine::units::{HORSEPOWER, INCH, LITRE, MINUTE, PSI, US_GALLON};
use kneepoint_engine::{heat, motor, Circuit, EXAMPLES};

const BAR: f64 = 1e5;

fn rel(a: f64, b: f64) -> f64 {
    ((a - b) / b).abs()
}

/// `got` within `tol` (relative) of `want`, with the source in the message.
fn check(what: &str, got: f64, want: f64, tol: f64, source: &str) {
    assert!(
        rel(got, want) <= tol,
        "{what}: got {got}, want {want} (±{tol} rel) [{source}]"
    );
}

fn run(d: &Design) -> CycleReport {
    let c = Circuit::new(d).expect("valid design");
    evaluate_cycle(&c).expect("cycle runs")
}

fn seg(r: &CycleReport, kind: SegmentKind) -> &kneepoint_engine::cycle::SegmentResult {
    r.segments
        .iter()
        .find(|s| s.kind == kind)
        .expect("segment present")
}

/// A press with leak-free pumps, no valve or line losses, the unloader set
/// above the test pressures so both pumps deliver throughout: Q is constant
/// and every closed form applies exactly.
fn ideal(q_total: f64, split: f64, bulk: f64) -> Design {
    let mut d = workshop_press();
    let n = d.drive.speed_rpm / 60.0;
    d.large_pump.displacement_m3 = q_total * split / n;
    d.small_pump.displacement_m3 = q_total * (1.0 - split) / n;
    for p in [&mut d.large_pump, &mut d.small_pump] {
        p.volumetric_efficiency = 1.0;
    }
    let dv = &mut d.directional_valve;
    (
        dv.drop_p_a_pa,
        dv.drop_b_t_pa,
        dv.drop_p_b_pa,
        dv.drop_a_t_pa,
    ) = (0.0, 0.0, 0.0, 0.0);
    d.lines.pressure_drop_pa = 0.0;
    d.lines.return_drop_pa = 0.0;
    d.lines.pressure_hose = None;
    d.lines.return_hose = None;
    d.unloading_valve.setting_pa = 250.0 * BAR;
    d.relief_valve.cracking_pa = 300.0 * BAR;
    d.relief_valve.full_flow_pa = 310.0 * BAR;
    d.ratings.component_pa = 400.0 * BAR;
    d.oil.bulk_modulus_pa = bulk;
    d
}

#[test]
fn constant_force_rigid_oil_is_area_times_stroke_over_flow() {
    // t = A·s/Q for a constant force, no leakage, no compressibility
    // (brief §5.2 with V/β → 0) [D]. Tolerance 1e-9.
    let q = 20.0 * LITRE / MINUTE;
    let mut d = ideal(q, 0.8, 1.0e30);
    d.cycle.segments = vec![
        Segment::Approach {
            distance_m: 0.3,
            force_n: 2000.0,
        },
        Segment::Pressing {
            distance_m: 0.05,
            force: PressingForce::Constant { force_n: 80.0e3 },
        },
        Segment::Retract {
            distance_m: 0.35,
            force_n: 1000.0,
        },
    ];
    let r = run(&d);
    let a = std::f64::consts::PI * 0.1_f64.powi(2) / 4.0;
    let a_ann = std::f64::consts::PI * (0.1_f64.powi(2) - 0.056_f64.powi(2)) / 4.0;
    let src = "t = A·s/Q [D]";
    check(
        "approach",
        seg(&r, SegmentKind::Approach).time_s,
        a * 0.3 / q,
        1e-9,
        src,
    );
    check(
        "pressing",
        seg(&r, SegmentKind::Pressing).time_s,
        a * 0.05 / q,
        1e-9,
        src,
    );
    check(
        "retract",
        seg(&r, SegmentKind::Retract).time_s,
        a_ann * 0.35 / q,
        1e-9,
        src,
    );
}

/// Locked load: a pressing segment whose force needs `dp` and that travels a
/// negligible distance after the rise, at a pressurised volume `v`.
fn locked(v: f64, dp: f64, beta: f64, q: f64) -> (f64, f64) {
    let mut d = ideal(q, 0.8, beta);
    let a = std::f64::consts::PI * 0.1_f64.powi(2) / 4.0;
    let approach = 0.1;
    d.cycle.dead_volume_m3 = v - a * approach;
    let travel = 1e-9;
    d.cycle.segments = vec![
        Segment::Approach {
            distance_m: approach,
            force_n: 0.0,
        },
        Segment::Pressing {
            distance_m: travel,
            force: PressingForce::Constant { force_n: dp * a },
        },
    ];
    let r = run(&d);
    let p = seg(&r, SegmentKind::Pressing);
    (p.time_s - a * travel / q, p.stored_change_j)
}

#[test]
fn locked_load_builds_pressure_in_v_dp_over_beta_q() {
    // Brief §10 Example 9 [D]: t = V·Δp/(β·Q), ΔV = V·Δp/β, E = V·p²/(2β).
    // SI: 5 L, 160 bar, 1.0 GPa, 6.5 L/min -> 0.080 L, 0.74 s, 640 J.
    let (v, dp, beta, q) = (5.0 * LITRE, 160.0 * BAR, 1.0e9, 6.5 * LITRE / MINUTE);
    let (t, e) = locked(v, dp, beta, q);
    check(
        "SI time exact",
        t,
        v * dp / (beta * q),
        1e-9,
        "closed form [D]",
    );
    check("SI time", t, 0.74, 0.005, "brief Example 9 (0.74 s)");
    check(
        "SI volume",
        t * q,
        0.080 * LITRE,
        1e-6,
        "brief Example 9 (0.080 L)",
    );
    check("SI energy", e, 640.0, 1e-6, "brief Example 9 (640 J)");
    // US: 300 in³, 2500 psi, 100 000 psi (Merritt's design value, from
    // memory), 3 gpm -> 7.5 in³, 0.649 s, 9375 lbf·in = 1059 J.
    let in3 = INCH.powi(3);
    let (v, dp, beta, q) = (
        300.0 * in3,
        2500.0 * PSI,
        100_000.0 * PSI,
        3.0 * US_GALLON / MINUTE,
    );
    let (t, e) = locked(v, dp, beta, q);
    check(
        "US time exact",
        t,
        v * dp / (beta * q),
        1e-9,
        "closed form [D]",
    );
    check("US time", t, 0.649, 0.001, "brief Example 9 (0.649 s)");
    check(
        "US volume",
        t * q / in3,
        7.5,
        1e-6,
        "brief Example 9 (7.5 in³)",
    );
    check("US energy", e, 1059.0, 0.001, "brief Example 9 (1059 J)");
}

#[test]
fn rms_motor_choice_example_10a() {
    // Brief §10 Example 10a, method S-21: 20 hp 2 s, 8 hp 5 s, 3 hp 10 s.
    let hp = HORSEPOWER;
    let duty = [(20.0 * hp, 2.0), (8.0 * hp, 5.0), (3.0 * hp, 10.0)];
    let rms = motor::rms_power(&duty).expect("valid duty");
    check(
        "P_rms",
        rms / hp,
        8.44,
        0.001,
        "brief Example 10a (8.44 hp)",
    );
    let mean = (20.0 * 2.0 + 8.0 * 5.0 + 3.0 * 10.0) / 17.0;
    check("mean", mean, 6.47, 0.001, "brief Example 10a (6.47 hp)");
    // RMS alone (10 % margin, peak unconstrained) -> 10 hp.
    let by_rms = motor::select(motor::MotorSeries::Nema, rms, 0.0, 0.10, 1.5).unwrap();
    assert_eq!(
        by_rms.label, "10 hp",
        "brief Example 10a: RMS alone suggests 10 hp"
    );
    // With the 20 hp peak and k = 1.5 -> 15 hp, peak 133 %.
    let pick =
        motor::select(motor::MotorSeries::Nema, rms, 20.0 * hp, 0.10, 1.5).unwrap();
    assert_eq!(pick.label, "15 hp", "brief Example 10a: select 15 hp");
    check(
        "peak loading",
        20.0 * hp / pick.rating_w,
        1.333,
        0.001,
        "brief Example 10a (133 %)",
    );
}

#[test]
fn reservoir_examples_10b_10c() {
    // Brief §10 Example 10b, S-17/S-18: 15 gpm -> 45 gal; 2 hp with U = 2
    // BTU/(h·ft²·°F), 80 °F ambient, 140 °F max -> 42.4 ft².
    let gpm = US_GALLON / MINUTE;
    let v = heat::reservoir_volume_rule(15.0 * gpm);
    check(
        "tank volume",
        v / US_GALLON,
        45.0,
        1e-9,
        "brief Example 10b (45 gal)",
    );
    let btu_h_ft2_f = kneepoint_engine::units::unit(
        kneepoint_engine::Quantity::HeatTransfer,
        kneepoint_engine::UnitSystem::Us,
    )
    .scale;
    let ft2 = (12.0 * INCH).powi(2);
    let a = heat::area_for_rise(2.0 * HORSEPOWER, 2.0 * btu_h_ft2_f, 60.0 * 5.0 / 9.0);
    check("area", a / ft2, 42.4, 0.001, "brief Example 10b (42.4 ft²)");
    // Example 10c: 2.19 kW, 30 K -> 6.4 m²; a 370 L tank with about 3 m²
    // wetted [RT, the stated assumption] dissipates about 1.0 kW, so a
    // ≈ 1.2 kW cooler.
    check(
        "area 10c",
        heat::area_for_rise(2190.0, 11.36, 30.0),
        6.4,
        0.01,
        "brief Example 10c (6.4 m²)",
    );
    check(
        "dissipated",
        11.36 * 3.0 * 30.0,
        1000.0,
        0.05,
        "brief Example 10c (≈ 1.0 kW)",
    );
    check(
        "cooler",
        heat::cooler_needed(2190.0, 11.36, 3.0, 30.0),
        1200.0,
        0.05,
        "brief Example 10c (≈ 1.2 kW)",
    );
    check(
        "tank 3×123 L/min",
        heat::reservoir_volume_rule(123.0 * LITRE / MINUTE) / LITRE,
        370.0,
        0.01,
        "brief Example 10c (370 L)",
    );
}

#[test]
fn halving_the_tolerance_changes_cycle_time_by_under_0_1_percent() {
    // Convergence requirement of the duty-cycle issue.
    for e in EXAMPLES {
        let c = Circuit::new(&(e.build)()).unwrap();
        let t = |tol| {
            evaluate_cycle_with(
                &c,
                CycleOptions {
                    tolerance: tol,
                    ..CycleOptions::default()
                },
            )
            .unwrap()
            .totals
            .cycle_time_s
        };
        for tol in [1e-4, 1e-6] {
            let (a, b) = (t(tol), t(tol / 2.0));
            assert!(rel(a, b) < 1e-3, "{}: {a} vs {b} at {tol}", e.name);
        }
        // And the default is close to a much tighter run.
        assert!(rel(t(1e-6), t(1e-10)) < 1e-6, "{}", e.name);
    }
}

#[test]
fn same_input_same_report_bit_for_bit() {
    for e in EXAMPLES {
        let c = Circuit::new(&(e.build)()).unwrap();
        let a = serde_json::to_string(&evaluate_cycle(&c).unwrap()).unwrap();
        let b = serde_json::to_string(&evaluate_cycle(&c).unwrap()).unwrap();
        assert_eq!(a, b, "{}", e.name);
    }
}

#[test]
fn samples_are_bounded_ordered_and_mark_segments() {
    for e in EXAMPLES {
        let r = run(&(e.build)());
        assert!(
            r.samples.len() <= MAX_SAMPLES && r.samples.len() > 10,
            "{}",
            e.name
        );
        assert!(
            r.samples.windows(2).all(|w| w[1].t_s >= w[0].t_s),
            "{}",
            e.name
        );
        for s in r.segments.iter().filter(|s| s.time_s > 0.0) {
            let first = r.samples.iter().find(|x| x.segment == s.index).unwrap();
            let last = r
                .samples
                .iter()
                .rev()
                .find(|x| x.segment == s.index)
                .unwrap();
            assert!(
                rel(first.t_s + 1.0, s.start_s + 1.0) < 1e-12,
                "{} {}",
                e.name,
                s.label
            );
            assert!(
                rel(last.t_s + 1.0, s.start_s + s.time_s + 1.0) < 1e-12,
                "{} {}",
                e.name,
                s.label
            );
        }
        let end = r.samples.last().unwrap().t_s;
        assert!(rel(end, r.totals.cycle_time_s) < 1e-12, "{}", e.name);
    }
}

#[test]
fn stroke_overrun_is_an_error_on_that_distance() {
    let mut d = workshop_press();
    d.cycle.segments = vec![
        Segment::Approach {
            distance_m: 0.3,
            force_n: 0.0,
        },
        Segment::Pressing {
            distance_m: 0.2,
            force: PressingForce::Constant { force_n: 1e4 },
        },
    ];
    let e = Circuit::new(&d).unwrap_err();
    let f = e
        .for_field("cycle.segments[1].distance_m")
        .expect("error on segment 1");
    assert_eq!(f.path(), "cycle.segments[1].distance_m");
    assert!(f.to_string().contains("100 mm"), "{f}");
}

#[test]
fn bad_table_and_negative_time_are_field_errors() {
    let mut d = workshop_press();
    d.cycle.segments = vec![
        Segment::Pressing {
            distance_m: 0.05,
            force: PressingForce::Table {
                points: vec![
                    kneepoint_engine::cycle::ForcePoint {
                        position_m: 0.02,
                        force_n: 1e3,
                    },
                    kneepoint_engine::cycle::ForcePoint {
                        position_m: 0.01,
                        force_n: 2e3,
                    },
                ],
            },
        },
        Segment::Dwell {
            time_s: -1.0,
            hold: Hold::AtRelief,
        },
    ];
    let e = Circuit::new(&d).unwrap_err();
    assert!(
        e.for_field("cycle.segments[0].force.points").is_some(),
        "{e}"
    );
    assert!(e.for_field("cycle.segments[1].time_s").is_some(), "{e}");
}

#[test]
fn stall_reports_the_position() {
    // Linear force rising past the largest force: stall mid-segment.
    let mut d = workshop_press();
    let f_max = d.relief_valve.full_flow_pa * std::f64::consts::PI * 0.01 / 4.0;
    d.cycle.segments = vec![
        Segment::Approach {
            distance_m: 0.3,
            force_n: 1000.0,
        },
        Segment::Pressing {
            distance_m: 0.1,
            force: PressingForce::Linear {
                from_n: 0.0,
                to_n: 2.0 * f_max,
            },
        },
    ];
    let c = Circuit::new(&d).unwrap();
    match evaluate_cycle(&c) {
        Err(CycleError::ForceNotReachable { segment, x_m, .. }) => {
            assert_eq!(segment, 1);
            // Half-way along the pressing travel, to within the stall margin.
            assert!((x_m - 0.35).abs() < 1e-3, "{x_m}");
            let msg = CycleError::ForceNotReachable {
                segment,
                x_m,
                force_n: 0.0,
                max_force_n: 0.0,
            }
            .to_string();
            assert!(msg.contains("Force not reachable at x = 350 mm"), "{msg}");
        }
        other => panic!("expected a stall, got {other:?}"),
    }
}

#[test]
fn missed_pressing_speed_gets_the_small_pump_that_meets_it() {
    let mut d = workshop_press();
    d.cycle.requirements.pressing_speed_ms = Some(0.020);
    let r = run(&d);
    let q = r
        .requirements
        .iter()
        .find(|q| q.kind == RequirementKind::PressingSpeed)
        .unwrap();
    assert!(!q.met && q.margin.unwrap() < 0.0);
    let Some(Change::SmallPumpDisplacement { from_m3, to_m3 }) = q.fix else {
        panic!("expected a small-pump fix, got {:?}", q.fix);
    };
    assert!(to_m3 > from_m3);
    let speed = |vg: f64| {
        let mut d2 = d.clone();
        d2.small_pump.displacement_m3 = vg;
        let r = run(&d2);
        seg(&r, SegmentKind::Pressing).mean_speed_ms
    };
    assert!(speed(to_m3) >= 0.020, "the fix meets it");
    assert!(speed(to_m3 * 0.995) < 0.020, "and is about the smallest");
}

#[test]
fn missed_approach_speed_gets_a_large_pump() {
    let mut d = workshop_press();
    d.cycle.requirements.approach_speed_ms = Some(0.080);
    let r = run(&d);
    let q = &r.requirements[0];
    assert_eq!(q.kind, RequirementKind::ApproachSpeed);
    assert!(!q.met);
    assert!(
        matches!(q.fix, Some(Change::LargePumpDisplacement { .. })),
        "{:?}",
        q.fix
    );
}

#[test]
fn relief_cracking_while_pressing_is_warned() {
    let mut d = workshop_press();
    let a = std::f64::consts::PI * 0.01 / 4.0;
    d.cycle.segments = vec![
        Segment::Approach {
            distance_m: 0.3,
            force_n: 1000.0,
        },
        Segment::Pressing {
            distance_m: 0.05,
            force: PressingForce::Constant {
                force_n: 164.0 * BAR * a,
            },
        },
    ];
    let r = run(&d);
    assert!(
        r.warnings.iter().any(|w| matches!(
            w.kind,
            CycleWarningKind::ReliefCracksDuringPressing { .. }
        )),
        "{:?}",
        r.warnings
    );
    assert!(seg(&r, SegmentKind::Pressing).heat.relief_j > 0.0);
}

#[test]
fn load_sitting_in_the_unloader_band_warns_of_hunting() {
    // Brief §3.4: regime II for more than a short transient.
    let mut d = ideal(20.0 * LITRE / MINUTE, 0.8, 1.0e9);
    d.unloading_valve.setting_pa = 30.0 * BAR;
    d.relief_valve.cracking_pa = 160.0 * BAR;
    d.relief_valve.full_flow_pa = 168.0 * BAR;
    let a = std::f64::consts::PI * 0.01 / 4.0;
    let p_band = 30.0 * BAR * (1.0 + d.unloading_valve.band_fraction / 2.0);
    d.cycle.segments = vec![Segment::Approach {
        distance_m: 0.3,
        force_n: p_band * a,
    }];
    let r = run(&d);
    assert!(seg(&r, SegmentKind::Approach).unloading_time_s > 1.0);
    assert!(r
        .warnings
        .iter()
        .any(|w| matches!(w.kind, CycleWarningKind::HuntingRisk { .. })));
}

#[test]
fn sudden_release_of_a_large_volume_is_warned() {
    // Brief §5.4: warn above 1 kJ or 0.1 L; here no decompression segment.
    let mut d = workshop_press();
    d.cycle.dead_volume_m3 = 5.0 * LITRE;
    d.cycle.segments = vec![
        Segment::Approach {
            distance_m: 0.35,
            force_n: 1000.0,
        },
        Segment::Pressing {
            distance_m: 0.02,
            force: PressingForce::Constant { force_n: 100e3 },
        },
        Segment::Retract {
            distance_m: 0.37,
            force_n: 1000.0,
        },
    ];
    let r = run(&d);
    assert!(r
        .warnings
        .iter()
        .any(|w| matches!(w.kind, CycleWarningKind::Decompression { sudden: true, .. })));
}

#[test]
fn derived_profile_when_none_is_given() {
    let mut d = workshop_press();
    d.cycle.segments.clear();
    let r = run(&d);
    assert!(r.profile_derived);
    assert_eq!(r.segments.len(), 6);
    assert!((r.segments[4].x_end_m).abs() < 1e-12);
}

#[test]
fn demo_cycles_meet_their_requirements_and_close_energy() {
    for e in EXAMPLES {
        let r = run(&(e.build)());
        assert!(!r.profile_derived, "{} carries its own cycle", e.name);
        assert!(
            r.requirements.iter().all(|q| q.met),
            "{}: {:?}",
            e.name,
            r.requirements
        );
        let t = &r.totals;
        let bal = t.energy_in_j - t.work_out_j - t.heat.total() - t.stored_end_j;
        assert!(bal.abs() <= 1e-9 * t.energy_in_j, "{}: {bal}", e.name);
        assert!(r.motor.recommended.is_some(), "{}", e.name);
        assert!(
            t.peak_power_w
                <= r.motor.peak_allowance
                    * r.motor.recommended.as_ref().unwrap().rating_w
        );
    }
}

#[test]
fn report_serialises_for_the_app() {
    let r = run(&workshop_press());
    let j = serde_json::to_value(&r).unwrap();
    assert!(j["samples"].as_array().unwrap().len() > 10);
    assert_eq!(j["segments"][1]["kind"], "pressing");
    assert!(j["totals"]["cycle_time_s"].as_f64().unwrap() > 0.0);
}
