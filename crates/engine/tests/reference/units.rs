//! Unit factors against NIST SP 811 and the `uom` crate, and the "magic
//! numbers" of the trade's working formulas (brief §1) derived from the
//! engine's own constants.

use std::f64::consts::PI;

use kneepoint_engine::units::{
    from_display, to_display, unit, Quantity, UnitSystem, BAR, BTU_IT, HORSEPOWER, INCH,
    LITRE, MINUTE, POUND_FORCE, POUND_FORCE_INCH, PSI, US_GALLON,
};
use kneepoint_engine::{Circuit, Design};

use crate::support::{check, row, Tol, GPM};

/// NIST SP 811 (2008) Appendix B.8 prints seven significant digits; the
/// engine's exact definitions must round to them.
const NIST: &str = "NIST SP 811 (2008) App. B.8";
const SEVEN_DIGITS: Tol = Tol::Rel(1e-6);

#[test]
fn factors_match_nist_sp_811() {
    check(
        "NIST SP 811",
        &[
            row("psi in Pa", PSI, 6.894_757e3, SEVEN_DIGITS, NIST),
            row(
                "US gallon in m³",
                US_GALLON,
                3.785_412e-3,
                SEVEN_DIGITS,
                NIST,
            ),
            row(
                "horsepower in W",
                HORSEPOWER,
                7.456_999e2,
                SEVEN_DIGITS,
                NIST,
            ),
            row(
                "pound-force in N",
                POUND_FORCE,
                4.448_222,
                SEVEN_DIGITS,
                NIST,
            ),
            row("inch in m (exact)", INCH, 0.0254, Tol::Abs(0.0), NIST),
            row("BTU_IT in J", BTU_IT, 1.055_056e3, SEVEN_DIGITS, NIST),
            row("bar in Pa (exact)", BAR, 1.0e5, Tol::Abs(0.0), NIST),
            row(
                "pound-force inch in N·m",
                POUND_FORCE_INCH,
                1.129_848e-1,
                SEVEN_DIGITS,
                NIST,
            ),
            row(
                "US gallon in in³ (exact)",
                US_GALLON / INCH.powi(3),
                231.0,
                Tol::Rel(1e-14),
                "definition of the US gallon, NIST SP 811 B.8 footnote",
            ),
        ],
    );
}

#[test]
fn factors_match_uom() {
    use uom::si::f64 as q;
    use uom::si::{force, length, power, pressure, torque, volume, volume_rate};
    const UOM: &str = "uom 0.36 (registry crate)";
    let psi = q::Pressure::new::<pressure::psi>(1.0).get::<pressure::pascal>();
    let bar = q::Pressure::new::<pressure::bar>(1.0).get::<pressure::pascal>();
    let gal = q::Volume::new::<volume::gallon>(1.0).get::<volume::cubic_meter>();
    let hp = q::Power::new::<power::horsepower>(1.0).get::<power::watt>();
    let lbf = q::Force::new::<force::pound_force>(1.0).get::<force::newton>();
    let inch = q::Length::new::<length::inch>(1.0).get::<length::meter>();
    let gpm = q::VolumeRate::new::<volume_rate::gallon_per_minute>(1.0)
        .get::<volume_rate::cubic_meter_per_second>();
    let lpm = q::VolumeRate::new::<volume_rate::liter_per_minute>(1.0)
        .get::<volume_rate::cubic_meter_per_second>();
    let lbf_in =
        q::Torque::new::<torque::pound_force_inch>(1.0).get::<torque::newton_meter>();
    let us = UnitSystem::Us;
    let si = UnitSystem::Metric;
    check(
        "uom",
        &[
            row("psi", PSI, psi, SEVEN_DIGITS, UOM),
            row("bar", BAR, bar, Tol::Rel(1e-15), UOM),
            row("gallon", US_GALLON, gal, SEVEN_DIGITS, UOM),
            row("horsepower", HORSEPOWER, hp, SEVEN_DIGITS, UOM),
            row("pound-force", POUND_FORCE, lbf, SEVEN_DIGITS, UOM),
            row("inch", INCH, inch, Tol::Rel(1e-15), UOM),
            row("lbf·in", POUND_FORCE_INCH, lbf_in, SEVEN_DIGITS, UOM),
            // The display units the user sees, by quantity.
            row(
                "display psi",
                unit(Quantity::Pressure, us).scale,
                psi,
                SEVEN_DIGITS,
                UOM,
            ),
            row(
                "display gpm",
                unit(Quantity::Flow, us).scale,
                gpm,
                SEVEN_DIGITS,
                UOM,
            ),
            row(
                "display L/min",
                unit(Quantity::Flow, si).scale,
                lpm,
                Tol::Rel(1e-14),
                UOM,
            ),
            row(
                "display hp",
                unit(Quantity::Power, us).scale,
                hp,
                SEVEN_DIGITS,
                UOM,
            ),
            row(
                "display lbf",
                unit(Quantity::Force, us).scale,
                lbf,
                SEVEN_DIGITS,
                UOM,
            ),
            row(
                "display lbf·in",
                unit(Quantity::Torque, us).scale,
                lbf_in,
                SEVEN_DIGITS,
                UOM,
            ),
            row(
                "display in",
                unit(Quantity::Length, us).scale,
                inch,
                Tol::Rel(1e-15),
                UOM,
            ),
            row(
                "display in/s",
                unit(Quantity::Velocity, us).scale,
                q::Velocity::new::<uom::si::velocity::inch_per_second>(1.0)
                    .get::<uom::si::velocity::meter_per_second>(),
                Tol::Rel(1e-14),
                UOM,
            ),
            row(
                "display in³/rev (per rev: in³)",
                unit(Quantity::Displacement, us).scale,
                q::Volume::new::<volume::cubic_inch>(1.0).get::<volume::cubic_meter>(),
                SEVEN_DIGITS,
                UOM,
            ),
        ],
    );
}

