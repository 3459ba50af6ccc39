//! The worked examples of the domain brief (§10) and the settings-check
//! examples, as reference tables. Closed-form results are checked to ±0.1 %
//! (brief §10). The brief rounds its hp constant to 1714; the engine uses
//! exact unit definitions (1714.2857…), a 0.017 % difference that the
//! tolerance absorbs. Where the brief prints a value rounded to two figures,
//! the expected value here is the brief's own formula, said so per row.

use kneepoint_engine::circuit::Regime;
use kneepoint_engine::figures::{corners, settings_check, Governing};
use kneepoint_engine::lines::{
    blasius_friction, hagen_poiseuille, hose_loss, laminar_friction, FlowRegime,
};
use kneepoint_engine::units::{
    to_display, Quantity, UnitSystem, BAR, BTU_IT, HORSEPOWER, INCH, POUND_FORCE,
    POUND_FORCE_INCH, PSI,
};
use kneepoint_engine::warnings::WarningKind;
use kneepoint_engine::{design::Oil, evaluate, Circuit, Design, Direction, ValvePath};

use crate::support::{check, ideal, row, Tol, CLOSED_FORM, GPM, LPM};

const KW: f64 = 1.0e3;
const MPS_IN_PER_MIN: f64 = INCH / 60.0;

fn circuit(d: &Design) -> Circuit {
    Circuit::new(d).unwrap_or_else(|e| panic!("test design must be valid: {e}"))
}

/// Sets the unloader and the relief (cracking, full flow) in Pa.
fn settings(d: &mut Design, unloading: f64, cracking: f64, full_flow: f64) {
    d.unloading_valve.setting_pa = unloading;
    d.relief_valve.cracking_pa = cracking;
    d.relief_valve.full_flow_pa = full_flow;
}

#[test]
fn example_1_hydraulic_and_input_power() {
    // (a) 20 gpm at 1500 psi, η_o = 0.85: the small pump alone delivers.
    let mut a = ideal(5.0 * GPM, 20.0 * GPM, 0.85);
    settings(&mut a, 100.0 * PSI, 2500.0 * PSI, 2600.0 * PSI);
    let pa = circuit(&a).pump_point(1500.0 * PSI).expect("in range");
    // (b) 180 L/min at 250 bar, η_o = 0.87.
    let mut b = ideal(10.0 * LPM, 180.0 * LPM, 0.87);
    settings(&mut b, 20.0 * BAR, 300.0 * BAR, 320.0 * BAR);
    let pb = circuit(&b).pump_point(250.0 * BAR).expect("in range");
    check(
        "Example 1",
        &[
            row(
                "(a) regime is small pump only",
                f64::from(pa.regime == Regime::SmallPump),
                1.0,
                Tol::Abs(0.0),
                "brief §3.2",
            ),
            row(
                "(a) hydraulic hp",
                pa.hydraulic_out_w / HORSEPOWER,
                17.50,
                CLOSED_FORM,
                "brief §10 Ex. 1a [S-1]",
            ),
            row(
                "(a) input hp at η_o 0.85",
                pa.shaft_power_w / HORSEPOWER,
                20.59,
                CLOSED_FORM,
                "brief §10 Ex. 1a [S-1]",
            ),
            row(
                "(b) hydraulic kW",
                pb.hydraulic_out_w / KW,
                75.0,
                CLOSED_FORM,
                "brief §10 Ex. 1b [S-4]",
            ),
            row(
                "(b) input kW at η_o 0.87",
                pb.shaft_power_w / KW,
                86.2,
                CLOSED_FORM,
                "brief §10 Ex. 1b [S-4]",
            ),
        ],
    );
}

