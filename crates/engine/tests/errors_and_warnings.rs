//! Every validation error kind, every solve error and every warning kind,
//! each reached by a design built for it. Checks go by `field` and `kind`,
//! not by message text, except a few checks that messages carry units.

use kneepoint_engine::cycle::{Segment, MAX_SEGMENTS};
use kneepoint_engine::figures::settings_check;
use kneepoint_engine::io::parse_design;
use kneepoint_engine::units::{Quantity, UnitSystem, BAR};
use kneepoint_engine::warnings::{Line, Warning, WarningKind};
use kneepoint_engine::{
    evaluate, Circuit, Design, Direction, ErrorKind, FieldError, Motion, SolveError,
    ValidationErrors,
};

fn errors(d: &Design) -> ValidationErrors {
    Circuit::new(d).expect_err("design must be invalid")
}

/// The error for `field`, which must be there.
fn error_for<'a>(e: &'a ValidationErrors, field: &str) -> &'a FieldError {
    e.for_field(field)
        .unwrap_or_else(|| panic!("no error for {field}; got {e:?}"))
}

#[test]
fn not_finite() {
    for v in [f64::NAN, f64::INFINITY, f64::NEG_INFINITY] {
        let mut d = Design::default();
        d.drive.speed_rpm = v;
        d.oil.viscosity_m2s = v;
        let e = errors(&d);
        assert_eq!(error_for(&e, "drive.speed_rpm").kind, ErrorKind::NotFinite);
        assert_eq!(
            error_for(&e, "oil.viscosity_m2s").kind,
            ErrorKind::NotFinite
        );
    }
}

#[test]
fn not_positive() {
    let mut d = Design::default();
    d.large_pump.displacement_m3 = 0.0;
    d.cylinder.stroke_m = -0.1;
    let e = errors(&d);
    assert_eq!(
        error_for(&e, "large_pump.displacement_m3").kind,
        ErrorKind::NotPositive {
            quantity: Quantity::Displacement
        }
    );
    assert_eq!(
        error_for(&e, "cylinder.stroke_m").kind,
        ErrorKind::NotPositive {
            quantity: Quantity::Length
        }
    );
}

#[test]
fn negative() {
    let mut d = Design::default();
    d.check_valve.cracking_pa = -1.0;
    d.loads.pressing_force_n = -5.0;
    let e = errors(&d);
    assert_eq!(
        error_for(&e, "check_valve.cracking_pa").kind,
        ErrorKind::Negative {
            quantity: Quantity::Pressure
        }
    );
    assert_eq!(
        error_for(&e, "loads.pressing_force_n").kind,
        ErrorKind::Negative {
            quantity: Quantity::Force
        }
    );
    // Zero is allowed where the quantity may be zero.
    let mut ok = Design::default();
    ok.check_valve.cracking_pa = 0.0;
    ok.loads.pressing_force_n = 0.0;
    assert!(Circuit::new(&ok).is_ok());
}

#[test]
fn out_of_range() {
    let mut d = Design::default();
    d.unloading_valve.band_fraction = 0.9;
    d.drive.speed_rpm = 0.5;
    let e = errors(&d);
    match &error_for(&e, "unloading_valve.band_fraction").kind {
        ErrorKind::OutOfRange { quantity, min, max } => {
            assert_eq!(*quantity, Quantity::Percent);
            assert!(*min < 0.05 && 0.05 < *max && *max < 0.9, "{min} .. {max}");
        }
        k => panic!("band: {k:?}"),
    }
    assert!(matches!(
        error_for(&e, "drive.speed_rpm").kind,
        ErrorKind::OutOfRange {
            quantity: Quantity::ShaftSpeed,
            ..
        }
    ));
    // The message gives the range in the user's units.
    let m = error_for(&e, "unloading_valve.band_fraction").message(UnitSystem::Us);
    assert!(m.contains('%'), "{m}");
}

