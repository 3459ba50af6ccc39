//! Kneepoint's pressing integration against an independent SciPy solution.
//!
//! `tests/reference/pressing.py` integrates the workshop-press demo's
//! pressing stroke in the time domain with `scipy.integrate.solve_ivp`
//! (pressure build-up at the standing piston, then motion with oil
//! compressibility), from the equations and with its own pump, relief and
//! loss model written in Python. `make reference` (scripts/reference.sh)
//! writes its result to target/reference/pressing.json. This test fails,
//! never passes silently, when that file is missing.

use std::path::PathBuf;

use kneepoint_engine::cycle::{evaluate_cycle, PressingForce, Segment, SegmentKind};
use kneepoint_engine::design::workshop_press;
use kneepoint_engine::Circuit;
use serde_json::Value;

fn reference() -> Value {
    let path = PathBuf::from(env!("CARGO_MANIFEST_DIR"))
        .join("../../target/reference/pressing.json");
    let text = std::fs::read_to_string(&path).unwrap_or_else(|e| {
        panic!(
            "the SciPy reference {} is missing ({e}): run `make reference` first \
             (scripts/reference.sh sets up .venv with scipy and writes it)",
            path.display()
        )
    });
    serde_json::from_str(&text).expect("reference JSON parses")
}

fn num(v: &Value, key: &str) -> f64 {
    v[key]
        .as_f64()
        .unwrap_or_else(|| panic!("reference JSON lacks number {key}"))
}

#[test]
fn pressing_time_and_final_pressure_match_scipy_within_half_a_percent() {
    let r = reference();
    let d = workshop_press();
    // The Python script carries its own copy of the design: check it is
    // still the demo's, so the comparison cannot drift apart silently.
    let rd = &r["design"];
    let pairs = [
        ("speed_rpm", d.drive.speed_rpm),
        ("large_displacement_m3", d.large_pump.displacement_m3),
        ("large_eta_v", d.large_pump.volumetric_efficiency),
        ("large_rated_pa", d.large_pump.rated_pressure_pa),
        ("small_displacement_m3", d.small_pump.displacement_m3),
        ("small_eta_v", d.small_pump.volumetric_efficiency),
        ("small_rated_pa", d.small_pump.rated_pressure_pa),
        ("check_cracking_pa", d.check_valve.cracking_pa),
        ("check_drop_pa", d.check_valve.rated_drop_pa),
        ("check_flow_m3s", d.check_valve.rated_flow_m3s),
        ("unloading_pa", d.unloading_valve.setting_pa),
        ("unloading_band_fraction", d.unloading_valve.band_fraction),
        ("back_pressure_pa", d.unloading_valve.back_pressure_pa),
        (
            "back_pressure_flow_m3s",
            d.unloading_valve.back_pressure_flow_m3s,
        ),
        ("relief_cracking_pa", d.relief_valve.cracking_pa),
        ("relief_full_pa", d.relief_valve.full_flow_pa),
        ("valve_flow_m3s", d.directional_valve.rated_flow_m3s),
        ("valve_drop_pa", d.directional_valve.drop_p_a_pa),
        ("valve_drop_pa", d.directional_valve.drop_b_t_pa),
        ("line_pressure_drop_pa", d.lines.pressure_drop_pa),
        ("line_return_drop_pa", d.lines.return_drop_pa),
        ("line_flow_m3s", d.lines.rated_flow_m3s),
        (
            "pressure_hose_bore_m",
            d.lines.pressure_hose.as_ref().unwrap().bore_m,
        ),
        (
            "pressure_hose_length_m",
            d.lines.pressure_hose.as_ref().unwrap().length_m,
        ),
        (
            "return_hose_bore_m",
            d.lines.return_hose.as_ref().unwrap().bore_m,
        ),
        (
            "return_hose_length_m",
            d.lines.return_hose.as_ref().unwrap().length_m,
        ),
        ("density_kg_m3", d.oil.density_kg_m3),
        ("viscosity_m2s", d.oil.viscosity_m2s),
        ("bulk_modulus_pa", d.oil.bulk_modulus_pa),
        ("bore_m", d.cylinder.bore_m),
        ("rod_m", d.cylinder.rod_m),
        ("dead_volume_m3", d.cycle.dead_volume_m3),
    ];
    for (k, want) in pairs {
        let got = num(rd, k);
        assert!(
            (got - want).abs() <= 1e-12 * want.abs(),
            "design {k}: python {got}, demo {want}"
        );
    }
    let Segment::Approach {
        distance_m,
        force_n,
    } = d.cycle.segments[0]
    else {
        panic!("demo cycle starts with an approach");
    };
    assert_eq!(
        (num(rd, "approach_m"), num(rd, "approach_force_n")),
        (distance_m, force_n)
    );
    let Segment::Pressing {
        distance_m,
        force: PressingForce::Linear { from_n, to_n },
    } = d.cycle.segments[1].clone()
    else {
        panic!("demo cycle presses with a linear force");
    };
    assert_eq!(num(rd, "pressing_m"), distance_m);
    assert_eq!(
        (num(rd, "pressing_from_n"), num(rd, "pressing_to_n")),
        (from_n, to_n)
    );

    let rep = evaluate_cycle(&Circuit::new(&d).unwrap()).unwrap();
    let p = rep
        .segments
        .iter()
        .find(|s| s.kind == SegmentKind::Pressing)
        .unwrap();
    let (t_ref, p_ref) = (num(&r, "pressing_time_s"), num(&r, "final_pressure_pa"));
    let dt = (p.time_s - t_ref).abs() / t_ref;
    let dp = (p.pressure_max_pa - p_ref).abs() / p_ref;
    println!(
        "pressing: Kneepoint {:.6} s, SciPy {:.6} s ({:.2e}); final {:.3} bar vs {:.3} bar ({:.2e})",
        p.time_s,
        t_ref,
        dt,
        p.pressure_max_pa / 1e5,
        p_ref / 1e5,
        dp
    );
    assert!(
        dt <= 0.005,
        "pressing time {} s vs SciPy {t_ref} s",
        p.time_s
    );
    assert!(
        dp <= 0.005,
        "final pressure {} Pa vs SciPy {p_ref} Pa",
        p.pressure_max_pa
    );
    // Against SciPy at rtol 1e-10 the two agree far closer (SciPy's own
    // error dominates at 1e-6).
    let t_tight = num(&r, "pressing_time_tight_s");
    let dtt = (p.time_s - t_tight).abs() / t_tight;
    println!("pressing vs SciPy at rtol 1e-10: {t_tight:.9} s ({dtt:.2e})");
    assert!(
        dtt <= 1e-5,
        "pressing time {} s vs tight SciPy {t_tight} s",
        p.time_s
    );
}