/// The brief's Example 2 pump as the small pump of a circuit whose large
/// pump is unloaded with no back-pressure, so the shaft sees only it.
fn example_2_design(displacement_m3: f64, eta_hm: f64, relief_pa: f64) -> Design {
    let mut d = ideal(5.0 * LPM, 5.0 * LPM, eta_hm);
    d.drive.speed_rpm = 1450.0;
    d.small_pump.displacement_m3 = displacement_m3;
    d.small_pump.volumetric_efficiency = 0.95;
    d.small_pump.rated_pressure_pa = 200.0 * BAR;
    settings(&mut d, 0.05 * relief_pa, 0.95 * relief_pa, relief_pa);
    d
}

#[test]
fn example_2_pump_flow_torque_power() {
    const SRC: &str = "brief §10 Ex. 2 [D]";
    let c = circuit(&example_2_design(100e-6, 0.92, 300.0 * BAR));
    let p = c.pump_point(200.0 * BAR).expect("in range");
    let ideal_torque = circuit(&example_2_design(100e-6, 1.0, 300.0 * BAR))
        .pump_point(200.0 * BAR)
        .expect("in range")
        .torque_nm;
    let us_design = |eta| example_2_design(6.0 * INCH.powi(3), eta, 4000.0 * PSI);
    let us_ideal = circuit(&us_design(1.0))
        .pump_point(3000.0 * PSI)
        .expect("in range")
        .torque_nm;
    let us_real = circuit(&us_design(0.92))
        .pump_point(3000.0 * PSI)
        .expect("in range")
        .torque_nm;
    check(
        "Example 2",
        &[
            row(
                "Q_th L/min",
                c.small_theoretical_flow() / LPM,
                145.0,
                CLOSED_FORM,
                SRC,
            ),
            row(
                "Q at 200 bar, L/min",
                p.small_flow_m3s / LPM,
                137.75,
                CLOSED_FORM,
                SRC,
            ),
            row(
                "delivered Q to the valve, L/min",
                p.out_flow_m3s / LPM,
                137.75,
                CLOSED_FORM,
                SRC,
            ),
            row("ideal torque N·m", ideal_torque, 318.31, CLOSED_FORM, SRC),
            row(
                "torque at η_hm 0.92, N·m",
                p.torque_nm,
                345.99,
                CLOSED_FORM,
                SRC,
            ),
            row("shaft kW", p.shaft_power_w / KW, 52.54, CLOSED_FORM, SRC),
            row(
                "hydraulic kW",
                p.hydraulic_out_w / KW,
                45.92,
                CLOSED_FORM,
                SRC,
            ),
            row(
                "overall efficiency",
                p.hydraulic_out_w / p.shaft_power_w,
                0.874,
                CLOSED_FORM,
                SRC,
            ),
            row(
                "US ideal torque lbf·in",
                us_ideal / POUND_FORCE_INCH,
                2864.8,
                CLOSED_FORM,
                SRC,
            ),
            row(
                "US torque at η_hm 0.92, lbf·in",
                us_real / POUND_FORCE_INCH,
                3113.9,
                CLOSED_FORM,
                SRC,
            ),
        ],
    );
}

/// Brief Example 3: bore 4 in, rod 2.5 in, 20 gpm from ideal pumps below
/// the unloading setting. The B→T path drops exactly 100 psi at the extend
/// return flow Q/φ; the A→T path is rated 50 psi at 20 gpm.
fn example_3_design() -> Design {
    let phi: f64 = 16.0 / (16.0 - 6.25);
    let mut d = ideal(15.0 * GPM, 5.0 * GPM, 1.0);
    d.cylinder.bore_m = 4.0 * INCH;
    d.cylinder.rod_m = 2.5 * INCH;
    settings(&mut d, 2500.0 * PSI, 2900.0 * PSI, 3000.0 * PSI);
    d.directional_valve.rated_flow_m3s = 20.0 * GPM;
    d.directional_valve.drop_b_t_pa = 100.0 * PSI * phi * phi;
    d.directional_valve.drop_a_t_pa = 50.0 * PSI;
    d.ratings.component_pa = 5000.0 * PSI;
    d
}

