//! The machine check: readings taken at the machine (stopwatch, gauges,
//! meters), what they say against the design, the live circuit diagram,
//! records kept on this device, and the fault simulator for training.

use kneepoint_engine::field::{
    diagnose, synthesize_readings, Diagnosis, Verdict, FIELD_CAUTIONS,
};
use kneepoint_engine::units::{from_display, to_display, unit};
use kneepoint_engine::{Circuit, Motion, Quantity};
use leptos::prelude::*;

use crate::browser;
use crate::components::diagram::CircuitDiagram;
use crate::components::faults::FaultPanel;
use crate::components::readings::{FieldCtx, MotorPhase, ReadingInput, YesNo};
use crate::components::stopwatch::Stopwatch;
use crate::field_form::{time_path, Form, Section, INPUTS};
use crate::field_record::{
    calc_rows, clean_label, draft_text, make_record, read_draft, read_record,
    reading_rows, record_as_text, record_id, record_line, record_text, Draft,
    FieldRecord, Stored, DRAFT_KEY, RECORD_PREFIX,
};
use crate::state::{AppState, NoticeKind};
use crate::url_codec;

/// Local date and time now, `2025-03-14 09:30`.
fn local_now() -> String {
    let d = js_sys::Date::new_0();
    format!(
        "{:04}-{:02}-{:02} {:02}:{:02}",
        d.get_full_year(),
        d.get_month() + 1,
        d.get_date(),
        d.get_hours(),
        d.get_minutes()
    )
}

/// Every stored record, damaged ones included.
fn read_records() -> Vec<Stored> {
    let mut v: Vec<Stored> = browser::storage_keys(RECORD_PREFIX)
        .into_iter()
        .map(|k| {
            let id = k[RECORD_PREFIX.len()..].to_string();
            read_record(&id, browser::storage_get(&k).as_deref())
        })
        .collect();
    v.reverse(); // newest first
    v
}

/// The paths of one section, in form order.
fn paths(section: Section) -> impl Iterator<Item = &'static str> {
    INPUTS
        .iter()
        .filter(move |s| s.section == section)
        .map(|s| s.path)
}

/// A timed stretch: stopwatch, then distance, time and gauge.
#[component]
fn TimedBlock(
    /// Which stretch.
    section: Section,
    /// Heading.
    title: &'static str,
    /// Words on the stopwatch button.
    phase: &'static str,
    /// Stable name for tests.
    id: &'static str,
    /// A hint under the heading.
    hint: &'static str,
) -> impl IntoView {
    let st = expect_context::<AppState>();
    let ctx = expect_context::<FieldCtx>();
    let time = time_path(section).unwrap_or("fast_stroke.time_s");
    let on_time = Callback::new(move |s: f64| {
        let u = st.units.get_untracked();
        ctx.form.update(|f| f.set_si(time, s, u));
    });
    view! {
        <fieldset class="group reading-group" data-section=id>
            <legend>{title}</legend>
            <p class="quiet">{hint}</p>
            <Stopwatch phase=phase id=id on_time=on_time />
            <div class="reading-grid">
                {paths(section).map(|p| view! { <ReadingInput path=p /> }).collect_view()}
            </div>
        </fieldset>
    }
}

/// The overall answer, kept in view.
#[component]
fn Verdict() -> impl IntoView {
    let st = expect_context::<AppState>();
    let ctx = expect_context::<FieldCtx>();
    let view_of = move || {
        let u = st.units.get();
        let empty = ctx.form.with(Form::is_empty);
        ctx.diagnosis.with(|d| match d {
            None => ("none", "No valid design to compare with: fix the marked inputs on the Circuit view.".to_string()),
            Some(Err(_)) => ("bad", "None of the readings can be used yet: see the marked fields.".to_string()),
            Some(Ok(_)) if empty => (
                "empty",
                "Enter a reading, or time a stretch with the stopwatch: results appear as you go."
                    .to_string(),
            ),
            Some(Ok(d)) => (
                match d.verdict {
                    Verdict::ConsistentWithDesign => "consistent",
                    Verdict::Findings => "findings",
                    Verdict::CannotTellYet { .. } => "cannot_tell",
                },
                d.summary(u),
            ),
        })
    };
    view! {
        <div class="verdict-bar" role="status" aria-live="polite" data-testid="field-verdict" data-verdict=move || view_of().0>
            {move || view_of().1}
        </div>
    }
}