#[test]
fn efficiency_out_of_range() {
    for v in [0.0, -0.2, 1.2] {
        let mut d = Design::default();
        d.small_pump.volumetric_efficiency = v;
        d.drive.motor_efficiency = v;
        let e = errors(&d);
        for f in ["small_pump.volumetric_efficiency", "drive.motor_efficiency"] {
            assert_eq!(
                error_for(&e, f).kind,
                ErrorKind::EfficiencyOutOfRange,
                "{f} = {v}"
            );
        }
    }
    let mut one = Design::default();
    one.small_pump.volumetric_efficiency = 1.0;
    assert!(Circuit::new(&one).is_ok(), "100 % is allowed (ideal pump)");
}

#[test]
fn rod_not_smaller_than_bore() {
    let mut d = Design::default();
    d.cylinder.rod_m = d.cylinder.bore_m;
    let e = errors(&d);
    let err = error_for(&e, "cylinder.rod_m");
    assert_eq!(
        err.kind,
        ErrorKind::RodNotSmallerThanBore {
            bore_m: d.cylinder.bore_m
        }
    );
    // Numbers in messages carry units.
    assert!(
        err.message(UnitSystem::Metric).contains("100 mm"),
        "{}",
        err.message(UnitSystem::Metric)
    );
    assert!(
        err.message(UnitSystem::Us).contains("3.94 in"),
        "{}",
        err.message(UnitSystem::Us)
    );
}

#[test]
fn relief_full_flow_below_cracking() {
    let mut d = Design::default();
    d.relief_valve.cracking_pa = 170.0 * BAR;
    d.relief_valve.full_flow_pa = 165.0 * BAR;
    let e = errors(&d);
    assert_eq!(
        error_for(&e, "relief_valve.full_flow_pa").kind,
        ErrorKind::FullFlowBelowCracking {
            cracking_pa: 170.0 * BAR
        }
    );
}

#[test]
fn relief_not_above_unloading() {
    let mut d = Design::default();
    d.unloading_valve.setting_pa = 200.0 * BAR;
    d.relief_valve.cracking_pa = 150.0 * BAR;
    d.relief_valve.full_flow_pa = 160.0 * BAR;
    let e = errors(&d);
    assert_eq!(e.0.len(), 1, "{e:?}");
    let err = error_for(&e, "relief_valve.full_flow_pa");
    assert_eq!(
        err.kind,
        ErrorKind::ReliefNotAboveUnloading {
            unloading_pa: 200.0 * BAR
        }
    );
    let us = err.message(UnitSystem::Us);
    assert!(us.contains("2901 psi"), "{us}");
    assert!(err.message(UnitSystem::Metric).contains("200.0 bar"));
}

#[test]
fn unsupported_format() {
    let d = Design {
        format: 2,
        ..Design::default()
    };
    let e = errors(&d);
    assert_eq!(
        error_for(&e, "format").kind,
        ErrorKind::UnsupportedFormat {
            found: 2,
            supported: kneepoint_engine::DESIGN_FORMAT
        }
    );
}

#[test]
fn inconsistent() {
    let mut d = Design::default();
    d.cycle.segments = vec![Segment::Idle { time_s: 1.0 }; MAX_SEGMENTS + 1];
    let e = errors(&d);
    assert!(matches!(
        error_for(&e, "cycle.segments").kind,
        ErrorKind::Inconsistent { .. }
    ));
}

#[test]
fn every_error_is_reported_at_once() {
    let mut d = Design::default();
    d.large_pump.displacement_m3 = -1.0;
    d.small_pump.hydromechanical_efficiency = 2.0;
    d.cylinder.rod_m = 0.2;
    d.oil.density_kg_m3 = f64::NAN;
    let e = errors(&d);
    let mut fields: Vec<&str> = e.0.iter().map(|x| x.field).collect();
    fields.sort_unstable();
    assert_eq!(
        fields,
        [
            "cylinder.rod_m",
            "large_pump.displacement_m3",
            "oil.density_kg_m3",
            "small_pump.hydromechanical_efficiency"
        ]
    );
}

