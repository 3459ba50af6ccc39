//! Reading fields for the machine check: large typed fields with units and
//! the message beside each, yes/no observations, and the check's context.

use kneepoint_engine::field::{Diagnosis, Phase};
use kneepoint_engine::units::unit;
use kneepoint_engine::ValidationErrors;
use leptos::prelude::*;

use crate::field_form::{input, Form, InputSpec, Parsed};
use crate::state::AppState;

/// The machine check's reactive state, shared by its parts (context).
#[derive(Clone, Copy)]
pub struct FieldCtx {
    /// What is entered.
    pub form: RwSignal<Form>,
    /// The form read as readings.
    pub parsed: Memo<Parsed>,
    /// The diagnosis against the current design (`None` without a valid
    /// design).
    pub diagnosis: Memo<Option<Result<Diagnosis, ValidationErrors>>>,
}

impl FieldCtx {
    /// The message for the reading at `path`: the form's own (not a
    /// number, a partner missing), else the engine's.
    pub fn message(&self, path: &str) -> Option<String> {
        let st = expect_context::<AppState>();
        let units = st.units.get();
        if let Some(m) = self.parsed.with(|p| p.error(path).map(str::to_string)) {
            return Some(m);
        }
        self.diagnosis.with(|d| match d {
            Some(Ok(d)) => d
                .errors
                .iter()
                .find(|e| e.field == path)
                .map(|e| e.message(units)),
            Some(Err(e)) => e.for_field(path).map(|e| e.message(units)),
            None => None,
        })
    }
}

/// The element id of a reading's field.
pub fn reading_id(path: &str) -> String {
    format!("r-{}", path.replace(['.', '_'], "-"))
}

/// One numeric reading: label, large field, unit, message.
#[component]
pub fn ReadingInput(
    /// Path of the reading (a row of `field_form::INPUTS`).
    path: &'static str,
) -> impl IntoView {
    let st = expect_context::<AppState>();
    let ctx = expect_context::<FieldCtx>();
    let Some(spec): Option<&'static InputSpec> = input(path) else {
        return ().into_any();
    };
    let id = reading_id(path);
    let msg_id = format!("{id}-msg");
    let message = Memo::new(move |_| ctx.message(path));
    let symbol = move || unit(spec.quantity, st.units.get()).symbol;
    let text = move || ctx.form.with(|f| f.text(path, st.units.get()));
    let on_input = move |ev| {
        let t = event_target_value(&ev);
        let u = st.units.get_untracked();
        ctx.form.update(|f| f.set(path, &t, u));
    };
    view! {
        <div class="reading" class:invalid=move || message.get().is_some() data-reading=path>
            <label for=id.clone() class="reading-label">
                {spec.gauge.map(|g| view! { <span class="gauge-tag">{g}</span> })}
                {spec.label}
                <span class="sr-only">", in " {symbol}</span>
            </label>
            <span class="reading-row">
                <input
                    id=id
                    type="text"
                    inputmode="decimal"
                    autocomplete="off"
                    spellcheck="false"
                    prop:value=text
                    on:input=on_input
                    aria-invalid=move || if message.get().is_some() { "true" } else { "false" }
                    aria-describedby=msg_id.clone()
                    data-testid=format!("reading-{path}")
                />
                <span class="unit" aria-hidden="true">
                    {symbol}
                </span>
            </span>
            <p id=msg_id class="field-msg" data-testid=format!("reading-msg-{path}")>
                {move || message.get()}
            </p>
        </div>
    }
    .into_any()
}

/// A yes / no / not noted observation.
#[component]
pub fn YesNo(
    /// The question.
    label: &'static str,
    /// Stable name for tests (`observe-<id>-yes`).
    id: &'static str,
    /// Reads the answer from the form.
    get: fn(&Form) -> Option<bool>,
    /// Writes the answer to the form.
    set: fn(&mut Form, Option<bool>),
) -> impl IntoView {
    let ctx = expect_context::<FieldCtx>();
    let label_id = format!("observe-{id}-label");
    let choice = move |v: Option<bool>, text: &'static str, code: &'static str| {
        view! {
            <button
                type="button"
                aria-pressed=move || (ctx.form.with(get) == v).to_string()
                data-testid=format!("observe-{id}-{code}")
                on:click=move |_| ctx.form.update(|f| set(f, v))
            >
                {text}
            </button>
        }
    };
    view! {
        <div class="observe">
            <span id=label_id.clone() class="reading-label">
                {label}
            </span>
            <div class="toggle big" role="group" aria-labelledby=label_id>
                {choice(Some(true), "Yes", "yes")}
                {choice(Some(false), "No", "no")}
                {choice(None, "Not noted", "unset")}
            </div>
        </div>
    }
}

/// When the motor current was read.
#[component]
pub fn MotorPhase() -> impl IntoView {
    let ctx = expect_context::<FieldCtx>();
    let choice = move |p: Phase, text: &'static str| {
        view! {
            <button
                type="button"
                aria-pressed=move || (ctx.form.with(|f| f.motor_during) == p).to_string()
                data-testid=format!("motor-during-{}", p.label())
                on:click=move |_| ctx.form.update(|f| f.motor_during = p)
            >
                {text}
            </button>
        }
    };
    view! {
        <div class="observe">
            <span id="motor-during-label" class="reading-label">
                "Current read during"
            </span>
            <div class="toggle big" role="group" aria-labelledby="motor-during-label">
                {choice(Phase::Approach, "Fast phase")}
                {choice(Phase::Pressing, "Slow phase")}
                {choice(Phase::Stall, "Stall")}
            </div>
        </div>
    }
}