/// Back-calculated figures, findings, notes and what is not checked.
#[component]
fn Findings() -> impl IntoView {
    let st = expect_context::<AppState>();
    let ctx = expect_context::<FieldCtx>();
    let body = move || {
        let u = st.units.get();
        ctx.diagnosis.with(|d| {
            let Some(Ok(d)) = d else {
                return ().into_any();
            };
            let d: &Diagnosis = d;
            let rows = calc_rows(&d.back_calc, u);
            let calc = (!rows.is_empty()).then(|| {
                view! {
                    <table class="calc" data-testid="calc">
                        <caption>"From the readings"</caption>
                        <thead>
                            <tr>
                                <th scope="col">"Figure"</th>
                                <th scope="col">"At the machine"</th>
                                <th scope="col">"Design expects"</th>
                            </tr>
                        </thead>
                        <tbody>
                            {rows
                                .into_iter()
                                .map(|r| {
                                    view! {
                                        <tr data-calc=r.id>
                                            <th scope="row">{r.label}</th>
                                            <td class="calc-value">{r.measured}</td>
                                            <td>{r.expected}</td>
                                        </tr>
                                    }
                                })
                                .collect_view()}
                        </tbody>
                    </table>
                }
            });
            let findings = d
                .findings
                .iter()
                .map(|f| {
                    let cause = serde_json::to_string(&f.cause)
                        .unwrap_or_default()
                        .trim_matches('"')
                        .to_string();
                    let confirm = (!f.confirm_with.is_empty()).then(|| {
                        view! {
                            <p class="confirm">
                                "To confirm, also measure: "
                                {f.confirm_with
                                    .iter()
                                    .map(|p| kneepoint_engine::field::reading_label(p))
                                    .collect::<Vec<_>>()
                                    .join(", ")}
                            </p>
                        }
                    });
                    view! {
                        <li class="finding" data-testid="finding" data-cause=cause>
                            <h3>
                                {f.title}
                                <span class="score" title="How strongly the readings point here">
                                    {format!(" score {:.2}", f.score)}
                                </span>
                            </h3>
                            <meter min="0" max="1" value=f.score.to_string() aria-label="score"></meter>
                            <ul class="evidence">
                                {f.evidence.iter().map(|e| view! { <li>{e.message(u)}</li> }).collect_view()}
                            </ul>
                            {confirm}
                            <p class="next">
                                <strong>"Next check: "</strong>
                                {f.next_check}
                            </p>
                            <p class="caution">
                                <strong>"Caution: "</strong>
                                {f.caution}
                            </p>
                        </li>
                    }
                })
                .collect_view();
            let notes = d
                .notes
                .iter()
                .map(|n| view! { <li>{n.message(u)}</li> })
                .collect_view();
            let not_checked = (!d.not_checked.is_empty()).then(|| {
                view! {
                    <details class="not-checked">
                        <summary>{format!("Not checked yet ({})", d.not_checked.len())}</summary>
                        <ul>
                            {d.not_checked
                                .iter()
                                .map(|n| {
                                    let m = n
                                        .measure
                                        .iter()
                                        .map(|p| kneepoint_engine::field::reading_label(p))
                                        .collect::<Vec<_>>()
                                        .join(" or ");
                                    view! { <li>{format!("{}: measure {m}.", n.title)}</li> }
                                })
                                .collect_view()}
                        </ul>
                    </details>
                }
            });
            view! {
                {calc}
                <ol class="findings">{findings}</ol>
                <ul class="warnings notes">{notes}</ul>
                {not_checked}
            }
            .into_any()
        })
    };
    view! {
        <section class="panel field-results" aria-labelledby="field-results-h">
            <h2 id="field-results-h">"What the readings say"</h2>
            {body}
        </section>
    }
}

