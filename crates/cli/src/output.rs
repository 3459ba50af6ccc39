//! The three output formats of `kneepoint report`.

use kneepoint_engine::figures::Governing;
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

/// The human-readable report.
pub fn text(d: &Design, r: &Report, u: UnitSystem) -> String {
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

    // DUTY-CYCLE REPORT: the duty-cycle section (cycle time, peak and RMS
    // shaft power, motor choice, heat) goes here, from
    // `kneepoint_engine::cycle`, when the CLI is wired to it.

    out.push('\n');
    out.push_str(CAUTION);
    out.push('\n');
    out
}

/// The engine's full report as JSON (SI units; field names carry them).
pub fn json(r: &Report) -> String {
    serde_json::to_string_pretty(r).unwrap_or_default() + "\n"
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