#[test]
fn example_3_cylinder_back_pressure_and_intensification() {
    const SRC: &str = "brief §10 Ex. 3 [D]";
    let d = example_3_design();
    let c = circuit(&d);
    let ext = c
        .motion_point(Direction::Extend, 24_367.0 * POUND_FORCE)
        .expect("reachable");
    let free = c.motion_point(Direction::Extend, 0.0).expect("reachable");
    let ret = c.motion_point(Direction::Retract, 0.0).expect("reachable");
    // Relief at 2000 psi for the force and the blocked-rod-port figures.
    let mut d2 = d.clone();
    settings(&mut d2, 1500.0 * PSI, 1990.0 * PSI, 2000.0 * PSI);
    d2.ratings.component_pa = 3000.0 * PSI;
    let r2 = evaluate(&d2).expect("valid");
    let intensified = r2
        .warnings
        .iter()
        .find_map(|w| match w.kind {
            WarningKind::Intensification { intensified_pa, .. } => Some(intensified_pa),
            _ => None,
        })
        .expect("φ·p_rf = 3282 psi is above the 3000 psi rating");
    // DCV scaling in SI on the demo design: 5 bar at 60 L/min.
    let demo = circuit(&Design::default());
    let in2 = INCH * INCH;
    check(
        "Example 3",
        &[
            row("A_cap in²", c.cap_area() / in2, 12.566, CLOSED_FORM, SRC),
            row("A_ann in²", c.annulus_area() / in2, 7.658, CLOSED_FORM, SRC),
            row(
                "A_rod in²",
                (c.cap_area() - c.annulus_area()) / in2,
                4.909,
                CLOSED_FORM,
                SRC,
            ),
            row("φ", c.area_ratio(), 1.641, CLOSED_FORM, SRC),
            row(
                "extend flow gpm",
                free.cylinder_flow_m3s / GPM,
                20.0,
                CLOSED_FORM,
                SRC,
            ),
            row(
                "v_ext in/min",
                free.speed_ms / MPS_IN_PER_MIN,
                367.6,
                CLOSED_FORM,
                SRC,
            ),
            row("v_ext in/s", free.speed_ms / INCH, 6.13, CLOSED_FORM, SRC),
            row(
                "v_ext ft/s",
                free.speed_ms / (12.0 * INCH),
                0.511,
                CLOSED_FORM,
                SRC,
            ),
            row(
                "v_ret in/min",
                ret.speed_ms / MPS_IN_PER_MIN,
                603.3,
                CLOSED_FORM,
                SRC,
            ),
            row(
                "return flow on retract gpm",
                ret.return_flow_m3s / GPM,
                32.82,
                CLOSED_FORM,
                SRC,
            ),
            row(
                "return flow on extend gpm",
                free.return_flow_m3s / GPM,
                12.19,
                CLOSED_FORM,
                SRC,
            ),
            row(
                "A→T drop at 32.82 gpm, psi",
                ret.return_valve_drop_pa / PSI,
                134.7,
                CLOSED_FORM,
                SRC,
            ),
            row(
                "rod-end back-pressure psi",
                ext.rod_pa / PSI,
                100.0,
                CLOSED_FORM,
                SRC,
            ),
            row(
                "24 367 lbf with 100 psi on the annulus: cap psi",
                ext.cap_pa / PSI,
                2000.0,
                CLOSED_FORM,
                SRC,
            ),
            row(
                "... pump pressure psi",
                ext.pump.pressure_pa / PSI,
                2000.0,
                CLOSED_FORM,
                SRC,
            ),
            row(
                "F_ext at 2000 psi, lbf",
                r2.summary.max_extend_force_n / POUND_FORCE,
                25_133.0,
                CLOSED_FORM,
                SRC,
            ),
            row(
                "blocked rod port at 2000 psi, psi",
                intensified / PSI,
                3282.0,
                CLOSED_FORM,
                SRC,
            ),
            row(
                "DCV 5 bar at 60 L/min → bar at 90 L/min",
                demo.valve_drop(ValvePath::PA, 90.0 * LPM) / BAR,
                11.25,
                CLOSED_FORM,
                "brief §4 DCV example [D]",
            ),
        ],
    );
}

