//! One numeric input: a slider and a typed field with its unit, in sync,
//! with its message beside it.

use kneepoint_engine::fields::{FieldSpec, Group, FIELDS};
use kneepoint_engine::units::{from_display, to_display, unit};
use kneepoint_engine::Quantity;
use leptos::prelude::*;

use crate::fmt::{field_text, parse_number};
use crate::model::{
    self, from_slider, parse_field, slider_position, visible_text, Draft,
};
use crate::state::AppState;

/// The element id of the typed field of `path`.
pub fn field_id(path: &str) -> String {
    format!("f-{}", path.replace(['.', '_'], "-"))
}

/// Slider plus typed field for `FIELDS[index]`.
#[component]
pub fn NumberField(
    /// Index of the input in the engine's `fields::FIELDS`.
    index: usize,
) -> impl IntoView {
    let st = expect_context::<AppState>();
    let spec: &'static FieldSpec = &FIELDS[index];
    let value = st.values[index];
    let draft = RwSignal::new(None::<Draft>);
    let id = field_id(spec.path);
    let label_id = format!("{id}-label");
    let msg_id = format!("{id}-msg");
    let engine_error = Memo::new(move |_| st.field_error(spec.path));
    let message = Memo::new(move |_| {
        let (u, g) = (st.units.get(), st.generation.get());
        draft
            .with(|d| {
                d.as_ref()
                    .filter(|d| d.units == u && d.generation == g)
                    .and_then(|d| parse_field(spec, u, &d.text).err())
            })
            .or_else(|| engine_error.get())
    });
    let text = move || {
        draft.with(|d| {
            visible_text(
                spec,
                st.units.get(),
                st.generation.get(),
                value.get(),
                d.as_ref(),
            )
        })
    };
    let on_text = move |ev| {
        let t = event_target_value(&ev);
        let units = st.units.get_untracked();
        if let Ok(si) = parse_field(spec, units, &t) {
            value.set(si);
        }
        draft.set(Some(Draft {
            units,
            generation: st.generation.get_untracked(),
            text: t,
        }));
    };
    let slider_label = label_id.clone();
    // Rebuilt when the units change, so that min, max and step are set
    // before the position (a browser clamps the position to the old range).
    let slider = move || {
        let units = st.units.get();
        let sl = model::slider(spec, units);
        view! {
            <input
                type="range"
                class="slider"
                aria-labelledby=slider_label.clone()
                min=sl.attr(sl.min)
                max=sl.attr(sl.max)
                step=sl.attr(sl.step)
                prop:value=move || sl.attr(slider_position(spec, units, value.get()))
                data-testid=format!("slider-{}", spec.path)
                on:input=move |ev| {
                    if let Some(si) = from_slider(spec, units, &event_target_value(&ev)) {
                        draft.set(None);
                        value.set(si);
                    }
                }
            />
        }
    };
    let symbol = move || unit(spec.quantity, st.units.get()).symbol;
    view! {
        <div class="field" class:invalid=move || message.get().is_some() data-field=spec.path>
            <label id=label_id for=id.clone() class="field-label">
                {spec.label}
                <span class="sr-only">", in " {symbol}</span>
            </label>
            <div class="field-row">
                {slider}
                <span class="number">
                    <input
                        id=id
                        type="text"
                        inputmode="decimal"
                        autocomplete="off"
                        spellcheck="false"
                        prop:value=text
                        on:input=on_text
                        aria-invalid=move || if message.get().is_some() { "true" } else { "false" }
                        aria-describedby=msg_id.clone()
                        data-testid=format!("input-{}", spec.path)
                    />
                    <span class="unit" aria-hidden="true">
                        {symbol}
                    </span>
                </span>
            </div>
            <p id=msg_id class="field-msg" data-testid=format!("msg-{}", spec.path)>
                {move || message.get()}
            </p>
        </div>
    }
}

