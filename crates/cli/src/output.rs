//! The three output formats of `kneepoint report`.

use kneepoint_engine::cycle::{CycleError, CycleReport, RequirementKind};
use kneepoint_engine::figures::Governing;
use kneepoint_engine::motor::MotorSeries;
use kneepoint_engine::report::Report;
use kneepoint_engine::units::{format, to_display, unit, Quantity, UnitSystem};
use kneepoint_engine::Design;

/// Short caution printed under every text report.
const CAUTION: &str = "\
Estimates for design and teaching. Settings on a real machine are made by
competent persons with a gauge fitted, following the machine's instructions,
ISO 4413 and local codes. Lock out and bleed stored pressure before work;
never feel for leaks with hands (injection injury).";

fn fmt(q: Quantity, u: UnitSystem, si: f64) -> String {
    format(q, u, si)
}

/// Left-aligned columns, two spaces apart.
fn table(rows: &[Vec<String>]) -> String {
    let cols = rows.iter().map(Vec::len).max().unwrap_or(0);
    let widths: Vec<usize> = (0..cols)
        .map(|c| {
            rows.iter()
                .filter_map(|r| r.get(c))
                .map(|s| s.chars().count())
                .max()
                .unwrap_or(0)
        })
        .collect();
    let mut out = String::new();
    for r in rows {
        let mut line = String::from("  ");
        for (c, cell) in r.iter().enumerate() {
            line.push_str(cell);
            if c + 1 < r.len() {
                let pad = widths[c] - cell.chars().count() + 2;
                line.extend(std::iter::repeat_n(' ', pad));
            }
        }
        out.push_str(line.trim_end());
        out.push('\n');
    }
    out
}

fn ok(b: bool) -> &'static str {
    if b {
        "OK"
    } else {
        "TOO LOW"
    }
}

/// The human-readable report, with the duty cycle.
pub fn text(d: &Design, r: &Report, cycle: &CycleOutcome, u: UnitSystem) -> String {
    use Quantity::*;
    let mut out = String::new();
    let name = if d.name.is_empty() {
        "(unnamed)"
    } else {
        &d.name
    };
    out.push_str(&format!(
        "Kneepoint steady-state report: {name}\nUnits: {}\n\n",
        match u {
            UnitSystem::Metric => "metric (bar, L/min, mm/s, kW)",
            UnitSystem::Us => "US customary (psi, gpm, in/s, hp)",
        }
    ));

    out.push_str("Operating points\n");
    let mut rows = vec![vec![
        "motion".to_string(),
        "pressure".into(),
        "regime".into(),
        "flow".into(),
        "speed".into(),
        "shaft power".into(),
    ]];
    for m in &r.motions {
        match &m.result {
            Ok(mp) => rows.push(vec![
                m.motion.label().into(),
                fmt(Pressure, u, mp.pump.pressure_pa),
                mp.pump.regime.label().into(),
                fmt(Flow, u, mp.cylinder_flow_m3s),
                fmt(Velocity, u, mp.speed_ms),
                fmt(Power, u, mp.pump.shaft_power_w),
            ]),
            Err(e) => rows.push(vec![m.motion.label().into(), e.message(u)]),
        }
    }
    out.push_str(&table(&rows));

    let k = &r.corners;
    out.push_str("\nCorner powers (shaft)\n");
    let small = if k.equal_corner_small_displacement_m3.is_finite() {
        format!(
            "{} ({})",
            fmt(Displacement, u, k.equal_corner_small_displacement_m3),
            fmt(Flow, u, k.equal_corner_small_flow_m3s)
        )
    } else {
        "none: no small pump balances the corners".into()
    };
    out.push_str(&table(&[
        vec![
            "low corner, just before unloading".into(),
            fmt(Power, u, k.low_w),
        ],
        vec![
            "high corner, at relief full flow".into(),
            fmt(Power, u, k.high_w),
        ],
        vec![
            "governing (sizes the motor)".into(),
            match k.governing {
                Governing::Low => "low corner".into(),
                Governing::High => "high corner".into(),
            },
        ],
        vec![
            "equal-corner unloading pressure".into(),
            fmt(Pressure, u, k.equal_corner_unloading_pa),
        ],
        vec!["equal-corner small displacement".into(), small],
        vec![
            "single pump of both displacements".into(),
            fmt(Power, u, k.single_pump_w),
        ],
    ]));

    let s = &r.settings;
    let rules = &d.rules;
    let opt = |p: Option<f64>| p.map_or("not reachable".into(), |p| fmt(Pressure, u, p));
    let fast = fmt(Pressure, u, s.fast_max_pa);
    let uv = &d.unloading_valve;
    let open = uv.setting_pa * (1.0 + uv.band_fraction);
    let press = fmt(
        Pressure,
        u,
        s.pressing_pa
            .unwrap_or(d.loads.pressing_force_n / r.summary.cap_area_m2),
    );
    out.push_str("\nSettings check (margin rules, common practice)\n");
    out.push_str(&table(&[
        vec!["approach, both pumps".into(), opt(s.approach_fast_pa)],
        vec!["retract, both pumps".into(), opt(s.retract_fast_pa)],
        vec!["pressing".into(), opt(s.pressing_pa)],
    ]));
    out.push_str(&format!(
        "  unloading ≥ max({fast} × {:.2}, {fast} + {}) = {}; set {}: {}\n",
        s.unload_margin_factor,
        fmt(Pressure, u, s.unload_margin_min_pa),
        fmt(Pressure, u, s.min_unloading_pa),
        fmt(Pressure, u, uv.setting_pa),
        ok(s.unloading_ok),
    ));
    out.push_str(&format!(
        "  relief cracking ≥ max({press} × {:.2}, {press} + {}, unloader fully open {} + {}) = {}; set {}: {}\n",
        rules.relief_margin_factor,
        fmt(Pressure, u, rules.relief_margin_min_pa),
        fmt(Pressure, u, open),
        fmt(Pressure, u, kneepoint_engine::figures::UNLOADER_RELIEF_GAP_PA),
        fmt(Pressure, u, s.min_relief_cracking_pa),
        fmt(Pressure, u, d.relief_valve.cracking_pa),
        ok(s.relief_ok),
    ));
    out.push_str(&format!(
        "  relief: cracking {} and full flow {} are both entered; nameplate settings usually mean full flow\n",
        fmt(Pressure, u, d.relief_valve.cracking_pa),
        fmt(Pressure, u, d.relief_valve.full_flow_pa),
    ));

    out.push_str("\nWarnings\n");
    if r.warnings.is_empty() {
        out.push_str("  none\n");
    }
    for w in &r.warnings {
        out.push_str(&format!("  - {} [{}]\n", w.message(u), w.field));
    }

    // DUTY-CYCLE REPORT
    out.push_str(&cycle_text(cycle, u));

    out.push('\n');
    out.push_str(CAUTION);
    out.push('\n');
    out
}

