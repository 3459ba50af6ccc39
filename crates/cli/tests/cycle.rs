//! The duty cycle in `kneepoint report`: text section, JSON member and the
//! time-series CSV, run as a user runs the binary.

use std::path::PathBuf;
use std::process::{Command, Output};

use kneepoint_engine::cycle::{evaluate_cycle, PressingForce, Segment};
use kneepoint_engine::io::design_to_json;
use kneepoint_engine::{Circuit, Design};

fn kneepoint(args: &[&str]) -> Output {
    Command::new(env!("CARGO_BIN_EXE_kneepoint"))
        .args(args)
        .output()
        .expect("binary runs")
}

fn stdout(o: &Output) -> String {
    String::from_utf8(o.stdout.clone()).expect("UTF-8 output")
}

fn stderr(o: &Output) -> String {
    String::from_utf8(o.stderr.clone()).expect("UTF-8 output")
}

/// A design file in the temp directory, unique to this test and process.
fn file(name: &str, d: &Design) -> PathBuf {
    let p = std::env::temp_dir()
        .join(format!("kneepoint-cli-cycle-{}-{name}", std::process::id()));
    std::fs::write(&p, design_to_json(d)).expect("temp file writable");
    p
}

fn path(p: &std::path::Path) -> &str {
    p.to_str().expect("UTF-8 temp path")
}

/// The demo press with a pressing force no relief setting of it reaches.
fn stalling() -> Design {
    let mut d = Design::default();
    for s in &mut d.cycle.segments {
        if let Segment::Pressing { force, .. } = s {
            *force = PressingForce::Constant { force_n: 5.0e6 };
        }
    }
    d
}

#[test]
fn text_report_has_every_cycle_part() {
    let d = Design::default();
    let r = evaluate_cycle(&Circuit::new(&d).expect("valid")).expect("runs");
    let f = file("text.json", &d);
    let o = kneepoint(&["report", path(&f)]);
    assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));
    let out = stdout(&o);
    let cycle = &out[out.find("\nDuty cycle\n").expect("a cycle section")..];
    for needle in [
        "profile of the design",
        "Cycle totals",
        "Motor (IEC kW series",
        "loading at peak",
        "electrical input",
        "Heat",
        "steady oil temperature",
        "Targets",
        "Cycle warnings",
    ] {
        assert!(cycle.contains(needle), "missing '{needle}' in\n{cycle}");
    }
    // One table row per segment, numbered, with its kind.
    for s in &r.segments {
        let row = format!("  {}  {}", s.index + 1, s.label);
        assert!(cycle.contains(&row), "missing '{row}' in\n{cycle}");
    }
    assert!(cycle.contains(&format!("{:.2} s (", r.totals.cycle_time_s)));
    let rec = r.motor.recommended.as_ref().expect("a standard size fits");
    assert!(
        cycle.contains(&format!("smallest that passes  {}", rec.label)),
        "{cycle}"
    );
    // The demo sets three targets: each is reported met or missed.
    let verdicts = cycle.matches("  MET: ").count() + cycle.matches("  MISSED: ").count();
    assert_eq!(verdicts, r.requirements.len());
    assert_eq!(r.requirements.len(), 3);
}

#[test]
fn a_design_without_profile_says_it_is_derived() {
    let mut d = Design::default();
    d.cycle.segments.clear();
    let f = file("derived.json", &d);
    let o = kneepoint(&["report", path(&f), "--units", "us"]);
    assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));
    let out = stdout(&o);
    assert!(out.contains("profile derived from the loads"), "{out}");
    assert!(out.contains("dwell") && out.contains("idle"));
}

#[test]
fn json_carries_the_cycle_report() {
    let d = Design::default();
    let r = evaluate_cycle(&Circuit::new(&d).expect("valid")).expect("runs");
    let f = file("json.json", &d);
    let o = kneepoint(&["report", path(&f), "--format", "json"]);
    assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));
    let v: serde_json::Value = serde_json::from_str(&stdout(&o)).expect("valid JSON");
    // The steady-state report is still at the top level.
    assert!(v["corners"]["low_w"].is_number());
    let c = &v["cycle"];
    let t = c["totals"]["cycle_time_s"].as_f64().expect("number");
    assert!((t - r.totals.cycle_time_s).abs() <= 1e-12 * t, "{t}");
    assert_eq!(
        c["segments"].as_array().map(Vec::len),
        Some(r.segments.len())
    );
    assert_eq!(c["samples"].as_array().map(Vec::len), Some(r.samples.len()));
    assert!(c["motor"]["rms_loading"].is_number());
    assert!(c["heat"]["steady_oil_c"].is_number());
    assert!(v.get("cycle_error").is_none());
}