/// Cautions beside the readings.
#[component]
fn FieldCautions() -> impl IntoView {
    view! {
        <aside class="panel field-cautions" aria-labelledby="field-cautions-h" data-testid="field-cautions">
            <h2 id="field-cautions-h">"Before you read the gauges"</h2>
            <ul class="safety-list">
                {FIELD_CAUTIONS.iter().map(|c| view! { <li>{*c}</li> }).collect_view()}
                <li>
                    "Adjust a setting only with a gauge fitted, starting from the backed-off \
                     position. Never turn the relief up to make up for a worn pump."
                </li>
            </ul>
        </aside>
    }
}

/// Saved records: save, open, share as text, download, delete.
#[component]
fn Records(
    /// The machine label.
    machine: RwSignal<String>,
) -> impl IntoView {
    let st = expect_context::<AppState>();
    let ctx = expect_context::<FieldCtx>();
    let records = RwSignal::new(read_records());
    for r in records.get_untracked() {
        if let Stored::Broken { id, reason } = r {
            st.notify(
                NoticeKind::Problem,
                format!(
                    "A machine-check record ({id}) could not be read ({reason}). It was skipped; \
                     every other record is available."
                ),
            );
        }
    }
    let message = RwSignal::new(None::<String>);
    let shared = RwSignal::new(None::<String>);
    let confirm_delete = RwSignal::new(None::<String>);
    let label_error = Memo::new(move |_| clean_label(&machine.get()).err());
    let save = move |_| {
        let label = match clean_label(&machine.get_untracked()) {
            Ok(l) => l,
            Err(e) => return message.set(Some(e)),
        };
        let Some(Ok(d)) = ctx.diagnosis.get_untracked() else {
            return message.set(Some(
                "Nothing to record yet: enter usable readings first.".into(),
            ));
        };
        let units = st.units.get_untracked();
        let design = st.design.get_untracked();
        let id = record_id(js_sys::Date::now());
        let rec = make_record(
            id.clone(),
            local_now(),
            label.clone(),
            design.name.clone(),
            url_codec::encode(&design, units, Some("field")),
            units,
            ctx.parsed.with_untracked(|p| p.readings.clone()),
            &d,
        );
        match browser::storage_set(&format!("{RECORD_PREFIX}{id}"), &record_text(&rec)) {
            Ok(()) => message.set(Some(format!(
                "Recorded the check of “{label}” on this device."
            ))),
            Err(e) => message.set(Some(format!(
                "Could not keep the record: {e}. Copy it as text instead."
            ))),
        }
        records.set(read_records());
    };
    let open = move |r: FieldRecord| {
        ctx.form
            .set(Form::from_readings(&r.readings, st.units.get_untracked()));
        machine.set(r.machine.clone());
        match url_codec::decode(&r.design_link) {
            Ok(s) => {
                st.load(s.design);
                st.notify(
                    NoticeKind::Info,
                    format!(
                        "Opened the check of “{}” from {}, with the design it was compared with.",
                        r.machine, r.taken_at
                    ),
                );
            }
            Err(e) => st.notify(
                NoticeKind::Problem,
                format!(
                    "Opened the readings of “{}”, but the design they were compared with could not be read ({}); they are compared with the current design.",
                    r.machine,
                    e.message()
                ),
            ),
        }
    };
    let list = move || {
        records
            .get()
            .into_iter()
            .map(|e| match e {
                Stored::Record(r) => {
                    let r = *r;
                    let line = record_line(&r);
                    let id = r.id.clone();
                    let (r1, r2, r3) = (r.clone(), r.clone(), r.clone());
                    let id_del = id.clone();
                    let asking = {
                        let id = id.clone();
                        move || confirm_delete.get().as_deref() == Some(id.as_str())
                    };
                    let asking2 = asking.clone();
                    let asking3 = asking.clone();
                    view! {
                        <li class="saved-row" data-testid="record" data-record=id.clone()>
                            <span class="saved-name">{line}</span>
                            <span class="row-actions">
                                <button type="button" data-testid="record-open" on:click=move |_| open(r1.clone())>
                                    "Open"
                                </button>
                                <button
                                    type="button"
                                    on:click=move |_| {
                                        let t = record_as_text(&r2);
                                        browser::copy_to_clipboard(&t);
                                        shared.set(Some(t));
                                    }
                                >
                                    "Copy as text"
                                </button>
                                <button
                                    type="button"
                                    on:click=move |_| {
                                        let name = crate::presets::file_name(&r3.machine)
                                            .replace(".kneepoint.json", ".check.json");
                                        if let Err(e) = browser::download(&name, &record_text(&r3)) {
                                            message.set(Some(format!("Could not download: {e}.")));
                                        }
                                    }
                                >
                                    "Download"
                                </button>
                                <button
                                    type="button"
                                    class:danger=asking3
                                    on:click=move |_| {
                                        if asking2() {
                                            browser::storage_remove(&format!("{RECORD_PREFIX}{id_del}"));
                                            confirm_delete.set(None);
                                            records.set(read_records());
                                        } else {
                                            confirm_delete.set(Some(id_del.clone()));
                                        }
                                    }
                                >
                                    {move || if asking() { "Really delete" } else { "Delete" }}
                                </button>
                            </span>
                        </li>
                    }
                    .into_any()
                }
                Stored::Broken { id, reason } => view! {
                    <li class="saved-row broken" data-testid="record-broken">
                        <span class="saved-name">
                            {format!("Record {id} is damaged and was skipped ({reason}).")}
                        </span>
                        <span class="row-actions">
                            <button
                                type="button"
                                on:click=move |_| {
                                    browser::storage_remove(&format!("{RECORD_PREFIX}{id}"));
                                    records.set(read_records());
                                }
                            >
                                "Remove"
                            </button>
                        </span>
                    </li>
                }
                .into_any(),
            })
            .collect_view()
    };
    let print = move |_| {
        if let Some(w) = web_sys::window() {
            let _ = w.print();
        }
    };
    view! {
        <section class="panel records" aria-labelledby="records-h">
            <h2 id="records-h">"Check records on this device"</h2>
            <div class="reading" class:invalid=move || label_error.get().is_some()>
                <label for="machine-label" class="reading-label">
                    "Machine (your label)"
                </label>
                <input
                    id="machine-label"
                    type="text"
                    autocomplete="off"
                    placeholder="e.g. press 3, bay 2"
                    prop:value=move || machine.get()
                    on:input=move |ev| machine.set(event_target_value(&ev))
                    aria-describedby="machine-label-msg"
                    data-testid="machine-label"
                />
                <p id="machine-label-msg" class="field-msg">{move || label_error.get()}</p>
            </div>
            <div class="row-actions">
                <button type="button" class="primary" data-testid="record-save" on:click=save>
                    "Record this check"
                </button>
                <button type="button" on:click=print>
                    "Print this check"
                </button>
            </div>
            <p class="quiet" role="status" data-testid="record-message">{move || message.get()}</p>
            {move || {
                shared
                    .get()
                    .map(|t| {
                        view! {
                            <div class="share">
                                <label for="record-text">"The record as text (copied if the browser allows; select to copy by hand):"</label>
                                <textarea id="record-text" readonly rows="8" prop:value=t></textarea>
                                <button type="button" on:click=move |_| shared.set(None)>"Done"</button>
                            </div>
                        }
                    })
            }}
            <ul class="saved records-list" data-testid="records">{list}</ul>
            <p class="quiet">"Records stay on this device only (local storage)."</p>
        </section>
    }
}

