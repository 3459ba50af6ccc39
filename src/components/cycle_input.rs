//! One typed number of the duty cycle (a segment's distance, a reservoir
//! temperature, a target speed) with its unit and its message beside it.
//! The SI value in the design is the source of truth; what the person types
//! stays on screen while it is being typed (a [`Draft`]).

use kneepoint_engine::units::{from_display, to_display, unit};
use kneepoint_engine::Quantity;
use leptos::prelude::*;

use crate::fmt::{field_text, parse_number};
use crate::model::Draft;
use crate::state::AppState;

/// Every engine message for the field at the full `path` (with list
/// indices, e.g. `cycle.segments[2].time_s`), joined, in the current units.
pub fn engine_message(st: &AppState, path: &str) -> Option<String> {
    let units = st.units.get();
    st.outcome.with(|o| {
        let e = o.as_ref().err()?;
        let msgs: Vec<String> =
            e.0.iter()
                .filter(|e| e.path() == path)
                .map(|e| e.message(units))
                .collect();
        (!msgs.is_empty()).then(|| msgs.join(" "))
    })
}

/// The element id for a design path: `cycle.segments[2].time_s` gives
/// `c-cycle-segments-2-time-s`.
pub fn input_id(path: &str) -> String {
    let mut s = String::from("c-");
    for c in path.chars() {
        s.push(if c.is_ascii_alphanumeric() { c } else { '-' });
    }
    while s.contains("--") {
        s = s.replace("--", "-");
    }
    s.trim_end_matches('-').to_string()
}

/// A typed number with its unit. Blank text sets `None` when `blank` names
/// what blank means; otherwise a number is required.
#[component]
pub fn CycleNumber(
    /// Visible label.
    #[prop(into)]
    label: String,
    /// What the value is (decides the unit).
    quantity: Quantity,
    /// Design path with list indices; gives the id, the test hook and the
    /// engine's messages.
    #[prop(into)]
    path: String,
    /// The value now (SI), `None` for blank.
    #[prop(into)]
    value: Signal<Option<f64>>,
    /// Writes a new value (SI).
    on_set: Callback<Option<f64>>,
    /// What blank means ("3 min of pump flow"); `None`: a number is needed.
    #[prop(optional)]
    blank: Option<&'static str>,
    /// A further message for this field (e.g. the cycle's own error).
    #[prop(optional, into)]
    extra: Option<Signal<Option<String>>>,
) -> impl IntoView {
    let st = expect_context::<AppState>();
    let draft = RwSignal::new(None::<Draft>);
    let id = input_id(&path);
    let msg_id = format!("{id}-msg");
    let engine_path = path.clone();
    let engine = Memo::new(move |_| engine_message(&st, &engine_path));
    let message = Memo::new(move |_| {
        let (u, g) = (st.units.get(), st.generation.get());
        let typed = draft.with(|d| {
            let d = d.as_ref().filter(|d| d.units == u && d.generation == g)?;
            let t = d.text.trim();
            if t.is_empty() && blank.is_some() {
                return None;
            }
            parse_number(t).is_none().then(|| {
                let sym = unit(quantity, u).symbol;
                let sym = if sym.is_empty() { "plain figures" } else { sym };
                match blank {
                    Some(b) => {
                        format!("Enter a number in {sym}, or leave blank for {b}.")
                    }
                    None => format!("Enter a number in {sym}."),
                }
            })
        });
        typed
            .or_else(|| engine.get())
            .or_else(|| extra.and_then(|e| e.get()))
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
                value.get().map_or_else(String::new, |si| {
                    field_text(to_display(quantity, u, si), unit(quantity, u).decimals)
                })
            })
    };
    let on_input = move |ev| {
        let t = event_target_value(&ev);
        let units = st.units.get_untracked();
        let new = if t.trim().is_empty() {
            blank.map(|_| None)
        } else {
            parse_number(&t).map(|v| Some(from_display(quantity, units, v)))
        };
        if let Some(v) = new {
            on_set.run(v);
        }
        draft.set(Some(Draft {
            units,
            generation: st.generation.get_untracked(),
            text: t,
        }));
    };
    let symbol = move || unit(quantity, st.units.get()).symbol;
    view! {
        <div class="field cfield" class:invalid=move || message.get().is_some() data-path=path.clone()>
            <label for=id.clone() class="field-label">
                {label}
                <span class="sr-only">", in " {symbol}</span>
            </label>
            <div class="field-row">
                {blank.map(|b| view! { <span class="field-hint">{format!("Blank: {b}")}</span> })}
                <span class="number">
                    <input
                        id=id
                        type="text"
                        inputmode="decimal"
                        autocomplete="off"
                        spellcheck="false"
                        placeholder=blank.map(|_| "auto")
                        prop:value=text
                        on:input=on_input
                        aria-invalid=move || if message.get().is_some() { "true" } else { "false" }
                        aria-describedby=msg_id.clone()
                        data-testid=format!("cin-{path}")
                    />
                    <span class="unit" aria-hidden="true">
                        {symbol}
                    </span>
                </span>
            </div>
            <p id=msg_id class="field-msg" data-testid=format!("cmsg-{path}")>
                {move || message.get()}
            </p>
        </div>
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn ids_are_plain() {
        assert_eq!(
            input_id("cycle.segments[2].time_s"),
            "c-cycle-segments-2-time-s"
        );
        assert_eq!(
            input_id("cycle.segments[0].force.points"),
            "c-cycle-segments-0-force-points"
        );
        assert_eq!(
            input_id("cycle.reservoir.ambient_c"),
            "c-cycle-reservoir-ambient-c"
        );
    }
}
