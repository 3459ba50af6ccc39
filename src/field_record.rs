//! Machine-check records kept on this device: what was read at a machine,
//! when, against which design, and what the check found. Each record is
//! stored under its own key (`kneepoint.record.<id>`) as JSON, so one
//! damaged record never hides the others. Pure, no web crates.

use kneepoint_engine::field::{reading_label, BackCalc, Diagnosis, Readings};
use kneepoint_engine::units::format;
use kneepoint_engine::UnitSystem;
use serde::{Deserialize, Serialize};

use crate::field_form::{Form, INPUTS};

/// Version of the record format written here.
pub const RECORD_FORMAT: u32 = 1;
/// Prefix of every record's key in local storage.
pub const RECORD_PREFIX: &str = "kneepoint.record.";
/// Key of the form being filled in (kept across reloads).
pub const DRAFT_KEY: &str = "kneepoint.field.draft";
/// Longest machine label (characters).
pub const MAX_LABEL: usize = 80;
/// Longest stored record read (bytes); a longer one is skipped unread.
pub const MAX_RECORD_BYTES: usize = 256 * 1024;

/// One finding as recorded.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RecordFinding {
    /// The likely cause.
    pub title: String,
    /// Its score, 0 ..= 1.
    pub score: f64,
    /// The evidence, in words, in the record's units.
    pub evidence: Vec<String>,
    /// What to check next.
    pub next_check: String,
}

/// A machine-check record.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct FieldRecord {
    /// Record format version ([`RECORD_FORMAT`]).
    pub format: u32,
    /// Its key in storage after [`RECORD_PREFIX`].
    pub id: String,
    /// When it was taken, as the device's local date and time
    /// (`2025-03-14 09:30`).
    pub taken_at: String,
    /// The machine, as the person labelled it.
    pub machine: String,
    /// Name of the design it was compared with.
    pub design_name: String,
    /// The link fragment of that design (opens it exactly).
    pub design_link: String,
    /// Units the record was written in.
    pub units: UnitSystem,
    /// The readings (SI).
    pub readings: Readings,
    /// The overall answer, in words.
    pub verdict: String,
    /// The likely causes, most likely first.
    pub findings: Vec<RecordFinding>,
}

/// One stored record, read.
#[derive(Clone, Debug, PartialEq)]
pub enum Stored {
    /// A readable record.
    Record(Box<FieldRecord>),
    /// A record that could not be read: reported, skipped, left in place.
    Broken {
        /// Its id (the key after the prefix).
        id: String,
        /// Why it could not be read.
        reason: String,
    },
}

impl Stored {
    /// The id of the entry.
    pub fn id(&self) -> &str {
        match self {
            Stored::Record(r) => &r.id,
            Stored::Broken { id, .. } => id,
        }
    }
}

/// A machine label as it will be stored: trimmed, no control characters,
/// at most [`MAX_LABEL`] characters. A blank label is "unnamed machine".
///
/// # Errors
/// What is wrong with the label, for people.
pub fn clean_label(raw: &str) -> Result<String, String> {
    let n = raw.trim();
    if n.chars().any(char::is_control) {
        return Err("A machine label cannot hold line breaks or tabs.".into());
    }
    if n.chars().count() > MAX_LABEL {
        return Err(format!(
            "A machine label can have at most {MAX_LABEL} characters."
        ));
    }
    Ok(if n.is_empty() {
        "unnamed machine".into()
    } else {
        n.to_string()
    })
}

/// The id of a record taken at `ms` milliseconds since 1970 (its key
/// suffix): sorts by time.
pub fn record_id(ms: f64) -> String {
    format!("{:015}", ms.max(0.0).floor() as u64)
}