#[test]
fn series_csv_has_units_and_every_sample() {
    let d = Design::default();
    let r = evaluate_cycle(&Circuit::new(&d).expect("valid")).expect("runs");
    let f = file("series.json", &d);
    let mut tables = Vec::new();
    for (units, header) in [
        (
            "metric",
            "time [s],position [mm],speed [mm/s],pressure [bar],cylinder pressure [bar],flow [L/min],shaft power [kW],regime,segment",
        ),
        (
            "us",
            "time [s],position [in],speed [in/s],pressure [psi],cylinder pressure [psi],flow [gpm],shaft power [hp],regime,segment",
        ),
    ] {
        let o = kneepoint(&[
            "report",
            path(&f),
            "--format",
            "csv",
            "--series",
            "--units",
            units,
        ]);
        assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));
        let out = stdout(&o);
        let mut lines = out.lines();
        assert_eq!(lines.next(), Some(header));
        let rows: Vec<Vec<String>> = lines
            .map(|l| l.split(',').map(String::from).collect())
            .collect();
        assert_eq!(rows.len(), r.samples.len());
        for row in &rows {
            assert_eq!(row.len(), 9, "{row:?}");
            for c in &row[..7] {
                c.parse::<f64>().unwrap_or_else(|_| panic!("'{c}' in {row:?}"));
            }
        }
        tables.push(rows);
    }
    let col = |rows: &[Vec<String>], i: usize| -> Vec<f64> {
        rows.iter().map(|r| r[i].parse().expect("number")).collect()
    };
    let (metric, us) = (&tables[0], &tables[1]);
    // Time never runs backwards and ends at the cycle time.
    let t = col(metric, 0);
    assert!(t.windows(2).all(|w| w[1] >= w[0]));
    assert!((t[t.len() - 1] - r.totals.cycle_time_s).abs() < 1e-5);
    // The piston reaches the design's 400 mm stroke (design data).
    let x = col(metric, 1);
    let top = x.iter().copied().fold(0.0, f64::max);
    assert!((top - d.cylinder.stroke_m * 1e3).abs() < 1e-3, "{top}");
    // 1 in = 25.4 mm exactly (NIST SP 811 B.8); 1 bar = 14.5038 psi.
    for (m, u) in col(metric, 1).iter().zip(col(us, 1)) {
        assert!((m / 25.4 - u).abs() < 2e-6, "{m} mm vs {u} in");
    }
    for (m, u) in col(metric, 3).iter().zip(col(us, 3)) {
        assert!(
            (m * 14.503_773_773 - u).abs() < 1e-4 * u.max(1.0),
            "{m} bar vs {u} psi"
        );
    }
    assert!(metric[0][8].starts_with("1 "), "{:?}", metric[0]);
}

#[test]
fn a_stalling_profile_is_reported_not_fatal() {
    let f = file("stall.json", &stalling());
    let o = kneepoint(&["report", path(&f)]);
    assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));
    let out = stdout(&o);
    assert!(out.contains("cannot run: Force not reachable"), "{out}");
    assert!(
        out.contains("Operating points"),
        "the steady-state part stays"
    );

    let o = kneepoint(&["report", path(&f), "--format", "json"]);
    assert_eq!(o.status.code(), Some(0));
    let v: serde_json::Value = serde_json::from_str(&stdout(&o)).expect("valid JSON");
    assert_eq!(v["cycle_error"]["kind"], "force_not_reachable");
    assert_eq!(v["cycle_error"]["segment"], 1);
    assert!(v.get("cycle").is_none());

    let o = kneepoint(&["report", path(&f), "--format", "csv", "--series"]);
    assert_eq!(o.status.code(), Some(1));
    assert!(stderr(&o).contains("cannot run"), "{}", stderr(&o));
    assert!(stdout(&o).is_empty());
}

#[test]
fn series_needs_csv() {
    let f = file("usage.json", &Design::default());
    let o = kneepoint(&["report", path(&f), "--series"]);
    assert_eq!(o.status.code(), Some(2));
    assert!(stderr(&o).contains("--series goes with --format csv"));
}