/// The check as printed: date, machine, design, readings, findings.
#[component]
fn PrintedCheck(
    /// The machine label.
    machine: RwSignal<String>,
) -> impl IntoView {
    let st = expect_context::<AppState>();
    let ctx = expect_context::<FieldCtx>();
    move || {
        let u = st.units.get();
        let rows = ctx.parsed.with(|p| reading_rows(&p.readings, u));
        let name = st.rest.with(|d| d.name.clone());
        let summary = ctx.diagnosis.with(|d| match d {
            Some(Ok(d)) => d.summary(u),
            _ => String::new(),
        });
        view! {
            <section class="print-only printed-check">
                <h2>"Machine check"</h2>
                <p>
                    {format!(
                        "Machine: {} · Taken: {} · Compared with the design: {}",
                        clean_label(&machine.get()).unwrap_or_default(),
                        local_now(),
                        name
                    )}
                </p>
                <table class="inputs-table">
                    <caption>"Readings"</caption>
                    <tbody>
                        {rows
                            .into_iter()
                            .map(|(l, v)| view! { <tr><th scope="row">{l}</th><td>{v}</td></tr> })
                            .collect_view()}
                    </tbody>
                </table>
                <p><strong>{summary}</strong></p>
            </section>
        }
    }
}

/// The pressure the field diagram shows, chosen by phase or slider.
#[component]
fn DiagramControls(
    /// Chosen pressure (Pa), `None` for the pressing point.
    pressure: RwSignal<Option<f64>>,
) -> impl IntoView {
    let st = expect_context::<AppState>();
    let limits = Memo::new(move |_| {
        st.shown.with(|g| {
            g.as_ref().map(|g| {
                let p_rf = st
                    .circuit
                    .with(|c| c.as_ref().map_or(1.0, Circuit::relief_full_pa));
                let at = |m: Motion| g.report.motion(m).map(|m| m.pump.pressure_pa);
                (p_rf, at(Motion::Approach), at(Motion::Pressing))
            })
        })
    });
    let pick = move |code: &'static str, text: &'static str| {
        view! {
            <button
                type="button"
                data-testid=format!("diagram-at-{code}")
                on:click=move |_| {
                    let Some((p_rf, a, _)) = limits.get_untracked() else { return };
                    pressure.set(match code {
                        "fast" => Some(a.unwrap_or(0.0)),
                        "stall" => Some(p_rf),
                        _ => None,
                    });
                }
            >
                {text}
            </button>
        }
    };
    let slider = move || {
        let u = st.units.get();
        let (p_rf, _, press) = limits.get()?;
        let max = to_display(Quantity::Pressure, u, p_rf);
        let step = if max > 500.0 { 1.0 } else { 0.1 };
        let pos = move || {
            let p = pressure.get().or(press).unwrap_or(0.0);
            format!("{:.1}", to_display(Quantity::Pressure, u, p))
        };
        Some(view! {
            <label for="diagram-pressure" class="reading-label">
                {format!("System pressure shown ({})", unit(Quantity::Pressure, u).symbol)}
            </label>
            <input
                id="diagram-pressure"
                type="range"
                class="slider"
                min="0"
                max=format!("{max:.1}")
                step=step.to_string()
                prop:value=pos
                data-testid="diagram-pressure"
                on:input=move |ev| {
                    if let Some(v) = crate::fmt::parse_number(&event_target_value(&ev)) {
                        pressure.set(Some(from_display(Quantity::Pressure, u, v)));
                    }
                }
            />
        })
    };
    view! {
        <div class="diagram-controls">
            <div class="toggle big" role="group" aria-label="Show the circuit during">
                {pick("fast", "Fast phase")}
                {pick("slow", "Slow phase")}
                {pick("stall", "Stall")}
            </div>
            {slider}
        </div>
    }
}

