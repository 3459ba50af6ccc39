//! Invariants of the steady-state engine over random valid designs drawn
//! within the sliders' ranges (`fields::FIELDS`), and robustness against
//! arbitrary numbers in every numeric field.

use kneepoint_engine::design::Hose;
use kneepoint_engine::faults::Stuck;
use kneepoint_engine::fields::{self, FIELDS};
use kneepoint_engine::units::{from_display, to_display, UnitSystem, BAR};
use kneepoint_engine::{evaluate, Circuit, Design, Motion};
use proptest::prelude::*;
use proptest::test_runner::Config;

/// Unit-interval draws a design takes beyond one per slider field.
const EXTRA_DRAWS: usize = 20;

fn lerp(lo: f64, hi: f64, u: f64) -> f64 {
    lo + (hi - lo) * u
}

/// A valid design from `FIELDS.len() + EXTRA_DRAWS` numbers in [0, 1): every slider field within
/// its range, the rod 0.3–0.8 of the bore, the relief cracking above the
/// unloader fully open and its full flow 1–25 % above cracking, plus the
/// non-slider inputs (check-valve and lumped-line points, oil, hoses, drag
/// torque, motor rating) within common-practice ranges.
fn design_from(u: &[f64]) -> Design {
    let mut d = Design::default();
    for (i, s) in FIELDS.iter().enumerate() {
        assert!(fields::set(&mut d, s.path, lerp(s.min, s.max, u[i])));
    }
    let n = FIELDS.len();
    let uv = &mut d.unloading_valve;
    let open = uv.setting_pa * (1.0 + uv.band_fraction);
    let rc = lerp(1.01 * open, (3.0 * open).max(350.0 * BAR), u[n]);
    d.relief_valve.cracking_pa = rc;
    d.relief_valve.full_flow_pa = rc * lerp(1.01, 1.25, u[n + 1]);
    d.cylinder.rod_m = d.cylinder.bore_m * lerp(0.3, 0.8, u[n + 2]);
    // The large pump's efficiency point at or above the unloader fully
    // open, as catalogue points are: extrapolated far below it (e.g. 75 %
    // at 10 bar, run at 46 bar), the linear slip model has the pump leak
    // more than half its flow before it unloads, and the blended band then
    // lets delivery rise with pressure (a known limit of the band model).
    d.large_pump.rated_pressure_pa = lerp(open.max(10.0 * BAR), 350.0 * BAR, u[n + 19]);
    d.check_valve.rated_drop_pa = lerp(0.0, 3.0 * BAR, u[n + 3]);
    // Check valve and unloader sized for the large pump's flow (a check
    // rated at a tenth of the flow would drop hundreds of bar).
    let q_large = d.large_pump.displacement_m3 * d.drive.speed_rpm / 60.0;
    d.check_valve.rated_flow_m3s = q_large * lerp(0.5, 2.0, u[n + 4]);
    d.unloading_valve.back_pressure_flow_m3s = q_large * lerp(0.5, 2.0, u[n + 5]);
    d.lines.pressure_drop_pa = lerp(0.0, 5.0 * BAR, u[n + 6]);
    d.lines.return_drop_pa = lerp(0.0, 5.0 * BAR, u[n + 7]);
    d.lines.rated_flow_m3s = lerp(10.0, 400.0, u[n + 8]) / 60_000.0;
    d.oil.viscosity_m2s = lerp(10.0, 100.0, u[n + 9]) * 1e-6;
    d.oil.density_kg_m3 = lerp(850.0, 900.0, u[n + 10]);
    let hose = |a: f64, b: f64| {
        (a < 0.7).then(|| Hose {
            bore_m: lerp(0.006, 0.05, a / 0.7),
            length_m: lerp(0.0, 10.0, b),
        })
    };
    d.lines.pressure_hose = hose(u[n + 11], u[n + 12]);
    d.lines.return_hose = hose(u[n + 13], u[n + 14]);
    d.large_pump.no_load_torque_nm = lerp(0.0, 3.0, u[n + 15]);
    d.small_pump.no_load_torque_nm = lerp(0.0, 1.0, u[n + 16]);
    d.drive.motor_rating_w = (u[n + 17] < 0.5).then(|| lerp(0.5e3, 100e3, u[n + 18]));
    // Steady state only: the duty cycle follows from the loads (its own
    // tests cover explicit load profiles, whose travels must fit the stroke).
    d.cycle.segments.clear();
    d
}

fn valid_design() -> impl Strategy<Value = Design> {
    prop::collection::vec(0.0..1.0_f64, FIELDS.len() + EXTRA_DRAWS)
        .prop_map(|u| design_from(&u))
}