/// The duty cycle of a design, or why it cannot run.
pub type CycleOutcome = Result<CycleReport, CycleError>;

/// The engine's full report as JSON (SI units; field names carry them),
/// with the duty cycle under `cycle` (or `cycle_error` when it cannot run).
pub fn json(r: &Report, cycle: &CycleOutcome) -> String {
    let mut v = serde_json::to_value(r).unwrap_or_default();
    if let Some(m) = v.as_object_mut() {
        let (key, c) = match cycle {
            Ok(c) => ("cycle", serde_json::to_value(c)),
            Err(e) => ("cycle_error", serde_json::to_value(e)),
        };
        m.insert(key.into(), c.unwrap_or_default());
    }
    serde_json::to_string_pretty(&v).unwrap_or_default() + "\n"
}

/// A number for CSV: six decimals at most, no trailing zeros.
fn num(v: f64) -> String {
    if v.is_finite() {
        let r = (v * 1e6).round() / 1e6;
        format!("{}", if r == 0.0 { 0.0 } else { r })
    } else {
        String::new()
    }
}

/// The curves as CSV, units in the header.
pub fn csv(r: &Report, u: UnitSystem) -> String {
    use Quantity::*;
    let sym = |q| unit(q, u).symbol;
    let mut out = format!(
        "pressure [{}],flow [{}],extend speed [{}],shaft power [{}],single pump power [{}],regime\n",
        sym(Pressure),
        sym(Flow),
        sym(Velocity),
        sym(Power),
        sym(Power)
    );
    for p in &r.curves.points {
        out.push_str(&format!(
            "{},{},{},{},{},{}\n",
            num(to_display(Pressure, u, p.pressure_pa)),
            num(to_display(Flow, u, p.flow_m3s)),
            num(to_display(Velocity, u, p.extend_speed_ms)),
            num(to_display(Power, u, p.shaft_power_w)),
            num(to_display(Power, u, p.single_pump_w)),
            p.regime.label()
        ));
    }
    out
}