/// The machine check view.
#[component]
pub fn FieldView() -> impl IntoView {
    let st = expect_context::<AppState>();
    let (draft, problem) = read_draft(browser::storage_get(DRAFT_KEY).as_deref());
    if let Some(p) = problem {
        st.notify(
            NoticeKind::Problem,
            format!("Note: {p}; starting with an empty form."),
        );
    }
    let form = RwSignal::new(draft.form);
    let machine = RwSignal::new(draft.machine);
    // Keep what is typed across reloads (the outside world: storage).
    Effect::new(move |_| {
        let d = Draft {
            form: form.get(),
            machine: machine.get(),
        };
        let _ = browser::storage_set(DRAFT_KEY, &draft_text(&d));
    });
    let parsed = Memo::new(move |_| form.with(Form::parse));
    let circuit = st.circuit;
    let diagnosis = Memo::new(move |_| {
        circuit.with(|c| {
            let c = c.as_ref()?;
            Some(parsed.with(|p| diagnose(c, &p.readings)))
        })
    });
    let ctx = FieldCtx {
        form,
        parsed,
        diagnosis,
    };
    provide_context(ctx);
    let diagram_p = RwSignal::new(None::<f64>);
    let take_readings = Callback::new(move |_| {
        let Some(c) = circuit.get_untracked() else {
            return;
        };
        let r = synthesize_readings(&c);
        form.set(Form::from_readings(&r, st.units.get_untracked()));
        st.notify(
            NoticeKind::Info,
            "Readings taken from the simulated machine: see what the check makes of them.",
        );
    });
    let clear = move |_| form.set(Form::default());
    let design_name = move || st.rest.with(|d| d.name.clone());
    view! {
        <div class="field-view">
            <div class="field-head">
                <h2>"Machine check"</h2>
                <p class="quiet">
                    "Compared with the design "
                    <strong data-testid="field-design">{design_name}</strong>
                    " (change it on the Circuit view, or open a saved design or a link)."
                </p>
                <button type="button" data-testid="readings-clear" on:click=clear>
                    "Clear readings"
                </button>
            </div>
            <Verdict />
            <FieldCautions />
            <section class="panel field-readings" aria-labelledby="readings-h">
                <h2 id="readings-h">"Readings"</h2>
                <TimedBlock
                    section=Section::Fast
                    title="Fast phase (both pumps)"
                    phase="fast phase"
                    id="fast"
                    hint="Time a steady stretch of the approach over a marked distance."
                />
                <TimedBlock
                    section=Section::Slow
                    title="Slow phase (small pump)"
                    phase="slow phase"
                    id="slow"
                    hint="Time a steady stretch of pressing, at a nearly constant gauge."
                />
                <details class="advanced">
                    <summary>"Second slow stretch, at another load"</summary>
                    <TimedBlock
                        section=Section::SecondSlow
                        title="Second slow stretch"
                        phase="second stretch"
                        id="second"
                        hint="A second pressing stretch at another pressure gives the small pump's leakage."
                    />
                </details>
                <fieldset class="group reading-group">
                    <legend>"Gauges G1 (system) and G2 (large-pump outlet)"</legend>
                    <div class="reading-grid">
                        {paths(Section::Gauges).map(|p| view! { <ReadingInput path=p /> }).collect_view()}
                    </div>
                    <YesNo
                        label="Does the cylinder visibly change from fast to slow?"
                        id="speed-change"
                        get=|f| f.speed_change_seen
                        set=|f, v| f.speed_change_seen = v
                    />
                    <YesNo
                        label="Does the approach speed alternate, with the valve buzzing?"
                        id="alternates"
                        get=|f| f.approach_speed_alternates
                        set=|f, v| f.approach_speed_alternates = v
                    />
                </fieldset>
                <fieldset class="group reading-group">
                    <legend>"Flow meters: G3 (unloader tank line) and pump tests"</legend>
                    <div class="reading-grid">
                        {paths(Section::Meters).map(|p| view! { <ReadingInput path=p /> }).collect_view()}
                    </div>
                </fieldset>
                <fieldset class="group reading-group">
                    <legend>"Oil, shaft and motor"</legend>
                    <div class="reading-grid">
                        {paths(Section::Machine).map(|p| view! { <ReadingInput path=p /> }).collect_view()}
                    </div>
                    <MotorPhase />
                </fieldset>
            </section>
            <Findings />
            <section class="panel field-diagram" aria-labelledby="field-diagram-h">
                <h2 id="field-diagram-h">"The circuit"</h2>
                <DiagramControls pressure=diagram_p />
                <CircuitDiagram pressure=diagram_p id="field" />
            </section>
            <Records machine=machine />
            <FaultPanel take_readings=take_readings />
            <PrintedCheck machine=machine />
        </div>
    }
}