/// Builds the record of a check.
#[allow(clippy::too_many_arguments)]
pub fn make_record(
    id: String,
    taken_at: String,
    machine: String,
    design_name: String,
    design_link: String,
    units: UnitSystem,
    readings: Readings,
    diagnosis: &Diagnosis,
) -> FieldRecord {
    FieldRecord {
        format: RECORD_FORMAT,
        id,
        taken_at,
        machine,
        design_name,
        design_link,
        units,
        readings,
        verdict: diagnosis.summary(units),
        findings: diagnosis
            .findings
            .iter()
            .map(|f| RecordFinding {
                title: f.title.to_string(),
                score: f.score,
                evidence: f.evidence.iter().map(|e| e.message(units)).collect(),
                next_check: f.next_check.to_string(),
            })
            .collect(),
    }
}

/// The stored text of a record.
pub fn record_text(r: &FieldRecord) -> String {
    serde_json::to_string(r).unwrap_or_default()
}

/// Reads the record stored under `id`; `text` is `None` when the key
/// vanished. A record that is not JSON, not this format, or holds values
/// no check could have written is [`Stored::Broken`].
pub fn read_record(id: &str, text: Option<&str>) -> Stored {
    let broken = |reason: String| Stored::Broken {
        id: id.to_string(),
        reason,
    };
    let Some(text) = text else {
        return broken("the entry is empty".into());
    };
    if text.len() > MAX_RECORD_BYTES {
        return broken("it is too large to be a record".into());
    }
    let v: serde_json::Value = match serde_json::from_str(text) {
        Ok(v) => v,
        Err(e) => return broken(format!("it is not readable JSON: {e}")),
    };
    match v.get("format").and_then(serde_json::Value::as_u64) {
        Some(f) if f == u64::from(RECORD_FORMAT) => {}
        Some(f) => {
            return broken(format!(
                "it is record format {f}; this version reads format {RECORD_FORMAT}"
            ))
        }
        None => return broken("it has no record format".into()),
    }
    let r: FieldRecord = match serde_json::from_value(v) {
        Ok(r) => r,
        Err(e) => return broken(format!("it is damaged: {e}")),
    };
    if r.id != id {
        return broken("its id does not match its key".into());
    }
    if let Err(e) = clean_label(&r.machine) {
        return broken(e);
    }
    if r.findings.iter().any(|f| !(0.0..=1.0).contains(&f.score)) {
        return broken("a finding's score is out of range".into());
    }
    Stored::Record(Box::new(r))
}

/// The readings of a record as `(label, value with unit)` rows, in form
/// order, in `units`.
pub fn reading_rows(r: &Readings, units: UnitSystem) -> Vec<(String, String)> {
    let f = Form::from_readings(r, UnitSystem::Metric);
    let p = f.parse();
    let mut rows = Vec::new();
    for s in INPUTS {
        if !f.texts.contains_key(s.path) {
            continue;
        }
        let si = si_of(&p.readings, s.path);
        if let Some(v) = si {
            let label = match s.gauge {
                Some(g) => format!("{} ({g})", reading_label(s.path)),
                None => reading_label(s.path).to_string(),
            };
            rows.push((label, format(s.quantity, units, v)));
        }
    }
    let yes_no = |b: bool| if b { "yes" } else { "no" }.to_string();
    if let Some(b) = r.speed_change_seen {
        rows.push((reading_label("speed_change_seen").into(), yes_no(b)));
    }
    if let Some(b) = r.approach_speed_alternates {
        rows.push((reading_label("approach_speed_alternates").into(), yes_no(b)));
    }
    if let Some(m) = r.motor {
        rows.push(("motor current read during".into(), m.during.label().into()));
    }
    rows
}