/// Rad/s per rpm, taken from the engine's circuit (ω = 2π·n/60).
fn rad_per_rpm() -> f64 {
    let d = Design::default();
    let c = Circuit::new(&d).expect("demo design is valid");
    c.omega() / d.drive.speed_rpm
}

#[test]
fn trade_constants_follow_from_engine_units() {
    const D: &str = "brief §1 [D], derived from the unit definitions";
    const S5: &str = "brief §1 [S-5] formula sheet, [D]";
    let gpm = unit(Quantity::Flow, UnitSystem::Us).scale;
    let lpm = unit(Quantity::Flow, UnitSystem::Metric).scale;
    let kw = unit(Quantity::Power, UnitSystem::Metric).scale;
    let hp = unit(Quantity::Power, UnitSystem::Us).scale;
    let bar = unit(Quantity::Pressure, UnitSystem::Metric).scale;
    let psi = unit(Quantity::Pressure, UnitSystem::Us).scale;
    let nm = unit(Quantity::Torque, UnitSystem::Metric).scale;
    let lbf_in = unit(Quantity::Torque, UnitSystem::Us).scale;
    let w = rad_per_rpm();
    let r4 = Tol::Rel(1e-4);
    // Hydraulic power: hp = psi·gpm/1714.29, kW = bar·(L/min)/600.
    let k1714 = hp / (psi * gpm);
    let k600 = kw / (bar * lpm);
    // Torque ↔ power: kW = N·m·rpm/9549.3, hp = lbf·in·rpm/63 025.
    let k9549 = kw / (nm * w);
    let k63025 = hp / (lbf_in * w);
    // Torque from flow and pressure: lbf·in = 36.77·gpm·psi/rpm (T = p·Q/ω).
    let k3677 = (psi * gpm / w) / lbf_in;
    // Cylinder speed: ft/s = 0.3208·gpm/in².
    let foot = 12.0 * INCH;
    let k03208 = gpm / (INCH * INCH) / foot;
    // Line velocity: m/s = 21.22·(L/min)/mm², ft/s = 0.4085·gpm/in².
    let k2122 = lpm / (PI / 4.0 * 1e-6);
    let k04085 = gpm / (PI / 4.0 * INCH * INCH) / foot;
    // Timed stroke: gpm = 0.2597·in²·in/s.
    let k02597 = INCH.powi(3) / gpm;
    // Heat: BTU/h per hp.
    let k2545 = hp / (BTU_IT / 3600.0);
    check(
        "brief §1 magic numbers",
        &[
            row("psi·gpm per hp (1714.29)", k1714, 1714.29, r4, D),
            row("bar·L/min per kW (600)", k600, 600.0, r4, D),
            row("N·m·rpm per kW (9549.3)", k9549, 9549.3, r4, S5),
            row("lbf·in·rpm per hp (63 025)", k63025, 63_025.0, r4, S5),
            // 36.77 is 63 025/1714, both rounded: the exact value is
            // 231/(2π) = 36.765, 1.4e-4 below it.
            row(
                "lbf·in·rpm per gpm·psi (36.77)",
                k3677,
                36.77,
                Tol::Rel(2e-4),
                S5,
            ),
            row(
                "exact 231/(2π)",
                k3677,
                231.0 / (2.0 * PI),
                Tol::Rel(1e-12),
                D,
            ),
            // Printed to four digits: within half a unit of the last one.
            row(
                "ft/s per gpm/in² (0.3208)",
                k03208,
                0.3208,
                Tol::Abs(5e-5),
                S5,
            ),
            row("exact 231/720", k03208, 231.0 / 720.0, Tol::Rel(1e-12), D),
            row(
                "m/s per (L/min)/mm² (21.22)",
                k2122,
                21.22,
                r4,
                "brief §1 [D][S-15]",
            ),
            row(
                "ft/s per gpm/in² (0.4085)",
                k04085,
                0.4085,
                r4,
                "brief §1 [D][S-15]",
            ),
            row(
                "gpm per in²·in/s (0.2597)",
                k02597,
                0.2597,
                Tol::Abs(5e-5),
                "brief §1 [D][S-2]",
            ),
            row("exact 60/231", k02597, 60.0 / 231.0, Tol::Rel(1e-12), D),
            // 2545 is rounded from 2544.43 (NIST hp and BTU_IT).
            row(
                "BTU/h per hp (2545)",
                k2545,
                2545.0,
                Tol::Rel(2.5e-4),
                "brief §1 [S-18]",
            ),
            row(
                "exact 1/1714.29: 1 psi × 1 gpm in hp",
                psi * gpm / hp,
                231.0 / (12.0 * 33_000.0),
                Tol::Rel(1e-9),
                "brief §1 implementation note [D]",
            ),
            row(
                "exact 1/600: 1 bar × 1 L/min in kW",
                bar * lpm / kw,
                1.0 / 600.0,
                Tol::Rel(1e-12),
                D,
            ),
            row(
                "1 bar in psi (14.5038)",
                BAR / PSI,
                14.5038,
                Tol::Rel(1e-5),
                D,
            ),
            row(
                "1 US gal in L (3.785 411 784)",
                US_GALLON / LITRE,
                3.785_411_784,
                Tol::Rel(1e-12),
                "brief §1 [M]; exact from 231 in³",
            ),
            row(
                "GPM helper = gpm display unit",
                GPM,
                gpm,
                Tol::Rel(1e-15),
                D,
            ),
            row("minute", MINUTE, 60.0, Tol::Abs(0.0), D),
        ],
    );
}

#[test]
fn display_round_trip_is_exact_enough() {
    // 1000 psi shown in bar and back, 20 gpm in L/min and back.
    let us = UnitSystem::Us;
    let si = UnitSystem::Metric;
    let p = from_display(Quantity::Pressure, us, 1000.0);
    let back = to_display(Quantity::Pressure, us, p);
    check(
        "display round trip",
        &[
            row(
                "1000 psi → Pa → psi",
                back,
                1000.0,
                Tol::Rel(1e-14),
                "identity",
            ),
            row(
                "1000 psi in bar (68.9476)",
                to_display(Quantity::Pressure, si, p),
                68.947_57,
                Tol::Rel(1e-6),
                NIST,
            ),
            row(
                "20 gpm in L/min (75.708)",
                to_display(Quantity::Flow, si, from_display(Quantity::Flow, us, 20.0)),
                75.708_24,
                Tol::Rel(1e-6),
                "231 in³/gal, [D]",
            ),
        ],
    );
}