fn vg46() -> Oil {
    Oil {
        density_kg_m3: 870.0,
        viscosity_m2s: 46.0e-6,
        bulk_modulus_pa: 1.0e9,
    }
}

#[test]
fn example_4_line_loss() {
    const SRC: &str = "brief §10 Ex. 4 [D]";
    let oil = vg46();
    let (d, l) = (0.019, 10.0);
    let lam = hose_loss(d, l, 60.0 * LPM, &oil);
    let hp = hagen_poiseuille(d, l, 60.0 * LPM, &oil);
    let fast = hose_loss(d, l, 150.0 * LPM, &oil);
    let dyn_p = oil.density_kg_m3 * fast.velocity_ms.powi(2) / 2.0 * (l / d);
    let blasius = blasius_friction(fast.reynolds) * dyn_p;
    let laminar = laminar_friction(fast.reynolds) * dyn_p;
    check(
        "Example 4",
        &[
            row("60 L/min: v m/s", lam.velocity_ms, 3.527, CLOSED_FORM, SRC),
            row("60 L/min: Re", lam.reynolds, 1457.0, CLOSED_FORM, SRC),
            row(
                "60 L/min: laminar",
                f64::from(lam.regime == FlowRegime::Laminar),
                1.0,
                Tol::Abs(0.0),
                SRC,
            ),
            row(
                "60 L/min: f = 64/Re",
                lam.friction_factor,
                0.04393,
                CLOSED_FORM,
                SRC,
            ),
            row(
                "60 L/min: Δp bar",
                lam.drop_pa / BAR,
                1.251,
                CLOSED_FORM,
                SRC,
            ),
            row("Hagen–Poiseuille bar", hp / BAR, 1.251, CLOSED_FORM, SRC),
            row(
                "Darcy = Hagen–Poiseuille",
                lam.drop_pa,
                hp,
                Tol::Rel(1e-12),
                "identity, [M]",
            ),
            row("150 L/min: v m/s", fast.velocity_ms, 8.82, CLOSED_FORM, SRC),
            row("150 L/min: Re", fast.reynolds, 3642.0, CLOSED_FORM, SRC),
            row(
                "150 L/min: transition flagged",
                f64::from(fast.regime == FlowRegime::Transition),
                1.0,
                Tol::Abs(0.0),
                SRC,
            ),
            row(
                "150 L/min: Blasius Δp bar",
                blasius / BAR,
                7.24,
                CLOSED_FORM,
                SRC,
            ),
            row(
                "150 L/min: laminar-formula Δp bar",
                laminar / BAR,
                3.13,
                CLOSED_FORM,
                SRC,
            ),
        ],
    );
    // The engine's transition blend must lie between the two estimates.
    assert!(
        fast.drop_pa > laminar && fast.drop_pa <= blasius,
        "blend {} Pa outside laminar {laminar} .. Blasius {blasius}",
        fast.drop_pa
    );
}