/// A valid design with the check valve stuck open or shut, with or
/// without a relief on the large-pump side.
fn stuck_check_design() -> impl Strategy<Value = Design> {
    (
        valid_design(),
        any::<bool>(),
        prop::option::of(0.1..2.0_f64),
    )
        .prop_map(|(mut d, open, relief)| {
            d.faults.check_stuck = Some(if open { Stuck::Open } else { Stuck::Closed });
            d.ratings.large_pump_relief_pa =
                relief.map(|x| x * d.relief_valve.full_flow_pa);
            d
        })
}

/// Walks a JSON value; every number must be finite. serde_json writes a
/// non-finite f64 as `null`, so `null` is allowed only for the settings
/// check's optional pressures (None when a motion is not reachable).
fn non_finite_paths(v: &serde_json::Value, path: &str, out: &mut Vec<String>) {
    use serde_json::Value::*;
    const OPTIONAL: [&str; 3] = ["approach_fast_pa", "retract_fast_pa", "pressing_pa"];
    match v {
        Null if !OPTIONAL.iter().any(|k| path.ends_with(k)) => out.push(path.into()),
        Number(n) if !n.as_f64().is_some_and(f64::is_finite) => out.push(path.into()),
        Array(a) => {
            for (i, x) in a.iter().enumerate() {
                non_finite_paths(x, &format!("{path}[{i}]"), out);
            }
        }
        Object(m) => {
            for (k, x) in m {
                non_finite_paths(x, &format!("{path}.{k}"), out);
            }
        }
        _ => {}
    }
}

fn rel_close(a: f64, b: f64, rel: f64) -> bool {
    (a - b).abs() <= rel * a.abs().max(b.abs()).max(f64::MIN_POSITIVE)
}

proptest! {
    #![proptest_config(Config { cases: 200, ..Config::default() })]

    #[test]
    fn valid_designs_evaluate_to_finite_outputs(d in valid_design()) {
        let report = evaluate(&d).map_err(|e| TestCaseError::fail(e.to_string()))?;
        let json = serde_json::to_value(&report).expect("serialisable");
        let mut bad = Vec::new();
        non_finite_paths(&json, "report", &mut bad);
        prop_assert!(bad.is_empty(), "non-finite outputs: {bad:?}");
        prop_assert!(!report.curves.points.is_empty());
    }

    #[test]
    fn delivery_never_rises_with_pressure(d in valid_design()) {
        let c = Circuit::new(&d).expect("valid");
        let p_max = c.relief_full_pa();
        let mut last = f64::INFINITY;
        for i in 0..=256 {
            let p = p_max * f64::from(i) / 256.0;
            let q = c.pump_point(p).expect("in range").out_flow_m3s;
            prop_assert!(q <= last * (1.0 + 1e-12), "Q rises at {p} Pa: {last} -> {q}");
            prop_assert!(q >= 0.0);
            last = q;
        }
        prop_assert_eq!(last, 0.0, "relief full flow passes all delivery");
    }

    #[test]
    fn power_balance_closes(d in valid_design(), us in prop::collection::vec(0.0..=1.0_f64, 16)) {
        let c = Circuit::new(&d).expect("valid");
        for u in us {
            let pp = c.pump_point(u * c.relief_full_pa()).expect("in range");
            let l = pp.losses;
            for (name, v) in [
                ("mechanical", l.mechanical),
                ("leakage", l.leakage),
                ("check valve", l.check_valve),
                ("unloader", l.unloader),
                ("large-side relief", l.large_relief),
                ("relief", l.relief),
            ] {
                prop_assert!(v >= -1e-9 * pp.shaft_power_w, "{name} loss {v} W < 0");
            }
            prop_assert!(pp.shaft_power_w >= pp.hydraulic_out_w);
            prop_assert!(
                rel_close(pp.shaft_power_w, pp.hydraulic_out_w + l.total(), 1e-9),
                "shaft {} W, out {} W + losses {} W", pp.shaft_power_w, pp.hydraulic_out_w, l.total()
            );
        }
    }

    #[test]
    fn motion_points_solve_and_balance(d in valid_design()) {
        let c = Circuit::new(&d).expect("valid");
        for m in Motion::ALL {
            let Ok(mp) = c.motion(m) else { continue };
            let p = mp.pump.pressure_pa;
            prop_assert!(mp.residual_pa.abs() <= 1e-9 * p.max(1.0),
                "{m:?}: residual {} Pa at {p} Pa", mp.residual_pa);
            let out = mp.pump.hydraulic_out_w;
            prop_assert!(
                (out - mp.load_power_w - mp.circuit_loss_w).abs() <= 1e-9 * out.max(1e-9),
                "{m:?}: out {out} W, load {} W, circuit {} W", mp.load_power_w, mp.circuit_loss_w
            );
            prop_assert!(mp.speed_ms >= 0.0);
        }
    }

    #[test]
    fn design_files_reload_bit_for_bit(d in valid_design()) {
        let text = kneepoint_engine::io::design_to_json(&d);
        let back = kneepoint_engine::io::parse_design(&text)
            .map_err(|e| TestCaseError::fail(e.to_string()))?;
        prop_assert_eq!(back, d);
    }

    #[test]
    fn every_field_survives_metric_us_metric(d in valid_design()) {
        for s in FIELDS {
            let si = fields::get(&d, s.path).expect("known field");
            let metric = to_display(s.quantity, UnitSystem::Metric, si);
            let us = to_display(s.quantity, UnitSystem::Us,
                from_display(s.quantity, UnitSystem::Metric, metric));
            let back = to_display(s.quantity, UnitSystem::Metric,
                from_display(s.quantity, UnitSystem::Us, us));
            prop_assert!((back - metric).abs() <= 1e-12 * metric.abs(),
                "{}: {metric} -> {us} -> {back}", s.path);
        }
    }
}