#[test]
fn malformed_files_give_line_and_column() {
    let good = kneepoint_engine::io::design_to_json(&Design::default());
    assert_eq!(parse_design(&good).expect("round trip"), Design::default());
    // A broken line: the error points at it.
    let broken = good.replacen("\"speed_rpm\": 1450.0", "\"speed_rpm\": 14 50", 1);
    let e = parse_design(&broken).expect_err("malformed");
    let line = good
        .lines()
        .position(|l| l.contains("\"speed_rpm\""))
        .expect("field present")
        + 1;
    assert_eq!(e.line, line, "{e}");
    assert!(e.column > 0);
    // Unknown fields are refused, named.
    let unknown = good.replacen("\"speed_rpm\"", "\"speed_rmp\"", 1);
    let e = parse_design(&unknown).expect_err("unknown field");
    assert!(e.message.contains("speed_rmp"), "{e}");
    // A wrong type.
    let wrong = good.replacen("1450.0", "\"fast\"", 1);
    assert!(parse_design(&wrong).is_err());
    // Not JSON at all.
    let e = parse_design("speed: 1450").expect_err("not JSON");
    assert_eq!((e.line, e.column), (1, 1), "{e}");
}

#[test]
fn solve_errors() {
    let c = Circuit::new(&Design::default()).expect("valid");
    let p_rf = c.relief_full_pa();
    for p in [-1.0, p_rf * 1.001, f64::NAN] {
        assert!(
            matches!(c.pump_point(p), Err(SolveError::PressureOutOfRange { .. })),
            "{p}"
        );
    }
    match c.motion_point(Direction::Extend, 10.0e6) {
        Err(SolveError::ForceNotReachable {
            force_n,
            max_force_n,
        }) => {
            assert_eq!(force_n, 10.0e6);
            assert!((max_force_n - p_rf * c.cap_area()).abs() <= 1e-9 * max_force_n);
        }
        r => panic!("{r:?}"),
    }
    let m = c
        .motion_point(Direction::Extend, 10.0e6)
        .expect_err("unreachable")
        .message(UnitSystem::Us);
    assert!(m.contains("lbf"), "{m}");
}

// ---------------------------------------------------------------- warnings

fn warnings(d: &Design) -> Vec<Warning> {
    evaluate(d).expect("design must be valid").warnings
}

/// The warning matching `pred`, which must be there.
fn find(d: &Design, pred: impl Fn(&WarningKind) -> bool) -> Warning {
    let w = warnings(d);
    *w.iter()
        .find(|w| pred(&w.kind))
        .unwrap_or_else(|| panic!("warning missing; got {w:?}"))
}

fn absent(d: &Design, pred: impl Fn(&WarningKind) -> bool) {
    let w = warnings(d);
    assert!(
        !w.iter().any(|w| pred(&w.kind)),
        "unexpected warning in {w:?}"
    );
}

#[test]
fn well_set_demo_warns_only_of_the_unprotected_large_pump() {
    let w = warnings(&Design::default());
    assert_eq!(w.len(), 1, "{w:?}");
    assert_eq!(w[0].kind, WarningKind::LargePumpUnprotected);
    assert_eq!(w[0].field, "ratings.large_pump_relief_pa");
}

#[test]
fn fast_motion_above_unloading() {
    let mut d = Design::default();
    d.unloading_valve.setting_pa = 5.0 * BAR;
    d.loads.approach_force_n = 20.0e3;
    let w = find(&d, |k| {
        matches!(
            k,
            WarningKind::FastMotionAboveUnloading {
                motion: Motion::Approach,
                ..
            }
        )
    });
    assert_eq!(w.field, "unloading_valve.setting_pa");
    let m = w.message(UnitSystem::Metric);
    assert!(m.contains("bar") && m.contains("Raise"), "{m}");
}

#[test]
fn hunting_risk() {
    let mut d = Design::default();
    let fast = settings_check(&Circuit::new(&d).expect("valid"))
        .retract_fast_pa
        .expect("reachable");
    // Unloading 5 % above the retract pressure: within the 10 % band.
    d.unloading_valve.setting_pa = fast / 0.95;
    let w = find(&d, |k| {
        matches!(
            k,
            WarningKind::HuntingRisk {
                motion: Motion::Retract,
                ..
            }
        )
    });
    assert_eq!(w.field, "unloading_valve.setting_pa");
    // ... and 20 % above it: no hunting warning.
    d.unloading_valve.setting_pa = fast / 0.8;
    absent(&d, |k| matches!(k, WarningKind::HuntingRisk { .. }));
}