/// The SI value of the reading at `path`.
fn si_of(r: &Readings, path: &str) -> Option<f64> {
    let st = |s: &Option<kneepoint_engine::field::TimedStroke>, leaf: &str| {
        s.and_then(|s| match leaf {
            "distance_m" => Some(s.distance_m),
            "time_s" => Some(s.time_s),
            _ => s.system_pa,
        })
    };
    let (head, leaf) = path.split_once('.').unwrap_or((path, ""));
    match head {
        "fast_stroke" => st(&r.fast_stroke, leaf),
        "slow_stroke" => st(&r.slow_stroke, leaf),
        "second_slow_stroke" => st(&r.second_slow_stroke, leaf),
        "system_approach_pa" => r.system_approach_pa,
        "unloading_observed_pa" => r.unloading_observed_pa,
        "stall_pa" => r.stall_pa,
        "large_outlet_approach_pa" => r.large_outlet_approach_pa,
        "large_outlet_pressing_pa" => r.large_outlet_pressing_pa,
        "unloader_tank_flow_pressing_m3s" => r.unloader_tank_flow_pressing_m3s,
        "large_flow_test" | "small_flow_test" => {
            let t = if head == "large_flow_test" {
                r.large_flow_test
            } else {
                r.small_flow_test
            };
            t.map(|t| {
                if leaf == "flow_m3s" {
                    t.flow_m3s
                } else {
                    t.pressure_pa
                }
            })
        }
        "oil_temperature_c" => r.oil_temperature_c,
        "shaft_speed_rpm" => r.shaft_speed_rpm,
        "motor" => r.motor.and_then(|m| match leaf {
            "current_a" => Some(m.current_a),
            "voltage_v" => Some(m.voltage_v),
            "power_factor" => Some(m.power_factor),
            _ => m.efficiency,
        }),
        _ => None,
    }
}

/// The record as plain text, to share by message or e-mail.
pub fn record_as_text(r: &FieldRecord) -> String {
    let mut s = format!(
        "Kneepoint machine check\nMachine: {}\nTaken: {}\nCompared with the design: {}\n\nReadings\n",
        r.machine, r.taken_at, r.design_name
    );
    let rows = reading_rows(&r.readings, r.units);
    if rows.is_empty() {
        s.push_str("  (none)\n");
    }
    for (label, v) in rows {
        s.push_str(&format!("  {label}: {v}\n"));
    }
    s.push_str(&format!("\nResult: {}\n", r.verdict));
    for (i, f) in r.findings.iter().enumerate() {
        s.push_str(&format!("{}. {} (score {:.2})\n", i + 1, f.title, f.score));
        for e in &f.evidence {
            s.push_str(&format!("   - {e}\n"));
        }
        s.push_str(&format!("   Next: {}\n", f.next_check));
    }
    s.push_str(
        "\nEstimates for setting-up and teaching. Lock out, bleed down and verify zero on a gauge \
         before opening any fitting; ISO 4413, local codes and licensed practice come first.\n",
    );
    s
}

/// A short line for the list of records.
pub fn record_line(r: &FieldRecord) -> String {
    let head = match r.findings.first() {
        Some(f) => f.title.clone(),
        None => r.verdict.clone(),
    };
    format!("{} · {} · {}", r.taken_at, r.machine, head)
}

/// One back-calculated figure beside the design's.
#[derive(Clone, Debug, PartialEq)]
pub struct CalcRow {
    /// Stable name (`data-calc`), for tests.
    pub id: &'static str,
    /// What it is.
    pub label: &'static str,
    /// Found at the machine, with unit.
    pub measured: String,
    /// What the design expects there, with unit.
    pub expected: String,
}