/// Numbers that break naive code: NaN, infinities, zeros, negatives, the
/// extremes of f64, subnormals, and anything else.
fn nasty() -> impl Strategy<Value = f64> {
    prop_oneof![
        Just(f64::NAN),
        Just(f64::INFINITY),
        Just(f64::NEG_INFINITY),
        Just(0.0),
        Just(-0.0),
        Just(-1.0),
        Just(f64::MAX),
        Just(f64::MIN),
        Just(f64::MIN_POSITIVE),
        Just(5e-324),
        Just(1e300),
        Just(1e-300),
        any::<f64>(),
        -1e6..1e6_f64,
    ]
}

/// Every numeric input of a design that `fields::FIELDS` does not list,
/// with a setter, including the optional ones (set to `Some`).
type Setter = fn(&mut Design, f64);
const OTHER_FIELDS: &[Setter] = &[
    |d, v| d.drive.motor_rating_w = Some(v),
    |d, v| d.large_pump.no_load_torque_nm = v,
    |d, v| d.small_pump.no_load_torque_nm = v,
    |d, v| d.check_valve.rated_drop_pa = v,
    |d, v| d.check_valve.rated_flow_m3s = v,
    |d, v| d.unloading_valve.back_pressure_flow_m3s = v,
    |d, v| d.lines.pressure_drop_pa = v,
    |d, v| d.lines.return_drop_pa = v,
    |d, v| d.lines.rated_flow_m3s = v,
    |d, v| {
        d.lines
            .pressure_hose
            .get_or_insert(Hose {
                bore_m: 0.01,
                length_m: 1.0,
            })
            .bore_m = v
    },
    |d, v| {
        d.lines
            .pressure_hose
            .get_or_insert(Hose {
                bore_m: 0.01,
                length_m: 1.0,
            })
            .length_m = v
    },
    |d, v| {
        d.lines
            .return_hose
            .get_or_insert(Hose {
                bore_m: 0.01,
                length_m: 1.0,
            })
            .bore_m = v
    },
    |d, v| {
        d.lines
            .return_hose
            .get_or_insert(Hose {
                bore_m: 0.01,
                length_m: 1.0,
            })
            .length_m = v
    },
    |d, v| d.oil.density_kg_m3 = v,
    |d, v| d.oil.viscosity_m2s = v,
    |d, v| d.oil.bulk_modulus_pa = v,
    |d, v| d.ratings.large_pump_relief_pa = Some(v),
    |d, v| d.rules.unload_margin_factor = v,
    |d, v| d.rules.unload_margin_min_pa = v,
    |d, v| d.rules.relief_margin_factor = v,
    |d, v| d.rules.relief_margin_min_pa = v,
    |d, v| d.faults.large_volumetric_efficiency = Some(v),
    |d, v| d.faults.small_volumetric_efficiency = Some(v),
    |d, v| d.faults.check_leak_m3s_per_pa = Some(v),
    |d, v| d.faults.unloading_setting_pa = Some(v),
    |d, v| d.faults.relief_scale = Some(v),
];

fn field_count() -> usize {
    FIELDS.len() + OTHER_FIELDS.len()
}

fn set_any(d: &mut Design, i: usize, v: f64) {
    if let Some(s) = FIELDS.get(i) {
        assert!(fields::set(d, s.path, v));
    } else {
        OTHER_FIELDS[i - FIELDS.len()](d, v);
    }
}

