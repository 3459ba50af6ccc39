//! Invariants of the duty cycle over random designs and profiles (proptest).

use kneepoint_engine::cycle::{
    evaluate_cycle, CycleReport, Hold, PressingForce, Segment, SegmentKind,
};
use kneepoint_engine::design::{workshop_press, Design};
use kneepoint_engine::Circuit;
use proptest::prelude::*;

#[derive(Clone, Debug)]
struct Case {
    vl_cm3: f64,
    vs_cm3: f64,
    eta_v: f64,
    bulk_gpa: f64,
    dead_l: f64,
    stroke_m: f64,
    press_frac: f64,
    f_from_kn: f64,
    f_to_kn: f64,
    dwell_s: f64,
    unloaded: bool,
    decomp_s: f64,
    idle_s: f64,
}

fn case() -> impl Strategy<Value = Case> {
    (
        (
            8.0..40.0_f64,
            1.5..10.0_f64,
            0.80..1.0_f64,
            0.3..1.8_f64,
            0.0..3.0_f64,
        ),
        (0.1..0.8_f64, 0.02..0.3_f64, 0.0..120.0_f64, 0.0..120.0_f64),
        (0.0..3.0_f64, any::<bool>(), 0.0..1.0_f64, 0.0..5.0_f64),
    )
        .prop_map(|(a, b, c)| Case {
            vl_cm3: a.0,
            vs_cm3: a.1,
            eta_v: a.2,
            bulk_gpa: a.3,
            dead_l: a.4,
            stroke_m: b.0,
            press_frac: b.1,
            f_from_kn: b.2,
            f_to_kn: b.3,
            dwell_s: c.0,
            unloaded: c.1,
            decomp_s: c.2,
            idle_s: c.3,
        })
}

fn design(k: &Case) -> Design {
    let mut d = workshop_press();
    d.large_pump.displacement_m3 = k.vl_cm3 * 1e-6;
    d.small_pump.displacement_m3 = k.vs_cm3 * 1e-6;
    d.large_pump.volumetric_efficiency = k.eta_v;
    d.small_pump.volumetric_efficiency = k.eta_v;
    d.oil.bulk_modulus_pa = k.bulk_gpa * 1e9;
    d.cycle.dead_volume_m3 = k.dead_l * 1e-3;
    d.cylinder.stroke_m = k.stroke_m;
    let press = k.press_frac * k.stroke_m;
    d.cycle.segments = vec![
        Segment::Approach {
            distance_m: k.stroke_m - press,
            force_n: 1500.0,
        },
        Segment::Pressing {
            distance_m: press,
            force: PressingForce::Linear {
                from_n: k.f_from_kn * 1e3,
                to_n: k.f_to_kn * 1e3,
            },
        },
        Segment::Dwell {
            time_s: k.dwell_s,
            hold: if k.unloaded {
                Hold::Unloaded
            } else {
                Hold::AtRelief
            },
        },
        Segment::Decompression { time_s: k.decomp_s },
        Segment::Retract {
            distance_m: k.stroke_m,
            force_n: 1000.0,
        },
        Segment::Idle { time_s: k.idle_s },
    ];
    d
}

/// The report, or `None` when the force stalls the cylinder (a valid
/// outcome for random forces, reported as an error).
fn eval(d: &Design) -> Option<CycleReport> {
    let c = Circuit::new(d).expect("valid by construction");
    match evaluate_cycle(&c) {
        Ok(r) => Some(r),
        Err(kneepoint_engine::cycle::CycleError::ForceNotReachable { .. }) => None,
        Err(e) => panic!("unexpected error {e:?}"),
    }
}

fn pressing_time(r: &CycleReport) -> f64 {
    r.segments
        .iter()
        .filter(|s| s.kind == SegmentKind::Pressing)
        .map(|s| s.time_s)
        .sum()
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 128, ..ProptestConfig::default() })]

    #[test]
    fn time_positive_balance_closes_heat_non_negative(k in case()) {
        let Some(r) = eval(&design(&k)) else { return Ok(()) };
        let t = r.totals.cycle_time_s;
        prop_assert!(t.is_finite() && t > 0.0, "cycle time {t}");
        for s in &r.segments {
            let h = &s.heat;
            let scale = s.energy_in_j.abs().max(h.total().abs()).max(s.stored_change_j.abs()).max(1e-30);
            let bal = s.energy_in_j - s.work_out_j - h.total() - s.stored_change_j;
            prop_assert!(bal.abs() <= 1e-9 * scale, "{}: balance {bal} of {scale}", s.label);
            for (name, v) in [("relief", h.relief_j), ("unloaded", h.unloaded_j), ("valves", h.valves_lines_j), ("pumps", h.pumps_j)] {
                prop_assert!(v >= -1e-12 * scale, "{}: {name} heat {v}", s.label);
            }
            prop_assert!(s.time_s >= 0.0 && s.time_s.is_finite());
        }
        prop_assert!(r.samples.len() <= kneepoint_engine::cycle::MAX_SAMPLES);
    }

    #[test]
    fn longer_stroke_never_shortens_the_cycle(k in case(), extra in 0.001..0.5_f64) {
        let a = design(&k);
        let mut b = a.clone();
        b.cylinder.stroke_m += extra;
        for s in &mut b.cycle.segments {
            match s {
                Segment::Approach { distance_m, .. } | Segment::Retract { distance_m, .. } => *distance_m += extra,
                _ => {}
            }
        }
        if let (Some(ra), Some(rb)) = (eval(&a), eval(&b)) {
            prop_assert!(rb.totals.cycle_time_s >= ra.totals.cycle_time_s * (1.0 - 1e-9),
                "{} < {}", rb.totals.cycle_time_s, ra.totals.cycle_time_s);
        }
    }

    #[test]
    fn larger_small_pump_never_slows_pressing(k in case(), grow in 1.001..3.0_f64) {
        let a = design(&k);
        let mut b = a.clone();
        b.small_pump.displacement_m3 *= grow;
        if let (Some(ra), Some(rb)) = (eval(&a), eval(&b)) {
            prop_assert!(pressing_time(&rb) <= pressing_time(&ra) * (1.0 + 1e-9),
                "{} > {}", pressing_time(&rb), pressing_time(&ra));
        }
    }
}