/// The back-calculation (brief §8.2) as rows, in `units`; rows whose
/// readings are missing are left out.
pub fn calc_rows(b: &BackCalc, units: UnitSystem) -> Vec<CalcRow> {
    use kneepoint_engine::Quantity::{Flow, Percent, Power, Pressure};
    let mut rows = Vec::new();
    let mut row = |id, label, q, m: Option<f64>, e: f64| {
        if let Some(m) = m.filter(|m| m.is_finite()) {
            rows.push(CalcRow {
                id,
                label,
                measured: format(q, units, m),
                expected: format(q, units, e),
            });
        }
    };
    row(
        "fast",
        "Fast-phase flow, both pumps (A·s/t)",
        Flow,
        b.fast_flow_m3s,
        b.fast_expected_m3s,
    );
    row(
        "slow",
        "Slow-phase flow, small pump (A·s/t)",
        Flow,
        b.slow_flow_m3s,
        b.slow_expected_m3s,
    );
    row(
        "large",
        "Large pump's share (fast − slow)",
        Flow,
        b.large_flow_m3s,
        b.fast_expected_m3s - b.slow_expected_m3s,
    );
    row(
        "eta-large",
        "Large pump volumetric efficiency",
        Percent,
        b.large_volumetric_efficiency,
        b.large_expected_efficiency,
    );
    row(
        "eta-small",
        "Small pump volumetric efficiency",
        Percent,
        b.small_volumetric_efficiency,
        b.small_expected_efficiency,
    );
    for (id, label, t) in [
        (
            "test-large",
            "Large pump alone on the meter",
            b.large_flow_test,
        ),
        (
            "test-small",
            "Small pump alone on the meter",
            b.small_flow_test,
        ),
    ] {
        if let Some(t) = t {
            row(id, label, Flow, Some(t.flow_m3s), t.expected_m3s);
        }
    }
    if let Some(u) = b.unloading {
        row(
            "unloading",
            "Speed drops at (unloading point)",
            Pressure,
            Some(u.observed_pa),
            u.design_pa,
        );
    }
    if let Some(r) = b.relief {
        row(
            "relief",
            "Stall pressure (relief full flow)",
            Pressure,
            Some(r.observed_pa),
            r.design_pa,
        );
    }
    if let Some(m) = b.motor {
        row(
            "motor",
            "Motor shaft power",
            Power,
            Some(m.shaft_w),
            m.expected_shaft_w,
        );
    }
    rows
}

/// The form being filled in, kept on the device across reloads.
#[derive(Clone, Debug, Default, PartialEq, Serialize, Deserialize)]
#[serde(default)]
pub struct Draft {
    /// What is entered.
    pub form: Form,
    /// The machine label typed.
    pub machine: String,
}

/// Reads the stored draft; damaged text gives an empty draft and says why.
pub fn read_draft(text: Option<&str>) -> (Draft, Option<String>) {
    match text {
        None => (Draft::default(), None),
        Some(t) if t.len() > MAX_RECORD_BYTES => (
            Draft::default(),
            Some("the readings kept from last time were too large to read".into()),
        ),
        Some(t) => match serde_json::from_str::<Draft>(t) {
            Ok(d) => (d, None),
            Err(e) => (
                Draft::default(),
                Some(format!(
                    "the readings kept from last time were damaged ({e})"
                )),
            ),
        },
    }
}

/// The stored text of a draft.
pub fn draft_text(d: &Draft) -> String {
    serde_json::to_string(d).unwrap_or_default()
}

#[cfg(test)]
mod tests {
    use super::*;
    use kneepoint_engine::field::{diagnose, synthesize_readings};
    use kneepoint_engine::{Circuit, Design};

    fn sample(id: &str) -> FieldRecord {
        let mut d = Design::default();
        d.faults.large_volumetric_efficiency = Some(0.6);
        let c = Circuit::new(&d).unwrap();
        let r = synthesize_readings(&c);
        let diag = diagnose(&c, &r).unwrap();
        make_record(
            id.into(),
            "2025-03-14 09:30".into(),
            "Press 3, bay 2".into(),
            d.name.clone(),
            "v=1&u=metric&base=workshop-press".into(),
            UnitSystem::Metric,
            r,
            &diag,
        )
    }

    #[test]
    fn a_record_reads_back_exactly() {
        let r = sample("000001700000000");
        assert!(!r.findings.is_empty(), "the worn pump is found");
        let t = record_text(&r);
        assert_eq!(read_record(&r.id, Some(&t)), Stored::Record(Box::new(r)));
    }

