//! The `kneepoint` binary, run as a user runs it.

use std::path::PathBuf;
use std::process::{Command, Output};

use kneepoint_engine::io::design_to_json;
use kneepoint_engine::Design;

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

/// A file in the temp directory, unique to this test and process.
fn file(name: &str, text: &str) -> PathBuf {
    let p =
        std::env::temp_dir().join(format!("kneepoint-cli-{}-{name}", std::process::id()));
    std::fs::write(&p, text).expect("temp file writable");
    p
}

fn demo_file(name: &str) -> PathBuf {
    file(name, &design_to_json(&Design::default()))
}

fn path(p: &std::path::Path) -> &str {
    p.to_str().expect("UTF-8 temp path")
}

#[test]
fn report_of_a_good_file() {
    let f = demo_file("good.json");
    let o = kneepoint(&["report", path(&f)]);
    assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));
    let out = stdout(&o);
    for needle in [
        "Operating points",
        "approach",
        "pressing",
        "retract",
        "both pumps",
        "small pump only",
        "Corner powers",
        "equal-corner unloading pressure",
        "Settings check",
        "× 1.25",
        "Warnings",
        "check valve sticks shut",
        "ISO 4413",
    ] {
        assert!(out.contains(needle), "missing '{needle}' in\n{out}");
    }
    assert!(out.contains(" bar") && out.contains("L/min") && out.contains("kW"));
    assert!(!out.contains("psi"));
}

#[test]
fn us_units_show_psi() {
    let f = demo_file("us.json");
    let o = kneepoint(&["report", path(&f), "--units", "us"]);
    assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));
    let out = stdout(&o);
    for needle in [" psi", " gpm", " in/s", " hp"] {
        assert!(out.contains(needle), "missing '{needle}' in\n{out}");
    }
    assert!(!out.contains(" bar"), "{out}");
}

#[test]
fn json_is_the_engine_report() {
    let f = demo_file("json.json");
    let o = kneepoint(&["report", path(&f), "--format=json"]);
    assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));
    let v: serde_json::Value = serde_json::from_str(&stdout(&o)).expect("valid JSON");
    let report = kneepoint_engine::evaluate(&Design::default()).expect("valid");
    let low = v["corners"]["low_w"].as_f64().expect("number");
    assert!((low - report.corners.low_w).abs() <= 1e-9 * low);
    assert_eq!(v["motions"].as_array().map(Vec::len), Some(3));
}

#[test]
fn csv_header_carries_units() {
    let f = demo_file("csv.json");
    for (units, header) in [
        (
            "metric",
            "pressure [bar],flow [L/min],extend speed [mm/s],shaft power [kW],single pump power [kW],regime",
        ),
        (
            "us",
            "pressure [psi],flow [gpm],extend speed [in/s],shaft power [hp],single pump power [hp],regime",
        ),
    ] {
        let o = kneepoint(&["report", path(&f), "--format", "csv", "--units", units]);
        assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));
        let out = stdout(&o);
        let mut lines = out.lines();
        assert_eq!(lines.next(), Some(header));
        let rows: Vec<&str> = lines.collect();
        let report = kneepoint_engine::evaluate(&Design::default()).expect("valid");
        assert_eq!(rows.len(), report.curves.points.len());
        for r in &rows {
            let cells: Vec<&str> = r.split(',').collect();
            assert_eq!(cells.len(), 6, "{r}");
            for c in &cells[..5] {
                c.parse::<f64>().unwrap_or_else(|_| panic!("'{c}' in '{r}'"));
            }
        }
        // Starts at zero pressure with both pumps; ends stalled at relief.
        assert!(rows[0].starts_with("0,") && rows[0].ends_with("both pumps"), "{}", rows[0]);
        assert!(rows.last().is_some_and(|r| r.ends_with("stalled at relief")));
    }
}

#[test]
fn malformed_file_gives_line_and_column_and_exit_2() {
    let good = design_to_json(&Design::default());
    let bad = good.replacen("\"speed_rpm\": 1450.0,", "\"speed_rpm\": 1450.0,,", 1);
    let line = good
        .lines()
        .position(|l| l.contains("speed_rpm"))
        .expect("present")
        + 1;
    let f = file("malformed.json", &bad);
    let o = kneepoint(&["report", path(&f)]);
    assert_eq!(o.status.code(), Some(2));
    let err = stderr(&o);
    assert!(err.contains(&format!("line {line}, column ")), "{err}");
    assert!(stdout(&o).is_empty());
}

#[test]
fn unknown_field_is_refused_with_exit_2() {
    let good = design_to_json(&Design::default());
    let f = file(
        "unknown.json",
        &good.replacen("\"stroke_m\"", "\"strok_m\"", 1),
    );
    let o = kneepoint(&["report", path(&f)]);
    assert_eq!(o.status.code(), Some(2));
    assert!(stderr(&o).contains("strok_m"), "{}", stderr(&o));
}

#[test]
fn invalid_design_lists_each_field_and_exits_1() {
    let mut d = Design::default();
    d.cylinder.rod_m = 0.2;
    d.large_pump.displacement_m3 = 0.0;
    let f = file("invalid.json", &design_to_json(&d));
    let o = kneepoint(&["report", path(&f), "--units", "us"]);
    assert_eq!(o.status.code(), Some(1));
    let err = stderr(&o);
    let lines: Vec<&str> = err.lines().collect();
    assert_eq!(lines.len(), 2, "{err}");
    assert!(lines
        .iter()
        .any(|l| l.contains("large_pump.displacement_m3: ")));
    let rod = lines
        .iter()
        .find(|l| l.contains("cylinder.rod_m: "))
        .expect("rod error");
    assert!(rod.contains(" in)"), "bore given in inches: {rod}");
    assert!(stdout(&o).is_empty());
}

#[test]
fn missing_file_exits_2() {
    let o = kneepoint(&["report", "/nonexistent/kneepoint/design.json"]);
    assert_eq!(o.status.code(), Some(2));
    assert!(stderr(&o).contains("cannot read"));
}

#[test]
fn examples_list_write_and_refuse() {
    let o = kneepoint(&["example"]);
    assert_eq!(o.status.code(), Some(0));
    let list = stdout(&o);
    for e in kneepoint_engine::EXAMPLES {
        assert!(list.contains(e.name), "{list}");
        let o = kneepoint(&["example", e.name]);
        assert_eq!(o.status.code(), Some(0));
        let d = kneepoint_engine::io::parse_design(&stdout(&o)).expect("example parses");
        assert_eq!(d, (e.build)());
    }
    let o = kneepoint(&["example", "steam-hammer"]);
    assert_eq!(o.status.code(), Some(2));
    let err = stderr(&o);
    assert!(
        err.contains("steam-hammer") && err.contains("workshop-press"),
        "{err}"
    );
}

#[test]
fn usage_errors_exit_2_and_help_exits_0() {
    assert_eq!(kneepoint(&[]).status.code(), Some(2));
    assert_eq!(kneepoint(&["report"]).status.code(), Some(2));
    assert_eq!(
        kneepoint(&["report", "x", "--units", "cubits"])
            .status
            .code(),
        Some(2)
    );
    let h = kneepoint(&["--help"]);
    assert_eq!(h.status.code(), Some(0));
    assert!(stdout(&h).contains("kneepoint report FILE"));
}