#[test]
fn example_5_flow_from_timed_strokes() {
    // (a) US: 7.065 in², 30 in in 3 s; pump 2.5 in³/rev at 1800 rpm.
    let us = UnitSystem::Us;
    let q_a = 7.065 * INCH * INCH * (30.0 * INCH) / 3.0;
    let q_a_gpm = to_display(Quantity::Flow, us, q_a);
    let mut pa = ideal(10.0 * GPM, 5.0 * GPM, 0.9);
    pa.small_pump.displacement_m3 = 2.5 * INCH.powi(3);
    let qth_a = circuit(&pa).small_theoretical_flow();
    // (b) SI hi-lo field check: 125 mm bore, 80 + 5 cm³/rev at 1450 rpm.
    let mut pb = Design::default();
    pb.drive.speed_rpm = 1450.0;
    pb.cylinder.bore_m = 0.125;
    pb.cylinder.rod_m = 0.070;
    pb.large_pump.displacement_m3 = 80e-6;
    pb.small_pump.displacement_m3 = 5e-6;
    let cb = circuit(&pb);
    let a = cb.cap_area();
    let q_fast = a * 0.300 / 1.95;
    let q_slow = a * 0.025 / 3.6;
    let q_large = q_fast - q_slow;
    check(
        "Example 5",
        &[
            row(
                "(a) gpm by 0.2597·A·s/t",
                q_a_gpm,
                0.2597 * 7.065 * 30.0 / 3.0,
                CLOSED_FORM,
                "brief §1 [D][S-2]",
            ),
            // S-2 rounds the factor to 0.26 and prints 18.4 gpm.
            row(
                "(a) gpm against S-2's 18.4 (factor 0.26)",
                q_a_gpm,
                18.4,
                Tol::Rel(5e-3),
                "brief §10 Ex. 5a [S-2]",
            ),
            row(
                "(a) theoretical gpm",
                qth_a / GPM,
                19.48,
                CLOSED_FORM,
                "brief §10 Ex. 5a [D]",
            ),
            row(
                "(a) η_v",
                q_a / qth_a,
                0.942,
                CLOSED_FORM,
                "brief §10 Ex. 5a [D]",
            ),
            row(
                "(b) A cm²",
                a / 1e-4,
                122.72,
                CLOSED_FORM,
                "brief §10 Ex. 5b [D]",
            ),
            row(
                "(b) fast Q_L + Q_S L/min",
                q_fast / LPM,
                113.3,
                CLOSED_FORM,
                "brief §10 Ex. 5b [D]",
            ),
            row(
                "(b) by 0.006·A·s/t",
                q_fast / LPM,
                0.006 * 122.72 * 300.0 / 1.95,
                CLOSED_FORM,
                "brief §1 [D][S-2]",
            ),
            row(
                "(b) slow Q_S L/min",
                q_slow / LPM,
                5.11,
                CLOSED_FORM,
                "brief §10 Ex. 5b [D]",
            ),
            row(
                "(b) Q_L L/min",
                q_large / LPM,
                108.2,
                CLOSED_FORM,
                "brief §10 Ex. 5b [D]",
            ),
            row(
                "(b) Q_th,L L/min",
                cb.large_theoretical_flow() / LPM,
                116.0,
                CLOSED_FORM,
                "brief §10 Ex. 5b [D]",
            ),
            row(
                "(b) Q_th,S L/min",
                cb.small_theoretical_flow() / LPM,
                7.25,
                CLOSED_FORM,
                "brief §10 Ex. 5b [D]",
            ),
            row(
                "(b) η_v,L",
                q_large / cb.large_theoretical_flow(),
                0.932,
                CLOSED_FORM,
                "brief §10 Ex. 5b [D]",
            ),
            row(
                "(b) η_v,S",
                q_slow / cb.small_theoretical_flow(),
                0.705,
                CLOSED_FORM,
                "brief §10 Ex. 5b [D]",
            ),
        ],
    );
}

/// Brief Example 6 (modelled on a textbook double-pump example; set-up and
/// 50 % margins from memory [M], numbers [D]). Ideal pumps deliver 20 gpm
/// in rapid motions, so the directional-valve paths, rated at 20 gpm, give
/// exactly the example's losses at the motion flows: P→A 100 psi; B→T 50 psi
/// at the extend return flow Q/φ; P→B 75 psi; A→T 50 psi at the retract
/// return flow φ·Q. φ = 1.5²/(1.5² − 0.5²) = 1.125 exactly.
fn example_6_design() -> Design {
    let phi = 1.125_f64;
    let mut d = ideal(19.0 * GPM, 1.0 * GPM, 0.9);
    d.cylinder.bore_m = 1.5 * INCH;
    d.cylinder.rod_m = 0.5 * INCH;
    settings(&mut d, 220.0 * PSI, 1800.0 * PSI, 1900.0 * PSI);
    let dv = &mut d.directional_valve;
    dv.rated_flow_m3s = 20.0 * GPM;
    dv.drop_p_a_pa = 100.0 * PSI;
    dv.drop_b_t_pa = 50.0 * PSI * phi * phi;
    dv.drop_p_b_pa = 75.0 * PSI;
    dv.drop_a_t_pa = 50.0 * PSI / (phi * phi);
    d.loads.approach_force_n = 0.0;
    d.loads.pressing_force_n = 2000.0 * POUND_FORCE;
    d.loads.retract_force_n = 0.0;
    d.rules.unload_margin_factor = 1.5;
    d.rules.unload_margin_min_pa = 0.0;
    d.rules.relief_margin_factor = 1.5;
    d.rules.relief_margin_min_pa = 0.0;
    d.ratings.component_pa = 3000.0 * PSI;
    d
}