    #[test]
    fn damaged_records_are_broken_with_a_reason() {
        let good = record_text(&sample("1"));
        let cases: Vec<(String, &str)> = vec![
            ("{not json".into(), "not readable JSON"),
            ("[]".into(), "no record format"),
            (good.replace("\"format\":1", "\"format\":9"), "format 9"),
            (good.replace("\"machine\"", "\"machina\""), "damaged"),
            (
                good.replace("\"Press 3, bay 2\"", "\"a\\nb\""),
                "line breaks",
            ),
            (
                good.replace("\"id\":\"1\"", "\"id\":\"2\""),
                "does not match",
            ),
            ("x".repeat(MAX_RECORD_BYTES + 1), "too large"),
        ];
        for (text, why) in cases {
            match read_record("1", Some(&text)) {
                Stored::Broken { id, reason } => {
                    assert_eq!(id, "1");
                    assert!(reason.contains(why), "{reason:?} should say {why:?}");
                }
                Stored::Record(_) => panic!("{text:.60} was read"),
            }
        }
        assert!(matches!(read_record("1", None), Stored::Broken { .. }));
        // A score out of range cannot come from a check.
        let mut r = sample("1");
        r.findings[0].score = 3.0;
        assert!(matches!(
            read_record("1", Some(&record_text(&r))),
            Stored::Broken { .. }
        ));
    }

    #[test]
    fn labels_are_cleaned() {
        assert_eq!(clean_label("  Baler 7 "), Ok("Baler 7".into()));
        assert_eq!(clean_label(""), Ok("unnamed machine".into()));
        assert!(clean_label("a\tb").is_err());
        assert!(clean_label(&"x".repeat(MAX_LABEL + 1)).is_err());
    }

    #[test]
    fn the_text_names_machine_readings_and_findings_with_units() {
        let r = sample("1");
        let t = record_as_text(&r);
        assert!(t.contains("Machine: Press 3, bay 2"));
        assert!(t.contains("fast-phase time: "), "{t}");
        assert!(t.contains(" bar"), "{t}");
        assert!(t.contains(" L/min"), "{t}");
        assert!(t.contains(&format!("1. {}", r.findings[0].title)));
        assert!(t.contains("ISO 4413"));
        let us = FieldRecord {
            units: UnitSystem::Us,
            ..r
        };
        assert!(record_as_text(&us).contains(" psi"));
    }

    #[test]
    fn ids_sort_by_time() {
        assert!(record_id(9.0e11) < record_id(1.7e12));
        assert_eq!(record_id(1.0).len(), 15);
    }

    #[test]
    fn calc_rows_show_what_was_read() {
        let r = sample("1");
        let c = Circuit::new(&Design::default()).unwrap();
        let d = diagnose(&c, &r.readings).unwrap();
        let rows = calc_rows(&d.back_calc, UnitSystem::Metric);
        let ids: Vec<_> = rows.iter().map(|r| r.id).collect();
        for id in [
            "fast",
            "slow",
            "large",
            "eta-large",
            "eta-small",
            "test-large",
            "relief",
            "motor",
        ] {
            assert!(ids.contains(&id), "{id} in {ids:?}");
        }
        assert!(rows[0].measured.ends_with(" L/min"));
        let d = diagnose(&c, &Readings::default()).unwrap();
        assert!(calc_rows(&d.back_calc, UnitSystem::Metric).is_empty());
    }

    #[test]
    fn drafts_round_trip_and_damage_is_reported() {
        let mut d = Draft::default();
        d.form.set("stall_pa", "150", UnitSystem::Metric);
        d.form.speed_change_seen = Some(true);
        d.machine = "Baler 2".into();
        assert_eq!(read_draft(Some(&draft_text(&d))), (d, None));
        let (e, why) = read_draft(Some("{\"form\": 7}"));
        assert_eq!(e, Draft::default());
        assert!(why.unwrap().contains("damaged"));
        assert_eq!(read_draft(None), (Draft::default(), None));
    }
}