#[test]
fn unloading_below_minimum() {
    let mut d = Design::default();
    let s = settings_check(&Circuit::new(&d).expect("valid"));
    d.unloading_valve.setting_pa = 0.99 * s.min_unloading_pa;
    let w = find(&d, |k| {
        matches!(k, WarningKind::UnloadingBelowMinimum { .. })
    });
    assert_eq!(w.field, "unloading_valve.setting_pa");
    d.unloading_valve.setting_pa = 1.01 * s.min_unloading_pa;
    absent(&d, |k| {
        matches!(k, WarningKind::UnloadingBelowMinimum { .. })
    });
}

#[test]
fn unloader_at_or_above_relief() {
    let mut d = Design::default();
    d.unloading_valve.setting_pa = 165.0 * BAR; // relief 160 / 168 bar
    let w = find(&d, |k| {
        matches!(k, WarningKind::UnloaderAtOrAboveRelief { .. })
    });
    assert_eq!(w.field, "unloading_valve.setting_pa");
}

#[test]
fn unloader_not_open_before_relief() {
    let mut d = Design::default();
    // Fully open at 152.25 bar, less than 20 bar below cracking (160 bar).
    d.unloading_valve.setting_pa = 145.0 * BAR;
    let w = find(&d, |k| {
        matches!(k, WarningKind::UnloaderNotOpenBeforeRelief { .. })
    });
    assert_eq!(w.field, "relief_valve.cracking_pa");
    absent(&d, |k| {
        matches!(k, WarningKind::UnloaderAtOrAboveRelief { .. })
    });
}

#[test]
fn relief_cracks_during_pressing() {
    let mut d = Design::default();
    // 128 kN on 78.5 cm² is about 163 bar: between cracking and full flow.
    d.loads.pressing_force_n = 128.0e3;
    let w = find(&d, |k| {
        matches!(k, WarningKind::ReliefCracksDuringPressing { .. })
    });
    assert_eq!(w.field, "relief_valve.cracking_pa");
}

#[test]
fn relief_margin_small() {
    let mut d = Design::default();
    // About 153 bar: below cracking, but less than 10 % under it.
    d.loads.pressing_force_n = 120.0e3;
    let w = find(&d, |k| matches!(k, WarningKind::ReliefMarginSmall { .. }));
    assert_eq!(w.field, "relief_valve.cracking_pa");
    absent(&d, |k| {
        matches!(k, WarningKind::ReliefCracksDuringPressing { .. })
    });
}

#[test]
fn pressing_force_not_reachable() {
    let mut d = Design::default();
    d.loads.pressing_force_n = 500.0e3;
    let w = find(&d, |k| {
        matches!(k, WarningKind::PressingForceNotReachable { .. })
    });
    assert_eq!(w.field, "loads.pressing_force_n");
    assert!(w.message(UnitSystem::Us).contains("lbf"));
}

#[test]
fn relief_above_rating() {
    let mut d = Design::default();
    d.ratings.component_pa = 150.0 * BAR;
    let w = find(&d, |k| matches!(k, WarningKind::ReliefAboveRating { .. }));
    assert_eq!(w.field, "relief_valve.full_flow_pa");
}

#[test]
fn intensification() {
    let mut d = Design::default();
    // φ = 1.457, φ·168 bar = 244.8 bar: above a 200 bar rating.
    d.ratings.component_pa = 200.0 * BAR;
    let w = find(&d, |k| matches!(k, WarningKind::Intensification { .. }));
    assert_eq!(w.field, "ratings.component_pa");
    absent(&d, |k| matches!(k, WarningKind::ReliefAboveRating { .. }));
}

#[test]
fn large_pump_unprotected() {
    let mut d = Design::default();
    let w = find(&d, |k| *k == WarningKind::LargePumpUnprotected);
    assert_eq!(w.field, "ratings.large_pump_relief_pa");
    d.ratings.large_pump_relief_pa = Some(60.0 * BAR);
    absent(&d, |k| *k == WarningKind::LargePumpUnprotected);
}