/// The optional installed motor rating: blank means "recommend one".
#[component]
pub fn MotorField() -> impl IntoView {
    let st = expect_context::<AppState>();
    let draft = RwSignal::new(None::<Draft>);
    let rating = move || st.rest.with(|d| d.drive.motor_rating_w);
    let error = Memo::new(move |_| st.field_error("drive.motor_rating_w"));
    let message = Memo::new(move |_| {
        let (u, g) = (st.units.get(), st.generation.get());
        let typed = draft.with(|d| {
            d.as_ref()
                .filter(|d| d.units == u && d.generation == g && !d.text.trim().is_empty())
                .and_then(|d| {
                    parse_number(&d.text).is_none().then(|| {
                        format!(
                            "Enter a number in {}, or leave blank for the next standard size.",
                            unit(Quantity::Power, u).symbol
                        )
                    })
                })
        });
        typed.or_else(|| error.get())
    });
    let text = move || {
        let (u, g) = (st.units.get(), st.generation.get());
        draft
            .with(|d| {
                d.as_ref()
                    .filter(|d| d.units == u && d.generation == g)
                    .map(|d| d.text.clone())
            })
            .unwrap_or_else(|| {
                rating().map_or_else(String::new, |w| {
                    field_text(
                        to_display(Quantity::Power, u, w),
                        unit(Quantity::Power, u).decimals,
                    )
                })
            })
    };
    let on_text = move |ev| {
        let t = event_target_value(&ev);
        let units = st.units.get_untracked();
        let new = if t.trim().is_empty() {
            Some(None)
        } else {
            parse_number(&t).map(|v| Some(from_display(Quantity::Power, units, v)))
        };
        if let Some(r) = new {
            st.rest.update(|d| d.drive.motor_rating_w = r);
        }
        draft.set(Some(Draft {
            units,
            generation: st.generation.get_untracked(),
            text: t,
        }));
    };
    let symbol = move || unit(Quantity::Power, st.units.get()).symbol;
    view! {
        <div class="field" class:invalid=move || message.get().is_some() data-field="drive.motor_rating_w">
            <label for="f-motor" class="field-label">
                "Installed motor rating"
                <span class="sr-only">", in " {symbol}</span>
            </label>
            <div class="field-row">
                <span class="field-hint">"Blank: next standard size"</span>
                <span class="number">
                    <input
                        id="f-motor"
                        type="text"
                        inputmode="decimal"
                        autocomplete="off"
                        placeholder="auto"
                        prop:value=text
                        on:input=on_text
                        aria-describedby="f-motor-msg"
                        data-testid="input-drive.motor_rating_w"
                    />
                    <span class="unit" aria-hidden="true">
                        {symbol}
                    </span>
                </span>
            </div>
            <p id="f-motor-msg" class="field-msg">
                {move || message.get()}
            </p>
        </div>
    }
}

/// The inputs of one group: the main ones, then the advanced ones folded.
#[component]
pub fn FieldGroup(
    /// Which group.
    group: Group,
) -> impl IntoView {
    let main: Vec<usize> = (0..FIELDS.len())
        .filter(|&i| FIELDS[i].group == group && !FIELDS[i].advanced)
        .collect();
    let advanced: Vec<usize> = (0..FIELDS.len())
        .filter(|&i| FIELDS[i].group == group && FIELDS[i].advanced)
        .collect();
    let n = advanced.len();
    let motor = (group == Group::Pumps).then(|| view! { <MotorField /> });
    view! {
        <fieldset class="group" data-group=group.label()>
            <legend>{group.label()}</legend>
            {main.into_iter().map(|i| view! { <NumberField index=i /> }).collect_view()}
            <details class="advanced">
                <summary>{format!("More inputs ({})", n + usize::from(motor.is_some()))}</summary>
                {motor}
                {advanced.into_iter().map(|i| view! { <NumberField index=i /> }).collect_view()}
            </details>
        </fieldset>
    }
}