#[test]
#[allow(clippy::approx_constant)] // A_ann = π/2 in² here, as printed
fn example_6_unloading_and_relief_settings() {
    const SRC: &str = "brief §10 Ex. 6 [M set-up, D numbers]";
    let c = circuit(&example_6_design());
    let s = settings_check(&c);
    let ext = s.approach_fast_pa.expect("rapid extend reachable");
    let ret = s.retract_fast_pa.expect("rapid retract reachable");
    let press = s.pressing_pa.expect("punching reachable");
    let in2 = INCH * INCH;
    // Pressing runs at 1 gpm, where the valve drops add 0.36 psi (0.03 %).
    check(
        "Example 6",
        &[
            row("A_cap in²", c.cap_area() / in2, 1.7671, CLOSED_FORM, SRC),
            row(
                "A_ann in²",
                c.annulus_area() / in2,
                1.5708,
                CLOSED_FORM,
                SRC,
            ),
            row("φ", c.area_ratio(), 1.125, CLOSED_FORM, SRC),
            row("rapid extend psi", ext / PSI, 144.4, CLOSED_FORM, SRC),
            row("rapid retract psi", ret / PSI, 131.3, CLOSED_FORM, SRC),
            row(
                "fast-motion maximum psi",
                s.fast_max_pa / PSI,
                144.4,
                CLOSED_FORM,
                SRC,
            ),
            row(
                "min unloading (×1.5) psi",
                s.min_unloading_pa / PSI,
                216.7,
                CLOSED_FORM,
                SRC,
            ),
            row("punching psi", press / PSI, 1131.8, CLOSED_FORM, SRC),
            row(
                "min relief cracking (×1.5) psi",
                s.min_relief_cracking_pa / PSI,
                1697.7,
                CLOSED_FORM,
                SRC,
            ),
            row(
                "margin factor shown",
                s.unload_margin_factor,
                1.5,
                Tol::Abs(0.0),
                SRC,
            ),
        ],
    );
    assert!(s.unloading_ok, "220 psi meets the 216.7 psi minimum");
    assert!(s.relief_ok, "1800 psi meets the 1697.7 psi minimum");
    // The naive sums (150 psi, 125 psi) ignore the area ratio: the classic
    // error the example is there to catch.
    for (got, naive) in [(ext, 150.0), (ret, 125.0)] {
        let rel = (got / PSI - naive).abs() / naive;
        assert!(rel > 0.03, "{} psi is the naive sum {naive}", got / PSI);
    }
}

fn example_8_design() -> Design {
    let mut d = ideal(20.0 * GPM, 3.0 * GPM, 0.85);
    settings(&mut d, 500.0 * PSI, 2400.0 * PSI, 2500.0 * PSI);
    d.unloading_valve.back_pressure_pa = 50.0 * PSI;
    d.unloading_valve.back_pressure_flow_m3s = 20.0 * GPM;
    d.ratings.component_pa = 3000.0 * PSI;
    d
}