fn exercise(d: &Design) {
    // Must return, Ok or Err, never panic.
    if let Ok(c) = Circuit::new(d) {
        let _ = evaluate(d).expect("Circuit::new accepted it");
        let _ = c.pump_point(c.relief_full_pa() * 0.5);
        for m in Motion::ALL {
            let _ = c.motion(m);
        }
    } else {
        assert!(evaluate(d).is_err());
    }
}

proptest! {
    #![proptest_config(Config { cases: 256, ..Config::default() })]

    #[test]
    fn arbitrary_numbers_never_panic(
        base in valid_design(),
        edits in prop::collection::vec((0..field_count(), nasty()), 1..6),
        stuck in prop_oneof![Just(None), Just(Some(Stuck::Open)), Just(Some(Stuck::Closed))],
    ) {
        let mut d = base;
        d.faults.unloader_stuck = stuck;
        for (i, v) in edits {
            set_any(&mut d, i, v);
        }
        exercise(&d);
    }
}

#[test]
fn every_field_alone_with_every_nasty_number() {
    let specials = [
        f64::NAN,
        f64::INFINITY,
        f64::NEG_INFINITY,
        0.0,
        -0.0,
        -1.0,
        f64::MAX,
        f64::MIN_POSITIVE,
        5e-324,
        1e300,
    ];
    for i in 0..field_count() {
        for v in specials {
            let mut d = Design::default();
            set_any(&mut d, i, v);
            exercise(&d);
        }
    }
}

#[test]
fn every_field_at_once_with_nan() {
    let mut d = Design::default();
    for i in 0..field_count() {
        set_any(&mut d, i, f64::NAN);
    }
    let errs = Circuit::new(&d).expect_err("all NaN is invalid");
    // One error per numeric field of the design, none missed. The optional
    // faults count too; the rules are checked as well.
    assert!(errs.0.len() >= FIELDS.len(), "{} errors", errs.0.len());
    for s in FIELDS {
        assert!(errs.for_field(s.path).is_some(), "no error for {}", s.path);
    }
}

// A stuck check valve (derived model, `Circuit::pump_point`): the solvers
// rely on delivery never rising with pressure, and the power split must
// still close with every loss non-negative.
proptest! {
    #![proptest_config(Config { cases: 200, ..Config::default() })]

    #[test]
    fn stuck_check_delivery_never_rises_and_balance_closes(d in stuck_check_design()) {
        let c = Circuit::new(&d).expect("valid");
        let p_max = c.relief_full_pa();
        let mut last = f64::INFINITY;
        for i in 0..=256 {
            let p = p_max * f64::from(i) / 256.0;
            let pp = c.pump_point(p).expect("in range");
            let q = pp.out_flow_m3s;
            prop_assert!(q <= last * (1.0 + 1e-12), "Q rises at {p} Pa: {last} -> {q}");
            prop_assert!(q >= 0.0);
            last = q;
            let l = pp.losses;
            for (name, v) in [
                ("mechanical", l.mechanical),
                ("leakage", l.leakage),
                ("check valve", l.check_valve),
                ("unloader", l.unloader),
                ("large-side relief", l.large_relief),
                ("relief", l.relief),
            ] {
                prop_assert!(v >= -1e-9 * pp.shaft_power_w, "{name} loss {v} W < 0 at {p} Pa");
            }
            prop_assert!(
                rel_close(pp.shaft_power_w, pp.hydraulic_out_w + l.total(), 1e-9),
                "at {p} Pa: shaft {} W, out {} W + losses {} W",
                pp.shaft_power_w, pp.hydraulic_out_w, l.total()
            );
            match d.faults.check_stuck {
                Some(Stuck::Open) => prop_assert_eq!(pp.large_outlet_pa, p),
                _ => prop_assert_eq!(pp.large_to_system_m3s, 0.0),
            }
        }
        prop_assert_eq!(last, 0.0, "relief full flow passes all delivery");
    }

    #[test]
    fn stuck_check_designs_evaluate_and_motions_solve(d in stuck_check_design()) {
        let report = evaluate(&d).map_err(|e| TestCaseError::fail(e.to_string()))?;
        let json = serde_json::to_value(&report).expect("serialisable");
        let mut bad = Vec::new();
        non_finite_paths(&json, "report", &mut bad);
        prop_assert!(bad.is_empty(), "non-finite outputs: {bad:?}");
        let c = Circuit::new(&d).expect("valid");
        for m in Motion::ALL {
            let Ok(mp) = c.motion(m) else { continue };
            let p = mp.pump.pressure_pa;
            prop_assert!(mp.residual_pa.abs() <= 1e-9 * p.max(1.0),
                "{m:?}: residual {} Pa at {p} Pa", mp.residual_pa);
            prop_assert!(mp.speed_ms >= 0.0);
        }
    }
}
