//! The results panel as rows of text with units: what the views show,
//! computed here so it can be tested natively. Pure, no web crates.

use kneepoint_engine::figures::Governing;
use kneepoint_engine::units::format;
use kneepoint_engine::{Design, Motion, Quantity, Report, UnitSystem};

use crate::chart::MotorLine;
use crate::motor::next_standard_rating;

/// One result: a stable key for tests, a label, the value with its unit,
/// and a line that says what it means.
#[derive(Clone, Debug, PartialEq)]
pub struct Row {
    /// Stable key (`data-testid` suffix).
    pub key: &'static str,
    /// Label for people.
    pub label: &'static str,
    /// Value with unit.
    pub value: String,
    /// What it means, or the condition it holds at.
    pub detail: String,
}

/// A pass or a fail of the settings check.
#[derive(Clone, Debug, PartialEq)]
pub struct Check {
    /// Stable key.
    pub key: &'static str,
    /// What is checked.
    pub label: &'static str,
    /// True when the design meets it.
    pub ok: bool,
    /// The numbers, in words.
    pub detail: String,
}

fn q(k: Quantity, u: UnitSystem, v: f64) -> String {
    format(k, u, v)
}

/// The motor line of the power chart: the entered rating, else the next
/// standard one above the peak corner.
pub fn motor_line(design: &Design, report: &Report, units: UnitSystem) -> MotorLine {
    match design.drive.motor_rating_w {
        Some(w) if w.is_finite() && w > 0.0 => MotorLine::Entered(w),
        _ => {
            let peak = report.corners.low_w.max(report.corners.high_w);
            next_standard_rating(peak, units)
                .map_or(MotorLine::None, MotorLine::Recommended)
        }
    }
}

/// The main results, in the order a practitioner reads them.
pub fn rows(design: &Design, report: &Report, units: UnitSystem) -> Vec<Row> {
    use Quantity::*;
    let mut out = Vec::new();
    let motion = |m: Motion| {
        report
            .motions
            .iter()
            .find(|r| r.motion == m)
            .map(|r| &r.result)
    };
    for (m, key, label) in [
        (Motion::Approach, "approach", "Approach"),
        (Motion::Pressing, "pressing", "Pressing at full force"),
        (Motion::Retract, "retract", "Retract"),
    ] {
        match motion(m) {
            Some(Ok(p)) => out.push(Row {
                key,
                label,
                value: q(Velocity, units, p.speed_ms),
                detail: format!(
                    "at {} ({}), {} to the cylinder",
                    q(Pressure, units, p.pump.pressure_pa),
                    p.pump.regime.label(),
                    q(Flow, units, p.cylinder_flow_m3s)
                ),
            }),
            Some(Err(e)) => out.push(Row {
                key,
                label,
                value: "not reachable".into(),
                detail: e.message(units),
            }),
            None => {}
        }
    }
    let s = &report.summary;
    out.push(Row {
        key: "max_force",
        label: "Maximum force",
        value: q(Force, units, s.max_extend_force_n),
        detail: format!(
            "extending at relief full flow; {} retracting",
            q(Force, units, s.max_retract_force_n)
        ),
    });
    let c = &report.corners;
    let gov = |g: Governing| {
        if c.governing == g {
            " — sizes the motor"
        } else {
            ""
        }
    };
    out.push(Row {
        key: "low_corner",
        label: "Low corner power",
        value: q(Power, units, c.low_w),
        detail: format!("both pumps, just before unloading{}", gov(Governing::Low)),
    });
    out.push(Row {
        key: "high_corner",
        label: "High corner power",
        value: q(Power, units, c.high_w),
        detail: format!("small pump at relief full flow{}", gov(Governing::High)),
    });
    out.push(Row {
        key: "equal_corner",
        label: "Equal-corner unloading pressure",
        value: q(Pressure, units, c.equal_corner_unloading_pa),
        detail: equal_corner_words(design, report, units),
    });
    let motor = match motor_line(design, report, units) {
        MotorLine::Entered(w) => Row {
            key: "motor",
            label: "Motor",
            value: q(Power, units, w),
            detail: "as entered".into(),
        },
        MotorLine::Recommended(w) => Row {
            key: "motor",
            label: "Motor",
            value: q(Power, units, w),
            detail: format!(
                "next standard {} rating above the peak corner",
                match units {
                    UnitSystem::Metric => "IEC kW",
                    UnitSystem::Us => "NEMA hp",
                }
            ),
        },
        MotorLine::None => Row {
            key: "motor",
            label: "Motor",
            value: "—".into(),
            detail: "the peak corner is above every listed standard rating".into(),
        },
    };
    out.push(motor);
    out.push(Row {
        key: "single_pump",
        label: "One fixed pump instead",
        value: q(Power, units, c.single_pump_w),
        detail: format!(
            "a single pump of the combined displacement at relief full flow, {:.1} × the peak corner",
            c.single_pump_w / c.low_w.max(c.high_w).max(1e-9)
        ),
    });
    out
}

