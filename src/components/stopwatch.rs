//! A stopwatch for one timed stretch: one large Start/Stop button. The time
//! is the difference of two `performance.now()` readings, so it does not
//! drift; the running display only repaints from the same clock.

use std::time::Duration;

use leptos::leptos_dom::helpers::IntervalHandle;
use leptos::prelude::*;

use crate::browser::now_ms;
use crate::field_form::{measured_seconds, stopwatch_text};

/// Start/stop timing of one phase; the measured time goes to `on_time`.
#[component]
pub fn Stopwatch(
    /// What is timed, for the button's label ("fast phase").
    phase: &'static str,
    /// Stable name for tests (`stopwatch-<id>`).
    id: &'static str,
    /// Receives the measured time (s) when the watch stops.
    on_time: Callback<f64>,
) -> impl IntoView {
    let start = RwSignal::new(None::<f64>);
    let shown = RwSignal::new(0.0_f64);
    let ticker = StoredValue::new(None::<IntervalHandle>);
    let stop_ticker = move || {
        if let Some(h) = ticker.get_value() {
            h.clear();
        }
        ticker.set_value(None);
    };
    on_cleanup(stop_ticker);
    let toggle = move |_| match start.get_untracked() {
        None => {
            let t0 = now_ms();
            start.set(Some(t0));
            shown.set(0.0);
            let h = set_interval_with_handle(
                move || {
                    if let Some(t0) = start.get_untracked() {
                        shown.set((now_ms() - t0) / 1000.0);
                    }
                },
                Duration::from_millis(47),
            )
            .ok();
            ticker.set_value(h);
        }
        Some(t0) => {
            let t1 = now_ms();
            stop_ticker();
            start.set(None);
            if let Some(s) = measured_seconds(t0, t1) {
                shown.set(s);
                on_time.run(s);
            }
        }
    };
    let running = move || start.get().is_some();
    view! {
        <div class="stopwatch" data-testid=format!("stopwatch-{id}")>
            <button
                type="button"
                class="stopwatch-button"
                class:running=running
                aria-pressed=move || running().to_string()
                data-testid=format!("stopwatch-{id}-toggle")
                on:click=toggle
            >
                {move || if running() { format!("Stop {phase}") } else { format!("Start {phase}") }}
            </button>
            <output
                class="stopwatch-time"
                aria-live="off"
                data-testid=format!("stopwatch-{id}-time")
            >
                {move || stopwatch_text(shown.get())}
            </output>
        </div>
    }
}