#[test]
fn pump_ratio() {
    for (large, small) in [(100e-6, 2e-6), (4e-6, 4e-6)] {
        let mut d = Design::default();
        d.large_pump.displacement_m3 = large;
        d.small_pump.displacement_m3 = small;
        let w = find(&d, |k| matches!(k, WarningKind::PumpRatio { .. }));
        assert_eq!(w.field, "small_pump.displacement_m3");
    }
}

#[test]
fn line_velocity() {
    let mut d = Design::default();
    let hoses = d.lines.pressure_hose.as_mut().expect("demo has hoses");
    hoses.bore_m = 0.008;
    d.lines.return_hose.as_mut().expect("demo has hoses").bore_m = 0.012;
    let p = find(&d, |k| {
        matches!(
            k,
            WarningKind::LineVelocity {
                line: Line::Pressure,
                ..
            }
        )
    });
    assert_eq!(p.field, "lines.pressure_hose.bore_m");
    let r = find(&d, |k| {
        matches!(
            k,
            WarningKind::LineVelocity {
                line: Line::Return,
                ..
            }
        )
    });
    assert_eq!(r.field, "lines.return_hose.bore_m");
    assert!(r.message(UnitSystem::Us).contains("in/s"));
}

#[test]
fn transition_flow() {
    let mut d = Design::default();
    let c = Circuit::new(&d).expect("valid");
    let q = c
        .motion(Motion::Approach)
        .expect("reachable")
        .cylinder_flow_m3s;
    let bore = d
        .lines
        .pressure_hose
        .as_ref()
        .expect("demo has hoses")
        .bore_m;
    // Viscosity for Re = 4Q/(π·d·ν) = 3000 in the pressure hose.
    d.oil.viscosity_m2s = 4.0 * q / (std::f64::consts::PI * bore * 3000.0);
    let w = find(&d, |k| {
        matches!(
            k,
            WarningKind::TransitionFlow {
                line: Line::Pressure,
                ..
            }
        )
    });
    assert_eq!(w.field, "lines.pressure_hose.bore_m");
    match w.kind {
        WarningKind::TransitionFlow { reynolds, .. } => {
            assert!((reynolds - 3000.0).abs() < 30.0, "{reynolds}");
        }
        _ => unreachable!(),
    }
}

#[test]
fn motor_below_peak() {
    let mut d = Design::default();
    d.drive.motor_rating_w = Some(1000.0);
    let w = find(&d, |k| matches!(k, WarningKind::MotorBelowPeak { .. }));
    assert_eq!(w.field, "drive.motor_rating_w");
    d.drive.motor_rating_w = Some(50.0e3);
    absent(&d, |k| matches!(k, WarningKind::MotorBelowPeak { .. }));
}

#[test]
fn every_warning_says_what_to_do_in_both_unit_systems() {
    // A design that trips many warnings at once.
    let mut d = Design::default();
    d.unloading_valve.setting_pa = 145.0 * BAR;
    d.loads.pressing_force_n = 500.0e3;
    d.ratings.component_pa = 150.0 * BAR;
    d.drive.motor_rating_w = Some(500.0);
    d.large_pump.displacement_m3 = 100e-6;
    d.small_pump.displacement_m3 = 2e-6;
    let w = warnings(&d);
    assert!(w.len() >= 6, "{w:?}");
    for x in &w {
        for u in [UnitSystem::Metric, UnitSystem::Us] {
            let m = x.message(u);
            assert!(m.ends_with('.'), "{m}");
            assert!(m.len() > 40, "{m}");
        }
    }
}

#[test]
fn band_model_invalid() {
    // Outside the band model: a check valve rated at a tenth of the large
    // pump's flow, on a large pump that leaks hard (common practice, no
    // source: real check valves are sized for the full flow).
    let mut d = Design::default();
    d.check_valve.rated_flow_m3s = 2.3 / 60_000.0;
    d.large_pump.volumetric_efficiency = 0.75;
    d.large_pump.rated_pressure_pa = 10.0 * BAR;
    let w = find(&d, |k| matches!(k, WarningKind::BandModelInvalid { .. }));
    assert_eq!(w.field, "large_pump.volumetric_efficiency");
    for e in kneepoint_engine::EXAMPLES {
        absent(&(e.build)(), |k| {
            matches!(k, WarningKind::BandModelInvalid { .. })
        });
    }
}