#[test]
fn example_8_corner_powers() {
    const SRC: &str = "brief §10 Ex. 8 [D]";
    let c = circuit(&example_8_design());
    let k = corners(&c);
    let p = 1500.0 * PSI;
    let pressing = c.pump_point(p).expect("in range");
    let small_share = p * c.small_theoretical_flow() / 0.85;
    let large_share = pressing.shaft_power_w - small_share;
    let btu_h = large_share * 3600.0 / BTU_IT;
    // SI counterpart, brief §3.2: 4 bar × 116 L/min, η_hm 0.9.
    let mut si = ideal(116.0 * LPM, 8.0 * LPM, 0.9);
    settings(&mut si, 30.0 * BAR, 160.0 * BAR, 168.0 * BAR);
    si.unloading_valve.back_pressure_pa = 4.0 * BAR;
    si.unloading_valve.back_pressure_flow_m3s = 116.0 * LPM;
    let csi = circuit(&si);
    let ppsi = csi.pump_point(100.0 * BAR).expect("in range");
    let si_large_share =
        ppsi.shaft_power_w - 100.0 * BAR * csi.small_theoretical_flow() / 0.9;
    check(
        "Example 8",
        &[
            row("P_low hp", k.low_w / HORSEPOWER, 7.89, CLOSED_FORM, SRC),
            row("P_high hp", k.high_w / HORSEPOWER, 5.83, CLOSED_FORM, SRC),
            row(
                "governing is low",
                f64::from(k.governing == Governing::Low),
                1.0,
                Tol::Abs(0.0),
                SRC,
            ),
            row(
                "equal-corner unloading psi",
                k.equal_corner_unloading_pa / PSI,
                369.6,
                CLOSED_FORM,
                SRC,
            ),
            // The brief prints 39.5; its formula 2500·23/(1714·0.85) is 39.47.
            row(
                "single 23 gpm pump hp",
                k.single_pump_w / HORSEPOWER,
                39.47,
                CLOSED_FORM,
                SRC,
            ),
            // Q_S* = Q_L·(p_u + Δp_cv − p_bp)/(p_rf − p_u) = 20·450/2000.
            row(
                "equal-corner small flow gpm",
                k.equal_corner_small_flow_m3s / GPM,
                4.5,
                CLOSED_FORM,
                "brief §3.3 step 4 [D]",
            ),
            row(
                "equal-corner small displacement in³/rev",
                k.equal_corner_small_displacement_m3 / INCH.powi(3),
                4.5 * 231.0 / 1800.0,
                CLOSED_FORM,
                "brief §3.3 step 4 [D]",
            ),
            row(
                "unloaded L at the shaft hp",
                large_share / HORSEPOWER,
                50.0 * 20.0 / (1714.0 * 0.85),
                CLOSED_FORM,
                "brief §10 Ex. 8 (printed 0.69) [D]",
            ),
            row(
                "unloaded L hydraulic hp",
                pressing.losses.unloader / HORSEPOWER,
                50.0 * 20.0 / 1714.0,
                CLOSED_FORM,
                "brief §3.2 (printed 0.58) [D]",
            ),
            row(
                "unloaded L heat BTU/h",
                btu_h,
                0.686_36 * 2545.0,
                CLOSED_FORM,
                "brief §3.2 (≈ 1750) [D][S-18]",
            ),
            row(
                "L outlet at back-pressure psi",
                pressing.large_outlet_pa / PSI,
                50.0,
                CLOSED_FORM,
                SRC,
            ),
            row(
                "SI: unloaded L hydraulic kW",
                ppsi.losses.unloader / KW,
                4.0 * 116.0 / 600.0,
                CLOSED_FORM,
                "brief §3.2 (printed 0.77) [D]",
            ),
            row(
                "SI: unloaded L at the shaft kW",
                si_large_share / KW,
                4.0 * 116.0 / (600.0 * 0.9),
                CLOSED_FORM,
                "brief §3.2 (printed 0.86) [D]",
            ),
        ],
    );
}