/// What the equal-corner unloading pressure means for this design.
pub fn equal_corner_words(design: &Design, report: &Report, units: UnitSystem) -> String {
    use Quantity::*;
    let c = &report.corners;
    let p_u = design.unloading_valve.setting_pa;
    let p_star = c.equal_corner_unloading_pa;
    if p_star >= p_u {
        format!(
            "The unloading setting can rise by {} to {} without a bigger motor: up to there the \
             high corner ({}) still sizes it. Use that room as margin for the fast motions.",
            q(Pressure, units, p_star - p_u),
            q(Pressure, units, p_star),
            q(Power, units, c.high_w)
        )
    } else {
        let grow = if c.equal_corner_small_displacement_m3.is_finite() {
            format!(
                " Or keep the setting and let the small pump grow to {} ({}) for faster \
                 pressing at no extra peak power.",
                q(Displacement, units, c.equal_corner_small_displacement_m3),
                q(Flow, units, c.equal_corner_small_flow_m3s)
            )
        } else {
            String::new()
        };
        format!(
            "The unloading setting is {} above this: the low corner ({}) sizes the motor. \
             Lowering it to {} would need only {}, if the fast motions still fit under it.{grow}",
            q(Pressure, units, p_u - p_star),
            q(Power, units, c.low_w),
            q(Pressure, units, p_star),
            q(Power, units, c.high_w)
        )
    }
}

/// The settings check (brief §3.3 steps 1, 2 and 5) in words.
pub fn checks(design: &Design, report: &Report, units: UnitSystem) -> Vec<Check> {
    use Quantity::*;
    let s = &report.settings;
    let mut out = vec![Check {
        key: "unloading",
        label: "Unloading setting above the fast motions",
        ok: s.unloading_ok,
        detail: format!(
            "fast motions need up to {}; the margin rule (× {:.2}, and at least {} above) asks for \
             {} or more; set: {}",
            q(Pressure, units, s.fast_max_pa),
            s.unload_margin_factor,
            q(Pressure, units, s.unload_margin_min_pa),
            q(Pressure, units, s.min_unloading_pa),
            q(Pressure, units, design.unloading_valve.setting_pa)
        ),
    }];
    out.push(Check {
        key: "relief",
        label: "Relief cracking above pressing and the unloader",
        ok: s.relief_ok,
        detail: format!(
            "pressing needs {}; the margin rule asks for cracking at {} or more; set: {}",
            s.pressing_pa.map_or_else(
                || "more than the relief allows".into(),
                |p| q(Pressure, units, p)
            ),
            q(Pressure, units, s.min_relief_cracking_pa),
            q(Pressure, units, design.relief_valve.cracking_pa)
        ),
    });
    out
}

#[cfg(test)]
mod tests {
    use super::*;
    use kneepoint_engine::{evaluate, EXAMPLES};

    #[test]
    fn every_row_carries_a_unit_or_says_why_not() {
        for ex in EXAMPLES {
            let d = (ex.build)();
            let r = evaluate(&d).unwrap();
            for units in [UnitSystem::Metric, UnitSystem::Us] {
                let rows = rows(&d, &r, units);
                let keys: Vec<&str> = rows.iter().map(|r| r.key).collect();
                assert_eq!(
                    keys,
                    [
                        "approach",
                        "pressing",
                        "retract",
                        "max_force",
                        "low_corner",
                        "high_corner",
                        "equal_corner",
                        "motor",
                        "single_pump"
                    ]
                );
                let symbols: &[&str] = match units {
                    UnitSystem::Metric => &["mm/s", "kN", "kW", "bar"],
                    UnitSystem::Us => &["in/s", "lbf", "hp", "psi"],
                };
                for row in &rows {
                    assert!(
                        symbols.iter().any(|s| row.value.ends_with(s))
                            || row.value == "not reachable"
                            || row.value == "—",
                        "{}: {}",
                        row.key,
                        row.value
                    );
                }
            }
        }
    }

    #[test]
    fn equal_corner_words_follow_the_sign_of_the_margin() {
        let mut d = Design::default();
        let r = evaluate(&d).unwrap();
        let p_star = r.corners.equal_corner_unloading_pa;
        // Below the equal-corner value: room to rise.
        d.unloading_valve.setting_pa = 0.5 * p_star;
        let r = evaluate(&d).unwrap();
        assert!(equal_corner_words(&d, &r, UnitSystem::Metric)
            .starts_with("The unloading setting can rise"));
        // Above it: the low corner sizes the motor.
        d.unloading_valve.setting_pa =
            (1.3 * p_star).min(0.9 * d.relief_valve.cracking_pa);
        let r = evaluate(&d).unwrap();
        if r.corners.equal_corner_unloading_pa < d.unloading_valve.setting_pa {
            let w = equal_corner_words(&d, &r, UnitSystem::Us);
            assert!(w.contains("low corner"), "{w}");
            assert!(w.contains("psi"));
        }
    }

    #[test]
    fn entered_motor_wins_over_the_standard_size() {
        let mut d = Design::default();
        let r = evaluate(&d).unwrap();
        assert!(matches!(
            motor_line(&d, &r, UnitSystem::Metric),
            MotorLine::Recommended(_)
        ));
        d.drive.motor_rating_w = Some(5500.0);
        assert_eq!(
            motor_line(&d, &r, UnitSystem::Metric),
            MotorLine::Entered(5500.0)
        );
    }

    #[test]
    fn checks_say_pass_or_fail() {
        let d = Design::default();
        let r = evaluate(&d).unwrap();
        let c = checks(&d, &r, UnitSystem::Metric);
        assert_eq!(c.len(), 2);
        assert_eq!(c[0].ok, r.settings.unloading_ok);
        assert!(c[0].detail.contains("bar"));
    }
}