/// The duty-cycle section of the text report.
fn cycle_text(cycle: &CycleOutcome, u: UnitSystem) -> String {
    use Quantity::*;
    let mut out = String::from("\nDuty cycle\n");
    let c = match cycle {
        Ok(c) => c,
        Err(e) => {
            out.push_str(&format!("  cannot run: {}\n", e.message(u)));
            return out;
        }
    };
    out.push_str(if c.profile_derived {
        "  profile derived from the loads (the design has none of its own)\n"
    } else {
        "  profile of the design\n"
    });
    let mut rows = vec![[
        "#",
        "segment",
        "time",
        "travel",
        "mean speed",
        "max pressure",
        "peak power",
        "RMS power",
        "energy in",
        "heat",
    ]
    .map(String::from)
    .to_vec()];
    for s in &c.segments {
        rows.push(vec![
            (s.index + 1).to_string(),
            s.label.into(),
            format!("{:.2} s", s.time_s),
            fmt(Length, u, s.distance_m),
            fmt(Velocity, u, s.mean_speed_ms),
            fmt(Pressure, u, s.pressure_max_pa),
            fmt(Power, u, s.peak_power_w),
            fmt(Power, u, s.rms_power_w),
            fmt(Energy, u, s.energy_in_j),
            fmt(Energy, u, s.heat.total()),
        ]);
    }
    out.push_str(&table(&rows));

    let t = &c.totals;
    out.push_str("\nCycle totals\n");
    out.push_str(&table(&[
        vec![
            "cycle time".into(),
            format!(
                "{:.2} s ({:.0} cycles per hour)",
                t.cycle_time_s, t.cycles_per_hour
            ),
        ],
        vec![
            "shaft power".into(),
            format!(
                "peak {}, RMS {}, mean {}",
                fmt(Power, u, t.peak_power_w),
                fmt(Power, u, t.rms_power_w),
                fmt(Power, u, t.mean_power_w)
            ),
        ],
        vec!["peak shaft torque".into(), fmt(Torque, u, t.peak_torque_nm)],
        vec![
            "highest pressure".into(),
            fmt(Pressure, u, t.pressure_max_pa),
        ],
        vec![
            "energy per cycle".into(),
            format!(
                "{} at the shaft, {} electrical, {} work on the load",
                fmt(Energy, u, t.energy_in_j),
                fmt(Energy, u, t.electrical_energy_j),
                fmt(Energy, u, t.work_out_j)
            ),
        ],
    ]));

    let m = &c.motor;
    let pct = |f: Option<f64>| f.map_or("-".into(), |f| format!("{:.0} %", 100.0 * f));
    out.push_str(&format!(
        "\nMotor ({} series; RMS margin {:.0} %, peak allowance {:.2} × rating)\n",
        match m.series {
            MotorSeries::Iec => "IEC kW",
            MotorSeries::Nema => "NEMA hp",
        },
        100.0 * m.margin_fraction,
        m.peak_allowance
    ));
    out.push_str(&table(&[
        vec![
            "smallest that passes".into(),
            match &m.recommended {
                Some(r) => format!(
                    "{} (needs at least {})",
                    r.label,
                    fmt(Power, u, m.minimum_w)
                ),
                None => {
                    format!("none in the series (needs {})", fmt(Power, u, m.minimum_w))
                }
            },
        ],
        vec![
            "rating checked".into(),
            m.checked_rating_w.map_or("-".into(), |w| {
                format!(
                    "{} ({})",
                    fmt(Power, u, w),
                    if m.checked_is_chosen {
                        "chosen"
                    } else {
                        "smallest that passes"
                    }
                )
            }),
        ],
        vec!["loading at peak".into(), pct(m.peak_loading)],
        vec!["loading on RMS".into(), pct(m.rms_loading)],
        vec![
            "electrical input".into(),
            format!(
                "mean {}, peak {} at {:.0} % efficiency",
                fmt(Power, u, m.electrical_mean_w),
                fmt(Power, u, m.electrical_peak_w),
                100.0 * m.motor_efficiency
            ),
        ],
    ]));

    let h = &c.heat;
    let per = |j: f64| {
        if t.cycle_time_s > 0.0 {
            fmt(Power, u, j / t.cycle_time_s)
        } else {
            "-".into()
        }
    };
    let est = |e: bool| if e { " (estimated)" } else { "" };
    out.push_str("\nHeat\n");
    out.push_str(&table(&[
        vec![
            "mean heat into the oil".into(),
            fmt(Power, u, h.mean_heat_w),
        ],
        vec!["  relief valve".into(), per(t.heat.relief_j)],
        vec!["  unloaded large pump".into(), per(t.heat.unloaded_j)],
        vec![
            "  valves, lines, released oil".into(),
            per(t.heat.valves_lines_j),
        ],
        vec!["  pump friction and leakage".into(), per(t.heat.pumps_j)],
        vec![
            "tank".into(),
            format!(
                "{}{}, {} wetted{}, U {}",
                fmt(Volume, u, h.oil_volume_m3),
                est(h.oil_volume_estimated),
                fmt(Area, u, h.wetted_area_m2),
                est(h.wetted_area_estimated),
                fmt(HeatTransfer, u, h.heat_transfer_w_m2k)
            ),
        ],
        vec![
            "steady oil temperature, no cooler".into(),
            format!(
                "{} ({} above ambient {}; allowed {})",
                fmt(Temperature, u, h.steady_oil_c),
                fmt(TemperatureRise, u, h.steady_rise_k),
                fmt(Temperature, u, h.ambient_c),
                fmt(Temperature, u, h.max_oil_c)
            ),
        ],
        vec![
            "time constant".into(),
            format!(
                "{:.0} s ({:.0} min)",
                h.time_constant_s,
                h.time_constant_s / 60.0
            ),
        ],
        vec![
            "cooler needed".into(),
            if h.cooler_w > 0.0 {
                fmt(Power, u, h.cooler_w)
            } else {
                "none".into()
            },
        ],
    ]));

    out.push_str("\nTargets\n");
    if c.requirements.is_empty() {
        out.push_str("  none set\n");
    }
    for q in &c.requirements {
        let (name, qty, at_least) = match q.kind {
            RequirementKind::ApproachSpeed => ("mean approach speed", Velocity, true),
            RequirementKind::PressingSpeed => ("mean pressing speed", Velocity, true),
            _ => ("cycle time", Time, false),
        };
        let got = q
            .achieved
            .map_or("no such segment".into(), |a| fmt(qty, u, a));
        let margin = q
            .margin
            .map_or(String::new(), |m| format!(", margin {:+.0} %", 100.0 * m));
        out.push_str(&format!(
            "  {}: {name} {got}, needed {} {}{margin}\n",
            if q.met { "MET" } else { "MISSED" },
            if at_least { "at least" } else { "at most" },
            fmt(qty, u, q.required),
        ));
        if let Some(f) = q.fix {
            out.push_str(&format!("    {} [{}]\n", f.message(u), f.field()));
        } else if !q.met {
            out.push_str("    no single pump change up to 16 times its size meets it\n");
        }
    }

    out.push_str("\nCycle warnings\n");
    if c.warnings.is_empty() {
        out.push_str("  none\n");
    }
    for w in &c.warnings {
        let seg = w
            .segment
            .map_or(String::new(), |i| format!("segment {}: ", i + 1));
        out.push_str(&format!("  - {seg}{} [{}]\n", w.message(u), w.field));
    }
    out
}

/// The cycle's time series as CSV, units in the header.
pub fn series_csv(c: &CycleReport, u: UnitSystem) -> String {
    use Quantity::*;
    let sym = |q| unit(q, u).symbol;
    let mut out = format!(
        "time [s],position [{}],speed [{}],pressure [{}],cylinder pressure [{}],flow [{}],shaft power [{}],regime,segment\n",
        sym(Length),
        sym(Velocity),
        sym(Pressure),
        sym(Pressure),
        sym(Flow),
        sym(Power)
    );
    for s in &c.samples {
        let seg = c.segments.get(s.segment).map_or("", |g| g.label);
        out.push_str(&format!(
            "{},{},{},{},{},{},{},{},{} {}\n",
            num(s.t_s),
            num(to_display(Length, u, s.x_m)),
            num(to_display(Velocity, u, s.v_ms)),
            num(to_display(Pressure, u, s.p_pa)),
            num(to_display(Pressure, u, s.chamber_pa)),
            num(to_display(Flow, u, s.q_m3s)),
            num(to_display(Power, u, s.power_w)),
            s.regime.label(),
            s.segment + 1,
            seg
        ));
    }
    out
}