/// Two equal ideal pumps with a narrow unloader band (0.1 %) and a
/// relief with almost no override (cracking 1999.9, full flow 2000 psi),
/// so the staircase is the textbook step.
#[test]
fn equal_pumps_staircase() {
    const SRC: &str = "common practice, no source";
    let mut d = ideal(10.0 * GPM, 10.0 * GPM, 1.0);
    settings(&mut d, 1000.0 * PSI, 1999.9 * PSI, 2000.0 * PSI);
    let c = circuit(&d);
    let at = |psi: f64| c.pump_point(psi * PSI).expect("in range");
    let k = corners(&c);
    let regime = |psi: f64, r: Regime| f64::from(at(psi).regime == r);
    check(
        "two 10 gpm pumps, 1000/2000 psi",
        &[
            row(
                "Q at 500 psi gpm",
                at(500.0).out_flow_m3s / GPM,
                20.0,
                CLOSED_FORM,
                SRC,
            ),
            row(
                "Q at 999 psi gpm",
                at(999.0).out_flow_m3s / GPM,
                20.0,
                CLOSED_FORM,
                SRC,
            ),
            row(
                "Q at 1002 psi gpm",
                at(1002.0).out_flow_m3s / GPM,
                10.0,
                CLOSED_FORM,
                SRC,
            ),
            row(
                "Q at 1500 psi gpm",
                at(1500.0).out_flow_m3s / GPM,
                10.0,
                CLOSED_FORM,
                SRC,
            ),
            row(
                "Q at 1999 psi gpm",
                at(1999.0).out_flow_m3s / GPM,
                10.0,
                CLOSED_FORM,
                SRC,
            ),
            row(
                "Q at 2000 psi gpm",
                at(2000.0).out_flow_m3s / GPM,
                0.0,
                Tol::Abs(1e-12),
                SRC,
            ),
            row(
                "both pumps at 500 psi",
                regime(500.0, Regime::BothPumps),
                1.0,
                Tol::Abs(0.0),
                SRC,
            ),
            row(
                "small pump at 1500 psi",
                regime(1500.0, Regime::SmallPump),
                1.0,
                Tol::Abs(0.0),
                SRC,
            ),
            row(
                "stalled at 2000 psi",
                regime(2000.0, Regime::Stalled),
                1.0,
                Tol::Abs(0.0),
                SRC,
            ),
            row(
                "low corner hp",
                k.low_w / HORSEPOWER,
                11.67,
                CLOSED_FORM,
                SRC,
            ),
            row(
                "high corner hp",
                k.high_w / HORSEPOWER,
                11.67,
                CLOSED_FORM,
                SRC,
            ),
            row(
                "equal-corner unloading psi",
                k.equal_corner_unloading_pa / PSI,
                1000.0,
                CLOSED_FORM,
                SRC,
            ),
            row(
                "relief flow at 2000 psi gpm",
                at(2000.0).relief_flow_m3s / GPM,
                10.0,
                CLOSED_FORM,
                SRC,
            ),
        ],
    );
}

/// The equal-corner small pump when it is far from the present one: a
/// 250:1 pump pair with the relief only 5 % above the unloader needs a
/// small pump many times larger, still a finite figure.
#[test]
fn equal_corner_small_pump_far_from_the_present_one() {
    const SRC: &str =
        "brief §3.3 step 4, Q_S* = Q_L·(p_u + Δp_cv − p_bp)/(p_rf − p_u) [D]";
    let mut d = ideal(250.0 * GPM, 1.0 * GPM, 0.9);
    settings(&mut d, 1000.0 * PSI, 1040.0 * PSI, 1050.0 * PSI);
    d.unloading_valve.back_pressure_pa = 50.0 * PSI;
    d.unloading_valve.back_pressure_flow_m3s = 250.0 * GPM;
    let k = corners(&circuit(&d));
    let expected = 250.0 * (1000.0 - 50.0) / (1050.0 - 1000.0);
    check(
        "equal-corner small pump, 250:1",
        &[row(
            "Q_S* gpm",
            k.equal_corner_small_flow_m3s / GPM,
            expected,
            CLOSED_FORM,
            SRC,
        )],
    );
}
